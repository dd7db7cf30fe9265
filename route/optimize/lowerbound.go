package optimize

import (
	"cmp"
	"encoding/binary"
	"math"
	"slices"
)

// The proved lower bound (Solution.LowerBoundCents): a dual ascent on the linear relaxation of
// the uncapacitated fixed-charge multi-commodity network design problem, after Balakrishnan,
// Magnanti and Wong, "A dual-ascent procedure for large-scale uncapacitated network design",
// Operations Research 37(5), 1989.
//
// The relaxation keeps, per demand d, its routes as paths from its free end to its anchor
// that pass no transit-free node, and the linking x_e^d ≤ y_e between its use of edge e and
// e's opening; it drops reach, duct capacity, edge-group and node disjointness (each only
// removes plans), prices every edge at the cheapest of d's media that may use it, and counts
// the cheapest option cost of d. A charge (Problem.Charges) is a fixed charge split evenly over
// its edges (a route that uses k of its edges is credited k shares, and all users together at
// most the charge); an edge whose ducts are full (and may get more) has its first added duct
// and that duct's trench as a fixed charge, when every medium's cable takes duct area; other
// added ducts (a proposed edge's beyond those its opening lays among them) are priced at 0. So each edge e has a budget b_e.
//
// The dual gives each demand d a price w_e^d ≥ 0 on each edge, with Σ_d w_e^d ≤ b_e; any such
// prices bound every plan from below by Σ_d (option cost + legs × SP_d(c + w^d)), SP_d the
// cheapest path of d with edge weights c_e^d + w_e^d: a plan pays each used edge's budget at
// least once, which covers every w_e^d of the demands that use it (a diverse pair's legs share
// no edge, so they take each w_e^d at most once).
//
// Choosing the prices is the heuristic part. For each demand in turn, those with the cheapest
// free route first (dualPasses passes, a demand keeping its prices between passes), repeat:
// find the cheapest path; of its budgeted edges that lie on every cheapest path (counted from
// a search out of the free end and one back from the anchor), raise the one with the most
// budget left by exactly what the cheapest path then gains, so that no budget is spent that
// does not raise the bound; when there are none (every edge has an equally cheap way around
// it), raise the budgeted edges of every cheapest path together by the least budget left among
// them, and keep of each only max(0, |π_u − π_v| − c_e), π the new distances from the free end
// capped at the new level — feasible potentials, so the level is the new cheapest path, and a
// raise the path did not need goes back to the budget. The work (nodes and edges scanned) is
// capped; demands the ascent does not reach keep the bound of their cheapest path with every
// proposed edge free, plus the budgets of the edges all their paths take (forcedPrices, before
// any search).
//
// The bound holds for every plan that routes the same demands and gives each diverse demand
// at least as many legs as the plan does (the optimizer ranks unrouted demands and missing
// pairs before cost, so those are the plans it compares).

// dualPasses is the number of passes of the ascent.
const dualPasses = 2

// dualRaises bounds the raises of one demand in one pass.
const dualRaises = 200

// dualWork bounds the nodes and edges the ascent scans, over all passes: both passes on
// campuses of about 100 buildings, a fixed amount of work beyond (a quarter of it where
// demands × proposed spans exceed maxDualWork).
const dualWork = 6_000_000

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
	onPath [][]int32   // demand → budgeted edges of its cheapest path at its level
	// wanted lists the proposed edges some demand priced (their budget is partly or wholly
	// used: the dual says they may pay), fullest first; wantBy the demands that priced each.
	wanted []int32
	wantBy map[int32][]int32
	// optLevel is, for a demand of several options, each option's level: its cheapest leg
	// under that option's own costs and the demand's prices (optionLevels); nil for a demand
	// of one option, or without a level. -1 for an option that has no path.
	optLevel [][]int64
	passes   int   // passes completed
	work     int64 // nodes and edges scanned
}

// legCost returns c_e^d, the cheapest of demand d's media on edge e (cable and labour cents),
// or -1 when none may use it.
func (sv *solver) legCost(d int, e int32) int64 {
	return sv.legMin[sv.legSet[d]][e]
}

