package optimize

// Lower-bound trees of the current plan. The trees of costTree price every proposed edge at
// its base weight only, as if it were open: they bound every plan, but on a campus where few
// trenches are opened they are loose by a whole FixedCents wherever a proposed edge is
// cheapest, so a search that must avoid the edge explores every node whose detour costs less
// than the trench. A plan tree also charges FixedCents on each proposed edge that was neither
// opened nor phantom when it was built. It stays a lower bound of the searches' weights as long
// as no edge charged in it has become free since (an edge that closed only makes it looser),
// which the solver tracks with two counters per tree as edges open, close and turn phantom;
// a tree is brought up to date when it would no longer bound, and rebuilt when it has become
// loose, once per local search round.
//
// Bringing a tree up to date does not rebuild it: the edges that became free since are
// lowered to their base weight in place (freeUp), and only the nodes whose distance falls are
// searched again. The tree is then exactly the shortest-path tree of its new weights, as a
// rebuild would give, save for which of two equal paths a node keeps. While a move holds
// phantom edges, the lowering is logged and undone as soon as the last phantom edge is
// released (rollBack), so that the next move starts from the plan's own tight trees; with more
// than maxPhantomUp edges to lower (the open start), or a tree due for a rebuild, the plain
// tree serves during the move.

// planTree is a lower-bound tree over the current plan; see the file comment.
type planTree struct {
	t      *tree
	freeAt []bool // per proposed edge (index into solver.proposed): free when built
	hash   uint64 // solver.freeHash when built
	// kept holds trees built earlier for other sets of free edges, most recent last: a local
	// search that tries a move and reverts it returns to a set it has seen.
	kept []keptTree
	bad  int // proposed edges free now but charged in the tree
	// pend lists (as indices into solver.proposed) the edges that became free while charged
	// in the tree, since it was last brought up to date: a superset of the bad ones.
	pend []int32
	// undo logs the changes freeUp made while phantom edges were held: the entries of the
	// nodes it lowered, oldest first, and the edges it freed (see rollBack).
	undo     []undoEntry
	undoFree []int32
	loose    int // proposed edges free in the tree but charged now
	round    int // solver.roundNo when built
	anchor   int
	prof     int
}

// undoEntry is a node's tree entry before freeUp lowered it.
type undoEntry struct {
	v           int32
	pred        int32
	dist, lenMM int64
}

// maxPhantomUp is the most edges that freeUp lowers in a plan tree while phantom edges are
// held; with more (the open start makes every proposed edge phantom), the plain tree serves.
const maxPhantomUp = 64

type keptTree struct {
	t      *tree
	freeAt []bool
	hash   uint64
}

// bounder is a lower-bound tree with the weights it was built on.
type bounder struct {
	t  *tree
	pt *planTree // nil for the plain tree of costTree
}

// treeWeight returns the weight the tree gave edge e, whose base weight is base[e].
func (sv *solver) treeWeight(b bounder, base []int64, e int32) int64 {
	w := base[e]
	if b.pt != nil {
		w += sv.fixedIn(b.pt.freeAt, e)
	}
	return w
}

// fixedIn is what a plan tree built with the free edges freeAt (per proposed edge) charges on
// edge e besides its base weight: FixedCents on a proposed edge not free in it, else 0.
func (sv *solver) fixedIn(freeAt []bool, e int32) int64 {
	if pi := sv.propIdx[e]; pi >= 0 && !freeAt[pi] {
		return sv.fixedE[e]
	}
	return 0
}

// planWeight is the weight function of a plan tree over the base weights base with the free
// edges freeAt: base plus fixedIn, unusable where base is negative.
func (sv *solver) planWeight(base []int64, freeAt []bool) func(e int32) (int64, bool) {
	return func(e int32) (int64, bool) { return sv.planEdge(base, freeAt, e) }
}

// planEdge is planWeight's weight of edge e, called directly where a call through a function
// value per arc would cost (freeUp).
func (sv *solver) planEdge(base []int64, freeAt []bool, e int32) (int64, bool) {
	b := base[e]
	if b < 0 {
		return 0, false
	}
	return b + sv.fixedIn(freeAt, e), true
}

// freeKey is proposed edge e's term in the set hashes of free edges (freeHash, planTree.hash).
func freeKey(e int32) uint64 { return mix(uint64(e), 17) }

// freeNow reports whether proposed edge e costs no FixedCents to the searches.
func (sv *solver) freeNow(e int32) bool { return sv.st.count[e] > 0 || sv.phantom[e] }

