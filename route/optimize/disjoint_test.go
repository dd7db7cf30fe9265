package optimize

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// unitProblem makes a problem whose edge costs are 100 cents per metre (cable only), with one
// diverse demand from s to t.
func unitProblem(nodes int, edges []Edge, s, t int) *Problem {
	for i := range edges {
		if edges[i].ID == "" {
			edges[i].ID = fmt.Sprintf("e%d", i)
		}
	}
	return &Problem{Nodes: nodes, Edges: edges, Demands: []Demand{{
		ID: "d", Source: s, Target: t, Diverse: true,
		Options: []Option{{Name: "os2", CablePerMCents: 100, MaxRouteM: math.Inf(1)}},
	}}}
}

// TestTrapTopology is the trap topology (Bhandari, "Survivable Networks: Algorithms for
// Diverse Routing", 1999, ch. 3; Suurballe and Tarjan 1984): the shortest path s-a-b-t uses
// the middle edge a-b that both disjoint paths need to avoid, so removing it and searching
// again finds nothing, yet the pair s-a-t, s-b-t exists.
func TestTrapTopology(t *testing.T) {
	t.Parallel()
	const s, a, b, tt = 0, 1, 2, 3
	edges := []Edge{
		{From: s, To: a, LengthM: 1},
		{From: a, To: b, LengthM: 1},
		{From: b, To: tt, LengthM: 1},
		{From: s, To: b, LengthM: 2},
		{From: a, To: tt, LengthM: 2},
	}
	p := unitProblem(4, edges, s, tt)
	// The two-step method fails here: check it independently.
	rest := []Edge{edges[3], edges[4]}
	if connected(4, rest, s, tt, nil) {
		t.Fatal("trap: removing the shortest path should disconnect s and t")
	}
	sol, err := Solve(p, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, "trap", p, sol)
	r := sol.Routes[0]
	if len(r.Secondary.Hops) == 0 {
		t.Fatalf("trap: no diverse pair, note %q", r.Note)
	}
	if got := r.Primary.LengthM + r.Secondary.LengthM; got != 6 {
		t.Errorf("trap: pair length got %v, want 6", got)
	}
}

