package geo

import (
	"slices"
	"testing"
)

// TestStretchesCandidateTap: duct D runs 200 m west-east with a handhole H at x = 100. A
// building U, 10 m north of D at x = 50, gets a counted lateral tapping D there, which cuts
// D's first span in two whether or not a route uses it (review 20 F5: the bill said "span
// D/1; span D/2" for work on one drawn duct). The stretches of pathway named for work on
// spans are the same with U as without it: the whole pathway by its id, a part by metres
// along it from its west end, the run west of H one stretch however the tap cuts it.
func TestStretchesCandidateTap(t *testing.T) {
	t.Parallel()
	stretches := func(withU bool, west bool) []string {
		c := Campus{Pathways: []Pathway{pw("D", ml(0, 0, 100, 0, 200, 0))},
			Structures: []Structure{{Source: Source{File: "t.geojson", Index: 1}, ID: "H", Type: "handhole", Point: at(100, 0)}}}
		if withU {
			c.Buildings = []Building{box("U", 50, 15, 5)}
		}
		n := build(t, &c)
		if want := map[bool]int{false: 2, true: 3}[withU]; len(n.Spans) != want {
			t.Fatalf("with U %v: %d spans, want %d (U's tap cuts D west of H)", withU, len(n.Spans), want)
		}
		var ids []string
		for _, sp := range n.Spans {
			if !west || sp.To == "H" || sp.From != "H" && sp.To != "H" && pointX(sp) < 100 {
				ids = append(ids, sp.ID)
			}
		}
		return n.Stretches(append(ids, "no-such-span"))
	}
	for _, west := range []bool{false, true} {
		without, with := stretches(false, west), stretches(true, west)
		want := []string{"pathway D", "span no-such-span"}
		if west {
			// 100 m east on the grid of at is 100.3 m on the ellipsoid.
			want = []string{"pathway D, 0.0 m to 100.3 m", "span no-such-span"}
		}
		if !slices.Equal(without, want) || !slices.Equal(with, want) {
			t.Errorf("west only %v: without U %q, with U %q; want %q", west, without, with, want)
		}
	}
}

// pointX is the metres east of the campus origin (at) of the middle of span sp's line.
func pointX(sp Span) float64 {
	p := sp.Line[len(sp.Line)/2]
	return (p[0] - at(0, 0)[0]) / (at(1, 0)[0] - at(0, 0)[0])
}
