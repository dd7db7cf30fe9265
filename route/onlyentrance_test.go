package route_test

import (
	"bytes"
	"context"
	"strings"
	"testing"

	"spanwright/media"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/report"
	"spanwright/route/routing"
)

// A diverse link to a building with one entrance (tester 13's F-G). The campus: hub A entered
// from two streets, S (y = 0) and N (y = 100), joined at both ends (W, E) into a ring. B stands
// 10 m off S with no pathway of its own: a counted lateral taps S at x = 150. C is reached only
// by a lateral drawn as a pathway, LC, from its wall to N. TIA-569 asks diverse entrance
// pathways of critical buildings (from memory); with one entrance the entrance and its lateral
// are shared whatever the routes, and the plan must say so (common practice, no published
// source, for what a designer does then: build the two routes apart beyond the shared entrance
// and name it, or name it and what would fix it).
func oneEntranceCampus(streetS string, more ...string) string {
	return collection(append([]string{testsite.Box("A", "mc", 50, 50), testsite.Box("B", "", 150, 20), testsite.Box("C", "", 220, 60),
		streetS, duct("N", 0, 100, 50, 100, 220, 100, 300, 100),
		duct("W", 0, 0, 0, 100), duct("E", 300, 0, 300, 100),
		duct("LA1", 50, 0, 50, 45), duct("LA2", 50, 100, 50, 55), duct("LC", 220, 70, 220, 100),
		handhole("H1", 50, 0), handhole("H2", 50, 100), handhole("H3", 0, 0), handhole("H4", 0, 100),
		handhole("H5", 300, 0), handhole("H6", 300, 100), handhole("H7", 220, 100)}, more...)...)
}

// legsTo returns the two legs of the diverse link to building to, failing the test without
// them.
func legsTo(t *testing.T, r *route.Result, to string) []routing.Leg {
	t.Helper()
	var legs []routing.Leg
	for _, l := range r.Legs {
		if l.Link.To == to {
			legs = append(legs, l)
		}
	}
	if len(legs) != 2 {
		t.Fatalf("A-%s legs: %+v", to, legs)
	}
	return legs
}

// TestDiverseOneEntranceTap: B's only entrance is a counted lateral tapping S. The two legs
// leave the tap along S in opposite directions, west to A's lateral LA1 and east round the
// ring to LA2: they share the entrance, the lateral and the tap's handhole, nothing else (S's
// two sides meet only at the tap). Both legs are planned and priced, the diverse leg flagged
// SPOF naming the entrance and its lateral, not S's shared-risk group (before the fix: NO-DIVERSE,
// "every route found shares the shared-risk group S", both unpriced).
func TestDiverseOneEntranceTap(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, oneEntranceCampus(duct("S", 0, 0, 50, 0, 300, 0)), diverse("B"))
	if err != nil {
		t.Fatal(err)
	}
	legs := legsTo(t, r, "B")
	for _, l := range legs {
		if !l.Feasible || l.Cost.TotalCents() <= 0 {
			t.Fatalf("%s leg: feasible %v, cost %d cents, reason %q; want planned and priced", l.Name, l.Feasible, l.Cost.TotalCents(), l.Reason)
		}
		if l.EntranceTo != "B:1" {
			t.Errorf("%s leg enters B by %q, want its only entrance B:1", l.Name, l.EntranceTo)
		}
		// The counted lateral, 10 m from the footprint to S (a 20 m box centred 20 m off S).
		if l.LateralM < 10-0.1 || l.LateralM > 10+0.1 {
			t.Errorf("%s leg lateral %.2f m, want 10 m", l.Name, l.LateralM)
		}
	}
	d := legs[1]
	if d.Name != routing.LegDiverse || d.ReasonCode != routing.CodeSharedPt {
		t.Fatalf("second leg %s code %q, want the diverse leg with %s", d.Name, d.ReasonCode, routing.CodeSharedPt)
	}
	// No other pathway within design.max_lateral_m (30 m) of B but S, which the lateral taps
	// (N is 70 m off): the fix is a proposed pathway to its wall.
	for _, want := range []string{"both legs use building B's only entrance B:1 and its 10.0 m lateral to junction ", "a single point of failure",
		"a second entrance to building B on another pathway would make the link diverse, but no other pathway passes within design.max_lateral_m 30 m of it: it needs a proposed pathway drawn to its wall, which the plan may build and would price"} {
		if !strings.Contains(d.Choice, want) {
			t.Errorf("diverse leg's note lacks %q: %s", want, d.Choice)
		}
	}
	if strings.Contains(d.Choice, "shared-risk group") {
		t.Errorf("diverse leg's note names a shared-risk group: %s", d.Choice)
	}
	// Apart beyond the tap: the legs share no span, and go opposite ways along S.
	spans := map[string]bool{}
	for _, st := range legs[0].Steps {
		spans[st.SpanID] = true
	}
	for _, st := range d.Steps {
		if spans[st.SpanID] {
			t.Errorf("both legs use span %s", st.SpanID)
		}
	}
	if !strings.Contains(strings.Join(legs[0].Pathways, " ")+" "+strings.Join(d.Pathways, " "), "E") {
		t.Errorf("no leg goes round by E: %v / %v", legs[0].Pathways, d.Pathways)
	}
}

