package escape

import (
	"encoding/csv"
	"fmt"
	"io"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Hidden reports whether r is shown as its code point rather than as itself: a
// bidirectional control or other format character, a line or paragraph separator, or a
// control character other than tab and line feed (see the package doc).
func Hidden(r rune) bool {
	switch {
	case r < 0x20: // C0 controls
		return r != '\t' && r != '\n'
	case r < 0x7f:
		return false
	case r <= 0x9f: // DEL and the C1 controls
		return true
	case r == 0xad: // soft hyphen, the only format character below U+0600
		return true
	case r < 0x600:
		return false
	case r == '\u200c', r == '\u200d': // zero-width non-joiner and joiner: several scripts need them
		return false
	case r == '\u2028', r == '\u2029':
		return true
	case r > 0x206f && r < 0xfeff: // no format character between these (arrows, symbols, CJK)
		return false
	}
	return unicode.Is(unicode.Cf, r)
}

// Visible returns s with every hidden character replaced by its code point, "<U+202E>",
// and every byte that is not UTF-8 by its value, "<0xFF>". Tab and line feed stay.
func Visible(s string) string { return visible(s, "<", ">") }

// visible is Visible with the brackets given: "<" and ">", or their HTML forms.
func visible(s, open, close string) string {
	if !needsVisible(s) {
		return s
	}
	var b strings.Builder
	b.Grow(len(s) + 16)
	for i := 0; i < len(s); {
		r, n := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && n == 1:
			fmt.Fprintf(&b, "%s0x%02X%s", open, s[i], close)
		case Hidden(r):
			fmt.Fprintf(&b, "%sU+%04X%s", open, r, close)
		default:
			b.WriteString(s[i : i+n])
		}
		i += n
	}
	return b.String()
}

// notPlain marks the bytes needsVisible must look at: control characters other than tab and
// line feed, DEL, and every byte of a multi-byte UTF-8 sequence.
var notPlain = func() (t [256]bool) {
	for c := range t {
		t[c] = c < 0x20 && c != '\t' && c != '\n' || c >= 0x7f
	}
	return t
}()

// needsVisible reports whether s holds a hidden character or a byte that is not UTF-8; it
// takes a page as bytes without copying it.
func needsVisible[T string | []byte](s T) bool {
	for i := 0; i < len(s); {
		if !notPlain[s[i]] {
			i++
			continue
		}
		// At most utf8.UTFMax bytes: converted on the stack, not copied to the heap.
		r, n := utf8.DecodeRuneInString(string(s[i:min(i+utf8.UTFMax, len(s))]))
		if (r == utf8.RuneError && n == 1) || Hidden(r) {
			return true
		}
		i += n
	}
	return false
}

// plainNumber reports whether s is a decimal number as the writers format them: an optional
// minus sign, digits, and optionally a point and more digits ("-12.5", "1234.56", "7").
func plainNumber(s string) bool {
	s = strings.TrimPrefix(s, "-")
	whole, frac, point := strings.Cut(s, ".")
	return digits(whole) && (!point || digits(frac))
}

func digits(s string) bool {
	if s == "" {
		return false
	}
	for i := 0; i < len(s); i++ {
		if s[i] < '0' || s[i] > '9' {
			return false
		}
	}
	return true
}

// CSVCell returns a CSV cell's text safe to open in a spreadsheet program: hidden characters
// made visible, and, following OWASP's CSV injection guidance, a cell that begins with = + -
// @ tab or carriage return (after any spaces) prefixed with a single quote, so the program
// shows it as text instead of running it as a formula. A plain decimal number ("-12.5") is a
// number, not a formula, and stays as it is: it keeps its sign and stays a number in the
// spreadsheet.
func CSVCell(s string) string {
	s = Visible(s)
	if plainNumber(s) {
		return s
	}
	// A program that trims spaces on import would see the character after them first.
	if t := strings.TrimLeft(s, " "); t != "" && strings.IndexByte("=+-@\t\r", t[0]) >= 0 {
		return "'" + s
	}
	return s
}

// Writer is a CSV writer (encoding/csv, comma-separated, quoted where needed) that passes
// every cell through CSVCell: every CSV the tool writes goes through it.
type Writer struct {
	w   *csv.Writer
	rec []string
}

// NewWriter returns a Writer writing to w.
func NewWriter(w io.Writer) *Writer { return &Writer{w: csv.NewWriter(w)} }

// Write writes one record, each cell through CSVCell.
func (w *Writer) Write(record []string) error {
	w.rec = w.rec[:0]
	for _, c := range record {
		w.rec = append(w.rec, CSVCell(c))
	}
	return w.w.Write(w.rec)
}

// Flush writes any buffered data and returns the first error of any Write or of the flush.
func (w *Writer) Flush() error {
	w.w.Flush()
	return w.w.Error()
}

// mdInline are the characters that can start inline Markdown (CommonMark and GitHub's
// extensions: emphasis, strikethrough, code, links and images, autolinks and raw HTML,
// entity references, table cells, math) or escape one; each is backslash-escaped.
const mdInline = "\\`*_~[]<>&|$"

// Markdown returns s as Markdown text that renders as written, in a paragraph or a table
// cell alike: hidden characters made visible, line breaks turned into spaces (a table row
// is one line), every character that could start inline markup backslash-escaped, and a
// character that would start a block at the beginning of a line (#, >, +, -, =, or the
// point of "1.", after any indentation) escaped too, unless s is a plain decimal number.
// Web addresses still become links where a renderer links bare addresses.
func Markdown(s string) string {
	s = strings.ReplaceAll(Visible(s), "\n", " ")
	var b strings.Builder
	b.Grow(len(s) + 8)
	// A block marker counts after indentation too.
	first := len(s) - len(strings.TrimLeft(s, " \t"))
	lead := !plainNumber(s)
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case strings.IndexByte(mdInline, c) >= 0:
			b.WriteByte('\\')
		case lead && i == first && strings.IndexByte("#>+-=", c) >= 0:
			b.WriteByte('\\')
		case lead && (c == '.' || c == ')') && i > first && digits(s[first:i]):
			b.WriteByte('\\')
		}
		b.WriteByte(c)
	}
	return b.String()
}

