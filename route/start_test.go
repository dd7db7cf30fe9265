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
	start := &routing.Start{From: "elsewhere", Legs: []routing.StartLeg{{Link: "ADM-NOWHERE", Leg: routing.LegPrimary, Medium: "os2", Spans: []string{"P-1"}}}}
	r, err := route.SolveFrom(context.Background(), s, p, eng, start)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.ContainsFunc(r.Notes, func(n string) bool {
		return strings.Contains(n, "elsewhere, which has a route for none of this plan's links (its links differ from this plan's: another plan or campus?)")
	}) {
		t.Errorf("notes %q: want one saying the start has a route for none of the links", r.Notes)
	}
	// A start planned from another hub (a sweep that varies the hub starts its scenarios
	// from the first): the note says so, rather than asking whether it was another hub.
	start.Legs[0].Link = "HUB-NOWHERE"
	r, err = route.SolveFrom(context.Background(), s, p, eng, start)
	if err != nil {
		t.Fatal(err)
	}
	// Every link is placed afresh, but with a warm start's search, so the note does not
	// promise the plan made alone (tester 10's finding 10).
	want := "started from the routes of elsewhere, whose links leave another cross-connect than this plan's (hub ADM): it has a route for none of this plan's links, and every link was placed afresh; " +
		"searched as a warm start is (no second start from scratch, no perturbation phase: README, \"Warm start\"), so the plan may be cheaper or dearer than the one `spanwright plan` makes alone, within its gap to the proved lower bound"
	if !slices.Contains(r.Notes, want) {
		t.Errorf("notes %q: want %q", r.Notes, want)
	}
}
