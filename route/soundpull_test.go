package route_test

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/output"
	"spanwright/route/plan"
)

// Sound pulls. NFPA 70 Chapter 9 Table 1 (seen) limits a duct's fill (53 % of its area for one
// cable, 31 % for two, 40 % for more) but not the number of cables pulled into it one by one;
// a practitioner pulls no more than 3 loose cables into one duct, each later pull dragging its
// rope over the cables already in (install.DefaultCablesPerDuct: common practice, no
// published source). The optimizer counts ducts by that rule (install.Load.Takes, the one
// rule), lays what it counts and prices it, and the bill buys the same ducts and fills them so.

// soundPullPlan plans testsite.FanN(100 mm ducts, spare, n, proposed) with every price of the
// demo book non-zero (costBook), new trench allowed, the design's two ducts in a new trench
// (new_ducts 2), and innerduct of odMM/idMM (0, 0: loose cables).
func soundPullPlan(t *testing.T, spare, n int, proposed, newTrench bool, innerODMM, innerIDMM float64) *route.Result {
	t.Helper()
	return soundPullPlanWith(t, spare, n, proposed, func(d *plan.Design) {
		d.AllowNewTrench = newTrench
		d.InnerductODMM, d.InnerductIDMM = innerODMM, innerIDMM
	})
}

// soundPullPlanWith is soundPullPlan with the design (new_ducts 2, the default
// cables_per_duct) changed by edit.
func soundPullPlanWith(t *testing.T, spare, n int, proposed bool, edit func(d *plan.Design)) *route.Result {
	t.Helper()
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "prices.yaml"), costBook(t), 0o644); err != nil {
		t.Fatal(err)
	}
	r, err := testplan.PullSolveJSON(t, testsite.FanN(100, spare, n, proposed), func(p *plan.Plan) {
		p.Dir, p.Prices = dir, "prices.yaml"
		p.Design.NewDucts = 2
		edit(&p.Design)
	})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// ductsOfT returns T's spare and laid ducts (routing.SegmentFill, the optimizer's count) and
// the cables in each of its duct fill rows (the bill's), in duct order, with whether each row
// is an added duct; it fails on a row not OK, in no duct, or with the crowding note.
func ductsOfT(t *testing.T, r *route.Result) (spare, laid int, perDuct []int, added []bool) {
	t.Helper()
	for _, f := range r.Fill {
		if f.Span == "T" {
			spare, laid = f.Ducts, f.AddedDucts
		}
	}
	for _, f := range r.Estimate.Fill {
		if f.Span != "T" {
			continue
		}
		if f.Unplaced || !f.OK || f.JamRisk || f.Note() != "" {
			t.Errorf("T duct %d: %v, unplaced %v, OK %v, jam risk %v, note %q; want placed, OK, no note", f.Duct, f.CablesODMM, f.Unplaced, f.OK, f.JamRisk, f.Note())
		}
		if f.Duct != len(perDuct)+1 {
			t.Errorf("T: row of duct %d after %d rows", f.Duct, len(perDuct))
		}
		perDuct, added = append(perDuct, len(f.CablesODMM)), append(added, f.Added)
	}
	return spare, laid, perDuct, added
}