// MarkdownCode returns s as a Markdown code span, which shows its text as written,
// markup included: hidden characters made visible, line breaks turned into spaces, and a
// fence of more backticks than any run inside. A pipe cannot be written in a code span that
// reads the same in a paragraph and a table cell, so s holding one is returned as
// Markdown(s) text instead; "" stays "".
func MarkdownCode(s string) string {
	s = strings.ReplaceAll(Visible(s), "\n", " ")
	if s == "" {
		return ""
	}
	if strings.Contains(s, "|") {
		return Markdown(s)
	}
	run, longest := 0, 0
	for i := 0; i < len(s); i++ {
		if s[i] == '`' {
			run++
			longest = max(longest, run)
		} else {
			run = 0
		}
	}
	fence := strings.Repeat("`", longest+1)
	// CommonMark strips one space from each side of a span that begins and ends with one,
	// and a backtick at either end would join the fence: pad with a space each side.
	if s[0] == '`' || s[len(s)-1] == '`' || (s[0] == ' ' && s[len(s)-1] == ' ' && strings.Trim(s, " ") != "") {
		s = " " + s + " "
	}
	return fence + s + fence
}

// HTML returns an HTML page rendered by html/template with every hidden character shown as
// its code point, escaped for HTML ("&lt;U+202E&gt;"), and every byte that is not UTF-8 as
// "&lt;0xFF&gt;". The template escaper leaves these characters as they are; the page's own
// markup holds none, so each one came from the input. In an attribute the value then holds
// the visible form, which is what a tooltip or a sort key should show; html/template has
// already percent-encoded them in links.
func HTML(page []byte) []byte {
	if !needsVisible(page) {
		return page
	}
	return []byte(visible(string(page), "&lt;", "&gt;"))
}

// Terminal returns one value from the input (an id, a name) safe to print within a line on
// a terminal: every hidden character, escape and carriage return among them, and line feed
// and tab too, shown as its code point, so the value can neither send control sequences nor
// overwrite, reorder or add lines.
func Terminal(s string) string {
	s = Visible(s)
	if strings.ContainsAny(s, "\n\t") {
		s = strings.NewReplacer("\n", "<U+000A>", "\t", "<U+0009>").Replace(s)
	}
	return s
}

// TerminalList returns values from the input each through Terminal, written as fmt's %v
// writes a slice of strings: "[a b c]".
func TerminalList(values []string) string {
	out := make([]string, len(values))
	for i, v := range values {
		out[i] = Terminal(v)
	}
	return "[" + strings.Join(out, " ") + "]"
}

// NewTerminal returns a writer for a terminal that passes everything written through Visible
// before writing it to w: hidden characters are shown, line feed and tab stay, as the
// writer's own lines need them (an id printed inside a line goes through Terminal first). A
// UTF-8 sequence split between two writes is held until the next one.
func NewTerminal(w io.Writer) io.Writer { return &visibleWriter{w: w, open: "<", close: ">"} }

// NewHTML returns a writer that passes an HTML page rendered by html/template through HTML
// on its way to w, for a page too large to hold: the bytes out are those HTML returns for the
// whole page. A UTF-8 sequence split between two writes is held until the next one; Flush
// writes one the page ended in. Give it large writes (a bufio.Writer in front): each write
// is scanned once, and copied only when it holds something to show.
func NewHTML(w io.Writer) io.Writer { return &visibleWriter{w: w, open: "&lt;", close: "&gt;"} }

// visibleWriter writes what it is given through visible, with its brackets.
type visibleWriter struct {
	w           io.Writer
	open, close string
	held        []byte // the start of a UTF-8 sequence the last write ended in
}

// FlushTerminal writes what a writer from NewTerminal or NewHTML still holds (the start of a
// UTF-8 sequence no later write completed), shown as bytes (<0xNN>); other writers have
// nothing to flush.
func FlushTerminal(w io.Writer) error { return Flush(w) }

// Flush is FlushTerminal, by the name that fits a writer from NewHTML.
func Flush(w io.Writer) error {
	t, ok := w.(*visibleWriter)
	if !ok || len(t.held) == 0 {
		return nil
	}
	held := t.held
	t.held = nil
	_, err := io.WriteString(t.w, visible(string(held), t.open, t.close))
	return err
}

func (t *visibleWriter) Write(p []byte) (int, error) {
	buf := p
	if len(t.held) > 0 {
		buf = append(t.held, p...)
		t.held = nil
	}
	// Hold back a sequence cut at the end, at most utf8.UTFMax-1 bytes.
	for k := 1; k < utf8.UTFMax && k <= len(buf); k++ {
		c := buf[len(buf)-k]
		if c < utf8.RuneSelf {
			break
		}
		if utf8.RuneStart(c) {
			if !utf8.FullRune(buf[len(buf)-k:]) {
				t.held = append([]byte(nil), buf[len(buf)-k:]...)
				buf = buf[:len(buf)-k]
			}
			break
		}
	}
	var err error
	if needsVisible(buf) {
		_, err = io.WriteString(t.w, visible(string(buf), t.open, t.close))
	} else {
		_, err = t.w.Write(buf)
	}
	if err != nil {
		return 0, err
	}
	return len(p), nil
}
