package sweep

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"reflect"
	"regexp"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"spanwright/geo/input"
	"spanwright/route/plan"
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
	f, err := LoadPartial(path, maxBytes)
	if err != nil {
		return nil, err
	}
	return f, nil
}

// LoadPartial is LoadLimit that, when the sweep file has problems in some of its overrides
// (an unknown key, a value of the wrong type or out of range) but its base plan reads, also
// returns the file with the scenarios its other overrides make (a bad axis or value left
// out; a case without its bad overrides), so that Check can find the problems those
// scenarios have (a hub no building has, a price book that cannot be read) in the same
// run. Such a file must never be run; it is nil when no scenario can be made.
func LoadPartial(path string, maxBytes int64) (*File, error) {
	data, err := input.ReadFile(path, input.Cap(maxBytes, input.DefaultTextMiB))
	if err != nil {
		return nil, &input.Problem{File: path, Err: fmt.Errorf("read: %w", input.Cause(err)), Class: ErrInvalid}
	}
	return parse(path, data, maxBytes)
}

// Parse reads a sweep file from data; name is its path, for messages and to resolve the
// base plan and file-valued overrides. It returns every problem at once, as an
// *input.Problems whose every problem is ErrInvalid, in line order.
func Parse(name string, data []byte) (*File, error) {
	f, err := parse(name, data, 0)
	if err != nil {
		return nil, err
	}
	return f, nil
}

// sweepFile is the shape of a sweep file for input.Decoder; vary and cases are read by
// parseVary and parseCases, since their keys are the plan's.
type sweepFile struct {
	At    input.Mapping
	Base  yaml.Node `yaml:"base"`
	Vary  yaml.Node `yaml:"vary"`
	Cases yaml.Node `yaml:"cases"`
}

func parse(name string, data []byte, maxBytes int64) (*File, error) {
	f := &File{Path: name, Dir: filepath.Dir(name), MaxInputBytes: maxBytes}
	var errs input.Problems
	dec := &input.Decoder{File: name, Problems: &errs, Class: ErrInvalid, RangeOf: plan.SettingRange}
	bad := func(n *yaml.Node, item, key string, err error) {
		line, col := 0, 0
		if n != nil {
			line, col = n.Line, n.Column
		}
		dec.Fail(line, col, item, key, err)
	}
	var sf sweepFile
	root := dec.Parse(data, &sf)
	if root == nil || input.Resolve(root).Kind != yaml.MappingNode {
		errs.Sort()
		return nil, errs.Err()
	}
	if key := planFileKey(sf.At); key != "" {
		// Its keys are all unknown to a sweep file: say what the file is instead.
		errs = input.Problems{}
		line, col := sf.At.At(key)
		dec.Fail(line, col, "", key, input.Errorf(input.ErrUnknownKey,
			"this is a plan file (it has %s: and no base:, vary: or cases:), not a sweep file; run `spanwright plan %s --out DIR`, or name it as base: in a sweep file", key, name))
		return nil, errs.Err()
	}
	if sf.At.Has("base") {
		if v := &sf.Base; v.Kind != yaml.ScalarNode || v.Tag != "!!str" || v.Value == "" {
			bad(v, "", "base", input.Errorf(ErrWrongType, "want the plan file's name, got %s", input.KindName(v)))
		} else {
			f.Base = v.Value
			if !filepath.IsAbs(f.Base) {
				f.Base = filepath.Join(f.Dir, f.Base)
			}
		}
	} else {
		bad(nil, "", "base", input.Errorf(input.ErrMissingKey, "missing; name the plan file the scenarios start from"))
	}
	if sf.At.Has("vary") {
		f.parseVary(dec, &sf.Vary, bad)
	}
	if sf.At.Has("cases") {
		f.parseCases(dec, &sf.Cases, bad)
	}
	if errs.Len() == 0 && len(f.Axes) == 0 && len(f.Cases) == 0 {
		bad(nil, "", "", input.Errorf(input.ErrMissingKey, "nothing to sweep: give vary, cases or both"))
	}
	if f.Base != "" {
		if data, err := input.ReadFile(f.Base, input.Cap(maxBytes, input.DefaultTextMiB)); err != nil {
			bad(&sf.Base, "", "base", err)
		} else if doc := parsePlanYAML(f.Base, data, &errs); doc != nil {
			f.baseData, f.baseDoc = data, doc
		}
	}
	if errs.Len() == 0 {
		f.expand(bad)
	} else if f.baseDoc != nil {
		// The scenarios the good overrides make, for LoadPartial: none when making them
		// finds a problem of its own.
		ok := true
		f.expand(func(*yaml.Node, string, string, error) { ok = false })
		if !ok {
			f.scenarios = nil
		}
	}
	errs.Sort()
	if err := errs.Err(); err != nil {
		if len(f.scenarios) == 0 {
			return nil, err
		}
		return f, err
	}
	return f, nil
}

