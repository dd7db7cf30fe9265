package media

import (
	"fmt"
	"maps"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"spanwright/geo/input"
)

// Bill-of-materials categories, the values of Quantity.Category, in the order a BOM lists
// them: material (cable, connectivity and its hardware), labour (installation hours),
// construction (trench, restoration, duct and structures, labour included) and optics
// (transceivers).
const (
	CategoryMaterial     = "material"
	CategoryLabour       = "labour"
	CategoryConstruction = "construction"
	CategoryOptics       = "optics"
)

// Categories returns the BOM categories in listing order.
func Categories() []string {
	return []string{CategoryMaterial, CategoryLabour, CategoryConstruction, CategoryOptics}
}

// Units of bill-of-materials quantities.
const (
	UnitM    = "m"    // metres, billed to 0.1 m
	UnitEach = "each" // a whole count
	UnitHour = "h"    // labour hours, billed up to 0.01 h
)

// Quantity is one thing a plan needs, before pricing.
type Quantity struct {
	Category string // a Category* constant
	// Item says what it is in words. Quantities with the same category, item, unit, price and
	// rate are summed into one line.
	Item   string
	Unit   string   // UnitM or UnitEach: the unit of Amount
	Amount float64  // in Unit, finite and >= 0
	Price  PriceKey // the price per Unit, or per hour when Rate is set
	// Rate, when set, makes the quantity labour: Amount units of work done at the book's
	// productivity Rate per hour (a Rate* key, e.g. metres pulled per hour in a duct). The
	// line is then billed in hours, Amount / rate rounded up to 0.01 h, at Price (normally
	// PriceLabourHour).
	Rate PriceKey
	// From names what the quantity comes from, so that an estimator can trace a bill line back
	// to it: e.g. "leg L-1/primary", "building ENG", "span S-4", "junction J-2". Bill lists
	// every line's sources; it does not take part in merging quantities into lines.
	From []string
}

// BOMLine is one priced line of a bill of materials.
type BOMLine struct {
	Category string
	Item     string // the quantity's item, e.g. "pull cable in duct"
	Unit     string // UnitM, UnitEach or UnitHour
	Price    PriceKey
	// Labour only: the work billed, in WorkUnit (the quantity's unit), and the book's rate
	// in WorkUnit per hour (its key Rate); see Describe.
	Rate        PriceKey
	Work        float64
	WorkUnit    string
	RatePerHour float64
	// Quantity is what is billed, in Unit: metres rounded to 0.1 m, counts whole, hours
	// rounded up to 0.01 h.
	Quantity float64
	// Summed is the quantities' amounts added up, in their unit (for labour WorkUnit), before
	// Quantity rounds them: an output in other units converts this, then rounds, as it does
	// every other length, so that one figure is shown alike everywhere.
	Summed        float64
	UnitCents     int64 // the book's price per Unit
	ExtendedCents int64 // Quantity × UnitCents, rounded half up to a whole cent
	// A bid item priced as a percentage only: one unit whose price is PercentBP of the sum
	// of the lines of the categories PercentOf (a workbook writes it as that formula).
	PercentBP int64
	PercentOf []string
	// From is the distinct sources (Quantity.From) of the line's quantities, sorted.
	From []string
	// NotPriced marks a line of a price the book leaves out (PriceBook.NotPriced): its
	// quantity is what the plan needs, UnitCents and ExtendedCents are 0, and the total
	// leaves it out, as a bid's exclusions.
	NotPriced bool
}

// Subtotal is the sum of the extended prices of one category, in cents.
type Subtotal struct {
	Category string
	Cents    int64
}

// BOM is a priced bill of materials: its lines, a subtotal per category, the markups of the
// price book and the grand total. Money is integer cents of Currency. The totals always add
// up: each subtotal is the sum of its category's lines, SubtotalCents the sum of the
// subtotals, contingency and overhead are their basis points of SubtotalCents, tax its basis
// points of subtotal plus contingency plus overhead (each rounded half away from zero with
// ApplyBP), and TotalCents the sum of the four.
type BOM struct {
	Label    string // the price book's label, e.g. "demo prices, invented, not a quotation"
	Currency string
	Lines    []BOMLine  // by category in Categories order, then price key (as PriceBook.Keys), item and unit
	Subtotal []Subtotal // one per category in Categories order, empty categories included

	SubtotalCents    int64
	ContingencyBP    int64
	ContingencyCents int64
	OverheadBP       int64
	OverheadCents    int64
	TaxBP            int64
	// Taxed are the categories and markups tax applies to (PriceBook.Taxed), TaxBaseCents
	// their sum.
	Taxed        []string
	TaxBaseCents int64
	TaxCents     int64 // TaxBP of TaxBaseCents
	TotalCents   int64
	bidItems     bool // the book has bid items: Subtotal lists CategoryBidItems too
}

