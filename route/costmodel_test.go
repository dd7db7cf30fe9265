package route_test

import (
	"bytes"
	"context"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
	"testing/fstest"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route"
	"spanwright/route/internal/campusgen"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/items"
	"spanwright/route/optimize"
	"spanwright/route/plan"
	"spanwright/route/routing"
	"spanwright/route/site"
)

// costBook is a price book that prices every item of the catalog and the bill, none at zero:
// the embedded demo book (invented prices) with the entrance transition priced at 90,000.00
// an enclosure; legs still take one where the routes around buried spans cost more (seeds 1-4:
// 6 to 29 transition ends), and modelGap counts them at the ends they splice.
func costBook(t *testing.T, edits ...string) []byte {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "media", "prices-demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	edits = append([]string{"transition_splice_each: 260.00", "transition_splice_each: 90000.00"}, edits...)
	for i := 0; i+1 < len(edits); i += 2 {
		if !bytes.Contains(data, []byte(edits[i])) {
			t.Fatalf("price book edit: %q not found", edits[i])
		}
		data = bytes.Replace(data, []byte(edits[i]), []byte(edits[i+1]), 1)
	}
	return data
}

// costScenario plans a generated campus of 40 buildings with the price book, new trench
// allowed, innerduct in every duct, no reel joins and no pull-length limit.
func costScenario(t *testing.T, seed uint64, book []byte) *route.Result {
	t.Helper()
	c := campusgen.Generate(seed, campusgen.Options{Buildings: 40})
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "prices.yaml"), book, 0o644); err != nil {
		t.Fatal(err)
	}
	// The embedded catalog, whose indoor/outdoor cable is not rated for direct burial: the
	// generated campuses draw proposed buried pathways, on which the optimizer prices a leg
	// as outside-plant cable (spliced at the entrances, priced out of reach by costBook) or
	// keeps it off them (routing's options per laying), so the legs stay ones it prices
	// exactly. Before, the test had to rate indoor/outdoor cable for burial.
	var diverse []string
	for _, id := range c.IDs {
		if strings.HasPrefix(id, "B") && !strings.Contains(id, "-") && id != c.Hub && len(diverse) < 3 {
			diverse = append(diverse, fmt.Sprintf("  - {to: %s, redundancy: diverse}", id))
		}
	}
	planText := fmt.Sprintf(`name: cost model
campus: [campus.geojson]
hub: %s
prices: prices.yaml
defaults: {rate: 10G, strands: 12, growth: 0.5, redundancy: none}
links:
%s
design: {allow_new_trench: true, innerduct_od_mm: 32, innerduct_id_mm: 27, reel_m: 100000, pull_max_m: 0}
`, c.Hub, strings.Join(diverse, "\n"))
	p, err := plan.ParsePlan("plan.yaml", []byte(planText))
	if err != nil {
		t.Fatal(err)
	}
	p.Dir = dir
	fsys := fstest.MapFS{"campus.geojson": &fstest.MapFile{Data: campusgen.GeoJSON(c.Features)}}
	site, err := site.Load(context.Background(), fsys, p.Campus, site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
	if err != nil {
		t.Fatal(err)
	}
	r, err := route.Solve(context.Background(), site, p)
	if err != nil {
		t.Fatalf("seed %d: %v", seed, err)
	}
	return r
}

// routeDependent reports whether a bill quantity or line, by its price key, is one of the
// route-dependent items the optimizer prices (README, "One cost model"): cable, pulls,
// innerduct, new work, added duct and the handholes where new pathway joins.
func routeDependent(pb *media.PriceBook, item string, price, rate media.PriceKey) bool {
	switch price.Item {
	case media.PriceBidItem:
		// Those priced per unit of a basis the routes decide (items.BidPer).
		for _, it := range pb.BidItems {
			if it.ID == price.Name {
				switch it.Basis {
				case media.BasisNewBuriedM, media.BasisStructure, media.BasisCableEnd, media.BasisLeg:
					return true
				}
			}
		}
		return false
	case media.PriceCable, media.PriceInnerduct, media.PriceTrench, media.PriceRestoration, media.PriceBore, media.PriceAddedDuct, media.PriceNewPathway:
		return true
	case media.PriceStructure:
		return item == "handhole where new pathway joins the network" || item == "handhole where a route turns between pathways" ||
			item == "handhole along new construction" || item == items.TapHandholeItem
	case media.PriceEntrance, media.PriceFirestop, media.PriceHoleWall:
		return true
	case media.PriceCrew:
		return price.Name != media.CrewEnclosureInstall // enclosures follow the media, not the routes
	case media.PriceLabourHour:
		return rate.Item == media.RatePull
	}
	return false
}

