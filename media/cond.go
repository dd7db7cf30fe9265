package media

import (
	"fmt"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"spanwright/geo/input"
)

// The condition language of rule files. A condition is an expression over facts that must
// come out true or false:
//
//	cond    = or
//	or      = and { "or" and }
//	and     = unary { "and" unary }
//	unary   = "not" unary | compare
//	compare = operand [ ("==" | "!=" | "<" | "<=" | ">" | ">=") operand ]
//	operand = number | string | "true" | "false" | fact | "(" cond ")"
//
// Numbers are decimal (12, 0.5, -3); strings are double-quoted with no escapes; facts are the
// names FactList returns. Types are checked when the rule file loads: ordering comparisons
// take numbers, == and != take two operands of one type, and, or and not take true/false, and
// a string compared with an enumerated fact (kind, max_emi) must be one of its values.

// condError is a problem at a byte offset of a condition or reason template.
type condError struct {
	Off  int
	Msg  string
	Kind error // ErrSyntax, ErrUnknownFact or ErrBadValue (a type or value mismatch)
}

func (e *condError) Error() string { return e.Msg }

type tokKind int

const (
	tokEOF tokKind = iota
	tokIdent
	tokNumber
	tokString
	tokLParen
	tokRParen
	tokOp // == != < <= > >=
)

type token struct {
	kind tokKind
	text string
	off  int
}

func (t token) String() string {
	switch t.kind {
	case tokEOF:
		return "end of condition"
	case tokString:
		return strconv.Quote(t.text)
	}
	return fmt.Sprintf("%q", t.text)
}

// lex splits a condition into tokens.
func lex(src string) ([]token, error) {
	var toks []token
	i := 0
	for i < len(src) {
		r, w := utf8.DecodeRuneInString(src[i:])
		switch {
		case unicode.IsSpace(r):
			i += w
		case r == '(':
			toks = append(toks, token{tokLParen, "(", i})
			i++
		case r == ')':
			toks = append(toks, token{tokRParen, ")", i})
			i++
		case r == '"':
			end := strings.IndexByte(src[i+1:], '"')
			if end < 0 {
				return nil, &condError{i, "string not closed: want a closing \"", ErrSyntax}
			}
			toks = append(toks, token{tokString, src[i+1 : i+1+end], i})
			i += end + 2
		case r == '=' || r == '!' || r == '<' || r == '>':
			op := string(r)
			if i+1 < len(src) && src[i+1] == '=' {
				op += "="
			}
			switch op {
			case "=":
				return nil, &condError{i, `"=" is not an operator: use "==" to compare`, ErrSyntax}
			case "!":
				return nil, &condError{i, `"!" is not an operator: use "not"`, ErrSyntax}
			}
			toks = append(toks, token{tokOp, op, i})
			i += len(op)
		case r == '&' || r == '|':
			word := map[rune]string{'&': "and", '|': "or"}[r]
			return nil, &condError{i, fmt.Sprintf("%q is not an operator: use %q", string(r), word), ErrSyntax}
		case r == '-' || r == '.' || (r >= '0' && r <= '9'):
			j := i + 1
			for j < len(src) && (src[j] == '.' || (src[j] >= '0' && src[j] <= '9')) {
				j++
			}
			text := src[i:j]
			if _, err := strconv.ParseFloat(text, 64); err != nil {
				return nil, &condError{i, fmt.Sprintf("bad number %q", text), ErrSyntax}
			}
			if j < len(src) && isIdentRune(rune(src[j])) {
				return nil, &condError{j, fmt.Sprintf("number %q runs into a name: put a space between them (units are not written in conditions)", text), ErrSyntax}
			}
			toks = append(toks, token{tokNumber, text, i})
			i = j
		case isIdentStart(r):
			j := i
			for j < len(src) {
				r2, w2 := utf8.DecodeRuneInString(src[j:])
				if !isIdentRune(r2) {
					break
				}
				j += w2
			}
			toks = append(toks, token{tokIdent, src[i:j], i})
			i = j
		default:
			return nil, &condError{i, fmt.Sprintf("unexpected character %q", string(r)), ErrSyntax}
		}
	}
	return append(toks, token{tokEOF, "", len(src)}), nil
}

