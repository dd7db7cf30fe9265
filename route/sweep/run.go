package sweep

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"

	lru "github.com/hashicorp/golang-lru/v2"
	"go.yaml.in/yaml/v3"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/route"
	"spanwright/route/escape"
	"spanwright/route/fileset"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// Files every planned scenario folder holds besides the plan's outputs.
const (
	PlanFile    = "plan.yaml"      // the scenario's plan: the base plan with its overrides
	InputsFile  = "inputs.sha256"  // SHA-256 of the plan and of every file it reads
	OutputsFile = "outputs.sha256" // SHA-256 of every output of the plan in the folder (outputsFile)
	ErrorFile   = "error.txt"      // why the scenario failed (hidden characters shown); only in a failed scenario's folder
	SummaryFile = "summary.json"   // the plan summary, read back by a resumed sweep
)

// Shard selects a deterministic part of a sweep: the scenarios whose index modulo N is I-1.
// The zero Shard is the whole sweep.
type Shard struct {
	I, N int // 1-based part I of N
}

// ParseShard reads "i/n" with 1 <= i <= n.
func ParseShard(s string) (Shard, error) {
	a, b, ok := strings.Cut(s, "/")
	i, err1 := strconv.Atoi(a)
	n, err2 := strconv.Atoi(b)
	if !ok || err1 != nil || err2 != nil || n < 1 || i < 1 || i > n {
		return Shard{}, fmt.Errorf("shard %q: want i/n with 1 <= i <= n, e.g. 2/8", s)
	}
	return Shard{I: i, N: n}, nil
}

// Whole reports whether the shard is the whole sweep.
func (s Shard) Whole() bool { return s.N <= 1 }

// Has reports whether the scenario at index belongs to the shard.
func (s Shard) Has(index int) bool { return s.Whole() || index%s.N == s.I-1 }

func (s Shard) String() string {
	if s.Whole() {
		return ""
	}
	return fmt.Sprintf("%d/%d", s.I, s.N)
}

// Options say how a sweep runs.
type Options struct {
	Out    string // output folder
	Jobs   int    // scenarios planned at once; 0 or less means runtime.NumCPU()
	Resume bool   // skip scenarios whose outputs exist and whose inputs are unchanged
	Shard  Shard  // the part of the sweep to run; zero for all
	Write  output.WriteOptions
	// Extra, when not nil, renders more files for a planned scenario's folder (a report, a
	// bill of materials); an error fails that scenario. ctx is the run's: when it is done,
	// Extra should return soon, and its answer is not used.
	Extra func(ctx context.Context, r *route.Result) ([]fileset.OutputFile, error)
	// Progress, when not nil, is called after each scenario of the run, one call at a time.
	Progress func(Progress)
	// Compare, when not nil, renders more comparison files (a report) for a whole sweep;
	// they are written in one set with compare.csv and the others.
	Compare CompareFunc
	// CampusDatabase, when not "", is the campus database of every scenario instead of its
	// plan's campus_database (the command line's --campus-db); scenarios' plan.yaml keep
	// their own.
	CampusDatabase string
	// Cold plans every scenario from scratch, as `spanwright plan` plans its plan alone. By
	// default a scenario on the base scenario's network (the same campus files and noding)
	// starts its search from the base scenario's routes where routing.StartPays finds that
	// worth it (see Run), and is planned from scratch elsewhere.
	Cold bool
	// Preflight checks the inputs of every scenario of the sweep before anything is planned
	// or written, and stops the sweep with every problem at once (see preflight) instead of
	// failing the scenarios one by one as they are planned.
	Preflight bool
	// warmAlways, for the tests of the warm start's machinery on campuses small enough to be
	// planned from scratch, starts every scenario on the base's site from the base's routes,
	// without asking routing.StartPays whether the start is worth it (no WherePays).
	warmAlways bool
}

// Progress is the state of a running sweep.
type Progress struct {
	Done    int // scenarios finished, skipped ones included
	Total   int // scenarios in this run (the shard's share)
	Skipped int // left as they were by Resume
	Failed  int
}

// Report is what a sweep or a merge did.
type Report struct {
	Scenarios  int // in the whole sweep
	Run        int // in this run: the shard's share, or all
	Skipped    int // left as they were by Resume
	OK         int
	Infeasible int // planned with some legs infeasible
	Failed     int
	Failures   []Row // the failed scenarios' rows, in index order
	DemoPrices int   // scenarios priced by the invented demo price book
	Incomplete int   // of OK, those whose totals leave out items not priced (Row.Incomplete), ranked among the same exclusion
	// OKSets is the number of sets the comparison ranks the ok scenarios in (RankSets with
	// okOnly: one per set of items not priced); an ok scenario is "ranked apart" only when
	// there is more than one.
	OKSets int
	sets   map[string]bool // the groups counted in OKSets
	Files  []string        // files written besides the scenario folders, sorted
	// Notes say what the run did that the user may not expect: a kept base scenario planned
	// again because its folder was not as the sweep wrote it, folders in the output folder
	// that no scenario of this sweep file has.
	Notes []string
}

// Err sums up the report as an error: nil when every scenario planned with all legs
// feasible; one wrapping ErrScenarioFailed when some scenario failed (this takes precedence);
// else one wrapping route.ErrInfeasible when some scenario has infeasible legs.
func (r *Report) Err() error {
	switch {
	case r.Failed > 0:
		first := r.Failures[0]
		return fmt.Errorf("%w: %d of %s, first %s: %s", ErrScenarioFailed, r.Failed, output.Counted(r.Run, "scenario", "scenarios"), first.ID, oneLine(first.Error))
	case r.Infeasible > 0:
		verb := " have"
		if r.Infeasible == 1 {
			verb = " has"
		}
		return infeasibleRows(fmt.Sprintf("%d of %s%s infeasible legs (the rows whose status is infeasible in compare.csv, total_cost blank and the total of the legs they serve in total_cost_served_legs_only; each folder's links.csv gives the reasons)",
			r.Infeasible, output.Counted(r.Run, "scenario", "scenarios"), verb))
	}
	return nil
}

