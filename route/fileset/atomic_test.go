package fileset

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strings"
	"syscall"
	"testing"
)

// outputSet is a set of outputs whose every file says which set it belongs to.
func outputSet(tag string) []OutputFile {
	var files []OutputFile
	for _, n := range []string{"bom.csv", "bom.xlsx", "links.csv", "report.html", "routes.geojson", "summary.json"} {
		files = append(files, OutputFile{Name: n, Data: []byte(tag + " " + n)})
	}
	return files
}

// entries lists the names in dir, sorted.
func entries(t *testing.T, dir string) []string {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range ents {
		names = append(names, e.Name())
	}
	sort.Strings(names)
	return names
}

// wholeSet fails unless dir holds every file of the set tagged tag and nothing else of ours.
func wholeSet(t *testing.T, dir, tag string) {
	t.Helper()
	for _, f := range outputSet(tag) {
		got, err := os.ReadFile(filepath.Join(dir, f.Name))
		if err != nil || !bytes.Equal(got, f.Data) {
			t.Errorf("%s: %s holds %q (%v), want %q", dir, f.Name, got, err, f.Data)
		}
	}
}

// noLeftovers fails when dir holds a hidden entry of the writers.
func noLeftovers(t *testing.T, dir string) {
	t.Helper()
	for _, n := range entries(t, dir) {
		if strings.HasPrefix(n, ourPrefix) || strings.Contains(n, ".tmp-") {
			t.Errorf("%s: leftover %s", dir, n)
		}
	}
}

// leave writes files into a new folder dir, as a killed run leaves them.
func leave(t *testing.T, dir string, files []OutputFile) {
	t.Helper()
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	if err := writeAll(dir, dir, files); err != nil {
		t.Fatal(err)
	}
}

// deadPid returns the id of a process that has exited.
func deadPid(t *testing.T) int {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^$")
	if err := cmd.Run(); err != nil {
		t.Fatal(err)
	}
	return cmd.Process.Pid
}

func TestWriteFilesReplacesTheSetKeepingForeignFiles(t *testing.T) {
	for _, portable := range []bool{false, true} {
		t.Run(fmt.Sprintf("portable=%v", portable), func(t *testing.T) {
			if portable {
				exchange = func(a, b string) error { return errNoExchange }
				defer func() { exchange = exchangeFolders }()
			}
			parent := t.TempDir()
			out := filepath.Join(parent, "out")
			if err := WriteFiles(context.Background(), out, outputSet("old"), nil); err != nil {
				t.Fatal(err)
			}
			notes := filepath.Join(out, "notes.txt")
			if err := os.WriteFile(notes, []byte("mine"), 0o600); err != nil {
				t.Fatal(err)
			}
			if err := os.Symlink("notes.txt", filepath.Join(out, "notes.lnk")); err != nil {
				t.Fatal(err)
			}
			before, _ := os.Stat(notes)
			if err := WriteFiles(context.Background(), out, outputSet("new"), nil); err != nil {
				t.Fatal(err)
			}
			wholeSet(t, out, "new")
			after, err := os.Stat(notes)
			if err != nil || !os.SameFile(before, after) || after.Mode() != before.Mode() {
				t.Errorf("notes.txt is not the same file after the switch: %v", err)
			}
			if got, _ := os.ReadFile(filepath.Join(out, "notes.lnk")); string(got) != "mine" {
				t.Errorf("notes.lnk reads %q, want the kept symbolic link to notes.txt", got)
			}
			if got := entries(t, parent); len(got) != 1 {
				t.Errorf("beside out: %v, want out alone", got)
			}
		})
	}
}

// TestWriteFilesRefusesWhatItCannotKeep: a sub-folder the user put in --out, or a folder in
// the way of an output, would be lost with the old folder: refused, nothing written.
func TestWriteFilesRefusesWhatItCannotKeep(t *testing.T) {
	for _, sub := range []string{"photos", "links.csv"} {
		out := t.TempDir()
		if err := os.Mkdir(filepath.Join(out, sub), 0o755); err != nil {
			t.Fatal(err)
		}
		err := WriteFiles(context.Background(), out, outputSet("new"), nil)
		if !errors.Is(err, ErrOutFolder) || !strings.Contains(err.Error(), sub) {
			t.Errorf("%s: got %v, want ErrOutFolder naming it", sub, err)
		}
		if got := entries(t, out); len(got) != 1 {
			t.Errorf("%s: out holds %v after a refusal", sub, got)
		}
		noLeftovers(t, filepath.Dir(out))
	}
}

