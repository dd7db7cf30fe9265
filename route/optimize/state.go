package optimize

import (
	"math"
	"slices"

	"spanwright/media/install"
)

// The plan under construction and its exact, incremental cost accounting.

type choice struct {
	opt     int     // option index, -1 when unrouted
	legs    [][]Hop // anchored orientation: from the demand's free end to its anchor
	varCost int64   // Σ cable and labour cents over the legs
	lenMM   int64   // Σ leg lengths in millimetres
}

type state struct {
	ch       []choice
	count    []int32     // cables per edge
	users    [][]int32   // per tracked edge (proposed or limited): demands using it, ascending
	added    []int       // per limited edge: ducts added
	over     []bool      // per limited edge: cables do not fit
	packs    []ductPack  // per limited edge: NFPA first-fit packing of its users (nil Fits only)
	sig      []uint64    // per demand: hash of its choice, for skipping moves already tried
	planH    uint64      // Σ mix(demand, sig): the plan's hash
	ods      [][]float64 // per limited edge: cable ODs of users, parallel to users
	cnt      [][]int32   // per limited edge: cables of each user (Option.Cables), parallel to users; nil unless solver.multi
	hsh      []uint64    // per limited edge: set hash of its (demand, OD) pairs
	packH    []uint64    // per limited edge: the hash its packing was computed for
	alt      []packState // per limited edge: the packing before the last flush
	dirty    []int32     // limited edges touched since the last flush
	isDirty  []bool
	appendN  []int32   // per limited edge: cables appended last (in demand order) since the flush, -1 after any other change
	free     []float64 // per limited edge: largest cable area it takes without a new duct, mm²
	fits     []uint8   // per limited edge: how many of the options' cable sizes free takes (sizesFitting)
	chUse    []int32   // per charge: uses of its edges by the plan's legs (with solver.chOn)
	total    int64     // plan cost in cents (without construction and ducts for the length objective)
	totalMM  int64
	overfull int
	unrouted int
	unmet    int
	atSite   int // diverse demands whose pair passes one place twice (Problem.Sites)
	// paidCents is the construction the plan pays, counted as it opens and closes: an edge's
	// FixedCents, the trench of an edge's first added duct. Only differences are read
	// (closeSet: what a move's reroutes built, net of what they gave up, so a link that leaves
	// its own span and takes it again adds nothing). Charges are left out: nearly every detour
	// pays one (a handhole where it turns), which would keep every close move going to its end.
	paidCents int64
}

type key struct {
	overfull, unrouted, unmet, atSite int
	total, totalMM                    int64
}

func (a key) less(b key) bool {
	if a.overfull != b.overfull {
		return a.overfull < b.overfull
	}
	if a.unrouted != b.unrouted {
		return a.unrouted < b.unrouted
	}
	if a.unmet != b.unmet {
		return a.unmet < b.unmet
	}
	if a.atSite != b.atSite {
		return a.atSite < b.atSite
	}
	if a.total != b.total {
		return a.total < b.total
	}
	return a.totalMM < b.totalMM
}

