package sweep

import (
	"bytes"
	"encoding/csv"
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/output"
	"spanwright/route/workbook"
)

func fp(x float64) *float64 { return &x }

// dominates is the Pareto dominance of the definition, written plainly: a is no worse than b
// on every objective and better on one.
func dominates(a, b Row) bool {
	m := func(r Row) float64 {
		if r.WorstMarginDB == nil {
			return math.Inf(1)
		}
		return *r.WorstMarginDB
	}
	noWorse := a.TotalCents <= b.TotalCents && m(a) >= m(b) && a.DiverseMissing <= b.DiverseMissing
	better := a.TotalCents < b.TotalCents || m(a) > m(b) || a.DiverseMissing < b.DiverseMissing
	return noWorse && better
}

func TestJudge(t *testing.T) {
	t.Parallel()
	rows := []Row{
		{Index: 0, Status: StatusOK, TotalCents: 100, WorstMarginDB: fp(1), DiverseMissing: 2},
		{Index: 1, Status: StatusOK, TotalCents: 200, WorstMarginDB: fp(3), DiverseMissing: 2},
		{Index: 2, Status: StatusOK, TotalCents: 200, WorstMarginDB: fp(2), DiverseMissing: 2}, // dominated by 1
		{Index: 3, Status: StatusOK, TotalCents: 300, WorstMarginDB: fp(0.5), DiverseMissing: 0},
		{Index: 4, Status: StatusOK, TotalCents: 100, WorstMarginDB: fp(1), DiverseMissing: 2}, // equal to 0
		{Index: 5, Status: StatusInfeasible, TotalCents: 10, WorstMarginDB: fp(9)},
		{Index: 6, Status: StatusFailed},
		{Index: 7, Status: StatusOK, TotalCents: 400, DiverseMissing: 0},                       // copper only: no margin to lose
		{Index: 8, Status: StatusOK, TotalCents: 500, WorstMarginDB: fp(5), DiverseMissing: 0}, // dominated by 7
	}
	js := judge(rows)
	wantRank := []int{1, 3, 3, 5, 1, 0, 0, 6, 7} // equal costs share a rank, the next skips
	wantPareto := []bool{true, true, false, true, true, false, false, true, false}
	for i, j := range js {
		if j.rank != wantRank[i] || j.pareto != wantPareto[i] {
			t.Errorf("row %d: got rank %d pareto %v, want %d %v", i, j.rank, j.pareto, wantRank[i], wantPareto[i])
		}
	}
}

// TestJudgeBruteForce checks the sorted Pareto sweep against the O(n²) definition on random
// tables with many ties.
func TestJudgeBruteForce(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 300; trial++ {
		n := 1 + rng.IntN(40)
		rows := make([]Row, n)
		for i := range rows {
			rows[i] = Row{Index: i, Status: StatusOK, TotalCents: int64(rng.IntN(6)) * 100, DiverseMissing: rng.IntN(3)}
			if rng.IntN(5) > 0 {
				rows[i].WorstMarginDB = fp(float64(rng.IntN(4)) / 2)
			}
			if rng.IntN(8) == 0 {
				rows[i].Status = StatusInfeasible
			}
		}
		js := judge(rows)
		for i := range rows {
			want := rows[i].Status == StatusOK
			for k := range rows {
				if rows[k].Status == StatusOK && dominates(rows[k], rows[i]) {
					want = false
				}
			}
			if js[i].pareto != want {
				t.Fatalf("trial %d row %d %+v: got pareto %v, want %v", trial, i, rows[i], js[i].pareto, want)
			}
			if rows[i].Status == StatusOK {
				cheaper := 0
				for k := range rows {
					if rows[k].Status == StatusOK && rows[k].TotalCents < rows[i].TotalCents {
						cheaper++
					}
				}
				if js[i].rank != cheaper+1 {
					t.Fatalf("trial %d row %d: got rank %d, want %d", trial, i, js[i].rank, cheaper+1)
				}
			}
		}
	}
}

func TestMoney(t *testing.T) {
	t.Parallel()
	cases := []struct {
		cents int64
		want  string
	}{{0, "0.00"}, {5, "0.05"}, {-5, "-0.05"}, {123456789, "1234567.89"}, {-100, "-1.00"}, {math.MaxInt64, "92233720368547758.07"}}
	for _, tc := range cases {
		t.Run(tc.want, func(t *testing.T) {
			if got := money(tc.cents); got != tc.want {
				t.Errorf("%d cents: got %q, want %q", tc.cents, got, tc.want)
			}
		})
	}
}

