package input

import (
	"fmt"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"
)

type walkedLink struct {
	To      string   `yaml:"to"`
	Strands int      `yaml:"strands"`
	Growth  *float64 `yaml:"growth"`
	Skip    bool     `yaml:"skip"`
}

type walkedFile struct {
	At    Mapping
	Name  string       `yaml:"name"`
	Links []walkedLink `yaml:"links"`
	Loss  float64      `yaml:"loss_db" range:"db"`
	Lines []string     `yaml:"lines" scalar:"text"`
}

// TestDecoder: one case per behaviour of the walker, each with every message it gives.
func TestDecoder(t *testing.T) {
	t.Parallel()
	ranges := map[string]Range{"db": {Min: 0, Max: 50, Unit: "dB"}}
	strands := Range{Min: 0, Max: 100, Whole: true, Unit: "strands"}
	rangeOf := func(path string) (Range, bool) { return strands, path == "links.strands" }
	cases := []struct {
		name, yaml string
		want       string // every problem, one per line
		check      func(t *testing.T, f walkedFile, where map[string]Pos)
	}{
		{"unknown key, wrong type, out of range: all at once", "name: x\nlinks:\n  - {to: A, strands: 101, speed: 1}\nloss_db: lots\n",
			"f.yaml:3:22: links[0].strands: want a whole number of strands from 0 to 100, got 101\n" +
				"f.yaml:3:27: links[0].speed: unknown key; want one of growth, skip, strands, to\n" +
				`f.yaml:4:10: loss_db: want a number, got "lots"`, nil},
		// YAML 1.2.2 §10.2.1.4: .nan is a float; the tag's range refuses it.
		{"tag range", "loss_db: .nan\n", "f.yaml:1:10: loss_db: want dB from 0 to 50, got NaN", nil},
		// YAML 1.2.2 §3.2.1.1: keys are unique; the first value is read.
		{"key twice", "name: a\nname: b\n", "f.yaml:2:1: name: given twice, at line 1 and line 2; remove one",
			func(t *testing.T, f walkedFile, _ map[string]Pos) {
				if f.Name != "a" {
					t.Errorf("name: got %q, want the first value a", f.Name)
				}
			}},
		// https://yaml.org/type/merge.html: a key given in the mapping wins over a merged one.
		{"merge key", "base: &b {to: A, strands: 6}\nlinks:\n  - <<: *b\n    strands: 12\n", "f.yaml:1:1: base: unknown key; want one of lines, links, loss_db, name",
			func(t *testing.T, f walkedFile, _ map[string]Pos) {
				if len(f.Links) != 1 || f.Links[0].To != "A" || f.Links[0].Strands != 12 {
					t.Errorf("links: got %+v, want to A with 12 strands", f.Links)
				}
			}},
		// https://yaml.org/type/bool.html: YAML 1.1's yes and no, which yaml.v3 reads into a bool.
		{"yes for true", "links:\n  - {to: A, skip: yes}\n  - {to: B, skip: maybe}\n", `f.yaml:3:19: links[1].skip: want true or false, got "maybe"`,
			func(t *testing.T, f walkedFile, _ map[string]Pos) {
				if !f.Links[0].Skip {
					t.Error("skip: yes read as false")
				}
			}},
		{"positions", "name: x\nlinks:\n  - to: A\n    growth: 0.5\n", "",
			func(t *testing.T, f walkedFile, where map[string]Pos) {
				if where["links[0]"] != (Pos{3, 5}) || where["links[0].growth"] != (Pos{4, 13}) || where["name"] != (Pos{1, 7}) {
					t.Errorf("where: got %v", where)
				}
				if l, c := f.At.At("links"); l != 2 || c != 1 || !f.At.Has("name") || f.At.Has("loss_db") {
					t.Errorf("mapping: got %+v", f.At)
				}
				if f.Links[0].Growth == nil || *f.Links[0].Growth != 0.5 {
					t.Errorf("growth: got %v", f.Links[0].Growth)
				}
			}},
		// YAML 1.2.2 §10.3.2 (core schema): plain 3, true and 1.5 resolve to an integer, a
		// boolean and a float; yaml.v3 resolves 2026-12-05 to a timestamp. A field tagged
		// scalar:"text" refuses them; quoted (§7.3) or tagged !!str they are text. A string
		// field without the tag still reads a plain 3 as "3".
		{"text only", "name: 3\nlines: [3, true, \"3\", '1.5', !!str 4, words, 1.5, 2026-12-05, {a: 1}]\n",
			`f.yaml:2:9: lines[0]: want text, got 3, which YAML reads as a number; quote it ("3") to keep it as written` + "\n" +
				`f.yaml:2:12: lines[1]: want text, got true, which YAML reads as true or false; quote it ("true") to keep it as written` + "\n" +
				`f.yaml:2:46: lines[6]: want text, got 1.5, which YAML reads as a number; quote it ("1.5") to keep it as written` + "\n" +
				`f.yaml:2:51: lines[7]: want text, got 2026-12-05, which YAML reads as a date; quote it ("2026-12-05") to keep it as written` + "\n" +
				"f.yaml:2:63: lines[8]: want text, got a mapping",
			func(t *testing.T, f walkedFile, _ map[string]Pos) {
				if f.Name != "3" || len(f.Lines) != 9 || f.Lines[2] != "3" || f.Lines[3] != "1.5" || f.Lines[4] != "4" || f.Lines[5] != "words" {
					t.Errorf("name %q, lines %q: want 3, and the quoted and plain text read", f.Name, f.Lines)
				}
			}},
		{"not YAML", "name: [", "f.yaml:1: not YAML: did not find expected node content", nil},
		{"empty", "", "f.yaml: not YAML: empty file", nil},
		{"not a mapping", "[1]", "f.yaml:1:1: want a mapping, got a list", nil},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			var errs Problems
			where := map[string]Pos{}
			d := &Decoder{File: "f.yaml", Problems: &errs, Ranges: ranges, RangeOf: rangeOf, Where: where}
			var f walkedFile
			d.Parse([]byte(tc.yaml), &f)
			got := ""
			if errs.Len() > 0 {
				errs.Sort()
				got = errs.Error()
			}
			if got != tc.want {
				t.Errorf("got\n%s\nwant\n%s", got, tc.want)
			}
			if tc.check != nil {
				tc.check(t, f, where)
			}
		})
	}
}