// initLegCosts tabulates legCost: per distinct set of demands' cost profiles, the cheapest
// of them on each edge (sv.legMin, indexed by sv.legSet per demand), so that the ascent's
// inner loop reads one array.
func (sv *solver) initLegCosts() {
	nd, ne := len(sv.p.Demands), len(sv.p.Edges)
	sv.legSet = make([]int32, nd)
	sv.legMin = sv.legMin[:0]
	seen := map[string]int32{}
	var key []byte
	for d := 0; d < nd; d++ {
		key = key[:0]
		for _, pi := range sv.optProf[d] {
			key = binary.AppendUvarint(key, uint64(pi))
		}
		i, ok := seen[string(key)]
		if !ok {
			i = int32(len(sv.legMin))
			seen[string(key)] = i
			m := make([]int64, ne)
			for e := range m {
				c := int64(-1)
				for _, pi := range sv.optProf[d] {
					if w := sv.profCent[pi][e]; w >= 0 && (c < 0 || w < c) {
						c = w
					}
				}
				m[e] = c
			}
			sv.legMin = append(sv.legMin, m)
		}
		sv.legSet[d] = i
	}
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

// freeLevels sets up legCost's table and returns each valid demand's free level (freeLevel;
// 0 for an invalid demand), what the ascent starts from.
func (sv *solver) freeLevels() []int64 {
	sv.initLegCosts()
	free := make([]int64, len(sv.p.Demands))
	sv.freeOpt = make([][]int64, len(sv.p.Demands))
	for d := range free {
		if sv.invalid[d] == "" {
			free[d] = sv.freeLevel(d)
			if n := len(sv.p.Demands[d].Options); n > 1 {
				// Each option's own free level, for optionLevels: read here, before the ascent
				// starts beside the solver, as the plain trees share the solver's scratch.
				sv.freeOpt[d] = make([]int64, n)
				for o := range n {
					sv.freeOpt[d][o] = sv.costTree(sv.to[d], sv.optProf[d][o]).dist[sv.from[d]]
				}
			}
		}
	}
	return free
}

// ascend computes the dual bound of the problem (nil for the length objective).
func (sv *solver) ascend() *dualBound {
	return sv.ascendAsync()()
}

// ascendAsync starts the ascent beside the caller and returns what waits for its result
// (nil for the length objective; run keeps it in waitDual, joinDual calls it). What the ascent reads of the solver is fixed once
// newSolver returns (the problem, the network, the cost profiles, the marks of invalid
// demands), or set up here before it starts (legCost's table, the free levels from the
// plain trees, which share the solver's search scratch), and it writes only its own
// dualBound and scratch: its result is the same whenever the other goroutine runs and
// whatever GOMAXPROCS is, and the solver may route demands meanwhile. It gives up when the
// solve's context is done (abandon, set by the waiter or by stopped); the waiter then
// returns nil, and the solve has stopped anyway.
func (sv *solver) ascendAsync() func() *dualBound {
	if sv.length {
		return func() *dualBound { return nil }
	}
	free := sv.freeLevels()
	out := make(chan *dualBound, 1)
	sv.abandon.Store(false)
	go func() { out <- sv.ascendFrom(free) }()
	return func() *dualBound {
		if sv.stopped() {
			sv.abandon.Store(true)
			return nil
		}
		select {
		case db := <-out:
			return db
		case <-sv.ctx.Done():
			sv.abandon.Store(true)
			sv.halted = true
			return nil
		}
	}
}

// joinDual takes the ascent's result (sv.dual) once it is needed: it waits for the ascent
// started by run, and does nothing after the first call. Until then sv.dual is nil, and the
// search neither stops on a closed gap nor tries the spans the dual prices. Where it is
// called is fixed (run, swapMoves, the end of run), never a matter of timing, so the plan is
// the same however the two goroutines are scheduled.
func (sv *solver) joinDual() {
	if sv.waitDual != nil {
		sv.dual = sv.waitDual()
		sv.waitDual = nil
	}
}

// dualSteers reports whether the dual steers the search from its start: on problems of up to
// maxDualWork demands × proposed spans, where open moves try the spans it prices
// (openCandidates) and a closed gap may end the search early. On larger ones the search runs
// without it until its first local optimum, and the ascent meanwhile on another core.
func (sv *solver) dualSteers() bool {
	return len(sv.p.Demands)*len(sv.proposed) <= maxDualWork
}

// newDualBound sets up the ascent: each edge's budget, all of it left, and each demand's level
// at its free level (-1 for an invalid demand).
func (sv *solver) newDualBound(free []int64) *dualBound {
	p := sv.p
	ne, nd := len(p.Edges), len(p.Demands)
	db := &dualBound{level: make([]int64, nd), budget: make([]int64, ne), uses: make([][]dualUse, nd), onPath: make([][]int32, nd), wantBy: map[int32][]int32{}}
	copy(db.budget, sv.fixedE)
	if sv.chOn {
		for _, ch := range p.Charges {
			share := ch.Cents / int64(len(ch.Edges))
			for _, e := range ch.Edges {
				db.budget[e] += share
			}
		}
	}
	// An edge whose ducts are full makes its first cable add a duct, and the trench for it:
	// a fixed charge on the edge, paid by any plan that uses it. Only when every option's
	// cable takes duct area (a cable of no diameter needs no duct).
	sized := true
	for _, dm := range p.Demands {
		for _, o := range dm.Options {
			sized = sized && o.CableODMM > 0
		}
	}
	for e := range p.Edges {
		if ed := &p.Edges[e]; sized && sv.limited[e] && ed.Ducts == 0 && ed.AddDuctPerMCents > 0 {
			db.budget[e] += sv.ductsCents(e, 1)
		}
	}
	db.rem = slices.Clone(db.budget)
	for d := range db.level {
		db.level[d] = -1
		if sv.invalid[d] == "" {
			db.level[d] = free[d]
		}
	}
	return db
}

// ascendFrom is the ascent from the demands' free levels (-1: no route; 0 for an invalid
// demand, whose level stays -1). It runs beside the solver (ascendAsync): it must not write
// the solver or call its searches.
func (sv *solver) ascendFrom(free []int64) *dualBound {
	db := sv.newDualBound(free)
	sv.forcedPrices(db, free)
	ne, nd := len(sv.p.Edges), len(sv.p.Demands)
	work := int64(dualWork)
	if nd*len(sv.proposed) > maxDualWork {
		work /= 4 // large campuses: the bound is looser, the solve stays fast
	}
	ds, dt := newDualSearch(sv.net.nodes, ne), newDualSearch(sv.net.nodes, 0)
	dt.w = ds.w // the search back from the anchor prices the same w^d
	var path []int32
	var raisedBuf, mustBuf []dualUse
	cnt := newPathCounts(sv.net.nodes)
	// The demands with the cheapest free route first: their searches are the smallest, so the
	// capped work reaches more of them, and each has fewer budgets to share. Against index
	// order, on the generated campuses of 100, 300 and 1,000 buildings: 20.6 → 16.5 %,
	// 52.3 → 47.0 % and 46.9 → 46.6 % gap, and on the CBC quality campus of make test the bound
	// 1.49 → 0.54 % below the optimum (dearest first: 25.1 %, 52.4 %, 46.6 %). (Measured with
	// every must-edge raised at once; see the raise below.)
	order := make([]int, nd)
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(free[a], free[b]) })
	for pass := 1; pass <= dualPasses; pass++ {
		for _, d := range order {
			if free[d] < 0 || db.level[d] < 0 || sv.abandon.Load() {
				continue
			}
			if db.work > work {
				return sv.optionLevels(db, ds, work+work/optionWorkShare).finish(nd)
			}
			for _, u := range db.uses[d] {
				ds.add(u.edge, u.cents)
			}
			s, t := int32(sv.from[d]), int32(sv.to[d])
			top := sv.dualRun(db, ds, d, s, t)
			for it := 0; top >= 0 && it < dualRaises; it++ {
				// First an edge on every cheapest path (a cut edge of the tight subgraph):
				// raising it raises the level, so no probe search is wasted on an edge with an
				// equally cheap way around it (the probes that failed were 48 % of the work on
				// the generated 300-building campus). Raising all of them at once and trimming
				// to the new distances took fewer searches still, but kept more budget than
				// the level gained: on 313 small test instances, run to the end, the bound was
				// lower on 37 and higher on 6 than one edge at a time.
				path = ds.pathTo(sv.net, t, path[:0])
				sv.dualRun(db, dt, d, t, s) // the search back from the anchor, for both steps
				must := cnt.mustEdges(sv, db, ds, dt, d, s, t, path, mustBuf[:0])
				mustBuf = must
				if len(must) > 0 {
					// The fullest: raising it gains (it is on every cheapest path), and keeping
					// exactly the gain spends no budget that does not raise the level.
					m := must[0]
					for _, u := range must[1:] {
						if u.cents > m.cents || u.cents == m.cents && u.edge < m.edge {
							m = u
						}
					}
					ds.add(m.edge, m.cents)
					top2 := sv.dualRun(db, ds, d, s, t)
					ds.w[m.edge] -= m.cents
					if gain := min(top2-top, m.cents); gain > 0 {
						ds.add(m.edge, gain)
						db.rem[m.edge] -= gain
						top = sv.dualRun(db, ds, d, s, t)
						continue
					}
					sv.dualRun(db, ds, d, s, t) // dt still holds the search back at these prices
				}
				raised := raisedBuf[:0]
				for _, v := range ds.popped {
					if !sv.net.transit(v, int(s)) {
						continue // no path goes on from v
					}
					du := ds.dist[v]
					for _, ar := range sv.net.adj[sv.net.start[v]:sv.net.start[v+1]] {
						e := ar.edge
						r := db.rem[e]
						if r <= 0 {
							continue
						}
						c := sv.legCost(d, e)
						if c < 0 {
							continue
						}
						if dv := dt.dist[ar.to]; dv >= 0 && dv < top && sv.net.transit(ar.to, int(s)) && du+c+ds.w[e]+dv == top || ar.to == t && du+c+ds.w[e] == top {
							raised = append(raised, dualUse{e, r})
						}
					}
				}
				slices.SortFunc(raised, func(a, b dualUse) int { return int(a.edge - b.edge) })
				raised = slices.CompactFunc(raised, func(a, b dualUse) bool { return a.edge == b.edge })
				// By the same amount each, the least budget left among them: a cut raised
				// evenly.
				step := int64(math.MaxInt64)
				for _, u := range raised {
					step = min(step, u.cents)
				}
				for i := range raised {
					raised[i].cents = step
					ds.add(raised[i].edge, step)
				}
				raisedBuf = raised
				if len(raised) == 0 {
					break
				}
				top2 := sv.dualRun(db, ds, d, s, t)
				if top2 <= top {
					for _, u := range raised {
						ds.w[u.edge] -= u.cents
					}
					break
				}
				sv.keepNeeded(db, ds, d, top2, raised)
				top = sv.dualRun(db, ds, d, s, t)
			}
			// The budgeted edges of d's cheapest path at its level: d wants them, priced or not
			// (another demand may have spent their budget).
			if top >= 0 && sv.dualRun(db, ds, d, s, t) >= 0 {
				db.onPath[d] = db.onPath[d][:0]
				for _, e := range ds.pathTo(sv.net, t, path[:0]) {
					if db.budget[e] > 0 {
						db.onPath[d] = append(db.onPath[d], e)
					}
				}
			}
			// Record d's prices (the edges priced above zero).
			uses := db.uses[d][:0]
			for _, e := range ds.wl {
				if ds.w[e] > 0 {
					uses = append(uses, dualUse{e, ds.w[e]})
				}
				ds.w[e], ds.wOn[e] = 0, false
			}
			ds.wl = ds.wl[:0]
			db.uses[d] = uses
			if top > db.level[d] {
				db.level[d] = top
			}
		}
		db.passes = pass
	}
	return sv.optionLevels(db, ds, work+work/optionWorkShare).finish(nd)
}