func ip(v int64) *int64 { return &v }

func TestCompareMarkdown(t *testing.T) {
	t.Parallel()
	rows := []Row{
		{Index: 0, ID: "a-1", Set: [][2]string{{"hub", "A|B"}}, Status: StatusOK, Currency: "EUR", TotalCents: 150, BudgetCents: ip(100), OverBudgetCents: ip(50), WorstMarginDB: fp(1.234), MediaMix: "os2:2",
			DiverseLinks: 2, DiverseSinglePoint: func() *int { n := 1; return &n }(), // one of two shares a point (tester 5, finding 10)
			ObjectiveCents: 120, LowerBoundCents: ip(100), GapPct: fp(4.4158)},
		{Index: 1, ID: "b-2", Case: "b", Status: StatusFailed, Error: "b-2/plan.yaml: hub: bad\nsecond line"},
	}
	files, err := Compare(rows, []string{"hub"}, "")
	if err != nil {
		t.Fatal(err)
	}
	var md, csvText string
	for _, f := range files {
		switch f.Name {
		case CompareMD:
			md = string(f.Data)
		case CompareCSV:
			csvText = string(f.Data)
		}
	}
	for _, want := range []string{
		"2 scenarios: 1 ok, 0 with infeasible legs, 1 failed. Money in EUR.",
		"Pareto optimal: `a-1`.",
		"| 0 | `a-1` |  | A\\|B | ok | 1.50 | 1.00 | 0.50 | 0 | 1.23 | 0.0 | 2 | 1 | 0 | os2:2 | 1 | yes | 0 |",
		"- `b-2`: b-2/plan.yaml: hub: bad; second line",
		"| total cost (EUR) |",
	} {
		if !strings.Contains(md, want) {
			t.Errorf("compare.md lacks %q:\n%s", want, md)
		}
	}
	// The optimizer's objective, bound and gap come last (objective, lower_bound, gap_pct):
	// the gap in percent, as summary.json has it in compare.csv (four decimals) and as the
	// terminal prints it in compare.md (output.PctText).
	if !strings.Contains(csvText, ",objective,lower_bound,gap_pct,") ||
		!strings.Contains(csvText, "0,a-1,,A|B,ok,EUR,1.50,1.00,0.50,0,1.23,0.0,2,1,0,os2:2,1,yes,0,,,1.20,1.00,4.4158,"+
			",,,,,,,,,,,no,,,,,,,\n") { // a row without a start, a handhole count, subtotals, cautions or new construction by kind (as an earlier rows file's); its budget covers every leg; it serves every leg
		t.Errorf("compare.csv:\n%s", csvText)
	}
	if !strings.Contains(md, "| optimizer objective (EUR) | proved lower bound (EUR) | gap to the bound (%) |") ||
		!strings.Contains(md, "| 1.20 | 1.00 | 4.42 |") {
		t.Errorf("compare.md: objective, bound and gap:\n%s", md)
	}
}

