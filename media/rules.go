package media

import (
	"bytes"
	_ "embed"
	"fmt"
	"unicode/utf8"

	"go.yaml.in/yaml/v3"

	"spanwright/geo/input"
)

// Rule effects, the values of Rule.Effect.
const (
	// EffectExclude rejects a candidate for which the condition holds.
	EffectExclude = "exclude"
	// EffectRequire rejects a candidate for which the condition does not hold.
	EffectRequire = "require"
	// EffectPrefer ranks candidates for which the condition holds ahead of the others,
	// before cost; an earlier prefer rule outweighs every later one.
	EffectPrefer = "prefer"
)

// Rules is a parsed rule file: rules in file order, which is the order they are applied in.
// A candidate is rejected by the first exclude or require rule it fails.
type Rules struct {
	File  string
	Rules []*Rule
}

// Rule is one declarative rule.
type Rule struct {
	ID     string
	When   *Condition // over the facts of one candidate
	Effect string     // EffectExclude, EffectRequire or EffectPrefer
	Reason string     // template with {fact} placeholders, as written
	Media  []string   // medium ids it applies to; empty for every medium
	Kinds  []string   // medium kinds it applies to; empty for every kind
	Source string     // the standard or practice it comes from, as written
	Line   int        // line of the rule in its file

	reason    *template
	whenPos   func(off int) (line, col int)
	mediaLine int
}

