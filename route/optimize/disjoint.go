package optimize

import "math"

// Diverse pairs: two paths from s to t sharing no edge and no interior node, of least total
// weight, by Suurballe's algorithm (J. W. Suurballe, "Disjoint paths in a network", Networks 4,
// 1974; Suurballe and Tarjan, "A quick method for finding shortest pairs of disjoint paths",
// Networks 14, 1984) in the form Bhandari gives for undirected networks (R. Bhandari,
// "Survivable Networks: Algorithms for Diverse Routing", Kluwer 1999, ch. 3–4):
//
//  1. Split every node v into v_in → v_out (weight 0, capacity 1), so node-disjoint becomes
//     arc-disjoint; an edge {u,v} becomes u_out → v_in and v_out → u_in.
//  2. Find the shortest path P1 (Dijkstra).
//  3. Reverse P1's arcs with negated weights, remove the opposite direction of its edges, and
//     find the shortest path P2 in that residual network. Dijkstra still applies on the reduced
//     weights w(u,v) + π(u) − π(v), with π the distances of step 2 (Suurballe's device).
//  4. Cancel the edges P2 traverses backwards along P1; the rest splits into the two paths.
//
// Taking the shortest path first and then the shortest path in what remains fails on the trap
// topology (the shortest path uses the one "bridge" both disjoint paths need); step 3 undoes
// that choice, so the pair is optimal whenever a pair exists.
//
// A transit-free node (Problem.NoTransit) other than s and t loses its split arc v_in → v_out:
// it is a node removed, so the pair stays optimal on what remains.
//
// When step 3 finds no path, the maximum number of node-disjoint paths is one, and the set R
// of states reachable in the residual network is a minimum cut: P1 leaves R through exactly one
// arc, which is the single point of failure — an edge arc (a bridge between s and t) or a split
// arc (an articulation node).

// pairScratch holds split-graph search arrays (2 states per node).
type pairScratch struct {
	net     *Network
	dist    []int64
	pred    []int32 // predecessor state, -1 at the source
	predArc []int32 // edge used into the state, -1 for a split arc
	seen    []uint32
	settled []uint32
	stamp   uint32
	heap    radixHeap

	p1Dir   []int8  // per edge: +1 used From→To by P1, -1 To→From, 0 unused
	p1In    []int32 // per node on P1 (interior): edge of P1 into it
	p1Prev  []int32 // per node on P1: previous node
	p1Mark  []uint32
	p1Stamp uint32

	flowE, flowV []int32 // per node: the edge and node its flow goes on to
	flowMark     []uint32
	flowSt       uint32

	touched  []int32 // states settled by the first search
	pot      []int64
	potMark  []uint32
	potStamp uint32
}

func newPairScratch(net *Network) *pairScratch {
	n := 2 * net.nodes
	return &pairScratch{
		net: net, dist: make([]int64, n), pred: make([]int32, n), predArc: make([]int32, n),
		seen: make([]uint32, n), settled: make([]uint32, n),
		p1Dir: make([]int8, len(net.edges)), p1In: make([]int32, net.nodes), p1Prev: make([]int32, net.nodes),
		p1Mark: make([]uint32, net.nodes), pot: make([]int64, n), potMark: make([]uint32, n),
		flowE: make([]int32, net.nodes), flowV: make([]int32, net.nodes), flowMark: make([]uint32, net.nodes),
	}
}

func inState(v int32) int32  { return 2 * v }
func outState(v int32) int32 { return 2*v + 1 }

// pairResult is the outcome of disjointPair.
type pairResult struct {
	ok     bool
	legs   [2][]Hop
	weight int64 // total weight of both legs
	// When !ok and found1, P1 exists and cut names the single point of failure, unless over.
	found1 bool
	// over: the search stopped because every pair weighs at least the caller's below
	// (ok false, no cut).
	over   bool
	single []Hop
	cut    SinglePoint
}

