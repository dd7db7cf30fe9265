package route

import (
	"spanwright/media"
	"spanwright/route/plan"
	"spanwright/route/routing"
	"spanwright/route/site"
)

// WarmStart returns start when beginning the optimizer's search for p from it is worth what
// it changes (routing.StartPays, the one decision: a start with a route for some link of p,
// and a routing problem too large for the optimizer's full search from scratch), and nil
// when p is to be planned from scratch, as `spanwright plan` plans it alone. SolveFrom makes
// the same decision itself, on the problem it builds, for a start with WherePays (a sweep's
// scenarios): WarmStart is for a caller that must know without planning (a resumed sweep
// keeping a scenario's folder, or one writing a scenario that failed), and may build the
// problem to tell. A plan that does not prepare (its hub, links or prices) gets nil:
// SolveFrom reports its problems.
func WarmStart(s *site.Site, p *plan.Plan, eng *media.Engine, start *routing.Start) *routing.Start {
	if start == nil {
		return nil
	}
	pr, err := prepare(s, p, eng)
	if err != nil || !routing.StartPays(s, pr.model, pr.links, start) {
		return nil
	}
	return start
}