// newState returns an empty plan, reusing a state dropped earlier (see dropState) when there
// is one, with its buffers.
func newState(sv *solver) *state {
	sv.settle() // pending entries belong to the state being replaced
	var st *state
	if n := len(sv.pool); n > 0 {
		st, sv.pool = sv.pool[n-1], sv.pool[:n-1]
	} else {
		ne, nd := len(sv.p.Edges), len(sv.p.Demands)
		st = &state{ch: make([]choice, nd), count: make([]int32, ne), users: make([][]int32, ne),
			added: make([]int, ne), over: make([]bool, ne), packs: make([]ductPack, ne), sig: make([]uint64, nd),
			ods: make([][]float64, ne), cnt: make([][]int32, ne), hsh: make([]uint64, ne), packH: make([]uint64, ne),
			alt: make([]packState, ne), isDirty: make([]bool, ne), free: make([]float64, ne), appendN: make([]int32, ne), fits: make([]uint8, ne)}
		if sv.chOn {
			st.chUse = make([]int32, len(sv.p.Charges))
		}
	}
	clear(st.chUse)
	clear(st.count)
	clear(st.added)
	clear(st.over)
	clear(st.sig)
	clear(st.hsh)
	clear(st.packH)
	clear(st.isDirty)
	clear(st.appendN)
	clear(st.free)
	clear(st.fits)
	st.dirty = st.dirty[:0]
	for e := range st.users {
		st.users[e], st.ods[e], st.cnt[e] = st.users[e][:0], st.ods[e][:0], st.cnt[e][:0]
		st.alt[e].valid = false
		if sv.limited[e] {
			st.packs[e].reset(sv.p.Edges[e].DuctIDMM, sv.p.Edges[e].PullLimit())
			st.free[e] = math.Inf(-1)
			if sv.p.Edges[e].Ducts > 0 {
				st.free[e] = FillOneCable * st.packs[e].areaMM2
			}
			st.fits[e] = uint8(min(sv.sizesFitting(st.free[e]), 255))
		}
	}
	st.planH = 0
	unrouted := choiceSig(choice{opt: -1})
	for d := range st.ch {
		st.ch[d], st.sig[d] = choice{opt: -1}, unrouted
		st.planH += mix(uint64(d), unrouted)
	}
	st.total, st.totalMM, st.overfull, st.unmet, st.atSite, st.unrouted = 0, 0, 0, 0, 0, len(st.ch)
	return st
}

// dropState hands a state no longer used back for newState to reuse.
func (sv *solver) dropState(st *state) {
	if st != nil && st != sv.st {
		sv.pool = append(sv.pool, st)
	}
}

func (st *state) key() key {
	return key{st.overfull, st.unrouted, st.unmet, st.atSite, st.total, st.totalMM}
}

func (sv *solver) od(d, o int) float64 { return sv.p.Demands[d].Options[o].CableODMM }

// cables is how many cables demand d pulls with option o (Option.Cables, at least 1).
func (sv *solver) cables(d, o int) int { return sv.p.Demands[d].Options[o].cables() }

// Duct packings are computed lazily. add and remove only update an edge's users and a set
// hash of its (demand, cable OD) pairs; key flushes the edges whose hash differs from the one
// their packing was computed for. A reroute that keeps its route therefore costs nothing here,
// and a move that is reverted swaps back the previous packing (kept per edge) in O(1), instead
// of repacking every cable of a duct bank that thousands of cables share. Searches in between
// read the packing as last flushed, which is one more reason their duct penalties are estimates.

// packState is a saved packing and its outcome.
type packState struct {
	load  []install.Load
	twos  []twoGroup
	seg   []float64
	size  int
	added int
	ok    bool
	h     uint64
	valid bool
}

func itemHash(d int, od float64, n int) uint64 {
	return mix(mix(uint64(d)+1, math.Float64bits(od)), uint64(n))
}

// touch records that demand d's n cables (od) joined or left limited edge e.
func (sv *solver) touch(e, d int, od float64, n int) {
	st := sv.st
	st.hsh[e] ^= itemHash(d, od, n)
	if !st.isDirty[e] {
		st.isDirty[e] = true
		st.dirty = append(st.dirty, int32(e))
	}
}

