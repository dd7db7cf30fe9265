package report

import (
	"regexp"
	"strings"
	"testing"

	"spanwright/route/sweep"
)

func margin(x float64) *float64 { return &x }

func ip(c int64) *int64 { return &c }

// sweepRows is a small comparison: three ok scenarios of which two are Pareto-optimal
// (cheapest; best margin), one ok without fibre, one infeasible, one failed, and ids and
// values that hold markup.
func sweepRows() []sweep.Row {
	return []sweep.Row{
		{Index: 0, ID: "cheap-1", Set: [][2]string{{"hub", "ADM"}}, Status: sweep.StatusOK, Currency: "USD",
			TotalCents: 100_000_00, BudgetCents: ip(150_000_00), OverBudgetCents: ip(-50_000_00), WorstMarginDB: margin(2.0), MediaMix: "os2:4"},
		{Index: 1, ID: "safe-2", Set: [][2]string{{"hub", "LIB"}}, Status: sweep.StatusOK, Currency: "USD",
			TotalCents: 120_000_00, BudgetCents: ip(150_000_00), OverBudgetCents: ip(-30_000_00), WorstMarginDB: margin(4.5), MediaMix: "os2:4"},
		{Index: 2, ID: "worse-3", Set: [][2]string{{"hub", "ENG"}}, Status: sweep.StatusOK, Currency: "USD",
			TotalCents: 130_000_00, BudgetCents: ip(150_000_00), OverBudgetCents: ip(-20_000_00), WorstMarginDB: margin(3.0), MediaMix: "om4:1 os2:3"},
		{Index: 3, ID: "copper-4", Case: "<i>copper</i>", Status: sweep.StatusOK, Currency: "USD",
			TotalCents: 140_000_00, BudgetCents: ip(150_000_00), OverBudgetCents: ip(-10_000_00), MediaMix: "cat6a:4"},
		{Index: 4, ID: "holes-5", Set: [][2]string{{"hub", `"><script>x()</script>`}}, Status: sweep.StatusInfeasible, Currency: "USD",
			TotalCents: 90_000_00, InfeasibleLegs: 2, WorstMarginDB: margin(1.5)},
		{Index: 5, ID: "bad-6", Case: "bad", Status: sweep.StatusFailed, Error: "hub: unknown building \"<NOWHERE>\""},
	}
}

func TestSweepReport(t *testing.T) {
	c := sweep.Judge(sweepRows(), []string{"hub"})
	b, err := Sweep(c, SweepOptions{Title: "alternatives <1>.yaml"})
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	// Pareto against the definition (cost lower, margin higher, no more missing diverse
	// routes): cheap-1 and safe-2; copper-4 has no fibre, so no margin to lose, and counts
	// as the best margin (sweep.Judge's rule): it is Pareto too.
	pareto := map[string]bool{}
	for _, j := range c.Rows {
		if j.Pareto {
			pareto[j.ID] = true
		}
	}
	if len(pareto) != 3 || !pareto["cheap-1"] || !pareto["safe-2"] || !pareto["copper-4"] {
		t.Fatalf("Pareto set %v, want cheap-1, safe-2 and copper-4", pareto)
	}
	points := regexp.MustCompile(`<circle [^>]*class="pt (pt-[a-z]+)" data-point="scenario"`).FindAllStringSubmatch(html, -1)
	count := map[string]int{}
	for _, p := range points {
		count[p[1]]++
	}
	// Every planned scenario is a point (the failed one is not); Pareto points are marked.
	if len(points) != 5 || count["pt-pareto"] != 3 || count["pt-infeasible"] != 1 || count["pt-ok"] != 1 {
		t.Errorf("points %v, want 5: 3 Pareto, 1 infeasible, 1 other", count)
	}
	for _, want := range []string{"#0</text>", "#1</text>", "#3</text>", ">no fibre</text>"} {
		if !strings.Contains(html, want) {
			t.Errorf("scatter lacks %q", want)
		}
	}
	if n := strings.Count(html, "<tr class=\""); n != 6 {
		t.Errorf("%d table rows, want 6", n)
	}
	if n := strings.Count(html, "<script>"); n != 1 {
		t.Errorf("%d scripts, want the one inline sorter", n)
	}
	for _, bad := range []string{"<script>x()", "<i>copper</i>", "<NOWHERE>", "alternatives <1>", "http:", "https:"} {
		if strings.Contains(html, bad) {
			t.Errorf("sweep report holds %q", bad)
		}
	}
	for _, want := range []string{"&lt;i&gt;copper&lt;/i&gt;", "&#34;&gt;&lt;script&gt;x()&lt;/script&gt;", "&lt;NOWHERE&gt;",
		`<a href="cheap-1/">cheap-1</a>`, `data-v="10000000"`, "100,000.00", "@page { size: A3;"} {
		if !strings.Contains(html, want) {
			t.Errorf("sweep report lacks %q", want)
		}
	}
	// The failed scenario has no report to link to.
	if strings.Contains(html, `href="bad-6/`) {
		t.Error("failed scenario linked")
	}
	again, _ := Sweep(sweep.Judge(sweepRows(), []string{"hub"}), SweepOptions{Title: "alternatives <1>.yaml"})
	if string(again) != html {
		t.Error("two renders differ")
	}
}