// infeasibleRows is Err's error when scenarios have infeasible legs: its own text, wrapping
// route.ErrInfeasible (exit status 3) without repeating that error's words.
type infeasibleRows string

func (e infeasibleRows) Error() string { return string(e) }
func (e infeasibleRows) Unwrap() error { return route.ErrInfeasible }

func (r *Report) count(row Row) {
	if row.DemoPrices {
		r.DemoPrices++
	}
	if row.Status == StatusOK {
		if r.sets == nil {
			r.sets = map[string]bool{}
		}
		r.sets[row.group()] = true
		r.OKSets = len(r.sets)
	}
	switch row.Status {
	case StatusOK:
		r.OK++
		if row.Incomplete() {
			r.Incomplete++
		}
	case StatusInfeasible:
		r.Infeasible++
	default:
		r.Failed++
		r.Failures = append(r.Failures, row)
	}
}

// Check is Run's pre-flight alone (Options.Preflight) on every scenario of f: every problem
// of their inputs at once, nothing planned or written; nil when there is none. It checks the
// scenarios of a file LoadPartial returned with problems, to report theirs as well.
func Check(ctx context.Context, f *File, opt Options) error {
	r, err := newRunner(f, opt)
	if err != nil {
		return err
	}
	return r.preflight(ctx, f.Scenarios())
}

// Run plans every scenario of f in opt.Shard and writes, under opt.Out, one folder per
// scenario named by its id, then the rows file and, for a whole sweep, the comparison (see
// Compare, and opt.Compare's files). Scenario folders appear whole or not at all: each is
// written under a temporary name and renamed into place. The rows file and the comparison are
// rendered in memory and written as one set with fileset.CommitFiles: a full disk leaves none of
// them and the previous set whole; a sweep killed while renaming them into place leaves a
// journal that the next run in the folder rolls forward first. A scenario that fails is
// recorded in its row and the sweep goes on; the returned error is only for what stops the
// sweep (a file that cannot be written, or ctx cancelled: then the finished scenario folders
// stay and no rows or comparison file is written). The output is the same, byte for byte,
// whatever opt.Jobs is.
//
// Warm start: unless opt.Cold, the base scenario (the first in sweep order) is planned first,
// from scratch, and every other scenario on its network for which routing.StartPays finds it
// worth it (a routing problem beyond the optimizer's full search from scratch, and a route of
// the base for one of its links: the same hub) begins the optimizer's search from its
// routes; the others are planned from scratch, as `spanwright plan` plans them alone. The
// base's routes are read back from its routes.geojson as `spanwright plan --start-from`
// reads them (so that command reproduces a warm-started scenario alone); such a scenario's
// summary names the base (started_from) and its inputs.sha256 lists the base's
// routes.geojson. A shard without the base plans it too, without writing it, so every shard
// starts from the same routes.
func Run(ctx context.Context, f *File, opt Options) (*Report, error) {
	r, err := newRunner(f, opt)
	if err != nil {
		return nil, err
	}
	if opt.Preflight {
		if err := r.preflight(ctx, f.Scenarios()); err != nil {
			return nil, err
		}
	}
	if err := r.makeOut(); err != nil {
		return nil, err
	}
	var mine []Scenario
	for _, s := range f.Scenarios() {
		if opt.Shard.Has(s.Index) {
			mine = append(mine, s)
		}
	}
	if err := r.clean(mine); err != nil {
		return nil, err
	}
	h := rowsHeader{Format: RowsFormat, Sweep: sweepHash(f), Scenarios: len(f.Scenarios()), Keys: f.Keys(), Shard: opt.Shard.String()}
	if opt.Write.Units == output.UnitsImperial {
		h.Units = output.UnitsImperial
	}
	// Refuse before planning anything when the comparison would replace the sweep file or
	// the base plan (the files the scenarios read are checked again when it is written).
	names, err := renderRun(h, nil, opt.Shard, opt.Compare, nil)
	if err != nil {
		return nil, err
	}
	if err := fileset.CheckOverwrite(opt.Out, names, r.protect); err != nil {
		return nil, err
	}
	if err := r.planBase(ctx); err != nil {
		if ctx.Err() != nil && errors.Is(err, ctx.Err()) {
			return nil, fmt.Errorf("sweep stopped while planning the base scenario, before any scenario was written: %w", err)
		}
		return nil, err
	}
	rows, err := r.runAll(ctx, mine)
	if b := r.base; b != nil && b.out != nil {
		os.RemoveAll(b.out.stage) // not published when the sweep stopped first (published, it is gone)
	}
	r.emptyTrash()
	if n := r.formatNote(); n != "" {
		r.notes = append(r.notes, n)
	}
	if n := r.foreign(f.Scenarios()); n != "" {
		r.notes = append(r.notes, n)
	}
	rep := &Report{Scenarios: len(f.Scenarios()), Run: len(mine)}
	for i := range rows {
		if rows[i].ID == "" {
			continue // not reached before the sweep stopped
		}
		rep.count(rows[i])
	}
	rep.Skipped = r.skipped
	rep.Notes = r.notes
	if err != nil {
		return rep, err
	}
	files, err := renderRun(h, rows, opt.Shard, opt.Compare, nil)
	if err != nil {
		return rep, err
	}
	// Never replace the sweep file, the base plan or any file a scenario read (the hash
	// cache holds every one, by absolute path).
	protect := append(append([]string(nil), r.protect...), r.hashes.c.Keys()...)
	if err := fileset.CommitFiles(ctx, opt.Out, files, protect); err != nil {
		return rep, err
	}
	for _, o := range files {
		rep.Files = append(rep.Files, filepath.Join(opt.Out, o.Name))
	}
	return rep, nil
}

