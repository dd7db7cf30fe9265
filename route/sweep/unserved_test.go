package sweep

import (
	"strings"
	"testing"

	"spanwright/route/output"
	"spanwright/route/workbook"
)

// TestJudgeRanksUnservedApart: one diverse link that no scenario can give a second route
// (tester 10's finding 5: ADMN-LIBR/diverse, "every route uses span L-LIBR/2", in every
// scenario) no longer leaves the whole comparison unranked: a scenario with infeasible legs is
// ranked and Pareto-judged among those leaving the same legs unserved (and the same items
// unpriced), never against one that serves more (common practice, no published source: bids
// are compared on the same scope). A row written before the legs were named is not ranked.
// Its rank and pareto cells count the legs, "1 of 2 leaving the 3 legs of set 2 unserved", and the legs
// are named once: compare.csv's unserved_legs, below compare.md's table (tester 15 F7: 31
// names in each cell). Its total is no figure to sort with complete ones: total_cost is
// blank, the total of its served legs in total_cost_served_legs_only (tester 15 F7: sorted by
// total_cost, the rows leaving 31 legs unserved came out the cheapest alternatives).
func TestJudgeRanksUnservedApart(t *testing.T) {
	t.Parallel()
	diverse := []string{"ADMN-LIBR/diverse"}
	noTrench := []string{"ADMN-LIBR/diverse", "ADMN-GLS2/primary", "ADMN-B14/primary"}
	rows := []Row{
		{Index: 0, ID: "book-a", Status: StatusInfeasible, InfeasibleLegs: 1, Unserved: diverse, TotalCents: 57409056, WorstMarginDB: fp(2.38)},
		{Index: 1, ID: "book-a-no-trench", Status: StatusInfeasible, InfeasibleLegs: 3, Unserved: noTrench, TotalCents: 42861405, WorstMarginDB: fp(2.38)},
		{Index: 2, ID: "book-b", Status: StatusInfeasible, InfeasibleLegs: 1, Unserved: diverse, TotalCents: 55488712, WorstMarginDB: fp(2.38)},
		{Index: 3, ID: "book-b-no-trench", Status: StatusInfeasible, InfeasibleLegs: 3, Unserved: []string{"ADMN-B14/primary", "ADMN-GLS2/primary", "ADMN-LIBR/diverse"}, TotalCents: 42798466, WorstMarginDB: fp(2.38)},
		{Index: 4, ID: "all-40g", Status: StatusInfeasible, InfeasibleLegs: 1, Unserved: diverse, TotalCents: 58538001, WorstMarginDB: fp(2.5)},
		{Index: 5, ID: "book-c", Status: StatusInfeasible, InfeasibleLegs: 1, Unserved: diverse, TotalCents: 100, NotPriced: []string{"maintenance_hole_entry_each"}},
		{Index: 6, ID: "old-row", Status: StatusInfeasible, InfeasibleLegs: 1, TotalCents: 1},
		{Index: 7, ID: "failed", Status: StatusFailed},
	}
	js := judge(rows)
	wantRank := []int{2, 2, 1, 1, 3, 1, 0, 0}
	wantPareto := []bool{false, false, true, true, true, true, false, false}
	wantRankText := []string{
		"2 of 3 leaving the 1 leg of set 1 unserved",
		"2 of 2 leaving the 3 legs of set 2 unserved",
		"1 of 3 leaving the 1 leg of set 1 unserved",
		"1 of 2 leaving the 3 legs of set 2 unserved",
		"3 of 3 leaving the 1 leg of set 1 unserved",
		"1 of 1 leaving the 1 leg of set 1 unserved and without maintenance_hole_entry_each",
		"", ""}
	for i, j := range js {
		if j.rank != wantRank[i] || j.pareto != wantPareto[i] || RankText(j.Row, j.rank, j.of, j.set) != wantRankText[i] {
			t.Errorf("%s: rank %d %q pareto %v, want %d %q %v", j.ID, j.rank, RankText(j.Row, j.rank, j.of, j.set), j.pareto, wantRank[i], wantRankText[i], wantPareto[i])
		}
	}
	if got := ParetoText(&rows[4], true, 0); got != "yes (leaving 1 leg unserved)" {
		t.Errorf("pareto cell %q", got)
	}
	if got := ParetoText(&rows[6], false, 0); got != "" {
		t.Errorf("a row without its legs' names is not judged: pareto cell %q", got)
	}
	files, err := Compare(rows, nil, "")
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		text := string(f.Data)
		switch f.Name {
		case CompareCSV:
			for _, want := range []string{
				`,1 of 3 leaving the 1 leg of set 1 unserved,yes (leaving the 1 leg of set 1 unserved),`,
				`,2 of 2 leaving the 3 legs of set 2 unserved,no (leaving the 3 legs of set 2 unserved),`,
				// No total_cost, the served legs' total and the legs at the end of the row.
				"\n1,book-a-no-trench,,infeasible,,,,,3,",
				",428614.05,ADMN-LIBR/diverse; ADMN-GLS2/primary; ADMN-B14/primary\n",
			} {
				if !strings.Contains(text, want) {
					t.Errorf("compare.csv lacks %q:\n%s", want, text)
				}
			}
			// Columns stay where they were: the header of earlier versions, then the columns
			// added after them.
			head, _, _ := strings.Cut(text, "\n")
			if head != "index,id,case,status,currency,total_cost,plan_budget,over_budget,infeasible_legs,worst_margin_db,new_trench_m,diverse_links,diverse_single_point,diverse_missing,media_mix,cost_rank,pareto,warnings,error,note,objective,lower_bound,gap_pct"+
				",started_from,handholes_to_build,cost_material,cost_labour,cost_construction,cost_optics,cost_bid_items,contingency,overhead,tax,safety,budget_feasible_legs_only"+
				",new_construction_trench_m,new_construction_bore_m,new_construction_aerial_m,new_construction_tray_m,new_construction_tunnel_m"+
				",total_cost_served_legs_only,unserved_legs" {
				t.Errorf("compare.csv header changed: %s", head)
			}
		case CompareMD:
			for _, want := range []string{
				"6 scenarios with infeasible legs ranked apart: each is ranked and Pareto-judged among those leaving the same legs unserved",
				"1 scenario with infeasible legs not ranked: its row does not name the legs",
				"3 legs left unserved by some of the scenarios, named below the table (Legs left unserved)",
				"Pareto optimal among scenarios leaving the 1 leg of set 1 unserved: `book-b`, `all-40g`.",
				"| 1 | `book-a-no-trench` |  | infeasible |  | 428614.05 |  |  | 3 |",
				"| 2 of 2 leaving the 3 legs of set 2 unserved | no (leaving the 3 legs of set 2 unserved) |",
				"## Legs left unserved\n\n- set 1: `book-a`, `book-b`, `all-40g`, `book-c`: 1 leg: `ADMN-LIBR/diverse`\n" +
					"- set 2: `book-a-no-trench`, `book-b-no-trench`: 3 legs: `ADMN-LIBR/diverse`, `ADMN-GLS2/primary`, `ADMN-B14/primary`\n",
			} {
				if !strings.Contains(text, want) {
					t.Errorf("compare.md lacks %q:\n%s", want, text)
				}
			}
		}
	}
	// compare.xlsx: the same cells, the served legs' total a number.
	for _, f := range files {
		if f.Name != CompareXLSX {
			continue
		}
		x, err := workbook.Open(f.Data)
		if err != nil {
			t.Fatal(err)
		}
		xr, err := x.Rows("scenarios")
		x.Close()
		if err != nil {
			t.Fatal(err)
		}
		cell := map[string]string{}
		for c, h := range xr[0] {
			if c < len(xr[2]) {
				cell[h] = xr[2][c] // book-a-no-trench
			}
		}
		for h, want := range map[string]string{"total cost": "", "total cost of the served legs only": "428614.05",
			"rank by cost": "2 of 2 leaving the 3 legs of set 2 unserved", "legs left unserved": "ADMN-LIBR/diverse; ADMN-GLS2/primary; ADMN-B14/primary"} {
			if cell[h] != want {
				t.Errorf("compare.xlsx %s: %q, want %q (header %q)", h, cell[h], want, xr[0])
			}
		}
	}
	// A leg every planned scenario leaves unserved is named as such.
	every := []Row{rows[0], rows[2]}
	every[1].Index = 1
	files, err = Compare(every, nil, "")
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		if f.Name == CompareMD && !strings.Contains(string(f.Data), "Infeasible in every planned scenario, so no alternative of this sweep serves it: `ADMN-LIBR/diverse`. Each scenario folder's links.csv gives the reason.") {
			t.Errorf("compare.md does not name the leg every scenario leaves unserved:\n%s", f.Data)
		}
	}
	// The report's judged rows carry the same ranks.
	c := Judge(rows, nil)
	for i, j := range c.Rows {
		if j.Rank != wantRank[i] || j.Pareto != wantPareto[i] {
			t.Errorf("Judge %s: rank %d pareto %v, want %d %v", j.ID, j.Rank, j.Pareto, wantRank[i], wantPareto[i])
		}
	}
}

