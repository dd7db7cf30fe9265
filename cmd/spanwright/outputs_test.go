package main

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"

	"spanwright/geo/input"
	"spanwright/route/fileset"
	"spanwright/route/plan"
)

// inputFolder copies the small test plan and its campus into a new folder, the campus under
// the name campus, and returns the folder and the plan's path.
func inputFolder(t *testing.T, campus string) (string, string) {
	t.Helper()
	dir := t.TempDir()
	geo, err := os.ReadFile("testdata/plans/island.geojson")
	if err != nil {
		t.Fatal(err)
	}
	plan, err := os.ReadFile("testdata/plans/ok.yaml")
	if err != nil {
		t.Fatal(err)
	}
	plan = []byte(strings.ReplaceAll(string(plan), "island.geojson", campus))
	if err := os.WriteFile(filepath.Join(dir, campus), geo, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "plan.yaml"), plan, 0o644); err != nil {
		t.Fatal(err)
	}
	return dir, filepath.Join(dir, "plan.yaml")
}

// TestOverwriteGuardByIdentity: an input reached as an output through a symbolic link to its
// folder, or hard-linked into --out under an output's name, is refused with status 2 and left
// as it was. Both replaced the input before the guard compared file identity.
func TestOverwriteGuardByIdentity(t *testing.T) {
	dir, plan := inputFolder(t, "routes.geojson")
	campus := filepath.Join(dir, "routes.geojson")
	want, _ := os.ReadFile(campus)
	link := filepath.Join(t.TempDir(), "out")
	if err := os.Symlink(dir, link); err != nil {
		t.Fatal(err)
	}
	hard := t.TempDir()
	if err := os.Link(campus, filepath.Join(hard, "links.csv")); err != nil {
		t.Fatal(err)
	}
	for _, out := range []string{link, hard} {
		_, msg, code := run(t, "plan", plan, "--out", out)
		if code != exitInvalid || !strings.Contains(msg, "would overwrite an input") || !strings.Contains(msg, campus) {
			t.Errorf("--out %s: status %d, %q; want %d naming %s", out, code, msg, exitInvalid, campus)
		}
		if got, _ := os.ReadFile(campus); string(got) != string(want) {
			t.Fatalf("--out %s: the input was overwritten", out)
		}
	}
	if ents, _ := os.ReadDir(dir); len(ents) != 2 {
		t.Errorf("the input folder holds %d entries after refusals, want 2", len(ents))
	}
}

// TestOutFolderHoldingInputs: --out naming the folder of the plan's inputs keeps them, the
// same files (inode and bytes), beside the outputs; a sub-folder there is refused (status 2).
func TestOutFolderHoldingInputs(t *testing.T) {
	dir, plan := inputFolder(t, "campus.geojson")
	before, _ := os.Stat(filepath.Join(dir, "campus.geojson"))
	if _, msg, code := run(t, "plan", plan, "--out", dir); code != exitOK {
		t.Fatalf("status %d: %s", code, msg)
	}
	after, err := os.Stat(filepath.Join(dir, "campus.geojson"))
	if err != nil || !os.SameFile(before, after) {
		t.Errorf("the campus file is not the same file after the plan wrote beside it: %v", err)
	}
	if _, err := os.Stat(filepath.Join(dir, "report.html")); err != nil {
		t.Errorf("outputs missing: %v", err)
	}
	if err := os.Mkdir(filepath.Join(dir, "photos"), 0o755); err != nil {
		t.Fatal(err)
	}
	_, msg, code := run(t, "plan", plan, "--out", dir)
	if code != exitInvalid || !strings.Contains(msg, "holds the folder photos") {
		t.Errorf("sub-folder in --out: status %d, %q", code, msg)
	}
}

