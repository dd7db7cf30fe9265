package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"runtime"
	"runtime/debug"
	"sort"
	"strings"
	"time"

	"github.com/schollz/progressbar/v3"
	"github.com/urfave/cli/v2"
	"golang.org/x/term"

	"spanwright/geo/input"
	"spanwright/route/escape"
	"spanwright/route/output"
	"spanwright/route/report"
	"spanwright/route/sweep"
)

func sweepCommand() *cli.Command {
	return &cli.Command{
		Name:      "sweep",
		Usage:     "plan every alternative of a sweep file and compare them",
		ArgsUsage: "SWEEP.yaml",
		Description: "Plans the base plan of the sweep file once per scenario (the product of its vary\n" +
			"axes, then each of its cases), writes each scenario's outputs to OUT/<scenario id>/\n" +
			"(plan.yaml, routes.geojson, links.csv, summary.json, bom.csv; with --full also bom.xlsx,\n" +
			"plan.gpkg and report.html) and the comparison to OUT/compare.csv, compare.xlsx, compare.md and\n" +
			"compare.html (sortable table, cost-against-margin plot). `spanwright plan` on a\n" +
			"scenario's plan.yaml writes its full set later. Every scenario's inputs are checked\n" +
			"before any is planned: a value or file the plan cannot take stops the sweep with every\n" +
			"problem at once, status 2, nothing written.\n\n" +
			"Every scenario is planned from scratch, as `spanwright plan` plans its plan.yaml alone,\n" +
			"unless its routing problem is too large for the optimizer's full search from scratch\n" +
			"(a campus of some hundreds of buildings, never one of a few dozen): such a scenario, on\n" +
			"the first scenario's campus and hub, starts the optimizer from the first scenario's\n" +
			"routes (summary.json's started_from names it, blank otherwise), and\n" +
			"`spanwright plan <scenario>/plan.yaml --start-from OUT/<first scenario>` reproduces it.\n" +
			"--cold plans every scenario from scratch, whatever its size (README, \"Warm start\").\n\n" +
			"With --shard i/n only the scenarios whose index mod n is i-1 are planned and their\n" +
			"rows written to OUT/rows-i-of-n.jsonl; `spanwright merge` joins the shards.\n\n" +
			exitHelp("sweep"),

		Flags: []cli.Flag{
			&cli.PathFlag{Name: "out", Usage: "output folder", Required: true, TakesFile: true},
			&cli.IntFlag{Name: "jobs", Value: runtime.NumCPU(), Usage: "scenarios planned at once"},
			&cli.BoolFlag{Name: "resume", Usage: "skip scenarios whose outputs all exist and whose inputs are unchanged"},
			&cli.StringFlag{Name: "shard", Usage: "plan part `i/n` of the sweep only: the scenarios whose index mod n is i-1"},
			&cli.BoolFlag{Name: "quiet", Usage: "print no progress on stderr"},
			&cli.BoolFlag{Name: "full", Usage: "also write bom.xlsx, plan.gpkg and report.html in every scenario folder (slower)"},
			&cli.BoolFlag{Name: "cold", Usage: "plan every scenario from scratch, as the plan command plans it alone, also those too large for the full search from scratch, which otherwise start from the first scenario's routes"},
			unitsFlag,
			maxInputFlag,
			campusDBFlag,
		},
		Action: func(c *cli.Context) error {
			opt, err := sweepOpts(c)
			if err != nil {
				return err
			}
			return runSweep(c.Context, opt, c.App.Writer, c.App.ErrWriter)
		},
	}
}

// sweepGCPercent is the garbage collector's target during a sweep (Go's default is 100).
const sweepGCPercent = 400

type sweepOptions struct {
	file   string
	out    string
	jobs   int
	resume bool
	quiet  bool
	full   bool
	cold   bool // no warm start (sweep.Options.Cold)
	shard  sweep.Shard
	write  output.WriteOptions
	// maxBytes caps every input file, in bytes; 0 for the defaults
	maxBytes int64
	// campusDB is the campus database of every scenario, instead of the plan's; "" for the plan's
	campusDB string
}

