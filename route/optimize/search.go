package optimize

// weight is what the searches minimise: int64 for cents and millimetres (exact), float64 only
// for the Lagrangian weights of LARAC.
type weight interface{ ~int64 | ~float64 }

// minHeap is a binary heap of (key, item), ties broken by the smaller item so that every search
// is deterministic.
type minHeap[W weight] struct {
	keys  []W
	items []int32
}

func (h *minHeap[W]) len() int { return len(h.items) }
func (h *minHeap[W]) reset()   { h.keys, h.items = h.keys[:0], h.items[:0] }

func (h *minHeap[W]) less(i, j int) bool {
	return h.keys[i] < h.keys[j] || (h.keys[i] == h.keys[j] && h.items[i] < h.items[j])
}

func (h *minHeap[W]) swap(i, j int) {
	h.keys[i], h.keys[j] = h.keys[j], h.keys[i]
	h.items[i], h.items[j] = h.items[j], h.items[i]
}

func (h *minHeap[W]) push(k W, it int32) {
	h.keys = append(h.keys, k)
	h.items = append(h.items, it)
	for i := len(h.items) - 1; i > 0; {
		p := (i - 1) / 2
		if !h.less(i, p) {
			break
		}
		h.swap(i, p)
		i = p
	}
}

func (h *minHeap[W]) pop() (W, int32) {
	k, it := h.keys[0], h.items[0]
	n := len(h.items) - 1
	h.swap(0, n)
	h.keys, h.items = h.keys[:n], h.items[:n]
	for i := 0; ; {
		l, r, m := 2*i+1, 2*i+2, i
		if l < n && h.less(l, m) {
			m = l
		}
		if r < n && h.less(r, m) {
			m = r
		}
		if m == i {
			break
		}
		h.swap(i, m)
		i = m
	}
	return k, it
}

// search is reusable scratch space for Dijkstra and A* over a Network's flat adjacency.
// Arrays are stamped rather than cleared, so a search costs only what it visits.
type search[W weight] struct {
	net     *Network
	dist    []W
	lenMM   []int64
	pred    []int32 // edge by which the node was reached, -1 at the root
	seen    []uint32
	settled []uint32
	stamp   uint32
	heap    minHeap[W]
}

func newSearch[W weight](net *Network) *search[W] {
	n := net.nodes
	return &search[W]{
		net: net, dist: make([]W, n), lenMM: make([]int64, n), pred: make([]int32, n),
		seen: make([]uint32, n), settled: make([]uint32, n),
	}
}

// reached reports whether the last run labelled v.
func (s *search[W]) reached(v int) bool { return s.seen[v] == s.stamp }

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
	s.stamp++
	if s.stamp == 0 { // wrapped: clear once every 2³² runs
		clear(s.seen)
		clear(s.settled)
		s.stamp = 1
	}
	st := s.stamp
	s.heap.reset()
	s.dist[root], s.lenMM[root], s.pred[root], s.seen[root] = 0, 0, -1, st
	var k W
	if h != nil {
		k, _ = h(int32(root))
	}
	s.heap.push(k, int32(root))
	net := s.net
	for s.heap.len() > 0 {
		_, u := s.heap.pop()
		if s.settled[u] == st {
			continue
		}
		s.settled[u] = st
		if int(u) == goal {
			return true
		}
		du, lu := s.dist[u], s.lenMM[u]
		for _, a := range net.adj[net.start[u]:net.start[u+1]] {
			v := a.to
			if s.settled[v] == st {
				continue
			}
			we, ok := w(a.edge)
			if !ok {
				continue
			}
			nd := du + we
			if s.seen[v] == st && nd >= s.dist[v] {
				continue
			}
			k := nd
			if h != nil {
				hv, ok := h(v)
				if !ok {
					continue
				}
				k += hv
			}
			s.seen[v], s.dist[v], s.lenMM[v], s.pred[v] = st, nd, lu+net.lenMM[a.edge], a.edge
			s.heap.push(k, v)
		}
	}
	return goal < 0
}

// pathTo returns the hops from the root of the last run to v, root first.
func (s *search[W]) pathTo(v int) []Hop {
	var hops []Hop
	for s.pred[v] >= 0 {
		e := s.pred[v]
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
		if s.reached(v) {
			t.dist[v], t.lenMM[v], t.pred[v] = s.dist[v], s.lenMM[v], s.pred[v]
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
