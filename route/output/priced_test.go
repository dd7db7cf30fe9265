package output

import "testing"

// TestPricedNote: a total that leaves infeasible legs out says so (a plan with 911 of 1,017
// legs infeasible printed its total with no word that it priced 106 legs); none when every
// leg is priced. Plain English grammar for the counts of one (no published source).
func TestPricedNote(t *testing.T) {
	for _, c := range []struct {
		legs, infeasible int
		want             string
	}{
		{10, 0, ""},
		{1017, 911, "the total prices the 106 feasible legs of 1017 only; 911 infeasible legs are not priced (no route or medium was found)"},
		{2, 1, "the total prices the 1 feasible leg of 2 only; 1 infeasible leg is not priced (no route or medium was found)"},
		// Every leg infeasible: said plainly, not "prices the 0 feasible legs of 5 only".
		{5, 5, "no leg is priced: all 5 legs are infeasible (no route or medium was found)"},
		{1, 1, "no leg is priced: the one leg is infeasible (no route or medium was found)"},
	} {
		if got := (Summary{Legs: c.legs, Infeasible: c.infeasible}).PricedNote(); got != c.want {
			t.Errorf("%d of %d infeasible: got %q, want %q", c.infeasible, c.legs, got, c.want)
		}
	}
}