// optionWorkShare: optionLevels' searches may add work/optionWorkShare to the ascent's cap.
const optionWorkShare = 4

// optionLevels sets db.optLevel: for each demand of several options with a level, each
// option's cheapest leg under its own costs (cable and labour of that option, not the
// cheapest of the demand's options that legCost reads) plus the prices the demand holds. The
// dual's argument holds option by option: a plan that routes the demand in option o pays at
// least o's fixed part and, per leg, o's costs along the path plus the demand's prices, and
// the prices of all demands stay within the edges' budgets; so each option's level is a
// bound for a plan that takes that option, and the plan's bound takes the cheapest option
// whole (planBound), not the cheapest fixed part beside the cheapest costs per metre of
// another option. A demand that holds no prices takes its options' free levels (read before
// the ascent, freeLevels), and so does every demand once the searches have done limit work
// (the ascent's cap and a share more): each option's free level, or the demand's level where
// that is more, both at most the option's cheapest leg under the demand's prices, which is
// what a search would find. Each option's level is at least the demand's level, as its costs
// are at least legCost's. In demand order, the work counted, so the same whatever the timing.
// With the searches, on the demo and the generated 40-, 200- and 1,000-building campuses the
// gap reads 6.34, 9.80, 45.91 and 58.91 %; with free levels alone 9.25, 14.29, 54.36 and
// 58.91 % (the 1,000-building ascent spends its cap: no searches; uncapped they cost 0.26 s
// of CPU there for 0.6 points).
func (sv *solver) optionLevels(db *dualBound, ds *dualSearch, limit int64) *dualBound {
	nd := len(sv.p.Demands)
	db.optLevel = make([][]int64, nd)
	for d := range nd {
		opts := sv.freeOpt[d]
		if opts == nil || db.level[d] < 0 || sv.abandon.Load() {
			continue
		}
		lv := slices.Clone(opts)
		if len(db.uses[d]) > 0 && db.work <= limit {
			for _, u := range db.uses[d] {
				ds.add(u.edge, u.cents)
			}
			s, t := int32(sv.from[d]), int32(sv.to[d])
			for o := range lv {
				lv[o] = sv.dualRunOn(db, ds, sv.profCent[sv.optProf[d][o]], s, t)
			}
			for _, e := range ds.wl {
				ds.w[e], ds.wOn[e] = 0, false
			}
			ds.wl = ds.wl[:0]
		}
		for o := range lv {
			if lv[o] >= 0 {
				lv[o] = max(lv[o], db.level[d])
			}
		}
		db.optLevel[d] = lv
	}
	return db
}

