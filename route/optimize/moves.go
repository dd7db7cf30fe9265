package optimize

import (
	"math"
	"slices"
)

// The local search: reroute, close and open moves, the starts and the perturbation phase.

// reroute rips demand d up and routes it again; it keeps the new route only if the plan improves.
func (sv *solver) reroute(d int) bool {
	if sv.invalid[d] != "" {
		return false
	}
	before := sv.key()
	// No memo for a pair whose legs pass one place: what its searches find then depends on
	// the pair search's branching, not on costs alone (see memo.go).
	memo := sv.memoUsable() && sv.st.ch[d].opt >= 0 && sv.sharedSite(sv.st.ch[d].legs) == 0
	if memo && sv.memoHolds(d) {
		if sv.memoAudit {
			sv.auditMemo(d, before)
		}
		return false
	}
	var stay int64
	if memo {
		stay, memo = sv.stayWeight(d, sv.st.ch[d])
	}
	sig := sv.st.sig[d]
	if memo {
		sv.startRecord()
	}
	old, nb := sv.rebest(d)
	sv.rec = false
	if nb.opt == old.opt && choiceSig(nb) == sig {
		// The same choice again: nothing to try.
		sv.add(d, old)
		sv.flush()
		sv.memos[d].ok = false
		if memo {
			sv.remember(d, sig, stay)
		}
		return false
	}
	sv.memos[d].ok = false
	sv.add(d, nb)
	if sv.key().less(before) {
		return true
	}
	sv.remove(d)
	sv.add(d, old)
	sv.flush()
	return false
}

// auditMemo reroutes demand d although its memo holds, counts in memoWrong a reroute that
// would have improved the plan (the memo was wrong to skip it), and puts d back.
func (sv *solver) auditMemo(d int, before key) {
	sig := sv.st.sig[d]
	old, nb := sv.rebest(d)
	if choiceSig(nb) != sig {
		sv.add(d, nb)
		if sv.key().less(before) {
			sv.memoWrong++
		}
		sv.remove(d)
	}
	sv.add(d, old)
	sv.flush()
}

// rebest takes demand d out of the plan and returns its old choice and its best choice
// against the rest. The last flushed packing must still hold d's cable on its old route: the
// searches then see d's own place in the ducts of that route as free (see penalty). Where
// the old choice may stay, only a cheaper one is searched for (bestBelow), and none found
// keeps the old one: most reroutes find the demand's own route again.
func (sv *solver) rebest(d int) (old, nb choice) {
	old = sv.remove(d)
	sv.markOwn(d, old)
	stay := sv.stayCost(d, old)
	nb = sv.bestBelow(d, stay)
	if nb.opt < 0 && stay < math.MaxInt64 {
		nb = old
	}
	sv.endOwn()
	return old, nb
}

// stayCost is the objective of choice c for demand d against the current state (which must
// not contain d), as best weighs a choice; math.MaxInt64 when c may not stay (no route, an
// edge forbidden or without room for its cable), when it is a diverse demand's single route
// (best must look for a pair first, and any pair weighs more than one route) or a pair whose
// legs pass one place (Problem.Sites: any pair that does not wins, whatever it weighs), or
// under the length objective, which weighs routes in metres.
func (sv *solver) stayCost(d int, c choice) int64 {
	if c.opt < 0 || sv.length || (sv.p.Demands[d].Diverse && len(c.legs) < 2) || sv.sharedSite(c.legs) != 0 {
		return math.MaxInt64
	}
	if cost, barred := sv.weigh(d, c); barred == 0 {
		return cost
	}
	return math.MaxInt64
}

// weigh is choice c's objective for demand d against the current state, as best weighs a
// choice (its option's cents and its edges' weights for d), over the edges d may use now, and
// how many of its edge uses d may not (forbidden by a move, or without room for its cable).
// c must hold a route (c.opt >= 0).
func (sv *solver) weigh(d int, c choice) (cost int64, barred int) {
	w := sv.weightFor(d, c.opt)
	cost = sv.optionCents(d, c.opt, len(c.legs))
	for _, leg := range c.legs {
		for _, h := range leg {
			we, ok := w(int32(h.Edge))
			if !ok {
				barred++
				continue
			}
			cost += we
		}
	}
	return cost, barred
}

// markOwn records choice c of demand d as the cable the last flushed packing holds for d.
func (sv *solver) markOwn(d int, c choice) {
	sv.endOwn()
	if c.opt < 0 {
		return
	}
	sv.ownArea = circleMM2(sv.od(d, c.opt))
	for _, leg := range c.legs {
		for _, h := range leg {
			sv.own[h.Edge] = sv.ownSt
		}
	}
}

// endOwn ends the view of markOwn: no edge holds the new ownSt. The stamps start at 1 over
// zeroed marks (newSolver) and skip 0 when they wrap, clearing the marks: a stamp equal to the
// zeroed arrays' value would mark every edge as the rerouted demand's own (issue 16: before
// the first estimate, every proposed span used by exactly one demand was then charged in full
// to any other demand, which could not join it).
func (sv *solver) endOwn() {
	sv.ownSt++
	if sv.ownSt == 0 {
		clear(sv.own)
		sv.ownSt = 1
	}
}

// endSelf ends the in-place view of estimate: no edge or charge holds the new selfSt.
func (sv *solver) endSelf() {
	sv.selfSt++
	if sv.selfSt == 0 {
		clear(sv.self)
		clear(sv.chSelf)
		sv.selfSt = 1
	}
}

// keepOrRevert keeps the plan if it beats before, else puts ds back on their old choices.
func (sv *solver) keepOrRevert(ds []int32, olds []choice, before key) bool {
	if sv.key().less(before) {
		return true
	}
	for i := len(ds) - 1; i >= 0; i-- {
		sv.remove(int(ds[i]))
		sv.add(int(ds[i]), olds[i])
	}
	sv.flush() // swaps the saved packings back
	return false
}

// closeMoves tries closing each opened proposed edge. A move is abandoned as soon as the
// users rerouted so far cost more than the edge's FixedCents (and its charges) save and the
// construction those reroutes built, net of what they gave up, could give back (see
// closeSet), and a move that failed is not tried again until one of the edge's users changes
// route.
func (sv *solver) closeMoves() bool {
	changed := false
	for _, e := range sv.proposed {
		if sv.stopped() {
			break
		}
		if sv.st.count[e] == 0 {
			continue
		}
		save := sv.fixedE[e]
		if sv.chOn {
			for _, k := range sv.chargesOf(int(e)) {
				save += sv.p.Charges[k].Cents
			}
		}
		if sv.closeSet(e, []int32{e}, slices.Clone(sv.st.users[e]), save) {
			changed = true
		}
	}
	return changed
}

