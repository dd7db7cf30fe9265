package optimize

import (
	"strings"
	"testing"
)

// endPartedProblem: a diverse demand from node 0, a tap on one run of duct (group 1: edges
// west 0-2 and east 0-3, 50 m each, meeting only at 0), to the hub at node 1, reached from
// 2 and from 3 by ducts of no group (10 m each). The only pair leaves the tap both ways
// along the run: with the run parted at the demand's own end (EndParted) the legs share
// nothing but their end, and the pair stands; without it they share group 1 and there is
// none. With mid true, both legs also pass edges of group 2, a run both reach away from their
// ends (2-4-1 and 3-5-1 in one duct bank), which no parting at the ends excuses. (A tap's two
// sides meet nowhere else, so a backhoe on one cuts one leg: common practice, no published
// source.)
func endPartedProblem(parted, mid bool) *Problem {
	edges := []Edge{
		{ID: "west", From: 0, To: 2, LengthM: 50, Group: 1, EndParted: parted},
		{ID: "east", From: 0, To: 3, LengthM: 50, Group: 1, EndParted: parted},
	}
	nodes := 4
	if mid {
		nodes = 6
		edges = append(edges, Edge{ID: "2-4", From: 2, To: 4, LengthM: 5}, Edge{ID: "4-1", From: 4, To: 1, LengthM: 5, Group: 2},
			Edge{ID: "3-5", From: 3, To: 5, LengthM: 5}, Edge{ID: "5-1", From: 5, To: 1, LengthM: 5, Group: 2})
	} else {
		edges = append(edges, Edge{ID: "2-1", From: 2, To: 1, LengthM: 10}, Edge{ID: "3-1", From: 3, To: 1, LengthM: 10})
	}
	return &Problem{Nodes: nodes, Edges: edges, Demands: []Demand{{ID: "tap", Source: 0, Target: 1, Diverse: true, Options: []Option{metreOption}}}}
}

func TestEndParted(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		parted, mid, pair bool
	}{{true, false, true}, {false, false, false}, {true, true, false}} {
		sol := solveOK(t, "end parted", endPartedProblem(c.parted, c.mid))
		r := sol.Routes[0]
		if got := len(r.Secondary.Hops) > 0; got != c.pair {
			t.Errorf("parted %v, mid %v: pair %v (note %q), want %v", c.parted, c.mid, got, r.Note, c.pair)
		}
		if c.pair && sol.TotalCents != 12000 { // two legs of 60 m at 100 cents a metre
			t.Errorf("parted: total %d cents, want 12000", sol.TotalCents)
		}
		if !c.pair && (r.SinglePoint == nil || r.SinglePoint.Kind != PointGroup) {
			t.Errorf("parted %v, mid %v: single point %+v, want a group", c.parted, c.mid, r.SinglePoint)
		}
	}
	// Reversed, the demand reaches the tap at its target: parted there the same.
	p := endPartedProblem(true, false)
	p.Demands[0].Source, p.Demands[0].Target = 1, 0
	if sol := solveOK(t, "reversed", p); len(sol.Routes[0].Secondary.Hops) == 0 {
		t.Errorf("tap at the target: no pair (note %q)", sol.Routes[0].Note)
	}
}

// TestEndPartedValidate: EndParted needs a group, and one value for all of it.
func TestEndPartedValidate(t *testing.T) {
	t.Parallel()
	for want, edit := range map[string]func(p *Problem){
		"parted at ends: want a group > 0":                        func(p *Problem) { p.Edges[2].EndParted = true },
		"parted at ends: want the same for every edge of group 1": func(p *Problem) { p.Edges[1].EndParted = false },
	} {
		p := endPartedProblem(true, false)
		edit(p)
		if _, err := Solve(p, Settings{}); err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("error %v, want %q", err, want)
		}
	}
}
