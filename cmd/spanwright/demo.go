package main

import (
	"fmt"
	"path"
	"spanwright/route/plan"

	"github.com/urfave/cli/v2"

	"spanwright"
)

func demoCommand() *cli.Command {
	return &cli.Command{
		Name:        "demo",
		Description: "Plans the invented demo campus and its invented price book (not a quotation) into --out.\n\n" + exitHelp("demo"),
		Usage:       "plan the invented demo campus embedded in the binary",
		Flags: []cli.Flag{
			&cli.PathFlag{Name: "out", Value: "demo-out", Usage: "output folder", TakesFile: true},
			unitsFlag,
		},
		Action: func(c *cli.Context) error {
			opt, err := writeOptions(c)
			if err != nil {
				return err
			}
			name := path.Join(spanwright.DemoDir, "plan.yaml")
			data, err := spanwright.Demo.ReadFile(name)
			if err != nil {
				return fmt.Errorf("demo: %w", err)
			}
			p, err := plan.ParsePlan(name, data)
			if err != nil {
				return err
			}
			fmt.Fprintln(c.App.Writer, "demo campus: invented for demonstration; names, places and prices are not real")
			return runPlan(c.Context, spanwright.Demo, p, c.Path("out"), planRun{write: opt}, c.App.Writer)
		},
	}
}