// chargeMoves tries, for each paid charge, forbidding all its edges and rerouting the demands
// that use them (a reroute alone never drops a charge that two demands share), the way
// closeMoves closes an edge.
func (sv *solver) chargeMoves() bool {
	changed := false
	for k := range sv.p.Charges {
		if sv.stopped() {
			break
		}
		ch := &sv.p.Charges[k]
		if sv.st.chUse[k] == 0 || ch.Cents == 0 {
			continue
		}
		var users []int32
		edges := make([]int32, 0, len(ch.Edges))
		for _, e := range ch.Edges {
			users = append(users, sv.st.users[e]...)
			edges = append(edges, int32(e))
		}
		slices.Sort(users)
		users = slices.Compact(users)
		// Demands without a diverse pair first: their reroutes are single searches, and the
		// move is abandoned as soon as what they cost exceeds the charge, often before any
		// pair search.
		single := slices.DeleteFunc(slices.Clone(users), func(d int32) bool { return sv.p.Demands[d].Diverse })
		users = append(single, slices.DeleteFunc(users, func(d int32) bool { return !sv.p.Demands[d].Diverse })...)
		if sv.closeSet(int32(-1-k), edges, users, ch.Cents) {
			changed = true
		}
	}
	return changed
}

// closeSet forbids edges, reroutes users and keeps the plan if it is cheaper. id names the
// move in failedClose (an edge index, or -1-charge); save is what the move may save at most
// besides the users' own costs, for abandoning it early.
func (sv *solver) closeSet(id int32, edges, users []int32, save int64) bool {
	st := sv.st
	sig := mix(uint64(id), 7)
	for _, d := range users {
		sig = mix(sig, st.sig[d])
	}
	if f, ok := sv.failedClose[id]; ok && f == sig {
		return false
	}
	before := sv.key()
	for _, e := range edges {
		sv.forbid[e] = true
	}
	// A user the forbidden edges cut off would be left unrouted, which no plan cost repays: the
	// move fails whatever the reroutes find, so it is not tried (a turn handhole at the tee of
	// a building's only lateral is the usual case).
	if !sv.joinedAll(users) {
		for _, e := range edges {
			sv.forbid[e] = false
		}
		sv.failedClose[id] = sig
		return false
	}
	// The move is abandoned once the users rerouted so far cost more than what closing can
	// save: the edges' own prices (save) and the construction the reroutes built, net of what
	// they gave up (a span opened, a first added duct's trench: state.paidCents), which the
	// users still to move may share: each of them is at its cheapest route now, so it gets
	// cheaper mostly by riding what the moved ones built. Without the second part the move
	// gave up where the first user's detour opened a trench the others would then take (the
	// generated 200-building campus with trench at 3 times the demo's price stayed 2-3 %
	// dearer: TestWarmBaseOrder). Counting what was built gross (a link leaving its own span
	// and taking it again counted it) cost up to 1.8 times the CPU at 100-200 buildings
	// (review 17 F1); counting the charges too (handholes, which nearly every detour pays)
	// kept every move going to its end. Since the total counts that construction too, the
	// test comes to: the reroutes' other costs (cable, labour, charges, further ducts) rose by
	// more than save. README Performance, "Where it stands (2026-12-05, 11:55)", has the
	// figures.
	paid0 := sv.st.paidCents
	olds := make([]choice, 0, len(users))
	var done []int32
	for _, d := range users {
		old, nb := sv.rebest(int(d))
		olds = append(olds, old)
		sv.add(int(d), nb)
		done = append(done, d)
		if k := sv.key(); k.overfull == before.overfull && k.unrouted == before.unrouted &&
			k.unmet == before.unmet && k.atSite == before.atSite && sv.inUse(edges) && k.total-before.total > save+sv.st.paidCents-paid0 {
			break
		}
	}
	for _, e := range edges {
		sv.forbid[e] = false
	}
	if sv.keepOrRevert(done, olds, before) {
		return true
	}
	sv.failedClose[id] = sig
	return false
}

// inUse reports whether any of edges carries a route.
func (sv *solver) inUse(edges []int32) bool {
	for _, e := range edges {
		if sv.st.count[e] > 0 {
			return true
		}
	}
	return false
}

type openCand struct {
	edges    []int32
	affected []int32
	key      string // the edges as bytes, for failedOpen
	// trench marks a run of existing edges whose next duct needs a trench (needsTrench): the
	// move prices those trenches free (trenchFree), not FixedCents.
	trench bool
}