// renderRun renders the rows file and, for a whole sweep, the comparison and more's files.
//
// dirs, when not nil, holds each scenario's folder relative to the comparison's folder
// (Judged.Dir), by index; nil when every folder is beside the comparison.
func renderRun(h rowsHeader, rows []Row, sh Shard, more CompareFunc, dirs []string) ([]fileset.OutputFile, error) {
	data, err := encodeRows(h, rows)
	if err != nil {
		return nil, err
	}
	if !sh.Whole() {
		return []fileset.OutputFile{{Name: shardRowsFile(sh), Data: data}}, nil
	}
	files, err := Compare(rows, h.Keys, h.Units)
	if err != nil {
		return nil, err
	}
	files = append(files, fileset.OutputFile{Name: RowsFile, Data: data})
	if more == nil {
		return files, nil
	}
	c, err := judgeEncoded(data)
	if err != nil {
		return nil, err
	}
	for i := range c.Rows {
		if i < len(dirs) && dirs[i] != "" {
			c.Rows[i].Dir = dirs[i]
		}
	}
	extra, err := more(c)
	if err != nil {
		return nil, err
	}
	return append(files, extra...), nil
}

type runner struct {
	f       *File
	opt     Options
	out     string // output folder, as given
	absOut  string
	protect []string
	sites   onceCache[loaded]
	engines onceCache[*media.Engine]
	hashes  onceCache[string]
	// rebaseSweep and rebaseBase turn a file name relative to the sweep file's folder, or to
	// the base plan's, into one relative to a scenario folder.
	rebaseSweep, rebaseBase func(string) string

	// base is the warm start every scenario on the base scenario's network begins from; nil
	// when the sweep is cold or the base scenario failed. Set before the scenarios are planned
	// and only read while they are.
	base *baseStart

	// baseHubOnce and baseHubID: the base plan's hub when it names none (baseHub).
	baseHubOnce sync.Once
	baseHubID   string

	mu      sync.Mutex
	skipped int
	notes   []string // what the run did that the user may not expect (Report.Notes)
	// otherFormat holds, by index, the scenarios Resume would have kept but planned again
	// because their summary.json is not of output.SummaryFormat (resumable), each with the
	// format it has ("" for none); formatNote names them.
	otherFormat map[int]otherSummary
	// trash lists replaced scenario folders, moved aside under temporary names and removed
	// once the scenarios are done: deleting while writing slows inode allocation on some file
	// systems (journal-less ext4 scans past recently deleted inodes), and a stopped sweep's
	// leftovers are removed by clean at the next run.
	trash []string
}

// emptyTrash removes the scenario folders publish replaced.
func (r *runner) emptyTrash() {
	r.mu.Lock()
	defer r.mu.Unlock()
	for _, d := range r.trash {
		os.RemoveAll(d)
	}
	r.trash = nil
}

func newRunner(f *File, opt Options) (*runner, error) {
	if opt.Out == "" {
		return nil, fmt.Errorf("sweep: no output folder")
	}
	out, err := filepath.Abs(opt.Out)
	if err != nil {
		return nil, fmt.Errorf("output folder: %w", err)
	}
	if info, err := os.Stat(out); err == nil && !info.IsDir() {
		return nil, &fileset.OutputError{Path: opt.Out, Err: errors.New("it is a file, not a folder")}
	}
	sweepDir, err := filepath.Abs(f.Dir)
	if err != nil {
		return nil, err
	}
	baseDir, err := filepath.Abs(filepath.Dir(f.Base))
	if err != nil {
		return nil, err
	}
	rebase := func(from string) func(string) string {
		return func(p string) string {
			if filepath.IsAbs(p) {
				return filepath.ToSlash(p)
			}
			rel, err := filepath.Rel(filepath.Join(out, "scenario"), filepath.Join(from, p))
			if err != nil {
				return filepath.ToSlash(filepath.Join(from, p))
			}
			return filepath.ToSlash(rel)
		}
	}
	r := &runner{f: f, opt: opt, out: filepath.Clean(opt.Out), absOut: out, rebaseSweep: rebase(sweepDir), rebaseBase: rebase(baseDir)}
	r.protect = []string{f.Path, f.Base}
	r.sites = newOnceCache[loaded](siteCacheSize)
	r.engines = newOnceCache[*media.Engine](engineCacheSize)
	r.hashes = newOnceCache[string](hashCacheSize)
	return r, nil
}

// makeOut makes the output folder and finishes the journal of a sweep killed while putting
// its comparison in place.
func (r *runner) makeOut() error {
	if err := os.MkdirAll(r.absOut, 0o755); err != nil {
		return &fileset.OutputError{Path: r.opt.Out, Err: err}
	}
	return fileset.RecoverFiles(r.absOut)
}

