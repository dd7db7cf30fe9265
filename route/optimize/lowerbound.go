package optimize

import (
	"math"
	"slices"
)

// The proved lower bound (Solution.LowerBoundCents): a dual ascent on the linear relaxation of
// the uncapacitated fixed-charge multi-commodity network design problem, after Balakrishnan,
// Magnanti and Wong, "A dual-ascent procedure for large-scale uncapacitated network design",
// Operations Research 37(5), 1989.
//
// The relaxation keeps, per demand d, its routes as paths from its free end to its anchor and
// the linking x_e^d ≤ y_e between its use of edge e and e's opening; it drops reach, duct
// capacity, transit-free nodes, edge-group and node disjointness (each only removes plans),
// prices every edge at the cheapest of d's media that may use it, and counts the cheapest
// option cost of d. A charge (Problem.Charges) is a fixed charge split evenly over its edges
// (a route that uses k of its edges is credited k shares, and all users together at most the
// charge), so each edge e has a budget b_e: its FixedCents (proposed, AllowNew) and its
// charges' shares.
//
// The dual gives each demand d a price w_e^d ≥ 0 on each edge, with Σ_d w_e^d ≤ b_e; any such
// prices bound every plan from below by Σ_d (option cost + legs × SP_d(c + w^d)), SP_d the
// cheapest path of d with edge weights c_e^d + w_e^d: a plan pays each opened edge's budget
// at least once, which covers every w_e^d of the demands that use it (a diverse pair's legs
// share no edge, so they take each w_e^d at most once). Potentials π_v = L − min(ℓ_v, L), with
// ℓ the shortest distances from the anchor over c + (budget left) and L ≤ ℓ(free end), are
// dual feasible when d takes w_e^d = max(0, |ℓ'_u − ℓ'_v| − c_e) (ℓ' = min(ℓ, L)), which
// never exceeds the budget left; L is then d's level, a lower bound of SP_d(c + w^d).
//
// The ascent raises the demands in turn, in dualPasses passes: pass j lifts each demand's
// level a (j/dualPasses) share of the way from the cheapest path without budgets to the
// highest level the budgets left allow (after giving back its own prices), so that early
// demands do not take whole budgets that later ones share (BMW raise one cut at a time,
// round-robin; the passes are a coarser form of the same fairness). A demand's level never
// falls between passes. The work (nodes and edges scanned) is capped by dualWork; demands the
// ascent does not reach keep the bound of their cheapest path with every proposed edge free.
//
// The bound holds for every plan that routes the same demands and gives each diverse demand
// at least as many legs as the plan does (the optimizer ranks unrouted demands and missing
// pairs before cost, so those are the plans it compares). Added ducts are priced at 0.

// dualPasses is the number of passes of the ascent.
const dualPasses = 4

// dualWork bounds the nodes and edges the ascent scans, over all passes: enough for every
// pass on campuses of a few hundred buildings, a fixed amount of work beyond.
const dualWork = 40_000_000

// dualInf caps distances, far from int64 overflow.
const dualInf = int64(1) << 61

// dualUse is one price a demand holds: w_e^d on edge edge.
type dualUse struct {
	edge  int32
	cents int64
}

// dualBound is the result of the ascent.
type dualBound struct {
	level  []int64     // demand → level L_d (a leg's lower bound), -1 when the demand has none
	budget []int64     // edge → budget b_e
	rem    []int64     // edge → budget left
	uses   [][]dualUse // demand → prices held
	// wanted lists the proposed edges some demand priced (their budget is partly or wholly
	// used: the dual says they may pay), fullest first; wantBy the demands that priced each.
	wanted []int32
	wantBy map[int32][]int32
	passes int   // passes completed
	work   int64 // nodes and edges scanned
}

// legCost returns c_e^d, the cheapest of demand d's media on edge e (cable and labour cents),
// or -1 when none may use it.
func (sv *solver) legCost(d int, e int32) int64 {
	c := int64(-1)
	for _, pi := range sv.optProf[d] {
		if w := sv.profCent[pi][e]; w >= 0 && (c < 0 || w < c) {
			c = w
		}
	}
	return c
}

