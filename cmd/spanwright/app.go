package main

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"strings"
	"syscall"

	"github.com/urfave/cli/v2"
	"github.com/xrash/smetrics"

	"spanwright/geo/input"
	"spanwright/route"
	"spanwright/route/fileset"
	"spanwright/route/output"
	"spanwright/route/starter"
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
		errors.Is(err, starter.ErrExists),
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
		Name:    "spanwright",
		Usage:   "plan campus network backbones: routes, media, loss budgets and costs",
		Version: version(),
		Description: "Reads a campus as GeoJSON and a plan as YAML, routes every backbone link over the\n" +
			"pathway network, chooses its medium, checks loss budgets and writes the results.\n" +
			"New here? `spanwright starter DIR` writes a small campus, a plan and a price-book template to edit.\n\n" +
			exitHelp(""),
		Commands: []*cli.Command{
			checkCommand(),
			planCommand(),
			demoCommand(),
			mediaCommand(),
			sweepCommand(), mergeCommand(),
			starterCommand(),
		},
		Action: func(c *cli.Context) error {
			if c.NArg() == 0 {
				return cli.ShowAppHelp(c)
			}
			if c.Args().First() == "help" { // `spanwright help plan`, as many programs take it
				if c.NArg() == 1 {
					return cli.ShowAppHelp(c)
				}
				return cli.ShowCommandHelp(c, c.Args().Get(1))
			}
			return unknownCommand(c.Args().First())
		},
		CommandNotFound: func(c *cli.Context, name string) {
			c.App.Metadata[notFoundKey] = unknownCommand(name)
		},
		OnUsageError:    onUsageError,
		HideHelpCommand: true,
		ExitErrHandler:  func(*cli.Context, error) {},
		Metadata:        map[string]any{},
	}
	for _, c := range app.Commands {
		c.OnUsageError = onUsageError
	}
	return app
}

// notFoundKey is where CommandNotFound leaves its error in App.Metadata: urfave/cli v2 calls
// it (for `spanwright --help NAME`) without a way to return one; runApp returns it.
const notFoundKey = "spanwright: command not found"

// unknownCommand is the usage error for a command name spanwright does not have, with the
// nearest command when one is within two edits, and the list of commands.
func unknownCommand(name string) error {
	hint := ""
	best := 3
	for _, c := range allCommands {
		if d := smetrics.WagnerFischer(strings.ToLower(name), c, 1, 1, 1); d < best { // Levenshtein distance
			best, hint = d, fmt.Sprintf(" (did you mean %s?)", c)
		}
	}
	return usageError{fmt.Errorf("unknown command %q%s; the commands are %s (spanwright --help)", name, hint, strings.Join(allCommands, ", "))}
}

// runApp runs the command line args (args[0] is the program) as main does: flags after
// positional arguments are moved ahead of them (intersperse), and an unknown command is a
// usage error however urfave/cli met it.
func runApp(ctx context.Context, app *cli.App, args []string) error {
	err := app.RunContext(ctx, intersperse(app, args))
	if e, ok := app.Metadata[notFoundKey].(error); ok && err == nil {
		return e
	}
	return err
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
	DefaultText: fmt.Sprintf("%d for campus GeoJSON and GeoPackage, %d for plan, sweep, catalog, rule and price files",
		input.DefaultDataMiB, input.DefaultTextMiB),
}

// campusDBFlag reads the campus from a PostgreSQL/PostGIS database; check, plan and sweep
// take it.
var campusDBFlag = &cli.StringFlag{
	Name: "campus-db",
	Usage: "read the campus from the tables of this PostgreSQL/PostGIS database (a libpq connection string " +
		"or postgresql:// URI; put the password in PGPASSWORD or ~/.pgpass), instead of the plan's campus_database",
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
