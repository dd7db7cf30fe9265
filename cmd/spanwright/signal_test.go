package main

import (
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"spanwright/route"
)

// TestMain lets a test run the real main, signal handling included, in a child process: the
// test binary runs main when SPANWRIGHT_AS_MAIN is set, with its arguments as the command line
// (and, when SPANWRIGHT_STEP_DELAY holds a duration, a pause before each step of writing).
func TestMain(m *testing.M) {
	if os.Getenv("SPANWRIGHT_AS_MAIN") == "1" {
		if d, err := time.ParseDuration(os.Getenv("SPANWRIGHT_STEP_DELAY")); err == nil {
			// Widen the window in which a kill finds the outputs half written.
			route.WriteHook = func(string, string) error { time.Sleep(d); return nil }
		}
		os.Args = append([]string{"spanwright"}, os.Args[1:]...)
		main()
		return
	}
	os.Exit(m.Run())
}

// TestSweepStopsOnSignal stops a sweep with SIGTERM: it exits 143 (128 + the signal, the
// shell's convention), every scenario folder it leaves is whole, no temporary folder and no
// comparison is left, and --resume then finishes a comparison equal to an uninterrupted sweep's.
func TestSweepStopsOnSignal(t *testing.T) {
	if testing.Short() {
		t.Skip("runs a 400-scenario sweep three times")
	}
	t.Parallel()
	dir := t.TempDir()
	base, err := filepath.Abs("../../testdata/demo/plan.yaml")
	if err != nil {
		t.Fatal(err)
	}
	var strands, slack []string
	for i := 0; i < 20; i++ {
		strands = append(strands, fmt.Sprint(6+6*i))
		slack = append(slack, fmt.Sprint(1+i))
	}
	sweepFile := filepath.Join(dir, "s.yaml")
	src := fmt.Sprintf("base: %s\nvary:\n  defaults.strands: [%s]\n  design.slack_m: [%s]\n", base, strings.Join(strands, ", "), strings.Join(slack, ", "))
	if err := os.WriteFile(sweepFile, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	cmd := exec.Command(os.Args[0], "sweep", sweepFile, "--out", out, "--jobs", "1", "--quiet")
	cmd.Env = append(os.Environ(), "SPANWRIGHT_AS_MAIN=1")
	var stderr strings.Builder
	cmd.Stderr = &stderr
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	for deadline := time.Now().Add(60 * time.Second); time.Now().Before(deadline); time.Sleep(5 * time.Millisecond) {
		if ents, _ := os.ReadDir(out); len(ents) >= 4 {
			break
		}
	}
	cmd.Process.Signal(syscall.SIGTERM)
	err = cmd.Wait()
	var ee *exec.ExitError
	if err == nil {
		t.Skip("the sweep finished before the signal reached it")
	}
	if !errors.As(err, &ee) || ee.ExitCode() != 143 {
		t.Fatalf("got %v, want exit status 143; stderr:\n%s", err, stderr.String())
	}
	if !strings.Contains(stderr.String(), "sweep stopped after") {
		t.Errorf("stderr does not say the sweep stopped:\n%s", stderr.String())
	}
	ents, err := os.ReadDir(out)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range ents {
		switch {
		case strings.HasPrefix(e.Name(), "."):
			t.Errorf("temporary %s left behind", e.Name())
		case !e.IsDir():
			t.Errorf("%s written by a stopped sweep", e.Name())
		default:
			for _, f := range []string{"plan.yaml", "inputs.sha256", "summary.json", "links.csv", "routes.geojson", "bom.csv"} {
				if _, err := os.Stat(filepath.Join(out, e.Name(), f)); err != nil {
					t.Errorf("scenario %s is not whole: %v", e.Name(), err)
				}
			}
		}
	}
	if len(ents) >= 400 {
		t.Skip("every scenario finished before the signal reached the sweep")
	}

	if _, msg, code := run(t, "sweep", sweepFile, "--out", out, "--resume", "--quiet"); code != 0 {
		t.Fatalf("resume: exit %d: %s", code, msg)
	}
	fresh := filepath.Join(dir, "fresh")
	if _, msg, code := run(t, "sweep", sweepFile, "--out", fresh, "--quiet"); code != 0 {
		t.Fatalf("fresh sweep: exit %d: %s", code, msg)
	}
	for _, f := range []string{"compare.csv", "compare.md"} {
		a, _ := os.ReadFile(filepath.Join(out, f))
		b, _ := os.ReadFile(filepath.Join(fresh, f))
		if len(a) == 0 || string(a) != string(b) {
			t.Errorf("%s after an interrupted sweep and --resume differs from a fresh sweep's", f)
		}
	}
}
