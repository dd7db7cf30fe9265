package route_test

import (
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestInfeasibleNamesFullDucts: a leg that full ducts keep out names the span whose ducts
// are full, with its spare ducts and the cables in them, and leads with the media the plan may
// use (tester 12 F5: the reason led with copper, never allowed outdoors, and named no span).
// Five buildings behind span T, one spare duct, no new trench: a duct takes at most three loose
// cables (install.PullLimit, common practice, no published source), so two legs find no room.
func TestInfeasibleNamesFullDucts(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, testsite.FanN(100, 1, 5, false), func(p *plan.Plan) { p.Design.AllowNewTrench = false })
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, l := range r.Legs {
		if l.Feasible {
			continue
		}
		n++
		if !strings.Contains(l.Reason, "no room on span T (1 spare duct, 3 cables of this plan in them), where this plan may add no duct") {
			t.Errorf("%s/%s: reason %q does not name span T's full duct", l.Link.ID, l.Name, l.Reason)
		}
		if cu := strings.Index(l.Reason, "cat6a"); cu >= 0 && cu < strings.Index(l.Reason, "os2") {
			t.Errorf("%s/%s: reason %q leads with copper, which the rules keep off the duct", l.Link.ID, l.Name, l.Reason)
		}
	}
	if n != 2 {
		t.Errorf("%d legs infeasible, want 2", n)
	}
}