// freeLevel returns the cheapest leg of demand d over its options with every proposed edge
// free (the plain lower-bound trees), or -1 when no option has a path.
func (sv *solver) freeLevel(d int) int64 {
	lv := int64(-1)
	for o := range sv.p.Demands[d].Options {
		if t := sv.costTree(sv.to[d], sv.optProf[d][o]).dist[sv.from[d]]; t >= 0 && (lv < 0 || t < lv) {
			lv = t
		}
	}
	return lv
}

// ascend computes the dual bound of the problem (nil for the length objective).
func (sv *solver) ascend() *dualBound {
	if sv.length {
		return nil
	}
	p := sv.p
	ne, nd := len(p.Edges), len(p.Demands)
	db := &dualBound{level: make([]int64, nd), budget: make([]int64, ne), uses: make([][]dualUse, nd), wantBy: map[int32][]int32{}}
	copy(db.budget, sv.fixedE)
	if sv.chOn {
		for _, ch := range p.Charges {
			share := ch.Cents / int64(len(ch.Edges))
			for _, e := range ch.Edges {
				db.budget[e] += share
			}
		}
	}
	db.rem = slices.Clone(db.budget)
	free := make([]int64, nd)
	for d := range db.level {
		db.level[d] = -1
		if sv.invalid[d] == "" {
			free[d] = sv.freeLevel(d)
			db.level[d] = free[d]
		}
	}
	a, b := newDualSearch(sv.net.nodes), newDualSearch(sv.net.nodes)
	var uses []dualUse
	for pass := 1; pass <= dualPasses; pass++ {
		for d := 0; d < nd; d++ {
			if free[d] < 0 || sv.stopped() {
				continue
			}
			if db.work > dualWork {
				return db.finish(nd)
			}
			for _, u := range db.uses[d] { // give back d's prices: it re-ascends with them
				db.rem[u.edge] += u.cents
			}
			s, t := int32(sv.from[d]), int32(sv.to[d])
			top := sv.dualRun(db, a, d, t, s, dualInf)
			prev := max(db.level[d], free[d])
			if top < 0 || top < prev {
				// Unreachable (cannot happen when freeLevel found a path) or numerically
				// below the old level: keep the old prices.
				for _, u := range db.uses[d] {
					db.rem[u.edge] -= u.cents
				}
				continue
			}
			// The level: a share of the way from the plain path to the top, never below the
			// level already proved.
			lv := free[d] + (top-free[d])*int64(pass)/dualPasses
			lv = max(lv, prev)
			lv = min(lv, top)
			// Potentials: π^T = lv − min(ℓ_t, lv) from the anchor's distances and π^S =
			// min(ℓ_s, lv) from the free end's; both are feasible with π(free end) = 0 and
			// π(anchor) = lv, and so is their minimum, which is steep only near the demand's
			// cheap paths and so prices fewer edges it would not use.
			sv.dualRun(db, b, d, s, -1, lv)
			pot := func(v int32) int64 {
				pt := int64(0)
				if dv := a.dist[v]; dv >= 0 && dv < lv {
					pt = lv - dv
				}
				ps := lv
				if dv := b.dist[v]; dv >= 0 && dv < lv {
					ps = dv
				}
				return min(pt, ps)
			}
			// Prices: each edge with an end of positive potential, counted from its higher end.
			uses = uses[:0]
			for _, v := range a.popped {
				pv := pot(v)
				if pv <= 0 {
					continue
				}
				for _, ar := range sv.net.adj[sv.net.start[v]:sv.net.start[v+1]] {
					c := sv.legCost(d, ar.edge)
					if c < 0 {
						continue
					}
					if w := pv - pot(ar.to) - c; w > 0 {
						uses = append(uses, dualUse{ar.edge, w})
					}
				}
			}
			db.uses[d] = append(db.uses[d][:0], uses...)
			for _, u := range db.uses[d] {
				db.rem[u.edge] -= u.cents
				if db.rem[u.edge] < 0 {
					panic("optimize: dual ascent overspent a budget")
				}
			}
			db.level[d] = lv
		}
		db.passes = pass
	}
	return db.finish(nd)
}

