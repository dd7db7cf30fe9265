package output

import (
	"bytes"
	"context"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"spanwright/media"
	"spanwright/media/install"
	"spanwright/route"
	"spanwright/route/estimate"
	"spanwright/route/internal/testplan"
	"spanwright/route/plan"
	"spanwright/route/workbook"
	"strconv"
	"strings"
	"testing"
)

// TestBOMOutputsAddUp parses bom.csv of the demo and checks that every subtotal is the sum
// of its lines, every extended price its quantity times unit price, and the markups and
// total those of the price book; summary.json says the same.
func TestBOMOutputsAddUp(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	files, err := Files(context.Background(), r, WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "bom.csv"))
	if got := strings.Join(rows[0], ","); got != "category,item,unit,quantity,unit_price_usd,extended_usd,from,price_key" { // "from", then "price_key", last, so no earlier column moves
		t.Fatalf("header: %s", got)
	}
	cents := func(s string) int64 {
		c, err := plan.ParseCents(strings.TrimPrefix(s, "-"))
		if err != nil {
			t.Fatalf("amount %q: %v", s, err)
		}
		return c
	}
	byCat := map[string]int64{}
	sub := map[string]int64{}
	var all, cont, over, tax, total int64
	for _, row := range rows[1:] {
		switch row[0] {
		case media.CategoryMaterial, media.CategoryLabour, media.CategoryConstruction, media.CategoryOptics, media.CategoryBidItems:
			qty, _ := strconv.ParseFloat(row[3], 64)
			if want := media.ExtendCents(int64(math.Round(qty*100)), cents(row[4])); cents(row[5]) != want {
				t.Errorf("%s: extended %s, want %s", row[1], row[5], media.FormatCents(want))
			}
			byCat[row[0]] += cents(row[5])
			if row[6] == "" {
				t.Errorf("%s: no sources in from", row[1])
			}
		case rowSubtotal:
			if row[1] == "all categories" {
				all = cents(row[5])
			} else {
				sub[row[1]] = cents(row[5])
			}
		case rowContingency:
			cont = cents(row[5])
		case rowOverhead:
			over = cents(row[5])
		case rowTax:
			tax = cents(row[5])
		case rowTotal:
			total = cents(row[5])
		}
	}
	var sum int64
	for _, c := range append(media.Categories(), media.CategoryBidItems) {
		if sub[c] != byCat[c] {
			t.Errorf("%s: subtotal %d, lines sum to %d", c, sub[c], byCat[c])
		}
		sum += sub[c]
	}
	book := r.Engine.PriceBook()
	if all != sum || cont != media.ApplyBP(all, book.ContingencyBP) || over != media.ApplyBP(all, book.OverheadBP) ||
		tax != media.ApplyBP(taxBase(book, sub, cont, over), book.TaxBP) || total != all+cont+over+tax {
		t.Errorf("totals: subtotal %d (sum %d), contingency %d, overhead %d, tax %d, total %d", all, sum, cont, over, tax, total)
	}
	s := Summarize(r)
	if s.TotalCents != total || s.SubtotalCents != all || s.CostByCategory[media.CategoryLabour] != sub[media.CategoryLabour] ||
		s.BudgetCents == nil || s.OverBudgetCents == nil || *s.OverBudgetCents != total-*s.BudgetCents || len(s.CostDrivers) != 5 {
		t.Errorf("summary: %+v", s)
	}
	var model int64
	for _, l := range r.Legs {
		model += l.Cost.TotalCents()
	}
	if s.ModelCents != model {
		t.Errorf("model cost: got %d, want %d", s.ModelCents, model)
	}
}

// taxBase is what the book taxes: the subtotals of its taxed categories, and contingency
// and overhead when taxed.
func taxBase(book *media.PriceBook, sub map[string]int64, cont, over int64) int64 {
	var base int64
	for c, cents := range sub {
		if slices.Contains(book.Taxed, c) {
			base += cents
		}
	}
	if slices.Contains(book.Taxed, media.MarkupContingency) {
		base += cont
	}
	if slices.Contains(book.Taxed, media.MarkupOverhead) {
		base += over
	}
	return base
}