// lineRouteDependent is routeDependent for a bill line, whose labour lines keep their items
// but not their rate keys: the pulls and the innerduct placing are pulls.
func lineRouteDependent(pb *media.PriceBook, l media.BOMLine) bool {
	if l.Unit == media.UnitHour {
		return strings.HasPrefix(l.Item, "pull cable in ") || l.Item == "place innerduct in duct" || l.Item == items.InsideItem
	}
	return routeDependent(pb, l.Item, l.Price, media.PriceKey{})
}

// routeLines sums the bill's route-dependent lines, with the most their rounding moves
// them: 0.05 m × the unit price for metres, 0.01 h × the hourly price for labour, and half a
// cent each (media.PriceBook.Cents).
func routeLines(b *media.BOM, p *media.PriceBook) (cents int64, bound float64) {
	hour, _ := p.Price(items.LabourHour)
	for _, l := range b.Lines {
		if !lineRouteDependent(p, l) {
			continue
		}
		cents += l.ExtendedCents
		switch l.Unit {
		case media.UnitM:
			bound += 0.05*float64(l.UnitCents) + 0.5
		case media.UnitHour:
			bound += 0.01*float64(hour) + 0.5
		}
	}
	return cents, bound
}

// routeIndependentCents is what the optimizer's objective holds besides the route-dependent
// items: each routed demand's terminations and transceivers (media.Engine.FixedCents, once
// per leg).
func routeIndependentCents(r *route.Result) int64 {
	var c int64
	for i := range r.Legs {
		l := &r.Legs[i]
		if l.Feasible {
			c += r.Engine.FixedCentsFor(l.Medium, mustRate(r, l.Link.Rate), media.Link{Strands: routing.CableStrands(l.Link.Strands, l.Link.Growth),
				CopperCables: routing.CopperCables(l.Link.Strands, l.Link.Growth)}) // a 4-pair cable per port pair on copper
		}
	}
	return c
}

func mustRate(r *route.Result, rate string) float64 {
	x, _ := r.Engine.Catalog().ParseRate(rate)
	return x
}