// TestSecondLegCents checks that a diverse demand pays its option's SecondLegCents only with
// its pair (the package documentation's cost): on the trap topology the pair costs 6 m ×
// 1.00 + 50.00 + 20.00; with the middle edge's partners gone no pair exists and the single
// route pays 3 m × 1.00 + 50.00.
func TestSecondLegCents(t *testing.T) {
	t.Parallel()
	const s, a, b, tt = 0, 1, 2, 3
	edges := func() []Edge {
		return []Edge{{From: s, To: a, LengthM: 1}, {From: a, To: b, LengthM: 1}, {From: b, To: tt, LengthM: 1},
			{From: s, To: b, LengthM: 2}, {From: a, To: tt, LengthM: 2}}
	}
	for _, tc := range []struct {
		name  string
		edges []Edge
		want  int64
	}{
		{"pair", edges(), 600 + 5000 + 2000},
		{"no pair", edges()[:3], 300 + 5000},
	} {
		p := unitProblem(4, tc.edges, s, tt)
		p.Demands[0].Options[0].FixedCents, p.Demands[0].Options[0].SecondLegCents = 5000, 2000
		sol, err := Solve(p, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		verify(t, tc.name, p, sol)
		if sol.TotalCents != tc.want {
			t.Errorf("%s: total %d cents, want %d", tc.name, sol.TotalCents, tc.want)
		}
	}
}

// connected reports whether s reaches t over edges, skipping edges for which skip is true.
func connected(n int, edges []Edge, s, t int, skip func(i int) bool) bool {
	seen := make([]bool, n)
	seen[s] = true
	for changed := true; changed; {
		changed = false
		for i, e := range edges {
			if skip != nil && skip(i) {
				continue
			}
			if seen[e.From] != seen[e.To] {
				seen[e.From], seen[e.To], changed = true, true, true
			}
		}
	}
	return seen[t]
}

// simplePaths enumerates every simple path from s to t by depth-first search, passing no
// node marked in noTransit (nil: none).
func simplePaths(n int, edges []Edge, s, t int, noTransit []bool) [][]int {
	var out [][]int
	onPath := make([]bool, n)
	var path []int
	var dfs func(v int)
	dfs = func(v int) {
		if v == t {
			out = append(out, append([]int(nil), path...))
			return
		}
		if v != s && noTransit != nil && noTransit[v] {
			return
		}
		onPath[v] = true
		for i, e := range edges {
			w := -1
			switch v {
			case e.From:
				w = e.To
			case e.To:
				w = e.From
			}
			if w < 0 || w == v || onPath[w] {
				continue
			}
			path = append(path, i)
			dfs(w)
			path = path[:len(path)-1]
		}
		onPath[v] = false
	}
	dfs(s)
	return out
}

// bruteBestPair returns the least total length of two paths sharing no edge, interior node
// or (when groups) group, or -1.
func bruteBestPair(n int, edges []Edge, s, t int, groups bool, noTransit []bool) float64 {
	paths := simplePaths(n, edges, s, t, noTransit)
	best := -1.0
	for i := range paths {
		for j := i + 1; j < len(paths); j++ {
			if !pairOK(edges, s, t, paths[i], paths[j], groups) {
				continue
			}
			l := 0.0
			for _, e := range append(append([]int(nil), paths[i]...), paths[j]...) {
				l += edges[e].LengthM
			}
			if best < 0 || l < best {
				best = l
			}
		}
	}
	return best
}

func pairOK(edges []Edge, s, t int, a, b []int, groups bool) bool {
	usedE := map[int]bool{}
	usedG := map[int]bool{}
	usedN := map[int]bool{}
	for _, e := range a {
		usedE[e] = true
		usedG[edges[e].Group] = edges[e].Group > 0
		usedN[edges[e].From], usedN[edges[e].To] = true, true
	}
	for _, e := range b {
		ed := edges[e]
		if usedE[e] || (groups && ed.Group > 0 && usedG[ed.Group]) {
			return false
		}
		if (ed.From != s && ed.From != t && usedN[ed.From]) || (ed.To != s && ed.To != t && usedN[ed.To]) {
			return false
		}
	}
	return true
}

func randomGraph(r *rand.Rand, groups bool) (int, []Edge) {
	n := 5 + r.IntN(4)
	var edges []Edge
	m := n + r.IntN(n+2)
	for len(edges) < m {
		a, b := r.IntN(n), r.IntN(n)
		if a == b {
			continue
		}
		e := Edge{From: a, To: b, LengthM: float64(1 + r.IntN(9))}
		if groups && r.IntN(3) == 0 {
			e.Group = 1 + r.IntN(3)
		}
		edges = append(edges, e)
	}
	return n, edges
}

// TestDiversePairsBruteForce compares Solve's diverse pairs with every pair of simple paths on
// small random multigraphs. Without groups Suurballe's pair must be optimal; with groups the
// pair must be group-disjoint and no cheaper than the brute-force optimum, and the heuristic's
// hit rate is reported. When no pair exists the single point of failure must really separate
// the ends (checked by removing it). The third pass marks about a fifth of the other nodes
// transit-free (Problem.NoTransit): a transit-free node is a node removed from the paths
// between the ends, so Suurballe's pair (Bhandari 1999, ch. 3–4) must still be optimal.
func TestDiversePairsBruteForce(t *testing.T) {
	t.Parallel()
	for pass, groups := range []bool{false, true, false} {
		transit := pass == 2
		r := rand.New(rand.NewPCG(7, uint64(pass+1)))
		exact, found, exists, spof := 0, 0, 0, 0
		const cases = 300
		for c := 0; c < cases; c++ {
			n, edges := randomGraph(r, groups)
			s, tt := 0, n-1
			var noTransit []bool
			if transit {
				noTransit = make([]bool, n)
				for v := 1; v < n-1; v++ {
					noTransit[v] = r.IntN(5) == 0
				}
			}
			if !connected(n, edges, s, tt, func(i int) bool {
				return noTransit != nil && (noTransit[edges[i].From] || noTransit[edges[i].To])
			}) {
				continue
			}
			p := unitProblem(n, append([]Edge(nil), edges...), s, tt)
			p.NoTransit = noTransit
			sol, err := Solve(p, Settings{})
			if err != nil {
				t.Fatal(err)
			}
			name := fmt.Sprintf("groups=%v transit=%v case %d", groups, transit, c)
			verify(t, name, p, sol)
			want := bruteBestPair(n, edges, s, tt, groups, noTransit)
			rt := sol.Routes[0]
			got := -1.0
			if len(rt.Secondary.Hops) > 0 {
				got = rt.Primary.LengthM + rt.Secondary.LengthM
			}
			if want >= 0 {
				exists++
			}
			switch {
			case got >= 0 && want < 0:
				t.Fatalf("%s: Solve found a pair of %v where brute force finds none", name, got)
			case got >= 0 && got < want:
				t.Fatalf("%s: Solve pair %v below the brute-force optimum %v", name, got, want)
			case got >= 0:
				found++
				if got == want {
					exact++
				} else if !groups {
					t.Errorf("%s: Suurballe pair %v, optimum %v", name, got, want)
				}
			case want >= 0 && !groups:
				t.Errorf("%s: no pair found, brute force has %v", name, want)
			}
			if got < 0 && rt.SinglePoint != nil && rt.SinglePoint.Separates {
				spof++
				sp := rt.SinglePoint
				skipE := func(i int) bool {
					e := edges[i]
					switch sp.Kind {
					case PointEdge:
						return i == sp.Index
					case PointNode:
						return e.From == sp.Index || e.To == sp.Index
					}
					return e.Group == sp.Index
				}
				if sp.Kind == PointNode && (sp.Index == s || sp.Index == tt) {
					t.Fatalf("%s: single point is an end node", name)
				}
				if transit {
					// Transit-free nodes are removed too: they carry no path between the ends.
					skip := skipE
					skipE = func(i int) bool {
						e := edges[i]
						return skip(i) || noTransit[e.From] || noTransit[e.To]
					}
				}
				if connected(n, edges, s, tt, skipE) {
					t.Fatalf("%s: removing %s %d does not disconnect the ends", name, sp.Kind, sp.Index)
				}
			}
			if got < 0 && want < 0 && !groups && (rt.SinglePoint == nil || !rt.SinglePoint.Separates) {
				t.Fatalf("%s: no pair and no separating single point (note %q)", name, rt.Note)
			}
		}
		t.Logf("groups=%v transit=%v: %d cases with a pair, Solve found %d, optimal %d; %d single points verified",
			groups, transit, exists, found, exact, spof)
		if groups && found*100 < 95*exists {
			t.Errorf("groups: found %d of %d existing group-disjoint pairs, want at least 95 %%", found, exists)
		}
	}
}

// TestSinglePoints checks the reported single point of failure on small fixed networks.
func TestSinglePoints(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name  string
		nodes int
		edges []Edge
		want  SinglePoint
	}{
		{"single edge", 2, []Edge{{From: 0, To: 1, LengthM: 1}},
			SinglePoint{Kind: PointEdge, Index: 0, Separates: true}},
		// Edge 3 is a bridge and node 2 an articulation node: the first cut on the path is named.
		{"bridge after a ring", 4, []Edge{{From: 0, To: 1, LengthM: 1}, {From: 1, To: 2, LengthM: 1}, {From: 0, To: 2, LengthM: 1}, {From: 2, To: 3, LengthM: 1}},
			SinglePoint{Kind: PointNode, Index: 2, Separates: true}},
		{"articulation node", 5, []Edge{{From: 0, To: 1, LengthM: 1}, {From: 0, To: 2, LengthM: 1}, {From: 1, To: 3, LengthM: 1}, {From: 2, To: 3, LengthM: 1}, {From: 3, To: 4, LengthM: 1}, {From: 3, To: 4, LengthM: 2}},
			SinglePoint{Kind: PointNode, Index: 3, Separates: true}},
		{"shared duct bank", 4, []Edge{{From: 0, To: 1, LengthM: 1, Group: 7}, {From: 1, To: 3, LengthM: 1}, {From: 0, To: 2, LengthM: 1, Group: 7}, {From: 2, To: 3, LengthM: 1}},
			SinglePoint{Kind: PointGroup, Index: 7, Separates: true}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			p := unitProblem(tc.nodes, tc.edges, 0, tc.nodes-1)
			sol, err := Solve(p, Settings{})
			if err != nil {
				t.Fatal(err)
			}
			verify(t, tc.name, p, sol)
			r := sol.Routes[0]
			if !r.Feasible || len(r.Primary.Hops) == 0 {
				t.Fatalf("%s: want the best single path, got %+v", tc.name, r)
			}
			if r.SinglePoint == nil || *r.SinglePoint != tc.want {
				t.Errorf("%s: single point got %+v (note %q), want %+v", tc.name, r.SinglePoint, r.Note, tc.want)
			}
		})
	}
}

