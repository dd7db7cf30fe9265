package output

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math/big"
	"regexp"
	"slices"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/routing"
	"spanwright/route/site"
	"spanwright/route/workbook"
	"strconv"
	"strings"
	"testing"
)

// TestLinksCSVPayloads plans a campus whose building and pathway ids are spreadsheet
// formulas, markup and hidden characters, then gives a leg a negative loss margin: in
// links.csv every id cell must be text a spreadsheet cannot run, and every number (the
// negative margin included) must stay a plain number.
func TestLinksCSVPayloads(t *testing.T) {
	t.Parallel()
	// The pull campus (estimate_test.go) with the ids of its buildings and duct replaced.
	ids := strings.NewReplacer(`"id":"A"`, `"id":"=A1+1"`, `"id":"B"`, `"id":"-B\u202E"`, `"id":"C"`, `"id":"@C\u001b[2J"`,
		`"id":"D"`, `"id":"+D"`)
	r, err := testplan.PullSolveJSON(t, ids.Replace(testsite.PullCampus(100, 1)), func(p *plan.Plan) { p.Hub = "=A1+1" })
	if err != nil {
		t.Fatal(err)
	}
	_, leg := testplan.LegOf(t, r, "=A1+1--B\u202E")
	for k := range leg.Losses {
		leg.Losses[k].MarginDB = -12.5
	}
	files, err := Files(context.Background(), r, WriteOptions{SkipWorkbook: true})
	if err != nil {
		t.Fatal(err)
	}
	rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "links.csv"))
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	var row []string
	for _, rec := range rows[1:] {
		if rec[col["to"]] == "'-B<U+202E>" && rec[col["leg"]] == routing.LegPrimary {
			row = rec
		}
	}
	if row == nil {
		t.Fatalf("links.csv has no row to '-B<U+202E>:\n%q", rows)
	}
	cases := []struct {
		column, want string
	}{
		// OWASP CSV injection guidance: a text cell beginning with = + - @ gets a leading quote
		{"link", "'=A1+1--B<U+202E>"},
		{"from", "'=A1+1"},
		// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
		{"to", "'-B<U+202E>"},
		{"pathways", "'+D"},
		// a plain number is a constant, not a formula: it keeps its sign
		{"margin_db", "-12.50"},
	}
	for _, tc := range cases {
		t.Run(tc.column, func(t *testing.T) {
			if got := row[col[tc.column]]; got != tc.want {
				t.Errorf("%s: got %q, want %q", tc.column, got, tc.want)
			}
		})
	}
	// ECMA-48: ESC [ begins a terminal control sequence
	found := false
	for _, rec := range rows[1:] {
		found = found || rec[col["to"]] == "'@C<U+001B>[2J"
	}
	if !found {
		t.Errorf("links.csv has no row to '@C<U+001B>[2J")
	}
	for _, rec := range rows {
		for _, cell := range rec {
			if strings.ContainsAny(cell, "\u202E\x1b") {
				t.Errorf("links.csv cell %q holds a raw hidden character", cell)
			}
		}
	}
}

// plannedCase is a plan that tests of the outputs check end to end: its name and how to plan it.
type plannedCase struct {
	name  string
	solve func(testing.TB) *route.Result
}

// demoCase is the demo campus planned.
var demoCase = plannedCase{"demo", testplan.DemoResult}

// campusCase is the generated campus of n buildings (campusfiles, seed 1) planned.
func campusCase(n int) plannedCase {
	return plannedCase{fmt.Sprintf("%d buildings", n), func(tb testing.TB) *route.Result {
		s, p := testplan.CampusSite(tb, n)
		return testplan.SolvePlan(tb, s, p)
	}}
}

