package sweep

import (
	"bytes"
	"cmp"
	"fmt"
	"maps"
	"math"
	"reflect"
	"slices"
	"sort"
	"strconv"
	"strings"

	"spanwright/media"
	"spanwright/route"
	"spanwright/route/escape"
	"spanwright/route/estimate"
	"spanwright/route/fileset"
	"spanwright/route/output"
	"spanwright/route/workbook"
)

// Comparison file names.
const (
	CompareCSV  = "compare.csv"
	CompareXLSX = "compare.xlsx"
	CompareMD   = "compare.md"
)

// judged is a row with what the comparison works out across rows.
type judged struct {
	*Row
	rank   int  // 1 for the cheapest of its Apart; 0 when not ranked
	of     int  // the rows ranked with it (its rank group); 0 when not ranked
	set    int  // its set of unserved legs, numbered (UnservedSets) when there are several; 0 otherwise
	pareto bool // not dominated within its Apart; only ranked scenarios are judged
}

// judge ranks the rows by total cost (equal costs share a rank, the next rank skips: 1, 2,
// 2, 4) and flags those no other row of the same kind dominates on (total cost lower is
// better, worst loss margin higher is better, links missing a diverse route fewer is better),
// among the rows whose totals cover the same legs and leave out the same items (Row.Apart):
// the ok ones pricing every line together; each set of incomplete ones whose books leave out
// the same items together (Row.NotPriced); each set of infeasible ones that leave the same
// legs unserved (Row.Unserved) together, so that a leg no scenario can serve (a diverse route
// the campus does not have) still leaves the others ranked; never one total against another
// that covers more. A scenario without fibre legs has no loss margin to lose and counts as the
// best margin. Failed scenarios, and infeasible ones whose legs are not named (a rows file
// written before they were kept), get neither a rank nor a flag.
func judge(rows []Row) []judged {
	out := make([]judged, len(rows))
	groups := map[string][]int{}
	var keys []string
	for i := range rows {
		out[i].Row = &rows[i]
		if rows[i].Ranked() {
			k := rows[i].group()
			if _, seen := groups[k]; !seen {
				keys = append(keys, k)
			}
			groups[k] = append(groups[k], i)
		}
	}
	for _, k := range keys {
		judgeGroup(rows, out, groups[k])
	}
	if sets := UnservedSets(rows); len(sets) > 1 {
		number := map[string]int{}
		for n, set := range sets {
			number[set.key] = n + 1
		}
		for i := range out {
			if rows[i].Ranked() {
				out[i].set = number[rows[i].legsKey()]
			}
		}
	}
	return out
}

// Exclusion is what a row's total leaves out, its NotPriced keys sorted and joined by ", ";
// "" for a complete total.
func (r *Row) Exclusion() string {
	return strings.Join(slices.Sorted(slices.Values(r.NotPriced)), ", ")
}

// judgeGroup ranks and flags the ranked rows of one Apart (judge).
func judgeGroup(rows []Row, out []judged, ok []int) {
	byCost := append([]int(nil), ok...)
	sort.SliceStable(byCost, func(a, b int) bool { return rows[byCost[a]].TotalCents < rows[byCost[b]].TotalCents })
	for k, i := range byCost {
		out[i].of = len(byCost)
		if k > 0 && rows[i].TotalCents == rows[byCost[k-1]].TotalCents {
			out[i].rank = out[byCost[k-1]].rank
		} else {
			out[i].rank = k + 1
		}
	}
	margin := func(i int) float64 {
		if m := rows[i].WorstMarginDB; m != nil {
			return *m
		}
		return math.Inf(1)
	}
	// Sorted by cost, then missing diverse links, then margin (best first), any row that
	// dominates another comes before it; best[m] is the best margin seen among earlier
	// rows with m missing diverse links.
	order := append([]int(nil), ok...)
	sort.SliceStable(order, func(a, b int) bool {
		x, y := order[a], order[b]
		if rows[x].TotalCents != rows[y].TotalCents {
			return rows[x].TotalCents < rows[y].TotalCents
		}
		if rows[x].DiverseMissing != rows[y].DiverseMissing {
			return rows[x].DiverseMissing < rows[y].DiverseMissing
		}
		return margin(x) > margin(y)
	})
	best := map[int]float64{}
	var missing []int // keys of best, sorted
	for g := 0; g < len(order); {
		// A group of identical points: none dominates another.
		h := g + 1
		for h < len(order) && same(rows, order[g], order[h], margin) {
			h++
		}
		i := order[g]
		dominated := false
		for _, m := range missing {
			if m > rows[i].DiverseMissing {
				break
			}
			if best[m] >= margin(i) {
				dominated = true
				break
			}
		}
		for _, j := range order[g:h] {
			out[j].pareto = !dominated
		}
		m := rows[i].DiverseMissing
		if b, seen := best[m]; !seen || margin(i) > b {
			if !seen {
				missing = append(missing, m)
				sort.Ints(missing)
			}
			best[m] = margin(i)
		}
		g = h
	}
}

// ParetoText is a row's pareto cell: "yes" or "no" for an ok scenario, judged among the
// complete ones, or for one ranked apart (Row.RankedApart: incomplete, or leaving legs
// unserved) among those of its rank group, with what sets its total apart after it
// (Row.ApartIn, its set of unserved legs numbered set), e.g. "yes (leaving 31 legs
// unserved)", "no (without patch_cords_each)"; "" for a row not ranked (Row.Ranked).
// compare.csv, compare.md and the sweep report all use it.
func ParetoText(r *Row, pareto bool, set int) string {
	text := "no"
	if pareto {
		text = "yes"
	}
	switch {
	case !r.Ranked():
		return ""
	case r.RankedApart():
		return text + " (" + r.ApartIn(set) + ")"
	}
	return text
}

