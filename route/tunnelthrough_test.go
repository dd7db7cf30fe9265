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
	r, err := testplan.PullSolveJSON(t, uCampus(testsite.Pathway("T", "tunnel", 20, 25, 200, 25)), nil)
	if err != nil {
		t.Fatal(err)
	}
	_, l := testplan.LegOf(t, r, "A-B")
	if got := l.ConstructionText(); got != "osp-loose-tube" || !slices.Contains(l.Crosses, "M") {
		t.Errorf("two 12 m crossings of M: %s crossing %q; want osp-loose-tube (each within 15 m of its entrance), M crossed", got, l.Crosses)
	}
}

// uCampus is TestTunnelThroughBuildingTwice's campus: hub A, served building B, and between
// them the U-shaped building M (arms at x = 72-84 and 96-108, the yard between them open from
// y = 15 to 35; transit: true), with the pathways given.
func uCampus(pathways ...string) string {
	u := [][2]float64{{72, 15}, {84, 15}, {84, 35}, {96, 35}, {96, 15}, {108, 15}, {108, 50}, {72, 50}, {72, 15}}
	var ring []string
	for _, p := range u {
		ring = append(ring, fmt.Sprintf("[%.7f,%.7f]", testsite.X(p[0]), testsite.Y(p[1])))
	}
	m := `{"type":"Feature","properties":{"kind":"building","id":"M","riser_m":2,"transit":true},"geometry":{"type":"Polygon","coordinates":[[` + strings.Join(ring, ",") + `]]}}`
	f := append([]string{testsite.Long("A", "mc", 0, 20), m, testsite.Long("B", "", 200, 220)}, pathways...)
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// TestThroughBuildingSplitPathway: a tunnel or tray drawn as pieces that meet at a vertex
// inside a building the route passes through is the same pathway as drawn whole, and the
// answer must not change: each crossing counts from its own point of entrance (NFPA 70
// 770.48(A), from memory; the rule through-15m) however many spans it is made of (review 15: a
// piece ending inside runs wall to wall on neither piece, and the crossing was not counted;
// the middle piece of the U building's tunnel, both ends inside M, was counted whole, 24 m,
// arms and yard). On tunnelUnderCampus's M, 10 m and 40 m wide, split at its middle, and on
// the U-shaped M split in one arm and in each: the same medium, construction, buildings
// crossed and reason as the whole tunnel's; osp-loose-tube where each crossing is within
// 15 m (10 m, 12 m an arm), indoor-outdoor across 40 m. Trays alike (the same campus with the
// pathway a tray): the same answer split as whole.
func TestThroughBuildingSplitPathway(t *testing.T) {
	t.Parallel()
	type answer struct{ medium, construction, crosses, reason string }
	solve := func(campus string) answer {
		r, err := testplan.PullSolveJSON(t, campus, nil)
		if err != nil {
			t.Fatal(err)
		}
		_, l := testplan.LegOf(t, r, "A-B")
		return answer{l.Medium, l.ConstructionText(), strings.Join(l.Crosses, " "), l.Choice}
	}
	straight := func(widthM float64, typ string, cutsX ...float64) string {
		building := testsite.Long
		m := strings.Replace(building("M", "", 90-widthM/2, 90+widthM/2), `"riser_m":2`, `"riser_m":2,"transit":true`, 1)
		f := []string{building("A", "mc", 0, 20), m, building("B", "", 200, 220)}
		return `{"type":"FeatureCollection","features":[` + strings.Join(append(f, pieces(typ, cutsX...)...), ",") + `]}`
	}
	for _, typ := range []string{"tunnel", "tray"} {
		for _, tc := range []struct {
			name   string
			whole  string
			splits []string
			want   string // the construction with a tunnel
		}{
			{"M 10 m wide", straight(10, typ), []string{straight(10, typ, 90)}, "osp-loose-tube"},
			{"M 40 m wide", straight(40, typ), []string{straight(40, typ, 90), straight(40, typ, 80, 100)}, "indoor-outdoor"},
			{"U-shaped M", uCampus(pieces(typ)...), []string{uCampus(pieces(typ, 78)...), uCampus(pieces(typ, 78, 102)...)}, "osp-loose-tube"},
		} {
			whole := solve(tc.whole)
			if typ == "tunnel" && (whole.construction != tc.want || whole.crosses != "M") {
				t.Errorf("%s, whole tunnel: %s crossing %q; want %s, M crossed", tc.name, whole.construction, whole.crosses, tc.want)
			}
			for k, c := range tc.splits {
				if got := solve(c); got != whole {
					t.Errorf("%s, %s split (%d): %+v\nwhole: %+v", tc.name, typ, k+1, got, whole)
				}
			}
		}
	}
}

// pieces is a pathway of type typ along y = 25 from x = 20 to 200, drawn as one line, or cut
// into pieces T1, T2, … at each x of cutsX.
func pieces(typ string, cutsX ...float64) []string {
	if len(cutsX) == 0 {
		return []string{testsite.Pathway("T", typ, 20, 25, 200, 25)}
	}
	var out []string
	from := 20.0
	for i, x := range append(cutsX, 200) {
		out = append(out, testsite.Pathway(fmt.Sprintf("T%d", i+1), typ, from, 25, x, 25))
		from = x
	}
	return out
}
