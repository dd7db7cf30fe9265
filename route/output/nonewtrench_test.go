package output

import (
	"bytes"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestNoNewTrenchNote: a plan that may build no new trench says what civil work it still
// does, the handholes by purpose (tester 12 F3: 21 handholes set into live duct banks under
// "no new civil work"). A cable changes duct bank only in a structure (common practice, no
// published source), so those handholes stay; the words must name them.
func TestNoNewTrenchNote(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		s    Summary
		want string
	}{
		{Summary{NewTrenchM: 25, HandholesToBuild: 21, TurnHandholes: 20, TapHandholes: 1},
			"no new trench or bore (design.allow_new_trench: false) but the counted laterals to buildings no pathway reaches; " +
				"21 handholes are still dug into existing pathways (20 where routes change pathway, 1 where laterals tap a duct or a pole line): " +
				"a cable changes duct bank only in a structure (design.turn_handholes: false keeps routes to existing structures, which may leave legs without a route)"},
		{Summary{HandholesToBuild: 1, TurnHandholes: 1},
			"no new trench or bore (design.allow_new_trench: false); 1 handhole is still dug into existing pathways (1 where routes change pathway): " +
				"a cable changes duct bank only in a structure (design.turn_handholes: false keeps routes to existing structures, which may leave legs without a route)"},
		{Summary{}, "no new trench or bore (design.allow_new_trench: false); no handhole is built"},
		// Splice points between reels are dug too (review 17 F3).
		{Summary{SplicePointsToBuild: 2}, "no new trench or bore (design.allow_new_trench: false); no handhole at a junction; " +
			"and 2 splice points to build between reels (a handhole each where underground)"},
		{Summary{HandholesToBuild: 1, TurnHandholes: 1, SplicePointsToBuild: 1},
			"no new trench or bore (design.allow_new_trench: false); 1 handhole is still dug into existing pathways (1 where routes change pathway): " +
				"a cable changes duct bank only in a structure (design.turn_handholes: false keeps routes to existing structures, which may leave legs without a route); " +
				"and 1 splice point to build between reels (a handhole each where underground)"},
	} {
		if got := NoNewTrenchNote(c.s); got != c.want {
			t.Errorf("got  %q\nwant %q", got, c.want)
		}
	}

	// Planned: the summary (so summary.json and the report) and the terminal carry it with no
	// new trench, and neither does with new trench allowed.
	r, err := testplan.PullSolveJSON(t, testsite.FanN(100, 1, 5, false), func(p *plan.Plan) { p.Design.AllowNewTrench = false })
	if err != nil {
		t.Fatal(err)
	}
	s := Summarize(r)
	if s.NoNewTrench == "" || s.NoNewTrench != NoNewTrenchNote(s) {
		t.Errorf("no_new_trench %q, want %q", s.NoNewTrench, NoNewTrenchNote(s))
	}
	var term bytes.Buffer
	if err := PrintSummary(&term, r, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(term.String(), "\n"+s.NoNewTrench+"\n") {
		t.Errorf("terminal lacks the no-new-trench line:\n%s", term.String())
	}
	r, err = testplan.PullSolveJSON(t, testsite.FanN(100, 1, 5, false), nil)
	if err != nil {
		t.Fatal(err)
	}
	if s := Summarize(r); s.NoNewTrench != "" {
		t.Errorf("new trench allowed: no_new_trench %q, want none", s.NoNewTrench)
	}
}