// RankText is a row's cost rank cell: the rank among the complete ok scenarios, "1"; for one
// ranked apart the rank among the of rows of its rank group and what sets them apart
// (Row.ApartIn, its set of unserved legs numbered set), "1 of 4 leaving 31 legs unserved",
// "2 of 3 without patch_cords_each"; "" when not ranked. Short whatever the legs (tester 15
// F7): they are named in compare.csv's unserved_legs and below compare.md's table
// (UnservedSets).
func RankText(r *Row, rank, of, set int) string {
	switch {
	case rank == 0:
		return ""
	case r.RankedApart():
		return strconv.Itoa(rank) + " of " + strconv.Itoa(of) + " " + r.ApartIn(set)
	}
	return strconv.Itoa(rank)
}

func same(rows []Row, a, b int, margin func(int) float64) bool {
	return rows[a].TotalCents == rows[b].TotalCents && rows[a].DiverseMissing == rows[b].DiverseMissing && margin(a) == margin(b)
}

// money formats cents with two decimals: 1234567 is "12345.67".
func money(c int64) string {
	sign := ""
	if c < 0 {
		sign, c = "-", -c
	}
	return fmt.Sprintf("%s%d.%02d", sign, c/100, c%100)
}

// column is one fixed column of the comparison.
type column struct {
	csv   string                // CSV header, unit in the name
	human string                // XLSX and Markdown header, without the unit
	unit  string                // "" for none; "$currency" for the sweep's currency
	text  func(j judged) string // compare.csv's cell, and compare.md's unless md is set
	cell  func(j judged) workbook.Cell
	md    func(j judged) string // compare.md's cell when it differs from text; nil: text
}

// mdText is the column's cell in compare.md, not yet escaped.
func (c column) mdText(j judged) string {
	if c.md != nil {
		return c.md(j)
	}
	return c.text(j)
}

func planned(j judged) bool { return j.Status != StatusFailed }

func moneyCol(csvName, human string, get func(*Row) int64, when func(judged) bool) column {
	return column{csvName, human, "$currency",
		func(j judged) string {
			if !when(j) {
				return ""
			}
			return money(get(j.Row))
		},
		func(j judged) workbook.Cell {
			if !when(j) {
				return workbook.Blank()
			}
			return workbook.Cents(get(j.Row))
		}, nil}
}

func intCol(csvName, human string, get func(*Row) int) column {
	return column{csvName, human, "",
		func(j judged) string {
			if !planned(j) {
				return ""
			}
			return strconv.Itoa(get(j.Row))
		},
		func(j judged) workbook.Cell {
			if !planned(j) {
				return workbook.Blank()
			}
			return workbook.Int(int64(get(j.Row)))
		}, nil}
}

// optIntCol is intCol for a count a rows file may lack (nil: written before it was kept),
// blank then.
func optIntCol(csvName, human string, get func(*Row) *int) column {
	return column{csvName, human, "",
		func(j judged) string {
			if !planned(j) || get(j.Row) == nil {
				return ""
			}
			return strconv.Itoa(*get(j.Row))
		},
		func(j judged) workbook.Cell {
			if !planned(j) || get(j.Row) == nil {
				return workbook.Blank()
			}
			return workbook.Int(int64(*get(j.Row)))
		}, nil}
}

func textCol(csvName, human string, get func(judged) string) column {
	return column{csvName, human, "", get, func(j judged) workbook.Cell {
		if s := get(j); s != "" {
			return workbook.Text(s)
		}
		return workbook.Blank()
	}, nil}
}

func hasBudget(j judged) bool { return planned(j) && j.BudgetCents != nil }

