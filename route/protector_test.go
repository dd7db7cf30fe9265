package route_test

import (
	"slices"
	"strings"
	"testing"

	"spanwright/media"
	"spanwright/route"
	"spanwright/route/estimate"
	"spanwright/route/internal/testplan"
	"spanwright/route/output"
	"spanwright/route/plan"
)

// TestPrimaryProtectors (tester 8's finding 2): copper entering a building from outside needs
// a listed primary protector at the entrance (NFPA 70 800.90, seen; the copper caution's
// source), so a copper leg whose route leaves the buildings buys one at each end of each
// 4-pair cable. A book without primary_protector_each lists them not priced, with their
// count, and names the key in the summary (as a bid lists its exclusions: common practice, no
// published source); a book with it prices them, in the leg's terminations and transceivers
// cost. A fibre leg buys none.
func TestPrimaryProtectors(t *testing.T) {
	t.Parallel()
	copperOnly := copperOnlyRules(t)
	solve := func(t *testing.T, edit func(p *plan.Plan)) *route.Result {
		t.Helper()
		r, err := testplan.PullSolveJSON(t, copperCampus(), func(p *plan.Plan) {
			p.Links = []plan.LinkSpec{{From: "A", To: "B", Rate: "1G", Strands: 4, Growth: new(float64)}}
			p.Design.AllowOutdoorCopper = true
			p.Rules = copperOnly
			if edit != nil {
				edit(p)
			}
		})
		if err != nil {
			t.Fatal(err)
		}
		return r
	}

	r := solve(t, nil)
	_, leg := testplan.LegOf(t, r, "A-B")
	if m := r.Engine.Catalog().Medium(leg.Medium); m == nil || m.Fibre() || !leg.Outdoor {
		t.Fatalf("leg A-B: medium %q, outdoor %v; want copper leaving the buildings", leg.Medium, leg.Outdoor)
	}
	want := float64(2 * len(leg.Cable.Cables)) // one at each end of each 4-pair cable
	if want < 4 {
		t.Fatalf("leg A-B: %d cables, want 2 (4 strands, one 4-pair cable per two)", len(leg.Cable.Cables))
	}
	line, ok := testplan.BOMLine(r.Estimate.BOM, estimate.ProtectorItem)
	if !ok || line.Quantity != want || !line.NotPriced || line.ExtendedCents != 0 || line.Category != media.CategoryMaterial {
		t.Errorf("without a price: protector line %+v (found %v), want %g not priced", line, ok, want)
	}
	if got := output.Summarize(r).NotPriced; !slices.Contains(got, "primary_protector_each") {
		t.Errorf("without a price: summary not_priced %q, want primary_protector_each", got)
	}

	path := testplan.DemoBookWith(t, "primary_protector_each: 85.00\n")
	r2 := solve(t, func(p *plan.Plan) { p.Prices = path })
	_, leg2 := testplan.LegOf(t, r2, "A-B")
	line, ok = testplan.BOMLine(r2.Estimate.BOM, estimate.ProtectorItem)
	if !ok || line.NotPriced || line.Quantity != want || line.ExtendedCents != int64(want)*8500 {
		t.Errorf("priced: protector line %+v (found %v), want %g at 85.00", line, ok, want)
	}
	if got := leg2.Cost.OpticsCents - leg.Cost.OpticsCents; got != int64(want)*8500 {
		t.Errorf("priced: the leg's terminations and transceivers cost grew by %d cents, want %d", got, int64(want)*8500)
	}
	if got := output.Summarize(r2).NotPriced; slices.Contains(got, "primary_protector_each") {
		t.Errorf("priced: summary not_priced %q", got)
	}

	// The same link without outdoor copper, on fibre, buys no protector.
	r3 := solve(t, func(p *plan.Plan) { p.Rules, p.Prices, p.Design.AllowOutdoorCopper = "", path, false })
	_, leg3 := testplan.LegOf(t, r3, "A-B")
	if m := r3.Engine.Catalog().Medium(leg3.Medium); m == nil || !m.Fibre() {
		t.Fatalf("embedded rules: leg A-B on %q, want fibre", leg3.Medium)
	}
	if _, ok := testplan.BOMLine(r3.Estimate.BOM, estimate.ProtectorItem); ok {
		t.Errorf("fibre leg: the bill buys primary protectors")
	}
}

// TestCopperLegsInTheirOwnTerms (tester 8's finding 8): a copper leg's strands are its pairs,
// four to each 4-pair cable (ANSI/TIA-568.2: a 4-pair cable serves one port, seen), not the
// fibre cable size the plan's strands round up to; and where unlisted outdoor copper would run
// more than 15 m inside a building (NFPA 70 770.48 as the rule entrance-15m applies it), the
// refusal names the building at each end with its metres.
func TestCopperLegsInTheirOwnTerms(t *testing.T) {
	t.Parallel()
	copperOnly := copperOnlyRules(t)
	solve := func(campus string) *route.Result {
		r, err := testplan.PullSolveJSON(t, campus, func(p *plan.Plan) {
			p.Links = []plan.LinkSpec{{From: "A", To: "B", Rate: "1G", Strands: 2, Growth: new(float64)}}
			p.Design.AllowOutdoorCopper = true
			p.Rules = copperOnly
		})
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	_, leg := testplan.LegOf(t, solve(copperCampus()), "A-B")
	if leg.Medium != "cat6a" || len(leg.Cable.Cables) != 1 || leg.StrandsCable != 4 {
		t.Errorf("copper leg: medium %q, %d cables, strands %d; want cat6a, one 4-pair cable, 4 pairs", leg.Medium, len(leg.Cable.Cables), leg.StrandsCable)
	}

	// Risers of 12 m at B: 12 + 5 m coil + 3 m loop = 20 m inside B, 1 + 8 = 9 m inside A.
	tall := strings.Replace(copperCampus(), `"riser_m":1,"id":"B"`, `"riser_m":12,"id":"B"`, 1)
	if tall == copperCampus() {
		t.Fatal("campus changed: no riser_m of B to raise")
	}
	r := solve(tall)
	var why string
	for _, l := range r.Legs {
		for _, rj := range l.Rejected {
			if rj.Medium == "cat6a" {
				why += rj.Reason
			}
		}
		why += l.Reason
	}
	if !strings.Contains(why, "entrance-15m") || !strings.Contains(why, "20 m inside B") || !strings.Contains(why, "9 m inside A") {
		t.Errorf("copper refused without naming the buildings: %q", why)
	}
}
