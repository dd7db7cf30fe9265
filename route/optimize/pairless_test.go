package optimize

import (
	"math"
	"testing"
)

// TestNoPairIsStructural: a demand whose every route passes one junction has no diverse pair
// whatever the weights (Menger's theorem: two node-disjoint paths exist iff no single interior
// node separates the ends), and the solver learns it once: noPair is true for it and false for
// a demand with two disjoint routes, and Solve still reports the junction for the first.
// Hub 0; building 1 reaches junction 2 by two ducts, and the junction reaches the hub by two
// more: every route passes node 2. Building 3 reaches the hub by two disjoint ducts.
func TestNoPairIsStructural(t *testing.T) {
	opt := []Option{{Name: "f", CablePerMCents: 1, MaxRouteM: math.Inf(1)}}
	p := &Problem{Nodes: 4, NoTransit: []bool{false, true, false, true},
		Edges: []Edge{
			{ID: "b1-j-a", From: 1, To: 2, LengthM: 10},
			{ID: "b1-j-b", From: 1, To: 2, LengthM: 12},
			{ID: "j-hub-a", From: 2, To: 0, LengthM: 100},
			{ID: "j-hub-b", From: 2, To: 0, LengthM: 120},
			{ID: "b3-hub-a", From: 3, To: 0, LengthM: 50},
			{ID: "b3-hub-b", From: 3, To: 0, LengthM: 70},
		},
		Demands: []Demand{
			{ID: "cut", Source: 1, Target: 0, Diverse: true, Options: opt},
			{ID: "two", Source: 3, Target: 0, Diverse: true, Options: opt},
		},
	}
	sv := newSolver(p, Settings{})
	if !sv.noPair(0, 0) {
		t.Error("demand through one junction: noPair false, want true")
	}
	if sv.noPair(1, 0) {
		t.Error("demand with two disjoint ducts: noPair true, want false")
	}
	sol, err := Solve(p, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	if len(sol.Routes[1].Secondary.Hops) == 0 {
		t.Error("demand with two disjoint ducts: no diverse leg")
	}
	if r := sol.Routes[0]; !r.Feasible || len(r.Secondary.Hops) != 0 || r.SinglePoint == nil || r.SinglePoint.Kind != PointNode || r.SinglePoint.Index != 2 {
		t.Errorf("demand through one junction: feasible %v, secondary %v, single point %+v; want its single route and junction 2 named", r.Feasible, r.Secondary.Hops, r.SinglePoint)
	}
}