// TestDiverseOneEntranceGroupGiven: the same, with S given a shared-risk group on the campus
// ("south bank"): the campus says the bank fails as one, so the legs may not both run in it, and
// no second route exists. The reason names B's entrance and lateral and the group, and what
// would fix it.
func TestDiverseOneEntranceGroupGiven(t *testing.T) {
	t.Parallel()
	s := strings.Replace(duct("S", 0, 0, 50, 0, 300, 0), `"type":"duct"`, `"type":"duct","group":"south bank"`, 1)
	r, err := testplan.PullSolveJSON(t, oneEntranceCampus(s), diverse("B"))
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range r.Legs {
		if l.Link.To != "B" || l.Name != routing.LegDiverse {
			continue
		}
		if l.Feasible || l.ReasonCode != routing.CodeNoDiverse {
			t.Fatalf("diverse leg feasible %v code %q, want %s", l.Feasible, l.ReasonCode, routing.CodeNoDiverse)
		}
		for _, want := range []string{"every route must use building B's only entrance B:1 and its 10.0 m lateral to junction ",
			"and leave it along shared-risk group south bank, a single point of failure", "a second entrance to building B"} {
			if !strings.Contains(l.Reason, want) {
				t.Errorf("reason lacks %q: %s", want, l.Reason)
			}
		}
		return
	}
	t.Fatal("no diverse leg to B")
}

// TestDiverseOneEntranceDrawnLateral: C's only way in is LC, a lateral drawn as a pathway from
// its wall to N: every route uses it (a shared span the optimizer's pair may not share), so no
// second route; the reason names C's entrance and LC up to the junction on N where ways part,
// as the single point of failure, with what would fix it (before: "every route uses span LC
// (pathway LC)", no word of the entrance or a fix). `check` says the same beforehand.
func TestDiverseOneEntranceDrawnLateral(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, oneEntranceCampus(duct("S", 0, 0, 50, 0, 300, 0)), diverse("C"))
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range r.Legs {
		if l.Link.To != "C" {
			continue
		}
		if l.Name == routing.LegPrimary {
			if !l.Feasible {
				t.Fatalf("primary leg infeasible: %s", l.Reason)
			}
			continue
		}
		if l.Feasible || l.ReasonCode != routing.CodeNoDiverse {
			t.Fatalf("diverse leg feasible %v code %q, want %s", l.Feasible, l.ReasonCode, routing.CodeNoDiverse)
		}
		// N, 30 m off C, is where ways part (shares the way in's risk); S is 50 m off.
		for _, want := range []string{"no diverse route: every route must use building C's only entrance ", " and its one way on, span LC (pathway LC), to junction ",
			", a single point of failure; a second entrance to building C on another pathway would make the link diverse, but no other pathway passes within design.max_lateral_m 30 m of it"} {
			if !strings.Contains(l.Reason, want) {
				t.Errorf("reason lacks %q: %s", want, l.Reason)
			}
		}
		return
	}
	t.Fatal("no diverse leg to C")
}

// TestDiverseOneEntranceSuggests: with a duct M looping 15 m north of B (from S at x = 100 up,
// along y = 45 and down to S at x = 200), the SPOF note names M as where a second entrance
// would go, at its distance: within design.max_lateral_m (30 m), a declared entrance facing
// it gets a counted lateral (Build). Not built: B keeps its one entrance. B is entered here by
// a lateral drawn from S to its wall, LB: a building with no way in drawn is offered a counted
// lateral to every pathway within design.max_lateral_m (M too), so there M is a way in
// already and nothing is left to suggest.
func TestDiverseOneEntranceSuggests(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, oneEntranceCampus(duct("S", 0, 0, 50, 0, 150, 0, 300, 0), duct("M", 100, 0, 100, 45, 200, 45, 200, 0), duct("LB", 150, 0, 150, 10)), diverse("B"))
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range r.Legs {
		if l.Link.To != "B" || l.Name != routing.LegDiverse {
			continue
		}
		// LB is a span both legs must use (as LC in TestDiverseOneEntranceDrawnLateral).
		if l.Feasible || l.ReasonCode != routing.CodeNoDiverse {
			t.Fatalf("diverse leg feasible %v code %q: %s", l.Feasible, l.ReasonCode, l.Reason)
		}
		for _, want := range []string{"every route must use building B's only entrance B:1 and its one way on, span LB (pathway LB)",
			"a second entrance to building B facing pathway M, 15.0 m from its footprint, would make the link diverse (declared there, within design.max_lateral_m 30 m, it gets a lateral the plan lays and prices)"} {
			if !strings.Contains(l.Reason, want) {
				t.Errorf("reason lacks %q: %s", want, l.Reason)
			}
		}
		return
	}
	t.Fatal("no diverse leg to B")
}