// modelGap is what the optimizer's model leaves out of, or adds to, the bill's
// route-dependent items on r, as the README names it: cable bought in whole metres per leg
// (the bill rounds up, the model does not), and new work listed to 0.1 m. (Handholes where new
// pathway joins, and where a route turns, are charges of their junctions, paid once in the
// model as in the bill; every leg's pass through them, its slack loop, crew and bid items per
// structure passed, is in the objective, partly on the edges and the rest in the plan's
// evaluation (routing's passGapCents); and the ducts new construction is built to size with
// are the optimizer's count, priced by it and laid by the bill.) It fails the test on
// what the model is not meant to meet here (a leg the rules moved to another medium or
// construction, several cables, transitions, reel joins).
func modelGap(t *testing.T, r *route.Result) (billOnly, modelOnly int64) {
	t.Helper()
	p := r.Engine.PriceBook()
	prob, links := problemOf(t, r)
	option := func(link, medium string) *optimize.Option {
		for d := range links {
			for o := range prob.Demands[d].Options {
				if links[d].ID == link && prob.Demands[d].Options[o].Name == medium {
					return &prob.Demands[d].Options[o]
				}
			}
		}
		t.Fatalf("link %s: no option %s", link, medium)
		return nil
	}
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible && l.Name == routing.LegDiverse && strings.HasPrefix(l.Reason, "no diverse route") {
			continue // the model charges no second leg either (Option.SecondLegCents)
		}
		if !l.Feasible {
			t.Fatalf("leg %s %s infeasible: %s", l.Link.ID, l.Name, l.Reason)
		}
		if strings.Contains(l.Choice, "the optimizer routed it for") || l.Cable.Joins != 0 {
			t.Fatalf("leg %s %s: %s, %d joins: outside what the model meets exactly", l.Link.ID, l.Name, l.Choice, l.Cable.Joins)
		}
		opt := option(l.Link.ID, l.Option)
		if l.Inside != "" && !strings.Contains(l.Option, " as "+l.Construction+" + "+l.Inside) {
			t.Fatalf("leg %s %s: %s spliced to %s, routed in option %q, not one priced as that", l.Link.ID, l.Name, l.Construction, l.Inside, l.Option)
		}
		if max(opt.Cables, 1) != len(l.Cable.Cables) {
			t.Fatalf("leg %s %s: %d cables, the model's %d", l.Link.ID, l.Name, len(l.Cable.Cables), opt.Cables)
		}
		perM := opt.CablePerMCents // all of the leg's cables
		// The book's price of each cable the bill buys, added up (288 + 12: both prices).
		priceOf := func(construction string, cables media.Cables) (cents int64) {
			for _, c := range cables {
				x, _ := p.Price(media.PriceKey{Item: media.PriceCable, Medium: l.Medium, Construction: construction, Count: c.Count})
				cents += x
			}
			return cents
		}
		if price := priceOf(l.Construction, l.Cable.Cables); price != perM {
			t.Fatalf("leg %s %s: %s × %s at %d cents a metre, the model's cable %d", l.Link.ID, l.Name, l.Cable.Cables.Text(), l.Construction, price, perM)
		}
		if l.Inside == "" {
			billOnly += media.MulCents(perM, l.Cable.LengthM-items.Wasted(r.Plan.Design, l.Cable.ChannelM))
		} else {
			// An entrance transition: the bill buys the inside cable's metres in whole metres and
			// the outside-plant cable the rest; the model priced the inside cable over the
			// inside run with waste, and the enclosures, splice trays, splicing and the
			// enclosures' installation (not route items of the bill) in the option's fixed part: worked here from the book as the
			// media engine prices them (one enclosure per outside cable and trays for its strands
			// at each entrance of the transition; every strand spliced there, once an end, at
			// splices_per_hour).
			inPerM := priceOf(l.Inside, l.Cable.InsideCables)
			wIn := items.Wasted(r.Plan.Design, l.Cable.InsideRunM)
			billOnly += media.MulCents(perM, l.Cable.LengthM-l.Cable.InsideLengthM-items.Wasted(r.Plan.Design, l.Cable.ChannelM)+wIn) +
				media.MulCents(inPerM, l.Cable.InsideLengthM-wIn)
			encl, _ := p.Price(media.PriceKey{Item: media.PriceTransition})
			tray, _ := p.Price(media.PriceKey{Item: media.PriceSpliceTray})
			spliced, trays := 0, 0
			for _, c := range l.Cable.Cables { // each cable in its own enclosure, its own trays
				spliced, trays = spliced+c.Count, trays+p.TraysFor(c.Count)
			}
			ends := l.InsideAt.Count()
			modelOnly += int64(ends) * (int64(len(l.Cable.Cables))*encl + int64(trays)*tray)
			hour, _ := p.Price(media.PriceKey{Item: media.PriceLabourHour})
			rate, _ := p.Rate(media.PriceKey{Item: media.RateSplice})
			modelOnly += int64(math.Round(float64(ends*spliced) / rate * float64(hour)))
			// Each enclosure installed (crew_each.enclosure_install; common practice, no
			// published source), which the bill lists with the leg but not among its route
			// items (routeDependent). The inside cables' ends, prepared and labelled, are route
			// items on both sides.
			install, _ := p.Price(media.PriceKey{Item: media.PriceCrew, Name: media.CrewEnclosureInstall})
			modelOnly += int64(ends*len(l.Cable.Cables)) * install
		}
	}
	// New civil work on the metres the bill lists, each piece to 0.1 m so that the pieces add
	// up to their lines (estimate.listPieces): its trench or bore and restoration, and the bid
	// items per metre of new buried work. The model prices each piece's own length.
	var listedM, lengthM float64
	for _, w := range r.Estimate.Construction.Pieces {
		listedM += w.ListedM
		lengthM += w.LengthM
		for _, q := range items.NewWork(r.Plan.Design, &geo.Span{Type: geo.TypeDuct, Surface: w.Surface}, w.Method, 1) {
			billOnly += int64(math.Round(float64(p.Cents(q)) * (w.ListedM - w.LengthM)))
		}
	}
	for _, q := range items.BidPer(p, media.BidBases{NewBuriedM: 1}) {
		if q.Unit != media.UnitEach {
			billOnly += int64(math.Round(float64(p.Cents(q)) * (listedM - lengthM)))
		}
	}
	return billOnly, modelOnly
}

