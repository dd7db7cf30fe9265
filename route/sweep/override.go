package sweep

import (
	"bytes"
	"encoding/json"
	"fmt"
	"path/filepath"
	"reflect"
	"sort"
	"strings"
	"sync"

	"go.yaml.in/yaml/v3"

	"spanwright/geo/input"
	"spanwright/route/plan"
)

// pathKeys are the plan settings that name files; in a sweep file their values are relative
// to the sweep file's folder.
var pathKeys = map[string]bool{"campus": true, "catalog": true, "rules": true, "prices": true}

// setting is one plan setting a sweep can override.
type setting struct {
	typ  reflect.Type
	path bool // a file name (campus: one or a list)
}

// settings returns the overridable plan settings by dotted key: every top-level key of
// plan.Plan except links, and every key of its nested sections (defaults.*, design.*). It is
// read from plan.Plan's YAML tags, so a setting the plan gains can be varied at once.
var settings = sync.OnceValue(func() map[string]setting {
	out := map[string]setting{}
	moneyT := reflect.TypeOf(plan.Money(0))
	t := reflect.TypeOf(plan.Plan{})
	for i := 0; i < t.NumField(); i++ {
		f := t.Field(i)
		key := yamlKey(f)
		if key == "" {
			continue
		}
		if f.Type.Kind() == reflect.Struct && f.Type != moneyT {
			for j := 0; j < f.Type.NumField(); j++ {
				g := f.Type.Field(j)
				if sub := yamlKey(g); sub != "" {
					out[key+"."+sub] = setting{typ: g.Type}
				}
			}
			continue
		}
		if f.Type.Kind() == reflect.Slice && f.Type.Elem().Kind() == reflect.Struct {
			continue // the links list: a plan of its own, not a setting
		}
		if key == notesKey {
			continue // text said with the plan, not a setting to vary
		}
		out[key] = setting{typ: f.Type, path: pathKeys[key]}
	}
	return out
})

func yamlKey(f reflect.StructField) string {
	tag, ok := f.Tag.Lookup("yaml")
	if !ok || !f.IsExported() {
		return ""
	}
	name, _, _ := strings.Cut(tag, ",")
	if name == "-" {
		return ""
	}
	return name
}