// CategoryCents returns the subtotal of category c, 0 for a category with no lines.
func (b *BOM) CategoryCents(c string) int64 {
	for _, s := range b.Subtotal {
		if s.Category == c {
			return s.Cents
		}
	}
	return 0
}

// Largest returns up to n lines with the highest extended prices, highest first; equal
// prices keep BOM order. Time O(L log L) for L lines.
func (b *BOM) Largest(n int) []BOMLine {
	lines := append([]BOMLine(nil), b.Lines...)
	sort.SliceStable(lines, func(i, j int) bool { return lines[i].ExtendedCents > lines[j].ExtendedCents })
	if n < len(lines) {
		lines = lines[:max(n, 0)]
	}
	return lines
}

var categoryRank = map[string]int{CategoryMaterial: 0, CategoryLabour: 1, CategoryConstruction: 2, CategoryOptics: 3, CategoryBidItems: 4}

type lineKey struct {
	category, item, unit string
	price, rate          PriceKey
}

// Bill prices quantities from the book into a BOM. It merges quantities that differ only in
// Amount and From (a line's From is its quantities' sources, distinct and sorted), drops those that come to nothing, and reports at once, as an *input.Problems, every
// price or labour rate the book lacks (each an *input.Problem with ErrMissingPrice naming the
// key and the path to add it at) and every malformed quantity (unknown category or unit,
// amount not finite and >= 0, ErrBadValue). Time O(Q log Q) for Q quantities.
func (p *PriceBook) Bill(qs []Quantity) (*BOM, error) {
	var errs input.Problems
	sums := map[lineKey]float64{}
	from := map[lineKey]map[string]bool{}
	var keys []lineKey
	var needs []PriceKey
	for i, q := range qs {
		_, okCat := categoryRank[q.Category]
		okUnit := q.Unit == UnitM || q.Unit == UnitEach
		if !okCat || !okUnit || !finite(q.Amount) || q.Amount < 0 {
			errs.Add(fmt.Errorf("media: bill of materials: quantity %d (%s %q): %w: want a known category and unit and an amount >= 0, got %q, %q, %g",
				i, q.Category, q.Item, ErrBadValue, q.Category, q.Unit, q.Amount))
			continue
		}
		k := lineKey{q.Category, q.Item, q.Unit, q.Price, q.Rate}
		if _, ok := sums[k]; !ok {
			keys = append(keys, k)
			needs = append(needs, q.Price)
			if q.Rate.Item != "" {
				needs = append(needs, q.Rate)
			}
		}
		sums[k] += q.Amount
		for _, f := range q.From {
			if q.Amount == 0 {
				break // a source that puts nothing on the line is not one of its sources
			}
			if from[k] == nil {
				from[k] = map[string]bool{}
			}
			from[k][f] = true
		}
	}
	if err := p.Check(needs); err != nil {
		errs.Add(err)
	}
	for _, k := range keys {
		if r, ok := p.Rate(k.rate); k.rate.Item != "" && ok && (!finite(r) || r <= 0) {
			errs.Add(fmt.Errorf("media: %s: rate %s: %w: want > 0, got %g", p.File, k.rate.Path(), ErrBadValue, r))
		}
	}
	if err := sorted(&errs); err != nil {
		return nil, err
	}
	b := &BOM{Label: p.Label, Currency: p.Currency,
		ContingencyBP: p.ContingencyBP, OverheadBP: p.OverheadBP, TaxBP: p.TaxBP, Taxed: p.Taxed, bidItems: len(p.BidItems) > 0}
	for _, k := range keys {
		amount := sums[k]
		unitCents, _ := p.Price(k.price)
		line := BOMLine{Category: k.category, Item: k.item, Unit: k.unit, Price: k.price, UnitCents: unitCents, Summed: amount,
			NotPriced: p.NotPriced(k.price)}
		var hundredths int64
		switch {
		case k.rate.Item != "":
			rate, _ := p.Rate(k.rate)
			hundredths = int64(math.Ceil(amount/rate*100 - 1e-6))
			line.Unit, line.Work, line.WorkUnit, line.RatePerHour, line.Rate = UnitHour, amount, k.unit, rate, k.rate
		case k.unit == UnitEach:
			hundredths = 100 * int64(math.Ceil(amount-1e-9))
		default:
			hundredths = int64(math.Round(amount*10)) * 10
		}
		if hundredths <= 0 {
			continue
		}
		line.Quantity = float64(hundredths) / 100
		line.ExtendedCents = ExtendCents(hundredths, unitCents)
		if len(from[k]) > 0 {
			line.From = slices.Sorted(maps.Keys(from[k]))
		}
		b.Lines = append(b.Lines, line)
	}
	sort.Slice(b.Lines, func(i, j int) bool {
		x, y := b.Lines[i], b.Lines[j]
		if x.Category != y.Category {
			return categoryRank[x.Category] < categoryRank[y.Category]
		}
		if x.Price != y.Price {
			return keyLess(x.Price, y.Price)
		}
		if x.Item != y.Item {
			return x.Item < y.Item
		}
		return x.Unit < y.Unit
	})
	b.percentItems(p.BidItems)
	b.total()
	return b, nil
}

