package output

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestAddedPullPointOnLateral: duct E runs from inside hub A at (0, 0) east to (100, 0) and
// ends there; U's counted lateral of 20 m joins E's end and carries it on, so the pull from U
// takes the lateral. With pull_max_m 15 the pulling plan adds pull points, the first inside
// the lateral; added_structures places it on the lateral (span "lateral of" U's entrance, its
// distance from U), at the point of the lateral's line that far from U, not on E.
func TestAddedPullPointOnLateral(t *testing.T) {
	t.Parallel()
	e := fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"E","type":"duct"},"geometry":{"type":"LineString","coordinates":[[%.7f,%.7f],[%.7f,%.7f]]}}`,
		testsite.X(0), testsite.Y(0), testsite.X(100), testsite.Y(0))
	campus := `{"type":"FeatureCollection","features":[` + strings.Join([]string{testsite.Box("A", "mc", 0, 0), testsite.Box("U", "", 100, 30), e}, ",") + `]}`
	r, err := testplan.PullSolveJSON(t, campus, func(p *plan.Plan) { p.Design.PullMaxM = 15 })
	if err != nil {
		t.Fatal(err)
	}
	_, leg := testplan.LegOf(t, r, "A-U")
	var on []pullPoint
	for _, p := range addedPullPoints(r) {
		if p.lateral {
			on = append(on, p)
		}
	}
	if len(on) == 0 {
		t.Fatalf("no added pull point on U's lateral: %+v", addedPullPoints(r))
	}
	var en geo.Entry
	for _, x := range r.Site.Net.EntrancesOf("U") {
		if x.ID == leg.EntranceTo {
			en = x
		}
	}
	for _, p := range on {
		lat := geo.Span{Line: en.Lateral, LengthM: en.LateralM}
		want := lat.PointAt(p.offM)
		got := p.lat.PointAt(p.offM)
		if p.span != "lateral of "+leg.EntranceTo || p.offM <= 0 || p.offM >= en.LateralM || got != want || math.Abs(got[0]-testsite.X(100)) > 1e-6 || got[1] < testsite.Y(0.5) || got[1] > testsite.Y(19.5) {
			t.Errorf("pull point %+v at %v, want on U's lateral (x = 100 m) between its ends", p, got)
		}
	}
	// The structures table lists every added pull point the bill counts as a handhole to
	// build where added_structures places it, with the leg pulled there: J0002 too, where the
	// lateral joins E (added_structures left it out before: the end of the leg's spans was
	// taken for a building).
	sts, err := StructuresOf(r)
	if err != nil {
		t.Fatal(err)
	}
	pulls := 0
	for _, st := range sts {
		if st.Status != StructureToBuild || st.Purpose != PurposePull {
			continue
		}
		pulls++
		if (st.ID == "") == (st.Span == "") || len(st.Legs) != 1 || st.Legs[0] != leg.Label() {
			t.Errorf("structure %+v: want a handhole at a junction or on a span or lateral, through %s", st, leg.Label())
		}
		if st.Span == "lateral of "+leg.EntranceTo && st.Point != geo.Rounded(on[0].lat.PointAt(st.AtM)) {
			t.Errorf("structure %d at %v, not on U's lateral", st.Mark, st.Point)
		}
	}
	if pulls != r.Estimate.AddedPullPoints || pulls == 0 {
		t.Errorf("%d pull points in the structures table, the bill counts %d", pulls, r.Estimate.AddedPullPoints)
	}
}
