package route_test

import (
	"context"
	"fmt"
	"slices"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/routing"
)

// Campuses drawn the way facilities GIS draws them (issue 13), on the pull grid of package
// testsite (metres, invented place): each test builds one and checks the property it proves.

// duct is a duct pathway through the given grid points, as a GeoJSON feature.
func duct(id string, pts ...float64) string {
	var c []string
	for i := 0; i+1 < len(pts); i += 2 {
		c = append(c, fmt.Sprintf("[%.7f,%.7f]", testsite.X(pts[i]), testsite.Y(pts[i+1])))
	}
	return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":%q,"type":"duct"},"geometry":{"type":"LineString","coordinates":[%s]}}`, id, strings.Join(c, ","))
}

// handhole is a handhole structure at a grid point.
func handhole(id string, x, y float64) string {
	return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"structure","id":%q,"type":"handhole"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`,
		id, testsite.X(x), testsite.Y(y))
}

func collection(features ...string) string {
	return `{"type":"FeatureCollection","features":[` + strings.Join(features, ",") + `]}`
}

func diverse(to string) func(p *plan.Plan) {
	return func(p *plan.Plan) {
		p.Links = append(p.Links, plan.LinkSpec{To: to, Redundancy: plan.RedundancyDiverse})
	}
}

// TestTwoEntrancesDiverse: B has two laterals from different streets (y = 0 and y = 100),
// each ending inside its footprint; so has the hub A. The diverse link's two legs enter B by
// different entrances and A by different entrances (physically diverse entry: TIA-569
// recommends diverse entrance pathways for critical buildings, from memory).
func TestTwoEntrancesDiverse(t *testing.T) {
	t.Parallel()
	campus := collection(testsite.Box("A", "mc", 50, 50), testsite.Box("B", "", 250, 50),
		duct("S", 0, 0, 50, 0, 250, 0, 300, 0), duct("N", 0, 100, 50, 100, 250, 100, 300, 100),
		duct("LA1", 50, 0, 50, 45), duct("LA2", 50, 100, 50, 55), duct("LB1", 250, 0, 250, 45), duct("LB2", 250, 100, 250, 55),
		handhole("H1", 50, 0), handhole("H2", 50, 100), handhole("H3", 250, 0), handhole("H4", 250, 100))
	r, err := testplan.PullSolveJSON(t, campus, diverse("B"))
	if err != nil {
		t.Fatal(err)
	}
	var legs []routing.Leg
	for _, l := range r.Legs {
		if l.Link.To == "B" {
			legs = append(legs, l)
		}
	}
	if len(legs) != 2 || !legs[0].Feasible || !legs[1].Feasible {
		t.Fatalf("A-B legs: %+v", legs)
	}
	if legs[0].EntranceTo == "" || legs[0].EntranceTo == legs[1].EntranceTo || legs[0].EntranceFrom == legs[1].EntranceFrom {
		t.Errorf("entrances: primary %s/%s, diverse %s/%s; want two different at each building",
			legs[0].EntranceTo, legs[0].EntranceFrom, legs[1].EntranceTo, legs[1].EntranceFrom)
	}
	if len(r.Handholes) != 0 {
		t.Errorf("handholes added: %+v, want none (every turn is at a handhole)", r.Handholes)
	}
}

// TestTransitOnlyWhereMarked: D is joined to the hub A only through C. Where ducts D1 and D2
// meet at one point inside C, a route may pass there only when C is marked transit: true;
// unmarked, D's leg is infeasible and its reason names C and what to do. Where D1 and D2 end
// apart inside C, only a pathway drawn inside C joins them: a basement tunnel, which allows
// the crossing without a mark. A crossing leg lists C.
func TestTransitOnlyWhereMarked(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name           string
		marked, tunnel bool
		ok             bool
	}{
		{"unmarked", false, false, false}, {"marked", true, false, true}, {"basement tunnel", false, true, true},
	} {
		c := testsite.Box("C", "", 150, 25)
		if tc.marked {
			c = strings.Replace(c, `"id":"C"`, `"id":"C","transit":true`, 1)
		}
		f := []string{testsite.Box("A", "mc", 50, 25), c, testsite.Box("D", "", 250, 25)}
		if tc.tunnel {
			f = append(f, duct("D1", 55, 25, 145, 25), duct("D2", 155, 25, 245, 25),
				strings.Replace(duct("T", 145, 25, 155, 25), `"type":"duct"`, `"type":"tunnel"`, 1))
		} else {
			f = append(f, duct("D1", 55, 25, 150, 25), duct("D2", 150, 25, 245, 25))
		}
		r, err := testplan.PullSolveJSON(t, collection(f...), nil)
		if err != nil {
			t.Fatal(err)
		}
		var ad *routing.Leg
		for i := range r.Legs {
			if r.Legs[i].Link.To == "D" {
				ad = &r.Legs[i]
			}
		}
		switch {
		case ad == nil:
			t.Fatalf("%s: no leg to D", tc.name)
		case !tc.ok && (ad.Feasible || !strings.HasPrefix(ad.Reason, "building D reaches A only through C: a route crosses a building only along")):
			t.Errorf("%s: leg to D feasible %v, reason %q", tc.name, ad.Feasible, ad.Reason)
		case tc.ok && (!ad.Feasible || !slices.Equal(ad.Crosses, []string{"C"})):
			t.Errorf("%s: leg to D feasible %v (%s), crosses %q; want feasible through C", tc.name, ad.Feasible, ad.Reason, ad.Crosses)
		}
		if (r.Infeasible() == nil) != tc.ok {
			t.Errorf("%s: Infeasible() = %v", tc.name, r.Infeasible())
		}
		// Every output renders a crossing leg (its steps join up).
		if _, err := output.Files(context.Background(), r, output.WriteOptions{}); err != nil {
			t.Errorf("%s: outputs: %v", tc.name, err)
		}
	}
}

// TestTurnNeedsHandhole: A's and B's laterals tee off street duct S where no structure is.
// A cable cannot turn from one duct into another there (common practice, no published
// source), so the route adds a handhole at each tee it turns at: in the optimizer's cost, the
// bill and the leg's Turns. With a handhole drawn at A's tee, only B's is added.
func TestTurnNeedsHandhole(t *testing.T) {
	t.Parallel()
	for _, drawn := range []bool{false, true} {
		f := []string{testsite.Box("A", "mc", 50, 25), testsite.Box("B", "", 250, 25),
			duct("S", 0, 0, 50, 0, 250, 0, 300, 0), duct("LA", 50, 0, 50, 20), duct("LB", 250, 0, 250, 20)}
		want := 2
		if drawn {
			f = append(f, handhole("HA", 50, 0))
			want = 1
		}
		r, err := testplan.PullSolveJSON(t, collection(f...), nil)
		if err != nil {
			t.Fatal(err)
		}
		l := r.Legs[0]
		if !l.Feasible || len(l.Turns) != want || len(r.Handholes) != want || r.Handholes[0].Joins {
			t.Fatalf("drawn %v: feasible %v, turns %q, handholes %+v; want %d turn handholes", drawn, l.Feasible, l.Turns, r.Handholes, want)
		}
		if got := testplan.BOMQty(r.Estimate.BOM, "handhole where a route turns between pathways"); got != float64(want) {
			t.Errorf("drawn %v: bill has %v turn handholes, want %d", drawn, got, want)
		}
		if len(r.Estimate.Construction.TurnJunctions) != want {
			t.Errorf("drawn %v: construction lists %q", drawn, r.Estimate.Construction.TurnJunctions)
		}
	}
}

// TestOneTrenchTwoDucts: two ducts drawn 2 m apart look disjoint, but lie in one trench
// (group TR-1): a backhoe cuts both, so a diverse link may not use one for each leg (the
// shared-risk group, as TIA-758 and common practice ask of diverse routes, from memory).
// Without the group the two ducts give the link its two legs.
func TestOneTrenchTwoDucts(t *testing.T) {
	t.Parallel()
	for _, grouped := range []bool{false, true} {
		d1, d2 := duct("S1", 0, 0, 45, 0, 245, 0, 300, 0), duct("S2", 0, 2, 55, 2, 255, 2, 300, 2)
		if grouped {
			d1 = strings.Replace(d1, `"type":"duct"`, `"type":"duct","group":"TR-1"`, 1)
			d2 = strings.Replace(d2, `"type":"duct"`, `"type":"duct","group":"TR-1"`, 1)
		}
		campus := collection(testsite.Box("A", "mc", 50, 50), testsite.Box("B", "", 250, 50), d1, d2,
			// Each lateral crosses the other duct without a vertex there: not joined (geo warns).
			duct("LA1", 45, 0, 45, 45), duct("LA2", 55, 2, 55, 45), duct("LB1", 245, 0, 245, 45), duct("LB2", 255, 2, 255, 45),
			handhole("H1", 45, 0), handhole("H2", 55, 2), handhole("H3", 245, 0), handhole("H4", 255, 2))
		r, err := testplan.PullSolveJSON(t, campus, diverse("B"))
		if err != nil {
			t.Fatal(err)
		}
		var d *routing.Leg
		for i := range r.Legs {
			if r.Legs[i].Link.To == "B" && r.Legs[i].Name == routing.LegDiverse {
				d = &r.Legs[i]
			}
		}
		switch {
		case d == nil:
			t.Fatalf("grouped %v: no diverse leg", grouped)
		case grouped && (d.Feasible || !strings.Contains(d.Reason, "shared-risk group TR-1")):
			t.Errorf("grouped: diverse leg feasible %v, reason %q; want infeasible naming TR-1", d.Feasible, d.Reason)
		case !grouped && !d.Feasible:
			t.Errorf("not grouped: diverse leg infeasible: %s", d.Reason)
		}
	}
}

// TestDiverseLegsCrossAtAJunction: ducts P (west-east) and Q (south-north) cross at a junction
// with no structure, drawn with a shared vertex. The optimizer splits it into two runs, so a
// diverse pair may use both; a backhoe there cuts both, and the diverse leg says so (issue
// 13: the legs share no junction; common practice, no published source).
func TestDiverseLegsCrossAtAJunction(t *testing.T) {
	t.Parallel()
	campus := collection(testsite.Box("A", "mc", 0, 150), testsite.Box("B", "", 300, 150),
		duct("P", 0, 140, 0, 100, 150, 100, 300, 100, 300, 140), duct("Q", 10, 160, 10, 200, 150, 200, 150, 100, 150, 0, 290, 0, 290, 140))
	r, err := testplan.PullSolveJSON(t, campus, diverse("B"))
	if err != nil {
		t.Fatal(err)
	}
	noted := 0
	for _, l := range r.Legs {
		if l.Name != routing.LegDiverse {
			continue
		}
		if !l.Feasible {
			t.Fatalf("diverse leg infeasible: %s", l.Reason)
		}
		if strings.Contains(l.Choice, "both legs pass junction ") && strings.Contains(l.Choice, "where their ducts cross with no structure") {
			noted++
		}
	}
	if noted != 1 {
		t.Errorf("%d diverse legs name the crossing, want 1: %+v", noted, r.Legs)
	}
}

// TestTouchingBuildingsOneEntrance: A and F share a wall, and the only pathway ends on it, so
// both are entered at one point. The leg between them is infeasible with a reason a user can
// act on, not the optimizer's node numbers.
func TestTouchingBuildingsOneEntrance(t *testing.T) {
	t.Parallel()
	campus := collection(testsite.Box("A", "mc", 50, 25), testsite.Box("F", "", 70, 25), duct("X", 60, 25, 60, -50, 200, -50))
	r, err := testplan.PullSolveJSON(t, campus, nil)
	if err != nil {
		t.Fatal(err)
	}
	l := r.Legs[0]
	if l.Feasible || !strings.Contains(l.Reason, "F and A are entered at one and the same point") || strings.Contains(l.Reason, "node") {
		t.Errorf("leg %s: feasible %v, reason %q", l.Link.ID, l.Feasible, l.Reason)
	}
}

// TestOneUsableEntrance: B has two entrances, but the second one's duct leads nowhere (a stub
// to an old pit never joined). The diverse link is planned as at a building with one
// entrance: both legs through it, one duct from each street, and the reason names the
// entrance as the single point of failure (it failed before: the legs had to use two
// entrances, and the stub's led nowhere).
func TestOneUsableEntrance(t *testing.T) {
	t.Parallel()
	campus := collection(testsite.Box("A", "mc", 50, 50), testsite.Box("B", "", 250, 50),
		duct("S", 0, 0, 50, 0, 250, 0, 300, 0), duct("N", 0, 100, 50, 100, 250, 100, 300, 100),
		// B's usable entrance takes a duct from each street at one point, a vault drawn in
		// its basement (H5; without it the two ducts are parted, each cut at its own wall,
		// TestSplitInside); its other entrance is the stub's end.
		duct("LA1", 50, 0, 50, 45), duct("LA2", 50, 100, 50, 55), duct("LB1", 250, 0, 250, 45), duct("LB2", 250, 100, 250, 45),
		duct("STUB", 255, 55, 275, 80), handhole("H1", 50, 0), handhole("H2", 50, 100), handhole("H3", 250, 0), handhole("H4", 250, 100), handhole("H5", 250, 45))
	r, err := testplan.PullSolveJSON(t, campus, diverse("B"))
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range r.Legs {
		if l.Link.To != "B" {
			continue
		}
		if !l.Feasible {
			t.Fatalf("%s leg infeasible: %s", l.Name, l.Reason)
		}
		if l.Name == routing.LegDiverse && !strings.Contains(l.Choice, "both legs use building B's only entrance") {
			t.Errorf("diverse leg does not name B's only usable entrance: %s", l.Choice)
		}
	}
}

// proposed makes a duct feature (duct) a proposed trench under turf.
func proposed(feature string) string {
	return strings.Replace(feature, `"type":"duct"`, `"type":"duct","status":"proposed","surface":"turf"`, 1)
}

// TestSplitPathwayOneDuct: a pathway that a facilities GIS draws as two features where
// another pathway joins it is still one duct where the two carry the same ducts: the split
// adds no turn handhole, no pull section and no cost (tester's finding 3: D-5 split at its
// bend where new trench P-2 joins got a turn handhole, 3 more pull sections and 3,578.01 more
// in total). A T junction stays one for the route that turns into the branch, not for the one
// that goes straight on. Where the same ducts carry straight on from one piece, that straight
// pair is the run and the bend is a turn (the split drawing says no more; common practice,
// no published source).
func TestSplitPathwayOneDuct(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name         string
		whole, split []string // the features that differ; common holds the rest
		common       []string
		turns        map[string]int // each link's primary leg's turns, drawn split
		same         bool           // whole and split give the same plan
	}{
		{
			name:   "bend where new trench carries on",
			whole:  []string{duct("D", 0, 25, 0, -100, 205, -100)},
			split:  []string{duct("D-a", 0, 25, 0, -100), duct("D-b", 0, -100, 205, -100)},
			common: []string{testsite.Box("A", "mc", 0, 30), testsite.Box("B", "", 210, -100), testsite.Box("C", "", 0, -310), proposed(duct("P", 0, -100, 0, -305))},
			turns:  map[string]int{"A-B": 0, "A-C": 0},
			same:   true,
		},
		{
			name:  "straight where laterals tee off",
			whole: []string{duct("S", 0, 0, 50, 0, 250, 0, 450, 0, 500, 0)},
			split: []string{duct("S-a", 0, 0, 50, 0, 250, 0), duct("S-b", 250, 0, 450, 0, 500, 0)},
			common: []string{testsite.Box("A", "mc", 50, 25), testsite.Box("B", "", 250, 25), testsite.Box("C", "", 450, 25),
				duct("LA", 50, 0, 50, 20), duct("LB", 250, 0, 250, 20), duct("LC", 450, 0, 450, 20)},
			turns: map[string]int{"A-B": 2, "A-C": 2},
			same:  true,
		},
		{
			// B's counted lateral taps S below its middle, 1.5 m from where K's duct tees
			// off: the tap moves to that junction, one handhole for both (tapMergeM, 2 m,
			// common practice, no published source), whether or not the street is split
			// between them (review 14 F4: drawn split, a second tap handhole 1.5 m away).
			name:  "a lateral's tap 1.5 m from a tee, a joint between",
			whole: []string{duct("S", -200, 0, 200, 0)},
			split: []string{duct("S-a", -200, 0, 1, 0), duct("S-b", 1, 0, 200, 0)},
			common: []string{testsite.Box("A", "mc", -150, 30), testsite.Box("B", "", 0, 28), testsite.Box("K", "", 1.5, -30),
				duct("LA", -150, 0, -150, 20), duct("L-K", 1.5, 0, 1.5, -20)},
			same: true,
		},
		{
			name:   "the same ducts carry straight on from one piece",
			whole:  []string{duct("D", 0, 25, 0, -100, 205, -100)},
			split:  []string{duct("D-a", 0, 25, 0, -100), duct("D-b", 0, -100, 205, -100)},
			common: []string{testsite.Box("A", "mc", 0, 30), testsite.Box("B", "", 210, -100), testsite.Box("C", "", 0, -310), duct("E", 0, -100, 0, -305)},
			turns:  map[string]int{"A-B": 1, "A-C": 0},
		},
	}
	for _, tc := range cases {
		solve := func(fs []string) (*route.Result, output.Summary) {
			r, err := testplan.PullSolveJSON(t, collection(append(slices.Clone(tc.common), fs...)...), nil)
			if err != nil {
				t.Fatalf("%s: %v", tc.name, err)
			}
			return r, output.Summarize(r)
		}
		rw, sw := solve(tc.whole)
		rs, ss := solve(tc.split)
		for _, l := range rs.Legs {
			if w, ok := tc.turns[l.Link.ID]; ok && l.Name == routing.LegPrimary && (!l.Feasible || len(l.Turns) != w) {
				t.Errorf("%s: split: leg %s feasible %v, turns %q; want %d turns", tc.name, l.Link.ID, l.Feasible, l.Turns, w)
			}
		}
		if !tc.same {
			continue
		}
		if sw.TotalCents != ss.TotalCents || sw.TurnHandholes != ss.TurnHandholes || sw.PullSections != ss.PullSections || sw.RunHandholes != ss.RunHandholes {
			t.Errorf("%s: whole total %d, turn handholes %d, pull sections %d, run handholes %d; split %d, %d, %d, %d", tc.name,
				sw.TotalCents, sw.TurnHandholes, sw.PullSections, sw.RunHandholes, ss.TotalCents, ss.TurnHandholes, ss.PullSections, ss.RunHandholes)
		}
		for i, l := range rw.Legs {
			if m := rs.Legs[i]; m.Link.ID != l.Link.ID || m.Feasible != l.Feasible || len(m.Turns) != len(l.Turns) || m.Cost != l.Cost {
				t.Errorf("%s: leg %s/%s whole: feasible %v, turns %q, cost %v; split: feasible %v, turns %q, cost %v", tc.name, l.Link.ID, l.Name,
					l.Feasible, l.Turns, l.Cost, m.Feasible, m.Turns, m.Cost)
			}
		}
	}
}
