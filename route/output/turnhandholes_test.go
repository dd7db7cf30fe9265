package output

import (
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/plan"
)

// TestTurnHandholesOff: design.turn_handholes: false keeps routes from changing pathway at a
// junction without a structure, so the plan digs no handhole for a turn (tester 12 F3: an
// owner's "nobody digs" alternative). On the demo, 2 turn handholes by default (a cable
// changes duct bank only in a structure: common practice, no published source); none with the setting off,
// no leg turning where none stands, and the legs that can go no other way infeasible with
// a reason that names the setting.
func TestTurnHandholesOff(t *testing.T) {
	t.Parallel()
	on := Summarize(testplan.DemoResult(t))
	if on.TurnHandholes == 0 {
		t.Fatalf("the demo turns at no handhole by default; the test needs one")
	}
	r := testplan.DemoDesign(t, func(d *plan.Design) { d.TurnHandholes = false })
	s := Summarize(r)
	if s.TurnHandholes != 0 || s.TurnsInOtherHandholes != 0 {
		t.Errorf("turn_handholes false: %d turn handholes (%d in others), want 0", s.TurnHandholes, s.TurnsInOtherHandholes)
	}
	for _, l := range r.Legs {
		if l.Feasible && len(l.Turns) > 0 {
			t.Errorf("%s/%s turns at %v without a structure", l.Link.ID, l.Name, l.Turns)
		}
	}
	t.Logf("turn handholes %d -> %d; infeasible %d -> %d; total %d -> %d", on.TurnHandholes, s.TurnHandholes, on.Infeasible, s.Infeasible, on.TotalCents, s.TotalCents)
	for _, l := range r.Legs {
		if !l.Feasible && !strings.Contains(l.Reason, "junctions without a structure (design.turn_handholes: false builds no handhole there)") {
			t.Errorf("%s/%s: reason %q does not name the setting", l.Link.ID, l.Name, l.Reason)
		}
	}
}
