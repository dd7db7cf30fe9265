package route_test

import (
	"context"
	"slices"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestHubOverridesMC: a plan whose hub is not the campus's building with role mc (ANSI/TIA-568
// and TIA-569 know one main cross-connect per campus, from memory) is planned from the plan's
// hub, and both check and plan warn that the two sources disagree, in the same words.
func TestHubOverridesMC(t *testing.T) {
	s, p := testsite.Demo(t)
	want := "the plan's hub LIB replaces ADM, the campus's building with role mc: ADM is planned as any other building (drop its role mc, or the plan's hub, to say one main cross-connect)"
	if w := s.HubOverride(p); w != "" {
		t.Errorf("plan's hub is the mc: got warning %q, want none", w)
	}
	q := *p
	q.Hub = "LIB"
	q.Links = slices.DeleteFunc(slices.Clone(q.Links), func(l plan.LinkSpec) bool { return l.To == "LIB" })
	rep := s.Check(q.Hub)
	if err := route.CheckPlan(s, &q, &rep); err != nil {
		t.Fatal(err)
	}
	if !slices.Contains(rep.Warnings, want) {
		t.Errorf("check: warnings %q, want %q", rep.Warnings, want)
	}
	r, err := route.Solve(context.Background(), s, &q)
	if err != nil {
		t.Fatal(err)
	}
	if r.Hub != "LIB" || !slices.Contains(r.Warnings, want) {
		t.Errorf("plan: hub %s, warnings %q; want hub LIB and %q", r.Hub, r.Warnings, want)
	}
}
