package main

import (
	"bytes"
	"errors"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
	"time"

	"spanwright/route/sweep"
)

const sweepFixtures = "../../testdata/sweep"

func TestSweepCommand(t *testing.T) {
	t.Parallel()
	out := t.TempDir()
	stdout, msg, code := run(t, "sweep", filepath.Join(sweepFixtures, "valid.yaml"), "--out", out, "--jobs", "2")
	if code != exitInfeasible {
		t.Errorf("exit status: got %d, want %d (a scenario has infeasible legs)\n%s", code, exitInfeasible, msg)
	}
	for _, want := range []string{
		"sweep: 5 scenarios: 4 ok, 1 with infeasible legs, 0 failed\n",
		"warning: 5 scenarios priced by the invented demo price book built into spanwright",
		filepath.Join(out, "compare.xlsx"),
	} {
		if !strings.Contains(stdout, want) {
			t.Errorf("stdout lacks %q:\n%s", want, stdout)
		}
	}
	if !strings.Contains(msg, "sweep: 5 scenarios planned in ") || !strings.Contains(msg, "1 of 5 scenarios has infeasible legs") {
		t.Errorf("stderr and error: got %q, want the closing progress line and the infeasible legs", msg)
	}

	// Resume keeps everything; --quiet prints no progress.
	stdout, msg, code = run(t, "sweep", filepath.Join(sweepFixtures, "valid.yaml"), "--out", out, "--resume", "--quiet")
	if code != exitInfeasible || !strings.Contains(stdout, "(5 unchanged, kept)") || strings.Contains(msg, "per second") {
		t.Errorf("resume: got status %d, stdout %q, stderr %q", code, stdout, msg)
	}

	// Shards and merge give the same comparison.
	shards := t.TempDir()
	for _, s := range []string{"1/2", "2/2"} {
		stdout, _, code := run(t, "sweep", filepath.Join(sweepFixtures, "valid.yaml"), "--out", shards, "--shard", s, "--quiet")
		if code != exitInfeasible && code != exitOK {
			t.Errorf("shard %s: status %d", s, code)
		}
		if n := map[string]string{"1/2": "3", "2/2": "2"}[s]; !strings.Contains(stdout, "shard "+s+": "+n+" of 5 scenarios") || !strings.Contains(stdout, "spanwright merge") {
			t.Errorf("shard %s stdout: %q", s, stdout)
		}
	}
	merged := filepath.Join(t.TempDir(), "all")
	stdout, msg, code = run(t, "merge", shards, "--out", merged)
	if code != exitInfeasible || !strings.Contains(stdout, "sweep: 5 scenarios: 4 ok, 1 with infeasible legs, 0 failed") {
		t.Errorf("merge: status %d, stdout %q, %s", code, stdout, msg)
	}
	for _, name := range []string{"compare.csv", "compare.md", "compare.xlsx", "rows.jsonl"} {
		a, err1 := os.ReadFile(filepath.Join(out, name))
		b, err2 := os.ReadFile(filepath.Join(merged, name))
		if err1 != nil || err2 != nil || !bytes.Equal(a, b) {
			t.Errorf("merged %s differs from the unsharded one (%v, %v)", name, err1, err2)
		}
	}
	// compare.html links each scenario's folder relative to itself: merged elsewhere, the
	// links lead back to the shards' folder; merged beside the scenarios, the page is the
	// unsharded sweep's, byte for byte.
	page, err := os.ReadFile(filepath.Join(merged, "compare.html"))
	if err != nil {
		t.Fatal(err)
	}
	links := regexp.MustCompile(`href="([^"#]+)"`).FindAllSubmatch(page, -1)
	if len(links) != 5 {
		t.Errorf("merged compare.html: %d scenario links, want 5 (one per planned scenario)", len(links))
	}
	for _, l := range links {
		if _, err := os.Stat(filepath.Join(merged, filepath.FromSlash(string(l[1])))); err != nil || !strings.HasPrefix(string(l[1]), "../") {
			t.Errorf("merged compare.html links %s: %v", l[1], err)
		}
	}
	if _, _, code := run(t, "merge", shards, "--out", shards); code != exitInfeasible {
		t.Errorf("merge in place: status %d", code)
	}
	a, err1 := os.ReadFile(filepath.Join(out, "compare.html"))
	b, err2 := os.ReadFile(filepath.Join(shards, "compare.html"))
	if err1 != nil || err2 != nil || !bytes.Equal(a, b) {
		t.Errorf("compare.html merged beside the scenarios differs from the unsharded one (%v, %v)", err1, err2)
	}
	if _, msg, code := run(t, "merge", t.TempDir(), "--out", t.TempDir()); code != exitInvalid || !strings.Contains(msg, "no rows file") {
		t.Errorf("merge of an empty folder: status %d, %s", code, msg)
	}
}

