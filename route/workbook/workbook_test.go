package workbook

import (
	"archive/zip"
	"bytes"
	"fmt"
	"io"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/xuri/excelize/v2"
)

// sample builds a workbook with every kind of cell.
func sample() *Workbook {
	w := New()
	s := w.AddSheet("links",
		Column{Name: "link"},
		Column{Name: "length", Unit: "m"},
		Column{Name: "strands"},
		Column{Name: "cost", Unit: "EUR", Width: 14},
		Column{Name: "feasible"},
		Column{Name: "note"})
	s.Filter = true
	s.Append(Text("ADM-LIB"), Number(412.35, 1), Int(24), Cents(1234567), Bool(true), Text("0042"))
	s.Append(Text("ADM-SCI"), Number(88, 1), Int(12), Cents(-5), Bool(false))
	s.Append(Text("ADM-OBS"), Number(1e-3, 3), Int(2), Cents(10), Bool(true), Blank())
	t := w.AddSheet("totals", Column{Name: "what"}, Column{Name: "value"})
	t.Append(Text("length"), Formula("SUM("+s.Range(1)+")", 412.35+88+1e-3, 1))
	t.Append(Text("cost"), Formula("=SUM("+s.Range(3)+")", 12345.72, 2))
	t.Append(Text("feasible links"), Formula("COUNTIF("+s.Range(4)+",TRUE)", 2, 0))
	t.Append(Text("first note"), FormulaText("IFERROR(INDEX("+s.Range(5)+",MATCH(\"x\","+s.Range(5)+",0)),\"\")", ""))
	return w
}

// reopen renders w and opens the bytes with excelize; the file is closed when the test ends.
func reopen(t *testing.T, w *Workbook) *excelize.File {
	t.Helper()
	data, err := w.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(bytes.NewReader(data))
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { f.Close() })
	return f
}

func TestReadBack(t *testing.T) {
	t.Parallel()
	f := reopen(t, sample())
	if got, want := f.GetSheetList(), []string{"links", "totals"}; strings.Join(got, ",") != strings.Join(want, ",") {
		t.Fatalf("sheets: got %v, want %v", got, want)
	}
	cells := []struct {
		sheet, ref string
		typ        excelize.CellType
		raw        string // stored value
	}{
		{"links", "A1", excelize.CellTypeInlineString, "link"},
		{"links", "B1", excelize.CellTypeInlineString, "length (m)"},
		{"links", "D1", excelize.CellTypeInlineString, "cost (EUR)"},
		{"links", "A2", excelize.CellTypeInlineString, "ADM-LIB"},
		{"links", "B2", excelize.CellTypeUnset, "412.35"}, // a number cell has no type attribute
		{"links", "C2", excelize.CellTypeUnset, "24"},
		{"links", "D2", excelize.CellTypeUnset, "12345.67"},
		{"links", "D3", excelize.CellTypeUnset, "-0.05"},
		{"links", "E2", excelize.CellTypeBool, "1"},
		{"links", "E3", excelize.CellTypeBool, "0"},
		{"links", "F2", excelize.CellTypeInlineString, "0042"},
		{"links", "F3", excelize.CellTypeUnset, ""},
	}
	for _, c := range cells {
		typ, err := f.GetCellType(c.sheet, c.ref)
		if err != nil {
			t.Fatal(err)
		}
		raw, err := f.GetCellValue(c.sheet, c.ref, excelize.Options{RawCellValue: true})
		if err != nil {
			t.Fatal(err)
		}
		if typ != c.typ || raw != c.raw {
			t.Errorf("%s!%s: got type %v value %q, want type %v value %q", c.sheet, c.ref, typ, raw, c.typ, c.raw)
		}
	}
	// Shown values follow the number formats.
	shown := map[string]string{"B2": "412.4", "B3": "88.0", "D2": "12345.67", "D4": "0.10", "C2": "24", "B4": "0.001"}
	for ref, want := range shown {
		got, err := f.GetCellValue("links", ref)
		if err != nil || got != want {
			t.Errorf("links!%s shown: got %q (%v), want %q", ref, got, err, want)
		}
	}
	formulas := map[string]string{
		"B2": "SUM('links'!$B$2:$B$4)",
		"B3": "SUM('links'!$D$2:$D$4)",
		"B4": "COUNTIF('links'!$E$2:$E$4,TRUE)",
	}
	calc := map[string]string{"B2": "500.351", "B3": "12345.72", "B4": "2"}
	for ref, want := range formulas {
		got, err := f.GetCellFormula("totals", ref)
		if err != nil || got != want {
			t.Errorf("totals!%s formula: got %q (%v), want %q", ref, got, err, want)
		}
		v, err := f.CalcCellValue("totals", ref, excelize.Options{RawCellValue: true})
		if err != nil || v != calc[ref] {
			t.Errorf("totals!%s calculated: got %q (%v), want %q", ref, v, err, calc[ref])
		}
	}
	for _, sheet := range []string{"links", "totals"} {
		p, err := f.GetPanes(sheet)
		if err != nil {
			t.Fatal(err)
		}
		if !p.Freeze || p.YSplit != 1 || p.XSplit != 0 || p.TopLeftCell != "A2" {
			t.Errorf("%s: header not frozen: %+v", sheet, p)
		}
	}
	if w, _ := f.GetColWidth("links", "D"); w != 14 {
		t.Errorf("fixed width: got %g, want 14", w)
	}
	if w, _ := f.GetColWidth("links", "B"); w != float64(len("length (m)")+3) {
		t.Errorf("automatic width: got %g, want %d", w, len("length (m)")+3)
	}
	if w, _ := f.GetColWidth("totals", "A"); w != float64(len("feasible links")+1) {
		t.Errorf("automatic width from content: got %g, want %d", w, len("feasible links")+1)
	}
	id, _ := f.GetCellStyle("links", "D2")
	st, err := f.GetStyle(id)
	if err != nil || st.CustomNumFmt == nil || *st.CustomNumFmt != "0.00" {
		t.Errorf("money format: got %+v (%v), want 0.00", st, err)
	}
	id, _ = f.GetCellStyle("links", "A1")
	if st, _ := f.GetStyle(id); st.Font == nil || !st.Font.Bold {
		t.Errorf("header not bold")
	}
}