func isIdentStart(r rune) bool { return r == '_' || (r >= 'a' && r <= 'z') || (r >= 'A' && r <= 'Z') }
func isIdentRune(r rune) bool  { return isIdentStart(r) || (r >= '0' && r <= '9') }

// valType is the type of a fact or expression.
type valType int

const (
	typeNumber valType = iota
	typeString
	typeBool
)

func (t valType) String() string { return [...]string{"a number", "a string", "true/false"}[t] }

// value is a fact's value; only the field of its type is meaningful.
type value struct {
	num float64
	str string
	b   bool
}

// expr is a type-checked condition node.
type expr interface {
	typ() valType
	eval(f []value) value
}

type litExpr struct {
	t valType
	v value
}

func (e litExpr) typ() valType          { return e.t }
func (e litExpr) eval([]value) value    { return e.v }
func (e factExpr) typ() valType         { return facts[e.idx].typ }
func (e factExpr) eval(f []value) value { return f[e.idx] }

type factExpr struct{ idx int }

type notExpr struct{ x expr }

func (e notExpr) typ() valType         { return typeBool }
func (e notExpr) eval(f []value) value { return value{b: !e.x.eval(f).b} }

type logicExpr struct {
	and  bool
	x, y expr
}

func (e logicExpr) typ() valType { return typeBool }
func (e logicExpr) eval(f []value) value {
	x := e.x.eval(f).b
	if e.and {
		return value{b: x && e.y.eval(f).b}
	}
	return value{b: x || e.y.eval(f).b}
}

type cmpExpr struct {
	op   string
	x, y expr
}

func (e cmpExpr) typ() valType { return typeBool }
func (e cmpExpr) eval(f []value) value {
	x, y := e.x.eval(f), e.y.eval(f)
	switch e.x.typ() {
	case typeString:
		if e.op == "==" {
			return value{b: x.str == y.str}
		}
		return value{b: x.str != y.str}
	case typeBool:
		if e.op == "==" {
			return value{b: x.b == y.b}
		}
		return value{b: x.b != y.b}
	}
	switch e.op {
	case "==":
		return value{b: x.num == y.num}
	case "!=":
		return value{b: x.num != y.num}
	case "<":
		return value{b: x.num < y.num}
	case "<=":
		return value{b: x.num <= y.num}
	case ">":
		return value{b: x.num > y.num}
	}
	return value{b: x.num >= y.num}
}

// strLit is a string literal compared with a fact, kept so that NewEngine can check it
// against the catalog (medium ids, application names, construction ids).
type strLit struct {
	fact  string
	value string
	off   int
}

// Condition is a parsed, type-checked condition.
type Condition struct {
	src  string
	root expr
	lits []strLit
	// reads are the facts the condition reads, by index into facts, in the order written
	// (a fact read twice is listed twice): what a verdict of the rules can depend on
	// (Engine.reads).
	reads []int
}

// String returns the condition as written.
func (c *Condition) String() string { return c.src }

// eval evaluates the condition over fact values indexed as facts.
func (c *Condition) eval(f []value) bool { return c.root.eval(f).b }

type parser struct {
	toks  []token
	i     int
	lits  []strLit
	reads []int // the facts read, by index (Condition.reads)
}

// parseCondition parses and type-checks a condition; errors are *condError with the byte
// offset of the problem.
func parseCondition(src string) (*Condition, error) {
	toks, err := lex(src)
	if err != nil {
		return nil, err
	}
	if len(toks) == 1 {
		return nil, &condError{0, "empty condition: want an expression such as channel_m > 100", ErrSyntax}
	}
	p := &parser{toks: toks}
	root, off, err := p.or()
	if err != nil {
		return nil, err
	}
	if t := p.peek(); t.kind != tokEOF {
		return nil, &condError{t.off, fmt.Sprintf("unexpected %s after a complete condition: want and, or, or the end", t), ErrSyntax}
	}
	if root.typ() != typeBool {
		return nil, &condError{off, fmt.Sprintf("a condition must be true/false, got %s: compare it, e.g. with >", root.typ()), ErrBadValue}
	}
	return &Condition{src: src, root: root, lits: p.lits, reads: p.reads}, nil
}

