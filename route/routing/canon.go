package routing

import (
	"cmp"
	"context"
	"encoding/hex"
	"slices"
	"strings"

	"spanwright/route/optimize"
	"spanwright/route/site"
)

// canonical is a routing problem put in an order that depends on the campus's geometry and
// the costs, not on its names: nodes by their junction's position, edges by their end nodes
// and then what they cost and carry, demands by their end nodes and options, shared-risk
// groups by their first edge. Ids decide only exact ties. The optimizer's local search, like
// any, can stop at an optimum that depends on the order it meets demands and edges in; solved
// in this order, a campus whose ids are renamed gets the same plan.
type canonical struct {
	prob   *optimize.Problem // the problem in canonical order
	edge   []int             // canonical edge index → the original's
	dem    []int             // canonical demand index → the original's
	node   []int             // canonical node index → the original's
	group  []int             // canonical group number → the original's (0 stays 0)
	charge []int             // canonical charge index → the original's
}

// canonicalize orders p canonically; at gives each original node's position (lon, lat) and
// name its junction id, which orders only nodes at the same position.
func canonicalize(p *optimize.Problem, at func(node int) [2]float64, name func(node int) string) *canonical {
	c := &canonical{}
	c.node = make([]int, p.Nodes)
	for i := range c.node {
		c.node[i] = i
	}
	slices.SortStableFunc(c.node, func(a, b int) int {
		pa, pb := at(a), at(b)
		return cmp.Or(cmp.Compare(pa[0], pb[0]), cmp.Compare(pa[1], pb[1]), strings.Compare(name(a), name(b)))
	})
	rank := make([]int, p.Nodes)
	for k, n := range c.node {
		rank[n] = k
	}
	ends := func(e *optimize.Edge) (int, int) {
		u, v := rank[e.From], rank[e.To]
		return min(u, v), max(u, v)
	}
	c.edge = make([]int, len(p.Edges))
	for i := range c.edge {
		c.edge[i] = i
	}
	slices.SortStableFunc(c.edge, func(i, j int) int {
		a, b := &p.Edges[i], &p.Edges[j]
		au, av := ends(a)
		bu, bv := ends(b)
		return cmp.Or(cmp.Compare(au, bu), cmp.Compare(av, bv), cmp.Compare(a.LengthM, b.LengthM),
			cmp.Compare(a.FixedCents, b.FixedCents), cmp.Compare(a.LabourPerMCents, b.LabourPerMCents),
			cmp.Compare(a.AddDuctPerMCents, b.AddDuctPerMCents), cmp.Compare(a.Flags, b.Flags),
			cmp.Compare(a.Ducts, b.Ducts), cmp.Compare(a.DuctIDMM, b.DuctIDMM), boolCmp(a.Proposed, b.Proposed),
			strings.Compare(a.ID, b.ID))
	})
	groupOf := map[int]int{0: 0} // original group → canonical
	c.group = []int{0}
	for _, i := range c.edge {
		if g := p.Edges[i].Group; g != 0 {
			if _, ok := groupOf[g]; !ok {
				groupOf[g] = len(c.group)
				c.group = append(c.group, g)
			}
		}
	}
	c.dem = make([]int, len(p.Demands))
	for i := range c.dem {
		c.dem[i] = i
	}
	slices.SortStableFunc(c.dem, func(i, j int) int {
		a, b := &p.Demands[i], &p.Demands[j]
		return cmp.Or(cmp.Compare(rank[a.Source], rank[b.Source]), cmp.Compare(rank[a.Target], rank[b.Target]),
			boolCmp(a.Diverse, b.Diverse), slices.CompareFunc(a.Options, b.Options, optionCmp), strings.Compare(a.ID, b.ID))
	})
	cp := *p
	cp.Edges = make([]optimize.Edge, len(p.Edges))
	edgeRank := make([]int, len(p.Edges))
	for k, i := range c.edge {
		e := p.Edges[i]
		e.From, e.To, e.Group = rank[e.From], rank[e.To], groupOf[e.Group]
		cp.Edges[k] = e
		edgeRank[i] = k
	}
	if p.NoTransit != nil {
		cp.NoTransit = make([]bool, len(p.NoTransit))
		for k, n := range c.node {
			cp.NoTransit[k] = p.NoTransit[n]
		}
	}
	if p.Sites != nil {
		// Places numbered by their first node in canonical order.
		cp.Sites = make([]int, len(p.Sites))
		siteOf := map[int]int{0: 0}
		for k, n := range c.node {
			x, ok := siteOf[p.Sites[n]]
			if !ok {
				x = len(siteOf)
				siteOf[p.Sites[n]] = x
			}
			cp.Sites[k] = x
		}
	}
	if len(p.Charges) > 0 {
		// Charges by their smallest canonical edge, then amount, then ID.
		c.charge = make([]int, len(p.Charges))
		for i := range c.charge {
			c.charge[i] = i
		}
		first := func(ch *optimize.Charge) int {
			f := len(p.Edges)
			for _, e := range ch.Edges {
				f = min(f, edgeRank[e])
			}
			return f
		}
		slices.SortStableFunc(c.charge, func(i, j int) int {
			a, b := &p.Charges[i], &p.Charges[j]
			return cmp.Or(cmp.Compare(first(a), first(b)), cmp.Compare(a.Cents, b.Cents), strings.Compare(a.ID, b.ID))
		})
		cp.Charges = make([]optimize.Charge, len(p.Charges))
		for k, i := range c.charge {
			ch := p.Charges[i]
			edges := make([]int, len(ch.Edges))
			for x, e := range ch.Edges {
				edges[x] = edgeRank[e]
			}
			slices.Sort(edges)
			ch.Edges = edges
			cp.Charges[k] = ch
		}
	}
	cp.Demands = make([]optimize.Demand, len(p.Demands))
	for k, i := range c.dem {
		d := p.Demands[i]
		d.Source, d.Target = rank[d.Source], rank[d.Target]
		cp.Demands[k] = d
	}
	if fits := p.Fits; fits != nil {
		cp.Fits = func(edge int, ods []float64, ducts int) bool { return fits(c.edge[edge], ods, ducts) }
	}
	c.prob = &cp
	return c
}