// openpyxl saves w and runs the Python script on it with openpyxl (Debian package
// python3-openpyxl), the file's path as its argument, and returns what the script printed.
// It skips the test when openpyxl is missing, except in CI.
func openpyxl(t *testing.T, w *Workbook, script string) string {
	t.Helper()
	py := "/usr/bin/python3"
	if err := exec.Command(py, "-c", "import openpyxl").Run(); err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatalf("python3-openpyxl is needed in CI: %v", err)
		}
		t.Skip("python3-openpyxl not installed (apt-get install python3-openpyxl)")
	}
	path := filepath.Join(t.TempDir(), "book.xlsx")
	data, err := w.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command(py, "-c", script, path).CombinedOutput()
	if err != nil {
		t.Fatalf("openpyxl: %v\n%s", err, out)
	}
	return string(out)
}

// TestOpenpyxlCached reads the workbook with openpyxl's data_only mode (python3-openpyxl),
// which reads a formula cell's cached value (ECMA-376 Part 1 §18.3.1.96, v) instead of its
// formula, as pandas and file previewers do: each is the value given to Formula, a number
// stored as a number; a text result is the empty string openpyxl reads as None.
func TestOpenpyxlCached(t *testing.T) {
	t.Parallel()
	out := openpyxl(t, sample(), `import sys, openpyxl
wb = openpyxl.load_workbook(sys.argv[1], data_only=True)
for row in wb["totals"].iter_rows(min_row=2, values_only=True):
    print(repr(row))
`)
	want := `('length', 500.351)
('cost', 12345.72)
('feasible links', 2)
('first note', None)
`
	if out != want {
		t.Errorf("openpyxl data_only read:\n%s\nwant:\n%s", out, want)
	}
}

// TestOpenpyxl reads the workbook with openpyxl (Debian package python3-openpyxl), a reader
// written independently of excelize.
func TestOpenpyxl(t *testing.T) {
	t.Parallel()
	out := openpyxl(t, sample(), `import sys, openpyxl
wb = openpyxl.load_workbook(sys.argv[1])
ws = wb["links"]
print(wb.sheetnames)
print(ws.freeze_panes, ws.auto_filter.ref)
for row in ws.iter_rows(min_row=1, max_row=3, values_only=True):
    print(repr(row))
print(ws["D2"].number_format, ws["B2"].number_format)
print(wb["totals"]["B3"].value)
`)
	want := `['links', 'totals']
A2 $A$1:$F$4
('link', 'length (m)', 'strands', 'cost (EUR)', 'feasible', 'note')
('ADM-LIB', 412.35, 24, 12345.67, True, '0042')
('ADM-SCI', 88, 12, -0.05, False, None)
0.00 0.0
=SUM('links'!$D$2:$D$4)
`
	if out != want {
		t.Errorf("openpyxl read:\n%s\nwant:\n%s", out, want)
	}
}

