package sweep

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"spanwright/route/fileset"
	"strings"
	"syscall"
	"testing"
)

// reportTagged stands in for the HTML comparison report: one file that says which run wrote it.
func reportTagged(tag string) CompareFunc {
	return func(c *Comparison) ([]fileset.OutputFile, error) {
		return []fileset.OutputFile{{Name: "compare.html", Data: []byte(tag)}}, nil
	}
}

// comparisonFiles are the files a whole sweep writes beside its scenario folders.
var comparisonFiles = []string{"compare.csv", "compare.html", "compare.md", "compare.xlsx", RowsFile}

// identities records the file behind every comparison file in dir.
func identities(t *testing.T, dir string) map[string]os.FileInfo {
	t.Helper()
	out := map[string]os.FileInfo{}
	for _, n := range comparisonFiles {
		info, err := os.Stat(filepath.Join(dir, n))
		if err != nil {
			t.Fatal(err)
		}
		out[n] = info
	}
	return out
}

// stepsIn records the writer's steps on files directly in dir.
func stepsIn(dir string, steps *[]string) func(step, path string) error {
	return func(step, path string) error {
		if filepath.Dir(path) == dir || path == dir {
			*steps = append(*steps, step+" "+filepath.Base(path))
		}
		return nil
	}
}

// TestComparisonIsOneSet: the sweep and the merge write the rows file, compare.csv, .md,
// .xlsx and the report together: every file before the commit, then the renames.
func TestComparisonIsOneSet(t *testing.T) {
	defer func() { fileset.WriteHook = nil }()
	f := load(t, "small.yaml")
	out := t.TempDir()
	var steps []string
	fileset.WriteHook = stepsIn(out, &steps)
	if _, err := Run(context.Background(), f, Options{Out: out, Jobs: 2, Compare: reportTagged("sweep")}); err != nil {
		t.Fatal(err)
	}
	merged := filepath.Join(t.TempDir(), "merged")
	var mergeSteps []string
	fileset.WriteHook = stepsIn(merged, &mergeSteps)
	if _, err := Merge([]string{out}, merged, reportTagged("sweep")); err != nil {
		t.Fatal(err)
	}
	for what, got := range map[string][]string{"sweep": steps, "merge": mergeSteps} {
		var want []string
		for _, n := range comparisonFiles {
			want = append(want, "write "+n)
		}
		want = append(want, "commit "+filepath.Base(map[string]string{"sweep": out, "merge": merged}[what]))
		for _, n := range comparisonFiles {
			want = append(want, "rename "+n)
		}
		if strings.Join(got, ", ") != strings.Join(want, ", ") {
			t.Errorf("%s: steps\n%s\nwant\n%s", what, strings.Join(got, ", "), strings.Join(want, ", "))
		}
	}
	for _, n := range comparisonFiles {
		a, _ := os.ReadFile(filepath.Join(out, n))
		b, _ := os.ReadFile(filepath.Join(merged, n))
		if len(a) == 0 || string(a) != string(b) {
			t.Errorf("%s: the merge wrote other bytes than the sweep", n)
		}
	}
}