// planFileKey returns the key that makes a file read as a sweep file a plan (campus or
// campus_database, one of which every plan has) when it has none of a sweep file's keys;
// "" otherwise. It mirrors the plan's own check for a sweep file given as a plan.
func planFileKey(at input.Mapping) string {
	if at.Has("base") || at.Has("vary") || at.Has("cases") {
		return ""
	}
	for _, k := range []string{"campus", "campus_database"} {
		if at.Has(k) {
			return k
		}
	}
	return ""
}

// parsePlanYAML parses a plan file's YAML document, which must be a mapping with no key
// given twice, and returns its root node; it adds its problems to errs, as problems of the
// plan file, and returns nil, when it is not such a document. The plan itself is checked
// per scenario.
func parsePlanYAML(name string, data []byte, errs *input.Problems) *yaml.Node {
	before := errs.Len()
	var root yaml.Node
	n := (&input.Decoder{File: name, Problems: errs, Class: ErrInvalid}).Parse(data, &root)
	if n == nil || errs.Len() > before {
		return nil
	}
	if root.Kind != yaml.MappingNode {
		errs.Add(&input.Problem{File: name, Line: root.Line, Col: root.Column, Class: ErrInvalid,
			Err: input.Errorf(ErrWrongType, "want a mapping of plan keys, got %s", input.KindName(&root))})
		return nil
	}
	return &yaml.Node{Kind: yaml.DocumentNode, Content: []*yaml.Node{n}}
}

type badFunc func(n *yaml.Node, item, key string, err error)

func (f *File) parseVary(dec *input.Decoder, v *yaml.Node, bad badFunc) {
	v = input.Resolve(v)
	if v.Kind != yaml.MappingNode {
		bad(v, "vary", "", input.Errorf(ErrWrongType, "want a mapping of plan keys to lists of values, got %s", input.KindName(v)))
		return
	}
	for i := 0; i+1 < len(v.Content); i += 2 {
		k, vals := v.Content[i], input.Resolve(v.Content[i+1])
		if _, err := parseOverride(k.Value, &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!null"}); err != nil {
			bad(k, "vary", k.Value, err)
			continue
		}
		if vals.Kind != yaml.SequenceNode || len(vals.Content) == 0 {
			got := input.KindName(vals)
			if vals.Kind == yaml.SequenceNode {
				got = "an empty list"
			}
			bad(vals, "vary", k.Value, input.Errorf(ErrWrongType, "want a non-empty list of values, got %s", got))
			continue
		}
		ax := Axis{Key: k.Value, Line: k.Line}
		for _, it := range vals.Content {
			o, err := parseOverride(k.Value, it)
			if err != nil {
				bad(it, "vary", k.Value, err)
				continue
			}
			ax.Values = append(ax.Values, o)
		}
		f.Axes = append(f.Axes, ax)
	}
}

