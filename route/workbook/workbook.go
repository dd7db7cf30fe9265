package workbook

import (
	"archive/zip"
	"bytes"
	"compress/flate"
	"context"
	"encoding/binary"
	"errors"
	"fmt"
	"hash"
	"hash/crc32"
	"io"
	"io/fs"
	"math"
	"sort"
	"strconv"
	"strings"
	"sync"
	"unicode/utf8"

	"github.com/xuri/excelize/v2"

	"spanwright/route/escape"
	"spanwright/route/internal/ctxio"
)

// Column widths, in characters of the default font.
const (
	// MinWidth is the narrowest column an automatic width gives.
	MinWidth = 6
	// MaxWidth is the widest column an automatic width gives; longer text is cut off on screen
	// but kept whole in the cell.
	MaxWidth = 60
)

// MaxDecimals is the most decimals a Number or Formula cell may show.
const MaxDecimals = 10

type kind uint8

const (
	kindBlank kind = iota
	kindText
	kindNumber
	kindBool
	kindFormula
)

// Cell is one typed value of a row. The zero Cell is blank.
type Cell struct {
	kind     kind
	text     string  // text, or formula without the leading "="
	num      float64 // number value, or a formula's cached numeric result
	decimals int     // decimals shown for numbers and formulas; -1 for general format
	b        bool
	// cachedText marks a formula whose cached result is the text cached, not num.
	cachedText bool
	cached     string
}

// Blank returns an empty cell.
func Blank() Cell { return Cell{} }

// Text returns a text cell, stored as a string even when it looks like a number or a
// formula ("=1+2" is the text =1+2, never calculated). Hidden characters (bidirectional
// controls, other invisible format characters, control characters) are shown as their code
// points, "<U+202E>", as in every output (see package escape).
func Text(s string) Cell { return Cell{kind: kindText, text: escape.Visible(s)} }

// Number returns a number cell shown with the given decimals (0 to MaxDecimals, or -1 for the
// spreadsheet's general format); the value is stored at full precision. NaN and infinities
// have no spreadsheet form and are stored as blank cells.
func Number(x float64, decimals int) Cell {
	checkDecimals(decimals)
	if math.IsNaN(x) || math.IsInf(x, 0) {
		return Cell{}
	}
	return Cell{kind: kindNumber, num: x, decimals: decimals}
}

// Int returns an integer number cell.
func Int(n int64) Cell { return Cell{kind: kindNumber, num: float64(n), decimals: 0} }

// Cents returns a money cell for an amount in integer cents: it is stored as a number in
// currency units (cents / 100) and shown with two decimals.
func Cents(c int64) Cell { return Cell{kind: kindNumber, num: float64(c) / 100, decimals: 2} }

// Bool returns a TRUE/FALSE cell.
func Bool(b bool) Cell { return Cell{kind: kindBool, b: b} }

// Formula returns a formula cell; expr is written without the leading "=", in the
// spreadsheet's English syntax with A1 references (see Ref and Sheet.Range), and its result is
// shown with the given decimals (-1 for general format). value is the formula's result as
// the caller works it out from the same figures; it is stored as the cell's cached value
// (ECMA-376 Part 1 §18.3.1.96, the v element beside f), so that readers that do not calculate
// (openpyxl with data_only, pandas, file previewers) see it. A spreadsheet program
// recalculates the formula and shows the same. A value that is not finite is stored as no
// cached value.
func Formula(expr string, value float64, decimals int) Cell {
	checkDecimals(decimals)
	return Cell{kind: kindFormula, text: strings.TrimPrefix(expr, "="), num: value, decimals: decimals}
}

// FormulaText is Formula for a formula whose result is text, value (such as the "" of an
// IFERROR that finds nothing).
func FormulaText(expr, value string) Cell {
	return Cell{kind: kindFormula, text: strings.TrimPrefix(expr, "="), decimals: -1, cachedText: true, cached: value}
}

func checkDecimals(d int) {
	if d < -1 || d > MaxDecimals {
		panic(fmt.Sprintf("workbook: decimals %d out of range -1..%d", d, MaxDecimals))
	}
}

