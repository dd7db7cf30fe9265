package optimize

import (
	"math"
	"slices"
	"testing"
)

// TestJoinOpenedTrenchAtStart: in the first pass, a demand joins a trench the demand before
// it opened (issue 16: the solver's in-place stamp started equal to its zeroed marks, so
// every span used by exactly one demand counted as the routed demand's own and was charged
// in full until the first estimate). Hub 0, junction 1, buildings 2 and 3 (transit-free);
// the trench 1–0 costs 10.00 and saves building 2 a 1,500 m detour, so building 2 opens it;
// building 3 then reaches the hub over it for 20 cents against 600 on its own duct.
func TestJoinOpenedTrenchAtStart(t *testing.T) {
	opt := []Option{{Name: "f", CablePerMCents: 1, MaxRouteM: math.Inf(1)}}
	p := &Problem{Nodes: 4, AllowNew: true, NoTransit: []bool{false, false, true, true},
		Edges: []Edge{
			{ID: "trench", From: 1, To: 0, LengthM: 10, Proposed: true, FixedCents: 1000},
			{ID: "a-j", From: 2, To: 1, LengthM: 10},
			{ID: "b-j", From: 3, To: 1, LengthM: 10},
			{ID: "a-hub", From: 2, To: 0, LengthM: 1500},
			{ID: "b-hub", From: 3, To: 0, LengthM: 600},
		},
		Demands: []Demand{{ID: "A", Source: 2, Target: 0, Options: opt}, {ID: "B", Source: 3, Target: 0, Options: opt}},
	}
	sv := newSolver(p, Settings{})
	sv.start(false)
	uses := func(d int) bool {
		return slices.ContainsFunc(sv.st.ch[d].legs[0], func(h Hop) bool { return h.Edge == 0 })
	}
	if !uses(0) || !uses(1) {
		t.Errorf("first pass: A takes the trench %v, B %v; want both (B pays 20 cents there, 600 alone)", uses(0), uses(1))
	}
	sol, err := Solve(p, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	// Optimum by hand: trench 1000 + A 20 + B 20 cents.
	if sol.TotalCents != 1040 || sol.LowerBoundCents > sol.TotalCents {
		t.Errorf("plan %d cents (bound %d), want 1040", sol.TotalCents, sol.LowerBoundCents)
	}
}
