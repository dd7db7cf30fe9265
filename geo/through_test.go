package geo

import (
	"fmt"
	"math"
	"strings"
	"testing"
)

// TestProposedThroughFootprint: a proposed trench drawn across a building's footprint is
// warned of with the pathway, the building and the metres inside; so is one drawn into the
// building and out again to an entrance on its wall (the new-user trial's case: 20 m east
// inside, then 10 m south to the wall). A proposed duct drawn through the wall to the
// telecom room (one end inside), an existing duct across the building (it is there already)
// and a proposed tray inside are not. The building is a 40 m square; the lengths are
// arithmetic on it (0.3 m allowed: the test's grid is a sphere's, the campus an ellipsoid's).
func TestProposedThroughFootprint(t *testing.T) {
	t.Parallel()
	proposed := func(id, typ string, xy ...float64) Pathway {
		p := pw(id, ml(xy...))
		p.Status, p.Type = StatusProposed, typ
		return p
	}
	for _, tc := range []struct {
		name  string
		p     Pathway
		wantM float64 // metres inside; 0 for no warning
	}{
		{"across", proposed("T", TypeDuct, -100, 0, 100, 0), 40},
		{"in and out to the wall", proposed("T", TypeDuct, -100, 5, 0, 5, 0, -20.0003), 20 + 25},
		{"buried across", proposed("T", TypeBuried, 0, -100, 0, 100), 40},
		{"to the telecom room", proposed("T", TypeDuct, -100, 0, 5, 0), 0},
		{"tray inside", proposed("T", TypeTray, -10, 0, 10, 0), 0},
		{"aerial over", proposed("T", TypeAerial, -100, 0, 100, 0), 0},
		{"existing across", pw("T", ml(-100, 0, 100, 0)), 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			n := build(t, &Campus{Buildings: []Building{box("B", 0, 0, 20)}, Pathways: []Pathway{tc.p}})
			var got []string
			for _, w := range n.Warnings {
				if strings.Contains(w.Message, "inside the footprint") {
					got = append(got, w.Message)
				}
			}
			if tc.wantM == 0 {
				if len(got) > 0 {
					t.Errorf("warned %q, want nothing", got)
				}
				return
			}
			var m float64
			if len(got) != 1 || !strings.HasPrefix(got[0], `proposed pathway "T" runs `) {
				t.Fatalf("warnings %q, want one naming pathway T", got)
			}
			if _, err := fmt.Sscanf(strings.TrimPrefix(got[0], `proposed pathway "T" runs `), "%g m inside the footprint of building \"B\"", &m); err != nil || math.Abs(m-tc.wantM) > 0.3 {
				t.Errorf("warning %q: %v m inside (%v), want %v", got[0], m, err, tc.wantM)
			}
		})
	}
}
