package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/urfave/cli/v2"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/route"
	"spanwright/route/escape"
)

func checkCommand() *cli.Command {
	return &cli.Command{
		Name:      "check",
		Usage:     "validate a plan or campus files and summarise the pathway network",
		ArgsUsage: "PLAN.yaml | CAMPUS.geojson...",
		Flags:     []cli.Flag{unitsFlag, maxInputFlag},
		Action: func(c *cli.Context) error {
			opt, err := writeOptions(c)
			if err != nil {
				return err
			}
			if c.NArg() == 0 {
				return usageError{fmt.Errorf("check: name a plan file or one or more campus GeoJSON files")}
			}
			maxBytes, err := maxInputBytes(c)
			if err != nil {
				return err
			}
			return runCheck(c.Context, c.Args().Slice(), maxBytes, opt, c.App.Writer)
		},
	}
}

func runCheck(ctx context.Context, args []string, maxBytes int64, opt route.WriteOptions, w io.Writer) (err error) {
	defer func() {
		if err != nil && ctx.Err() != nil && errors.Is(err, ctx.Err()) {
			err = fmt.Errorf("stopped: %w", err)
		}
	}()
	var site *route.Site
	var p *route.Plan
	hub := ""
	if len(args) == 1 && (strings.HasSuffix(args[0], ".yaml") || strings.HasSuffix(args[0], ".yml")) {
		if p, err = route.LoadPlanLimit(args[0], maxBytes); err != nil {
			return err
		}
		site, err = route.LoadSite(ctx, nil, campusPaths(p), siteOptions(p))
		hub = p.Hub
	} else {
		site, err = route.LoadSite(ctx, nil, args, route.SiteOptions{SnapM: route.PlanDefaults.Design.SnapM,
			MaxLateralM: route.PlanDefaults.Design.MaxLateralM, MaxInputBytes: maxBytes})
	}
	if err != nil {
		return err
	}
	rep := site.Check(hub)
	if err := rep.Print(w, opt); err != nil {
		return err
	}
	if hub != "" && rep.Hub == "" {
		_, err := site.Hub(p) // the plan's problem, at the hub's line
		return err
	}
	if len(rep.Unreachable) > 0 {
		err := input.Errorf(geo.ErrUnreachable, "%d buildings cannot reach the hub %s: %s", len(rep.Unreachable), escape.Terminal(rep.Hub), escape.TerminalList(rep.Unreachable))
		if p != nil {
			return p.Problem("hub", err)
		}
		return fmt.Errorf("%w: %w", errInvalid, err)
	}
	return nil
}

func campusPaths(p *route.Plan) []string {
	out := make([]string, len(p.Campus))
	for i, f := range p.Campus {
		out[i] = p.Path(f)
	}
	return out
}

func siteOptions(p *route.Plan) route.SiteOptions {
	return route.SiteOptions{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM, MaxInputBytes: p.MaxInputBytes}
}