// TestBOMWorkbook opens bom.xlsx back and checks its formulas and their results against
// the bill of materials, then changes a unit price as an estimator would and checks that
// the total moves by what the price book's markups give.
func TestBOMWorkbook(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	b := r.Estimate.BOM
	for _, opt := range []WriteOptions{{}, {Units: UnitsImperial}} {
		t.Run("units "+opt.Units, func(t *testing.T) {
			files, err := Files(context.Background(), r, opt)
			if err != nil {
				t.Fatal(err)
			}
			x, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
			if err != nil {
				t.Fatal(err)
			}
			defer x.Close()
			want := []string{"summary", "links", "bill of materials", "pull sections", "structures", "duct fill", "loss budgets", SheetSafety}
			if got := x.Sheets(); fmt.Sprint(got) != fmt.Sprint(want) {
				t.Fatalf("sheets: got %v, want %v", got, want)
			}
			// The safety sheet is the plan's one list of cautions (route.Result.Cautions), as
			// the report lists them, between the words said before and after them.
			rows, err := x.Rows(SheetSafety)
			if err != nil {
				t.Fatal(err)
			}
			if len(rows) != len(r.Cautions)+3 || len(r.Cautions) == 0 {
				t.Fatalf("safety sheet: %d rows for %d cautions, want a header, the preamble, the cautions and the closing", len(rows), len(r.Cautions))
			}
			if rows[1][2] != route.CautionsPreamble || rows[len(rows)-1][2] != route.CautionsClosing {
				t.Errorf("safety sheet: preamble %q, closing %q", rows[1][2], rows[len(rows)-1][2])
			}
			for i, c := range r.Cautions {
				if got := rows[i+2]; len(got) < 4 || got[0] != c.Title || got[1] != c.Where || got[2] != c.Text || got[3] != c.Source {
					t.Errorf("safety sheet row %d: %q, want the caution %+v", i+3, got, c)
				}
			}
			const sh = "bill of materials"
			num := func(sheet, ref string) float64 {
				t.Helper()
				v, err := x.Calc(sheet, ref)
				if err != nil {
					t.Fatal(err)
				}
				f, err := strconv.ParseFloat(v, 64)
				if err != nil {
					t.Fatalf("%s!%s: %q is not a number", sheet, ref, v)
				}
				return f
			}
			cents := func(f float64) int64 { return int64(math.Round(f * 100)) }
			for i, l := range b.Lines {
				row := i + 2
				if f, _ := x.Formula(sh, fmt.Sprintf("F%d", row)); f != fmt.Sprintf("ROUND(D%d*E%d,2)", row, row) {
					t.Errorf("F%d formula: %q", row, f)
				}
				if got := cents(num(sh, fmt.Sprintf("F%d", row))); got != l.ExtendedCents {
					t.Errorf("%s: extended %d, want %d", l.Item, got, l.ExtendedCents)
				}
				// The sources last, after the live formulas, as in bom.csv, in the run's units
				// (a stretch's metres in feet: review 22 F3; 1 ft = 0.3048 m exactly, NIST SP 811).
				want := strings.Join(l.From, "; ")
				if opt.imperial() {
					want = strings.ReplaceAll(want, "pathway EA-3, 0.0 m to 20.1 m", "pathway EA-3, 0.0 ft to 65.9 ft")
				}
				if got, _ := x.Value(sh, fmt.Sprintf("G%d", row)); got != want || got == "" {
					t.Errorf("%s: from %q, want %q", l.Item, got, want)
				}
			}
			if h, _ := x.Value(sh, "G1"); h != "from" {
				t.Errorf("G1: %q, want from", h)
			}
			n := len(b.Lines)
			totalRow := n + 1 + 1 + len(b.Subtotal) + 5 // lines, a blank row, subtotals, all, three markups, total
			if v, _ := x.Value(sh, fmt.Sprintf("A%d", totalRow)); v != rowTotal {
				t.Fatalf("row %d is %q, not the total", totalRow, v)
			}
			totalRef := fmt.Sprintf("F%d", totalRow)
			if got := cents(num(sh, totalRef)); got != b.TotalCents {
				t.Errorf("total: got %d, want %d", got, b.TotalCents)
			}
			// The summary lists one money row per category: the total is row 21 with four.
			sumTotal := fmt.Sprintf("B%d", 21+len(b.Subtotal)-4)
			if got := cents(num("summary", sumTotal)); got != b.TotalCents {
				v, _ := x.Value("summary", "A"+sumTotal[1:])
				t.Errorf("summary %s: got %d, want total %d", v, got, b.TotalCents)
			}
			if got := cents(num("summary", fmt.Sprintf("B%d", 23+len(b.Subtotal)-4))); got != b.TotalCents-int64(r.Plan.Budget) {
				t.Errorf("summary over budget: got %d", got)
			}
			// An estimator raises the first line's unit price by 1.00 (per unit shown).
			price := num(sh, "E2")
			qty := num(sh, "D2")
			if err := x.SetNumber(sh, "E2", price+1); err != nil {
				t.Fatal(err)
			}
			// The first line's category moves by the edit, a bid item priced as a percentage
			// of it too, and the markups and tax with them.
			book := r.Engine.PriceBook()
			cats := map[string]int64{}
			for _, l := range b.Lines {
				if l.PercentOf == nil {
					cats[l.Category] += l.ExtendedCents
				}
			}
			cats[b.Lines[0].Category] += cents(math.Round(qty*(price+1)*100)/100) - b.Lines[0].ExtendedCents
			for _, l := range b.Lines {
				if l.PercentOf != nil {
					var base int64
					for _, c := range l.PercentOf {
						base += cats[c]
					}
					cats[l.Category] += media.ApplyBP(base, l.PercentBP)
				}
			}
			var sub int64
			for _, c := range cats {
				sub += c
			}
			cont, over := media.ApplyBP(sub, book.ContingencyBP), media.ApplyBP(sub, book.OverheadBP)
			moved := sub + cont + over + media.ApplyBP(taxBase(book, cats, cont, over), book.TaxBP)
			if got := cents(num(sh, totalRef)); got != moved || got == b.TotalCents {
				t.Errorf("total after the edit: got %d, want %d (was %d)", got, moved, b.TotalCents)
			}
			if got := cents(num("summary", sumTotal)); got != moved {
				t.Errorf("summary total after the edit: got %d, want %d", got, moved)
			}
		})
	}
}

