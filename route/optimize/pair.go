package optimize

import (
	"math"
	"slices"
)

// Shared-risk groups. Two legs that avoid each other's edges and nodes can still share a duct
// bank or trench (a Group). Finding a least-cost pair that shares no group is NP-hard in
// general (J. Q. Hu, "Diverse routing in optical mesh networks", IEEE Trans. Commun. 51(3),
// 2003), so pair uses a bounded heuristic on top of Suurballe's exact edge- and node-disjoint
// pair:
//
//   - If the Suurballe pair shares no group, it is optimal and is used.
//   - Otherwise the search branches on the smallest shared group g: in one branch g may be used
//     only on the edges the first leg used, in the other only where the second leg used it
//     (the rest of g is blocked), and Suurballe runs again; branches accumulate, up to
//     maxPairTries runs.
//   - Besides, for each leg L of the pair and for the cheapest single path, the cheapest path
//     avoiding L's edges, interior nodes and every edge of L's groups completes a candidate
//     (the two-step method, which the trap topology defeats but which is cheap).
//
// The cheapest group-disjoint candidate wins. The heuristic can miss a pair that exists; when
// it finds none the solver reports the group the pairs shared, and whether removing that group
// alone disconnects the demand's ends.
//
// Reach: both legs must fit the medium's reach. When the cheapest pair does not, the search is
// repeated on weights cost + λ·length for λ rising geometrically from the pair's own
// cents-per-millimetre ratio up to pure length, and the cheapest pair within reach is kept;
// this too is a heuristic.

// maxPairTries bounds the Suurballe runs of one group-aware pair search.
const maxPairTries = 6

// pair returns demand d's best diverse pair for option o against the current state, legs
// oriented free end → anchor, with their marginal weight. With mix false only the cost
// weights are tried; fits reports then whether a pair was found but exceeds the reach (so
// that a call with mix true may help). A caller that wants only a pair weighing less than
// below (bestBelow) gets none, and no search beyond the first, when the cheapest pair that
// may share groups weighs as much.
func (sv *solver) pair(d, o int, mix bool, below int64) (legs [2][]Hop, weight int64, ok, tooLong bool) {
	s, t := sv.from[d], sv.to[d]
	limit := sv.reach[d][o]
	prof := sv.optProf[d][o]
	weight = math.MaxInt64
	lt := sv.lenTreeOf(t, sv.profLen[prof])
	if lt.dist[s] < 0 || lt.dist[s] > limit {
		return legs, weight, false, false
	}
	if sv.noPair(d, sv.profLen[prof]) {
		return legs, weight, false, false
	}
	w := sv.weightFor(d, o)
	hc := treeH(sv.bound(t, prof).t)
	try := func(wt func(e int32) (int64, bool), h heuristic[int64], below int64) (ratio float64) {
		cand, found := sv.groupPair(s, t, wt, h, below)
		if !found {
			return 0
		}
		c0, l0 := pathEval(sv.net, cand[0], w)
		c1, l1 := pathEval(sv.net, cand[1], w)
		if l0+l1 > 0 {
			ratio = float64(c0+c1) / float64(l0+l1)
		}
		if l0 > limit || l1 > limit {
			tooLong = true
			sv.plainW = c0 + c1
		} else if c0+c1 < weight {
			legs, weight, ok = cand, c0+c1, true
		}
		return ratio
	}
	ratio := try(w, hc, below)
	if ok || !mix || limit >= unlimitedMM {
		if tooLong && !ok {
			weight = sv.plainW // the cheapest pair ignoring reach: a bound for the reach scan
		}
		return legs, weight, ok, tooLong && !ok
	}
	if ratio <= 0 {
		ratio = 1
	}
	// Rising weight on length, stopping at the first pair within reach (the cheapest of
	// those the scan meets, as cost rises with λ).
	for _, f := range []float64{1, 8} {
		lambda := ratio * f
		try(func(e int32) (int64, bool) {
			c, okw := w(e)
			return c + int64(math.Round(lambda*float64(sv.net.lenMM[e]))), okw
		}, hc, math.MaxInt64)
		if ok {
			return legs, weight, ok, false
		}
	}
	try(func(e int32) (int64, bool) {
		if _, okw := w(e); !okw {
			return 0, false
		}
		return sv.net.lenMM[e], true
	}, treeH(lt), math.MaxInt64)
	return legs, weight, ok, tooLong && !ok
}

// noPair reports whether demand d has no edge- and node-disjoint pair at all over the edges
// open to exclusion class c, whatever their weights: the searches only ever take edges away
// (forbidden, full ducts, blocked groups), so such a demand never gets a pair and its pair
// searches, each of which explores all it can reach before failing, are skipped. Found with
// one search per demand and class, on first asking.
func (sv *solver) noPair(d, c int) bool {
	if sv.pairless == nil {
		sv.pairless = make([]uint8, len(sv.p.Demands)*len(sv.lenBase))
	}
	k := d*len(sv.lenBase) + c
	if sv.pairless[k] == 0 {
		base := sv.lenBase[c]
		sv.pairless[k] = 1
		if !disjointPair(sv.ps, sv.from[d], sv.to[d], func(e int32) (int64, bool) { return base[e], base[e] >= 0 }, nil, math.MaxInt64).ok {
			sv.pairless[k] = 2
		}
	}
	return sv.pairless[k] == 2
}