// disjointPair finds the least-weight pair of edge- and node-disjoint paths from s to t under w.
// h, when non-nil, is a consistent lower bound of the weight to t: the searches then run on the
// reduced weights w(u,v) − h(u) + h(v), which changes every s–t path by the same constant and
// so leaves the optimal pair unchanged, while steering both searches towards t (A*).
//
// A caller that wants only a pair weighing less than below (math.MaxInt64: any pair) gets
// over instead of a pair once both searches show that none can: each leg weighs at least the
// shortest path, so the pair at least twice it, and in Suurballe's residual search the pair
// weighs 2·d(t) + d'(x) at least through a state x settled at reduced distance d'(x), since
// the reduced weights are non-negative (in true weights, plus 2·h(s): both legs are counted
// from h(s) on the A* weights).
func disjointPair(ps *pairScratch, s, t int, w func(e int32) (int64, bool), h heuristic[int64], below int64) pairResult {
	net := ps.net
	var res pairResult
	if h == nil {
		h = func(int32) (int64, bool) { return 0, true }
	}
	hs, ok := h(int32(s))
	if !ok {
		return res
	}
	rw := func(e, from, to int32) (int64, bool) {
		we, ok := w(e)
		if !ok {
			return 0, false
		}
		hf, _ := h(from)
		ht, okt := h(to)
		if !okt {
			return 0, false
		}
		return max(0, we-hf+ht), true
	}
	// Step 2: shortest path P1 on the split graph; any single path is node-simple.
	if !ps.dijkstra(int32(s), int32(t), rw) {
		return res
	}
	// Suurballe potentials: distances of step 2, capped at d(t) for states settled later or
	// never, which keeps every reduced weight non-negative.
	dT := ps.dist[inState(int32(t))]
	limit := int64(math.MaxInt64) // the reduced distance the residual search need not reach
	if below < math.MaxInt64/4 {
		if limit = below - 2*dT - 2*hs; limit <= 0 {
			res.found1, res.over = true, true
			return res
		}
	}
	ps.potStamp++
	if ps.potStamp == 0 {
		clear(ps.potMark)
		ps.potStamp = 1
	}
	for _, x := range ps.touched {
		ps.pot[x], ps.potMark[x] = min(ps.dist[x], dT), ps.potStamp
	}
	p1 := ps.statePath(int32(t))
	res.found1, res.single = true, p1
	ps.markP1(s, p1)

	// Step 3: residual search on reduced weights.
	if found, over := ps.residual(int32(s), int32(t), rw, dT, limit); !found {
		if over {
			res.over = true
			ps.unmarkP1(p1)
			return res
		}
		res.cut = ps.cutOnP1(s, p1)
		ps.unmarkP1(p1)
		return res
	}
	// Collect P2's edge uses: forward uses of new edges and cancellations of P1 edges.
	type use struct {
		e    int32
		from int32
	}
	var p2 []use
	for x := inState(int32(t)); ps.pred[x] >= 0; x = ps.pred[x] {
		if e := ps.predArc[x]; e >= 0 {
			p2 = append(p2, use{e: e, from: ps.pred[x] / 2})
		}
	}
	// Flow out of each node: successor edges after cancellation (P1 edges that P2 traverses
	// backwards are marked 2 in p1Dir until unmarkP1).
	for _, u := range p2 {
		if ps.p1Dir[u.e] != 0 {
			ps.p1Dir[u.e] = 2
		}
	}
	ps.flowSt++
	if ps.flowSt == 0 {
		clear(ps.flowMark)
		ps.flowSt = 1
	}
	var srcE, srcV [2]int32
	nSrc := 0
	addFlow := func(from, e int32) {
		ed := &net.edges[e]
		to := int32(ed.To)
		if int32(ed.From) != from {
			to = int32(ed.From)
		}
		if int(from) == s {
			if nSrc == 2 {
				panic("optimize: disjoint pair: source carries more than two units of flow")
			}
			srcE[nSrc], srcV[nSrc] = e, to
			nSrc++
			return
		}
		if ps.flowMark[from] == ps.flowSt {
			panic("optimize: disjoint pair: interior node carries more than one path")
		}
		ps.flowMark[from], ps.flowE[from], ps.flowV[from] = ps.flowSt, e, to
	}
	for _, h := range p1 {
		ed := &net.edges[h.Edge]
		from := int32(ed.From)
		if !h.Forward {
			from = int32(ed.To)
		}
		if ps.p1Dir[h.Edge] != 2 {
			addFlow(from, int32(h.Edge))
		}
	}
	for i := len(p2) - 1; i >= 0; i-- {
		if ps.p1Dir[p2[i].e] != 2 {
			addFlow(p2[i].from, p2[i].e)
		}
	}
	ps.unmarkP1(p1)
	if nSrc != 2 {
		panic("optimize: disjoint pair: source does not carry two units of flow")
	}
	// Both legs together use at most the edges of P1 and P2: one backing array serves both.
	buf := make([]Hop, 0, len(p1)+len(p2))
	for k := 0; k < 2; k++ {
		leg := buf[len(buf):]
		u := int32(s)
		e, x := srcE[k], srcV[k]
		for steps := 0; ; steps++ {
			if steps > len(net.edges) {
				panic("optimize: disjoint pair: flow does not reach the target")
			}
			ed := &net.edges[e]
			leg = append(leg, Hop{Edge: int(e), Forward: int32(ed.From) == u && int32(ed.To) == x})
			if int(x) == t {
				break
			}
			u = x
			if ps.flowMark[u] != ps.flowSt {
				panic("optimize: disjoint pair: flow stops at an interior node")
			}
			e, x = ps.flowE[u], ps.flowV[u]
		}
		res.legs[k] = leg[:len(leg):len(leg)]
		buf = buf[:len(buf)+len(leg)]
		c, _ := pathEval(net, leg, w)
		res.weight += c
	}
	res.ok = true
	return res
}

