package route_test

import (
	"fmt"
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

// TestTunnelThroughBuildingTwice: a tunnel that crosses the two arms of a U-shaped building M
// (12 m inside each, the open yard between them outside) is inside M twice, 12 m from each
// point of entrance: NFPA 70 770.48(A) counts unlisted outside-plant cable from the point where
// it enters (from memory; the rule through-15m), so each crossing is within 15 m and the cable
// stays outside-plant; summed over the two crossings (24 m) it was refused (review 15 F7).
func TestTunnelThroughBuildingTwice(t *testing.T) {
	t.Parallel()
	u := [][2]float64{{72, 15}, {84, 15}, {84, 35}, {96, 35}, {96, 15}, {108, 15}, {108, 50}, {72, 50}, {72, 15}}
	var ring []string
	for _, p := range u {
		ring = append(ring, fmt.Sprintf("[%.7f,%.7f]", testsite.X(p[0]), testsite.Y(p[1])))
	}
	m := `{"type":"Feature","properties":{"kind":"building","id":"M","riser_m":2,"transit":true},"geometry":{"type":"Polygon","coordinates":[[` + strings.Join(ring, ",") + `]]}}`
	f := []string{testsite.Long("A", "mc", 0, 20), m, testsite.Long("B", "", 200, 220), testsite.Pathway("T", "tunnel", 20, 25, 200, 25)}
	r, err := testplan.PullSolveJSON(t, `{"type":"FeatureCollection","features":[`+strings.Join(f, ",")+`]}`, nil)
	if err != nil {
		t.Fatal(err)
	}
	_, l := testplan.LegOf(t, r, "A-B")
	if got := l.ConstructionText(); got != "osp-loose-tube" || !slices.Contains(l.Crosses, "M") {
		t.Errorf("two 12 m crossings of M: %s crossing %q; want osp-loose-tube (each within 15 m of its entrance), M crossed", got, l.Crosses)
	}
}
