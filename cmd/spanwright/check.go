package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/urfave/cli/v2"

	"spanwright/route"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/site"
)

func checkCommand() *cli.Command {
	return &cli.Command{
		Name:        "check",
		Description: "Validates a plan (everything plan rejects before routing) or campus files (GeoJSON or\nGeoPackage) and summarises the pathway network.\n\n" + exitHelp("check"),
		Usage:       "validate a plan or campus files and summarise the pathway network",
		ArgsUsage:   "PLAN.yaml | CAMPUS.geojson|CAMPUS.gpkg...",
		Flags:       []cli.Flag{unitsFlag, maxInputFlag, campusDBFlag},
		Action: func(c *cli.Context) error {
			opt, err := writeOptions(c)
			if err != nil {
				return err
			}
			if c.NArg() == 0 && c.String(campusDBFlag.Name) == "" {
				return usageError{fmt.Errorf("check: name a plan file, one or more campus files (GeoJSON or GeoPackage) or --%s", campusDBFlag.Name)}
			}
			maxBytes, err := maxInputBytes(c)
			if err != nil {
				return err
			}
			return runCheck(c.Context, c.Args().Slice(), c.String(campusDBFlag.Name), maxBytes, opt, c.App.Writer)
		},
	}
}

// runCheck checks the plan or campus files of args, with the tables of the database db
// when not "" (instead of the plan's).
func runCheck(ctx context.Context, args []string, db string, maxBytes int64, opt output.WriteOptions, w io.Writer) (err error) {
	defer func() {
		if err != nil && ctx.Err() != nil && errors.Is(err, ctx.Err()) {
			err = fmt.Errorf("stopped: %w", err)
		}
	}()
	var st *site.Site
	var p *plan.Plan
	hub := ""
	if len(args) == 1 && (strings.HasSuffix(args[0], ".yaml") || strings.HasSuffix(args[0], ".yml")) {
		if p, err = loadPlan(ctx, args[0], plan.LoadOptions{MaxInputBytes: maxBytes, CampusDatabase: db}); err != nil {
			return err
		}
		st, _, err = loadInputs(ctx, nil, p)
		hub = p.Hub
	} else {
		st, err = site.Load(ctx, nil, args, site.Options{SnapM: plan.Default.Design.SnapM,
			MaxLateralM: plan.Default.Design.MaxLateralM, MaxInputBytes: maxBytes, Database: db})
	}
	if err != nil {
		return err
	}
	rep := st.Check(hub)
	// Everything plan rejects before routing, check rejects too, after the report.
	var planErr error
	if p != nil {
		planErr = route.CheckPlan(st, p, &rep)
	}
	if err := output.PrintCheck(w, rep, opt); err != nil {
		return err
	}
	if hub != "" && rep.Hub == "" && planErr == nil {
		_, err := st.Hub(p) // the plan's problem, at the hub's line
		return err
	}
	// planErr, with no hub, is route.Check's: the hub's problem and every other at once.
	if planErr != nil {
		return planErr
	}
	// As plan: the buildings and diverse links that cannot be served (exit 3); the rest can be
	// planned.
	cannot := output.CannotServe(rep)
	if len(cannot) > 0 {
		return fmt.Errorf("%w: %s", route.ErrInfeasible, strings.Join(cannot, "; "))
	}
	return nil
}

func campusPaths(p *plan.Plan) []string {
	out := make([]string, len(p.Campus))
	for i, f := range p.Campus {
		out[i] = p.Path(f)
	}
	return out
}

func siteOptions(p *plan.Plan) site.Options {
	return site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM, MaxInputBytes: p.MaxInputBytes,
		Database: p.CampusDatabase}
}
