package main

import (
	"bytes"
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// warmRowBuildings is the size of the generated campus TestSweepWarmRowReproducedByPlan
// sweeps: large enough that a sweep warm-starts a scenario from its base (optimize.WarmPays:
// demands × (proposed spans and charges) above the bound of the full search from scratch).
const warmRowBuildings = 200

// TestSweepWarmRowReproducedByPlan: on a campus large enough that the sweep starts a scenario
// from its base's routes, that row is, byte for byte, what the command its plan.yaml names
// writes (`plan OUT/<scenario>/plan.yaml --start-from OUT/<base> --out DIR`): its summary's
// totals, and every file. The README's promise ("Reproducing one scenario alone") and the
// project's rule, same inputs, same bytes; TestSweepScenarioReproducedByPlan holds the rows
// planned from scratch on the demo campus, where no row is warm-started.
func TestSweepWarmRowReproducedByPlan(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	// The generator is internal to route: run it as BenchmarkCommands does (seed 1).
	gen := exec.Command("go", "run", "./route/internal/campusgen/campusfiles", "-buildings", strconv.Itoa(warmRowBuildings), "-out", dir)
	gen.Dir = filepath.Join("..", "..")
	if out, err := gen.CombinedOutput(); err != nil {
		t.Fatalf("generating the campus: %v\n%s", err, out)
	}
	sweepFile := filepath.Join(dir, "sweep.yaml")
	if err := os.WriteFile(sweepFile, []byte("base: plan.yaml\nvary:\n  defaults.rate: [1G, 10G]\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	if _, msg, code := run(t, "sweep", sweepFile, "--out", out, "--quiet"); code != exitOK && code != exitInfeasible {
		t.Fatalf("sweep: status %d: %s", code, msg)
	}
	ents, err := os.ReadDir(out)
	if err != nil {
		t.Fatal(err)
	}
	command := regexp.MustCompile(`(?m)^#   spanwright plan OUT/(\S+)/plan\.yaml --start-from OUT/(\S+) --out DIR$`)
	warm := 0
	for _, e := range ents {
		if !e.IsDir() {
			continue
		}
		summary, err := os.ReadFile(filepath.Join(out, e.Name(), "summary.json"))
		if err != nil {
			t.Fatal(err)
		}
		var s struct {
			StartedFrom string `json:"started_from"`
		}
		if err := json.Unmarshal(summary, &s); err != nil {
			t.Fatal(err)
		}
		if s.StartedFrom == "" {
			continue
		}
		warm++
		planYAML, err := os.ReadFile(filepath.Join(out, e.Name(), "plan.yaml"))
		if err != nil {
			t.Fatal(err)
		}
		m := command.FindSubmatch(planYAML)
		if m == nil || string(m[1]) != e.Name() || string(m[2]) != s.StartedFrom {
			t.Fatalf("%s: plan.yaml names no command planning it from %s:\n%.800s", e.Name(), s.StartedFrom, planYAML)
		}
		again := filepath.Join(dir, "again-"+e.Name())
		args := []string{"plan", filepath.Join(out, string(m[1]), "plan.yaml"), "--start-from", filepath.Join(out, string(m[2])), "--out", again}
		if _, msg, code := run(t, args...); code != exitOK && code != exitInfeasible {
			t.Fatalf("%s: status %d: %s", strings.Join(args, " "), code, msg)
		}
		totals := regexp.MustCompile(`(?m)^  "(total_cents|objective_cents|lower_bound_cents|gap_pct|started_from)": .*$`)
		for _, name := range []string{"summary.json", "routes.geojson", "links.csv", "bom.csv"} {
			a, err1 := os.ReadFile(filepath.Join(out, e.Name(), name))
			b, err2 := os.ReadFile(filepath.Join(again, name))
			if err1 != nil || err2 != nil || !bytes.Equal(a, b) {
				t.Errorf("%s: %s differs from plan --start-from's (%v, %v)", e.Name(), name, err1, err2)
				if name == "summary.json" {
					t.Errorf("sweep %q\nplan  %q", totals.FindAll(a, -1), totals.FindAll(b, -1))
				}
			}
		}
		t.Logf("%s from %s: %q", e.Name(), s.StartedFrom, totals.FindAll(summary, -1))
	}
	if warm == 0 {
		t.Fatalf("no row of the %d-building sweep was warm-started: the campus is too small for the test (optimize.WarmPays)", warmRowBuildings)
	}
}
