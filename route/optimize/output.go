package optimize

import (
	"fmt"
	"math"
	"slices"
	"strings"
)

// solution turns the final state into a Solution, splitting the cost per demand.
func (sv *solver) solution() *Solution {
	sv.flush()
	avoided := make([]int64, len(sv.p.Demands))
	var offDs []int
	var offAlts []choice
	for d := range sv.p.Demands {
		if sv.p.Demands[d].Diverse {
			var alt choice
			if avoided[d], alt = sv.crossingAvoided(d); alt.opt >= 0 {
				offDs, offAlts = append(offDs, d), append(offAlts, alt)
			}
		}
	}
	joint := sv.crossingJoint(offDs, offAlts)
	p, st := sv.p, sv.st
	sol := &Solution{CrossingAvoidedCents: joint, Routes: make([]Route, len(p.Demands)), Rounds: sv.rounds, LowerBoundCents: sv.planBound(), StartUnused: sv.startUnused,
		StartNoRoom: sv.startNoRoom}
	for d := range p.Demands {
		dm := &p.Demands[d]
		r := &sol.Routes[d]
		r.Demand, r.ID, r.Option = d, dm.ID, -1
		c := st.ch[d]
		if c.opt < 0 {
			reason, fails := sv.reason(d)
			sol.Infeasible = append(sol.Infeasible, Infeasible{Demand: d, ID: dm.ID, Reason: reason, Options: fails})
			continue
		}
		op := &dm.Options[c.opt]
		r.Feasible, r.Option, r.Medium = true, c.opt, op.Name
		legs := make([]Leg, len(c.legs))
		for i, hops := range c.legs {
			if sv.from[d] != dm.Source {
				hops = reverseHops(hops)
			}
			legs[i] = Leg{Hops: hops}
			for _, h := range hops {
				e := &p.Edges[h.Edge]
				legs[i].LengthM += e.LengthM
				r.Cost.CableCents += cableCents(e, op.CablePerMCents)
				r.Cost.LabourCents += labourCents(e, op.cables())
			}
			sol.TotalM += legs[i].LengthM
		}
		if len(legs) == 2 && sv.legLess(legs[1], legs[0], op) {
			legs[0], legs[1] = legs[1], legs[0]
		}
		r.Primary = legs[0]
		if len(legs) == 2 {
			r.Secondary = legs[1]
			r.CrossingAvoidedCents = avoided[d]
		} else if dm.Diverse {
			r.SinglePoint, r.Note = sv.singlePoint(d, c.opt)
		}
		r.Cost.FixedCents = sv.optionCents(d, c.opt, len(c.legs))
	}
	// Cables per edge: every cable of every leg (Option.Cables).
	cables := make([]int, len(p.Edges))
	for d, c := range st.ch {
		if c.opt < 0 {
			continue
		}
		n := sv.cables(d, c.opt)
		for _, leg := range c.legs {
			for _, h := range leg {
				cables[h.Edge] += n
			}
		}
	}
	// Construction shares and added ducts, edge by edge.
	for e := range p.Edges {
		users := st.users[e]
		if p.Edges[e].Proposed && len(users) > 0 {
			sol.Opened = append(sol.Opened, e)
			splitCents(p.Edges[e].FixedCents, users, func(u int32, c int64) {
				sol.Routes[u].Cost.ConstructionShareCents += c
				sol.Routes[u].legWith(e).ConstructionCents += c
			})
		}
		if st.count[e] == 0 {
			continue
		}
		fill := EdgeFill{Edge: e, Cables: cables[e], Limited: sv.limited[e]}
		if sv.limited[e] {
			ed := &p.Edges[e]
			ods, cnt := sv.odBuf[:0], sv.cntBuf[:0]
			for _, u := range users {
				ods = append(ods, sv.od(int(u), st.ch[u].opt))
				cnt = append(cnt, int32(sv.cables(int(u), st.ch[u].opt)))
			}
			sv.odBuf, sv.cntBuf = ods, cnt
			if !sv.multi {
				cnt = nil // one cable each
			}
			fill.Ducts, fill.AddedDucts = ed.Ducts, ed.LaidDucts(st.added[e])
			if ed.Proposed {
				fill.Ducts = 0 // every duct of new construction is laid by the plan
			}
			fill.Demands = make([]int, len(users))
			for i, u := range users {
				fill.Demands[i] = int(u)
			}
			fill.UsedAreaMM2, fill.AllowedAreaMM2 = sv.cap.allowedArea(ed, ods, cnt)
			prev := 0
			for i, k := range sv.cap.prefixNeeds(e, ods, cnt) {
				if k > prev {
					r := &sol.Routes[users[i]]
					c := sv.ductsCents(e, k) - sv.ductsCents(e, prev)
					r.Cost.AddedDuctCents += c
					r.legWith(e).ConstructionCents += c
					prev = k
				}
			}
		}
		sol.Fill = append(sol.Fill, fill)
	}
	sv.chargeShares(sol)
	for d := range sol.Routes {
		sol.TotalCents += sol.Routes[d].Cost.Total()
	}
	return sol
}

