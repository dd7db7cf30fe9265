package sweep

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"path/filepath"
	"reflect"
	"regexp"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"spanwright/geo/input"
	"spanwright/route"
)

// File is a parsed sweep file: a base plan and the alternatives to plan from it.
type File struct {
	Path  string // the sweep file's path, for messages
	Dir   string // its folder: file names in it are relative to this
	Base  string // the base plan's path, resolved against Dir
	Axes  []Axis // the cartesian product's axes, in file order
	Cases []Case // named cases, in file order
	// MaxInputBytes caps every file the sweep reads, in bytes; 0 for the defaults
	// (input.DefaultTextMiB MiB for YAML, input.DefaultDataMiB for campus files).
	MaxInputBytes int64

	baseData  []byte
	baseDoc   *yaml.Node // baseData parsed; each scenario edits a copy
	scenarios []Scenario
}

// Axis is one key of the vary section and the values it takes, in file order.
type Axis struct {
	Key    string
	Line   int
	Values []Override
}

// Case is one named entry of the cases section: overrides applied to the base plan alone.
type Case struct {
	Name string
	Line int
	Set  []Override // in file order
}

// Scenario is one plan of the sweep: the base plan with its overrides.
type Scenario struct {
	Index int    // 0-based position in sweep order
	ID    string // stable folder name, see ScenarioID
	Case  string // the case's name; "" for a scenario of the product
	Set   []Override
}

// Load reads and checks a sweep file and its base plan's YAML (the plan itself is validated
// per scenario, after the overrides). Both must be regular files of at most
// input.DefaultTextMiB MiB.
func Load(path string) (*File, error) { return LoadLimit(path, 0) }

// LoadLimit is Load with a cap of maxBytes bytes on every file the sweep reads (0: the
// defaults), kept in File.MaxInputBytes.
func LoadLimit(path string, maxBytes int64) (*File, error) {
	data, err := input.ReadFile(path, input.Cap(maxBytes, input.DefaultTextMiB))
	if err != nil {
		return nil, &Error{File: path, Err: fmt.Errorf("read: %w", input.Cause(err))}
	}
	return parse(path, data, maxBytes)
}

// Parse reads a sweep file from data; name is its path, for messages and to resolve the
// base plan and file-valued overrides. It returns every problem at once, as an *ErrorList
// of *Error.
func Parse(name string, data []byte) (*File, error) { return parse(name, data, 0) }

func parse(name string, data []byte, maxBytes int64) (*File, error) {
	f := &File{Path: name, Dir: filepath.Dir(name), MaxInputBytes: maxBytes}
	var errs ErrorList
	bad := func(line int, where, key string, err error) {
		errs.Errs = append(errs.Errs, &Error{File: name, Line: line, Case: where, Key: key, Err: err})
	}
	var doc yaml.Node
	if err := yaml.Unmarshal(data, &doc); err != nil {
		bad(0, "", "", fmt.Errorf("not YAML: %v", strings.TrimPrefix(err.Error(), "yaml: ")))
		return nil, &errs
	}
	if len(doc.Content) == 0 || doc.Content[0].Kind != yaml.MappingNode {
		bad(0, "", "", fmt.Errorf("want a mapping with base, vary and cases"))
		return nil, &errs
	}
	for _, d := range input.YAMLDuplicates(&doc) {
		bad(d.Line, "", d.Where(), d.Err())
	}
	input.DropYAMLDuplicates(&doc) // reported: check the rest as if each key were given once
	root := doc.Content[0]
	for i := 0; i+1 < len(root.Content); i += 2 {
		k, v := root.Content[i], root.Content[i+1]
		switch k.Value {
		case "base":
			if v.Kind != yaml.ScalarNode || v.Tag != "!!str" || v.Value == "" {
				bad(v.Line, "", "base", fmt.Errorf("%w: want the plan file's name, got %s", ErrWrongType, shown(v)))
				continue
			}
			f.Base = v.Value
			if !filepath.IsAbs(f.Base) {
				f.Base = filepath.Join(f.Dir, f.Base)
			}
		case "vary":
			f.parseVary(v, bad)
		case "cases":
			f.parseCases(v, bad)
		default:
			bad(k.Line, "", k.Value, fmt.Errorf("%w; want base, vary or cases", ErrUnknownKey))
		}
	}
	if f.Base == "" && !hasKey(root, "base") {
		bad(0, "", "base", fmt.Errorf("missing: name the plan file the scenarios start from"))
	}
	if len(errs.Errs) == 0 && len(f.Axes) == 0 && len(f.Cases) == 0 {
		bad(0, "", "", fmt.Errorf("nothing to sweep: give vary, cases or both"))
	}
	if f.Base != "" {
		if data, err := input.ReadFile(f.Base, input.Cap(maxBytes, input.DefaultTextMiB)); err != nil {
			bad(lineOf(root, "base"), "", "base", err)
		} else if doc, err := parsePlanYAML(data); err != nil {
			bad(lineOf(root, "base"), "", "base", fmt.Errorf("%s: %w", f.Base, err))
		} else {
			f.baseData, f.baseDoc = data, doc
		}
	}
	if len(errs.Errs) == 0 {
		f.expand(bad)
	}
	if err := errs.Err(); err != nil {
		return nil, err
	}
	return f, nil
}