// TestImperialEdges: bom.csv in feet keeps the metric extended prices, and the pull
// sheet's tensions are in pound-force.
func TestImperialEdges(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	files, err := Files(context.Background(), r, WriteOptions{Units: UnitsImperial})
	if err != nil {
		t.Fatal(err)
	}
	rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "bom.csv"))
	b := r.Estimate.BOM
	feet := 0
	for i, l := range b.Lines {
		row := rows[i+1]
		if l.Unit != media.UnitM {
			continue
		}
		feet++
		qty, _ := strconv.ParseFloat(row[3], 64)
		price, _ := strconv.ParseFloat(row[4], 64)
		ext, _ := plan.ParseCents(row[5])
		// 1 ft = 0.3048 m exactly: the quantity in feet times the price per foot is the
		// metric line within the rounding of the shown figures.
		if row[2] != "ft" || ext != l.ExtendedCents || math.Abs(qty*price-float64(l.ExtendedCents)/100) > 0.05*price+0.00005*qty+0.01 {
			t.Errorf("%s: %v, want feet and %s", l.Item, row, media.FormatCents(l.ExtendedCents))
		}
	}
	if feet == 0 {
		t.Errorf("no length line")
	}
	x, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	defer x.Close()
	for ref, want := range map[string]string{"L1": "tension (lbf)", "I1": "length (ft)", "P1": "sidewall pressure (lbf/ft)"} {
		if v, _ := x.Value("pull sections", ref); v != want {
			t.Errorf("pull sections %s: got %q, want %q", ref, v, want)
		}
	}
	v, _ := x.Value("pull sections", "L2")
	lbf, _ := strconv.ParseFloat(v, 64)
	// 1 lbf = 4.4482216152605 N exactly.
	if want := r.Estimate.Pulls[0].TensionN / 4.4482216152605; math.Abs(lbf-want) > 1e-9 {
		t.Errorf("tension: got %v lbf, want %v", lbf, want)
	}
	var out bytes.Buffer
	if err := PrintSummary(&out, r, WriteOptions{Units: UnitsImperial}); err != nil {
		t.Fatal(err)
	}
	if s := out.String(); !strings.Contains(s, " lbf rated") || !strings.Contains(s, " ft in all") || strings.Contains(s, " m ") {
		t.Errorf("imperial summary:\n%s", s)
	}
}