// TestComparePayloads writes the comparison of rows whose ids, case names, override values
// and errors carry formula, markup, bidi and terminal payloads (ids as a merged rows file
// could hold them; a sweep file's ids are slugs): every file must show them as text.
func TestComparePayloads(t *testing.T) {
	t.Parallel()
	payloads := []struct {
		name, text string
		csv        string // the cell in compare.csv
		md         string // the cell in compare.md
		xlsx       string // the text in compare.xlsx
	}{
		// OWASP CSV injection guidance: = + - @ tab CR begin a formula
		{"equals", `=HYPERLINK("http://e.invalid","x")`, `'=HYPERLINK("http://e.invalid","x")`, `\=HYPERLINK("http://e.invalid","x")`, `=HYPERLINK("http://e.invalid","x")`},
		{"plus", "+1+2", "'+1+2", `\+1+2`, "+1+2"},
		{"minus", "-2+3", "'-2+3", `\-2+3`, "-2+3"},
		{"at", "@SUM(A1)", "'@SUM(A1)", "@SUM(A1)", "@SUM(A1)"},
		{"tab", "\t=1", "'\t=1", "\t\\=1", "\t=1"},
		// CommonMark 0.31 §2.4 and GitHub Flavored Markdown 0.29 §4.10 (pipes in cells)
		{"markup", "<script>alert(1)</script>|*x*`y`", "<script>alert(1)</script>|*x*`y`", "\\<script\\>alert(1)\\</script\\>\\|\\*x\\*\\`y\\`", "<script>alert(1)</script>|*x*`y`"},
		{"heading, then a list on a second line", "# one\n- two", "# one\n- two", `\# one - two`, "# one\n- two"},
		// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
		{"bidi", "B\u202Eevil\u2066", "B<U+202E>evil<U+2066>", `B\<U+202E\>evil\<U+2066\>`, "B<U+202E>evil<U+2066>"},
		// ECMA-48: ESC [ begins a terminal control sequence
		{"escape", "\x1b[31mRED", "<U+001B>[31mRED", `\<U+001B\>\[31mRED`, "<U+001B>[31mRED"},
	}
	var rows []Row
	for i, p := range payloads {
		rows = append(rows, Row{Index: i, ID: p.text, Case: p.text, Set: [][2]string{{"hub", p.text}}, Status: StatusOK,
			Currency: "EUR", TotalCents: int64(100 + i), WorstMarginDB: fp(-1.5), MediaMix: "os2:2"})
	}
	rows = append(rows, Row{Index: len(rows), ID: "failed-1", Status: StatusFailed, Error: "=1+2 <b>bad</b>\n\u202Eevil"})
	files, err := Compare(rows, []string{"hub"}, "")
	if err != nil {
		t.Fatal(err)
	}
	data := map[string][]byte{}
	for _, f := range files {
		data[f.Name] = f.Data
	}
	recs, err := csv.NewReader(bytes.NewReader(data[CompareCSV])).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	md := strings.Split(string(data[CompareMD]), "\n")
	var table []string
	for _, l := range md {
		if strings.HasPrefix(l, "|") {
			table = append(table, l)
		}
	}
	if len(table) != len(rows)+2 {
		t.Fatalf("compare.md: %d table lines, want %d:\n%s", len(table), len(rows)+2, data[CompareMD])
	}
	// GitHub Flavored Markdown 0.29 §4.10: a row's cells are split at pipes not escaped
	borders := func(l string) int {
		l = strings.ReplaceAll(l, `\\`, "")
		return strings.Count(l, "|") - strings.Count(l, `\|`)
	}
	for i, p := range payloads {
		t.Run(p.name, func(t *testing.T) {
			rec := recs[i+1]
			if rec[1] != p.csv || rec[2] != p.csv || rec[3] != p.csv {
				t.Errorf("%s: compare.csv id, case, hub: got %q, want %q each", p.name, rec[1:4], p.csv)
			}
			if got := rec[slices.Index(recs[0], "worst_margin_db")]; got != "-1.50" {
				t.Errorf("%s: compare.csv worst margin: got %q, want the number -1.50", p.name, got)
			}
			line := table[i+2]
			if borders(line) != borders(table[0]) {
				t.Errorf("%s: compare.md row has %d cell borders, the head %d: %s", p.name, borders(line), borders(table[0]), line)
			}
			if !strings.Contains(line, " | "+p.md+" | "+p.md+" | ") {
				t.Errorf("%s: compare.md row lacks the case and hub cells %q:\n%s", p.name, p.md, line)
			}
		})
	}
	if want := "- `failed-1`: \\=1+2 \\<b\\>bad\\</b\\>; \\<U+202E\\>evil\n"; !strings.Contains(string(data[CompareMD]), want) {
		t.Errorf("compare.md failure list lacks %q:\n%s", want, data[CompareMD])
	}

	// compare.xlsx keeps each payload a string, never a formula (ECMA-376 Part 1 §18.3.1.4).
	xl, err := workbook.Open(data[CompareXLSX])
	if err != nil {
		t.Fatal(err)
	}
	defer xl.Close()
	for i, p := range payloads {
		for col := 1; col <= 3; col++ {
			ref := workbook.Ref(col, i+2)
			v, _ := xl.Value("scenarios", ref)
			f, _ := xl.Formula("scenarios", ref)
			if v != p.xlsx || f != "" {
				t.Errorf("%s: compare.xlsx %s: got %q formula %q, want the text %q", p.name, ref, v, f, p.xlsx)
			}
		}
	}
}

