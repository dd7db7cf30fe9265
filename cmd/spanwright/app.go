package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"strings"

	"github.com/urfave/cli/v2"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/route"
)

// Exit statuses.
const (
	exitOK         = 0
	exitInternal   = 1
	exitInvalid    = 2
	exitInfeasible = 3
)

// usageError marks a mistake in the command line.
type usageError struct{ err error }

func (e usageError) Error() string { return e.err.Error() }
func (e usageError) Unwrap() error { return e.err }

func onUsageError(_ *cli.Context, err error, _ bool) error { return usageError{err} }

// exitCode maps an error to the process exit status.
func exitCode(err error) int {
	var ue usageError
	var fe *geo.FeatureError
	var gl *geo.ErrorList
	var pe *route.PlanError
	var rl *route.ErrorList
	var mf *media.FileError
	var ml *media.ErrorList
	switch {
	case err == nil:
		return exitOK
	case errors.Is(err, route.ErrInfeasible):
		return exitInfeasible
	case errors.As(err, &ue), errors.As(err, &fe), errors.As(err, &gl), errors.As(err, &pe), errors.As(err, &rl),
		errors.As(err, &mf), errors.As(err, &ml), errors.Is(err, media.ErrMissingPrice),
		errors.Is(err, errInvalid), errors.Is(err, fs.ErrNotExist),
		strings.HasPrefix(err.Error(), "Required flag"), strings.HasPrefix(err.Error(), "flag provided but not defined"):
		// urfave/cli reports missing required flags as plain errors; they are usage mistakes.
		return exitInvalid
	}
	return exitInternal
}

// errInvalid marks other invalid input found by a command.
var errInvalid = errors.New("invalid input")

func newApp() *cli.App {
	app := &cli.App{
		Name:  "spanwright",
		Usage: "plan campus network backbones: routes, media, loss budgets and costs",
		Description: "Reads a campus as GeoJSON and a plan as YAML, routes every backbone link over the\n" +
			"pathway network, chooses its medium, checks loss budgets and writes the results.\n\n" +
			"EXIT STATUS\n   0 done, 1 internal error, 2 invalid input or usage, 3 plan finished but some links are infeasible.",
		Commands: []*cli.Command{
			checkCommand(),
			planCommand(),
			demoCommand(),
			mediaCommand(),
			sweepCommand(), mergeCommand(),
		},
		OnUsageError:    onUsageError,
		HideHelpCommand: true,
		ExitErrHandler:  func(*cli.Context, error) {},
	}
	for _, c := range app.Commands {
		c.OnUsageError = onUsageError
	}
	return app
}

// unitsFlag is shared by every command that prints lengths.
var unitsFlag = &cli.StringFlag{
	Name:  "units",
	Value: route.UnitsMetric,
	Usage: "units for CSV and printed lengths: metric or imperial (JSON and GeoJSON stay metric)",
}

// maxInputFlag sets the size cap of every input file; check, plan and sweep take it.
var maxInputFlag = &cli.Int64Flag{
	Name: input.LimitFlag,
	Usage: fmt.Sprintf("refuse input files larger than this, in MiB (default: %d for campus GeoJSON, %d for plan, sweep, catalog, rule and price files)",
		input.DefaultDataMiB, input.DefaultTextMiB),
}

// maxMiB is the largest value --max-input-mb takes: a tebibyte.
const maxMiB = 1 << 20

// maxInputBytes reads --max-input-mb as bytes, 0 when it is not given.
func maxInputBytes(c *cli.Context) (int64, error) {
	if !c.IsSet(input.LimitFlag) {
		return 0, nil
	}
	mb := c.Int64(input.LimitFlag)
	if mb < 1 || mb > maxMiB {
		return 0, usageError{fmt.Errorf("--%s: want MiB from 1 to %d, got %d", input.LimitFlag, maxMiB, mb)}
	}
	return mb * input.MiB, nil
}

func writeOptions(c *cli.Context) (route.WriteOptions, error) {
	u := c.String("units")
	if u != route.UnitsMetric && u != route.UnitsImperial {
		return route.WriteOptions{}, usageError{fmt.Errorf("--units: want metric or imperial, got %q", u)}
	}
	return route.WriteOptions{Units: u}, nil
}

func fprintWarnings(w io.Writer, warnings []string) {
	for _, m := range warnings {
		fmt.Fprintf(w, "warning: %s\n", m)
	}
}