// TestBOMWorkbookOpenpyxl reads bom.xlsx with openpyxl (Debian package python3-openpyxl),
// a reader written independently of excelize, and recomputes the total from the stored
// quantities, unit prices and markup percentages with Python's decimal arithmetic.
func TestBOMWorkbookOpenpyxl(t *testing.T) {
	t.Parallel()
	py := testplan.Openpyxl(t)
	r := testplan.DemoResult(t)
	files, err := Files(context.Background(), r, WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "bom.xlsx")
	if err := os.WriteFile(path, testplan.FileOf(t, files, "bom.xlsx"), 0o644); err != nil {
		t.Fatal(err)
	}
	// The script prices the lines itself: quantity × unit price, a percentage bid item from
	// the categories its formula names, tax on the categories and markups argv[2] lists.
	script := `import sys, re, openpyxl
from decimal import Decimal, ROUND_HALF_UP
wb = openpyxl.load_workbook(sys.argv[1])
taxed = sys.argv[2].split(",")
ws = wb["bill of materials"]
cent = Decimal("0.01")
def rnd(x): return x.quantize(cent, rounding=ROUND_HALF_UP)
cats, pct, formulas = {}, {}, 0
for row in ws.iter_rows(min_row=2):
    a, d, e, f = row[0].value, row[3].value, row[4].value, row[5].value
    if a in ("material", "labour", "construction", "optics", "bid items"):
        assert isinstance(d, (int, float)), (a, d)
        if isinstance(e, str):
            names = re.findall(r'SUMIF\([^,]*,"([^"]*)"', e)
            p = re.search(r'\)\*([0-9.]+)/100,2\)$', e).group(1)
            e = float(rnd(sum(cats.get(n, Decimal(0)) for n in names) * Decimal(p) / 100))
        assert f == "=ROUND(D%d*E%d,2)" % (row[0].row, row[0].row), f
        cats[a] = cats.get(a, Decimal(0)) + rnd(Decimal(repr(d)) * Decimal(repr(e)))
        formulas += 1
    elif a in ("contingency", "overhead", "tax"):
        pct[a] = Decimal(repr(d))
sub = sum(cats.values())
cont = rnd(sub * pct["contingency"] / 100)
over = rnd(sub * pct["overhead"] / 100)
base = sum(v for k, v in cats.items() if k in taxed) + (cont if "contingency" in taxed else 0) + (over if "overhead" in taxed else 0)
tax = rnd(base * pct["tax"] / 100)
print(wb.sheetnames)
print(formulas, int((sub + cont + over + tax) * 100))
print(wb["summary"]["B%d" % (21 + len(cats) - 4)].value)
`
	out, err := exec.Command(py, "-c", script, path, strings.Join(r.Engine.PriceBook().Taxed, ",")).CombinedOutput()
	if err != nil {
		t.Fatalf("openpyxl: %v\n%s", err, out)
	}
	b := r.Estimate.BOM
	want := fmt.Sprintf("['summary', 'links', 'bill of materials', 'pull sections', 'structures', 'duct fill', 'loss budgets', 'safety']\n%d %d\n='bill of materials'!F%d\n",
		len(b.Lines), b.TotalCents, len(b.Lines)+1+1+len(b.Subtotal)+5)
	if string(out) != want {
		t.Errorf("openpyxl read:\n%s\nwant:\n%s", out, want)
	}
}

