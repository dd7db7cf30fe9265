package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCheckOnlyOverProposed: with design.allow_new_trench: false, check judges reachability
// over the pathways the plan may use: LAB, joined to the hub only by proposed ducts (the
// trench campus with its ducts proposed), is reported and check exits 3, as plan does with
// the same cause in its reason (tester: check said "every building can reach it").
func TestCheckOnlyOverProposed(t *testing.T) {
	data, err := os.ReadFile("testdata/plans/trench.geojson")
	if err != nil {
		t.Fatal(err)
	}
	campus := strings.ReplaceAll(string(data), `"type": "duct"`, `"type": "duct", "status": "proposed", "surface": "turf"`)
	if campus == string(data) {
		t.Fatal("trench.geojson: no duct to propose")
	}
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "campus.geojson"), []byte(campus), 0o644); err != nil {
		t.Fatal(err)
	}
	planText := "name: proposed only\ncampus: [campus.geojson]\ndesign: {allow_new_trench: false}\nlinks:\n  - {to: LAB, rate: 10G}\n"
	if err := os.WriteFile(filepath.Join(dir, "plan.yaml"), []byte(planText), 0o644); err != nil {
		t.Fatal(err)
	}
	out, msg, code := run(t, "check", filepath.Join(dir, "plan.yaml"))
	if code != exitInfeasible || !strings.Contains(msg, "1 building reaches the hub HQ only over proposed pathways (design.allow_new_trench: false): [LAB]") {
		t.Errorf("check: exit %d, %q; want 3 naming LAB", code, msg)
	}
	if want := "proposed    1 building reaches the hub only over proposed pathways, which the plan may not use (design.allow_new_trench: false): [LAB]\n"; !strings.Contains(out, want) {
		t.Errorf("check's report lacks %q:\n%s", want, out)
	}
	out, msg, code = run(t, "plan", filepath.Join(dir, "plan.yaml"), "--out", filepath.Join(dir, "out"))
	if code != exitInfeasible || !strings.Contains(out, "building LAB reaches HQ only over proposed pathways (design.allow_new_trench: false") {
		t.Errorf("plan: exit %d, %q; want 3 and the cause in LAB's reason:\n%s", code, msg, out)
	}
}
