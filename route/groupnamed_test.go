package route_test

import (
	"fmt"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/routing"
)

// groupDuct is a duct pathway through the points (x, y pairs, metres), with a shared-risk
// group when group is not "".
func groupDuct(id, group string, pts ...float64) string {
	var c []string
	for i := 0; i+1 < len(pts); i += 2 {
		c = append(c, fmt.Sprintf("[%.7f,%.7f]", testsite.X(pts[i]), testsite.Y(pts[i+1])))
	}
	g := ""
	if group != "" {
		g = fmt.Sprintf(`,"group":%q`, group)
	}
	return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":%q,"type":"duct"%s},"geometry":{"type":"LineString","coordinates":[%s]}}`, id, g, strings.Join(c, ","))
}

// TestGroupNamedAfterPathway: streets S and N are declared one shared-risk group (one duct
// bank, one trench: they fail together), whether by a name of their own or by one named after
// pathway S; the diverse link A-B may not take one leg on each (review 22 F1: a group named
// after a pathway's id was taken for that pathway's own default and parted into runs, and the
// pair was signed diverse). Physically diverse pathways: ANSI/TIA-569 (from memory); a declared
// group as one risk: common practice, no published source.
func TestGroupNamedAfterPathway(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ name, gS, gN string }{
		{"both TR", "TR", "TR"},
		{"both S (S names its own id)", "S", "S"},
		{"N gives S, S gives none", "", "S"},
	} {
		campus := collection(testsite.Box("A", "mc", 50, 50), testsite.Box("B", "", 250, 50),
			groupDuct("S", tc.gS, 0, 0, 50, 0, 250, 0, 300, 0), groupDuct("N", tc.gN, 0, 100, 50, 100, 250, 100, 300, 100),
			duct("LA1", 50, 0, 50, 45), duct("LA2", 50, 100, 50, 55), duct("LB1", 250, 0, 250, 45), duct("LB2", 250, 100, 250, 55),
			handhole("H1", 50, 0), handhole("H2", 50, 100), handhole("H3", 250, 0), handhole("H4", 250, 100))
		r, err := testplan.PullSolveJSON(t, campus, diverse("B"))
		if err != nil {
			t.Fatal(err)
		}
		d := legsTo(t, r, "B")[1]
		if d.Feasible || d.ReasonCode != routing.CodeNoDiverse {
			t.Errorf("%s: diverse leg feasible %v, code %q (%s); want NO-DIVERSE: the legs would take S and N, which the campus puts in one group",
				tc.name, d.Feasible, d.ReasonCode, d.Reason)
		}
	}
}
