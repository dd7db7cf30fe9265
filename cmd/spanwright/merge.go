package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"sort"

	"github.com/urfave/cli/v2"

	"spanwright/route/report"
	"spanwright/route/sweep"
)

func mergeCommand() *cli.Command {
	return &cli.Command{
		Name:      "merge",
		Usage:     "join the output folders of a sharded sweep into one comparison",
		ArgsUsage: "DIR...",
		Description: "Reads the rows files (rows.jsonl, rows-i-of-n.jsonl) of every folder named and\n" +
			"writes compare.csv, compare.xlsx, compare.md, compare.html and rows.jsonl to --out as one set,\n" +
			"the same bytes as the unsharded sweep writes. Scenario folders stay where the shards wrote them.\n\n" +
			exitHelp("merge"),

		Flags: []cli.Flag{
			&cli.PathFlag{Name: "out", Usage: "output folder for the comparison", Required: true, TakesFile: true},
		},
		Action: func(c *cli.Context) error {
			if c.NArg() == 0 {
				return usageError{fmt.Errorf("merge: name the output folders of the shards")}
			}
			return runMerge(c.Context, c.Args().Slice(), c.Path("out"), c.App.Writer)
		},
	}
}

func runMerge(_ context.Context, dirs []string, out string, w io.Writer) error {
	rep, err := sweep.Merge(dirs, out, report.SweepFiles(report.SweepOptions{}))
	if errors.Is(err, sweep.ErrMerge) {
		return invalid{err}
	}
	if err != nil {
		return err
	}
	sort.Strings(rep.Files)
	printReport(w, rep, sweep.Shard{})
	return outcome(rep)
}
