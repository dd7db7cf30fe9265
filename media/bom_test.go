package media

import (
	"errors"
	"math/rand/v2"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// todayBook is the demo price book without bid_items and taxed_categories (the sections at its
// end), as price books were before them.
func todayBook(t *testing.T) *PriceBook {
	t.Helper()
	text, _, ok := strings.Cut(string(pricesYAML), "\n# Items a bid carries")
	if !ok {
		t.Fatal("the demo book has no bid items section")
	}
	p, err := ParsePriceBook("today.yaml", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// TestBillWorked is a bill priced by hand from a book without bid items: the same lines and
// totals as before bid items and taxed categories existed.
func TestBillWorked(t *testing.T) {
	t.Parallel()
	p := todayBook(t)
	qs := []Quantity{
		{Category: CategoryMaterial, Item: "cable os2 osp-loose-tube 12", Unit: UnitM, Amount: 600.02,
			Price: PriceKey{Item: PriceCable, Medium: "os2", Construction: "osp-loose-tube", Count: 12}},
		{Category: CategoryOptics, Item: "transceiver 10GBASE-LR", Unit: UnitEach, Amount: 2, Price: PriceKey{Item: PriceTransceiver, Name: "10GBASE-LR"}},
		{Category: CategoryMaterial, Item: "fibre enclosure 24 ports", Unit: UnitEach, Amount: 2, Price: PriceKey{Item: PriceEnclosure, Count: 24}},
		{Category: CategoryLabour, Item: "pull cable in duct", Unit: UnitM, Amount: 125, Price: PriceKey{Item: PriceLabourHour},
			Rate: PriceKey{Item: RatePull, Name: "duct"}},
		{Category: CategoryConstruction, Item: "trench in turf", Unit: UnitM, Amount: 10.26, Price: PriceKey{Item: PriceTrench, Name: "turf"}},
		// Merged with the first line: same category, item, unit and price.
		{Category: CategoryMaterial, Item: "cable os2 osp-loose-tube 12", Unit: UnitM, Amount: 400.02,
			Price: PriceKey{Item: PriceCable, Medium: "os2", Construction: "osp-loose-tube", Count: 12}},
		// Nothing to bill: dropped.
		{Category: CategoryMaterial, Item: "splice tray", Unit: UnitEach, Amount: 0, Price: PriceKey{Item: PriceSpliceTray}},
	}
	b, err := p.Bill(qs)
	if err != nil {
		t.Fatal(err)
	}
	// Hand computation (computed) with the demo book's invented prices: 1000.0 m × 1.43 =
	// 1430.00; 2 × 310.00 = 620.00; 125 m at 60 m/h = 2.0833 h, billed 2.09 h × 92.00 = 192.28;
	// 10.3 m × 48.00 = 494.40; 2 × 45.00 = 90.00.
	want := []struct {
		item, unit     string
		qty            float64
		unitCents, ext int64
	}{
		{"cable os2 osp-loose-tube 12", UnitM, 1000.0, 143, 143000},
		{"fibre enclosure 24 ports", UnitEach, 2, 31000, 62000},
		{"pull cable in duct", UnitHour, 2.09, 9200, 19228},
		{"trench in turf", UnitM, 10.3, 4800, 49440},
		{"transceiver 10GBASE-LR", UnitEach, 2, 4500, 9000},
	}
	if len(b.Lines) != len(want) {
		t.Fatalf("lines: got %d %+v, want %d", len(b.Lines), b.Lines, len(want))
	}
	for i, w := range want {
		l := b.Lines[i]
		if l.Item != w.item || l.Unit != w.unit || l.Quantity != w.qty || l.UnitCents != w.unitCents || l.ExtendedCents != w.ext {
			t.Errorf("line %d: got %q %s %v × %d = %d, want %q %s %v × %d = %d", i, l.Item, l.Unit, l.Quantity, l.UnitCents, l.ExtendedCents,
				w.item, w.unit, w.qty, w.unitCents, w.ext)
		}
	}
	// Markups of the demo book: contingency 10 %, overhead 12 % of 2826.68; tax 7.25 % of
	// 2826.68 + 282.67 + 339.20 = 3448.55, i.e. 250.02 (computed, half away from zero).
	checks := []struct {
		name      string
		got, want int64
	}{
		{"material", b.CategoryCents(CategoryMaterial), 205000},
		{"labour", b.CategoryCents(CategoryLabour), 19228},
		{"construction", b.CategoryCents(CategoryConstruction), 49440},
		{"optics", b.CategoryCents(CategoryOptics), 9000},
		{"subtotal", b.SubtotalCents, 282668},
		{"contingency", b.ContingencyCents, 28267},
		{"overhead", b.OverheadCents, 33920},
		{"tax", b.TaxCents, 25002},
		{"total", b.TotalCents, 369857},
	}
	for _, c := range checks {
		if c.got != c.want {
			t.Errorf("%s: got %d cents, want %d", c.name, c.got, c.want)
		}
	}
	if got := b.Lines[2].Describe(nil); got != "pull cable in duct: 125.0 m at 60.0 m per hour" {
		t.Errorf("labour described: got %q", got)
	}
	// 1 ft = 0.3048 m exactly (NIST SP 811, B.8).
	ft := func(m float64) string { return strconv.FormatFloat(m/0.3048, 'f', 1, 64) + " ft" }
	if got := b.Lines[2].Describe(ft); got != "pull cable in duct: 410.1 ft at 196.9 ft per hour" {
		t.Errorf("labour described in feet: got %q", got)
	}
	if got := b.Lines[0].Describe(ft); got != "cable os2 osp-loose-tube 12" {
		t.Errorf("material described: got %q", got)
	}
	if top := b.Largest(2); len(top) != 2 || top[0].ExtendedCents != 143000 || top[1].ExtendedCents != 62000 {
		t.Errorf("largest two: got %+v", top)
	}
	if b.Currency != "USD" || !strings.Contains(b.Label, "invented") {
		t.Errorf("label and currency: got %q %q", b.Label, b.Currency)
	}
}

// TestBillTotalsAddUp is the property that every total is the sum of its parts, on random
// bills of materials.
func TestBillTotalsAddUp(t *testing.T) {
	t.Parallel()
	p := DefaultPriceBook()
	var priced []PriceKey
	for _, k := range p.Keys() {
		if !isRate(k.Item) {
			priced = append(priced, k)
		}
	}
	rates := []PriceKey{{Item: RatePull, Name: "duct"}, {Item: RateSplice}, {Item: RateTermination}, {Item: RateLossTest}}
	rng := rand.New(rand.NewPCG(5, 17))
	for trial := 0; trial < 300; trial++ {
		var qs []Quantity
		for n := rng.IntN(40); n > 0; n-- {
			q := Quantity{Category: Categories()[rng.IntN(4)], Item: "item " + string(rune('a'+rng.IntN(8))),
				Unit: []string{UnitM, UnitEach}[rng.IntN(2)], Amount: rng.Float64() * 5000, Price: priced[rng.IntN(len(priced))]}
			if q.Category == CategoryLabour {
				q.Price, q.Rate = PriceKey{Item: PriceLabourHour}, rates[rng.IntN(len(rates))]
			}
			qs = append(qs, q)
		}
		b, err := p.Bill(qs)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		var sum int64
		for _, s := range b.Subtotal {
			var lines int64
			for _, l := range b.Lines {
				if l.Category == s.Category {
					lines += l.ExtendedCents
				}
			}
			if lines != s.Cents {
				t.Fatalf("trial %d: %s subtotal %d, lines sum to %d", trial, s.Category, s.Cents, lines)
			}
			sum += s.Cents
		}
		for _, l := range b.Lines {
			if want := ExtendCents(int64(l.Quantity*100+0.5), l.UnitCents); l.ExtendedCents != want {
				t.Fatalf("trial %d: %q: extended %d, want %d", trial, l.Item, l.ExtendedCents, want)
			}
		}
		if sum != b.SubtotalCents {
			t.Fatalf("trial %d: subtotal %d, categories sum to %d", trial, b.SubtotalCents, sum)
		}
		// The tax base: the subtotals of the book's taxed categories, and a markup when taxed.
		var taxBase int64
		for _, s := range b.Subtotal {
			if slices.Contains(p.Taxed, s.Category) {
				taxBase += s.Cents
			}
		}
		if slices.Contains(p.Taxed, MarkupContingency) {
			taxBase += b.ContingencyCents
		}
		if slices.Contains(p.Taxed, MarkupOverhead) {
			taxBase += b.OverheadCents
		}
		if b.ContingencyCents != ApplyBP(sum, p.ContingencyBP) || b.OverheadCents != ApplyBP(sum, p.OverheadBP) ||
			b.TaxBaseCents != taxBase || b.TaxCents != ApplyBP(taxBase, p.TaxBP) {
			t.Fatalf("trial %d: markups %d %d %d on %d", trial, b.ContingencyCents, b.OverheadCents, b.TaxCents, sum)
		}
		if b.TotalCents != sum+b.ContingencyCents+b.OverheadCents+b.TaxCents {
			t.Fatalf("trial %d: total %d is not the sum", trial, b.TotalCents)
		}
	}
}

func TestBillErrors(t *testing.T) {
	t.Parallel()
	book, err := ParsePriceBook("mini.yaml", []byte("label: test, invented\ncurrency: EUR\nprices_date: 2026-01-01\n"+
		"trench_per_m: {turf: 40}\nlabour: {hourly_rate: 80}\n"))
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name string
		qs   []Quantity
		want []string
	}{
		{"missing prices named by key", []Quantity{
			{Category: CategoryConstruction, Item: "trench", Unit: UnitM, Amount: 3, Price: PriceKey{Item: PriceTrench, Name: "asphalt"}},
			{Category: CategoryMaterial, Item: "tray", Unit: UnitEach, Amount: 3, Price: PriceKey{Item: PriceSpliceTray}},
			{Category: CategoryLabour, Item: "pull", Unit: UnitM, Amount: 3, Price: PriceKey{Item: PriceLabourHour}, Rate: PriceKey{Item: RatePull, Name: "duct"}},
		}, []string{`price "trench asphalt": missing; add trench_per_m.asphalt`, "add splice_tray.each", "add labour.pull_m_per_hour.duct"}},
		{"bad quantities", []Quantity{
			{Category: "snacks", Item: "x", Unit: UnitM, Amount: 1, Price: PriceKey{Item: PriceTrench, Name: "turf"}},
			{Category: CategoryMaterial, Item: "y", Unit: "furlong", Amount: 1, Price: PriceKey{Item: PriceTrench, Name: "turf"}},
			{Category: CategoryMaterial, Item: "z", Unit: UnitM, Amount: -1, Price: PriceKey{Item: PriceTrench, Name: "turf"}},
		}, []string{`quantity 0 (snacks "x")`, `quantity 1 (material "y")`, `quantity 2 (material "z")`}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := book.Bill(tc.qs)
			if err == nil {
				t.Fatalf("%s: no error", tc.name)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("%s: error %q lacks %q", tc.name, err, w)
				}
			}
		})
	}
	// A book that prices patch cords for one medium lacks the others': a missing price, not
	// one left out on purpose (PriceBook.NotPriced asks for the whole section absent).
	cords, err := ParsePriceBook("cords.yaml", []byte("label: test, invented\ncurrency: EUR\nprices_date: 2026-01-01\npatch_cords_each: {os2: 15}\n"))
	if err != nil {
		t.Fatal(err)
	}
	_, err = cords.Bill([]Quantity{{Category: CategoryMaterial, Item: "cord", Unit: UnitEach, Amount: 1, Price: PriceKey{Item: PricePatchCord, Medium: "om4"}}})
	if !errors.Is(err, ErrMissingPrice) || !strings.Contains(err.Error(), "add patch_cords_each.om4") {
		t.Errorf("missing price: got %v, want ErrMissingPrice naming patch_cords_each.om4", err)
	}
	if book.Has(PricePatchCord) || !book.Has(PriceTrench) || !DefaultPriceBook().Has(PricePatchCord) {
		t.Errorf("Has: wrong answer for patch cords or trench")
	}
}

