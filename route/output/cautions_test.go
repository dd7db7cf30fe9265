package output

import (
	"encoding/json"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
)

// TestSummaryCautions: summary.json carries the plan's safety cautions, the one list the
// report, bom.xlsx and the terminal show (route.Result.Cautions), each with what in this plan
// calls for it and its source, and the planning-aid line, so that a sweep's lean scenario
// folders (no report.html without --full) carry them too (tester 12's finding 2; the sources
// are the cautions' own: 29 CFR 1926 Subpart P, one-call laws, NESC and the others).
func TestSummaryCautions(t *testing.T) {
	r := testplan.DemoResult(t)
	if len(r.Cautions) == 0 {
		t.Fatal("the demo plan calls for no caution")
	}
	data, err := json.Marshal(Summarize(r))
	if err != nil {
		t.Fatal(err)
	}
	var s struct {
		Cautions []struct {
			ID, Title, Where, Source string
		} `json:"cautions"`
		PlanningAid string `json:"planning_aid"`
	}
	if err := json.Unmarshal(data, &s); err != nil {
		t.Fatal(err)
	}
	if len(s.Cautions) != len(r.Cautions) || s.PlanningAid != route.PlanningAid {
		t.Fatalf("summary.json: %d cautions (the plan %d), planning_aid %q", len(s.Cautions), len(r.Cautions), s.PlanningAid)
	}
	for i, c := range r.Cautions {
		got := s.Cautions[i]
		if got.ID != c.ID || got.Title != c.Title || got.Where != c.Where || got.Source != c.Source || got.Where == "" {
			t.Errorf("caution %d: %+v, want %s %q %q %q", i, got, c.ID, c.Title, c.Where, c.Source)
		}
	}
	r2 := *r
	r2.Cautions = nil
	if data, _ := json.Marshal(Summarize(&r2)); !json.Valid(data) || !strings.Contains(string(data), `"cautions":[]`) {
		t.Errorf("a plan calling for no caution: want \"cautions\": [], got %s", data)
	}
}