// TestSoundPullsNewTrench: seven cables over new trench T. Fill alone would put all seven in
// one 100 mm duct (7 × 10 mm cables: 7 % of its area, within 40 %); three to a duct they need
// three, one more than the design's two, so T is built to size with three ducts: the
// optimizer lays and prices three, the bill buys 3 × T's length of added duct (SizedDucts
// names it) with T's trench once, the fill rows give 3, 3 and 1, and the optimizer's
// objective is the bill's route-dependent total (oneCostModel). With 33/27 mm innerducts
// (two to a 100 mm duct: the jam band, NFPA 70 Chapter 9 Table 1 Informational Note No. 2,
// seen; the 1.05 ovality factor common practice, no published source) the same seven need
// four ducts, as before this rule.
func TestSoundPullsNewTrench(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name       string
		inner      [2]float64
		wantDucts  int
		wantPerDct []int
	}{
		// three loose cables a duct: common practice, no published source
		{"loose cables, three a duct", [2]float64{0, 0}, 3, []int{3, 3, 1}},
		// two 33 mm innerducts a 100 mm duct: NFPA 70 Chapter 9 Table 1 Informational Note No. 2
		{"innerducts, two a duct", [2]float64{33, 27}, 4, []int{2, 2, 2, 1}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			r := soundPullPlan(t, 0, 7, true, true, tc.inner[0], tc.inner[1])
			if fmt.Sprint(r.Opened) != "[T]" {
				t.Fatalf("opened %v, want [T]", r.Opened)
			}
			feasible := 0
			for _, l := range r.Legs {
				if l.Feasible {
					feasible++
				}
			}
			if feasible != 7 {
				t.Fatalf("%d feasible legs, want 7", feasible)
			}
			spare, laid, perDuct, added := ductsOfT(t, r)
			if spare != 0 || laid != tc.wantDucts {
				t.Errorf("T: %d spare and %d laid by the optimizer, want 0 and %d", spare, laid, tc.wantDucts)
			}
			if !slices.Equal(perDuct, tc.wantPerDct) || slices.Contains(added, false) {
				t.Errorf("T: cables per duct %v (added %v), want %v, every duct new", perDuct, added, tc.wantPerDct)
			}
			sp, _ := r.Site.Net.Span("T")
			if got := testplan.BOMQty(r.Estimate.BOM, "added duct"); math.Abs(got-float64(tc.wantDucts)*sp.LengthM) > 0.05 {
				t.Errorf("bill: added duct %.1f m, want %d × T's %.1f m", got, tc.wantDucts, sp.LengthM)
			}
			if got := testplan.BOMQty(r.Estimate.BOM, "trench, turf"); math.Abs(got-sp.LengthM) > 0.05 {
				t.Errorf("bill: trench %.1f m, want T's %.1f m once", got, sp.LengthM)
			}
			if sd := r.Estimate.Construction.SizedDucts; len(sd) != 1 || sd[0].Span != "T" || sd[0].Ducts != tc.wantDucts || sd[0].Design != 2 {
				t.Errorf("sized ducts %+v, want T with %d ducts, the design's 2", sd, tc.wantDucts)
			}
			oneCostModel(t, tc.name, r)
		})
	}
}

// TestSoundPullsFullBank: nine cables over existing duct T with two spare 100 mm ducts. By fill
// alone the first spare duct would take all nine; three to a duct the two spare ducts take
// six, and the other three need a duct beside the bank: the optimizer lays a trench with the
// design's two ducts (new_ducts; one would do), prices it, and the bill buys the same, 2 ×
// T's length of added duct and T's length of trench once; the fill rows give 3 and 3 in the
// spare ducts and 3 in the first added one (the second stays empty), and the optimizer's
// objective is the bill's route-dependent total (oneCostModel). Without new trench, the
// three cables that find no duct have no route: their legs are infeasible for ducts too full,
// not pulled as a fourth cable into a duct.
func TestSoundPullsFullBank(t *testing.T) {
	t.Parallel()
	t.Run("ducts added beside the bank", func(t *testing.T) {
		t.Parallel()
		r := soundPullPlan(t, 2, 9, false, true, 0, 0)
		spare, laid, perDuct, added := ductsOfT(t, r)
		if spare != 2 || laid != 2 {
			t.Errorf("T: %d spare and %d laid by the optimizer, want 2 and 2", spare, laid)
		}
		// three loose cables a duct: common practice, no published source
		if !slices.Equal(perDuct, []int{3, 3, 3}) || !slices.Equal(added, []bool{false, false, true}) {
			t.Errorf("T: cables per duct %v (added %v), want [3 3 3], the third added", perDuct, added)
		}
		sp, _ := r.Site.Net.Span("T")
		if got := testplan.BOMQty(r.Estimate.BOM, "added duct"); math.Abs(got-2*sp.LengthM) > 0.05 {
			t.Errorf("bill: added duct %.1f m, want 2 × T's %.1f m", got, sp.LengthM)
		}
		if got := testplan.BOMQty(r.Estimate.BOM, "trench, turf"); math.Abs(got-sp.LengthM) > 0.05 {
			t.Errorf("bill: trench %.1f m, want T's %.1f m once", got, sp.LengthM)
		}
		oneCostModel(t, "full bank", r)
	})
	t.Run("no new trench", func(t *testing.T) {
		t.Parallel()
		r := soundPullPlan(t, 2, 9, false, false, 0, 0)
		feasible := 0
		for _, l := range r.Legs {
			switch {
			case l.Feasible:
				feasible++
			case !strings.Contains(l.Reason, "too full"):
				t.Errorf("%s: infeasible for %q, want ducts too full", l.Link.ID, l.Reason)
			}
		}
		if feasible != 6 {
			t.Errorf("%d feasible legs, want 6 (three in each spare duct)", feasible)
		}
		spare, laid, perDuct, _ := ductsOfT(t, r)
		if spare != 2 || laid != 0 || !slices.Equal(perDuct, []int{3, 3}) {
			t.Errorf("T: %d spare, %d laid, cables per duct %v; want 2, 0, [3 3]", spare, laid, perDuct)
		}
	})
}