// freeChanged updates the plan trees' counters after proposed edge e became free or charged.
func (sv *solver) freeChanged(e int32, free bool) {
	pi := sv.propIdx[e]
	if pi < 0 {
		return
	}
	sv.freeHash ^= freeKey(e)
	for _, pt := range sv.planList {
		switch {
		case free && !pt.freeAt[pi]:
			pt.bad++
			pt.pend = append(pt.pend, pi)
		case free:
			pt.loose--
		case !pt.freeAt[pi]:
			pt.bad--
		default:
			pt.loose++
		}
	}
}

// setPhantom marks proposed edge e phantom (free for the searches) or not.
func (sv *solver) setPhantom(e int32, on bool) {
	if sv.phantom[e] == on {
		return
	}
	if on {
		sv.nPhantom++
	} else {
		sv.nPhantom--
	}
	sv.phantom[e] = on
	if sv.st.count[e] == 0 {
		sv.freeChanged(e, on)
	}
	if sv.nPhantom == 0 {
		// The move is over: undo what freeUp lowered for it now, so that the next move
		// (and saveBound's cached trees) start from the tight trees, not from trees left
		// loose by this one, which the next move could only replace by the plain tree.
		for _, pt := range sv.planList {
			if len(pt.undoFree) > 0 {
				sv.rollBack(pt)
			}
		}
	}
}

// freeSetIs reports whether freeAt (per proposed edge) is the set of edges free now.
func (sv *solver) freeSetIs(freeAt []bool) bool {
	for pi, e := range sv.proposed {
		if freeAt[pi] != sv.freeNow(e) {
			return false
		}
	}
	return true
}

// recount recomputes the plan trees' counters, after the state was replaced.
func (sv *solver) recount() {
	sv.chargeHash = 0
	for k, u := range sv.st.chUse {
		if u > 0 {
			sv.chargeHash ^= mix(uint64(k), 29)
		}
	}
	sv.freeHash = 0
	for _, e := range sv.proposed {
		if sv.freeNow(e) {
			sv.freeHash ^= freeKey(e)
		}
	}
	for _, pt := range sv.planList {
		pt.bad, pt.loose = 0, 0
		pt.pend = pt.pend[:0]
		for pi, e := range sv.proposed {
			switch f := sv.freeNow(e); {
			case f && !pt.freeAt[pi]:
				pt.bad++
				pt.pend = append(pt.pend, int32(pi))
			case !f && pt.freeAt[pi]:
				pt.loose++
			}
		}
	}
}

// bound returns the tightest valid lower-bound tree for (anchor, profile): the plan tree,
// brought up to date or rebuilt if needed, or the plain tree on networks under planTreeNodes
// and while phantom edges would need a rebuild, which would be short-lived. While a move holds
// phantom edges, a plan tree is brought up to date in place as for edges opened, but with
// every change logged, and rolled back when the move is over (rollBack): the move's searches
// run on the tight tree, and the tree does not stay loose after it.
func (sv *solver) bound(anchor, prof int) bounder {
	if sv.length || len(sv.proposed) == 0 || sv.plainBounds {
		return bounder{t: sv.costTree(anchor, prof)}
	}
	k := sv.slot(anchor)*len(sv.profiles) + prof
	pt := sv.planTrees[k]
	if pt != nil && sv.nPhantom == 0 && len(pt.undoFree) > 0 {
		sv.rollBack(pt)
	}
	if pt != nil && pt.bad == 0 && (pt.loose == 0 || pt.round == sv.roundNo || sv.nPhantom > 0) {
		pt.pend = pt.pend[:0] // none of them is both free now and charged in the tree
		return bounder{t: pt.t, pt: pt}
	}
	if pt != nil && pt.bad > 0 && (pt.loose == 0 || pt.round == sv.roundNo) && (sv.nPhantom == 0 || pt.bad <= maxPhantomUp) {
		sv.freeUp(pt)
		return bounder{t: pt.t, pt: pt}
	}
	if sv.nPhantom > 0 {
		return bounder{t: sv.costTree(anchor, prof)}
	}
	if pt == nil {
		pt = &planTree{freeAt: make([]bool, len(sv.proposed)), anchor: anchor, prof: prof}
		sv.planTrees[k] = pt
		sv.planList = append(sv.planList, pt)
	}
	pt.bad, pt.loose, pt.round = 0, 0, sv.roundNo
	pt.pend = pt.pend[:0]
	if pt.t != nil && sv.keepTrees > 0 {
		// Keep the current tree; reuse one kept for the current free set if there is one.
		for i := range pt.kept {
			if kt := &pt.kept[i]; kt.hash == sv.freeHash && sv.freeSetIs(kt.freeAt) {
				kt.t, pt.t = pt.t, kt.t
				kt.freeAt, pt.freeAt = pt.freeAt, kt.freeAt
				kt.hash, pt.hash = pt.hash, kt.hash
				k := *kt
				copy(pt.kept[i:], pt.kept[i+1:])
				pt.kept[len(pt.kept)-1] = k
				return bounder{t: pt.t, pt: pt}
			}
		}
		var buf keptTree
		if len(pt.kept) == sv.keepTrees {
			buf = pt.kept[0]
			copy(pt.kept, pt.kept[1:])
			pt.kept = pt.kept[:len(pt.kept)-1]
		} else {
			buf.freeAt = make([]bool, len(sv.proposed))
		}
		pt.kept = append(pt.kept, keptTree{t: pt.t, freeAt: pt.freeAt, hash: pt.hash})
		pt.t, pt.freeAt = buf.t, buf.freeAt
	}
	for pi, e := range sv.proposed {
		pt.freeAt[pi] = sv.freeNow(e)
	}
	pt.hash = sv.freeHash
	pt.t = buildTreeInto(pt.t, sv.srch, anchor, sv.planWeight(sv.profBase[prof], pt.freeAt))
	return bounder{t: pt.t, pt: pt}
}

