package optimize

import "testing"

// TestSaveBoundCoversEstimate: saveBound bounds from above what estimate finds a demand
// would save with a proposed span open (the bound only screens open moves, but a bound below
// the estimate would discard moves that pay), on campuses with full ducts and shared trenches
// where every other building has one entrance; and each edge forcedFrom finds lies on every
// route of its demand: without it the demand's ends are apart (an edge whose removal
// disconnects two nodes is on every path between them).
func TestSaveBoundCoversEstimate(t *testing.T) {
	for _, seed := range []uint64{4, 5} {
		p := campus(campusSpec{buildings: 120, seed: seed, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 25})
		oneEntrance(p)
		sv := newSolver(p, Settings{})
		sv.dual = sv.ascend()
		sv.start(false)
		sv.rounds = sv.improve()
		sv.flush()
		forced, ownTrench := 0, 0
		for d := range p.Demands {
			if sv.invalid[d] != "" {
				continue
			}
			for _, e := range sv.forcedFrom(d) {
				forced++
				if sv.fixedE[e] > 0 && sv.st.count[e] == 1 {
					ownTrench++
				}
				if joinedWithout(p, sv.from[d], sv.to[d], e) {
					t.Fatalf("seed %d demand %d: edge %d is called forced, but the ends stay joined without it", seed, d, e)
				}
			}
		}
		if forced == 0 || ownTrench == 0 {
			t.Fatalf("seed %d: %d forced edges, %d of them a trench only its demand opened; the test checks nothing", seed, forced, ownTrench)
		}
		checked := 0
		for _, e := range sv.proposed {
			if sv.st.count[e] > 0 || checked > 3000 {
				continue
			}
			sv.sbVer++
			open := []int32{e}
			for d := range p.Demands {
				if sv.invalid[d] != "" || sv.st.ch[d].opt < 0 {
					continue
				}
				b := sv.saveBound(d, open)
				sv.setPhantom(e, true)
				g := sv.estimate(d)
				sv.setPhantom(e, false)
				checked++
				if g > b {
					t.Fatalf("seed %d span %d demand %d: estimate saves %d, saveBound %d", seed, e, d, g, b)
				}
			}
		}
	}
}

// oneEntrance leaves every other demand's free end with one edge, a new lateral (proposed, its
// trench priced as the campus's shortcuts): the others are dropped.
func oneEntrance(p *Problem) {
	drop := map[int]bool{}
	for d, dm := range p.Demands {
		if d%2 == 1 {
			drop[dm.Source] = true
		}
	}
	kept := p.Edges[:0]
	seen := map[int]bool{}
	for _, e := range p.Edges {
		end := -1
		if drop[e.From] {
			end = e.From
		} else if drop[e.To] {
			end = e.To
		}
		if end >= 0 && seen[end] {
			continue
		}
		if end >= 0 {
			seen[end] = true
			e.Proposed, e.FixedCents = true, centsFor(e.LengthM, 9000)+150000
			e.Ducts, e.DuctIDMM, e.AddDuctPerMCents = 0, 0, 0
		}
		kept = append(kept, e)
	}
	p.Edges = kept
}

// joinedWithout reports whether nodes a and b are joined by edges other than skip
// (breadth-first, over every edge).
func joinedWithout(p *Problem, a, b int, skip int32) bool {
	adj := make([][]int, p.Nodes)
	for i, e := range p.Edges {
		if int32(i) != skip {
			adj[e.From] = append(adj[e.From], e.To)
			adj[e.To] = append(adj[e.To], e.From)
		}
	}
	seen := make([]bool, p.Nodes)
	seen[a] = true
	q := []int{a}
	for len(q) > 0 {
		v := q[0]
		q = q[1:]
		if v == b {
			return true
		}
		for _, w := range adj[v] {
			if !seen[w] {
				seen[w] = true
				q = append(q, w)
			}
		}
	}
	return false
}