// TestCablesPerDuctNewTrench: design.cables_per_duct decides the ducts of new trench T
// carrying seven 10 mm cables (new_ducts 1, so the design lays no more than one). With 0 the
// fill alone decides (NFPA 70 Chapter 9 Table 1, seen: seven 10 mm cables are 7 % of a 100 mm
// duct's area, within 40 %): one duct. With 3 (common practice, no published source) three
// ducts, 3, 3 and 1; with 2, four, 2, 2, 2 and 1. In each the optimizer lays and prices what
// the bill buys (oneCostModel), and the work laid only for the count
// (estimate.Construction.ForCount) is T's ducts beyond the one the fill needs, no trench (T
// is opened whatever the count), and the objective's difference from the plan of 0: the
// routes are the same (there is no other way).
func TestCablesPerDuctNewTrench(t *testing.T) {
	t.Parallel()
	plans := map[int]*route.Result{}
	for _, perDuct := range []int{0, 2, 3} {
		plans[perDuct] = soundPullPlanWith(t, 0, 7, true, func(d *plan.Design) {
			d.AllowNewTrench, d.NewDucts, d.CablesPerDuct = true, 1, perDuct
		})
	}
	fillAlone := plans[0]
	sp, _ := fillAlone.Site.Net.Span("T")
	for _, tc := range []struct {
		perDuct    int
		wantDucts  int
		wantPerDct []int
	}{
		{0, 1, []int{7}},          // NFPA 70 Chapter 9 Table 1: 7 % of the area
		{2, 4, []int{2, 2, 2, 1}}, // two a duct
		{3, 3, []int{3, 3, 1}},    // three a duct: common practice, no published source
	} {
		r := plans[tc.perDuct]
		name := fmt.Sprintf("cables_per_duct %d", tc.perDuct)
		if fmt.Sprint(r.Opened) != "[T]" || fmt.Sprint(r.Opened) != fmt.Sprint(fillAlone.Opened) {
			t.Fatalf("%s: opened %v, want [T]", name, r.Opened)
		}
		for i, l := range r.Legs {
			if !l.Feasible || !slices.Equal(l.Steps, fillAlone.Legs[i].Steps) {
				t.Fatalf("%s: leg %s feasible %v, route not the fill alone's", name, l.Label(), l.Feasible)
			}
		}
		_, laid, perDuct, _ := ductsOfT(t, r)
		if laid != tc.wantDucts || !slices.Equal(perDuct, tc.wantPerDct) {
			t.Errorf("%s: T laid %d ducts, cables per duct %v; want %d, %v", name, laid, perDuct, tc.wantDucts, tc.wantPerDct)
		}
		if got := testplan.BOMQty(r.Estimate.BOM, "added duct"); math.Abs(got-float64(tc.wantDucts)*sp.LengthM) > 0.05 {
			t.Errorf("%s: bill: added duct %.1f m, want %d × T's %.1f m", name, got, tc.wantDucts, sp.LengthM)
		}
		oneCostModel(t, name, r)
		fc := r.Estimate.Construction.ForCount
		wantDuctM := r.Estimate.Construction.AddedDuctM - fillAlone.Estimate.Construction.AddedDuctM
		if math.Abs(fc.DuctM-float64(tc.wantDucts-1)*sp.LengthM) > 1e-6 || math.Abs(fc.DuctM-wantDuctM) > 1e-6 || fc.TrenchM != 0 {
			t.Errorf("%s: laid for the count %.1f m of duct, %.1f m of trench; want %.1f m (the plans' added duct %.1f m apart), none",
				name, fc.DuctM, fc.TrenchM, float64(tc.wantDucts-1)*sp.LengthM, wantDuctM)
		}
		if want := r.ObjectiveCents - fillAlone.ObjectiveCents; fc.Cents != want {
			t.Errorf("%s: laid for the count %d cents, want the objectives' difference %d", name, fc.Cents, want)
		}
	}
}

