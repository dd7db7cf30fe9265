package route_test

import (
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/plan"
)

// TestCopperEMINamesSpan: a copper alternative refused on a route over a high-EMI duct names
// the span (tester 10's finding 18: "cat6a rejected by copper-emi: the route crosses a
// high-EMI segment" named none), so that the designer can judge whether a detour is worth it;
// the rule itself is common practice, no published source.
func TestCopperEMINamesSpan(t *testing.T) {
	t.Parallel()
	campus := strings.Replace(copperCampus(), `"id":"D","type":"duct"`, `"id":"D","type":"duct","emi":"high"`, 1)
	if campus == copperCampus() {
		t.Fatal("the copper campus has no duct D to mark")
	}
	r, err := testplan.PullSolveJSON(t, campus, func(p *plan.Plan) {
		p.Links = []plan.LinkSpec{{From: "A", To: "B", Rate: "1G", Strands: 2, Growth: new(float64)}}
		p.Design.AllowOutdoorCopper = true
	})
	if err != nil {
		t.Fatal(err)
	}
	_, leg := testplan.LegOf(t, r, "A-B")
	if !leg.Feasible || leg.Medium == "cat6a" {
		t.Fatalf("leg A-B: feasible %v on %q, want fibre over the high-EMI duct", leg.Feasible, leg.Medium)
	}
	var got string
	for _, x := range leg.Rejected {
		if x.Rule == "copper-emi" {
			got = x.Reason
		}
	}
	if want := "cat6a rejected by copper-emi: the route crosses a high-EMI segment on span D"; !strings.HasPrefix(got, want) {
		t.Errorf("copper's reason %q, want it to begin %q", got, want)
	}
}
