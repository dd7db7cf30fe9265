package routing

import (
	"fmt"
	"slices"
	"testing"

	"spanwright/route/optimize"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// coldWarmTol is how much dearer, as a share, a plan searched from scratch may be than the
// plan the same search keeps when started from another plan of the same problem. A local
// search guarantees neither way; this bounds how far the basin its own start falls into may
// lie from one another start reaches. // common practice, no published source
// Measured on seed 1: −0.6 % at 300 buildings, +0.15 % since junctions where only tunnels
// meet are free to turn at (no handhole there), +0.25 % since a leg may be spliced to listed
// cable at one entrance only (both plans cheaper: cold 4,504,973.05 → 4,478,431.02 USD, warm
// 4,498,071.37 → 4,467,115.83); other seeds of the same generator reach up to +1.0 % (150
// and 300 buildings, seeds 1–6, 2026-12-05), so this guards against the trench moves'
// regression on seed 1 (0.5 % and 1.9 % above before them), not a bound the search keeps on
// every campus.
const coldWarmTol = 0.003

// TestColdNotAboveWarm is a metamorphic check of the optimizer's search (cold ≤ warm from any
// start + coldWarmTol): on generated campuses, the plan Solve finds from scratch costs no more
// than coldWarmTol above the plan it keeps when started from the plan of a price scenario
// of the same campus in which the first duct added to an existing span needs no trench (so
// its trunks fill other streets). The added ducts' trench is a fixed charge no single
// reroute pays; before open moves priced it (optimize.openCandidates, tester 6's finding 3)
// the cold plan was 0.5 % above the warm one at 150 buildings and 1.9 % at 300.
func TestColdNotAboveWarm(t *testing.T) {
	t.Parallel()
	for _, n := range []int{150, 300} {
		t.Run(fmt.Sprint(n), func(t *testing.T) {
			t.Parallel()
			s, p := generatedSite(t, n)
			prob := generatedProblem(t, s, p)
			cold, err := optimize.Solve(prob, optimize.Settings{})
			if err != nil {
				t.Fatal(err)
			}
			free := *prob
			free.Edges = slices.Clone(prob.Edges)
			for i := range free.Edges {
				free.Edges[i].AddTrenchPerMCents, free.Edges[i].AddTrenchCents = 0, 0
			}
			other, err := optimize.Solve(&free, optimize.Settings{})
			if err != nil {
				t.Fatal(err)
			}
			warm, err := optimize.Solve(prob, optimize.Settings{Start: optimize.StartFrom(other)})
			if err != nil {
				t.Fatal(err)
			}
			t.Logf("%d buildings: cold %d cents, warm %d cents (%.3f %%)", n, cold.TotalCents, warm.TotalCents,
				100*float64(cold.TotalCents-warm.TotalCents)/float64(warm.TotalCents))
			if float64(cold.TotalCents) > float64(warm.TotalCents)*(1+coldWarmTol) {
				t.Errorf("%d buildings: cold plan %d cents, above the warm plan's %d by more than %.1f %%", n, cold.TotalCents, warm.TotalCents, 100*coldWarmTol)
			}
		})
	}
}

// generatedProblem is the optimizer's problem of generatedSite's plan.
func generatedProblem(t *testing.T, s *site.Site, p *plan.Plan) *optimize.Problem {
	t.Helper()
	m, links := generatedLinks(t, s, p)
	prob, _, _, err := problem(s, m, links, m.runsOf(s))
	if err != nil {
		t.Fatal(err)
	}
	return prob
}

// generatedLinks is the model and the links of generatedSite's plan.
func generatedLinks(t *testing.T, s *site.Site, p *plan.Plan) (*Model, []site.Link) {
	t.Helper()
	eng, err := plan.Engine(p)
	if err != nil {
		t.Fatal(err)
	}
	hub, _ := s.Hub(p)
	links, _, errs := s.Links(p, hub)
	if len(errs) > 0 {
		t.Fatal(errs)
	}
	return NewModel(eng, p.Design), links
}