func (ps *pairScratch) begin() uint32 {
	ps.stamp++
	if ps.stamp == 0 {
		clear(ps.seen)
		clear(ps.settled)
		ps.stamp = 1
	}
	ps.heap.reset()
	return ps.stamp
}

// dijkstra finds the shortest path from out(s) to in(t) on the split graph without residual
// arcs.
func (ps *pairScratch) dijkstra(s, t int32, w func(e, from, to int32) (int64, bool)) bool {
	st := ps.begin()
	ps.touched = ps.touched[:0]
	net := ps.net
	src, goal := outState(s), inState(t)
	ps.dist[src], ps.pred[src], ps.predArc[src], ps.seen[src] = 0, -1, -1, st
	ps.heap.push(0, src)
	for ps.heap.len() > 0 {
		_, x := ps.heap.pop()
		if ps.settled[x] == st {
			continue
		}
		ps.settled[x] = st
		ps.touched = append(ps.touched, x)
		if x == goal {
			return true
		}
		v := x / 2
		if x == inState(v) { // split arc
			if net.transit(v, int(s)) {
				ps.relax(x, outState(v), -1, ps.dist[x], st)
			}
			continue
		}
		for _, a := range net.adj[net.start[v]:net.start[v+1]] {
			if a.to == s || a.to == v {
				continue
			}
			we, ok := w(a.edge, v, a.to)
			if !ok {
				continue
			}
			ps.relax(x, inState(a.to), a.edge, ps.dist[x]+we, st)
		}
	}
	return false
}

func (ps *pairScratch) relax(from, to, e int32, nd int64, st uint32) {
	if ps.settled[to] == st || (ps.seen[to] == st && nd >= ps.dist[to]) {
		return
	}
	ps.seen[to], ps.dist[to], ps.pred[to], ps.predArc[to] = st, nd, from, e
	ps.heap.push(nd, to)
}

// statePath turns the last search's predecessor states into hops from s to t.
func (ps *pairScratch) statePath(t int32) []Hop {
	var hops []Hop
	for x := inState(t); ps.pred[x] >= 0; x = ps.pred[x] {
		if e := ps.predArc[x]; e >= 0 {
			ed := &ps.net.edges[e]
			hops = append(hops, Hop{Edge: int(e), Forward: int32(ed.To) == x/2 && int32(ed.From) == ps.pred[x]/2})
		}
	}
	for i, j := 0, len(hops)-1; i < j; i, j = i+1, j-1 {
		hops[i], hops[j] = hops[j], hops[i]
	}
	return hops
}

