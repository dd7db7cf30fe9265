package sweep

import (
	"strings"
	"testing"

	"spanwright/route/output"
)

// TestRowNotesNotPriced: a scenario whose price book leaves out prices its bill needs (its
// total leaves those lines out) says so in its row's note, after what it left out of the plan,
// so that a comparison ranking totals shows why it is cheaper (common practice, no published
// source: bids are compared with their exclusions).
func TestRowNotesNotPriced(t *testing.T) {
	for _, c := range []struct {
		notes, notPriced []string
		want             string
	}{
		{nil, nil, ""},
		{[]string{"link to B dropped"}, nil, "link to B dropped"},
		{nil, []string{"patch_cords_each"}, "not priced, left out of the total: patch_cords_each (see the warnings)"},
		{[]string{"link to B dropped"}, []string{"patch_cords_each", "building_entrance_each"},
			"link to B dropped; not priced, left out of the total: building_entrance_each, patch_cords_each (see the warnings)"},
	} {
		var r Row
		r.fill(output.Summary{Notes: c.notes, NotPriced: c.notPriced})
		if r.Note != c.want {
			t.Errorf("notes %q, not priced %q: note %q, want %q", c.notes, c.notPriced, r.Note, c.want)
		}
	}
}

// TestJudgeRanksIncompleteApart: an ok scenario whose book leaves items unpriced (tester 6's
// finding 5: prices-x 589,335.65 ranked first and Pareto-optimal against a complete
// 614,817.94) is never ranked or Pareto-judged against complete ones; it is ranked among the
// scenarios leaving out the same items (review 4 F4: a sweep whose every book leaves out an
// optional item ranked nothing), the complete ones among themselves as if it were not there,
// and every comparison file says so (common practice, no published source: bids are compared
// on the same scope, exclusions apart).
func TestJudgeRanksIncompleteApart(t *testing.T) {
	t.Parallel()
	rows := []Row{
		{Index: 0, ID: "complete-dear", Status: StatusOK, TotalCents: 61481794, WorstMarginDB: fp(1)},
		{Index: 1, ID: "incomplete-cheap", Status: StatusOK, TotalCents: 58933565, WorstMarginDB: fp(1),
			NotPriced: []string{"patch_cords_each"}, Note: "not priced, left out of the total: patch_cords_each (see the warnings)"},
		{Index: 2, ID: "complete-dearer", Status: StatusOK, TotalCents: 70000000, WorstMarginDB: fp(0.5)},
		{Index: 3, ID: "infeasible", Status: StatusInfeasible, TotalCents: 100, NotPriced: []string{"patch_cords_each"}},
	}
	js := judge(rows)
	wantRank := []int{1, 1, 2, 0}
	wantPareto := []bool{true, true, false, false}
	wantText := []string{"yes", "yes (without patch_cords_each)", "no", ""}
	wantRankText := []string{"1", "1 of 1 without patch_cords_each", "2", ""}
	for i, j := range js {
		if j.rank != wantRank[i] || j.pareto != wantPareto[i] || ParetoText(j.Row, j.pareto, j.set) != wantText[i] || RankText(j.Row, j.rank, j.of, j.set) != wantRankText[i] {
			t.Errorf("%s: rank %d %q pareto %v %q, want %d %q %v %q", j.ID, j.rank, RankText(j.Row, j.rank, j.of, j.set), j.pareto, ParetoText(j.Row, j.pareto, j.set),
				wantRank[i], wantRankText[i], wantPareto[i], wantText[i])
		}
	}
	files, err := Compare(rows, nil, "")
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		text := string(f.Data)
		switch f.Name {
		case CompareCSV:
			if !strings.Contains(text, ",1 of 1 without patch_cords_each,yes (without patch_cords_each),") {
				t.Errorf("compare.csv does not mark the incomplete scenario's rank and flag:\n%s", text)
			}
		case CompareMD:
			for _, want := range []string{"1 ok scenario ranked apart: its total leaves out items its price book does not price",
				"Pareto optimal: `complete-dear`.", "Pareto optimal among scenarios without patch\\_cords\\_each: `incomplete-cheap`.",
				"`incomplete-cheap`: not priced, left out of the total: patch\\_cords\\_each"} {
				if !strings.Contains(text, want) {
					t.Errorf("compare.md lacks %q:\n%s", want, text)
				}
			}
		}
	}
	c := Judge(rows, nil)
	if c.Rows[1].Rank != 1 || !c.Rows[1].Pareto || c.Rows[0].Rank != 1 || c.Rows[2].Rank != 2 {
		t.Errorf("Judge: incomplete rank %d pareto %v, complete ranks %d %d", c.Rows[1].Rank, c.Rows[1].Pareto, c.Rows[0].Rank, c.Rows[2].Rank)
	}
}

