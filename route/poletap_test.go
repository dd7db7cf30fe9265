package route_test

import (
	"fmt"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/items"
	"spanwright/route/output"
	"spanwright/route/plan"
)

// TestLateralFromPoleLine: building C has no pathway end; the pole line P (aerial, poles at
// its vertices x = 100, 200 and 300 m, hung from the duct D at the riser pole at x = 100)
// passes 12 m from its wall mid-span, and its nearest pole, at x = 200, is 19.2 m from the
// footprint. C's counted lateral leaves the line at that pole: the cable comes down the pole
// in a riser into a handhole at its foot, then runs in the lateral's trench to C (README
// "Pathway types": the turn where an aerial span meets a duct is made in the handhole at the
// pole's foot; common practice, no published source). So the plan builds one handhole at
// C's tap (and the turn handhole at the riser pole where D meets P), and bills one riser down
// a pole: NFPA 70 300.5(D)(1) asks for protection of cables emerging from grade up to 2.5 m
// (8 ft) above it (from memory, for Chapter 3 wiring; applied to the lateral's riser as
// common practice), which the riser's conduit and guard give; the demo book has no
// pole_riser_each, so it is listed not priced.
func TestLateralFromPoleLine(t *testing.T) {
	t.Parallel()
	campus := `{"type":"FeatureCollection","features":[` + strings.Join([]string{
		testsite.Box("A", "mc", 10, 25), testsite.Box("C", "", 225, 22),
		line("D", `,"spare_ducts":2`, 10, 15, 10, 0, 100, 0),
		testsite.Pathway("P", "aerial", 100, 0, 200, 0, 300, 0),
	}, ",") + `]}`
	r, err := testplan.PullSolveJSON(t, campus, nil)
	if err != nil {
		t.Fatal(err)
	}
	_, l := testplan.LegOf(t, r, "A-C")
	if !l.Feasible {
		t.Fatalf("A-C infeasible: %s", l.Reason)
	}
	e, _ := r.Site.Net.Entry("C", l.EntranceTo)
	j, _ := r.Site.Net.Junction(e.Junction)
	pole := orb.Point{testsite.X(200), testsite.Y(0)}
	if d := geo.DistanceM(j.Point, pole); d > 0.05 {
		t.Errorf("C's lateral taps at %v, %.1f m from the pole at x = 200; want the pole", j.Point, d)
	}
	if !e.PoleRiser {
		t.Errorf("C's entrance %+v; want its lateral down a pole (PoleRiser)", e)
	}
	var taps []string
	for _, h := range r.Handholes {
		if h.Taps {
			taps = append(taps, h.Junction)
		}
	}
	if len(taps) != 1 || taps[0] != e.Junction {
		t.Errorf("tap handholes %q; want one, at C's tap %s", taps, e.Junction)
	}
	lines := map[string]string{}
	for _, bl := range r.Estimate.BOM.Lines {
		lines[bl.Item] = fmt.Sprintf("%g not priced %v", bl.Quantity, bl.NotPriced)
	}
	if got, want := lines[items.PoleRiserItem], "1 not priced true"; got != want {
		t.Errorf("bill: %q %q; want %q", items.PoleRiserItem, got, want)
	}
	if got, want := lines[items.TapHandholes(1).Item], "1 not priced false"; got != want {
		t.Errorf("bill: %q %q; want %q", items.TapHandholes(1).Item, got, want)
	}
	// The riser is placed (tester 11's finding 12): the bill's line is from the handhole at
	// the pole's foot, and the structures table names the riser on that handhole's row.
	if line, _ := testplan.BOMLine(r.Estimate.BOM, items.PoleRiserItem); !slices.Equal(line.From, []string{"junction " + e.Junction + " for the lateral of entrance " + e.ID + " of building C"}) {
		t.Errorf("riser line from %q, want the junction %s and C's entrance %s", line.From, e.Junction, e.ID)
	}
	sts, err := output.StructuresOf(r)
	if err != nil {
		t.Fatal(err)
	}
	for _, st := range sts {
		if st.ID == e.Junction {
			if want := "pole riser (lateral of " + e.ID + ")"; !strings.Contains(st.Purpose, want) {
				t.Errorf("structures table: %s's purpose %q lacks %q", st.ID, st.Purpose, want)
			}
		} else if strings.Contains(st.Purpose, "pole riser") {
			t.Errorf("structures table: %s's purpose %q names a pole riser", st.ID, st.Purpose)
		}
	}

	// Priced (an invented 650.00 each), the riser is in the optimizer's objective and the
	// bill's construction alike, and nothing else moves.
	path := testplan.DemoBookWith(t, "pole_riser_each: 650.00\n")
	r2, err := testplan.PullSolveJSON(t, campus, func(p *plan.Plan) { p.Prices = path })
	if err != nil {
		t.Fatal(err)
	}
	if got := r2.ObjectiveCents - r.ObjectiveCents; got != 65000 {
		t.Errorf("priced riser: the objective moved %d cents; want 65000", got)
	}
	c := media.CategoryConstruction
	if got := r2.Estimate.BOM.CategoryCents(c) - r.Estimate.BOM.CategoryCents(c); got != 65000 {
		t.Errorf("priced riser: the bill's construction moved %d cents; want 65000", got)
	}
}