// TestMergeCycleAndFanOut: a mapping that merges itself is reported, not followed (it never
// ends), and nested merges that name one mapping many times are resolved once each.
func TestMergeCycleAndFanOut(t *testing.T) {
	t.Parallel()
	var cyc yaml.Node
	if err := yaml.Unmarshal([]byte("d: &d\n  a: 1\n  <<: *d\n"), &cyc); err != nil {
		t.Fatal(err)
	}
	got := pairs(Resolve(cyc.Content[0].Content[1]))
	if len(got) != 2 || !strings.Contains(got[1][0].Value, "merges the mapping it stands in") {
		t.Errorf("self-merge: got %d pairs, want a and the refused merge", len(got))
	}
	src := "x0: &a0 {k: 3}\n"
	for i := 1; i <= 12; i++ {
		src += fmt.Sprintf("x%d: &a%d {<<: [%s]}\n", i, i, strings.TrimSuffix(strings.Repeat(fmt.Sprintf("*a%d, ", i-1), 10), ", "))
	}
	var fan yaml.Node
	if err := yaml.Unmarshal([]byte(src), &fan); err != nil {
		t.Fatal(err)
	}
	top := fan.Content[0]
	if got := pairs(Resolve(top.Content[len(top.Content)-1])); len(got) != 1 || got[0][0].Value != "k" {
		t.Errorf("fan-out: got %d pairs, want the one key k", len(got))
	}
}
