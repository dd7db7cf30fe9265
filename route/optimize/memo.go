package optimize

import "slices"

// Reroute memos. Most reroutes in a local search round find the demand's own route again,
// and on a large campus each of them costs a search of hundreds of nodes (thousands for a
// diverse pair). A memo records, when best(d) returned d's current choice, every edge whose
// weight the searches read, how each was priced then (see priceLevel) and what staying cost.
// The next reroute of d is skipped when none of those edges has become cheaper for d's cable
// sizes, the set of open proposed edges is the same and staying costs no more: every route
// the searches rejected then costs at least as much as before, and a route they never
// reached is bounded from below, as it was then, by the frontier they stopped at (a search
// settles every node whose weight plus lower bound is below the route it returns, and the
// lower-bound trees stay valid while no edge opens). So best(d) would find nothing cheaper
// than staying, and the reroute would change nothing. Comparing prices, not counting
// changes, lets moves that were tried and reverted leave the memos intact. With charges, the
// memo also needs the same charges paid (with d in the plan) and, among the charges d's
// route uses, the same ones used by other demands too: then every charge costs d's searches
// what it cost them.
//
// Memos serve the cost objective with the default duct rule only: the length objective
// chooses the medium on cents after routing on metres, which the argument above does not
// cover, and a custom Fits prices an edge from all its cables.

// rerouteMemo is what a skipped reroute relies on; see the file comment.
type rerouteMemo struct {
	ok       bool
	epoch    uint64
	freeHash uint64  // solver.freeHash when recorded
	sig      uint64  // the choice's signature (state.sig)
	charges  uint64  // solver.chargeHash when recorded
	chSig    uint64  // ownCharges' hash of the shared charges of the choice then
	stay     int64   // the weight of staying then
	edges    []int32 // edges whose weights the searches read
	levels   []uint8 // priceLevel of each then
}

// Price levels: the number of the options' cable sizes (solver.areas, ascending) that fit
// in an edge's room without a new duct, and two flags.
const (
	levelOver   = 1 << 6 // a limited edge over capacity
	levelForbid = 1 << 7 // forbidden by a move
	levelFits   = levelOver - 1
)

// priceLevel summarises how the searches price edge e for a cable other than the one
// routed: forbidden or not and, for a limited edge, which sizes fit and whether it is over
// capacity (see penalty).
func (sv *solver) priceLevel(e int32) uint8 {
	var l uint8
	if sv.forbid[e] {
		l |= levelForbid
	}
	if sv.limited[e] {
		l |= sv.st.fits[e]
		if sv.st.over[e] {
			l |= levelOver
		}
	}
	return l
}

// cheaperFor reports whether an edge priced at level then, now at level now, may cost less
// to demand d.
func (sv *solver) cheaperFor(d int, then, now uint8) bool {
	if then == now {
		return false
	}
	if then&levelForbid != 0 && now&levelForbid == 0 || then&levelOver != 0 && now&levelOver == 0 {
		return true
	}
	lo, hi := int32(then&levelFits), int32(now&levelFits)
	for _, r := range sv.ranks[d] {
		if r >= lo && r < hi {
			return true // a size of d's newly fits
		}
	}
	return false
}

// sizesFitting returns how many of the options' cable sizes fit in freeMM2 of duct room.
func (sv *solver) sizesFitting(freeMM2 float64) int {
	i, _ := slices.BinarySearchFunc(sv.areas, freeMM2, func(a, x float64) int {
		if a <= x+1e-9 {
			return -1
		}
		return 1
	})
	return i
}

// newEpoch drops every memo (the state was replaced, or changed wholesale).
func (sv *solver) newEpoch() { sv.epoch++ }

// memoUsable reports whether memos can serve this problem (see the file comment).
func (sv *solver) memoUsable() bool {
	return !sv.length && sv.cap.fits == nil && len(sv.areas) <= levelFits
}

// noteQuery records that a search read the weight of edge e while a memo is being recorded.
func (sv *solver) noteQuery(e int32) {
	if sv.qSt[e] != sv.qStamp {
		sv.qSt[e] = sv.qStamp
		sv.qList = append(sv.qList, e)
		sv.qLevel[e] = sv.priceLevel(e)
	}
}

// startRecord begins recording the edges the searches read.
func (sv *solver) startRecord() {
	sv.qStamp++
	if sv.qStamp == 0 {
		clear(sv.qSt)
		sv.qStamp = 1
	}
	sv.qList = sv.qList[:0]
	sv.rec = true
}

// remember records demand d's memo after best found its current choice again, with the
// choice's signature and the weight of staying taken before the searches (d in the plan, as
// when the memo is checked). The levels were taken as the searches read the edges: the
// packing was flushed with d in it, and taking d out does not change free room.
func (sv *solver) remember(d int, sig uint64, stay int64) {
	m := &sv.memos[d]
	m.ok, m.epoch, m.freeHash, m.sig, m.stay = true, sv.epoch, sv.freeHash, sig, stay
	if sv.chOn {
		_, m.chSig = sv.ownCharges(sv.st.ch[d])
		m.charges = sv.chargeHash
	}
	m.edges = append(m.edges[:0], sv.qList...)
	m.levels = m.levels[:0]
	for _, e := range sv.qList {
		m.levels = append(m.levels, sv.qLevel[e])
	}
}

// stayWeight returns what keeping its current choice c costs demand d as best prices it once
// d is out of the plan (own cable places free, see penalty), and false when that price is not
// so simple (a limited edge over capacity).
func (sv *solver) stayWeight(d int, c choice) (int64, bool) {
	st := sv.st
	base := sv.profBase[sv.optProf[d][c.opt]]
	area := circleMM2(sv.od(d, c.opt))
	var w int64
	for _, leg := range c.legs {
		for _, h := range leg {
			e := h.Edge
			w += base[e]
			if sv.fixedE[e] > 0 && st.count[e] == 1 && !sv.phantom[e] {
				w += sv.fixedE[e]
			}
			if sv.limited[e] && area > 0 {
				if sv.cap.fits != nil || st.over[e] {
					return 0, false
				}
				if sv.holdsLastDuct(int32(e), area) {
					w += sv.lastDuctCents(e)
				}
			}
		}
	}
	if sv.chOn {
		own, _ := sv.ownCharges(c)
		w += own
	}
	return w, true
}

// memoHolds reports whether demand d's memo shows that rerouting it would change nothing.
func (sv *solver) memoHolds(d int) bool {
	m := &sv.memos[d]
	if !m.ok || m.epoch != sv.epoch || m.freeHash != sv.freeHash || m.sig != sv.st.sig[d] {
		return false
	}
	if sv.chOn {
		// The same charges paid by the others: with d in the plan (chargeHash) and, among
		// those d's route uses, by demands other than d (chSig).
		if _, sig := sv.ownCharges(sv.st.ch[d]); m.charges != sv.chargeHash || sig != m.chSig {
			return false
		}
	}
	if w, ok := sv.stayWeight(d, sv.st.ch[d]); !ok || w > m.stay {
		return false
	}
	for i, e := range m.edges {
		if sv.cheaperFor(d, m.levels[i], sv.priceLevel(e)) {
			return false
		}
	}
	return true
}
