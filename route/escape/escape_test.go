package escape

import (
	"bytes"
	"encoding/csv"
	"io"
	"strings"
	"testing"
	"unicode"
)

// textCase is one input of an escaping function and the text it must give.
type textCase struct{ name, in, want string }

func check(t *testing.T, f func(string) string, cases []textCase) {
	t.Helper()
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if got := f(tc.in); got != tc.want {
				t.Errorf("%s: got %q, want %q", tc.name, got, tc.want)
			}
		})
	}
}

func TestVisible(t *testing.T) {
	t.Parallel()
	check(t, Visible, []textCase{
		{"plain text unchanged", "ADM-LIB Hall → east", "ADM-LIB Hall → east"},
		// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
		{"right-to-left override", "B\u202Efdp.exe", "B<U+202E>fdp.exe"},
		{"every embedding and override", "\u202A\u202B\u202C\u202D\u202E", "<U+202A><U+202B><U+202C><U+202D><U+202E>"},
		{"isolates", "\u2066a\u2067b\u2068c\u2069", "<U+2066>a<U+2067>b<U+2068>c<U+2069>"},
		{"marks", "\u200E\u200F\u061C", "<U+200E><U+200F><U+061C>"},
		// Unicode category Cf (format characters): invisible in most fonts
		{"zero-width space and byte order mark", "A\u200BB\uFEFF", "A<U+200B>B<U+FEFF>"},
		{"soft hyphen and tag character", "x\u00ADy\U000E0041", "x<U+00AD>y<U+E0041>"},
		{"joiners kept", "می\u200Cخواهم \U0001F468\u200D\U0001F469", "می\u200Cخواهم \U0001F468\u200D\U0001F469"},
		// ECMA-48 control functions: ESC starts a terminal control sequence, CR returns the cursor
		{"escape sequence", "\x1b[31mred\x1b[0m", "<U+001B>[31mred<U+001B>[0m"},
		{"carriage return, bell, NUL, DEL, C1 CSI", "a\rb\ac\x00d\x7fe\u009bf", "a<U+000D>b<U+0007>c<U+0000>d<U+007F>e<U+009B>f"},
		{"tab and line feed kept", "a\tb\nc", "a\tb\nc"},
		{"line and paragraph separators", "a\u2028b\u2029c", "a<U+2028>b<U+2029>c"},
		{"invalid UTF-8", "a\xffb\xc3", "a<0xFF>b<0xC3>"},
	})
}

// TestHiddenEveryRune checks Hidden's fast paths against its definition on every code point:
// Unicode general categories Cc and Cf (Unicode Standard §4.5, as Go's unicode tables give
// them), with tab, line feed, ZWNJ and ZWJ kept, and U+2028 and U+2029 (Zl, Zp) added.
func TestHiddenEveryRune(t *testing.T) {
	t.Parallel()
	for r := rune(0); r <= unicode.MaxRune; r++ {
		want := (unicode.Is(unicode.Cc, r) || unicode.Is(unicode.Cf, r) || r == 0x2028 || r == 0x2029) &&
			r != '\t' && r != '\n' && r != 0x200c && r != 0x200d
		if got := Hidden(r); got != want {
			t.Errorf("U+%04X: got %v, want %v", r, got, want)
		}
	}
}

func TestCSVCell(t *testing.T) {
	t.Parallel()
	check(t, CSVCell, []textCase{
		// OWASP CSV injection guidance: = + - @ tab and carriage return start a formula
		{"equals", `=HYPERLINK("http://x","y")`, `'=HYPERLINK("http://x","y")`},
		{"plus", "+1+2", "'+1+2"},
		{"minus with formula", "-2+3", "'-2+3"},
		{"minus with DDE", "-cmd|' /C calc'!A0", "'-cmd|' /C calc'!A0"},
		{"at", "@SUM(A1:A9)", "'@SUM(A1:A9)"},
		{"tab", "\t=1", "'\t=1"},
		{"carriage return shown, so no longer first", "\r=1", "<U+000D>=1"},
		{"trigger inside is harmless", "A=1+2", "A=1+2"},
		// common practice, no published source: an import that trims spaces sees the = first
		{"spaces, then equals", "  =1+2", "'  =1+2"},
		{"only spaces", "  ", "  "},
		{"empty", "", ""},
		// a plain number is a constant in every spreadsheet program, not a formula
		{"negative number stays a number", "-12.5", "-12.5"},
		{"negative integer", "-7", "-7"},
		{"money", "1234.56", "1234.56"},
		{"signed exponent is not a plain number", "-1e5", "'-1e5"},
		{"minus alone", "-", "'-"},
		{"minus point", "-.5", "'-.5"},
		// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
		{"bidi control shown", "B\u202E1", "B<U+202E>1"},
		{"bidi control then formula", "\u202E=1+2", "<U+202E>=1+2"},
	})
}

