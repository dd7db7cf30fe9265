package input

import (
	"fmt"
	"maps"
	"math"
	"reflect"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"
)

// Every YAML file spanwright reads (plan, sweep file, catalog, rules, price book) is decoded
// by one strict walker over yaml.Node instead of yaml.Decoder, so that every unknown key,
// wrong type and bad value of a file is reported at once with its line, column, item and key
// path, in the file's own words (yaml.Decoder with KnownFields stops at the first type error
// and names Go types).
//
// The walker fills a struct by its fields' tags:
//
//	yaml:"key"        the key the field holds; untagged and "-" fields are not read
//	range:"name"      a number's range, by name in Decoder.Ranges (for a list or map: each value)
//	keyrange:"name"   the range of a map's integer keys
//	item:"label"      a list whose elements are items of their own, named label and their
//	                  id, name or medium key (`medium "om4"`), with key paths restarting inside
//
// and a field of type Mapping receives where its mapping was and which keys it held. A field
// whose pointer implements yaml.Unmarshaler decodes itself, and a yaml.Node field keeps the
// node as it is.

// Mapping records where a YAML mapping was and which keys it held.
type Mapping struct {
	Line, Col int
	Keys      map[string]KeyPos
}

// KeyPos is the position of one key of a mapping and its value node.
type KeyPos struct {
	Line, Col int
	Value     *yaml.Node
}

// Has reports whether the mapping held key.
func (m Mapping) Has(key string) bool { _, ok := m.Keys[key]; return ok }

// At is the line and column of key, or of the mapping when key is absent.
func (m Mapping) At(key string) (int, int) {
	if k, ok := m.Keys[key]; ok {
		return k.Line, k.Col
	}
	return m.Line, m.Col
}

// Pos is a line and column in a file, 1-based.
type Pos struct{ Line, Col int }

var (
	mappingType     = reflect.TypeOf(Mapping{})
	nodeType        = reflect.TypeOf(yaml.Node{})
	unmarshalerType = reflect.TypeOf((*yaml.Unmarshaler)(nil)).Elem()
)

// Decoder walks a YAML document into a Go value, adding every problem to Problems.
type Decoder struct {
	File     string    // the file's name, for messages
	Problems *Problems // where problems go; must be set
	// Ranges are the ranges a field's range and keyrange tags name.
	Ranges map[string]Range
	// RangeOf, when set, gives the range of a number without a range tag by its key path
	// with list indexes left out ("design.slack_m", "links.growth").
	RangeOf func(path string) (Range, bool)
	// Class is set on every problem (see Problem.Class).
	Class error
	// Where, when not nil, receives the position of the value of every key read, by key
	// path ("design.slack_m", "links[2].growth"), and of every list element ("links[2]").
	Where map[string]Pos
}

// loc names what is being decoded: the item (e.g. `medium "om4"`) and the key path in it;
// and the range a number there must be in (rng, for the keys of a map keyRng).
type loc struct {
	item, field string
	path        string // field with the items' own paths, for Where and RangeOf
	rng, keyRng *Range
	// text is set inside a field tagged `scalar:"text"`: its strings must be text as YAML
	// reads it (a quoted or plain scalar that is no number, true/false, date or null),
	// never a number or true/false taken as the text "3" or "true".
	text bool
}

func (l loc) child(name string) loc {
	if l.field == "" {
		l.field = name
	} else {
		l.field += "." + name
	}
	if l.path == "" {
		l.path = name
	} else {
		l.path += "." + name
	}
	return l
}

func (l loc) index(i int) loc {
	l.field = fmt.Sprintf("%s[%d]", l.field, i)
	l.path = fmt.Sprintf("%s[%d]", l.path, i)
	return l
}

// Fail adds a problem at line and col of the file, in item, at key.
func (d *Decoder) Fail(line, col int, item, key string, err error) {
	d.Problems.Add(Place(Problem{File: d.File, Line: line, Col: col, Item: item, Key: key, Class: d.Class}, err))
}