// flush brings the packing of every touched edge up to date.
func (sv *solver) flush() {
	sv.settle()
	st := sv.st
	for _, e32 := range st.dirty {
		e := int(e32)
		st.isDirty[e] = false
		appended := st.appendN[e]
		st.appendN[e] = 0
		if st.hsh[e] == st.packH[e] {
			continue
		}
		cur, alt := &st.packs[e], &st.alt[e]
		swapWith := alt.valid && alt.h == st.hsh[e]
		// Exchange the current packing with the saved one.
		cur.load, alt.load = alt.load, cur.load
		cur.twos, alt.twos = alt.twos, cur.twos
		cur.seg, alt.seg = alt.seg, cur.seg
		cur.size, alt.size = alt.size, cur.size
		added, ok := alt.added, alt.ok
		alt.added, alt.ok, alt.h, alt.valid = st.added[e], !st.over[e], st.packH[e], true
		if !swapWith {
			if ods := st.ods[e]; appended > 0 && sv.cap.fits == nil && !st.over[e] && int(appended) <= len(ods) {
				// Cables pulled last: first-fit goes on from the packing before them.
				tail := len(ods) - int(appended)
				var cnt []int32
				if sv.multi {
					cnt = st.cnt[e][tail:]
				}
				added, ok = sv.cap.extend(e, alt, cur, ods[tail:], cnt)
			} else {
				added, ok = sv.cap.needed(e, st.ods[e], st.cnt[e], cur)
			}
		}
		st.packH[e] = st.hsh[e]
		sv.applyDucts(e, added, ok)
	}
	st.dirty = st.dirty[:0]
}

// key flushes the packings and returns the plan's objective key.
func (sv *solver) key() key {
	sv.flush()
	return sv.st.key()
}

// applyDucts records edge e's new duct count and fit and updates the total.
func (sv *solver) applyDucts(e, added int, ok bool) {
	st := sv.st
	if !ok {
		added = st.added[e]
	}
	if ok == st.over[e] {
		if ok {
			st.overfull--
		} else {
			st.overfull++
		}
		st.over[e] = !ok
	}
	if !sv.length {
		switch {
		case st.added[e] == 0 && added > 0:
			st.paidCents += sv.trenchCent[e]
		case st.added[e] > 0 && added == 0:
			st.paidCents -= sv.trenchCent[e]
		}
		st.total += sv.ductsCents(e, added) - sv.ductsCents(e, st.added[e])
	}
	st.added[e] = added
	pk := &st.packs[e]
	st.free[e] = pk.maxRoom()
	if len(pk.load) < sv.p.Edges[e].Ducts+added {
		st.free[e] = max(st.free[e], FillOneCable*pk.areaMM2)
	}
	st.fits[e] = uint8(min(sv.sizesFitting(st.free[e]), 255))
}

// mix is a 64-bit hash step (SplitMix64 finaliser).
func mix(h, v uint64) uint64 {
	h ^= v + 0x9e3779b97f4a7c15 + (h << 6) + (h >> 2)
	h ^= h >> 30
	h *= 0xbf58476d1ce4e5b9
	h ^= h >> 27
	h *= 0x94d049bb133111eb
	return h ^ (h >> 31)
}

// choiceSig hashes a choice: its option and the edges of its legs in order.
func choiceSig(c choice) uint64 {
	h := mix(0, uint64(c.opt+1))
	for _, leg := range c.legs {
		h = mix(h, 1<<40)
		for _, hp := range leg {
			h = mix(h, uint64(hp.Edge))
		}
	}
	return h
}

func (sv *solver) add(d int, c choice) {
	st := sv.st
	if sv.pendD != d {
		sv.settle()
	}
	st.ch[d] = c
	st.planH -= mix(uint64(d), st.sig[d])
	st.sig[d] = choiceSig(c)
	st.planH += mix(uint64(d), st.sig[d])
	if c.opt < 0 {
		sv.settle()
		return
	}
	st.unrouted--
	if sv.p.Demands[d].Diverse && len(c.legs) < 2 {
		st.unmet++
	}
	if sv.sharedSite(c.legs) != 0 {
		st.atSite++
	}
	st.total += c.varCost + sv.optionCents(d, c.opt, len(c.legs))
	st.totalMM += c.lenMM
	for _, leg := range c.legs {
		for _, h := range leg {
			e := h.Edge
			st.count[e]++
			if st.count[e] == 1 {
				st.total += sv.fixedE[e]
				st.paidCents += sv.fixedE[e]
				if !sv.phantom[e] {
					sv.freeChanged(int32(e), true)
				}
			}
			if sv.chOn {
				for _, k := range sv.chargesOf(e) {
					if st.chUse[k]++; st.chUse[k] == 1 {
						st.total += sv.p.Charges[k].Cents
						sv.chargeHash ^= mix(uint64(k), 29)
					}
				}
			}
			if sv.tracked[e] {
				if sv.pendMark[e] == sv.pendSt {
					// d's entry, left by remove, is d's again: its cable in place.
					sv.pendMark[e] = 0
					i, _ := slices.BinarySearch(st.users[e], int32(d))
					if sv.limited[e] {
						sv.putCable(e, i, d, c.opt, false)
					}
					continue
				}
				i, _ := slices.BinarySearch(st.users[e], int32(d))
				if sv.limited[e] && st.appendN[e] >= 0 {
					if i == len(st.users[e]) {
						st.appendN[e]++
					} else {
						st.appendN[e] = -1
					}
				}
				st.users[e] = slices.Insert(st.users[e], i, int32(d))
				if sv.limited[e] {
					sv.putCable(e, i, d, c.opt, true)
				}
			}
		}
	}
	sv.settle()
}