// TestImperialBOMUnitPrices: with --units imperial a length line's extended price stays the
// metric line's, so that the totals agree in either units, and its price per foot is written
// with as many decimals as make the row re-extend (four at least, a hundredth of a cent a foot:
// common practice, no published source): the quantity as bom.csv prints it times the unit
// price as it prints it, worked out exactly in decimal and rounded half away from zero to the
// cent, is the extended price it prints (tester 15 F6: 88,707.6 ft × 1.0058 gave 89,222.10
// against 89,225.40; a bid spreadsheet re-extends every row: common practice, no published
// source). bom.xlsx holds and shows the same price, so its live extension formula gives the
// same cents, and bom.csv needs no note on prices per foot. The bill's total is summary.json's.
// On the demo and the generated campus of 200 buildings (campusfiles, seed 1), whose lines of
// hundreds of thousands of feet need seven decimals or more.
func TestImperialBOMUnitPrices(t *testing.T) {
	t.Parallel()
	for _, tc := range []plannedCase{demoCase, campusCase(200)} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			r := tc.solve(t)
			opt := WriteOptions{Units: UnitsImperial, SkipGeoPackage: true}
			files, err := Files(context.Background(), r, opt)
			if err != nil {
				t.Fatal(err)
			}
			rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "bom.csv"))
			x, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
			if err != nil {
				t.Fatal(err)
			}
			defer x.Close()
			n, most := 0, 0
			for i, row := range rows[1:] {
				if row[2] != "ft" || row[5] == "" {
					continue
				}
				n++
				xc, err := plan.ParseCents(row[5])
				if err != nil {
					t.Fatal(err)
				}
				if got := reExtendCents(t, row[3], row[4]); got != xc {
					t.Errorf("%s: %s ft × %s re-extends to %d cents, extended %s", row[1], row[3], row[4], got, row[5])
				}
				_, dec, _ := strings.Cut(row[4], ".")
				if len(dec) < perFootDecimals {
					t.Errorf("%s: unit price %s, want %d decimals at least", row[1], row[4], perFootDecimals)
				}
				most = max(most, len(dec))
				// The cell holds the price bom.csv prints, and its formula re-extends it.
				v, _ := x.Value("bill of materials", fmt.Sprintf("E%d", i+2))
				xv, err := strconv.ParseFloat(v, 64)
				if p, _ := strconv.ParseFloat(row[4], 64); err != nil || xv != p {
					t.Errorf("%s: bom.xlsx unit price %q, bom.csv %q", row[1], v, row[4])
				}
				f, _ := x.Formula("bill of materials", fmt.Sprintf("F%d", i+2))
				if want := fmt.Sprintf("ROUND(D%d*E%d,2)", i+2, i+2); f != want {
					t.Errorf("%s: bom.xlsx extension %q, want %q", row[1], f, want)
				}
			}
			for _, row := range rows {
				if row[0] == rowNote && strings.Contains(row[1], "prices per ft") {
					t.Errorf("bom.csv: a note on prices per ft, where every row re-extends: %q", row[1])
				}
			}
			t.Logf("%d lines in feet, prices with up to %d decimals", n, most)
			if n == 0 {
				t.Fatal("no priced line in feet")
			}
			var sum struct {
				TotalCents int64 `json:"total_cents"`
			}
			if err := json.Unmarshal(testplan.FileOf(t, files, "summary.json"), &sum); err != nil {
				t.Fatal(err)
			}
			last := rows[len(rows)-1]
			for k := len(rows) - 2; last[0] == rowNote && k >= 0; k-- {
				last = rows[k]
			}
			if got, _ := plan.ParseCents(last[5]); last[0] != rowTotal || got != sum.TotalCents || got != r.Estimate.BOM.TotalCents {
				t.Errorf("bom.csv total %q, summary.json %d cents, the bill %d cents", last, sum.TotalCents, r.Estimate.BOM.TotalCents)
			}
		})
	}
}

// TestReasonsInUnits: the rule engine's reasons give lengths in metres; an imperial run shows
// them in feet, with as many decimals (1 ft = 0.3048 m exactly, by the 1959 international
// agreement), and leaves wavelengths and everything else alone (issue 14, item 8).
func TestReasonsInUnits(t *testing.T) {
	t.Parallel()
	in := "a 247.41 m channel; at most 15 m (50 ft) inside; loss at 1310 nm; 2 m."
	const want = "a 811.71 ft channel; at most 49 ft (50 ft) inside; loss at 1310 nm; 7 ft."
	if got := InUnits(WriteOptions{Units: UnitsImperial}, in); got != want {
		t.Errorf("imperial:\n got %s\nwant %s", got, want)
	}
	if got := InUnits(WriteOptions{}, in); got != in {
		t.Errorf("metric: %s", got)
	}
	r := testplan.DemoResult(t)
	var buf bytes.Buffer
	if err := linksCSV(&buf, r, WriteOptions{Units: UnitsImperial}); err != nil {
		t.Fatal(err)
	}
	data := buf.Bytes()
	rows := testplan.ReadCSV(t, data)
	reason := slices.Index(rows[0], "reason")
	for _, row := range rows[1:] {
		if m := bareMetres.FindString(row[reason]); m != "" {
			t.Errorf("%s %s: imperial reason still says %q", row[0], row[1], m)
		}
	}
}