// columnsIn are the comparison's columns after the override columns, with the lengths in
// units (output.UnitsMetric or UnitsImperial), as the sweep wrote its scenarios' files
// (rowsHeader.Units): compare.csv's new_trench_m is new_trench_ft under --units imperial.
func columnsIn(units string) []column {
	return slices.Concat([]column{
		textCol("status", "status", func(j judged) string { return j.Status }),
		textCol("currency", "currency", func(j judged) string { return j.Currency }),
		figureCol("total_cost", "total cost", (*Row).Total),
		moneyCol("plan_budget", "budget", func(r *Row) int64 { return *r.BudgetCents }, hasBudget),
		overBudgetColumn(),
		intCol("infeasible_legs", "infeasible legs", func(r *Row) int { return r.InfeasibleLegs }),
		{"worst_margin_db", "worst loss margin", "dB",
			func(j judged) string {
				if !planned(j) || j.WorstMarginDB == nil {
					return ""
				}
				return strconv.FormatFloat(*j.WorstMarginDB, 'f', 2, 64)
			},
			func(j judged) workbook.Cell {
				if !planned(j) || j.WorstMarginDB == nil {
					return workbook.Blank()
				}
				return workbook.Number(*j.WorstMarginDB, 2)
			}, nil},
		lengthColumn("new_trench", "new trench", func(j judged) (float64, bool) { return j.NewTrenchM, planned(j) }, units),
		intCol("diverse_links", "diverse links", func(r *Row) int { return r.DiverseLinks }),
		optIntCol("diverse_single_point", "diverse links sharing a single point of failure", func(r *Row) *int { return r.DiverseSinglePoint }),
		intCol("diverse_missing", "links lacking a diverse route", func(r *Row) int { return r.DiverseMissing }),
		textCol("media_mix", "media (legs per medium)", func(j judged) string { return j.MediaMix }),
		{"cost_rank", "rank by cost", "",
			func(j judged) string { return RankText(j.Row, j.rank, j.of, j.set) },
			func(j judged) workbook.Cell {
				switch {
				case j.rank == 0:
					return workbook.Blank()
				case j.RankedApart(): // text: the totals' formulas match the complete ranks only
					return workbook.Text(RankText(j.Row, j.rank, j.of, j.set))
				}
				return workbook.Int(int64(j.rank))
			}, nil},
		{"pareto", "pareto optimal", "",
			func(j judged) string { return ParetoText(j.Row, j.pareto, j.set) },
			func(j judged) workbook.Cell {
				switch {
				case !j.Ranked():
					return workbook.Blank()
				case j.RankedApart():
					return workbook.Text(ParetoText(j.Row, j.pareto, j.set))
				}
				return workbook.Bool(j.pareto)
			}, nil},
		intCol("warnings", "warnings", func(r *Row) int { return r.Warnings }),
		textCol("error", "error", func(j judged) string { return oneLine(j.Error) }),
		textCol("note", "note", func(j judged) string { return j.Note }),
		// The optimizer's objective, proved lower bound and gap, last so that readers of the
		// columns before them stay valid.
		moneyCol("objective", "optimizer objective", func(r *Row) int64 { return r.ObjectiveCents }, planned),
		moneyCol("lower_bound", "proved lower bound", func(r *Row) int64 { return *r.LowerBoundCents }, bounded),
		// The gap in percent: compare.csv as summary.json has it (four decimals), the workbook
		// and compare.md as the terminal and the report show it (output.PctText, two).
		{"gap_pct", "gap to the bound", "%",
			func(j judged) string {
				if !bounded(j) || j.GapPct == nil {
					return ""
				}
				return strconv.FormatFloat(*j.GapPct, 'f', 4, 64)
			},
			func(j judged) workbook.Cell {
				if !bounded(j) || j.GapPct == nil {
					return workbook.Blank()
				}
				return workbook.Number(*j.GapPct, 2)
			},
			func(j judged) string {
				if !bounded(j) || j.GapPct == nil {
					return ""
				}
				return output.PctText(*j.GapPct)
			}},
		// Where the search began, then what the total is made of, after the columns of earlier
		// versions: the base scenario a warm-started row's search began from (blank: planned
		// from scratch, as `spanwright plan` plans it alone), the handholes the plan adds (new
		// digging, with or without new trench), and the bill's subtotals by category and its
		// markups, as summary.json has them, which add up to total_cost.
		textCol("started_from", "search started from", func(j judged) string {
			if !planned(j) {
				return ""
			}
			return j.StartedFrom
		}),
		optIntCol("handholes_to_build", "handholes to build", func(r *Row) *int { return r.HandholesToBuild }),
	}, costColumns(), []column{
		// The safety cautions the scenario's work calls for, and that the figures are a planning
		// aid, on every row: a comparison is read without the scenarios' reports (tester 12's
		// finding 2).
		textCol("safety", "safety", safetyText),
		// Whether over_budget covers the feasible legs only, after the columns of earlier versions:
		// yes for a row with a budget and infeasible legs, whose total prices those legs alone
		// (Row.BudgetFeasibleOnly), no for another row with a budget, blank without one.
		{"budget_feasible_legs_only", "budget checks the feasible legs only", "",
			func(j judged) string {
				if !hasBudget(j) {
					return ""
				}
				if j.BudgetFeasibleOnly {
					return "yes"
				}
				return "no"
			},
			func(j judged) workbook.Cell {
				if !hasBudget(j) {
					return workbook.Blank()
				}
				return workbook.Bool(j.BudgetFeasibleOnly)
			}, nil},
	}, constructionColumns(units), []column{
		// A total that leaves legs out, after the columns of earlier versions: the figure
		// total_cost was for such a row before (blank there now), under a name that says what
		// it covers, and the legs it leaves unserved, named once a row here (tester 15 F7).
		figureCol("total_cost_served_legs_only", "total cost of the served legs only", (*Row).ServedLegsTotal),
		textCol("unserved_legs", "legs left unserved", func(j judged) string { return strings.Join(j.Unserved, "; ") }),
	})
}

// figureCol is a money column of a figure a row may not have: blank where get says false.
func figureCol(csvName, human string, get func(*Row) (int64, bool)) column {
	return moneyCol(csvName, human, func(r *Row) int64 { c, _ := get(r); return c },
		func(j judged) bool { _, ok := get(j.Row); return ok })
}

// constructionColumns are the new construction by kind (Row.NewConstruction), one column of
// each kind of estimate.NewKinds in its order, after the columns of earlier versions:
// new_construction_trench_m, …_bore_m, …_aerial_m (a pole line), …_tray_m, …_tunnel_m, in
// feet under --units imperial; blank for a failed row and one of a rows file written before
// they were kept.
func constructionColumns(units string) []column {
	var out []column
	for _, k := range estimate.NewKinds {
		out = append(out, lengthColumn("new_construction_"+k, "new construction: "+output.KindName(k),
			func(j judged) (float64, bool) { return j.NewConstruction(k) }, units))
	}
	return out
}

// SubtotalCategories are the bill's categories the comparison gives a subtotal column of, in
// order (compare.csv's cost_<category>, compare.html's too): media.Categories and the bid
// items.
func SubtotalCategories() []string {
	return append(media.Categories(), media.CategoryBidItems)
}

// Markups are the bill's markups the comparison gives a column of after the subtotals, in
// order, each with its figure of a row: together with the subtotals they add up to the total.
var Markups = []struct {
	Name  string
	Cents func(*Row) int64
}{
	{"contingency", func(r *Row) int64 { return r.ContingencyCents }},
	{"overhead", func(r *Row) int64 { return r.OverheadCents }},
	{"tax", func(r *Row) int64 { return r.TaxCents }},
}

// costColumns are the subtotal columns (SubtotalCategories) and the markups (Markups).
func costColumns() []column {
	var out []column
	for _, cat := range SubtotalCategories() {
		out = append(out, categoryCol(cat))
	}
	for _, m := range Markups {
		out = append(out, moneyCol(m.Name, m.Name, m.Cents, billed))
	}
	return out
}

// FeasibleOnlyText is what follows the over-budget figure of a row whose budget check covers
// its feasible legs only (Row.BudgetFeasibleOnly): compare.md's and compare.html's over budget
// cell, as the plan's own outputs say it (output.Summary.BudgetScope); "" for another row.
func FeasibleOnlyText(r *Row) string {
	if !r.BudgetFeasibleOnly {
		return ""
	}
	return " (feasible legs only)"
}

