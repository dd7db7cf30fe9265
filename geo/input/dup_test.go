package input

import (
	"encoding/json"
	"fmt"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"
)

func TestJSONDuplicates(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name string
		doc  string
		want []string // Where() and lines of each duplicate
	}{
		{"none", `{"a":1,"b":{"a":2},"c":[{"a":1},{"a":2}]}`, nil},
		// RFC 8259 §4: names within an object SHOULD be unique; readers differ on which
		// value they keep.
		{"top level", "{\"type\":1,\n\"type\":2}", []string{"type 1 2"}},
		{"nested in an array", "{\"features\":[{},\n{\"properties\":{\"riser_m\":1,\n\"riser_m\":2}}]}", []string{"features[1].properties.riser_m 2 3"}},
		// RFC 8259 §7: \u0061 is the letter a.
		{"escaped name", `{"a":1,"\u0061":2}`, []string{"a 1 1"}},
		{"same name in sibling objects", `[{"a":1},{"a":1}]`, nil},
		{"names inside strings", `{"x":"\"a\":1,\"a\":2"}`, nil},
		{"three times", `{"k":1,"k":2,"k":3}`, []string{"k 1 1", "k 1 1"}},
	}
	for _, tc := range cases {
		if !json.Valid([]byte(tc.doc)) {
			t.Fatalf("%s: fixture is not JSON", tc.name)
		}
		got := describeDups(JSONDuplicates([]byte(tc.doc)))
		if strings.Join(got, "|") != strings.Join(tc.want, "|") {
			t.Errorf("%s: got %q, want %q", tc.name, got, tc.want)
		}
	}
}

// TestJSONDuplicatesBigObject takes the map path for objects of many members.
func TestJSONDuplicatesBigObject(t *testing.T) {
	t.Parallel()
	var b strings.Builder
	b.WriteString("{")
	for i := 0; i < 3*smallObject; i++ {
		fmt.Fprintf(&b, "%q:%d,", fmt.Sprintf("k%d", i), i)
	}
	b.WriteString(`"k5":0,"k90":1}`)
	got := describeDups(JSONDuplicates([]byte(b.String())))
	if want := "k5 1 1|k90 1 1"; strings.Join(got, "|") != want {
		t.Errorf("got %q, want %q", got, want)
	}
}

// TestDuplicateOnOneLine (tester 14 F13): GIS tools often write a whole file on one line, where
// "at line 1 and line 1" finds neither; both columns are named instead (1-based, in bytes, at
// the name's opening quote), in JSON and in a YAML flow mapping alike.
func TestDuplicateOnOneLine(t *testing.T) {
	t.Parallel()
	doc := `{"features":[{"properties":{"riser_m":30,"riser_m":31}}]}`
	//      1234567890123456789012345678901234567890123456789
	ds := JSONDuplicates([]byte(doc))
	if len(ds) != 1 {
		t.Fatalf("got %d duplicates, want 1", len(ds))
	}
	if d := ds[0]; d.FirstCol != 29 || d.Col != 42 {
		t.Errorf("columns %d and %d, want 29 and 42", d.FirstCol, d.Col)
	}
	if msg := ds[0].Err().Error(); msg != "given twice on line 1, at columns 29 and 42; remove one" {
		t.Errorf("message: %q", msg)
	}
	var n yaml.Node
	if err := yaml.Unmarshal([]byte("a: 1\nb: {x: 1, x: 2}\n"), &n); err != nil {
		t.Fatal(err)
	}
	if msg := YAMLDuplicates(&n)[0].Err().Error(); msg != "given twice on line 2, at columns 5 and 11; remove one" {
		t.Errorf("YAML message: %q", msg)
	}
}

func TestYAMLDuplicates(t *testing.T) {
	t.Parallel()
	// YAML 1.2.2 §3.2.1.1: the keys of a mapping are unique.
	doc := "hub: A\ndesign:\n  slack_m: 5\n  slack_m: 6\nlinks:\n  - to: B\n    to: C\nhub: B\nshared: &s {a: 1}\nother: *s\n"
	var n yaml.Node
	if err := yaml.Unmarshal([]byte(doc), &n); err != nil {
		t.Fatal(err)
	}
	got := describeDups(YAMLDuplicates(&n))
	want := []string{"design.slack_m 3 4", "links[0].to 6 7", "hub 1 8"}
	if strings.Join(got, "|") != strings.Join(want, "|") {
		t.Errorf("got %q, want %q", got, want)
	}
	if msg := YAMLDuplicates(&n)[0].Err().Error(); msg != "given twice, at line 3 and line 4; remove one" {
		t.Errorf("message: %q", msg)
	}
}

func describeDups(ds []Duplicate) []string {
	var out []string
	for _, d := range ds {
		out = append(out, fmt.Sprintf("%s %d %d", d.Where(), d.FirstLine, d.Line))
	}
	return out
}

func TestDropYAMLDuplicates(t *testing.T) {
	t.Parallel()
	var n yaml.Node
	if err := yaml.Unmarshal([]byte("a: 1\nb: {x: 1, x: 2}\na: 3\n"), &n); err != nil {
		t.Fatal(err)
	}
	DropYAMLDuplicates(&n)
	// yaml.v3 refuses to decode a mapping with a repeated key; without them it decodes.
	var got map[string]any
	if err := n.Decode(&got); err != nil {
		t.Fatal(err)
	}
	if fmt.Sprint(got) != "map[a:1 b:map[x:1]]" {
		t.Errorf("got %v, want the first of each key", got)
	}
}