// TestComparisonDiskFull fails each comparison file of a sweep and of a merge in turn as a full
// disk does: the error says so, and the folder keeps the previous comparison, every file the
// same file as before, with no new file and no journal left.
func TestComparisonDiskFull(t *testing.T) {
	defer func() { fileset.WriteHook = nil }()
	f := load(t, "small.yaml")
	out := t.TempDir()
	if _, err := Run(context.Background(), f, Options{Out: out, Jobs: 2, Compare: reportTagged("old")}); err != nil {
		t.Fatal(err)
	}
	before := identities(t, out)
	listing := func() string {
		ents, _ := os.ReadDir(out)
		var names []string
		for _, e := range ents {
			names = append(names, e.Name())
		}
		return strings.Join(names, " ")
	}
	wantListing := listing()
	for _, merge := range []bool{false, true} {
		for n := 1; n <= len(comparisonFiles); n++ {
			seen := 0
			fileset.WriteHook = func(step, path string) error {
				if step == "write" && filepath.Dir(path) == out {
					if seen++; seen == n {
						return syscall.ENOSPC
					}
				}
				return nil
			}
			var err error
			if merge {
				_, err = Merge([]string{out}, out, reportTagged("new"))
			} else {
				_, err = Run(context.Background(), f, Options{Out: out, Jobs: 2, Resume: true, Compare: reportTagged("new")})
			}
			fileset.WriteHook = nil
			var oe *fileset.OutputError
			if !errors.As(err, &oe) || !errors.Is(err, syscall.ENOSPC) {
				t.Fatalf("merge=%v, file %d failing: got %v, want an OutputError for a full disk", merge, n, err)
			}
			after := identities(t, out)
			for _, name := range comparisonFiles {
				if !os.SameFile(before[name], after[name]) {
					t.Errorf("merge=%v, file %d failing: %s was replaced", merge, n, name)
				}
			}
			if got, _ := os.ReadFile(filepath.Join(out, "compare.html")); string(got) != "old" {
				t.Errorf("merge=%v, file %d failing: compare.html holds %q", merge, n, got)
			}
			if got := listing(); got != wantListing {
				t.Errorf("merge=%v, file %d failing: folder holds\n%s\nwant\n%s", merge, n, got, wantListing)
			}
		}
	}
}

// TestKilledComparisonRolledForward leaves what a sweep killed while renaming its comparison
// into place leaves (a journal marked whole, two files already moved) and checks that the
// next sweep finishes it before anything else and leaves no journal; and that a journal not
// marked whole is dropped, the previous comparison kept.
func TestKilledComparisonRolledForward(t *testing.T) {
	f := load(t, "small.yaml")
	out := t.TempDir()
	if _, err := Run(context.Background(), f, Options{Out: out, Jobs: 2, Compare: reportTagged("old")}); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	if err := cmd.Run(); err != nil {
		t.Fatal(err)
	}
	dead := cmd.Process.Pid
	for _, marked := range []bool{true, false} {
		stage := filepath.Join(out, fmt.Sprintf(".spanwright-stage-%d-%d", dead, map[bool]int{true: 1, false: 2}[marked]))
		if err := os.Mkdir(stage, 0o755); err != nil {
			t.Fatal(err)
		}
		for _, n := range comparisonFiles {
			if err := os.WriteFile(filepath.Join(stage, n), []byte("killed "+n), 0o644); err != nil {
				t.Fatal(err)
			}
		}
		if marked {
			os.WriteFile(filepath.Join(stage, ".commit"), nil, 0o644)
			for _, n := range comparisonFiles[:2] {
				if err := os.Rename(filepath.Join(stage, n), filepath.Join(out, n)); err != nil {
					t.Fatal(err)
				}
			}
		}
		var steps []string
		fileset.WriteHook = func(step, path string) error {
			if filepath.Dir(path) == out && step == "rename" && !strings.Contains(strings.Join(steps, ","), "commit") {
				steps = append(steps, "recovered "+filepath.Base(path))
			}
			if filepath.Dir(path) == out || path == out {
				steps = append(steps, step)
			}
			return nil
		}
		_, err := Run(context.Background(), f, Options{Out: out, Jobs: 2, Resume: true, Compare: reportTagged("new")})
		fileset.WriteHook = nil
		if err != nil {
			t.Fatal(err)
		}
		recovered := strings.Count(strings.Join(steps, ","), "recovered ")
		if want := map[bool]int{true: len(comparisonFiles) - 2, false: 0}[marked]; recovered != want {
			t.Errorf("marked=%v: %d files rolled forward before the run's own set, want %d (%v)", marked, recovered, want, steps)
		}
		if got, _ := os.ReadFile(filepath.Join(out, "compare.html")); string(got) != "new" {
			t.Errorf("marked=%v: compare.html holds %q after the next run", marked, got)
		}
		if _, err := os.Stat(stage); !errors.Is(err, fs.ErrNotExist) {
			t.Errorf("marked=%v: the journal is still there: %v", marked, err)
		}
	}
}
