package media

import (
	"fmt"
	"math"
	"reflect"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"spanwright/geo/input"
)

// The catalog, rule and price files are decoded by one strict walker over yaml.Node instead
// of yaml.Decoder, so that every unknown field, wrong type and bad value of a file is
// reported at once with its line, column, item id and field path (yaml.Decoder with
// KnownFields stops at the first type error and knows nothing of item ids).

// pos records where a YAML mapping was and which keys it held; the walker fills a struct
// field of this type, which must be tagged `yaml:"-"`.
type pos struct {
	Line, Col int
	Keys      map[string]keyPos
}

// keyPos is the position of one key of a mapping and its value node.
type keyPos struct {
	Line, Col int
	Value     *yaml.Node
}

func (p pos) has(key string) bool { _, ok := p.Keys[key]; return ok }

// at is the line and column of key, or of the mapping when key is absent.
func (p pos) at(key string) (int, int) {
	if k, ok := p.Keys[key]; ok {
		return k.Line, k.Col
	}
	return p.Line, p.Col
}

var (
	posType         = reflect.TypeOf(pos{})
	nodeType        = reflect.TypeOf(yaml.Node{})
	unmarshalerType = reflect.TypeOf((*yaml.Unmarshaler)(nil)).Elem()
)

// loc names what is being decoded: the item (e.g. `medium "om4"`) and the field path in it;
// and the range a number there must be in (rng, for the keys of a map keyRng), from the
// field's `range` and `keyrange` tags, which hold for the elements of a list and the values
// of a map too.
type loc struct {
	item, field string
	rng, keyRng *input.Range
}

func (l loc) child(name string) loc {
	if l.field == "" {
		l.field = name
	} else {
		l.field += "." + name
	}
	return l
}

func (l loc) index(i int) loc {
	l.field = fmt.Sprintf("%s[%d]", l.field, i)
	return l
}

// Ranges of the numeric keys of the catalog and the price book, by the name a field's
// `range` or `keyrange` tag gives; each field must have one (TestEveryNumberHasARange).
// Amounts of money have their own type, read exactly and capped (parseDecimal2).
var ranges = map[string]input.Range{
	// A connection, a splice, an application's budget: a few dB; 100 dB is no optical link.
	"db": {Min: 0, Max: 100, Unit: "dB"},
	// Fibre attenuates well under 10 dB/km (TIA-568.3-D Table 4); plastic fibre about 200.
	"db-per-km": {Min: 0, Max: 1000, Unit: "dB/km"},
	// Optical fibre transmits from the visible to about 1.7 µm (ITU-T G.Sup39 bands end at 1675 nm).
	"nm": {Min: 400, Max: 2000, Whole: true, Unit: "nm"},
	// Strands, ports, lanes: the largest cables hold a few thousand fibres.
	"count": {Min: 1, Max: 10000, Whole: true},
	// Bend radius as a multiple of the cable's diameter (TIA-568.3-D: 10× unloaded, 20× loaded).
	"od":      {Min: 0, AboveMin: true, Max: 100, Unit: "cable diameters"},
	"newtons": {Min: 0, AboveMin: true, Max: 100000, Unit: "N"},
	"mm":      {Min: 0, AboveMin: true, Max: 1000, Unit: "mm"},
	"kg-m":    {Min: 0, AboveMin: true, Max: 100, Unit: "kg/m"},
	"gbps":    {Min: 0, AboveMin: true, Max: 100000, Unit: "Gbit/s"},
	// An application's reach: the longest single-mode reaches are tens of kilometres.
	"reach-m":  {Min: 0, AboveMin: true, Max: 1000000, Unit: "metres"},
	"per-hour": {Min: 0, AboveMin: true, Max: 1000000, Unit: "a number per hour"},
}

// tagRange is the range a field's tag names, or nil.
func tagRange(f reflect.StructField, tag string) *input.Range {
	name := f.Tag.Get(tag)
	if name == "" {
		return nil
	}
	r, ok := ranges[name]
	if !ok {
		panic("media: unknown range " + strconv.Quote(name) + " on field " + f.Name)
	}
	return &r
}

// decoder walks yaml.Nodes into Go values, collecting problems in errs.
type decoder struct {
	file string
	errs *ErrorList
}

func (d *decoder) failAt(line, col int, at loc, err error) {
	d.errs.Add(&FileError{File: d.file, Line: line, Col: col, Item: at.item, Field: at.field, Err: err})
}

func (d *decoder) fail(n *yaml.Node, at loc, err error) { d.failAt(n.Line, n.Column, at, err) }

var yamlLineRE = regexp.MustCompile(`line (\d+)`)