func (f *File) parseCases(dec *input.Decoder, v *yaml.Node, bad badFunc) {
	v = input.Resolve(v)
	if v.Kind != yaml.SequenceNode {
		bad(v, "cases", "", input.Errorf(ErrWrongType, "want a list of cases, each a name and overrides, got %s", input.KindName(v)))
		return
	}
	names := map[string]int{}
	for ci, it := range v.Content {
		where := fmt.Sprintf("cases[%d]", ci)
		if it = input.Resolve(it); it.Kind != yaml.MappingNode {
			bad(it, where, "", input.Errorf(ErrWrongType, "want a mapping with a name and overrides, got %s", input.KindName(it)))
			continue
		}
		c := Case{Line: it.Line}
		if n := lookup(it, "name"); n == nil {
			bad(it, where, "name", input.Errorf(input.ErrMissingKey, "missing; every case needs a name"))
		} else if n.Kind != yaml.ScalarNode || n.Value == "" || n.Tag == "!!null" {
			bad(n, where, "name", input.Errorf(ErrWrongType, "want the case's name, got %s", input.KindName(n)))
		} else if first, dup := names[n.Value]; dup {
			c.Name = n.Value
			bad(n, caseItem(n.Value), "name", input.Errorf(ErrDuplicate, "used twice: the case at line %d has the same name", first))
		} else {
			c.Name = n.Value
			names[n.Value] = n.Line
			where = caseItem(c.Name)
		}
		for i := 0; i+1 < len(it.Content); i += 2 {
			k, val := it.Content[i], it.Content[i+1]
			if k.Value == "name" {
				continue
			}
			o, err := parseOverride(k.Value, val)
			if err != nil {
				at := val
				if errors.Is(err, ErrUnknownKey) {
					at = k
				}
				bad(at, where, k.Value, err)
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
				bad(&yaml.Node{Line: ax.Line}, "vary", ax.Key, input.Errorf(input.ErrBadValue, "the product has more than %d scenarios", MaxScenarios))
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
			bad(&yaml.Node{Line: s.line(f)}, s.where(), "", input.Errorf(ErrDuplicate, "scenario id %q used twice: scenario %d (%s) has the same overrides", s.ID, j, o.Describe()))
			continue
		}
		seen[s.ID] = i
	}
}

// MaxScenarios is the most scenarios one sweep file may give.
const MaxScenarios = 1_000_000

func (s *Scenario) where() string {
	if s.Case != "" {
		return caseItem(s.Case)
	}
	return "vary"
}

// caseItem names a case in messages: case "fast".
func caseItem(name string) string { return "case " + strconv.Quote(name) }

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
const maxSlug = 64

// nonSlug matches what a slug never holds: anything but a-z, 0-9, dot, underscore and hyphen.
var nonSlug = regexp.MustCompile(`[^a-z0-9._-]+`)

// ScenarioID returns the stable id of a scenario whose overrides come from a sweep file (a
// case's, or one value of each axis), used as its folder name: a readable slug,
// a hyphen and the first IDLen hexadecimal digits of the SHA-256 of the canonical override
// list (one "key=value" line per override, sorted by key, each value decoded into the plan
// setting's type and written as JSON: so "10G" and 10G, or 850000 and 850000.00, agree, and
// the order overrides are written in does not matter). The slug is the case's name, or for a
// scenario of the product its values joined by hyphens: text as written, a number after the
// last part of its key ("snap_m-0.5", "loss_margin_db-1e-7", "budget-850000": see
// numberSlug), file names without folder and extension, true as the key's last part
// ("allow_new_trench"), false as "no-" and that part, null as that part and "-default";
// lower-cased, anything but a-z, 0-9, dot, underscore and hyphen turned into hyphens, no
// dot, underscore or hyphen first, at most maxSlug bytes of whole parts. The names are safe
// folder names on Linux, macOS and Windows (ASCII, no reserved characters, never a reserved
// device name before a dot, never ending in a dot or space) and unique even on file systems
// that ignore case, since the hash tells scenarios apart. Renaming a case changes only the slug.
func ScenarioID(caseName string, set []Override) string {
	sum := sha256.Sum256([]byte(canonical(set)))
	parts := []string{caseName}
	if caseName == "" {
		parts = make([]string, len(set))
		for i, o := range set {
			parts[i] = o.slugPart()
		}
	}
	slug := ""
	for _, p := range parts {
		p = strings.Trim(nonSlug.ReplaceAllString(strings.ToLower(p), "-"), "-")
		if p == "" {
			continue
		}
		if slug != "" && len(slug)+1+len(p) > maxSlug {
			break // whole parts only: a number cut short would mislead
		}
		if slug != "" {
			slug += "-"
		}
		slug += p
	}
	if len(slug) > maxSlug { // one part longer than the limit: a long case name
		slug = slug[:maxSlug]
		if i := strings.LastIndexByte(slug, '-'); i > maxSlug/2 {
			slug = slug[:i]
		}
	}
	slug = strings.TrimLeft(strings.TrimRight(slug, "-"), "._-")
	if slug == "" {
		slug = "scenario"
	}
	if dev, _, _ := strings.Cut(slug, "."); windowsDevice[dev] {
		slug = "scenario-" + slug // "con.5" is a device on Windows whatever follows the dot
	}
	return slug + "-" + hex.EncodeToString(sum[:])[:IDLen]
}

// windowsDevice holds the names Windows reserves for devices, which no folder may take even
// with an extension (Microsoft, "Naming Files, Paths, and Namespaces", from memory).
var windowsDevice = map[string]bool{"con": true, "prn": true, "aux": true, "nul": true,
	"com1": true, "com2": true, "com3": true, "com4": true, "com5": true, "com6": true, "com7": true, "com8": true, "com9": true,
	"lpt1": true, "lpt2": true, "lpt3": true, "lpt4": true, "lpt5": true, "lpt6": true, "lpt7": true, "lpt8": true, "lpt9": true}

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
	case o.set.typ == reflect.TypeOf(plan.Money(0)):
		c, _ := strconv.ParseInt(o.canon, 10, 64)
		return leaf + "-" + strings.ReplaceAll(strings.TrimSuffix(money(c), ".00"), ",", "")
	case o.set.typ.Kind() != reflect.String:
		return leaf + "-" + numberSlug(o.canon) // numbers as decoded: 1.0 and 1 agree
	}
	return o.Value
}

// numberSlug writes a decoded number (JSON) for a folder name: plain decimals from 0.0001 to
// below 10^15 ("0.5", "0.001", "30"), else a power of ten without plus sign or padding zeros
// ("1e-7", "2.5e21"); a negative number starts "minus" (a hyphen separates parts).
func numberSlug(canon string) string {
	v, err := strconv.ParseFloat(canon, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return canon
	}
	sign := ""
	if v < 0 {
		sign, v = "minus", -v
	}
	if v == 0 || (v >= 1e-4 && v < 1e15) {
		return sign + strconv.FormatFloat(v, 'f', -1, 64)
	}
	mant, exp, _ := strings.Cut(strconv.FormatFloat(v, 'e', -1, 64), "e")
	exp = strings.TrimPrefix(exp, "+")
	neg := strings.HasPrefix(exp, "-")
	exp = strings.TrimLeft(strings.TrimPrefix(exp, "-"), "0")
	if neg {
		exp = "-" + exp
	}
	return sign + mant + "e" + exp
}
