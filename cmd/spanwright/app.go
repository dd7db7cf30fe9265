package main

import (
	"errors"
	"fmt"
	"io/fs"
	"strings"
	"syscall"

	"github.com/urfave/cli/v2"

	"spanwright/geo/input"
	"spanwright/route"
	"spanwright/route/fileset"
	"spanwright/route/output"
)

// Exit statuses. 130 and 143 (stopped by a signal) are set by main.
const (
	exitOK          = 0
	exitInternal    = 1 // a bug in spanwright
	exitInvalid     = 2 // invalid input or usage, an output that would overwrite an input
	exitInfeasible  = 3 // finished, but some links are infeasible
	exitEnvironment = 4 // the machine refused: an output could not be written, a file not read
)

// usageError marks a mistake in the command line.
type usageError struct{ err error }

func (e usageError) Error() string { return e.err.Error() }
func (e usageError) Unwrap() error { return e.err }

func onUsageError(_ *cli.Context, err error, _ bool) error { return usageError{err} }

// exitCode maps an error to the process exit status.
func exitCode(err error) int {
	var ue usageError
	var ip *input.Problem
	var oe *fileset.OutputError
	switch {
	case err == nil:
		return exitOK
	case errors.Is(err, route.ErrInfeasible):
		return exitInfeasible
	case errors.Is(err, fileset.ErrOverwrite), errors.Is(err, fileset.ErrOutFolder):
		// The command as given can never succeed: its --out holds what it must not replace.
		return exitInvalid
	case errors.As(err, &oe), environmental(err):
		// Before the input checks: an input that cannot be read for lack of permission or
		// an I/O error is the machine's fault, whatever loader reports it.
		return exitEnvironment
	case errors.As(err, &ue), errors.As(err, &ip), // every input problem, of every file kind
		errors.Is(err, errInvalid), errors.Is(err, fs.ErrNotExist),
		strings.HasPrefix(err.Error(), "Required flag"), strings.HasPrefix(err.Error(), "flag provided but not defined"):
		// urfave/cli reports missing required flags as plain errors; they are usage mistakes.
		return exitInvalid
	}
	return exitInternal
}

// environmental reports whether err comes from the machine rather than from spanwright or
// its input: a full disk or quota, a missing permission, a read-only file system, an I/O
// error, too many open files. A retry may succeed once the machine is put right.
func environmental(err error) bool {
	if errors.Is(err, fs.ErrPermission) {
		return true
	}
	for _, e := range []syscall.Errno{syscall.ENOSPC, syscall.EDQUOT, syscall.EROFS, syscall.EIO, syscall.EMFILE, syscall.ENFILE, syscall.EFBIG} {
		if errors.Is(err, e) {
			return true
		}
	}
	return false
}

// errInvalid marks other invalid input found by a command.
var errInvalid = errors.New("invalid input")

func newApp() *cli.App {
	app := &cli.App{
		Name:  "spanwright",
		Usage: "plan campus network backbones: routes, media, loss budgets and costs",
		Description: "Reads a campus as GeoJSON and a plan as YAML, routes every backbone link over the\n" +
			"pathway network, chooses its medium, checks loss budgets and writes the results.\n\n" +
			"EXIT STATUS\n   0 done; 1 internal error (a bug: please report it); 2 invalid input or usage (an unknown\n" +
			"   command, a bad flag, an invalid file, an output that would overwrite an input or an --out\n" +
			"   folder holding a sub-folder); 3 plan finished but some links are infeasible; 4 the machine\n" +
			"   refused: an output could not be written (disk full, no permission, --out names a file) or\n" +
			"   an input not read (no permission, I/O error); 130 stopped by Ctrl-C, 143 by SIGTERM.",
		Commands: []*cli.Command{
			checkCommand(),
			planCommand(),
			demoCommand(),
			mediaCommand(),
			sweepCommand(), mergeCommand(),
		},
		Action: func(c *cli.Context) error {
			if c.NArg() > 0 {
				return usageError{fmt.Errorf("unknown command %q; the commands are check, plan, demo, media, sweep and merge (spanwright --help)", c.Args().First())}
			}
			return cli.ShowAppHelp(c)
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
	Value: output.UnitsMetric,
	Usage: "units for CSV and printed lengths: metric or imperial (JSON, GeoJSON and plan.gpkg stay metric)",
}

// maxInputFlag sets the size cap of every input file; check, plan and sweep take it.
var maxInputFlag = &cli.Int64Flag{
	Name:  input.LimitFlag,
	Usage: "refuse input files larger than this, in MiB",
	DefaultText: fmt.Sprintf("%d for campus GeoJSON, %d for plan, sweep, catalog, rule and price files",
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

func writeOptions(c *cli.Context) (output.WriteOptions, error) {
	u := c.String("units")
	if u != output.UnitsMetric && u != output.UnitsImperial {
		return output.WriteOptions{}, usageError{fmt.Errorf("--units: want metric or imperial, got %q", u)}
	}
	return output.WriteOptions{Units: u}, nil
}