func boolCmp(a, b bool) int {
	switch {
	case a == b:
		return 0
	case !a:
		return -1
	}
	return 1
}

func optionCmp(a, b optimize.Option) int {
	return cmp.Or(strings.Compare(a.Name, b.Name), cmp.Compare(a.CablePerMCents, b.CablePerMCents),
		cmp.Compare(a.FixedCents, b.FixedCents), cmp.Compare(a.MaxRouteM, b.MaxRouteM),
		cmp.Compare(a.ExcludeFlags, b.ExcludeFlags), cmp.Compare(a.CableODMM, b.CableODMM), cmp.Compare(a.Cables, b.Cables))
}

// back translates a solution of the canonical problem into one of the original: the same
// routes, with the original's edge, node, demand and group numbers, in its orders.
func (c *canonical) back(s *optimize.Solution) *optimize.Solution {
	out := *s
	demRank := make([]int, len(c.dem))
	for k, i := range c.dem {
		demRank[i] = k
	}
	leg := func(l optimize.Leg) optimize.Leg {
		if len(l.Hops) == 0 {
			return l
		}
		hops := make([]optimize.Hop, len(l.Hops))
		for i, h := range l.Hops {
			hops[i] = optimize.Hop{Edge: c.edge[h.Edge], Forward: h.Forward}
		}
		l.Hops = hops
		return l
	}
	out.Routes = make([]optimize.Route, len(s.Routes))
	for i := range out.Routes {
		r := s.Routes[demRank[i]]
		r.Demand = i
		r.Primary, r.Secondary = leg(r.Primary), leg(r.Secondary)
		if sp := r.SinglePoint; sp != nil {
			q := *sp
			switch q.Kind {
			case optimize.PointEdge:
				q.Index = c.edge[q.Index]
			case optimize.PointNode:
				q.Index = c.node[q.Index]
			case optimize.PointGroup:
				q.Index = c.group[q.Index]
			}
			r.SinglePoint = &q
			r.Note = "" // it names the point by its canonical number; SinglePoint names it
		}
		out.Routes[i] = r
	}
	if s.StartUnused != nil {
		out.StartUnused = make([]int, len(s.StartUnused))
		for i, k := range s.StartUnused {
			out.StartUnused[i] = c.dem[k]
		}
		slices.Sort(out.StartUnused)
	}
	if s.StartNoRoom != nil {
		out.StartNoRoom = make([]optimize.StartNoRoom, len(s.StartNoRoom))
		for i, n := range s.StartNoRoom {
			es := make([]int, len(n.Edges))
			for k, e := range n.Edges {
				es[k] = c.edge[e]
			}
			slices.Sort(es)
			out.StartNoRoom[i] = optimize.StartNoRoom{Demand: c.dem[n.Demand], Edges: es}
		}
		slices.SortFunc(out.StartNoRoom, func(a, b optimize.StartNoRoom) int { return cmp.Compare(a.Demand, b.Demand) })
	}
	out.Infeasible = make([]optimize.Infeasible, len(s.Infeasible))
	for i, in := range s.Infeasible {
		in.Demand = c.dem[in.Demand]
		if in.Options != nil {
			in.Options = slices.Clone(in.Options)
			for k, f := range in.Options {
				if f.Full != nil {
					full := slices.Clone(f.Full)
					for j := range full {
						full[j].Edge = c.edge[full[j].Edge]
					}
					in.Options[k].Full = full
				}
			}
		}
		out.Infeasible[i] = in
	}
	slices.SortFunc(out.Infeasible, func(a, b optimize.Infeasible) int { return cmp.Compare(a.Demand, b.Demand) })
	out.Opened = make([]int, len(s.Opened))
	for i, e := range s.Opened {
		out.Opened[i] = c.edge[e]
	}
	slices.Sort(out.Opened)
	out.Fill = make([]optimize.EdgeFill, len(s.Fill))
	for i, f := range s.Fill {
		f.Edge = c.edge[f.Edge]
		if f.Demands != nil {
			ds := make([]int, len(f.Demands))
			for k, d := range f.Demands {
				ds[k] = c.dem[d] // the packing order stays the canonical one the optimizer packed in
			}
			f.Demands = ds
		}
		out.Fill[i] = f
	}
	slices.SortFunc(out.Fill, func(a, b optimize.EdgeFill) int { return cmp.Compare(a.Edge, b.Edge) })
	if s.Charged != nil {
		out.Charged = make([]int, len(s.Charged))
		for i, k := range s.Charged {
			out.Charged[i] = c.charge[k]
		}
		slices.Sort(out.Charged)
	}
	return &out
}