// appliesTo reports whether r concerns medium m.
func (r *Rule) appliesTo(m *Medium) bool {
	if len(r.Media) > 0 && !contains(r.Media, m.ID) {
		return false
	}
	return len(r.Kinds) == 0 || contains(r.Kinds, m.Kind)
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

//go:embed rules.yaml
var rulesYAML []byte

// DefaultRulesFile is the name the embedded rule file goes by in messages.
const DefaultRulesFile = "rules.yaml (embedded)"

// DefaultRules returns the embedded rules. It panics if the embedded file is invalid, which
// the package tests rule out.
func DefaultRules() *Rules {
	r, err := ParseRules(DefaultRulesFile, rulesYAML)
	if err != nil {
		panic("media: embedded rules: " + err.Error())
	}
	return r
}

// LoadRules reads and validates a rule file.
func LoadRules(path string) (*Rules, error) {
	data, err := readFile(path)
	if err != nil {
		return nil, err
	}
	return ParseRules(path, data)
}

type rulesFile struct {
	Pos   pos        `yaml:"-"`
	Rules []ruleYAML `yaml:"rules" item:"rule"`
}

type ruleYAML struct {
	Pos    pos      `yaml:"-"`
	ID     string   `yaml:"id"`
	When   string   `yaml:"when"`
	Effect string   `yaml:"effect"`
	Reason string   `yaml:"reason"`
	Media  []string `yaml:"media"`
	Kinds  []string `yaml:"kinds"`
	Source string   `yaml:"source"`
}

// ParseRules reads a rule file from data; name is the file name used in messages. Every
// problem is reported at once in an *input.Problems; a malformed condition or an
// unknown fact is reported at its line and column in the file.
func ParseRules(name string, data []byte) (*Rules, error) {
	var errs input.Problems
	var f rulesFile
	newDecoder(name, &errs).Parse(data, &f)
	if errs.Len() > 0 && f.Pos.Keys == nil {
		return nil, sorted(&errs)
	}
	c := checker{file: name, errs: &errs}
	c.require(f.Pos, "", "rules")
	rs := &Rules{File: name}
	seen := map[string]int{}
	for i, ry := range f.Rules {
		item := "rule " + itemLabel(ry.ID, i)
		if !c.require(ry.Pos, item, "id", "when", "effect", "reason") {
			continue
		}
		r := &Rule{ID: ry.ID, Effect: ry.Effect, Reason: ry.Reason, Media: ry.Media, Kinds: ry.Kinds,
			Source: ry.Source, Line: ry.Pos.Line}
		r.mediaLine, _ = ry.Pos.At("media")
		ok := true
		if !idRE.MatchString(ry.ID) {
			c.bad(ry.Pos, item, "id", ErrBadValue, "want lower-case letters, digits and '-', got %q", ry.ID)
			ok = false
		} else if ry.ID == RuleCost || ry.ID == RuleNoApplication {
			c.bad(ry.Pos, item, "id", ErrBadValue, "%q is reserved for the engine's own rejections", ry.ID)
			ok = false
		} else if first, dup := seen[ry.ID]; dup {
			c.bad(ry.Pos, item, "id", ErrDuplicateID, "rule %q already defined at line %d", ry.ID, first)
			ok = false
		}
		seen[ry.ID] = ry.Pos.Line
		switch ry.Effect {
		case EffectExclude, EffectRequire, EffectPrefer:
		default:
			c.bad(ry.Pos, item, "effect", ErrBadValue, "want %s, %s or %s, got %q", EffectExclude, EffectRequire, EffectPrefer, ry.Effect)
			ok = false
		}
		for j, k := range ry.Kinds {
			if k != KindCopper && k != KindMultimode && k != KindSinglemode {
				c.bad(ry.Pos, item, fmt.Sprintf("kinds[%d]", j), ErrBadValue, "want %s, %s or %s, got %q", KindCopper, KindMultimode, KindSinglemode, k)
				ok = false
			}
		}
		whenPos := scalarPos(data, ry.Pos.Keys["when"].Value)
		cond, err := parseCondition(ry.When)
		if err != nil {
			c.condFail(whenPos, item, "when", err)
			ok = false
		}
		r.When = cond
		r.whenPos = whenPos
		tmpl, err := parseTemplate(ry.Reason)
		if err != nil {
			c.condFail(scalarPos(data, ry.Pos.Keys["reason"].Value), item, "reason", err)
			ok = false
		}
		r.reason = tmpl
		if ok {
			rs.Rules = append(rs.Rules, r)
		}
	}
	if err := sorted(&errs); err != nil {
		return nil, err
	}
	return rs, nil
}

// condFail reports a condition or template error at its position in the file.
func (c checker) condFail(at func(int) (int, int), item, field string, err error) {
	ce := err.(*condError)
	line, col := at(ce.Off)
	c.errs.Add(&input.Problem{File: c.file, Line: line, Col: col, Item: item, Key: field, Err: input.Errorf(ce.Kind, "%s", ce.Msg)})
}

// scalarPos maps a byte offset in the value of scalar node n to its line and column
// (1-based, columns in characters) in data. It walks the value and the source side by side,
// skipping whitespace, so it works for plain, quoted, literal and folded scalars; an escape
// sequence in a double-quoted string can put the column off by its length.
func scalarPos(data []byte, n *yaml.Node) func(off int) (int, int) {
	return func(off int) (int, int) {
		if n == nil {
			return 0, 0
		}
		lines := bytes.SplitAfter(data, []byte("\n"))
		p := 0
		for i := 0; i < n.Line-1 && i < len(lines); i++ {
			p += len(lines[i])
		}
		if n.Line-1 < len(lines) {
			p += byteCol(lines[n.Line-1], n.Column)
		}
		switch {
		case n.Style&(yaml.DoubleQuotedStyle|yaml.SingleQuotedStyle) != 0:
			p++
		case n.Style&(yaml.LiteralStyle|yaml.FoldedStyle) != 0:
			if nl := bytes.IndexByte(data[p:], '\n'); nl >= 0 {
				p += nl + 1
			}
		}
		val := n.Value
		for k := 0; k < off && k < len(val); k++ {
			if isSpaceByte(val[k]) {
				continue
			}
			for p < len(data) && data[p] != val[k] {
				p++
			}
			p++
		}
		for p < len(data) && isSpaceByte(data[p]) && (off >= len(val) || !isSpaceByte(val[off])) {
			p++
		}
		return lineCol(data, p)
	}
}

func isSpaceByte(b byte) bool { return b == ' ' || b == '\t' || b == '\n' || b == '\r' }

// byteCol is the byte offset in line of 1-based character column col.
func byteCol(line []byte, col int) int {
	off := 0
	for c := 1; c < col && off < len(line); c++ {
		_, w := utf8.DecodeRune(line[off:])
		off += w
	}
	return off
}

// lineCol is the 1-based line and character column of byte offset p in data.
func lineCol(data []byte, p int) (int, int) {
	if p > len(data) {
		p = len(data)
	}
	line := 1 + bytes.Count(data[:p], []byte("\n"))
	start := bytes.LastIndexByte(data[:p], '\n') + 1
	return line, 1 + utf8.RuneCount(data[start:p])
}