func hasKey(m *yaml.Node, key string) bool { return lookup(m, key) != nil }

func lineOf(m *yaml.Node, key string) int {
	for i := 0; i+1 < len(m.Content); i += 2 {
		if m.Content[i].Value == key {
			return m.Content[i].Line
		}
	}
	return 0
}

// parsePlanYAML parses a plan file's YAML document, which must be a mapping.
func parsePlanYAML(data []byte) (*yaml.Node, error) {
	var doc yaml.Node
	if err := yaml.Unmarshal(data, &doc); err != nil {
		return nil, fmt.Errorf("not YAML: %v", strings.TrimPrefix(err.Error(), "yaml: "))
	}
	if len(doc.Content) == 0 || doc.Content[0].Kind != yaml.MappingNode {
		return nil, fmt.Errorf("want a mapping of plan keys")
	}
	var errs []error
	for _, d := range input.YAMLDuplicates(&doc) {
		errs = append(errs, fmt.Errorf("line %d: %s: %w", d.Line, d.Where(), d.Err()))
	}
	if err := errors.Join(errs...); err != nil {
		return nil, err
	}
	return &doc, nil
}

type badFunc func(line int, where, key string, err error)

func (f *File) parseVary(v *yaml.Node, bad badFunc) {
	if v.Kind != yaml.MappingNode {
		bad(v.Line, "vary", "", fmt.Errorf("%w: want a mapping of plan keys to lists of values", ErrWrongType))
		return
	}
	for i := 0; i+1 < len(v.Content); i += 2 {
		k, vals := v.Content[i], v.Content[i+1]
		if _, err := parseOverride(k.Value, &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!null"}); err != nil {
			bad(k.Line, "vary", k.Value, err)
			continue
		}
		if vals.Kind != yaml.SequenceNode || len(vals.Content) == 0 {
			bad(vals.Line, "vary", k.Value, fmt.Errorf("%w: want a non-empty list of values, got %s", ErrWrongType, shown(vals)))
			continue
		}
		ax := Axis{Key: k.Value, Line: k.Line}
		for _, it := range vals.Content {
			o, err := parseOverride(k.Value, it)
			if err != nil {
				bad(it.Line, "vary", k.Value, err)
				continue
			}
			ax.Values = append(ax.Values, o)
		}
		f.Axes = append(f.Axes, ax)
	}
}

