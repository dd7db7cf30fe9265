package routing

import (
	"testing"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/items"
	"spanwright/route/plan"
)

// TestJoinsCentsSplicePointCrew: the price a placement of joins is compared on counts, at a
// splice point to build, the crew's work per cable as the bill does (CableTakeoff.SplicePointCrew;
// review 15 F4): the pull set-up there (the next reel's pull starts there; it was left out,
// 95.00 + 40.00 a cable in the demo book) and, where the point is a handhole dug on a span
// (SplicePoint.BuildsHandhole: a duct's), its entry to splice (review 16 F9: with no span
// under it the entry was never tested). One join at a splice point costs exactly those more
// than the same join in a structure (slack alike): on a duct the point, a pull set-up and an
// entry; on an aerial span (a closure on the strand, nothing dug) and off the spans (a riser,
// a loop) the point and a pull set-up. Common practice, no published source; the prices are
// the demo book's, invented.
func TestJoinsCentsSplicePointCrew(t *testing.T) {
	t.Parallel()
	m, _ := defaultModel(t)
	ch := media.Choice{Medium: "os2", Construction: "osp-loose-tube", Cables: media.Cables{{Count: 24}}}
	inHole := CableTakeoff{Joins: 1, Splices: []SplicePoint{{ID: "MH-1", SlackM: 27}}}
	net := &geo.Network{Spans: []geo.Span{
		{ID: "D1", PathwayID: "P1", LengthM: 300, Type: geo.TypeDuct},
		{ID: "A1", PathwayID: "P2", LengthM: 300, Type: geo.TypeAerial},
	}}
	point, _ := m.prices.Price(media.PriceKey{Item: media.PriceSplicePoint})
	pullOnly, entered := m.cents(items.AtJunctions(m.prices, 1, 0)...), m.cents(items.AtJunctions(m.prices, 1, 1)...)
	if pullOnly == 0 || entered <= pullOnly {
		t.Fatalf("the demo book prices a pull set-up %s and with an entry %s: the test would see nothing", media.FormatCents(pullOnly), media.FormatCents(entered))
	}
	for _, tc := range []struct {
		name string
		at   SplicePoint
		want int64
	}{
		{"a handhole on a duct", SplicePoint{ID: "D1", Span: "D1", AtM: 150, NoStructure: true, SlackM: 27}, point + entered},
		{"a closure on an aerial strand", SplicePoint{ID: "A1", Span: "A1", AtM: 150, NoStructure: true, SlackM: 27}, point + pullOnly},
		{"off the spans", SplicePoint{ID: "B1", NoStructure: true, SlackM: 27}, point + pullOnly},
	} {
		atPoint := CableTakeoff{Joins: 1, Splices: []SplicePoint{tc.at}}
		if got := m.joinsCents(atPoint, ch, net) - m.joinsCents(inHole, ch, net); got != tc.want {
			t.Errorf("%s: a splice point to build costs %s more than a join in a structure, want %s", tc.name, media.FormatCents(got), media.FormatCents(tc.want))
		}
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