// TestDiverseCountedLaterals: B has no way in drawn, S runs 20 m south of it and a duct M
// loops 15 m north of it off S (from x = 100 up, along y = 45, down to x = 200). B gets a
// counted lateral to each (Build, every pathway within design.max_lateral_m). The legs leave
// by the two laterals: one along S from its tap, the other along M and back onto S beyond
// x = 200 or before x = 100. They share no run of S (a run ends where M meets it, a junction
// of three spans: runGroups), so the link is diverse and both legs are planned and priced, not left
// NO-DIVERSE because both use S somewhere (physically diverse pathways, ANSI/TIA-569 (from
// memory); parting a duct's risk at its branch points: common practice, no published source).
func TestDiverseCountedLaterals(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, oneEntranceCampus(duct("S", 0, 0, 50, 0, 150, 0, 300, 0), duct("M", 100, 0, 100, 45, 200, 45, 200, 0)), diverse("B"))
	if err != nil {
		t.Fatal(err)
	}
	legs := legsTo(t, r, "B")
	for _, l := range legs {
		if !l.Feasible || l.Cost.TotalCents() <= 0 {
			t.Fatalf("%s leg: feasible %v, code %q, cost %d cents, reason %q; want planned and priced", l.Name, l.Feasible, l.ReasonCode, l.Cost.TotalCents(), l.Reason)
		}
	}
	if legs[0].EntranceTo == legs[1].EntranceTo {
		t.Errorf("both legs enter B by %q, want two counted laterals", legs[0].EntranceTo)
	}
}

// crossingAtTapCampus (a reviewer's, invented place): ducts D1 (west-east) and PB (a loop from
// the hub's south side over D1 to FEN's north side) cross at one junction with no structure,
// where the counted lateral of a third building, COB, taps D1. PC, a longer duct round the
// south, reaches FEN from the west.
const crossingAtTapCampus = `{"type": "FeatureCollection", "features": [{"type": "Feature", "properties": {"kind": "building", "id": "HUB", "name": "Larchwick Hall", "role": "mc"}, "geometry": {"type": "Polygon", "coordinates": [[[-1.0001459, 51.9999099], [-0.9998541, 51.9999099], [-0.9998541, 52.0000901], [-1.0001459, 52.0000901], [-1.0001459, 51.9999099]]]}}, {"type": "Feature", "properties": {"kind": "building", "id": "FEN", "name": "Fenmoor Lab"}, "geometry": {"type": "Polygon", "coordinates": [[[-0.9943099, 51.9999099], [-0.9940181, 51.9999099], [-0.9940181, 52.0000901], [-0.9943099, 52.0000901], [-0.9943099, 51.9999099]]]}}, {"type": "Feature", "properties": {"kind": "building", "id": "COB", "name": "Cobble Store"}, "geometry": {"type": "Polygon", "coordinates": [[[-0.9970674, 52.000009], [-0.9966443, 52.0000901], [-0.9967172, 52.0002703], [-0.9969361, 52.0002523], [-0.9970674, 52.000009]]]}}, {"type": "Feature", "properties": {"kind": "pathway", "id": "D1", "type": "duct"}, "geometry": {"type": "LineString", "coordinates": [[-0.9998541, 52.0], [-0.997082, 52.0], [-0.9943099, 52.0]]}}, {"type": "Feature", "properties": {"kind": "pathway", "id": "PB", "type": "duct"}, "geometry": {"type": "LineString", "coordinates": [[-1.0, 51.9999099], [-1.0, 51.999099], [-0.997082, 51.999099], [-0.997082, 52.0], [-0.997082, 52.000901], [-0.994164, 52.000901], [-0.994164, 52.0000901]]}}, {"type": "Feature", "properties": {"kind": "pathway", "id": "PC", "type": "duct"}, "geometry": {"type": "LineString", "coordinates": [[-1.0001459, 52.0], [-1.001459, 52.0], [-1.001459, 51.997297], [-0.994164, 51.997297], [-0.994164, 51.9999099]]}}]}`