func (p *parser) peek() token { return p.toks[p.i] }
func (p *parser) next() token { t := p.toks[p.i]; p.i++; return t }

func (p *parser) isWord(w string) bool {
	t := p.peek()
	return t.kind == tokIdent && t.text == w
}

func needBool(e expr, off int, what string) error {
	if e.typ() != typeBool {
		return &condError{off, fmt.Sprintf("%s takes true/false, got %s", what, e.typ()), ErrBadValue}
	}
	return nil
}

func (p *parser) or() (expr, int, error) {
	x, off, err := p.and()
	if err != nil {
		return nil, 0, err
	}
	for p.isWord("or") {
		p.next()
		y, yoff, err := p.and()
		if err != nil {
			return nil, 0, err
		}
		if err := needBool(x, off, `"or"`); err != nil {
			return nil, 0, err
		}
		if err := needBool(y, yoff, `"or"`); err != nil {
			return nil, 0, err
		}
		x = logicExpr{and: false, x: x, y: y}
	}
	return x, off, nil
}

func (p *parser) and() (expr, int, error) {
	x, off, err := p.unary()
	if err != nil {
		return nil, 0, err
	}
	for p.isWord("and") {
		p.next()
		y, yoff, err := p.unary()
		if err != nil {
			return nil, 0, err
		}
		if err := needBool(x, off, `"and"`); err != nil {
			return nil, 0, err
		}
		if err := needBool(y, yoff, `"and"`); err != nil {
			return nil, 0, err
		}
		x = logicExpr{and: true, x: x, y: y}
	}
	return x, off, nil
}

func (p *parser) unary() (expr, int, error) {
	if p.isWord("not") {
		t := p.next()
		x, off, err := p.unary()
		if err != nil {
			return nil, 0, err
		}
		if err := needBool(x, off, `"not"`); err != nil {
			return nil, 0, err
		}
		return notExpr{x}, t.off, nil
	}
	return p.compare()
}

func (p *parser) compare() (expr, int, error) {
	x, xoff, err := p.operand()
	if err != nil {
		return nil, 0, err
	}
	if p.peek().kind != tokOp {
		return x, xoff, nil
	}
	op := p.next()
	y, yoff, err := p.operand()
	if err != nil {
		return nil, 0, err
	}
	if x.typ() != y.typ() {
		return nil, 0, &condError{op.off, fmt.Sprintf("%q compares %s with %s", op.text, x.typ(), y.typ()), ErrBadValue}
	}
	if op.text != "==" && op.text != "!=" && x.typ() != typeNumber {
		return nil, 0, &condError{op.off, fmt.Sprintf("%q orders numbers, got %s", op.text, x.typ()), ErrBadValue}
	}
	if x.typ() == typeString {
		if err := p.checkEnum(x, y, yoff); err != nil {
			return nil, 0, err
		}
		if err := p.checkEnum(y, x, xoff); err != nil {
			return nil, 0, err
		}
	}
	return cmpExpr{op: op.text, x: x, y: y}, xoff, nil
}

// checkEnum checks a string literal lit compared with fact f.
func (p *parser) checkEnum(f, lit expr, off int) error {
	fe, ok := f.(factExpr)
	if !ok {
		return nil
	}
	le, ok := lit.(litExpr)
	if !ok {
		return nil
	}
	def := facts[fe.idx]
	if len(def.Enum) > 0 {
		for _, v := range def.Enum {
			if v == le.v.str {
				return nil
			}
		}
		return &condError{off, fmt.Sprintf("%s is one of %s, got %q", def.Name, strings.Join(def.Enum, ", "), le.v.str), ErrBadValue}
	}
	p.lits = append(p.lits, strLit{fact: def.Name, value: le.v.str, off: off})
	return nil
}

