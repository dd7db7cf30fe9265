package report

import (
	"context"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spanwright/route/output"
)

// TestMediaRowsAddUpToTotalRoute: the report's "Links by medium" rows are each medium's legs as
// links.csv lists them, so they add up to the total route the summary prints (tester 15 F8:
// 27,619.9 m in the row under a total of 27,620.0 m). Every feasible leg of the demo made
// 10.04 m long lists 10.0 m (32.9 ft: 10.04 m / 0.3048 m/ft = 32.94 ft, NIST SP 811 B.8), so a
// medium of n legs shows n × 10.0 m, not n × 10.04 m rounded. Arithmetic, no published source.
func TestMediaRowsAddUpToTotalRoute(t *testing.T) {
	r0 := result(t, demoPlan)
	r := *r0
	r.Legs = slices.Clone(r0.Legs)
	for i := range r.Legs {
		r.Legs[i].RouteM = 10.04
	}
	for _, c := range []struct {
		units   string
		perLegU float64
	}{{"", 10.0}, {output.UnitsImperial, 32.9}} {
		v, err := planViewOf(context.Background(), &r, Options{Units: c.units})
		if err != nil {
			t.Fatal(err)
		}
		unit := " " + output.UnitsOf(output.WriteOptions{Units: c.units}).Length
		total, err := strconv.ParseFloat(strings.ReplaceAll(strings.TrimSuffix(v.TotalRoute, unit), ",", ""), 64)
		if err != nil {
			t.Fatalf("total route %q: %v", v.TotalRoute, err)
		}
		var dm int64
		for _, m := range v.Media {
			got, err := strconv.ParseFloat(strings.ReplaceAll(m.Route, ",", ""), 64)
			if err != nil {
				t.Fatalf("%s row %q: %v", m.Info.Label, m.Route, err)
			}
			if want := float64(int64(m.Legs)*int64(c.perLegU*10)) / 10; got != want {
				t.Errorf("%s: %s row %s, want %d legs × %.1f = %.1f", unit, m.Info.Label, m.Route, m.Legs, c.perLegU, want)
			}
			dm += int64(got*10 + 0.5)
		}
		if float64(dm)/10 != total {
			t.Errorf("%s: rows add up to %.1f, total route %s", unit, float64(dm)/10, v.TotalRoute)
		}
	}
}