// overBudgetColumn is total minus budget, blank without a budget; compare.md says beside it
// when it covers the feasible legs only (FeasibleOnlyText), compare.csv and compare.xlsx in
// the column budget_feasible_legs_only, so that the number stays a number.
func overBudgetColumn() column {
	c := moneyCol("over_budget", "over budget", func(r *Row) int64 { return *r.OverBudgetCents }, hasBudget)
	c.md = func(j judged) string {
		if !hasBudget(j) {
			return ""
		}
		return money(*j.OverBudgetCents) + FeasibleOnlyText(j.Row)
	}
	return c
}

// safetyText is a row's safety cell: its cautions' titles and that local codes and the
// authority having jurisdiction prevail (route.PlanningAid, said in full above compare.md's
// table and in compare.xlsx's totals sheet); "" for a failed row and one of a rows file
// written before the cautions were kept.
func safetyText(j judged) string {
	if !planned(j) || j.Cautions == nil {
		return ""
	}
	what := "no safety caution"
	if len(j.Cautions) > 0 {
		what = output.Counted(len(j.Cautions), "safety caution", "safety cautions") + " (" + strings.ToLower(strings.Join(j.Cautions, ", ")) + "; the scenario's report.html or summary.json says what calls for each)"
	}
	return what + "; " + safetyRider
}

// safetyRider ends every row's safety cell: route.PlanningAid in short.
const safetyRider = "a planning aid, not a construction document: local codes, licensed professionals and the authority having jurisdiction prevail"

// billed reports whether the row is planned with a bill whose subtotals it keeps (Row.Billed).
func billed(j judged) bool { return j.Billed() }

// Billed reports whether the row is of a planned scenario with a bill whose subtotals it
// keeps (CostByCategory): its subtotal and markup columns are filled, blank otherwise.
func (r *Row) Billed() bool { return r.Status != StatusFailed && len(r.CostByCategory) > 0 }

// categoryCol is the bill's subtotal of one category (media.Categories, media.CategoryBidItems)
// as compare.csv's cost_<category> (spaces as underscores), 0 where the bill has no line of
// it, blank without a bill.
func categoryCol(cat string) column {
	return moneyCol("cost_"+strings.ReplaceAll(cat, " ", "_"), cat, func(r *Row) int64 { return r.CostByCategory[cat] }, billed)
}

// lengthColumn is a column of lengths of a row in units (output.UnitsMetric or
// UnitsImperial), named base and the unit in compare.csv (new_trench_m, new_trench_ft),
// human in the others: get gives the row's metres (summary.json's, to 0.1 m), false for a
// blank cell; metres, or feet under --units imperial, one decimal, converted from those
// metres, so a figure in feet can be 0.1 ft off the scenario's own files.
func lengthColumn(base, human string, get func(judged) (float64, bool), units string) column {
	u := output.UnitsOf(output.WriteOptions{Units: units})
	return column{base + "_" + u.Length, human, u.Length,
		func(j judged) string {
			m, ok := get(j)
			if !ok {
				return ""
			}
			return strconv.FormatFloat(u.Rounded(m, 1), 'f', 1, 64)
		},
		func(j judged) workbook.Cell {
			m, ok := get(j)
			if !ok {
				return workbook.Blank()
			}
			return workbook.Number(u.Rounded(m, 1), 1)
		}, nil}
}

// bounded reports whether the row is planned with a lower bound.
func bounded(j judged) bool { return planned(j) && j.LowerBoundCents != nil }

func oneLine(s string) string { return strings.ReplaceAll(strings.TrimSpace(s), "\n", "; ") }

// currencyOf returns the currency every planned row shares, or "" when they differ or give none.
func currencyOf(rows []Row) string {
	cur := ""
	for _, r := range rows {
		if r.Status == StatusFailed || r.Currency == "" {
			continue
		}
		if cur != "" && r.Currency != cur {
			return ""
		}
		cur = r.Currency
	}
	return cur
}

// Compare renders the comparison of rows (every scenario of a sweep, in index order) as the
// files compare.csv, compare.xlsx and compare.md. keys are the override keys, one column
// each, in order; units the units of the scenarios' files for people (output.UnitsImperial,
// or "" or output.UnitsMetric), which the lengths follow.
//
// compare.csv has a header line, then one line per scenario: index (0-based), id, case, one
// column per override key (empty where the scenario keeps the base plan's value), status
// (ok, infeasible, failed), currency, total_cost, plan_budget and over_budget (currency units
// with two decimals; budget columns empty without a budget), infeasible_legs,
// worst_margin_db (two decimals, empty without fibre legs), new_trench_m (one decimal;
// new_trench_ft under --units imperial, columnsIn),
// diverse_links, diverse_single_point (of them, those whose two routes share a single point
// of failure), diverse_missing, media_mix ("medium:legs" pairs), cost_rank and pareto
// (RankText, ParetoText), warnings, error, note, then objective and lower_bound (currency units, empty
// without a bound) and gap_pct (the gap to the bound in percent, four decimals; empty
// without a bound), started_from, handholes_to_build, the bill's subtotals cost_<category>
// and markups contingency, overhead and tax, safety, and budget_feasible_legs_only (yes when
// over_budget covers the feasible legs only, no with a budget otherwise, empty without one),
// then the new construction by kind, new_construction_trench_m, _bore_m, _aerial_m (a pole
// line), _tray_m and _tunnel_m (one decimal, _ft under --units imperial; empty for a failed
// row and one of a rows file written before they were kept; trench and bore add up to
// new_trench_m). Last, total_cost_served_legs_only and unserved_legs: a row leaving legs
// unserved has total_cost blank and the total of the legs it serves there (Row.Total,
// Row.ServedLegsTotal), and names the legs ("; " between them); blank for any other row.
// compare.xlsx holds the same table, numbers as numbers, with a
// second sheet of totals as formulas; compare.md the same as a Markdown table. Text from the
// sweep (ids, case names, values, errors) is escaped for each file by package escape: no CSV
// cell begins a formula, no Markdown text forms markup, hidden characters show as "<U+202E>".
func Compare(rows []Row, keys []string, units string) ([]fileset.OutputFile, error) {
	js := judge(rows)
	cur := currencyOf(rows)
	cols := columnsIn(units)
	csvData, err := compareCSV(js, keys, cols)
	if err != nil {
		return nil, err
	}
	xlsx, err := compareXLSX(js, keys, cur, cols)
	if err != nil {
		return nil, err
	}
	md := compareMD(js, keys, cur, cols)
	return []fileset.OutputFile{
		{Name: CompareCSV, Data: csvData},
		{Name: CompareMD, Data: md},
		{Name: CompareXLSX, Data: xlsx},
	}, nil
}

