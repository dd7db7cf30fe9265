package route_test

import (
	"strings"
	"testing"

	"spanwright/route"
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
	if n := fullOnT(t, r); n != 2 {
		t.Errorf("%d legs infeasible, want 2", n)
	}
}

// fullOnT checks that every infeasible leg of r names span T's full duct, leading with the
// media the plan may use, and returns how many there are.
func fullOnT(t *testing.T, r *route.Result) int {
	t.Helper()
	n := 0
	for _, l := range r.Legs {
		if l.Feasible {
			continue
		}
		n++
		if !strings.Contains(l.Reason, "no room on span T (1 spare duct, 3 cables of this plan in them") || !strings.Contains(l.Reason, "), where this plan may add no duct") {
			t.Errorf("%s/%s: reason %q does not name span T's full duct", l.Link.ID, l.Name, l.Reason)
		}
		if cu := strings.Index(l.Reason, "cat6a"); cu >= 0 && cu < strings.Index(l.Reason, "os2") {
			t.Errorf("%s/%s: reason %q leads with copper, which the rules keep off the duct", l.Link.ID, l.Name, l.Reason)
		}
	}
	return n
}

// TestMethodNoneAddsNoDuct: five buildings behind span T, one spare duct, new trench allowed:
// the plan adds ducts beside T for the legs a duct of three loose cables leaves out
// (install.PullLimit, common practice, no published source). With T's method "none" (a
// conduit on a bridge, a casing under a railway: nothing may be built beside it; tester 15
// F12) it adds none, and the two legs name T's full duct, as with no new trench at all.
func TestMethodNoneAddsNoDuct(t *testing.T) {
	t.Parallel()
	campus := testsite.FanN(100, 1, 5, false)
	r, err := testplan.PullSolveJSON(t, campus, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range r.Legs {
		if !l.Feasible {
			t.Errorf("method trench: %s/%s infeasible: %s", l.Link.ID, l.Name, l.Reason)
		}
	}
	if added := testplan.BOMQty(r.Estimate.BOM, "added duct"); added == 0 {
		t.Error("method trench: no duct added beside T, want the ducts the two last legs need")
	}
	none := strings.Replace(campus, `"spare_ducts":1,`, `"spare_ducts":1,"method":"none",`, 1)
	if none == campus {
		t.Fatal("test campus: T's spare_ducts not found")
	}
	r, err = testplan.PullSolveJSON(t, none, nil)
	if err != nil {
		t.Fatal(err)
	}
	n := fullOnT(t, r)
	for _, l := range r.Legs {
		if !l.Feasible && !strings.Contains(l.Reason, `span T (1 spare duct, 3 cables of this plan in them; its pathway's method is "none": nothing may be built beside it)`) {
			t.Errorf("method none: %s/%s: reason %q does not say why no duct is added (review 21 F8)", l.Link.ID, l.Name, l.Reason)
		}
	}
	if added := testplan.BOMQty(r.Estimate.BOM, "added duct"); n != 2 || added != 0 {
		t.Errorf("method none: %d legs infeasible and %v m of duct added, want 2 and none", n, added)
	}
}