// openCandidates lists runs of unopened proposed edges on the demands' unconstrained cheapest
// routes (from the lower-bound trees), each with the demands it may help; and, the same way,
// runs of existing edges on those routes where the demand's cable would need an added duct
// whose trench no cable has paid yet (needsTrench). The trench of the first added duct is a
// fixed charge as a proposed edge's FixedCents is: a lone reroute pays it whole, so without
// these moves the plan keeps the trunk its first routes filled, however dear its detours
// (tester 6's finding 3: on the generated 1,000-building campus the start's order alone moved
// the local optimum by 2.4 %, and a plan whose trunk took another street was 3.3 % cheaper).
func (sv *solver) openCandidates() []openCand {
	st := sv.st
	nd := len(sv.p.Demands)
	small := len(sv.proposed) <= 48 && nd <= 48
	if sv.valid == nil {
		for d := 0; d < nd; d++ {
			if sv.invalid[d] == "" {
				sv.valid = append(sv.valid, int32(d))
			}
		}
	}
	all := sv.valid
	if sv.optUsers == nil {
		sv.optUsers = make([][]int32, len(sv.proposed))
	}
	for i := range sv.optUsers {
		sv.optUsers[i] = sv.optUsers[i][:0]
	}
	if sv.trenchUsers == nil {
		sv.trenchUsers = make([][]int32, len(sv.p.Edges))
	}
	for _, e := range sv.trenchTouched {
		sv.trenchUsers[e] = sv.trenchUsers[e][:0]
	}
	sv.trenchTouched = sv.trenchTouched[:0]
	seen := map[string]bool{}
	var cands []openCand
	addCand := func(edges []int32, trench bool) {
		if len(edges) == 0 {
			return
		}
		sv.candBuf = append(sv.candBuf[:0], edges...)
		slices.Sort(sv.candBuf)
		k := string(int32Key(sv.candBuf))
		if trench {
			k = "t" + k // an edge's trench and its FixedCents are different moves
		}
		if seen[k] {
			return
		}
		seen[k] = true
		cands = append(cands, openCand{edges: slices.Clone(sv.candBuf), key: k, trench: trench})
	}
	run, whole := sv.runBuf[:0], sv.wholeBuf[:0]
	trun, twhole := sv.trenchRun[:0], sv.trenchWhole[:0]
	for _, d := range all {
		o := st.ch[d].opt
		if o < 0 {
			o = 0
		}
		area := circleMM2(sv.od(int(d), o))
		tr := sv.costTree(sv.to[d], sv.optProf[d][o])
		run, whole = run[:0], whole[:0]
		trun, twhole = trun[:0], twhole[:0]
		for v := sv.from[d]; tr.dist[v] >= 0 && tr.pred[v] >= 0; {
			e := tr.pred[v]
			if ed := &sv.p.Edges[e]; ed.From == v {
				v = ed.To
			} else {
				v = ed.From
			}
			if sv.needsTrench(e, area) {
				trun = append(trun, e)
				twhole = append(twhole, e)
				if len(sv.trenchUsers[e]) == 0 {
					sv.trenchTouched = append(sv.trenchTouched, e)
				}
				sv.trenchUsers[e] = append(sv.trenchUsers[e], d)
			} else {
				addCand(trun, true)
				trun = trun[:0]
			}
			if sv.fixedE[e] > 0 && st.count[e] == 0 {
				run = append(run, e)
				whole = append(whole, e)
				pi := sv.propIdx[e]
				sv.optUsers[pi] = append(sv.optUsers[pi], d)
				continue
			}
			addCand(run, false)
			run = run[:0]
		}
		addCand(run, false)
		addCand(whole, false)
		addCand(trun, true)
		addCand(twhole, true)
	}
	sv.runBuf, sv.wholeBuf = run, whole
	sv.trenchRun, sv.trenchWhole = trun, twhole
	if small {
		for _, e := range sv.proposed {
			if st.count[e] == 0 {
				addCand([]int32{e}, false)
			}
		}
	}
	// The spans the lower bound's dual prices (lowerbound.go): a demand would pay for them,
	// whether or not they lie on its cheapest route with every span free (a short closure
	// or gap-fill that pays on its own). Most wanted first.
	dualCands := sv.dual != nil && sv.dualSteers()
	if dualCands {
		n := 0
		for _, e := range sv.dual.wanted {
			if n >= maxDualCands {
				break
			}
			if sv.propIdx[e] >= 0 && st.count[e] == 0 {
				addCand([]int32{e}, false)
				n++
			}
		}
	}
	var nodeUsers [][]int32
	if dualCands && !small {
		nodeUsers = sv.nodeUsers()
	}
	for i := range cands {
		if small {
			cands[i].affected = all
			continue
		}
		var aff []int32
		for _, e := range cands[i].edges {
			if cands[i].trench {
				aff = append(aff, sv.trenchUsers[e]...)
				continue
			}
			aff = append(aff, sv.optUsers[sv.propIdx[e]]...)
			if dualCands {
				// The demands that priced it, and those whose routes pass its ends (the
				// dual's budget may have gone to one demand while several would share the
				// span), unless an end is a hub many routes pass.
				aff = append(aff, sv.dual.wantBy[e]...)
				for _, v := range [2]int{sv.p.Edges[e].From, sv.p.Edges[e].To} {
					if len(nodeUsers[v]) <= maxNodeUsers {
						aff = append(aff, nodeUsers[v]...)
					}
				}
			}
		}
		slices.Sort(aff)
		cands[i].affected = slices.Compact(aff)
	}
	return cands
}

// maxDualCands is the most dual-priced spans one pass of open moves tries besides the spans
// on cheapest routes; maxDualWork bounds demands × proposed spans for which it tries them
// (campuses of up to about 300 buildings: on larger ones their estimates cost more than
// the rest of the solve).
const (
	maxDualCands = 32
	maxDualWork  = 100000
)

// maxNodeUsers is the most routes through a span's end for which an open move of the span
// reroutes them all.
const maxNodeUsers = 64

// nodeUsers returns, per node, the demands whose routes pass it, ascending.
func (sv *solver) nodeUsers() [][]int32 {
	out := make([][]int32, sv.p.Nodes)
	for d, c := range sv.st.ch {
		for _, leg := range c.legs {
			for _, h := range leg {
				ed := &sv.p.Edges[h.Edge]
				for _, v := range [2]int{ed.From, ed.To} {
					if n := len(out[v]); n == 0 || out[v][n-1] != int32(d) {
						out[v] = append(out[v], int32(d))
					}
				}
			}
		}
	}
	return out
}

// needsTrench reports whether a cable of area areaMM2 routed over edge e would need an added
// duct whose trench no cable pays yet: an existing limited edge that may have ducts added,
// with none added and no room left for the cable.
func (sv *solver) needsTrench(e int32, areaMM2 float64) bool {
	ed := &sv.p.Edges[e]
	return sv.limited[e] && !ed.Proposed && ed.canAdd() && sv.trenchCent[e] > 0 && sv.st.added[e] == 0 &&
		(sv.cap.fits != nil || areaMM2 > sv.st.free[e]+1e-9)
}

// opens reports whether opening candidate c would open its edge e, one not open yet: for a
// run of trenches an edge with no duct added yet, else an edge no cable uses.
func (sv *solver) opens(c *openCand, e int32) bool {
	if c.trench {
		return sv.st.added[e] == 0
	}
	return sv.st.count[e] == 0
}

// openCost is what opening candidate c would cost besides its demands' own: the FixedCents
// of its unopened edges, or the trenches of its edges with no duct added yet (opens).
func (sv *solver) openCost(c *openCand) int64 {
	var cost int64
	for _, e := range c.edges {
		switch {
		case !sv.opens(c, e):
		case c.trench:
			cost += sv.trenchCent[e]
		default:
			cost += sv.fixedE[e]
		}
	}
	return cost
}

// holdOpen prices candidate c's edges as opened (on) or as they are (off) for the searches:
// phantom proposed edges, or free trenches.
func (sv *solver) holdOpen(c *openCand, on bool) {
	for _, e := range c.edges {
		if c.trench {
			sv.trenchFree[e] = on
		} else {
			sv.setPhantom(e, on)
		}
	}
}

func int32Key(es []int32) []byte {
	b := make([]byte, 0, 4*len(es))
	for _, e := range es {
		b = append(b, byte(e), byte(e>>8), byte(e>>16), byte(e>>24))
	}
	return b
}

