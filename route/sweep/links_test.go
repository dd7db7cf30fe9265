package sweep

import (
	"context"
	"net/url"
	"os"
	"path/filepath"
	"strings"
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