// display is the cell as a spreadsheet shows it, used to size columns.
func (c Cell) display() string {
	switch c.kind {
	case kindText:
		return c.text
	case kindNumber:
		return strconv.FormatFloat(c.num, 'f', c.decimals, 64)
	case kindBool:
		if c.b {
			return "TRUE"
		}
		return "FALSE"
	case kindFormula:
		if c.cachedText {
			return c.cached
		}
		if c.decimals < 0 {
			return strconv.FormatFloat(c.num, 'g', -1, 64)
		}
		return strconv.FormatFloat(c.num, 'f', c.decimals, 64)
	}
	return ""
}

// Column describes one column of a sheet.
type Column struct {
	Name string // header text
	// Unit is shown after the name in parentheses, e.g. "length" with unit "m" heads the
	// column "length (m)"; "" for none.
	Unit string
	// Width is the column width in characters; 0 sizes the column to its header and
	// content, between MinWidth and MaxWidth.
	Width float64
}

// Header returns the column's header text: the name, then the unit in parentheses, hidden
// characters shown as Text shows them.
func (c Column) Header() string {
	if c.Unit == "" {
		return escape.Visible(c.Name)
	}
	return escape.Visible(c.Name + " (" + c.Unit + ")")
}

// Sheet is one worksheet: a header row made from its columns, then its rows in the order
// they were appended.
type Sheet struct {
	Name    string
	Columns []Column
	// Filter, when true, adds filter buttons to the header row.
	Filter bool
	// The rows appended, packed (appendCell) one after the other: a large workbook holds
	// hundreds of thousands of cells, and a Cell is 64 bytes before its text.
	rows    []byte
	nrows   int
	widest  []int  // per column, the widest cell appended, in characters as shown
	scratch []byte // a number's text, to measure it
}

// Append adds a row; a row shorter than the columns ends with blank cells. It panics if the
// row has more cells than the sheet has columns.
func (s *Sheet) Append(cells ...Cell) {
	if len(cells) > len(s.Columns) {
		panic(fmt.Sprintf("workbook: sheet %q: row of %d cells, sheet has %d columns", s.Name, len(cells), len(s.Columns)))
	}
	if len(s.widest) < len(s.Columns) {
		s.widest = append(s.widest, make([]int, len(s.Columns)-len(s.widest))...)
	}
	s.rows = binary.AppendUvarint(s.rows, uint64(len(cells)))
	for c, cell := range cells {
		s.rows = appendCell(s.rows, cell)
		s.widest[c] = max(s.widest[c], s.width(cell))
	}
	s.nrows++
}

// width is the number of characters of c as shown (display), numbers formatted into the
// sheet's scratch buffer rather than a new string each.
func (s *Sheet) width(c Cell) int {
	switch {
	case c.kind == kindNumber, c.kind == kindFormula && !c.cachedText:
		format, decimals := byte('f'), c.decimals
		if c.kind == kindFormula && decimals < 0 {
			format = 'g'
		}
		s.scratch = strconv.AppendFloat(s.scratch[:0], c.num, format, decimals, 64)
		return len(s.scratch) // digits, sign, point and exponent: one byte a character
	}
	return utf8.RuneCountInString(c.display())
}

// Rows returns the number of rows appended, the header not counted.
func (s *Sheet) Rows() int { return s.nrows }

// eachRow calls f with every row appended, in order, as long as f returns nil; the row's
// slice is reused from one call to the next.
func (s *Sheet) eachRow(f func(r int, row []Cell) error) error {
	var row []Cell
	data := s.rows
	for r := 0; r < s.nrows; r++ {
		n, k := binary.Uvarint(data)
		data = data[k:]
		row = row[:0]
		for range n {
			var c Cell
			c, data = readCell(data)
			row = append(row, c)
		}
		if err := f(r, row); err != nil {
			return err
		}
	}
	return nil
}

