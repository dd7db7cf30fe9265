package optimize

import (
	"cmp"
	"slices"
)

// ejectMoves tries, at a local optimum of the other moves, giving full duct runs' room to a
// demand that wants it: a demand whose cheapest route with the runs' room aside (wantedRoom)
// is cheaper than its own, but passes runs with no room left for its cable, takes that route
// once a cable in those runs (a victim) moves off them: the victim is rerouted with the runs
// forbidden, then the demand, then both once more at the plan's real prices; the plan is kept
// if it is cheaper. No single reroute finds this trade: the victim alone gets dearer, and the
// other cannot get in while it is there (tester 10's campus: a link that took the last pull
// slots of a bank sent another the long way round, some 2,900 USD dearer, for 74 USD it saved
// itself). The victims tried first are those in most of the runs. A move that failed is not
// tried again until one of its demands changes route. The searches and reroutes of a call are
// bounded by ejectBudget × demands: a budget per solve ran out in the perturbation phase on
// small campuses, leaving the plan short of a move a warm start from it then made
// (TestWarmNoKicks). A warm-started solve makes none: it starts from a plan that had them
// (a sweep's base), and each look costs a search a demand, which on a warm scenario that
// settles in a round or two was a third of its CPU (a sweep of 10 price books of the
// generated 1,000-building campus: 21.3 s user before the move, 29.0 s with it in warm
// solves).
func (sv *solver) ejectMoves() bool {
	if sv.length || len(sv.warm) > 0 {
		return false
	}
	sv.ejectWork = 0
	limit := ejectBudget * max(len(sv.p.Demands), 1)
	changed := false
	for _, w := range sv.wantedRoom() {
		if sv.stopped() || sv.ejectWork > limit || sv.gapClosed() {
			break
		}
		for _, v := range sv.victims(w.blocked) {
			if sv.ejectWork > limit {
				break
			}
			st := sv.st
			if st.sig[w.d] != w.sig {
				break // w.d moved meanwhile: its wish is stale
			}
			sig := mix(mix(mix(uint64(v), uint64(w.d)), 23), st.sig[v])
			sig = mix(sig, st.sig[w.d])
			for _, e := range w.blocked {
				sig = mix(sig, uint64(e))
			}
			k := [2]int32{v, w.d}
			if f, ok := sv.failedEject[k]; ok && f == sig {
				continue
			}
			if sv.tryEject(w.blocked, v, w.d) {
				changed = true
				break
			}
			sv.failedEject[k] = sig
		}
	}
	return changed
}

// roomWish is a demand that would route cheaper if some full duct runs had room for it.
type roomWish struct {
	d       int32
	sig     uint64  // its choice when wished
	gain    int64   // what its route would save with the room
	blocked []int32 // the limited edges of that route with no room for its cable, ascending
}

// wantedRoom lists the single-route demands whose cheapest route for their current option with
// every duct run's room aside (ignoreRoom) is cheaper than the route they have and takes
// limited edges their route does not, which have no room for their cable now without an added
// duct (penalty): most saving first, then by demand.
func (sv *solver) wantedRoom() []roomWish {
	st := sv.st
	var out []roomWish
	for d := range sv.p.Demands {
		c := st.ch[d]
		if sv.invalid[d] != "" || c.opt < 0 || len(c.legs) != 1 || sv.p.Demands[d].Diverse {
			continue
		}
		if sv.stopped() {
			break
		}
		o := c.opt
		// Staying and the route with the room aside are priced as estimate prices a demand
		// still in the plan: its own spans and charges as what leaving them saves (self), its
		// own cable's place in the ducts as its own (markOwn), not as a cable more.
		sv.viewInPlace(d, c)
		stay, barred := sv.weigh(d, c)
		var hops []Hop
		var w int64
		ok := barred == 0
		if ok {
			stay -= sv.optionCents(d, o, 1)
			sv.ignoreRoom = true
			hops, w, ok, _ = sv.route(d, o, stay-1)
			sv.ignoreRoom = false
			sv.ejectWork++
		}
		sv.endOwn()
		if !ok || w >= stay {
			continue
		}
		area := circleMM2(sv.od(d, o))
		sv.weightFor(d, o) // a new penalty memo for d
		var blocked []int32
		for _, h := range hops {
			e := int32(h.Edge)
			if !sv.limited[e] || len(st.users[e]) == 0 || sv.self[e] == sv.selfSt {
				continue
			}
			if pen, ok := sv.penalty(d, o, e, area); !ok || pen > 0 {
				blocked = append(blocked, e)
			}
		}
		if len(blocked) > 0 {
			slices.Sort(blocked)
			out = append(out, roomWish{d: int32(d), sig: st.sig[d], gain: stay - w, blocked: slices.Compact(blocked)})
		}
	}
	sv.endSelf()
	slices.SortFunc(out, func(a, b roomWish) int {
		if c := cmp.Compare(b.gain, a.gain); c != 0 {
			return c
		}
		return cmp.Compare(a.d, b.d)
	})
	return out
}

// victims returns at most ejectWidth demands whose routes use edges of blocked, those in most
// of them first, then by demand.
func (sv *solver) victims(blocked []int32) []int32 {
	n := map[int32]int{}
	for _, e := range blocked {
		for _, u := range sv.st.users[e] {
			n[u]++
		}
	}
	vs := make([]int32, 0, len(n))
	for u := range n {
		vs = append(vs, u)
	}
	slices.SortFunc(vs, func(a, b int32) int {
		if c := cmp.Compare(n[b], n[a]); c != 0 {
			return c
		}
		return cmp.Compare(a, b)
	})
	return vs[:min(len(vs), ejectWidth)]
}

// tryEject makes the move of ejectMoves for victim v, moved off the edges blocked, and demand
// d, which wants their room, and keeps it if the plan is cheaper.
func (sv *solver) tryEject(blocked []int32, v, d int32) bool {
	before := sv.key()
	for _, e := range blocked {
		sv.forbid[e] = true
	}
	ok := sv.joinedAll([]int32{v})
	var olds [2]choice
	if ok {
		var nb choice
		olds[0], nb = sv.rebest(int(v))
		sv.add(int(v), nb)
		sv.flush() // d's searches see the room v left
	}
	for _, e := range blocked {
		sv.forbid[e] = false
	}
	if !ok {
		return false
	}
	var nb choice
	olds[1], nb = sv.rebest(int(d))
	sv.add(int(d), nb)
	sv.flush()
	moved := [2]int32{v, d}
	for _, u := range moved {
		if sv.stopped() {
			break
		}
		sv.reroute(int(u))
	}
	sv.ejectWork += 4
	if sv.key().less(before) {
		sv.sbVer++
		return true
	}
	sv.remove(int(d))
	sv.remove(int(v))
	sv.add(int(v), olds[0])
	sv.add(int(d), olds[1])
	sv.flush()
	sv.newEpoch() // memos recorded during the move describe another plan
	return false
}

// ejectBudget bounds ejectMoves' searches and reroutes per demand in one call; ejectWidth is
// the most victims tried for one demand's wish in one call.
const (
	ejectBudget = 8
	ejectWidth  = 4
)
