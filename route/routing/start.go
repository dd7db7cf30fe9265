package routing

import (
	"fmt"
	"math"
	"slices"

	"spanwright/geo"
	"spanwright/route/optimize"
	"spanwright/route/site"
)

// Start is an earlier plan's routes for the optimizer to begin its search from (a warm
// start, optimize.Settings.Start): a sweep's base scenario for the scenarios after it, or
// the routes.geojson of an earlier plan's folder (`spanwright plan --start-from`). The plan
// depends on its start, so the same plan from the same start gives the same bytes.
type Start struct {
	// From names where the routes come from (a plan folder's name), for the outputs.
	From string
	// Legs are the earlier plan's feasible legs; at most one primary and one diverse leg per
	// link (a later one of the same link and leg is ignored).
	Legs []StartLeg
	// ProblemSHA256 is the routes file's problem_sha256 (Routed.ProblemSHA256): the routing
	// problem whose plan from scratch these routes are; "" when unknown. A plan of that very
	// problem started from them is that plan (SolveFrom), not a search from it: identical
	// problems give identical plans, whichever was planned first.
	ProblemSHA256 string
	// WherePays starts the search from these routes only where that is worth what it changes
	// (StartPays: a sweep's scenarios); without it SolveFrom starts from them whatever the
	// problem (`spanwright plan --start-from` starts from the routes it is given).
	WherePays bool
}

// StartPays reports whether beginning the optimizer's search for links from start is worth
// what it changes, the one decision a sweep's scenario starts warm by (Start.WherePays): start
// must have a route for some link of links (Start.KeepsRoute: a base planned from another
// hub keeps nothing, and a warm search from no routes is only a weaker search), and the routing problem must be too large for the
// optimizer's full search from scratch (optimize.WarmPays: the second start and the
// perturbation phase, which a warm start skips). SolveFrom decides it on the problem it
// builds; StartPays, for a caller that has to know before planning (a resumed sweep), builds
// it only when the plan's demands and proposed spans alone do not already settle it. A
// problem that does not build gets false: SolveFrom reports its error.
func StartPays(s *site.Site, m *Model, links []site.Link, start *Start) bool {
	if start == nil || !start.KeepsRoute(links) {
		return false
	}
	// The plan's demands and its proposed spans alone (one demand a link, one proposed edge a
	// proposed span, and more edges and the charges besides) are a problem no larger than its
	// own: when that already pays, the problem need not be built.
	lower := &optimize.Problem{Demands: make([]optimize.Demand, len(links)), AllowNew: m.design.AllowNewTrench}
	for i := range s.Net.Spans {
		if s.Net.Spans[i].Status == geo.StatusProposed {
			lower.Edges = append(lower.Edges, optimize.Edge{Proposed: true})
		}
	}
	if optimize.WarmPays(lower) {
		return true
	}
	prob, _, _, err := problem(s, m, links, m.runsOf(s))
	return err == nil && startPaysOn(prob, links, start)
}

// startPaysOn is StartPays on the problem of links, built.
func startPaysOn(prob *optimize.Problem, links []site.Link, start *Start) bool {
	return start.KeepsRoute(links) && optimize.WarmPays(prob)
}

// KeepsRoute reports whether the start has a route for some link of links (a link is named
// by its cross-connect end first, site.Link.ID, so a start planned from another hub has
// none).
func (st *Start) KeepsRoute(links []site.Link) bool {
	in := map[string]bool{}
	for _, l := range st.Legs {
		in[l.Link] = true
	}
	return slices.ContainsFunc(links, func(l site.Link) bool { return in[l.ID] })
}

// StartLeg is one leg of a Start, as routes.geojson writes it.
type StartLeg struct {
	Link   string   // the link's ID
	Leg    string   // LegPrimary or LegDiverse
	Medium string   // the catalog medium it carries: the option the route starts in
	Spans  []string // span IDs in the order of the line: from the link's from building to its to building
}