func compareCSV(js []judged, keys []string, fixed []column) ([]byte, error) {
	var b bytes.Buffer
	w := escape.NewWriter(&b)
	head := append([]string{"index", "id", "case"}, keys...)
	for _, c := range fixed {
		head = append(head, c.csv)
	}
	w.Write(head)
	for _, j := range js {
		rec := []string{strconv.Itoa(j.Index), j.ID, j.Case}
		for _, k := range keys {
			rec = append(rec, j.value(k))
		}
		for _, c := range fixed {
			rec = append(rec, c.text(j))
		}
		w.Write(rec)
	}
	if err := w.Flush(); err != nil {
		return nil, err
	}
	return b.Bytes(), nil
}

func unitOf(c column, cur string) string {
	if c.unit == "$currency" {
		return cur
	}
	return c.unit
}

func compareXLSX(js []judged, keys []string, cur string, fixed []column) ([]byte, error) {
	wb := workbook.New()
	cols := []workbook.Column{{Name: "index"}, {Name: "id"}, {Name: "case"}}
	for _, k := range keys {
		cols = append(cols, workbook.Column{Name: k})
	}
	first := len(cols)
	for _, c := range fixed {
		cols = append(cols, workbook.Column{Name: c.human, Unit: unitOf(c, cur)})
	}
	sh := wb.AddSheet("scenarios", cols...)
	sh.Filter = true
	for _, j := range js {
		cells := []workbook.Cell{workbook.Int(int64(j.Index)), workbook.Text(j.ID), textOrBlank(j.Case)}
		for _, k := range keys {
			cells = append(cells, axisCell(k, j.value(k)))
		}
		for _, c := range fixed {
			cells = append(cells, c.cell(j))
		}
		sh.Append(cells...)
	}
	col := func(csvName string) string {
		for i, c := range fixed {
			if c.csv == csvName {
				return sh.Range(first + i)
			}
		}
		panic("sweep: no column " + csvName)
	}
	// The totals are formulas over the scenarios sheet, each with its result worked out here
	// from the same rows as its cached value.
	n := tallyOf(js)
	maxRank, pareto := 0, 0
	for _, j := range js {
		if j.RankedApart() {
			continue // ranked among their own kind, in text cells the formulas pass over
		}
		if j.Status == StatusOK && j.pareto {
			pareto++
		}
		maxRank = max(maxRank, j.rank)
	}
	// costAtRank is INDEX(cost, MATCH(rank, ranks, 0)): the total cost of the first row of
	// that rank, "" (IFERROR) when no row has it.
	costAtRank := func(expr string, rank int) workbook.Cell {
		for _, j := range js {
			if rank > 0 && j.rank == rank && !j.RankedApart() {
				return workbook.Formula(expr, float64(j.TotalCents)/100, 2)
			}
		}
		return workbook.FormulaText(expr, "")
	}
	tot := wb.AddSheet("totals", workbook.Column{Name: "what"}, workbook.Column{Name: "value"})
	status := col("status")
	tot.Append(workbook.Text("scenarios"), workbook.Formula("COUNTA("+sh.Range(1)+")", float64(len(js)), 0))
	tot.Append(workbook.Text("ok"), workbook.Formula("COUNTIF("+status+",\"ok\")", float64(n.ok), 0))
	tot.Append(workbook.Text("with infeasible legs"), workbook.Formula("COUNTIF("+status+",\"infeasible\")", float64(n.infeasible), 0))
	tot.Append(workbook.Text("failed"), workbook.Formula("COUNTIF("+status+",\"failed\")", float64(n.failed), 0))
	tot.Append(workbook.Text("pareto optimal"), workbook.Formula("COUNTIF("+col("pareto")+",TRUE)", float64(pareto), 0))
	// The cheapest and dearest ranked scenarios (ok, every line priced) are those ranked first
	// and last; INDEX and MATCH
	// work in every spreadsheet program, unlike the newer conditional MIN and MAX.
	cost, rank := col("total_cost"), col("cost_rank")
	tot.Append(workbook.Text("lowest total cost of a ranked scenario"+unitSuffix(cur)),
		costAtRank("IFERROR(INDEX("+cost+",MATCH(1,"+rank+",0)),\"\")", 1))
	tot.Append(workbook.Text("highest total cost of a ranked scenario"+unitSuffix(cur)),
		costAtRank("IFERROR(INDEX("+cost+",MATCH(MAX("+rank+"),"+rank+",0)),\"\")", maxRank))
	// Said with the figures, as in compare.md and every row's safety cell.
	tot.Append(workbook.Text("planning aid"), workbook.Text(route.PlanningAid))
	return wb.Bytes()
}

func unitSuffix(cur string) string {
	if cur == "" {
		return ""
	}
	return " (" + cur + ")"
}

