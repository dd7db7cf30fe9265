package input

import "testing"

// TestDidYouMean: an unknown key names the known key it is likely a typo of (a new user who
// wrote allow_new_trnch got a list of 35 keys and no hint), and nothing when the nearest is
// far or not alone. Edit distance: Levenshtein (insertions, deletions, substitutions).
func TestDidYouMean(t *testing.T) {
	known := map[string]bool{"allow_new_trench": true, "allow_outdoor_copper": true, "snap_m": true, "slack_m": true,
		"budget": true, "name": true, "links": true, "hub": true, "hut": true}
	for _, c := range []struct{ key, want string }{
		{"allow_new_trnch", " did you mean allow_new_trench?"},
		{"budgit", " did you mean budget?"},
		{"snap", " did you mean snap_m?"}, // the unit left off
		{"slak_m", " did you mean slack_m?"},
		{"base", ""}, // name is two edits from base: too far for four letters
		{"hux", ""},  // hub and hut are both one edit away
		{"zzzzzz", ""},
	} {
		if got := DidYouMean(c.key, known); got != c.want {
			t.Errorf("%s: got %q, want %q", c.key, got, c.want)
		}
	}
	if d := EditDistance("kitten", "sitting"); d != 3 { // the textbook example
		t.Errorf("EditDistance(kitten, sitting) = %d, want 3", d)
	}
}