// forcedPrices gives each single-leg demand, before any search, the whole budget left of the
// edges that every one of its paths takes (from its free end, as long as the node reached has
// exactly one other edge the demand may use: a building's only entrance and lateral), in
// demand order: each raise lifts every path of the demand, so its level, by as much. On
// campuses too large for the ascent to reach every demand it is most of what the bound gains
// (the generated 300-building campus: the budget of such edges is 69 million cents).
func (sv *solver) forcedPrices(db *dualBound, free []int64) {
	n := sv.net
	for d := range sv.p.Demands {
		if free[d] < 0 || db.level[d] < 0 || sv.p.Demands[d].Diverse {
			continue // a diverse pair's legs could not both take the edge: they have no route
		}
		s, t := int32(sv.from[d]), int32(sv.to[d])
		prev := int32(-1)
		steps := 0
		for v := s; v != t && steps < maxForced; steps++ {
			if v != s && !n.transit(v, int(s)) {
				break // no path passes v
			}
			next, way, ways := int32(-1), int32(-1), 0
			for _, a := range n.adj[n.start[v]:n.start[v+1]] {
				if a.edge != prev && a.to != v && sv.legCost(d, a.edge) >= 0 {
					next, way = a.to, a.edge
					ways++
				}
			}
			if ways != 1 || next == s {
				break
			}
			if r := db.rem[way]; r > 0 {
				db.uses[d] = append(db.uses[d], dualUse{way, r})
				db.rem[way] = 0
				db.level[d] += r
			}
			prev, v = way, next
		}
	}
}