// TestFromCellFits: a line with more sources than a workbook cell holds (Excel
// specifications and limits: 32,767 characters in a cell) keeps whole sources and says how
// many more bom.csv lists; a short list is kept whole.
func TestFromCellFits(t *testing.T) {
	t.Parallel()
	l := media.BOMLine{From: []string{"leg A-B/primary", "leg A-C/primary"}}
	if got := fromCell(WriteOptions{}, l); got != "leg A-B/primary; leg A-C/primary" {
		t.Errorf("short: %q", got)
	}
	l.From = nil
	for i := range 5000 {
		l.From = append(l.From, fmt.Sprintf("leg L%05d/primary", i))
	}
	got := fromCell(WriteOptions{}, l)
	if len(got) > 32767 || !strings.HasSuffix(got, " more, all in bom.csv") {
		t.Fatalf("long: %d characters, ends %q", len(got), got[len(got)-40:])
	}
	var kept, more int
	head, _, _ := strings.Cut(got, "; and ")
	kept = len(strings.Split(head, "; "))
	if _, err := fmt.Sscanf(got[len(head):], "; and %d more", &more); err != nil || kept+more != 5000 ||
		strings.Split(head, "; ")[kept-1] != l.From[kept-1] {
		t.Errorf("long: kept %d, %d more (%v), want 5,000 in all, whole sources", kept, more, err)
	}
}

// TestBOMWorkbookCachedOpenpyxl reads bom.xlsx with openpyxl's data_only mode (Debian
// python3-openpyxl), which gives a formula cell's cached value (ECMA-376 Part 1 §18.3.1.96)
// as pandas and file previewers see it, in both unit systems: every formula cell holds a
// number; it is what the formula gives when calculated again (excelize's calculation
// engine, to the cent); and the bill's figures (each line's extended price, a percentage
// bid item's price, subtotals, markups and their bases, the total) and the summary's money
// and budget check are the estimate's own, to the cent.
func TestBOMWorkbookCachedOpenpyxl(t *testing.T) {
	t.Parallel()
	py := testplan.Openpyxl(t)
	const script = `import sys, openpyxl
f = openpyxl.load_workbook(sys.argv[1])
v = openpyxl.load_workbook(sys.argv[1], data_only=True)
for ws in f.worksheets:
    for row in ws.iter_rows():
        for c in row:
            if isinstance(c.value, str) and c.value.startswith("="):
                x = v[ws.title][c.coordinate].value
                print("%s\t%s\t%s\t%r" % (ws.title, c.coordinate, type(x).__name__, x))
`
	r := testplan.DemoResult(t)
	b := r.Estimate.BOM
	s := Summarize(r)
	if s.BudgetCents == nil {
		t.Fatal("the demo plan has no budget; this test checks the budget rows")
	}
	for _, opt := range []WriteOptions{{}, {Units: UnitsImperial}} {
		t.Run("units "+opt.Units, func(t *testing.T) {
			t.Parallel()
			files, err := Files(context.Background(), r, WriteOptions{Units: opt.Units, SkipGeoPackage: true})
			if err != nil {
				t.Fatal(err)
			}
			data := testplan.FileOf(t, files, "bom.xlsx")
			path := filepath.Join(t.TempDir(), "bom.xlsx")
			if err := os.WriteFile(path, data, 0o644); err != nil {
				t.Fatal(err)
			}
			out, err := exec.Command(py, "-c", script, path).CombinedOutput()
			if err != nil {
				t.Fatalf("openpyxl: %v\n%s", err, out)
			}
			x, err := workbook.Open(data)
			if err != nil {
				t.Fatal(err)
			}
			defer x.Close()

			// The estimate's figures, in cents, by cell.
			const bill = "bill of materials"
			want := map[string]int64{}
			n := len(b.Lines)
			for i, l := range b.Lines {
				want[fmt.Sprintf("%s!F%d", bill, i+2)] = l.ExtendedCents
				if l.PercentOf != nil {
					want[fmt.Sprintf("%s!E%d", bill, i+2)] = l.UnitCents
				}
			}
			row := n + 3 // after the lines and a blank row
			for _, c := range b.Subtotal {
				want[fmt.Sprintf("%s!F%d", bill, row)] = c.Cents
				row++
			}
			want[fmt.Sprintf("%s!F%d", bill, row)] = b.SubtotalCents
			for _, m := range [][2]int64{{b.SubtotalCents, b.ContingencyCents}, {b.SubtotalCents, b.OverheadCents}, {b.TaxBaseCents, b.TaxCents}} {
				row++
				want[fmt.Sprintf("%s!E%d", bill, row)], want[fmt.Sprintf("%s!F%d", bill, row)] = m[0], m[1]
			}
			want[fmt.Sprintf("%s!F%d", bill, row+1)] = b.TotalCents
			labels, err := x.Rows("summary")
			if err != nil {
				t.Fatal(err)
			}
			figures := map[string]int64{"subtotal": b.SubtotalCents, "contingency": b.ContingencyCents, "overhead": b.OverheadCents,
				"tax": b.TaxCents, "total": b.TotalCents}
			for _, c := range b.Subtotal {
				figures[c.Category] = c.Cents
			}
			overSeen := false
			for i, rec := range labels {
				if c, ok := figures[rec[0]]; ok {
					want[fmt.Sprintf("summary!B%d", i+1)] = c
				}
				if rec[0] == "over (+) or under (-) budget" && !overSeen {
					overSeen = true
					want[fmt.Sprintf("summary!B%d", i+1)] = *s.OverBudgetCents
				}
			}

			cells, found := 0, 0
			for _, line := range strings.Split(strings.TrimSpace(string(out)), "\n") {
				f := strings.Split(line, "\t")
				if len(f) != 4 {
					t.Fatalf("openpyxl line %q", line)
				}
				cells++
				key := f[0] + "!" + f[1]
				if f[2] != "float" && f[2] != "int" {
					t.Errorf("%s: cached value %s of type %s, want a number", key, f[3], f[2])
					continue
				}
				got, err := strconv.ParseFloat(f[3], 64)
				if err != nil {
					t.Fatalf("%s: %q", key, f[3])
				}
				calc, err := x.Calc(f[0], f[1])
				if err != nil {
					t.Fatal(err)
				}
				if c, err := strconv.ParseFloat(calc, 64); err != nil || math.Abs(c-got) >= 0.005 {
					t.Errorf("%s: cached %v, calculated %q", key, got, calc)
				}
				if w, ok := want[key]; ok {
					found++
					if int64(math.Round(got*100)) != w {
						t.Errorf("%s: cached %v, want the estimate's %d cents", key, got, w)
					}
				}
			}
			if found != len(want) || cells < len(want)+1 {
				t.Errorf("%d formula cells, %d of the %d figures found", cells, found, len(want))
			}
			// The over-budget percentage: the summary's figure.
			for i, rec := range labels {
				if rec[0] == "over (+) or under (-) budget" && len(rec) > 2 && rec[2] == "%" {
					v, _ := x.Value("summary", fmt.Sprintf("B%d", i+1))
					if got, _ := strconv.ParseFloat(v, 64); got != *s.OverBudgetPct {
						t.Errorf("over budget: cached %v %%, want %v", got, *s.OverBudgetPct)
					}
				}
			}
		})
	}
}