// TestOneCostModel is the single cost model's acceptance: on generated campuses, with every
// price non-zero, the optimizer's objective for the routes it returned, less the
// route-independent terminations and transceivers, equals the bill's route-dependent items
// priced one by one (media.PriceBook.Cents) once the gaps the README names are counted
// (modelGap), within half a cent per item priced on either side; and those items differ
// from the bill's route-dependent lines only by the lines' rounding (metres to 0.1 m, hours
// up to 0.01 h; media.PriceBook.Cents).
func TestOneCostModel(t *testing.T) {
	t.Parallel()
	book := costBook(t)
	pb, err := media.ParsePriceBook("prices.yaml", book)
	if err != nil {
		t.Fatal(err)
	}
	for _, k := range pb.Keys() {
		price, okP := pb.Price(k)
		rate, okR := pb.Rate(k)
		if (okP && price <= 0) || (okR && rate <= 0) {
			t.Fatalf("price %s is not > 0", k.Path())
		}
	}
	for _, seed := range []uint64{1, 2, 3, 4} {
		t.Run(fmt.Sprint("seed ", seed), func(t *testing.T) {
			t.Parallel()
			oneCostModel(t, fmt.Sprint("seed ", seed), costScenario(t, seed, book))
		})
	}
	// The entrance transition at the demo book's 260.00 an enclosure (invented), where it is
	// cheaper than indoor/outdoor cable or the only laying allowed on a buried span
	// (direct-burial): the optimizer's objective meets the bill on the transition legs too,
	// each priced by its ends' items (media.TransitionEnds: enclosures, trays, splicing, the
	// inside cable ends' preparation and labelling, the enclosures' installation).
	t.Run("transitions at the demo price", func(t *testing.T) {
		t.Parallel()
		r := costScenario(t, 1, costBook(t, "transition_splice_each: 90000.00", "transition_splice_each: 260.00"))
		ends := 0
		for _, l := range r.Legs {
			ends += l.InsideAt.Count()
		}
		if ends == 0 {
			t.Fatal("no leg takes an entrance transition; the case wants some")
		}
		t.Logf("%d transition ends", ends)
		oneCostModel(t, "transitions", r)
	})
	// Copper links of three 4-pair cables each (ANSI/TIA-568.2: one per port pair) sharing a
	// duct that needs two more for them (NFPA 70 Chapter 9 Table 1 and its jam band; estimate's
	// TestCopperCablesInTheFill): the model counts every cable's pulls, crew and duct place.
	t.Run("copper, three cables a leg", func(t *testing.T) {
		t.Parallel()
		dir := t.TempDir()
		if err := os.WriteFile(filepath.Join(dir, "prices.yaml"), costBook(t, "1000BASE-SX: 18.00", "1000BASE-SX: 90000.00",
			"1000BASE-LX: 22.00", "1000BASE-LX: 90000.00"), 0o644); err != nil {
			t.Fatal(err)
		}
		r, err := testplan.PullSolveJSON(t, testsite.CopperFan(), func(p *plan.Plan) {
			p.Dir, p.Prices = dir, "prices.yaml"
			p.Design.AllowOutdoorCopper, p.Design.AllowNewTrench = true, true
			p.Design.InnerductODMM, p.Design.InnerductIDMM = 0, 0
			p.Defaults.Rate, p.Defaults.Strands = "1G", 4
		})
		if err != nil {
			t.Fatal(err)
		}
		for _, l := range r.Legs {
			if len(l.Cable.Cables) != 3 {
				t.Fatalf("leg %s: %s, %d cables; want three 4-pair cables", l.Link.ID, l.Medium, len(l.Cable.Cables))
			}
		}
		oneCostModel(t, "copper", r)
	})
	// Fibre links of 200 strands with 50 % growth: 300 strands, more than the largest size
	// (288, the catalog's TIA-598 common-practice counts, seen), bought as 288 + 12
	// (media.Engine.Cables, tester 11's finding 15): the model prices both cables per metre and
	// counts each one's pulls, crew and duct place, as the bill does.
	t.Run("fibre, 288 + 12 a leg", func(t *testing.T) {
		t.Parallel()
		dir := t.TempDir()
		if err := os.WriteFile(filepath.Join(dir, "prices.yaml"), costBook(t), 0o644); err != nil {
			t.Fatal(err)
		}
		r, err := testplan.PullSolve(t, 100, 2, func(p *plan.Plan) {
			p.Dir, p.Prices = dir, "prices.yaml"
			p.Defaults.Strands, p.Defaults.Growth = 200, 0.5
		})
		if err != nil {
			t.Fatal(err)
		}
		for _, l := range r.Legs {
			if got := l.Cable.Cables.Text(); got != "288 + 12" {
				t.Fatalf("leg %s: %s, cables %s; want 288 + 12", l.Link.ID, l.Medium, got)
			}
		}
		oneCostModel(t, "288 + 12", r)
	})
}