// saveBound returns an upper bound of what demand d could save by any reroute once the
// proposed edges open are opened, as the searches price it: its current cost share (option,
// cable and labour, edges only it opened, the added ducts it likely holds alone, see
// holdsLastDuct) less a lower bound of its cost after the opening. The trench of an edge
// every route of it takes (forcedFrom: its building's only entrance and lateral) that only it
// uses is paid after any reroute too, so it is not a saving; the duct its cable added there
// is (another of its media may need none).
// Diverse demands still without a pair get no bound (math.MaxInt64 / 4).
//
// The lower bound is the plan tree's (bound.go) less the shortcut each opened edge offers
// towards the anchor: with T the tree distances and w the edge's base weight, a path that
// takes edge {a, b} from a to b saves at most σ = T(a) − w − T(b) over T, since every other
// edge of the path costs at least the T difference of its ends. A pair's legs share no edge,
// so a pair costs at least 2·T(s) − Σσ.
//
// The parts that do not depend on open are kept per demand until the plan changes (sbVer).
func (sv *solver) saveBound(d int, open []int32) int64 {
	st := sv.st
	dm := &sv.p.Demands[d]
	off := sv.optOff[d]
	if sv.sbAt[d] != sv.sbVer {
		sv.sbAt[d] = sv.sbVer
		c := st.ch[d]
		sv.sbCur[d] = -1
		if c.opt < 0 || (dm.Diverse && len(c.legs) < 2) {
			return math.MaxInt64 / 4
		}
		cur := c.varCost + sv.optionCents(d, c.opt, len(c.legs))
		area := circleMM2(sv.od(d, c.opt))
		forced := sv.forcedFrom(d)
		for _, leg := range c.legs {
			for _, h := range leg {
				// The trench of a forced edge only d uses: every route of d pays it as this one
				// does. (Its added duct is still counted: another medium of d may need none.)
				if sv.fixedE[h.Edge] > 0 && st.count[h.Edge] == 1 && !slices.Contains(forced, int32(h.Edge)) {
					cur += sv.fixedE[h.Edge]
				}
				if sv.limited[h.Edge] && st.added[h.Edge] > 0 && sv.holdsLastDuct(int32(h.Edge), area) {
					cur += sv.lastDuctCents(h.Edge)
				}
			}
		}
		if sv.chOn {
			own, _ := sv.ownCharges(c) // leaves chCnt counting c's uses of each charge
			cur += own
			for _, e := range forced {
				for _, k := range sv.chargesOf(int(e)) {
					if sv.chMark[k] == sv.chStamp && st.chUse[k] == sv.chCnt[k] {
						cur -= sv.p.Charges[k].Cents
					}
				}
			}
		}
		sv.sbCur[d] = cur
		for o := range dm.Options {
			sv.sbTree[off+o] = sv.bound(sv.to[d], sv.optProf[d][o]).t
		}
	}
	cur := sv.sbCur[d]
	if cur < 0 {
		return math.MaxInt64 / 4
	}
	lb := int64(math.MaxInt64)
	for o := range dm.Options {
		prof := sv.optProf[d][o]
		tr := sv.sbTree[off+o]
		t := tr.dist[sv.from[d]]
		if t < 0 {
			continue
		}
		if dm.Diverse {
			t *= 2
		}
		base := sv.profBase[prof]
		for _, e := range open {
			if base[e] < 0 {
				continue
			}
			ed := &sv.p.Edges[e]
			ta, tb := tr.dist[ed.From], tr.dist[ed.To]
			if ta < 0 || tb < 0 {
				continue
			}
			t -= max(0, ta-base[e]-tb, tb-base[e]-ta)
		}
		lb = min(lb, max(t, 0)+dm.Options[o].FixedCents)
	}
	return max(0, cur-lb)
}

// forcedFrom returns the edges every route of demand d takes, in order from its free end: as
// long as the node reached has exactly one other edge that any of d's media may use (a
// building's only entrance and the lateral to the street), up to the anchor. They depend on the
// network and d's media only (not on the plan or on forbidden edges) and are found once.
func (sv *solver) forcedFrom(d int) []int32 {
	if sv.forcedOK == nil {
		sv.forced = make([][]int32, len(sv.p.Demands))
		sv.forcedOK = make([]bool, len(sv.p.Demands))
	}
	if sv.forcedOK[d] {
		return sv.forced[d]
	}
	sv.forcedOK[d] = true
	usable := func(e int32) bool {
		for _, pi := range sv.optProf[d] {
			if sv.profBase[pi][e] >= 0 {
				return true
			}
		}
		return false
	}
	n := sv.net
	var chain []int32
	prev := int32(-1)
	for v := int32(sv.from[d]); v != int32(sv.to[d]) && len(chain) < maxForced; {
		next, way, ways := int32(-1), int32(-1), 0
		for _, a := range n.adj[n.start[v]:n.start[v+1]] {
			if a.edge != prev && a.to != v && usable(a.edge) {
				next, way = a.to, a.edge
				ways++
			}
		}
		if ways != 1 || slices.Contains(chain, way) {
			break
		}
		chain = append(chain, way)
		prev, v = way, next
	}
	sv.forced[d] = chain
	return chain
}

// maxForced bounds the edges forcedFrom follows from one demand's free end.
const maxForced = 64

// estimate returns how much demand d would save by rerouting under the current move (phantom
// and forbidden edges), computed without taking d out of the plan: an edge only d uses is
// charged as unopened, and the duct penalties count d's own cable, so it is an estimate used to
// screen moves before they are tried for real. It never changes the plan.
func (sv *solver) estimate(d int) int64 {
	st := sv.st
	c := st.ch[d]
	if c.opt < 0 || sv.invalid[d] != "" {
		return 0
	}
	sv.viewInPlace(d, c)
	defer sv.endOwn()
	dm := &sv.p.Demands[d]
	cur, barred := sv.weigh(d, c)
	cur += int64(barred) * (math.MaxInt64 / 8) // forbidden by the move: leaving it is a must
	below := cur                               // a route that saves nothing is not wanted
	useful := int64(math.MaxInt64)
	if dm.Diverse && (len(c.legs) < 2 || sv.sharedSite(c.legs) != 0) {
		below = math.MaxInt64 // bestBelow with a limit looks for pairs only, or cheaper ones
		if len(c.legs) == 2 && !sv.length && sv.siteBoundAll(d) {
			// Every pair of d passes a place (siteBound), as its own does: only a pair
			// weighing less than cur saves anything, and no other answer does.
			useful = cur
		}
	}
	nb := sv.bestOf(d, below, useful)
	defer sv.endSelf() // end the in-place view
	if nb.opt < 0 || (dm.Diverse && len(nb.legs) < len(c.legs)) {
		return 0
	}
	nc, _ := sv.weigh(d, nb)
	return max(0, cur-nc)
}