// chargeShares lists the charges the plan pays and splits each among the demands that use
// any of its edges: equal shares, the remainder cents to the first user in demand order.
func (sv *solver) chargeShares(sol *Solution) {
	p := sv.p
	if len(p.Charges) == 0 {
		return
	}
	users := make([][]int32, len(p.Charges))
	for d := range sol.Routes {
		c := sv.st.ch[d]
		for _, leg := range c.legs {
			for _, h := range leg {
				for _, k := range sv.chargesOf(h.Edge) {
					if u := users[k]; len(u) == 0 || u[len(u)-1] != int32(d) {
						users[k] = append(u, int32(d))
					}
				}
			}
		}
	}
	for k, us := range users {
		if len(us) == 0 {
			continue
		}
		sol.Charged = append(sol.Charged, k)
		splitCents(p.Charges[k].Cents, us, func(u int32, c int64) {
			r := &sol.Routes[u]
			r.Cost.ChargeShareCents += c
			leg := &r.Primary
			if !slices.ContainsFunc(r.Primary.Hops, func(h Hop) bool { return slices.Contains(p.Charges[k].Edges, h.Edge) }) {
				leg = &r.Secondary
			}
			leg.ConstructionCents += c
		})
	}
}

// legWith is the leg of r whose hops take edge e: the secondary when it does, else the
// primary (a demand's legs share no edge).
func (r *Route) legWith(e int) *Leg {
	if slices.ContainsFunc(r.Secondary.Hops, func(h Hop) bool { return h.Edge == e }) {
		return &r.Secondary
	}
	return &r.Primary
}

// splitCents gives f cents to the users (demands, ascending) through add: equal parts, the
// remainder cents to the first (ShareCents).
func splitCents(f int64, users []int32, add func(u int32, c int64)) {
	for i, u := range users {
		add(u, ShareCents(f, len(users), i))
	}
}

// ShareCents is user i's share (0 ≤ i < n) of cents split among n users: equal parts, the
// remainder cents to the first. It is how every cost a plan shares is split (construction,
// charges, a building's one entrance).
func ShareCents(cents int64, n, i int) int64 {
	part := cents / int64(n)
	if i == 0 {
		return part + cents - part*int64(n)
	}
	return part
}

// legLess orders the legs of a pair: cheaper first, then shorter, then by first edge.
func (sv *solver) legLess(a, b Leg, op *Option) bool {
	cost := func(l Leg) int64 {
		var c int64
		for _, h := range l.Hops {
			e := &sv.p.Edges[h.Edge]
			c += cableCents(e, op.CablePerMCents) + labourCents(e, op.cables()) + e.FixedCents
		}
		return c
	}
	ca, cb := cost(a), cost(b)
	if ca != cb {
		return ca < cb
	}
	la, lb := hopsLenMM(sv.net, a.Hops), hopsLenMM(sv.net, b.Hops)
	if la != lb {
		return la < lb
	}
	return a.Hops[0].Edge < b.Hops[0].Edge
}

