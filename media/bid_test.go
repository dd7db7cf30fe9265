package media

import (
	"errors"
	"slices"
	"strings"
	"testing"
)

// bidBook is a small price book with one bid item of every basis; its amounts are invented.
const bidBook = `label: bid items test, invented
currency: USD
prices_date: 2026-01-01
trench_per_m: {turf: 50.00}
termination_each: {os2: 10.00}
markups_percent: {contingency: 10, overhead: 5, tax: 8}
bid_items:
  - {id: mob, description: mobilisation, lump_sum: 1000.00}
  - {id: tracer, description: tracer wire, per_m_new_buried: 2.00}
  - {id: aerial, description: lashing, per_m_aerial: 1.50}
  - {id: duct, description: duct proving, per_m_existing_duct_used: 0.75}
  - {id: mh, description: pumping, per_structure_passed: 40.00}
  - {id: bldg, description: grounding, per_building_served: 120.00}
  - {id: label, description: labels, per_cable_end: 3.00}
  - {id: test, description: test report, per_leg: 25.00}
  - {id: pm, description: project management, percent_of: {percent: 5, categories: [construction]}}
taxed_categories: [material, contingency]
`

// bidQuantities are the quantities of a small plan: 200 m of new trench in turf and 8 strand
// ends terminated.
var bidQuantities = []Quantity{
	{Category: CategoryConstruction, Item: "trench in turf", Unit: UnitM, Amount: 200, Price: PriceKey{Item: PriceTrench, Name: "turf"}},
	{Category: CategoryMaterial, Item: "termination os2", Unit: UnitEach, Amount: 8, Price: PriceKey{Item: PriceTermination, Medium: "os2"}},
}

// TestBidItemsBilled prices every kind of bid item and a tax on chosen categories, by hand.
func TestBidItemsBilled(t *testing.T) {
	t.Parallel()
	p, err := ParsePriceBook("bid.yaml", []byte(bidBook))
	if err != nil {
		t.Fatal(err)
	}
	bases := BidBases{NewBuriedM: 200, AerialM: 120.04, ExistingDuctM: 333.33, Structures: 3, Buildings: 2, CableEnds: 4, Legs: 2}
	b, err := p.Bill(append(slices.Clone(bidQuantities), p.BidQuantities(bases)...))
	if err != nil {
		t.Fatal(err)
	}
	// Computed by hand: each line is its quantity (metres to 0.1 m) × its rate, rounded half
	// up to a cent; bid items by price key (id), the percentage last: 5 % of the
	// construction subtotal 10000.00.
	want := []struct {
		category, item string
		qty            float64
		ext            int64
	}{
		{CategoryMaterial, "termination os2", 8, 8000},
		{CategoryConstruction, "trench in turf", 200, 1000000},
		{CategoryBidItems, "lashing", 120.0, 18000},      // 120.0 m × 1.50
		{CategoryBidItems, "grounding", 2, 24000},        // 2 × 120.00
		{CategoryBidItems, "duct proving", 333.3, 24998}, // 333.3 m × 0.75 = 249.975
		{CategoryBidItems, "labels", 4, 1200},            // 4 × 3.00
		{CategoryBidItems, "pumping", 3, 12000},          // 3 × 40.00
		{CategoryBidItems, "mobilisation", 1, 100000},    // lump sum
		{CategoryBidItems, "test report", 2, 5000},       // 2 × 25.00
		{CategoryBidItems, "tracer wire", 200, 40000},    // 200 m × 2.00
		{CategoryBidItems, "project management, 5 % of construction", 1, 50000},
	}
	if len(b.Lines) != len(want) {
		t.Fatalf("lines: got %d %+v, want %d", len(b.Lines), b.Lines, len(want))
	}
	for i, w := range want {
		l := b.Lines[i]
		if l.Category != w.category || l.Item != w.item || l.Quantity != w.qty || l.ExtendedCents != w.ext {
			t.Errorf("line %d: got %s %q %v = %d, want %s %q %v = %d", i, l.Category, l.Item, l.Quantity, l.ExtendedCents, w.category, w.item, w.qty, w.ext)
		}
	}
	// Subtotal 80.00 + 10000.00 + 2751.98 = 12831.98; contingency 10 % 1283.20, overhead 5 %
	// 641.60; tax 8 % of material 80.00 + contingency 1283.20 = 1363.20 is 109.06 (computed).
	checks := []struct {
		name      string
		got, want int64
	}{
		{"bid items", b.CategoryCents(CategoryBidItems), 275198},
		{"subtotal", b.SubtotalCents, 1283198},
		{"contingency", b.ContingencyCents, 128320},
		{"overhead", b.OverheadCents, 64160},
		{"tax base", b.TaxBaseCents, 136320},
		{"tax", b.TaxCents, 10906},
		{"total", b.TotalCents, 1486584},
		{"subtotal rows", int64(len(b.Subtotal)), 5},
	}
	for _, c := range checks {
		if c.got != c.want {
			t.Errorf("%s: got %d, want %d", c.name, c.got, c.want)
		}
	}
}