// NotPricedText is what a line of a price the book leaves out says where the price would be:
// "not priced", and the key that prices it.
func (l BOMLine) NotPricedText() string {
	return "not priced (no " + l.Price.SectionPath() + " in the price book)"
}

// NotPriced lists, one sentence each, the prices the book leaves out (PriceBook.NotPriced)
// that the bill needs, in bill order, each with its lines' items and quantities: the
// warnings a bid's exclusions give. file names the price book. Empty when every line is priced.
func (b *BOM) NotPriced(file string) []string {
	lines := map[string][]string{}
	for _, l := range b.Lines {
		if l.NotPriced {
			k := l.Price.SectionPath()
			lines[k] = append(lines[k], fmt.Sprintf("%q %s %s", l.Item, strconv.FormatFloat(l.Quantity, 'f', -1, 64), l.Unit))
		}
	}
	keys := b.NotPricedKeys()
	out := make([]string, 0, len(keys))
	for _, k := range keys {
		out = append(out, fmt.Sprintf("%s: %s: not in the price book, so not priced: the plan needs %s; the bill lists them with no price and the total leaves them out",
			file, k, strings.Join(lines[k], " and ")))
	}
	return out
}

// NotPricedKeys lists the keys of the prices the book leaves out that the bill needs
// (PriceKey.SectionPath of its NotPriced lines), each once, in bill order.
func (b *BOM) NotPricedKeys() []string {
	var keys []string
	for _, l := range b.Lines {
		if k := l.Price.SectionPath(); l.NotPriced && !slices.Contains(keys, k) {
			keys = append(keys, k)
		}
	}
	return keys
}

// percentItems adds a line for each bid item priced as a percentage, after the other lines:
// one unit at its percentage of the subtotal of its categories (rounded with ApplyBP), the
// base's categories named in the item's words.
func (b *BOM) percentItems(items []BidItem) {
	for _, it := range items {
		if it.Basis != BasisPercentOf {
			continue
		}
		var base int64
		for _, l := range b.Lines {
			if contains(it.Of, l.Category) {
				base += l.ExtendedCents
			}
		}
		c := ApplyBP(base, it.PercentBP)
		if c == 0 {
			continue
		}
		b.Lines = append(b.Lines, BOMLine{Category: CategoryBidItems, Unit: UnitEach, Quantity: 1, UnitCents: c, ExtendedCents: c,
			Price: PriceKey{Item: PriceBidItem, Name: it.ID}, PercentBP: it.PercentBP, PercentOf: it.Of,
			From: []string{"categories " + strings.Join(it.Of, ", ")}, // what the percentage is of
			// The words name the base, not its amount: a workbook prices the line by a live
			// formula over those categories, which a figure in the text would contradict
			// once a price is changed there.
			Item: fmt.Sprintf("%s, %s %% of %s", it.Description, strconv.FormatFloat(float64(it.PercentBP)/100, 'f', -1, 64), strings.Join(it.Of, " + "))})
	}
}

// BidBases are the quantities a bid item may be priced per unit of (the per_* keys of
// bid_items), each counted once by the estimate.
type BidBases struct {
	NewBuriedM, AerialM, ExistingDuctM     float64
	Structures, Buildings, CableEnds, Legs int
}