func TestDeterministic(t *testing.T) {
	t.Parallel()
	a, err := sample().Bytes()
	if err != nil {
		t.Fatal(err)
	}
	for i := 0; i < 10; i++ { // streamed sheets are kept in a map: enough runs to see its order change
		b, err := sample().Bytes()
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(a, b) {
			t.Fatalf("run %d: bytes differ", i)
		}
	}
}

func TestErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name  string
		build func() *Workbook
		want  string
	}{
		{"no sheets", New, "no sheets"},
		{"name too long", func() *Workbook {
			w := New()
			w.AddSheet(strings.Repeat("x", 32), Column{Name: "a"})
			return w
		}, "want 1 to 31 characters"},
		{"bad character", func() *Workbook {
			w := New()
			w.AddSheet("a/b", Column{Name: "a"})
			return w
		}, `sheet name "a/b"`},
		{"name twice", func() *Workbook {
			w := New()
			w.AddSheet("Costs", Column{Name: "a"})
			w.AddSheet("costs", Column{Name: "a"})
			return w
		}, `"costs" used twice`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := tc.build().Bytes()
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: got %v, want error containing %q", tc.name, err, tc.want)
			}
		})
	}
}

func TestAppendTooLongPanics(t *testing.T) {
	t.Parallel()
	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(r.(string), "workbook: ") {
			t.Errorf("got panic %v, want a workbook: panic", r)
		}
	}()
	New().AddSheet("s", Column{Name: "a"}).Append(Int(1), Int(2))
}

func TestColumnName(t *testing.T) {
	t.Parallel()
	// A1 column letters are bijective base 26, XFD the last column (ECMA-376 Part 1 A1
	// references; from memory), checked against excelize's own conversion too.
	cases := []struct {
		col  int
		want string
	}{{0, "A"}, {25, "Z"}, {26, "AA"}, {51, "AZ"}, {52, "BA"}, {701, "ZZ"}, {702, "AAA"}, {16383, "XFD"}}
	for _, tc := range cases {
		t.Run(tc.want, func(t *testing.T) {
			if got := ColumnName(tc.col); got != tc.want {
				t.Errorf("column %d: got %q, want %q", tc.col, got, tc.want)
			}
			ex, err := excelize.ColumnNumberToName(tc.col + 1)
			if err != nil || ex != tc.want {
				t.Errorf("column %d: excelize says %q (%v)", tc.col, ex, err)
			}
		})
	}
	if got := Ref(2, 10); got != "C10" {
		t.Errorf("Ref(2, 10): got %q, want C10", got)
	}
	s := &Sheet{Name: "it's"}
	if got := s.Range(0); got != "'it''s'!$A$2:$A$2" {
		t.Errorf("Range on empty sheet: got %q", got)
	}
}

func TestNonFiniteIsBlank(t *testing.T) {
	t.Parallel()
	for _, x := range []float64{math.Inf(1), math.Inf(-1), math.NaN()} {
		if c := Number(x, 1); c.kind != kindBlank {
			t.Errorf("Number(%g): got kind %d, want blank", x, c.kind)
		}
	}
}

// payloadCells are text cells a spreadsheet would run as formulas if they were stored as
// formulas, or that hold characters that reorder or hide text.
var payloadCells = []struct {
	name, text, stored string
}{
	// OWASP CSV injection guidance: = + - @ start a formula when typed or imported as CSV
	{"equals", `=HYPERLINK("http://x","y")`, `=HYPERLINK("http://x","y")`},
	{"plus", "+1+2", "+1+2"},
	{"minus", "-2+3", "-2+3"},
	{"at", "@SUM(A1:A9)", "@SUM(A1:A9)"},
	{"DDE", "=cmd|' /C calc'!A0", "=cmd|' /C calc'!A0"},
	// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
	{"bidi override", "B\u202E1", "B<U+202E>1"},
	// ECMA-48 control functions
	{"escape", "\x1b[31mx", "<U+001B>[31mx"},
}

