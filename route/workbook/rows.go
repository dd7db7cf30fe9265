package workbook

import (
	"bytes"
	"encoding/xml"
	"io"
	"math"
	"regexp"
	"strconv"
	"strings"
	"unicode/utf16"
)

// The rows of a sheet are written here as SpreadsheetML (ECMA-376 Part 1 §18.3.1.73 row,
// §18.3.1.4 c), straight into the sheet's compressed part, byte for byte as excelize's
// StreamWriter.SetRow would write them (TestRowsAsExcelize holds the two to the same bytes):
// excelize lays out the rest of the file (its header row included) and this writer fills
// the sheet's rows in when excelize writes the sheet's part (sortedZip, spliceRows). Going
// through SetRow cost a boxed value per cell, a cell reference parsed back per row and the
// sheet's XML buffered whole (or in a temporary file past 16 MiB) before it was compressed.

// rowFlushAt is how many bytes of rows are gathered before they go to the compressor.
const rowFlushAt = 32 << 10

// writeRows writes the data rows of s (spreadsheet rows 2 and on) to w, looking at ctx every
// rowCheckEvery rows. Every style a cell needs was registered (b.registerStyles).
func (b *builder) writeRows(w io.Writer, s *Sheet) error {
	cols := make([]string, len(s.Columns))
	for c := range cols {
		cols[c] = ColumnName(c)
	}
	buf := make([]byte, 0, rowFlushAt+4<<10)
	var esc bytes.Buffer
	err := s.eachRow(func(r int, row []Cell) error {
		if r%rowCheckEvery == 0 {
			if err := b.ctx.Err(); err != nil {
				return err
			}
		}
		buf = b.appendRow(buf, &esc, cols, r+2, row)
		if len(buf) >= rowFlushAt {
			if _, err := w.Write(buf); err != nil {
				return err
			}
			buf = buf[:0]
		}
		return nil
	})
	if err == nil && len(buf) > 0 {
		_, err = w.Write(buf)
	}
	return err
}

// appendRow appends spreadsheet row rn: <row r="rn">, its cells but the blank ones, </row>.
func (b *builder) appendRow(buf []byte, esc *bytes.Buffer, cols []string, rn int, row []Cell) []byte {
	buf = append(buf, `<row r="`...)
	buf = strconv.AppendInt(buf, int64(rn), 10)
	buf = append(buf, `">`...)
	for c, cell := range row {
		if cell.kind == kindBlank {
			continue
		}
		space, typ, value := false, "", ""
		switch cell.kind {
		case kindText:
			v, sp := cellText(cell.text, esc, true)
			buf = append(buf, `<c r="`...)
			buf = appendRef(buf, cols[c], rn)
			buf = append(buf, `" t="inlineStr"><is><t`...)
			if sp {
				buf = append(buf, ` xml:space="preserve"`...)
			}
			buf = append(buf, '>')
			buf = append(buf, v...)
			buf = append(buf, `</t></is></c>`...)
			continue
		case kindBool:
			typ, value = "b", "0"
			if cell.b {
				value = "1"
			}
		case kindNumber:
			value = floatText(cell.num)
		case kindFormula:
			switch {
			case cell.cachedText:
				typ = "str"
				value, space = cellText(cell.cached, esc, false)
			case math.IsNaN(cell.num) || math.IsInf(cell.num, 0):
				typ = "str"
			default:
				value = floatText(cell.num)
			}
		}
		buf = append(buf, `<c`...)
		if space {
			buf = append(buf, ` xml:space="preserve"`...)
		}
		buf = append(buf, ` r="`...)
		buf = appendRef(buf, cols[c], rn)
		buf = append(buf, '"')
		if (cell.kind == kindNumber || cell.kind == kindFormula) && cell.decimals >= 0 {
			if id := b.styles[styleKey{decimals: cell.decimals}]; id != 0 {
				buf = append(buf, ` s="`...)
				buf = strconv.AppendInt(buf, int64(id), 10)
				buf = append(buf, '"')
			}
		}
		if typ != "" {
			buf = append(buf, ` t="`...)
			buf = append(buf, typ...)
			buf = append(buf, '"')
		}
		buf = append(buf, '>')
		if cell.kind == kindFormula {
			buf = append(buf, `<f>`...)
			buf = appendEscaped(buf, esc, cell.text)
			buf = append(buf, `</f>`...)
		}
		if value != "" {
			buf = append(buf, `<v>`...)
			buf = appendEscaped(buf, esc, value)
			buf = append(buf, `</v>`...)
		}
		buf = append(buf, `</c>`...)
	}
	return append(buf, `</row>`...)
}

func appendRef(buf []byte, col string, rn int) []byte {
	return strconv.AppendInt(append(buf, col...), int64(rn), 10)
}

