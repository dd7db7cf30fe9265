package route_test

import (
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"spanwright/media"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/output"
	"spanwright/route/plan"
)

// conductiveCatalog writes the embedded catalog with every outdoor fibre construction made
// conductive into a temporary file and returns its path: indoor-outdoor listed OFCR (NFPA 70
// Article 770: "C", conductive, seen), which metallic_members is then read from, and
// osp-loose-tube said to have metallic members (an armoured outside-plant cable).
func conductiveCatalog(t *testing.T) string {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "media", "catalog.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	text := strings.ReplaceAll(string(data), "metallic_members: false", "metallic_members: true")
	io := regexp.MustCompile(`listing: OFNR( #[^\n]*)?\n(\s+)outdoor_rated: true`)
	if n := len(io.FindAllString(text, -1)); n != 2 {
		t.Fatalf("catalog: %d listed outdoor constructions, want 2 (indoor-outdoor, multimode and single-mode)", n)
	}
	text = io.ReplaceAllString(text, "listing: OFCR\n${2}outdoor_rated: true")
	path := filepath.Join(t.TempDir(), "catalog.yaml")
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestBondingMetallicMembers (tester 15 F5): a fibre cable with metallic members entering a
// building from outside has them bonded or grounded as close to the point of entrance as
// practicable (NFPA 70 770.93 and 770.100, from memory), so the bill buys a bonding at each end
// of each such cable of a leg whose route leaves the buildings, in material at
// metallic_member_bonding_each, or listed not priced without it (as a bid lists its
// exclusions: common practice, no published source); the leg's cable cost and the optimizer's
// objective carry the same amount, and the safety cautions name the legs and entrances. The
// embedded catalog's constructions are all-dielectric: no line, no caution.
func TestBondingMetallicMembers(t *testing.T) {
	t.Parallel()
	catalog := conductiveCatalog(t)
	solve := func(t *testing.T, edit func(p *plan.Plan)) *route.Result {
		t.Helper()
		r, err := testplan.PullSolveJSON(t, copperCampus(), func(p *plan.Plan) {
			p.Links = []plan.LinkSpec{{From: "A", To: "B", Rate: "10G", Strands: 12, Growth: new(float64)}}
			edit(p)
		})
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	r := solve(t, func(p *plan.Plan) { p.Catalog = catalog })
	_, leg := testplan.LegOf(t, r, "A-B")
	m := r.Engine.Catalog().Medium(leg.Medium)
	if m == nil || !m.Fibre() || !leg.Outdoor || !m.Construction(leg.Construction).MetallicMembers {
		t.Fatalf("leg A-B: %s %s, outdoor %v; want fibre with metallic members leaving the buildings", leg.Medium, leg.Construction, leg.Outdoor)
	}
	want := float64(2 * len(leg.Cable.Cables)) // both ends of each cable
	line, ok := testplan.BOMLine(r.Estimate.BOM, media.BondingItem)
	if !ok || line.Quantity != want || !line.NotPriced || line.ExtendedCents != 0 || line.Category != media.CategoryMaterial {
		t.Errorf("without a price: bonding line %+v (found %v), want %g not priced", line, ok, want)
	}
	if got := output.Summarize(r).NotPriced; !slices.Contains(got, "metallic_member_bonding_each") {
		t.Errorf("without a price: summary not_priced %q, want metallic_member_bonding_each", got)
	}
	c := cautionOf(t, r, route.CautionMetallic)
	if wantWhere := "1 fibre leg with metallic members leaving a building: A-B/primary; members bonded at 2 entrances A:1, B:1"; c.Where != wantWhere {
		t.Errorf("caution where %q, want %q", c.Where, wantWhere)
	}
	if !strings.Contains(c.Source, "Article 770") || !strings.Contains(c.Text, media.BondingItem) {
		t.Errorf("caution %+v: want NFPA 70 Article 770 and the bill's line named", c)
	}

	book := testplan.DemoBookWith(t, "metallic_member_bonding_each: 120.00\n")
	r2 := solve(t, func(p *plan.Plan) { p.Catalog, p.Prices = catalog, book })
	_, leg2 := testplan.LegOf(t, r2, "A-B")
	if leg2.Construction != leg.Construction || len(leg2.Steps) != len(leg.Steps) {
		t.Fatalf("priced: leg A-B %s over %d spans, want %s over %d as unpriced", leg2.Construction, len(leg2.Steps), leg.Construction, len(leg.Steps))
	}
	cents := int64(want) * 12000
	line, ok = testplan.BOMLine(r2.Estimate.BOM, media.BondingItem)
	if !ok || line.NotPriced || line.Quantity != want || line.ExtendedCents != cents {
		t.Errorf("priced: bonding line %+v (found %v), want %g at 120.00", line, ok, want)
	}
	if got := leg2.Cost.CableCents - leg.Cost.CableCents; got != cents {
		t.Errorf("priced: the leg's cable cost grew by %d cents, want %d", got, cents)
	}
	if got := r2.ObjectiveCents - r.ObjectiveCents; got != cents {
		t.Errorf("priced: the optimizer's objective grew by %d cents, want %d (the bill's bonding)", got, cents)
	}

	// The embedded catalog: all-dielectric cable, nothing to bond.
	r3 := solve(t, func(p *plan.Plan) { p.Prices = book })
	if _, ok := testplan.BOMLine(r3.Estimate.BOM, media.BondingItem); ok {
		t.Error("all-dielectric cable: the bill bonds metallic members")
	}
	if ids := cautionIDs(r3); slices.Contains(ids, route.CautionMetallic) {
		t.Errorf("all-dielectric cable: cautions %v", ids)
	}
}
