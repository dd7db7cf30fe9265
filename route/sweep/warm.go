package sweep

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"syscall"

	"spanwright/geo/input"
	"spanwright/route"
	"spanwright/route/fileset"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/routing"
)

// baseStart is the base scenario's plan as the warm start of the others (Run).
type baseStart struct {
	index   int    // the base scenario's index (0)
	id      string // its id: its folder's name
	siteKey string // its site (siteOf): a scenario on another starts from scratch
	// start is its routes, read back from its routes.geojson as `plan --start-from` reads
	// them; nil when the base scenario failed.
	start *routing.Start
	// routesSum is the SHA-256 of its routes.geojson, listed in the inputs.sha256 of every
	// scenario that starts from it.
	routesSum string
	// out is its own outcome when it belongs to this run (the shard's), to be written as is.
	out *outcome
}

// planBase plans the base scenario from scratch, as `spanwright plan` plans it, and keeps
// its routes as the warm start of the scenarios after it (runner.base); nothing when the
// sweep is cold or has one scenario. With Options.Resume a base folder of the same inputs is
// read instead of planned. Its error is for what must stop the sweep.
func (r *runner) planBase(ctx context.Context) error {
	all := r.f.Scenarios()
	if r.opt.Cold || len(all) < 2 {
		return nil
	}
	sc := all[0]
	out, err := r.scenario(ctx, sc, r.opt.Resume)
	if err != nil {
		return err
	}
	b := &baseStart{index: sc.Index, id: sc.ID}
	if r.opt.Shard.Has(sc.Index) {
		b.out = &out
	}
	r.base = b
	if out.row.Status == StatusFailed {
		return nil // no start: every scenario plans from scratch, as the base's row says why
	}
	dir := filepath.Join(r.out, sc.ID)
	path := filepath.Join(dir, output.RoutesFile)
	var routes []byte
	var st *routing.Start
	if out.skipped {
		routes, err = input.ReadFile(path, input.Cap(r.f.MaxInputBytes, input.DefaultDataMiB))
		if err == nil {
			st, err = output.ParseStart(path, routes)
		}
		if err == nil && !outputsIntact(dir) {
			err = errChanged
		}
		if err != nil {
			// Its folder is not whole, or not as the sweep wrote it (a routes.geojson edited by
			// hand would steer every warm scenario): plan it (and write it, when it is this run's).
			why := "its outputs are not those its " + OutputsFile + " lists (edited or removed by hand?)"
			if !errors.Is(err, errChanged) {
				why = err.Error()
			}
			r.notes = append(r.notes, fmt.Sprintf("base scenario %s planned again: %s; the warm scenarios start from it as the sweep planned it", sc.ID, why))
			if out, err = r.scenario(ctx, sc, false); err != nil {
				return err
			}
			if b.out != nil {
				b.out = &out
			}
			if out.row.Status == StatusFailed {
				return nil
			}
			routes, st = nil, nil
		}
	}
	if st == nil {
		for _, o := range out.files {
			if o.Name == output.RoutesFile {
				routes = o.Data
			}
		}
		if st, err = output.ParseStart(path, routes); err != nil {
			return fmt.Errorf("sweep: base scenario %s: its own routes: %w", sc.ID, err) // a bug: the writer and the reader disagree
		}
	}
	st.From, st.WherePays = sc.ID, !r.opt.warmAlways
	planData, err := r.planYAML(sc)
	if err != nil {
		return err
	}
	p, err := plan.ParsePlanOptions(filepath.Join(dir, PlanFile), planData, plan.LoadOptions{CampusDatabase: r.opt.CampusDatabase})
	if err != nil {
		return fmt.Errorf("sweep: base scenario %s: %w", sc.ID, err) // it planned, so it parses
	}
	sum := sha256.Sum256(routes)
	_, _, b.siteKey = siteOf(p)
	b.start, b.routesSum = st, hex.EncodeToString(sum[:])
	return nil
}

// planned is the scenario's outcome: the base scenario's as planBase planned it, or planned
// now.
func (r *runner) planned(ctx context.Context, sc Scenario) (outcome, error) {
	if b := r.base; b != nil && b.out != nil && sc.Index == b.index {
		return *b.out, nil
	}
	return r.scenario(ctx, sc, r.opt.Resume)
}