// oneCostModel is TestOneCostModel's check of one plan.
func oneCostModel(t *testing.T, name string, r *route.Result) {
	t.Helper()
	p := r.Engine.PriceBook()
	model := r.ObjectiveCents - routeIndependentCents(r)
	var items int64
	var nItems int
	for _, q := range r.Estimate.Quantities {
		if routeDependent(p, q.Item, q.Price, q.Rate) {
			items += p.Cents(q)
			nItems++
		}
	}
	lines, lineBound := routeLines(r.Estimate.BOM, p)
	billOnly, modelOnly := modelGap(t, r)
	// Items priced on the model's side: per span crossed, for each cable, its cable, its pull,
	// innerduct and placing, and its structure loops; per leg the cable and pulls of its ends;
	// per opened span its new work, duct and handholes.
	crossed := 0
	for _, l := range r.Legs {
		crossed += len(l.Steps) * max(len(l.Cable.Cables), 1)
	}
	modelItems := 5*crossed + 4*len(r.Legs) + 5*len(r.Opened)
	bound := 0.5 * float64(modelItems+nItems)
	got, want := model, items-billOnly+modelOnly
	t.Logf("%s: objective %s, route-independent %s, model's route part %s; bill's route items %s (lines %s), bill-only (whole-metre cable, new work as listed to 0.1 m) %s, model-only %s; %d legs, %d spans opened, %d built to size",
		name, media.FormatCents(r.ObjectiveCents), media.FormatCents(r.ObjectiveCents-model), media.FormatCents(model),
		media.FormatCents(items), media.FormatCents(lines), media.FormatCents(billOnly), media.FormatCents(modelOnly), len(r.Legs), len(r.Opened),
		len(r.Estimate.Construction.SizedDucts))
	if math.Abs(float64(got-want)) > bound {
		t.Errorf("%s: the model's route part %s against the bill's %s: %s apart, more than the rounding bound %.2f cents",
			name, media.FormatCents(got), media.FormatCents(want), media.FormatCents(got-want), bound)
	}
	if math.Abs(float64(lines-items)) > lineBound {
		t.Errorf("%s: the bill's route lines %s against its items priced alone %s: more than the lines' rounding %.2f cents",
			name, media.FormatCents(lines), media.FormatCents(items), lineBound)
	}
	if len(r.Opened) == 0 {
		t.Logf("%s: no span opened", name)
	}
}

// problemOf builds the optimizer's problem of r's plan again, with r's engine.
func problemOf(t *testing.T, r *route.Result) (*optimize.Problem, []site.Link) {
	t.Helper()
	hub, err := r.Site.Hub(r.Plan)
	if err != nil {
		t.Fatal(err)
	}
	links, _, errs := r.Site.Links(r.Plan, hub)
	if len(errs) > 0 {
		t.Fatal(errs)
	}
	cm := routing.NewModel(r.Engine, r.Plan.Design)
	prob, err := routing.Problem(r.Site, cm, links)
	if err != nil {
		t.Fatal(err)
	}
	return prob, links
}