// groupsOf returns the sorted distinct groups (> 0) of a leg.
func (sv *solver) groupsOf(leg []Hop) []int {
	var gs []int
	for _, h := range leg {
		if g := sv.p.Edges[h.Edge].Group; g > 0 {
			gs = append(gs, g)
		}
	}
	slices.Sort(gs)
	return slices.Compact(gs)
}

// sharedGroup returns the smallest group both legs use, or 0.
func (sv *solver) sharedGroup(legs [2][]Hop) int {
	a := sv.gbuf[:0]
	for _, h := range legs[0] {
		if g := sv.p.Edges[h.Edge].Group; g > 0 {
			a = append(a, g)
		}
	}
	sv.gbuf = a
	if len(a) == 0 {
		return 0
	}
	slices.Sort(a)
	shared := 0
	for _, h := range legs[1] {
		if g := sv.p.Edges[h.Edge].Group; g > 0 && (shared == 0 || g < shared) {
			if _, ok := slices.BinarySearch(a, g); ok {
				shared = g
			}
		}
	}
	return shared
}

// block starts a new set of blocked edges holding es (read by groupPair's weight wrapper).
func (sv *solver) block(es []int32) {
	sv.blkSt++
	if sv.blkSt == 0 {
		clear(sv.blk)
		sv.blkSt = 1
	}
	for _, e := range es {
		sv.blk[e] = sv.blkSt
	}
}

// groupPair returns the cheapest pair under wt that shares no edge, interior node or group.
// h is a consistent lower bound of wt to t, or nil. It returns none when the cheapest pair
// that may share groups weighs below or more: every pair it could find weighs as much.
func (sv *solver) groupPair(s, t int, wt func(e int32) (int64, bool), h heuristic[int64], below int64) ([2][]Hop, bool) {
	blocked := func(e int32) (int64, bool) {
		if sv.blk[e] == sv.blkSt {
			return 0, false
		}
		return wt(e)
	}
	sv.block(nil)
	res := disjointPair(sv.ps, s, t, blocked, h, below)
	if !res.ok || res.weight >= below {
		return [2][]Hop{}, false
	}
	if sv.sharedGroup(res.legs) == 0 {
		return res.legs, true
	}
	var best [2][]Hop
	bestW := int64(math.MaxInt64)
	consider := func(legs [2][]Hop) {
		c0, _ := pathEval(sv.net, legs[0], wt)
		c1, _ := pathEval(sv.net, legs[1], wt)
		if c0+c1 < bestW {
			best, bestW = legs, c0+c1
		}
	}
	// Two-step candidates.
	for _, leg := range [][]Hop{res.legs[0], res.legs[1], sv.single(s, t, blocked, h)} {
		if leg == nil {
			continue
		}
		if q := sv.avoiding(s, t, leg, blocked, h); q != nil {
			consider([2][]Hop{leg, q})
		}
	}
	// Branching on shared groups.
	type node struct {
		blocked []int32
		legs    [2][]Hop
	}
	queue := []node{{legs: res.legs}}
	for tries := 1; len(queue) > 0 && tries < maxPairTries && !sv.stopped(); {
		n := queue[0]
		queue = queue[1:]
		g := sv.sharedGroup(n.legs)
		for k := 0; k < 2 && tries < maxPairTries; k++ {
			keep := map[int32]bool{}
			for _, h := range n.legs[k] {
				keep[int32(h.Edge)] = true
			}
			bl := slices.Clone(n.blocked)
			for _, e := range sv.groups[g] {
				if !keep[e] {
					bl = append(bl, e)
				}
			}
			sv.block(bl)
			r := disjointPair(sv.ps, s, t, blocked, h, math.MaxInt64)
			tries++
			if !r.ok {
				continue
			}
			if sv.sharedGroup(r.legs) == 0 {
				consider(r.legs)
				continue
			}
			queue = append(queue, node{blocked: bl, legs: r.legs})
		}
	}
	sv.block(nil)
	return best, bestW < math.MaxInt64
}

// single returns the cheapest path from s to t under w, or nil.
func (sv *solver) single(s, t int, w func(e int32) (int64, bool), h heuristic[int64]) []Hop {
	if !sv.srch.run(s, t, w, h) {
		return nil
	}
	return sv.srch.pathTo(t)
}

// avoiding returns the cheapest path from s to t under w that shares no edge, interior node
// or group with leg, or nil.
func (sv *solver) avoiding(s, t int, leg []Hop, w func(e int32) (int64, bool), h heuristic[int64]) []Hop {
	avoidE := map[int32]bool{}
	avoidG := map[int]bool{}
	avoidN := map[int]bool{}
	for _, h := range leg {
		avoidE[int32(h.Edge)] = true
		if g := sv.p.Edges[h.Edge].Group; g > 0 {
			avoidG[g] = true
		}
	}
	for _, v := range (Leg{Hops: leg}).Nodes(sv.p.Edges) {
		if v != s && v != t {
			avoidN[v] = true
		}
	}
	return sv.single(s, t, func(e int32) (int64, bool) {
		ed := &sv.p.Edges[e]
		if avoidE[e] || (ed.Group > 0 && avoidG[ed.Group]) || avoidN[ed.From] || avoidN[ed.To] {
			return 0, false
		}
		return w(e)
	}, h)
}
