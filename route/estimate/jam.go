package estimate

import (
	"fmt"
	"maps"
	"math"
	"slices"
	"strconv"
	"strings"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media/install"
)

// jamWarnings are the plan's warnings on duct sizes whose jam verdict turns on their inside
// diameter (tester 15 F2: 33 mm innerducts in a duct given as 100 mm are 3.18, in the band, two
// to a duct; at 101.5 mm, trade size 103 PVC Schedule 40, 3.23, three), one per duct size, from
// the smallest: for each outside diameter the plan puts three or more of on a span of ducts of
// that size, where a duct within install.JamTolerancePct of it would get the other verdict
// (install.JamEdge) and so take another count of them (install.DuctBank.MaxCables, the count
// every packing keeps to). Each names the diameter, the cable or innerduct, its ratio, what a
// duct takes and would take, and, for a round nominal figure, the trade size it may mean
// (geo.NominalHint). fill is Estimate.Fill; innerduct and cablesPerDuct are the packing's.
func jamWarnings(fill []DuctFill, innerduct bool, cablesPerDuct int) []string {
	// duct size → span → occupant diameter → how many the span carries (in ducts or none).
	spans := map[float64]map[string]map[float64]int{}
	for _, f := range fill {
		if f.DuctIDMM <= 0 {
			continue
		}
		if spans[f.DuctIDMM] == nil {
			spans[f.DuctIDMM] = map[string]map[float64]int{}
		}
		if spans[f.DuctIDMM][f.Span] == nil {
			spans[f.DuctIDMM][f.Span] = map[float64]int{}
		}
		for _, od := range f.CablesODMM {
			spans[f.DuctIDMM][f.Span][od]++
		}
	}
	what := "cables"
	if innerduct {
		what = "innerducts"
	}
	var out []string
	for _, d := range slices.Sorted(maps.Keys(spans)) {
		trios := map[float64][]string{} // diameter → the spans that carry three or more of it
		for span, ods := range spans[d] {
			for od, n := range ods {
				if n >= 3 {
					trios[od] = append(trios[od], span)
				}
			}
		}
		var parts, on []string
		for _, od := range slices.Sorted(maps.Keys(trios)) {
			edge, ok := install.JamEdge(d, od, install.JamTolerancePct)
			if !ok {
				continue
			}
			ratio, in := install.Jam(d, od, od, od)
			across := edge * (1 - 1e-9) // a duct just beyond the edge from d
			if edge > d {
				across = edge * (1 + 1e-9)
			}
			bank := install.DuctBank{Ducts: 1, IDMM: d, Innerduct: innerduct, CablesPerDuct: cablesPerDuct}
			takes := bank.MaxCables(od)
			bank.IDMM = across
			would := bank.MaxCables(od)
			if takes == would {
				continue // the count of pulls or the fill decides, not the jam band
			}
			verdict := "in"
			if !in {
				verdict = "outside"
			}
			// The note gives the band on D/d; the 1.05 is the pulling guides' allowance for a
			// duct's ovality at bends (common practice, no published source): both ratios are
			// said, so that a reader checking the note finds its figure (review 22 F4).
			verdict += fmt.Sprintf(" the jam band %g–%g (NFPA 70 Chapter 9 Table 1 Informational Note No. 2 gives it on D/d; the plan applies it to %g·D/d)",
				install.JamRatioLowest, install.JamRatioHighest, install.JamBendFactor)
			var other string
			switch {
			case in && edge > d:
				other = "wider than " + mm2(edge)
			case in:
				other = "narrower than " + mm2(edge)
			case edge > d:
				other = "of " + mm2(edge) + " or wider"
			default:
				other = "of " + mm2(edge) + " or narrower"
			}
			on = append(on, trios[od]...)
			parts = append(parts, fmt.Sprintf("three %g mm %s give D/d = %.2f, and %g·D/d = %.2f with the pulling guides' allowance for ovality at bends, %s, so a duct takes %d of them; a duct %s inside, %s away, would take %d",
				od, what, d/od, install.JamBendFactor, ratio, verdict, takes, other, mm2(math.Abs(edge-d)), would))
		}
		if len(parts) == 0 {
			continue
		}
		on = slices.Compact(slices.Sorted(slices.Values(on)))
		where := "span " + on[0] + " carries"
		if len(on) > 1 {
			where = "span " + on[0] + " and " + input.Counted(len(on)-1, "more span carry", "more spans carry")
		}
		w := fmt.Sprintf("ducts of %g mm inside (%s three or more of one size): %s. That is within the %g %% by which Schedule 40 and Schedule 80 PVC conduit of one trade size differ inside (NFPA 70 Chapter 9 Table 4): check the inside diameter of the ducts laid (duct_mm)",
			d, where, strings.Join(parts, "; "), install.JamTolerancePct)
		if hint := geo.NominalHint(d, install.JamTolerancePct); hint != "" {
			w += "; " + hint
		}
		out = append(out, w)
	}
	return out
}

// mm2 is a diameter in millimetres to two decimals, for a figure worked out (an edge of the
// jam band) rather than given.
func mm2(mm float64) string { return strconv.FormatFloat(mm, 'f', 2, 64) + " mm" }
