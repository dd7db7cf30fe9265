package optimize

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/graph/path"
	"gonum.org/v1/gonum/graph/simple"
)

// rcspCase is a random small network with separate costs and lengths per edge.
type rcspCase struct {
	n     int
	edges []Edge
	cost  []int64
}

func randomRCSP(r *rand.Rand, parallel bool) rcspCase {
	n := 6 + r.IntN(5)
	var c rcspCase
	c.n = n
	seen := map[[2]int]bool{}
	for len(c.edges) < 2*n {
		a, b := r.IntN(n), r.IntN(n)
		if a == b {
			continue
		}
		k := [2]int{min(a, b), max(a, b)}
		if !parallel && seen[k] {
			continue
		}
		seen[k] = true
		c.edges = append(c.edges, Edge{ID: fmt.Sprint(len(c.edges)), From: a, To: b, LengthM: float64(1 + r.IntN(20))})
		c.cost = append(c.cost, int64(1+r.IntN(20)))
	}
	return c
}

// exactRCSP enumerates all simple paths for the cheapest one within limitMM (or -1).
func exactRCSP(c rcspCase, s, t int, limitMM int64) int64 {
	best := int64(-1)
	for _, p := range simplePaths(c.n, c.edges, s, t, nil) {
		var cost, l int64
		for _, e := range p {
			cost += c.cost[e]
			l += lengthMM(c.edges[e].LengthM)
		}
		if l <= limitMM && (best < 0 || cost < best) {
			best = cost
		}
	}
	return best
}

// solveRCSP runs the package's reach-constrained search as route does: cheapest path, LARAC
// from the cheapest and the shortest path, then the exact label search.
func solveRCSP(t *testing.T, c rcspCase, s, tt int, limitMM int64) (exact, laracCost int64) {
	t.Helper()
	net := NewNetwork(c.n, c.edges)
	w := func(e int32) (int64, bool) { return c.cost[e], true }
	lw := func(e int32) (int64, bool) { return net.lenMM[e], true }
	sr := newSearch[int64](net)
	tc, tl := buildTree(sr, tt, w), buildTree(sr, tt, lw)
	if tl.dist[s] < 0 || tl.dist[s] > limitMM {
		return -1, -1
	}
	sr.run(s, tt, w, treeH(tc))
	pc := sr.pathTo(tt)
	sr.run(s, tt, lw, treeH(tl))
	pd := sr.pathTo(tt)
	rc := newRCSPScratch(net)
	pl := larac(net, rc, s, tt, limitMM, w, tc.dist, tl.dist, pc, pd, math.MaxInt64)
	laracCost, ll := pathEval(net, pl, w)
	if ll > limitMM {
		t.Fatalf("LARAC path of %d mm exceeds the limit %d mm", ll, limitMM)
	}
	hops, ok, exhausted := labelSearch(net, rc, s, tt, limitMM, w, tc.dist, tl.dist, laracCost)
	if !ok || exhausted {
		t.Fatalf("label search found nothing (exhausted %v) though LARAC has a path", exhausted)
	}
	exact, el := pathEval(net, hops, w)
	if el > limitMM {
		t.Fatalf("label search path of %d mm exceeds the limit %d mm", el, limitMM)
	}
	return exact, laracCost
}

// TestReachConstrainedBruteForce checks the label search against every simple path on small
// random multigraphs, and that LARAC is feasible and never cheaper than the optimum.
func TestReachConstrainedBruteForce(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(3, 4))
	laracExact, cases := 0, 0
	for i := 0; i < 400; i++ {
		c := randomRCSP(r, true)
		s, tt := 0, c.n-1
		if !connected(c.n, c.edges, s, tt, nil) {
			continue
		}
		limit := int64(10_000 + r.IntN(40_000))
		want := exactRCSP(c, s, tt, limit)
		got, lc := solveRCSP(t, c, s, tt, limit)
		if got != want {
			t.Fatalf("case %d: label search cost got %d, want %d", i, got, want)
		}
		if want < 0 {
			continue
		}
		cases++
		if lc < want {
			t.Fatalf("case %d: LARAC cost %d below the optimum %d", i, lc, want)
		}
		if lc == want {
			laracExact++
		}
	}
	t.Logf("reach-constrained: %d feasible cases, label search exact in all, LARAC alone exact in %d", cases, laracExact)
}