// readFile reads an input file of at most input.DefaultTextMiB MiB, and reports a problem
// reading it as a *FileError naming the file.
func readFile(path string) ([]byte, error) {
	data, err := input.ReadFile(path, input.Cap(0, input.DefaultTextMiB))
	if err != nil {
		return nil, &FileError{File: path, Err: fmt.Errorf("read: %w", input.Cause(err))}
	}
	return data, nil
}

// parseYAML reads data as one YAML document holding a mapping and decodes it strictly into
// v, a pointer to a struct.
func (d *decoder) parseYAML(data []byte, v any) {
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		line := 0
		if m := yamlLineRE.FindStringSubmatch(err.Error()); m != nil {
			line, _ = strconv.Atoi(m[1])
		}
		msg := strings.TrimPrefix(err.Error(), "yaml: ")
		d.failAt(line, 0, loc{}, fmt.Errorf("%w: %s", ErrNotYAML, msg))
		return
	}
	if len(root.Content) == 0 {
		d.failAt(0, 0, loc{}, fmt.Errorf("%w: empty file", ErrNotYAML))
		return
	}
	for _, dup := range input.YAMLDuplicates(&root) {
		d.failAt(dup.Line, 0, loc{field: dup.Where()}, dup.Err())
	}
	d.decode(root.Content[0], reflect.ValueOf(v).Elem(), loc{})
}

func kindName(n *yaml.Node) string {
	switch n.Kind {
	case yaml.MappingNode:
		return "a mapping"
	case yaml.SequenceNode:
		return "a list"
	case yaml.ScalarNode:
		if n.Tag == "!!null" {
			return "nothing"
		}
		return strconv.Quote(n.Value)
	}
	return "an alias"
}

// resolve follows aliases to the node they name.
func resolve(n *yaml.Node) *yaml.Node {
	for n.Kind == yaml.AliasNode && n.Alias != nil {
		n = n.Alias
	}
	return n
}

func (d *decoder) decode(n *yaml.Node, v reflect.Value, at loc) {
	n = resolve(n)
	if v.Kind() != reflect.Pointer && v.CanAddr() && v.Addr().Type().Implements(unmarshalerType) {
		if err := v.Addr().Interface().(yaml.Unmarshaler).UnmarshalYAML(n); err != nil {
			d.fail(n, at, err)
		}
		return
	}
	if v.Type() == nodeType {
		v.Set(reflect.ValueOf(*n)) // kept as is: anchors read where their aliases are used
		return
	}
	switch v.Kind() {
	case reflect.Pointer:
		if v.IsNil() {
			v.Set(reflect.New(v.Type().Elem()))
		}
		d.decode(n, v.Elem(), at)
	case reflect.Struct:
		d.structure(n, v, at)
	case reflect.Slice:
		d.sequence(n, v, at, "")
	case reflect.Map:
		d.mapping(n, v, at)
	case reflect.String, reflect.Bool, reflect.Int, reflect.Int64, reflect.Float64:
		d.scalar(n, v, at)
	default:
		panic("media: cannot decode YAML into " + v.Type().String())
	}
}

// sequence decodes a list. When label is set each element is an item of its own, named
// label plus its id (or name) key, and field paths restart inside it.
func (d *decoder) sequence(n *yaml.Node, v reflect.Value, at loc, label string) {
	n = resolve(n)
	if n.Kind != yaml.SequenceNode {
		d.fail(n, at, fmt.Errorf("%w: want a list, got %s", ErrWrongType, kindName(n)))
		return
	}
	s := reflect.MakeSlice(v.Type(), len(n.Content), len(n.Content))
	for i, c := range n.Content {
		el := at.index(i)
		if label != "" {
			el = loc{item: joinItem(at.item, label+" "+itemID(c, i))}
		}
		d.decode(c, s.Index(i), el)
	}
	v.Set(s)
}

func joinItem(outer, inner string) string {
	if outer == "" {
		return inner
	}
	return outer + " " + inner
}

// itemID is the quoted id (or name) of a list element, or its 0-based index.
func itemID(n *yaml.Node, i int) string {
	n = resolve(n)
	if n.Kind == yaml.MappingNode {
		for _, key := range []string{"id", "name", "medium"} {
			for j := 0; j+1 < len(n.Content); j += 2 {
				if n.Content[j].Value == key && n.Content[j+1].Kind == yaml.ScalarNode && n.Content[j+1].Value != "" {
					return strconv.Quote(n.Content[j+1].Value)
				}
			}
		}
	}
	return fmt.Sprintf("#%d", i)
}

