package optimize

// Pairs bound to a place. A diverse demand whose every pair passes one place twice
// (Problem.Sites: a junction drawn as several nodes, such as two ducts crossing where no
// structure is) can never get a pair that does not, and its searches can then skip the work
// that only looks for one (review 19 F4): bestBelow ranks its pairs by weight alone, as it
// ranks pairs that pass no place twice, and groupPair keeps the cheapest pair of all when it
// passes a place but shares no group, since nothing it could find would be preferred to it.
//
// siteBound proves it on the edges open to an exclusion class, whatever their weights, so the
// answer holds for the whole solve (the searches only ever take edges away: forbidden, full
// ducts, blocked groups) and needs no dropping when an edge becomes usable or cheaper again:
// it never depends on which edges are usable at the moment. The proof is a flow of two units
// from the free end to the anchor, on the network with each place merged into one node of
// capacity one. A pair whose legs pass no place twice maps there to two paths that share no
// interior node (a place both legs pass, which that pair does not have, would be the only
// way to share one), so when no such flow exists no such pair does. A place at which a
// demand's legs may both start or end (sharedSite does not count it) is left as its nodes:
// any place holding an end or a neighbour of an end. The proof is one-sided: a flow of two
// does not say that a pair free of places exists (merging a place lets a path turn there as
// the drawn nodes may not), and then nothing is skipped.

// siteBound reports whether no pair of demand d's option o (its exclusion class) passes no
// place twice. Found once per demand and class, on first asking; false when the problem
// draws no place as several nodes.
func (sv *solver) siteBound(d, o int) bool {
	if sv.siteOf == nil || sv.noSiteBound || sv.from[d] == sv.to[d] {
		return false
	}
	c := sv.profLen[sv.optProf[d][o]]
	if sv.siteless == nil {
		sv.siteless = make([]uint8, len(sv.p.Demands)*len(sv.lenBase))
	}
	k := d*len(sv.lenBase) + c
	if sv.siteless[k] == 0 {
		sv.siteless[k] = 1
		if !sv.placeFlow(sv.from[d], sv.to[d], sv.lenBase[c]) {
			sv.siteless[k] = 2
		}
	}
	return sv.siteless[k] == 2
}

// siteBoundAll reports siteBound for every option of demand d.
func (sv *solver) siteBoundAll(d int) bool {
	for o := range sv.p.Demands[d].Options {
		if !sv.siteBound(d, o) {
			return false
		}
	}
	return true
}

// placeFlow reports whether two units of flow go from s to t over the edges with base ≥ 0,
// each place (Problem.Sites) not holding s, t or a neighbour of either merged into one node,
// every node but s and t of capacity one, transit-free nodes closed but merged places open
// (a merged place is passed by whatever path would pass it; allowing more only keeps the
// proof one-sided). Two breadth-first augmenting paths on the residual network.
func (sv *solver) placeFlow(s, t int, base []int64) bool {
	n := sv.net
	sf := &sv.sfl
	if sf.rep == nil {
		sf.rep = make([]int32, n.nodes)
		sf.pred = make([]int32, 2*n.nodes)
		sf.predE = make([]int32, 2*n.nodes)
		sf.seen = make([]uint32, 2*n.nodes)
		sf.nodeFlow = make([]bool, n.nodes)
		sf.fwd = make([]bool, len(n.edges))
		sf.bwd = make([]bool, len(n.edges))
		sf.open = make([]bool, len(sv.siteEdges))
		sf.members = make([][]int32, len(sv.siteEdges))
		for v, x := range sv.siteOf {
			if x > 0 {
				sf.members[x] = append(sf.members[x], int32(v))
			}
		}
	}
	clear(sf.nodeFlow)
	clear(sf.fwd)
	clear(sf.bwd)
	clear(sf.open)
	for _, v := range []int{s, t} {
		sf.open[sv.siteOf[v]] = true
		for _, a := range n.adj[n.start[v]:n.start[v+1]] {
			sf.open[sv.siteOf[a.to]] = true
		}
	}
	for v := range sf.rep {
		sf.rep[v] = int32(v)
		if x := sv.siteOf[v]; x > 0 && !sf.open[x] {
			sf.rep[v] = sf.members[x][0]
		}
	}
	merged := func(r int32) bool { x := sv.siteOf[r]; return x > 0 && !sf.open[x] }
	rs, rt := sf.rep[s], sf.rep[t]
	for range 2 {
		if !sf.augment(sv, rs, rt, base, merged) {
			return false
		}
	}
	return true
}