func (p *parser) operand() (expr, int, error) {
	t := p.next()
	switch t.kind {
	case tokNumber:
		f, _ := strconv.ParseFloat(t.text, 64)
		return litExpr{typeNumber, value{num: f}}, t.off, nil
	case tokString:
		return litExpr{typeString, value{str: t.text}}, t.off, nil
	case tokLParen:
		x, _, err := p.or()
		if err != nil {
			return nil, 0, err
		}
		if c := p.next(); c.kind != tokRParen {
			return nil, 0, &condError{c.off, fmt.Sprintf("want \")\" to close an open \"(\", got %s", c), ErrSyntax}
		}
		return x, t.off, nil
	case tokIdent:
		switch t.text {
		case "true", "false":
			return litExpr{typeBool, value{b: t.text == "true"}}, t.off, nil
		case "and", "or", "not":
			return nil, 0, &condError{t.off, fmt.Sprintf("want a fact, number or string before %q", t.text), ErrSyntax}
		}
		idx, ok := factIndex[t.text]
		if !ok {
			return nil, 0, &condError{t.off, unknownFactMsg(t.text), ErrUnknownFact}
		}
		p.reads = append(p.reads, idx)
		return factExpr{idx}, t.off, nil
	}
	return nil, 0, &condError{t.off, fmt.Sprintf("want a fact, number or string, got %s", t), ErrSyntax}
}

func unknownFactMsg(name string) string {
	msg := fmt.Sprintf("unknown fact %q", name)
	if s := closestFact(name); s != "" {
		msg += fmt.Sprintf("; did you mean %q?", s)
	}
	return msg
}

// closestFact is the fact name within edit distance 2 of name, or "".
func closestFact(name string) string {
	best, bestD := "", 3
	for _, f := range facts {
		if d := input.EditDistance(name, f.Name); d < bestD {
			best, bestD = f.Name, d
		}
	}
	return best
}

// template is a parsed reason: text with {fact} placeholders ("{{" and "}}" for braces).
type template struct {
	parts []tmplPart
}

type tmplPart struct {
	text string
	fact int // -1 for text
}

func parseTemplate(src string) (*template, error) {
	t := &template{}
	var text strings.Builder
	flush := func() {
		if text.Len() > 0 {
			t.parts = append(t.parts, tmplPart{text: text.String(), fact: -1})
			text.Reset()
		}
	}
	for i := 0; i < len(src); i++ {
		c := src[i]
		switch {
		case c == '{' && i+1 < len(src) && src[i+1] == '{':
			text.WriteByte('{')
			i++
		case c == '}' && i+1 < len(src) && src[i+1] == '}':
			text.WriteByte('}')
			i++
		case c == '{':
			end := strings.IndexByte(src[i:], '}')
			if end < 0 {
				return nil, &condError{i, `placeholder not closed: want "}"`, ErrSyntax}
			}
			name := strings.TrimSpace(src[i+1 : i+end])
			idx, ok := factIndex[name]
			if !ok {
				return nil, &condError{i + 1, unknownFactMsg(name), ErrUnknownFact}
			}
			flush()
			t.parts = append(t.parts, tmplPart{fact: idx})
			i += end
		case c == '}':
			return nil, &condError{i, `"}" without "{": write "}}" for a brace`, ErrSyntax}
		default:
			text.WriteByte(c)
		}
	}
	flush()
	return t, nil
}

// render fills the placeholders from fact values; numbers print with at most two decimals.
func (t *template) render(f []value) string {
	var b strings.Builder
	for _, p := range t.parts {
		if p.fact < 0 {
			b.WriteString(p.text)
			continue
		}
		v := f[p.fact]
		switch facts[p.fact].typ {
		case typeNumber:
			b.WriteString(formatNum(v.num))
		case typeString:
			b.WriteString(v.str)
		default:
			b.WriteString(strconv.FormatBool(v.b))
		}
	}
	return b.String()
}

// formatNum prints x with two decimals and no trailing zeros: 612.4, 400, 2.55.
func formatNum(x float64) string {
	s := strconv.FormatFloat(x, 'f', 2, 64)
	s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	if s == "-0" {
		s = "0"
	}
	return s
}
