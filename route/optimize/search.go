package optimize

// weight is what the searches minimise: int64 for cents and millimetres (exact), float64 only
// for the Lagrangian weights of LARAC.
type weight interface{ ~int64 | ~float64 }

// minHeap is a 4-ary heap of (key, item), ties broken by the smaller item so that every
// search is deterministic: entries leave in the order of (key, item), whatever the arity.
// Four children per node halve the depth of a binary heap, and keys and items sit side by
// side, which is what the searches' inner loops spend most of their time on.
type minHeap[W weight] struct {
	es []heapEntry[W]
}

type heapEntry[W weight] struct {
	key  W
	item int32
}

func (h *minHeap[W]) len() int { return len(h.es) }
func (h *minHeap[W]) reset()   { h.es = h.es[:0] }

func (a heapEntry[W]) less(b heapEntry[W]) bool {
	return a.key < b.key || (a.key == b.key && a.item < b.item)
}

func (h *minHeap[W]) push(k W, it int32) {
	x := heapEntry[W]{k, it}
	h.es = append(h.es, x)
	es := h.es
	i := len(es) - 1
	for i > 0 {
		p := (i - 1) / 4
		if !x.less(es[p]) {
			break
		}
		es[i] = es[p]
		i = p
	}
	es[i] = x
}

func (h *minHeap[W]) pop() (W, int32) {
	es := h.es
	top := es[0]
	n := len(es) - 1
	x := es[n]
	h.es = es[:n]
	es = es[:n]
	if n > 0 {
		i := 0
		for {
			c := 4*i + 1
			if c >= n {
				break
			}
			m := c
			for j := c + 1; j < c+4 && j < n; j++ {
				if es[j].less(es[m]) {
					m = j
				}
			}
			if !es[m].less(x) {
				break
			}
			es[i] = es[m]
			i = m
		}
		es[i] = x
	}
	return top.key, top.item
}

// search is reusable scratch space for Dijkstra and A* over a Network's flat adjacency.
// Entries are stamped rather than cleared, so a search costs only what it visits.
type search[W weight] struct {
	net   *Network
	ns    []nodeLabel[W] // per node
	stamp uint32
	heap  minHeap[W]
	rad   *radixHeap // used instead of heap when W is int64
}

// nodeLabel is a search's label of one node. Its fields sit side by side because the inner
// loop reads them together for each neighbour (settled, then seen and dist): one cache line,
// not one per field, on a network larger than the cache.
type nodeLabel[W weight] struct {
	dist    W
	lenMM   int64
	seen    uint32
	settled uint32
	pred    int32 // edge by which the node was reached, -1 at the root
}

func newSearch[W weight](net *Network) *search[W] {
	s := &search[W]{net: net, ns: make([]nodeLabel[W], net.nodes)}
	var zero W
	if _, ok := any(zero).(int64); ok {
		s.rad = &radixHeap{}
	}
	return s
}

// dist returns the weight of the last run's path to v (v reached).
func (s *search[W]) dist(v int) W { return s.ns[v].dist }

// lenMM returns the length of the last run's path to v (v reached).
func (s *search[W]) lenMM(v int) int64 { return s.ns[v].lenMM }

// heuristic returns a lower bound of the weight from node v to the goal, consistent
// (h(u) <= w(u,v) + h(v)), and false for a node that cannot reach the goal.
type heuristic[W weight] func(v int32) (W, bool)

// treeH is the heuristic of a lower-bound tree's distances.
func treeH(t *tree) heuristic[int64] {
	return func(v int32) (int64, bool) { d := t.dist[v]; return d, d >= 0 }
}

// run is Dijkstra's algorithm from root over edges with w(e) → (weight >= 0, usable), or A*
// when h is non-nil. It stops when goal is settled (goal < 0: settle everything) and reports
// whether goal was reached. Time O(|E| log |V|) for what it visits.
func (s *search[W]) run(root, goal int, w func(e int32) (W, bool), h heuristic[W]) bool {
	return s.runAtMost(root, goal, w, h, false, 0)
}