// viewInPlace starts the in-place view of demand d, still in the plan on choice c, that
// estimate weighs it in: its edges and charges as its own (self: what leaving them saves) and
// its cable's place in the ducts as its own (markOwn). endSelf and endOwn end it.
func (sv *solver) viewInPlace(d int, c choice) {
	sv.endSelf()
	for _, leg := range c.legs {
		for _, h := range leg {
			sv.self[h.Edge] = sv.selfSt
		}
	}
	if sv.chOn {
		sv.scanCharges(c)
		for _, k := range sv.chTouch {
			sv.chSelf[k] = selfUses{st: sv.selfSt, n: sv.chCnt[k]}
		}
	}
	sv.markOwn(d, c)
}

// estKey names an estimate: a candidate run (openCand.key) and a demand.
type estKey struct {
	cand string
	d    int32
}

// estRec is an estimate kept for a later pass over the candidates.
type estRec struct {
	sig  uint64 // the demand's choice then
	stay int64  // what staying cost it then
	gain int64
}

// estimateFor is estimate under the candidate run named cand, kept for later passes: on
// problems too large for every candidate to concern every demand, an estimate is reused
// while the demand keeps its choice and staying costs it the same. Other demands' moves may
// have changed the estimate meanwhile; it only screens moves, which are judged on the exact
// cost when tried.
func (sv *solver) estimateFor(cand string, d int) int64 {
	c := sv.st.ch[d]
	small := len(sv.proposed) <= 48 && len(sv.p.Demands) <= 48
	if small || c.opt < 0 {
		return sv.estimate(d)
	}
	stay, ok := sv.stayWeight(d, c)
	if !ok {
		return sv.estimate(d)
	}
	k := estKey{cand, int32(d)}
	if r, found := sv.estMemo[k]; found && r.sig == sv.st.sig[d] && r.stay == stay {
		return r.gain
	}
	g := sv.estimate(d)
	sv.estMemo[k] = estRec{sig: sv.st.sig[d], stay: stay, gain: g}
	return g
}

// openMoves tries opening each candidate run. A candidate whose affected demands could not
// together save the FixedCents of its unopened edges (by saveBound) is skipped; so is one
// whose estimated savings, with the bounds of the demands not yet estimated, fall short. A
// move that failed is not tried again until an affected demand changes route, and in the
// same call no other run is tried for exactly the same demands on the same routes.
func (sv *solver) openMoves() bool {
	changed := false
	// Affected sets (with their demands' choices) of the moves tried in vain in this call:
	// another run of trenches for the same demands, from the same plan, is not tried.
	tried := map[uint64]bool{}
	sv.sbVer++
	large := len(sv.p.Demands)*len(sv.proposed) > maxKickWork
	for _, c := range sv.openCandidates() {
		if sv.stopped() {
			break
		}
		if c.trench && sv.trenchWork > trenchBudget*len(sv.p.Demands) {
			continue
		}
		st := sv.st
		openCost := sv.openCost(&c)
		sig := mix(0, 11)
		for _, e := range c.edges {
			if sv.opens(&c, e) {
				sig = mix(sig, uint64(e))
			}
		}
		if openCost == 0 || len(c.affected) == 0 {
			continue
		}
		var bound int64
		bounds := sv.bounds[:0]
		for _, d := range c.affected {
			b := sv.saveBound(int(d), c.edges)
			bounds = append(bounds, b)
			bound += b
			sig = mix(sig, st.sig[d])
		}
		sv.bounds = bounds
		if bound <= openCost {
			continue
		}
		k := c.key
		if f, ok := sv.failedOpen[k]; ok && f == sig {
			continue
		}
		sv.holdOpen(&c, true)
		// Estimate the demands that may save most first, so that either test ends early.
		ord := sv.ord[:0]
		for i := range c.affected {
			ord = append(ord, int32(i))
		}
		slices.SortFunc(ord, func(a, b int32) int {
			if bounds[a] != bounds[b] {
				if bounds[a] > bounds[b] {
					return -1
				}
				return 1
			}
			return int(a - b)
		})
		sv.ord = ord
		var gain, seen int64 // the savings estimated, and the bounds of the demands estimated
		barren := 0          // estimates in a row that found no saving
		for n, i := range ord {
			if sv.stopped() {
				break
			}
			g := sv.estimateFor(c.key, int(c.affected[i]))
			if c.trench {
				sv.trenchWork++
			}
			gain += g
			bound -= bounds[i]
			if g == 0 {
				barren++
			} else {
				barren = 0
			}
			seen += bounds[i]
			if gain > openCost || gain+bound <= openCost || (large && ((barren >= maxBarren && 2*gain < openCost) || fallsShort(gain, seen, bound, openCost, n))) {
				break
			}
		}
		if gain <= openCost {
			sv.holdOpen(&c, false)
			sv.failedOpen[k] = sig
			continue
		}
		aff := mix(0, 13)
		for _, d := range c.affected {
			aff = mix(mix(aff, uint64(d)), st.sig[d])
		}
		if tried[aff] {
			sv.holdOpen(&c, false)
			continue
		}
		if c.trench {
			sv.trenchWork += len(c.affected)
		}
		before := sv.key()
		olds := make([]choice, len(c.affected))
		for i, d := range c.affected {
			var nb choice
			olds[i], nb = sv.rebest(int(d))
			sv.add(int(d), nb)
		}
		sv.holdOpen(&c, false)
		if sv.keepOrRevert(c.affected, olds, before) {
			changed = true
			sv.sbVer++
		} else {
			sv.failedOpen[k] = sig
			tried[aff] = true
		}
	}
	return changed
}

// trenchBudget bounds, per demand per solve, the estimates and reroutes of open moves that
// price added ducts' trenches free (openCand.trench); a move is not started once they are
// spent. Unbounded, the generated 5,000-building plan spent 397,000 (256,000 estimates, 519
// moves) for a plan 0.5 % cheaper at 62 % more CPU; with 12 it spends about 60,000, its plan
// is 0.47 % cheaper than without these moves (189,131,606.79 against 190,026,638.54 USD) at
// 1-2 % more CPU (GNU time side by side: 67.5 and 68.2 s user against 65.4 and 68.0). The
// 1,000-building plan (13,900 unbounded) then costs 20,052,712.72 USD (16: 20,070,176.86;
// 10: 20,165,646.09; 8: 20,473,655.00), below the 20,082,233.74 of a warm start from an
// older plan.
const trenchBudget = 12