func TestSweepExitStatus(t *testing.T) {
	t.Parallel()
	base, err := filepath.Abs("../../testdata/demo/plan.yaml")
	if err != nil {
		t.Fatal(err)
	}
	write := func(body string) string {
		path := filepath.Join(t.TempDir(), "s.yaml")
		if err := os.WriteFile(path, []byte("base: "+base+"\n"+body), 0o644); err != nil {
			t.Fatal(err)
		}
		return path
	}
	cases := []struct {
		name string
		args []string
		code int
		want string
	}{
		{"all ok", []string{write("cases: [{name: base}]")}, exitOK, ""},
		{"infeasible legs", []string{write("cases: [{name: d, defaults.redundancy: diverse}]")}, exitInfeasible, "1 of 1 scenario has infeasible legs"},
		{"invalid sweep file", []string{filepath.Join(sweepFixtures, "bad.yaml")}, exitInvalid, `bad.yaml:9:44: case "strands-text": defaults.strands: want an integer, got "many"`},
		// Checked before any scenario is planned (TestSweepPreflightWritesNothing).
		{"a scenario's plan invalid", []string{filepath.Join(sweepFixtures, "small.yaml")}, exitInvalid,
			`small.yaml:10:26: case "bad-hub": hub: want the id of a building, got "NOWHERE", which no building has`},
		{"bad shard", []string{write("cases: [{name: base}]"), "--shard", "3/2"}, exitInvalid, "--shard"},
		{"bad jobs", []string{write("cases: [{name: base}]"), "--jobs", "0"}, exitInvalid, "--jobs"},
		{"no sweep file", nil, exitInvalid, "name exactly one sweep file"},
		// The mirror of a sweep file given to plan: one line naming the file a plan, and the
		// command to run, instead of "base: missing" and an unknown key per plan key.
		{"a plan file", []string{"../../testdata/demo/plan.yaml"}, exitInvalid,
			"plan.yaml:4:1: campus: this is a plan file (it has campus: and no base:, vary: or cases:), not a sweep file; run `spanwright plan ../../testdata/demo/plan.yaml --out DIR`"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			args := append([]string{"sweep", "--quiet", "--out", t.TempDir()}, tc.args...)
			_, msg, code := run(t, args...)
			if code != tc.code || !strings.Contains(msg, tc.want) {
				t.Errorf("%s: got status %d, %q; want %d, %q", tc.name, code, msg, tc.code, tc.want)
			}
			if tc.name == "a plan file" && strings.Count(strings.TrimSpace(msg), "\n") != 0 {
				t.Errorf("%s: %d lines, want one:\n%s", tc.name, strings.Count(msg, "\n")+1, msg)
			}
		})
	}
}

func TestSweepFull(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name string
		args []string
		want bool
	}{{"lean by default", nil, false}, {"full", []string{"--full"}, true}} {
		out := t.TempDir()
		args := append([]string{"sweep", filepath.Join(sweepFixtures, "valid.yaml"), "--out", out, "--quiet"}, tc.args...)
		if _, msg, code := run(t, args...); code != exitInfeasible {
			t.Fatalf("%s: exit %d: %s", tc.name, code, msg)
		}
		dirs, _ := filepath.Glob(filepath.Join(out, "*", "summary.json"))
		if len(dirs) == 0 {
			t.Fatalf("%s: no scenario folders", tc.name)
		}
		for _, s := range dirs {
			dir := filepath.Dir(s)
			for _, name := range []string{"bom.xlsx", "report.html"} {
				_, err := os.Stat(filepath.Join(dir, name))
				if got := err == nil; got != tc.want {
					t.Errorf("%s: %s in %s: got %v, want %v", tc.name, name, filepath.Base(dir), got, tc.want)
				}
			}
			if _, err := os.Stat(filepath.Join(dir, "bom.csv")); err != nil {
				t.Errorf("%s: bom.csv missing in %s", tc.name, filepath.Base(dir))
			}
		}
		if _, err := os.Stat(filepath.Join(out, "compare.html")); err != nil {
			t.Errorf("%s: compare.html missing", tc.name)
		}
	}
}