// keepNeeded keeps of each raise in raised (edge, amount just added to ds.w) only what the
// search's new distances π need, capped at the new level top2: w_e = max(0, |π_u − π_v| − c_e).
// The potentials stay feasible, so top2 stays the level, and the rest goes back to the budget.
func (sv *solver) keepNeeded(db *dualBound, ds *dualSearch, d int, top2 int64, raised []dualUse) {
	pot := func(v int) int64 {
		if dv := ds.dist[v]; dv >= 0 && dv < top2 {
			return dv
		}
		return top2
	}
	for _, u := range raised {
		ed := &sv.p.Edges[u.edge]
		need := max(0, abs64(pot(ed.From)-pot(ed.To))-sv.legCost(d, u.edge))
		db.rem[u.edge] -= need - (ds.w[u.edge] - u.cents)
		ds.w[u.edge] = need
	}
}

// pathCounts is the scratch of mustEdges: per node, the number of cheapest paths from the
// free end (s) and to the anchor (t), modulo 2^64, valid where the stamps equal stamp.
type pathCounts struct {
	fromS, toT []uint64
	atS, atT   []uint32
	stamp      uint32
}

func newPathCounts(nodes int) *pathCounts {
	return &pathCounts{fromS: make([]uint64, nodes), toT: make([]uint64, nodes), atS: make([]uint32, nodes), atT: make([]uint32, nodes)}
}