// TestReachConstrainedYen checks the label search against gonum's Yen k-shortest paths on
// simple graphs: paths in cost order, the first within the limit is the cheapest feasible one.
func TestReachConstrainedYen(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(5, 6))
	for i := 0; i < 100; i++ {
		c := randomRCSP(r, false)
		s, tt := 0, c.n-1
		if !connected(c.n, c.edges, s, tt, nil) {
			continue
		}
		limit := int64(10_000 + r.IntN(40_000))
		g := simple.NewWeightedUndirectedGraph(0, math.Inf(1))
		length := map[[2]int64]int64{}
		for e, ed := range c.edges {
			g.SetWeightedEdge(g.NewWeightedEdge(simple.Node(ed.From), simple.Node(ed.To), float64(c.cost[e])))
			length[[2]int64{int64(ed.From), int64(ed.To)}] = lengthMM(ed.LengthM)
			length[[2]int64{int64(ed.To), int64(ed.From)}] = lengthMM(ed.LengthM)
		}
		want := int64(-1)
		for _, p := range path.YenKShortestPaths(g, -1, math.Inf(1), simple.Node(s), simple.Node(tt)) {
			var l int64
			var cost float64
			for j := 1; j < len(p); j++ {
				l += length[[2]int64{p[j-1].ID(), p[j].ID()}]
				w, _ := g.Weight(p[j-1].ID(), p[j].ID())
				cost += w
			}
			if l <= limit {
				want = int64(cost)
				break
			}
		}
		got, _ := solveRCSP(t, c, s, tt, limit)
		if got != want {
			t.Fatalf("case %d: label search cost got %d, gonum Yen gives %d", i, got, want)
		}
	}
}

// TestTreeMatchesGonumDijkstra checks the flat-array Dijkstra against gonum's path.DijkstraFrom
// on the Network's gonum view.
func TestTreeMatchesGonumDijkstra(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(9, 9))
	for i := 0; i < 50; i++ {
		c := randomRCSP(r, true)
		net := NewNetwork(c.n, c.edges)
		tr := buildTree(newSearch[int64](net), 0, func(e int32) (int64, bool) { return c.cost[e], true })
		sh := path.DijkstraFrom(simple.Node(0), net.View(func(e int) (float64, bool) { return float64(c.cost[e]), true }))
		for v := 0; v < c.n; v++ {
			want := sh.WeightTo(int64(v))
			got := float64(tr.dist[v])
			if tr.dist[v] < 0 {
				got = math.Inf(1)
			}
			if got != want {
				t.Fatalf("case %d node %d: flat Dijkstra %v, gonum %v", i, v, got, want)
			}
		}
	}
}

// TestSearchesAtMost checks the capped searches against the uncapped ones on small random
// multigraphs: an A* search capped at the cheapest path's cost finds the same path (Dijkstra
// and A* with a consistent bound settle in key order: Hart, Nilsson and Raphael 1968), capped
// one below it finds none; LARAC capped below the reach-constrained optimum (brute force over
// every simple path) returns nil or a path no cheaper than it, never a wrong "none" for a cap
// at or above the optimum (its Lagrangian bound, Jüttner et al. 2001).
func TestSearchesAtMost(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(5, 9))
	checked := 0
	for i := 0; i < 400; i++ {
		c := randomRCSP(r, true)
		s, tt := 0, c.n-1
		if !connected(c.n, c.edges, s, tt, nil) {
			continue
		}
		net := NewNetwork(c.n, c.edges)
		w := func(e int32) (int64, bool) { return c.cost[e], true }
		lw := func(e int32) (int64, bool) { return net.lenMM[e], true }
		sr := newSearch[int64](net)
		tc, tl := buildTree(sr, tt, w), buildTree(sr, tt, lw)
		sr.run(s, tt, w, treeH(tc))
		pc := sr.pathTo(tt)
		cost := sr.dist(tt)
		if !sr.runAtMost(s, tt, w, treeH(tc), true, cost) || fmt.Sprint(sr.pathTo(tt)) != fmt.Sprint(pc) {
			t.Fatalf("case %d: capped at the optimum %d the search found another path", i, cost)
		}
		if sr.runAtMost(s, tt, w, nil, true, cost-1) {
			t.Fatalf("case %d: capped below the optimum %d the search found a path", i, cost)
		}
		limit := int64(10_000 + r.IntN(40_000))
		want := exactRCSP(c, s, tt, limit)
		if want < 0 || tl.dist[s] > limit {
			continue
		}
		sr.run(s, tt, lw, treeH(tl))
		pd := sr.pathTo(tt)
		rc := newRCSPScratch(net)
		for _, most := range []int64{want - 1, want, want + 5} {
			pl := larac(net, rc, s, tt, limit, w, tc.dist, tl.dist, pc, pd, most)
			if pl == nil && most >= want {
				t.Fatalf("case %d: LARAC capped at %d gave none, the optimum within reach is %d", i, most, want)
			}
			if pl != nil {
				if got, l := pathEval(net, pl, w); got < want || l > limit {
					t.Fatalf("case %d: LARAC capped at %d gave cost %d length %d, optimum %d limit %d", i, most, got, l, want, limit)
				}
			}
		}
		checked++
	}
	if checked < 100 {
		t.Fatalf("only %d cases within reach", checked)
	}
}