// bareMetres finds a length in metres that is not a setting's value (TestSettingsInUnits).
var bareMetres = regexp.MustCompile(`(?:^|[^_a-z0-9] )(\d+(?:\.\d+)?) m\b`)

// TestSettingsInUnits (tester 15 F9): a setting the user writes in metres or millimetres
// (snap_m, design.max_lateral_m, duct_mm) is printed in an imperial run with its own unit and
// the run's after it to a tenth of a foot at least, "snap_m 0.5 m (1.6 ft)", whether the
// message gave the unit or not;
// a bare length beside it is in feet as before. 1 ft = 0.3048 m and 1 in = 25.4 mm exactly
// (NIST SP 811 (2008) B.8): 0.5 m is 1.64 ft, 30 m 98.43 ft, 100 mm 3.94 in.
func TestSettingsInUnits(t *testing.T) {
	t.Parallel()
	for _, c := range []struct{ in, want string }{
		{"it ends 3.0 m from pathway P-2, beyond snap_m 0.5", "it ends 9.8 ft from pathway P-2, beyond snap_m 0.5 m (1.6 ft)"},
		{"within 0.5 m (design: snap_m); snap_m 3 would join it", "within 1.6 ft (design: snap_m); snap_m 3 m (9.8 ft) would join it"},
		{"within design.max_lateral_m 30 m of it", "within design.max_lateral_m 30 m (98.4 ft) of it"},
		{"duct_mm 100 mm, innerduct 33/27 mm", "duct_mm 100 mm (3.94 in), innerduct 1.30/1.06 in"},
		{"riser_m 15.25 m riser", "riser_m 15.25 m (50.03 ft) riser"},
		{"snap_m (design)", "snap_m (design)"},
	} {
		if got := InUnits(WriteOptions{Units: UnitsImperial}, c.in); got != c.want {
			t.Errorf("imperial %q:\n got %s\nwant %s", c.in, got, c.want)
		}
		if got := InUnits(WriteOptions{}, c.in); got != c.in {
			t.Errorf("metric %q: %s", c.in, got)
		}
		if m := bareMetres.FindString(InUnits(WriteOptions{Units: UnitsImperial}, c.in)); m != "" {
			t.Errorf("imperial %q: a bare length in metres left: %q", c.in, m)
		}
	}
}

// TestPiecesLine: check's network line says how many separate pieces of the pathway network
// hold buildings, never a bare number that reads as a count of buildings, and when there are
// several, how many buildings are off the hub's piece with the first ShownOffPiece of them.
func TestPiecesLine(t *testing.T) {
	t.Parallel()
	off := []string{"B1", "B2", "B3", "B4", "B5", "B6", "B7"}
	cases := []struct {
		name string
		r    site.CheckReport
		want string
	}{
		{"one piece", site.CheckReport{Components: 1, Hub: "H"}, "network     in one piece: every pathway that reaches a building joins the others"},
		{"no piece", site.CheckReport{}, "network     no pathway reaches a building"},
		{"two pieces, one off", site.CheckReport{Components: 2, Hub: "H", Unreachable: off[:1]},
			"network     in 2 separate pieces that each hold buildings; 1 building is off the hub's piece: [B1]"},
		{"three pieces, seven off", site.CheckReport{Components: 3, Hub: "H", Unreachable: off},
			"network     in 3 separate pieces that each hold buildings; 7 buildings are off the hub's piece: [B1 B2 B3 B4 B5] and 2 more"},
		{"two pieces, no hub", site.CheckReport{Components: 2}, "network     in 2 separate pieces that each hold buildings"},
	}
	for _, tc := range cases {
		if got := piecesLine(tc.r); got != tc.want {
			t.Errorf("%s: got %q, want %q", tc.name, got, tc.want)
		}
	}
}