// keyList lists the overridable keys, sorted, for messages.
func keyList() string {
	keys := make([]string, 0, len(settings()))
	for k := range settings() {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return strings.Join(keys, ", ")
}

// Override is one plan setting a scenario changes.
type Override struct {
	Key   string // dotted plan key, e.g. "defaults.rate"
	Value string // the value as shown in the comparison: the text written, "~" for null
	Line  int    // line of the value in the sweep file
	// canon is the value decoded into the setting's type and encoded as JSON ("null" for
	// null); paths are cleaned and use forward slashes, as written (relative to the sweep
	// file's folder).
	canon string
	node  *yaml.Node
	set   setting
}

// parseOverride checks one key and value of the sweep file.
func parseOverride(key string, v *yaml.Node) (Override, error) {
	st, ok := settings()[key]
	if !ok {
		hint := ""
		if key == "links" || strings.HasPrefix(key, "links.") {
			hint = "; the links list cannot be varied: write another plan and use it as base"
		}
		return Override{}, input.Errorf(ErrUnknownKey, "unknown key;%s want one of %s%s", input.DidYouMean(key, settings()), keyList(), hint)
	}
	o := Override{Key: key, Line: v.Line, node: v, set: st}
	if v.Kind == yaml.AliasNode {
		v = v.Alias
	}
	if v.Kind == yaml.ScalarNode && v.Tag == "!!null" {
		o.Value, o.canon = "~", "null"
		return o, nil
	}
	if st.path {
		files, err := pathValue(key, v, st.typ)
		if err != nil {
			return Override{}, err
		}
		for i, f := range files {
			files[i] = filepath.ToSlash(filepath.Clean(f))
		}
		o.Value = strings.Join(files, " ")
		o.canon = mustJSON(files)
		if st.typ.Kind() == reflect.String {
			o.canon = mustJSON(files[0])
		}
		return o, nil
	}
	// The value as the plan would read it: its type and range (SettingRange) checked by the
	// same walker, with the same messages.
	ptr := reflect.New(st.typ)
	var probs input.Problems
	(&input.Decoder{Problems: &probs, RangeOf: plan.SettingRange}).DecodeAt(v, ptr.Interface(), "", key)
	if len(probs.List) > 0 {
		return Override{}, &input.Problem{Value: probs.List[0].Value, Err: probs.List[0].Err}
	}
	o.Value = v.Value
	if st.typ.Kind() == reflect.Bool {
		o.Value = fmt.Sprint(ptr.Elem().Interface())
	}
	o.canon = mustJSON(ptr.Elem().Interface())
	return o, nil
}

// pathValue reads a file name, or for a list-valued setting (campus) a name or a list of names.
func pathValue(key string, v *yaml.Node, typ reflect.Type) ([]string, error) {
	list := typ.Kind() == reflect.Slice
	want := "a file name"
	if list {
		want = "a file name or a list of file names"
	}
	bad := func() error { return input.Errorf(ErrWrongType, "want %s, got %s", want, input.KindName(v)) }
	switch {
	case v.Kind == yaml.ScalarNode && v.Tag == "!!str" && v.Value != "":
		return []string{v.Value}, nil
	case list && v.Kind == yaml.SequenceNode && len(v.Content) > 0:
		var out []string
		for _, it := range v.Content {
			if it.Kind != yaml.ScalarNode || it.Tag != "!!str" || it.Value == "" {
				return nil, bad()
			}
			out = append(out, it.Value)
		}
		return out, nil
	}
	return nil, bad()
}

func mustJSON(v any) string {
	b, err := json.Marshal(v)
	if err != nil {
		panic("sweep: " + err.Error())
	}
	return string(b)
}

// canonical is the override list in a form that does not depend on how it was written: one
// "key=value" line per override, sorted by key, values as decoded (so 10 and 10.0 agree).
func canonical(set []Override) string {
	lines := make([]string, len(set))
	for i, o := range set {
		lines[i] = o.Key + "=" + o.canon
	}
	sort.Strings(lines)
	var b bytes.Buffer
	for _, l := range lines {
		b.WriteString(l)
		b.WriteByte('\n')
	}
	return b.String()
}

// apply changes the plan mapping m (the base plan's root) by each override in order. rebase
// turns a file name of the sweep file into the name written into the scenario's plan.
func apply(m *yaml.Node, set []Override, rebase func(string) string) {
	for _, o := range set {
		parent := m
		keys := strings.Split(o.Key, ".")
		for _, k := range keys[:len(keys)-1] {
			v := lookup(parent, k)
			if v == nil || v.Kind != yaml.MappingNode {
				if o.canon == "null" {
					parent = nil
					break
				}
				nv := &yaml.Node{Kind: yaml.MappingNode, Tag: "!!map", Style: yaml.FlowStyle}
				setKey(parent, k, nv)
				v = nv
			}
			parent = v
		}
		if parent == nil {
			continue
		}
		leaf := keys[len(keys)-1]
		if o.canon == "null" {
			deleteKey(parent, leaf)
			continue
		}
		setKey(parent, leaf, o.valueNode(rebase))
	}
}

// valueNode is the override's value as a plan node: file names rebased, anything else as
// written in the sweep file.
func (o Override) valueNode(rebase func(string) string) *yaml.Node {
	if !o.set.path {
		n := *o.node
		if n.Kind == yaml.AliasNode {
			n = *n.Alias
		}
		n.Anchor, n.HeadComment, n.LineComment, n.FootComment = "", "", "", ""
		return &n
	}
	return pathNode(o.files(), rebase, o.set.typ.Kind() == reflect.Slice)
}

// files returns the file names of a file-valued override, as written.
func (o Override) files() []string {
	var files []string
	if strings.HasPrefix(o.canon, "[") {
		if err := json.Unmarshal([]byte(o.canon), &files); err != nil {
			panic("sweep: " + err.Error())
		}
		return files
	}
	var f string
	if err := json.Unmarshal([]byte(o.canon), &f); err != nil {
		panic("sweep: " + err.Error())
	}
	return []string{f}
}

func pathNode(files []string, rebase func(string) string, list bool) *yaml.Node {
	scalar := func(s string) *yaml.Node {
		return &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!str", Value: rebase(filepath.FromSlash(s))}
	}
	if !list {
		return scalar(files[0])
	}
	seq := &yaml.Node{Kind: yaml.SequenceNode, Tag: "!!seq", Style: yaml.FlowStyle}
	for _, f := range files {
		seq.Content = append(seq.Content, scalar(f))
	}
	return seq
}

// rebasePlanPaths rewrites the file names the base plan itself gives (relative to its own
// folder) with rebase, so the scenario's plan can live in another folder.
func rebasePlanPaths(m *yaml.Node, rebase func(string) string) {
	for i := 0; i+1 < len(m.Content); i += 2 {
		k, v := m.Content[i], m.Content[i+1]
		if !pathKeys[k.Value] {
			continue
		}
		switch v.Kind {
		case yaml.ScalarNode:
			if v.Tag == "!!str" && v.Value != "" {
				v.Value = rebase(v.Value)
			}
		case yaml.SequenceNode:
			for _, it := range v.Content {
				if it.Kind == yaml.ScalarNode && it.Tag == "!!str" && it.Value != "" {
					it.Value = rebase(it.Value)
				}
			}
		}
	}
}

func lookup(m *yaml.Node, key string) *yaml.Node {
	for i := 0; i+1 < len(m.Content); i += 2 {
		if m.Content[i].Value == key {
			return m.Content[i+1]
		}
	}
	return nil
}

func setKey(m *yaml.Node, key string, v *yaml.Node) {
	for i := 0; i+1 < len(m.Content); i += 2 {
		if m.Content[i].Value == key {
			m.Content[i+1] = v
			return
		}
	}
	m.Content = append(m.Content, &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!str", Value: key}, v)
}

func deleteKey(m *yaml.Node, key string) {
	for i := 0; i+1 < len(m.Content); i += 2 {
		if m.Content[i].Value == key {
			m.Content = append(m.Content[:i], m.Content[i+2:]...)
			return
		}
	}
}

// carryHubLink turns, in a scenario's plan root whose hub is not the base plan's (baseRoot),
// a links entry for the scenario's hub (to: the hub, from: none or the hub) into the same
// entry the other way: to the base plan's hub, from the scenario's, with every other setting
// kept (redundancy, rate, strands, growth, future rate). Without it the entry would be dropped
// (the hub has no link of its own: site.Site.Links), and an alternative with the other hub
// would be priced without what the base pays for, such as the diverse route between the two
// buildings, and would read as lacking none (tester 12's finding 13): the entry is about the
// link between the two buildings, which the scenario still has, served the other way. It
// returns the note saying so, "" when nothing was carried: the hubs are the same, no entry is
// for the scenario's hub, or an entry is already for the base's hub (then site.Site.Links
// drops the one for the scenario's hub, and says so). baseHub is the base plan's hub when its
// root names none (the campus's building with role mc: runner.baseHub).
func carryHubLink(root, baseRoot *yaml.Node, baseHub string) string {
	hubOf := func(m *yaml.Node) string {
		if v := lookup(m, "hub"); v != nil && v.Kind == yaml.ScalarNode && v.Tag != "!!null" {
			return v.Value
		}
		return ""
	}
	hub, base := hubOf(root), hubOf(baseRoot)
	if base == "" {
		base = baseHub
	}
	links := lookup(root, "links")
	if hub == "" || base == "" || hub == base || links == nil || links.Kind != yaml.SequenceNode {
		return ""
	}
	str := func(m *yaml.Node, key string) string {
		if v := lookup(m, key); v != nil && v.Kind == yaml.ScalarNode && v.Tag != "!!null" {
			return v.Value
		}
		return ""
	}
	at := -1
	for i, e := range links.Content {
		if e.Kind != yaml.MappingNode {
			return "" // the plan's own validation reports it
		}
		to, from := str(e, "to"), str(e, "from")
		switch {
		case to == base && (from == "" || from == hub):
			return "" // the base's hub has an entry of its own for this link
		case to == hub && (from == "" || from == hub) && str(e, "skip") != "true" && at < 0:
			at = i // a skip stays dropped: the other way the hub serves the base's hub all the same
		}
	}
	if at < 0 {
		return ""
	}
	e := links.Content[at]
	setKey(e, "to", &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!str", Value: base})
	setKey(e, "from", &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!str", Value: hub})
	e.LineComment = "carried by the sweep from {to: " + hub + "}: " + hub + " is this scenario's hub, " + base + " the base plan's"
	note := fmt.Sprintf("links[%d] (to %s) carried to the link %s-%s, the other way: %s is this scenario's hub and %s the base plan's, so the link between them keeps the entry's settings (its redundancy among them)", at, hub, hub, base, hub, base)
	addPlanNote(root, note)
	return note
}

// notesKey is the plan's key of its notes (plan.Plan.Notes).
const notesKey = "notes"

// addPlanNote appends note to the notes of plan root (plan.Plan.Notes), which the scenario's
// outputs carry among their notes (summary.json, the report's Notes, the comparison's note
// column), planned by the sweep or alone from its plan.yaml (review 17 F6: the carried entry
// was said in the comparison only, and the scenario's report said every entry of the plan
// applied). Notes that are not a list are left to the plan's own validation.
func addPlanNote(root *yaml.Node, note string) {
	text := &yaml.Node{Kind: yaml.ScalarNode, Tag: "!!str", Value: note}
	switch v := lookup(root, notesKey); {
	case v == nil || (v.Kind == yaml.ScalarNode && v.Tag == "!!null"):
		setKey(root, notesKey, &yaml.Node{Kind: yaml.SequenceNode, Tag: "!!seq", Content: []*yaml.Node{text}})
	case v.Kind == yaml.SequenceNode:
		v.Content = append(v.Content, text)
	}
}