// BidQuantities lists the bill quantities of the book's bid items priced as a lump sum (one
// each) or per unit of a basis in bases, in file order, in CategoryBidItems; the items
// priced as a percentage Bill adds itself.
func (p *PriceBook) BidQuantities(bases BidBases) []Quantity {
	var qs []Quantity
	for _, it := range p.BidItems {
		unit, amount := UnitEach, 0.0
		switch it.Basis {
		case BasisPercentOf:
			continue
		case BasisLumpSum:
			amount = 1
		case BasisNewBuriedM:
			unit, amount = UnitM, bases.NewBuriedM
		case BasisAerialM:
			unit, amount = UnitM, bases.AerialM
		case BasisExistingDuctM:
			unit, amount = UnitM, bases.ExistingDuctM
		case BasisStructure:
			amount = float64(bases.Structures)
		case BasisBuilding:
			amount = float64(bases.Buildings)
		case BasisCableEnd:
			amount = float64(bases.CableEnds)
		case BasisLeg:
			amount = float64(bases.Legs)
		}
		qs = append(qs, Quantity{Category: CategoryBidItems, Item: it.Description, Unit: unit, Amount: amount,
			Price: PriceKey{Item: PriceBidItem, Name: it.ID}})
	}
	return qs
}

// UnitCents is the price of one unit of q's Amount, in cents, and whether the book has the
// prices it needs: the price of q.Price, or for labour (q.Rate set) the hourly price over the
// productivity rate, e.g. cents per metre pulled. Bill prices a line of such quantities;
// the route optimizer prices the same quantities with it one route at a time.
func (p *PriceBook) UnitCents(q Quantity) (float64, bool) {
	c, ok := p.Price(q.Price)
	if !ok {
		return 0, false
	}
	if q.Rate.Item == "" {
		return float64(c), true
	}
	r, ok := p.Rate(q.Rate)
	if !ok || !finite(r) || r <= 0 {
		return 0, false
	}
	return float64(c) / r, true
}

// Cents is q alone priced, Amount × UnitCents rounded half away from zero to a cent; 0 when
// the book lacks a price it needs (Bill reports those). Summed over the quantities of one
// line it differs from the line's ExtendedCents only by the line's rounding: metres to
// 0.1 m (at most 0.05 m × the unit price) and hours up to 0.01 h (at most 0.01 h × the
// hourly price), each plus half a cent.
func (p *PriceBook) Cents(q Quantity) int64 {
	u, ok := p.UnitCents(q)
	if !ok {
		return 0
	}
	x := q.Amount * u
	if x < 0 {
		return -int64(-x + 0.5)
	}
	return int64(x + 0.5)
}

// ExtendCents is a quantity given in hundredths of its unit times a unit price in cents,
// rounded half up to a whole cent: the extended price of a BOM line. A spreadsheet gets the
// same with ROUND(quantity × unit price, 2).
func ExtendCents(quantityHundredths, unitCents int64) int64 {
	return ApplyBP(quantityHundredths*unitCents, 100)
}

// total fills the subtotals, markups and total from the lines.
func (b *BOM) total() {
	b.Subtotal = b.Subtotal[:0]
	cats := Categories()
	if b.bidItems {
		cats = append(cats, CategoryBidItems)
	}
	for _, c := range cats {
		s := Subtotal{Category: c}
		for _, l := range b.Lines {
			if l.Category == c {
				s.Cents += l.ExtendedCents
			}
		}
		b.Subtotal = append(b.Subtotal, s)
		b.SubtotalCents += s.Cents
	}
	b.ContingencyCents = ApplyBP(b.SubtotalCents, b.ContingencyBP)
	b.OverheadCents = ApplyBP(b.SubtotalCents, b.OverheadBP)
	if b.Taxed == nil { // a BOM built by hand: everything taxed, as a book that does not say
		b.Taxed = append(cats, MarkupContingency, MarkupOverhead)
	}
	b.TaxBaseCents = 0
	for _, s := range b.Subtotal {
		if contains(b.Taxed, s.Category) {
			b.TaxBaseCents += s.Cents
		}
	}
	if contains(b.Taxed, MarkupContingency) {
		b.TaxBaseCents += b.ContingencyCents
	}
	if contains(b.Taxed, MarkupOverhead) {
		b.TaxBaseCents += b.OverheadCents
	}
	b.TaxCents = ApplyBP(b.TaxBaseCents, b.TaxBP)
	b.TotalCents = b.SubtotalCents + b.ContingencyCents + b.OverheadCents + b.TaxCents
}