// TestExitStatusEnvironment: what the machine refuses is status 4 with the place named; a
// refused overwrite and an unknown command are status 2; 1 is left for bugs. Not parallel:
// it sets fileset.WriteHook.
func TestExitStatusEnvironment(t *testing.T) {
	defer func() { fileset.WriteHook = nil }()
	_, planFile := inputFolder(t, "campus.geojson")
	file := filepath.Join(t.TempDir(), "a-file")
	if err := os.WriteFile(file, nil, 0o644); err != nil {
		t.Fatal(err)
	}
	sweepFile := filepath.Join(t.TempDir(), "s.yaml")
	if err := os.WriteFile(sweepFile, []byte(fmt.Sprintf("base: %s\ncases: [{name: a}]\n", planFile)), 0o644); err != nil {
		t.Fatal(err)
	}
	fail := func(e error, name string) func(string, string) error {
		return func(step, path string) error {
			if step == "write" && filepath.Base(path) == name {
				return e
			}
			return nil
		}
	}
	cases := []struct {
		name string
		hook func(string, string) error
		args []string
		code int
		want string
	}{
		{"disk full", fail(syscall.ENOSPC, "summary.json"), []string{"plan", planFile, "--out", filepath.Join(t.TempDir(), "o")}, exitEnvironment, "summary.json: no space left on device"},
		{"no permission", fail(fs.ErrPermission, "summary.json"), []string{"plan", planFile, "--out", filepath.Join(t.TempDir(), "o")}, exitEnvironment, "summary.json: permission denied"},
		{"out is a file", nil, []string{"plan", planFile, "--out", file}, exitEnvironment, file + ": it is a file, not a folder"},
		{"sweep out is a file", nil, []string{"sweep", sweepFile, "--quiet", "--out", file}, exitEnvironment, file + ": it is a file, not a folder"},
		{"sweep disk full", fail(syscall.ENOSPC, "compare.md"), []string{"sweep", sweepFile, "--quiet", "--out", t.TempDir()}, exitEnvironment, "compare.md: no space left on device"},
		{"sweep scenario disk full", fail(syscall.ENOSPC, "links.csv"), []string{"sweep", sweepFile, "--quiet", "--out", filepath.Join(t.TempDir(), "o")}, exitEnvironment, "o/a-e3b0c442/links.csv: no space left on device"},
		{"unknown command", nil, []string{"plna", planFile}, exitInvalid, `unknown command "plna"`},
	}
	for _, tc := range cases {
		fileset.WriteHook = tc.hook
		_, msg, code := run(t, tc.args...)
		if code != tc.code || !strings.Contains(msg, tc.want) {
			t.Errorf("%s: status %d, %q; want %d, %q", tc.name, code, msg, tc.code, tc.want)
		}
	}
	// An input the loader cannot open: missing is the user's mistake, unreadable the machine's.
	for errno, want := range map[syscall.Errno]int{syscall.ENOENT: exitInvalid, syscall.EACCES: exitEnvironment, syscall.EIO: exitEnvironment} {
		err := &input.Problem{File: "p.yaml", Err: &fs.PathError{Op: "open", Path: "p.yaml", Err: errno}, Class: plan.ErrPlan}
		if code := exitCode(err); code != want {
			t.Errorf("planFile file %v: status %d, want %d", errno, code, want)
		}
	}
	if code := exitCode(errors.New("index out of range")); code != exitInternal {
		t.Errorf("an unclassified error: status %d, want %d", code, exitInternal)
	}
}

// TestSweepRefusesBeforePlanning: a sweep whose comparison would replace its own sweep file is
// refused with status 2 before any scenario is planned: nothing is written into the folder.
func TestSweepRefusesBeforePlanning(t *testing.T) {
	_, plan := inputFolder(t, "campus.geojson")
	dir := t.TempDir()
	sweepFile := filepath.Join(dir, "compare.md")
	body := fmt.Sprintf("base: %s\ncases: [{name: a}, {name: b}]\n", plan)
	if err := os.WriteFile(sweepFile, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	_, msg, code := run(t, "sweep", sweepFile, "--quiet", "--out", dir)
	if code != exitInvalid || !strings.Contains(msg, "would overwrite an input") {
		t.Fatalf("exit %d: %s; want 2 and the overwrite refused", code, msg)
	}
	ents, _ := os.ReadDir(dir)
	if len(ents) != 1 {
		t.Errorf("the folder holds %d entries, want only the sweep file", len(ents))
	}
	if got, _ := os.ReadFile(sweepFile); string(got) != body {
		t.Errorf("the sweep file changed")
	}
}

// TestOutFolderNames plans into --out folders whose names hold what an SQLite URI reads
// otherwise ('#', '?', '%41', a space: SQLite, "URI Filenames" §3.1): plan.gpkg is the same
// whole GeoPackage as in a plain folder (it was built elsewhere and came out empty, status 0,
// before gpkgout.URI), and nothing is left beside --out or in TMPDIR. Not parallel: it points
// TMPDIR at a folder of its own.
func TestOutFolderNames(t *testing.T) {
	t.Setenv("TMPDIR", t.TempDir())
	plain := filepath.Join(t.TempDir(), "plain")
	if _, msg, code := run(t, "plan", "testdata/plans/ok.yaml", "--out", plain); code != exitOK {
		t.Fatalf("exit %d: %s", code, msg)
	}
	want, err := os.ReadFile(filepath.Join(plain, "plan.gpkg"))
	if err != nil || len(want) == 0 {
		t.Fatalf("plan.gpkg in a plain folder: %d bytes, %v", len(want), err)
	}
	for _, name := range []string{"x#1", "what?now", "a%41b", "two words", "#?%41 all"} {
		top := t.TempDir()
		out := filepath.Join(top, name)
		if _, msg, code := run(t, "plan", "testdata/plans/ok.yaml", "--out", out); code != exitOK {
			t.Errorf("--out %q: exit %d: %s", name, code, msg)
			continue
		}
		if got, _ := os.ReadFile(filepath.Join(out, "plan.gpkg")); !bytes.Equal(got, want) {
			t.Errorf("--out %q: plan.gpkg is %d bytes, want the plain folder's %d", name, len(got), len(want))
		}
		if ents, _ := os.ReadDir(top); len(ents) != 1 {
			t.Errorf("--out %q: beside it %v; want nothing else", name, ents)
		}
	}
	if ents, _ := os.ReadDir(os.Getenv("TMPDIR")); len(ents) != 0 {
		t.Errorf("left in TMPDIR: %v", ents)
	}
}