// start puts a warm start of the original problem (one route per demand, in its order) in
// canonical order, with canonical edge numbers; nil stays nil.
func (c *canonical) start(routes []optimize.StartRoute) []optimize.StartRoute {
	if routes == nil {
		return nil
	}
	edgeRank := make([]int, len(c.edge))
	for k, e := range c.edge {
		edgeRank[e] = k
	}
	out := make([]optimize.StartRoute, len(c.dem))
	for k, i := range c.dem {
		r := routes[i]
		legs := make([][]optimize.Hop, len(r.Legs))
		for l, leg := range r.Legs {
			legs[l] = make([]optimize.Hop, len(leg))
			for x, h := range leg {
				legs[l][x] = optimize.Hop{Edge: edgeRank[h.Edge], Forward: h.Forward}
			}
		}
		r.Legs = legs
		out[k] = r
	}
	return out
}

// solve runs the optimizer, or returns the solution of an identical problem solved before on
// this site. Solve is deterministic, so the answer is the same either way; the returned
// solution is the caller's own, mapped back from the canonical one the cache keeps. A solve
// stopped by ctx returns ctx's error and is not remembered.
//
// The optimizer sees the problem in canonical order (canon.go), so that the plan depends on
// the campus's geometry and costs, not on the names of its ids.
//
// cold is the hex SHA-256 of the problem and settings without the start (optimize.Fingerprint),
// "" when it has none. When opt has a start and cold is same (the fingerprint of the problem
// the start's routes were solved for from scratch: Start.ProblemSHA256), the start is
// dropped: the answer is that problem's own, the one the start came from (reused says so).
func solve(ctx context.Context, s *site.Site, lay *layout, prob *optimize.Problem, opt optimize.Settings, same string) (sol *optimize.Solution, cold string, reused bool, err error) {
	c := canonicalize(prob, func(n int) [2]float64 { return lay.at[n] }, func(n int) string { return lay.name[n] })
	start := c.start(opt.Start)
	opt.Start = nil
	if sum, ok := optimize.Fingerprint(c.prob, opt); ok {
		cold = hex.EncodeToString(sum[:])
	}
	reused = start != nil && cold != "" && same == cold
	if !reused {
		opt.Start = start
	}
	key, ok := optimize.Fingerprint(c.prob, opt)
	if ok {
		if sol, hit := s.Solved.Get(key); hit {
			return c.back(sol), cold, reused, nil
		}
	}
	sol, err = optimize.SolveContext(ctx, c.prob, opt)
	if err != nil {
		return nil, "", false, err
	}
	if ok {
		s.Solved.Add(key, sol)
	}
	return c.back(sol), cold, reused, nil
}
