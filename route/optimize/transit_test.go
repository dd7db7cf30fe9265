package optimize

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"
)

// Hand-checked instances for transit-free nodes (Problem.NoTransit) and charges
// (Problem.Charges). Every figure below is worked out in the comment beside it from the
// package cost formula; the networks are invented.

// metreOption costs 100 cents per metre of cable and nothing else.
var metreOption = Option{Name: "os2", CablePerMCents: 100, MaxRouteM: math.Inf(1)}

func named(edges []Edge) []Edge {
	for i := range edges {
		if edges[i].ID == "" {
			edges[i].ID = fmt.Sprintf("e%d", i)
		}
	}
	return edges
}

func solveOK(t *testing.T, name string, p *Problem) *Solution {
	t.Helper()
	sol, err := Solve(p, Settings{})
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	verify(t, name, p, sol)
	return sol
}

// TestNoTransitGoesAround: the cheapest route from 0 to 2 runs through node 1 (20 m, 2,000
// cents); with node 1 transit-free it goes round by node 3 (30 m, 3,000 cents), while a
// demand that starts at node 1 still leaves from it (10 m, 1,000 cents).
func TestNoTransitGoesAround(t *testing.T) {
	t.Parallel()
	edges := named([]Edge{
		{From: 0, To: 1, LengthM: 10}, {From: 1, To: 2, LengthM: 10},
		{From: 0, To: 3, LengthM: 15}, {From: 3, To: 2, LengthM: 15},
	})
	p := &Problem{Nodes: 4, Edges: edges, Demands: []Demand{
		{ID: "through", Source: 0, Target: 2, Options: []Option{metreOption}},
		{ID: "from-building", Source: 1, Target: 2, Options: []Option{metreOption}},
	}}
	free := solveOK(t, "unmarked", p)
	if got := free.Routes[0].Primary.Nodes(edges); !slices.Equal(got, []int{0, 1, 2}) {
		t.Fatalf("unmarked: route %v, want through node 1 (the test's premise)", got)
	}
	p.NoTransit = []bool{false, true, false, false}
	sol := solveOK(t, "marked", p)
	if got := sol.Routes[0].Primary.Nodes(edges); !slices.Equal(got, []int{0, 3, 2}) {
		t.Errorf("marked: route %v, want round by node 3", got)
	}
	if got := sol.Routes[1].Primary.Nodes(edges); !slices.Equal(got, []int{1, 2}) {
		t.Errorf("marked: route from the transit-free node %v, want [1 2]", got)
	}
	if sol.TotalCents != 3000+1000 {
		t.Errorf("marked: total %d cents, want 4000", sol.TotalCents)
	}
}

// TestNoTransitOnlyPath: the only way from 0 to 2 is through transit-free node 1, so the
// demand is infeasible, and the reason says no pathway joins the ends without passing one.
func TestNoTransitOnlyPath(t *testing.T) {
	t.Parallel()
	p := &Problem{Nodes: 3, Edges: named([]Edge{{From: 0, To: 1, LengthM: 5}, {From: 1, To: 2, LengthM: 5}}),
		NoTransit: []bool{false, true, false},
		Demands:   []Demand{{ID: "d", Source: 0, Target: 2, Options: []Option{metreOption}}}}
	sol := solveOK(t, "only path", p)
	if len(sol.Infeasible) != 1 {
		t.Fatalf("want the demand infeasible, got %+v", sol.Routes[0])
	}
	inf := sol.Infeasible[0]
	if len(inf.Options) != 1 || inf.Options[0].Kind != FailNoPath || !strings.Contains(inf.Reason, "transit-free") {
		t.Errorf("reason %q, failures %+v: want no-path through a transit-free node", inf.Reason, inf.Options)
	}
}