// appendCell packs c onto b: its kind, then what the kind needs (text and cached text
// length-prefixed, numbers as their IEEE 754 bits, decimals shifted by one to fit a byte).
func appendCell(b []byte, c Cell) []byte {
	b = append(b, byte(c.kind))
	str := func(b []byte, s string) []byte {
		return append(binary.AppendUvarint(b, uint64(len(s))), s...)
	}
	switch c.kind {
	case kindText:
		b = str(b, c.text)
	case kindNumber:
		b = binary.LittleEndian.AppendUint64(append(b, byte(c.decimals+1)), math.Float64bits(c.num))
	case kindBool:
		b = append(b, boolByte(c.b))
	case kindFormula:
		b = binary.LittleEndian.AppendUint64(append(str(b, c.text), byte(c.decimals+1)), math.Float64bits(c.num))
		b = str(append(b, boolByte(c.cachedText)), c.cached)
	}
	return b
}

func boolByte(v bool) byte {
	if v {
		return 1
	}
	return 0
}

// readCell unpacks the cell appendCell packed at the start of b and returns the rest.
func readCell(b []byte) (Cell, []byte) {
	c := Cell{kind: kind(b[0])}
	b = b[1:]
	str := func() string {
		n, k := binary.Uvarint(b)
		s := string(b[k : k+int(n)])
		b = b[k+int(n):]
		return s
	}
	num := func() {
		c.decimals = int(b[0]) - 1
		c.num = math.Float64frombits(binary.LittleEndian.Uint64(b[1:9]))
		b = b[9:]
	}
	switch c.kind {
	case kindText:
		c.text = str()
	case kindNumber:
		num()
	case kindBool:
		c.b, b = b[0] == 1, b[1:]
	case kindFormula:
		c.text = str()
		num()
		c.cachedText, b = b[0] == 1, b[1:]
		c.cached = str()
	}
	return c, b
}

// Range returns an absolute reference to the data cells of column col (0-based) on this
// sheet, for formulas on any sheet: 'cost sheet'!$F$2:$F$101. With no rows it refers to the
// first data row alone.
func (s *Sheet) Range(col int) string {
	last := s.nrows + 1
	if last < 2 {
		last = 2
	}
	c := ColumnName(col)
	return quoteSheet(s.Name) + "!$" + c + "$2:$" + c + "$" + strconv.Itoa(last)
}

func quoteSheet(name string) string {
	return "'" + strings.ReplaceAll(name, "'", "''") + "'"
}

// ColumnName returns the spreadsheet letters of column col, 0-based: 0 is "A", 26 is "AA".
// It panics if col is negative.
func ColumnName(col int) string {
	if col < 0 {
		panic(fmt.Sprintf("workbook: negative column %d", col))
	}
	var b []byte
	for n := col + 1; n > 0; n = (n - 1) / 26 {
		b = append([]byte{byte('A' + (n-1)%26)}, b...)
	}
	return string(b)
}

// Ref returns the A1 reference of column col (0-based) and spreadsheet row row (1-based; the
// header is row 1, the first appended row is row 2). It panics on a negative column or a row
// below 1.
func Ref(col, row int) string {
	if row < 1 {
		panic(fmt.Sprintf("workbook: row %d below 1", row))
	}
	return ColumnName(col) + strconv.Itoa(row)
}

// Workbook is a set of sheets, written in the order they were added.
type Workbook struct {
	sheets    []*Sheet
	viaSetRow bool // see builder.viaSetRow
}

// New returns an empty workbook.
func New() *Workbook { return &Workbook{} }

// AddSheet adds a sheet with the given columns and returns it for rows to be appended.
func (w *Workbook) AddSheet(name string, cols ...Column) *Sheet {
	s := &Sheet{Name: name, Columns: cols}
	w.sheets = append(w.sheets, s)
	return s
}

// Sheets returns the sheets in order.
func (w *Workbook) Sheets() []*Sheet { return w.sheets }

// Bytes renders the workbook as .xlsx bytes. It returns an error for a workbook without
// sheets, a sheet name the format does not allow (empty, longer than 31 characters, or with
// one of : \ / ? * [ ]) or a name used twice. Formulas are not checked: a wrong one shows as
// an error in the spreadsheet program.
func (w *Workbook) Bytes() ([]byte, error) {
	return w.BytesContext(context.Background())
}