// TestBillNotPriced: a price a book may leave out whole (building entrances, firestop of an
// entrance there already, patch cords) and leaves out is no error: the bill keeps the quantity
// the plan needs on a line with no price, the subtotals and total leave it out, and one warning
// per price left out names the book, the key to add and every line it leaves unpriced. A bid
// lists what it does not price as exclusions with their quantities (common practice, no
// published source).
func TestBillNotPriced(t *testing.T) {
	t.Parallel()
	book, err := ParsePriceBook("bare.yaml", []byte("label: test, invented\ncurrency: EUR\nprices_date: 2026-01-01\n"+
		"trench_per_m: {turf: 40}\n"))
	if err != nil {
		t.Fatal(err)
	}
	qs := []Quantity{
		{Category: CategoryConstruction, Item: "trench", Unit: UnitM, Amount: 12.5, Price: PriceKey{Item: PriceTrench, Name: "turf"}},
		{Category: CategoryConstruction, Item: "new entrance", Unit: UnitEach, Amount: 3, Price: PriceKey{Item: PriceEntrance}, From: []string{"building A"}},
		{Category: CategoryConstruction, Item: "duct entrance", Unit: UnitEach, Amount: 2, Price: PriceKey{Item: PriceEntrance}},
		{Category: CategoryConstruction, Item: "firestop", Unit: UnitEach, Amount: 4, Price: PriceKey{Item: PriceFirestop}},
		{Category: CategoryMaterial, Item: "cord os2", Unit: UnitEach, Amount: 6, Price: PriceKey{Item: PricePatchCord, Medium: "os2"}},
		{Category: CategoryMaterial, Item: "cord om4", Unit: UnitEach, Amount: 2, Price: PriceKey{Item: PricePatchCord, Medium: "om4"}},
	}
	for _, q := range qs[1:] {
		if !book.NotPriced(q.Price) {
			t.Errorf("%s: NotPriced false, want true", q.Item)
		}
		if DefaultPriceBook().NotPriced(q.Price) {
			t.Errorf("%s: the demo book prices it, NotPriced true", q.Item)
		}
	}
	if book.NotPriced(PriceKey{Item: PriceTrench, Name: "asphalt"}) {
		t.Errorf("trench asphalt: a required price is never NotPriced")
	}
	b, err := book.Bill(qs)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]float64{"trench": 12.5, "new entrance": 3, "duct entrance": 2, "firestop": 4, "cord os2": 6, "cord om4": 2}
	for _, l := range b.Lines {
		if l.Quantity != want[l.Item] {
			t.Errorf("%s: quantity %g, want %g", l.Item, l.Quantity, want[l.Item])
		}
		if got := l.Item != "trench"; l.NotPriced != got || (got && (l.UnitCents != 0 || l.ExtendedCents != 0)) {
			t.Errorf("%s: not priced %v at %d, extended %d", l.Item, l.NotPriced, l.UnitCents, l.ExtendedCents)
		}
		delete(want, l.Item)
	}
	if len(want) != 0 {
		t.Errorf("lines missing: %v", want)
	}
	if b.SubtotalCents != 50000 || b.TotalCents != 50000 {
		t.Errorf("subtotal %d, total %d; want 50000 each (the trench alone)", b.SubtotalCents, b.TotalCents)
	}
	got := b.NotPriced(book.File)
	wantW := []string{ // in bill order: material, then construction
		`bare.yaml: patch_cords_each: not in the price book, so not priced: the plan needs "cord om4" 2 each and "cord os2" 6 each; the bill lists them with no price and the total leaves them out`,
		`bare.yaml: building_entrance_each: not in the price book, so not priced: the plan needs "duct entrance" 2 each and "new entrance" 3 each; the bill lists them with no price and the total leaves them out`,
		`bare.yaml: entrance_firestop_each: not in the price book, so not priced: the plan needs "firestop" 4 each; the bill lists them with no price and the total leaves them out`,
	}
	if !slices.Equal(got, wantW) {
		t.Errorf("warnings:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(wantW, "\n"))
	}
	if err := book.Check([]PriceKey{{Item: PriceEntrance}, {Item: PricePatchCord, Medium: "os2"}}); err != nil {
		t.Errorf("Check asks for prices left out on purpose: %v", err)
	}
	// Crew tasks: a book without crew_each prices labour by the hour alone (no crew task is
	// asked of it); one with crew_each leaves out the tasks it does not list.
	crews, err := ParsePriceBook("crews.yaml", []byte("label: test, invented\ncurrency: EUR\nprices_date: 2026-01-01\ncrew_each: {pull_setup: 100}\n"))
	if err != nil {
		t.Fatal(err)
	}
	setup, prep := PriceKey{Item: PriceCrew, Name: CrewPullSetup}, PriceKey{Item: PriceCrew, Name: CrewCableEndPrep}
	if book.NotPriced(prep) || crews.NotPriced(setup) || !crews.NotPriced(prep) {
		t.Errorf("crew tasks: NotPriced %v without crew_each, %v for a task priced, %v for one left out; want false, false, true",
			book.NotPriced(prep), crews.NotPriced(setup), crews.NotPriced(prep))
	}
	cb, err := crews.Bill([]Quantity{{Category: CategoryLabour, Item: "cable end preparation", Unit: UnitEach, Amount: 8, Price: prep}})
	if err != nil || len(cb.Lines) != 1 || !cb.Lines[0].NotPriced || cb.Lines[0].Quantity != 8 ||
		!slices.Equal(cb.NotPriced("crews.yaml"), []string{`crews.yaml: crew_each.cable_end_prep: not in the price book, so not priced: the plan needs "cable end preparation" 8 each; the bill lists them with no price and the total leaves them out`}) {
		t.Errorf("crew task left out: %v, %+v", err, cb)
	}
}