// TestWriteFilesGuardByIdentity: an input reached through a symbolic link to its folder, or
// hard-linked under an output's name, is refused by identity, the input unchanged.
func TestWriteFilesGuardByIdentity(t *testing.T) {
	inputs := t.TempDir()
	campus := filepath.Join(inputs, "routes.geojson")
	if err := os.WriteFile(campus, []byte("campus"), 0o644); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(t.TempDir(), "link")
	if err := os.Symlink(inputs, link); err != nil {
		t.Fatal(err)
	}
	hard := t.TempDir()
	if err := os.Link(campus, filepath.Join(hard, "links.csv")); err != nil {
		t.Fatal(err)
	}
	for _, out := range []string{link, hard, inputs} {
		for _, write := range []func(context.Context, string, []OutputFile, []string) error{WriteFiles, CommitFiles} {
			err := write(context.Background(), out, outputSet("new"), []string{campus})
			if !errors.Is(err, ErrOverwrite) || !strings.Contains(err.Error(), campus) {
				t.Errorf("--out %s: got %v, want ErrOverwrite naming %s", out, err, campus)
			}
			if got, _ := os.ReadFile(campus); string(got) != "campus" {
				t.Fatalf("--out %s: the input now holds %q", out, got)
			}
		}
	}
}

// TestWriteFilesFollowsOutSymlink: --out given as a symbolic link to a folder replaces that
// folder; the link stays a link.
func TestWriteFilesFollowsOutSymlink(t *testing.T) {
	real := filepath.Join(t.TempDir(), "real")
	if err := WriteFiles(context.Background(), real, outputSet("old"), nil); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(t.TempDir(), "link")
	if err := os.Symlink(real, link); err != nil {
		t.Fatal(err)
	}
	if err := WriteFiles(context.Background(), link, outputSet("new"), nil); err != nil {
		t.Fatal(err)
	}
	wholeSet(t, real, "new")
	if info, err := os.Lstat(link); err != nil || info.Mode()&fs.ModeSymlink == 0 {
		t.Errorf("--out link is no longer a symbolic link: %v", err)
	}
}

// failNth makes the nth "write" step under dir fail as a full disk does.
func failNth(dir string, n int) func(step, path string) error {
	seen := 0
	return func(step, path string) error {
		if step != "write" || filepath.Dir(path) != dir {
			return nil
		}
		if seen++; seen == n {
			return syscall.ENOSPC
		}
		return nil
	}
}

// TestWritersDiskFull fails each file of a set in turn as a full disk would: the old set stays
// whole, nothing of the new set appears, no temporary is left, and the error is an
// *OutputError naming the file.
func TestWritersDiskFull(t *testing.T) {
	defer func() { WriteHook = nil }()
	for name, write := range map[string]func(context.Context, string, []OutputFile, []string) error{"WriteFiles": WriteFiles, "CommitFiles": CommitFiles} {
		for n := 1; n <= len(outputSet("")); n++ {
			out := filepath.Join(t.TempDir(), "out")
			WriteHook = nil
			if err := write(context.Background(), out, outputSet("old"), nil); err != nil {
				t.Fatal(err)
			}
			WriteHook = failNth(out, n)
			err := write(context.Background(), out, outputSet("new"), nil)
			var oe *OutputError
			if !errors.As(err, &oe) || !errors.Is(err, syscall.ENOSPC) || filepath.Dir(oe.Path) != out {
				t.Errorf("%s, file %d: got %v, want an OutputError for a file in %s", name, n, err, out)
			}
			wholeSet(t, out, "old")
			noLeftovers(t, out)
			noLeftovers(t, filepath.Dir(out))
		}
	}
}

