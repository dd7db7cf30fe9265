package input

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"
)

// ErrDuplicateKey is a key given twice in one JSON object or YAML mapping. JSON and YAML
// readers keep one of the two values silently; spanwright refuses the file instead.
var ErrDuplicateKey = errors.New("key given twice")

// Step is one step of the path from a document's root to a value: a key, or an index
// (0-based) into a list when Key is "".
type Step struct {
	Key   string
	Index int
}

// Duplicate is a key given twice in one object or mapping: the path to that object, the
// key, the lines and columns (1-based) of its first and its second occurrence.
type Duplicate struct {
	Path            []Step
	Key             string
	FirstLine, Line int
	FirstCol, Col   int
}

// Where is the path to the key itself, dotted: "design.slack_m", "features[3].properties.riser_m".
func (d Duplicate) Where() string {
	return pathText(append(d.Path[:len(d.Path):len(d.Path)], Step{Key: d.Key}))
}

// Err is the problem as an error wrapping ErrDuplicateKey: "given twice, at line 4 and
// line 9; remove one", or, both on one line (a GIS export writes a file, or each feature, as
// one line), "given twice on line 1, at columns 812 and 830; remove one".
func (d Duplicate) Err() error {
	if d.FirstLine == d.Line {
		return &problem{ErrDuplicateKey, fmt.Sprintf("given twice on line %d, at columns %d and %d; remove one", d.Line, d.FirstCol, d.Col)}
	}
	return &problem{ErrDuplicateKey, fmt.Sprintf("given twice, at line %d and line %d; remove one", d.FirstLine, d.Line)}
}

func pathText(p []Step) string {
	var b strings.Builder
	for _, s := range p {
		if s.Key == "" {
			fmt.Fprintf(&b, "[%d]", s.Index)
			continue
		}
		if b.Len() > 0 {
			b.WriteByte('.')
		}
		b.WriteString(s.Key)
	}
	return b.String()
}

// YAMLDuplicates returns every key given twice in a mapping of the document under n, at
// every level, in document order. Scalar keys are compared by their text; an alias is not
// followed (its anchor is checked where it is defined); merge keys (<<) are left to the
// YAML reader.
func YAMLDuplicates(n *yaml.Node) []Duplicate {
	var out []Duplicate
	var walk func(n *yaml.Node, path []Step)
	walk = func(n *yaml.Node, path []Step) {
		switch n.Kind {
		case yaml.DocumentNode:
			for _, c := range n.Content {
				walk(c, path)
			}
		case yaml.SequenceNode:
			for i, c := range n.Content {
				walk(c, append(path, Step{Index: i}))
			}
		case yaml.MappingNode:
			var first map[string]*yaml.Node
			if len(n.Content) > 2 {
				first = make(map[string]*yaml.Node, len(n.Content)/2)
			}
			for i := 0; i+1 < len(n.Content); i += 2 {
				k := n.Content[i]
				if k.Kind == yaml.ScalarNode && k.Tag != "!!merge" && first != nil {
					if f, dup := first[k.Value]; dup {
						out = append(out, Duplicate{Path: append([]Step(nil), path...), Key: k.Value,
							FirstLine: f.Line, FirstCol: f.Column, Line: k.Line, Col: k.Column})
					} else {
						first[k.Value] = k
					}
				}
				walk(n.Content[i+1], append(path, Step{Key: k.Value}))
			}
		}
	}
	walk(n, nil)
	return out
}

// DropYAMLDuplicates removes from every mapping under n the keys given again after their
// first occurrence, with their values, so that a reader that stops at a repeated key
// (yaml.v3's Decode) reads the rest. Call it after reporting YAMLDuplicates.
func DropYAMLDuplicates(n *yaml.Node) {
	switch n.Kind {
	case yaml.DocumentNode, yaml.SequenceNode:
		for _, c := range n.Content {
			DropYAMLDuplicates(c)
		}
	case yaml.MappingNode:
		seen := make(map[string]bool, len(n.Content)/2)
		kept := n.Content[:0]
		for i := 0; i+1 < len(n.Content); i += 2 {
			k, v := n.Content[i], n.Content[i+1]
			if k.Kind == yaml.ScalarNode && k.Tag != "!!merge" {
				if seen[k.Value] {
					continue
				}
				seen[k.Value] = true
			}
			DropYAMLDuplicates(v)
			kept = append(kept, k, v)
		}
		n.Content = kept
	}
}

// JSONDuplicates returns every member name given twice in an object of the JSON document
// data, at every level, in document order. Names are compared after unescaping, so "a" and
// "\u0061" are the same. data must be valid JSON (checked by the caller); on anything else
// the result is incomplete but the function does not fail.
func JSONDuplicates(data []byte) []Duplicate {
	s := jsonScan{data: data}
	s.value()
	return s.dups
}

// jsonScan walks a JSON text once, keeping for each open object the names seen so far as
// offsets into data (no allocation per name), and the path from the root as offsets too.
type jsonScan struct {
	data  []byte
	i     int
	names [][]span         // names of the open objects, by depth; reused
	big   []map[string]int // by depth, once an object has more than smallObject names: name → its offset
	path  []step
	dups  []Duplicate
}