// TestChargePaidOnce is a handhole at junction 1 where two new spans (proposed, 20 m and
// 1,000 cents each) join the existing duct 1–0 (10 m): the charge of 5,000 cents covers both
// spans and is paid once. Each demand: 30 m of cable (3,000) + its span (1,000) + half the
// handhole (2,500) = 6,500; the plan 13,000 (folding the handhole into each span would make
// it 18,000).
func TestChargePaidOnce(t *testing.T) {
	t.Parallel()
	p := &Problem{Nodes: 4, AllowNew: true,
		Edges: named([]Edge{
			{From: 1, To: 0, LengthM: 10},
			{From: 2, To: 1, LengthM: 20, Proposed: true, FixedCents: 1000},
			{From: 3, To: 1, LengthM: 20, Proposed: true, FixedCents: 1000},
		}),
		Charges: []Charge{{ID: "handhole J", Edges: []int{1, 2}, Cents: 5000}},
		Demands: []Demand{
			{ID: "A", Source: 2, Target: 0, Options: []Option{metreOption}},
			{ID: "B", Source: 3, Target: 0, Options: []Option{metreOption}},
		}}
	sol := solveOK(t, "handhole", p)
	if sol.TotalCents != 13000 {
		t.Errorf("total %d cents, want 13000", sol.TotalCents)
	}
	if !slices.Equal(sol.Charged, []int{0}) {
		t.Errorf("charged %v, want [0]", sol.Charged)
	}
	for d, r := range sol.Routes {
		if r.Cost.ChargeShareCents != 2500 || r.Cost.Total() != 6500 {
			t.Errorf("demand %d: charge share %d, total %d; want 2500 and 6500", d, r.Cost.ChargeShareCents, r.Cost.Total())
		}
	}
}

// turnJunction is a junction of three pathways with no structure, split into one node per
// pathway (3 from building 1, 4 from building 2, 5 towards the hub 0) joined by zero-length
// turn edges that share one charge of 3,000 cents (a new pull box). Each building also has
// its own 40 m duct to the hub. Through the junction a building's route is 20 m (2,000
// cents), its own duct 40 m (4,000 cents).
func turnJunction(demands int) *Problem {
	p := &Problem{Nodes: 6,
		Edges: named([]Edge{
			{From: 1, To: 3, LengthM: 10}, {From: 2, To: 4, LengthM: 10}, {From: 5, To: 0, LengthM: 10},
			{ID: "turn 3-5", From: 3, To: 5}, {ID: "turn 4-5", From: 4, To: 5}, {ID: "turn 3-4", From: 3, To: 4},
			{From: 1, To: 0, LengthM: 40}, {From: 2, To: 0, LengthM: 40},
		}),
		Charges: []Charge{{ID: "pull box", Edges: []int{3, 4, 5}, Cents: 3000}},
	}
	for d := 0; d < demands; d++ {
		p.Demands = append(p.Demands, Demand{ID: fmt.Sprint("B", d+1), Source: 1 + d, Target: 0, Options: []Option{metreOption}})
	}
	return p
}

// TestChargeDecidesRoutes: one building alone takes its own duct (4,000 < 2,000 + 3,000);
// two buildings share the pull box (2 × 2,000 + 3,000 = 7,000 < 8,000), each paying 1,500 of
// it: the search sees a charge another route pays as free, and the plan counts it once.
func TestChargeDecidesRoutes(t *testing.T) {
	t.Parallel()
	one := solveOK(t, "one building", turnJunction(1))
	if one.TotalCents != 4000 || len(one.Charged) != 0 {
		t.Errorf("one building: total %d, charged %v; want 4000 and none", one.TotalCents, one.Charged)
	}
	two := solveOK(t, "two buildings", turnJunction(2))
	if two.TotalCents != 7000 || !slices.Equal(two.Charged, []int{0}) {
		t.Errorf("two buildings: total %d, charged %v; want 7000 and [0]", two.TotalCents, two.Charged)
	}
	for d, r := range two.Routes {
		if r.Cost.ChargeShareCents != 1500 {
			t.Errorf("two buildings: demand %d pays %d of the pull box, want 1500", d, r.Cost.ChargeShareCents)
		}
	}
}