// TestOutIsAFile: an output folder that is a file is an OutputError naming it.
func TestOutIsAFile(t *testing.T) {
	file := filepath.Join(t.TempDir(), "out")
	if err := os.WriteFile(file, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	for name, write := range map[string]func(context.Context, string, []OutputFile, []string) error{"WriteFiles": WriteFiles, "CommitFiles": CommitFiles} {
		var oe *OutputError
		if err := write(context.Background(), file, outputSet("new"), nil); !errors.As(err, &oe) || !strings.Contains(err.Error(), "is a file, not a folder") {
			t.Errorf("%s: got %v", name, err)
		}
	}
}

// TestRecoverAfterKill builds what a run killed at each point leaves and checks that the next
// run cleans it up: the old or the new set whole, no leftover.
func TestRecoverAfterKill(t *testing.T) {
	dead := deadPid(t)
	t.Run("WriteFiles killed before the switch", func(t *testing.T) {
		parent := t.TempDir()
		out := filepath.Join(parent, "out")
		if err := WriteFiles(context.Background(), out, outputSet("old"), nil); err != nil {
			t.Fatal(err)
		}
		left := filepath.Join(parent, fmt.Sprintf("%sout.new-%d-123", ourPrefix, dead))
		leave(t, left, outputSet("half")[:2])
		if err := WriteFiles(context.Background(), out, outputSet("new"), nil); err != nil {
			t.Fatal(err)
		}
		wholeSet(t, out, "new")
		noLeftovers(t, parent)
	})
	t.Run("portable switch killed between its renames", func(t *testing.T) {
		parent := t.TempDir()
		out := filepath.Join(parent, "out")
		old := filepath.Join(parent, fmt.Sprintf("%sout.old-%d-456", ourPrefix, dead))
		leave(t, old, append(outputSet("old"), OutputFile{Name: "notes.txt", Data: []byte("mine")}))
		if err := WriteFiles(context.Background(), out, outputSet("new"), nil); err != nil {
			t.Fatal(err)
		}
		wholeSet(t, out, "new")
		if got, _ := os.ReadFile(filepath.Join(out, "notes.txt")); string(got) != "mine" {
			t.Errorf("the user's file in the restored folder: %q", got)
		}
		noLeftovers(t, parent)
	})
	t.Run("a running writer's folders are left alone", func(t *testing.T) {
		parent := t.TempDir()
		live := filepath.Join(parent, fmt.Sprintf("%sout.new-%d-789", ourPrefix, os.Getppid()))
		if err := os.Mkdir(live, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := WriteFiles(context.Background(), filepath.Join(parent, "out"), outputSet("new"), nil); err != nil {
			t.Fatal(err)
		}
		if _, err := os.Stat(live); err != nil {
			t.Errorf("a running process's folder was removed: %v", err)
		}
	})
	t.Run("CommitFiles killed while renaming", func(t *testing.T) {
		out := t.TempDir()
		if err := CommitFiles(context.Background(), out, outputSet("old"), nil); err != nil {
			t.Fatal(err)
		}
		stage := filepath.Join(out, fmt.Sprintf("%s%d-1", stagePrefix, dead))
		leave(t, stage, append(outputSet("new"), OutputFile{Name: commitMark}))
		// The first two files were renamed into place before the kill.
		for _, f := range outputSet("new")[:2] {
			if err := os.Rename(filepath.Join(stage, f.Name), filepath.Join(out, f.Name)); err != nil {
				t.Fatal(err)
			}
		}
		if err := RecoverFiles(out); err != nil {
			t.Fatal(err)
		}
		wholeSet(t, out, "new")
		noLeftovers(t, out)
	})
	t.Run("CommitFiles killed before its mark", func(t *testing.T) {
		out := t.TempDir()
		if err := CommitFiles(context.Background(), out, outputSet("old"), nil); err != nil {
			t.Fatal(err)
		}
		stage := filepath.Join(out, fmt.Sprintf("%s%d-2", stagePrefix, dead))
		leave(t, stage, outputSet("new"))
		// What an earlier version left: a file written to a temporary name in place.
		if err := os.WriteFile(filepath.Join(out, fmt.Sprintf(".links.csv.tmp-%d-7", dead)), nil, 0o644); err != nil {
			t.Fatal(err)
		}
		if err := RecoverFiles(out); err != nil {
			t.Fatal(err)
		}
		wholeSet(t, out, "old")
		noLeftovers(t, out)
	})
}

// TestCommitFilesOneSet: every file is written before the commit mark, and only then renamed.
func TestCommitFilesOneSet(t *testing.T) {
	defer func() { WriteHook = nil }()
	out := t.TempDir()
	var steps []string
	WriteHook = func(step, path string) error {
		steps = append(steps, step)
		return nil
	}
	if err := CommitFiles(context.Background(), out, outputSet("new"), nil); err != nil {
		t.Fatal(err)
	}
	want := strings.Repeat("write ", 6) + "commit " + strings.Repeat("rename ", 6)
	if got := strings.Join(steps, " ") + " "; got != want {
		t.Errorf("steps %q, want %q", got, want)
	}
	wholeSet(t, out, "new")
	noLeftovers(t, out)
}

// TestWriteFilesIntoWorkingFolder: --out naming the working folder is written in place (with
// CommitFiles' journal), so the shell in it does not stay behind in a replaced folder.
func TestWriteFilesIntoWorkingFolder(t *testing.T) {
	dir := t.TempDir()
	t.Chdir(dir)
	before, _ := os.Stat(".")
	for _, tag := range []string{"old", "new"} {
		if err := WriteFiles(context.Background(), ".", outputSet(tag), nil); err != nil {
			t.Fatal(err)
		}
	}
	if after, err := os.Stat(dir); err != nil || !os.SameFile(before, after) {
		t.Errorf("the working folder was replaced: %v", err)
	}
	wholeSet(t, dir, "new")
	noLeftovers(t, dir)
}
