package main

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"syscall"
	"testing"
	"time"

	"spanwright/geo/ctxtest"
	"spanwright/route"
	"spanwright/route/fileset"
)

// TestMain lets a test run the real main, signal handling included, in a child process: the
// test binary runs main when SPANWRIGHT_AS_MAIN is set, with its arguments as the command line;
// when SPANWRIGHT_STEP_DELAY holds a duration, with a pause before each step of writing, and
// with SPANWRIGHT_TEST_STAGE set it prints "stage NAME" on stderr when runPlan reaches it.
func TestMain(m *testing.M) {
	if os.Getenv("SPANWRIGHT_AS_MAIN") == "1" {
		if d, err := time.ParseDuration(os.Getenv("SPANWRIGHT_STEP_DELAY")); err == nil {
			// Widen the window in which a kill finds the outputs half written.
			fileset.WriteHook = func(string, string) error { time.Sleep(d); return nil }
		}
		if at := os.Getenv("SPANWRIGHT_TEST_STAGE"); at != "" {
			// Say on stderr when runPlan reaches the stage, for the test to signal then.
			stage = func(ctx context.Context, s string) {
				if s != at {
					return
				}
				fmt.Fprintln(os.Stderr, "stage "+s)
				if os.Getenv("SPANWRIGHT_TEST_STAGE_WAIT") == "1" {
					// Wait here for the signal, so that it lands before the run can finish.
					select {
					case <-ctx.Done():
					case <-time.After(time.Minute):
					}
				}
			}
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
	// One plain line: the signal and what was written, not the context's "canceled".
	if msg := stderr.String(); !regexp.MustCompile(`^spanwright: stopped by SIGTERM: (no scenario written|[0-9]+ scenarios? written to \S+, each whole); no comparison written`).MatchString(msg) ||
		strings.Count(msg, "\n") != 1 || strings.Contains(msg, "cancel") {
		t.Errorf("stderr does not say in one line that the sweep stopped and what it wrote:\n%s", msg)
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

// gridCampus writes a campus of about n buildings as GeoJSON: streets on a grid of 120 m
// blocks, one existing duct pathway per block side, a building 12 m off the middle of each
// side reached by a lateral, a proposed trench across every seventh block, and the mc near
// the middle. Names and places are invented.
func gridCampus(n int) []byte {
	g := 2
	for 2*g*(g-1) < n {
		g++
	}
	const stepM = 120.0
	ll := func(xM, yM float64) string { // about 40° N, where a degree of longitude is 85.3 km
		return fmt.Sprintf("[%.7f,%.7f]", -75+xM/85276, 40+yM/110540)
	}
	var feats []string
	line := func(props string, pts ...[2]float64) {
		var cs []string
		for _, p := range pts {
			cs = append(cs, ll(p[0], p[1]))
		}
		feats = append(feats, fmt.Sprintf(`{"type":"Feature","properties":{%s},"geometry":{"type":"LineString","coordinates":[%s]}}`, props, strings.Join(cs, ",")))
	}
	built := 0
	building := func(x, y float64) {
		if built >= n {
			return
		}
		role := ""
		if built == n/2 {
			role = `,"role":"mc"`
		}
		sq := []string{ll(x-8, y-8), ll(x+8, y-8), ll(x+8, y+8), ll(x-8, y+8), ll(x-8, y-8)}
		feats = append(feats, fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":"G%05d"%s},"geometry":{"type":"Polygon","coordinates":[[%s]]}}`,
			built, role, strings.Join(sq, ",")))
		built++
	}
	for i := 0; i < g; i++ {
		for j := 0; j < g; j++ {
			x, y := float64(i)*stepM, float64(j)*stepM
			if i+1 < g {
				line(fmt.Sprintf(`"kind":"pathway","id":"E%d-%d","spare_ducts":2`, i, j), [2]float64{x, y}, [2]float64{x + stepM, y})
				building(x+stepM/2, y+20)
			}
			if j+1 < g {
				line(fmt.Sprintf(`"kind":"pathway","id":"N%d-%d","spare_ducts":2`, i, j), [2]float64{x, y}, [2]float64{x, y + stepM})
				building(x+20, y+stepM/2)
			}
			if i+1 < g && j+1 < g && (i*g+j)%7 == 3 {
				line(fmt.Sprintf(`"kind":"pathway","id":"P%d-%d","status":"proposed","type":"buried","surface":"turf"`, i, j),
					[2]float64{x, y}, [2]float64{x + stepM, y + stepM})
			}
		}
	}
	return []byte(`{"type":"FeatureCollection","features":[` + strings.Join(feats, ",\n") + "]}\n")
}

// TestPlanStopsOnSignal stops `plan` on a generated 1,000-building campus with SIGTERM at
// three points: just after the campus is read, 300 ms later (in the optimizer) and just after
// planning (while the outputs are rendered). Each time it must exit 143 (128 +
// SIGTERM, the shell's convention) within a second of the signal, and leave --out without
// any output or temporary file. The bound is asserted loosely (1.5 s) against slow machines;
// the measured time is logged.
func TestPlanStopsOnSignal(t *testing.T) {
	if testing.Short() {
		t.Skip("plans a 1,000-building campus")
	}
	t.Parallel()
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "campus.geojson"), gridCampus(1000), 0o644); err != nil {
		t.Fatal(err)
	}
	plan := filepath.Join(dir, "plan.yaml")
	if err := os.WriteFile(plan, []byte("name: grid\ncampus: [campus.geojson]\ndesign: {allow_new_trench: true}\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		stage string
		after time.Duration
		wait  bool // the run waits at the stage for the signal
	}{{"loaded", 0, false}, {"loaded", 300 * time.Millisecond, false}, {"planned", 0, true}} {
		t.Run(fmt.Sprintf("%s+%v", tc.stage, tc.after), func(t *testing.T) {
			out := filepath.Join(dir, "out-"+tc.stage+tc.after.String())
			if err := os.Mkdir(out, 0o755); err != nil {
				t.Fatal(err)
			}
			cmd := exec.Command(os.Args[0], "plan", plan, "--out", out)
			cmd.Env = append(os.Environ(), "SPANWRIGHT_AS_MAIN=1", "SPANWRIGHT_TEST_STAGE="+tc.stage)
			if tc.wait {
				cmd.Env = append(cmd.Env, "SPANWRIGHT_TEST_STAGE_WAIT=1")
			}
			stderr, err := cmd.StderrPipe()
			if err != nil {
				t.Fatal(err)
			}
			if err := cmd.Start(); err != nil {
				t.Fatal(err)
			}
			sc := bufio.NewScanner(stderr)
			var rest strings.Builder
			reached := false
			for sc.Scan() {
				if sc.Text() == "stage "+tc.stage {
					reached = true
					break
				}
				rest.WriteString(sc.Text() + "\n")
			}
			if !reached {
				cmd.Wait()
				t.Fatalf("the plan never reached %q; stderr:\n%s", tc.stage, rest.String())
			}
			time.Sleep(tc.after)
			sent := time.Now()
			if err := cmd.Process.Signal(syscall.SIGTERM); err != nil {
				t.Fatal(err)
			}
			// Read the rest of stderr to its end (the process's exit) before Wait closes the pipe.
			var after strings.Builder
			for sc.Scan() {
				after.WriteString(sc.Text() + "\n")
			}
			err = cmd.Wait()
			took := time.Since(sent)
			t.Logf("exited %v after SIGTERM", took.Round(time.Millisecond))
			var ee *exec.ExitError
			if err == nil {
				t.Fatalf("the plan finished (exit 0) after SIGTERM, in %v", took)
			}
			if !errors.As(err, &ee) || ee.ExitCode() != 143 {
				t.Fatalf("got %v, want exit status 143; stderr:\n%s", err, rest.String())
			}
			if msg := after.String(); msg != "spanwright: stopped by SIGTERM: nothing written\n" {
				t.Errorf("stderr: got %q, want the one line that says it stopped and wrote nothing", msg)
			}
			// How soon it stops is measured and logged (README: 5-110 ms on 1,000 buildings), not
			// asserted: timings belong in benchmarks, and this machine is shared.
			ents, err := os.ReadDir(out)
			if err != nil {
				t.Fatal(err)
			}
			for _, e := range ents {
				t.Errorf("%s written by a stopped plan", e.Name())
			}
		})
	}
}

// TestStoppedCommandsWriteNothing runs plan, demo and check with a context cancelled at the
// first, a quarter, half, three quarters and the last of the looks a whole run takes at it:
// each returns context.Canceled (which main turns into 130 or 143), prints no summary, and
// plan and demo say they stopped and leave no file in the output folder.
func TestStoppedCommandsWriteNothing(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, tc := range []struct {
		name string
		args []string
	}{
		{"plan", []string{"plan", "../../testdata/demo/plan.yaml", "--out"}},
		{"demo", []string{"demo", "--out"}},
		{"check", []string{"check", "../../testdata/demo/plan.yaml"}},
	} {
		runWith := func(ctx context.Context, out string) (string, error) {
			app := newApp()
			var stdout bytes.Buffer
			app.Writer, app.ErrWriter = &stdout, io.Discard
			args := tc.args
			if tc.name != "check" {
				args = append(append([]string(nil), args...), out)
			}
			err := app.RunContext(ctx, intersperse(app, append([]string{"spanwright"}, args...)))
			return stdout.String(), err
		}
		count := ctxtest.New(0)
		if _, err := runWith(count, filepath.Join(dir, tc.name+"-whole")); err != nil && exitCode(err) != exitInfeasible {
			t.Fatalf("%s: %v", tc.name, err)
		}
		total := count.Looks()
		for _, at := range []int64{1, total / 4, total / 2, 3 * total / 4, total} {
			out := filepath.Join(dir, fmt.Sprintf("%s-%d", tc.name, at))
			stdout, err := runWith(ctxtest.New(at), out)
			if !errors.Is(err, context.Canceled) {
				t.Errorf("%s cancelled at look %d of %d: got %v, want context.Canceled", tc.name, at, total, err)
				continue
			}
			if tc.name != "check" && !strings.Contains(err.Error(), "stopped, nothing written") {
				t.Errorf("%s cancelled at look %d of %d: the error %q does not say nothing was written", tc.name, at, total, err)
			}
			if strings.Contains(stdout, "total") || strings.Contains(stdout, "outputs written") || strings.Contains(stdout, "buildings") {
				t.Errorf("%s cancelled at look %d of %d printed a summary:\n%s", tc.name, at, total, stdout)
			}
			// The folder itself may have been made: the last look is just before the renames.
			if ents, _ := os.ReadDir(out); len(ents) > 0 {
				t.Errorf("%s cancelled at look %d of %d: %s holds %s, want nothing written", tc.name, at, total, out, ents[0].Name())
			}
		}
	}
}

// TestFinalStatus: the status and line main ends with. A run stopped by a signal exits
// 128 + the signal, as shells report a command a signal ended (POSIX Shell Command Language,
// "Exit Status for Commands": greater than 128; bash's and dash's 128 + n, from memory), with
// one plain line; a run that ended by itself
// exits as exitCode says, with its error's text; an error that only wraps a cancelled
// context without a signal is not called stopped by one.
func TestFinalStatus(t *testing.T) {
	canceled := stopped{what: "nothing written", err: context.Canceled}
	for _, tc := range []struct {
		name string
		err  error
		sig  syscall.Signal
		code int
		msg  string
	}{
		{"done", nil, 0, exitOK, ""},
		{"done, signal after", nil, syscall.SIGINT, exitOK, ""},
		{"Ctrl-C", canceled, syscall.SIGINT, exitInterrupt, "stopped by Ctrl-C (SIGINT): nothing written"},
		{"SIGTERM", canceled, syscall.SIGTERM, exitTerminate, "stopped by SIGTERM: nothing written"},
		{"infeasible, signal after", &route.InfeasibleError{Legs: []string{"L/primary: x"}, Listed: true}, syscall.SIGINT, exitInfeasible, "1 infeasible link leg, listed above"},
		{"cancelled without a signal", canceled, 0, exitCode(canceled), "stopped, nothing written"},
	} {
		code, msg := finalStatus(tc.err, tc.sig)
		if code != tc.code || msg != tc.msg {
			t.Errorf("%s: got %d %q, want %d %q", tc.name, code, msg, tc.code, tc.msg)
		}
	}
}