// maxBarren is, on problems too large for the perturbation phase (demands × proposed edges
// above maxKickWork), the most estimates in a row that may find no saving before an open move
// is given up, unless the savings found so far reach half its trench: the affected demands
// are estimated in order of their saving bounds, which on such campuses are loose (a
// candidate run concerns some 90 demands at 5,000 buildings, and refuting it cost about 75
// estimates). A move given up is recorded as failed (failedOpen) like one refuted: it is
// tried again only when one of its demands changes route. On the generated 5,000-building
// campus, 16 (without the half-trench proviso) cut the estimates from 409,000 to 138,000 and
// raised the plan cost by 0.06 % (8: 70,000 and 0.16 %); the 1,000-building plan was the
// same. Smaller problems estimate as before: their moves are checked against the exact
// optimum (make soak).
const maxBarren = 16

// fallsShort reports whether an open move's savings, projected from the n+1 demands estimated
// so far over the rest, fall short of half its trench, on problems too large for the
// perturbation phase (as maxBarren): the savings found (gain) are scaled by the affected
// demands' saving bounds, those estimated (seen) and the rest (rest), as if the estimates took
// a like share of every bound. The demands are estimated in order of their bounds, so the projection
// leans high. It is made from minProjected estimates on. On the 1,000-building generated
// campus's price sweep of 6 scenarios it cut the estimates by 20-68 % and the nodes the
// searches settle by 5-44 %; the 100 scenarios' plans cost 0.016 % less on average
// (from 0.61 % less to 0.23 % more); at 5,000 buildings the estimates fell from 167,000 to
// 69,000, the nodes settled by 30 %, and the plan cost 0.08 % less.
func fallsShort(gain, seen, rest, openCost int64, n int) bool {
	return n+1 >= minProjected && seen > 0 && 2*float64(gain)*float64(seen+rest) < float64(openCost)*float64(seen)
}

// minProjected is the fewest estimates from which fallsShort projects.
const minProjected = 8

// swapWidth is the number of spans swapMoves tries in place of each opened span.
const swapWidth = 6

// swapMoves tries, at a local optimum of the other moves, exchanging an opened span for an
// unopened one that the lower bound's dual prices (lowerbound.go) for some of its users:
// close the one (forbid it), open the other (free), reroute the users of the first and the
// demands that priced the second, then reroute them again at the plan's real prices; keep the
// plan if it is cheaper. A swap that failed is not tried again until one of its demands
// changes route. The reroutes are bounded by swapBudget × demands per solve.
func (sv *solver) swapMoves() bool {
	sv.joinDual()
	db := sv.dual
	if db == nil || len(db.wanted) == 0 {
		return false
	}
	changed := false
	limit := swapBudget * max(len(sv.p.Demands), 1)
	for _, out := range sv.proposed {
		if sv.stopped() || sv.swapWork > limit || sv.gapClosed() {
			break
		}
		st := sv.st
		if st.count[out] == 0 {
			continue
		}
		users := slices.Clone(st.users[out])
		tried := 0
		for _, in := range db.wanted {
			if tried >= swapWidth || sv.swapWork > limit {
				break
			}
			if sv.propIdx[in] < 0 || st.count[in] > 0 || in == out || !sharesAny(db.wantBy[in], users) {
				continue
			}
			tried++
			moved := append(slices.Clone(users), db.wantBy[in]...)
			slices.Sort(moved)
			moved = slices.Compact(moved)
			sig := mix(mix(uint64(out), uint64(in)), 19)
			for _, d := range moved {
				sig = mix(sig, st.sig[d])
			}
			k := [2]int32{out, in}
			if f, ok := sv.failedSwap[k]; ok && f == sig {
				continue
			}
			if sv.trySwap(out, in, users, moved) {
				changed = true
				break
			}
			sv.failedSwap[k] = sig
		}
	}
	return changed
}

// trySwap makes the swap of swapMoves and keeps it if the plan is cheaper.
func (sv *solver) trySwap(out, in int32, users, moved []int32) bool {
	before := sv.key()
	sv.forbid[out] = true
	if !sv.joinedAll(users) {
		sv.forbid[out] = false
		return false
	}
	sv.setPhantom(in, true)
	olds := make([]choice, len(moved))
	done := 0
	for i, d := range moved {
		if sv.stopped() {
			break
		}
		var nb choice
		olds[i], nb = sv.rebest(int(d))
		sv.add(int(d), nb)
		done++
	}
	moved = moved[:done]
	sv.setPhantom(in, false)
	sv.flush()
	for _, d := range moved {
		if sv.stopped() {
			break
		}
		sv.reroute(int(d))
	}
	sv.forbid[out] = false
	sv.swapWork += 2 * len(moved)
	if sv.key().less(before) {
		sv.sbVer++
		return true
	}
	for i := len(moved) - 1; i >= 0; i-- {
		sv.remove(int(moved[i]))
	}
	for i, d := range moved {
		sv.add(int(d), olds[i])
	}
	sv.flush()
	sv.newEpoch() // memos recorded during the swap describe another plan
	return false
}

// swapBudget bounds swapMoves' reroutes per demand per solve.
const swapBudget = 4

// sharesAny reports whether the ascending lists a and b share an element.
func sharesAny(a, b []int32) bool {
	i, j := 0, 0
	for i < len(a) && j < len(b) {
		switch {
		case a[i] == b[j]:
			return true
		case a[i] < b[j]:
			i++
		default:
			j++
		}
	}
	return false
}

// improve runs local search rounds on the current state.
func (sv *solver) improve() int {
	rounds := 0
	moves := !sv.length && len(sv.proposed) > 0
	for rounds < sv.maxRounds && !sv.stopped() {
		rounds++
		sv.roundNo++
		changed := false
		for d := range sv.p.Demands {
			if sv.stopped() {
				break
			}
			if sv.reroute(d) {
				changed = true
			}
			if sv.shorten(d) {
				changed = true
			}
		}
		if moves {
			if sv.closeMoves() {
				changed = true
			}
			if sv.openMoves() {
				changed = true
			}
		}
		if sv.chOn && !sv.stopped() && sv.chargeMoves() {
			changed = true
		}
		if moves && !changed && !sv.stopped() && !sv.gapClosed() && sv.swapMoves() {
			changed = true
		}
		if !changed && !sv.stopped() && !sv.gapClosed() && sv.ejectMoves() {
			changed = true
		}
		if !changed || sv.optima[sv.st.planH] || sv.gapClosed() {
			break // a local optimum, or one the perturbation phase has reached before (kicks)
		}
	}
	return rounds
}