func reverseHops(hops []Hop) []Hop {
	out := make([]Hop, len(hops))
	for i, h := range hops {
		out[len(hops)-1-i] = Hop{Edge: h.Edge, Forward: !h.Forward}
	}
	return out
}

// reason explains why demand d has no route, option by option, in words and as data.
func (sv *solver) reason(d int) (string, []OptionFailure) {
	if sv.invalid[d] != "" {
		return sv.invalid[d], nil
	}
	dm := &sv.p.Demands[d]
	s, t := sv.from[d], sv.to[d]
	var msgs []string
	var fails []OptionFailure
	// free is the tree of shortest paths to t over every usable edge, built once for the
	// options that no path on their own edges joins: which of their excluded edges lie on
	// the way (OptionFailure.BlockFlags), or that no path joins the ends at all.
	var free *tree
	blocking := func(excl uint64) (uint64, bool) {
		if free == nil {
			all := sv.lenFor(0)
			free = buildTree(sv.srch, t, func(e int32) (int64, bool) { return all[e], all[e] >= 0 })
		}
		if free.dist[s] < 0 {
			return 0, false
		}
		var on uint64
		for _, h := range free.pathFrom(sv.net, s) {
			on |= sv.p.Edges[h.Edge].Flags & excl
		}
		return on, true
	}
	for o := range dm.Options {
		op := &dm.Options[o]
		name := fmt.Sprintf("option %d (%q)", o, op.Name)
		excl := op.ExcludeFlags
		comp, ok := sv.comps[excl]
		if !ok {
			comp = sv.net.components(func(e int) bool { return sv.usable(e, excl) })
			sv.comps[excl] = comp
		}
		lt := sv.lenTree(t, excl)
		f := OptionFailure{Option: o, Name: op.Name}
		// Joined only through a node that routes may not pass (Problem.NoTransit).
		const via = " without passing through a transit-free node"
		var block uint64
		joined := true
		if excl != 0 && (comp[s] != comp[t] || lt.dist[s] < 0) {
			block, joined = blocking(excl)
		}
		switch {
		case comp[s] != comp[t] && excl != 0 && joined:
			f.Kind, f.ExcludeFlags, f.BlockFlags = FailNoPathFlags, excl, block
			msgs = append(msgs, fmt.Sprintf("%s: no pathway joins its two ends on the edges this option may use (it excludes edges flagged %#x, %#x on the shortest path)", name, excl, block))
		case comp[s] != comp[t]:
			f.Kind = FailNoPath
			msgs = append(msgs, fmt.Sprintf("%s: no pathway joins its two ends", name))
		case lt.dist[s] < 0 && excl != 0 && joined:
			f.Kind, f.ExcludeFlags, f.BlockFlags = FailNoPathFlags, excl, block
			msgs = append(msgs, fmt.Sprintf("%s: no pathway joins its two ends on the edges this option may use (it excludes edges flagged %#x, %#x on the shortest path)%s", name, excl, block, via))
		case lt.dist[s] < 0:
			f.Kind = FailNoPath
			msgs = append(msgs, fmt.Sprintf("%s: no pathway joins its two ends%s", name, via))
		case lt.dist[s] > sv.reach[d][o]:
			f.Kind, f.ShortestM, f.ReachM = FailReach, float64(lt.dist[s])/mmPerM, op.MaxRouteM
			msgs = append(msgs, fmt.Sprintf("%s: shortest route %.3f m exceeds reach %.3f m", name, f.ShortestM, op.MaxRouteM))
		default:
			f.Kind, f.Full = FailDucts, sv.fullOn(d, o, lt)
			msgs = append(msgs, fmt.Sprintf("%s: every route within reach crosses ducts too full for the cable", name))
		}
		fails = append(fails, f)
	}
	return strings.Join(msgs, "; "), fails
}