// fullEdges returns nil when the plan, with choice c just added, has no more overfull edges
// than before: the exact packing of every duct c passes (key flushes it, by capacity's rule)
// takes its cables within the ducts the edge has or may add. Otherwise it returns the
// capacity-limited edges of c that are overfull now, ascending, each once; the caller takes
// c out again. Whether a route's cables fit its ducts is decided here, for the start (place)
// and the warm start (startWarm) alike.
func (sv *solver) fullEdges(c choice, before int) []int {
	if sv.key().overfull <= before {
		return nil
	}
	full := []int{}
	for _, leg := range c.legs {
		for _, h := range leg {
			if e := h.Edge; sv.limited[e] && sv.st.over[e] && !slices.Contains(full, e) {
				full = append(full, e)
			}
		}
	}
	slices.Sort(full)
	return full
}

// Deferred removals. remove leaves demand d's entries in the users (and ods, cnt) of its
// edges, marked pending, and the next add of d reuses those on its new route in place; the
// rest are deleted then (settle), as they are before any other add or remove and before a
// flush. Most removals are followed by an add of the same demand on much the same route
// (a reroute), and on a trunk that thousands of cables share, deleting and inserting its
// entry moved the whole list twice. The lists are the same as with immediate deletion
// whenever anything reads them; between remove(d) and add(d) only best(d) runs, which skips d
// in them (penalty).

// settle deletes the entries remove left pending.
func (sv *solver) settle() {
	if sv.pendD < 0 {
		return
	}
	d := int32(sv.pendD)
	for _, e := range sv.pendE {
		if sv.pendMark[e] != sv.pendSt {
			continue // d's again (add)
		}
		sv.dropUser(int(e), d)
	}
	sv.pendE, sv.pendD = sv.pendE[:0], -1
	sv.pendSt++
	if sv.pendSt == 0 {
		clear(sv.pendMark)
		sv.pendSt = 1
	}
}

// putCable puts demand d's cable with option o on limited edge e, at index i of its users
// (where users holds d): its cable OD and, with options of several cables, its cable count,
// in place of the entry remove left there (insert false) or as a new entry (insert true),
// then hashes it into the edge's packing key (touch). add's two ways of taking a cable back
// on an edge share it, so that the OD and count are worked out once each.
func (sv *solver) putCable(e, i, d, o int, insert bool) {
	st := sv.st
	od, n := sv.od(d, o), sv.cables(d, o)
	if insert {
		st.ods[e] = slices.Insert(st.ods[e], i, od)
		if sv.multi {
			st.cnt[e] = slices.Insert(st.cnt[e], i, int32(n))
		}
	} else {
		st.ods[e][i] = od
		if sv.multi {
			st.cnt[e][i] = int32(n)
		}
	}
	sv.touch(e, d, od, n)
}

// dropUser deletes demand d's entry from edge e's users (and, on a capacity-limited edge,
// its cable and count there): settle's pending deletions and remove's second pass over e.
func (sv *solver) dropUser(e int, d int32) {
	st := sv.st
	i, found := slices.BinarySearch(st.users[e], d)
	if !found {
		panic("optimize: demand missing from an edge's users")
	}
	st.users[e] = slices.Delete(st.users[e], i, i+1)
	if sv.limited[e] {
		st.ods[e] = slices.Delete(st.ods[e], i, i+1)
		if sv.multi {
			st.cnt[e] = slices.Delete(st.cnt[e], i, i+1)
		}
	}
}

