package route_test

import (
	"testing"

	"spanwright/route/internal/testsite"
	"spanwright/route/optimize"
	"spanwright/route/plan"
	"spanwright/route/routing"
	"spanwright/route/site"
)

// independentCents routes every demand of prob alone, each paying in full for the proposed
// edges it uses: the plan a designer gets by routing link by link with no shared trench. Its
// routes laid together still need the ducts their cables need where they share a span (three
// loose cables a duct, install.DefaultCablesPerDuct: common practice, no published source),
// which no link alone sees: those are priced on the routes together (Settings.PlaceOnly with
// the routes as the start), in place of the ducts each link alone paid for.
func independentCents(t *testing.T, prob *optimize.Problem) int64 {
	t.Helper()
	var total, aloneDucts int64
	start := make([]optimize.StartRoute, len(prob.Demands))
	for i, d := range prob.Demands {
		one := *prob
		one.Demands = []optimize.Demand{d}
		sol, err := optimize.Solve(&one, optimize.Settings{})
		if err != nil {
			t.Fatal(err)
		}
		total += sol.TotalCents
		for _, r := range sol.Routes {
			aloneDucts += r.Cost.AddedDuctCents
		}
		start[i] = optimize.StartFrom(sol)[0]
	}
	together, err := optimize.Solve(prob, optimize.Settings{Start: start, PlaceOnly: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(together.StartNoRoom) > 0 || len(together.StartUnused) > 0 {
		t.Fatalf("independent routes laid together: %d find no room, %d unused", len(together.StartNoRoom), len(together.StartUnused))
	}
	var ducts int64
	for _, r := range together.Routes {
		ducts += r.Cost.AddedDuctCents
	}
	return total - aloneDucts + ducts
}

// TestSavingOverIndependentRouting compares the optimizer's plan with routing each link
// alone (trench charged per link), on the demo campus at the demo prices and with trench at a
// tenth of them. The optimizer must never cost more; the figures are logged for the README
// (route/optimize measures the same on synthetic campuses).
func TestSavingOverIndependentRouting(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name        string
		site        func(t *testing.T) (*site.Site, *plan.Plan)
		trenchScale float64
	}{
		{"demo campus", func(t *testing.T) (*site.Site, *plan.Plan) { return testsite.Demo(t) }, 1},
		{"demo campus, trench at a tenth of the demo price", func(t *testing.T) (*site.Site, *plan.Plan) { return testsite.Demo(t) }, 0.1},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			s, p := tc.site(t)
			eng, err := plan.Engine(p)
			if err != nil {
				t.Fatal(err)
			}
			cm := routing.NewModel(eng, p.Design)
			hub, err := s.Hub(p)
			if err != nil {
				t.Fatal(err)
			}
			links, _, errs := s.Links(p, hub)
			if len(errs) > 0 {
				t.Fatal(errs)
			}
			prob, err := routing.Problem(s, cm, links)
			if err != nil {
				t.Fatal(err)
			}
			for i := range prob.Edges {
				prob.Edges[i].FixedCents = int64(float64(prob.Edges[i].FixedCents) * tc.trenchScale)
			}
			sol, err := optimize.Solve(prob, optimize.Settings{})
			if err != nil {
				t.Fatal(err)
			}
			alone := independentCents(t, prob)
			if sol.TotalCents > alone {
				t.Errorf("%s: optimizer %d cents costs more than independent routing %d cents", tc.name, sol.TotalCents, alone)
			}
			t.Logf("%s: optimizer %.2f, independent %.2f, saving %.2f %%, %d proposed spans opened",
				tc.name, float64(sol.TotalCents)/100, float64(alone)/100, 100*float64(alone-sol.TotalCents)/float64(alone), len(sol.Opened))
		})
	}
}