// Describe is the line's item in words; for labour it adds the work and the rate, e.g.
// "pull cable in duct: 1234.5 m at 60.0 m per hour", "terminate fibre strands: 96 at 8 per
// hour". length writes a number of metres with its unit, in the units and style of the
// output the text goes to (nil: one decimal and "m"); the rate gets the decimals it needs
// for the line to multiply out (rateShown).
func (l BOMLine) Describe(length func(m float64) string) string {
	if l.WorkUnit == "" {
		return l.Item
	}
	if length == nil {
		length = func(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) + " m" }
	}
	amount := func(x float64) string {
		if l.WorkUnit != UnitM {
			return strconv.FormatFloat(x, 'f', -1, 64)
		}
		return length(x)
	}
	work, rate := amount(l.Work), amount(l.RatePerHour)
	if l.WorkUnit == UnitM {
		rate = l.rateShown(work, rate, length)
	}
	return fmt.Sprintf("%s: %s at %s per hour", l.Item, work, rate)
}

// rateShown is the production rate of a labour line in metres as Describe writes it, given
// the work and the rate as length wrote them: as written when the work as written, over it,
// gives the line's hours (rounded up to 0.01 h, as Bill rounds them), else with as many more
// decimals as that takes, up to six, or, where the work's own rounding to 0.1 keeps the line
// from multiplying out whatever the rate, as many as make the rate's rounding move the
// hours by less than 0.0005 h (tester 13's finding I: "42227.3 ft at 196.9 ft per hour" is
// 214.46 h, and the line's 214.52 h came from 60 m per hour, 196.85 ft). The output's unit
// per metre and its name are read back from what length writes (shownNumber), so every
// writer, in whatever style, gets the digits.
func (l BOMLine) rateShown(work, rate string, length func(m float64) string) string {
	w, _, okW := shownNumber(work)
	r, unit, okR := shownNumber(rate)
	hours := func(r float64) float64 { return math.Ceil(w/r*100-1e-6) / 100 }
	if !okW || !okR || r <= 0 || l.Unit != UnitHour || hours(r) == l.Quantity {
		return rate
	}
	big, _, ok := shownNumber(length(1e6))
	if !ok || big <= 0 {
		return rate
	}
	exact := l.RatePerHour * big / 1e6 // in the writer's unit
	precise := ""
	for d := 2; d <= 6; d++ {
		p := math.Pow(10, float64(d))
		rd := math.Round(exact*p) / p
		text := strconv.FormatFloat(rd, 'f', d, 64) + " " + unit
		if hours(rd) == l.Quantity {
			return text
		}
		if precise == "" && math.Abs(w/rd-w/exact) < 0.0005 {
			precise = text
		}
	}
	if precise == "" {
		return rate
	}
	return precise
}

// shownNumber reads back a length as a writer wrote it, "42,227.3 ft": the number of its
// first word (thousands separators dropped) and the rest, its unit.
func shownNumber(text string) (float64, string, bool) {
	num, unit, _ := strings.Cut(text, " ")
	x, err := strconv.ParseFloat(strings.ReplaceAll(num, ",", ""), 64)
	return x, unit, err == nil
}

// PriceKeys is where the line's price comes from in the price book, as a bid estimator
// traces a line to its source: the key's path ("cable_per_m.os2.osp-loose-tube.24",
// "bid_items[id mobilisation]"), and for labour by the hour the hourly rate's and the
// production rate's, "labour.hourly_rate / labour.pull_m_per_hour.duct" (hours are the work
// over the production rate).
func (l BOMLine) PriceKeys() string {
	if l.Rate.Item != "" {
		return l.Price.Path() + " / " + l.Rate.Path()
	}
	return l.Price.Path()
}

// keyLess orders price keys by item, medium, construction, name and count, as Keys does.
func keyLess(a, b PriceKey) bool {
	if a.Item != b.Item {
		return a.Item < b.Item
	}
	if a.Medium != b.Medium {
		return a.Medium < b.Medium
	}
	if a.Construction != b.Construction {
		return a.Construction < b.Construction
	}
	if a.Name != b.Name {
		return a.Name < b.Name
	}
	return a.Count < b.Count
}
