package site

import (
	"container/heap"
	"math"
	"sort"

	"gonum.org/v1/gonum/graph"
	"gonum.org/v1/gonum/graph/iterator"
	"gonum.org/v1/gonum/graph/simple"

	"spanwright/geo"
)

// Graph is the pathway network as a gonum undirected weighted graph. Node IDs are indices
// into the network's junctions; parallel spans between two junctions stay distinct and the
// graph's edge between them weighs as the lightest span. Every iteration is in a fixed
// order (neighbours by node ID), so algorithms run on it give the same answer every time.
type Graph struct {
	net    *geo.Network
	nodeOf map[string]int64 // junction ID → node ID
	adj    [][]half         // per node, sorted by neighbour then span index
	weight []float64        // per span; +Inf excludes the span
}

// half is one span seen from one of its ends.
type half struct {
	to   int64
	span int // index into net.Spans
}

var (
	_ graph.WeightedUndirected = (*Graph)(nil)
	_ graph.WeightedEdge       = edge{}
)

// NewGraph builds the graph of net, every span weighing its length in metres.
func NewGraph(net *geo.Network) *Graph {
	g := &Graph{net: net, nodeOf: make(map[string]int64, len(net.Junctions))}
	for i, j := range net.Junctions {
		g.nodeOf[j.ID] = int64(i)
	}
	g.adj = make([][]half, len(net.Junctions))
	g.weight = make([]float64, len(net.Spans))
	for i, s := range net.Spans {
		u, okU := g.nodeOf[s.From]
		v, okV := g.nodeOf[s.To]
		if !okU || !okV {
			panic("route: span " + s.ID + " names an unknown junction")
		}
		g.weight[i] = s.LengthM
		if u == v {
			continue // a loop never shortens a path
		}
		g.adj[u] = append(g.adj[u], half{to: v, span: i})
		g.adj[v] = append(g.adj[v], half{to: u, span: i})
	}
	for _, a := range g.adj {
		sort.Slice(a, func(i, j int) bool {
			if a[i].to != a[j].to {
				return a[i].to < a[j].to
			}
			return a[i].span < a[j].span
		})
	}
	return g
}

// SetWeight sets the weight of every span from w; w returning +Inf excludes a span.
// It panics on a negative or NaN weight, which Dijkstra cannot take.
func (g *Graph) SetWeight(w func(s *geo.Span) float64) {
	for i := range g.net.Spans {
		x := w(&g.net.Spans[i])
		if x < 0 || math.IsNaN(x) {
			panic("route: negative or NaN span weight for " + g.net.Spans[i].ID)
		}
		g.weight[i] = x
	}
}

// NodeOf returns the node ID of a junction.
func (g *Graph) NodeOf(junction string) (int64, bool) {
	id, ok := g.nodeOf[junction]
	return id, ok
}

// Junction returns the junction ID of node id.
func (g *Graph) Junction(id int64) string { return g.net.Junctions[id].ID }

// lightest returns the lightest usable span between u and v, and false when there is none.
func (g *Graph) lightest(u, v int64) (int, float64, bool) {
	best, bestW := -1, math.Inf(1)
	a := g.adj[u]
	i := sort.Search(len(a), func(i int) bool { return a[i].to >= v })
	for ; i < len(a) && a[i].to == v; i++ {
		if w := g.weight[a[i].span]; w < bestW {
			best, bestW = a[i].span, w
		}
	}
	return best, bestW, best >= 0
}

// Node returns the node with the given ID, or nil.
func (g *Graph) Node(id int64) graph.Node {
	if id < 0 || id >= int64(len(g.adj)) {
		return nil
	}
	return simple.Node(id)
}

// Nodes returns every node in ID order.
func (g *Graph) Nodes() graph.Nodes {
	ns := make([]graph.Node, len(g.adj))
	for i := range ns {
		ns[i] = simple.Node(i)
	}
	return iterator.NewOrderedNodes(ns)
}

// From returns the neighbours of id reachable over a usable span, in ID order.
func (g *Graph) From(id int64) graph.Nodes {
	if g.Node(id) == nil {
		return graph.Empty
	}
	var ns []graph.Node
	last := int64(-1)
	for _, h := range g.adj[id] {
		if h.to == last || math.IsInf(g.weight[h.span], 1) {
			continue
		}
		if _, _, ok := g.lightest(id, h.to); ok {
			ns = append(ns, simple.Node(h.to))
			last = h.to
		}
	}
	if len(ns) == 0 {
		return graph.Empty
	}
	return iterator.NewOrderedNodes(ns)
}

