package route_test

import (
	"context"
	"slices"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testsite"
)

// TestCheckTurnsOnlyAsPlan: check judges design.turn_handholes: false as plan does. With it,
// a route changes pathway only in a structure or a building (a cable changes duct bank only in
// a structure: common practice, no published source), so on the demo some links have no route
// at all; check lists exactly the links whose legs plan finds infeasible for that reason, and
// with the setting on lists none. Before, check judged reachability over the spans alone and
// said nothing of it (tester 12's campus with allow_new_trench and turn_handholes false: plan
// left 31 of 31 legs infeasible, check named the 3 buildings reached only over proposed
// pathways and exited as if the other 27 links could be planned).
func TestCheckTurnsOnlyAsPlan(t *testing.T) {
	s, p := testsite.Demo(t)
	q := *p
	q.Design.TurnHandholes = false
	rep := s.Check(q.Hub)
	if err := route.CheckPlan(s, &q, &rep); err != nil {
		t.Fatal(err)
	}
	r, err := route.Solve(context.Background(), s, &q)
	if err != nil {
		t.Fatal(err)
	}
	var want []string
	for _, l := range r.Legs {
		if !l.Feasible && strings.Contains(l.Reason, "design.turn_handholes: false") {
			if w := "building " + l.Link.To + ", " + l.Link.ID + ": "; !slices.Contains(want, w) {
				want = append(want, w)
			}
		}
	}
	if len(want) == 0 {
		t.Fatal("no leg of the demo is infeasible for turn_handholes false; the test needs one")
	}
	var got []string
	for _, line := range rep.TurnsOnly {
		b, _, _ := strings.Cut(line, ": ")
		got = append(got, b+": ")
		if !strings.Contains(line, "turns between pathways at junctions without a structure (design.turn_handholes: false builds no handhole there)") {
			t.Errorf("check's line %q does not say why as plan does", line)
		}
	}
	if !slices.Equal(got, want) {
		t.Errorf("check lists %q, plan finds %q infeasible for the setting", got, want)
	}
	on := s.Check(p.Hub)
	if err := route.CheckPlan(s, p, &on); err != nil {
		t.Fatal(err)
	}
	if on.TurnsOnly != nil {
		t.Errorf("turn_handholes true: check lists %q", on.TurnsOnly)
	}
}
