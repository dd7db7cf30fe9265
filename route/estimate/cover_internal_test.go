package estimate

import (
	"maps"
	"testing"

	"spanwright/media"
)

// TestCoverCheapestDemo: enclosures for a building's ports from the demo price book
// (prices-demo.yaml, invented prices), each combination priced by hand.
func TestCoverCheapestDemo(t *testing.T) {
	t.Parallel()
	sizes, cents := counts(media.DefaultPriceBook(), media.PriceEnclosure)
	encl, price := sizes[media.PriceEnclosure], cents[media.PriceEnclosure]
	cases := []struct {
		name  string
		ports int
		want  map[int]int
	}{
		// 192 ports: 144 + 48 = 1,090 + 460 = 1,550; 96 + 96 = 1,560; 288 = 1,980;
		// 144 + 24 + 24 = 1,710; 4 × 48 = 1,840 (computed by hand).
		{"two smaller units", 192, map[int]int{144: 1, 48: 1}},
		// 288 ports: 288 = 1,980; 144 + 144 = 2,180; 3 × 96 = 2,340 (computed by hand).
		{"one big unit", 288, map[int]int{288: 1}},
		// 20 ports: one 24-port at 310 (computed by hand).
		{"below the smallest", 20, map[int]int{24: 1}},
		{"nothing", 0, map[int]int{}},
	}
	for _, tc := range cases {
		if got := cover(encl, price, tc.ports); !maps.Equal(got, tc.want) {
			t.Errorf("%s: cover(%d ports) = %v, want %v", tc.name, tc.ports, got, tc.want)
		}
	}
}

// TestCoverTieBreak: equal costs take the fewest units, then the larger sizes (the
// project's own rule; prices chosen to tie, not a price list).
func TestCoverTieBreak(t *testing.T) {
	t.Parallel()
	sizes := []int{12, 24, 36, 48}
	cents := map[int]int64{12: 1000, 24: 2000, 36: 3000, 48: 4000}
	// 48 ports cost 4,000 however made: one 48 is the fewest units.
	if got, want := cover(sizes, cents, 48), map[int]int{48: 1}; !maps.Equal(got, want) {
		t.Errorf("48 ports: %v, want %v", got, want)
	}
	// 60 ports cost 5,000 however made; two units: 48 + 12 or 36 + 24; the larger sizes win.
	if got, want := cover(sizes, cents, 60), map[int]int{48: 1, 12: 1}; !maps.Equal(got, want) {
		t.Errorf("60 ports: %v, want %v", got, want)
	}
}