func payloadBook() *Workbook {
	w := New()
	s := w.AddSheet("cells", Column{Name: "text"}, Column{Name: "=1+\u202E2"})
	for _, c := range payloadCells {
		s.Append(Text(c.text))
	}
	return w
}

// TestTextNeverFormula stores formula-like and bidi text with Text: each cell must be an
// inline string holding the text (with hidden characters shown), with no formula, as excelize
// reads it back.
func TestTextNeverFormula(t *testing.T) {
	t.Parallel()
	f := reopen(t, payloadBook())
	for i, c := range payloadCells {
		ref := Ref(0, i+2)
		typ, _ := f.GetCellType("cells", ref)
		raw, _ := f.GetCellValue("cells", ref, excelize.Options{RawCellValue: true})
		formula, _ := f.GetCellFormula("cells", ref)
		// ECMA-376 Part 1 §18.3.1.4: t="inlineStr" is a string, f is a formula
		if typ != excelize.CellTypeInlineString || raw != c.stored || formula != "" {
			t.Errorf("%s: got type %v value %q formula %q, want an inline string %q and no formula", c.name, typ, raw, formula, c.stored)
		}
	}
	if h, _ := f.GetCellValue("cells", "B1"); h != "=1+<U+202E>2" {
		t.Errorf("header: got %q, want =1+<U+202E>2", h)
	}
}

// TestTextNeverFormulaOpenpyxl reads the same workbook with openpyxl (python3-openpyxl), a
// reader written independently of excelize: every cell has data type "s" (string), not "f".
func TestTextNeverFormulaOpenpyxl(t *testing.T) {
	t.Parallel()
	out := openpyxl(t, payloadBook(), `import sys, openpyxl
ws = openpyxl.load_workbook(sys.argv[1])["cells"]
for row in ws.iter_rows(min_row=1):
    for c in row:
        print(c.data_type, c.value)
`)
	var want strings.Builder
	want.WriteString("s text\ns =1+<U+202E>2\n")
	for _, c := range payloadCells {
		want.WriteString("s " + c.stored + "\nn None\n")
	}
	if out != want.String() {
		t.Errorf("openpyxl read:\n%s\nwant:\n%s", out, want.String())
	}
}

