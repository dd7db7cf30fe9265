package report

import (
	"context"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestBudgetRow: the report's Budget row qualifies the check of a plan with infeasible legs
// (it covers the feasible legs only), and with every leg infeasible gives no verdict at all,
// saying why (review 17 F8: "under by 99.6 %" with nothing priced). Buildings behind one duct
// T with 1 or 0 spare ducts and no new trench: a duct takes at most three loose cables
// (install.PullLimit; common practice, no published source).
func TestBudgetRow(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name        string
		spare, n    int
		want, never string
	}{
		{"some legs infeasible", 1, 5, "</span> for the 3 feasible legs of 5 only; 2 infeasible legs unpriced", ""},
		{"every leg infeasible", 0, 3, "no verdict: no leg is priced (all 3 legs infeasible)", "under by"},
	} {
		r, err := testplan.PullSolveJSON(t, testsite.FanN(100, tc.spare, tc.n, false), func(p *plan.Plan) {
			p.Design.AllowNewTrench = false
			p.Budget = 10_000_000_00
		})
		if err != nil {
			t.Fatal(err)
		}
		b, err := Plan(context.Background(), r, Options{})
		if err != nil {
			t.Fatal(err)
		}
		html := string(b)
		_, row, _ := strings.Cut(html, "<tr><th>Budget</th>")
		row, _, _ = strings.Cut(row, "</tr>")
		if !strings.Contains(row, tc.want) || (tc.never != "" && strings.Contains(row, tc.never)) {
			t.Errorf("%s: Budget row %q; want %q and never %q", tc.name, row, tc.want, tc.never)
		}
	}
}
