package main

import (
	"errors"
	"fmt"
	"io"
	"path/filepath"

	"github.com/urfave/cli/v2"

	"spanwright/route/escape"
	"spanwright/route/starter"
)

func starterCommand() *cli.Command {
	return &cli.Command{
		Name:      "starter",
		Usage:     "write editable starter inputs (a small invented campus, a plan, a price-book template) into a folder",
		ArgsUsage: "DIR",
		Description: "Writes campus.geojson (a small invented campus of six buildings: ducts, a tunnel, a pole line,\n" +
			"proposed trench), plan.yaml and prices.yaml (a price-book template, every key explained, every amount a\n" +
			"placeholder) into DIR, creating it when missing, so that `spanwright plan DIR/plan.yaml --out OUT` runs\n" +
			"at once and the files can be edited into your own. It never replaces a file: when any of the three\n" +
			"exists, it writes none and names them.\n\n" + exitHelp("starter"),
		Action: func(c *cli.Context) error {
			if c.NArg() != 1 {
				return usageError{fmt.Errorf("starter: name the folder to write the starter files into")}
			}
			return runStarter(c.Args().First(), c.App.Writer)
		},
	}
}

func runStarter(dir string, w io.Writer) error {
	written, err := starter.Write(dir)
	if errors.Is(err, starter.ErrExists) {
		return invalid{err}
	}
	if err != nil {
		return err
	}
	for _, p := range written {
		fmt.Fprintf(w, "wrote %s\n", escape.Terminal(p))
	}
	fmt.Fprintf(w, "next: spanwright plan %s --out %s\n", escape.Terminal(filepath.Join(dir, starter.PlanFile)), escape.Terminal(dir+"-out"))
	fmt.Fprintln(w, "the campus and every amount in prices.yaml are invented placeholders: replace them with your own")
	return nil
}
