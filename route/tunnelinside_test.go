package route_test

import (
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"spanwright/geo"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestTunnelIntoBuildingCountsInside is tester 10's F1: a tunnel that runs from the hub A's
// wall into the long building B, 90 m past B's wall to its end there, puts the cable inside B
// from that wall on. NFPA 70 770.48(A) lets unlisted outside-plant optical cable run at most
// 15 m (50 ft) inside a building from the point of entrance, where it emerges through the
// external wall (from memory; the rule entrance-15m), so B's end holds the 90 m of tunnel
// besides its 2 m riser, service coil and entrance loop: the leg is spliced to listed riser
// cable at B's entrance when the book prices the enclosure cheaply, and is indoor/outdoor
// cable all the way when it prices none; A's end (10 m inside) keeps its outside-plant cable.
// The same tunnel ending on B's wall leaves B's end at 10 m: outside-plant cable, no
// transition, as before. Books: the demo's (invented), indoor/outdoor single-mode dearer
// and a 5.00 enclosure as TestEntranceTransitionOneEnd has them.
func TestTunnelIntoBuildingCountsInside(t *testing.T) {
	t.Parallel()
	building := testsite.Long
	campus := func(endX float64) string {
		f := []string{building("A", "mc", 0, 20), building("B", "", 200, 300), testsite.Pathway("T", "tunnel", 20, 25, endX, 25)}
		return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
	}
	dir := testplan.TransitionBooks(t)
	inM := geo.DistanceM(orb.Point(testsite.Point(200, 25)), orb.Point(testsite.Point(290, 25)))

	into, err := testplan.PullSolveJSON(t, campus(290), func(p *plan.Plan) { p.Dir, p.Prices = dir, "cheap.yaml" })
	if err != nil {
		t.Fatal(err)
	}
	_, l := testplan.LegOf(t, into, "A-B")
	c := l.Cable
	ends := c.EndSlackM/2 + c.EntranceLoopM/2 // one end's service coil and entrance loop
	if l.ConstructionText() != "osp-loose-tube + ofnr-riser at B entrance" || !strings.Contains(l.Choice, "osp-loose-tube spliced to ofnr-riser at the entrance of B") {
		t.Errorf("90 m into B, enclosure priced: %s (%s), want osp-loose-tube spliced to ofnr-riser at B's entrance alone", l.ConstructionText(), l.Choice)
	}
	// B's inside piece: riser, coil, loop and the tunnel from B's wall, 5 % waste, whole metres.
	if want := math.Ceil((2 + ends + inM) * 1.05); c.InsideToM != want || c.InsideFromM != 0 {
		t.Errorf("inside cable %.0f m at B and %.0f at A, want %.0f at B (2 m riser, %.0f m coil and loop, %.2f m of tunnel) and none at A",
			c.InsideToM, c.InsideFromM, want, ends, inM)
	}

	plain, err := testplan.PullSolveJSON(t, campus(290), func(p *plan.Plan) { p.Dir, p.Prices = dir, "none.yaml" })
	if err != nil {
		t.Fatal(err)
	}
	if _, l := testplan.LegOf(t, plain, "A-B"); l.Construction != "indoor-outdoor" || l.Inside != "" {
		t.Errorf("90 m into B, no enclosure price: %s, want indoor-outdoor (listed) cable", l.ConstructionText())
	}

	wall, err := testplan.PullSolveJSON(t, campus(200), func(p *plan.Plan) { p.Dir, p.Prices = dir, "cheap.yaml" })
	if err != nil {
		t.Fatal(err)
	}
	if _, l := testplan.LegOf(t, wall, "A-B"); l.ConstructionText() != "osp-loose-tube" || l.Cable.InsideLengthM != 0 {
		t.Errorf("tunnel ending on B's wall: %s with %.0f m inside cable, want osp-loose-tube throughout (B's end 2 m riser + %.0f m coil and loop, within 15 m)",
			l.ConstructionText(), l.Cable.InsideLengthM, ends)
	}
}