func sweepOpts(c *cli.Context) (sweepOptions, error) {
	w, err := writeOptions(c)
	if err != nil {
		return sweepOptions{}, err
	}
	if c.NArg() != 1 {
		return sweepOptions{}, usageError{fmt.Errorf("sweep: name exactly one sweep file")}
	}
	if c.Int("jobs") < 1 {
		return sweepOptions{}, usageError{fmt.Errorf("--jobs: want at least 1, got %d", c.Int("jobs"))}
	}
	o := sweepOptions{file: c.Args().First(), out: c.Path("out"), jobs: c.Int("jobs"),
		resume: c.Bool("resume"), quiet: c.Bool("quiet"), full: c.Bool("full"), cold: c.Bool("cold"), write: w, campusDB: c.String(campusDBFlag.Name)}
	o.write.SkipWorkbook = !o.full
	o.write.SkipGeoPackage = !o.full
	if o.maxBytes, err = maxInputBytes(c); err != nil {
		return sweepOptions{}, err
	}
	if s := c.String("shard"); s != "" {
		if o.shard, err = sweep.ParseShard(s); err != nil {
			return sweepOptions{}, usageError{fmt.Errorf("--shard: %w", err)}
		}
	}
	return o, nil
}

func runSweep(ctx context.Context, o sweepOptions, stdout, stderr io.Writer) error {
	f, err := sweep.LoadPartial(o.file, o.maxBytes)
	if err != nil {
		if f != nil {
			// The scenarios the good overrides make: their problems too, in the same run.
			err = allProblems(err, sweep.Check(ctx, f, sweep.Options{Out: o.out, CampusDatabase: o.campusDB}))
		}
		return invalid{err}
	}
	// A sweep allocates much short-lived garbage and keeps little: trade a few MiB of heap for
	// less collection, unless the user set GOGC.
	if os.Getenv("GOGC") == "" {
		defer debug.SetGCPercent(debug.SetGCPercent(sweepGCPercent))
	}
	prog := newProgress(stderr, o.quiet)
	so := sweep.Options{Out: o.out, Jobs: o.jobs, Resume: o.resume, Shard: o.shard, Write: o.write, Progress: prog.update,
		Compare: report.SweepFiles(report.SweepOptions{}), CampusDatabase: o.campusDB, Cold: o.cold, Preflight: true}
	if o.full {
		so.Extra = report.Extra(report.Options{Units: o.write.Units})
	}
	rep, err := sweep.Run(ctx, f, so)
	prog.finish(err == nil)
	if err != nil {
		if ctx.Err() != nil && errors.Is(err, ctx.Err()) {
			return stopped{what: sweepStopped(rep, o.out), err: err}
		}
		return err
	}
	sort.Strings(rep.Files)
	printReport(stdout, rep, o.shard)
	return outcome(rep)
}

// sweepStopped says what a sweep stopped by its context left: the scenario folders it
// finished (each whole; rep is nil when it stopped before the first), and how to go on.
func sweepStopped(rep *sweep.Report, out string) string {
	n := 0
	if rep != nil {
		n = rep.OK + rep.Infeasible + rep.Failed - rep.Skipped
	}
	if n == 0 {
		return "no scenario written; no comparison written"
	}
	return fmt.Sprintf("%s written to %s, each whole; no comparison written; run the same command with --resume to finish",
		scenarios(n), escape.Terminal(out))
}

// outcome turns a finished run's report into the command's error: failed scenarios are
// invalid input (status 2), infeasible legs status 3.
func outcome(rep *sweep.Report) error {
	err := rep.Err()
	if errors.Is(err, sweep.ErrScenarioFailed) {
		return invalid{err}
	}
	return err
}

func printReport(w io.Writer, rep *sweep.Report, shard sweep.Shard) {
	what := scenarios(rep.Run)
	if !shard.Whole() {
		what = fmt.Sprintf("shard %s: %d of %s", shard, rep.Run, scenarios(rep.Scenarios))
	}
	fmt.Fprintf(w, "sweep: %s: %d ok, %d with infeasible legs, %d failed", what, rep.OK, rep.Infeasible, rep.Failed)
	if rep.Skipped > 0 {
		fmt.Fprintf(w, " (%d unchanged, kept)", rep.Skipped)
	}
	fmt.Fprintln(w)
	for _, n := range rep.Notes {
		fmt.Fprintf(w, "note: %s\n", escape.Terminal(n))
	}
	for i, r := range rep.Failures {
		if i == 10 {
			fmt.Fprintf(w, "  and %d more failed (see compare.md or each scenario's error.txt)\n", len(rep.Failures)-10)
			break
		}
		fmt.Fprintf(w, "  failed %s: %s\n", escape.Terminal(r.ID), escape.Terminal(strings.ReplaceAll(r.Error, "\n", "; ")))
	}
	switch {
	case rep.Incomplete > 0 && rep.OKSets > 1:
		fmt.Fprintf(w, "note: %s ok but ranked apart: the price book leaves items out of the total, so each is ranked only among scenarios leaving out the same items (rank says \"1 of 3 without …\", pareto \"yes (without …)\"; see compare.md's notes)\n", scenarios(rep.Incomplete))
	case rep.Incomplete > 0:
		fmt.Fprintf(w, "note: %s ok, every total leaving out the same items the price book does not price: ranked together, on totals without them (rank says \"1 of 3 without …\", pareto \"yes (without …)\"; see compare.md's notes)\n", scenarios(rep.Incomplete))
	}
	if rep.DemoPrices > 0 {
		fmt.Fprintf(w, "warning: %s priced by the invented demo price book built into spanwright: not a quotation (see each summary.json)\n", scenarios(rep.DemoPrices))
	}
	fmt.Fprintf(w, "written: %s\n", escape.Terminal(strings.Join(rep.Files, ", ")))
	if !shard.Whole() {
		fmt.Fprintln(w, "when every shard has run, join them with: spanwright merge DIR... --out DIR")
	}
}

