package estimate

import (
	"fmt"
	"math"
	"slices"
	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/routing"
	"spanwright/route/site"
	"strings"
	"testing"
)

// TestDuctFillJamBand: three equal cables in one spare duct. NFPA 70 Chapter 9 (seen): 40 % fill
// for three or more; the 1.05·D/d jam band 2.8-3.2 (Table 1 Informational Note No. 2, seen).
func TestDuctFillJamBand(t *testing.T) {
	t.Parallel()
	const od = 10.5
	cases := []struct {
		name       string
		idMM       float64
		wantRows   []int // cables per duct row
		ratio      float64
		unplaced   bool
		allowedPct float64
		// jam is what the warning on a verdict a few per cent would turn says (jamWarnings),
		// "" for none.
		jam string
	}{
		// 1.05 × 31.5 / 10.5 = 3.15: in the band, so the third cable is refused (computed);
		// the band ends at 3.2 × 10.5 / 1.05 = 32 mm, 1.6 % wider, within
		// install.JamTolerancePct, where a duct takes three (computed).
		{"in the jam band", 31.5, []int{2}, 0, true, 31, "ducts of 31.5 mm inside (span S1 carries three or more of one size): three 10.5 mm cables give D/d = 3.00, and 1.05·D/d = 3.15 with the pulling guides' allowance for ovality at bends, in the jam band 2.8–3.2 (NFPA 70 Chapter 9 Table 1 Informational Note No. 2 gives it on D/d; the plan applies it to 1.05·D/d), so a duct takes 2 of them; a duct wider than 32.00 mm inside, 0.50 mm away, would take 3"},
		// 1.05 × 40 / 10.5 = 4.0, and 3 × 10.5² / 40² = 20.7 % of 40 % (computed); the band's
		// edge (32 mm) is 20 % away: no warning.
		{"clear of the band", 40, []int{3}, 4.0, false, 40, ""},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			net := &geo.Network{Spans: []geo.Span{{ID: "S1", PathwayID: "P1", DuctMM: tc.idMM, LengthM: 10, Type: geo.TypeDuct}}}
			r := &run{Input: Input{Site: &site.Site{Net: net},
				Fill: []routing.SegmentFill{{Span: "S1", PathwayID: "P1", Cables: 3, Limited: true, Ducts: 1}}}, Estimate: &Estimate{}}
			for range 3 {
				r.Legs = append(r.Legs, routing.Leg{Feasible: true, Steps: []geo.Step{{SpanID: "S1"}},
					Cable: routing.CableTakeoff{Cables: media.Cables{{Count: 24, ODMM: od}}}})
			}
			r.ductFill()
			var got []int
			left := 0
			for _, f := range r.Estimate.Fill {
				if f.Unplaced {
					// The refused cable has a row of its own, not OK, so no output shows the span as fine.
					left += len(f.CablesODMM)
					if f.OK || f.Duct != 0 || f.FillPct != 0 {
						t.Errorf("%s: unplaced row %+v, want duct 0, no fill and not OK", tc.name, f)
					}
					continue
				}
				got = append(got, len(f.CablesODMM))
				if f.AllowedPct != tc.allowedPct || math.Abs(f.JamRatio-tc.ratio) > 1e-9 || f.JamRisk || !f.OK {
					t.Errorf("%s: row %+v, want limit %.0f %% and ratio %.2f", tc.name, f, tc.allowedPct, tc.ratio)
				}
				if want := 100 * float64(len(f.CablesODMM)) * od * od / (tc.idMM * tc.idMM); math.Abs(f.FillPct-want) > 1e-9 {
					t.Errorf("%s: fill %.3f %%, want %.3f %%", tc.name, f.FillPct, want)
				}
			}
			if fmt.Sprint(got) != fmt.Sprint(tc.wantRows) {
				t.Errorf("%s: cables per duct %v, want %v", tc.name, got, tc.wantRows)
			}
			if left != 3-tc.wantRows[0] {
				t.Errorf("%s: %d cables in the unplaced row, want %d", tc.name, left, 3-tc.wantRows[0])
			}
			warned := len(r.Estimate.Warnings) > 0 && strings.Contains(r.Estimate.Warnings[0], "1 of 3 cables fit no duct")
			if warned != tc.unplaced {
				t.Errorf("%s: warnings %q", tc.name, r.Estimate.Warnings)
			}
			jam := r.Estimate.JamWarnings
			switch {
			case tc.jam == "" && len(jam) > 0:
				t.Errorf("%s: jam warnings %q, want none", tc.name, jam)
			case tc.jam != "" && (len(jam) != 1 || !strings.HasPrefix(jam[0], tc.jam) || !slices.Contains(r.Estimate.Warnings, jam[0])):
				t.Errorf("%s: jam warnings %q (among the warnings: %q), want one starting %q", tc.name, jam, r.Estimate.Warnings, tc.jam)
			}
		})
	}
}