// foreign returns a note naming the scenario folders in the output folder (folders holding a
// plan.yaml) that are no scenario of this sweep: left by an earlier sweep file under
// --resume. The comparison leaves them out; they are not removed (they may be wanted). ""
// when there are none.
func (r *runner) foreign(all []Scenario) string {
	ents, err := os.ReadDir(r.out)
	if err != nil {
		return ""
	}
	ids := make(map[string]bool, len(all))
	for _, s := range all {
		ids[s.ID] = true
	}
	var names []string
	for _, e := range ents {
		n := e.Name()
		if !e.IsDir() || strings.HasPrefix(n, ".") || ids[n] {
			continue
		}
		if _, err := os.Stat(filepath.Join(r.out, n, PlanFile)); err == nil {
			names = append(names, n)
		}
	}
	if len(names) == 0 {
		return ""
	}
	shown, more := input.Shown(names, 5)
	verb := "are"
	if len(names) == 1 {
		verb = "is"
	}
	return fmt.Sprintf("%s in %s %s no scenario of this sweep (left by an earlier sweep file?): %s%s; the comparison leaves them out",
		output.Counted(len(names), "folder", "folders"), r.opt.Out, verb, strings.Join(shown, ", "), more)
}

// tmpPrefix starts the name of a scenario folder being written; the id follows (it may hold
// dots: snap_m-0.5), then a dot and os.MkdirTemp's digits.
const tmpPrefix = ".tmp-"

// clean removes what a sweep stopped by force (power cut, kill -9) left of this run's
// scenario folders: temporary folders, whose names hold the scenario id. Other shards'
// scenarios are not touched, so shards may share the output folder.
func (r *runner) clean(mine []Scenario) error {
	ents, err := os.ReadDir(r.out)
	if err != nil {
		return err
	}
	ids := make(map[string]bool, len(mine))
	for _, s := range mine {
		ids[s.ID] = true
	}
	for _, e := range ents {
		n := e.Name()
		if !e.IsDir() || !strings.HasPrefix(n, tmpPrefix) {
			continue
		}
		rest := strings.TrimPrefix(n, tmpPrefix)
		dot := strings.LastIndexByte(rest, '.')
		if dot > 0 && ids[rest[:dot]] {
			if err := os.RemoveAll(filepath.Join(r.out, n)); err != nil {
				return err
			}
		}
	}
	return nil
}

// writersPerJob is how many scenario folders may be written at once per planning worker:
// writing waits on the file system, so it runs beside the planning.
const writersPerJob = 4

// outcome is a planned scenario: its row and the folder to write (nil when kept as it was).
type outcome struct {
	row     Row
	files   []fileset.OutputFile
	skipped bool // kept as it was (Options.Resume)
	// stage is the scenario's staging folder (runner.stage), made before its files were
	// rendered so that their scratch files went there; publish puts it in place. "" when
	// none was made (kept, or failed before planning).
	stage string
}

// runAll plans the scenarios on a pool of workers, writes their folders on a pool of writers,
// and returns their rows in order; a row left zero was not reached before the sweep stopped.
func (r *runner) runAll(ctx context.Context, list []Scenario) ([]Row, error) {
	jobs := r.opt.Jobs
	if jobs <= 0 {
		jobs = runtime.NumCPU()
	}
	jobs = max(1, min(jobs, len(list)))
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	type result struct {
		pos int
		row Row
		err error
	}
	next := make(chan int)
	results := make(chan result, jobs)
	writers := make(chan struct{}, jobs*writersPerJob)
	var wg sync.WaitGroup
	for w := 0; w < jobs; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for pos := range next {
				out, err := r.planned(ctx, list[pos])
				if out.skipped {
					r.mu.Lock()
					r.skipped++
					r.mu.Unlock()
				}
				if err != nil || out.files == nil {
					results <- result{pos, out.row, err}
					continue
				}
				writers <- struct{}{}
				wg.Add(1)
				go func() {
					defer wg.Done()
					err := r.publish(out.row.ID, out.stage, out.files)
					<-writers
					results <- result{pos, out.row, err}
				}()
			}
		}()
	}
	go func() {
		defer close(next)
		for pos := range list {
			select {
			case next <- pos:
			case <-ctx.Done():
				return
			}
		}
	}()
	go func() { wg.Wait(); close(results) }()

	rows := make([]Row, len(list))
	var firstErr error
	var prog Progress
	prog.Total = len(list)
	for res := range results {
		if res.err != nil {
			if firstErr == nil {
				firstErr = res.err
				cancel()
			}
			continue
		}
		rows[res.pos] = res.row
		prog.Done++
		if res.row.Status == StatusFailed {
			prog.Failed++
		}
		if r.opt.Progress != nil {
			r.mu.Lock()
			prog.Skipped = r.skipped
			r.mu.Unlock()
			r.opt.Progress(prog)
		}
	}
	if firstErr == nil {
		firstErr = ctx.Err()
	}
	if firstErr != nil {
		if errors.Is(firstErr, context.Canceled) || errors.Is(firstErr, context.DeadlineExceeded) {
			return rows, fmt.Errorf("sweep stopped after %d of %d scenarios (finished scenario folders are kept; run again with --resume): %w", prog.Done, len(list), firstErr)
		}
		return rows, firstErr
	}
	return rows, nil
}