// fullOn lists the capacity-limited edges of the shortest path to demand d's anchor on lt
// (its option o's edges, ignoring fill) that have no room for the option's cable in the final
// state (weightFor refuses them, by the one fill rule, penalty), each with its ducts and the
// cables the plan pulls there, in path order (OptionFailure.Full).
func (sv *solver) fullOn(d, o int, lt *tree) []FullEdge {
	w := sv.weightFor(d, o)
	var full []FullEdge
	for _, h := range lt.pathFrom(sv.net, sv.from[d]) {
		e := h.Edge
		if !sv.limited[e] {
			continue
		}
		if _, ok := w(int32(e)); ok {
			continue
		}
		f := FullEdge{Edge: e, Ducts: sv.p.Edges[e].Ducts + sv.st.added[e]}
		for _, u := range sv.st.users[e] {
			if c := sv.st.ch[u]; c.opt >= 0 {
				f.Cables += sv.cables(int(u), c.opt)
			}
		}
		full = append(full, f)
	}
	return full
}

// singlePoint explains why diverse demand d got one leg, for its option o.
func (sv *solver) singlePoint(d, o int) (*SinglePoint, string) {
	if sp, note := sv.singlePointOn(d, sv.anyOption(d)); sp != nil && sp.Separates {
		return sp, note // true of every option: the same words whichever is routed (NoDiversePair)
	}
	base := sv.profBase[sv.optProf[d][o]]
	return sv.singlePointOn(d, func(e int32) (int64, bool) { return base[e], base[e] >= 0 })
}

// anyOption weighs an edge that some option of demand d may use at the least of their base
// weights, and refuses one that none may: a point every route passes on those edges is one
// every route of every option passes.
func (sv *solver) anyOption(d int) func(e int32) (int64, bool) {
	profs := sv.optProf[d]
	return func(e int32) (int64, bool) {
		w := int64(-1)
		for _, pi := range profs {
			if b := sv.profBase[pi][e]; b >= 0 && (w < 0 || b < w) {
				w = b
			}
		}
		return w, w >= 0
	}
}

// singlePointOn is singlePoint on the edges w allows.
func (sv *solver) singlePointOn(d int, w func(e int32) (int64, bool)) (*SinglePoint, string) {
	s, t := sv.from[d], sv.to[d]
	res := disjointPair(sv.ps, s, t, w, nil, math.MaxInt64)
	if !res.ok {
		if !res.found1 {
			return nil, "no route for a diverse pair"
		}
		cut := res.cut
		var what string
		if cut.Kind == PointEdge {
			what = fmt.Sprintf("edge %d (%q)", cut.Index, sv.p.Edges[cut.Index].ID)
		} else {
			what = fmt.Sprintf("node %d", cut.Index)
		}
		return &cut, "every route passes " + what
	}
	g := sv.sharedGroup(res.legs)
	if g == 0 {
		return nil, "a diverse pair exists but none fits the reach of any medium or the ducts' capacity"
	}
	// Does some group on the pair separate s from t on its own?
	for _, cand := range sv.sharedGroups(res.legs) {
		if !sv.srch.run(s, t, func(e int32) (int64, bool) {
			if sv.p.Edges[e].Group == cand {
				return 0, false
			}
			return w(e)
		}, nil) {
			return &SinglePoint{Kind: PointGroup, Index: cand, Separates: true}, fmt.Sprintf("every route passes shared-risk group %d", cand)
		}
	}
	return &SinglePoint{Kind: PointGroup, Index: g}, fmt.Sprintf("every diverse pair found shares group %d (group-disjoint routing is a heuristic here)", g)
}
