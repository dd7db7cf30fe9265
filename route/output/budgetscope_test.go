package output

import (
	"bytes"
	"context"
	"encoding/json"
	"slices"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/workbook"
)

// TestBudgetScopeInfeasible: the budget check of a plan that leaves legs unserved compares a
// total that prices the feasible legs alone, so wherever it gives its verdict (terminal,
// summary.json, report, bom.xlsx's summary sheet) it says it covers those legs only (tester 12
// F4: "under by 56.4 %" for a plan leaving 10 of 31 legs unserved). Five buildings behind one
// spare duct and no new trench: a duct takes at most three loose cables (install.PullLimit,
// common practice, no published source), so two legs are infeasible.
func TestBudgetScopeInfeasible(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, testsite.FanN(100, 1, 5, false), func(p *plan.Plan) {
		p.Design.AllowNewTrench = false
		p.Budget = 10_000_000_00 // far above the total: "under" is the verdict to qualify
	})
	if err != nil {
		t.Fatal(err)
	}
	s := Summarize(r)
	if s.Infeasible == 0 || s.Infeasible == s.Legs {
		t.Fatalf("%d of %d legs infeasible; the test wants some of each", s.Infeasible, s.Legs)
	}
	want := "for the 3 feasible legs of 5 only; 2 infeasible legs unpriced"
	if !s.BudgetFeasibleOnly || s.BudgetScope() != want {
		t.Fatalf("budget_feasible_legs_only %v, scope %q; want true, %q", s.BudgetFeasibleOnly, s.BudgetScope(), want)
	}
	var term bytes.Buffer
	if err := PrintSummary(&term, r, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(term.String(), "%) "+want+"\n") {
		t.Errorf("terminal budget line lacks the scope:\n%s", term.String())
	}
	files, err := Files(context.Background(), r, WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var js map[string]any
	if err := json.Unmarshal(testplan.FileOf(t, files, "summary.json"), &js); err != nil {
		t.Fatal(err)
	}
	if js["budget_feasible_legs_only"] != true {
		t.Errorf("summary.json budget_feasible_legs_only %v, want true", js["budget_feasible_legs_only"])
	}
	xl, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	defer xl.Close()
	rows, err := xl.Rows("summary")
	if err != nil {
		t.Fatal(err)
	}
	if !slices.ContainsFunc(rows, func(row []string) bool {
		return len(row) > 1 && row[0] == rowNote && row[1] == "the budget check "+want
	}) {
		t.Errorf("bom.xlsx summary sheet has no note on the budget check's scope: %q", rows)
	}

	// Every leg feasible: no flag, no words.
	r, err = testplan.PullSolveJSON(t, testsite.FanN(100, 1, 3, false), func(p *plan.Plan) { p.Budget = 10_000_000_00 })
	if err != nil {
		t.Fatal(err)
	}
	if s := Summarize(r); s.Infeasible != 0 || s.BudgetFeasibleOnly || s.BudgetScope() != "" {
		t.Errorf("all feasible: %d infeasible, flag %v, scope %q", s.Infeasible, s.BudgetFeasibleOnly, s.BudgetScope())
	}
}

// TestBudgetNoLegPriced: with every leg infeasible the total prices no leg, so the budget check
// gives no verdict and says why, in the terminal, the report and bom.xlsx, instead of "under by
// 99.6 %" (review 17 F8). Three buildings behind a duct with no spare and no new trench.
func TestBudgetNoLegPriced(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, testsite.FanN(100, 0, 3, false), func(p *plan.Plan) {
		p.Design.AllowNewTrench = false
		p.Budget = 10_000_000_00
	})
	if err != nil {
		t.Fatal(err)
	}
	s := Summarize(r)
	if s.Infeasible != s.Legs || s.Legs == 0 {
		t.Fatalf("%d of %d legs infeasible; the test wants all", s.Infeasible, s.Legs)
	}
	want := "no verdict: no leg is priced (all 3 legs infeasible)"
	if !s.NoLegPriced() || s.BudgetScope() != want {
		t.Fatalf("no leg priced %v, scope %q; want true, %q", s.NoLegPriced(), s.BudgetScope(), want)
	}
	var term bytes.Buffer
	if err := PrintSummary(&term, r, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(term.String(), ": "+want+"\n") || strings.Contains(term.String(), "under by") {
		t.Errorf("terminal budget line gives a verdict or lacks %q:\n%s", want, term.String())
	}
	files, err := Files(context.Background(), r, WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	xl, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	defer xl.Close()
	rows, err := xl.Rows("summary")
	if err != nil {
		t.Fatal(err)
	}
	if !slices.ContainsFunc(rows, func(row []string) bool {
		return len(row) > 1 && row[0] == rowNote && row[1] == "the budget check: "+want
	}) {
		t.Errorf("bom.xlsx summary sheet has no note that the check gives no verdict: %q", rows)
	}
}