// plainXML reports whether s needs no escaping as XML character data: printable ASCII
// without & < > " '.
func plainXML(s string) bool {
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case c < 0x20 || c >= 0x7f, c == '&', c == '<', c == '>', c == '"', c == '\'':
			return false
		}
	}
	return true
}

// appendEscaped appends s escaped as encoding/xml.EscapeText escapes it (which is what
// excelize uses), through esc when s is not plain.
func appendEscaped(buf []byte, esc *bytes.Buffer, s string) []byte {
	if plainXML(s) {
		return append(buf, s...)
	}
	esc.Reset()
	_ = xml.EscapeText(esc, []byte(s)) // a bytes.Buffer does not fail
	return append(buf, esc.Bytes()...)
}

// maxCellUnits is the most UTF-16 code units a cell's text may hold (ECMA-376's limit for a
// cell, 32,767 characters, as excelize applies it: longer text is cut).
const maxCellUnits = 32767

// cellText is a cell's text as excelize stores it: cut to maxCellUnits UTF-16 units, escaped
// as XML but for line feeds when escape is true (inline strings), with _xHHHH_ sequences
// that would read as escaped characters escaped themselves (ECMA-376 Part 1 §22.9.2.19,
// ST_Xstring); space says whether it begins or ends with a tab, line feed, carriage return or
// space, which xml:space="preserve" keeps.
func cellText(s string, esc *bytes.Buffer, escape bool) (v string, space bool) {
	if len(s) > maxCellUnits {
		units := 0
		for i, r := range s {
			if units += utf16.RuneLen(r); units > maxCellUnits {
				s = s[:i]
				break
			}
		}
	}
	if s == "" {
		return "", false
	}
	switch s[0] {
	case '\t', '\n', '\r', ' ':
		space = true
	}
	switch s[len(s)-1] {
	case '\t', '\n', '\r', ' ':
		space = true
	}
	if escape && !plainXML(s) {
		esc.Reset()
		_ = xml.EscapeText(esc, []byte(s))
		s = strings.ReplaceAll(esc.String(), "&#xA;", "\n")
	}
	return escapeXstring(s), space
}

var (
	xstringEscape = regexp.MustCompile(`_x[a-fA-F\d]{4}_`)
	xstringAfter  = regexp.MustCompile(`x[a-fA-F\d]{4}_`)
)

// escapeXstring escapes the _xHHHH_ sequences of s as excelize does before it stores text:
// _x005F_ (the escaped underscore) becomes _x005F_x005F_, and _x005F_x005F_x005F_ when what
// follows it would read as an escape too; another _xHHHH_ that names a character gets
// _x005F before it; one that names none (a lone surrogate half) is dropped, as excelize
// drops it.
func escapeXstring(s string) string {
	if !strings.Contains(s, "_x") {
		return s
	}
	var out strings.Builder
	cursor := 0
	for _, m := range xstringEscape.FindAllStringIndex(s, -1) {
		out.WriteString(s[cursor:m[0]])
		sub := s[m[0]:m[1]]
		cursor = m[1]
		if sub == "_x005F_" {
			if m[1]+6 <= len(s) && xstringAfter.MatchString(s[m[1]:m[1]+6]) && namesChar(s[m[1]+1:m[1]+5]) {
				out.WriteString(sub + "x005F" + sub)
				continue
			}
			out.WriteString(sub + "x005F_")
			continue
		}
		if namesChar(sub[2:6]) {
			out.WriteString("_x005F" + sub)
		}
	}
	out.WriteString(s[cursor:])
	return out.String()
}

// namesChar reports whether the four hexadecimal digits name a Unicode character that a Go
// string literal's \u escape accepts (not a surrogate half).
func namesChar(hex string) bool {
	_, err := strconv.Unquote(`"\u` + hex + `"`)
	return err == nil
}

// floatText is a number as excelize writes a float64 with automatic precision: its shortest
// decimal form, cut (not rounded) to 15 significant digits, as spreadsheet programs keep
// them; digits cut before the decimal point become zeros.
func floatText(x float64) string {
	str := strconv.FormatFloat(x, 'f', -1, 64)
	if math.Abs(x) == math.MaxFloat64 {
		return str
	}
	const maxDigits = 15
	point := strings.IndexByte(str, '.')
	digits := 0
	for i := 0; i < len(str); i++ {
		if str[i] < '0' || str[i] > '9' || digits == 0 && str[i] == '0' {
			continue
		}
		if digits++; digits <= maxDigits {
			continue
		}
		if point >= 0 && i > point {
			return strings.TrimSuffix(str[:i], ".")
		}
		if point < 0 {
			point = len(str)
		}
		whole := []byte(str[:point])
		for ; i < len(whole); i++ {
			whole[i] = '0'
		}
		return string(whole)
	}
	return str
}