// TestSweepScenarioReproducedByPlan: every scenario of a sweep of the demo campus (with
// --full: every file) is, byte for byte, what `plan` writes alone from its plan.yaml, by
// default as with --cold: the campus is small enough for the optimizer's full search from
// scratch, so no scenario is warm-started (routing.StartPays; tester 12's findings 1 and 7).
// A warm-started scenario's plan.yaml names the `plan --start-from` command that reproduces
// it; the sweep package's warm tests hold those scenarios to the same bytes in every shard
// and on --resume, and `plan --start-from` itself still starts from what it is given. The
// project's rule (same inputs, same bytes) and the README's promise that a scenario can be
// reproduced alone.
func TestSweepScenarioReproducedByPlan(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	base, err := filepath.Abs("../../testdata/demo/plan.yaml")
	if err != nil {
		t.Fatal(err)
	}
	low, _ := filepath.Abs(filepath.Join(sweepFixtures, "prices-low.yaml"))
	high, _ := filepath.Abs(filepath.Join(sweepFixtures, "prices-high.yaml"))
	sweepFile := filepath.Join(dir, "prices.yaml")
	body := "base: " + base + "\nvary:\n  prices: [" + low + ", " + high + "]\n  design.allow_new_trench: [true, false]\n" +
		"cases:\n  - {name: all-diverse, defaults.redundancy: diverse, prices: " + high + "}\n" +
		// The base's optimizer problem (a budget is no route cost): the base's plan, not searched again.
		"  - {name: same-problem, prices: " + low + ", budget: 500000}\n"
	if err := os.WriteFile(sweepFile, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	var baseFolder, otherFolder string // of the default sweep
	for _, mode := range []string{"default", "cold"} {
		out := filepath.Join(dir, mode)
		args := []string{"sweep", sweepFile, "--out", out, "--quiet", "--full"}
		if mode == "cold" {
			args = append(args, "--cold")
		}
		if _, msg, code := run(t, args...); code != exitOK && code != exitInfeasible {
			t.Fatalf("%s sweep: status %d: %s", mode, code, msg)
		}
		ents, err := os.ReadDir(out)
		if err != nil {
			t.Fatal(err)
		}
		var scenarios []string
		first := ""
		for _, e := range ents {
			if !e.IsDir() {
				continue
			}
			scenarios = append(scenarios, e.Name())
			if strings.HasPrefix(e.Name(), "prices-low-allow_new_trench-") { // scenario 0: the first value of each axis
				first = e.Name()
			}
		}
		if len(scenarios) != 6 || first == "" {
			t.Fatalf("%s: scenario folders %v, base %q", mode, scenarios, first)
		}
		if mode == "default" {
			baseFolder = filepath.Join(out, first)
			otherFolder = filepath.Join(out, scenarios[slices.IndexFunc(scenarios, func(s string) bool { return s != first })])
		}
		for _, sc := range scenarios {
			args := []string{"plan", filepath.Join(out, sc, "plan.yaml"), "--out", filepath.Join(dir, mode+"-plan-"+sc)}
			summary, _ := os.ReadFile(filepath.Join(out, sc, "summary.json"))
			planYAML, _ := os.ReadFile(filepath.Join(out, sc, "plan.yaml"))
			// A warm scenario's plan.yaml says how to reproduce it: that command is the one run.
			again := regexp.MustCompile(`(?m)^#   spanwright (plan OUT/\S+ --start-from OUT/(\S+) --out DIR)$`).FindSubmatch(planYAML)
			if bytes.Contains(summary, []byte(`"started_from"`)) || again != nil || bytes.Contains(planYAML, []byte("warm start")) {
				t.Errorf("%s %s: summary.json or plan.yaml names a start", mode, sc)
			}
			if _, msg, code := run(t, args...); code != exitOK && code != exitInfeasible {
				t.Fatalf("%s: status %d: %s", strings.Join(args, " "), code, msg)
			}
			for _, name := range []string{"routes.geojson", "links.csv", "summary.json", "bom.csv", "bom.xlsx", "plan.gpkg", "report.html"} {
				a, err1 := os.ReadFile(filepath.Join(out, sc, name))
				b, err2 := os.ReadFile(filepath.Join(dir, mode+"-plan-"+sc, name))
				if err1 != nil || err2 != nil || !bytes.Equal(a, b) {
					t.Errorf("%s sweep %s: %s differs from plan's (%v, %v)", mode, sc, name, err1, err2)
				}
			}
		}
		// Identical problems give identical plans: the same routes, the same objective.
		var same string
		for _, sc := range scenarios {
			if strings.HasPrefix(sc, "same-problem-") {
				same = sc
			}
		}
		a, _ := os.ReadFile(filepath.Join(out, first, "routes.geojson"))
		b, _ := os.ReadFile(filepath.Join(out, same, "routes.geojson"))
		if same == "" || len(a) == 0 || !bytes.Equal(a, b) || !bytes.HasPrefix(a, []byte(`{"type":"FeatureCollection","problem_sha256":"`)) {
			t.Errorf("%s: the same-problem scenario %q's routes.geojson is not the base's, with its problem_sha256", mode, same)
		}
		objective := func(sc string) string {
			data, _ := os.ReadFile(filepath.Join(out, sc, "summary.json"))
			return regexp.MustCompile(`"objective_cents": *\d+`).FindString(string(data))
		}
		if objective(first) == "" || objective(first) != objective(same) {
			t.Errorf("%s: objective %q of the base, %q of the same problem", mode, objective(first), objective(same))
		}
		note, _ := os.ReadFile(filepath.Join(out, same, "summary.json"))
		if reused := bytes.Contains(note, []byte("a plan of this same routing problem")); reused {
			t.Errorf("%s: the same-problem scenario's summary says the base's plan was reused: %v", mode, reused)
		}
	}
	// `plan --start-from` starts from what it is given, whatever the campus's size: only a
	// sweep asks whether a warm start is worth it.
	warm := filepath.Join(dir, "plan-start-from")
	if _, msg, code := run(t, "plan", filepath.Join(otherFolder, "plan.yaml"), "--start-from", baseFolder, "--out", warm); code != exitOK && code != exitInfeasible {
		t.Fatalf("plan --start-from: status %d: %s", code, msg)
	}
	if summary, _ := os.ReadFile(filepath.Join(warm, "summary.json")); !bytes.Contains(summary, []byte(`"started_from": "`+filepath.Base(baseFolder)+`"`)) {
		t.Errorf("plan --start-from %s: summary.json names no start:\n%.400s", baseFolder, summary)
	}
}

// TestProgressCountsPlannedOnly: on a resumed sweep, the rate and the time left count only
// the scenarios planned in this run. 100 of 200 scenarios are kept at once, then one is
// planned every 2 s: at 20 s, 10 planned in 20 s is 0.5 per second and the 90 not yet
// reached take about 180 s (counting the kept ones would say 5.5 per second and 16 s). The
// bar on a terminal counts the scenarios to plan (its length less the kept ones) and the
// closing line the planned ones.
func TestProgressCountsPlannedOnly(t *testing.T) {
	t.Parallel()
	var buf bytes.Buffer
	clock := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)
	p := newProgress(&buf, false)
	p.now = func() time.Time { return clock }
	p.start, p.last = clock, clock
	s := sweep.Progress{Total: 200}
	for i := 0; i < 100; i++ {
		s.Done++
		s.Skipped++
		p.update(s)
	}
	for i := 0; i < 10; i++ {
		clock = clock.Add(2 * time.Second)
		s.Done++
		p.update(s)
	}
	want := "sweep: 105/200 scenarios (100 kept), 0.5 planned per second, about 3m10s left\n" +
		"sweep: 110/200 scenarios (100 kept), 0.5 planned per second, about 3m0s left\n"
	if buf.String() != want {
		t.Errorf("progress lines:\ngot  %q\nwant %q", buf.String(), want)
	}
	buf.Reset()
	p.finish(true)
	if got := buf.String(); got != "sweep: 10 scenarios planned in 20s, 0.5 per second\n" {
		t.Errorf("closing line: got %q", got)
	}

	tty := newProgress(io.Discard, false)
	tty.tty = true
	tty.update(sweep.Progress{Total: 200, Done: 100, Skipped: 100})
	tty.update(sweep.Progress{Total: 200, Done: 110, Skipped: 100})
	if st := tty.bar.State(); st.Max != 100 || st.CurrentNum != 10 {
		t.Errorf("bar: %d of %d, want 10 of 100 (the kept scenarios are not counted)", st.CurrentNum, st.Max)
	}
}

