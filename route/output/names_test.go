package output

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/plan"
	"spanwright/route/workbook"
)

// TestSummaryNames pins the names of summary.json's budget and bound members, each carrying
// its unit: format first, then budget_cents, over_budget_cents and over_budget_pct, and
// lower_bound_cents and gap_pct (a percentage like over_budget_pct, not a fraction); the
// names of format 1 (lower_bound, gap) are gone. On the demo the gap is 100 × (objective −
// bound) / bound and over_budget_pct 100 × (total − budget) / budget (the definitions in
// the README), and the terminal prints the gap with GapText.
func TestSummaryNames(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	var b bytes.Buffer
	if err := summaryJSON(&b, r); err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(b.Bytes(), []byte("{\n  \"format\": \""+SummaryFormat+"\",\n")) {
		t.Errorf("summary.json does not begin with its format %q:\n%.80s", SummaryFormat, b.String())
	}
	var m map[string]json.RawMessage
	if err := json.Unmarshal(b.Bytes(), &m); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"format", "total_cents", "budget_cents", "over_budget_cents", "over_budget_pct", "objective_cents", "lower_bound_cents", "gap_pct"} {
		if v, ok := m[k]; !ok || string(v) == "null" {
			t.Errorf("summary.json of the demo: %s is %s, want a value", k, v)
		}
	}
	for _, k := range []string{"lower_bound", "gap"} {
		if _, ok := m[k]; ok {
			t.Errorf("summary.json still has %s (format 1's name)", k)
		}
	}
	var s struct {
		Format          string  `json:"format"`
		TotalCents      int64   `json:"total_cents"`
		BudgetCents     int64   `json:"budget_cents"`
		OverBudgetCents int64   `json:"over_budget_cents"`
		OverBudgetPct   float64 `json:"over_budget_pct"`
		ObjectiveCents  int64   `json:"objective_cents"`
		LowerBoundCents int64   `json:"lower_bound_cents"`
		GapPct          float64 `json:"gap_pct"`
	}
	if err := json.Unmarshal(b.Bytes(), &s); err != nil {
		t.Fatal(err)
	}
	if s.BudgetCents != int64(r.Plan.Budget) || s.OverBudgetCents != s.TotalCents-s.BudgetCents ||
		math.Abs(s.OverBudgetPct-100*float64(s.OverBudgetCents)/float64(s.BudgetCents)) > 0.05 {
		t.Errorf("budget: %d, over %d (%v %%) of total %d; want the plan's %d and the difference in percent of it",
			s.BudgetCents, s.OverBudgetCents, s.OverBudgetPct, s.TotalCents, r.Plan.Budget)
	}
	if s.LowerBoundCents != r.LowerBoundCents || s.LowerBoundCents <= 0 ||
		math.Abs(s.GapPct-100*float64(s.ObjectiveCents-s.LowerBoundCents)/float64(s.LowerBoundCents)) > 0.00005 {
		t.Errorf("bound %d, gap %v %%, objective %d; want the result's bound %d and the gap in percent of it",
			s.LowerBoundCents, s.GapPct, s.ObjectiveCents, r.LowerBoundCents)
	}
	var term bytes.Buffer
	if err := PrintSummary(&term, r, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if want := ", gap " + GapText(&s.GapPct); !strings.Contains(term.String(), want) {
		t.Errorf("terminal lacks %q:\n%s", want, term.String())
	}
}

// TestGapText: the gap's one formatting, two decimals and the percent sign; a dash for none.
func TestGapText(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		pct  *float64
		want string
	}{{fp(4.4158), "4.42 %"}, {fp(0), "0.00 %"}, {fp(12.5), "12.50 %"}, {nil, "—"}} {
		if got := GapText(tc.pct); got != tc.want {
			t.Errorf("GapText(%v): got %q, want %q", tc.pct, got, tc.want)
		}
	}
	if got := PctText(4.4158); got != "4.42" {
		t.Errorf("PctText(4.4158): got %q, want 4.42", got)
	}
}

func fp(x float64) *float64 { return &x }

