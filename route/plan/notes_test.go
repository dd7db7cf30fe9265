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
	} {
		if _, err := ParsePlan("plan.yaml", []byte(tc.yaml)); err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want a problem at %q", tc.name, err, tc.want)
		}
	}
}
