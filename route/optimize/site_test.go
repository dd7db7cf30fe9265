package optimize

import (
	"math"
	"slices"
	"testing"
)

// siteProblem: a diverse link from building S (node 0) to the hub T (node 1). Two ducts
// cross with no structure at X, drawn as one node per run (X1 for the north-south run, node
// 4; X2 for the east-west run, node 5) joined by a turn edge: leg A runs S-2-X1-3-T and leg B
// S-6-X2-7-T, 40 m each. A third way S-8-T is 100 m. Legs A and B share no edge and no node,
// but both pass X, where a dig cuts both ducts: a diverse pair must not pass one place twice
// (physically diverse pathways, ANSI/TIA-569 (from memory); common practice, no published
// source for the crossing itself). With far false, the third way is missing.
func siteProblem(far bool) *Problem {
	opt := Option{Name: "os2", CablePerMCents: 100, MaxRouteM: math.Inf(1)}
	edges := []Edge{
		{ID: "S-2", From: 0, To: 2, LengthM: 10}, {ID: "2-X1", From: 2, To: 4, LengthM: 10},
		{ID: "X1-3", From: 4, To: 3, LengthM: 10}, {ID: "3-T", From: 3, To: 1, LengthM: 10},
		{ID: "S-6", From: 0, To: 6, LengthM: 10}, {ID: "6-X2", From: 6, To: 5, LengthM: 10},
		{ID: "X2-7", From: 5, To: 7, LengthM: 10}, {ID: "7-T", From: 7, To: 1, LengthM: 10},
		{ID: "turn X", From: 4, To: 5, LengthM: 0},
	}
	if far {
		edges = append(edges, Edge{ID: "S-8", From: 0, To: 8, LengthM: 50}, Edge{ID: "8-T", From: 8, To: 1, LengthM: 50})
	}
	return &Problem{Nodes: 9, Edges: named(edges), Sites: []int{0, 0, 0, 0, 1, 1, 0, 0, 0},
		Demands: []Demand{{ID: "S", Source: 0, Target: 1, Diverse: true, Options: []Option{opt}}}}
}

// TestPairAvoidsSharedPlace: with a third way, the pair is one leg through X and the third
// way (40 + 100 m = 14,000 cents), not the two legs through X (80 m, 8,000 cents); without
// it, the pair through X is kept (the only pair there is), not dropped.
func TestPairAvoidsSharedPlace(t *testing.T) {
	t.Parallel()
	sol := solveOK(t, "third way", siteProblem(true))
	if sol.TotalCents != 14000 {
		t.Errorf("with a third way: total %d cents, want 14000 (one leg through X, one by node 8)", sol.TotalCents)
	}
	r := sol.Routes[0]
	// What keeping off the crossing costs: the pair through X weighs 8000 cents (the plans
	// without Sites and without a third way below), this one 14000.
	if r.CrossingAvoidedCents != 6000 {
		t.Errorf("with a third way: crossing avoided %d cents, want 14000 - 8000 = 6000", r.CrossingAvoidedCents)
	}
	byEight := false
	for _, leg := range []Leg{r.Primary, r.Secondary} {
		byEight = byEight || slices.Contains(leg.Nodes(siteProblem(true).Edges), 8)
	}
	if !byEight {
		t.Errorf("with a third way: legs %v and %v, want one by node 8", r.Primary.Nodes(siteProblem(true).Edges), r.Secondary.Nodes(siteProblem(true).Edges))
	}

	// Without Sites the crossing is two nodes, and the cheaper pair through both is taken.
	p := siteProblem(true)
	p.Sites = nil
	if sol := solveOK(t, "no sites", p); sol.TotalCents != 8000 || sol.Routes[0].CrossingAvoidedCents != 0 {
		t.Errorf("without sites: total %d cents, crossing avoided %d, want 8000 and 0", sol.TotalCents, sol.Routes[0].CrossingAvoidedCents)
	}

	sol = solveOK(t, "no third way", siteProblem(false))
	if sol.TotalCents != 8000 || len(sol.Routes[0].Secondary.Hops) == 0 || sol.Routes[0].CrossingAvoidedCents != 0 {
		t.Errorf("without a third way: total %d cents, secondary %d hops, crossing avoided %d; want 8000, the pair through X kept, 0",
			sol.TotalCents, len(sol.Routes[0].Secondary.Hops), sol.Routes[0].CrossingAvoidedCents)
	}
}

// TestPairAvoidsSharedPlaceAnyOrder: the answer does not depend on the order of the edges.
func TestPairAvoidsSharedPlaceAnyOrder(t *testing.T) {
	t.Parallel()
	p := siteProblem(true)
	slices.Reverse(p.Edges)
	if sol := solveOK(t, "reversed", p); sol.TotalCents != 14000 || sol.Routes[0].CrossingAvoidedCents != 6000 {
		t.Errorf("edges reversed: total %d cents, crossing avoided %d, want 14000 and 6000", sol.TotalCents, sol.Routes[0].CrossingAvoidedCents)
	}
}