// start routes every demand in order; with open, every proposed edge and every charge is free
// in this pass.
func (sv *solver) start(open bool) { sv.startFree(open, false) }

// startFree is start, with also, when trench, the trench of every existing edge's first added
// duct free in this pass: one trench beside a full duct bank serves every cable laid in it,
// which demands placed one by one at its full price do not find together.
func (sv *solver) startFree(open, trench bool) {
	sv.st = newState(sv)
	sv.recount()
	for _, e := range sv.proposed {
		sv.setPhantom(e, open)
	}
	if trench {
		for e := range sv.p.Edges {
			sv.trenchFree[e] = sv.addsTrench(e)
		}
	}
	sv.chFree = open
	for d := range sv.p.Demands {
		if sv.stopped() {
			break
		}
		sv.place(d)
	}
	sv.chFree = false
	for _, e := range sv.proposed {
		sv.setPhantom(e, false)
	}
	clear(sv.trenchFree)
	sv.flush()
	sv.newEpoch()
}

// addsTrench reports whether existing edge e may get ducts whose first one needs a trench.
func (sv *solver) addsTrench(e int) bool {
	return sv.limited[e] && !sv.p.Edges[e].Proposed && sv.trenchCent[e] > 0
}

// hasTrench reports whether some existing edge may get ducts in a trench (addsTrench).
func (sv *solver) hasTrench() bool {
	for e := range sv.p.Edges {
		if sv.addsTrench(e) {
			return true
		}
	}
	return false
}

// place adds demand d's best choice to the plan. The searches estimate duct fill, so the exact
// packing may find that the cable does not fit an edge where no duct can be added; the edge is
// then forbidden for d and d routed again, a few times, before d is left unrouted.
func (sv *solver) place(d int) {
	before := sv.key().overfull
	var banned []int
	defer func() {
		for _, e := range banned {
			sv.forbid[e] = false
		}
	}()
	for try := 0; try < 4; try++ {
		c := sv.best(d)
		sv.add(d, c)
		full := sv.fullEdges(c, before)
		if full == nil {
			return
		}
		for _, e := range full {
			if !sv.forbid[e] {
				sv.forbid[e] = true
				banned = append(banned, e)
			}
		}
		sv.remove(d)
	}
	sv.add(d, choice{opt: -1})
}

func (sv *solver) run() {
	// The lower bound is computed beside the search (ascendAsync) and taken where it is first
	// needed (joinDual): after the first start on problems whose open moves try the spans it
	// prices, else at the first local optimum (swapMoves) or at the end.
	sv.waitDual = sv.ascendAsync()
	defer sv.joinDual()
	warm := len(sv.warm) > 0
	if warm {
		sv.startWarm()
	} else {
		sv.start(false)
	}
	if sv.placeOnly {
		return
	}
	if sv.dualSteers() {
		sv.joinDual()
	}
	if !sv.gapClosed() {
		sv.rounds = sv.improve()
	}
	fixed := len(sv.proposed) // proposed edges and, priced, charges: what a start may open
	if sv.chOn {
		fixed += len(sv.p.Charges)
	}
	if sv.length || fixed == 0 || sv.stopped() || sv.gapClosed() {
		return
	}
	if !warm {
		if n := len(sv.p.Demands) * fixed; n > maxSecondStart {
			// Too large for the second start below and the kicks, but not for a second start
			// with the trenches beside full duct banks free too, where there are any: the
			// count of sound pulls fills banks, and a cold plan of the generated 200-building
			// campus with trench at 3 times the price was 5-9 % dearer than one warm-started
			// from the routes of cheap trench (TestWarmBaseOrder; with only those trenches
			// free, 5-8 %; with them, the proposed spans and the charges, within 1.5 %).
			if n <= maxTrenchStart && sv.hasTrench() {
				sv.flush()
				first := sv.st
				sv.startFree(true, true)
				sv.rounds += sv.improve()
				if !sv.stopped() {
					sv.keepCheaper(first)
				}
			}
			return
		}
		sv.flush()
		first := sv.st
		sv.start(true)
		sv.rounds += sv.improve()
		if sv.stopped() {
			return
		}
		sv.keepCheaper(first)
	}
	if warm {
		// A warm start is an earlier plan's local optimum, which had its second start and its
		// kicks where the problem is small enough; kicking again from it would search a warm
		// plan harder than a cold one and rank a sweep's scenarios by their search effort (on
		// the generated 200-building campus: a warm scenario 0.6-1 % cheaper than the same
		// problem cold, at 8-15 times the CPU; README "Sweeps with a warm start").
		return
	}
	if len(sv.proposed) > 0 && len(sv.p.Demands)*len(sv.proposed) <= maxKickWork && !sv.gapClosed() {
		sv.kicks()
	}
}

// keepCheaper keeps the cheaper of the plan first and the current one (the current one on a
// tie is dropped: first was found first), and drops the other.
func (sv *solver) keepCheaper(first *state) {
	if sv.key().less(first.key()) {
		sv.dropState(first)
		return
	}
	second := sv.st
	sv.st = first
	sv.dropState(second)
	sv.recount()
	sv.newEpoch()
}

// maxSecondStart bounds demands × proposed edges for which Solve also starts from the plan with
// every proposed edge free; on larger problems the second start seldom wins and doubles the time.
const maxSecondStart = 100000

// maxTrenchStart bounds demands × (proposed edges and charges) for which Solve, beyond
// maxSecondStart, also starts from the plan with the trenches beside full duct banks, the
// proposed edges and the charges free (run), without the kicks: it doubles the time of the
// search, which on the generated 1,000-building campus (above the bound: its plan is the same
// byte for byte with the bound at 0) is not spent.
const maxTrenchStart = 1000000

// maxKickWork bounds demands × proposed edges for which Solve runs the perturbation phase:
// campuses of up to about 300 buildings with a third of their spans proposed. On the 24
// generated campuses of 100–300 buildings of make soak, the perturbation phase lowered the
// plan on 11 (by up to 2.6 %, on 223 buildings) at up to about 1 s a solve, where the earlier
// bound of 20,000 (about 150 buildings) left them at the plain local optimum; larger campuses
// would spend more than they gain.
const maxKickWork = 200000

