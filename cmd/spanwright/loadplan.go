package main

import (
	"context"
	"errors"

	"spanwright/geo/input"
	"spanwright/route"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// loadPlan reads the plan file at path for plan and check. When the file has problems in its
// values, it still reads the campus the plan names and checks the plan against it (the hub,
// the links' buildings, the rates, the prices), so that every problem comes back at once: a
// misspelt key and an unknown building in one run, not one after the other. Problems the
// campus shows are added only when they are problems of a file (a missing or unreadable
// campus is reported once the plan is right).
func loadPlan(ctx context.Context, path string, o plan.LoadOptions) (*plan.Plan, error) {
	p, err := plan.LoadPlanPartial(path, o)
	if err == nil || p == nil {
		return p, err
	}
	var all input.Problems
	all.Add(err)
	if len(p.Campus) > 0 || p.CampusDatabase != "" {
		if err := campusProblems(ctx, p); isFileProblem(err) {
			all.AddNew(err)
		}
	}
	all.Sort()
	return nil, all.Err()
}

// campusProblems returns what reading p's campus and checking the plan on it find: the
// campus's own problems, the engine's, or route.Check's; nil when there are none.
func campusProblems(ctx context.Context, p *plan.Plan) error {
	st, err := site.Load(ctx, nil, campusPaths(p), siteOptions(p))
	if err != nil {
		return err
	}
	eng, err := plan.Engine(p)
	if err != nil {
		return err
	}
	return route.Check(st, p, eng)
}

// isFileProblem reports whether err is one or more problems of an input file (not the
// machine's refusal to read one, nor a stop).
func isFileProblem(err error) bool {
	var p *input.Problem
	var ps *input.Problems
	return err != nil && (errors.As(err, &ps) || errors.As(err, &p)) && !errors.Is(err, context.Canceled) && !errors.Is(err, context.DeadlineExceeded)
}