// TestCompareTiesSubtotalsSafety: two ok rows of one total are both the cheapest, named
// together in compare.md (tester 12's finding 10); every row carries where its search began
// (started_from: tester 12's finding 8), its handholes to build, the bill's subtotals by
// category and markups as summary.json has them, adding up to the total, and its safety
// cautions with the planning-aid line (finding 2: ANSI/TIA-568 and NFPA 70 are the designer's,
// the authority having jurisdiction decides); compare.md says the planning-aid line above
// its table and lists the cautions below it.
func TestCompareTiesSubtotalsSafety(t *testing.T) {
	t.Parallel()
	hh := func(n int) *int { return &n }
	cats := map[string]int64{"material": 40000, "labour": 30000, "construction": 20000, "optics": 5000, "bid items": 1000}
	rows := []Row{
		{Index: 0, ID: "adm-1g", Status: StatusOK, Currency: "USD", TotalCents: 100000, MediaMix: "os2:2",
			HandholesToBuild: hh(3), CostByCategory: cats, ContingencyCents: 2000, OverheadCents: 1500, TaxCents: 500,
			Cautions: []string{"Buried utilities", "Laser light"}},
		{Index: 1, ID: "lib-1g", Status: StatusOK, Currency: "USD", TotalCents: 110000, MediaMix: "os2:2", StartedFrom: "adm-1g",
			HandholesToBuild: hh(0), CostByCategory: cats, ContingencyCents: 12000, OverheadCents: 1500, TaxCents: 500,
			Cautions: []string{}},
		{Index: 2, ID: "adm-1g-100g", Status: StatusOK, Currency: "USD", TotalCents: 100000, MediaMix: "os2:2",
			HandholesToBuild: hh(3), CostByCategory: cats, ContingencyCents: 2000, OverheadCents: 1500, TaxCents: 500,
			Cautions: []string{"Buried utilities", "Laser light"}},
	}
	files, err := Compare(rows, nil, "")
	if err != nil {
		t.Fatal(err)
	}
	data := map[string]string{}
	for _, f := range files {
		data[f.Name] = string(f.Data)
	}
	recs, err := csv.NewReader(strings.NewReader(data[CompareCSV])).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := func(r int, name string) string { return recs[r+1][slices.Index(recs[0], name)] }
	for r, row := range rows {
		sum := int64(0)
		for _, c := range []string{"cost_material", "cost_labour", "cost_construction", "cost_optics", "cost_bid_items", "contingency", "overhead", "tax"} {
			v, err := strconv.ParseFloat(col(r, c), 64)
			if err != nil {
				t.Fatalf("row %d: %s %q: %v", r, c, col(r, c), err)
			}
			sum += int64(math.Round(v * 100))
		}
		if sum != row.TotalCents {
			t.Errorf("row %d: subtotals and markups add up to %d cents, total %d", r, sum, row.TotalCents)
		}
		if col(r, "started_from") != row.StartedFrom || col(r, "handholes_to_build") != strconv.Itoa(*row.HandholesToBuild) {
			t.Errorf("row %d: started_from %q, handholes_to_build %q", r, col(r, "started_from"), col(r, "handholes_to_build"))
		}
		if !strings.HasSuffix(col(r, "safety"), "; "+safetyRider) || !strings.Contains(safetyRider, "authority having jurisdiction") {
			t.Errorf("row %d: safety %q lacks the planning-aid line", r, col(r, "safety"))
		}
	}
	if got := col(0, "safety"); !strings.HasPrefix(got, "2 safety cautions (buried utilities, laser light;") {
		t.Errorf("row 0: safety %q", got)
	}
	if got := col(1, "safety"); !strings.HasPrefix(got, "no safety caution;") {
		t.Errorf("row 1: safety %q", got)
	}
	md := data[CompareMD]
	for _, want := range []string{
		route.PlanningAid,
		"Cheapest ok scenario: #0 `adm-1g` and #2 `adm-1g-100g` (tied: 2 scenarios at the same total) at 1000.00.",
		"| search started from | handholes to build | material (USD) |",
		"- `adm-1g`, `adm-1g-100g`: 2 cautions: buried utilities, laser light",
		"- `lib-1g`: no safety caution",
	} {
		if !strings.Contains(md, want) {
			t.Errorf("compare.md lacks %q:\n%s", want, md)
		}
	}
}

