package optimize

import (
	"math"
	"sync"

	"gonum.org/v1/gonum/graph"
	"gonum.org/v1/gonum/graph/iterator"
	"gonum.org/v1/gonum/graph/multi"
	"gonum.org/v1/gonum/graph/simple"
	"gonum.org/v1/gonum/graph/topo"
)

var (
	_ graph.WeightedUndirectedMultigraph = (*multi.WeightedUndirectedGraph)(nil)
	_ graph.WeightedUndirected           = View{}
	_ graph.WeightedEdge                 = viewEdge{}
)

// Network is the pathway multigraph of a Problem.
//
// Graph returns it as a gonum multi.WeightedUndirectedGraph, built on first use: node IDs are
// node indices, each edge is one line whose UID is the edge index and whose weight is its
// length in metres.
// Alongside it Network keeps a flat adjacency array (compressed sparse rows, neighbours in edge
// index order) that the optimizer's inner loops walk: a search there touches two slices per step
// instead of allocating gonum iterators and consulting maps, which is what makes thousands of
// searches per Solve affordable.
type Network struct {
	g     *multi.WeightedUndirectedGraph
	gOnce sync.Once

	nodes int
	edges []Edge
	start []int32 // adjacency of node v is adj[start[v]:start[v+1]]
	adj   []arc
	lenMM []int64 // edge lengths in whole millimetres
	// noTransit marks the nodes the optimizer's searches never pass through (Problem.NoTransit;
	// nil when none). Graph and View ignore it: they are the plain pathway graph.
	noTransit []bool
}

// transit reports whether a search rooted at root may go on from node v.
func (n *Network) transit(v int32, root int) bool {
	return n.noTransit == nil || !n.noTransit[v] || int(v) == root
}

// arc is one direction of an edge in the flat adjacency.
type arc struct {
	to   int32
	edge int32
}

// NewNetwork builds the Network of nodes nodes and the given edges. Edge endpoints must be in
// [0, nodes); NewNetwork panics otherwise (Solve validates them first).
func NewNetwork(nodes int, edges []Edge) *Network {
	n := &Network{
		nodes: nodes,
		edges: edges,
		start: make([]int32, nodes+1),
		lenMM: make([]int64, len(edges)),
	}
	deg := make([]int32, nodes+1)
	for i := range edges {
		e := &edges[i]
		if e.From < 0 || e.From >= nodes || e.To < 0 || e.To >= nodes {
			panic("optimize: edge endpoint out of range")
		}
		n.lenMM[i] = lengthMM(e.LengthM)
		if e.ReachM > 0 {
			n.lenMM[i] = lengthMM(e.ReachM) // what the edge adds to a channel (Edge.ReachM)
		}
		deg[e.From]++
		if e.To != e.From {
			deg[e.To]++
		}
	}
	for v := 0; v < nodes; v++ {
		n.start[v+1] = n.start[v] + deg[v]
	}
	n.adj = make([]arc, n.start[nodes])
	fill := append([]int32(nil), n.start[:nodes]...)
	for i := range edges {
		e := &edges[i]
		n.adj[fill[e.From]] = arc{to: int32(e.To), edge: int32(i)}
		fill[e.From]++
		if e.To != e.From {
			n.adj[fill[e.To]] = arc{to: int32(e.From), edge: int32(i)}
			fill[e.To]++
		}
	}
	return n
}

// minLineWeight summarises parallel lines by the lightest, as a path search needs.
func minLineWeight(lines graph.WeightedLines) float64 {
	w := math.Inf(1)
	if lines == nil {
		return w
	}
	for lines.Next() {
		w = math.Min(w, lines.WeightedLine().Weight())
	}
	lines.Reset()
	return w
}

// Graph returns the gonum multigraph, building it on the first call (safe for concurrent
// use). Callers must not modify it.
func (n *Network) Graph() *multi.WeightedUndirectedGraph {
	n.gOnce.Do(func() {
		g := multi.NewWeightedUndirectedGraph()
		g.EdgeWeightFunc = minLineWeight
		for v := 0; v < n.nodes; v++ {
			g.AddNode(simple.Node(v))
		}
		for i := range n.edges {
			e := &n.edges[i]
			g.SetWeightedLine(multi.WeightedLine{F: simple.Node(e.From), T: simple.Node(e.To), W: e.LengthM, UID: int64(i)})
		}
		n.g = g
	})
	return n.g
}

// View returns the network seen through weight as a simple weighted undirected gonum graph:
// weight(e) gives edge e's weight and whether it may be used, and parallel edges collapse to
// the lightest usable one. It suits gonum's algorithms (path.DijkstraFrom, path.YenKShortestPaths,
// topo.ConnectedComponents).
func (n *Network) View(weight func(edge int) (float64, bool)) View { return View{n: n, weight: weight} }