// TestBillFrom: a line's sources are the distinct sources of its quantities, sorted; a
// quantity of nothing is not a source; sources change neither the lines nor the totals
// (the project's own rule for traceable bills).
func TestBillFrom(t *testing.T) {
	t.Parallel()
	p := DefaultPriceBook()
	cable := func(m float64, from ...string) Quantity {
		return Quantity{Category: CategoryMaterial, Item: "cable", Unit: UnitM, Amount: m,
			Price: PriceKey{Item: PriceCable, Medium: "os2", Construction: "osp-loose-tube", Count: 12}, From: from}
	}
	tray := func(n float64, from ...string) Quantity {
		return Quantity{Category: CategoryMaterial, Item: "splice tray", Unit: UnitEach, Amount: n, Price: PriceKey{Item: PriceSpliceTray}, From: from}
	}
	qs := []Quantity{cable(100, "leg B-C/primary"), tray(2, "building B"), cable(50, "leg A-B/primary"),
		cable(0, "leg Z-Z/primary"), cable(25, "leg B-C/primary"), tray(1, "building A", "building B"), tray(0, "building Z")}
	b, err := p.Bill(qs)
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]string{"cable": "leg A-B/primary,leg B-C/primary", "splice tray": "building A,building B"}
	for _, l := range b.Lines {
		if l.PercentBP > 0 {
			// A bid item priced as a percentage comes from the categories it is of.
			if got := strings.Join(l.From, ","); got != "categories "+strings.Join(l.PercentOf, ", ") {
				t.Errorf("%s: from %q", l.Item, got)
			}
			continue
		}
		if got := strings.Join(l.From, ","); got != want[l.Item] {
			t.Errorf("%s: from %q, want %q", l.Item, got, want[l.Item])
		}
	}
	bare := make([]Quantity, len(qs))
	for i, q := range qs {
		q.From = nil
		bare[i] = q
	}
	nb, err := p.Bill(bare)
	if err != nil {
		t.Fatal(err)
	}
	if len(nb.Lines) != len(b.Lines) || nb.TotalCents != b.TotalCents {
		t.Fatalf("with sources %d lines, total %d; without %d lines, total %d", len(b.Lines), b.TotalCents, len(nb.Lines), nb.TotalCents)
	}
	for i := range b.Lines {
		if b.Lines[i].Item != nb.Lines[i].Item || b.Lines[i].ExtendedCents != nb.Lines[i].ExtendedCents {
			t.Errorf("line %d: %+v, without sources %+v", i, b.Lines[i], nb.Lines[i])
		}
	}
}

