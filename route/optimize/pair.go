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
	bound := func() bool { return sv.siteBound(d, o) }
	legsAtSite := false // legs share a place (Problem.Sites): any pair that does not wins
	try := func(wt func(e int32) (int64, bool), h heuristic[int64], below int64) (ratio float64) {
		cand, found := sv.groupPair(s, t, wt, h, below, bound)
		if !found {
			return 0
		}
		c0, l0 := pathEval(sv.net, cand[0], w)
		c1, l1 := pathEval(sv.net, cand[1], w)
		if l0+l1 > 0 {
			ratio = float64(c0+c1) / float64(l0+l1)
		}
		atSite := sv.sharedSite(cand[:]) != 0
		if l0 > limit || l1 > limit {
			tooLong = true
			sv.plainW = c0 + c1
		} else if !ok || (legsAtSite && !atSite) || (legsAtSite == atSite && c0+c1 < weight) {
			legs, weight, ok, legsAtSite = cand, c0+c1, true, atSite
		}
		return ratio
	}
	ratio := try(w, hc, below)
	if (ok && !legsAtSite) || !mix || limit >= unlimitedMM {
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
		if ok && !legsAtSite {
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

// counted returns, for each of a demand's two legs (both from its source to its target),
// the hops that count for its shared-risk groups, legs[k][from[k]:to[k]]: all of them, but
// where both legs leave the source along one group parted at ends (Edge.EndParted), one each
// way, the hops of each along it from there are left out, and so at the target. Such a group
// is one run of duct with no branch between its ends: the two sides of the demand's own end
// meet nowhere else (the legs share no node), and the end itself is the demand's single point.
func (sv *solver) counted(legs [2][]Hop) (from, to [2]int) {
	to = [2]int{len(legs[0]), len(legs[1])}
	if to[0] == 0 || to[1] == 0 {
		return from, to
	}
	e := sv.p.Edges
	if a := &e[legs[0][0].Edge]; a.EndParted && a.Group == e[legs[1][0].Edge].Group {
		for k := range 2 {
			for from[k] < to[k] && e[legs[k][from[k]].Edge].Group == a.Group {
				from[k]++
			}
		}
	}
	if a := &e[legs[0][to[0]-1].Edge]; a.EndParted && a.Group == e[legs[1][to[1]-1].Edge].Group {
		for k := range 2 {
			for to[k] > from[k] && e[legs[k][to[k]-1].Edge].Group == a.Group {
				to[k]--
			}
		}
	}
	return from, to
}

// sharedGroups returns the sorted groups both legs of a demand use (counted).
func (sv *solver) sharedGroups(legs [2][]Hop) []int {
	from, to := sv.counted(legs)
	var gs [2][]int
	for k := range 2 {
		for _, h := range legs[k][from[k]:to[k]] {
			if g := sv.p.Edges[h.Edge].Group; g > 0 {
				gs[k] = append(gs[k], g)
			}
		}
		slices.Sort(gs[k])
		gs[k] = slices.Compact(gs[k])
	}
	return slices.DeleteFunc(gs[0], func(g int) bool {
		_, ok := slices.BinarySearch(gs[1], g)
		return !ok
	})
}

// sharedGroup returns the smallest group both legs of a demand use (counted), or 0.
func (sv *solver) sharedGroup(legs [2][]Hop) int {
	from, to := sv.counted(legs)
	a := sv.gbuf[:0]
	for _, h := range legs[0][from[0]:to[0]] {
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
	for _, h := range legs[1][from[1]:to[1]] {
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
// bound, when not nil, reports whether no pair free of places exists (siteBound); it is
// asked only of a cheapest pair that shares no group but passes a place, which is then the
// answer.
func (sv *solver) groupPair(s, t int, wt func(e int32) (int64, bool), h heuristic[int64], below int64, bound func() bool) ([2][]Hop, bool) {
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
	if sv.sharedGroup(res.legs) == 0 && (sv.sharedSite(res.legs[:]) == 0 || bound != nil && bound()) {
		// It shares nothing; or it shares only a place, and no pair free of places exists,
		// so every candidate below would pass a place too and none weighs less than this
		// cheapest pair of all (Suurballe): the search below would keep this one.
		return res.legs, true
	}
	// The cheapest pair that shares nothing, and the cheapest that shares only a place
	// (Problem.Sites), kept in case no other is found. consider reports whether legs share
	// nothing.
	var best, atSite [2][]Hop
	bestW, atSiteW := int64(math.MaxInt64), int64(math.MaxInt64)
	consider := func(legs [2][]Hop) bool {
		if sv.sharedGroup(legs) != 0 {
			return false
		}
		c0, _ := pathEval(sv.net, legs[0], wt)
		c1, _ := pathEval(sv.net, legs[1], wt)
		if sv.sharedSite(legs[:]) != 0 {
			if c0+c1 < atSiteW {
				atSite, atSiteW = legs, c0+c1
			}
			return false
		}
		if c0+c1 < bestW {
			best, bestW = legs, c0+c1
		}
		return true
	}
	consider(res.legs)
	// Two-step candidates: each leg of the pair and the cheapest single path, with the
	// cheapest path avoiding it, if the two may weigh less than below.
	for _, leg := range [][]Hop{res.legs[0], res.legs[1], sv.single(s, t, blocked, h)} {
		if leg == nil {
			continue
		}
		most := int64(math.MaxInt64)
		if below < math.MaxInt64 {
			c, _ := pathEval(sv.net, leg, wt)
			if most = below - c - 1; most < 0 {
				continue
			}
		}
		if q := sv.avoiding(s, t, leg, blocked, h, most); q != nil {
			consider([2][]Hop{leg, q})
		}
	}
	// Branching on shared groups, then on shared places: the edges of the group (or the edges
	// at the place's nodes) are kept for one leg's use only.
	type node struct {
		blocked []int32
		legs    [2][]Hop
	}
	queue := []node{{legs: res.legs}}
	for tries := 1; len(queue) > 0 && tries < maxPairTries && !sv.stopped(); {
		n := queue[0]
		queue = queue[1:]
		shared := sv.groups[sv.sharedGroup(n.legs)]
		if len(shared) == 0 {
			shared = sv.siteEdges[sv.sharedSite(n.legs[:])]
		}
		for k := 0; k < 2 && tries < maxPairTries; k++ {
			keep := map[int32]bool{}
			for _, h := range n.legs[k] {
				keep[int32(h.Edge)] = true
			}
			bl := slices.Clone(n.blocked)
			for _, e := range shared {
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
			if consider(r.legs) {
				continue
			}
			queue = append(queue, node{blocked: bl, legs: r.legs})
		}
	}
	sv.block(nil)
	if bestW == math.MaxInt64 {
		return atSite, atSiteW < math.MaxInt64
	}
	return best, true
}

// initSites reads Problem.Sites into siteOf and siteEdges; a problem with no place drawn as
// several nodes leaves them nil.
func (sv *solver) initSites() {
	n := 0
	for _, x := range sv.p.Sites {
		n = max(n, x)
	}
	if n == 0 {
		return
	}
	sv.siteOf = make([]int32, sv.p.Nodes)
	for v, x := range sv.p.Sites {
		sv.siteOf[v] = int32(x)
	}
	sv.siteEdges = make([][]int32, n+1)
	sv.siteMark = make([]uint32, n+1)
	for i, e := range sv.p.Edges {
		a, b := sv.siteOf[e.From], sv.siteOf[e.To]
		if a > 0 {
			sv.siteEdges[a] = append(sv.siteEdges[a], int32(i))
		}
		if b > 0 && b != a {
			sv.siteEdges[b] = append(sv.siteEdges[b], int32(i))
		}
	}
}

// sharedSite returns the smallest place (Problem.Sites) that the interior nodes of both legs
// pass, or 0: two legs that pass one place share it as they would share a node. A place both
// legs reach first from one end, or last before the other (a one-entrance building's
// entrance drawn as several nodes), is not counted: no pair avoids it.
func (sv *solver) sharedSite(legs [][]Hop) int {
	if sv.siteOf == nil || len(legs) < 2 || len(legs[0]) == 0 || len(legs[1]) == 0 {
		return 0
	}
	sv.siteStamp++
	if sv.siteStamp == 0 {
		clear(sv.siteMark)
		sv.siteStamp = 1
	}
	// A leg's interior nodes are the ends of its hops but the last.
	a, b := legs[0][:len(legs[0])-1], legs[1][:len(legs[1])-1]
	if len(a) == 0 || len(b) == 0 {
		return 0
	}
	var endSite [2]int32 // the place at each end both legs start from, if any
	if x := sv.siteOf[sv.hopEnd(a[0])]; x == sv.siteOf[sv.hopEnd(b[0])] {
		endSite[0] = x
	}
	if x := sv.siteOf[sv.hopEnd(a[len(a)-1])]; x == sv.siteOf[sv.hopEnd(b[len(b)-1])] {
		endSite[1] = x
	}
	for _, h := range a {
		if x := sv.siteOf[sv.hopEnd(h)]; x > 0 {
			sv.siteMark[x] = sv.siteStamp
		}
	}
	shared := int32(0)
	for _, h := range b {
		if x := sv.siteOf[sv.hopEnd(h)]; x > 0 && x != endSite[0] && x != endSite[1] && sv.siteMark[x] == sv.siteStamp && (shared == 0 || x < shared) {
			shared = x
		}
	}
	return int(shared)
}

// hopEnd is the node hop h arrives at.
func (sv *solver) hopEnd(h Hop) int {
	if h.Forward {
		return sv.p.Edges[h.Edge].To
	}
	return sv.p.Edges[h.Edge].From
}

// single returns the cheapest path from s to t under w, or nil.
func (sv *solver) single(s, t int, w func(e int32) (int64, bool), h heuristic[int64]) []Hop {
	if !sv.srch.run(s, t, w, h) {
		return nil
	}
	return sv.srch.pathTo(t)
}

// avoiding returns the cheapest path from s to t under w that shares no edge, interior node,
// group or place (Problem.Sites) with leg, or nil; none weighing more than most is looked for.
func (sv *solver) avoiding(s, t int, leg []Hop, w func(e int32) (int64, bool), h heuristic[int64], most int64) []Hop {
	// The edges to avoid, stamped: the leg's, those of its groups, those at its interior
	// nodes and at the places they are part of.
	if sv.avE == nil {
		sv.avE = make([]uint32, len(sv.p.Edges))
	}
	sv.avSt++
	if sv.avSt == 0 {
		clear(sv.avE)
		sv.avSt = 1
	}
	mark := func(es []int32) {
		for _, e := range es {
			sv.avE[e] = sv.avSt
		}
	}
	for _, hp := range leg {
		sv.avE[hp.Edge] = sv.avSt
		if g := sv.p.Edges[hp.Edge].Group; g > 0 {
			mark(sv.groups[g])
		}
	}
	n := sv.net
	for _, hp := range leg[:max(len(leg)-1, 0)] {
		v := sv.hopEnd(hp)
		for _, a := range n.adj[n.start[v]:n.start[v+1]] {
			sv.avE[a.edge] = sv.avSt
		}
		if sv.siteOf != nil && sv.siteOf[v] > 0 {
			mark(sv.siteEdges[sv.siteOf[v]])
		}
	}
	if !sv.srch.runAtMost(s, t, func(e int32) (int64, bool) {
		if sv.avE[e] == sv.avSt {
			return 0, false
		}
		return w(e)
	}, h, most < math.MaxInt64, most) {
		return nil
	}
	return sv.srch.pathTo(t)
}