// startOf is the warm start scenario sc with plan p may begin from: the base's routes when sc
// is another scenario on the base's site, nil otherwise (the scenario is then planned from
// scratch, as `spanwright plan` plans it alone and --cold does). Those routes carry
// WherePays (planBase): SolveFrom starts from them only where routing.StartPays finds it
// worth it (a problem too large for the optimizer's full search from scratch, and a start
// with a route for some link of the scenario), on the problem it builds.
func (r *runner) startOf(sc Scenario, p *plan.Plan) *routing.Start {
	b := r.base
	if b == nil || b.start == nil || sc.Index == b.index {
		return nil
	}
	if _, _, key := siteOf(p); key != b.siteKey {
		return nil
	}
	return b.start
}

// warmStart reports whether scenario plan p starts from start, as SolveFrom would decide it
// (route.WarmStart), for where that must be known without planning; a site or engine that
// does not load gives false, and the scenario fails where it would have failed anyway.
func (r *runner) warmStart(p *plan.Plan, start *routing.Start) bool {
	site, err := r.site(p)
	if err != nil {
		return false
	}
	eng, err := r.engine(p)
	if err != nil {
		return false
	}
	return route.WarmStart(site, p, eng, start) != nil
}

// warmHeader returns a warm-started scenario's plan.yaml with, after its first line (the
// comment naming the scenario), the lines that say where the optimizer's search began and
// how `spanwright plan --start-from` reproduces the scenario alone. OUT stands for the
// sweep's --out as it was given, so that the bytes do not depend on it (shards written to
// different folders agree).
func warmHeader(planData []byte, id, base string) []byte {
	head := "# warm start: the optimizer's search began from the routes of the base scenario " + base + "\n" +
		"# (summary.json: started_from); to plan this scenario alone, byte for byte, run where the\n" +
		"# sweep ran, with OUT its --out as given:\n" +
		"#   spanwright plan OUT/" + id + "/" + PlanFile + " --start-from OUT/" + base + " --out DIR\n"
	i := bytes.IndexByte(planData, '\n') + 1 // the first line is the scenario's comment (planYAML)
	out := make([]byte, 0, len(planData)+len(head))
	out = append(append(append(out, planData[:i]...), head...), planData[i:]...)
	return out
}

// errChanged says that a kept scenario folder's files are not those its outputs.sha256 lists.
var errChanged = errors.New("changed since it was written")

// outputsFile is outputs.sha256 for a scenario's outputs (files: the plan's and Extra's, not
// plan.yaml and inputs.sha256, whose bytes name files relative to the output folder and which
// inputs.sha256 covers): one line per file, sorted by name, in the format of GNU sha256sum, so
// `sha256sum -c outputs.sha256` in the folder checks them.
func outputsFile(files []fileset.OutputFile) fileset.OutputFile {
	files = slices.SortedFunc(slices.Values(files), func(a, b fileset.OutputFile) int { return strings.Compare(a.Name, b.Name) })
	var b bytes.Buffer
	for _, f := range files {
		sum := sha256.Sum256(f.Data)
		b.WriteString(sumLine(hex.EncodeToString(sum[:]), f.Name))
	}
	return fileset.OutputFile{Name: OutputsFile, Data: b.Bytes()}
}

// outputsIntact reports whether the scenario folder dir holds an outputs.sha256 whose every
// file is there with its hash: false for a file edited or removed by hand, and for a folder
// written before outputs.sha256 existed. The files are the sweep's own outputs, hashed as
// streams (fileSum): the input cap (--max-input-mb) is not theirs, and a small one must not
// pass for a hand edit.
func outputsIntact(dir string) bool {
	list, err := input.ReadFile(filepath.Join(dir, OutputsFile), input.Cap(0, input.DefaultTextMiB))
	if err != nil || len(list) == 0 {
		return false
	}
	for _, line := range strings.Split(strings.TrimSuffix(string(list), "\n"), "\n") {
		want, name, ok := strings.Cut(line, "  ")
		if !ok || strings.ContainsAny(name, "/\\") || name == "" {
			return false // the sweep names only files of the folder itself, plainly
		}
		if sum, err := fileSum(filepath.Join(dir, name)); err != nil || sum != want {
			return false
		}
	}
	return true
}

// fileSum returns the SHA-256, in hex, of the regular file at path, read as a stream
// whatever its size; anything but a regular file is an error (O_NONBLOCK: a named pipe in
// its place must not wait for a writer).
func fileSum(path string) (string, error) {
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if err != nil {
		return "", err
	}
	defer f.Close()
	if st, err := f.Stat(); err != nil {
		return "", err
	} else if !st.Mode().IsRegular() {
		return "", fmt.Errorf("%s: not a regular file", path)
	}
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", err
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}
