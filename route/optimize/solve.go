package optimize

import (
	"context"
	"math"
	"slices"
	"sync/atomic"
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
//     answer many searches outright and guide the others as A* heuristics. On networks of
//     planTreeNodes or more, plan trees (bound.go) also charge the edges not yet opened, and
//     serve instead while they stay valid.
//  2. A starting plan: demands routed one by one in demand order with each unopened proposed
//     edge charged its full FixedCents and each unpaid charge its Cents (edges opened and
//     charges paid by earlier demands are free). Each demand
//     takes the option whose route (within reach: LARAC and an exact label search, see
//     rcsp.go) plus option cost is cheapest; diverse demands take a diverse pair (disjoint.go,
//     pair.go).
//  3. Local search until no move lowers the cost or Settings.MaxRounds: rip up and reroute
//     each demand against the others' plan (an edge only it uses costs its full FixedCents, so
//     leaving it saves that); close an opened edge (forbid it, reroute its users, keep if
//     cheaper); open a run of proposed edges that some demand's unconstrained cheapest route
//     uses (treat it as free, reroute the demands it may help, keep if cheaper), or a run of
//     existing edges on such routes whose next duct needs a trench no cable has paid yet
//     (price that trench free the same way: the first added duct's trench is a fixed charge
//     too, which no lone reroute pays, so a trunk's street would stay where the start put
//     it); drop a paid charge (forbid its edges, reroute its users, keep if cheaper); replace a
//     stretch of a single-leg route between two nodes one edge joins by that edge (shortcut.go:
//     the searches price a charge on each edge of its set, so a route may go round a block to
//     avoid paying one twice); at a local optimum, give a full duct run's room to a demand whose
//     cheapest route with the runs' room aside is cheaper than its own (eject.go: a cable in
//     those runs rerouted with them forbidden, the demand rerouted into the room, kept if
//     cheaper). Open moves are
//     screened first by bounds and by an in-place estimate, and a failed move is not retried
//     until a demand it involves changes route. A reroute is skipped when its memo shows that
//     no edge its last searches read has become cheaper (memo.go): it would change nothing.
//  4. On problems with demands × (proposed edges + charges) up to maxSecondStart, a second
//     start routes the first pass with every proposed edge and charge free and is searched the
//     same way; the cheaper plan is kept. Up to maxKickWork (demands × proposed edges), an
//     iterated local search then perturbs the optimum (open a run that could pay for itself,
//     or forbid an opened edge), moves the demands concerned and descends again, keeping
//     improvements and stopping at optima already seen.
//
// Transit-free nodes (Problem.NoTransit) end every search path that reaches them, except at
// the search's own root and goal.
//
// Every move is kept only when the exact plan cost — compared lexicographically after the number
// of capacity violations, unrouted demands and diverse demands without a pair, then by total
// metres — strictly falls, so the search ends. Searches estimate duct penalties (capacity.go,
// penalty); the plan's cost always counts the exact duct packing. Complexity per round is O(D)
// searches, each O(|E| log |V|) at worst and usually far less; the exact reach search is
// exponential in the worst case and capped at maxLabels labels.
func Solve(p *Problem, opt Settings) (*Solution, error) {
	return SolveContext(context.Background(), p, opt)
}

// SolveContext is Solve that gives up when ctx is done: it then returns ctx's error and no
// solution, within one search step (see stop.go). A ctx that is never done gives the same
// Solution as Solve.
func SolveContext(ctx context.Context, p *Problem, opt Settings) (*Solution, error) {
	if err := validate(p, opt); err != nil {
		return nil, err
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	sv := newSolver(p, opt)
	sv.ctx = ctx
	sv.run()
	if sv.stopped() {
		return nil, ctx.Err()
	}
	return sv.solution(), nil
}

// profile is a distinct cost profile: cable price, excluded flags and cables per leg.
type profile struct {
	cablePerM int64
	exclude   uint64
	cables    int
}

type solver struct {
	ctx       context.Context // SolveContext's; see stopped
	halted    bool            // ctx was found done
	abandon   atomic.Bool     // tells the ascent running beside the solve to give up (ascendAsync)
	p         *Problem
	net       *Network
	length    bool
	maxRounds int
	rounds    int

	profiles []profile
	profBase [][]int64 // profile → edge → search weight (cents or mm), -1 when unusable
	profCent [][]int64 // profile → edge → cable + labour cents, -1 when unusable
	freeOpt  [][]int64 // demand → option → free level, for a demand of several options (freeLevels)
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
	// trenchCent is edge → cents of the trench the first added duct needs (ductsCents).
	trenchCent []int64
	groups     map[int][]int32
	// Places drawn as several nodes (Problem.Sites): each node's, nil when the problem has
	// none; each place's edges (those with an end at one of its nodes); a stamp per place for
	// sharedSite.
	siteOf    []int32
	siteEdges [][]int32
	siteMark  []uint32
	siteStamp uint32
	avE       []uint32 // avoiding's stamp of the edges to avoid
	avSt      uint32
	proposed  []int32

	costTrees   []*tree     // slot × profiles + profile, see slot
	planTrees   []*planTree // slot × profiles + profile
	planList    []*planTree // planTrees in creation order
	upHeap      radixHeap   // freeUp's scratch: its keys never fall below the last popped
	pairless    []uint8     // demand × exclusion class → 0 not known, 1 a pair may exist, 2 none can (noPair)
	legSet      []int32     // demand → index into legMin (initLegCosts)
	legMin      [][]int64   // set of cost profiles → edge → cheapest cents, -1 when none may use it
	freeUps     int         // plan trees brought up to date in place (for the tests)
	anchorSlot  []int32     // node → slot of the trees rooted there, -1 when none yet
	nSlots      int
	profLen     []int   // profile → exclusion class
	propIdx     []int32 // edge → index into proposed, -1 for other edges
	nPhantom    int     // phantom edges
	freeHash    uint64  // set hash of the proposed edges free now (open or phantom)
	keepTrees   int     // plan trees kept per (anchor, profile) for other free sets
	plainBounds bool    // bound serves the plain trees only (see bound)
	roundNo     int     // local search rounds begun, for rebuilding loose plan trees

	failedClose map[int32]uint64    // edge → signature of its users when closing it failed
	failedOpen  map[string]uint64   // candidate → signature of its demands when opening failed
	failedSwap  map[[2]int32]uint64 // (opened span, span) → signature of its demands when the swap failed
	swapWork    int                 // reroutes swapMoves made
	failedEject map[[2]int32]uint64 // (victim, demand wanting room) → their signature when the eject move failed
	ejectWork   int                 // searches and reroutes the current ejectMoves call made
	ignoreRoom  bool                // weightFor leaves the limited edges' duct room aside (wantedRoom)
	lenTrees    []*tree             // slot × exclusion classes + class
	comps       map[uint64][]int    // excluded flags → component label per node (for reasons)

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
	cntBuf []int32 // cables per user beside odBuf (solution)
	// multi is set when some option pulls several cables (Option.Cables > 1): only then are
	// the counts kept per limited edge (state.cnt).
	multi bool
	// manyPack is penaltyMany's scratch packing.
	manyPack ductPack
	self     []uint32 // edges of the demand being estimated in place (see estimate)
	selfSt   uint32
	// own marks the edges where the last flushed packing holds the cable of the demand being
	// routed, of area ownArea (mm²); see markOwn and penalty.
	own     []uint32
	ownSt   uint32
	ownArea float64
	bounds  []int64           // openMoves' saving bounds per affected demand
	pool    []*state          // states dropped, for newState to reuse
	estMemo map[estKey]estRec // open-move estimates kept between passes (estimateFor)
	gbuf    []int             // sharedGroup's scratch
	kickBuf []int32           // the demands a kick moves
	optima  map[uint64]bool   // plan hashes of the local optima the kicks reached
	// saveBound's parts per demand (sbCur, -1 for no bound) and option (sbTree, at optOff),
	// valid while sbAt == sbVer.
	optOff []int
	sbAt   []uint32
	sbVer  uint32
	sbCur  []int64
	sbTree []*tree
	// forced is, per demand, the edges every route of it takes (forcedFrom), valid where
	// forcedOK.
	forced   [][]int32
	forcedOK []bool
	// openCandidates' scratch: valid demands, demands per proposed edge, edge runs; per
	// existing edge whose next duct needs a trench, the demands whose cheapest route crosses it
	// (trenchUsers, listed in trenchTouched), and that edge's runs.
	valid                     []int32
	optUsers                  [][]int32
	candBuf, runBuf, wholeBuf []int32
	trenchUsers               [][]int32
	trenchTouched             []int32
	trenchRun, trenchWhole    []int32
	// trenchFree marks the existing edges whose first added duct an open move prices without
	// its trench (nextDuctCents), as phantom does a proposed edge's FixedCents.
	trenchFree []bool
	trenchWork int       // estimates and reroutes spent on such moves (trenchBudget)
	areas      []float64 // distinct cable cross-sections of the options, ascending, mm²
	// Reroute memos (memo.go).
	memos  []rerouteMemo
	epoch  uint64
	ranks  [][]int32 // per demand: ranks in areas of its options' cable sizes
	rec    bool      // record the edges the searches read
	qSt    []uint32
	qStamp uint32
	qList  []int32
	qLevel []uint8 // per edge: priceLevel when a memo search read it
	// For the test of the memos: memoAudit reroutes every demand whose memo holds
	// (auditMemo) and counts in memoWrong the reroutes that would have improved the plan.
	memoAudit bool
	memoWrong int
	ord       []int32 // openMoves' estimate order
	plainW    int64   // weight of the last pair found too long for its reach
	// Charges (Problem.Charges): the charges of edge e are chList[chStart[e]:chStart[e+1]]
	// (nil without charges); chOn says whether the searches and the plan cost price them
	// (not for the length objective). chargeHash is the set hash of the charges paid.
	chStart []int32
	chList  []int32
	chOn    bool
	chFree  bool    // every charge is free to the searches (the open start)
	kinds   []uint8 // edge → kindFixed | kindCharged | kindLimited (newSolver)
	// Deferred removals (state.go, settle): the demand removed last, -1 when none is
	// pending, and the edges whose users still list it (pendMark == pendSt).
	pendD      int
	pendE      []int32
	pendMark   []uint32
	pendSt     uint32
	chargeHash uint64
	// Per charge: uses by the demand being scanned (chCnt, valid where chMark == chStamp;
	// see scanCharges) and by the demand estimated in place (chSelf, where its st == selfSt);
	// chCents is each charge's Cents, side by side for chargeCents.
	chCnt   []int32
	chMark  []uint32
	chStamp uint32
	chTouch []int32
	chSelf  []selfUses
	chCents []int64
	// joinSeen, joinStamp and joinQueue are the scratch of joined; joinWide marks the nodes
	// whose walk went past joinBudget while joinEpoch held, within joinedAll (joinOn).
	joinSeen  []uint32
	joinStamp uint32
	joinQueue []int32
	joinWide  []uint32
	joinEpoch uint32
	joinOn    bool
	// shorten's scratch: per node its position along the leg (posAt, valid where posSt ==
	// posN) and the leg's nodes.
	posAt  []int32
	posSt  []uint32
	posN   uint32
	posBuf []int32
	// warm is Settings.Start, the warm start (startWarm).
	warm []StartRoute
	// startUnused are the demands whose start route did not fit (Solution.StartUnused).
	startUnused []int
	// startNoRoom are those of them whose route fitted but whose cables did not fit the
	// ducts (Solution.StartNoRoom).
	startNoRoom []StartNoRoom
	// placeOnly: the warm start's plan, mended, is the answer (Settings.PlaceOnly).
	placeOnly bool
	// dual is the lower bound's ascent (lowerbound.go), nil for the length objective and
	// until joinDual takes it from waitDual, which waits for the ascent running beside.
	dual     *dualBound
	waitDual func() *dualBound
	// Pairs bound to a place (sitebound.go): per demand × exclusion class, 0 not known, 1 a
	// pair that passes no place twice may exist, 2 none can; placeFlow's scratch; for the
	// tests, noSiteBound proves nothing, so that the searches run as without it.
	siteless    []uint8
	sfl         placeFlowScratch
	noSiteBound bool
}

func newSolver(p *Problem, opt Settings) *solver {
	net := NewNetwork(p.Nodes, p.Edges)
	ne := len(p.Edges)
	sv := &solver{
		ctx: context.Background(), p: p, net: net, length: opt.Objective == ObjectiveLength, maxRounds: opt.MaxRounds,
		lenClass: map[uint64]int{}, fixedE: make([]int64, ne), limited: make([]bool, ne), tracked: make([]bool, ne),
		ductCent: make([]int64, ne), trenchCent: make([]int64, ne), groups: map[int][]int32{},
		propIdx: make([]int32, ne), comps: map[uint64][]int{}, anchorSlot: make([]int32, max(p.Nodes, 0)),
		failedClose: map[int32]uint64{}, failedOpen: map[string]uint64{}, failedSwap: map[[2]int32]uint64{}, failedEject: map[[2]int32]uint64{}, estMemo: map[estKey]estRec{},
		cap:    capacity{edges: p.Edges, fits: p.Fits},
		forbid: make([]bool, ne), phantom: make([]bool, ne), trenchFree: make([]bool, ne), blk: make([]uint32, ne),
		srch: newSearch[int64](net), rc: newRCSPScratch(net), ps: newPairScratch(net),
		pen: make([]int64, ne), penOK: make([]bool, ne), penSt: make([]uint32, ne), self: make([]uint32, ne), own: make([]uint32, ne),
		memos: make([]rerouteMemo, len(p.Demands)), qSt: make([]uint32, ne), qLevel: make([]uint8, ne),
		selfSt: 1, ownSt: 1, // see endOwn
		pendD: -1, pendSt: 1, pendMark: make([]uint32, ne),
		warm: opt.Start, placeOnly: opt.PlaceOnly && len(opt.Start) > 0,
	}
	if sv.maxRounds == 0 {
		sv.maxRounds = DefaultMaxRounds
	}
	sv.rc.stop = sv.stopped
	if len(p.NoTransit) > 0 {
		net.noTransit = p.NoTransit
	}
	sv.initCharges()
	sv.initSites()
	sv.keepTrees = min(8, 20000/max(p.Nodes, 1)) // a few MB of trees at most
	sv.plainBounds = p.Nodes < planTreeNodes
	for i := range p.Edges {
		e := &p.Edges[i]
		sv.propIdx[i] = -1
		if e.Proposed {
			sv.tracked[i] = true
			if p.AllowNew {
				sv.propIdx[i] = int32(len(sv.proposed))
				sv.proposed = append(sv.proposed, int32(i))
				if !sv.length {
					sv.fixedE[i] = e.FixedCents
				}
			}
		}
		if e.limited() {
			sv.limited[i], sv.tracked[i] = true, true
			sv.ductCent[i] = centsFor(e.LengthM, e.AddDuctPerMCents)
			if !e.Proposed { // a proposed edge's trench is its FixedCents
				sv.trenchCent[i] = centsFor(e.LengthM, e.AddTrenchPerMCents) + e.AddTrenchCents
			}
		}
		if e.Group > 0 {
			sv.groups[e.Group] = append(sv.groups[e.Group], int32(i))
		}
	}
	sv.kinds = make([]uint8, ne)
	for i := range sv.kinds {
		if sv.fixedE[i] > 0 {
			sv.kinds[i] |= kindFixed
		}
		if sv.chOn && sv.chStart[i] != sv.chStart[i+1] {
			sv.kinds[i] |= kindCharged
		}
		if sv.limited[i] {
			sv.kinds[i] |= kindLimited
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
			pr := profile{cablePerM: op.CablePerMCents, exclude: op.ExcludeFlags, cables: op.cables()}
			pi, ok := profIdx[pr]
			if !ok {
				pi = len(sv.profiles)
				profIdx[pr] = pi
				sv.profiles = append(sv.profiles, pr)
				sv.profBase = append(sv.profBase, sv.baseFor(pr, false))
				sv.profCent = append(sv.profCent, sv.baseFor(pr, true))
				if _, ok := sv.lenClass[pr.exclude]; !ok {
					sv.lenClass[pr.exclude] = len(sv.lenBase)
					sv.lenBase = append(sv.lenBase, sv.lenFor(pr.exclude))
				}
				sv.profLen = append(sv.profLen, sv.lenClass[pr.exclude])
			}
			sv.areas = append(sv.areas, circleMM2(op.CableODMM))
			sv.multi = sv.multi || op.cables() > 1
			sv.optProf[d] = append(sv.optProf[d], pi)
			sv.reach[d] = append(sv.reach[d], reachMM(op))
		}
	}
	for i := range sv.anchorSlot {
		sv.anchorSlot[i] = -1
	}
	sv.optOff = make([]int, nd)
	nopt := 0
	for d := range p.Demands {
		sv.optOff[d] = nopt
		nopt += len(p.Demands[d].Options)
	}
	sv.sbAt, sv.sbCur, sv.sbTree = make([]uint32, nd), make([]int64, nd), make([]*tree, nopt)
	slices.Sort(sv.areas)
	sv.areas = slices.Compact(sv.areas)
	sv.ranks = make([][]int32, nd)
	for d := range p.Demands {
		if sv.invalid[d] != "" {
			continue
		}
		for _, op := range p.Demands[d].Options {
			r, _ := slices.BinarySearch(sv.areas, circleMM2(op.CableODMM))
			if !slices.Contains(sv.ranks[d], int32(r)) {
				sv.ranks[d] = append(sv.ranks[d], int32(r))
			}
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

// initCharges indexes the charges by edge and marks their edges tracked (their users are
// kept, for the charge moves).
func (sv *solver) initCharges() {
	p := sv.p
	if len(p.Charges) == 0 {
		return
	}
	ne, nc := len(p.Edges), len(p.Charges)
	sv.chStart = make([]int32, ne+1)
	for _, c := range p.Charges {
		for _, e := range c.Edges {
			sv.chStart[e+1]++
		}
	}
	for e := 0; e < ne; e++ {
		sv.chStart[e+1] += sv.chStart[e]
	}
	sv.chList = make([]int32, sv.chStart[ne])
	fill := append([]int32(nil), sv.chStart[:ne]...)
	for c, ch := range p.Charges {
		for _, e := range ch.Edges {
			sv.chList[fill[e]] = int32(c)
			fill[e]++
		}
	}
	sv.chOn = !sv.length
	if sv.chOn {
		for _, ch := range p.Charges {
			for _, e := range ch.Edges {
				sv.tracked[e] = true
			}
		}
	}
	sv.chCnt, sv.chMark = make([]int32, nc), make([]uint32, nc)
	sv.chSelf, sv.chCents = make([]selfUses, nc), make([]int64, nc)
	for k, ch := range p.Charges {
		sv.chCents[k] = ch.Cents
	}
}

// selfUses is a charge's uses by the demand estimated in place, valid where st == selfSt:
// the two sit side by side, as chargeCents reads them together.
type selfUses struct {
	st uint32
	n  int32
}

// chargesOf returns the charges of edge e.
func (sv *solver) chargesOf(e int) []int32 { return sv.chList[sv.chStart[e]:sv.chStart[e+1]] }

// scanCharges counts, per charge, the uses of choice c's edges (chCnt, for the charges listed
// in chTouch, in order of first use).
func (sv *solver) scanCharges(c choice) {
	sv.chStamp++
	if sv.chStamp == 0 {
		clear(sv.chMark)
		sv.chStamp = 1
	}
	sv.chTouch = sv.chTouch[:0]
	for _, leg := range c.legs {
		for _, h := range leg {
			for _, k := range sv.chargesOf(h.Edge) {
				if sv.chMark[k] != sv.chStamp {
					sv.chMark[k], sv.chCnt[k] = sv.chStamp, 0
					sv.chTouch = append(sv.chTouch, k)
				}
				sv.chCnt[k]++
			}
		}
	}
}

// ownCharges returns what the charges cost demand d's choice c (in the plan) as the searches
// price it once d is out: each charge only d uses, on every edge of c that belongs to it;
// and a hash of which charges c touches that other demands use too.
func (sv *solver) ownCharges(c choice) (cents int64, sig uint64) {
	sv.scanCharges(c)
	st := sv.st
	sig = mix(0, 37)
	for _, k := range sv.chTouch {
		if st.chUse[k] == sv.chCnt[k] {
			cents += int64(sv.chCnt[k]) * sv.p.Charges[k].Cents
		} else {
			sig = mix(sig, uint64(k))
		}
	}
	return cents, sig
}

// chargeCents is what the charges of edge e add to a route's weight now: every charge of e
// that no other demand pays (an estimate in place, see estimate, does not count the demand's
// own uses).
func (sv *solver) chargeCents(e int32) int64 {
	st := sv.st
	var b int64
	for _, k := range sv.chList[sv.chStart[e]:sv.chStart[e+1]] {
		if u := st.chUse[k]; u == 0 || (sv.chSelf[k].st == sv.selfSt && u == sv.chSelf[k].n) {
			b += sv.chCents[k]
		}
	}
	return b
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
			b[i] = cableCents(e, pr.cablePerM) + labourCents(e, pr.cables)
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

// slot returns the index of anchor among the anchors seen so far, growing the tree tables
// (indexed slot × profiles + profile, slot × exclusion classes + class) by one when new.
func (sv *solver) slot(anchor int) int {
	if s := sv.anchorSlot[anchor]; s >= 0 {
		return int(s)
	}
	s := sv.nSlots
	sv.anchorSlot[anchor] = int32(s)
	sv.nSlots++
	np, nl := len(sv.profiles), len(sv.lenBase)
	sv.costTrees = append(sv.costTrees, make([]*tree, np)...)
	sv.planTrees = append(sv.planTrees, make([]*planTree, np)...)
	sv.lenTrees = append(sv.lenTrees, make([]*tree, nl)...)
	return s
}

// costTree returns the lower-bound tree of (anchor, profile) with every proposed edge free.
func (sv *solver) costTree(anchor, prof int) *tree {
	k := sv.slot(anchor)*len(sv.profiles) + prof
	if t := sv.costTrees[k]; t != nil {
		return t
	}
	base := sv.profBase[prof]
	t := buildTree(sv.srch, anchor, func(e int32) (int64, bool) { return base[e], base[e] >= 0 })
	sv.costTrees[k] = t
	return t
}

// lenTree returns the shortest-length tree of anchor over the edges open to exclude's media.
func (sv *solver) lenTree(anchor int, exclude uint64) *tree {
	return sv.lenTreeOf(anchor, sv.lenClass[exclude])
}

func (sv *solver) lenTreeOf(anchor, c int) *tree {
	k := sv.slot(anchor)*len(sv.lenBase) + c
	if t := sv.lenTrees[k]; t != nil {
		return t
	}
	base := sv.lenBase[c]
	t := buildTree(sv.srch, anchor, func(e int32) (int64, bool) { return base[e], base[e] >= 0 })
	sv.lenTrees[k] = t
	return t
}

// weightFor returns demand d's marginal weight for option o against the current state: the
// profile's base weight, plus FixedCents on an unopened proposed edge, plus the Cents of each
// of the edge's charges that no other demand pays, plus the price of any ducts its cable
// would add. It starts a new penalty memo.
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
		if sv.rec {
			sv.noteQuery(e)
		}
		b := base[e]
		if b < 0 || sv.forbid[e] {
			return 0, false
		}
		k := sv.kinds[e]
		if k == 0 {
			return b, true // most edges: the base weight alone
		}
		if k&kindFixed != 0 && (st.count[e] == 0 || (st.count[e] == 1 && sv.self[e] == sv.selfSt)) && !sv.phantom[e] {
			b += sv.fixedE[e]
		}
		if k&kindCharged != 0 && !sv.chFree {
			b += sv.chargeCents(e)
		}
		if k&kindLimited != 0 && !sv.ignoreRoom {
			pen, ok := sv.penalty(d, o, e, area)
			if !ok {
				return 0, false
			}
			b += pen
		}
		return b, true
	}
}

// Edge kinds (solver.kinds): what besides its base weight weightFor may add on an edge, so
// that the searches read one byte, not three arrays, on the edges that add nothing.
const (
	kindFixed   = 1 << iota // FixedCents > 0 (proposed, cost objective)
	kindCharged             // has charges, and the charges are priced (solver.chOn)
	kindLimited             // limited duct capacity
)

// route returns the best single path for demand d with option o against the current state:
// its hops (free end → anchor), marginal weight and whether one within reach exists. When the
// cheapest path is too long, route returns it with tooLong set and ok false, without the
// search within reach (routeWithin), which costs tens of searches: its weight bounds every
// path within reach from below, so that best may rule the option out first. A path weighing
// more than most is not looked for (bestBelow's mostWeight): route then returns none, as for
// an option with no route.
func (sv *solver) route(d, o int, most int64) (hops []Hop, weight int64, ok, tooLong bool) {
	s, t := sv.from[d], sv.to[d]
	prof := sv.optProf[d][o]
	bd := sv.bound(t, prof)
	tr := bd.t
	limit := sv.reach[d][o]
	if lt := sv.lenTreeOf(t, sv.profLen[prof]); tr.dist[s] < 0 || lt.dist[s] > limit || tr.dist[s] > most {
		return nil, 0, false, false
	}
	w := sv.weightFor(d, o)
	base := sv.profBase[prof]
	// The lower-bound tree path is optimal when every edge on it costs what the tree charged.
	exact := tr.lenMM[s] <= limit
	for v := s; exact && tr.pred[v] >= 0; {
		e := tr.pred[v]
		if c, ok := w(e); !ok || c != sv.treeWeight(bd, base, e) {
			exact = false
		}
		ed := &sv.p.Edges[e]
		if ed.From == v {
			v = ed.To
		} else {
			v = ed.From
		}
	}
	if exact {
		return tr.pathFrom(sv.net, s), tr.dist[s], true, false
	}
	if !sv.srch.runAtMost(s, t, w, treeH(tr), most < math.MaxInt64, most) {
		return nil, 0, false, false
	}
	hops = sv.srch.pathTo(t)
	if sv.srch.lenMM(t) <= limit {
		return hops, sv.srch.dist(t), true, false
	}
	return hops, sv.srch.dist(t), false, true
}

// routeWithin is route's search within reach for demand d with option o, whose cheapest path
// cheapest (from route) is too long: LARAC's path, then the exact label search below its cost;
// none when no path within reach weighs at most most (bestBelow's mostWeight).
func (sv *solver) routeWithin(d, o int, cheapest []Hop, most int64) ([]Hop, int64, bool) {
	s, t := sv.from[d], sv.to[d]
	prof := sv.optProf[d][o]
	tr := sv.bound(t, prof).t
	limit := sv.reach[d][o]
	w := sv.weightFor(d, o)
	lt := sv.lenTreeOf(t, sv.profLen[prof])
	if lt.dist[s] > limit {
		return nil, 0, false
	}
	lw := func(e int32) (int64, bool) {
		if _, ok := w(e); !ok {
			return 0, false
		}
		return sv.net.lenMM[e], true
	}
	if !sv.srch.run(s, t, lw, treeH(lt)) || sv.srch.dist(t) > limit {
		return nil, 0, false
	}
	pd := sv.srch.pathTo(t)
	pl := larac(sv.net, sv.rc, s, t, limit, w, tr.dist, lt.dist, cheapest, pd, most)
	if pl == nil {
		return nil, 0, false
	}
	ub, _ := pathEval(sv.net, pl, w)
	if ex, ok, _ := labelSearch(sv.net, sv.rc, s, t, limit, w, tr.dist, lt.dist, min(ub, most)); ok {
		pl = ex
	}
	c, _ := pathEval(sv.net, pl, w)
	if c > most {
		return nil, 0, false
	}
	return pl, c, true
}

// cand orders option candidates: a diverse pair that passes no place twice (Problem.Sites)
// first, then by the objective (marginal cents; for the length objective the cents of the
// option on its shortest route), then metres, then option index.
type cand struct {
	atSite bool
	obj    int64
	lenMM  int64
	opt    int
}

func (a cand) less(b cand) bool {
	if a.atSite != b.atSite {
		return b.atSite
	}
	if a.obj != b.obj {
		return a.obj < b.obj
	}
	if a.lenMM != b.lenMM {
		return a.lenMM < b.lenMM
	}
	return a.opt < b.opt
}

// best returns demand d's best choice against the current state (which must not contain d).
func (sv *solver) best(d int) choice { return sv.bestBelow(d, math.MaxInt64) }

// bestBelow is best, for a caller that wants only a choice whose objective (cost objective) is
// below below: an option whose lower bound reaches it is not searched, and the result is opt
// −1 when no option is below it. An estimate that asks what a demand would save needs no route
// that saves nothing. For a diverse demand a limit means a pair below it: the single route
// best falls back on when no pair exists is not looked for (it would always weigh less than
// the pair it is compared with; review 13).
func (sv *solver) bestBelow(d int, below int64) choice { return sv.bestOf(d, below, math.MaxInt64) }

// bestOf is bestBelow for a caller to which, besides, only a pair whose objective is under
// useful matters, and which takes any other answer (another pair, none, a single route) as
// no better than what it has: options whose every pair reaches useful are not searched, and
// no single route is looked for when no pair is found (estimate, for a demand whose pair
// passes a place). With useful math.MaxInt64 it is bestBelow.
func (sv *solver) bestOf(d int, below, useful int64) choice {
	if sv.invalid[d] != "" {
		return choice{opt: -1}
	}
	dm := &sv.p.Demands[d]
	type lbo struct {
		lb  int64
		lb0 int64 // lb as first found, from the lower-bound tree alone
		opt int
	}
	var buf [8]lbo
	order := buf[:0]
	for o := range dm.Options {
		lb := sv.bound(sv.to[d], sv.optProf[d][o]).t.dist[sv.from[d]]
		if lb < 0 {
			continue
		}
		legs := 1
		if dm.Diverse {
			lb *= 2
			legs = 2
		}
		if !sv.length {
			lb += sv.optionCents(d, o, legs)
		}
		order = append(order, lbo{lb, lb, o})
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
	bestC := cand{atSite: true, obj: math.MaxInt64}
	var bestCh choice
	bestCh.opt = -1
	var bestLegs [2][]Hop // the legs of bestCh, made a slice only for the winner
	nLegs := 0
	consider := func(o int, legs [2][]Hop, n int, w int64) {
		vc, mm := sv.legsCost(d, o, legs[:n])
		c := cand{atSite: n == 2 && sv.sharedSite(legs[:]) != 0, obj: w + sv.optionCents(d, o, n), lenMM: mm, opt: o}
		if c.atSite && below < math.MaxInt64 {
			// A caller with a limit has a pair that passes no place twice (stayCost): one that
			// does is never wanted in its place.
			return
		}
		if sv.length {
			// The length objective routes by metres but chooses the cheapest medium.
			c.obj = vc + sv.optionCents(d, o, n)
		}
		if c.less(bestC) {
			bestC = c
			bestCh = choice{opt: o, varCost: vc, lenMM: mm}
			bestLegs, nLegs = legs, n
		}
	}
	done := func() choice {
		if bestCh.opt >= 0 {
			bestCh.legs = append([][]Hop(nil), bestLegs[:nLegs]...)
		}
		return bestCh
	}
	// bound: whether no pair of d passes no place twice (siteBound, every option): then a
	// best pair that passes one is beaten by weight alone, as one that does not is. Asked
	// only once a pair passing a place is the best found.
	bound := int8(0)
	boundPair := func() bool {
		if bound == 0 {
			bound = 1
			if dm.Diverse && sv.siteBoundAll(d) {
				bound = 2
			}
		}
		return bound == 2
	}
	pruned := func(x lbo) bool {
		if sv.length {
			return false
		}
		if x.lb >= below || x.lb0 >= useful || (!bestC.atSite && (x.lb > bestC.obj || (x.lb == bestC.obj && x.opt > bestC.opt))) {
			return true
		}
		// Against a best pair that passes a place, only an option whose every pair weighs
		// more (by the tree's bound: lb0) is out, ties kept (cand.less breaks them on metres).
		return bestC.atSite && bestC.obj < math.MaxInt64 && x.lb0 > bestC.obj && boundPair()
	}
	// pairBelow is the weight a pair of option o must stay under to be wanted.
	pairBelow := func(o int) int64 {
		if sv.length || below == math.MaxInt64 {
			return math.MaxInt64
		}
		return below - sv.optionCents(d, o, 2)
	}
	if dm.Diverse {
		var retry []lbo
		for _, x := range order {
			if pruned(x) {
				break
			}
			legs, w, ok, tooLong := sv.pair(d, x.opt, false, pairBelow(x.opt))
			if ok {
				consider(x.opt, legs, 2, w)
			} else if tooLong {
				// The cheapest pair, too long, bounds every pair within reach from below.
				x.lb = max(x.lb, w+sv.optionCents(d, x.opt, 2))
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
			if legs, w, ok, _ := sv.pair(d, x.opt, true, pairBelow(x.opt)); ok {
				consider(x.opt, legs, 2, w)
			}
		}
		if bestCh.opt >= 0 || below != math.MaxInt64 || useful != math.MaxInt64 {
			return done()
		}
		for i := range order { // single-path bounds are half the pair bounds
			if !sv.length {
				o := order[i].opt
				order[i].lb = (order[i].lb-sv.optionCents(d, o, 2))/2 + dm.Options[o].FixedCents
			}
		}
	}
	// Options whose cheapest path is too long get the search within reach after the others,
	// if the cheapest path's weight lets them still win.
	type within struct {
		x        lbo
		cheapest []Hop
	}
	var later []within
	for _, x := range order {
		if pruned(x) {
			break
		}
		hops, w, ok, tooLong := sv.route(d, x.opt, sv.mostWeight(d, x.opt, 1, below, bestC))
		switch {
		case ok:
			consider(x.opt, [2][]Hop{hops}, 1, w)
		case tooLong:
			if !sv.length {
				x.lb = max(x.lb, w+sv.optionCents(d, x.opt, 1))
			}
			later = append(later, within{x, hops})
		}
	}
	for _, y := range later {
		if pruned(y.x) {
			continue
		}
		if hops, w, ok := sv.routeWithin(d, y.x.opt, y.cheapest, sv.mostWeight(d, y.x.opt, 1, below, bestC)); ok {
			consider(y.x.opt, [2][]Hop{hops}, 1, w)
		}
	}
	return done()
}

// mostWeight is the most a route (legs 1) or pair (legs 2) of demand d's option o may weigh
// to matter to bestBelow: under below less its option's cents, and, against the best found so
// far, at most its objective less them (an equal objective may still win on metres, cand.less).
// math.MaxInt64 when nothing caps it, and under the length objective, which weighs metres.
func (sv *solver) mostWeight(d, o, legs int, below int64, best cand) int64 {
	if sv.length {
		return math.MaxInt64
	}
	oc := sv.optionCents(d, o, legs)
	most := int64(math.MaxInt64)
	if below < math.MaxInt64 {
		most = below - oc - 1
	}
	if best.obj < math.MaxInt64 {
		most = min(most, best.obj-oc)
	}
	return most
}

// planTreeNodes is the network size, in nodes, from which the searches use plan trees
// (bound.go): on smaller networks a search costs less than the tree rebuilds would save.
const planTreeNodes = 1000