// TestREADMESweepExample runs the shell block of the README's "Sweeps" section as written,
// in an empty folder, with `spanwright` on PATH (this test binary as main): a new user must
// be able to run it from `spanwright starter` alone. It plans 17 scenarios and exits 3, as the
// README says.
func TestREADMESweepExample(t *testing.T) {
	t.Parallel()
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	_, section, _ := strings.Cut(string(readme), "\n## Sweeps\n")
	_, block, ok1 := strings.Cut(section, "```sh\n")
	block, _, ok2 := strings.Cut(block, "```\n")
	if !ok1 || !ok2 || !strings.Contains(block, "spanwright sweep") {
		t.Fatalf("no shell block with a sweep in the README's Sweeps section")
	}
	dir := t.TempDir()
	bin := filepath.Join(dir, "bin")
	if err := os.Mkdir(bin, 0o755); err != nil {
		t.Fatal(err)
	}
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	wrapper := "#!/bin/sh\nSPANWRIGHT_AS_MAIN=1 exec '" + self + "' \"$@\"\n"
	if err := os.WriteFile(filepath.Join(bin, "spanwright"), []byte(wrapper), 0o755); err != nil {
		t.Fatal(err)
	}
	work := filepath.Join(dir, "work")
	if err := os.Mkdir(work, 0o755); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command("bash", "-c", block)
	cmd.Dir = work
	cmd.Env = append(os.Environ(), "PATH="+bin+string(os.PathListSeparator)+os.Getenv("PATH"))
	out, err := cmd.CombinedOutput()
	var ee *exec.ExitError
	if !errors.As(err, &ee) || ee.ExitCode() != exitInfeasible {
		t.Fatalf("the README's sweep: %v, want exit status 3 as the README says\n%s", err, out)
	}
	if !strings.Contains(string(out), "sweep: 17 scenarios: ") {
		t.Errorf("the README's sweep did not plan 17 scenarios:\n%s", out)
	}
	if _, err := os.Stat(filepath.Join(work, "results", "compare.md")); err != nil {
		t.Errorf("the README's sweep wrote no results/compare.md: %v", err)
	}
}