// axisCell is an override's value (as written, see Override.Value) as a typed cell: a number
// for a setting of a numeric type, TRUE or FALSE for a boolean one, text for any other (file
// names, rates, "~" for null) and for a value that does not read as its type; blank when the
// scenario keeps the base plan's value.
func axisCell(key, value string) workbook.Cell {
	if value == "" {
		return workbook.Blank()
	}
	st, ok := settings()[key]
	if !ok || st.path {
		return workbook.Text(value)
	}
	typ := st.typ
	for typ.Kind() == reflect.Pointer {
		typ = typ.Elem()
	}
	switch typ.Kind() {
	case reflect.Bool:
		if b, err := strconv.ParseBool(value); err == nil {
			return workbook.Bool(b)
		}
	case reflect.Int, reflect.Int8, reflect.Int16, reflect.Int32, reflect.Int64,
		reflect.Uint, reflect.Uint8, reflect.Uint16, reflect.Uint32, reflect.Uint64, reflect.Float32, reflect.Float64:
		if x, err := strconv.ParseFloat(value, 64); err == nil && !math.IsInf(x, 0) && !math.IsNaN(x) {
			return workbook.Number(x, -1)
		}
	}
	return workbook.Text(value)
}

func textOrBlank(s string) workbook.Cell {
	if s == "" {
		return workbook.Blank()
	}
	return workbook.Text(s)
}

// tally counts the scenarios by status: ok, with infeasible legs, failed (any other).
// Of the ok ones, incomplete counts those whose totals leave out items not priced.
// okSets is the number of sets the ok scenarios are ranked in (RankSets, okOnly).
type tally struct{ ok, infeasible, failed, incomplete, okSets int }

func tallyOf(js []judged) tally {
	var n tally
	rows := make([]Row, len(js))
	for i, j := range js {
		rows[i] = *j.Row
	}
	n.okSets = RankSets(rows, true)
	for _, j := range js {
		switch j.Status {
		case StatusOK:
			n.ok++
			if j.Incomplete() {
				n.incomplete++
			}
		case StatusInfeasible:
			n.infeasible++
		default:
			n.failed++
		}
	}
	return n
}

func compareMD(js []judged, keys []string, cur string, fixed []column) []byte {
	var b bytes.Buffer
	var front []string
	without := map[string][]string{} // rank group (Row.group) → its Pareto optimal scenarios
	apart := map[string]string{}     // rank group → its Row.Apart
	var exclusions []string
	for _, j := range js {
		switch {
		case !j.pareto:
		case j.RankedApart():
			k := j.group()
			if _, seen := without[k]; !seen {
				exclusions = append(exclusions, k)
				apart[k] = j.ApartIn(j.set)
			}
			without[k] = append(without[k], escape.MarkdownCode(j.ID))
		default:
			front = append(front, escape.MarkdownCode(j.ID))
		}
	}
	n := tallyOf(js)
	fmt.Fprintf(&b, "# Sweep comparison\n\n")
	fmt.Fprintf(&b, "%s Each scenario's safety cautions are listed below the table.\n\n", route.PlanningAid)
	fmt.Fprintf(&b, "%s: %d ok, %d with infeasible legs, %d failed.", output.Counted(len(js), "scenario", "scenarios"), n.ok, n.infeasible, n.failed)
	if cur != "" {
		fmt.Fprintf(&b, " Money in %s.", escape.Markdown(cur))
	}
	if slices.ContainsFunc(js, func(j judged) bool { return j.Status == StatusInfeasible && j.Ranked() }) {
		fmt.Fprintf(&b, "\nRank and Pareto flag compare scenarios whose totals cover the same legs and items: the ok ones (every leg feasible)\n")
		fmt.Fprintf(&b, "pricing every line together, and each set below apart; Pareto over total cost, worst loss margin (higher is better) and links lacking a diverse route.\n")
	} else {
		fmt.Fprintf(&b, "\nRank and Pareto flag consider only ok scenarios (every leg feasible), those whose totals price every\n")
		fmt.Fprintf(&b, "line together; Pareto over total cost, worst loss margin (higher is better) and links lacking a diverse route.\n")
	}
	unservedMD(&b, js, n)
	switch {
	case n.incomplete > 0 && n.okSets > 1:
		why := "its total leaves out items its price book does not price"
		if n.incomplete > 1 {
			why = "their totals leave out items their price books do not price"
		}
		fmt.Fprintf(&b, "%s ranked apart: %s; each is ranked among those leaving out the same items, never against a complete total (rank says \"1 of 3 without …\", pareto \"yes (without …)\"; see the notes).\n",
			output.Counted(n.incomplete, "ok scenario", "ok scenarios"), why)
	case n.incomplete > 0:
		fmt.Fprintf(&b, "%s: every total leaves out the same items, which the price books do not price; they are ranked together on those totals (rank says \"1 of 3 without …\", pareto \"yes (without …)\"; see the notes).\n",
			output.Counted(n.incomplete, "ok scenario", "ok scenarios"))
	}
	b.WriteString("\n")
	if len(front) > 0 {
		fmt.Fprintf(&b, "Pareto optimal: %s.\n\n", strings.Join(front, ", "))
	}
	for _, k := range exclusions {
		fmt.Fprintf(&b, "Pareto optimal among scenarios %s: %s.\n\n", escape.Markdown(apart[k]), strings.Join(without[k], ", "))
	}
	if c := cheapestMD(js); c != "" {
		fmt.Fprintf(&b, "Cheapest ok scenario: %s.\n\n", c)
	}
	gapMD(&b, js)
	head := []string{"#", "id", "case"}
	for _, k := range keys {
		head = append(head, escape.Markdown(k))
	}
	align := []string{"--:", "---", "---"}
	for range keys {
		align = append(align, "---")
	}
	var cols []column
	for _, c := range mdOrder(fixed) {
		if c.csv == "error" || c.csv == "currency" || c.csv == "note" || c.csv == "safety" || c.csv == "budget_feasible_legs_only" || c.csv == "unserved_legs" {
			continue // failures, notes, cautions and unserved legs are listed below the table; the currency is said above; the budget's scope beside over budget
		}
		if c.csv == "total_cost_served_legs_only" && n.infeasible == 0 {
			continue // no row has one
		}
		cols = append(cols, c)
		h := c.human
		if u := unitOf(c, cur); u != "" {
			h += " (" + u + ")"
		}
		head = append(head, escape.Markdown(h))
		if c.csv == "status" || c.csv == "media_mix" || c.csv == "pareto" {
			align = append(align, "---")
		} else {
			align = append(align, "--:")
		}
	}
	mdRow(&b, head)
	mdRow(&b, align)
	for _, j := range js {
		rec := []string{strconv.Itoa(j.Index), escape.MarkdownCode(j.ID), escape.Markdown(j.Case)}
		for _, k := range keys {
			rec = append(rec, escape.Markdown(j.value(k)))
		}
		for _, c := range cols {
			rec = append(rec, escape.Markdown(c.mdText(j)))
		}
		mdRow(&b, rec)
	}
	if noted := slices.ContainsFunc(js, func(j judged) bool { return j.Note != "" }); noted {
		fmt.Fprintf(&b, "\n## Notes\n\n")
		for _, j := range js {
			if j.Note != "" {
				fmt.Fprintf(&b, "- %s: %s\n", escape.MarkdownCode(j.ID), escape.Markdown(j.Note))
			}
		}
	}
	unservedSetsMD(&b, js)
	safetyMD(&b, js)
	if n.failed > 0 {
		fmt.Fprintf(&b, "\n## Failed scenarios\n\n")
		for _, j := range js {
			if j.Status == StatusFailed {
				fmt.Fprintf(&b, "- %s: %s\n", escape.MarkdownCode(j.ID), escape.Markdown(oneLine(j.Error)))
			}
		}
	}
	return b.Bytes()
}