func TestWriter(t *testing.T) {
	t.Parallel()
	var b bytes.Buffer
	w := NewWriter(&b)
	w.Write([]string{"id", "length_m", "note"})
	w.Write([]string{"=1+2", "-12.5", "a,\"b\"\nc"})
	if err := w.Flush(); err != nil {
		t.Fatal(err)
	}
	// RFC 4180 quoting as encoding/csv does it, after the OWASP prefix
	want := "id,length_m,note\n'=1+2,-12.5,\"a,\"\"b\"\"\nc\"\n"
	if b.String() != want {
		t.Errorf("got %q, want %q", b.String(), want)
	}
	recs, err := csv.NewReader(&b).ReadAll()
	if err != nil || len(recs) != 2 || recs[1][2] != "a,\"b\"\nc" {
		t.Errorf("read back: %q (%v)", recs, err)
	}
}

func TestMarkdown(t *testing.T) {
	t.Parallel()
	check(t, Markdown, []textCase{
		{"plain", "slack 2", "slack 2"},
		// CommonMark 0.31 §2.4: any ASCII punctuation may be backslash-escaped
		{"raw HTML", "<script>alert(1)</script>", `\<script\>alert(1)\</script\>`},
		{"emphasis and code", "*b* _i_ `c`", "\\*b\\* \\_i\\_ \\`c\\`"},
		{"link and image", "![x](http://e)[y]", `!\[x\](http://e)\[y\]`},
		{"entity reference", "&#x202E;&amp;", `\&#x202E;\&amp;`},
		{"backslash", `a\b`, `a\\b`},
		// GitHub Flavored Markdown 0.29 §4.10: a pipe inside a cell is escaped as \|
		{"table pipe", "A|B", `A\|B`},
		{"strikethrough and math", "~~x~~ $y$", `\~\~x\~\~ \$y\$`},
		{"line break joins the row", "one\ntwo", "one two"},
		// CommonMark §4.2, §5.1, §5.2, §4.3: ATX heading, block quote, list items, setext underline at a line start
		{"leading heading", "# big", `\# big`},
		{"leading quote", "> q", `\> q`},
		{"leading list", "- item", `\- item`},
		{"leading plus", "+ item", `\+ item`},
		{"leading ordered list", "12. item", `12\. item`},
		{"leading ordered list with paren", "3) item", `3\) item`},
		{"setext underline", "===", `\===`},
		{"indented heading", "  # big", `  \# big`},
		{"indented ordered list", "\t7. item", "\t7\\. item"},
		{"negative number unchanged", "-3.50", "-3.50"},
		{"number unchanged", "12.50", "12.50"},
		// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
		{"bidi control shown, its brackets escaped", "a\u202Eb", `a\<U+202E\>b`},
	})
}

func TestMarkdownCode(t *testing.T) {
	t.Parallel()
	check(t, MarkdownCode, []textCase{
		{"slug", "base-1a2b3c4d", "`base-1a2b3c4d`"},
		{"empty", "", ""},
		// CommonMark 0.31 §6.1: a code span's fence is a backtick string not found inside;
		// one leading and trailing space is stripped when both are there
		{"markup is literal", "<script>*x*", "`<script>*x*`"},
		{"backticks inside", "a``b`c", "```a``b`c```"},
		{"backtick at the end", "a`", "`` a` ``"},
		{"spaces both ends kept", " a ", "`  a  `"},
		{"only spaces", "  ", "`  `"},
		{"line break", "a\nb", "`a b`"},
		{"pipe falls back to text", "a|<b>", `a\|\<b\>`},
		// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
		{"bidi control shown", "a\u202Eb", "`a<U+202E>b`"},
	})
}

func TestHTML(t *testing.T) {
	t.Parallel()
	check(t, func(s string) string { return string(HTML([]byte(s))) }, []textCase{
		{"no hidden character: same bytes", "<p>Hall → east</p>", "<p>Hall → east</p>"},
		// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
		{"bidi override in text", "<td>B\u202E1</td>", "<td>B&lt;U+202E&gt;1</td>"},
		{"in an attribute", `<td data-v="a` + "\u2066" + `">`, `<td data-v="a&lt;U+2066&gt;">`},
		// HTML Living Standard §13.1.4: control characters are not allowed in text
		{"escape character", "<b>\x1b[2J</b>", "<b>&lt;U+001B&gt;[2J</b>"},
		{"line feed kept", "<p>a\nb</p>", "<p>a\nb</p>"},
	})
}