// scenario plans one scenario and renders its folder, or with resume keeps a folder of the
// same inputs (outcome.skipped). The error is for what must stop the sweep; a scenario's own
// failure is in the row.
func (r *runner) scenario(ctx context.Context, sc Scenario, resume bool) (outcome, error) {
	out := outcome{row: newRow(sc)}
	if err := ctx.Err(); err != nil {
		return out, err
	}
	dir := filepath.Join(r.out, sc.ID)
	planPath := filepath.Join(dir, PlanFile)
	planData, err := r.planYAML(sc)
	if err != nil {
		return out, err
	}
	fail := func(err error) (outcome, error) {
		// Messages name the scenario's plan by its id, whatever the output folder, so the
		// rows of shards written to different folders merge into the same bytes.
		out.row.fail(errors.New(strings.ReplaceAll(err.Error(), dir+string(filepath.Separator), sc.ID+"/")))
		out.files = []fileset.OutputFile{{Name: PlanFile, Data: planData}, {Name: ErrorFile, Data: []byte(escape.Visible(out.row.Error) + "\n")}}
		return out, nil
	}
	p, err := plan.ParsePlanOptions(planPath, planData, plan.LoadOptions{CampusDatabase: r.opt.CampusDatabase})
	if err != nil {
		return fail(err)
	}
	p.MaxInputBytes = r.f.MaxInputBytes
	// The base's routes, when the scenario may start from them: SolveFrom decides whether it
	// does (routing.Start.WherePays), on the problem it builds. Its plan.yaml and
	// inputs.sha256 say which (startFiles); where that must be known without planning (a
	// folder kept by resume, a scenario that fails) route.WarmStart makes the same decision.
	start := r.startOf(sc, p)
	startsWarm := func() bool { return start != nil && (!start.WherePays || r.warmStart(p, start)) }
	coldPlan := planData
	planData, inputs, err := r.startFiles(sc, p, coldPlan, false)
	if err != nil {
		if startsWarm() {
			planData = warmHeader(coldPlan, sc.ID, r.base.id)
		}
		return fail(err)
	}
	// A database has no file to hash: a scenario that reads one is planned again.
	if resume && p.CampusDatabase == "" {
		s, ok := output.Summary{}, false
		if start != nil {
			// A folder of a warm start from these very routes (their hash is among its inputs)
			// was decided warm on the same inputs, so it would be again.
			if _, warm, err := r.startFiles(sc, p, coldPlan, true); err == nil {
				s, ok = r.resumable(sc, dir, warm)
			}
		}
		if !ok {
			s, ok = r.resumable(sc, dir, inputs)
			ok = ok && !startsWarm()
		}
		if ok {
			out.row.fill(s)
			out.row.Report = htmlIn(dir)
			out.skipped = true
			return out, nil
		}
	}
	site, err := r.site(p)
	if err != nil {
		return fail(err)
	}
	eng, err := r.engine(p)
	if err != nil {
		return fail(err)
	}
	res, err := route.SolveFrom(ctx, site, p, eng, start)
	if err != nil {
		if ctx.Err() != nil {
			return out, ctx.Err()
		}
		if startsWarm() {
			planData = warmHeader(coldPlan, sc.ID, r.base.id)
		}
		return fail(err)
	}
	if res.StartedFrom != "" {
		if planData, inputs, err = r.startFiles(sc, p, coldPlan, true); err != nil {
			return fail(err)
		}
	}
	if !r.opt.Shard.Has(sc.Index) {
		// Another shard's scenario (the base, planned by every shard for its warm start):
		// nothing of it is written here, and only its routes are read (planBase).
		files, err := routesOnly(ctx, res, r.opt.Write)
		if ctx.Err() != nil {
			return out, ctx.Err()
		}
		if err != nil {
			return fail(err)
		}
		out.row.fill(output.Summarize(res))
		out.files = files
		return out, nil
	}
	// The renderers' scratch files (plan.gpkg is built in one) go into the scenario's staging
	// folder, as `spanwright plan`'s go into its set's: never into the system's temporary
	// folder, and what a killed sweep leaves there the next run clears. Only this shard's
	// scenarios have one: clean, at another shard's start, removes the staging folders of
	// that shard's scenarios.
	if out.stage, err = r.stage(sc.ID); err != nil {
		return out, err
	}
	stop := func(err error) (outcome, error) {
		os.RemoveAll(out.stage)
		out.stage = ""
		return out, err
	}
	rctx := fileset.WithScratchDir(ctx, out.stage)
	files, err := output.Files(rctx, res, r.opt.Write)
	if ctx.Err() != nil {
		return stop(ctx.Err())
	}
	if err != nil {
		return fail(err)
	}
	if r.opt.Extra != nil {
		more, err := r.opt.Extra(rctx, res)
		if ctx.Err() != nil {
			return stop(ctx.Err())
		}
		if err != nil {
			return fail(fmt.Errorf("extra outputs: %w", err))
		}
		files = append(files, more...)
	}
	files = append(files, outputsFile(files), fileset.OutputFile{Name: PlanFile, Data: planData}, fileset.OutputFile{Name: InputsFile, Data: inputs})
	seen := map[string]bool{}
	for _, o := range files {
		if seen[o.Name] || o.Name == ErrorFile {
			return fail(fmt.Errorf("two outputs named %s", o.Name))
		}
		seen[o.Name] = true
	}
	out.row.fill(output.Summarize(res))
	for _, o := range files {
		if strings.HasSuffix(o.Name, ".html") && out.row.Report == "" {
			out.row.Report = o.Name
		}
	}
	out.files = files
	return out, nil
}

// routesOnly renders a planned scenario's routes file alone, as output.Files renders it.
func routesOnly(ctx context.Context, res *route.Result, opt output.WriteOptions) ([]fileset.OutputFile, error) {
	for _, f := range output.Outputs(res, opt) {
		if f.Name == output.RoutesFile {
			var buf bytes.Buffer
			if err := f.Render(ctx, &buf); err != nil {
				return nil, err
			}
			return []fileset.OutputFile{{Name: f.Name, Data: buf.Bytes()}}, nil
		}
	}
	panic("sweep: no " + output.RoutesFile + " among the outputs")
}

