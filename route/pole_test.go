package route_test

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/routing"
)

// TestNoHandholeAtAPole (tester 8's finding 7): a pole line from hub A east to C branches at a
// pole P at (200, 0), where line A-3 leaves north to B, with no structure drawn there. The
// route A-B turns at the pole from one aerial line into the other; the cable is lashed to the
// strand and turned on the pole, and nothing is built in the ground: no handhole, no pass
// through one (no slack loop or crew entry), no bill line and no "Buried utilities" caution
// for it. The same where only tunnels and trays meet (the cable lies on racks there) and
// where new strand is hung from the pole. Where the branch is a duct (a riser pole: the
// cable goes down the pole into the ground), the turn is made in a handhole at its foot, as
// before. (Common practice, no published source: a turn or branch of an aerial cable is made
// at the pole, with corner hardware on the strand; TIA-569's pull points are for conduit.)
// The optimizer prices what the bill prices on each campus (oneCostModel).
func TestNoHandholeAtAPole(t *testing.T) {
	t.Parallel()
	typed := func(typ, feature string) string {
		return strings.Replace(feature, `"type":"duct"`, `"type":"`+typ+`"`, 1)
	}
	line := func(typ string) string { return typed(typ, duct("A-1", 0, 0, 200, 0, 410, 0)) }
	branch := func(typ string) string { return typed(typ, duct("A-3", 200, 0, 200, 200)) }
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "prices.yaml"), costBook(t), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name         string
		line, branch string
		handhole     bool // the turn at the pole needs a handhole built
	}{
		{"a pole line branching at a pole", line(geo.TypeAerial), branch(geo.TypeAerial), false},
		{"new strand hung from the pole", line(geo.TypeAerial), typed(geo.TypeAerial, proposed(branch("duct"))), false},
		{"a tray off a tunnel", line(geo.TypeTunnel), branch(geo.TypeTray), false},
		{"a duct down a riser pole", line(geo.TypeAerial), branch(geo.TypeDuct), true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			campus := collection(testsite.Box("A", "mc", 0, 0), testsite.Box("B", "", 200, 210), testsite.Box("C", "", 420, 0), tc.line, tc.branch)
			r, err := testplan.PullSolveJSON(t, campus, func(p *plan.Plan) {
				p.Dir, p.Prices = dir, "prices.yaml"
				p.Design.AllowNewTrench = true
			})
			if err != nil {
				t.Fatal(err)
			}
			var pole string
			for _, jn := range r.Site.Net.Junctions {
				if jn.Point == testsite.Point(200, 0) {
					pole = jn.ID
				}
			}
			if pole == "" {
				t.Fatal("no junction at the pole (200, 0)")
			}
			_, ab := testplan.LegOf(t, r, "A-B")
			if !ab.Feasible {
				t.Fatalf("leg A-B infeasible: %s", ab.Reason)
			}
			passes := ab.Cable.Passes(pole)
			c := r.Estimate.Construction
			built := slices.ContainsFunc(r.Handholes, func(h routing.Handhole) bool { return h.Junction == pole })
			billed := testplan.BOMQty(r.Estimate.BOM, "handhole where a route turns between pathways") +
				testplan.BOMQty(r.Estimate.BOM, "handhole where new pathway joins the network")
			var dig string
			for _, cn := range r.Cautions {
				if cn.ID == route.CautionLocates {
					dig = cn.Where
				}
			}
			if !tc.handhole {
				if built || passes || billed != 0 || len(c.TurnJunctions)+len(c.NewJunctions) != 0 || slices.Contains(ab.Turns, pole) {
					t.Errorf("handholes %+v, A-B passes %s: %v, turns %q, billed %v, construction turns %q joins %q; want no handhole at the pole",
						r.Handholes, pole, passes, ab.Turns, billed, c.TurnJunctions, c.NewJunctions)
				}
				if strings.Contains(dig, "handhole") {
					t.Errorf("buried utilities: %q, want no handhole to set", dig)
				}
			} else {
				if !built || !passes || billed != 1 || !slices.Equal(c.TurnJunctions, []string{pole}) || !slices.Contains(ab.Turns, pole) {
					t.Errorf("handholes %+v, A-B passes %s: %v, turns %q, billed %v, construction turns %q; want the turn's handhole at the pole's foot",
						r.Handholes, pole, passes, ab.Turns, billed, c.TurnJunctions)
				}
				if !strings.Contains(dig, "1 handhole to set") {
					t.Errorf("buried utilities: %q, want 1 handhole to set", dig)
				}
			}
			oneCostModel(t, tc.name, r)

			// With reels that run out just past the pole on A-B, the join goes where the reel
			// ends: on the strand as a splice closure (NoStructure, on a span), not in a
			// handhole at the pole; at a riser pole, in the handhole at its foot, the last
			// structure before the reel's end (TIA-758-B: a closure stored in a maintenance
			// hole or handhole, from memory).
			_, plain := testplan.LegOf(t, r, "A-B")
			poleM := -1.0
			for _, sc := range plain.Cable.Passed {
				if sc.ID == pole {
					poleM = sc.ChannelM
				}
			}
			r, err = testplan.PullSolveJSON(t, campus, func(p *plan.Plan) {
				p.Dir, p.Prices = dir, "prices.yaml"
				p.Design.AllowNewTrench = true
				p.Design.ReelM = 260
			})
			if err != nil {
				t.Fatal(err)
			}
			_, ab = testplan.LegOf(t, r, "A-B")
			if !ab.Feasible || len(ab.Cable.Splices) == 0 {
				t.Fatalf("with reel_m 260: leg A-B feasible %v, splices %+v; want a join", ab.Feasible, ab.Cable.Splices)
			}
			join := ab.Cable.Splices[0]
			if !tc.handhole {
				if join.ID == pole || join.Added || !join.NoStructure || join.Span == "" || !strings.HasPrefix(join.Span, "A-") {
					t.Errorf("with reel_m 260: the join %+v, want a splice closure on a span of the line, not in a handhole at %s", join, pole)
				}
			} else if join.ID != pole || !join.Added || poleM <= 0 {
				t.Errorf("with reel_m 260: the join %+v (the pole at %.1f m of the channel), want it in the handhole at %s", join, poleM, pole)
			}
		})
	}
}
