package output

import (
	"bytes"
	"slices"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/internal/testplan"
	"spanwright/route/routing"
)

// TestSummaryFiguresOnce: the figures summary.json adds for what the terminal prints are the
// legs' and the bill's own (tester 5, findings 10 and 18). On the demo: every diverse link's
// second route shares its building's only entrance (reason_code SPOF), so diverse_single_point
// is the number of feasible diverse legs with that code, 4, and the terminal says so beside the
// diverse links; handholes_to_build is the bill's handhole lines added up (each billed at the
// price book's structures.handhole); added_duct_m is the bill's added-duct line; the
// optimizer's figures on the terminal name the currency.
func TestSummaryFiguresOnce(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	s := Summarize(r)
	spof := 0
	for _, l := range r.Legs {
		if l.Feasible && l.Name == routing.LegDiverse && l.ReasonCode == routing.CodeSharedPt {
			spof++
		}
	}
	if s.DiverseSinglePoint != spof || spof != 4 || s.DiverseLinks != 4 {
		t.Errorf("diverse_single_point %d of diverse_links %d, want the %d diverse legs coded %s (4 on the demo)",
			s.DiverseSinglePoint, s.DiverseLinks, spof, routing.CodeSharedPt)
	}
	handholes := 0.0
	for _, l := range r.Estimate.BOM.Lines {
		if l.Price == (media.PriceKey{Item: media.PriceStructure, Name: geo.StructureHandhole}) {
			handholes += l.Quantity
		}
	}
	if float64(s.HandholesToBuild) != handholes || handholes != 2 {
		t.Errorf("handholes_to_build %d, want the bill's handhole lines, %v (2 on the demo, where routes turn: its counted laterals run to junctions, none taps a duct)", s.HandholesToBuild, handholes)
	}
	if s.TurnHandholes+s.JoinHandholes+s.TapHandholes+s.RunHandholes+s.AddedPullPoints != s.HandholesToBuild {
		t.Errorf("handholes by purpose %d+%d+%d+%d+%d do not add up to %d", s.TurnHandholes, s.JoinHandholes, s.TapHandholes,
			s.RunHandholes, s.AddedPullPoints, s.HandholesToBuild)
	}
	if dm := testplan.BOMQty(r.Estimate.BOM, "added duct"); s.AddedDuctM != dm || dm == 0 {
		t.Errorf("added_duct_m %v, want the bill's added duct, %v m", s.AddedDuctM, dm)
	}
	// New work: the pieces plan.gpkg lists, the bill's trench and bore lines and the laterals
	// add up to the totals stated (tester 5, finding 16).
	var lines, pieces, laterals float64
	for _, l := range r.Estimate.BOM.Lines {
		if l.Price.Item == media.PriceTrench || l.Price.Item == media.PriceBore {
			lines += l.Quantity
		}
	}
	con := r.Estimate.Construction
	for _, w := range con.Pieces {
		pieces += w.ListedM
		if w.Span == "" {
			laterals += w.ListedM
		}
	}
	if round1(lines) != s.NewTrenchM || round1(pieces) != s.NewTrenchM || round1(laterals) != con.LateralM || laterals == 0 {
		t.Errorf("new_trench_m %v; bill's trench and bore lines %v, pieces listed %v; laterals listed %v, stated %v",
			s.NewTrenchM, lines, pieces, laterals, con.LateralM)
	}
	var term bytes.Buffer
	if err := PrintSummary(&term, r, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{
		"\ndiverse links: 4 with two routes, 4 of them sharing a single point of failure (reason_code SPOF in links.csv)\n",
		" USD by the optimizer's objective, proved lower bound ",
		"(2 handholes to build in all, with the 2 where routes turn)",
	} {
		if !strings.Contains(term.String(), want) {
			t.Errorf("terminal lacks %q:\n%s", want, term.String())
		}
	}
}

// TestWarningCountsAddUp: summary.json's warning_counts split warning_count by source and add
// up to it, the plan's own warnings (a building it cannot serve, routing's findings) under
// "plan" (verify 18 V6: tester 14's unjoined building was counted in warning_count only).
func TestWarningCountsAddUp(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	for _, extra := range []int{0, 2} {
		rr := *r
		rr.Warnings = append(slices.Clone(r.Warnings), slices.Repeat([]string{"plan: a warning of the plan's own"}, extra)...)
		s := Summarize(&rr)
		sum := 0
		for _, n := range s.WarningCounts {
			sum += n
		}
		if sum != s.WarningCount || s.WarningCounts["plan"] != extra {
			t.Errorf("%d warnings of the plan's own: warning_counts %v add up to %d, warning_count %d; want equal, plan %d", extra, s.WarningCounts, sum, s.WarningCount, extra)
		}
	}
}