// SetLabel begins the line of the n-th (0-based) of sets sets of unserved legs below the
// comparison's table: "set 2: " when there are several, which the rank and pareto cells
// name (RankText), "" for the only one.
func SetLabel(n, sets int) string {
	if sets < 2 {
		return ""
	}
	return "set " + strconv.Itoa(n+1) + ": "
}

// mdOrder is the columns in compare.md's order: the total of the served legs only beside the
// total cost, which is blank where it is set (compare.csv and compare.xlsx keep it after the
// columns of earlier versions).
func mdOrder(fixed []column) []column {
	var served column
	for _, c := range fixed {
		if c.csv == "total_cost_served_legs_only" {
			served = c
		}
	}
	out := make([]column, 0, len(fixed))
	for _, c := range fixed {
		switch c.csv {
		case "total_cost_served_legs_only":
		case "total_cost":
			out = append(out, c, served)
		default:
			out = append(out, c)
		}
	}
	return out
}

// unservedMD says, above compare.md's table, how scenarios with infeasible legs are ranked,
// how many legs some of them leave unserved (named below the table, unservedSetsMD) and which
// legs every planned scenario leaves unserved: a leg that every planned scenario leaves unserved (a diverse route the campus does not
// have, say) is no alternative's fault, and ranking the scenarios among those leaving the same
// legs unserved keeps the rest of the comparison (tester 10's finding 5).
func unservedMD(b *bytes.Buffer, js []judged, n tally) {
	if n.infeasible == 0 {
		return
	}
	planned, ranked := 0, 0
	count := map[string]int{}
	for _, j := range js {
		if j.Status == StatusFailed {
			continue
		}
		planned++
		if j.Status == StatusInfeasible && j.Ranked() {
			ranked++
		}
		for _, l := range j.Unserved {
			count[l]++
		}
	}
	if ranked > 0 {
		fmt.Fprintf(b, "%s with infeasible legs ranked apart: each is ranked and Pareto-judged among those leaving the same legs unserved (and the same items unpriced), never against a scenario serving more (rank says \"1 of 4 leaving 31 legs unserved\", pareto \"yes (leaving 31 legs unserved)\", with the number of the set below the table, \"leaving the 31 legs of set 1 unserved\", when there are several sets); its total leaves out the legs it cannot serve, so its total cost is blank and the total of the legs it serves is in its own column (total cost of the served legs only), not to be sorted with complete totals.\n",
			output.Counted(ranked, "scenario", "scenarios"))
	}
	if left := n.infeasible - ranked; left > 0 {
		rows := "their rows do"
		if left == 1 {
			rows = "its row does"
		}
		fmt.Fprintf(b, "%s with infeasible legs not ranked: %s not name the legs (written by an earlier spanwright; plan again to rank).\n",
			output.Counted(left, "scenario", "scenarios"), rows)
	}
	if len(count) == 0 {
		return
	}
	legs := slices.Collect(maps.Keys(count))
	slices.SortFunc(legs, func(a, b string) int { return cmp.Or(count[b]-count[a], strings.Compare(a, b)) })
	var every []string
	some := 0 // legs some planned scenarios serve
	for _, l := range legs {
		if count[l] == planned {
			every = append(every, escape.MarkdownCode(l))
		} else {
			some++
		}
	}
	if len(every) > 0 {
		it := "it"
		if len(every) > 1 {
			it = "them"
		}
		fmt.Fprintf(b, "Infeasible in every planned scenario, so no alternative of this sweep serves %s: %s.", it, strings.Join(every, ", "))
		if some > 0 {
			b.WriteString(" ")
		} else {
			b.WriteString(" Each scenario folder's links.csv gives the reason.\n")
		}
	}
	if some > 0 {
		fmt.Fprintf(b, "%s left unserved by some of the scenarios, named below the table (Legs left unserved), each set with the scenarios that leave it. Each scenario folder's links.csv gives the reason.\n", output.Counted(some, "leg", "legs"))
	}
}

