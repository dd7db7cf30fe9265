package route_test

import (
	"slices"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
)

// tunnelUnderCampus is a hub A and a served building B 180 m apart, joined by the utility
// tunnel T alone, which runs wall to wall beneath the plant building M between them (M spans
// x = 90 − widthM/2 to 90 + widthM/2; it is entered where the tunnel crosses its walls, its
// only way in, and marked transit: true, as the plan's refusal without it asks, so routes
// pass through it where the tunnel meets those entrances). Each building's riser is 2 m, so the ends hold 10 m of cable inside with the
// service coil and entrance loop: within 15 m.
func tunnelUnderCampus(widthM float64) string {
	building := testsite.Long
	m := strings.Replace(building("M", "", 90-widthM/2, 90+widthM/2), `"riser_m":2`, `"riser_m":2,"transit":true`, 1)
	f := []string{building("A", "mc", 0, 20), m, building("B", "", 200, 220),
		testsite.Pathway("T", "tunnel", 20, 25, 200, 25)}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// TestTunnelThroughBuildingCountsInside (inside13): outside-plant cable in a tunnel that runs
// beneath a building's basement from one wall to the other is inside that building there,
// though it is neither end of the leg. NFPA 70 770.48(A) lets unlisted outside-plant optical
// cable run at most 15 m (50 ft) inside a building from its point of entrance, where it
// crosses the external wall (from memory; the rule through-15m), and no entrance transition
// can be spliced in a building the route only passes through. So A-B, whose cable would run
// 40 m inside M, is laid as listed indoor/outdoor cable all the way (media's
// TestThroughBuildingRule has the rule's reason); across a building 10 m wide it keeps outside-plant cable.
// Both list M among the buildings crossed. Before the fix A-B was outside-plant cable with
// nothing said of M's 40 m.
func TestTunnelThroughBuildingCountsInside(t *testing.T) {
	t.Parallel()
	plan := func(widthM float64) (construction string, crosses []string) {
		r, err := testplan.PullSolveJSON(t, tunnelUnderCampus(widthM), nil)
		if err != nil {
			t.Fatal(err)
		}
		_, l := testplan.LegOf(t, r, "A-B")
		return l.ConstructionText(), l.Crosses
	}
	narrow, nCross := plan(10)
	if narrow != "osp-loose-tube" || !slices.Contains(nCross, "M") {
		t.Errorf("10 m across M: %s crossing %q; want osp-loose-tube (10 m inside M, within 15 m), M crossed", narrow, nCross)
	}
	wide, wCross := plan(40)
	if wide != "indoor-outdoor" || !slices.Contains(wCross, "M") {
		t.Errorf("40 m across M: %s crossing %q; want indoor-outdoor (listed) cable, M crossed", wide, wCross)
	}
}
