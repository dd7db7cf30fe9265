package route_test

import (
	"context"
	"slices"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/routing"
)

// TestStartFromAnotherPlan: a start whose routes are for none of the plan's links (another
// campus's folder given to --start-from) is said so in a note, not taken silently.
func TestStartFromAnotherPlan(t *testing.T) {
	s, p := testsite.DemoFresh(t)
	eng, err := plan.Engine(p)
	if err != nil {
		t.Fatal(err)
	}
	start := &routing.Start{From: "elsewhere", Legs: []routing.StartLeg{{Link: "HUB-NOWHERE", Leg: routing.LegPrimary, Medium: "os2", Spans: []string{"P-1"}}}}
	r, err := route.SolveFrom(context.Background(), s, p, eng, start)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.ContainsFunc(r.Notes, func(n string) bool {
		return strings.Contains(n, "elsewhere, which has a route for none of this plan's")
	}) {
		t.Errorf("notes %q: want one saying the start has a route for none of the links", r.Notes)
	}
}