// invalid marks err as invalid input for exitCode, keeping its message.
type invalid struct{ error }

func (e invalid) Is(target error) bool { return target == errInvalid }
func (e invalid) Unwrap() error        { return e.error }

// progress shows a sweep's progress on stderr: a bar on a terminal, a line every
// plainEvery otherwise, nothing when quiet. Its rate and time left count only the scenarios
// planned in this run: those --resume keeps take no time and would make both look better
// than they are. The time left assumes that every scenario not yet reached is planned.
type progress struct {
	w     io.Writer
	quiet bool
	tty   bool
	now   func() time.Time // time.Now; a test's clock in the tests
	start time.Time
	last  time.Time
	bar   *progressbar.ProgressBar
	state sweep.Progress
}

// plainEvery is how often progress lines are printed when stderr is not a terminal.
const plainEvery = 10 * time.Second

func newProgress(w io.Writer, quiet bool) *progress {
	p := &progress{w: w, quiet: quiet, now: time.Now}
	p.start = p.now()
	p.last = p.start
	if f, ok := w.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		p.tty = true
	}
	return p
}

// planned is how many scenarios of s were planned in this run, not kept.
func planned(s sweep.Progress) int { return s.Done - s.Skipped }

func (p *progress) update(s sweep.Progress) {
	p.state = s
	if p.quiet {
		return
	}
	if p.tty {
		// The bar counts the scenarios to plan: each one kept takes one off its length.
		if p.bar == nil {
			p.bar = progressbar.NewOptions(s.Total, progressbar.OptionSetWriter(p.w),
				progressbar.OptionSetDescription("sweep"), progressbar.OptionShowCount(),
				progressbar.OptionShowIts(), progressbar.OptionSetItsString("scenarios"),
				progressbar.OptionSetPredictTime(true), progressbar.OptionThrottle(100*time.Millisecond),
				progressbar.OptionClearOnFinish())
		}
		if s.Skipped > 0 {
			p.bar.Describe(fmt.Sprintf("sweep (%d kept)", s.Skipped))
		}
		p.bar.ChangeMax(max(1, s.Total-s.Skipped))
		p.bar.Set(planned(s))
		return
	}
	if now := p.now(); now.Sub(p.last) >= plainEvery && s.Done < s.Total {
		p.last = now
		el := now.Sub(p.start).Seconds()
		rate := float64(planned(s)) / el
		line := fmt.Sprintf("sweep: %d/%d scenarios", s.Done, s.Total)
		if s.Skipped > 0 {
			line += fmt.Sprintf(" (%d kept)", s.Skipped)
		}
		if rate > 0 {
			left := time.Duration(float64(s.Total-s.Done)/rate) * time.Second
			line += fmt.Sprintf(", %.1f planned per second, about %s left", rate, left.Round(time.Second))
		}
		fmt.Fprintln(p.w, line)
	}
}

// finish ends the progress: the bar is cleared and, when the sweep ran to its end, one line
// says how many scenarios were planned and how fast. A stopped sweep's one line is the
// error main prints.
func (p *progress) finish(done bool) {
	if p.quiet {
		return
	}
	if p.bar != nil {
		if done {
			p.bar.Finish()
		}
		p.bar.Clear() // Finish leaves the bar on its line when it never drew the whole
	}
	el := p.now().Sub(p.start)
	if n := planned(p.state); done && n > 0 {
		fmt.Fprintf(p.w, "sweep: %s planned in %s, %.1f per second\n", scenarios(n), el.Round(time.Millisecond), float64(n)/el.Seconds())
	}
}

// scenarios counts scenarios in words: "1 scenario", "3 scenarios".
func scenarios(n int) string { return output.Counted(n, "scenario", "scenarios") }

// allProblems is the problems of err and of more (when they are problems of input files:
// a stop or another error of more is left out), each once, sorted.
func allProblems(err, more error) error {
	var all input.Problems
	all.Add(err)
	if isFileProblem(more) {
		all.AddNew(more)
	}
	all.Sort()
	return all.Err()
}