// TestDiverseAvoidsCrossingAtTap: the diverse link HUB-FEN takes D1 and PC, not D1 and PB,
// which cross D1 at COB's tap with no structure (one dig there cuts both); COB's own diverse
// link is still planned, with its one entrance named as its single point of failure. Before,
// a crossing that was also an entrance was not a place to the optimizer (review 19 F1), and
// the plan named the crossing as HUB-FEN's single point of failure (physically diverse
// pathways, ANSI/TIA-569 (from memory); a crossing as a shared point: common practice, no
// published source).
func TestDiverseAvoidsCrossingAtTap(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, crossingAtTapCampus, func(p *plan.Plan) {
		p.Hub = "HUB"
		diverse("FEN")(p)
		diverse("COB")(p)
	})
	if err != nil {
		t.Fatal(err)
	}
	for _, l := range r.Legs {
		if !l.Feasible {
			t.Errorf("%s %s leg not planned: %s", l.Link.To, l.Name, l.Reason)
		}
		if l.Link.To != "FEN" || l.Name != routing.LegDiverse {
			continue
		}
		if l.ReasonCode == routing.CodeSharedPt {
			t.Errorf("FEN's diverse leg shares a point: %s", l.Choice)
		}
		// What keeping off the crossing costs is said, and priced (review 19 F2): PC is the
		// longer way round.
		if l.CrossingAvoidedCents <= 0 || !strings.Contains(l.Choice, "kept off a junction where ducts cross") {
			t.Errorf("FEN's diverse leg: crossing avoided %d cents, choice %q; want > 0 and said", l.CrossingAvoidedCents, l.Choice)
		}
		for _, st := range l.Steps {
			if st.SpanID != "" && strings.HasPrefix(st.SpanID, "PB") {
				t.Errorf("FEN's diverse leg takes %s, which crosses the primary's D1 with no structure", st.SpanID)
			}
		}
		// The summary counts it and adds up what it costs; the terminal says it beside the
		// diverse links.
		s := output.Summarize(r)
		// One link: the figure of all of them together is its own.
		if s.DiverseOffCrossing != 1 || s.DiverseOffCrossingCents != l.CrossingAvoidedCents || r.CrossingAvoidedCents != l.CrossingAvoidedCents {
			t.Errorf("summary: diverse_off_crossing %d, %d cents (plan %d); want 1, the leg's %d", s.DiverseOffCrossing, s.DiverseOffCrossingCents,
				r.CrossingAvoidedCents, l.CrossingAvoidedCents)
		}
		var term bytes.Buffer
		if err := output.PrintSummary(&term, r, output.WriteOptions{}); err != nil {
			t.Fatal(err)
		}
		want := ", 1 kept off a junction where ducts cross with no structure that a cheaper pair would share (" + media.FormatCents(l.CrossingAvoidedCents)
		if !strings.Contains(term.String(), want) {
			t.Errorf("terminal lacks %q:\n%s", want, term.String())
		}
		html, err := report.Plan(context.Background(), r, report.Options{})
		if err != nil {
			t.Fatal(err)
		}
		// The report groups thousands (2,177.20): the same figure, its own format.
		for _, want := range []string{
			"1 kept off a junction where ducts cross with no structure that a cheaper pair would share (",
			", nor the junctions diverse legs are kept off (",
		} {
			if !strings.Contains(string(html), want) {
				t.Errorf("report lacks %q", want)
			}
		}
	}
}

// TestDiverseTwoTapsOneRun: B declares two entrances on its south wall, 20 m apart, each with
// a counted lateral to S; no other pathway is within design.max_lateral_m of it. The legs
// could leave by the two taps one each way along S, but S from H1 to H5 is one run of duct
// with no branch point between (no structure, no side pathway, no wall): one duct bank in one
// trench, which a designer does not count as two ways in (physically diverse entrance
// pathways, ANSI/TIA-569 (from memory); the run as the unit of risk: common practice, no
// published source). So the link is NO-DIVERSE, naming the run by its pathway and the
// structures at its ends.
func TestDiverseTwoTapsOneRun(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, oneEntranceCampus(duct("S", 0, 0, 50, 0, 300, 0), entrance("B-W", "B", 140, 10), entrance("B-E", "B", 160, 10)), diverse("B"))
	if err != nil {
		t.Fatal(err)
	}
	d := legsTo(t, r, "B")[1]
	if d.Feasible || d.ReasonCode != routing.CodeNoDiverse || !strings.Contains(d.Reason, "shared-risk group S between H1 and H5") {
		t.Errorf("diverse leg feasible %v, code %q, reason %q; want NO-DIVERSE naming S between H1 and H5", d.Feasible, d.ReasonCode, d.Reason)
	}
}