// HasEdgeBetween reports whether a usable span joins x and y.
func (g *Graph) HasEdgeBetween(x, y int64) bool {
	if g.Node(x) == nil || g.Node(y) == nil {
		return false
	}
	_, w, ok := g.lightest(x, y)
	return ok && !math.IsInf(w, 1)
}

// Edge returns the edge from u to v, or nil.
func (g *Graph) Edge(u, v int64) graph.Edge { return g.WeightedEdge(u, v) }

// EdgeBetween returns the edge between x and y, or nil.
func (g *Graph) EdgeBetween(x, y int64) graph.Edge { return g.WeightedEdge(x, y) }

// WeightedEdge returns the lightest span from u to v as an edge, or nil.
func (g *Graph) WeightedEdge(u, v int64) graph.WeightedEdge {
	if !g.HasEdgeBetween(u, v) {
		return nil
	}
	s, w, _ := g.lightest(u, v)
	return edge{f: simple.Node(u), t: simple.Node(v), span: s, w: w}
}

// WeightedEdgeBetween returns the lightest span between x and y, or nil.
func (g *Graph) WeightedEdgeBetween(x, y int64) graph.WeightedEdge { return g.WeightedEdge(x, y) }

// Weight returns the weight of the lightest usable span between x and y; it is 0 for x == y
// and +Inf with false when no span joins them.
func (g *Graph) Weight(x, y int64) (float64, bool) {
	if x == y {
		return 0, true
	}
	if !g.HasEdgeBetween(x, y) {
		return math.Inf(1), false
	}
	_, w, _ := g.lightest(x, y)
	return w, true
}

// edge is one span as a gonum weighted edge.
type edge struct {
	f, t graph.Node
	span int
	w    float64
}

func (e edge) From() graph.Node         { return e.f }
func (e edge) To() graph.Node           { return e.t }
func (e edge) ReversedEdge() graph.Edge { return edge{f: e.t, t: e.f, span: e.span, w: e.w} }
func (e edge) Weight() float64          { return e.w }

// DistancesM returns, by node ID, the length in metres of the lightest path over usable spans
// from any of the sources (node ID → the length it starts at, ≥ 0) to each node; +Inf where
// none reaches. It is Dijkstra's algorithm started from every source at once, so a node's
// answer is the least over the sources of the start plus the path.
func (g *Graph) DistancesM(sources map[int64]float64) []float64 {
	dist := make([]float64, len(g.adj))
	for i := range dist {
		dist[i] = math.Inf(1)
	}
	var q nodeQueue
	for n, d := range sources {
		if d < 0 || math.IsNaN(d) {
			panic("route: negative or NaN start length")
		}
		if d < dist[n] {
			dist[n] = d
			heap.Push(&q, queued{n, d})
		}
	}
	for q.Len() > 0 {
		x := heap.Pop(&q).(queued)
		if x.d > dist[x.n] {
			continue // a stale entry: the node was reached shorter since
		}
		for _, h := range g.adj[x.n] {
			if d := x.d + g.weight[h.span]; d < dist[h.to] {
				dist[h.to] = d
				heap.Push(&q, queued{h.to, d})
			}
		}
	}
	return dist
}

// queued is a node waiting in DistancesM's queue with the length it was reached at.
type queued struct {
	n int64
	d float64
}

// nodeQueue is a binary heap of queued nodes, shortest first, then by node ID, so the order
// nodes settle in is fixed.
type nodeQueue []queued

func (q nodeQueue) Len() int { return len(q) }
func (q nodeQueue) Less(i, j int) bool {
	return q[i].d < q[j].d || (q[i].d == q[j].d && q[i].n < q[j].n)
}
func (q nodeQueue) Swap(i, j int) { q[i], q[j] = q[j], q[i] }
func (q *nodeQueue) Push(x any)   { *q = append(*q, x.(queued)) }
func (q *nodeQueue) Pop() any {
	old := *q
	x := old[len(old)-1]
	*q = old[:len(old)-1]
	return x
}