// objectiveOf evaluates the optimizer's objective (route/optimize's package documentation)
// of r's routes, media, opened spans and added ducts on prob, a problem of the same site
// priced from pb.
func objectiveOf(r *route.Result, prob *optimize.Problem, pb *media.PriceBook, links []site.Link) int64 {
	var c int64
	index := map[string]int{}
	for i := range r.Site.Net.Spans {
		index[r.Site.Net.Spans[i].ID] = i
	}
	for d := range links {
		var opt *optimize.Option
		for i := range r.Legs {
			l := &r.Legs[i]
			if l.Link.ID != links[d].ID || !l.Feasible {
				continue
			}
			for o := range prob.Demands[d].Options {
				if prob.Demands[d].Options[o].Name == l.Option {
					opt = &prob.Demands[d].Options[o]
				}
			}
			for _, st := range l.Steps {
				e := &prob.Edges[index[st.SpanID]]
				m := e.CableM
				if m == 0 {
					m = e.LengthM
				}
				c += int64(math.Round(m*float64(opt.CablePerMCents))) + int64(math.Round(e.LengthM*float64(e.LabourPerMCents))) + e.PerCableCents
			}
			c += passPart(r, pb, l, opt)
		}
		if opt != nil {
			c += opt.FixedCents
		}
	}
	for _, id := range r.Opened {
		c += prob.Edges[index[id]].FixedCents
	}
	// Entrance edges with a lateral, at ends with several entrances; the handholes the plan
	// adds, each a charge paid once.
	byID := map[string]*optimize.Edge{}
	for i := len(r.Site.Net.Spans); i < len(prob.Edges); i++ {
		byID[prob.Edges[i].ID] = &prob.Edges[i]
	}
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		for _, end := range [][2]string{{l.EntranceTo, l.Link.To}, {l.EntranceFrom, l.Link.From}} {
			if e, ok := byID["entrance "+end[0]+" of "+end[1]]; ok && (e.CableM > 0 || e.PerCableCents > 0) {
				var perM int64
				for d := range links {
					for _, o := range prob.Demands[d].Options {
						if links[d].ID == l.Link.ID && o.Name == l.Option {
							perM = o.CablePerMCents
						}
					}
				}
				c += int64(math.Round(e.CableM*float64(perM))) + e.PerCableCents
			}
		}
	}
	// One handhole per junction the plan adds one at, whatever its reasons (a junction's charge,
	// or the tap of a building with one entrance, which the objective pays as a constant).
	c += int64(len(r.Handholes)) * pb.Cents(items.JoinHandholes(1))
	// Turn edges carry the crew's work at the handhole a route turns in, per cable: one whole
	// set-up and entry per turn the leg lists; a route into or out of new pathway that joins
	// at a junction split for turns, where it is a run of its own, pays half of that on the
	// turn edge and half on its span (routing's layout.turnShare), and lists no turn there.
	cents := func(qs []media.Quantity) (c int64) {
		for _, q := range qs {
			c += pb.Cents(q)
		}
		return c
	}
	whole, half := cents(items.AtJunctions(pb, 1, 1)), cents(items.AtJunctions(pb, 0.5, 0.5))
	for i := range r.Legs {
		if l := &r.Legs[i]; l.Feasible {
			c += int64(len(l.Turns))*whole + int64(intoJoiningRuns(r, l))*half
		}
	}
	// Entrances: those of buildings with several are charges paid once, those of buildings
	// with one the constant part of the objective (routing.Routed.ConstantCents).
	for _, en := range r.Estimate.Construction.Entrances {
		if en.Single {
			for _, q := range items.Entrance(pb, r.Plan.Design, en.LateralM, en.Built, en.PoleRiser) {
				c += pb.Cents(q)
			}
			for _, q := range items.BidPer(pb, media.BidBases{NewBuriedM: 1}) {
				q.Amount *= en.LateralM
				c += pb.Cents(q)
			}
			continue
		}
		for _, ch := range prob.Charges {
			if ch.ID == "entrance "+en.Entrance+" of "+en.Building {
				c += ch.Cents
			}
		}
	}
	for _, f := range r.Fill {
		e := &prob.Edges[index[f.Span]]
		duct := int64(math.Round(e.LengthM * float64(e.AddDuctPerMCents)))
		switch {
		case e.Proposed && f.Limited: // built to size: the ducts laid beyond those its opening lays
			c += int64(f.AddedDucts-e.Ducts) * duct
		case f.AddedDucts > 0: // the trench once, laid with the ducts the fill counts
			c += int64(f.AddedDucts)*duct + int64(math.Round(e.LengthM*float64(e.AddTrenchPerMCents))) + e.AddTrenchCents
		}
	}
	return c
}

// intoJoiningRuns counts the junctions where leg l turns from the network into a joining run
// there, or out of one into the network (inJoiningRun on one side, not both): the turn edges
// of half a crew share (routing's layout.turnShare).
func intoJoiningRuns(r *route.Result, l *routing.Leg) int {
	n := 0
	for k := 1; k < len(l.Steps); k++ {
		a, _ := r.Site.Net.Span(l.Steps[k-1].SpanID)
		b, _ := r.Site.Net.Span(l.Steps[k].SpanID)
		j := a.To
		if l.Steps[k-1].Reverse {
			j = a.From
		}
		if inJoiningRun(r, &a, j) != inJoiningRun(r, &b, j) {
			n++
		}
	}
	return n
}