// View is a Network seen through an edge weighting; see Network.View.
type View struct {
	n      *Network
	weight func(edge int) (float64, bool)
}

type viewEdge struct {
	f, t graph.Node
	e    int
	w    float64
}

func (e viewEdge) From() graph.Node         { return e.f }
func (e viewEdge) To() graph.Node           { return e.t }
func (e viewEdge) ReversedEdge() graph.Edge { e.f, e.t = e.t, e.f; return e }
func (e viewEdge) Weight() float64          { return e.w }

// Node returns the node with the given ID, or nil.
func (v View) Node(id int64) graph.Node {
	if id < 0 || id >= int64(v.n.nodes) {
		return nil
	}
	return simple.Node(id)
}

// Nodes returns all nodes in ID order.
func (v View) Nodes() graph.Nodes {
	ns := make([]graph.Node, v.n.nodes)
	for i := range ns {
		ns[i] = simple.Node(i)
	}
	return iterator.NewOrderedNodes(ns)
}

// From returns the nodes joined to id by a usable edge, in adjacency order without repeats.
func (v View) From(id int64) graph.Nodes {
	if v.Node(id) == nil {
		return graph.Empty
	}
	var ns []graph.Node
	seen := map[int32]bool{}
	for _, a := range v.n.adj[v.n.start[id]:v.n.start[id+1]] {
		if _, ok := v.weight(int(a.edge)); !ok || seen[a.to] || int64(a.to) == id {
			continue
		}
		seen[a.to] = true
		ns = append(ns, simple.Node(a.to))
	}
	if len(ns) == 0 {
		return graph.Empty
	}
	return iterator.NewOrderedNodes(ns)
}

// lightest returns the lightest usable edge between x and y, or -1.
func (v View) lightest(xid, yid int64) (int, float64) {
	best, bw := -1, math.Inf(1)
	if v.Node(xid) == nil || v.Node(yid) == nil || xid == yid {
		return -1, bw
	}
	for _, a := range v.n.adj[v.n.start[xid]:v.n.start[xid+1]] {
		if int64(a.to) != yid {
			continue
		}
		if w, ok := v.weight(int(a.edge)); ok && (best < 0 || w < bw) {
			best, bw = int(a.edge), w
		}
	}
	return best, bw
}

// HasEdgeBetween reports whether a usable edge joins x and y.
func (v View) HasEdgeBetween(xid, yid int64) bool { e, _ := v.lightest(xid, yid); return e >= 0 }

// Edge returns the lightest usable edge between u and v, or nil.
func (v View) Edge(uid, vid int64) graph.Edge { return v.WeightedEdge(uid, vid) }

// EdgeBetween is Edge.
func (v View) EdgeBetween(xid, yid int64) graph.Edge { return v.WeightedEdge(xid, yid) }

// WeightedEdgeBetween is WeightedEdge.
func (v View) WeightedEdgeBetween(xid, yid int64) graph.WeightedEdge { return v.WeightedEdge(xid, yid) }

// WeightedEdge returns the lightest usable edge between u and v, or nil.
func (v View) WeightedEdge(uid, vid int64) graph.WeightedEdge {
	e, w := v.lightest(uid, vid)
	if e < 0 {
		return nil
	}
	return viewEdge{f: simple.Node(uid), t: simple.Node(vid), e: e, w: w}
}

// Weight returns the weight of the lightest usable edge between x and y; 0 for x == y and
// +Inf when no edge joins them.
func (v View) Weight(xid, yid int64) (float64, bool) {
	if xid == yid {
		return 0, true
	}
	e, w := v.lightest(xid, yid)
	return w, e >= 0
}

// EdgeOf returns the edge index behind an edge returned by the view, or -1.
func EdgeOf(e graph.Edge) int {
	if ve, ok := e.(viewEdge); ok {
		return ve.e
	}
	return -1
}

// components labels each node with its connected component over the edges usable under use,
// using gonum's topo.ConnectedComponents. Labels are the smallest node index in the component.
func (n *Network) components(use func(edge int) bool) []int {
	label := make([]int, n.nodes)
	cc := topo.ConnectedComponents(n.View(func(e int) (float64, bool) { return n.edges[e].LengthM, use(e) }))
	for _, comp := range cc {
		low := int64(math.MaxInt64)
		for _, v := range comp {
			low = min(low, v.ID())
		}
		for _, v := range comp {
			label[v.ID()] = int(low)
		}
	}
	return label
}