// TestCablesPerDuctFullBank: nine 10 mm cables over existing duct T with two spare 100 mm
// ducts. The fill alone puts them all in the first spare duct (9 % of its area, within NFPA 70
// Chapter 9 Table 1's 40 %, seen), so with cables_per_duct 0 nothing is laid; with 3 (common
// practice, no published source) the third three need a trench beside the bank with the
// design's two ducts. That trench and its ducts are laid only for the count: ForCount is T's
// length of trench and twice it of duct, the plans' new trench and added duct apart, and the
// objectives' difference (the routes are the same); summary.json carries the same figures.
func TestCablesPerDuctFullBank(t *testing.T) {
	t.Parallel()
	plans := map[int]*route.Result{}
	for _, perDuct := range []int{0, 3} {
		plans[perDuct] = soundPullPlanWith(t, 2, 9, false, func(d *plan.Design) {
			d.AllowNewTrench, d.CablesPerDuct = true, perDuct
		})
	}
	zero, three := plans[0], plans[3]
	sp, _ := zero.Site.Net.Span("T")
	for i, l := range three.Legs {
		if !l.Feasible || !zero.Legs[i].Feasible || !slices.Equal(l.Steps, zero.Legs[i].Steps) {
			t.Fatalf("leg %s: not one route in both plans", l.Label())
		}
	}
	if _, laid, perDuct, _ := ductsOfT(t, zero); laid != 0 || !slices.Equal(perDuct, []int{9}) {
		t.Errorf("fill alone: T laid %d ducts, cables per duct %v; want 0, [9]", laid, perDuct)
	}
	if fc := zero.Estimate.Construction.ForCount; fc.DuctM != 0 || fc.TrenchM != 0 || fc.Cents != 0 || len(fc.Spans) != 0 {
		t.Errorf("fill alone: laid for the count %+v, want nothing", fc)
	}
	fc := three.Estimate.Construction.ForCount
	c0, c3 := zero.Estimate.Construction, three.Estimate.Construction
	if math.Abs(fc.TrenchM-sp.LengthM) > 1e-6 || math.Abs(fc.TrenchM-(c3.NewM-c0.NewM)) > 0.05 {
		t.Errorf("laid for the count %.1f m of trench, want T's %.1f m, the plans' new trench %.1f m apart", fc.TrenchM, sp.LengthM, c3.NewM-c0.NewM)
	}
	if math.Abs(fc.DuctM-2*sp.LengthM) > 1e-6 || math.Abs(fc.DuctM-(c3.AddedDuctM-c0.AddedDuctM)) > 1e-6 {
		t.Errorf("laid for the count %.1f m of duct, want 2 × T's %.1f m, the plans' added duct %.1f m apart", fc.DuctM, sp.LengthM, c3.AddedDuctM-c0.AddedDuctM)
	}
	if want := three.ObjectiveCents - zero.ObjectiveCents; fc.Cents != want || want <= 0 {
		t.Errorf("laid for the count %d cents, want the objectives' difference %d (> 0)", fc.Cents, want)
	}
	if len(fc.Spans) != 1 || fc.Spans[0].Span != "T" || !fc.Spans[0].Trench || fc.Spans[0].Ducts != 2 {
		t.Errorf("laid for the count on %+v, want T, its trench and 2 ducts", fc.Spans)
	}
	oneCostModel(t, "fill alone", zero)
	oneCostModel(t, "three a duct", three)
	s0, s3 := output.Summarize(zero), output.Summarize(three)
	if s0.CablesPerDuct != 0 || s0.CountLaidCents != 0 || s0.CountLaidDuctM != 0 || s0.CountLaidTrenchM != 0 {
		t.Errorf("summary of fill alone: %d a duct, %d cents, %.1f m duct, %.1f m trench; want 0s", s0.CablesPerDuct, s0.CountLaidCents, s0.CountLaidDuctM, s0.CountLaidTrenchM)
	}
	if s3.CablesPerDuct != 3 || s3.CountLaidCents != fc.Cents || s3.CountLaidDuctM != math.Round(fc.DuctM*10)/10 || s3.CountLaidTrenchM != math.Round(fc.TrenchM*10)/10 {
		t.Errorf("summary: %d a duct, %d cents, %.1f m duct, %.1f m trench; want 3 and the estimate's %+v", s3.CablesPerDuct, s3.CountLaidCents, s3.CountLaidDuctM, s3.CountLaidTrenchM, fc)
	}
}
