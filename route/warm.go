package route

import (
	"slices"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/optimize"
	"spanwright/route/plan"
	"spanwright/route/routing"
	"spanwright/route/site"
)

// WarmStart returns start when beginning the optimizer's search for p from it is worth what
// it changes, and nil when p is to be planned from scratch, as `spanwright plan` plans it
// alone: when start has a route for none of p's links (a base planned from another hub keeps
// nothing, and a warm search from no routes is only a weaker search), or when p's routing
// problem is small enough that the search from scratch runs in full (optimize.WarmPays: the
// second start and the perturbation phase, which a warm start skips). A sweep asks it of each
// scenario; `spanwright plan --start-from` starts from what it is given. A plan that does not
// prepare (its hub, links or prices) gets nil: SolveFrom reports its problems.
func WarmStart(s *site.Site, p *plan.Plan, eng *media.Engine, start *routing.Start) *routing.Start {
	if start == nil {
		return nil
	}
	pr, err := prepare(s, p, eng)
	if err != nil || !keepsRoute(start, pr.links) {
		return nil
	}
	// The plan's demands and its proposed spans alone (one demand a link, one proposed edge a
	// proposed span, and more edges and the charges besides) are a problem no larger than its
	// own: when that already pays, the problem need not be built twice (at 1,000 buildings the
	// second build raised a 10-scenario sweep's peak from about 600 to 740-810 MB).
	lower := &optimize.Problem{Demands: make([]optimize.Demand, len(pr.links)), AllowNew: p.Design.AllowNewTrench}
	for i := range s.Net.Spans {
		if s.Net.Spans[i].Status == geo.StatusProposed {
			lower.Edges = append(lower.Edges, optimize.Edge{Proposed: true})
		}
	}
	if optimize.WarmPays(lower) {
		return start
	}
	prob, err := routing.Problem(s, pr.model, pr.links)
	if err != nil || !optimize.WarmPays(prob) {
		return nil
	}
	return start
}

// keepsRoute reports whether start has a route for some link of links (a link is named by
// its cross-connect end first, site.Link.ID, so a start from another hub has none).
func keepsRoute(start *routing.Start, links []site.Link) bool {
	in := map[string]bool{}
	for _, l := range start.Legs {
		in[l.Link] = true
	}
	return slices.ContainsFunc(links, func(l site.Link) bool { return in[l.ID] })
}
