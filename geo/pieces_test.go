package geo

import (
	"fmt"
	"slices"
	"testing"

	"github.com/paulmach/orb"
)

// pieceNames names each span by its id and its points in west-to-east order, so that a line
// drawn the other way gives the same names when its pieces keep their ids.
func pieceNames(n *Network) []string {
	var out []string
	for _, s := range n.Spans {
		pts := slices.Clone(s.Line)
		slices.SortFunc(pts, func(a, b orb.Point) int {
			if lessLL(a, b) {
				return -1
			}
			if lessLL(b, a) {
				return 1
			}
			return 0
		})
		out = append(out, fmt.Sprintf("%s %v", s.ID, pts))
	}
	slices.Sort(out)
	return out
}

// TestPieceIDsIgnoreDirection (tester's finding 15): reversing a pathway's line, or the
// order of a MultiLineString's lines, gives every piece the same id: pieces are numbered from
// the west end of a line that runs more east-west than north-south, else from its south end
// (a closed line toward the neighbour that rule puts first), so a plan read back by
// --start-from names the same spans.
func TestPieceIDsIgnoreDirection(t *testing.T) {
	t.Parallel()
	// D bends where B joins it (its ends 150 m apart east-west, 100 m north-south: numbered
	// from its west end); M is two lines, each crossed by C; R is a closed loop that E joins.
	d, m1, m2, r := ml(0, 0, 0, 100, -150, 100), ml(200, 0, 300, 0), ml(300, 50, 200, 50), ml(0, 300, 100, 300, 100, 400, 0, 400, 0, 300)
	others := []Pathway{pw("B", ml(0, 100, 0, 200)), pw("C", ml(250, -50, 250, 0, 250, 50, 250, 100)), pw("E", ml(100, 400, 200, 400))}
	base := build(t, &Campus{Pathways: append(slices.Clone(others), pw("D", d), pw("M", m1, m2), pw("R", r))})
	want := pieceNames(base)
	if !slices.Contains(want, fmt.Sprintf("D/1 %v", []orb.Point{at(-150, 100), at(0, 100)})) {
		t.Errorf("D/1 is not the piece at D's western end: %q", want)
	}
	for _, tc := range []struct {
		name string
		pws  []Pathway
	}{
		{"lines reversed", []Pathway{pw("D", reversed(d)), pw("M", reversed(m1), reversed(m2)), pw("R", reversed(r))}},
		{"lines of M in the other order", []Pathway{pw("D", d), pw("M", m2, m1), pw("R", r)}},
		{"both", []Pathway{pw("D", reversed(d)), pw("M", reversed(m2), m1), pw("R", reversed(r))}},
	} {
		got := pieceNames(build(t, &Campus{Pathways: append(slices.Clone(others), tc.pws...)}))
		if !slices.Equal(got, want) {
			t.Errorf("%s: spans %q, want %q", tc.name, got, want)
		}
	}
}