func (f *File) parseCases(v *yaml.Node, bad badFunc) {
	if v.Kind != yaml.SequenceNode {
		bad(v.Line, "cases", "", fmt.Errorf("%w: want a list of cases, each a name and overrides", ErrWrongType))
		return
	}
	names := map[string]int{}
	for ci, it := range v.Content {
		where := fmt.Sprintf("cases[%d]", ci)
		if it.Kind != yaml.MappingNode {
			bad(it.Line, where, "", fmt.Errorf("%w: want a mapping with a name and overrides, got %s", ErrWrongType, shown(it)))
			continue
		}
		c := Case{Line: it.Line}
		if n := lookup(it, "name"); n == nil {
			bad(it.Line, where, "name", fmt.Errorf("missing: every case needs a name"))
		} else if n.Kind != yaml.ScalarNode || n.Value == "" || n.Tag == "!!null" {
			bad(n.Line, where, "name", fmt.Errorf("%w: want the case's name, got %s", ErrWrongType, shown(n)))
		} else if first, dup := names[n.Value]; dup {
			c.Name = n.Value
			bad(n.Line, n.Value, "name", fmt.Errorf("%w: the case at line %d has the same name", ErrDuplicate, first))
		} else {
			c.Name = n.Value
			names[n.Value] = n.Line
			where = c.Name
		}
		for i := 0; i+1 < len(it.Content); i += 2 {
			k, val := it.Content[i], it.Content[i+1]
			if k.Value == "name" {
				continue
			}
			o, err := parseOverride(k.Value, val)
			if err != nil {
				line := val.Line
				if errorsIsUnknown(err) {
					line = k.Line
				}
				bad(line, where, k.Value, err)
				continue
			}
			c.Set = append(c.Set, o)
		}
		f.Cases = append(f.Cases, c)
	}
}

// expand lists the scenarios: the product of the axes (the first axis varies slowest), then
// each case. Two scenarios with the same id are an error.
func (f *File) expand(bad badFunc) {
	if len(f.Axes) > 0 {
		n := 1
		for _, ax := range f.Axes {
			n *= len(ax.Values)
			if n > MaxScenarios {
				bad(ax.Line, "vary", ax.Key, fmt.Errorf("the product has more than %d scenarios", MaxScenarios))
				return
			}
		}
		pick := make([]int, len(f.Axes))
		for i := 0; i < n; i++ {
			set := make([]Override, len(f.Axes))
			for a, ax := range f.Axes {
				set[a] = ax.Values[pick[a]]
			}
			f.scenarios = append(f.scenarios, Scenario{Index: len(f.scenarios), Set: set})
			for a := len(pick) - 1; a >= 0; a-- {
				if pick[a]++; pick[a] < len(f.Axes[a].Values) {
					break
				}
				pick[a] = 0
			}
		}
	}
	for _, c := range f.Cases {
		f.scenarios = append(f.scenarios, Scenario{Index: len(f.scenarios), Case: c.Name, Set: c.Set})
	}
	seen := map[string]int{}
	for i := range f.scenarios {
		s := &f.scenarios[i]
		s.ID = ScenarioID(s.Case, s.Set)
		if j, dup := seen[s.ID]; dup {
			o := f.scenarios[j]
			bad(s.line(f), s.where(), "", fmt.Errorf("%w: scenario id %q: scenario %d (%s) has the same overrides", ErrDuplicate, s.ID, j, o.Describe()))
			continue
		}
		seen[s.ID] = i
	}
}

// MaxScenarios is the most scenarios one sweep file may give.
const MaxScenarios = 1_000_000

func (s *Scenario) where() string {
	if s.Case != "" {
		return s.Case
	}
	return "vary"
}

func (s *Scenario) line(f *File) int {
	if s.Case != "" {
		for _, c := range f.Cases {
			if c.Name == s.Case {
				return c.Line
			}
		}
	}
	if len(s.Set) > 0 {
		return s.Set[len(s.Set)-1].Line
	}
	return 0
}

