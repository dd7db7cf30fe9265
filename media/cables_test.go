package media

import (
	"testing"
)

// TestCables: a link's cables are the fewest the largest size allows, and of those the
// cheapest set of the construction's sizes by the book's cable per metre (Engine.Cables).
// Strand counts are the catalog's (TIA-598 common-practice counts 12 to 288, seen); the
// prices are invented, one book dearer per strand in the larger sizes and one where a
// smaller size is dearer than a larger, to show the set follows the prices, not the counts.
func TestCables(t *testing.T) {
	t.Parallel()
	sizes := []Size{{Count: 12, ODMM: 10.5}, {Count: 24, ODMM: 10.5}, {Count: 48, ODMM: 11}, {Count: 72, ODMM: 11.5},
		{Count: 96, ODMM: 13}, {Count: 144, ODMM: 15}, {Count: 288, ODMM: 20}}
	// The tester's book (os2 osp-loose-tube, USD/m): 1.40, 2.30, 4.20, 5.90, 7.60, 11.00, 21.00.
	book := []int64{140, 230, 420, 590, 760, 1100, 2100}
	// A book where 144 costs more than 288 (a supplier's odd list): 300 strands then buy
	// 288 + 12 still, but 150 strands buy one 288, since one cable is the fewest.
	odd := []int64{140, 230, 420, 590, 760, 2500, 2100}
	// A book where 12 is not sold (a check engine's missing price): 300 strands buy 288 + 24.
	no12 := []int64{-1, 230, 420, 590, 760, 1100, 2100}
	for _, tc := range []struct {
		name      string
		cents     []int64
		strands   int
		want      string
		wantCents int64
		wantODs   int // cables
	}{
		{"tester 11's 300 strands", book, 300, "288 + 12", 2240, 2}, // 21.00 + 1.40 USD/m, not 2 × 21.00
		{"one cable", book, 30, "48", 420, 1},
		{"exactly the largest", book, 288, "288", 2100, 1},
		{"two largest", book, 576, "2 × 288", 4200, 2},
		{"three cables", book, 600, "288 + 288 + 24", 4430, 3},
		{"remainder of 150", book, 438, "2 × 288", 4200, 2}, // 288 + 144 = 432 < 438
		{"dear 144, 150 strands", odd, 150, "288", 2100, 1},
		{"dear 144, 432 strands", odd, 432, "2 × 288", 4200, 2}, // 288 + 144 would cost 46.00
		{"no 12", no12, 300, "288 + 24", 2330, 2},
		{"below one", book, 0, "12", 140, 1},
		{"one size priced", []int64{-1, -1, -1, -1, -1, -1, 2100}, 300, "2 × 288", 4200, 2},
		{"none priced", []int64{-1, -1, -1, -1, -1, -1, -1}, 300, "288 + 12", -1, 2}, // the smallest rest; -1: no price (routing excludes it)
	} {
		got, cents := cover(sizes, tc.cents, tc.strands)
		if got.Text() != tc.want {
			t.Errorf("%s: got %s, want %s", tc.name, got.Text(), tc.want)
			continue
		}
		if tc.wantODs == 0 {
			continue
		}
		if cents != tc.wantCents || len(got.ODsMM()) != tc.wantODs || got.Strands() < tc.strands {
			t.Errorf("%s: got %d cents, %d cables, %d strands; want %d cents, %d cables, at least %d strands",
				tc.name, cents, len(got.ODsMM()), got.Strands(), tc.wantCents, tc.wantODs, tc.strands)
		}
	}
}

// TestCablesCopper: a copper construction lists one size, the 4-pair cable (count 1,
// ANSI/TIA-568.2: one cable per port); a link of 9 port pairs buys 9 of it at 9 × its price.
func TestCablesCopper(t *testing.T) {
	t.Parallel()
	eng, err := NewEngine(nil, nil, nil, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	m := eng.Catalog().Medium("cat6a")
	k := m.Construction("outdoor")
	perM, _ := eng.PriceBook().Price(PriceKey{Item: PriceCable, Medium: "cat6a", Construction: "outdoor", Count: 1})
	for _, n := range []int{1, 9} {
		c, cents := eng.Cables(m, k, n)
		if len(c) != n || c.Strands() != n || cents != int64(n)*perM {
			t.Errorf("%d cables: got %s at %d cents, want %d at %d", n, c.Text(), cents, n, int64(n)*perM)
		}
	}
}

// TestCablesLots: the bill buys each size of a set on its own line, largest first, and the
// trays of each cable's enclosure add up (PriceBook.TraysFor, one tray per splice_tray strands).
func TestCablesLots(t *testing.T) {
	t.Parallel()
	c := Cables{{Count: 288, ODMM: 20}, {Count: 12, ODMM: 10.5}}
	lots := c.Lots()
	if len(lots) != 2 || lots[0].Size.Count != 288 || lots[0].Cables != 1 || lots[1].Size.Count != 12 || lots[1].Cables != 1 {
		t.Errorf("lots of 288 + 12: got %+v", lots)
	}
	if !c.Mixed() || (Cables{{Count: 288}, {Count: 288}}).Mixed() {
		t.Error("mixed: 288 + 12 is, 2 × 288 is not")
	}
	p := &PriceBook{SpliceTrayStrands: 24}
	// 288/24 = 12 trays and 12/24 → 1 tray: 13 (computed)
	if got := c.Trays(p); got != 13 {
		t.Errorf("trays of 288 + 12 at 24 a tray: got %d, want 13", got)
	}
}