// TestNoBidItems: a book without bid_items and taxed_categories bills the same quantities
// with the four categories and tax on everything, as before either key existed.
func TestNoBidItems(t *testing.T) {
	t.Parallel()
	text, _, _ := strings.Cut(bidBook, "bid_items:")
	p, err := ParsePriceBook("today.yaml", []byte(text))
	if err != nil {
		t.Fatal(err)
	}
	if qs := p.BidQuantities(BidBases{NewBuriedM: 200, Legs: 2}); len(qs) != 0 {
		t.Errorf("bid quantities without bid items: %+v", qs)
	}
	b, err := p.Bill(bidQuantities)
	if err != nil {
		t.Fatal(err)
	}
	// Subtotal 10080.00; contingency 1008.00, overhead 504.00; tax 8 % of 11592.00 is 927.36
	// (computed).
	if len(b.Lines) != 2 || len(b.Subtotal) != len(Categories()) || b.SubtotalCents != 1008000 ||
		b.TaxBaseCents != 1159200 || b.TaxCents != 92736 || b.TotalCents != 1008000+100800+50400+92736 {
		t.Errorf("got %d lines, %d subtotals, subtotal %d, tax %d of %d, total %d", len(b.Lines), len(b.Subtotal),
			b.SubtotalCents, b.TaxCents, b.TaxBaseCents, b.TotalCents)
	}
}

func TestBidItemsBad(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name, old, new string
		sentinel       error
		want           string
	}{
		{"unknown key", "per_leg: 25.00", "per_legs: 25.00", ErrUnknownField, `bid.yaml:15:42: bid item "test": per_legs: unknown key`},
		{"two bases", "lump_sum: 1000.00}", "lump_sum: 1000.00, per_leg: 2.00}", ErrBadValue,
			`bid.yaml:8:61: bid item "mob": per_leg: want exactly one of lump_sum, per_m_new_buried, per_m_aerial, per_m_existing_duct_used, per_structure_passed, per_building_served, per_cable_end, per_leg, percent_of, got 2 (lump_sum, per_leg)`},
		{"no basis", ", lump_sum: 1000.00}", "}", ErrBadValue, `bid.yaml:8:6: bid item "mob": id: want one of lump_sum, per_m_new_buried, per_m_aerial, per_m_existing_duct_used, per_structure_passed, per_building_served, per_cable_end, per_leg, percent_of besides id and description, got none`},
		{"negative", "per_cable_end: 3.00", "per_cable_end: -3.00", ErrBadValue, `per_cable_end: want an amount >= 0`},
		{"unknown base", "categories: [construction]", "categories: [civil]", ErrBadValue,
			`bid.yaml:16:72: bid item "pm": percent_of.categories[0]: want one of material, labour, construction, optics, got "civil"`},
		{"no percent", "percent: 5, ", "", ErrMissingField, `bid.yaml:16:59: bid item "pm": percent: missing`},
		{"duplicate id", "id: mh,", "id: mob,", ErrDuplicateID, `bid.yaml:12:6: bid item "mob": id: "mob" is used by an earlier bid item`},
		{"no description", "description: labels, ", "", ErrMissingField, `bid.yaml:14:5: bid item "label": description: missing`},
		{"bad id", "id: test,", "id: Test Report,", ErrBadValue, `id: want lower-case letters, digits and hyphens, got "Test Report"`},
		{"taxed", "[material, contingency]", "[material, freight]", ErrBadValue,
			`bid.yaml:17:1: taxed_categories[1]: want one of material, labour, construction, optics, bid items, contingency, overhead, got "freight"`},
		{"taxed twice", "[material, contingency]", "[material, material]", ErrBadValue, `taxed_categories[1]: "material" is listed twice`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			data := strings.Replace(bidBook, tc.old, tc.new, 1)
			if data == bidBook {
				t.Fatalf("replacement did not apply")
			}
			_, err := ParsePriceBook("bid.yaml", []byte(data))
			if err == nil || !strings.Contains(err.Error(), tc.want) || !errors.Is(err, tc.sentinel) {
				t.Errorf("got %v, want %v containing %q", err, tc.sentinel, tc.want)
			}
		})
	}
	// All problems at once: two entries wrong, each reported.
	data := strings.Replace(strings.Replace(bidBook, "per_leg: 25.00", "per_leg: -1", 1), "[construction]", "[civil]", 1)
	_, err := ParsePriceBook("bid.yaml", []byte(data))
	if err == nil || !strings.Contains(err.Error(), "per_leg") || !strings.Contains(err.Error(), "civil") {
		t.Errorf("two problems: got %v", err)
	}
}