// TestRowKeepsUnserved: the row keeps the names of the summary's infeasible legs; an ok
// scenario has none and is ranked with the complete ones.
func TestRowKeepsUnserved(t *testing.T) {
	var r Row
	r.fill(output.Summary{Infeasible: 1, InfeasibleNames: []string{"ADMN-LIBR/diverse"}})
	if r.Status != StatusInfeasible || !r.Ranked() || !r.RankedApart() || r.Apart() != "leaving 1 leg unserved" {
		t.Errorf("row %+v: want infeasible, ranked apart leaving 1 leg unserved (Apart %q)", r, r.Apart())
	}
	r.fill(output.Summary{})
	if len(r.Unserved) != 0 || r.RankedApart() || !r.Ranked() {
		t.Errorf("ok row %+v: want ranked with the complete ones", r)
	}
}

// TestCompareSaysGapIsTheNoise: compare.md says how far its totals are proved, with the
// sweep's own gaps to the bound, and that a warm-started scenario's search differs from a
// plan made alone (tester 10's finding 10: a LIBR-hub scenario "every link was placed afresh"
// came out 2 % cheaper than the same plan from scratch, with gaps of 16-21 %), naming the
// column that tells which rows were (tester 12's finding 8: the rows that moved had no note);
// without a warm-started row, that every row is planned as `spanwright plan` plans it alone.
func TestCompareSaysGapIsTheNoise(t *testing.T) {
	t.Parallel()
	lb1, lb2 := int64(22121668), int64(29997784)
	rows := []Row{
		{Index: 0, ID: "cold", Status: StatusOK, TotalCents: 57401484, ObjectiveCents: 36126875, LowerBoundCents: &lb2, GapPct: fp(20.4318)},
		{Index: 1, ID: "warm", Status: StatusOK, TotalCents: 41362127, ObjectiveCents: 25737840, LowerBoundCents: &lb1, GapPct: fp(16.3467),
			StartedFrom: "cold"},
	}
	md := func() string {
		files, err := Compare(rows, nil, "")
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range files {
			if f.Name == CompareMD {
				return string(f.Data)
			}
		}
		t.Fatal("no compare.md")
		return ""
	}
	got := md()
	for _, want := range []string{"gap to the bound (here 16.35 to 20.43 %)",
		"A row whose \"search started from\" names a base scenario began its search from that scenario's routes, searched with fewer moves than `spanwright plan` searches a plan from scratch",
		"so it may come out cheaper or dearer than the plan made alone, within that gap",
		"| search started from |", "| 16.35 | cold |",
		"Two totals that differ by less than their gaps are not proved to differ by the alternatives alone"} {
		if !strings.Contains(got, want) {
			t.Errorf("compare.md lacks %q:\n%s", want, got)
		}
	}
	rows[1].StartedFrom = ""
	if got := md(); !strings.Contains(got, "Every row is planned from scratch, as `spanwright plan` plans it alone") {
		t.Errorf("compare.md without a warm row:\n%s", got)
	}
}

// TestUnservedGroupsByLeg: two scenarios whose unserved legs read alike once joined by ", "
// (an id may hold a comma) are still two rank groups: each is ranked 1.
func TestUnservedGroupsByLeg(t *testing.T) {
	t.Parallel()
	rows := []Row{
		{Index: 0, ID: "a", Status: StatusInfeasible, Unserved: []string{"X, Y/primary", "Z/primary"}, TotalCents: 2},
		{Index: 1, ID: "b", Status: StatusInfeasible, Unserved: []string{"X", "Y/primary, Z/primary"}, TotalCents: 1},
	}
	if rows[0].Apart() != rows[1].Apart() {
		t.Fatalf("want texts alike: %q, %q", rows[0].Apart(), rows[1].Apart())
	}
	for _, j := range judge(rows) {
		if j.rank != 1 || !j.pareto {
			t.Errorf("%s: rank %d pareto %v, want 1 and Pareto in a group of its own", j.ID, j.rank, j.pareto)
		}
	}
}
