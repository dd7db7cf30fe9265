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

// TestWarmStartWherePays: a sweep starts a scenario from its base's routes only where that
// is worth it (route.WarmStart): not on the demo campus, small enough for the optimizer's full
// search from scratch (second start, perturbation phase), whose plan from scratch does not
// depend on which plan it started from; not from a start with a route for none of the plan's
// links (a base from another hub), on any campus; and on a synthetic campus of 600
// buildings, beyond the full search, from a start naming one of its links. Common practice,
// no published source: alternatives are compared on equal search where it costs little.
func TestWarmStartWherePays(t *testing.T) {
	s, p := testsite.DemoFresh(t)
	eng, err := plan.Engine(p)
	if err != nil {
		t.Fatal(err)
	}
	r, err := route.SolveWith(context.Background(), s, p, eng)
	if err != nil {
		t.Fatal(err)
	}
	own := &routing.Start{From: "base", Legs: []routing.StartLeg{{Link: r.Links[0].ID, Leg: routing.LegPrimary, Medium: "os2"}}}
	if got := route.WarmStart(s, p, eng, own); got != nil {
		t.Errorf("demo campus: warm start kept; want a plan from scratch")
	}
	// SolveFrom makes the same decision on the problem it builds, for a start with WherePays
	// (a sweep's), and plans from scratch: the plan SolveWith makes, naming no start.
	pays := *own
	pays.WherePays = true
	got, err := route.SolveFrom(context.Background(), s, p, eng, &pays)
	if err != nil {
		t.Fatal(err)
	}
	if got.StartedFrom != "" || got.ObjectiveCents != r.ObjectiveCents || got.ProblemSHA256 != r.ProblemSHA256 || len(got.Notes) != len(r.Notes) {
		t.Errorf("demo campus, SolveFrom with WherePays: started from %q, objective %d, problem %q, notes %q; want no start, %d, %q, %q",
			got.StartedFrom, got.ObjectiveCents, got.ProblemSHA256, got.Notes, r.ObjectiveCents, r.ProblemSHA256, r.Notes)
	}
	// Without WherePays (`plan --start-from`) it starts from the routes it is given.
	if got, err := route.SolveFrom(context.Background(), s, p, eng, own); err != nil {
		t.Fatal(err)
	} else if got.StartedFrom != "base" {
		t.Errorf("demo campus, SolveFrom without WherePays: started from %q, want base", got.StartedFrom)
	}
	big := testsite.Synth(t, 600)
	bp := testsite.SynthPlan(big)
	beng, err := plan.Engine(bp)
	if err != nil {
		t.Fatal(err)
	}
	hub, err := big.Hub(bp)
	if err != nil {
		t.Fatal(err)
	}
	links, _, errs := big.Links(bp, hub)
	if len(errs) > 0 || len(links) == 0 {
		t.Fatalf("synthetic links: %v", errs)
	}
	bigStart := &routing.Start{From: "base", Legs: []routing.StartLeg{{Link: links[0].ID, Leg: routing.LegPrimary, Medium: "os2"}}}
	if got := route.WarmStart(big, bp, beng, bigStart); got != bigStart {
		t.Errorf("600 buildings: warm start dropped; want it kept")
	}
	other := &routing.Start{From: "base", Legs: []routing.StartLeg{{Link: "ELSEWHERE-" + links[0].To, Leg: routing.LegPrimary, Medium: "os2"}}}
	if got := route.WarmStart(big, bp, beng, other); got != nil {
		t.Errorf("600 buildings, a start from another hub: kept; want a plan from scratch")
	}
}