func (ps *pairScratch) markP1(s int, p1 []Hop) {
	ps.p1Stamp++
	if ps.p1Stamp == 0 {
		clear(ps.p1Mark)
		ps.p1Stamp = 1
	}
	u := int32(s)
	for _, h := range p1 {
		ed := &ps.net.edges[h.Edge]
		v := int32(ed.To)
		if h.Forward {
			ps.p1Dir[h.Edge] = 1
		} else {
			ps.p1Dir[h.Edge] = -1
			v = int32(ed.From)
		}
		ps.p1Mark[v], ps.p1In[v], ps.p1Prev[v] = ps.p1Stamp, int32(h.Edge), u
		u = v
	}
}

func (ps *pairScratch) unmarkP1(p1 []Hop) {
	for _, h := range p1 {
		ps.p1Dir[h.Edge] = 0
	}
}

// residual searches for P2 from out(s) to in(t) in the residual network of P1, on reduced
// weights. It stops with over when the next state to settle lies at limit or beyond.
func (ps *pairScratch) residual(s, t int32, w func(e, from, to int32) (int64, bool), dT, limit int64) (found, over bool) {
	st := ps.begin()
	net := ps.net
	src, goal := outState(s), inState(t)
	ps.dist[src], ps.pred[src], ps.predArc[src], ps.seen[src] = 0, -1, -1, st
	ps.heap.push(0, src)
	onP1 := func(v int32) bool { return v != s && v != t && ps.p1Mark[v] == ps.p1Stamp }
	pot := func(x int32) int64 {
		if ps.potMark[x] == ps.potStamp {
			return ps.pot[x]
		}
		return dT
	}
	red := func(from, to int32, we int64) int64 { return max(0, we+pot(from)-pot(to)) }
	for ps.heap.len() > 0 {
		_, x := ps.heap.pop()
		if ps.settled[x] == st {
			continue
		}
		if ps.dist[x] >= limit {
			return false, true
		}
		ps.settled[x] = st
		if x == goal {
			return true, false
		}
		v := x / 2
		dx := ps.dist[x]
		if x == inState(v) {
			if onP1(v) {
				// Split arc saturated: only the reversed P1 edge into v leads on.
				e := ps.p1In[v]
				we, _ := w(e, ps.p1Prev[v], v)
				u := outState(ps.p1Prev[v])
				ps.relax(x, u, e, dx+red(x, u, -we), st)
			} else if net.transit(v, int(s)) {
				ps.relax(x, outState(v), -1, dx+red(x, outState(v), 0), st)
			}
			continue
		}
		if onP1(v) {
			ps.relax(x, inState(v), -1, dx+red(x, inState(v), 0), st)
		}
		for _, a := range net.adj[net.start[v]:net.start[v+1]] {
			if a.to == s || a.to == v || ps.p1Dir[a.edge] != 0 {
				continue
			}
			we, ok := w(a.edge, v, a.to)
			if !ok {
				continue
			}
			y := inState(a.to)
			ps.relax(x, y, a.edge, dx+red(x, y, we), st)
		}
	}
	return false, false
}

// cutOnP1 returns the arc by which P1 leaves the states the residual search reached.
func (ps *pairScratch) cutOnP1(s int, p1 []Hop) SinglePoint {
	reached := func(x int32) bool { return ps.seen[x] == ps.stamp }
	u := int32(s)
	for _, h := range p1 {
		ed := &ps.net.edges[h.Edge]
		v := int32(ed.To)
		if !h.Forward {
			v = int32(ed.From)
		}
		if reached(outState(u)) && !reached(inState(v)) {
			return SinglePoint{Kind: PointEdge, Index: h.Edge, Separates: true}
		}
		if reached(inState(v)) && !reached(outState(v)) {
			return SinglePoint{Kind: PointNode, Index: int(v), Separates: true}
		}
		u = v
	}
	panic("optimize: disjoint pair: no cut arc on the first path")
}
