package metamorphic_test

import (
	"slices"
	"testing"

	"spanwright/geo"
	"spanwright/route/internal/campusgen"
	"spanwright/route/internal/testplan"
	"spanwright/route/items"
)

// TestOneHandholePerJunctionGenerated holds, on the generated campuses, the rules of the
// handholes the plan adds at junctions without a structure (common practice, no published
// source: one handhole serves every cable that turns, taps or joins there; TIA-569's pull
// point after at most two 90° bends of conduit is the related published rule, from memory):
//
//   - a run of duct through such a junction (geo.Network.RunsAt) is one span or two, and two
//     spans of different pathways in one run deflect by at most 90° (a duct carries on into
//     at most one other, so no run chains into a hairpin);
//   - the plan adds at most one handhole per junction (routing.Routed.Handholes), listed under
//     exactly one of the construction's joins, taps and turns, billed once in the three bill
//     lines together, and it stands wherever a used lateral taps a duct and wherever a leg
//     lists a turn.
func TestOneHandholePerJunctionGenerated(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		_, res := outputs(t, sc)
		net := res.Site.Net
		for _, j := range res.Site.TurnsNeedingStructure() {
			var at []int
			for i := range net.Spans {
				if s := &net.Spans[i]; s.From == j || s.To == j {
					at = append(at, i)
				}
			}
			for _, run := range net.RunsAt(j, at) {
				if len(run) > 2 {
					t.Errorf("seed %d: junction %s: a run of %d spans", seed, j, len(run))
					continue
				}
				if len(run) == 2 {
					a, b := &net.Spans[run[0]], &net.Spans[run[1]]
					turn := net.TurnDeg(geo.Step{SpanID: a.ID, Reverse: a.From == j}, geo.Step{SpanID: b.ID, Reverse: b.To == j})
					if a.PathwayID != b.PathwayID && turn > 90 {
						t.Errorf("seed %d: junction %s: %s and %s one run, turning %.1f°", seed, j, a.ID, b.ID, turn)
					}
				}
			}
		}
		var added []string
		for _, h := range res.Handholes {
			if slices.Contains(added, h.Junction) {
				t.Errorf("seed %d: two handholes at %s", seed, h.Junction)
			}
			added = append(added, h.Junction)
		}
		con := res.Estimate.Construction
		listed := slices.Concat(con.NewJunctions, con.TapJunctions, con.TurnJunctions)
		slices.Sort(listed)
		want := slices.Sorted(slices.Values(added))
		if !slices.Equal(listed, want) {
			t.Errorf("seed %d: construction lists %q, want each of the handholes %q once", seed, listed, want)
		}
		var billed float64
		for _, item := range []string{"handhole where new pathway joins the network", items.TapHandholeItem,
			"handhole where a route turns between pathways"} {
			billed += testplan.BOMQty(res.Estimate.BOM, item)
		}
		if int(billed) != len(added) {
			t.Errorf("seed %d: %v junction handholes billed, want %d", seed, billed, len(added))
		}
		for _, en := range con.Entrances {
			if en.Tap != "" && !slices.Contains(added, en.Tap) {
				t.Errorf("seed %d: entrance %s taps at %s, no handhole there", seed, en.Entrance, en.Tap)
			}
		}
		for i := range res.Legs {
			for _, j := range res.Legs[i].Turns {
				if !slices.Contains(added, j) {
					t.Errorf("seed %d: leg %s turns at %s, no handhole there", seed, legKey(&res.Legs[i]), j)
				}
			}
		}
	})
}
