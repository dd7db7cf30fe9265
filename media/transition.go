package media

import "fmt"

// TransitionEnds lists what n ends of an entrance transition put on the bill besides their
// cables, where the outside cables are spliced to insideCables inside cables at a building's
// entrance: at each end, one enclosure per outside cable (transition_splice_each) with trays
// for every strand it holds (splice_tray, Cables.Trays), every strand spliced (splices per
// hour), each inside cable's two ends prepared, one at the entrance and one in the telecom
// room (crew_each.cable_end_prep), each enclosure installed (crew_each.enclosure_install), and
// the bid items priced per cable end for those ends (bid_items, per_cable_end). The one list
// of a transition's items: the rule engine's cost of a laying (layingPrice), the optimizer's
// option (routing's addOption) and the bill (estimate's legItems, which counts the bid items
// on the plan's totals instead, CableTakeoff.CableEnds) all read it.
//
// Every strand bought is spliced, spare ones included, each outside cable in trays of its own
// enclosure; the crew tasks are counted per cable end and per enclosure whatever the strand
// count: common practice, no published source.
func TransitionEnds(p *PriceBook, outside Cables, insideCables, n int) []Quantity {
	if n <= 0 || len(outside) == 0 {
		return nil
	}
	ends := float64(n)
	cableEnds := 2 * insideCables * n
	qs := make([]Quantity, 0, 5+len(p.BidItems)) // one allocation: the engine prices this for every candidate
	qs = append(qs,
		Quantity{Category: CategoryMaterial, Item: "entrance transition enclosure", Unit: UnitEach, Amount: ends * float64(len(outside)), Price: PriceKey{Item: PriceTransition}},
		Quantity{Category: CategoryMaterial, Item: fmt.Sprintf("splice tray, %d splices", p.TraySplices()), Unit: UnitEach, Amount: ends * float64(outside.Trays(p)), Price: PriceKey{Item: PriceSpliceTray}},
		Quantity{Category: CategoryLabour, Item: "splice fibre, entrance transitions", Unit: UnitEach, Amount: ends * float64(outside.Strands()),
			Price: PriceKey{Item: PriceLabourHour}, Rate: PriceKey{Item: RateSplice}})
	if q, ok := crew(p, CrewCableEndPrep, float64(cableEnds)); ok {
		qs = append(qs, q)
	}
	if q, ok := crew(p, CrewEnclosureInstall, ends*float64(len(outside))); ok {
		qs = append(qs, q)
	}
	// The bid items per cable end, as PriceBook.BidQuantities lists them.
	for _, it := range p.BidItems {
		if it.Basis == BasisCableEnd && cableEnds != 0 {
			qs = append(qs, Quantity{Category: CategoryBidItems, Item: it.Description, Unit: UnitEach, Amount: float64(cableEnds),
				Price: PriceKey{Item: PriceBidItem, Name: it.ID}})
		}
	}
	return qs
}

// Crew is amount of a crew task (CrewTasks) when the book prices crews (crew_each), else
// nothing: a book without crew_each prices labour by the hour alone. A book with crew_each that
// leaves this task out gets it all the same, not priced (PriceBook.NotPriced).
func Crew(p *PriceBook, task string, amount float64) []Quantity {
	if q, ok := crew(p, task, amount); ok {
		return []Quantity{q}
	}
	return nil
}

// crew is Crew's one quantity, and whether there is one.
func crew(p *PriceBook, task string, amount float64) (Quantity, bool) {
	if !p.Has(PriceCrew) || amount == 0 {
		return Quantity{}, false
	}
	return Quantity{Category: CategoryLabour, Item: crewItems[task], Unit: UnitEach, Amount: amount, Price: PriceKey{Item: PriceCrew, Name: task}}, true
}

var crewItems = map[string]string{
	CrewPullSetup:        "crew set-up, per pull",
	CrewStructureEntry:   "crew entry into a structure, per cable",
	CrewCableEndPrep:     "cable end preparation",
	CrewEnclosureInstall: "enclosure or panel installation",
}