// TestLegConstruction: a diverse demand between two nodes joined by an existing edge and a
// proposed one (FixedCents 5000, and a charge of 700 over it) takes the existing edge as its
// primary (cheaper) and the proposed one as its diverse leg; the trench and the charge are the
// diverse leg's construction, none the primary's, and the route's shares are unchanged.
func TestLegConstruction(t *testing.T) {
	t.Parallel()
	edges := []Edge{{From: 0, To: 1, LengthM: 10}, {From: 0, To: 1, LengthM: 12, Proposed: true, FixedCents: 5000}}
	p := unitProblem(2, edges, 0, 1)
	p.AllowNew = true
	p.Charges = []Charge{{ID: "hh", Edges: []int{1}, Cents: 700}}
	sol, err := Solve(p, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, "leg construction", p, sol)
	r := sol.Routes[0]
	if len(r.Primary.Hops) != 1 || r.Primary.Hops[0].Edge != 0 || len(r.Secondary.Hops) != 1 || r.Secondary.Hops[0].Edge != 1 {
		t.Fatalf("legs: primary %+v, secondary %+v", r.Primary, r.Secondary)
	}
	if r.Primary.ConstructionCents != 0 || r.Secondary.ConstructionCents != 5700 {
		t.Errorf("construction: primary %d, secondary %d; want 0 and 5700", r.Primary.ConstructionCents, r.Secondary.ConstructionCents)
	}
	if r.Cost.ConstructionShareCents != 5000 || r.Cost.ChargeShareCents != 700 {
		t.Errorf("route's shares: %+v", r.Cost)
	}
}