// unservedSetsMD names, below compare.md's table, the legs the scenarios leave unserved, once:
// each set (UnservedSets) with the scenarios that leave it, so that the table's rank and
// pareto cells only count them (tester 15 F7).
func unservedSetsMD(b *bytes.Buffer, js []judged) {
	rows := make([]Row, len(js))
	for i, j := range js {
		rows[i] = *j.Row
	}
	sets := UnservedSets(rows)
	if len(sets) == 0 {
		return
	}
	fmt.Fprintf(b, "\n## Legs left unserved\n\n")
	for n, s := range sets {
		ids := make([]string, len(s.IDs))
		for i, id := range s.IDs {
			ids[i] = escape.MarkdownCode(id)
		}
		legs := make([]string, len(s.Legs))
		for i, l := range s.Legs {
			legs[i] = escape.MarkdownCode(l)
		}
		fmt.Fprintf(b, "- %s%s: %s: %s\n", SetLabel(n, len(sets)), strings.Join(ids, ", "), output.Counted(len(legs), "leg", "legs"), strings.Join(legs, ", "))
	}
}

// gapMD says, below the Pareto lines, how far the comparison's totals are proved: each row's
// gap to its lower bound, and which rows were warm-started (started_from), searched with fewer
// moves than a plan from scratch, or that none was, so two totals closer than their gaps may trade places under a better
// search (tester 10's finding 10).
func gapMD(b *bytes.Buffer, js []judged) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, j := range js {
		if bounded(j) && j.GapPct != nil {
			lo, hi = min(lo, *j.GapPct), max(hi, *j.GapPct)
		}
	}
	if math.IsInf(lo, 1) {
		return
	}
	span := output.PctText(lo) + " %"
	if output.PctText(hi) != output.PctText(lo) {
		span = output.PctText(lo) + " to " + output.PctText(hi) + " %"
	}
	fmt.Fprintf(b, "How far the totals are proved: no plan of a row's legs costs less than its proved lower bound, and a row's gap to the bound (here %s) is how far above it the plan found is, in the optimizer's objective: a better plan of the same legs could save at most that share. ", span)
	if slices.ContainsFunc(js, func(j judged) bool { return planned(j) && j.StartedFrom != "" }) {
		b.WriteString("A row whose \"search started from\" names a base scenario began its search from that scenario's routes, searched with fewer moves than `spanwright plan` searches a plan from scratch (no second start, no perturbation phase: README, \"Warm start\"), so it may come out cheaper or dearer than the plan made alone, within that gap; a sweep starts a scenario so only on a campus too large for that search, and a row with the column blank is planned from scratch, as `spanwright plan` plans it alone. ")
	} else {
		b.WriteString("Every row is planned from scratch, as `spanwright plan` plans it alone (\"search started from\" is blank): none depends on which scenario is the base. ")
	}
	b.WriteString("Two totals that differ by less than their gaps are not proved to differ by the alternatives alone: a better search could put them in the other order.\n\n")
}

// safetyMD lists, below compare.md's table, the safety cautions each planned scenario's work
// calls for (Row.Cautions), scenarios with the same cautions on one line, in index order of
// their first; what calls for each is in the scenario's summary.json (cautions) and report.
func safetyMD(b *bytes.Buffer, js []judged) {
	var sets []string
	ids := map[string][]string{}
	for _, j := range js {
		if !planned(j) || j.Cautions == nil {
			continue
		}
		k := strings.Join(j.Cautions, "\x00")
		if _, seen := ids[k]; !seen {
			sets = append(sets, k)
		}
		ids[k] = append(ids[k], escape.MarkdownCode(j.ID))
	}
	if len(sets) == 0 {
		return
	}
	fmt.Fprintf(b, "\n## Safety cautions\n\n")
	for _, k := range sets {
		what := "no safety caution"
		if k != "" {
			titles := strings.Split(k, "\x00")
			what = output.Counted(len(titles), "caution", "cautions") + ": " + escape.Markdown(strings.ToLower(strings.Join(titles, ", ")))
		}
		fmt.Fprintf(b, "- %s: %s\n", strings.Join(ids[k], ", "), what)
	}
	fmt.Fprintf(b, "\nWhat in each plan calls for a caution is in its folder's summary.json (cautions); what to do, in its report.html (Safety, written with --full). %s\n", escape.Markdown(route.CautionsClosing))
}

// cheapestMD names compare.md's cheapest ok scenarios pricing every line (Row.Cheapest),
// every one when several tie (TiedText), with their total; "" when none is ranked so.
func cheapestMD(js []judged) string {
	var names []string
	var cents int64
	for _, j := range js {
		if j.Cheapest(j.rank) {
			names = append(names, "#"+strconv.Itoa(j.Index)+" "+escape.MarkdownCode(j.ID))
			cents = j.TotalCents
		}
	}
	if len(names) == 0 {
		return ""
	}
	return TiedText(names) + " at " + money(cents)
}

// Cheapest reports whether a row of cost rank rank is among the sweep's cheapest: rank 1
// among the ok scenarios that price every line. Several rows of one total all are.
func (r *Row) Cheapest(rank int) bool { return rank == 1 && !r.RankedApart() }

// TiedText names the scenarios of one rank together: "a", "a and b", "a, b and c", and for
// more than one "(tied: N scenarios at the same total)" after them, so that a headline never
// names one of several equal rows as the answer (tester 12's finding 10).
func TiedText(names []string) string {
	switch len(names) {
	case 0:
		return ""
	case 1:
		return names[0]
	}
	return strings.Join(names[:len(names)-1], ", ") + " and " + names[len(names)-1] +
		fmt.Sprintf(" (tied: %d scenarios at the same total)", len(names))
}

// mdRow writes one table row of cells already in Markdown (see escape.Markdown).
func mdRow(b *bytes.Buffer, cells []string) {
	b.WriteString("|")
	for _, c := range cells {
		b.WriteString(" ")
		b.WriteString(c)
		b.WriteString(" |")
	}
	b.WriteString("\n")
}