// mustEdges appends to buf, each with its whole budget left, the budgeted edges of path (d's
// cheapest path at level top, from ds) that lie on every cheapest path: edge u→v does when
// N_s(u)·N_t(v) = N_s(t), N_s counting the cheapest paths from s over ds's settled nodes and
// N_t those to t over dt's (dt searched back from t). The counts are modulo 2^64 and assume
// positive edge costs; a wrong answer (a wrap, or equal distances over zero-cost edges) only
// costs a probe: the caller keeps of a raise exactly what the level gained.
func (pc *pathCounts) mustEdges(sv *solver, db *dualBound, ds, dt *dualSearch, d int, s, t int32, path []int32, buf []dualUse) []dualUse {
	pc.stamp++
	if pc.stamp == 0 {
		clear(pc.atS)
		clear(pc.atT)
		pc.stamp = 1
	}
	n := sv.net
	count := func(sr *dualSearch, root, goal int32, cnt []uint64, at []uint32) {
		for _, v := range sr.popped {
			at[v] = pc.stamp
			cnt[v] = 0
		}
		at[goal], cnt[goal] = pc.stamp, 0
		cnt[root] = 1
		for _, u := range sr.popped {
			if !n.transit(u, int(root)) {
				continue
			}
			du := sr.dist[u]
			for _, a := range n.adj[n.start[u]:n.start[u+1]] {
				if at[a.to] != pc.stamp || a.to == root {
					continue
				}
				c := sv.legCost(d, a.edge)
				if c >= 0 && du+c+sr.w[a.edge] == sr.dist[a.to] {
					cnt[a.to] += cnt[u]
				}
			}
		}
	}
	count(ds, s, t, pc.fromS, pc.atS)
	count(dt, t, s, pc.toT, pc.atT)
	total := pc.fromS[t]
	if total == 0 {
		return buf
	}
	for _, e := range path {
		r := db.rem[e]
		if r <= 0 {
			continue
		}
		ed := &n.edges[e]
		u, v := int32(ed.From), int32(ed.To)
		if ds.dist[u] > ds.dist[v] {
			u, v = v, u
		}
		if pc.atS[u] == pc.stamp && pc.atT[v] == pc.stamp && pc.fromS[u]*pc.toT[v] == total {
			buf = append(buf, dualUse{e, r})
		}
	}
	return buf
}

