package sweep

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/route/internal/testsite"
	"spanwright/route/output"
)

// TestWarmFullBank (warmAlways: by default a campus this small is planned from scratch):
// every link of the fan campus crosses duct T, whose one 100 mm bank has no
// spare duct. The base scenario may build new trench and lays added duct beside T for the
// links; the "no new trench" scenario started warm from it keeps none of those routes (a
// duct with no room: T has no spare duct and the scenario may add none), so its legs are as
// infeasible as planned cold, its total the cold one, and no duct is left overfull (NFPA 70
// Chapter 9 Table 1 fill, the duct fill rows' rule); its note counts the links placed afresh
// for a duct with no room and names T. Same bytes with one worker and two.
func TestWarmFullBank(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	files := map[string]string{
		"campus.geojson": testsite.FanCampus(100, 0, false),
		"plan.yaml":      "campus: [campus.geojson]\nhub: A\n",
		"s.yaml":         "base: plan.yaml\nvary:\n  design.allow_new_trench: [true, false]\n",
	}
	for name, data := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	f, err := Load(filepath.Join(dir, "s.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	opt := func(out string, jobs int, cold bool) Options {
		return Options{Out: filepath.Join(dir, out), Jobs: jobs, Cold: cold, warmAlways: !cold, Write: output.WriteOptions{SkipWorkbook: true, SkipGeoPackage: true}}
	}
	run(t, f, opt("warm", 2, false))
	run(t, f, opt("warm1", 1, false))
	run(t, f, opt("cold", 2, true))
	sameTree(t, "one worker", tree(t, filepath.Join(dir, "warm")), tree(t, filepath.Join(dir, "warm1")))
	type summary struct {
		StartedFrom    string   `json:"started_from"`
		InfeasibleLegs int      `json:"infeasible_legs"`
		TotalCents     int64    `json:"total_cents"`
		Notes          []string `json:"notes"`
		Warnings       []string `json:"warnings"`
	}
	read := func(out, id string) summary {
		t.Helper()
		data, err := os.ReadFile(filepath.Join(dir, out, id, SummaryFile))
		if err != nil {
			t.Fatal(err)
		}
		var s summary
		if err := json.Unmarshal(data, &s); err != nil {
			t.Fatal(err)
		}
		return s
	}
	sc := f.Scenarios()
	base, nt := read("warm", sc[0].ID), read("warm", sc[1].ID)
	if base.InfeasibleLegs != 0 {
		t.Fatalf("base scenario: %d legs infeasible, want every link through T in added duct", base.InfeasibleLegs)
	}
	cold := read("cold", sc[1].ID)
	if nt.StartedFrom != sc[0].ID {
		t.Fatalf("%s started from %q, want the base %s", sc[1].ID, nt.StartedFrom, sc[0].ID)
	}
	if nt.InfeasibleLegs != cold.InfeasibleLegs || nt.InfeasibleLegs == 0 || nt.TotalCents != cold.TotalCents {
		t.Errorf("no new trench, warm: %d legs infeasible, %d cents; cold: %d, %d cents; want the same, with T full",
			nt.InfeasibleLegs, nt.TotalCents, cold.InfeasibleLegs, cold.TotalCents)
	}
	for _, w := range nt.Warnings {
		if strings.Contains(w, "fit no duct") {
			t.Errorf("warm no-new-trench scenario overfull: %s", w)
		}
	}
	note := strings.Join(nt.Notes, "\n")
	if !strings.Contains(note, "placed afresh, for a duct with no room") || !strings.Contains(note, "span T has no spare duct and this plan may add none") {
		t.Errorf("notes %q: want the links placed afresh for a duct with no room, naming T", nt.Notes)
	}
}