// TestPairBelow checks disjointPair's early stop against its full search on small random
// multigraphs, with and without an A* heuristic (the exact distances to t, which are
// consistent): asked for a pair below the optimum's weight + 1 it returns the optimal pair's
// weight (Suurballe 1974: the pair found is optimal), asked for one below the optimum itself it
// returns none and says over, never a cut.
func TestPairBelow(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(11, 3))
	checked := 0
	for c := 0; c < 400; c++ {
		n, edges := randomGraph(r, false)
		s, tt := 0, n-1
		sv := newSolver(unitProblem(n, edges, s, tt), Settings{})
		w := func(e int32) (int64, bool) { return sv.net.lenMM[e], true }
		full := disjointPair(sv.ps, s, tt, w, nil, math.MaxInt64)
		if !full.ok {
			continue
		}
		checked++
		lt := sv.lenTreeOf(tt, 0)
		for _, h := range []heuristic[int64]{nil, treeH(lt)} {
			got := disjointPair(sv.ps, s, tt, w, h, full.weight+1)
			if !got.ok || got.weight != full.weight {
				t.Fatalf("case %d (h %v): below the optimum + 1 gave ok %v weight %d, the full search %d", c, h != nil, got.ok, got.weight, full.weight)
			}
			got = disjointPair(sv.ps, s, tt, w, h, full.weight)
			if got.ok || !got.over || got.cut != (SinglePoint{}) {
				t.Fatalf("case %d (h %v): below the optimum gave ok %v over %v cut %+v, want none and over", c, h != nil, got.ok, got.over, got.cut)
			}
		}
	}
	if checked < 100 {
		t.Fatalf("only %d cases had a pair", checked)
	}
}
