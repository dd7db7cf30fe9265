package plan

import (
	"slices"
	"strings"
	"testing"
)

// TestPlanNotes: the plan's notes are lines of text, read in order (the outputs carry them
// first among their notes: route.Result.Notes); anything else is a problem at its place.
func TestPlanNotes(t *testing.T) {
	t.Parallel()
	p, err := ParsePlan("plan.yaml", []byte("campus: [c.geojson]\nnotes:\n  - carried by the sweep\n  - prices as quoted\n"))
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{"carried by the sweep", "prices as quoted"}; !slices.Equal(p.Notes, want) {
		t.Errorf("notes %q, want %q", p.Notes, want)
	}
	for _, tc := range []struct{ name, yaml, want string }{
		{"a mapping", "campus: [c.geojson]\nnotes: [{a: 1}]\n", "plan.yaml:2:9: notes[0]: "},
		{"not a list", "campus: [c.geojson]\nnotes: {a: 1}\n", "plan.yaml:2:8: notes: "},
		{"an empty line", "campus: [c.geojson]\nnotes: [ok, \"  \"]\n", "notes[1]: "}, // review 18 F7
		// YAML 1.2.2 §10.3.2 (core schema): plain 3, true and 1.5 resolve to an integer, a
		// boolean and a float, not text; each is one problem, never read as the text "3".
		{"a number", "campus: [c.geojson]\nnotes: [ok, 3]\n", `plan.yaml:2:13: notes[1]: want text, got 3, which YAML reads as a number; quote it ("3") to keep it as written`},
		{"true", "campus: [c.geojson]\nnotes: [true]\n", `plan.yaml:2:9: notes[0]: want text, got true, which YAML reads as true or false`},
		{"a float", "campus: [c.geojson]\nnotes:\n  - 1.5\n", `plan.yaml:3:5: notes[0]: want text, got 1.5, which YAML reads as a number`},
		{"a mapping item", "campus: [c.geojson]\nnotes: [ok, {a: 1}]\n", "plan.yaml:2:13: notes[1]: want text, got a mapping"},
	} {
		_, err := ParsePlan("plan.yaml", []byte(tc.yaml))
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want a problem at %q", tc.name, err, tc.want)
		} else if n := strings.Count(err.Error(), "notes["); n > 1 {
			t.Errorf("%s: %d problems, want one: %v", tc.name, n, err)
		}
	}
	// Quoted, the same values are text (YAML 1.2.2 §7.3: a quoted scalar is a string).
	p, err = ParsePlan("plan.yaml", []byte("campus: [c.geojson]\nnotes: [\"3\", 'true', \"1.5\", !!str 4, plain words]\n"))
	if err != nil {
		t.Fatal(err)
	}
	if want := []string{"3", "true", "1.5", "4", "plain words"}; !slices.Equal(p.Notes, want) {
		t.Errorf("quoted notes %q, want %q", p.Notes, want)
	}
}