// restore rebuilds the state from saved choices.
func (sv *solver) restore(saved []choice) {
	old := sv.st
	sv.st = newState(sv)
	sv.dropState(old)
	sv.recount()
	for d, c := range saved {
		sv.add(d, c)
	}
	sv.flush()
	sv.newEpoch()
}

// kicks is an iterated local search for small problems: from the local optimum, force a
// change — open a candidate run of proposed edges for everyone, or forbid an opened edge —
// descend again from there, and keep the result only if it beats the optimum it started from.
// A run whose demands could not together save its FixedCents (saveBound) is not kicked open.
// It catches trades that no single move finds, such as closing two edges while opening two
// others. It repeats while a kick succeeds, at most Settings.MaxRounds times.
func (sv *solver) kicks() {
	// Local optima reached so far: a descent that reaches one again would end there as before.
	sv.optima = map[uint64]bool{sv.st.planH: true}
	defer func() { sv.optima = nil }()
	was := sv.plainBounds
	sv.plainBounds = true
	defer func() { sv.plainBounds = was }()
	for pass := 0; pass < sv.maxRounds && !sv.stopped(); pass++ {
		improved := false
		var all []int32
		for d := range sv.p.Demands {
			if sv.invalid[d] == "" {
				all = append(all, int32(d))
			}
		}
		type kick struct {
			open  openCand
			close int32
		}
		var ks []kick
		for _, c := range sv.openCandidates() {
			ks = append(ks, kick{open: c, close: -1})
		}
		for _, e := range sv.proposed {
			if sv.st.count[e] > 0 {
				ks = append(ks, kick{close: e})
			}
		}
		for _, k := range ks {
			if sv.stopped() || sv.gapClosed() {
				return
			}
			before := sv.key()
			saved := slices.Clone(sv.st.ch)
			// The demands the kick may move: a closed edge's users; for an opened run, those
			// that could save anything with it open (saveBound, on the plan trees).
			moved := sv.kickBuf[:0]
			if k.close >= 0 {
				moved = append(moved, sv.st.users[k.close]...)
			} else {
				sv.sbVer++
				sv.plainBounds = false
				var bound, openCost int64
				for _, d := range all {
					if b := sv.saveBound(int(d), k.open.edges); b > 0 {
						moved = append(moved, d)
						bound += b
					}
				}
				openCost = sv.openCost(&k.open)
				sv.plainBounds = true
				if bound <= openCost {
					// Opening the run cannot pay by itself: its descent would close it again.
					continue
				}
			}
			sv.kickBuf = moved
			sv.holdOpen(&k.open, true)
			if k.close >= 0 {
				sv.forbid[k.close] = true
			}
			for _, d := range moved {
				if sv.stopped() {
					return
				}
				_, nb := sv.rebest(int(d))
				sv.add(int(d), nb)
			}
			sv.holdOpen(&k.open, false)
			sv.flush()
			sv.newEpoch()
			if k.close >= 0 {
				sv.improve()
				sv.forbid[k.close] = false
			}
			// Reroute the demands the kick moved first: when that alone leads back to a known
			// optimum, the descent would end there.
			for _, d := range moved {
				if sv.stopped() {
					return
				}
				sv.reroute(int(d))
			}
			if !sv.optima[sv.st.planH] {
				sv.rounds += sv.improve()
			}
			sv.optima[sv.st.planH] = true
			if sv.key().less(before) {
				improved = true
				continue
			}
			sv.restore(saved)
		}
		if !improved {
			break
		}
	}
}

// joined reports whether demand d's ends may still be joined by edges not forbidden,
// whatever else a route must respect (transit-free nodes, flags, reach, capacity): where it
// says no, a search finds no route. It looks from each end at most joinBudget nodes far: a
// forbidden charge cuts off the small side (a building's lateral), which a short look settles;
// a longer one says yes.
func (sv *solver) joined(d int) bool {
	src, dst := int32(sv.p.Demands[d].Source), int32(sv.p.Demands[d].Target)
	return src == dst || (sv.reaches(src, dst) && sv.reaches(dst, src))
}

// joinedAll reports whether joined holds for every demand of ds, the forbidden edges fixed
// meanwhile. A walk that goes past joinBudget says yes whatever it looks for, so it is taken
// once per node: the users of a span share their cross-connect, whose walk is the long one.
func (sv *solver) joinedAll(ds []int32) bool {
	if sv.joinWide == nil {
		sv.joinWide = make([]uint32, sv.net.nodes)
	}
	sv.joinEpoch++
	if sv.joinEpoch == 0 {
		clear(sv.joinWide)
		sv.joinEpoch = 1
	}
	sv.joinOn = true
	defer func() { sv.joinOn = false }() // the forbidden edges may change after
	for _, d := range ds {
		if !sv.joined(int(d)) {
			return false
		}
	}
	return true
}

// markWide records, within joinedAll, that the nodes of a walk lie in a part of the network
// (over the edges not forbidden) of more than joinBudget nodes: a walk from any of them would
// go past the budget too, so it says yes at once.
func (sv *solver) markWide(queue []int32) {
	if !sv.joinOn {
		return
	}
	for _, v := range queue {
		sv.joinWide[v] = sv.joinEpoch
	}
}

// joinBudget is how many nodes joined looks at from one end before it says yes.
const joinBudget = 256

// reaches reports whether a walk from src over edges not forbidden meets dst, or goes on past
// joinBudget nodes without running out.
func (sv *solver) reaches(src, dst int32) bool {
	n := sv.net
	if sv.joinSeen == nil {
		sv.joinSeen = make([]uint32, n.nodes)
	}
	if sv.joinOn && sv.joinWide[src] == sv.joinEpoch {
		return true
	}
	sv.joinStamp++
	stamp := sv.joinStamp
	queue := append(sv.joinQueue[:0], src)
	sv.joinSeen[src] = stamp
	defer func() { sv.joinQueue = queue }()
	for i := 0; i < len(queue); i++ {
		if len(queue) > joinBudget {
			sv.markWide(queue)
			return true
		}
		v := queue[i]
		for _, a := range n.adj[n.start[v]:n.start[v+1]] {
			if sv.forbid[a.edge] || sv.joinSeen[a.to] == stamp {
				continue
			}
			if a.to == dst {
				return true
			}
			if sv.joinOn && sv.joinWide[a.to] == sv.joinEpoch {
				sv.markWide(queue)
				return true
			}
			sv.joinSeen[a.to] = stamp
			queue = append(queue, a.to)
		}
	}
	return false
}