// TestSummaryNulls: a plan without a budget (absent or 0) writes null for budget_cents,
// over_budget_cents and over_budget_pct, not a budget of 0, and the terminal prints no
// budget line; with the length objective (no bound is computed) lower_bound_cents and
// gap_pct are null and the terminal prints no optimizer line. A plan with both has values.
func TestSummaryNulls(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name              string
		budget            plan.Money
		objective         string
		noBudget, noBound bool
	}{
		{"no budget, length objective", 0, plan.ObjectiveLength, true, true},
		{"no budget, cost objective", 0, plan.ObjectiveCost, true, false},
		{"budget, length objective", 5_000_000_00, plan.ObjectiveLength, false, true},
		{"budget, cost objective", 5_000_000_00, plan.ObjectiveCost, false, false},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			r, err := testplan.PullSolve(t, 100, 1, func(p *plan.Plan) { p.Budget, p.Design.Objective = tc.budget, tc.objective })
			if err != nil {
				t.Fatal(err)
			}
			var b bytes.Buffer
			if err := summaryJSON(&b, r); err != nil {
				t.Fatal(err)
			}
			var m map[string]json.RawMessage
			if err := json.Unmarshal(b.Bytes(), &m); err != nil {
				t.Fatal(err)
			}
			for _, k := range []string{"budget_cents", "over_budget_cents", "over_budget_pct", "lower_bound_cents", "gap_pct"} {
				v, ok := m[k]
				wantNull := tc.noBudget
				if k == "lower_bound_cents" || k == "gap_pct" {
					wantNull = tc.noBound
				}
				if !ok || (string(v) == "null") != wantNull {
					t.Errorf("%s: %s (present %v), want null %v", k, v, ok, wantNull)
				}
			}
			var term bytes.Buffer
			if err := PrintSummary(&term, r, WriteOptions{}); err != nil {
				t.Fatal(err)
			}
			if got := strings.Contains(term.String(), "\nbudget "); got == tc.noBudget {
				t.Errorf("terminal budget line: %v, want %v:\n%s", got, !tc.noBudget, term.String())
			}
			if got := strings.Contains(term.String(), "\noptimizer: "); got == tc.noBound {
				t.Errorf("terminal optimizer line: %v, want %v:\n%s", got, !tc.noBound, term.String())
			}
		})
	}
}

// TestBOMWorkbookNoBudget: without a budget, bom.xlsx's budget cell is blank (not a budget
// of 0) and both over-budget rows are 0, cached and recalculated; a budget typed into the
// cell makes them check it (total minus budget, and in percent of the budget, one decimal).
func TestBOMWorkbookNoBudget(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolve(t, 100, 1, func(p *plan.Plan) { p.Budget = 0 })
	if err != nil {
		t.Fatal(err)
	}
	files, err := Files(context.Background(), r, WriteOptions{SkipGeoPackage: true})
	if err != nil {
		t.Fatal(err)
	}
	x, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	defer x.Close()
	rows, err := x.Rows("summary")
	if err != nil {
		t.Fatal(err)
	}
	budget, over := -1, -1
	for i, rec := range rows {
		switch {
		case len(rec) > 0 && rec[0] == "budget":
			budget = i + 1
		case len(rec) > 0 && rec[0] == "over (+) or under (-) budget" && over < 0:
			over = i + 1
		}
	}
	if budget < 0 || over != budget+1 {
		t.Fatalf("summary sheet: budget row %d, over-budget rows from %d: %q", budget, over, rows)
	}
	if v, _ := x.Value("summary", fmt.Sprintf("B%d", budget)); v != "" {
		t.Errorf("budget cell without a budget: %q, want blank", v)
	}
	for _, ref := range []string{fmt.Sprintf("B%d", over), fmt.Sprintf("B%d", over+1)} {
		cached, _ := x.Value("summary", ref)
		calc, err := x.Calc("summary", ref)
		if err != nil {
			t.Fatal(err)
		}
		if c, _ := strconv.ParseFloat(cached, 64); c != 0 || calc != "0" {
			t.Errorf("%s without a budget: cached %q, calculated %q; want 0", ref, cached, calc)
		}
	}
	total := r.Estimate.BOM.TotalCents
	budgetCents := total / 2
	if err := x.SetNumber("summary", fmt.Sprintf("B%d", budget), float64(budgetCents)/100); err != nil {
		t.Fatal(err)
	}
	calc := func(ref string) float64 {
		t.Helper()
		v, err := x.Calc("summary", ref)
		if err != nil {
			t.Fatal(err)
		}
		f, err := strconv.ParseFloat(v, 64)
		if err != nil {
			t.Fatalf("%s: %q is not a number", ref, v)
		}
		return f
	}
	if got := int64(math.Round(100 * calc(fmt.Sprintf("B%d", over)))); got != total-budgetCents {
		t.Errorf("over budget with a budget typed in: %d cents, want %d", got, total-budgetCents)
	}
	wantPct := math.Round(1000*float64(total-budgetCents)/float64(budgetCents)) / 10
	if got := calc(fmt.Sprintf("B%d", over+1)); math.Abs(got-wantPct) > 1e-9 {
		t.Errorf("over budget with a budget typed in: %v %%, want %v", got, wantPct)
	}
}