// freeUp brings plan tree pt up to date with the edges that became free since it was built:
// each pending edge free now is lowered to its base weight, and the nodes whose distance to
// the root falls are searched again from there (Dijkstra over the improved region only), which
// leaves the exact shortest-path tree of the new weights.
func (sv *solver) freeUp(pt *planTree) {
	t, net, root := pt.t, sv.net, pt.anchor
	base, freeAt := sv.profBase[pt.prof], pt.freeAt
	logged := sv.nPhantom > 0
	h := &sv.upHeap
	h.reset()
	// relax offers v the path through u by edge e.
	relax := func(u, v, e int32) {
		du := t.dist[u]
		if du < 0 || !net.transit(u, root) {
			return
		}
		we, ok := sv.planEdge(base, freeAt, e)
		if !ok {
			return
		}
		if nd := du + we; t.dist[v] < 0 || nd < t.dist[v] {
			if logged {
				pt.undo = append(pt.undo, undoEntry{v: v, pred: t.pred[v], dist: t.dist[v], lenMM: t.lenMM[v]})
			}
			t.dist[v], t.lenMM[v], t.pred[v] = nd, t.lenMM[u]+net.lenMM[e], e
			h.push(nd, v)
		}
	}
	for _, pi := range pt.pend {
		e := sv.proposed[pi]
		if pt.freeAt[pi] || !sv.freeNow(e) {
			continue
		}
		pt.freeAt[pi] = true
		pt.hash ^= freeKey(e)
		if logged {
			pt.undoFree = append(pt.undoFree, pi)
		}
		ed := &sv.p.Edges[e]
		a, b := int32(ed.From), int32(ed.To)
		relax(a, b, e)
		relax(b, a, e)
	}
	pt.pend = pt.pend[:0]
	pt.bad = 0
	sv.freeUps++
	for h.len() > 0 {
		d, u := h.pop()
		if d != t.dist[u] {
			continue // stale: u was lowered again after this entry
		}
		if !net.transit(u, root) {
			continue
		}
		for _, a := range net.adj[net.start[u]:net.start[u+1]] {
			relax(u, a.to, a.edge)
		}
	}
}

// rollBack undoes what freeUp changed in pt while phantom edges were held: the nodes' entries,
// newest change first, and the edges it freed, which are charged in the tree again; the
// counters follow (an edge free now is bad again and pending, one charged now no longer loose).
func (sv *solver) rollBack(pt *planTree) {
	t := pt.t
	for i := len(pt.undo) - 1; i >= 0; i-- {
		u := &pt.undo[i]
		t.dist[u.v], t.lenMM[u.v], t.pred[u.v] = u.dist, u.lenMM, u.pred
	}
	for _, pi := range pt.undoFree {
		e := sv.proposed[pi]
		pt.freeAt[pi] = false
		pt.hash ^= freeKey(e)
		if sv.freeNow(e) {
			pt.bad++
			pt.pend = append(pt.pend, pi)
		} else {
			pt.loose--
		}
	}
	pt.undo, pt.undoFree = pt.undo[:0], pt.undoFree[:0]
}