func (d *decoder) structure(n *yaml.Node, v reflect.Value, at loc) {
	n = resolve(n)
	if n.Kind != yaml.MappingNode {
		d.fail(n, at, fmt.Errorf("%w: want a mapping, got %s", ErrWrongType, kindName(n)))
		return
	}
	t := v.Type()
	fields := map[string]int{}
	posField := -1
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		if f.Type == posType {
			posField = i
			continue
		}
		name, _, _ := strings.Cut(f.Tag.Get("yaml"), ",")
		if name == "" || name == "-" || !f.IsExported() {
			continue
		}
		fields[name] = i
	}
	p := pos{Line: n.Line, Col: n.Column, Keys: map[string]keyPos{}}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, val := n.Content[i], n.Content[i+1]
		kl := at.child(k.Value)
		if _, dup := p.Keys[k.Value]; dup {
			continue // reported by parseYAML
		}
		p.Keys[k.Value] = keyPos{Line: k.Line, Col: k.Column, Value: val}
		fi, ok := fields[k.Value]
		if !ok {
			d.fail(k, kl, fmt.Errorf("%w: want one of %s", ErrUnknownField, sortedKeys(fields)))
			continue
		}
		kl.rng, kl.keyRng = tagRange(t.Field(fi), "range"), tagRange(t.Field(fi), "keyrange")
		fv := v.Field(fi)
		if label := t.Field(fi).Tag.Get("item"); label != "" && fv.Kind() == reflect.Slice {
			d.sequence(val, fv, kl, label)
			continue
		}
		d.decode(val, fv, kl)
	}
	if posField >= 0 {
		v.Field(posField).Set(reflect.ValueOf(p))
	}
}

func sortedKeys[V any](m map[string]V) string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return strings.Join(keys, ", ")
}

func (d *decoder) mapping(n *yaml.Node, v reflect.Value, at loc) {
	n = resolve(n)
	if n.Kind != yaml.MappingNode {
		d.fail(n, at, fmt.Errorf("%w: want a mapping, got %s", ErrWrongType, kindName(n)))
		return
	}
	if v.IsNil() {
		v.Set(reflect.MakeMap(v.Type()))
	}
	seen := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, val := n.Content[i], n.Content[i+1]
		kl := at.child(k.Value)
		if seen[k.Value] {
			continue // reported by parseYAML
		}
		seen[k.Value] = true
		kv := reflect.New(v.Type().Key()).Elem()
		keyAt := kl
		keyAt.rng = at.keyRng
		if !d.scalar(k, kv, keyAt) {
			continue
		}
		ev := reflect.New(v.Type().Elem()).Elem()
		d.decode(val, ev, kl)
		v.SetMapIndex(kv, ev)
	}
}

// scalar decodes a string, bool, integer or finite float (in at's range, when it has one)
// and reports whether it succeeded.
func (d *decoder) scalar(n *yaml.Node, v reflect.Value, at loc) bool {
	n = resolve(n)
	want := map[reflect.Kind]string{reflect.String: "a string", reflect.Bool: "true or false",
		reflect.Int: "an integer", reflect.Int64: "an integer", reflect.Float64: "a number"}[v.Kind()]
	bad := func() bool {
		d.fail(n, at, fmt.Errorf("%w: want %s, got %s", ErrWrongType, want, kindName(n)))
		return false
	}
	if n.Kind != yaml.ScalarNode || n.Tag == "!!null" {
		return bad()
	}
	switch v.Kind() {
	case reflect.String:
		v.SetString(n.Value)
	case reflect.Bool:
		if n.Tag != "!!bool" {
			return bad()
		}
		b, err := strconv.ParseBool(n.Value)
		if err != nil {
			return bad()
		}
		v.SetBool(b)
	case reflect.Int, reflect.Int64:
		i, err := strconv.ParseInt(strings.ReplaceAll(n.Value, "_", ""), 10, 64)
		if err != nil || (n.Tag != "!!int" && n.Tag != "!!str") {
			return bad()
		}
		if at.rng != nil {
			if err := at.rng.CheckInt(i); err != nil {
				d.fail(n, at, fmt.Errorf("%w: %w", ErrBadValue, err))
				return false
			}
		}
		v.SetInt(i)
	case reflect.Float64:
		if n.Tag != "!!int" && n.Tag != "!!float" {
			return bad()
		}
		f, err := strconv.ParseFloat(strings.ReplaceAll(n.Value, "_", ""), 64)
		if err != nil || math.IsNaN(f) || math.IsInf(f, 0) {
			want := "a finite number"
			if at.rng != nil {
				want = at.rng.String()
			}
			d.fail(n, at, fmt.Errorf("%w: want %s, got %q", ErrBadValue, want, n.Value))
			return false
		}
		if at.rng != nil {
			if err := at.rng.Check(f); err != nil {
				d.fail(n, at, fmt.Errorf("%w: %w", ErrBadValue, err))
				return false
			}
		}
		v.SetFloat(f)
	default:
		panic("media: cannot decode a YAML scalar into " + v.Type().String())
	}
	return true
}
