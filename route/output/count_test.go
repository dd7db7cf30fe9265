package output

import (
	"strings"
	"testing"

	"spanwright/route/estimate"
)

// TestCountTextRule: the count-of-pulls sentence counts its cables in the singular for one (review
// 17 F8: "at most 1 loose cables") and tags only the default count as common practice, no
// published source: another count is the plan's own value, not a rule of thumb the program
// asserts.
func TestCountTextRule(t *testing.T) {
	t.Parallel()
	m := func(x float64) string { return "" }
	c := func(int64) string { return "" }
	for _, tc := range []struct {
		perDuct int
		want    string
	}{
		{1, "count of pulls: at most 1 loose cable a duct, one pull each (design.cables_per_duct): "},
		{3, "count of pulls: at most 3 loose cables a duct, one pull each (design.cables_per_duct; common practice, no published source): "},
		{4, "count of pulls: at most 4 loose cables a duct, one pull each (design.cables_per_duct): "},
	} {
		if got := CountText(estimate.CountWork{}, tc.perDuct, m, c); !strings.HasPrefix(got, tc.want) {
			t.Errorf("%d a duct: %q, want it to begin %q", tc.perDuct, got, tc.want)
		}
	}
}
