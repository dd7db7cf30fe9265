package main

import (
	"context"
	"errors"
	"io/fs"

	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/route"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// loadPlan reads the plan file at path for plan and check. When the file has problems in its
// values, it still reads the campus and the media files the plan names and checks the plan
// against them (the hub, the links' buildings, the rates, the prices), so that every problem
// comes back at once: a misspelt key and an unknown building in one run, not one after the
// other. Problems the campus shows are added only when they are problems of a file (a
// missing or unreadable campus is reported once the plan is right).
func loadPlan(ctx context.Context, path string, o plan.LoadOptions) (*plan.Plan, error) {
	p, err := plan.LoadPlanPartial(path, o)
	if err == nil || p == nil {
		return p, err
	}
	var all input.Problems
	all.Add(err)
	if len(p.Campus) > 0 || p.CampusDatabase != "" {
		st, eng, err := loadInputs(ctx, nil, p)
		if err == nil {
			err = route.Check(st, p, eng)
		}
		if isFileProblem(err) {
			all.AddNew(err)
		}
	}
	all.Sort()
	return nil, all.Err()
}

// loadInputs reads the campus p names (from fsys when not nil) and builds its media engine
// (catalog, rules, price book). The two do not depend on one another, so when either has
// problems it reports those of both at once, with what can still be checked: the plan on
// the campus and the media files (route.Check) when both were read but for prices the book
// lacks; when the campus has problems, the plan's hub and links on the buildings that did
// read (site.CheckNames) and its rates on the catalog. The prices the
// routes need depend on the campus (its proposed spans, entrances and junctions), and are
// checked only once it reads. A stop or the machine's refusal to read comes back alone.
func loadInputs(ctx context.Context, fsys fs.FS, p *plan.Plan) (*site.Site, *media.Engine, error) {
	st, read, siteErr := site.LoadRead(ctx, fsys, campusPaths(p), siteOptions(p))
	if siteErr != nil && !isFileProblem(siteErr) {
		return nil, nil, siteErr
	}
	eng, engErr := plan.CheckEngine(p)
	if siteErr == nil && engErr == nil {
		return st, eng, nil
	}
	if engErr != nil && !isFileProblem(engErr) {
		return nil, nil, engErr
	}
	var all input.Problems
	all.Add(siteErr)
	all.AddNew(engErr)
	if st == nil {
		for _, err := range site.CheckNames(read, siteErr, p) {
			all.AddNew(err)
		}
	}
	switch {
	case eng != nil && st != nil:
		all.AddNew(route.Check(st, p, eng))
	case eng != nil:
		for _, err := range p.CheckRates(eng.Catalog()) {
			all.AddNew(err)
		}
	}
	all.Sort()
	return nil, nil, all.Err()
}

// isFileProblem reports whether err is one or more problems of an input file (not the
// machine's refusal to read one, nor a stop).
func isFileProblem(err error) bool {
	var p *input.Problem
	var ps *input.Problems
	return err != nil && (errors.As(err, &ps) || errors.As(err, &p)) && !errors.Is(err, context.Canceled) && !errors.Is(err, context.DeadlineExceeded)
}