func (sv *solver) remove(d int) choice {
	st := sv.st
	sv.settle()
	c := st.ch[d]
	st.planH -= mix(uint64(d), st.sig[d])
	st.sig[d] = choiceSig(choice{opt: -1})
	st.planH += mix(uint64(d), st.sig[d])
	if c.opt < 0 {
		return c
	}
	for _, leg := range c.legs {
		for _, h := range leg {
			e := h.Edge
			st.count[e]--
			if st.count[e] == 0 {
				st.total -= sv.fixedE[e]
				st.paidCents -= sv.fixedE[e]
				if !sv.phantom[e] {
					sv.freeChanged(int32(e), false)
				}
			}
			if sv.chOn {
				for _, k := range sv.chargesOf(e) {
					if st.chUse[k]--; st.chUse[k] == 0 {
						st.total -= sv.p.Charges[k].Cents
						sv.chargeHash ^= mix(uint64(k), 29)
					}
				}
			}
			if sv.tracked[e] {
				if sv.pendMark[e] != sv.pendSt {
					sv.pendMark[e] = sv.pendSt
					sv.pendE = append(sv.pendE, int32(e))
				} else {
					sv.dropUser(e, int32(d)) // the route passes e again: this entry goes now
				}
				if sv.limited[e] {
					st.appendN[e] = -1
					sv.touch(e, d, sv.od(d, c.opt), sv.cables(d, c.opt))
				}
			}
		}
	}
	st.total -= c.varCost + sv.optionCents(d, c.opt, len(c.legs))
	st.totalMM -= c.lenMM
	if sv.p.Demands[d].Diverse && len(c.legs) < 2 {
		st.unmet--
	}
	if sv.sharedSite(c.legs) != 0 {
		st.atSite--
	}
	st.unrouted++
	st.ch[d] = choice{opt: -1}
	sv.pendD = d
	return c
}

// ductsCents is what k added ducts on edge e cost: on an existing edge the trench once, laid
// with Edge.LaidDucts(k) ducts; on a proposed one the k ducts beyond those its FixedCents lays.
func (sv *solver) ductsCents(e, k int) int64 {
	if k <= 0 {
		return 0
	}
	ed := &sv.p.Edges[e]
	if ed.Proposed {
		return int64(k) * sv.ductCent[e]
	}
	return int64(ed.LaidDucts(k))*sv.ductCent[e] + sv.trenchCent[e]
}

// nextDuctCents is what one more added duct on edge e costs now; without the trench while an
// open move holds the edge's trench free (trenchFree).
func (sv *solver) nextDuctCents(e int) int64 {
	k := sv.st.added[e]
	c := sv.ductsCents(e, k+1) - sv.ductsCents(e, k)
	if k == 0 && sv.trenchFree[e] {
		c -= sv.trenchCent[e]
	}
	return c
}

// lastDuctCents is what the last added duct on edge e costs now (its trench too when it is
// the only one).
func (sv *solver) lastDuctCents(e int) int64 {
	k := sv.st.added[e]
	return sv.ductsCents(e, k) - sv.ductsCents(e, k-1)
}

// holdsLastDuct reports whether taking a cable of area areaMM2 out of limited edge e would
// likely save a duct: the last duct of the flushed packing was added and holds no more cable.
func (sv *solver) holdsLastDuct(e int32, areaMM2 float64) bool {
	pk := &sv.st.packs[e]
	n := len(pk.load)
	return n > 0 && n > sv.p.Edges[e].Ducts && pk.load[n-1].UsedMM2 <= areaMM2+1e-9
}

