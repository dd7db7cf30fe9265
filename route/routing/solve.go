package routing

import (
	"context"
	"fmt"
	"slices"

	"spanwright/route/internal/ctxio"
	"spanwright/route/optimize"
	"spanwright/route/site"
)

// Routed is a plan's routing: the legs of every link in link order, with their routes, media
// and cable takeoffs, and what the optimizer decided for the plan as a whole.
type Routed struct {
	Legs   []Leg
	Opened []string      // proposed spans the plan builds, by span ID
	Fill   []SegmentFill // duct fill of every span that carries cable, by span ID
	// Handholes are the handholes or pull boxes the plan adds at junctions without a
	// structure, by junction ID: where new pathway joins the network, or where a route turns
	// from one pathway into another.
	Handholes []Handhole
	// ObjectiveCents is the optimizer's objective for the routes it returned
	// (optimize.Solution.TotalCents): see the README's "One cost model".
	ObjectiveCents int64
	// LowerBoundCents is the optimizer's proved lower bound on that objective for every plan
	// serving the same legs (optimize.Solution.LowerBoundCents); -1 when none was computed
	// (the length objective).
	LowerBoundCents int64
}

// Handhole is a handhole the plan adds at a junction without a structure.
type Handhole struct {
	Junction string
	Joins    bool // an opened proposed span ends there; else only routes turn there
}

// Solve routes links over the site with the model's prices and rules, and chooses each leg's
// medium with the model's engine. Each leg points into links. An infeasible leg does not stop
// the others; it carries its reason. When ctx is done, the optimizer and the media choice stop
// within a step and Solve returns ctx's error.
func Solve(ctx context.Context, s *site.Site, m *Model, links []site.Link) (*Routed, error) {
	prob, infos, err := problem(s, m, links)
	if err != nil {
		return nil, err
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	lay := m.layout
	sol, err := solve(ctx, s, lay, prob, optimize.Settings{Objective: m.design.Objective})
	if err != nil {
		if ctx.Err() != nil {
			return nil, ctx.Err()
		}
		return nil, fmt.Errorf("route: optimizer: %w", err)
	}
	r := &Routed{ObjectiveCents: sol.TotalCents, LowerBoundCents: sol.LowerBoundCents, Fill: fillReport(s, prob, sol)}
	for _, e := range sol.Opened {
		r.Opened = append(r.Opened, s.Net.Spans[e].ID)
	}
	for _, k := range sol.Charged {
		c := lay.charges[k]
		joins := slices.ContainsFunc(sol.Opened, func(e int) bool { return slices.Contains(c.edges, e) })
		r.Handholes = append(r.Handholes, Handhole{Junction: c.junction, Joins: joins})
	}
	infeasible := map[int]string{}
	for _, in := range sol.Infeasible {
		infeasible[in.Demand] = m.explain(in)
	}
	for i := range links {
		if err := ctxio.StopEvery(ctx, i); err != nil {
			return nil, err
		}
		r.Legs = append(r.Legs, legsOf(s, m, prob, &sol.Routes[i], &links[i], infos[i], infeasible[i])...)
	}
	return r, nil
}

// Problem is the optimizer's problem Solve states for links: one edge per span of the
// site's network (same index), one demand per link, every price from the model. It is what
// the optimizer's objective is computed on, for checks against the bill.
func Problem(s *site.Site, m *Model, links []site.Link) (*optimize.Problem, error) {
	prob, _, err := problem(s, m, links)
	return prob, err
}
