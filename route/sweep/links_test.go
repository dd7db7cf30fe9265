package sweep

import (
	"context"
	"errors"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"spanwright/route"
	"spanwright/route/fileset"
)

// TestScenarioLinks checks the folder and report each comparison row points at: relative to
// the comparison's folder, to the report when the scenario wrote one (Options.Extra), and
// still resolving after a merge of shards into another folder (RFC 3986 §5.2 resolution of a
// relative reference, done here with net/url as a browser does for compare.html's links),
// including shard folders whose names need escaping.
func TestScenarioLinks(t *testing.T) {
	t.Parallel()
	f := load(t, "small.yaml")
	extra := func(context.Context, *route.Result) ([]fileset.OutputFile, error) {
		return []fileset.OutputFile{{Name: "report.html", Data: []byte("<!DOCTYPE html>\n")}}, nil
	}
	var got *Comparison
	capture := func(c *Comparison) ([]fileset.OutputFile, error) { got = c; return nil, nil }
	check := func(what, out string, want func(j Judged) string) {
		t.Helper()
		base, err := url.Parse("file://" + filepath.ToSlash(out) + "/compare.html")
		if err != nil {
			t.Fatal(err)
		}
		planned := 0
		for _, j := range got.Rows {
			if j.Status == StatusFailed {
				continue
			}
			planned++
			if j.Report != "report.html" {
				t.Errorf("%s: %s: report %q, want report.html", what, j.ID, j.Report)
			}
			if j.Dir != want(j) {
				t.Errorf("%s: %s: dir %q, want %q", what, j.ID, j.Dir, want(j))
			}
			ref, err := url.Parse(j.Dir + "/" + j.Report)
			if err != nil {
				t.Fatalf("%s: %s: %v", what, j.ID, err)
			}
			if _, err := os.Stat(filepath.FromSlash(base.ResolveReference(ref).Path)); err != nil {
				t.Errorf("%s: %s: link %s does not resolve from %s: %v", what, j.ID, ref, out, err)
			}
		}
		if planned == 0 {
			t.Fatalf("%s: no planned scenario", what)
		}
	}

	whole := t.TempDir()
	run(t, f, Options{Out: whole, Jobs: 2, Extra: extra, Compare: capture})
	check("sweep", whole, func(j Judged) string { return j.ID })

	root := t.TempDir()
	var dirs []string
	for i := 1; i <= 2; i++ {
		d := filepath.Join(root, "shard #"+string(rune('0'+i))+" of 2")
		dirs = append(dirs, d)
		run(t, f, Options{Out: d, Jobs: 2, Shard: Shard{i, 2}, Extra: extra})
	}
	merged := filepath.Join(root, "elsewhere", "merged")
	if _, err := Merge(dirs, merged, capture); err != nil {
		t.Fatal(err)
	}
	check("merge into another folder", merged, func(j Judged) string {
		return "../../" + url.PathEscape("shard #"+string(rune('1'+j.Index%2))+" of 2") + "/" + j.ID
	})
	// Merged into the folder that holds the scenarios, the links are the sweep's own.
	if _, err := Merge([]string{whole}, whole, capture); err != nil {
		t.Fatal(err)
	}
	check("merge in place", whole, func(j Judged) string { return j.ID })
}

// TestCleanDottedIDs checks that a scenario folder left half-written by a stopped sweep
// (tmpPrefix, the id, a dot, os.MkdirTemp's digits) is removed by the next run when the id
// itself holds a dot, as a numeric axis's does (snap_m-0.5).
func TestCleanDottedIDs(t *testing.T) {
	t.Parallel()
	f := parseInline(t, "vary: {design.snap_m: [0.5]}")
	id := f.Scenarios()[0].ID
	if !strings.Contains(id, ".") {
		t.Fatalf("id %s holds no dot", id)
	}
	out := t.TempDir()
	left := filepath.Join(out, tmpPrefix+id+".123456")
	if err := os.MkdirAll(left, 0o755); err != nil {
		t.Fatal(err)
	}
	run(t, f, Options{Out: out, Jobs: 1})
	if _, err := os.Stat(left); err == nil {
		t.Errorf("%s left behind", left)
	}
	if _, err := os.Stat(filepath.Join(out, id, "summary.json")); err != nil {
		t.Errorf("scenario %s not written: %v", id, err)
	}
}

