package output

import (
	"fmt"
	"strings"

	"spanwright/geo/input"
	"spanwright/media/install"
	"spanwright/route/estimate"
)

// CountText is the one sentence that says what the count of pulls a duct
// (design.cables_per_duct, perDuct; 0: none) costs the plan: the trench or bore beside existing
// duct banks and the duct laid only for it, and their price, from
// estimate.Construction.ForCount (computed once there). The terminal prints it when the count
// lays anything; the report always. length and money format metres and cents in the run's
// units and currency.
func CountText(c estimate.CountWork, perDuct int, length func(m float64) string, money func(cents int64) string) string {
	if perDuct <= 0 {
		return "count of pulls: none (design.cables_per_duct 0): ducts are packed by the NFPA 70 Chapter 9 Table 1 fill and the jam band alone"
	}
	// The default is common practice, no published source; another count is the plan's own.
	source := "design.cables_per_duct"
	if perDuct == install.DefaultCablesPerDuct {
		source += "; common practice, no published source"
	}
	rule := fmt.Sprintf("count of pulls: at most %s a duct, one pull each (%s)", Counted(perDuct, "loose cable", "loose cables"), source)
	if c.DuctM <= 0 && c.TrenchM <= 0 && c.Cents <= 0 {
		return rule + ": it lays nothing that the fill alone would not on these routes"
	}
	var laid []string
	if c.TrenchM > 0 {
		laid = append(laid, length(c.TrenchM)+" of trench or bore beside existing duct banks")
	}
	if c.DuctM > 0 {
		laid = append(laid, length(c.DuctM)+" of duct")
	}
	return fmt.Sprintf("%s: %s laid only for it%s, %s as the optimizer prices them, which the fill alone (NFPA 70 Chapter 9 Table 1 and the jam band) would not need on these routes; without the count the optimizer might route otherwise (design.cables_per_duct 0 plans so)",
		rule, strings.Join(laid, " and "), countSpansText(c), money(c.Cents))
}

// maxCountSpans is the most stretches CountText names; the rest are counted.
const maxCountSpans = 10

// countSpansText names where the count lays its work (estimate.CountWork.Where, the
// stretches of pathway drawn, as the bill names them), " (on pathway EA-3)" or " (2
// stretches: pathway EA-3; pathway S-TWR-E, 0.0 m to 45.2 m)", at most maxCountSpans of them then
// "and N more"; "" when none is listed. Where to dig is what the owner weighs the count
// against, and what a bidder prices (review 17 F5: the figures said how much, never where).
func countSpansText(c estimate.CountWork) string {
	switch len(c.Where) {
	case 0:
		return ""
	case 1:
		return " (on " + c.Where[0] + ")"
	}
	shown, more := input.Shown(c.Where, maxCountSpans)
	return fmt.Sprintf(" (%d stretches: %s%s)", len(c.Where), strings.Join(shown, "; "), more)
}

// CountSpans lists the ids of the spans where the count of pulls lays duct, trench or bore
// (estimate.CountWork.Spans), in their order: summary.json's count_laid_spans and the spans
// CountText names.
func CountSpans(c estimate.CountWork) []string {
	var ids []string
	for _, sp := range c.Spans {
		ids = append(ids, sp.Span)
	}
	return ids
}
