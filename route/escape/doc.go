// Package escape makes text from the input safe in each kind of output the tool writes:
// spreadsheet cells (CSV), Markdown, HTML pages and the terminal. Input text (ids, names,
// case names, override values, reasons that quote them) is data and must show as written:
// never as a formula, markup or control sequence, and never reordered or hidden.
//
// Hidden characters are shown in one notation everywhere: the code point in angle brackets,
// "<U+202E>". They are the Unicode bidirectional controls (U+061C, U+200E, U+200F,
// U+202A–U+202E, U+2066–U+2069; Unicode TR #9, the "Trojan Source" reordering of
// CVE-2021-42574), every other format character of category Cf (zero-width space, soft
// hyphen, byte order mark, invisible operators, tag characters) except the zero-width
// joiner and non-joiner that several scripts and emoji need to be spelt, the line and
// paragraph separators U+2028 and U+2029, and the C0 and C1 control characters, escape (ESC,
// the start of terminal sequences) and carriage return included, but not tab and line feed.
// A byte that is not UTF-8 shows as "<0xFF>". A name whose text is literally "<U+202E>"
// looks the same as one holding the character; the raw value is in summary.json and
// routes.geojson, which keep every id exactly.
//
// One helper per output kind: CSVCell (and Writer, which applies it to every cell),
// Markdown and MarkdownCode, HTML, and for the terminal NewTerminal (a writer for the whole
// stream) and Terminal (for one value within a line, which shows line feed and tab too).
package escape