func TestSweepReportEmpty(t *testing.T) {
	rows := []sweep.Row{{Index: 0, ID: "bad-1", Status: sweep.StatusFailed, Error: "no"}}
	b, err := Sweep(sweep.Judge(rows, nil), SweepOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(b), "No scenario was planned.") {
		t.Error("empty plot not said")
	}
}

func TestAxis(t *testing.T) {
	lo, hi, ticks := axis([]float64{100000, 140000})
	if lo >= 100000 || hi <= 140000 {
		t.Errorf("range %g..%g does not pad 100000..140000", lo, hi)
	}
	if len(ticks) < 3 || len(ticks) > 11 {
		t.Errorf("%d ticks", len(ticks))
	}
	for i := 1; i < len(ticks); i++ {
		if d := ticks[i] - ticks[i-1]; d != ticks[1]-ticks[0] {
			t.Errorf("uneven ticks %v", ticks)
		}
	}
	if _, _, one := axis([]float64{2.25, 2.25}); len(one) < 2 {
		t.Errorf("a single value gets ticks %v", one)
	}
}

// TestSweepReportHidden renders a comparison whose ids, case names and override values hold
// bidi controls and terminal controls: each must show as its code point in the page's text
// and attributes, never raw, and a scenario's link must still reach its folder.
func TestSweepReportHidden(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name, text, shown string
	}{
		// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
		{"override", "B\u202Eevil", "B&lt;U+202E&gt;evil"},
		{"isolate", "\u2067x\u2069", "&lt;U+2067&gt;x&lt;U+2069&gt;"},
		{"mark", "a\u200Fb", "a&lt;U+200F&gt;b"},
		// HTML Living Standard §13.1.4: no control characters in text; ECMA-48 for ESC and CSI
		{"escape", "\x1b[2Jx", "&lt;U+001B&gt;[2Jx"},
		{"C1 control", "a\u009bb", "a&lt;U+009B&gt;b"},
	}
	var rows []sweep.Row
	for i, tc := range cases {
		rows = append(rows, sweep.Row{Index: i, ID: tc.text + "-id", Case: tc.text, Set: [][2]string{{"hub", tc.text}},
			Status: sweep.StatusOK, Currency: "USD", TotalCents: int64(100 + i), WorstMarginDB: margin(1)})
	}
	b, err := Sweep(sweep.Judge(rows, []string{"hub"}), SweepOptions{Title: "hidden \u202E title"})
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if strings.Contains(html, tc.text) {
				t.Errorf("%s: the page holds %q raw", tc.name, tc.text)
			}
			// three cells (id, case, hub) and the point's title
			if n := strings.Count(html, tc.shown); n < 3 {
				t.Errorf("%s: %q shown %d times, want at least 3", tc.name, tc.shown, n)
			}
		})
	}
	// html/template percent-encodes a link (RFC 3986): U+202E is E2 80 AE in UTF-8
	if !strings.Contains(html, `href="B%e2%80%aeevil-id/`) && !strings.Contains(html, `href="B%E2%80%AEevil-id/`) {
		t.Errorf("the link to the scenario folder is not percent-encoded:\n%s", html)
	}
	if !strings.Contains(html, "<title>Sweep comparison: hidden &lt;U+202E&gt; title</title>") {
		t.Error("the title does not show its bidi control")
	}
}

