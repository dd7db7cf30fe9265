package input

import (
	"errors"
	"fmt"
	"strings"
	"testing"
)

// TestProblemText: each part of a problem is printed when known, in one order, once; the
// file:line:col prefix is go/scanner's (Go's compilers print positions so).
func TestProblemText(t *testing.T) {
	t.Parallel()
	want := Errorf(ErrBadValue, "want a thing")
	cases := []struct {
		name string
		p    Problem
		text string
	}{
		{"whole file", Problem{File: "a.yaml", Err: want}, "a.yaml: want a thing"},
		{"line only", Problem{File: "a.yaml", Line: 3, Err: want}, "a.yaml:3: want a thing"},
		{"line and column, key", Problem{File: "a.yaml", Line: 3, Col: 7, Key: "design.slack_m", Err: want}, "a.yaml:3:7: design.slack_m: want a thing"},
		{"item and key", Problem{File: "c.yaml", Line: 8, Col: 5, Item: `medium "om4"`, Key: "colour", Err: want}, `c.yaml:8:5: medium "om4": colour: want a thing`},
		{"feature with id, property", Problem{File: "c.geojson", Feature: &Feature{Index: 2, ID: "P-1"}, Key: "duct_mm", Err: want},
			`c.geojson: feature #2 "P-1": property "duct_mm": want a thing`},
		{"feature without id, geometry", Problem{File: "c.geojson", Feature: &Feature{Index: 0}, Key: "geometry", Err: want},
			`c.geojson: feature #0 (no id): geometry: want a thing`},
		{"table row with id, property", Problem{File: "c.gpkg", Feature: &Feature{Table: "pathways", FID: 12, ID: "D-07"}, Key: "duct_mm", Err: want},
			`c.gpkg: table pathways fid 12 (id "D-07"): property "duct_mm": want a thing`},
		{"table row without id, odd table name", Problem{File: "c.gpkg", Feature: &Feature{Table: "door ways", FID: 3}, Key: "geometry", Err: want},
			`c.gpkg: table "door ways" fid 3 (no id): geometry: want a thing`},
		{"whole table", Problem{File: "c.gpkg", Item: "table " + TableName("local"), Err: want}, `c.gpkg: table local: want a thing`},
		{"value", Problem{File: "a.yaml", Line: 2, Col: 9, Key: "growth", Value: "NaN", Err: want}, "a.yaml:2:9: growth: want a thing, got NaN"},
		{"nowhere", Problem{Value: "-1", Err: want}, "want a thing, got -1"},
	}
	for _, tc := range cases {
		if got := tc.p.Error(); got != tc.text {
			t.Errorf("%s: got %q, want %q", tc.name, got, tc.text)
		}
	}
}

// TestPlace: a Range's problem put at a key keeps its value as a field; any other error is
// the problem's Err; Class is matched by errors.Is without being printed.
func TestPlace(t *testing.T) {
	t.Parallel()
	class := errors.New("invalid plan")
	at := Problem{File: "p.yaml", Line: 4, Col: 12, Key: "design.slack_m", Class: class}
	p := Place(at, Range{Min: 0, Max: 1000, Unit: "metres"}.Check(-1))
	if p.Value != "-1" || p.Error() != "p.yaml:4:12: design.slack_m: want metres from 0 to 1000, got -1" {
		t.Errorf("range: got %q (value %q)", p, p.Value)
	}
	if !errors.Is(p, ErrOutOfRange) || !errors.Is(p, ErrBadValue) || !errors.Is(p, class) {
		t.Errorf("range: %v does not match ErrOutOfRange, ErrBadValue and its class", p)
	}
	other := fmt.Errorf("read: %w", ErrNotRegular)
	if p := Place(at, other); p.Err != other || p.Value != "" || !errors.Is(p, ErrNotRegular) {
		t.Errorf("other error: got %+v", p)
	}
}

// TestProblems: a list flattens the lists added to it, keeps MaxProblems and counts the rest
// (go/scanner's ErrorList reports "and N more errors" too), sorts each file by position
// keeping the files in order of their first problem, and is nil as an error when empty.
func TestProblems(t *testing.T) {
	t.Parallel()
	var empty Problems
	if empty.Err() != nil {
		t.Errorf("empty list: Err() = %v, want nil", empty.Err())
	}
	var inner Problems
	inner.Add(&Problem{File: "b.yaml", Line: 9, Err: Errorf(ErrBadValue, "b9")})
	inner.Add(&Problem{File: "b.yaml", Line: 2, Col: 4, Err: Errorf(ErrBadValue, "b2")})
	var l Problems
	l.Add(&Problem{File: "a.yaml", Line: 5, Err: Errorf(ErrUnknownKey, "a5")})
	l.Add(&inner)
	l.Add(errors.New("not about a file"))
	l.Add(nil)
	l.Add(&Problem{File: "a.yaml", Line: 1, Err: Errorf(ErrBadValue, "a1")})
	if l.Len() != 5 {
		t.Fatalf("got %d problems, want 5: %v", l.Len(), &l)
	}
	l.Sort()
	want := "a.yaml:1: a1\na.yaml:5: a5\nb.yaml:2:4: b2\nb.yaml:9: b9\nnot about a file"
	if got := l.Error(); got != want {
		t.Errorf("sorted: got\n%s\nwant\n%s", got, want)
	}
	if !errors.Is(l.Err(), ErrUnknownKey) {
		t.Errorf("errors.Is does not see the problems of %v", &l)
	}
	var many Problems
	for i := 0; i < MaxProblems+3; i++ {
		many.Add(&Problem{File: "c.yaml", Line: i + 1, Err: Errorf(ErrBadValue, "bad")})
	}
	if len(many.List) != MaxProblems || many.Dropped != 3 || !strings.HasSuffix(many.Error(), "\n(and 3 more errors)") {
		t.Errorf("over the cap: kept %d, dropped %d, ends %q", len(many.List), many.Dropped, many.Error()[len(many.Error())-30:])
	}
}
