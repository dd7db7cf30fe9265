package routing

import (
	"testing"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/items"
	"spanwright/route/plan"
)

// TestJoinsCentsSplicePointCrew: the price a placement of joins is compared on counts, at a
// splice point to build, the crew's pull set-up per cable (the next reel's pull starts there)
// as the bill does (CableTakeoff.SplicePointCrew; review 15 F4: it was left out, 95.00 + 40.00
// a cable in the demo book), beside splice_point_each: one join at a splice point off the
// spans costs exactly those more than the same join in a structure (slack alike). Common
// practice, no published source; the prices are the demo book's, invented.
func TestJoinsCentsSplicePointCrew(t *testing.T) {
	t.Parallel()
	m, _ := defaultModel(t)
	ch := media.Choice{Medium: "os2", Construction: "osp-loose-tube", Cables: media.Cables{{Count: 24}}}
	inHole := CableTakeoff{Joins: 1, Splices: []SplicePoint{{ID: "MH-1", SlackM: 27}}}
	atPoint := CableTakeoff{Joins: 1, Splices: []SplicePoint{{ID: "B1", NoStructure: true, SlackM: 27}}}
	net := &geo.Network{}
	point, _ := m.prices.Price(media.PriceKey{Item: media.PriceSplicePoint})
	want := point + m.cents(items.AtJunctions(m.prices, 1, 0)...)
	if m.cents(items.AtJunctions(m.prices, 1, 0)...) == 0 {
		t.Fatal("the demo book prices no pull set-up: the test would see nothing")
	}
	if got := m.joinsCents(atPoint, ch, net) - m.joinsCents(inHole, ch, net); got != want {
		t.Errorf("a splice point to build costs %s more than a join in a structure, want %s (its price and a pull set-up)", media.FormatCents(got), media.FormatCents(want))
	}
}

// defaultModel is the cost model of plan.Default's design and engine (the demo's book and
// catalog), and that plan.
func defaultModel(t *testing.T) (*Model, plan.Plan) {
	t.Helper()
	p := plan.Default
	eng, err := plan.Engine(&p)
	if err != nil {
		t.Fatal(err)
	}
	return NewModel(eng, p.Design), p
}