func TestTerminal(t *testing.T) {
	t.Parallel()
	check(t, Terminal, []textCase{
		// ECMA-48: ESC [ starts a control sequence, CR returns to the start of the line
		{"escape sequence", "\x1b[2Jid", "<U+001B>[2Jid"},
		{"carriage return", "ok\rFAIL", "ok<U+000D>FAIL"},
		// a value within a line may not add lines or columns
		{"line feed", "ISLE\nhub HQ: ok", "ISLE<U+000A>hub HQ: ok"},
		{"tab", "a\tb", "a<U+0009>b"},
		// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
		{"bidi override", "B\u202E1", "B<U+202E>1"},
	})
	if got, want := TerminalList([]string{"A", "B\nC", "\x1b"}), "[A B<U+000A>C <U+001B>]"; got != want {
		t.Errorf("TerminalList: got %q, want %q", got, want)
	}
}

func TestTerminalWriter(t *testing.T) {
	t.Parallel()
	// ECMA-48: ESC [ starts a control sequence; Unicode TR #9 / CVE-2021-42574 for U+202E
	in := "link \x1b]0;owned\x07B\u202E1 → C\rX\n"
	want := "link <U+001B>]0;owned<U+0007>B<U+202E>1 → C<U+000D>X\n"
	for _, n := range []int{1, 2, 3, 5, len(in)} {
		var b strings.Builder
		w := NewTerminal(&b)
		for i := 0; i < len(in); i += n {
			end := min(i+n, len(in))
			if k, err := w.Write([]byte(in[i:end])); err != nil || k != end-i {
				t.Fatalf("pieces of %d: wrote %d of %d (%v)", n, k, end-i, err)
			}
		}
		if b.String() != want {
			t.Errorf("pieces of %d: got %q, want %q", n, b.String(), want)
		}
	}
}

// TestFlushTerminal: a UTF-8 sequence cut at the end of the last write is not lost: Flush
// shows its bytes (Unicode's rule: an ill-formed sequence must not vanish silently).
func TestFlushTerminal(t *testing.T) {
	var b strings.Builder
	w := NewTerminal(&b)
	if _, err := w.Write([]byte("id \xe2\x80")); err != nil { // the first two bytes of U+202E
		t.Fatal(err)
	}
	if err := FlushTerminal(w); err != nil {
		t.Fatal(err)
	}
	if got := b.String(); got != "id <0xE2><0x80>" {
		t.Errorf("got %q, want the cut sequence shown as bytes", got)
	}
}

// TestHTMLWriter: a page written in pieces of any size through NewHTML, then Flush, gives
// the bytes HTML gives for the whole page: hidden characters (Unicode TR #9 / CVE-2021-42574
// for U+202E; ECMA-48 for ESC), a byte that is not UTF-8 and a sequence the page ends in cut
// (Unicode's rule: an ill-formed sequence must not vanish silently), wherever a piece ends.
func TestHTMLWriter(t *testing.T) {
	t.Parallel()
	page := "<td>B\u202E1 → é 😀 \x1b[31m \xff</td>\n<td>plain</td>\xe2\x80"
	want := string(HTML([]byte(page)))
	if !strings.Contains(want, "&lt;U+202E&gt;") || !strings.HasSuffix(want, "&lt;0xE2&gt;&lt;0x80&gt;") {
		t.Fatalf("HTML(page) = %q: the reference does not show the hidden characters", want)
	}
	for n := 1; n <= len(page); n++ {
		var b strings.Builder
		w := NewHTML(&b)
		for i := 0; i < len(page); i += n {
			end := min(i+n, len(page))
			if k, err := w.Write([]byte(page[i:end])); err != nil || k != end-i {
				t.Fatalf("pieces of %d: wrote %d of %d (%v)", n, k, end-i, err)
			}
		}
		if err := Flush(w); err != nil {
			t.Fatal(err)
		}
		if b.String() != want {
			t.Errorf("pieces of %d: got %q, want %q", n, b.String(), want)
		}
	}
	var b strings.Builder
	w := NewHTML(&b)
	io.WriteString(w, "<p>plain</p>")
	if b.String() != "<p>plain</p>" {
		t.Errorf("a plain page changed: %q", b.String())
	}
}
