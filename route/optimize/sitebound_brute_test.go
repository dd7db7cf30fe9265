package optimize

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// TestSiteBoundBruteForce: on small random graphs with places (Problem.Sites) and
// transit-free nodes, whenever siteBound says no pair free of places exists, brute force over
// every pair of simple paths (no shared edge or interior node, no transit-free interior node)
// finds none that passes no place twice (sharedSite 0). The proof is a flow argument (each
// place merged into one node); this checks it against enumeration (review 22 F9: 40,000
// problems in the review, a tenth here). No published source: the solver's own definitions.
func TestSiteBoundBruteForce(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(22, 1))
	checked, proved, meaningful := 0, 0, 0
	for iter := 0; iter < 4000; iter++ {
		n := 9 + rng.IntN(4)
		var edges []Edge
		add := func(a, b int) {
			edges = append(edges, Edge{ID: fmt.Sprintf("e%d-%d", a, b), From: a, To: b, LengthM: float64(1 + rng.IntN(20))})
		}
		add(0, 1)
		add(0, 2)
		add(n-3, n-1)
		add(n-2, n-1)
		for a := 1; a < n-1; a++ {
			for b := a + 1; b < n-1; b++ {
				if rng.Float64() < 0.3 {
					add(a, b)
				}
			}
		}
		sites := make([]int, n)
		mid := n - 6 // nodes 3 .. n-4
		for k := 0; k < 2+rng.IntN(2); k++ {
			sites[3+rng.IntN(mid)] = 1
		}
		if rng.IntN(2) == 0 {
			for k := 0; k < 2; k++ {
				if v := 3 + rng.IntN(mid); sites[v] == 0 {
					sites[v] = 2
				}
			}
		}
		var noT []bool
		if rng.IntN(2) == 0 {
			noT = make([]bool, n)
			for v := range noT {
				noT[v] = rng.IntN(6) == 0
			}
		}
		s, tt := 0, n-1
		p := &Problem{Nodes: n, Edges: edges, Sites: sites, NoTransit: noT,
			Demands: []Demand{{ID: "d", Source: s, Target: tt, Diverse: true, Options: []Option{metreOption}}}}
		if err := validate(p, Settings{}); err != nil {
			continue
		}
		sv := newSolver(p, Settings{})
		if sv.siteOf == nil {
			continue
		}
		bound := sv.siteBound(0, 0)
		// brute force
		adj := make([][]Hop, n)
		for i, e := range edges {
			adj[e.From] = append(adj[e.From], Hop{Edge: i, Forward: true})
			adj[e.To] = append(adj[e.To], Hop{Edge: i, Forward: false})
		}
		other := func(h Hop) int {
			if h.Forward {
				return edges[h.Edge].To
			}
			return edges[h.Edge].From
		}
		var paths [][]Hop
		var cur []Hop
		on := make([]bool, n)
		var dfs func(v int)
		dfs = func(v int) {
			if v == tt {
				paths = append(paths, append([]Hop(nil), cur...))
				return
			}
			if v != s && noT != nil && noT[v] {
				return
			}
			on[v] = true
			for _, h := range adj[v] {
				w := other(h)
				if on[w] {
					continue
				}
				cur = append(cur, h)
				dfs(w)
				cur = cur[:len(cur)-1]
			}
			on[v] = false
		}
		dfs(s)
		free, any := false, false
		for i := 0; i < len(paths) && !free; i++ {
			for j := i + 1; j < len(paths) && !free; j++ {
				a, b := paths[i], paths[j]
				ok := true
				used := map[int]bool{}
				inner := map[int]bool{}
				for _, h := range a {
					used[h.Edge] = true
				}
				for _, h := range a[:len(a)-1] {
					inner[other(h)] = true
				}
				for _, h := range b {
					if used[h.Edge] {
						ok = false
					}
				}
				for _, h := range b[:len(b)-1] {
					if inner[other(h)] {
						ok = false
					}
				}
				if ok {
					any = true
				}
				if ok && sv.sharedSite([][]Hop{a, b}) == 0 {
					free = true
				}
			}
		}
		checked++
		if bound {
			proved++
			if any {
				meaningful++
			}
			if free {
				t.Fatalf("iter %d: siteBound says no place-free pair, brute force finds one; edges %v sites %v noTransit %v", iter, edges, sites, noT)
			}
		}
	}
	if meaningful == 0 {
		t.Errorf("checked %d problems, siteBound true on %d, none with a pair through a place: the test proves too little", checked, proved)
	}
}
