package optimize

import (
	"math"
	"slices"
)

// Solve routes every demand of p and chooses its medium, minimising the plan cost (or, with
// Settings.Objective "length", the total route length). It returns an error only for a malformed
// Problem or Settings (every problem found, as an ErrorList wrapping ErrInvalidProblem); a
// demand that cannot be routed is listed in Solution.Infeasible and the others are routed.
//
// Method (see the package documentation for the cost):
//
//  1. Lower bounds: one Dijkstra per (anchor node, cost profile), where the anchor is the
//     demand end that more demands share (usually the cross-connect) and a cost profile is a
//     distinct (cable price, excluded flags) pair, with every proposed edge free. These trees
//     answer many searches outright and guide the others as A* heuristics.
//  2. A starting plan: demands routed one by one in demand order with each unopened proposed
//     edge charged its full FixedCents (edges opened by earlier demands are free). Each demand
//     takes the option whose route (within reach: LARAC and an exact label search, see
//     rcsp.go) plus option cost is cheapest; diverse demands take a diverse pair (disjoint.go,
//     pair.go).
//  3. Local search until no move lowers the cost or Settings.MaxRounds: rip up and reroute
//     each demand against the others' plan (an edge only it uses costs its full FixedCents, so
//     leaving it saves that); close an opened edge (forbid it, reroute its users, keep if
//     cheaper); open a run of proposed edges that some demand's unconstrained cheapest route
//     uses (treat it as free, reroute the demands it may help, keep if cheaper). Open moves are
//     screened first by bounds and by an in-place estimate, and a failed move is not retried
//     until a demand it involves changes route.
//  4. On problems with demands × proposed edges up to maxSecondStart, a second start routes the
//     first pass with every proposed edge free and is searched the same way; the cheaper plan
//     is kept. Up to maxKickWork, an iterated local search then perturbs the optimum (open a
//     run for everyone, or forbid an opened edge) and descends again, keeping improvements.
//
// Every move is kept only when the exact plan cost — compared lexicographically after the number
// of capacity violations, unrouted demands and diverse demands without a pair, then by total
// metres — strictly falls, so the search ends. Searches estimate duct penalties (capacity.go,
// penalty); the plan's cost always counts the exact duct packing. Complexity per round is O(D)
// searches, each O(|E| log |V|) at worst and usually far less; the exact reach search is
// exponential in the worst case and capped at maxLabels labels.
func Solve(p *Problem, opt Settings) (*Solution, error) {
	if err := validate(p, opt); err != nil {
		return nil, err
	}
	sv := newSolver(p, opt)
	sv.run()
	return sv.solution(), nil
}

// profile is a distinct cost profile: cable price and excluded flags.
type profile struct {
	cablePerM int64
	exclude   uint64
}

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
	ods      [][]float64 // per limited edge: cable ODs of users, parallel to users
	hsh      []uint64    // per limited edge: set hash of its (demand, OD) pairs
	packH    []uint64    // per limited edge: the hash its packing was computed for
	alt      []packState // per limited edge: the packing before the last flush
	dirty    []int32     // limited edges touched since the last flush
	isDirty  []bool
	free     []float64 // per limited edge: largest cable area it takes without a new duct, mm²
	total    int64     // plan cost in cents (without construction and ducts for the length objective)
	totalMM  int64
	overfull int
	unrouted int
	unmet    int
}

type key struct {
	overfull, unrouted, unmet int
	total, totalMM            int64
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
	if a.total != b.total {
		return a.total < b.total
	}
	return a.totalMM < b.totalMM
}

type solver struct {
	p         *Problem
	net       *Network
	length    bool
	maxRounds int
	rounds    int

	profiles []profile
	profBase [][]int64 // profile → edge → search weight (cents or mm), -1 when unusable
	profCent [][]int64 // profile → edge → cable + labour cents, -1 when unusable
	lenBase  [][]int64 // exclusion class → edge → mm, -1 when unusable
	lenClass map[uint64]int
	optProf  [][]int   // demand → option → profile
	reach    [][]int64 // demand → option → reach in mm
	invalid  []string  // demand → reason it cannot be routed at all, "" when usable
	from, to []int     // demand → free end and anchor
	fixedE   []int64   // edge → FixedCents charged when opened (0 for the length objective)
	limited  []bool
	tracked  []bool
	ductCent []int64 // edge → cents per added duct
	groups   map[int][]int32
	proposed []int32

	costTrees map[[2]int]*tree // (anchor, profile)

	failedClose map[int32]uint64  // edge → signature of its users when closing it failed
	failedOpen  map[string]uint64 // candidate → signature of its demands when opening failed
	lenTrees    map[[2]int]*tree  // (anchor, exclusion class)
	comps       map[uint64][]int  // excluded flags → component label per node (for reasons)

	cap capacity
	st  *state

	forbid  []bool
	phantom []bool
	blk     []uint32 // edges blocked for the current pair search
	blkSt   uint32

	srch   *search[int64]
	rc     *rcspScratch
	ps     *pairScratch
	pen    []int64
	penOK  []bool
	penSt  []uint32
	penN   uint32
	odBuf  []float64
	self   []uint32 // edges of the demand being estimated in place (see estimate)
	selfSt uint32
	plainW int64 // weight of the last pair found too long for its reach
}

