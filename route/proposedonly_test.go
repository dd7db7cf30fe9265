package route_test

import (
	"slices"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// TestOnlyOverProposed: B is joined to the hub A only by a proposed duct, C by existing ones.
// With design.allow_new_trench: false a plan may not use the proposed duct: B's leg is
// infeasible and its reason names the proposed pathways as the cause, in the words check uses
// (tester: check said every building could reach the hub, plan "no pathway joins its two
// ends"); with new trench allowed B is served. (The plan's own rule, README "design".)
func TestOnlyOverProposed(t *testing.T) {
	t.Parallel()
	campus := collection(testsite.Box("A", "mc", 50, 50), testsite.Box("B", "", 250, 50), testsite.Box("C", "", 150, 50),
		duct("S", 0, 0, 50, 0, 150, 0, 300, 0), duct("LA", 50, 0, 50, 45), duct("LC", 150, 0, 150, 45),
		proposed(duct("LB", 250, 0, 250, 45)))
	c, err := geo.Parse("pull.geojson", []byte(campus))
	if err != nil {
		t.Fatal(err)
	}
	net, err := geo.Build(c, geo.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if got := site.NewSite(c, net).OnlyOverProposed("A"); !slices.Equal(got, []string{"B"}) {
		t.Errorf("only over proposed pathways: %q, want [B]", got)
	}
	const why = "building B reaches A only over proposed pathways (design.allow_new_trench: false"
	for _, allow := range []bool{false, true} {
		r, err := testplan.PullSolveJSON(t, campus, func(p *plan.Plan) { p.Design.AllowNewTrench = allow })
		if err != nil {
			t.Fatal(err)
		}
		for _, l := range r.Legs {
			switch {
			case l.Link.To == "B" && !allow:
				if l.Feasible || !strings.HasPrefix(l.Reason, why) {
					t.Errorf("allow_new_trench %v: %s feasible %v, reason %q; want infeasible, %q…", allow, l.Link.ID, l.Feasible, l.Reason, why)
				}
			case !l.Feasible:
				t.Errorf("allow_new_trench %v: %s infeasible: %s", allow, l.Link.ID, l.Reason)
			}
		}
	}
}