// span is a string's contents, between its quotes; plain when its bytes are its text (no
// escape, only ASCII: encoding/json reads invalid UTF-8 as U+FFFD, so two different invalid
// names are the same name).
type span struct {
	start, end int
	plain      bool
}

type step struct {
	name  span // a member's name, or start -1 for an array element
	index int
}

func (s *jsonScan) ws() {
	for s.i < len(s.data) {
		switch s.data[s.i] {
		case ' ', '\t', '\n', '\r':
			s.i++
		default:
			return
		}
	}
}

func (s *jsonScan) value() {
	s.ws()
	if s.i >= len(s.data) {
		return
	}
	switch s.data[s.i] {
	case '{':
		s.object()
	case '[':
		s.array()
	case '"':
		s.str()
	default:
		for s.i < len(s.data) {
			switch s.data[s.i] {
			case ',', ']', '}', ' ', '\t', '\n', '\r':
				return
			}
			s.i++
		}
	}
}

// str skips a string starting at its opening quote and returns its contents.
func (s *jsonScan) str() span {
	s.i++ // opening quote
	sp := span{start: s.i, plain: true}
	for s.i < len(s.data) {
		switch c := s.data[s.i]; {
		case c == '\\':
			sp.plain = false
			s.i += 2
			continue
		case c == '"':
			sp.end = s.i
			s.i++
			return sp
		case c >= 0x80:
			sp.plain = false
		}
		s.i++
	}
	sp.end = min(s.i, len(s.data))
	return sp
}

func (s *jsonScan) object() {
	depth := len(s.path)
	for len(s.names) <= depth {
		s.names = append(s.names, nil)
	}
	s.names[depth] = s.names[depth][:0]
	for len(s.big) <= depth {
		s.big = append(s.big, nil)
	}
	s.big[depth] = nil
	s.i++ // {
	for {
		s.ws()
		if s.i >= len(s.data) || s.data[s.i] != '"' {
			s.i++ // } (or malformed input: step past it)
			return
		}
		name := s.str()
		s.check(depth, name)
		s.names[depth] = append(s.names[depth], name)
		s.ws()
		s.i++ // :
		s.path = append(s.path, step{name: name})
		s.value()
		s.path = s.path[:depth]
		s.ws()
		if s.i < len(s.data) && s.data[s.i] == ',' {
			s.i++
		}
	}
}

func (s *jsonScan) array() {
	depth := len(s.path)
	s.i++ // [
	for n := 0; ; n++ {
		s.ws()
		if s.i >= len(s.data) || s.data[s.i] == ']' {
			s.i++
			return
		}
		s.path = append(s.path, step{name: span{start: -1}, index: n})
		before := s.i
		s.value()
		s.path = s.path[:depth]
		s.ws()
		if s.i < len(s.data) && s.data[s.i] == ',' {
			s.i++
		} else if s.i == before {
			s.i++ // malformed input: make progress
		}
	}
}

// smallObject is the most names an object's duplicates are looked for among by comparing
// each pair; a larger object gets a map, so the check stays linear.
const smallObject = 32

// check records name as a duplicate when an earlier member of the object at depth has it.
func (s *jsonScan) check(depth int, name span) {
	names := s.names[depth]
	if len(names) < smallObject {
		for _, prev := range names {
			if s.same(prev, name) {
				s.dup(prev.start, name)
				return
			}
		}
		return
	}
	m := s.big[depth]
	if m == nil {
		m = make(map[string]int, 2*len(names))
		for _, prev := range names {
			m[s.text(prev)] = prev.start
		}
		s.big[depth] = m
	}
	t := s.text(name)
	if off, dup := m[t]; dup {
		s.dup(off, name)
		return
	}
	m[t] = name.start
}

func (s *jsonScan) dup(firstOff int, name span) {
	s.dups = append(s.dups, Duplicate{Path: s.steps(), Key: s.text(name),
		FirstLine: s.line(firstOff), FirstCol: s.col(firstOff - 1), Line: s.line(name.start), Col: s.col(name.start - 1)})
}

func (s *jsonScan) same(a, b span) bool {
	if a.plain && b.plain {
		return bytes.Equal(s.data[a.start:a.end], s.data[b.start:b.end])
	}
	return s.text(a) == s.text(b)
}

// text is a name as encoding/json reads it: unescaped, invalid UTF-8 replaced.
func (s *jsonScan) text(a span) string {
	raw := s.data[a.start:a.end]
	if a.plain {
		return string(raw)
	}
	var out string
	if err := json.Unmarshal(s.data[a.start-1:min(a.end+1, len(s.data))], &out); err != nil {
		return strconv.Quote(string(raw))
	}
	return out
}

func (s *jsonScan) steps() []Step {
	out := make([]Step, len(s.path))
	for i, p := range s.path {
		if p.name.start < 0 {
			out[i] = Step{Index: p.index}
		} else {
			out[i] = Step{Key: s.text(p.name)}
		}
	}
	return out
}

func (s *jsonScan) line(off int) int { return 1 + bytes.Count(s.data[:off], []byte{'\n'}) }

// col is the 1-based column of the byte at off, in bytes.
func (s *jsonScan) col(off int) int { return off - bytes.LastIndexByte(s.data[:off], '\n') }