func newSolver(p *Problem, opt Settings) *solver {
	net := NewNetwork(p.Nodes, p.Edges)
	ne := len(p.Edges)
	sv := &solver{
		p: p, net: net, length: opt.Objective == ObjectiveLength, maxRounds: opt.MaxRounds,
		lenClass: map[uint64]int{}, fixedE: make([]int64, ne), limited: make([]bool, ne), tracked: make([]bool, ne),
		ductCent: make([]int64, ne), groups: map[int][]int32{},
		costTrees: map[[2]int]*tree{}, lenTrees: map[[2]int]*tree{}, comps: map[uint64][]int{},
		failedClose: map[int32]uint64{}, failedOpen: map[string]uint64{},
		cap:    capacity{edges: p.Edges, fits: p.Fits},
		forbid: make([]bool, ne), phantom: make([]bool, ne), blk: make([]uint32, ne),
		srch: newSearch[int64](net), rc: newRCSPScratch(net), ps: newPairScratch(net),
		pen: make([]int64, ne), penOK: make([]bool, ne), penSt: make([]uint32, ne), self: make([]uint32, ne),
	}
	if sv.maxRounds == 0 {
		sv.maxRounds = DefaultMaxRounds
	}
	for i := range p.Edges {
		e := &p.Edges[i]
		if e.Proposed {
			sv.tracked[i] = true
			if p.AllowNew {
				sv.proposed = append(sv.proposed, int32(i))
				if !sv.length {
					sv.fixedE[i] = e.FixedCents
				}
			}
		}
		if e.limited() {
			sv.limited[i], sv.tracked[i] = true, true
			sv.ductCent[i] = centsFor(e.LengthM, e.AddDuctPerMCents)
		}
		if e.Group > 0 {
			sv.groups[e.Group] = append(sv.groups[e.Group], int32(i))
		}
	}
	profIdx := map[profile]int{}
	nd := len(p.Demands)
	sv.optProf, sv.reach, sv.invalid = make([][]int, nd), make([][]int64, nd), make([]string, nd)
	sv.from, sv.to = make([]int, nd), make([]int, nd)
	ends := make([]int, max(p.Nodes, 0))
	for d := range p.Demands {
		dm := &p.Demands[d]
		if sv.invalid[d] = demandProblem(p, dm); sv.invalid[d] != "" {
			continue
		}
		ends[dm.Source]++
		ends[dm.Target]++
		for o := range dm.Options {
			op := &dm.Options[o]
			pr := profile{cablePerM: op.CablePerMCents, exclude: op.ExcludeFlags}
			pi, ok := profIdx[pr]
			if !ok {
				pi = len(sv.profiles)
				profIdx[pr] = pi
				sv.profiles = append(sv.profiles, pr)
				sv.profBase = append(sv.profBase, sv.baseFor(pr, false))
				sv.profCent = append(sv.profCent, sv.baseFor(pr, true))
			}
			if _, ok := sv.lenClass[pr.exclude]; !ok {
				sv.lenClass[pr.exclude] = len(sv.lenBase)
				sv.lenBase = append(sv.lenBase, sv.lenFor(pr.exclude))
			}
			sv.optProf[d] = append(sv.optProf[d], pi)
			sv.reach[d] = append(sv.reach[d], reachMM(op))
		}
	}
	for d := range p.Demands {
		if sv.invalid[d] != "" {
			continue
		}
		dm := &p.Demands[d]
		// Anchor searches at the end more demands share (ties: the target).
		sv.from[d], sv.to[d] = dm.Source, dm.Target
		if ends[dm.Source] > ends[dm.Target] {
			sv.from[d], sv.to[d] = dm.Target, dm.Source
		}
	}
	return sv
}

func (sv *solver) usable(i int, exclude uint64) bool {
	e := &sv.p.Edges[i]
	return (!e.Proposed || sv.p.AllowNew) && e.Flags&exclude == 0
}