// TestInfeasibleInUnits: the reasons of the infeasible legs the terminal lists are in the
// run's units (1 ft = 0.3048 m exactly, NIST SP 811 B.8), and unchanged in metric.
func TestInfeasibleInUnits(t *testing.T) {
	t.Parallel()
	in := []string{"L-1/primary: om4: the shortest route it may use is 612.3 m along pathways, beyond the 400.0 m it reaches there"}
	want := "L-1/primary: om4: the shortest route it may use is 2008.9 ft along pathways, beyond the 1312.3 ft it reaches there"
	if got := legsInUnits(WriteOptions{Units: UnitsImperial}, in); len(got) != 1 || got[0] != want {
		t.Errorf("imperial: got %q, want %q", got, want)
	}
	if got := legsInUnits(WriteOptions{}, in); len(got) != 1 || got[0] != in[0] {
		t.Errorf("metric: got %q, want the legs unchanged", got)
	}
}

// TestSafetyLine: the terminal names the plan's cautions (route.Result.Cautions) once, in one
// line that says where they are written out and defers to the local codes and the authority
// having jurisdiction; a plan whose work calls for none prints no such line.
func TestSafetyLine(t *testing.T) {
	t.Parallel()
	r := *testplan.DemoResult(t)
	lines := func(r *route.Result) []string {
		var out bytes.Buffer
		if err := PrintSummary(&out, r, WriteOptions{}); err != nil {
			t.Fatal(err)
		}
		var got []string
		for _, l := range strings.Split(out.String(), "\n") {
			if strings.Contains(l, "caution") {
				got = append(got, l)
			}
		}
		return got
	}
	got := lines(&r)
	if len(got) != 1 || !strings.HasPrefix(got[0], "safety: ") {
		t.Fatalf("want one safety line, got %q", got)
	}
	for _, c := range r.Cautions {
		if !strings.Contains(got[0], strings.ToLower(c.Title)) {
			t.Errorf("the safety line does not name %q: %s", c.Title, got[0])
		}
	}
	for _, want := range []string{Counted(len(r.Cautions), "caution", "cautions"), "sheet " + SheetSafety, "authority having jurisdiction"} {
		if !strings.Contains(got[0], want) {
			t.Errorf("the safety line lacks %q: %s", want, got[0])
		}
	}
	r.Cautions = nil
	if got := lines(&r); len(got) != 0 {
		t.Errorf("a plan with no caution prints %q", got)
	}
}

// TestImperialInnerduct: with --units imperial the bill's innerduct reads in inches, as every
// other dimension of an imperial run does (1 in = 25.4 mm exactly, NIST SP 811): 33/27 mm is
// 1.30/1.06 in; no bill line of the imperial bom.csv keeps millimetres.
func TestImperialInnerduct(t *testing.T) {
	t.Parallel()
	r := testplan.DemoDesign(t, func(d *plan.Design) {
		d.InnerductODMM, d.InnerductIDMM = 33, 27
	})
	for _, c := range []struct {
		opt  WriteOptions
		want string
	}{{WriteOptions{}, "innerduct 33/27 mm"}, {WriteOptions{Units: UnitsImperial}, "innerduct 1.30/1.06 in"}} {
		var buf bytes.Buffer
		if err := bomCSV(&buf, r, c.opt); err != nil {
			t.Fatal(err)
		}
		rows, err := csv.NewReader(&buf).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		found := false
		for _, row := range rows[1:] {
			found = found || row[1] == c.want
			if c.opt.Units == UnitsImperial && strings.Contains(row[1], " mm") {
				t.Errorf("imperial bom.csv: item %q in millimetres", row[1])
			}
		}
		if !found {
			t.Errorf("%q bom.csv: no item %q", c.opt.Units, c.want)
		}
	}
}

// reExtendCents is quantity × unit price, both as a CSV prints them, in exact decimal
// arithmetic, rounded half away from zero to the cent (as a spreadsheet's ROUND does).
func reExtendCents(t *testing.T, qty, price string) int64 {
	t.Helper()
	q, ok1 := new(big.Rat).SetString(qty)
	p, ok2 := new(big.Rat).SetString(price)
	if !ok1 || !ok2 {
		t.Fatalf("quantity %q or unit price %q is no decimal", qty, price)
	}
	c := new(big.Rat).Mul(q, p)
	c.Mul(c, big.NewRat(100, 1))
	neg := c.Sign() < 0
	c.Abs(c)
	c.Add(c, big.NewRat(1, 2))
	cents := new(big.Int).Quo(c.Num(), c.Denom()).Int64()
	if neg {
		cents = -cents
	}
	return cents
}
