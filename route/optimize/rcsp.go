package optimize

import "math"

// Reach-constrained cheapest paths: the cheapest path from s to t whose length does not exceed
// a medium's reach. The problem is NP-hard in general (weakly; it is the restricted shortest
// path problem), but on campus networks the two methods below are fast:
//
//   - LARAC, the Lagrangian relaxation of Jüttner, Szviatovszki, Mécs and Rajkó, "Lagrange
//     relaxation based method for the QoS routing problem", IEEE INFOCOM 2001: shortest paths
//     under cost + λ·length for the λ that closes the duality gap. It gives a feasible path and
//     a lower bound quickly, but the path need not be optimal.
//   - An exact label-setting search in the manner of Desrochers and Soumis (1988) and
//     Irnich and Desaulniers, "Shortest path problems with resource constraints" (2005):
//     labels (cost, length) per node, a label dominated when another at the node is no dearer
//     and no longer, popped in A* order of cost plus a lower bound to t, pruned by the
//     remaining length to t and by LARAC's cost. The first label to reach t is optimal.
//
// The label search stops after maxLabels labels; the LARAC path is then used (the only case
// where a reach-constrained route is not proven cheapest).

// maxLabels bounds the exact label-setting search.
const maxLabels = 400000

type label struct {
	node  int32
	edge  int32 // edge into node, -1 at the source
	prev  int32 // previous label, -1 at the source
	cost  int64
	lenMM int64
}

// rcspScratch is reusable label storage.
type rcspScratch struct {
	labels  []label
	heap    radixHeap
	minLen  []int64 // least length of a settled label per node
	minSeen []uint32
	stamp   uint32
	fs      *search[float64]
	stop    stopper // the solver's stopped: larac and labelSearch give up when it says so
}

func newRCSPScratch(net *Network) *rcspScratch {
	return &rcspScratch{minLen: make([]int64, net.nodes), minSeen: make([]uint32, net.nodes), fs: newSearch[float64](net)}
}

// pathEval returns the cost and length of hops under w.
func pathEval(net *Network, hops []Hop, w func(e int32) (int64, bool)) (cost, lenMM int64) {
	for _, h := range hops {
		c, _ := w(int32(h.Edge))
		cost += c
		lenMM += net.lenMM[h.Edge]
	}
	return cost, lenMM
}

// larac returns a path from s to t of length at most limitMM, given pc (the cheapest path,
// too long) and pd (the shortest path, within the limit). It follows Jüttner et al. 2001.
// hCost and hLen are consistent lower bounds of cost and length to t (-1: cannot reach t);
// hCost + λ·hLen is then a consistent heuristic for cost + λ·length, so each step is an A*.
// A caller that wants only a path of cost at most most gets nil once the Lagrangian bound
// shows none within the limit can be: the path r cheapest under cost + λ·length bounds every
// path p within it, cost(p) ≥ cost(p) + λ(len(p) − limit) ≥ cost(r) + λ(len(r) − limit)
// (Jüttner et al. 2001, after Handler and Zang 1980).
func larac(net *Network, sc *rcspScratch, s, t int, limitMM int64, w func(e int32) (int64, bool), hCost, hLen []int64, pc, pd []Hop, most int64) []Hop {
	cc, dc := pathEval(net, pc, w)
	cd, dd := pathEval(net, pd, w)
	for iter := 0; iter < 40 && dc > dd && cd > cc && !sc.stop.stop(); iter++ {
		lambda := float64(cd-cc) / float64(dc-dd)
		lw := func(e int32) (float64, bool) {
			c, ok := w(e)
			return float64(c) + lambda*float64(net.lenMM[e]), ok
		}
		h := func(v int32) (float64, bool) {
			return float64(hCost[v]) + lambda*float64(hLen[v]), hCost[v] >= 0 && hLen[v] >= 0
		}
		if !sc.fs.run(s, t, lw, h) {
			break
		}
		r := sc.fs.pathTo(t)
		cr, dr := pathEval(net, r, w)
		if lb := float64(cr) + lambda*(float64(dr)-float64(limitMM)); most < math.MaxInt64 && lb > float64(most)+1e-9*math.Max(1, math.Abs(lb)) {
			return nil
		}
		lr := float64(cr) + lambda*float64(dr)
		lpc := float64(cc) + lambda*float64(dc)
		if lr >= lpc-1e-9*math.Max(1, math.Abs(lpc)) {
			break // r is on the line through pc and pd: pd is LARAC's answer
		}
		if dr <= limitMM {
			pd, cd, dd = r, cr, dr
		} else {
			pc, cc, dc = r, cr, dr
		}
	}
	return pd
}