func (d *Decoder) fail(n *yaml.Node, at loc, err error) {
	d.Fail(n.Line, n.Column, at.item, at.field, err)
}

// tagRange is the range a field's tag names, or nil.
func (d *Decoder) tagRange(f reflect.StructField, tag string) *Range {
	name := f.Tag.Get(tag)
	if name == "" {
		return nil
	}
	r, ok := d.Ranges[name]
	if !ok {
		panic("input: unknown range " + strconv.Quote(name) + " on field " + f.Name)
	}
	return &r
}

var yamlLineRE = regexp.MustCompile(`^(?:yaml: )?line (\d+): `)

// Parse reads data as one YAML document and decodes it strictly into v, a pointer; a key
// given twice is reported too (and only its first value read). It returns the document's
// root node, or nil when data is not YAML or holds no document.
func (d *Decoder) Parse(data []byte, v any) *yaml.Node {
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		line := 0
		msg := strings.TrimPrefix(err.Error(), "yaml: ")
		if m := yamlLineRE.FindStringSubmatch(err.Error()); m != nil {
			line, _ = strconv.Atoi(m[1])
			msg = err.Error()[len(m[0]):]
		}
		d.Fail(line, 0, "", "", Errorf(ErrNotYAML, "not YAML: %s", msg))
		return nil
	}
	if len(root.Content) == 0 {
		d.Fail(0, 0, "", "", Errorf(ErrNotYAML, "not YAML: empty file"))
		return nil
	}
	for _, dup := range YAMLDuplicates(&root) {
		d.Fail(dup.Line, dup.Col, "", dup.Where(), dup.Err())
	}
	d.Decode(root.Content[0], v)
	return root.Content[0]
}

// Decode decodes node n strictly into v, a pointer, as Parse does.
func (d *Decoder) Decode(n *yaml.Node, v any) {
	d.decode(n, reflect.ValueOf(v).Elem(), loc{})
}

// DecodeAt is Decode for a value at key in item: problems name them.
func (d *Decoder) DecodeAt(n *yaml.Node, v any, item, key string) {
	d.decode(n, reflect.ValueOf(v).Elem(), loc{item: item, field: key, path: key})
}

// KindName describes a node for a message: `"text"` for a scalar, "a list", "a mapping",
// "nothing" for null.
func KindName(n *yaml.Node) string {
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

// Resolve follows aliases to the node they name.
func Resolve(n *yaml.Node) *yaml.Node {
	for n.Kind == yaml.AliasNode && n.Alias != nil {
		n = n.Alias
	}
	return n
}

func (d *Decoder) decode(n *yaml.Node, v reflect.Value, at loc) {
	n = Resolve(n)
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
		panic("input: cannot decode YAML into " + v.Type().String())
	}
}