// TestDescribeRateMultipliesOut (tester 13's finding I): a labour line's text multiplies out
// in every unit: the work as written over the rate as written gives the line's hours, rounded
// up to 0.01 h as Bill rounds them. 12,870.87 m (12,870.9 as written) at 60 m per hour is 214.52 h; in feet (1 ft =
// 0.3048 m exactly, the international foot of 1959) the work is 42,227.3 ft and the rate
// 196.850… ft per hour, which written 196.9 would give 214.46 h, written 196.85 gives
// 214.5157…, 214.52 h.
func TestDescribeRateMultipliesOut(t *testing.T) {
	t.Parallel()
	line := BOMLine{Item: "pull cable in duct", Unit: UnitHour, Quantity: 214.52, Work: 12870.87, WorkUnit: UnitM, RatePerHour: 60}
	feet := func(m float64) string { return strconv.FormatFloat(m/0.3048, 'f', 1, 64) + " ft" }
	grouped := func(m float64) string { // a writer with thousands separators, as the report's
		s := strconv.FormatFloat(m/0.3048, 'f', 1, 64)
		if i := strings.Index(s, "."); i > 3 {
			s = s[:i-3] + "," + s[i-3:]
		}
		return s + " ft"
	}
	for _, tc := range []struct {
		name   string
		length func(m float64) string
		want   string
	}{
		{"metres", nil, "pull cable in duct: 12870.9 m at 60.0 m per hour"},
		{"feet", feet, "pull cable in duct: 42227.3 ft at 196.85 ft per hour"},
		{"feet grouped", grouped, "pull cable in duct: 42,227.3 ft at 196.85 ft per hour"},
	} {
		if got := line.Describe(tc.length); got != tc.want {
			t.Errorf("%s: %q, want %q", tc.name, got, tc.want)
		}
	}
	// A book's rate with more digits than the writer's one decimal: 1000 m at 33.33 m per hour
	// is 30.003 h, 30.01 h rounded up; written 33.3 it would be 30.04 h.
	odd := BOMLine{Item: "pull cable in tray", Unit: UnitHour, Quantity: 30.01, Work: 1000, WorkUnit: UnitM, RatePerHour: 33.33}
	if got, want := odd.Describe(nil), "pull cable in tray: 1000.0 m at 33.33 m per hour"; got != want {
		t.Errorf("%q, want %q", got, want)
	}
}
