package sweep

import (
	"testing"

	"spanwright/route/output"
)

// TestRowNotesNotPriced: a scenario whose price book leaves out prices its bill needs (its
// total leaves those lines out) says so in its row's note, after what it left out of the plan,
// so that a comparison ranking totals shows why it is cheaper (common practice, no published
// source: bids are compared with their exclusions).
func TestRowNotesNotPriced(t *testing.T) {
	for _, c := range []struct {
		notes, notPriced []string
		want             string
	}{
		{nil, nil, ""},
		{[]string{"link to B dropped"}, nil, "link to B dropped"},
		{nil, []string{"patch_cords_each"}, "not priced, left out of the total: patch_cords_each (see the warnings)"},
		{[]string{"link to B dropped"}, []string{"patch_cords_each", "building_entrance_each"},
			"link to B dropped; not priced, left out of the total: patch_cords_each, building_entrance_each (see the warnings)"},
	} {
		var r Row
		r.fill(output.Summary{Notes: c.notes, NotPriced: c.notPriced})
		if r.Note != c.want {
			t.Errorf("notes %q, not priced %q: note %q, want %q", c.notes, c.notPriced, r.Note, c.want)
		}
	}
}