// TestScratchInStaging checks where a scenario's scratch files go (plan.gpkg is built in
// one, gpkgout.WriteToIn): into the scenario's own staging folder in --out (tmpPrefix, the
// id, a dot, digits: what the next run clears after a killed one), as `spanwright plan`
// builds them in its set's staging folder, never in the system's temporary folder. With
// TMPDIR a folder that does not exist every scenario is written whole, the renderers see
// that folder (fileset.ScratchDir), and no staging folder is left. Not parallel: it sets
// TMPDIR.
func TestScratchInStaging(t *testing.T) {
	t.Setenv("TMPDIR", filepath.Join(t.TempDir(), "absent"))
	f := parseInline(t, "vary: {design.snap_m: [0.5, 1]}")
	out := t.TempDir()
	var mu sync.Mutex
	var seen []string // the scratch folders the renderers were given, one per scenario
	extra := func(ctx context.Context, r *route.Result) ([]fileset.OutputFile, error) {
		mu.Lock()
		defer mu.Unlock()
		seen = append(seen, fileset.ScratchDir(ctx))
		return nil, nil
	}
	rep := run(t, f, Options{Out: out, Jobs: 2, Extra: extra})
	if rep.Failed != 0 {
		t.Fatalf("failed: %+v", rep.Failures)
	}
	left := map[string]bool{}
	for _, sc := range f.Scenarios() {
		left[sc.ID] = true
		if st, err := os.Stat(filepath.Join(out, sc.ID, "plan.gpkg")); err != nil || st.Size() == 0 {
			t.Errorf("scenario %s: plan.gpkg %v", sc.ID, err)
		}
	}
	for _, dir := range seen {
		name, ok := strings.CutPrefix(dir, out+string(filepath.Separator)+tmpPrefix)
		dot := strings.LastIndexByte(name, '.')
		if !ok || dot < 0 || !left[name[:dot]] || strings.Trim(name[dot+1:], "0123456789") != "" {
			t.Errorf("scratch folder %q: want %s<id>.<digits> in %s, one per scenario", dir, tmpPrefix, out)
			continue
		}
		delete(left, name[:dot])
	}
	if len(left) != 0 {
		t.Errorf("no scratch folder seen for %v", left)
	}
	ents, _ := os.ReadDir(out)
	for _, e := range ents {
		if strings.HasPrefix(e.Name(), tmpPrefix) {
			t.Errorf("left in %s: %s", out, e.Name())
		}
	}

	// Shard 2 of 2 plans the base scenario (shard 1's) for its warm start but stages and
	// renders only its own scenario: another shard's clean, at its start, removes the staging
	// folders of its own scenarios, the base's among them.
	seen = nil
	sharded := t.TempDir()
	rep = run(t, f, Options{Out: sharded, Jobs: 1, Shard: Shard{2, 2}, Extra: extra})
	own := f.Scenarios()[1].ID
	if rep.Failed != 0 || len(seen) != 1 || !strings.HasPrefix(seen[0], filepath.Join(sharded, tmpPrefix+own+".")) {
		t.Errorf("shard 2 of 2: failed %d, scratch folders %q; want one, %s%s.* in %s", rep.Failed, seen, tmpPrefix, own, sharded)
	}
	if ents, _ := os.ReadDir(sharded); len(ents) < 1 {
		t.Errorf("shard 2 of 2 wrote nothing")
	} else {
		for _, e := range ents {
			if strings.HasPrefix(e.Name(), tmpPrefix) || e.Name() == f.Scenarios()[0].ID {
				t.Errorf("shard 2 of 2 left %s in %s", e.Name(), sharded)
			}
		}
	}

	// Stopped while a scenario's files render (its staging folder made, plan.gpkg built in
	// it), the sweep leaves no staging folder behind, whichever scenario it was.
	for stopAt := 1; stopAt <= 2; stopAt++ {
		out := t.TempDir()
		ctx, cancel := context.WithCancel(context.Background())
		n := 0
		extra := func(context.Context, *route.Result) ([]fileset.OutputFile, error) {
			if n++; n == stopAt {
				cancel()
			}
			return nil, nil
		}
		if _, err := Run(ctx, f, Options{Out: out, Jobs: 1, Extra: extra}); !errors.Is(err, context.Canceled) {
			t.Errorf("stopped at scenario %d: got %v, want it stopped", stopAt, err)
		}
		cancel()
		ents, _ := os.ReadDir(out)
		for _, e := range ents {
			if strings.HasPrefix(e.Name(), tmpPrefix) {
				t.Errorf("stopped at scenario %d: left in %s: %s", stopAt, out, e.Name())
			}
		}
	}
}