// TestDiverseVirtualNode: building 0 is a transit-free node joined by zero-length edges to
// its two entrances (junctions 1 and 2); so is building 4 (entrances 2 and 5). The diverse
// pair from building 0 to the hub 3 leaves by both entrance edges, and its second leg may not
// cut through building 4 (2–4–5–3, 10 m) but takes the duct 2–3 (80 m): 50 + 80 m. With one
// entrance edge, that edge is the single point of failure (Bhandari 1999, ch. 3: the
// residual search stops at the cut).
func TestDiverseVirtualNode(t *testing.T) {
	t.Parallel()
	edges := named([]Edge{
		{ID: "entrance 1", From: 0, To: 1}, {ID: "entrance 2", From: 0, To: 2},
		{From: 1, To: 3, LengthM: 50}, {From: 2, To: 3, LengthM: 80},
		{ID: "B4 entrance 2", From: 4, To: 2}, {ID: "B4 entrance 5", From: 4, To: 5}, {From: 5, To: 3, LengthM: 10},
	})
	p := unitProblem(6, edges, 0, 3)
	p.NoTransit = []bool{true, false, false, false, true, false}
	sol := solveOK(t, "two entrances", p)
	r := sol.Routes[0]
	if len(r.Secondary.Hops) == 0 {
		t.Fatalf("two entrances: no pair (%q)", r.Note)
	}
	first := []int{r.Primary.Hops[0].Edge, r.Secondary.Hops[0].Edge}
	slices.Sort(first)
	if !slices.Equal(first, []int{0, 1}) {
		t.Errorf("two entrances: legs leave by edges %v, want [0 1]", first)
	}
	if got := r.Primary.LengthM + r.Secondary.LengthM; got != 130 {
		t.Errorf("two entrances: pair length %v m, want 130", got)
	}

	one := unitProblem(6, slices.Delete(slices.Clone(edges), 1, 2), 0, 3)
	one.NoTransit = p.NoTransit
	sol = solveOK(t, "one entrance", one)
	r = sol.Routes[0]
	want := SinglePoint{Kind: PointEdge, Index: 0, Separates: true}
	if len(r.Secondary.Hops) != 0 || r.SinglePoint == nil || *r.SinglePoint != want {
		t.Errorf("one entrance: single point %+v (note %q), want %+v", r.SinglePoint, r.Note, want)
	}
}

// TestInvalidTransitAndCharges: malformed marks and charges are input errors, all reported.
func TestInvalidTransitAndCharges(t *testing.T) {
	t.Parallel()
	p := &Problem{Nodes: 2, Edges: named([]Edge{{From: 0, To: 1, LengthM: 1}}),
		NoTransit: []bool{true},
		Charges:   []Charge{{ID: "empty"}, {ID: "bad", Edges: []int{0, 0, 3}, Cents: -1}}}
	_, err := Solve(p, Settings{})
	var list ErrorList
	if !errors.As(err, &list) || len(list) != 5 {
		t.Fatalf("got %v, want 5 errors", err)
	}
	for i, want := range []string{"no-transit marks", `charge 0 ("empty"): edges`, "listed twice", "got 3", `charge 1 ("bad"): cents`} {
		if !strings.Contains(list[i].Error(), want) {
			t.Errorf("error %d: %q, want it to mention %q", i, list[i], want)
		}
	}
}

// TestLengthObjectiveCharges: under the length objective the searches ignore cents, but the
// Solution still prices what the routes use: every charge they touch is listed and split
// (verify recomputes both), and no leg passes a transit-free node.
func TestLengthObjectiveCharges(t *testing.T) {
	t.Parallel()
	paid := 0
	for seed := uint64(1); seed <= 30; seed++ {
		p := randomTransitCharges(seed)
		sol, err := Solve(p, Settings{Objective: ObjectiveLength})
		if err != nil {
			t.Fatal(err)
		}
		verify(t, fmt.Sprintf("seed %d", seed), p, sol)
		if len(sol.Charged) > 0 {
			paid++
		}
	}
	if paid == 0 {
		t.Error("no plan paid a charge: the instances do not exercise charges")
	}
}