// TestSweepReportRanksUnserved: scenarios with infeasible legs are ranked among those leaving
// the same legs unserved (tester 10's finding 5); the report counts them, puts the rank in the
// point's tooltip, and never calls one the cheapest: its total leaves out the legs it cannot
// serve (common practice, no published source: bids are compared on the same scope). Its
// total cost cell is blank, the total of its served legs in a column of its own, its rank cell
// counts the legs and the legs are named once, below the table (tester 15 F7).
func TestSweepReportRanksUnserved(t *testing.T) {
	t.Parallel()
	unserved := []string{"ADM-LIB/diverse"}
	rows := []sweep.Row{
		{Index: 0, ID: "ok-dear", Status: sweep.StatusOK, Currency: "USD", TotalCents: 500_000_00, WorstMarginDB: margin(2)},
		{Index: 1, ID: "short-cheap", Status: sweep.StatusInfeasible, Currency: "USD", TotalCents: 400_000_00, InfeasibleLegs: 1, Unserved: unserved, WorstMarginDB: margin(2)},
		{Index: 2, ID: "short-dear", Status: sweep.StatusInfeasible, Currency: "USD", TotalCents: 450_000_00, InfeasibleLegs: 1, Unserved: unserved, WorstMarginDB: margin(1)},
	}
	b, err := Sweep(sweep.Judge(rows, nil), SweepOptions{})
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	for _, want := range []string{"2 with infeasible legs ranked apart, each among those leaving the same legs unserved",
		"cheapest ok: #0 ok-dear at 500,000.00 USD", "ranked apart: 1 of 2 leaving 1 leg unserved", "ranked apart: 2 of 2 leaving 1 leg unserved",
		"400,000.00 USD for the served legs only",
		`<td data-v="infeasible">infeasible</td><td data-v="" class="n"></td><td data-v="40000000" class="n">400,000.00</td>`,
		`<td data-v="1" class="n">1 of 2 leaving 1 leg unserved</td>`,
		"<h3>Legs left unserved</h3>", "<li>short-cheap, short-dear: 1 leg: ADM-LIB/diverse</li>"} {
		if !strings.Contains(html, want) {
			t.Errorf("sweep report lacks %q", want)
		}
	}
}

// TestSweepReportTiesAndCautions: the headline names every cheapest ok scenario of a tie
// (tester 12's finding 10); the table shows where each row's search began, its handholes to
// build and its safety cautions; and the page's sentence on where the cautions are read is
// true with and without --full (finding 2: without it, no report.html exists to link).
func TestSweepReportTiesAndCautions(t *testing.T) {
	rows := sweepRows()
	rows[1].TotalCents = rows[0].TotalCents
	hh := 4
	rows[0].HandholesToBuild, rows[0].Cautions = &hh, []string{"Buried utilities", "Laser light"}
	rows[1].StartedFrom = "cheap-1"
	page := func(rows []sweep.Row) string {
		b, err := Sweep(sweep.Judge(rows, []string{"hub"}), SweepOptions{})
		if err != nil {
			t.Fatal(err)
		}
		return string(b)
	}
	html := page(rows)
	for _, want := range []string{
		"cheapest ok: #0 cheap-1 and #1 safe-2 (tied: 2 scenarios at the same total) at 100,000.00 USD",
		`<td data-v="2: buried utilities, laser light">2: buried utilities, laser light</td>`,
		`<td data-v="cheap-1">cheap-1</td>`,
		"this sweep wrote no report.html: run it with --full",
	} {
		if !strings.Contains(html, want) {
			t.Errorf("sweep report lacks %q", want)
		}
	}
	if strings.Contains(html, "linked from its id) says") {
		t.Error("without --full the page says each id links to a report")
	}
	for i := range rows {
		if rows[i].Status != sweep.StatusFailed {
			rows[i].Report = "report.html"
		}
	}
	if html := page(rows); !strings.Contains(html, "each scenario's own report (linked from its id) says what calls for each and what to do") {
		t.Error("with --full the page does not point to each scenario's report")
	}
}

// TestSweepReportSubtotalsAndBudgetScope: compare.html has the subtotal and markup columns
// compare.csv has, which add up to the total (review 17 F8, tester 12 F10: the breakdown to
// trace why one alternative beats another), blank for a row without a bill; and says beside an
// infeasible row's over budget that it covers the feasible legs only (review 17 F3).
func TestSweepReportSubtotalsAndBudgetScope(t *testing.T) {
	rows := sweepRows()
	rows[0].CostByCategory = map[string]int64{"material": 40_000_00, "labour": 30_000_00, "construction": 20_000_00, "optics": 5_000_00, "bid items": 1_000_00}
	rows[0].ContingencyCents, rows[0].OverheadCents, rows[0].TaxCents = 2_000_00, 1_500_00, 500_00
	rows[4].BudgetCents, rows[4].OverBudgetCents, rows[4].BudgetFeasibleOnly = ip(150_000_00), ip(-60_000_00), true
	b, err := Sweep(sweep.Judge(rows, []string{"hub"}), SweepOptions{})
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	for _, want := range []string{
		">material (USD)<", ">labour (USD)<", ">construction (USD)<", ">optics (USD)<", ">bid items (USD)<",
		">contingency (USD)<", ">overhead (USD)<", ">tax (USD)<",
		`<td data-v="4000000" class="n">40,000.00</td>`, `<td data-v="150000" class="n">1,500.00</td>`,
		`<td data-v="-6000000" class="n">−60,000.00 (feasible legs only)</td>`,
	} {
		if !strings.Contains(html, want) {
			t.Errorf("sweep report lacks %q", want)
		}
	}
	if strings.Contains(html, "50,000.00 (feasible") {
		t.Error("an ok row's over budget is said to cover the feasible legs only")
	}
}