// runAtMost is run for a caller that wants goal only at a weight of at most most (when capped):
// a node whose key (weight, plus h under A*) exceeds most is not queued, and goal is not
// reached when every path to it weighs more. Keys leave the queue in order, so whatever
// reaches goal within most does so exactly as run would: same path, same ties.
func (s *search[W]) runAtMost(root, goal int, w func(e int32) (W, bool), h heuristic[W], capped bool, most W) bool {
	s.stamp++
	if s.stamp == 0 { // wrapped: clear once every 2³² runs
		clear(s.ns)
		s.stamp = 1
	}
	st := s.stamp
	rad := s.rad
	if rad != nil {
		rad.reset()
	} else {
		s.heap.reset()
	}
	ns := s.ns
	ns[root].dist, ns[root].lenMM, ns[root].pred, ns[root].seen = 0, 0, -1, st
	var k W
	if h != nil {
		k, _ = h(int32(root))
	}
	if capped && k > most {
		return false
	}
	if rad != nil {
		rad.push(int64(k), int32(root))
	} else {
		s.heap.push(k, int32(root))
	}
	net := s.net
	for {
		var u int32
		if rad != nil {
			if rad.len() == 0 {
				break
			}
			_, u = rad.pop()
		} else {
			if s.heap.len() == 0 {
				break
			}
			_, u = s.heap.pop()
		}
		nu := &ns[u]
		if nu.settled == st {
			continue
		}
		nu.settled = st
		if int(u) == goal {
			return true
		}
		if !net.transit(u, root) {
			continue // a transit-free node ends the paths that reach it
		}
		du, lu := nu.dist, nu.lenMM
		for _, a := range net.adj[net.start[u]:net.start[u+1]] {
			v := a.to
			nv := &ns[v]
			if nv.settled == st {
				continue
			}
			we, ok := w(a.edge)
			if !ok {
				continue
			}
			nd := du + we
			if nv.seen == st && nd >= nv.dist {
				continue
			}
			k := nd
			if h != nil {
				if int(v) != goal && !net.transit(v, root) {
					// A dead end (a transit-free node), where the bound need not be
					// consistent: skipped, so keys leave the heap in order.
					continue
				}
				hv, ok := h(v)
				if !ok {
					continue
				}
				k += hv
			}
			if capped && k > most {
				continue
			}
			nv.seen, nv.dist, nv.lenMM, nv.pred = st, nd, lu+net.lenMM[a.edge], a.edge
			if rad != nil {
				rad.push(int64(k), v)
			} else {
				s.heap.push(k, v)
			}
		}
	}
	return goal < 0
}

// pathTo returns the hops from the root of the last run to v, root first.
func (s *search[W]) pathTo(v int) []Hop {
	var hops []Hop
	for s.ns[v].pred >= 0 {
		e := s.ns[v].pred
		ed := &s.net.edges[e]
		fwd := ed.To == v && (ed.From != v)
		u := ed.From
		if !fwd {
			u = ed.To
		}
		hops = append(hops, Hop{Edge: int(e), Forward: fwd})
		v = u
	}
	for i, j := 0, len(hops)-1; i < j; i, j = i+1, j-1 {
		hops[i], hops[j] = hops[j], hops[i]
	}
	return hops
}

// tree is a finished shortest-path tree rooted at a demand target: dist[v] is the least weight
// from v to the root (-1 if unreachable), pred[v] the first edge of that path from v, lenMM[v]
// its length in millimetres.
type tree struct {
	root  int
	dist  []int64
	lenMM []int64
	pred  []int32
}

// buildTree runs Dijkstra from root over w and keeps the result.
func buildTree(s *search[int64], root int, w func(e int32) (int64, bool)) *tree {
	return buildTreeInto(nil, s, root, w)
}

// buildTreeInto is buildTree storing the result in t's arrays (a new tree when t is nil).
func buildTreeInto(t *tree, s *search[int64], root int, w func(e int32) (int64, bool)) *tree {
	s.run(root, -1, w, nil)
	n := s.net.nodes
	if t == nil {
		t = &tree{dist: make([]int64, n), lenMM: make([]int64, n), pred: make([]int32, n)}
	}
	t.root = root
	for v := 0; v < n; v++ {
		if nv := &s.ns[v]; nv.seen == s.stamp {
			t.dist[v], t.lenMM[v], t.pred[v] = nv.dist, nv.lenMM, nv.pred
		} else {
			t.dist[v], t.lenMM[v], t.pred[v] = -1, -1, -1
		}
	}
	return t
}

// pathFrom returns the tree path from v to the root, v first; nil if v is the root or unreachable.
func (t *tree) pathFrom(net *Network, v int) []Hop {
	var hops []Hop
	for t.dist[v] >= 0 && t.pred[v] >= 0 {
		e := t.pred[v]
		ed := &net.edges[e]
		fwd := ed.From == v
		next := ed.To
		if !fwd {
			next = ed.From
		}
		hops = append(hops, Hop{Edge: int(e), Forward: fwd})
		v = next
	}
	return hops
}

// hopsLenMM returns the length of hops in millimetres.
func hopsLenMM(net *Network, hops []Hop) int64 {
	var l int64
	for _, h := range hops {
		l += net.lenMM[h.Edge]
	}
	return l
}