// TestJudgeSameExclusionRanked: a sweep whose every book leaves out the same optional item
// (cords furnished with the equipment) ranks its scenarios 1 and 2 and judges them Pareto
// among themselves; one leaving out another item is ranked apart again (review 4 F4).
func TestJudgeSameExclusionRanked(t *testing.T) {
	t.Parallel()
	cords := []string{"patch_cords_each"}
	rows := []Row{
		{Index: 0, ID: "hub-adm", Status: StatusOK, TotalCents: 29200725, WorstMarginDB: fp(2), NotPriced: cords},
		{Index: 1, ID: "hub-lib", Status: StatusOK, TotalCents: 29056277, WorstMarginDB: fp(1), NotPriced: cords},
		{Index: 2, ID: "hub-lib-2", Status: StatusOK, TotalCents: 29100000, WorstMarginDB: fp(0.5), NotPriced: cords},
		{Index: 3, ID: "other", Status: StatusOK, TotalCents: 1, WorstMarginDB: fp(9), NotPriced: []string{"splice_point_each", "patch_cords_each"}},
	}
	js := judge(rows)
	wantRank := []int{3, 1, 2, 1}
	wantPareto := []bool{true, true, false, true}
	for i, j := range js {
		if j.rank != wantRank[i] || j.pareto != wantPareto[i] {
			t.Errorf("%s: rank %d pareto %v, want %d %v", j.ID, j.rank, j.pareto, wantRank[i], wantPareto[i])
		}
	}
	if got := RankText(&rows[3], js[3].rank, js[3].of, js[3].set); got != "1 of 1 without patch_cords_each, splice_point_each" {
		t.Errorf("rank cell %q", got)
	}
}

// TestRowKeepsNotPriced: the row keeps the summary's not-priced keys, which make it
// incomplete only when every leg is feasible.
func TestRowKeepsNotPriced(t *testing.T) {
	var r Row
	r.fill(output.Summary{NotPriced: []string{"building_entrance_each"}})
	if !r.Incomplete() || len(r.NotPriced) != 1 {
		t.Errorf("row %+v: want incomplete with one key not priced", r)
	}
	r.fill(output.Summary{Infeasible: 1, NotPriced: []string{"building_entrance_each"}})
	if r.Incomplete() {
		t.Errorf("an infeasible row is not also incomplete: %+v", r)
	}
}

// TestOneRankedSetNotApart: when every ok scenario leaves out the same unpriced item they are
// one ranked set, and neither compare.md nor the terminal says they are "ranked apart", even
// beside scenarios with infeasible legs, ranked in sets of their own (tester 14 F10: six ok
// scenarios, all without pole_riser_each, ranked 1 to 6 together beside twelve infeasible).
func TestOneRankedSetNotApart(t *testing.T) {
	t.Parallel()
	risers := []string{"pole_riser_each"}
	rows := []Row{
		{Index: 0, ID: "a", Status: StatusOK, TotalCents: 200, WorstMarginDB: fp(1), NotPriced: risers},
		{Index: 1, ID: "b", Status: StatusOK, TotalCents: 100, WorstMarginDB: fp(1), NotPriced: risers},
		{Index: 2, ID: "c", Status: StatusFailed, Error: "boom"},
		{Index: 3, ID: "d", Status: StatusInfeasible, TotalCents: 50, WorstMarginDB: fp(1), NotPriced: risers, InfeasibleLegs: 1, Unserved: []string{"A-B/diverse"}},
	}
	if n := RankSets(rows, true); n != 1 {
		t.Fatalf("RankSets of the ok rows = %d, want 1", n)
	}
	if c := Judge(rows, nil); c.OKSets != 1 || c.RankSets != 2 {
		t.Errorf("Comparison: OKSets %d, RankSets %d, want 1 and 2", c.OKSets, c.RankSets)
	}
	var rep Report
	for _, r := range rows {
		rep.count(r)
	}
	if rep.OKSets != 1 || rep.Incomplete != 2 {
		t.Errorf("Report: OKSets %d Incomplete %d, want 1 and 2", rep.OKSets, rep.Incomplete)
	}
	files, err := Compare(rows, nil, "")
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		if f.Name != CompareMD {
			continue
		}
		text := string(f.Data)
		if strings.Contains(text, "ok scenarios ranked apart") {
			t.Errorf("compare.md says the ok scenarios are ranked apart, in one ranked set:\n%s", text)
		}
		if want := "2 ok scenarios: every total leaves out the same items"; !strings.Contains(text, want) {
			t.Errorf("compare.md lacks %q:\n%s", want, text)
		}
	}
	// A complete scenario beside them makes two sets: now they are ranked apart.
	rows = append(rows, Row{Index: 4, ID: "e", Status: StatusOK, TotalCents: 300, WorstMarginDB: fp(1)})
	if n := RankSets(rows, true); n != 2 {
		t.Errorf("RankSets of the ok rows with a complete one = %d, want 2", n)
	}
}
