package route_test

import (
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestTunnelIntoBuildingOneCostModel (inside13 b): the optimizer prices the cable of a tunnel
// that runs from B's wall 90 m to B's entrance inside it as the bill buys it, because every
// route from B takes that tunnel (routing's endIndoorM) and its metres are in B's end before
// routing: the objective less the route-independent items equals the bill's route items within
// their rounding (TestOneCostModel's check, oneCostModel). With no entrance enclosure priced,
// the 100 m inside B (2 m riser, 8 m coil and loop, 90 m of tunnel) rule out outside-plant cable
// (NFPA 70 770.48(A): 15 m past the point of entrance; from memory), and the optimizer routes
// the indoor/outdoor cable the rules choose; before, it priced outside-plant os2 (B's end 10 m
// to it) and the leg came out om4 indoor/outdoor, 2,289.34 USD of objective against 3,226.54.
// With a 40 m direct-buried span at A's end, which indoor/outdoor cable may not take (rule
// direct-burial: ICEA S-87-640 / Telcordia GR-20, from memory), the option spliced at B's
// entrance prices B's inside cable over the tunnel too, as the bill does.
func TestTunnelIntoBuildingOneCostModel(t *testing.T) {
	t.Parallel()
	building := testsite.Long
	campus := func(buriedM float64) string {
		f := []string{building("A", "mc", 0, 20), building("B", "", 200, 300), testsite.Pathway("T", "tunnel", 20+buriedM, 25, 290, 25)}
		if buriedM > 0 {
			f = append(f, testsite.Pathway("S", "buried", 20, 25, 20+buriedM, 25))
		}
		return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
	}
	dir := testplan.TransitionBooks(t)
	for _, tc := range []struct {
		book    string
		buriedM float64
	}{{"none.yaml", 0}, {"cheap.yaml", 40}} {
		r, err := testplan.PullSolveJSON(t, campus(tc.buriedM), func(p *plan.Plan) { p.Dir, p.Prices = dir, tc.book })
		if err != nil {
			t.Fatal(err)
		}
		if _, l := testplan.LegOf(t, r, "A-B"); !strings.Contains(l.ConstructionText(), "indoor-outdoor") && !strings.Contains(l.ConstructionText(), "ofnr-riser at B") {
			t.Errorf("%s: A-B laid as %s; want listed cable inside B", tc.book, l.ConstructionText())
		}
		oneCostModel(t, tc.book, r)
	}
}