// startRoutes turns start into the optimizer's warm start of prob (one route per demand, in
// demand order; edges matched by span ID, and the entrance and turn edges between them and at
// the ends found from the layout) and lists, by demand, the links whose routes there do not
// join on this site: a span it does not have, spans that do not meet, a leg that does not end
// at the link's buildings, a medium that is not one of the link's options, a diverse leg
// without its primary. Those start as Option -1 (placed afresh by the optimizer, which then
// does not report them) and are reported here instead. A link without a leg in the start is
// placed afresh and not reported.
func startRoutes(s *site.Site, lay *layout, prob *optimize.Problem, start *Start) ([]optimize.StartRoute, map[int]string) {
	net := s.Net
	spanAt := make(map[string]int, len(net.Spans))
	for i := range net.Spans {
		spanAt[net.Spans[i].ID] = i
	}
	nSpans := len(net.Spans)
	extraAt := make(map[int][]int) // node → the extra edges (optimizer edge indexes) at it, ascending
	for k, x := range lay.extra {
		extraAt[x.from] = append(extraAt[x.from], nSpans+k)
		if x.to != x.from {
			extraAt[x.to] = append(extraAt[x.to], nSpans+k)
		}
	}
	// hop is the extra edge e taken from u, and the node it leads to.
	hop := func(u, e int) (optimize.Hop, int) {
		if x := &lay.extra[e-nSpans]; x.from == u {
			return optimize.Hop{Edge: e, Forward: true}, x.to
		} else {
			return optimize.Hop{Edge: e, Forward: false}, x.from
		}
	}
	// join takes extra edges (entrance and turn edges, no length) from u to one of the nodes
	// in to: one if one does, else two (a leg between two buildings that meet at a junction
	// takes no span); the lowest edge indexes first.
	join := func(u int, to ...int) ([]optimize.Hop, int, bool) {
		for _, e := range extraAt[u] {
			if h, v := hop(u, e); slices.Contains(to, v) {
				return []optimize.Hop{h}, v, true
			}
		}
		for _, e := range extraAt[u] {
			h, w := hop(u, e)
			for _, e2 := range extraAt[w] {
				if h2, v := hop(w, e2); e2 != e && slices.Contains(to, v) {
					return []optimize.Hop{h, h2}, v, true
				}
			}
		}
		return nil, 0, false
	}
	// walk follows spans from node from and ends at node to, joining them by extra edges
	// where they do not meet; the hops are returned from to back to from.
	walk := func(from, to int, spans []string) ([]optimize.Hop, string) {
		u := from
		var hops []optimize.Hop
		for i, id := range spans {
			e, ok := spanAt[id]
			if !ok {
				return nil, fmt.Sprintf("span %s is not on this campus", id)
			}
			a, b := lay.spanEnds[e][0], lay.spanEnds[e][1]
			if u != a && u != b {
				hs, v, ok := join(u, a, b)
				if !ok {
					if i == 0 {
						return nil, fmt.Sprintf("its first span %s does not start at the link's building", id)
					}
					return nil, fmt.Sprintf("span %s does not meet span %s before it", id, spans[i-1])
				}
				hops, u = append(hops, hs...), v
			}
			if u == a {
				hops, u = append(hops, optimize.Hop{Edge: e, Forward: true}), b
			} else {
				hops, u = append(hops, optimize.Hop{Edge: e, Forward: false}), a
			}
		}
		if u != to {
			hs, _, ok := join(u, to)
			if !ok {
				return nil, "it does not end at the link's other building"
			}
			hops = append(hops, hs...)
		}
		if len(hops) == 0 {
			return nil, "it has no hop"
		}
		// Back to front, each hop turned round: from to to from.
		out := make([]optimize.Hop, len(hops))
		for i, h := range hops {
			out[len(hops)-1-i] = optimize.Hop{Edge: h.Edge, Forward: !h.Forward}
		}
		return out, ""
	}
	type pair struct{ primary, diverse *StartLeg }
	byLink := map[string]*pair{}
	for i := range start.Legs {
		l := &start.Legs[i]
		p := byLink[l.Link]
		if p == nil {
			p = &pair{}
			byLink[l.Link] = p
		}
		switch {
		case l.Leg == LegPrimary && p.primary == nil:
			p.primary = l
		case l.Leg == LegDiverse && p.diverse == nil:
			p.diverse = l
		}
	}
	out := make([]optimize.StartRoute, len(prob.Demands))
	unfit := map[int]string{}
	for d := range prob.Demands {
		dm := &prob.Demands[d]
		out[d] = optimize.StartRoute{ID: dm.ID, Option: -1}
		p := byLink[dm.ID]
		if p == nil || (p.primary == nil && p.diverse == nil) {
			continue
		}
		r, why := startRoute(dm, prob.Edges, p.primary, p.diverse, walk)
		if why != "" {
			unfit[d] = why
			continue
		}
		out[d] = r
	}
	return out, unfit
}

// startRoute is demand dm's start route from its start legs (the diverse one nil when there is
// none), or false when they do not join on the site (startRoutes). The route starts in the
// primary's medium (the optimizer gives a pair one medium; the rules may choose another for
// the diverse leg on its own facts). The legs run from the
// link's from building (the demand's Target) to its to building (Source); walk turns them.
//
// A medium may have several options (optionName): the route starts in the one of them whose
// excluded edges its legs keep off (a route over a buried span in the option priced as the
// cable laid there) and that is cheapest on these legs by the objective's own terms (its
// fixed part and its cable along them; the rest is the same for every option of a medium),
// as the optimizer gives a route its option; the first on a tie; else in the medium's first.
func startRoute(dm *optimize.Demand, edges []optimize.Edge, primary, diverse *StartLeg, walk func(from, to int, spans []string) ([]optimize.Hop, string)) (optimize.StartRoute, string) {
	r := optimize.StartRoute{ID: dm.ID, Option: -1}
	switch {
	case primary == nil:
		return r, "a diverse leg without its primary"
	case diverse != nil && !dm.Diverse:
		return r, "a diverse leg, and the link is not diverse in this plan"
	}
	var flags uint64 // of every edge the legs take
	for _, l := range []*StartLeg{primary, diverse} {
		if l == nil {
			continue
		}
		hops, why := walk(dm.Target, dm.Source, l.Spans)
		if why != "" {
			return optimize.StartRoute{ID: dm.ID, Option: -1}, l.Leg + " leg: " + why
		}
		for _, h := range hops {
			flags |= edges[h.Edge].Flags
		}
		r.Legs = append(r.Legs, hops)
	}
	first, best := -1, int64(0)
	for o := range dm.Options {
		op := &dm.Options[o]
		if optionMedium(op.Name) != primary.Medium {
			continue
		}
		if first < 0 {
			first = o
		}
		if op.ExcludeFlags&flags != 0 {
			continue
		}
		c := op.FixedCents
		if len(r.Legs) > 1 {
			c += op.SecondLegCents
		}
		for _, hops := range r.Legs {
			for _, h := range hops {
				e := &edges[h.Edge]
				m := e.CableM
				if m == 0 {
					m = e.LengthM
				}
				c += int64(math.Round(m * float64(op.CablePerMCents)))
			}
		}
		if r.Option < 0 || c < best {
			r.Option, best = o, c
		}
	}
	if r.Option < 0 {
		r.Option = first
	}
	if r.Option < 0 {
		return optimize.StartRoute{ID: dm.ID, Option: -1}, fmt.Sprintf("medium %s is not one this link may use in this plan", primary.Medium)
	}
	return r, ""
}
