package optimize

import (
	"math"
	"slices"
	"testing"
)

// TestEjectGivesRoom: two buildings, A (node 2) and B (node 3), reach the hub (0) through a
// 100 m run X (0-1) with one spare 50 mm duct and no duct to be added, then a 10 m lateral
// each; a 50 mm duct takes one 36 mm cable (NFPA 70 Chapter 9 Table 1: 53 % of the area for
// one cable allows 36.4 mm; 31 % for two, 27.8 mm each). A has a way of its own 120 m long,
// B one of 135 m (shorter than A's way and the two laterals, 140 m). At 1.00 a metre, A first
// into X and B round costs 110 + 135 m = 24,500 cents; B in X and A on its own way 120 + 110 m
// = 23,000 cents. A, placed first, takes X;
// neither reroute alone leaves that plan (A off X gets dearer, B cannot get in while A is
// there), which ejectMoves trades: A moved off X, B into it.
func TestEjectGivesRoom(t *testing.T) {
	t.Parallel()
	opt := Option{Name: "os2", CablePerMCents: 100, MaxRouteM: math.Inf(1), CableODMM: 36}
	p := &Problem{Nodes: 4,
		Edges: named([]Edge{
			{ID: "X", From: 0, To: 1, LengthM: 100, DuctIDMM: 50, Ducts: 1},
			{ID: "lateral A", From: 1, To: 2, LengthM: 10},
			{ID: "lateral B", From: 1, To: 3, LengthM: 10},
			{ID: "A's own way", From: 0, To: 2, LengthM: 120},
			{ID: "B's own way", From: 0, To: 3, LengthM: 135},
		}),
		Demands: []Demand{
			{ID: "A", Source: 2, Target: 0, Options: []Option{opt}},
			{ID: "B", Source: 3, Target: 0, Options: []Option{opt}},
		}}
	sol := solveOK(t, "eject", p)
	if sol.TotalCents != 23000 {
		t.Errorf("total %d cents, want 23000 (B in the run, A on its own way)", sol.TotalCents)
	}
	if got := sol.Routes[1].Primary.Nodes(p.Edges); !slices.Equal(got, []int{3, 1, 0}) {
		t.Errorf("B's route %v, want [3 1 0]", got)
	}
	// The descent without the move stays where the start left it.
	sv := newSolver(p, Settings{})
	sv.start(false)
	if got := sv.key().total; got != 24500 {
		t.Fatalf("start: %d cents, want 24500 (A placed first takes the run)", got)
	}
	if sv.reroute(0) || sv.reroute(1) {
		t.Error("a single reroute left the start's plan; the test no longer needs ejectMoves")
	}
	if !sv.ejectMoves() || sv.key().total != 23000 {
		t.Errorf("ejectMoves: %d cents, want 23000", sv.key().total)
	}
}