// finish lists the wanted edges.
func (db *dualBound) finish(nd int) *dualBound {
	for d := 0; d < nd; d++ {
		for _, u := range db.uses[d] {
			if db.budget[u.edge] > 0 {
				db.wantBy[u.edge] = append(db.wantBy[u.edge], int32(d))
			}
		}
		for _, e := range db.onPath[d] {
			db.wantBy[e] = append(db.wantBy[e], int32(d))
		}
	}
	for e, ds := range db.wantBy {
		db.wanted = append(db.wanted, e)
		slices.Sort(ds)
		db.wantBy[e] = slices.Compact(ds)
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
		best := fx + int64(legs)*db.level[d]
		if lv := db.optLevel[d]; lv != nil {
			// The cheapest option whole (optionLevels); at least best, as each term is.
			whole := int64(math.MaxInt64)
			for o, l := range lv {
				if l >= 0 {
					whole = min(whole, sv.optionCents(d, o, legs)+int64(legs)*l)
				}
			}
			if whole != math.MaxInt64 {
				best = max(best, whole)
			}
		}
		b += best
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
	if k.overfull != 0 || k.unrouted != 0 || k.unmet != 0 || k.atSite != 0 {
		return false
	}
	b := sv.planBound()
	return b > 0 && float64(k.total-b) <= 1e-9*float64(b)
}

// dualSearch is the scratch of the ascent's searches: distances, the edge each node was
// reached by, and the prices w^d of the demand being raised (wl lists the edges of w
// touched, so that they can be cleared).
type dualSearch struct {
	dist            []int64 // -1 when not reached
	pred            []int32 // edge a node was reached by, -1 for the root
	popped, touched []int32
	h               radixHeap // leaves in (key, item) order, as minHeap would
	w               []int64
	wl              []int32
	wOn             []bool
}

func newDualSearch(nodes, edges int) *dualSearch {
	ds := &dualSearch{dist: make([]int64, nodes), pred: make([]int32, nodes), w: make([]int64, edges), wOn: make([]bool, edges)}
	for i := range ds.dist {
		ds.dist[i] = -1
	}
	return ds
}

func abs64(x int64) int64 {
	if x < 0 {
		return -x
	}
	return x
}

// add raises the price of edge e by x.
func (ds *dualSearch) add(e int32, x int64) {
	if !ds.wOn[e] {
		ds.wOn[e] = true
		ds.wl = append(ds.wl, e)
	}
	ds.w[e] += x
}

// pathTo appends to buf the edges of the search's path from its root to v.
func (ds *dualSearch) pathTo(n *Network, v int32, buf []int32) []int32 {
	for ds.pred[v] >= 0 {
		e := ds.pred[v]
		buf = append(buf, e)
		if ed := &n.edges[e]; int32(ed.From) == v {
			v = int32(ed.To)
		} else {
			v = int32(ed.From)
		}
	}
	return buf
}

// dualRun runs Dijkstra from root over demand d's edges weighted c_e^d + w_e^d (ds.w),
// passing no transit-free node but the root, until it pops goal; it returns goal's distance,
// or -1 when goal cannot be reached.
func (sv *solver) dualRun(db *dualBound, ds *dualSearch, d int, root, goal int32) int64 {
	return sv.dualRunOn(db, ds, sv.legMin[sv.legSet[d]], root, goal)
}

// dualRunOn is dualRun over the edge costs cents (c_e^d: legCost's row of the demand, or one
// option's profile, profCent's row, for optionLevels), -1 on an edge they may not use.
func (sv *solver) dualRunOn(db *dualBound, ds *dualSearch, cents []int64, root, goal int32) int64 {
	n := sv.net
	for _, v := range ds.touched {
		ds.dist[v] = -1
	}
	ds.popped, ds.touched = ds.popped[:0], append(ds.touched[:0], root)
	ds.h.reset()
	ds.dist[root], ds.pred[root] = 0, -1
	ds.h.push(0, root)
	for ds.h.len() > 0 {
		k, v := ds.h.pop()
		if k > ds.dist[v] {
			continue
		}
		if v == goal {
			return k
		}
		ds.popped = append(ds.popped, v)
		db.work++
		if !n.transit(v, int(root)) {
			continue
		}
		for _, a := range n.adj[n.start[v]:n.start[v+1]] {
			db.work++
			c := cents[a.edge]
			if c < 0 {
				continue
			}
			nk := min(k+c+ds.w[a.edge], dualInf)
			if dv := ds.dist[a.to]; dv < 0 || nk < dv {
				if dv < 0 {
					ds.touched = append(ds.touched, a.to)
				}
				ds.dist[a.to], ds.pred[a.to] = nk, a.edge
				ds.h.push(nk, a.to)
			}
		}
	}
	return -1
}