// TestAddedPullPointInUnits: a pull point the plan adds on a span keeps its place as a number
// (estimate.PullPoint.AtM) and is written in the run's units where it reaches a person: the
// pull sections sheet of an imperial run gives its offset in feet (1 ft = 0.3048 m exactly,
// NIST SP 811 B.8), a metric run in metres.
func TestAddedPullPointInUnits(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolve(t, 100, 2, func(p *plan.Plan) { p.Design.PullMaxM = 100 })
	if err != nil {
		t.Fatal(err)
	}
	var at estimate.PullPoint
	for _, p := range r.Estimate.Pulls {
		if p.AddedTo && p.To.Span != "" {
			at = p.To
			break
		}
	}
	if at.Span == "" {
		t.Fatal("no pull point added on a span")
	}
	ft := strconv.FormatFloat(at.AtM/0.3048, 'f', 1, 64)
	m := strconv.FormatFloat(at.AtM, 'f', 1, 64)
	sp, _ := r.Site.Net.Span(at.Span)
	end := " from the " + r.Site.Net.EndName(sp.From) + " end" // the end AtM counts from, named
	for _, tc := range []struct {
		name string
		opt  WriteOptions
		want string
	}{
		{"imperial", WriteOptions{Units: UnitsImperial}, "new handhole on " + at.Span + ", " + ft + " ft" + end},
		{"metric", WriteOptions{}, "new handhole on " + at.Span + ", " + m + " m" + end},
	} {
		if got := PointText(tc.opt, at); got != tc.want {
			t.Errorf("%s: got %q, want %q", tc.name, got, tc.want)
		}
		files, err := Files(context.Background(), r, WriteOptions{Units: tc.opt.Units, SkipGeoPackage: true})
		if err != nil {
			t.Fatal(err)
		}
		x, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
		if err != nil {
			t.Fatal(err)
		}
		found, metres := false, false
		for row := 2; ; row++ {
			from, _ := x.Value("pull sections", "D"+strconv.Itoa(row))
			to, _ := x.Value("pull sections", "E"+strconv.Itoa(row))
			if from == "" && to == "" {
				break
			}
			found = found || to == tc.want || from == tc.want
			metres = metres || tc.opt.Units == UnitsImperial && (strings.HasSuffix(from, " m") || strings.HasSuffix(to, " m"))
		}
		x.Close()
		if !found || metres {
			t.Errorf("%s: pull sections sheet: %q found %v, a point in metres %v", tc.name, tc.want, found, metres)
		}
	}
}

