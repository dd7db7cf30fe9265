package routing

import (
	"cmp"
	"context"
	"fmt"
	"maps"
	"slices"
	"strings"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/internal/ctxio"
	"spanwright/route/items"
	"spanwright/route/optimize"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// Routed is a plan's routing: the legs of every link in link order, with their routes, media
// and cable takeoffs, and what the optimizer decided for the plan as a whole.
type Routed struct {
	Legs   []Leg
	Opened []string      // proposed spans the plan builds, by span ID
	Fill   []SegmentFill // duct fill of every span that carries cable, by span ID
	// Handholes are the handholes or pull boxes the plan adds at junctions without a
	// structure, one per junction whatever its reasons, in the network's junction order: where
	// new pathway joins the network, where a counted lateral taps a duct, where a route turns
	// from one pathway into another.
	Handholes []Handhole
	// Runs are the runs of new construction the plan opens, with the handholes along them
	// (site.NewRuns with the plan's design).
	Runs []site.NewRun
	// Entrances are the building entrances the feasible legs use, by building then entrance.
	Entrances []EntranceUse
	// ObjectiveCents is the optimizer's objective for the routes it returned
	// (optimize.Solution.TotalCents) plus ConstantCents: see the README's "One cost model".
	ObjectiveCents int64
	// LowerBoundCents is the optimizer's proved lower bound on that objective for every plan
	// serving the same legs (optimize.Solution.LowerBoundCents); -1 when none was computed
	// (the length objective).
	LowerBoundCents int64
	// CrossingAvoidedCents is what keeping diverse legs off junctions where ducts cross with
	// no structure costs, all such links together (optimize.Solution.CrossingAvoidedCents);
	// each diverse leg's own figure is Leg.CrossingAvoidedCents.
	CrossingAvoidedCents int64
	// ConstantCents is what the plan pays whatever its routes: the entrances of buildings with
	// one (items.Entrance), used as soon as a leg ends there, and the handholes where their
	// counted laterals tap a duct, one per junction (prepaidTaps).
	ConstantCents int64
	// Started reports that the optimizer's search began from SolveFrom's start: false
	// without one, and when the start's WherePays found it not worth it (StartPays), the
	// plan then being the plan from scratch.
	Started bool
	// StartUnused lists, in link order, the links whose routes in SolveFrom's start did not
	// fit this plan (another network, hub or medium, a span gone, beyond reach, a duct with no
	// room) and were placed afresh, each as its ID and why in brackets; nil without a start.
	StartUnused []string
	// StartNoRoom is how many of StartUnused were placed afresh because their cables found no
	// room in the ducts of their start route (optimize.Solution.StartNoRoom).
	StartNoRoom int
	// StartSame reports that SolveFrom's start came from a plan of this very routing problem
	// solved from scratch (Start.ProblemSHA256): its routes were not searched from, the
	// problem's own plan is the answer, the same as without the start.
	StartSame bool
	// ProblemSHA256 is the fingerprint of the routing problem these routes are the plan of
	// when solved from scratch (optimize.Fingerprint of the canonical problem and settings,
	// hex): set when there was no start, or StartSame; "" for a plan searched from a start,
	// and for a problem without a fingerprint. routes.geojson carries it (problem_sha256), so
	// that a warm start from it can tell its own problem (Start.ProblemSHA256).
	ProblemSHA256 string
	// Warnings are what the routing leaves for a person to check: handholes at junctions
	// whose rounds did not settle (unsettledWarning).
	Warnings []string
}

// EntranceUse is a building entrance the plan uses.
type EntranceUse struct {
	Building string
	Entrance string  // geo.Entry ID
	LateralM float64 // its counted lateral, built as new construction (items.Entrance)
	Single   bool    // the building's only entrance
	Built    bool    // the entrance is there already (geo.Entry.Built): its cables are only firestopped
	// PoleRiser says its counted lateral comes down a pole in a riser (geo.Entry.PoleRiser).
	PoleRiser bool
	// Tap is the junction where the counted lateral taps the side of a duct, with a handhole
	// built there (site.Site.TapOf); "" when it does not.
	Tap string
}

// Handhole is a handhole the plan adds at a junction without a structure, and why: one or
// more of its reasons.
type Handhole struct {
	Junction string
	Joins    bool // an opened proposed span ends there
	Taps     bool // the counted lateral of an entrance used taps a duct there (site.Site.TapOf)
	Turns    bool // a route turns there from one pathway into another
}

// Purposes of an added handhole, the values of Handhole.Purpose.
const (
	PurposeJoin = "join" // new pathway joins the network
	PurposeTap  = "tap"  // a counted lateral taps the side of a duct
	PurposeTurn = "turn" // a route turns from one pathway into another
)

// Purpose is the one reason a handhole is listed and billed under: the first of new pathway
// joining, a lateral tapping, a route turning. It is the one place that decides it, so that
// the bill's three lines (items.JoinHandholes, TapHandholes, TurnHandholes) and every list of
// added structures count each junction once.
func (h Handhole) Purpose() string {
	switch {
	case h.Joins:
		return PurposeJoin
	case h.Taps:
		return PurposeTap
	}
	return PurposeTurn
}

// Solve routes links over the site with the model's prices and rules, and chooses each leg's
// medium with the model's engine. Each leg points into links. An infeasible leg does not stop
// the others; it carries its reason. When ctx is done, the optimizer and the media choice stop
// within a step and Solve returns ctx's error.
func Solve(ctx context.Context, s *site.Site, m *Model, links []site.Link) (*Routed, error) {
	return SolveFrom(ctx, s, m, links, nil)
}

// SolveFrom is Solve with the optimizer's search begun from start's routes (a warm start);
// nil start is Solve, and so is a start with WherePays on a problem it does not pay for
// (StartPays; Routed.Started says which). The links whose start routes no longer fit are
// placed afresh and listed in Routed.StartUnused.
func SolveFrom(ctx context.Context, s *site.Site, m *Model, links []site.Link, start *Start) (*Routed, error) {
	runs := m.runsOf(s)
	prob, lay, infos, err := problem(s, m, links, runs)
	if err != nil {
		return nil, err
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	if start != nil && start.WherePays && !startPaysOn(prob, links, start) {
		start = nil // planned from scratch, as without a start (Routed.Started)
	}
	opt := optimize.Settings{Objective: m.design.Objective}
	var unfit map[int]string
	if start != nil {
		opt.Start, unfit = startRoutes(s, lay, prob, start)
	}
	var same string
	if start != nil {
		same = start.ProblemSHA256
	}
	sol, cold, reused, err := solve(ctx, s, lay, prob, opt, same)
	if err != nil {
		return nil, optimizerErr(ctx, err)
	}
	r := &Routed{Started: start != nil, StartSame: reused}
	if start == nil || reused {
		r.ProblemSHA256 = cold
	}
	if start != nil && !reused {
		for _, n := range sol.StartNoRoom {
			if _, ok := unfit[n.Demand]; !ok {
				unfit[n.Demand] = noRoom(prob, n.Edges)
				r.StartNoRoom++
			}
		}
		for _, d := range sol.StartUnused {
			if _, ok := unfit[d]; !ok {
				unfit[d] = "it does not fit this plan's rules or prices (a span its medium may not use, beyond its reach, or new trench not allowed)"
			}
		}
		for _, d := range slices.Sorted(maps.Keys(unfit)) {
			r.StartUnused = append(r.StartUnused, links[d].ID+" ("+unfit[d]+")")
		}
	}
	legs, unpaid, err := m.measure(ctx, s, lay, prob, sol, links, infos, runs, r)
	if err != nil {
		return nil, err
	}
	at := map[string]bool{} // the handholes at junctions of every plan measured
	for mend := 0; mend < maxMends && beyondReach(sol, legs); mend++ {
		// Legs the optimizer kept within reach that the rules reject: the slack loops they
		// leave in handholes other routes build (at junctions they pass straight through) are
		// in their channels but not in the search's reach. The plan's routes that stay within
		// reach with those loops counted (passLoops) are kept and the others placed again
		// (optimize.Settings.PlaceOnly); that plan stands when it leaves fewer legs infeasible.
		// Placed again, a leg may pass or build other handholes: a second mend counts the
		// loops in those of both plans.
		maps.Copy(at, handholeJunctions(r.Handholes))
		again := opt
		again.Start, again.PlaceOnly = optimize.StartFrom(sol), true
		sol2, _, _, err := solve(ctx, s, lay, passLoops(s, m.design, lay, prob, at), again, "")
		if err != nil {
			return nil, optimizerErr(ctx, err)
		}
		r2 := *r
		legs2, unpaid2, err := m.measure(ctx, s, lay, prob, sol2, links, infos, runs, &r2)
		if err != nil {
			return nil, err
		}
		if infeasibleLegs(r2.Legs) >= infeasibleLegs(r.Legs) {
			break
		}
		*r, sol, legs, unpaid = r2, sol2, legs2, unpaid2
	}
	// The passes through handholes at junctions that the optimizer's edges price in part or not
	// at all, priced here on the routes it returned (passGapCents).
	for i := range links {
		r.ObjectiveCents += m.passGapCents(s, lay, prob, i, &sol.Routes[i], legs[i])
	}
	hh := m.cents(items.JoinHandholes(1))
	// What a building with one entrance pays whatever the routes is carried by the legs that
	// use the entrance, in equal shares, as the legs through an entrance of a building with
	// several carry its charge: a leg's cost does not depend on whether its building has an
	// entrance it does not use.
	through := legsThrough(r.Legs)
	rank := shareRank(s, r.Legs)
	tapUsers := map[string][]int{} // the junctions of singleTaps, each with the legs it serves
	for _, e := range r.Entrances {
		if e.Single {
			c := m.entranceCents(geo.Entry{ID: e.Entrance, Access: geo.Access{LateralM: e.LateralM}, Built: e.Built, PoleRiser: e.PoleRiser}) // its prices checked by problem
			r.ConstantCents += c
			users := through[[2]string{e.Building, e.Entrance}]
			shareAmong(r.Legs, rank, c, users)
			if e.Tap != "" {
				tapUsers[e.Tap] = append(tapUsers[e.Tap], users...)
			}
		}
	}
	for _, j := range slices.Sorted(maps.Keys(tapUsers)) {
		r.ConstantCents += hh
		users := tapUsers[j]
		slices.Sort(users)
		shareAmong(r.Legs, rank, hh, slices.Compact(users))
	}
	r.ObjectiveCents += r.ConstantCents + hh*unpaid
	if r.LowerBoundCents >= 0 {
		r.LowerBoundCents += r.ConstantCents // paid by every plan alike
	}
	return r, nil
}

// measure fills r from the optimizer's solution sol of prob: its objective and bound, the
// spans it opens, the legs of every link with their media and takeoffs, the entrances and
// the handholes the plan builds. It returns the legs by link and how many prepaid handholes
// no used tap paid (prepaidTaps).
func (m *Model) measure(ctx context.Context, s *site.Site, lay *layout, prob *optimize.Problem, sol *optimize.Solution, links []site.Link, infos []demandInfo, runs []site.NewRun, r *Routed) (legs [][]Leg, unpaid int64, err error) {
	r.ObjectiveCents, r.LowerBoundCents, r.Fill = sol.TotalCents, sol.LowerBoundCents, fillReport(s, prob, sol)
	r.CrossingAvoidedCents = sol.CrossingAvoidedCents
	r.Opened, r.Runs, r.Legs = nil, nil, nil // fresh: a copy of r (SolveFrom's mend) keeps its own
	for _, e := range sol.Opened {
		r.Opened = append(r.Opened, s.Net.Spans[e].ID)
	}

	for _, run := range runs {
		if slices.Contains(r.Opened, run.Steps[0].SpanID) {
			r.Runs = append(r.Runs, run)
		}
	}
	infeasible := map[int]string{}
	for _, in := range sol.Infeasible {
		info := infos[in.Demand]
		infeasible[in.Demand] = lay.explain(in, &links[in.Demand], prob, func(name string, c spanClass) string {
			return m.whyNot(name, info, c)
		})
		if l := &links[in.Demand]; !m.design.AllowNewTrench {
			if why := s.ProposedOnlyReason(l.From, l.To); why != "" {
				infeasible[in.Demand] = why + "; " + infeasible[in.Demand]
			}
		}
	}
	// The handholes the plan builds, where every leg passing them leaves a slack loop
	// (passesOf): along its runs of new construction, and at junctions, known from the routes
	// before the media are chosen, but for the taps of buildings with one entrance, built when a
	// feasible leg uses the entrance: taken first as every routed leg's, then as the feasible
	// legs' until the two agree (a leg the rules reject leaves its tap unbuilt, and the legs
	// passing that junction are measured again; settleHandholes).
	built := builtOn{along: site.HandholesBySpan(r.Runs)}
	hs, _ := handholesOf(s, lay, prob, sol, routedTaps(s, lay, sol, links))
	legs = make([][]Leg, len(links))
	r.Warnings = nil
	with, builds, err := settleHandholes(handholeJunctions(hs), func(at map[string]bool) (map[string]bool, error) {
		built.at = at
		// Each link's legs are its own (the engine's caches are safe for concurrent use, the
		// rest is read): worked out side by side, assembled in link order.
		if err := ctxio.Each(ctx, len(links), func(i int) {
			legs[i] = legsOf(s, m, lay, prob, &sol.Routes[i], &links[i], infos[i], infeasible[i], built)
		}); err != nil {
			return nil, err
		}
		r.Legs = r.Legs[:0]
		for _, l := range legs {
			r.Legs = append(r.Legs, l...)
		}
		r.Entrances = entrancesUsed(s, lay, r.Legs)
		r.Handholes, unpaid = handholesOf(s, lay, prob, sol, r.Entrances)
		return handholeJunctions(r.Handholes), nil
	})
	if err != nil {
		return nil, 0, err
	}
	if w := unsettledWarning(with, builds); w != "" {
		r.Warnings = append(r.Warnings, w)
	}
	shareConstruction(s, prob, sol, legs, r)
	return legs, unpaid, nil
}

// noRoom is why a start route whose cables the optimizer found no room for was placed afresh
// (optimize.Solution.StartNoRoom), naming the spans: a span without a spare duct, or whose
// spare ducts the routes kept before it fill, where this plan may add none; or a cable wider
// than one duct there takes (NFPA 70 Chapter 9 Table 1, the packing's rule).
func noRoom(prob *optimize.Problem, edges []int) string {
	var none, filled []string
	var wide []int
	for _, e := range edges {
		switch ed := &prob.Edges[e]; {
		case ed.MayAddDucts():
			wide = append(wide, e)
		case ed.Ducts == 0:
			none = append(none, ed.ID)
		default:
			filled = append(filled, ed.ID)
		}
	}
	spans := func(ids []string, one, many string) string {
		if len(ids) == 1 {
			return "span " + ids[0] + one
		}
		return "spans " + strings.Join(ids, ", ") + many
	}
	var parts []string
	if len(none) > 0 {
		parts = append(parts, spans(none, " has", " have")+" no spare duct and this plan may add none")
	}
	if len(filled) > 0 {
		parts = append(parts, "the spare ducts of "+spans(filled, "", "")+" have no room for its cable after the routes kept before it (NFPA 70 Chapter 9 fill) and this plan may add none")
	}
	if len(wide) > 0 {
		parts = append(parts, wideWords(prob, wide, 0))
	}
	return "a duct with no room: " + strings.Join(parts, "; ")
}

// beyondReach reports whether the rules reject a leg of a link the optimizer routed within
// reach (sol).
func beyondReach(sol *optimize.Solution, legs [][]Leg) bool {
	for i, ls := range legs {
		if !sol.Routes[i].Feasible {
			continue
		}
		for _, l := range ls {
			if !l.Feasible && l.Steps != nil {
				return true
			}
		}
	}
	return false
}

// optimizerErr is the error of a failed optimizer run: ctx's when it was stopped.
func optimizerErr(ctx context.Context, err error) error {
	if ctx.Err() != nil {
		return ctx.Err()
	}
	return fmt.Errorf("route: optimizer: %w", err)
}

// infeasibleLegs counts the legs that are not feasible.
func infeasibleLegs(legs []Leg) int {
	n := 0
	for i := range legs {
		if !legs[i].Feasible {
			n++
		}
	}
	return n
}

// legsThrough indexes the feasible legs, in leg order, by the building entrances they use
// (building, entrance ID).
func legsThrough(legs []Leg) map[[2]string][]int {
	out := map[[2]string][]int{}
	for i := range legs {
		l := &legs[i]
		if !l.Feasible {
			continue
		}
		to, from := [2]string{l.Link.To, l.EntranceTo}, [2]string{l.Link.From, l.EntranceFrom}
		out[to] = append(out[to], i)
		if from != to {
			out[from] = append(out[from], i)
		}
	}
	return out
}

// singleTaps lists, each once, the junctions where the counted laterals of the used entrances
// of buildings with one tap a duct.
func singleTaps(used []EntranceUse) map[string]bool {
	out := map[string]bool{}
	for _, e := range used {
		if e.Single && e.Tap != "" {
			out[e.Tap] = true
		}
	}
	return out
}

// handholesOf lists the handholes the plan adds at junctions without a structure, one per
// junction in the network's junction order, with every reason it has: the junction charges
// the routes pay (an opened span ends there, a turn edge or a tapping entrance's edge carries
// a route) and the taps of the entrances used. unpaid counts the charges a route used at cost
// 0 because a tap of a building with one entrance was to pay for them (prepaidTaps) when no
// used entrance taps there.
func handholesOf(s *site.Site, lay *layout, prob *optimize.Problem, sol *optimize.Solution, used []EntranceUse) (hs []Handhole, unpaid int64) {
	carried := map[int]bool{}
	for _, rt := range sol.Routes {
		for _, leg := range []optimize.Leg{rt.Primary, rt.Secondary} {
			for _, h := range leg.Hops {
				carried[h.Edge] = true
			}
		}
	}
	byJunction := map[string]*Handhole{}
	get := func(j string) *Handhole {
		if byJunction[j] == nil {
			byJunction[j] = &Handhole{Junction: j}
		}
		return byJunction[j]
	}
	single := singleTaps(used)
	for _, k := range sol.Charged {
		if k >= len(lay.charges) {
			continue // an entrance's charge (problem): Entrances
		}
		c := lay.charges[k]
		h := get(c.junction)
		for _, e := range c.edges {
			switch x, extra := lay.isExtra(len(s.Net.Spans), e); {
			case !extra:
				h.Joins = h.Joins || slices.Contains(sol.Opened, e)
			case x.kind == edgeTurn:
				h.Turns = h.Turns || carried[e]
			case x.kind == edgeEntrance:
				h.Taps = h.Taps || carried[e]
			}
		}
		if prob.Charges[k].Cents == 0 && !single[c.junction] {
			unpaid++
		}
	}
	for _, e := range used {
		if e.Tap != "" {
			get(e.Tap).Taps = true
		}
	}
	for _, j := range s.Net.Junctions {
		if h := byJunction[j.ID]; h != nil {
			hs = append(hs, *h)
		}
	}
	return hs, unpaid
}

// maxMends bounds SolveFrom's mends of a plan whose legs the rules reject beyond the reach
// the search kept them within (passLoops).
const maxMends = 2

// maxHandholeRounds bounds SolveFrom's rounds of measuring the legs against the handholes
// built at junctions (settleHandholes): the second agrees unless a leg that a tap built for
// another leg made infeasible becomes feasible without it (a leg's own taps are always
// counted, passesOf), and that leg's tap in turn makes the other infeasible.
const maxHandholeRounds = 3

// settleHandholes measures the legs against the handholes built at junctions, first those
// of at, then those the legs of the round before build (measure: the junctions of the
// handholes the legs it measured build), until the two agree, for at most maxHandholeRounds
// rounds; if they still disagree, once more against what the last round builds. It returns
// the junctions the last round measured the legs against (with) and those that round builds
// (builds): the same sets unless the rounds did not settle (unsettledWarning). It stops at
// measure's first error.
func settleHandholes(at map[string]bool, measure func(at map[string]bool) (map[string]bool, error)) (with, builds map[string]bool, err error) {
	for round := 1; ; round++ {
		builds, err = measure(at)
		if err != nil || maps.Equal(builds, at) || round > maxHandholeRounds {
			return at, builds, err
		}
		at = builds
	}
}

// unsettledWarning is the warning of handholes at junctions that SolveFrom's rounds left
// unsettled (settleHandholes): the legs were measured with handholes at junctions of with,
// and build those of builds. "" when the two are the same. Every leg is as measured; the
// handholes listed and billed are those it builds, so a leg passing a junction of one set and
// not the other has a structures list (and slack loops, loss budget) that disagrees there.
func unsettledWarning(with, builds map[string]bool) string {
	if maps.Equal(with, builds) {
		return ""
	}
	var extra, missing []string
	for _, j := range slices.Sorted(maps.Keys(with)) {
		if !builds[j] {
			extra = append(extra, j)
		}
	}
	for _, j := range slices.Sorted(maps.Keys(builds)) {
		if !with[j] {
			missing = append(missing, j)
		}
	}
	var parts []string
	if len(extra) > 0 {
		parts = append(parts, "the legs through "+strings.Join(extra, ", ")+" are measured with a handhole there that the plan does not build")
	}
	if len(missing) > 0 {
		parts = append(parts, "the legs through "+strings.Join(missing, ", ")+" are measured without the handhole the plan builds there")
	}
	return fmt.Sprintf("the handholes at junctions did not settle in %d rounds (a leg's loss budget or reach turns on a handhole that another leg's feasibility builds): %s; check their structures passed, slack loops and loss budgets against the structures table",
		maxHandholeRounds+1, strings.Join(parts, ", and "))
}

// handholeJunctions is the set of the junctions of hs.
func handholeJunctions(hs []Handhole) map[string]bool {
	out := make(map[string]bool, len(hs))
	for _, h := range hs {
		out[h.Junction] = true
	}
	return out
}

// routedTaps lists, as entrances used, those of buildings with one entrance at either end of
// a link the optimizer routed whose counted lateral taps a duct: the taps the routes build if
// every routed leg is feasible (handholesOf's used).
func routedTaps(s *site.Site, lay *layout, sol *optimize.Solution, links []site.Link) []EntranceUse {
	var out []EntranceUse
	for i := range sol.Routes {
		if !sol.Routes[i].Feasible {
			continue
		}
		for _, b := range []string{links[i].To, links[i].From} {
			if e, ok := lay.endEntry[b]; ok && s.TapOf(e) {
				out = append(out, EntranceUse{Building: b, Entrance: e.ID, LateralM: e.LateralM, Single: true, Built: e.Built, Tap: e.Junction})
			}
		}
	}
	return out
}

// passGapCents is what the optimizer's edges leave out of, or (in ties of unpriced crews) add
// to, the passes of link d's routed legs (route rt, legs as legsOf made them) through the
// handholes the plan builds at junctions, at the option's prices. The bill counts one pass per
// handhole per leg (passesOf): its slack loop (cable with waste, pulled as duct), the bid items
// per structure passed, and a crew pull set-up and entry, per cable. The edges price what a
// route decides alone: half a pass at each end of an opened span where it joins the network
// (items.JoinEnds), the crew's share on a turn edge (layout.turnShare) and a whole pass at a
// lateral's tap; a turn's slack loop and bid items, the other half where a route turns from
// the network into a joining span, and a pass straight through a handhole other routes build
// are the plan's, counted here (README, "One cost model").
func (m *Model) passGapCents(s *site.Site, lay *layout, prob *optimize.Problem, d int, rt *optimize.Route, legs []Leg) int64 {
	if !rt.Feasible {
		return 0
	}
	options := prob.Demands[d].Options
	o := slices.IndexFunc(options, func(o optimize.Option) bool { return o.Name == rt.Medium })
	if o < 0 {
		return 0
	}
	opt := &options[o]
	dsg := m.design
	cables := float64(max(opt.Cables, 1))
	loopCents := func(n float64) int64 { // n slack loops of each cable, with their bid items per structure passed
		loopM := n * dsg.SlackLoopStructureM
		return media.MulCents(opt.CablePerMCents, items.Wasted(dsg, loopM)) +
			m.cents(items.Times(cables, items.StructureLoops(loopM)...)...) + m.bidPer(media.BidBases{Structures: 1}, n*cables)
	}
	crewCents := func(n float64) int64 { return m.cents(items.Times(cables, items.AtJunctions(m.prices, n, n)...)...) }
	var c int64
	ol := []optimize.Leg{rt.Primary, rt.Secondary}
	for k := range legs {
		if k >= len(ol) || len(ol[k].Hops) == 0 || !legs[k].Feasible {
			continue // a leg the rules reject is the optimizer's as routed: the bill has none of it
		}
		loops := endTaps(s, lay, legs[k].Link) // what the demand and the edges priced
		crews := loops
		for _, h := range ol[k].Hops {
			l, c := pricedPasses(s, lay, h.Edge)
			loops, crews = loops+l, crews+c
		}
		passes := 0.0
		for _, p := range legs[k].Cable.Passed {
			if p.Added && p.Span == "" {
				passes++
			}
		}
		c += loopCents(passes-loops) + crewCents(passes-crews)
	}
	return c
}

// entrancesUsed lists the entrances feasible legs use, by building then entrance ID.
func entrancesUsed(s *site.Site, lay *layout, legs []Leg) []EntranceUse {
	seen := map[[2]string]bool{}
	var out []EntranceUse
	use := func(b, id string) {
		if id == "" || seen[[2]string{b, id}] {
			return
		}
		seen[[2]string{b, id}] = true
		if e, ok := lay.endEntry[b]; ok && e.ID == id {
			out = append(out, EntranceUse{Building: b, Entrance: id, LateralM: e.LateralM, Single: true, Built: e.Built, PoleRiser: e.PoleRiser, Tap: tapOf(s, e)})
			return
		}
		for _, en := range lay.entrances {
			if en.building == b && en.entry.ID == id {
				out = append(out, EntranceUse{Building: b, Entrance: id, LateralM: en.entry.LateralM, Built: en.entry.Built, PoleRiser: en.entry.PoleRiser, Tap: tapOf(s, en.entry)})
				return
			}
		}
	}
	for i := range legs {
		if l := &legs[i]; l.Feasible {
			use(l.Link.To, l.EntranceTo)
			use(l.Link.From, l.EntranceFrom)
		}
	}
	slices.SortFunc(out, func(a, b EntranceUse) int {
		return cmp.Or(strings.Compare(a.Building, b.Building), strings.Compare(a.Entrance, b.Entrance))
	})
	return out
}

// Problem is the optimizer's problem Solve states for links: one edge per span of the
// site's network (same index), one demand per link, every price from the model. It is what
// the optimizer's objective is computed on, for checks against the bill.
func Problem(s *site.Site, m *Model, links []site.Link) (*optimize.Problem, error) {
	prob, _, _, err := problem(s, m, links, m.runsOf(s))
	return prob, err
}

// tapOf is the junction where entry e's counted lateral taps a duct (site.Site.TapOf), or "".
func tapOf(s *site.Site, e geo.Entry) string {
	if s.TapOf(e) {
		return e.Junction
	}
	return ""
}

// passLoops is prob with, in its edges' reach (optimize.Edge.ReachM), the slack loop a route
// leaves in each handhole the plan builds at a junction of at (Routed.Handholes), as its legs'
// takeoffs count it (passesOf), whichever route's turn, tap or join builds it: half a loop at
// each span end there that the edge does not count already (a joining end, joinEnds), none
// on the turn edges there, which the spans' halves now cover, and half, not a whole, on an
// entrance edge whose lateral taps there. The search's own edges count a loop only where the
// route itself turns, joins or taps; a route passing straight through another's handhole
// leaves a loop there all the same. A junction where only aerial spans meet keeps the
// search's count: a leg passing it overhead leaves no loop (throughHandhole), one turning
// there does (its turn edge). An aerial span's end at a junction where ducts meet too counts
// half a loop, so a leg passing there overhead is counted a loop it does not leave: the
// reach errs short, never long.
func passLoops(s *site.Site, d plan.Design, lay *layout, prob *optimize.Problem, at map[string]bool) *optimize.Problem {
	p := *prob
	p.Edges = slices.Clone(prob.Edges)
	half := d.SlackLoopStructureM / 2
	underground := map[string]bool{} // junctions of at where a span other than aerial ends
	for i := range s.Net.Spans {
		sp := &s.Net.Spans[i]
		for _, j := range [2]string{sp.From, sp.To} {
			if at[j] && sp.Type != geo.TypeAerial {
				underground[j] = true
			}
		}
	}
	for i := range s.Net.Spans {
		sp := &s.Net.Spans[i]
		for k, j := range [2]string{sp.From, sp.To} {
			if underground[j] && !lay.joinEnd(s, i, k) {
				p.Edges[i].ReachM += half
			}
		}
	}
	for k, x := range lay.extra {
		e := &p.Edges[len(s.Net.Spans)+k]
		switch {
		case x.kind == edgeTurn && underground[x.junction]:
			e.ReachM = 0
		case x.kind == edgeEntrance && underground[x.junction] && x.entry.LateralM > 0 && s.TapOf(x.entry):
			e.ReachM -= half
		}
	}
	return &p
}