// penalty returns the price of the ducts demand d's cable (option o) would add to edge e if it
// were pulled last, and whether it can be pulled there at all; the state must not contain d.
// Pulling last is an approximation when d is not the last user in demand order (the packing
// follows demand order): the search uses it to stay O(ducts) per edge, and add and remove
// then account the exact duct count, so a move is judged on the exact cost.
//
// The default rule reads the packing as last flushed, which may still hold d's own cable (d
// was just taken out to be rerouted, or estimate keeps it in). On the edges markOwn recorded,
// a cable no wider than d's own takes its place and costs nothing, except that staying costs
// the last duct when that duct was added and holds no more cable than d's (taking d out would
// likely empty it, so leaving may save it). Without that rule every edge of d's current route
// near capacity would look a duct dearer than it is, and the searches would leave good routes
// for worse ones, and screen open moves on savings that are not there.
func (sv *solver) penalty(d, o int, e int32, areaMM2 float64) (int64, bool) {
	st := sv.st
	if areaMM2 == 0 {
		return 0, true // a cable that takes no duct area
	}
	if sv.cap.fits == nil {
		var pen int64
		switch {
		case sv.own[e] == sv.ownSt && areaMM2 <= sv.ownArea+1e-9 && !st.over[e]:
			// The flushed packing holds d's own cable here: a cable no wider takes its place.
			// It costs the last duct when that duct was added and holds no more than d's cable
			// (taking d out would likely empty it).
			if sv.holdsLastDuct(e, sv.ownArea) && !sv.length {
				return sv.lastDuctCents(int(e)), true
			}
			return 0, true
		case sv.cables(d, o) > 1:
			// Several cables side by side (Option.Cables): pulled last into a copy of the
			// packing, each as the packing would place it. Rare (a copper link of several
			// 4-pair cables on a duct), so the copy's O(ducts) does not matter.
			var ok bool
			if pen, ok = sv.penaltyMany(int(e), sv.od(d, o), sv.cables(d, o)); !ok {
				return 0, false
			}
		case areaMM2 <= st.free[e]+1e-9:
			return 0, true
		case sv.p.Edges[e].canAdd() && areaMM2 <= FillOneCable*st.packs[e].areaMM2+1e-9:
			pen = sv.nextDuctCents(int(e))
		default:
			return 0, false
		}
		if sv.length {
			pen = 0
		}
		return pen, true
	}
	if sv.penSt[e] == sv.penN {
		return sv.pen[e], sv.penOK[e]
	}
	ed := &sv.p.Edges[e]
	var pen int64
	ok := true
	avail := ed.Ducts + st.added[e]
	if sv.pendD != d {
		sv.settle() // the lists as they are, but for d
	}
	ods := sv.odBuf[:0]
	for _, u := range st.users[e] {
		if int(u) != d { // estimate keeps d in the plan
			ods = append(ods, sv.od(int(u), st.ch[u].opt))
		}
	}
	for range sv.cables(d, o) {
		ods = append(ods, sv.od(d, o))
	}
	sv.odBuf = ods
	switch {
	case sv.cap.fits(int(e), ods, avail):
	case ed.canAdd() && sv.cap.fits(int(e), ods, avail+1):
		pen = sv.nextDuctCents(int(e))
	default:
		ok = false
	}
	if sv.length {
		pen = 0
	}
	sv.penSt[e], sv.pen[e], sv.penOK[e] = sv.penN, pen, ok
	return pen, ok
}

// penaltyMany is what n cables of outside diameter odMM pulled last along limited edge e
// would add in ducts, on the packing as last flushed, and whether they can be pulled there.
func (sv *solver) penaltyMany(e int, odMM float64, n int) (int64, bool) {
	st, ed := sv.st, &sv.p.Edges[e]
	p := &sv.manyPack
	p.copyOf(&st.packs[e])
	for range n {
		if !p.place(odMM) {
			return 0, false
		}
	}
	extra := max(0, len(p.load)-(ed.Ducts+st.added[e]))
	if extra > 0 && !ed.canAdd() {
		return 0, false
	}
	return sv.ductsCents(e, st.added[e]+extra) - sv.ductsCents(e, st.added[e]), true
}