// passPart is what the objective prices of leg l's passes through the handholes the plan
// builds at junctions beyond its span edges (half a pass at each joining end, items.JoinEnds)
// and its taps (a whole pass each): the slack loop (cable with waste at the option's price,
// pulled as duct) and the bid items per structure passed of the rest, and the crew's set-up
// and entry of the rest less the turn edges' shares (objectiveOf adds those), per cable
// (routing's passGapCents).
func passPart(r *route.Result, pb *media.PriceBook, l *routing.Leg, opt *optimize.Option) int64 {
	d := r.Plan.Design
	passes := 0.0
	for _, p := range l.Cable.Passed {
		if p.Added && p.Span == "" {
			passes++
		}
	}
	priced := 0.0
	for _, st := range l.Steps {
		sp, _ := r.Site.Net.Span(st.SpanID)
		priced += 0.5 * items.JoinEnds(r.Site, &sp)
		for _, j := range []string{sp.From, sp.To} {
			if i := slices.IndexFunc(r.Site.Net.Spans, func(s geo.Span) bool { return s.ID == sp.ID }); sp.Status == geo.StatusProposed && r.Site.JoinsNetwork(j) && carriedOn(r, i, j) {
				priced -= 0.5 // carried on from a street's duct: no half there (routing's layout.joinEnds)
			}
		}
	}
	for _, end := range [][2]string{{l.Link.To, l.EntranceTo}, {l.Link.From, l.EntranceFrom}} {
		for _, e := range r.Site.Net.EntrancesOf(end[0]) {
			if e.ID == end[1] && r.Site.TapOf(e) {
				priced++
			}
		}
	}
	turns := float64(len(l.Turns)) + 0.5*float64(intoJoiningRuns(r, l))
	cables := float64(max(opt.Cables, 1))
	sum := func(qs []media.Quantity) (c int64) {
		for _, q := range qs {
			c += pb.Cents(q)
		}
		return c
	}
	n := passes - priced
	loopM := n * d.SlackLoopStructureM
	c := media.MulCents(opt.CablePerMCents, items.Wasted(d, loopM)) + sum(items.Times(cables, items.StructureLoops(loopM)...)) +
		sum(items.Times(n*cables, items.BidPer(pb, media.BidBases{Structures: 1})...))
	return c + sum(items.Times(cables, items.AtJunctions(pb, n-turns, n-turns)...))
}

// inJoiningRun reports whether sp is in a joining run at junction j, a junction split for turns
// where new pathway joins the network: a run of duct through j (geo.Network.RunsAt) of
// proposed spans only. A route into or out of it there pays half of the crew's work at j's
// handhole on the turn edge and half on the joining span (routing's layout.turnShare).
func inJoiningRun(r *route.Result, sp *geo.Span, j string) bool {
	if !slices.Contains(r.Site.TurnsNeedingStructure(), j) || !r.Site.JoinsNetwork(j) {
		return false
	}
	var at []int
	for i := range r.Site.Net.Spans {
		if s := &r.Site.Net.Spans[i]; s.From == j || s.To == j {
			at = append(at, i)
		}
	}
	for _, run := range r.Site.Net.RunsAt(j, at) {
		in, allNew := false, true
		for _, i := range run {
			in = in || r.Site.Net.Spans[i].ID == sp.ID
			allNew = allNew && r.Site.Net.Spans[i].Status == geo.StatusProposed
		}
		if in {
			return allNew
		}
	}
	return false
}