// placeFlowScratch is placeFlow's: states 2r (into node r) and 2r+1 (out of it), r a node
// standing for itself or for its merged place.
type placeFlowScratch struct {
	rep      []int32 // node → the node standing for it
	pred     []int32 // state → the state it was reached from
	predE    []int32 // state → the edge it was reached by, -1 by the node's own arc
	seen     []uint32
	stamp    uint32
	nodeFlow []bool // node r carries a unit (its arc in → out)
	fwd, bwd []bool // edge e carries a unit From → To, To → From (by the nodes standing for them)
	open     []bool // place → kept as its nodes for this demand
	members  [][]int32
	queue    []int32
}

// augment finds one augmenting path from out of rs to into rt and applies it.
func (sf *placeFlowScratch) augment(sv *solver, rs, rt int32, base []int64, merged func(int32) bool) bool {
	n := sv.net
	sf.stamp++
	if sf.stamp == 0 {
		clear(sf.seen)
		sf.stamp = 1
	}
	start, goal := 2*rs+1, 2*rt
	sf.seen[start] = sf.stamp
	sf.queue = append(sf.queue[:0], start)
	visit := func(x, from, e int32) {
		if sf.seen[x] != sf.stamp {
			sf.seen[x], sf.pred[x], sf.predE[x] = sf.stamp, from, e
			sf.queue = append(sf.queue, x)
		}
	}
	// flowOn returns the flag of edge e in the direction from node u's stand-in.
	flowOn := func(e, u int32) *bool {
		if sf.rep[n.edges[e].From] == u {
			return &sf.fwd[e]
		}
		return &sf.bwd[e]
	}
	for i := 0; i < len(sf.queue) && sf.seen[goal] != sf.stamp; i++ {
		x := sf.queue[i]
		r := x / 2
		nodes := []int32{r}
		if merged(r) {
			nodes = sf.members[sv.siteOf[r]]
		}
		if x%2 == 1 { // out of r: along an edge into its other end, or back through r's arc
			if sf.nodeFlow[r] {
				visit(2*r, x, -1)
			}
			for _, v := range nodes {
				for _, a := range n.adj[n.start[v]:n.start[v+1]] {
					u := sf.rep[a.to]
					if base[a.edge] < 0 || u == r || u == rs || *flowOn(a.edge, r) {
						continue
					}
					visit(2*u, x, a.edge)
				}
			}
			continue
		}
		// Into r (never rs): through r's arc, or back along an edge carrying a unit into r.
		if !sf.nodeFlow[r] && (merged(r) || n.transit(r, -1)) {
			visit(2*r+1, x, -1)
		}
		for _, v := range nodes {
			for _, a := range n.adj[n.start[v]:n.start[v+1]] {
				u := sf.rep[a.to]
				if base[a.edge] < 0 || u == r || !*flowOn(a.edge, u) {
					continue
				}
				visit(2*u+1, x, a.edge)
			}
		}
	}
	if sf.seen[goal] != sf.stamp {
		return false
	}
	for x := goal; x != start; x = sf.pred[x] {
		p, e := sf.pred[x], sf.predE[x]
		switch {
		case e < 0 && x%2 == 1: // in → out of x/2
			sf.nodeFlow[x/2] = true
		case e < 0: // out → in of x/2, undoing its unit
			sf.nodeFlow[x/2] = false
		case x%2 == 0: // out of p/2 → into x/2 along e
			*flowOn(e, p/2) = true
		default: // into p/2 → out of x/2, undoing e's unit x/2 → p/2
			*flowOn(e, x/2) = false
		}
	}
	return true
}