// BytesContext is Bytes that gives up when ctx is done, returning ctx's error: it looks at
// ctx between sheets, every rowCheckEvery rows and at every write of the packed file.
func (w *Workbook) BytesContext(ctx context.Context) ([]byte, error) {
	var buf bytes.Buffer
	if _, err := w.writeTo(ctx, &buf); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// WriteTo renders the workbook as .xlsx and writes it to out; errors are those of Bytes and
// of out.
func (w *Workbook) WriteTo(out io.Writer) (int64, error) {
	return w.writeTo(context.Background(), out)
}

// WriteToContext is WriteTo that gives up when ctx is done, returning ctx's error, as
// BytesContext does; out may then hold part of a file.
func (w *Workbook) WriteToContext(ctx context.Context, out io.Writer) error {
	_, err := w.writeTo(ctx, out)
	return err
}

func (w *Workbook) writeTo(ctx context.Context, out io.Writer) (int64, error) {
	// excelize's WriteTo packs the file into a buffer of its own and then copies it to out;
	// the zip writer it is given (sortedZip) writes to out itself instead, so the packed file
	// is never held whole, and excelize's buffer stays empty.
	cw := &countWriter{w: ctxio.Writer(ctx, out)}
	f, err := w.build(ctx, cw)
	if err != nil {
		return 0, err
	}
	defer f.Close()
	_, err = f.WriteTo(cw)
	if err := ctx.Err(); err != nil {
		return cw.n, err
	}
	if err != nil {
		return cw.n, fmt.Errorf("workbook: write: %w", err)
	}
	return cw.n, nil
}

// countWriter counts the bytes written through it.
type countWriter struct {
	w io.Writer
	n int64
}

func (c *countWriter) Write(p []byte) (int, error) {
	n, err := c.w.Write(p)
	c.n += int64(n)
	return n, err
}

// rowCheckEvery is how many rows a sheet renders between two looks at the context.
const rowCheckEvery = 256

// build lays out the workbook; its zip writer writes the packed file to out.
func (w *Workbook) build(ctx context.Context, out io.Writer) (*excelize.File, error) {
	if len(w.sheets) == 0 {
		return nil, fmt.Errorf("workbook: no sheets")
	}
	seen := map[string]bool{}
	for _, s := range w.sheets {
		if err := checkSheetName(s.Name); err != nil {
			return nil, err
		}
		key := strings.ToLower(s.Name)
		if seen[key] {
			return nil, fmt.Errorf("workbook: sheet name %q used twice", s.Name)
		}
		seen[key] = true
	}
	f := excelize.NewFile()
	b := &builder{ctx: ctx, f: f, styles: map[styleKey]int{}, rowsOf: map[string]*Sheet{}, viaSetRow: w.viaSetRow}
	f.SetZipWriter(func(io.Writer) excelize.ZipWriter { return newSortedZip(ctx, out, b) })
	for i, s := range w.sheets {
		err := ctx.Err()
		if err == nil && i == 0 {
			err = f.SetSheetName(f.GetSheetName(0), s.Name)
		} else if err == nil {
			_, err = f.NewSheet(s.Name)
		}
		if err == nil {
			err = b.sheet(s)
		}
		if err != nil {
			f.Close()
			return nil, fmt.Errorf("workbook: sheet %q: %w", s.Name, err)
		}
	}
	// The first sheet is active in a new file. Setting it again would make excelize read every
	// streamed sheet back in.
	full := true
	if err := f.SetCalcProps(&excelize.CalcPropsOptions{FullCalcOnLoad: &full}); err != nil {
		f.Close()
		return nil, fmt.Errorf("workbook: %w", err)
	}
	return f, nil
}

func checkSheetName(name string) error {
	if name == "" || utf8.RuneCountInString(name) > 31 || strings.ContainsAny(name, `:\/?*[]`) ||
		strings.HasPrefix(name, "'") || strings.HasSuffix(name, "'") {
		return fmt.Errorf("workbook: sheet name %q: want 1 to 31 characters, none of : \\ / ? * [ ] and no leading or trailing '", name)
	}
	return nil
}

type styleKey struct {
	header   bool
	decimals int // -1 general, -2 none (text, bool)
}

type builder struct {
	ctx    context.Context
	f      *excelize.File
	styles map[styleKey]int
	// rowsOf maps the part of each sheet laid out to the sheet, whose rows writeRows writes
	// into it; sheets counts the sheets laid out.
	rowsOf map[string]*Sheet
	sheets int
	// viaSetRow writes every row through excelize's StreamWriter.SetRow instead, as this
	// package did before writeRows: the tests' reference for the bytes writeRows writes.
	viaSetRow bool
}

// style returns the style for the key, creating styles in first-use order so the output is
// the same every time.
func (b *builder) style(k styleKey) (int, error) {
	if id, ok := b.styles[k]; ok {
		return id, nil
	}
	st := &excelize.Style{}
	if k.header {
		st.Font = &excelize.Font{Bold: true}
		st.Alignment = &excelize.Alignment{WrapText: false, Vertical: "top"}
	}
	if k.decimals >= 0 {
		fmtCode := "0"
		if k.decimals > 0 {
			fmtCode += "." + strings.Repeat("0", k.decimals)
		}
		st.CustomNumFmt = &fmtCode
	}
	id, err := b.f.NewStyle(st)
	if err != nil {
		return 0, err
	}
	b.styles[k] = id
	return id, nil
}

// sheet writes one sheet with excelize's stream writer, which renders rows straight to XML:
// widths, panes and the filter are set first, then the rows.
func (b *builder) sheet(s *Sheet) error {
	f := b.f
	widths := make([]int, len(s.Columns))
	for c, col := range s.Columns {
		widths[c] = utf8.RuneCountInString(col.Header()) + 2 // room for filter buttons
		if c < len(s.widest) {
			widths[c] = max(widths[c], s.widest[c])
		}
	}
	if s.Filter && len(s.Columns) > 0 {
		last := Ref(len(s.Columns)-1, max(s.nrows+1, 1))
		if err := f.AutoFilter(s.Name, "A1:"+last, nil); err != nil {
			return err
		}
	}
	sw, err := f.NewStreamWriter(s.Name)
	if err != nil {
		return err
	}
	for c, col := range s.Columns {
		width := col.Width
		if width <= 0 {
			width = float64(min(max(widths[c]+1, MinWidth), MaxWidth))
		}
		if err := sw.SetColWidth(c+1, c+1, width); err != nil {
			return err
		}
	}
	if len(s.Columns) > 0 {
		if err := sw.SetPanes(&excelize.Panes{Freeze: true, YSplit: 1, TopLeftCell: "A2", ActivePane: "bottomLeft",
			Selection: []excelize.Selection{{SQRef: "A2", ActiveCell: "A2", Pane: "bottomLeft"}}}); err != nil {
			return err
		}
		hdr, err := b.style(styleKey{header: true, decimals: -2})
		if err != nil {
			return err
		}
		vals := make([]any, len(s.Columns))
		for c, col := range s.Columns {
			vals[c] = excelize.Cell{StyleID: hdr, Value: col.Header()}
		}
		if err := sw.SetRow("A1", vals); err != nil {
			return err
		}
	}
	if !b.viaSetRow {
		// The rows are written when excelize writes the sheet's part (writeRows); excelize
		// writes the styles before the sheets, so every style the rows use is made now, in
		// the order the rows first use them.
		if err := b.registerStyles(s); err != nil {
			return err
		}
		b.rowsOf[sheetPart(b.sheets)] = s
		b.sheets++
		return sw.Flush()
	}
	err = s.eachRow(func(r int, row []Cell) error {
		if r%rowCheckEvery == 0 {
			if err := b.ctx.Err(); err != nil {
				return err
			}
		}
		vals := make([]any, len(row))
		for c, cell := range row {
			v, err := b.value(cell)
			if err != nil {
				return fmt.Errorf("cell %s: %w", Ref(c, r+2), err)
			}
			vals[c] = v
		}
		if err := sw.SetRow(Ref(0, r+2), vals); err != nil {
			return fmt.Errorf("row %d: %w", r+2, err)
		}
		return nil
	})
	if err != nil {
		return err
	}
	return sw.Flush()
}

// registerStyles makes the styles of s's cells, in the order its rows first use them.
func (b *builder) registerStyles(s *Sheet) error {
	return s.eachRow(func(r int, row []Cell) error {
		for c, cell := range row {
			if (cell.kind == kindNumber || cell.kind == kindFormula) && cell.decimals >= 0 {
				if _, err := b.style(styleKey{decimals: cell.decimals}); err != nil {
					return fmt.Errorf("cell %s: %w", Ref(c, r+2), err)
				}
			}
		}
		return nil
	})
}

// sheetPart is the name of the part excelize writes the i-th sheet (0-based) of a new file
// to: the first sheet of a new file is sheet1.xml, and each sheet added takes the next number.
func sheetPart(i int) string { return "xl/worksheets/sheet" + strconv.Itoa(i+1) + ".xml" }

// value is the stream writer's form of a cell; nil for a blank.
func (b *builder) value(c Cell) (any, error) {
	switch c.kind {
	case kindBlank:
		return nil, nil
	case kindText:
		return c.text, nil
	case kindBool:
		return c.b, nil
	case kindNumber, kindFormula:
		out := excelize.Cell{Value: c.num}
		if c.kind == kindFormula {
			// excelize's stream writer writes the formula and, after it, the value as the
			// cached result: <c><f>…</f><v>…</v></c>.
			out.Formula = c.text
			switch {
			case c.cachedText:
				out.Value = c.cached
			case math.IsNaN(c.num) || math.IsInf(c.num, 0):
				out.Value = nil
			}
		}
		if c.decimals >= 0 {
			id, err := b.style(styleKey{decimals: c.decimals})
			if err != nil {
				return nil, err
			}
			out.StyleID = id
		}
		return out, nil
	}
	panic("workbook: unknown cell kind")
}

// sortedZip collects the parts excelize writes and stores them in name order when closed:
// excelize writes streamed sheets in map order, which would change the bytes from run to run.
// Each part is compressed as it is written (a sheet's XML is about ten times its deflated
// size, and a large workbook's sheets are hundreds of megabytes of it) and the compressed
// parts are stored as they are (zip.Writer.CreateRaw), with the headers CreateHeader would
// write, so the file is the same bytes as compressing them at the close. Once ctx is done,
// every write and the close fail with its error.
type sortedZip struct {
	ctx   context.Context
	w     io.Writer
	parts map[string]*zipPart
	open  *zipPart // the part being written: excelize writes one part at a time, as zip.Writer wants
	b     *builder // whose sheets' rows are spliced into their parts (spliceRows)
	rowed int      // how many sheets' rows were spliced in
}

// zipPart is one part, deflated as it is written.
type zipPart struct {
	data   bytes.Buffer // deflated
	crc    hash.Hash32  // of the part as written
	size   uint64       // bytes written
	comp   io.WriteCloser
	splice *spliceRows // a sheet's part, into which its rows are written; nil for others
}

func (p *zipPart) Write(b []byte) (int, error) {
	p.crc.Write(b)
	p.size += uint64(len(b))
	return p.comp.Write(b)
}

func newSortedZip(ctx context.Context, w io.Writer, b *builder) excelize.ZipWriter {
	return &sortedZip{ctx: ctx, w: w, parts: map[string]*zipPart{}, b: b}
}

func (z *sortedZip) Create(name string) (io.Writer, error) {
	if err := z.closePart(); err != nil {
		return nil, err
	}
	p := &zipPart{crc: crc32.NewIEEE()}
	comp, err := fastDeflate(&p.data)
	if err != nil {
		return nil, err
	}
	p.comp = comp
	z.parts[name], z.open = p, p
	w := ctxio.Writer(z.ctx, p)
	if s := z.b.rowsOf[name]; s != nil {
		p.splice = &spliceRows{w: w, rows: func(w io.Writer) error { return z.b.writeRows(w, s) }}
		return p.splice, nil
	}
	return w, nil
}

// closePart ends the compression of the part being written.
func (z *sortedZip) closePart() error {
	if z.open == nil {
		return nil
	}
	p := z.open
	z.open = nil
	if p.splice != nil {
		if err := p.splice.close(); err != nil {
			return err
		}
		z.rowed++
	}
	return p.comp.Close()
}

// spliceRows passes a sheet's part through, writing the sheet's rows (rows) just before
// its </sheetData>, which excelize writes once, after the header row.
type spliceRows struct {
	w    io.Writer
	rows func(io.Writer) error
	held []byte // the end of what was written, which may be the start of the mark
	done bool   // the rows are written
}

var sheetDataEnd = []byte("</sheetData>")

func (s *spliceRows) Write(p []byte) (int, error) {
	if s.done {
		return s.w.Write(p)
	}
	s.held = append(s.held, p...)
	i := bytes.Index(s.held, sheetDataEnd)
	if i < 0 {
		// Keep what could be the start of the mark; pass the rest on.
		keep := min(len(s.held), len(sheetDataEnd)-1)
		if _, err := s.w.Write(s.held[:len(s.held)-keep]); err != nil {
			return 0, err
		}
		s.held = append(s.held[:0], s.held[len(s.held)-keep:]...)
		return len(p), nil
	}
	if _, err := s.w.Write(s.held[:i]); err != nil {
		return 0, err
	}
	if err := s.rows(s.w); err != nil {
		return 0, err
	}
	s.done = true
	_, err := s.w.Write(s.held[i:])
	s.held = nil
	return len(p), err
}

// close fails when the part had no </sheetData>: the rows were not written.
func (s *spliceRows) close() error {
	if !s.done {
		return errors.New("workbook: a sheet's part has no sheetData for its rows")
	}
	return nil
}

func (z *sortedZip) AddFS(fs.FS) error {
	return fmt.Errorf("workbook: adding a file system to a workbook is not supported")
}

func (z *sortedZip) Close() error {
	if err := z.closePart(); err != nil {
		return err
	}
	if z.rowed != len(z.b.rowsOf) {
		return fmt.Errorf("workbook: the rows of %d sheets were written, of %d", z.rowed, len(z.b.rowsOf))
	}
	names := make([]string, 0, len(z.parts))
	for n := range z.parts {
		names = append(names, n)
	}
	sort.Strings(names)
	zw := zip.NewWriter(z.w)
	for _, n := range names {
		if err := z.ctx.Err(); err != nil {
			return err
		}
		p := z.parts[n]
		// The header zip.Writer.CreateHeader gives a part it compresses: version 2.0, sizes
		// and checksum in a data descriptor after the data (APPNOTE.TXT 4.3.9), no time.
		fw, err := zw.CreateRaw(&zip.FileHeader{Name: n, Method: zip.Deflate, Flags: 0x8,
			CreatorVersion: zipVersion20, ReaderVersion: zipVersion20,
			CRC32: p.crc.Sum32(), CompressedSize64: uint64(p.data.Len()), UncompressedSize64: p.size})
		if err != nil {
			return err
		}
		if _, err := fw.Write(p.data.Bytes()); err != nil {
			return err
		}
		delete(z.parts, n) // written: let it go
	}
	return zw.Close()
}

// zipVersion20 is the zip format version 2.0 (deflate), as archive/zip writes it
// (PKWARE APPNOTE.TXT 4.4.3).
const zipVersion20 = 20

// flateWriters are reused: a compressor holds about a megabyte of state.
var flateWriters = sync.Pool{New: func() any {
	w, err := flate.NewWriter(io.Discard, flate.BestSpeed)
	if err != nil {
		panic("workbook: " + err.Error())
	}
	return w
}}

// fastDeflate compresses parts at deflate's best speed: a spreadsheet's XML is repetitive, so
// the file stays small, and sweeps write one workbook per scenario.
func fastDeflate(w io.Writer) (io.WriteCloser, error) {
	fw := flateWriters.Get().(*flate.Writer)
	fw.Reset(w)
	return &pooledFlate{fw}, nil
}

type pooledFlate struct{ *flate.Writer }

func (p *pooledFlate) Close() error {
	if p.Writer == nil {
		return nil
	}
	err := p.Writer.Close()
	flateWriters.Put(p.Writer)
	p.Writer = nil
	return err
}