func (sv *solver) baseFor(pr profile, cents bool) []int64 {
	b := make([]int64, len(sv.p.Edges))
	for i := range b {
		e := &sv.p.Edges[i]
		switch {
		case !sv.usable(i, pr.exclude):
			b[i] = -1
		case sv.length && !cents:
			b[i] = sv.net.lenMM[i]
		default:
			b[i] = centsFor(e.LengthM, pr.cablePerM) + centsFor(e.LengthM, e.LabourPerMCents)
		}
	}
	return b
}

func (sv *solver) lenFor(exclude uint64) []int64 {
	b := make([]int64, len(sv.p.Edges))
	for i := range b {
		b[i] = -1
		if sv.usable(i, exclude) {
			b[i] = sv.net.lenMM[i]
		}
	}
	return b
}

func (sv *solver) costTree(anchor, prof int) *tree {
	k := [2]int{anchor, prof}
	if t, ok := sv.costTrees[k]; ok {
		return t
	}
	base := sv.profBase[prof]
	t := buildTree(sv.srch, anchor, func(e int32) (int64, bool) { return base[e], base[e] >= 0 })
	sv.costTrees[k] = t
	return t
}

func (sv *solver) lenTree(anchor int, exclude uint64) *tree {
	c := sv.lenClass[exclude]
	k := [2]int{anchor, c}
	if t, ok := sv.lenTrees[k]; ok {
		return t
	}
	base := sv.lenBase[c]
	t := buildTree(sv.srch, anchor, func(e int32) (int64, bool) { return base[e], base[e] >= 0 })
	sv.lenTrees[k] = t
	return t
}

func newState(sv *solver) *state {
	ne, nd := len(sv.p.Edges), len(sv.p.Demands)
	st := &state{ch: make([]choice, nd), count: make([]int32, ne), users: make([][]int32, ne),
		added: make([]int, ne), over: make([]bool, ne), packs: make([]ductPack, ne), sig: make([]uint64, nd),
		ods: make([][]float64, ne), hsh: make([]uint64, ne), packH: make([]uint64, ne),
		alt: make([]packState, ne), isDirty: make([]bool, ne), free: make([]float64, ne)}
	for e := range st.packs {
		if sv.limited[e] {
			st.packs[e].reset(circleMM2(sv.p.Edges[e].DuctIDMM))
			st.free[e] = math.Inf(-1)
			if sv.p.Edges[e].Ducts > 0 {
				st.free[e] = FillOneCable * st.packs[e].areaMM2
			}
		}
	}
	for d := range st.ch {
		st.ch[d].opt = -1
		st.unrouted++
	}
	return st
}

func (st *state) key() key { return key{st.overfull, st.unrouted, st.unmet, st.total, st.totalMM} }

func (sv *solver) od(d, o int) float64 { return sv.p.Demands[d].Options[o].CableODMM }

// Duct packings are computed lazily. add and remove only update an edge's users and a set
// hash of its (demand, cable OD) pairs; key flushes the edges whose hash differs from the one
// their packing was computed for. A reroute that keeps its route therefore costs nothing here,
// and a move that is reverted swaps back the previous packing (kept per edge) in O(1), instead
// of repacking every cable of a duct bank that thousands of cables share. Searches in between
// read the packing as last flushed, which is one more reason their duct penalties are estimates.

// packState is a saved packing and its outcome.
type packState struct {
	count []int
	used  []float64
	seg   []float64
	size  int
	added int
	ok    bool
	h     uint64
	valid bool
}

func itemHash(d int, od float64) uint64 { return mix(uint64(d)+1, math.Float64bits(od)) }

// touch records that demand d's cable (od) joined or left limited edge e.
func (sv *solver) touch(e, d int, od float64) {
	st := sv.st
	st.hsh[e] ^= itemHash(d, od)
	if !st.isDirty[e] {
		st.isDirty[e] = true
		st.dirty = append(st.dirty, int32(e))
	}
}

