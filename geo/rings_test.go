package geo

import (
	"math"
	"strings"
	"testing"
)

// ringOf closes the points (x, y pairs, metres) into a ring on the local plane.
func ringOf(xy ...float64) []vec {
	var r []vec
	for i := 0; i+1 < len(xy); i += 2 {
		r = append(r, vec{xy[i], xy[i+1]})
	}
	return append(r, r[0])
}

// TestRingCrossing: a ring is simple when its edges meet only at their shared vertices (OGC
// Simple Features / ISO 19125-1, polygon rings; from memory). The cases a footprint drawn by
// hand produces, and rotations and reversals of each (where a ring starts and which way it
// runs must not matter).
func TestRingCrossing(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name  string
		ring  []vec
		cross bool
	}{
		{"square", ringOf(0, 0, 20, 0, 20, 20, 0, 20), false},
		{"L-shaped (concave)", ringOf(0, 0, 30, 0, 30, 10, 10, 10, 10, 30, 0, 30), false},
		{"bow-tie: two vertices swapped", ringOf(0, 0, 20, 20, 20, 0, 0, 20), true},
		{"pentagram", ringOf(0, 10, 5.9, -8.1, -9.5, 3.1, 9.5, 3.1, -5.9, -8.1), true},
		{"traced twice round, spiralling in", ringOf(0, 0, 20, 0, 20, 20, 0, 20, 0, 2, 18, 2, 18, 18, 2, 18), true},
		// Two rooms touching at one corner: the edges meet at a vertex, not across.
		{"touches itself at a vertex", ringOf(0, 0, 10, 0, 10, 10, 20, 10, 20, 20, 10, 20, 10, 10, 0, 10), false},
		// A notch whose sides come within 0.2 m of each other without crossing.
		{"narrow notch", ringOf(0, 0, 20, 0, 20, 20, 10.1, 20, 10.1, 5, 9.9, 5, 9.9, 20, 0, 20), false},
	}
	for _, tc := range cases {
		n := len(tc.ring) - 1
		for rot := 0; rot < n; rot++ {
			for _, rev := range []bool{false, true} {
				r := make([]vec, 0, n+1)
				for i := 0; i < n; i++ {
					j := (rot + i) % n
					if rev {
						j = (rot - i + n) % n
					}
					r = append(r, tc.ring[j])
				}
				r = append(r, r[0])
				if _, _, got := ringCrossing(r, 0.05); got != tc.cross {
					t.Errorf("%s (from vertex %d, reversed %v): crossing %v, want %v", tc.name, rot, rev, got, tc.cross)
				}
			}
		}
	}
	// A round footprint of 20,000 vertices (a digitized silo, say) is checked in about linear
	// time through the grid; and a crossing put into it is found.
	const n = 20000
	big := make([]vec, 0, n+1)
	for i := 0; i < n; i++ {
		a := 2 * math.Pi * float64(i) / n
		big = append(big, vec{50 * math.Cos(a), 50 * math.Sin(a)})
	}
	big = append(big, big[0])
	if _, _, got := ringCrossing(big, 0.05); got {
		t.Errorf("a circle of %d vertices reported crossing itself", n)
	}
	big[n/2], big[n/2+n/4] = big[n/2+n/4], big[n/2]
	if _, _, got := ringCrossing(big, 0.05); !got {
		t.Errorf("a circle with two vertices swapped across it not reported")
	}
}

// TestSelfCrossingWarned: Build warns once, on the building, of a bow-tie footprint, and says
// nothing of a square one.
func TestSelfCrossingWarned(t *testing.T) {
	t.Parallel()
	bow := box("BOW", 0, 0, 10)
	r := bow.Footprint[0][0]
	r[1], r[2] = r[2], r[1] // (-10,-10) (10,10) (10,-10) (-10,10): a bow-tie
	c := Campus{
		Buildings: []Building{bow, box("SQ", 100, 0, 10)},
		Pathways:  []Pathway{pw("S", ml(-50, -30, 150, -30)), pw("L1", ml(0, -30, 0, -10)), pw("L2", ml(100, -30, 100, -10))},
	}
	n := build(t, &c)
	var got []Warning
	for _, w := range n.Warnings {
		if strings.Contains(w.Message, "crosses itself") {
			got = append(got, w)
		}
	}
	if len(got) != 1 || !strings.Contains(got[0].Feature, "BOW") || !strings.Contains(got[0].Message, `building "BOW": its footprint's outer ring crosses itself at`) {
		t.Fatalf("warnings of crossing rings: %+v, want one on BOW", got)
	}
}
