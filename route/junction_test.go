package route_test

import (
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/items"
	"spanwright/route/plan"
	"spanwright/route/routing"
)

// handholeLines are the bill's lines of handholes the plan adds at junctions without a
// structure, one per reason.
var handholeLines = []string{"handhole where new pathway joins the network", items.TapHandholeItem,
	"handhole where a route turns between pathways"}

// entrance is a declared entrance of building b at a grid point.
func entrance(id, b string, x, y float64) string {
	return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"entrance","id":%q,"building":%q},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`,
		id, b, testsite.X(x), testsite.Y(y))
}

// TestOneHandholePerJunction: the plan adds at most one handhole at a junction without a
// structure, whatever it is for (common practice, no published source: one handhole serves
// every cable that turns, taps or joins there). Hub A's duct D runs east from A to handhole
// HH at (300, 0); buildings reached by counted laterals of 20 m tap D at (150, 0), where no
// structure stands, and in the second case duct L leaves D there north to building B, so the
// route A-B turns there too. Before, the bill and added_structures listed such a junction
// once per lateral and again for the turn (a reviewer's campus listed J0002 twice). The
// optimizer's objective moves with the handhole price exactly as the bill does: one
// handhole, so the objective prices the junction once too.
func TestOneHandholePerJunction(t *testing.T) {
	t.Parallel()
	d := duct("D", 0, 0, 150, 0, 300, 0)
	common := []string{testsite.Box("A", "mc", 0, 0), d, handhole("HH", 300, 0)}
	for _, tc := range []struct {
		name     string
		features []string
		purpose  string
		taps     int    // laterals that tap there
		turns    string // the link whose primary leg turns at the junction, "" for none
	}{
		{"two laterals tap one junction", []string{testsite.Box("S", "", 150, 30), testsite.Box("N", "", 150, -30)}, routing.PurposeTap, 2, ""},
		{"a lateral taps where a route turns", []string{testsite.Box("S", "", 150, -30), testsite.Box("B", "", 150, 130),
			duct("L", 150, 0, 150, 120)}, routing.PurposeTap, 1, "A-B"},
		// M's entrances: the north one's lateral taps D at the junction, the south one is on
		// proposed duct F, which reaches D at HH (300 m of trench: not taken): the junction's
		// one charge covers M's north entrance edges too.
		{"a building with two entrances taps where a route turns", []string{testsite.Box("M", "", 150, -30), entrance("M-N", "M", 150, -20),
			entrance("M-S", "M", 150, -40), proposed(duct("F", 150, -40, 300, -40, 300, 0)), testsite.Box("B", "", 150, 130),
			duct("L", 150, 0, 150, 120)}, routing.PurposeTap, 1, "A-B"},
	} {
		solve := func(handholeCents string) *route.Result {
			book := filepath.Join(t.TempDir(), "prices.yaml")
			if err := os.WriteFile(book, costBook(t, "handhole: 2400.00", "handhole: "+handholeCents), 0o644); err != nil {
				t.Fatal(err)
			}
			r, err := testplan.PullSolveJSON(t, collection(append(slices.Clone(common), tc.features...)...), func(p *plan.Plan) { p.Prices = book })
			if err != nil {
				t.Fatalf("%s: %v", tc.name, err)
			}
			return r
		}
		r := solve("2400.00")
		if len(r.Handholes) != 1 || r.Handholes[0].Purpose() != tc.purpose {
			t.Fatalf("%s: handholes %+v, want one for %s", tc.name, r.Handholes, tc.purpose)
		}
		j := r.Handholes[0].Junction
		c := r.Estimate.Construction
		if n := len(c.NewJunctions) + len(c.TapJunctions) + len(c.TurnJunctions); n != 1 {
			t.Errorf("%s: construction lists %q joins, %q taps, %q turns; want one junction", tc.name, c.NewJunctions, c.TapJunctions, c.TurnJunctions)
		}
		taps := 0
		for _, en := range c.Entrances {
			if en.Tap == j {
				taps++
			}
		}
		if taps != tc.taps {
			t.Errorf("%s: %d laterals tap at %s, want %d", tc.name, taps, j, tc.taps)
		}
		var billed float64
		for _, item := range handholeLines {
			billed += testplan.BOMQty(r.Estimate.BOM, item)
		}
		if billed != 1 {
			t.Errorf("%s: %v handholes billed at junctions, want 1", tc.name, billed)
		}
		for _, l := range r.Legs {
			if l.Name != routing.LegPrimary {
				continue
			}
			if want := l.Link.ID == tc.turns; !l.Feasible || slices.Contains(l.Turns, j) != want {
				t.Errorf("%s: leg %s feasible %v, turns %q; want a turn at %s: %v", tc.name, l.Link.ID, l.Feasible, l.Turns, j, want)
			}
		}
		// 1,000.00 more per handhole moves the objective and the bill by 1,000.00 each.
		dear := solve("3400.00")
		if got := dear.ObjectiveCents - r.ObjectiveCents; got != 100_000 {
			t.Errorf("%s: the objective moved by %d cents with the handhole price, want 100000 (one handhole)", tc.name, got)
		}
		var before, after int64
		for _, item := range handholeLines {
			if l, ok := testplan.BOMLine(r.Estimate.BOM, item); ok {
				before += l.ExtendedCents
			}
			if l, ok := testplan.BOMLine(dear.Estimate.BOM, item); ok {
				after += l.ExtendedCents
			}
		}
		if after-before != 100_000 {
			t.Errorf("%s: the bill's junction handholes moved by %d cents, want 100000", tc.name, after-before)
		}
	}
}

// TestNoSharpRun plans the three campuses where runs of duct used to chain (geo.Network.RunsAt
// joined spans transitively), each with junction J at (200, 0) and no structure there: a leg
// that goes straight on keeps its duct, the leg that the chain took "straight" through a
// sharp turn now turns at J, and the plan bills the handhole it turns in (common practice,
// no published source; TIA-569's pull point after at most two 90° bends of conduit is the
// related published rule, from memory).
func TestNoSharpRun(t *testing.T) {
	t.Parallel()
	aerial := func(feature string) string { return strings.Replace(feature, `"type":"duct"`, `"type":"aerial"`, 1) }
	for _, tc := range []struct {
		name            string
		features        []string
		straight, turns string // the links that go straight on at J and that turn there
	}{
		// Street S from A east to B; lateral duct L leaves J 14° off the street's west piece,
		// back to C: A-C used to go "straight" from S's west piece into L, a 166° hairpin.
		{"hairpin", []string{testsite.Box("A", "mc", 0, 0), testsite.Box("B", "", 410, 0), testsite.Box("C", "", 0, 60),
			duct("S", 0, 0, 200, 0, 400, 0), duct("L", 200, 0, 0, 50)}, "A-B", "A-C"},
		// A narrow fork: F0 from A forks at J into F1 (5° off) and F2 (15° off).
		{"fork", []string{testsite.Box("A", "mc", 0, 0), testsite.Box("B", "", 410, 17), testsite.Box("C", "", 410, -54),
			duct("F0", 0, 0, 200, 0), duct("F1", 200, 0, 400, 17), duct("F2", 200, 0, 400, -54)}, "A-B", "A-C"},
		// Duct D1 from A carried on by aerial span X to B; duct D2 leaves J 10° off D1, back to
		// C: A-C used to pass from D1 into D2 "straight", a 170° hairpin, both chained to X.
		{"duct, aerial, duct", []string{testsite.Box("A", "mc", 0, 0), testsite.Box("B", "", 410, 0), testsite.Box("C", "", 0, 45),
			duct("D1", 0, 0, 200, 0), aerial(duct("X", 200, 0, 400, 0)), duct("D2", 200, 0, 0, 35)}, "A-B", "A-C"},
	} {
		r, err := testplan.PullSolveJSON(t, collection(tc.features...), nil)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		var j string
		for _, jn := range r.Site.Net.Junctions {
			if jn.Point == testsite.Point(200, 0) {
				j = jn.ID
			}
		}
		for _, l := range r.Legs {
			if want := l.Link.ID == tc.turns; !l.Feasible || slices.Contains(l.Turns, j) != want {
				t.Errorf("%s: leg %s feasible %v (%s), turns %q; want a turn at %s: %v", tc.name, l.Link.ID, l.Feasible, l.Reason, l.Turns, j, want)
			}
		}
		if c := r.Estimate.Construction; !slices.Equal(c.TurnJunctions, []string{j}) {
			t.Errorf("%s: turn handholes at %q, want one at %s", tc.name, c.TurnJunctions, j)
		}
		if got := testplan.BOMQty(r.Estimate.BOM, "handhole where a route turns between pathways"); got != 1 {
			t.Errorf("%s: %v turn handholes billed, want 1", tc.name, got)
		}
	}
}
