package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"path/filepath"

	"github.com/urfave/cli/v2"

	"spanwright/route"
	"spanwright/route/escape"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/report"
	"spanwright/route/routing"
)

func planCommand() *cli.Command {
	return &cli.Command{
		Name:        "plan",
		Description: "Plans every backbone link of the plan and writes routes.geojson, links.csv, summary.json,\nbom.csv, bom.xlsx and report.html to --out as one set.\n\n" + exitHelp("plan"),
		Usage:       "route and specify every backbone link of a plan and write the results",
		ArgsUsage:   "PLAN.yaml",
		Flags: []cli.Flag{
			&cli.PathFlag{Name: "out", Usage: "output folder", Required: true, TakesFile: true},
			unitsFlag,
			&cli.PathFlag{Name: "catalog", Usage: "media catalog YAML, instead of the plan's catalog: or the embedded one", TakesFile: true},
			&cli.PathFlag{Name: "rules", Usage: "media rule YAML, instead of the plan's rules: or the embedded one", TakesFile: true},
			&cli.PathFlag{Name: "prices", Usage: "price book YAML, instead of the plan's prices: or the embedded demo book", TakesFile: true},
			maxInputFlag,
			campusDBFlag,
			&cli.PathFlag{Name: "start-from", Usage: "begin the optimizer's search from the routes of an earlier plan's output `folder` (its routes.geojson); the result records it as started_from", TakesFile: true},
		},
		Action: func(c *cli.Context) error {
			opt, err := writeOptions(c)
			if err != nil {
				return err
			}
			if c.NArg() != 1 {
				return usageError{fmt.Errorf("plan: name exactly one plan file")}
			}
			maxBytes, err := maxInputBytes(c)
			if err != nil {
				return err
			}
			p, err := loadPlan(c.Context, c.Args().First(), plan.LoadOptions{MaxInputBytes: maxBytes, CampusDatabase: c.String(campusDBFlag.Name)})
			if err != nil {
				return err
			}
			overrideFiles(p, c.Path("catalog"), c.Path("rules"), c.Path("prices"))
			var start *routing.Start
			if dir := c.Path("start-from"); dir != "" {
				if start, err = output.ReadStart(dir, maxBytes); err != nil {
					return invalid{fmt.Errorf("--start-from: %w", err)}
				}
			}
			run := planRun{write: opt, start: start}
			if start != nil {
				run.startFile = filepath.Join(c.Path("start-from"), output.RoutesFile)
			}
			return runPlan(c.Context, nil, p, c.Path("out"), run, c.App.Writer)
		},
	}
}

// planRun says how runPlan plans and writes.
type planRun struct {
	write output.WriteOptions
	// start, when not nil, is where the optimizer's search begins (--start-from), read from
	// startFile, which the outputs must not replace.
	start     *routing.Start
	startFile string
}

// runPlan plans p (its campus read from fsys when not nil) and writes the outputs to out.
// When ctx is done before the outputs are renamed into place, it writes nothing and returns
// an error wrapping ctx's.
func runPlan(ctx context.Context, fsys fs.FS, p *plan.Plan, out string, run planRun, w io.Writer) (err error) {
	opt := run.write
	defer func() {
		if err != nil && ctx.Err() != nil && errors.Is(err, ctx.Err()) {
			err = stopped{what: "nothing written", err: err}
		}
	}()
	site, eng, err := loadInputs(ctx, fsys, p)
	if err != nil {
		return err
	}
	stage(ctx, "loaded")
	res, err := route.SolveFrom(ctx, site, p, eng, run.start)
	if err != nil {
		return err
	}
	stage(ctx, "planned")
	files := append(output.Outputs(res, opt), report.Output(res, report.Options{Units: opt.Units}))
	inputs := res.Inputs()
	if run.startFile != "" {
		inputs = append(inputs, run.startFile)
	}
	if err := output.WriteSet(ctx, out, files, inputs); err != nil {
		return err
	}
	if err := output.PrintSummary(w, res, opt); err != nil {
		return err
	}
	fmt.Fprintf(w, "outputs written to %s\n", escape.Terminal(out))
	if legs := res.InfeasibleLegs(); len(legs) > 0 {
		return &route.InfeasibleError{Legs: legs, Listed: true} // the summary listed them
	}
	return nil
}

// stage is told when runPlan has read the campus ("loaded") and planned ("planned"); it does
// nothing but in the tests that stop a plan at a known point (signal_test.go).
var stage = func(context.Context, string) {}

// overrideFiles points the plan at the files named on the command line; they are relative
// to the working folder, not to the plan.
func overrideFiles(p *plan.Plan, catalog, rules, prices string) {
	for _, o := range []struct {
		flag string
		dst  *string
	}{{catalog, &p.Catalog}, {rules, &p.Rules}, {prices, &p.Prices}} {
		if o.flag == "" {
			continue
		}
		if abs, err := filepath.Abs(o.flag); err == nil {
			*o.dst = abs
		} else {
			*o.dst = o.flag
		}
	}
}
