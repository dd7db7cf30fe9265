package output

import (
	"context"
	"encoding/json"
	"slices"
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

// TestCSVSafetyPointer (tester 13's finding H, tester 14 F16): the CSVs a crew and an
// estimator are handed point to the plan's cautions, and stay one table each for a CSV
// reader: bom.csv in a closing note row of the bill's eight columns, the pointer counting and
// naming every caution, the files that say what to do, deferring to the codes and the
// authority having jurisdiction; links.csv in its last column, each leg's own cautions by key
// (the keys the safety sheet and the report give): the laser caution on every fibre leg
// (IEC 60825-1, -2, from memory), a leg's others only where its own route calls for them,
// and every caution of the plan called for by some leg.
func TestCSVSafetyPointer(t *testing.T) {
	r := testplan.DemoResult(t)
	note := SafetyNote(r)
	for _, want := range []string{"safety: " + Counted(len(r.Cautions), "caution", "cautions"), "report.html (Safety)", "summary.json (cautions)",
		"bom.xlsx (sheet safety)", "authority having jurisdiction", strings.ToLower(r.Cautions[len(r.Cautions)-1].Title)} {
		if !strings.Contains(note, want) {
			t.Errorf("safety note %q lacks %q", note, want)
		}
	}
	files, err := Files(context.Background(), r, WriteOptions{SkipWorkbook: true, SkipGeoPackage: true})
	if err != nil {
		t.Fatal(err)
	}
	links := testplan.ReadCSV(t, testplan.FileOf(t, files, "links.csv"))
	head := links[0]
	if head[len(head)-1] != "safety" {
		t.Errorf("links.csv ends with %q, want safety", head[len(head)-1])
	}
	var ids []string
	for _, c := range r.Cautions {
		ids = append(ids, c.ID)
	}
	called := map[string]bool{}
	distinct := map[string]bool{}
	for i, row := range links[1:] {
		if len(row) != len(head) {
			t.Errorf("links.csv row %s: %d cells (header %d)", row[0], len(row), len(head))
			continue
		}
		cell := row[len(row)-1]
		distinct[cell] = true
		if len(cell) > 120 {
			t.Errorf("links.csv row %s: safety cell of %d characters, want keys: %q", row[0], len(cell), cell)
		}
		keys := strings.Fields(cell)
		for _, k := range keys {
			if !slices.Contains(ids, k) {
				t.Errorf("links.csv row %s: safety key %q is none of the plan's cautions %v", row[0], k, ids)
			}
			called[k] = true
		}
		l := &r.Legs[i]
		fibre := l.Feasible && r.Engine.Catalog().Medium(l.Medium) != nil && r.Engine.Catalog().Medium(l.Medium).Fibre()
		if slices.Contains(keys, route.CautionLaser) != fibre {
			t.Errorf("links.csv row %s (%s, feasible %v): keys %q, laser caution %v, want %v", row[0], l.Medium, l.Feasible, cell, !fibre, fibre)
		}
		if !l.Feasible && cell != "" {
			t.Errorf("links.csv row %s: an infeasible leg is given cautions %q", row[0], cell)
		}
	}
	for _, id := range ids {
		if !called[id] {
			t.Errorf("caution %q is called for by no leg of links.csv", id)
		}
	}
	if len(distinct) < 2 {
		t.Errorf("every leg of the demo has the same cautions %v: want each leg's own", distinct)
	}
	bom := testplan.ReadCSV(t, testplan.FileOf(t, files, "bom.csv"))
	if last := bom[len(bom)-1]; len(last) != len(bom[0]) || last[0] != rowNote || last[1] != note {
		t.Errorf("bom.csv ends with %q, want the note row %q", last, note)
	}
}