// finish lists the wanted edges.
func (db *dualBound) finish(nd int) *dualBound {
	for d := 0; d < nd; d++ {
		for _, u := range db.uses[d] {
			if db.budget[u.edge] > 0 {
				db.wantBy[u.edge] = append(db.wantBy[u.edge], int32(d))
			}
		}
	}
	for e, ds := range db.wantBy {
		db.wanted = append(db.wanted, e)
		db.wantBy[e] = slices.Compact(ds) // ds ascending: demands were scanned in order
	}
	slices.SortFunc(db.wanted, func(a, b int32) int {
		ra, rb := db.rem[a]*1000/max(db.budget[a], 1), db.rem[b]*1000/max(db.budget[b], 1)
		if ra != rb {
			if ra < rb {
				return -1
			}
			return 1
		}
		return int(a - b)
	})
	return db
}

// planBound returns the lower bound for the current plan's routed demands and legs (see the
// file comment), or -1 without a bound.
func (sv *solver) planBound() int64 {
	db := sv.dual
	if db == nil {
		return -1
	}
	var b int64
	for d, c := range sv.st.ch {
		if c.opt < 0 || db.level[d] < 0 {
			continue
		}
		legs := max(len(c.legs), 1)
		fx := int64(math.MaxInt64)
		for o := range sv.p.Demands[d].Options {
			fx = min(fx, sv.optionCents(d, o, legs))
		}
		b += fx + int64(legs)*db.level[d]
	}
	return b
}

// gapClosed reports whether the plan is proved optimal: every demand routed with its pair,
// nothing overfull, and its cost within 1e-9 of the bound.
func (sv *solver) gapClosed() bool {
	if sv.dual == nil {
		return false
	}
	k := sv.st.key()
	if k.overfull != 0 || k.unrouted != 0 || k.unmet != 0 {
		return false
	}
	b := sv.planBound()
	return b > 0 && float64(k.total-b) <= 1e-9*float64(b)
}

// dualSearch is the scratch of one ascent search.
type dualSearch struct {
	dist            []int64 // -1 when not reached
	popped, touched []int32
	h               minHeap[int64]
}

func newDualSearch(nodes int) *dualSearch {
	ds := &dualSearch{dist: make([]int64, nodes)}
	for i := range ds.dist {
		ds.dist[i] = -1
	}
	return ds
}

// dualRun runs Dijkstra from root over demand d's edges weighted c + budget left, until it
// pops goal (returning its distance) or a node at limit or more (returning -1). Every node of
// distance below the distance returned (or limit) is popped, with its final distance.
func (sv *solver) dualRun(db *dualBound, ds *dualSearch, d int, root, goal int32, limit int64) int64 {
	n := sv.net
	for _, v := range ds.touched {
		ds.dist[v] = -1
	}
	ds.popped, ds.touched = ds.popped[:0], append(ds.touched[:0], root)
	ds.h.reset()
	ds.dist[root] = 0
	ds.h.push(0, root)
	for ds.h.len() > 0 {
		k, v := ds.h.pop()
		if k > ds.dist[v] {
			continue
		}
		if k >= limit {
			return -1
		}
		ds.popped = append(ds.popped, v)
		if v == goal {
			return k
		}
		db.work++
		for _, a := range n.adj[n.start[v]:n.start[v+1]] {
			db.work++
			c := sv.legCost(d, a.edge)
			if c < 0 {
				continue
			}
			nk := min(k+c+db.rem[a.edge], dualInf)
			if dv := ds.dist[a.to]; dv < 0 || nk < dv {
				if dv < 0 {
					ds.touched = append(ds.touched, a.to)
				}
				ds.dist[a.to] = nk
				ds.h.push(nk, a.to)
			}
		}
	}
	return -1
}