// flush brings the packing of every touched edge up to date.
func (sv *solver) flush() {
	st := sv.st
	for _, e32 := range st.dirty {
		e := int(e32)
		st.isDirty[e] = false
		if st.hsh[e] == st.packH[e] {
			continue
		}
		cur, alt := &st.packs[e], &st.alt[e]
		swapWith := alt.valid && alt.h == st.hsh[e]
		// Exchange the current packing with the saved one.
		cur.count, alt.count = alt.count, cur.count
		cur.used, alt.used = alt.used, cur.used
		cur.seg, alt.seg = alt.seg, cur.seg
		cur.size, alt.size = alt.size, cur.size
		added, ok := alt.added, alt.ok
		alt.added, alt.ok, alt.h, alt.valid = st.added[e], !st.over[e], st.packH[e], true
		if !swapWith {
			added, ok = sv.cap.needed(e, st.ods[e], cur)
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
		st.total += int64(added-st.added[e]) * sv.ductCent[e]
	}
	st.added[e] = added
	pk := &st.packs[e]
	st.free[e] = math.Inf(-1)
	if pk.size > 0 {
		st.free[e] = pk.seg[1]
	}
	if len(pk.count) < sv.p.Edges[e].Ducts+added {
		st.free[e] = max(st.free[e], FillOneCable*pk.areaMM2)
	}
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

func (sv *solver) add(d int, c choice) {
	st := sv.st
	st.ch[d] = c
	h := mix(0, uint64(c.opt+1))
	for _, leg := range c.legs {
		h = mix(h, 1<<40)
		for _, hp := range leg {
			h = mix(h, uint64(hp.Edge))
		}
	}
	st.sig[d] = h
	if c.opt < 0 {
		return
	}
	st.unrouted--
	if sv.p.Demands[d].Diverse && len(c.legs) < 2 {
		st.unmet++
	}
	st.total += c.varCost + sv.p.Demands[d].Options[c.opt].FixedCents
	st.totalMM += c.lenMM
	for _, leg := range c.legs {
		for _, h := range leg {
			e := h.Edge
			st.count[e]++
			if st.count[e] == 1 {
				st.total += sv.fixedE[e]
			}
			if sv.tracked[e] {
				i, _ := slices.BinarySearch(st.users[e], int32(d))
				st.users[e] = slices.Insert(st.users[e], i, int32(d))
				if sv.limited[e] {
					st.ods[e] = slices.Insert(st.ods[e], i, sv.od(d, c.opt))
					sv.touch(e, d, sv.od(d, c.opt))
				}
			}
		}
	}
}

func (sv *solver) remove(d int) choice {
	st := sv.st
	c := st.ch[d]
	if c.opt < 0 {
		return c
	}
	for _, leg := range c.legs {
		for _, h := range leg {
			e := h.Edge
			st.count[e]--
			if st.count[e] == 0 {
				st.total -= sv.fixedE[e]
			}
			if sv.tracked[e] {
				i, found := slices.BinarySearch(st.users[e], int32(d))
				if !found {
					panic("optimize: demand missing from an edge's users")
				}
				st.users[e] = slices.Delete(st.users[e], i, i+1)
				if sv.limited[e] {
					st.ods[e] = slices.Delete(st.ods[e], i, i+1)
					sv.touch(e, d, sv.od(d, c.opt))
				}
			}
		}
	}
	st.total -= c.varCost + sv.p.Demands[d].Options[c.opt].FixedCents
	st.totalMM -= c.lenMM
	if sv.p.Demands[d].Diverse && len(c.legs) < 2 {
		st.unmet--
	}
	st.unrouted++
	st.ch[d] = choice{opt: -1}
	return c
}

// penalty returns the price of the ducts demand d's cable (option o) would add to edge e if it
// were pulled last, and whether it can be pulled there at all; the state must not contain d.
// Pulling last is an approximation when d is not the last user in demand order (the packing
// follows demand order): the search uses it to stay O(ducts) per edge, and add and remove
// then account the exact duct count, so a move is judged on the exact cost.
func (sv *solver) penalty(d, o int, e int32, areaMM2 float64) (int64, bool) {
	st := sv.st
	if areaMM2 == 0 {
		return 0, true // a cable that takes no duct area
	}
	if sv.cap.fits == nil {
		var pen int64
		switch {
		case areaMM2 <= st.free[e]+1e-9:
			return 0, true
		case sv.p.Edges[e].AddDuctPerMCents > 0 && areaMM2 <= FillOneCable*st.packs[e].areaMM2+1e-9:
			pen = sv.ductCent[e]
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
	ods := sv.odBuf[:0]
	for _, u := range st.users[e] {
		ods = append(ods, sv.od(int(u), st.ch[u].opt))
	}
	ods = append(ods, sv.od(d, o))
	sv.odBuf = ods
	switch {
	case sv.cap.fits(int(e), ods, avail):
	case ed.AddDuctPerMCents > 0 && sv.cap.fits(int(e), ods, avail+1):
		pen = sv.ductCent[e]
	default:
		ok = false
	}
	if sv.length {
		pen = 0
	}
	sv.penSt[e], sv.pen[e], sv.penOK[e] = sv.penN, pen, ok
	return pen, ok
}

// weightFor returns demand d's marginal weight for option o against the current state: the
// profile's base weight, plus FixedCents on an unopened proposed edge, plus the price of any
// ducts its cable would add. It starts a new penalty memo.
func (sv *solver) weightFor(d, o int) func(e int32) (int64, bool) {
	sv.penN++
	if sv.penN == 0 {
		clear(sv.penSt)
		sv.penN = 1
	}
	base := sv.profBase[sv.optProf[d][o]]
	st := sv.st
	area := circleMM2(sv.od(d, o))
	return func(e int32) (int64, bool) {
		b := base[e]
		if b < 0 || sv.forbid[e] {
			return 0, false
		}
		if fx := sv.fixedE[e]; fx > 0 && (st.count[e] == 0 || (st.count[e] == 1 && sv.self[e] == sv.selfSt)) && !sv.phantom[e] {
			b += fx
		}
		if sv.limited[e] {
			pen, ok := sv.penalty(d, o, e, area)
			if !ok {
				return 0, false
			}
			b += pen
		}
		return b, true
	}
}

// route returns the best single path for demand d with option o against the current state:
// its hops (free end → anchor), marginal weight and whether one within reach exists.
func (sv *solver) route(d, o int) ([]Hop, int64, bool) {
	s, t := sv.from[d], sv.to[d]
	prof := sv.optProf[d][o]
	tr := sv.costTree(t, prof)
	limit := sv.reach[d][o]
	if lt := sv.lenTree(t, sv.profiles[prof].exclude); tr.dist[s] < 0 || lt.dist[s] > limit {
		return nil, 0, false
	}
	w := sv.weightFor(d, o)
	base := sv.profBase[prof]
	// The lower-bound tree path is optimal when every edge on it costs only its base weight.
	hops := tr.pathFrom(sv.net, s)
	exact := true
	for _, h := range hops {
		if c, ok := w(int32(h.Edge)); !ok || c != base[h.Edge] {
			exact = false
			break
		}
	}
	if exact && tr.lenMM[s] <= limit {
		return hops, tr.dist[s], true
	}
	if !sv.srch.run(s, t, w, treeH(tr)) {
		return nil, 0, false
	}
	hops = sv.srch.pathTo(t)
	if sv.srch.lenMM[t] <= limit {
		return hops, sv.srch.dist[t], true
	}
	lt := sv.lenTree(t, sv.profiles[prof].exclude)
	if lt.dist[s] > limit {
		return nil, 0, false
	}
	lw := func(e int32) (int64, bool) {
		if _, ok := w(e); !ok {
			return 0, false
		}
		return sv.net.lenMM[e], true
	}
	if !sv.srch.run(s, t, lw, treeH(lt)) || sv.srch.dist[t] > limit {
		return nil, 0, false
	}
	pd := sv.srch.pathTo(t)
	pl := larac(sv.net, sv.rc, s, t, limit, w, tr.dist, lt.dist, hops, pd)
	ub, _ := pathEval(sv.net, pl, w)
	if ex, ok, _ := labelSearch(sv.net, sv.rc, s, t, limit, w, tr.dist, lt.dist, ub); ok {
		pl = ex
	}
	c, _ := pathEval(sv.net, pl, w)
	return pl, c, true
}

// cand orders option candidates: by the objective (marginal cents; for the length objective
// the cents of the option on its shortest route), then metres, then option index.
type cand struct {
	obj   int64
	lenMM int64
	opt   int
}

func (a cand) less(b cand) bool {
	if a.obj != b.obj {
		return a.obj < b.obj
	}
	if a.lenMM != b.lenMM {
		return a.lenMM < b.lenMM
	}
	return a.opt < b.opt
}

// best returns demand d's best choice against the current state (which must not contain d).
func (sv *solver) best(d int) choice {
	if sv.invalid[d] != "" {
		return choice{opt: -1}
	}
	dm := &sv.p.Demands[d]
	type lbo struct {
		lb  int64
		opt int
	}
	order := make([]lbo, 0, len(dm.Options))
	for o := range dm.Options {
		lb := sv.costTree(sv.to[d], sv.optProf[d][o]).dist[sv.from[d]]
		if lb < 0 {
			continue
		}
		if dm.Diverse {
			lb *= 2
		}
		if !sv.length {
			lb += dm.Options[o].FixedCents
		}
		order = append(order, lbo{lb, o})
	}
	slices.SortFunc(order, func(a, b lbo) int {
		if a.lb != b.lb {
			if a.lb < b.lb {
				return -1
			}
			return 1
		}
		return a.opt - b.opt
	})
	bestC := cand{obj: math.MaxInt64}
	var bestCh choice
	bestCh.opt = -1
	consider := func(o int, legs [][]Hop, w int64) {
		var vc, mm int64
		cents := sv.profCent[sv.optProf[d][o]]
		for _, leg := range legs {
			for _, h := range leg {
				vc += cents[h.Edge]
				mm += sv.net.lenMM[h.Edge]
			}
		}
		c := cand{obj: w + dm.Options[o].FixedCents, lenMM: mm, opt: o}
		if sv.length {
			// The length objective routes by metres but chooses the cheapest medium.
			c.obj = vc + dm.Options[o].FixedCents
		}
		if c.less(bestC) {
			bestC = c
			bestCh = choice{opt: o, legs: legs, varCost: vc, lenMM: mm}
		}
	}
	pruned := func(x lbo) bool { return !sv.length && (x.lb > bestC.obj || (x.lb == bestC.obj && x.opt > bestC.opt)) }
	if dm.Diverse {
		var retry []lbo
		for _, x := range order {
			if pruned(x) {
				break
			}
			legs, w, ok, tooLong := sv.pair(d, x.opt, false)
			if ok {
				consider(x.opt, legs[:], w)
			} else if tooLong {
				// The cheapest pair, too long, bounds every pair within reach from below.
				x.lb = max(x.lb, w+dm.Options[x.opt].FixedCents)
				if sv.length {
					x.lb = 0
				}
				retry = append(retry, x)
			}
		}
		// Options whose cheapest pair is too long get the reach scan, if they can still win.
		for _, x := range retry {
			if pruned(x) {
				continue
			}
			if legs, w, ok, _ := sv.pair(d, x.opt, true); ok {
				consider(x.opt, legs[:], w)
			}
		}
		if bestCh.opt >= 0 {
			return bestCh
		}
		for i := range order { // single-path bounds are half the pair bounds
			if !sv.length {
				o := order[i].opt
				order[i].lb = (order[i].lb-dm.Options[o].FixedCents)/2 + dm.Options[o].FixedCents
			}
		}
	}
	for _, x := range order {
		if pruned(x) {
			break
		}
		if hops, w, ok := sv.route(d, x.opt); ok {
			consider(x.opt, [][]Hop{hops}, w)
		}
	}
	return bestCh
}

// reroute rips demand d up and routes it again; it keeps the new route only if the plan improves.
func (sv *solver) reroute(d int) bool {
	if sv.invalid[d] != "" {
		return false
	}
	before := sv.key()
	old := sv.remove(d)
	sv.add(d, sv.best(d))
	if sv.key().less(before) {
		return true
	}
	sv.remove(d)
	sv.add(d, old)
	return false
}

// rerouteAll reroutes the given demands in order under the current move; it reverts them all
// unless the plan improves.
func (sv *solver) rerouteAll(ds []int32, before key) bool {
	olds := make([]choice, len(ds))
	for i, d := range ds {
		olds[i] = sv.remove(int(d))
		sv.add(int(d), sv.best(int(d)))
	}
	return sv.keepOrRevert(ds, olds, before)
}

func (sv *solver) keepOrRevert(ds []int32, olds []choice, before key) bool {
	if sv.key().less(before) {
		return true
	}
	for i := len(ds) - 1; i >= 0; i-- {
		sv.remove(int(ds[i]))
		sv.add(int(ds[i]), olds[i])
	}
	return false
}

// closeMoves tries closing each opened proposed edge. A move is abandoned as soon as the
// users rerouted so far cost more than the edge's FixedCents saves (the remaining users would
// have to get cheaper than before, which rerouting around a closed edge does not do), and a
// move that failed is not tried again until one of the edge's users changes route.
func (sv *solver) closeMoves() bool {
	changed := false
	for _, e := range sv.proposed {
		st := sv.st
		if st.count[e] == 0 {
			continue
		}
		users := slices.Clone(st.users[e])
		sig := mix(uint64(e), 7)
		for _, d := range users {
			sig = mix(sig, st.sig[d])
		}
		if f, ok := sv.failedClose[e]; ok && f == sig {
			continue
		}
		before := sv.key()
		sv.forbid[e] = true
		olds := make([]choice, 0, len(users))
		var done []int32
		for _, d := range users {
			olds = append(olds, sv.remove(int(d)))
			sv.add(int(d), sv.best(int(d)))
			done = append(done, d)
			if k := sv.key(); k.overfull == before.overfull && k.unrouted == before.unrouted &&
				k.unmet == before.unmet && st.count[e] > 0 && k.total-before.total > sv.fixedE[e] {
				break
			}
		}
		sv.forbid[e] = false
		if sv.keepOrRevert(done, olds, before) {
			changed = true
		} else {
			sv.failedClose[e] = sig
		}
	}
	return changed
}

type openCand struct {
	edges    []int32
	affected []int32
}

// openCandidates lists runs of unopened proposed edges on the demands' unconstrained cheapest
// routes (from the lower-bound trees), each with the demands it may help.
func (sv *solver) openCandidates() []openCand {
	st := sv.st
	nd := len(sv.p.Demands)
	small := len(sv.proposed) <= 48 && nd <= 48
	var all []int32
	for d := 0; d < nd; d++ {
		if sv.invalid[d] == "" {
			all = append(all, int32(d))
		}
	}
	optUsers := map[int32][]int32{}
	seen := map[string]bool{}
	var cands []openCand
	addCand := func(edges []int32) {
		if len(edges) == 0 {
			return
		}
		es := slices.Clone(edges)
		slices.Sort(es)
		k := string(int32Key(es))
		if seen[k] {
			return
		}
		seen[k] = true
		cands = append(cands, openCand{edges: es})
	}
	for _, d := range all {
		o := st.ch[d].opt
		if o < 0 {
			o = 0
		}
		tr := sv.costTree(sv.to[d], sv.optProf[d][o])
		var run, whole []int32
		for _, h := range tr.pathFrom(sv.net, sv.from[d]) {
			e := int32(h.Edge)
			if sv.fixedE[e] > 0 && st.count[e] == 0 {
				run = append(run, e)
				whole = append(whole, e)
				optUsers[e] = append(optUsers[e], d)
				continue
			}
			addCand(run)
			run = run[:0]
		}
		addCand(run)
		addCand(whole)
	}
	if small {
		for _, e := range sv.proposed {
			if st.count[e] == 0 {
				addCand([]int32{e})
			}
		}
	}
	for i := range cands {
		if small {
			cands[i].affected = all
			continue
		}
		var aff []int32
		for _, e := range cands[i].edges {
			aff = append(aff, optUsers[e]...)
		}
		slices.Sort(aff)
		cands[i].affected = slices.Compact(aff)
	}
	return cands
}

func int32Key(es []int32) []byte {
	b := make([]byte, 0, 4*len(es))
	for _, e := range es {
		b = append(b, byte(e), byte(e>>8), byte(e>>16), byte(e>>24))
	}
	return b
}

// saveBound returns an upper bound of what demand d could save by any reroute: its current
// cost share (option, cable and labour, edges only it opened, ducts on its edges) less its
// lower-bound cost. Diverse demands still without a pair get no bound (math.MaxInt64 / 4).
func (sv *solver) saveBound(d int) int64 {
	st := sv.st
	c := st.ch[d]
	dm := &sv.p.Demands[d]
	if c.opt < 0 || (dm.Diverse && len(c.legs) < 2) {
		return math.MaxInt64 / 4
	}
	cur := c.varCost + dm.Options[c.opt].FixedCents
	for _, leg := range c.legs {
		for _, h := range leg {
			if sv.fixedE[h.Edge] > 0 && st.count[h.Edge] == 1 {
				cur += sv.fixedE[h.Edge]
			}
			if sv.limited[h.Edge] && st.added[h.Edge] > 0 {
				cur += sv.ductCent[h.Edge]
			}
		}
	}
	lb := int64(math.MaxInt64)
	for o := range dm.Options {
		t := sv.costTree(sv.to[d], sv.optProf[d][o]).dist[sv.from[d]]
		if t < 0 {
			continue
		}
		if dm.Diverse {
			t *= 2
		}
		lb = min(lb, t+dm.Options[o].FixedCents)
	}
	return max(0, cur-lb)
}

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
	sv.selfSt++
	if sv.selfSt == 0 {
		clear(sv.self)
		sv.selfSt = 1
	}
	for _, leg := range c.legs {
		for _, h := range leg {
			sv.self[h.Edge] = sv.selfSt
		}
	}
	dm := &sv.p.Demands[d]
	w := sv.weightFor(d, c.opt)
	cur := dm.Options[c.opt].FixedCents
	for _, leg := range c.legs {
		for _, h := range leg {
			we, ok := w(int32(h.Edge))
			if !ok {
				we = math.MaxInt64 / 8 // forbidden by the move: leaving it is a must
			}
			cur += we
		}
	}
	nb := sv.best(d)
	defer func() { sv.selfSt++ }() // end the in-place view
	if nb.opt < 0 || (dm.Diverse && len(nb.legs) < len(c.legs)) {
		return 0
	}
	nw := sv.weightFor(d, nb.opt)
	nc := dm.Options[nb.opt].FixedCents
	for _, leg := range nb.legs {
		for _, h := range leg {
			we, _ := nw(int32(h.Edge))
			nc += we
		}
	}
	return max(0, cur-nc)
}

// openMoves tries opening each candidate run. A candidate whose affected demands could not
// together save the FixedCents of its unopened edges (by saveBound) is skipped, and a move
// that failed is not tried again until an affected demand changes route.
func (sv *solver) openMoves() bool {
	changed := false
	for _, c := range sv.openCandidates() {
		st := sv.st
		var openCost int64
		sig := mix(0, 11)
		for _, e := range c.edges {
			if st.count[e] == 0 {
				openCost += sv.fixedE[e]
				sig = mix(sig, uint64(e))
			}
		}
		if openCost == 0 || len(c.affected) == 0 {
			continue
		}
		var bound int64
		for _, d := range c.affected {
			bound += sv.saveBound(int(d))
			sig = mix(sig, st.sig[d])
		}
		if bound <= openCost {
			continue
		}
		k := string(int32Key(c.edges))
		if f, ok := sv.failedOpen[k]; ok && f == sig {
			continue
		}
		for _, e := range c.edges {
			sv.phantom[e] = true
		}
		var gain int64
		for _, d := range c.affected {
			if gain += sv.estimate(int(d)); gain > openCost {
				break
			}
		}
		if gain <= openCost {
			for _, e := range c.edges {
				sv.phantom[e] = false
			}
			sv.failedOpen[k] = sig
			continue
		}
		before := sv.key()
		olds := make([]choice, len(c.affected))
		for i, d := range c.affected {
			olds[i] = sv.remove(int(d))
			sv.add(int(d), sv.best(int(d)))
		}
		for _, e := range c.edges {
			sv.phantom[e] = false
		}
		if sv.keepOrRevert(c.affected, olds, before) {
			changed = true
		} else {
			sv.failedOpen[k] = sig
		}
	}
	return changed
}

// improve runs local search rounds on the current state.
func (sv *solver) improve() int {
	rounds := 0
	moves := !sv.length && len(sv.proposed) > 0
	for rounds < sv.maxRounds {
		rounds++
		changed := false
		for d := range sv.p.Demands {
			if sv.reroute(d) {
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
		if !changed {
			break
		}
	}
	return rounds
}

// start routes every demand in order; with open, every proposed edge is free in this pass.
func (sv *solver) start(open bool) {
	sv.st = newState(sv)
	for _, e := range sv.proposed {
		sv.phantom[e] = open
	}
	for d := range sv.p.Demands {
		sv.add(d, sv.best(d))
	}
	for _, e := range sv.proposed {
		sv.phantom[e] = false
	}
}

func (sv *solver) run() {
	sv.start(false)
	sv.rounds = sv.improve()
	if sv.length || len(sv.proposed) == 0 {
		return
	}
	if len(sv.p.Demands)*len(sv.proposed) > maxSecondStart {
		return
	}
	sv.flush()
	first := sv.st
	sv.start(true)
	sv.rounds += sv.improve()
	if !sv.key().less(first.key()) {
		sv.st = first
	}
	if len(sv.p.Demands)*len(sv.proposed) <= maxKickWork {
		sv.kicks()
	}
}

// maxSecondStart bounds demands × proposed edges for which Solve also starts from the plan with
// every proposed edge free; on larger problems the second start seldom wins and doubles the time.
const maxSecondStart = 100000

// maxKickWork bounds demands × proposed edges for which Solve runs the perturbation phase.
const maxKickWork = 4096

// restore rebuilds the state from saved choices.
func (sv *solver) restore(saved []choice) {
	sv.st = newState(sv)
	for d, c := range saved {
		sv.add(d, c)
	}
}

// kicks is an iterated local search for small problems: from the local optimum, force a
// change — open a candidate run of proposed edges for everyone, or forbid an opened edge —
// descend again from there, and keep the result only if it beats the optimum it started from.
// It catches trades that no single move finds, such as closing two edges while opening two
// others. It repeats while a kick succeeds, at most Settings.MaxRounds times.
func (sv *solver) kicks() {
	for pass := 0; pass < sv.maxRounds; pass++ {
		improved := false
		var all []int32
		for d := range sv.p.Demands {
			if sv.invalid[d] == "" {
				all = append(all, int32(d))
			}
		}
		type kick struct {
			open  []int32
			close int32
		}
		var ks []kick
		for _, c := range sv.openCandidates() {
			ks = append(ks, kick{open: c.edges, close: -1})
		}
		for _, e := range sv.proposed {
			if sv.st.count[e] > 0 {
				ks = append(ks, kick{close: e})
			}
		}
		for _, k := range ks {
			before := sv.key()
			saved := slices.Clone(sv.st.ch)
			for _, e := range k.open {
				sv.phantom[e] = true
			}
			if k.close >= 0 {
				sv.forbid[k.close] = true
			}
			for _, d := range all {
				sv.remove(int(d))
				sv.add(int(d), sv.best(int(d)))
			}
			for _, e := range k.open {
				sv.phantom[e] = false
			}
			if k.close >= 0 {
				sv.improve()
				sv.forbid[k.close] = false
			}
			sv.rounds += sv.improve()
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