// TestCostModelMovesWithTheBill changes one price at a time and re-prices the same plan:
// the optimizer's objective for its routes (on the problem built from the changed book) and
// the bill's route-dependent lines (the same quantities billed from the changed book) move
// by the same amount, within the lines' and items' rounding. On the old code the cable price
// moved the model by the route alone (no waste, loops or coils) and the handhole not at all.
func TestCostModelMovesWithTheBill(t *testing.T) {
	t.Parallel()
	base := costBook(t)
	r := costScenario(t, 2, base)
	problem := func(book []byte) (*optimize.Problem, *media.PriceBook) {
		pb, err := media.ParsePriceBook("prices.yaml", book)
		if err != nil {
			t.Fatal(err)
		}
		eng, err := media.NewEngine(r.Engine.Catalog(), nil, pb, plan.EngineOptions(r.Plan))
		if err != nil {
			t.Fatal(err)
		}
		r2 := *r
		r2.Engine = eng
		prob, _ := problemOf(t, &r2)
		return prob, pb
	}
	_, links := problemOf(t, r)
	prob0, pb0 := problem(base)
	if got := objectiveOf(r, prob0, pb0, links); got != r.ObjectiveCents {
		t.Fatalf("objectiveOf %d cents, the optimizer's %d: the evaluator is wrong", got, r.ObjectiveCents)
	}
	bill := func(pb *media.PriceBook) (int64, float64) {
		b, err := pb.Bill(r.Estimate.Quantities)
		if err != nil {
			t.Fatal(err)
		}
		return routeLines(b, pb)
	}
	bill0, bound0 := bill(pb0)
	crossed := 0
	for _, l := range r.Legs {
		crossed += len(l.Steps)
	}
	itemBound := 0.5 * float64(5*crossed+4*len(r.Legs)+5*len(r.Opened))
	cases := []struct{ name, from, to string }{
		{"os2 outside-plant cable, 24 strands", "osp-loose-tube: {12: 1.43, 24: 2.31,", "osp-loose-tube: {12: 1.43, 24: 2.81,"},
		{"hourly labour", "hourly_rate: 92.00", "hourly_rate: 120.00"},
		{"duct pull rate", "pull_m_per_hour: {duct: 60,", "pull_m_per_hour: {duct: 40,"},
		{"buried pull rate", "buried: 30, tray: 80}", "buried: 20, tray: 80}"},
		{"tray pull rate", "buried: 30, tray: 80}", "buried: 30, tray: 50}"},
		{"innerduct", "innerduct_per_m: 2.40", "innerduct_per_m: 4.40"},
		{"turf trench", "turf: 48.00", "turf: 58.00"},
		{"turf restoration", "turf: 9.00", "turf: 19.00"},
		{"added duct", "added_duct_per_m: 7.50", "added_duct_per_m: 17.50"},
		{"handhole", "handhole: 2400.00", "handhole: 4400.00"},
		{"building entrance", "building_entrance_each: 1250.00", "building_entrance_each: 2000.00"},
		{"firestop at an entrance already there", "entrance_firestop_each: 190.00", "entrance_firestop_each: 300.00"},
		{"crew pull set-up", "pull_setup: 95.00", "pull_setup: 150.00"},
		{"crew structure entry", "structure_entry: 40.00", "structure_entry: 70.00"},
		{"crew cable end", "cable_end_prep: 30.00", "cable_end_prep: 50.00"},
		{"tracer wire per new metre", "per_m_new_buried: 1.80}", "per_m_new_buried: 3.80}"},
		{"labelling per cable end", "per_cable_end: 6.00}", "per_cable_end: 9.00}"},
	}
	for _, tc := range cases {
		prob1, pb1 := problem(costBook(t, tc.from, tc.to))
		bill1, bound1 := bill(pb1)
		dModel := objectiveOf(r, prob1, pb1, links) - r.ObjectiveCents
		dBill := bill1 - bill0
		if dModel == 0 && dBill == 0 {
			t.Logf("%s: moves neither (not used on this campus)", tc.name)
			continue
		}
		// The handhole gap scales with its price (modelGap); none here moves
		// the whole-metre rounding of cable except the cable price, by that rounding alone.
		if math.Abs(float64(dModel-dBill)) > bound0+bound1+2*itemBound+gapMove(t, r, pb0, pb1) {
			t.Errorf("%s: the model moved %s, the bill's route lines %s", tc.name, media.FormatCents(dModel), media.FormatCents(dBill))
		}
		t.Logf("%s: model %+d cents, bill %+d cents", tc.name, dModel, dBill)
	}
}

// gapMove is how much the gaps modelGap names move between two price books on r's plan.
func gapMove(t *testing.T, r *route.Result, a, b *media.PriceBook) float64 {
	t.Helper()
	gap := func(pb *media.PriceBook) float64 {
		eng := r.Engine
		e2, err := media.NewEngine(eng.Catalog(), nil, pb, plan.EngineOptions(r.Plan))
		if err != nil {
			t.Fatal(err)
		}
		r2 := *r
		r2.Engine = e2
		billOnly, modelOnly := modelGap(t, &r2)
		return float64(billOnly + modelOnly)
	}
	return math.Abs(gap(b) - gap(a))
}