// planYAML renders the scenario's plan: the base plan with file names made relative to the
// scenario folder and the overrides applied, headed by a comment naming the scenario. What the
// sweep changed beyond the overrides (carryHubLink) is among its notes (plan.Plan.Notes).
func (r *runner) planYAML(sc Scenario) ([]byte, error) {
	doc := cloneNode(r.f.baseDoc)
	root := doc.Content[0]
	rebasePlanPaths(root, r.rebaseBase)
	apply(root, sc.Set, r.rebaseSweep)
	carryHubLink(root, r.f.baseDoc.Content[0], r.baseHub())
	head := "scenario " + sc.ID + ": " + escape.Visible(sc.Describe()) // YAML comments allow no control characters
	if b := builtIns(root); b != "" {
		// Part of the plan's bytes, so a resumed sweep plans again when a new build changes
		// the embedded files this scenario reads.
		head += "\n" + b
	}
	if u := r.opt.Write.Units; u != "" && u != output.UnitsMetric {
		// Part of the plan's bytes, so a resumed sweep in other units plans again.
		head += "\noutputs written in " + u + " units"
	}
	doc.HeadComment = strings.TrimSpace(head + "\n" + doc.HeadComment)
	var b bytes.Buffer
	enc := yaml.NewEncoder(&b)
	enc.SetIndent(2)
	if err := enc.Encode(doc); err != nil {
		return nil, fmt.Errorf("scenario %s: %w", sc.ID, err)
	}
	if err := enc.Close(); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

// builtIns names, with their SHA-256, the embedded files a plan reads because it names no
// catalog, rule file or price book of its own; "" when it names all three.
func builtIns(root *yaml.Node) string {
	named := map[string]bool{}
	for i := 0; i+1 < len(root.Content); i += 2 {
		if v := root.Content[i+1]; v.Kind == yaml.ScalarNode && v.Value != "" && v.Tag != "!!null" {
			named[root.Content[i].Value] = true
		}
	}
	cat, rules, prices := media.EmbeddedSHA256()
	var parts []string
	for _, f := range []struct{ key, sum string }{{"catalog", cat}, {"rules", rules}, {"prices", prices}} {
		if !named[f.key] {
			parts = append(parts, "built-in "+f.key+" sha256 "+f.sum[:16])
		}
	}
	return strings.Join(parts, ", ")
}

// cloneNode copies a YAML node tree deeply; alias nodes point into the copy.
func cloneNode(n *yaml.Node) *yaml.Node {
	copies := map[*yaml.Node]*yaml.Node{}
	var clone func(*yaml.Node) *yaml.Node
	clone = func(n *yaml.Node) *yaml.Node {
		if n == nil {
			return nil
		}
		if c, ok := copies[n]; ok {
			return c
		}
		c := *n
		copies[n] = &c
		if n.Content != nil {
			c.Content = make([]*yaml.Node, len(n.Content))
			for i, k := range n.Content {
				c.Content[i] = clone(k)
			}
		}
		c.Alias = clone(n.Alias)
		return &c
	}
	return clone(n)
}

// startFiles returns the scenario's plan.yaml and inputs.sha256 from planData, its plan as
// planYAML renders it: with warm, as a scenario started from the base's routes writes them
// (warmHeader, and the base's routes.geojson among the inputs: a new base plans it again).
func (r *runner) startFiles(sc Scenario, p *plan.Plan, planData []byte, warm bool) ([]byte, []byte, error) {
	if warm {
		planData = warmHeader(planData, sc.ID, r.base.id)
	}
	inputs, err := r.inputsFile(p, planData)
	if err != nil {
		return planData, nil, err
	}
	if warm {
		inputs = append(inputs, sumLine(r.base.routesSum, "../"+r.base.id+"/"+output.RoutesFile)...)
	}
	return planData, inputs, nil
}

// inputsFile renders inputs.sha256 in the format of GNU sha256sum: one "hash  name" line
// for the scenario's plan, then for every file it reads (campus files, catalog, rules, price
// book), named as the plan names them, relative to the scenario folder; so
// `sha256sum -c inputs.sha256` run in the folder checks them.
func (r *runner) inputsFile(p *plan.Plan, planData []byte) ([]byte, error) {
	var b bytes.Buffer
	sum := sha256.Sum256(planData)
	b.WriteString(sumLine(hex.EncodeToString(sum[:]), PlanFile))
	names := append([]string(nil), p.Campus...)
	for _, f := range []string{p.Catalog, p.Rules, p.Prices} {
		if f != "" {
			names = append(names, f)
		}
	}
	for _, n := range names {
		h, err := r.hash(p.Path(n))
		if err != nil {
			return nil, err
		}
		b.WriteString(sumLine(h, n))
	}
	return b.Bytes(), nil
}

// sumEscaper writes a file name as GNU sha256sum does when the name holds a backslash, line
// feed or carriage return.
var sumEscaper = strings.NewReplacer(`\`, `\\`, "\n", `\n`, "\r", `\r`)

// sumLine is one line of a sha256sum file: "hash  name", or, as GNU coreutils writes a
// name holding a backslash, line feed or carriage return, a backslash, the hash and the name
// with those escaped, so a name can neither break the line nor add one.
func sumLine(hash, name string) string {
	if strings.ContainsAny(name, "\\\n\r") {
		return `\` + hash + "  " + sumEscaper.Replace(name) + "\n"
	}
	return hash + "  " + name + "\n"
}

// resumable reports whether the scenario folder holds a finished plan of the same inputs, and
// its summary: its inputs.sha256 equal to inputs, its summary.json of output.SummaryFormat,
// and every file this run would write there (output.Names for its write options and its
// bill, and a report when Options.Extra is set), so that a file removed by hand, or a run
// with --full after one without, plans the scenario again. A summary.json of another format
// (an earlier spanwright's, whose gap was a fraction and whose budget_cents was 0 for no
// budget) is never read as this one: the scenario is planned again, its folder rewritten in
// this version's formats, and formatNote says so.
func (r *runner) resumable(sc Scenario, dir string, inputs []byte) (output.Summary, bool) {
	var s output.Summary
	old, err := os.ReadFile(filepath.Join(dir, InputsFile))
	if err != nil || !bytes.Equal(old, inputs) {
		return s, false
	}
	data, err := os.ReadFile(filepath.Join(dir, SummaryFile))
	if err != nil {
		return s, false
	}
	var head struct {
		Format string `json:"format"`
	}
	if json.Unmarshal(data, &head) != nil {
		return s, false
	}
	if head.Format != output.SummaryFormat {
		r.mu.Lock()
		if r.otherFormat == nil {
			r.otherFormat = map[int]otherSummary{}
		}
		r.otherFormat[sc.Index] = otherSummary{id: sc.ID, format: head.Format}
		r.mu.Unlock()
		return s, false
	}
	if json.Unmarshal(data, &s) != nil {
		return s, false
	}
	for _, name := range append(output.Names(r.opt.Write, s.HasBill()), PlanFile, OutputsFile) {
		if fi, err := os.Stat(filepath.Join(dir, name)); err != nil || !fi.Mode().IsRegular() {
			return s, false
		}
	}
	if r.opt.Extra != nil && htmlIn(dir) == "" {
		return s, false
	}
	return s, true
}

// otherSummary is a scenario whose summary.json is not of output.SummaryFormat.
type otherSummary struct {
	id     string
	format string // the format it has; "" when it has none (written before summary.json had one)
}

// formatNote says which scenarios of this run --resume planned again because their
// summary.json is of another format than this version's (resumable); "" when none. The
// scenarios are named in index order, the first five of them.
func (r *runner) formatNote() string {
	r.mu.Lock()
	defer r.mu.Unlock()
	var idx []int
	for i := range r.otherFormat {
		if r.opt.Shard.Has(i) { // a base of another shard is planned here but not written
			idx = append(idx, i)
		}
	}
	if len(idx) == 0 {
		return ""
	}
	slices.Sort(idx)
	var all []string
	for _, i := range idx {
		all = append(all, r.otherFormat[i].id)
	}
	ids, more := input.Shown(all, 5)
	their, has, is := "its summary.json", "has", "is"
	if len(idx) > 1 {
		their, has, is = "their summary.json files", "have", "are"
	}
	what := fmt.Sprintf("%s no format member (written by an earlier spanwright", has)
	if f := r.otherFormat[idx[0]].format; f != "" {
		what = fmt.Sprintf("%s of format %q (written by another version", is, f)
	}
	return fmt.Sprintf("%s planned again, not kept: %s %s; this one writes %q): %s%s",
		output.Counted(len(idx), "scenario", "scenarios"), their, what, output.SummaryFormat, strings.Join(ids, ", "), more)
}

// htmlIn names the first HTML file (by name) in a scenario folder, "" when there is none.
func htmlIn(dir string) string {
	ents, err := os.ReadDir(dir)
	if err != nil {
		return ""
	}
	for _, e := range ents { // sorted by name
		if e.Type().IsRegular() && strings.HasSuffix(e.Name(), ".html") {
			return e.Name()
		}
	}
	return ""
}

// stage makes the staging folder of scenario id in the output folder (tmpPrefix, the id, a
// dot, digits: clean removes it after a killed run). Failures are *fileset.OutputError
// naming the scenario folder.
func (r *runner) stage(id string) (string, error) {
	tmp, err := os.MkdirTemp(r.out, tmpPrefix+id+".")
	if err == nil {
		if err = os.Chmod(tmp, 0o755); err != nil {
			os.RemoveAll(tmp)
		}
	}
	if err != nil {
		return "", fmt.Errorf("scenario %s: %w", id, &fileset.OutputError{Path: filepath.Join(r.out, id), Err: err})
	}
	return tmp, nil
}

// publish writes a scenario folder whole: the files go into its staging folder (stage, or a
// new one when "") with fileset.WriteFresh, which is then renamed to the scenario id,
// replacing an older folder. Failures are *fileset.OutputError naming the scenario folder;
// the staging folder is removed.
func (r *runner) publish(id, stage string, files []fileset.OutputFile) error {
	final := filepath.Join(r.out, id)
	tmp := stage
	fail := func(err error) error {
		var oe *fileset.OutputError
		if errors.As(err, &oe) {
			if rest, ok := strings.CutPrefix(oe.Path, tmp); ok && tmp != "" {
				oe.Path = final + rest // name the place the user knows, not the temporary folder
			}
			return fmt.Errorf("scenario %s: %w", id, err)
		}
		return fmt.Errorf("scenario %s: %w", id, &fileset.OutputError{Path: final, Err: err})
	}
	if tmp == "" {
		var err error
		if tmp, err = r.stage(id); err != nil {
			return err
		}
	}
	if err := fileset.WriteFresh(tmp, files); err != nil {
		os.RemoveAll(tmp)
		return fail(err)
	}
	err := os.Rename(tmp, final)
	if err != nil {
		// An older folder is in the way: move it aside, put the new one in place, and drop
		// the old one when the scenarios are done (see runner.trash).
		old := tmp + "-old"
		if err2 := os.Rename(final, old); err2 != nil {
			os.RemoveAll(tmp)
			return fail(err)
		}
		if err = os.Rename(tmp, final); err != nil {
			os.Rename(old, final)
			os.RemoveAll(tmp)
			return fail(err)
		}
		r.mu.Lock()
		r.trash = append(r.trash, old)
		r.mu.Unlock()
	}
	return nil
}

// onceCache builds each value once per key and keeps the most recently used few, so that a
// sweep over many campus variants or price books keeps its memory flat; a value dropped and
// asked for again is built again, with the same result. It is safe for concurrent use:
// callers asking for the same key at once share one build.
type onceCache[V any] struct {
	c *lru.Cache[string, *onceEntry[V]]
}

type onceEntry[V any] struct {
	once sync.Once
	v    V
	err  error
}

func newOnceCache[V any](size int) onceCache[V] {
	c, _ := lru.New[string, *onceEntry[V]](size) // errs only on a size <= 0
	return onceCache[V]{c: c}
}

func (c onceCache[V]) get(key string, build func() (V, error)) (V, error) {
	e, ok := c.c.Get(key)
	if !ok {
		e = &onceEntry[V]{}
		if prev, found, _ := c.c.PeekOrAdd(key, e); found {
			e = prev
		}
	}
	e.once.Do(func() { e.v, e.err = build() })
	return e.v, e.err
}

// Bounds of the runner's caches: sites are large and a sweep rarely varies the campus;
// engines (a catalog, rules and a price book each) are smaller and price books are a common
// axis; file hashes are tiny.
const (
	siteCacheSize   = 4
	engineCacheSize = 32
	hashCacheSize   = 4096
)

// baseHub is the hub of a base plan that names none: the campus's building with role mc, as
// site.Site.Hub takes it; "" when the plan names one (carryHubLink reads it then) or when its
// campus does not load or has no mc (the scenario's own planning reports that). Review 17 F2:
// without it a sweep over the hub of such a plan dropped the diverse hub link silently.
func (r *runner) baseHub() string {
	r.baseHubOnce.Do(func() {
		if v := lookup(r.f.baseDoc.Content[0], "hub"); v != nil && v.Kind == yaml.ScalarNode && v.Tag != "!!null" {
			return
		}
		p, err := plan.ParsePlanOptions(r.f.Base, r.f.baseData, plan.LoadOptions{CampusDatabase: r.opt.CampusDatabase})
		if err != nil {
			return
		}
		p.MaxInputBytes = r.f.MaxInputBytes
		s, err := r.site(p)
		if err != nil {
			return
		}
		r.baseHubID = s.MainCrossConnect()
	})
	return r.baseHubID
}

// site returns the site of the plan's campus files and noding options, built once and
// shared read-only.
func (r *runner) site(p *plan.Plan) (*site.Site, error) {
	l, err := r.load(p)
	return l.site, err
}

// load returns the site of the plan's campus files as site does, and, when the campus has
// problems, the buildings that did read (site.LoadRead), built once and shared read-only.
func (r *runner) load(p *plan.Plan) (loaded, error) {
	files, opt, key := siteOf(p)
	// The site is shared by every scenario that reads it and kept with its error, so no one
	// scenario's stop may end its building: it is built to the end.
	return r.sites.get(key, func() (loaded, error) {
		s, read, err := site.LoadRead(context.Background(), nil, files, opt)
		return loaded{s, read}, err
	})
}

// loaded is a site as the runner's cache keeps it: the site, or, for a campus with problems,
// the buildings that did read (nil when not known).
type loaded struct {
	site *site.Site
	read *geo.Partial
}

// siteOf is what site.Load reads for the plan: its campus files, the options, and a key that
// is the same for two plans exactly when those are.
func siteOf(p *plan.Plan) ([]string, site.Options, string) {
	files := make([]string, len(p.Campus))
	for i, f := range p.Campus {
		files[i] = p.Path(f)
	}
	opt := site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM, MaxInputBytes: p.MaxInputBytes,
		Database: p.CampusDatabase}
	var key strings.Builder
	for _, f := range files {
		abs, err := filepath.Abs(f)
		if err != nil {
			abs = f
		}
		key.WriteString(abs + "\x00")
	}
	key.WriteString(strconv.FormatFloat(opt.SnapM, 'g', -1, 64) + "\x00" + strconv.FormatFloat(opt.MaxLateralM, 'g', -1, 64))
	key.WriteString("\x00" + opt.Database)
	return files, opt, key.String()
}

// hash returns the SHA-256 of an input file, read once per sweep.
func (r *runner) hash(path string) (string, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		abs = path
	}
	return r.hashes.get(abs, func() (string, error) {
		data, err := input.ReadFile(path, input.Cap(r.f.MaxInputBytes, input.DefaultDataMiB))
		if err != nil {
			return "", err
		}
		sum := sha256.Sum256(data)
		return hex.EncodeToString(sum[:]), nil
	})
}

// engine returns the media engine of the plan's catalog, rule and price files and engine
// options (plan.Engine reads only those), built once and shared: an engine is safe for
// concurrent use.
func (r *runner) engine(p *plan.Plan) (*media.Engine, error) {
	var key strings.Builder
	for _, f := range []string{p.Catalog, p.Rules, p.Prices} {
		if f != "" {
			if abs, err := filepath.Abs(p.Path(f)); err == nil {
				f = abs
			}
		}
		key.WriteString(f + "\x00")
	}
	fmt.Fprintf(&key, "%#v", plan.EngineOptions(p))
	return r.engines.get(key.String(), func() (*media.Engine, error) { return plan.Engine(p) })
}