// sequence decodes a list. When label is set each element is an item of its own, named
// label plus its id (or name) key, and key paths restart inside it.
func (d *Decoder) sequence(n *yaml.Node, v reflect.Value, at loc, label string) {
	n = Resolve(n)
	if n.Kind != yaml.SequenceNode {
		d.fail(n, at, Errorf(ErrWrongType, "want a list, got %s", KindName(n)))
		return
	}
	s := reflect.MakeSlice(v.Type(), len(n.Content), len(n.Content))
	for i, c := range n.Content {
		el := at.index(i)
		if d.Where != nil {
			d.Where[el.path] = Pos{c.Line, c.Column}
		}
		if label != "" {
			el = loc{item: joinItem(at.item, label+" "+itemID(c, i)), path: el.path}
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
	n = Resolve(n)
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

func (d *Decoder) structure(n *yaml.Node, v reflect.Value, at loc) {
	n = Resolve(n)
	if n.Kind != yaml.MappingNode {
		d.fail(n, at, Errorf(ErrWrongType, "want a mapping, got %s", KindName(n)))
		return
	}
	t := v.Type()
	fields := map[string]int{}
	mappingField := -1
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		if f.Type == mappingType {
			mappingField = i
			continue
		}
		name, _, _ := strings.Cut(f.Tag.Get("yaml"), ",")
		if name == "" || name == "-" || !f.IsExported() {
			continue
		}
		fields[name] = i
	}
	p := Mapping{Line: n.Line, Col: n.Column, Keys: map[string]KeyPos{}}
	for _, kv := range pairs(n) {
		k, val := kv[0], kv[1]
		kl := at.child(k.Value)
		if _, dup := p.Keys[k.Value]; dup {
			continue // reported by Parse
		}
		p.Keys[k.Value] = KeyPos{Line: k.Line, Col: k.Column, Value: val}
		if d.Where != nil {
			d.Where[kl.path] = Pos{val.Line, val.Column}
		}
		fi, ok := fields[k.Value]
		if !ok {
			d.fail(k, kl, Errorf(ErrUnknownKey, "unknown key;%s want one of %s", DidYouMean(k.Value, fields), sortedKeys(fields)))
			continue
		}
		kl.rng, kl.keyRng = d.tagRange(t.Field(fi), "range"), d.tagRange(t.Field(fi), "keyrange")
		kl.text = t.Field(fi).Tag.Get("scalar") == "text"
		fv := v.Field(fi)
		if label := t.Field(fi).Tag.Get("item"); label != "" && fv.Kind() == reflect.Slice {
			d.sequence(val, fv, kl, label)
			continue
		}
		d.decode(val, fv, kl)
	}
	if mappingField >= 0 {
		v.Field(mappingField).Set(reflect.ValueOf(p))
	}
}

// pairs lists the keys and values of mapping n, with those of the mappings its merge keys
// (<<) name in place of each merge key; a key given in n itself wins over a merged one, an
// earlier merged mapping over a later one, as YAML's merge key type says.
func pairs(n *yaml.Node) [][2]*yaml.Node {
	return (&merger{memo: map[*yaml.Node][][2]*yaml.Node{}, open: map[*yaml.Node]bool{}}).pairs(n)
}

// merger resolves merge keys once per mapping (an alias may name one mapping many times:
// without the memo, nested merges grow exponentially) and refuses a mapping that merges
// itself, directly or through others (yaml.v3 builds such a node, and following it would
// never end).
type merger struct {
	memo map[*yaml.Node][][2]*yaml.Node
	open map[*yaml.Node]bool // mappings being resolved: merging one of them is a cycle
}

// badMerge is the key node a merge that cannot be followed is reported under.
func badMerge(k *yaml.Node, why string) *yaml.Node {
	return &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!str", Value: "<< (" + why + ")", Line: k.Line, Column: k.Column}
}

func (mg *merger) pairs(n *yaml.Node) [][2]*yaml.Node {
	if out, ok := mg.memo[n]; ok {
		return out
	}
	mg.open[n] = true
	defer delete(mg.open, n)
	own := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		if n.Content[i].Tag != "!!merge" {
			own[n.Content[i].Value] = true
		}
	}
	var out [][2]*yaml.Node
	merged := map[string]bool{}
	for i := 0; i+1 < len(n.Content); i += 2 {
		k, v := n.Content[i], n.Content[i+1]
		if k.Tag != "!!merge" {
			out = append(out, [2]*yaml.Node{k, v})
			continue
		}
		v = Resolve(v)
		sources := []*yaml.Node{v}
		if v.Kind == yaml.SequenceNode {
			sources = v.Content
		}
		for _, m := range sources {
			if m = Resolve(m); m.Kind != yaml.MappingNode {
				out = append(out, [2]*yaml.Node{badMerge(k, "a merge key takes a mapping or a list of mappings"), v})
				break
			}
			if mg.open[m] {
				out = append(out, [2]*yaml.Node{badMerge(k, "merges the mapping it stands in"), v})
				break
			}
			for _, mkv := range mg.pairs(m) {
				if key := mkv[0].Value; !own[key] && !merged[key] {
					merged[key] = true
					out = append(out, mkv)
				}
			}
		}
	}
	mg.memo[n] = out
	return out
}

// DidYouMean returns " did you mean KEY?" naming the known key nearest to key, when exactly
// one is nearest and within a third of key's length in edits (insertions, deletions,
// substitutions; at least one edit), or starts with key and "_" (a unit left off: snap for
// snap_m); "" otherwise. It is the one hint of every unknown key: a YAML file's (Decoder)
// and a sweep file's dotted plan keys (design.snap_mm).
func DidYouMean[V any](key string, known map[string]V) string {
	if best := Nearest(key, known); best != "" {
		return " did you mean " + best + "?"
	}
	return ""
}

// Nearest is the known key DidYouMean names for key, "" when there is none.
func Nearest[V any](key string, known map[string]V) string {
	best, bestD, ties := "", max(1, len(key)/3)+1, 0
	for _, k := range slices.Sorted(maps.Keys(known)) {
		d := EditDistance(key, k)
		if strings.HasPrefix(k, key+"_") {
			d = 1
		}
		switch {
		case d < bestD:
			best, bestD, ties = k, d, 1
		case d == bestD:
			ties++
		}
	}
	if ties > 1 {
		return ""
	}
	return best
}

// Counted is n and the words that go with it: one for a count of one, many for any other
// ("1 leg", "2 legs", "0 legs"; "1 building reaches", "3 buildings reach"). Every count printed
// to the terminal or written in a warning or summary text goes through it.
func Counted(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// Shown cuts a list of names short for a note or a terminal line: the first n of items and,
// when there are more, " and N more" to write after them ("" when all are shown).
func Shown(items []string, n int) (shown []string, more string) {
	if len(items) <= n {
		return items, ""
	}
	return items[:n], fmt.Sprintf(" and %d more", len(items)-n)
}

// EditDistance is the Levenshtein distance between a and b, in bytes: the one measure of how
// near a misspelt name is (DidYouMean here, the rule language's unknown facts in media).
func EditDistance(a, b string) int {
	prev := make([]int, len(b)+1)
	cur := make([]int, len(b)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(a); i++ {
		cur[0] = i
		for j := 1; j <= len(b); j++ {
			sub := prev[j-1]
			if a[i-1] != b[j-1] {
				sub++
			}
			cur[j] = min(sub, prev[j]+1, cur[j-1]+1)
		}
		prev, cur = cur, prev
	}
	return prev[len(b)]
}

func sortedKeys[V any](m map[string]V) string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return strings.Join(keys, ", ")
}

func (d *Decoder) mapping(n *yaml.Node, v reflect.Value, at loc) {
	n = Resolve(n)
	if n.Kind != yaml.MappingNode {
		d.fail(n, at, Errorf(ErrWrongType, "want a mapping, got %s", KindName(n)))
		return
	}
	if v.IsNil() {
		v.Set(reflect.MakeMap(v.Type()))
	}
	seen := map[string]bool{}
	for _, kv := range pairs(n) {
		k, val := kv[0], kv[1]
		kl := at.child(k.Value)
		if seen[k.Value] {
			continue // reported by Parse
		}
		seen[k.Value] = true
		if d.Where != nil {
			d.Where[kl.path] = Pos{val.Line, val.Column}
		}
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

// rangeAt is the range a number at at must be in: its tag's, else RangeOf's, else nil.
func (d *Decoder) rangeAt(at loc) *Range {
	if at.rng != nil || d.RangeOf == nil {
		return at.rng
	}
	path := at.path
	if strings.IndexByte(path, '[') >= 0 {
		path = listIndex.ReplaceAllString(path, "")
	}
	if r, ok := d.RangeOf(path); ok {
		return &r
	}
	return nil
}

var listIndex = regexp.MustCompile(`\[\d+\]`)

// WantOf says what a value of Go kind k is, for messages: "a string", "a number".
func WantOf(k reflect.Kind) string {
	switch k {
	case reflect.String:
		return "a string"
	case reflect.Bool:
		return "true or false"
	case reflect.Int, reflect.Int64, reflect.Int32:
		return "an integer"
	case reflect.Float64, reflect.Float32:
		return "a number"
	}
	return "a value"
}

// scalar decodes a string, bool, integer or finite float (in its range, when it has one)
// and reports whether it succeeded.
func (d *Decoder) scalar(n *yaml.Node, v reflect.Value, at loc) bool {
	n = Resolve(n)
	bad := func() bool {
		want := WantOf(v.Kind())
		if at.text && v.Kind() == reflect.String {
			want = "text"
		}
		d.fail(n, at, Errorf(ErrWrongType, "want %s, got %s", want, KindName(n)))
		return false
	}
	if n.Kind != yaml.ScalarNode || n.Tag == "!!null" {
		return bad()
	}
	rng := d.rangeAt(at)
	switch v.Kind() {
	case reflect.String:
		if read, ok := notText[n.Tag]; at.text && n.Tag != "!!str" {
			if !ok {
				read = "something other than text"
			}
			d.fail(n, at, Errorf(ErrWrongType, "want text, got %s, which YAML reads as %s; quote it (%s) to keep it as written",
				n.Value, read, strconv.Quote(n.Value)))
			return false
		}
		v.SetString(n.Value)
	case reflect.Bool:
		b, ok := yaml11Bools[n.Value]
		if n.Tag == "!!bool" {
			var err error
			b, err = strconv.ParseBool(n.Value)
			ok = err == nil
		}
		if !ok {
			return bad()
		}
		v.SetBool(b)
	case reflect.Int, reflect.Int64:
		i, err := strconv.ParseInt(strings.ReplaceAll(n.Value, "_", ""), 10, 64)
		if n.Tag != "!!int" && n.Tag != "!!str" {
			return bad()
		}
		if err != nil {
			if n.Tag == "!!int" && rng != nil {
				d.fail(n, at, Errorf(ErrBadValue, "want %s, got %s", rng, n.Value)) // too large for 64 bits
				return false
			}
			return bad()
		}
		if rng != nil {
			if err := rng.CheckInt(i); err != nil {
				d.fail(n, at, err)
				return false
			}
		}
		v.SetInt(i)
	case reflect.Float64:
		if n.Tag != "!!int" && n.Tag != "!!float" {
			return bad()
		}
		f, err := parseFloat(n.Value)
		if err != nil {
			return bad()
		}
		if rng != nil {
			if err := rng.Check(f); err != nil {
				d.fail(n, at, err)
				return false
			}
		} else if math.IsNaN(f) || math.IsInf(f, 0) {
			d.fail(n, at, Errorf(ErrBadValue, "want a finite number, got %s", n.Value))
			return false
		}
		v.SetFloat(f)
	default:
		panic("input: cannot decode a YAML scalar into " + v.Type().String())
	}
	return true
}

// notText is what YAML 1.2 (and yaml.v3's timestamps) reads a plain scalar as when it is
// not text, by its resolved tag, for the message of a field that takes text only.
var notText = map[string]string{"!!int": "a number", "!!float": "a number", "!!bool": "true or false",
	"!!timestamp": "a date", "!!binary": "binary data"}

// yaml11Bools are the YAML 1.1 spellings of true and false (https://yaml.org/type/bool.html)
// that YAML 1.2 reads as text; a key that holds true or false takes them, as yaml.v3 does.
var yaml11Bools = map[string]bool{
	"y": true, "Y": true, "yes": true, "Yes": true, "YES": true, "on": true, "On": true, "ON": true,
	"n": false, "N": false, "no": false, "No": false, "NO": false, "off": false, "Off": false, "OFF": false,
}

// parseFloat reads a YAML number, .nan and .inf included (1e999 is +Inf, as YAML reads it).
func parseFloat(s string) (float64, error) {
	s = strings.ReplaceAll(s, "_", "")
	switch strings.ToLower(strings.TrimPrefix(strings.TrimPrefix(s, "+"), "-")) {
	case ".nan":
		return math.NaN(), nil
	case ".inf":
		if strings.HasPrefix(s, "-") {
			return math.Inf(-1), nil
		}
		return math.Inf(1), nil
	}
	f, err := strconv.ParseFloat(s, 64)
	if err != nil && !math.IsInf(f, 0) {
		return 0, err
	}
	return f, nil
}