// TestRowsPacked: every kind of cell comes back from a sheet's packed rows as it was
// appended, rows shorter than the columns included, and the widest cell of each column is
// the widest shown (IEEE 754 bits kept: -0 and a formula's NaN result as given).
func TestRowsPacked(t *testing.T) {
	t.Parallel()
	s := New().AddSheet("s", Column{Name: "a"}, Column{Name: "b"}, Column{Name: "c"})
	rows := [][]Cell{
		{Text("B\u202E1"), Number(1.25, 2), Int(1 << 53)},
		{Blank(), Bool(true)},
		{Formula("SUM(A1:A2)", math.NaN(), 3), FormulaText(`IFERROR(A1,"")`, "é"), Number(math.Copysign(0, -1), -1)},
		{},
		{Text(""), Bool(false), Cents(-12345)},
	}
	for _, r := range rows {
		s.Append(r...)
	}
	if s.Rows() != len(rows) {
		t.Fatalf("%d rows, want %d", s.Rows(), len(rows))
	}
	widest := make([]int, 3)
	err := s.eachRow(func(r int, got []Cell) error {
		want := rows[r]
		if len(got) != len(want) {
			t.Fatalf("row %d: %d cells, want %d", r, len(got), len(want))
		}
		for c := range want {
			g, w := got[c], want[c]
			if math.Float64bits(g.num) != math.Float64bits(w.num) {
				t.Errorf("row %d cell %d: number %v, want %v", r, c, g.num, w.num)
			}
			g.num, w.num = 0, 0
			if g != w {
				t.Errorf("row %d cell %d: %+v, want %+v", r, c, g, w)
			}
			widest[c] = max(widest[c], utf8.RuneCountInString(want[c].display()))
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(s.widest, widest) {
		t.Errorf("widest %v, want %v", s.widest, widest)
	}
}

// TestRowsAsExcelize: the rows writeRows writes into each sheet's part are byte for byte what
// excelize's own StreamWriter.SetRow writes (excelize v2.11.1, the reference), for every kind
// of cell: text that needs escaping, begins or ends with white space, holds _xHHHH_
// sequences (ECMA-376 Part 1 §22.9.2.19) or runs past the 32,767-character limit of a cell;
// numbers of every size and sign with each number of decimals (15 significant digits);
// booleans; formulas with a number, text or no cached value; blanks between cells.
func TestRowsAsExcelize(t *testing.T) {
	long := strings.Repeat("ab", maxCellUnits/2) + "😀tail" // the emoji straddles the limit
	texts := []string{"", "plain", "a & b < c > d", `quote " and ' apostrophe`, " lead", "trail ",
		"\ttab", "line\nfeed", "cr\rhere", "é ü 中文", "bad \xff utf-8", "_x0041_", "_x005F_",
		"_x005F_x0041_", "_x005F_xZZZZ_", "_xD800_ lone half", "a_x00e9_b_x005f_c", long,
		"=1+2", "\u202e hidden", "end\n"}
	rng := rand.New(rand.NewPCG(16, 7))
	w := New()
	for sh := range 3 {
		cols := make([]Column, 9)
		for c := range cols {
			cols[c] = Column{Name: fmt.Sprintf("column %d", c), Unit: "m"}
		}
		s := w.AddSheet(fmt.Sprintf("sheet %d", sh), cols...)
		s.Filter = sh != 1
		for r := range 400 {
			x := (rng.Float64() - 0.5) * math.Pow(10, float64(rng.IntN(44)-22))
			switch r % 9 {
			case 1:
				x = math.MaxFloat64
			case 2:
				x = -math.SmallestNonzeroFloat64
			case 3:
				x = float64(rng.Int64())
			}
			text := texts[r%len(texts)]
			row := []Cell{
				{kind: kindText, text: text},
				Text(text),
				Number(x, rng.IntN(MaxDecimals+2)-1),
				Int(rng.Int64N(1 << 40)),
				Bool(r%2 == 0),
				Formula(fmt.Sprintf("SUM(C%d:D%d)", r+2, r+2), x, rng.IntN(4)-1),
				FormulaText(fmt.Sprintf("IF(E%d,\"yes\",\"\")", r+2), text),
				Formula("1/0", math.NaN(), 2),
			}
			if r%5 == 0 {
				row[3] = Blank()
			}
			s.Append(row[:1+r%len(row)]...)
		}
	}
	got, err := w.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	w.viaSetRow = true
	want, err := w.Bytes()
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, want) {
		gs, ws := sheetXML(t, got, "xl/worksheets/sheet1.xml"), sheetXML(t, want, "xl/worksheets/sheet1.xml")
		i := 0
		for i < len(gs) && i < len(ws) && gs[i] == ws[i] {
			i++
		}
		t.Fatalf("rows differ from excelize's (%d and %d bytes); sheet1 first differs at byte %d:\n got %.200q\nwant %.200q", len(got), len(want), i, gs[max(0, i-40):], ws[max(0, i-40):])
	}
}

// sheetXML is the uncompressed part name of the .xlsx data.
func sheetXML(t *testing.T, data []byte, name string) string {
	t.Helper()
	zr, err := zip.NewReader(bytes.NewReader(data), int64(len(data)))
	if err != nil {
		t.Fatal(err)
	}
	f, err := zr.Open(name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	b, err := io.ReadAll(f)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestWidthAsDisplayed: a cell's width, measured without building its text, is the number of
// characters of the text a spreadsheet shows (display) for every kind of cell.
func TestWidthAsDisplayed(t *testing.T) {
	rng := rand.New(rand.NewPCG(16, 8))
	s := &Sheet{}
	for i := range 2000 {
		x := (rng.Float64() - 0.5) * math.Pow(10, float64(rng.IntN(60)-30))
		d := rng.IntN(MaxDecimals+2) - 1
		for _, c := range []Cell{Number(x, d), Formula("A1", x, d), Formula("A1", math.NaN(), d), FormulaText("A1", "é"), Text("ü"), Bool(i%2 == 0), Blank(), Int(rng.Int64())} {
			if got, want := s.width(c), utf8.RuneCountInString(c.display()); got != want {
				t.Fatalf("%+v: width %d, shown as %q (%d characters)", c, got, c.display(), want)
			}
		}
	}
}
