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
	"spanwright/route/plan"
)

// Sound pulls. NFPA 70 Chapter 9 Table 1 (seen) limits a duct's fill (53 % of its area for one
// cable, 31 % for two, 40 % for more) but not the number of cables pulled into it one by one;
// a practitioner pulls no more than 3 loose cables into one duct, each later pull dragging its
// rope over the cables already in (install.SeparateCablesPerDuct: common practice, no
// published source). The optimizer counts ducts by that rule (install.Load.Takes, the one
// rule), lays what it counts and prices it, and the bill buys the same ducts and fills them so.

// soundPullPlan plans testsite.FanN(100 mm ducts, spare, n, proposed) with every price of the
// demo book non-zero (costBook), new trench allowed, the design's two ducts in a new trench
// (new_ducts 2), and innerduct of odMM/idMM (0, 0: loose cables).
func soundPullPlan(t *testing.T, spare, n int, proposed, newTrench bool, innerODMM, innerIDMM float64) *route.Result {
	t.Helper()
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "prices.yaml"), costBook(t), 0o644); err != nil {
		t.Fatal(err)
	}
	r, err := testplan.PullSolveJSON(t, testsite.FanN(100, spare, n, proposed), func(p *plan.Plan) {
		p.Dir, p.Prices = dir, "prices.yaml"
		p.Design.AllowNewTrench = newTrench
		p.Design.NewDucts = 2
		p.Design.InnerductODMM, p.Design.InnerductIDMM = innerODMM, innerIDMM
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