// TestCompareBudgetFeasibleOnly: a row with infeasible legs and a budget compares a total that
// prices its feasible legs alone, so the comparison says its over_budget covers those only, as
// the plan's own outputs do (review 17 F3: "-338722.31" read as a plain "under by 338,722"):
// compare.md beside the figure, compare.csv and compare.xlsx in budget_feasible_legs_only (the
// number stays a number), and rows.jsonl keeps the flag for merge.
func TestCompareBudgetFeasibleOnly(t *testing.T) {
	t.Parallel()
	rows := []Row{
		{Index: 0, ID: "ok-0", Status: StatusOK, Currency: "USD", TotalCents: 500_000_00, BudgetCents: ip(600_000_00), OverBudgetCents: ip(-100_000_00)},
		{Index: 1, ID: "short-1", Status: StatusInfeasible, Currency: "USD", TotalCents: 261_277_69, BudgetCents: ip(600_000_00),
			OverBudgetCents: ip(-338_722_31), InfeasibleLegs: 10, Unserved: []string{"B03/primary"}, BudgetFeasibleOnly: true},
		{Index: 2, ID: "nobudget-2", Status: StatusOK, Currency: "USD", TotalCents: 400_000_00},
	}
	files, err := Compare(rows, nil, "")
	if err != nil {
		t.Fatal(err)
	}
	data := map[string][]byte{}
	for _, f := range files {
		data[f.Name] = f.Data
	}
	recs, err := csv.NewReader(bytes.NewReader(data[CompareCSV])).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := func(r int, name string) string { return recs[r+1][slices.Index(recs[0], name)] }
	for r, want := range []string{"no", "yes", ""} {
		if got := col(r, "budget_feasible_legs_only"); got != want {
			t.Errorf("compare.csv row %d: budget_feasible_legs_only %q, want %q", r, got, want)
		}
	}
	if got := col(1, "over_budget"); got != "-338722.31" {
		t.Errorf("compare.csv row 1: over_budget %q, want the number alone", got)
	}
	md := string(data[CompareMD])
	if !strings.Contains(md, "| \\-338722.31 (feasible legs only) |") || strings.Contains(md, "100000.00 (feasible") {
		t.Errorf("compare.md: the infeasible row's over budget is not said to cover the feasible legs only, or another row's is:\n%s", md)
	}
	xl, err := workbook.Open(data[CompareXLSX])
	if err != nil {
		t.Fatal(err)
	}
	defer xl.Close()
	sheet, err := xl.Rows("scenarios")
	if err != nil {
		t.Fatal(err)
	}
	at := slices.Index(sheet[0], "budget checks the feasible legs only")
	cell := func(r int) string { // trailing blank cells are not read back
		if at < len(sheet[r]) {
			return sheet[r][at]
		}
		return ""
	}
	if at < 0 || cell(2) != "1" || cell(1) != "0" || cell(3) != "" {
		t.Errorf("compare.xlsx: budget scope column at %d in %q", at, sheet[:3])
	}
	// rows.jsonl keeps it, and a row without it reads as before.
	enc, err := encodeRows(rowsHeader{Format: RowsFormat, Scenarios: len(rows)}, rows)
	if err != nil {
		t.Fatal(err)
	}
	_, back, err := decodeRows("rows.jsonl", bytes.NewReader(enc))
	if err != nil {
		t.Fatal(err)
	}
	if !back[1].BudgetFeasibleOnly || back[0].BudgetFeasibleOnly || !bytes.Contains(enc, []byte(`"budget_feasible_legs_only":true`)) {
		t.Errorf("rows.jsonl does not keep budget_feasible_legs_only:\n%s", enc)
	}
	// The row takes it from the scenario's summary (summary.json's budget_feasible_legs_only).
	var r Row
	r.fill(output.Summary{Legs: 31, Infeasible: 10, BudgetCents: ip(600_000_00), OverBudgetCents: ip(-338_722_31), BudgetFeasibleOnly: true})
	if !r.BudgetFeasibleOnly {
		t.Error("Row.fill drops the summary's budget_feasible_legs_only")
	}
}