// Describe is the scenario's overrides as text: "hub=ADM defaults.rate=10G", the case's name
// first when it has one.
func (s *Scenario) Describe() string {
	parts := make([]string, 0, len(s.Set)+1)
	if s.Case != "" {
		parts = append(parts, "case "+s.Case+":")
	}
	for _, o := range s.Set {
		parts = append(parts, o.Key+"="+o.Value)
	}
	if len(parts) == 0 {
		return "(base plan)"
	}
	return strings.Join(parts, " ")
}

// Scenarios returns every scenario of the sweep, in sweep order.
func (f *File) Scenarios() []Scenario { return f.scenarios }

// Keys returns the override keys of the sweep in order of first use: the axes, then keys
// that only cases set.
func (f *File) Keys() []string {
	var keys []string
	seen := map[string]bool{}
	add := func(k string) {
		if !seen[k] {
			seen[k] = true
			keys = append(keys, k)
		}
	}
	for _, ax := range f.Axes {
		add(ax.Key)
	}
	for _, c := range f.Cases {
		for _, o := range c.Set {
			add(o.Key)
		}
	}
	return keys
}

// IDLen is the number of hexadecimal digits of the hash that ends a scenario id.
const IDLen = 8

// maxSlug is the longest readable part of a scenario id, in bytes.
const maxSlug = 48

var nonSlug = regexp.MustCompile(`[^a-z0-9]+`)

// ScenarioID returns the stable id of a scenario whose overrides come from a sweep file (a
// case's, or one value of each axis), used as its folder name: a readable slug,
// a hyphen and the first IDLen hexadecimal digits of the SHA-256 of the canonical override
// list (one "key=value" line per override, sorted by key, each value decoded into the plan
// setting's type and written as JSON: so "10G" and 10G, or 850000 and 850000.00, agree, and
// the order overrides are written in does not matter). The slug is the case's name, or for a
// scenario of the product its values joined by hyphens: text as written, numbers as decoded,
// file names without folder and extension, true as the key's last part ("allow-new-trench"),
// false as "no-" and that part, null as that part and "-default"; lower-cased, anything but a-z and 0-9 turned into
// hyphens, at most 48 bytes. Renaming a case changes only the slug.
func ScenarioID(caseName string, set []Override) string {
	sum := sha256.Sum256([]byte(canonical(set)))
	slug := caseName
	if caseName == "" {
		parts := make([]string, len(set))
		for i, o := range set {
			parts[i] = o.slugPart()
		}
		slug = strings.Join(parts, "-")
	}
	slug = strings.Trim(nonSlug.ReplaceAllString(strings.ToLower(slug), "-"), "-")
	if len(slug) > maxSlug {
		slug = slug[:maxSlug]
		if i := strings.LastIndexByte(slug, '-'); i > maxSlug/2 {
			slug = slug[:i]
		}
		slug = strings.TrimRight(slug, "-")
	}
	if slug == "" {
		slug = "scenario"
	}
	return slug + "-" + hex.EncodeToString(sum[:])[:IDLen]
}

func (o Override) slugPart() string {
	leaf := o.Key[strings.LastIndexByte(o.Key, '.')+1:]
	switch {
	case o.canon == "null":
		return leaf + "-default"
	case o.set.path:
		var names []string
		for _, f := range o.files() {
			b := filepath.Base(filepath.FromSlash(f))
			names = append(names, strings.TrimSuffix(b, filepath.Ext(b)))
		}
		return strings.Join(names, "-")
	case o.canon == "true":
		return leaf
	case o.canon == "false":
		return "no-" + leaf
	case o.set.typ == reflect.TypeOf(route.Money(0)):
		c, _ := strconv.ParseInt(o.canon, 10, 64)
		return strings.TrimSuffix(money(c), ".00")
	case o.set.typ.Kind() != reflect.String:
		return o.canon // numbers as decoded: 1.0 and 1 agree
	}
	return o.Value
}