// TestPullUnits: why a pull is over its limits is written in the run's units, as the pull
// sheet's columns are: feet, pound-force and lbf/ft when imperial (NIST SP 811 B.8), SI
// otherwise.
func TestPullUnits(t *testing.T) {
	t.Parallel()
	over := []install.Excess{{Limit: install.OverTension, Value: 3000, Max: 2670}, {Limit: install.OverSidewall, Value: 1800, Max: 1460},
		{Limit: install.OverLength, Value: 160.24, Max: 150}}
	imp := "tension 674.4 lbf over rating 600.2 lbf; sidewall pressure 123.3 lbf/ft over 100.0 lbf/ft; length 525.7 ft over 492.1 ft between pull points"
	if got := install.Why(over, PullUnits(WriteOptions{Units: UnitsImperial})); got != imp {
		t.Errorf("imperial: got %q, want %q", got, imp)
	}
	si := "tension 3000.0 N over rating 2670.0 N; sidewall pressure 1800.0 N/m over 1460.0 N/m; length 160.2 m over 150.0 m between pull points"
	if got := install.Why(over, PullUnits(WriteOptions{})); got != si {
		t.Errorf("metric: got %q, want %q", got, si)
	}
}

// TestBOMPriceKeys: every priced line of bom.csv names where its price comes from in the
// price book (price_key: the key's path, for labour by the hour the hourly rate's and the
// production rate's), so that an estimator can trace a line to the book (tester 5's finding
// 17; common practice, no published source: a bid's unit prices are traced to their source).
func TestBOMPriceKeys(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	files, err := Files(context.Background(), r, WriteOptions{SkipWorkbook: true, SkipGeoPackage: true})
	if err != nil {
		t.Fatal(err)
	}
	book := map[string]bool{}
	for _, k := range r.Engine.PriceBook().Keys() {
		book[k.Path()] = true
	}
	for _, it := range r.Engine.PriceBook().BidItems { // a percentage has no price of its own
		book[media.PriceKey{Item: media.PriceBidItem, Name: it.ID}.Path()] = true
	}
	rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "bom.csv"))
	key := slices.Index(rows[0], "price_key")
	if key != len(rows[0])-1 || rows[0][key-1] != "from" {
		t.Fatalf("bom.csv head %q: want price_key last, after from", rows[0])
	}
	lines := r.Estimate.BOM.Lines
	for i, l := range lines {
		row := rows[i+1]
		parts := strings.Split(row[key], " / ")
		if (l.Unit == "h") != (len(parts) == 2) {
			t.Errorf("%s: price key %q", l.Item, row[key])
		}
		for _, p := range parts {
			if !book[p] {
				t.Errorf("%s: price key %q is not a key of the book", l.Item, p)
			}
		}
	}
	for _, row := range rows[len(lines)+1:] {
		want := map[string]string{"contingency": "markups_percent.contingency", "overhead": "markups_percent.overhead", "tax": "markups_percent.tax"}[row[0]]
		if row[key] != want {
			t.Errorf("bom.csv %s row: price key %q, want %q", row[0], row[key], want)
		}
	}
}
