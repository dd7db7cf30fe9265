package routing

import (
	"slices"
	"testing"

	"spanwright/geo"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestPassesOfOncePerHandhole holds passesOf to its rule (README, "Structures passed"): a
// handhole the plan builds at junction J, where duct D runs on east, duct L leaves north and
// aerial line X passes in a V, is passed once by every leg through J on a duct — straight on
// along D, turning from D into L, and turning there for two reasons at once (a turn listed
// twice, as a route that also turns into new pathway joining there once counted it) — each
// leaving one slack loop (design.slack_loop_structure_m); a leg along X passes J overhead, in
// the strand, and not through the handhole (common practice, no published source).
func TestPassesOfOncePerHandhole(t *testing.T) {
	t.Parallel()
	s := testsite.Campus(t, "t.geojson", testsite.Features(testsite.Pathway("D", geo.TypeDuct, 0, 0, 150, 0, 300, 0),
		testsite.Pathway("L", geo.TypeDuct, 150, 0, 150, 120), testsite.Pathway("X", geo.TypeAerial, 50, -100, 150, 0, 250, -100)))
	net := s.Net
	// J: the junction where all three meet.
	j := ""
	for _, m := range net.Meetings {
		if m.Degree == 5 {
			j = m.Junction
		}
	}
	if j == "" {
		t.Fatalf("no junction of 5 span ends: %+v", net.Meetings)
	}
	// steps is a way along the spans of the pathways given, in order, through J.
	steps := func(in, out string) []geo.Step {
		var st []geo.Step
		for _, sp := range net.Spans {
			if sp.PathwayID == in && (sp.To == j || sp.From == j) && len(st) == 0 {
				st = append(st, geo.Step{SpanID: sp.ID, Reverse: sp.From == j})
			}
		}
		for _, sp := range net.Spans {
			if sp.PathwayID == out && (sp.To == j || sp.From == j) && sp.ID != st[0].SpanID {
				st = append(st, geo.Step{SpanID: sp.ID, Reverse: sp.To == j})
				break
			}
		}
		if len(st) != 2 {
			t.Fatalf("no way from %s into %s at %s", in, out, j)
		}
		return st
	}
	d := plan.Default.Design
	built := builtOn{at: map[string]bool{j: true}}
	for _, tc := range []struct {
		name  string
		leg   Leg
		wantN int
	}{
		{"straight on along D", Leg{Steps: steps("D", "D")}, 1},
		{"turning from D into L", Leg{Steps: steps("D", "L"), Turns: []string{j}}, 1},
		{"two reasons at one junction", Leg{Steps: steps("D", "L"), Turns: []string{j, j}}, 1},
		{"overhead along X", Leg{Steps: steps("X", "X")}, 0},
	} {
		tk := takeoff(s, d, &tc.leg, built)
		var at []string
		for _, p := range tk.Passed {
			at = append(at, p.ID)
		}
		if tk.Structures != tc.wantN || tk.AddedStructures != tc.wantN || len(tk.Passed) != tc.wantN || (tc.wantN > 0 && !slices.Equal(at, []string{j})) {
			t.Errorf("%s: passes %q (%d structures, %d added), want %s %d time(s)", tc.name, at, tk.Structures, tk.AddedStructures, j, tc.wantN)
		}
		if want := float64(tc.wantN) * d.SlackLoopStructureM; tk.StructureLoopM != want {
			t.Errorf("%s: structure loops %.1f m, want %.1f m", tc.name, tk.StructureLoopM, want)
		}
		if tk.Passes(j) != (tc.wantN > 0) {
			t.Errorf("%s: Passes(%s) %v", tc.name, j, tk.Passes(j))
		}
	}
}