// TestSweepPreflightWritesNothing: a sweep one of whose scenarios names a hub no building has
// (testdata/sweep/small.yaml's bad-hub case) is refused before any scenario is planned:
// status 2, the problem at the case's line in the sweep file, no summary on stdout, and no
// output folder made.
func TestSweepPreflightWritesNothing(t *testing.T) {
	t.Parallel()
	out := filepath.Join(t.TempDir(), "results")
	stdout, msg, code := run(t, "sweep", filepath.Join(sweepFixtures, "small.yaml"), "--out", out)
	if code != exitInvalid || !strings.Contains(msg, `small.yaml:10:26: case "bad-hub": hub: want the id of a building, got "NOWHERE"`) {
		t.Errorf("got status %d, %q; want 2 and the bad hub at its place in the sweep file", code, msg)
	}
	if stdout != "" || strings.Contains(msg, "planned") {
		t.Errorf("a refused sweep printed a summary or progress: stdout %q, stderr %q", stdout, msg)
	}
	if _, err := os.Stat(out); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("a refused sweep made %s (%v)", out, err)
	}
}

// TestPrintReportRankedApart: the sweep's terminal says how many ok scenarios the comparison
// ranks apart because their books leave items out of the total (tester 6's finding 5, review
// 4 F4).
func TestPrintReportRankedApart(t *testing.T) {
	var b strings.Builder
	printReport(&b, &sweep.Report{Scenarios: 2, Run: 2, OK: 2, Incomplete: 1, OKSets: 2}, sweep.Shard{})
	if want := "note: 1 scenario ok but ranked apart: the price book leaves items out of the total, so each is ranked only among scenarios leaving out the same items"; !strings.Contains(b.String(), want) {
		t.Errorf("terminal:\n%s\nwant %q", b.String(), want)
	}
	// Tester 14 F10: six ok scenarios all leaving out the same item are one ranked set, so
	// nothing is ranked apart.
	b.Reset()
	printReport(&b, &sweep.Report{Scenarios: 6, Run: 6, OK: 6, Incomplete: 6, OKSets: 1}, sweep.Shard{})
	if strings.Contains(b.String(), "apart") {
		t.Errorf("one ranked set, yet the terminal says ranked apart:\n%s", b.String())
	}
	if want := "note: 6 scenarios ok, every total leaving out the same items the price book does not price: ranked together"; !strings.Contains(b.String(), want) {
		t.Errorf("terminal:\n%s\nwant %q", b.String(), want)
	}
}