// labelSearch returns the cheapest path from s to t of length at most limitMM under w, or
// ok=false when none exists; exhausted reports that maxLabels was reached first, or that
// sc.stop said to give up. hCost[v] must
// be a lower bound of the cost from v to t under w, consistent (hCost[u] <= w(u,v) + hCost[v]),
// with -1 for nodes that cannot reach t; hLen[v] a lower bound of the length from v to t.
// ubCost is a cost no optimal path exceeds (math.MaxInt64 when unknown).
func labelSearch(net *Network, sc *rcspScratch, s, t int, limitMM int64, w func(e int32) (int64, bool), hCost, hLen []int64, ubCost int64) (hops []Hop, ok, exhausted bool) {
	sc.stamp++
	if sc.stamp == 0 {
		clear(sc.minSeen)
		sc.stamp = 1
	}
	st := sc.stamp
	sc.labels = sc.labels[:0]
	sc.heap.reset()
	if hCost[s] < 0 || hLen[s] < 0 || hLen[s] > limitMM {
		return nil, false, false
	}
	sc.labels = append(sc.labels, label{node: int32(s), edge: -1, prev: -1})
	sc.heap.push(hCost[s], 0)
	for pops := 1; sc.heap.len() > 0; pops++ {
		if pops%labelCheckEvery == 0 && sc.stop.stop() {
			return nil, false, true // stopped: the caller keeps its LARAC path, and the solve ends
		}
		_, li := sc.heap.pop()
		L := sc.labels[li]
		u := L.node
		if sc.minSeen[u] == st && sc.minLen[u] <= L.lenMM {
			continue // dominated by a settled label no dearer and no longer
		}
		sc.minSeen[u], sc.minLen[u] = st, L.lenMM
		if int(u) == t {
			return labelPath(net, sc.labels, li), true, false
		}
		if !net.transit(u, s) {
			continue
		}
		if len(sc.labels) > maxLabels {
			return nil, false, true
		}
		for _, a := range net.adj[net.start[u]:net.start[u+1]] {
			v := a.to
			if hCost[v] < 0 || (int(v) != t && !net.transit(v, s)) {
				continue // cannot reach t, or a dead end (a transit-free node)
			}
			c, okw := w(a.edge)
			if !okw {
				continue
			}
			nc, nl := L.cost+c, L.lenMM+net.lenMM[a.edge]
			if nl+hLen[v] > limitMM || nc+hCost[v] > ubCost {
				continue
			}
			if sc.minSeen[v] == st && sc.minLen[v] <= nl {
				continue
			}
			sc.labels = append(sc.labels, label{node: v, edge: a.edge, prev: li, cost: nc, lenMM: nl})
			sc.heap.push(nc+hCost[v], int32(len(sc.labels)-1))
		}
	}
	return nil, false, false
}

func labelPath(net *Network, labels []label, li int32) []Hop {
	var hops []Hop
	for labels[li].prev >= 0 {
		L := labels[li]
		ed := &net.edges[L.edge]
		hops = append(hops, Hop{Edge: int(L.edge), Forward: int(L.node) == ed.To && ed.From != ed.To})
		li = L.prev
	}
	for i, j := 0, len(hops)-1; i < j; i, j = i+1, j-1 {
		hops[i], hops[j] = hops[j], hops[i]
	}
	return hops
}
