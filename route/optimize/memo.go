package optimize

import "slices"

// Reroute memos. Most reroutes in a local search round find the demand's own route again,
// and on a large campus each of them costs a search of hundreds of nodes (thousands for a
// diverse pair). A memo records, when best(d) returned d's current choice, every edge whose
// weight the searches read and what staying cost then. The next reroute of d is skipped when
// none of those edges has become cheaper since, no proposed edge has opened and staying
// costs no more: every route the searches rejected then costs at least as much as before,
// and a route they never reached is bounded from below, as it was then, by the frontier
// they stopped at (a search settles every node whose weight plus lower bound is below the
// route it returns, and the lower-bound trees stay valid while no edge opens). So best(d)
// would find nothing cheaper than staying, and the reroute would change nothing.
//
// "Cheaper" is tracked per edge and cable size with a clock: a limited edge whose packing
// leaves room for more of the options' cable sizes (for those sizes) or stops being over
// capacity, an edge no longer forbidden, any change of a limited edge's
// cables under a custom Fits. An opened proposed edge, or a new state, moves the epoch and
// drops every memo. Memos serve the cost objective only: the length objective chooses the
// medium on cents after routing on metres, which the argument above does not cover.

// rerouteMemo is what a skipped reroute relies on; see the file comment.
type rerouteMemo struct {
	ok    bool
	epoch uint64
	clock uint64  // solver.clock when recorded
	sig   uint64  // the choice's signature (state.sig)
	stay  int64   // the weight of staying then
	edges []int32 // edges whose weights the searches read
}

// Changes are noted as pending while a move is tried and count only once it is kept: a move
// that is reverted leaves every edge priced as before.

// cheaperEvent is a pending change: edge e became cheaper for the cable sizes of ranks
// [lo, hi) in solver.areas.
type cheaperEvent struct{ e, lo, hi int32 }

// pendCheaper notes that edge e may have become cheaper for the cable sizes of ranks [lo, hi).
func (sv *solver) pendCheaper(e, lo, hi int) {
	sv.pend = append(sv.pend, cheaperEvent{int32(e), int32(lo), int32(hi)})
}

// commit makes the pending changes count: the edges they made cheaper, and an opened edge.
func (sv *solver) commit() {
	if len(sv.pend) > 0 {
		sv.clock++
		nk := len(sv.areas)
		for _, ev := range sv.pend {
			for r := ev.lo; r < ev.hi; r++ {
				sv.cheapAt[int(ev.e)*nk+int(r)] = sv.clock
			}
		}
	}
	if sv.pendOpen {
		sv.epoch++
	}
	sv.discard()
}

// discard forgets the pending changes (the move was reverted).
func (sv *solver) discard() {
	sv.pend = sv.pend[:0]
	sv.pendOpen = false
}

// sizesFitting returns how many of the options' cable sizes fit in freeMM2 of duct room:
// an edge's price to a newcomer changes only when this number does.
func (sv *solver) sizesFitting(freeMM2 float64) int {
	i, _ := slices.BinarySearchFunc(sv.areas, freeMM2, func(a, x float64) int {
		if a <= x+1e-9 {
			return -1
		}
		return 1
	})
	return i
}

// cheaper records at once that edge e may have become cheaper for every cable (an edge no
// longer forbidden).
func (sv *solver) cheaper(e int) {
	sv.clock++
	nk := len(sv.areas)
	for r := range nk {
		sv.cheapAt[e*nk+r] = sv.clock
	}
}

// newEpoch drops every memo (the state was replaced, or changed wholesale).
func (sv *solver) newEpoch() {
	sv.epoch++
	sv.discard()
}

// remember records demand d's memo after best found its current choice again; clock and
// stay were taken before the searches, sig is the choice's signature.
func (sv *solver) remember(d int, clock, sig uint64, stay int64) {
	m := &sv.memos[d]
	m.ok, m.epoch, m.clock, m.sig, m.stay = true, sv.epoch, clock, sig, stay
	m.edges = append(m.edges[:0], sv.qList...)
}

// noteQuery records that a search read the weight of edge e while a memo is being recorded.
func (sv *solver) noteQuery(e int32) {
	if sv.qSt[e] != sv.qStamp {
		sv.qSt[e] = sv.qStamp
		sv.qList = append(sv.qList, e)
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

// stayWeight returns what keeping its current choice c costs demand d as best prices it once
// d is out of the plan (own cable places free, see penalty), and false when that price is not
// so simple (a limited edge over capacity, or a custom Fits).
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
					w += sv.ductCent[e]
				}
			}
		}
	}
	return w, true
}

// memoHolds reports whether demand d's memo shows that rerouting it would change nothing.
func (sv *solver) memoHolds(d int) bool {
	m := &sv.memos[d]
	if !m.ok || m.epoch != sv.epoch || m.sig != sv.st.sig[d] {
		return false
	}
	if w, ok := sv.stayWeight(d, sv.st.ch[d]); !ok || w > m.stay {
		return false
	}
	nk := len(sv.areas)
	ranks := sv.ranks[d]
	for _, e := range m.edges {
		at := sv.cheapAt[int(e)*nk:]
		for _, r := range ranks {
			if at[r] > m.clock {
				return false
			}
		}
	}
	return true
}
