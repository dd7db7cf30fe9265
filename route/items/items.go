package items

import (
	"fmt"
	"slices"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// InnerductFits reports whether a cable of the given outside diameter fits the design's
// innerduct: one cable at most 53 % of its inside area (NFPA 70 Chapter 9 Table 1, one cable).
func InnerductFits(d plan.Design, cableODMM float64) bool {
	return cableODMM*cableODMM <= 0.53*d.InnerductIDMM*d.InnerductIDMM
}

// Each function below lists, as bill quantities, what one priced thing of a route takes; the
// bill of materials (package estimate) adds them up into its lines and the optimizer's
// problem (package routing) prices them one span or one demand at a time with
// media.PriceBook.Cents.

// LabourHour is the price of an hour of labour; labour items carry their rate beside it.
var LabourHour = media.PriceKey{Item: media.PriceLabourHour}

// PathwayTypes are the pathway types in a fixed order, and pullItems the bill items of
// pulling cable in each.
var (
	PathwayTypes = [...]string{geo.TypeAerial, geo.TypeBuried, geo.TypeDuct, geo.TypeTray, geo.TypeTunnel}
	pullItems    = func() (m [len(PathwayTypes)]string) {
		for i, t := range PathwayTypes {
			m[i] = "pull cable in " + t
		}
		return m
	}()
)

// Pull is pulling metres of one cable in a pathway of type typ.
func Pull(typ string, metres float64) media.Quantity {
	item := "pull cable in " + typ
	if i := slices.Index(PathwayTypes[:], typ); i >= 0 {
		item = pullItems[i]
	}
	return media.Quantity{Category: media.CategoryLabour, Item: item, Unit: media.UnitM, Amount: metres,
		Price: LabourHour, Rate: media.PriceKey{Item: media.RatePull, Name: typ}}
}

// AlongSpan is what one cable takes along metres of a span of type typ besides the cable
// itself: its pull, and in a duct with the design's innerduct, one innerduct for it and the
// pull that places the innerduct.
func AlongSpan(d plan.Design, typ string, metres float64) []media.Quantity {
	q := []media.Quantity{Pull(typ, metres)}
	if typ == geo.TypeDuct && d.Innerduct() {
		q = append(q,
			media.Quantity{Category: media.CategoryMaterial, Item: fmt.Sprintf("innerduct %g/%g mm", d.InnerductODMM, d.InnerductIDMM),
				Unit: media.UnitM, Amount: metres, Price: media.PriceKey{Item: media.PriceInnerduct}},
			media.Quantity{Category: media.CategoryLabour, Item: "place innerduct in duct", Unit: media.UnitM, Amount: metres,
				Price: LabourHour, Rate: media.PriceKey{Item: media.RatePull, Name: geo.TypeDuct}})
	}
	return q
}

// InsideItem is the bill item of the cable work inside the buildings at a leg's ends.
const InsideItem = "pull riser cable, place service coils and entrance loops"

// Inside is the work one cable takes inside the buildings at a leg's ends: metres pulled up
// the risers and laid as service coils and entrance loops. It is its own bill line whatever
// pathways the campus has, priced at the book's rate for cable placed inside buildings,
// labour.pull_m_per_hour.tray (common practice, no published source: a riser pull and coiling
// slack go at about the pace of placing cable in tray, not of pulling it through duct).
func Inside(metres float64) media.Quantity {
	return media.Quantity{Category: media.CategoryLabour, Item: InsideItem, Unit: media.UnitM, Amount: metres,
		Price: LabourHour, Rate: media.PriceKey{Item: media.RatePull, Name: geo.TypeTray}}
}

// LegEnds is what one cable takes at the ends of a leg besides the cable: risers, service
// coils and entrance loops (coilsM) placed inside the buildings (Inside), counted laterals
// pulled in the duct the plan builds for them (Entrance) and up the riser conduit on a pole
// where a lateral leaves a pole line, pulled as duct too. riserM is all the leg's risers,
// poleRiserM of them down poles (PoleRiserM).
func LegEnds(riserM, poleRiserM, coilsM, lateralM float64) []media.Quantity {
	return []media.Quantity{Inside(riserM - poleRiserM + coilsM), Pull(geo.TypeDuct, lateralM+poleRiserM)}
}

// PoleRiserM is the cable, in metres, one cable takes on the pole where a counted lateral of
// lateralM metres leaves a pole line (poleRiser, geo.Entry.PoleRiser): design.pole_riser_m,
// from the strand down the pole's riser into the handhole at its foot; 0 for any other
// entrance. It is a riser of the leg (routing.Leg.RiserM, media.Link.RiserM): in the cable
// bought, the channel, the loss budget and the optimizer's reach, and pulled as duct
// (LegEnds); outdoors, so in no building's inside metres. The one figure of it.
func PoleRiserM(d plan.Design, lateralM float64, poleRiser bool) float64 {
	if !poleRiser || lateralM <= 0 {
		return 0
	}
	return d.PoleRiserM
}

// StructureLoops is what one cable's slack loops of metres at structures take besides the
// cable: they are pulled as duct.
func StructureLoops(metres float64) []media.Quantity {
	return []media.Quantity{Pull(geo.TypeDuct, metres)}
}

// Join is what one mid-span join of one fibre cable of count strands puts on the bill besides
// its cable: a splice closure, trays for every strand and the splicing of every strand (the
// crew's cable ends and the closure's installation are counted with the leg's others,
// routing.CableTakeoff.CableEnds and Enclosures). The bill (estimate's legItems) and the price
// of a placement of joins (routing's joinsCents) read it.
func Join(p *media.PriceBook, count int) []media.Quantity {
	return []media.Quantity{
		{Category: media.CategoryMaterial, Item: "splice closure, mid-span join", Unit: media.UnitEach, Amount: 1, Price: media.PriceKey{Item: media.PriceSpliceClosure}},
		{Category: media.CategoryMaterial, Item: fmt.Sprintf("splice tray, %d splices", p.TraySplices()), Unit: media.UnitEach, Amount: float64(p.TraysFor(count)), Price: media.PriceKey{Item: media.PriceSpliceTray}},
		{Category: media.CategoryLabour, Item: "splice fibre, mid-span joins", Unit: media.UnitEach, Amount: float64(count), Price: LabourHour, Rate: media.PriceKey{Item: media.RateSplice}},
	}
}

// Cable is metres of one cable of medium on construction k in size count (4-pair copper
// when !fibre).
func Cable(medium, k string, count int, fibre bool, metres float64) media.Quantity {
	item := fmt.Sprintf("cable %s %s, %d strands", medium, k, count)
	if !fibre {
		item = fmt.Sprintf("cable %s %s, 4-pair", medium, k)
	}
	return media.Quantity{Category: media.CategoryMaterial, Item: item, Unit: media.UnitM, Amount: metres,
		Price: media.PriceKey{Item: media.PriceCable, Medium: medium, Construction: k, Count: count}}
}

// Trench is new trench of metres on a surface, with its restoration.
func Trench(surface string, metres float64) []media.Quantity {
	return []media.Quantity{
		{Category: media.CategoryConstruction, Item: "trench, " + surface, Unit: media.UnitM, Amount: metres,
			Price: media.PriceKey{Item: media.PriceTrench, Name: surface}},
		{Category: media.CategoryConstruction, Item: "restoration, " + surface, Unit: media.UnitM, Amount: metres,
			Price: media.PriceKey{Item: media.PriceRestoration, Name: surface}}}
}

// Bore is metres of directional bore.
func Bore(metres float64) media.Quantity {
	return media.Quantity{Category: media.CategoryConstruction, Item: "directional bore", Unit: media.UnitM, Amount: metres,
		Price: media.PriceKey{Item: media.PriceBore}}
}

// NewWork is new work along metres of a span built by method (MethodOf): a bore, trench and
// restoration of its surface (SurfaceOf), or, for a pathway that is not dug (Dug), that
// pathway built new (NewPathway, the method being its type).
func NewWork(d plan.Design, sp *geo.Span, method string, metres float64) []media.Quantity {
	switch method {
	case geo.MethodBore:
		return []media.Quantity{Bore(metres)}
	case geo.MethodTrench:
		return Trench(SurfaceOf(d, sp), metres)
	}
	return []media.Quantity{NewPathway(method, metres)}
}

// Dug reports whether new work of pathway type typ is dug, trenched or bored: a duct (and a
// counted lateral, which is one) or a direct-buried pathway. A proposed pole line, cable tray
// or utility tunnel is built otherwise (NewPathway), and is no new buried work (no locates bid
// item per new buried metre, no turf to restore).
func Dug(typ string) bool { return typ == geo.TypeDuct || typ == geo.TypeBuried }

// newPathwayItems are the bill's lines of NewPathway, by pathway type.
var newPathwayItems = map[string]string{
	geo.TypeAerial: "new pole line: poles, guys and anchors, messenger strand, lashing",
	geo.TypeTray:   "new cable tray with its supports",
	geo.TypeTunnel: "new utility tunnel",
}

// NewPathway is metres of a proposed pathway of type typ that is not dug (Dug): a pole line,
// a cable tray or a utility tunnel, each priced per metre at new_pathway_per_m by its type
// (media.PriceNewPathway; a book without the type's price stops the plan, naming the key).
// README, "Pathway types".
func NewPathway(typ string, metres float64) media.Quantity {
	item, ok := newPathwayItems[typ]
	if !ok {
		item = "new " + typ + " pathway"
	}
	return media.Quantity{Category: media.CategoryConstruction, Item: item, Unit: media.UnitM, Amount: metres,
		Price: media.PriceKey{Item: media.PriceNewPathway, Name: typ}}
}

// NewBuriedM is the metres of new buried work (the bid items' per_m_new_buried basis) that
// opening span sp takes: its length when it is dug (Dug), else none.
func NewBuriedM(sp *geo.Span) float64 {
	if !Dug(sp.Type) {
		return 0
	}
	return sp.LengthM
}

// MethodOf is how new work along a span is built, the one decision of it: a pathway that is
// not dug (Dug: aerial, tray, tunnel) is built as its type, whatever the campus's method;
// else the campus's method when it gives one; otherwise, when the price book prices both,
// the cheaper per metre of trench with the restoration of the span's surface and directional
// bore (trench on a tie); otherwise trench. The optimizer's problem and the bill both ask
// here, so they build the same way. A span where nothing may be built (geo.MethodNone) gets
// no new work from either; asked of one, MethodOf answers as for a span without a method.
func MethodOf(p *media.PriceBook, d plan.Design, sp *geo.Span) string {
	if !Dug(sp.Type) {
		return sp.Type
	}
	if sp.MethodSet && sp.Method != geo.MethodNone {
		return sp.Method
	}
	perM := func(qs ...media.Quantity) (float64, bool) {
		var c float64
		for _, q := range qs {
			u, ok := p.UnitCents(q)
			if !ok {
				return 0, false
			}
			c += u
		}
		return c, true
	}
	trench, okT := perM(Trench(SurfaceOf(d, sp), 1)...)
	bore, okB := perM(Bore(1))
	if okT && okB && bore < trench {
		return geo.MethodBore
	}
	if !okT && okB && sp.Method == geo.MethodBore {
		return geo.MethodBore
	}
	return geo.MethodTrench
}

// AddedDuct is metres of duct laid in new work.
func AddedDuct(metres float64) media.Quantity {
	return media.Quantity{Category: media.CategoryConstruction, Item: "added duct", Unit: media.UnitM, Amount: metres,
		Price: media.PriceKey{Item: media.PriceAddedDuct}}
}

// JoinHandholes is n handholes where new pathway joins the network. The plan adds at most
// one handhole at a junction, whatever its reasons (new pathway joins, a lateral taps a duct,
// a route turns): each junction is counted under the first of them (routing.Handhole.Purpose),
// and the optimizer prices a junction's handhole with this item (package routing, problem).
func JoinHandholes(n int) media.Quantity {
	return media.Quantity{Category: media.CategoryConstruction, Item: "handhole where new pathway joins the network",
		Unit: media.UnitEach, Amount: float64(n), Price: media.PriceKey{Item: media.PriceStructure, Name: geo.StructureHandhole}}
}

// NewDucts is how many ducts new construction of a duct pathway is laid with at least: the
// design's (plan.Design.NewDucts), at least one. An opened duct span is built to size: it
// gets as many more as its cables need, packed by install.Load.Takes (NFPA 70 Chapter 9
// Table 1 fill and its jam band, at most 3 loose cables a duct: the rule the fill rows
// check), each an AddedDuct in the same
// trench; a trench beside a full duct gets the ducts its cables need or these, whichever is
// more. The optimizer decides both counts (optimize.Edge.LaidDucts) and prices each duct with
// AddedDuct, and the bill lays what it decided (routing.SegmentFill.AddedDucts). A counted
// lateral has no duct size to pack by: it gets these.
func NewDucts(d plan.Design) int { return max(d.NewDucts, 1) }

// Opening is what opening a proposed span built by method takes: its new work, and the
// design's ducts (NewDucts) when it is a duct. The ducts its cables need beyond those are
// AddedDuct each, priced by the optimizer and laid by the bill alike (NewDucts). The handholes along
// its run are RunHandholes; those where it joins the network are charges of their junctions,
// paid once however many opened spans meet there (package routing, layout).
func Opening(d plan.Design, sp *geo.Span, method string) []media.Quantity {
	q := NewWork(d, sp, method, sp.LengthM)
	if sp.Type == geo.TypeDuct {
		q = append(q, AddedDuct(float64(NewDucts(d))*sp.LengthM))
	}
	return q
}

// RunHandholes is n handholes placed along new construction so that no pull section is
// longer or bends more than the design allows (site.NewRuns).
func RunHandholes(n int) media.Quantity {
	return media.Quantity{Category: media.CategoryConstruction, Item: "handhole along new construction",
		Unit: media.UnitEach, Amount: float64(n), Price: media.PriceKey{Item: media.PriceStructure, Name: geo.StructureHandhole}}
}

// Entrance is what a building entrance a plan uses takes: its entry, and, when the campus
// reaches it by a counted lateral of lateralM metres (no pathway drawn), that lateral built as
// new construction is: trench or bore, restoration of the design's assumed surface, the
// design's ducts. Cables in the lateral are pulled in duct (LegEnds). When the lateral taps
// the side of a duct (site.Site.TapOf), the handhole built there (TapHandholes) is not the
// entrance's but its junction's: one per junction, whatever else the plan adds it for (a
// route turning there, new pathway joining there, another lateral tapping there; package
// routing, layout, and README "One cost model"); a crew still sets up a pull at it and enters
// it, per cable (TapCrew).
//
// The entry is the one decision of what a wall costs (README, "Building entry"): a new one
// (wall penetration, sleeve or entrance conduit, firestop) at building_entrance_each; one that
// is there already (geo.Entry.Built: an existing pathway meets the wall, no proposed one)
// needs only the cables firestopped through its sleeve, at entrance_firestop_each, or at
// building_entrance_each when the book has no such price (the dearer, rather than nothing).
// A book with neither still gets the entry, at the price it leaves out (media.PriceBook.NotPriced):
// the bill lists it with no price.
//
// A lateral that leaves a pole line (poleRiser, geo.Entry.PoleRiser) also takes its riser down
// the pole (PoleRisers).
func Entrance(p *media.PriceBook, d plan.Design, lateralM float64, built, poleRiser bool) []media.Quantity {
	firestop, entrance := media.PriceKey{Item: media.PriceFirestop}, media.PriceKey{Item: media.PriceEntrance}
	var q []media.Quantity
	if built && (!p.NotPriced(firestop) || p.NotPriced(entrance)) {
		q = append(q, media.Quantity{Category: media.CategoryConstruction, Item: "building entrance already there: firestop through its sleeve",
			Unit: media.UnitEach, Amount: 1, Price: firestop})
	} else {
		q = append(q, media.Quantity{Category: media.CategoryConstruction, Item: "building entrance: penetration, sleeve, firestop",
			Unit: media.UnitEach, Amount: 1, Price: entrance})
	}
	if lateralM > 0 {
		lat := &geo.Span{Type: geo.TypeDuct, LengthM: lateralM}
		q = append(q, Opening(d, lat, MethodOf(p, d, lat))...)
		if poleRiser {
			q = append(q, PoleRisers(1)...)
		}
	}
	return q
}

// PoleRiserItem is the bill's line of PoleRisers.
const PoleRiserItem = "riser down a pole for a lateral: conduit and guard from the strand into the handhole at its foot"

// PoleRisers is what n counted laterals that leave a pole line take on the pole: the cable
// comes down it from the strand in a riser conduit with its guard, fastened to the pole, into
// the handhole at its foot (README, "Pathway types"; the pole owner's attachment rules and
// NFPA 70 for the conduit where they apply; common practice, no published source, for one
// riser per lateral), at the optional pole_riser_each, or listed not priced without it
// (media.PriceBook.NotPriced). The optimizer pays it with the entrance (Entrance), the bill
// from the entrances used (package estimate).
func PoleRisers(n int) []media.Quantity {
	if n <= 0 {
		return nil
	}
	return []media.Quantity{{Category: media.CategoryConstruction, Item: PoleRiserItem,
		Unit: media.UnitEach, Amount: float64(n), Price: media.PriceKey{Item: media.PricePoleRiser}}}
}

// TapHandholeItem is the bill's line of TapHandholes.
const TapHandholeItem = "handhole where a lateral taps a duct or a pole line"

// TapHandholes is n handholes built where a counted lateral taps the side of a duct, or
// comes down a pole into the handhole at its foot (site.Site.Tap), priced as the other handholes the plan adds; a junction is counted once,
// under the first of its reasons (routing.Handhole.Purpose).
func TapHandholes(n int) media.Quantity {
	return media.Quantity{Category: media.CategoryConstruction, Item: TapHandholeItem,
		Unit: media.UnitEach, Amount: float64(n), Price: media.PriceKey{Item: media.PriceStructure, Name: geo.StructureHandhole}}
}

// TapCrew is the crew labour one cable takes at a lateral's tap handhole: a pull set-up (the
// lateral is a pull of its own) and an entry, as at a handhole where a route turns.
func TapCrew(p *media.PriceBook) []media.Quantity { return AtJunctions(p, 1, 1) }

// Crew is amount of a crew task (media.CrewTasks) when the book prices crews (crew_each), else
// nothing (media.Crew, the one list of crew items, which the transitions' items read too).
func Crew(p *media.PriceBook, task string, amount float64) []media.Quantity {
	return media.Crew(p, task, amount)
}

// BidPer is what the book's bid items priced per unit of a route-dependent basis take for the
// amounts in bases (media.PriceBook.BidQuantities): new buried metres, structures passed per
// cable, cable ends and legs. The optimizer prices these with a route; the bill prices the
// plan's totals of the same bases (package estimate, bidBases). Lump sums, percentages and the
// per-span-once bases (aerial metres, existing duct metres) and buildings served are not
// priced per route (README, "One cost model").
func BidPer(p *media.PriceBook, bases media.BidBases) []media.Quantity {
	if len(p.BidItems) == 0 {
		return nil
	}
	var out []media.Quantity
	qs := p.BidQuantities(media.BidBases{NewBuriedM: bases.NewBuriedM, Structures: bases.Structures,
		CableEnds: bases.CableEnds, Legs: bases.Legs})
	for i, it := range nonPercent(p) {
		switch it.Basis {
		case media.BasisNewBuriedM, media.BasisStructure, media.BasisCableEnd, media.BasisLeg:
			if qs[i].Amount != 0 {
				out = append(out, qs[i])
			}
		}
	}
	return out
}

// nonPercent lists the book's bid items BidQuantities lists, in its order.
func nonPercent(p *media.PriceBook) []media.BidItem {
	var out []media.BidItem
	for _, it := range p.BidItems {
		if it.Basis != media.BasisPercentOf {
			out = append(out, it)
		}
	}
	return out
}

// PullPoint reports whether a cable's pull breaks at junction j: a structure (site.IsStructure)
// splits a pull into sections, each set up on its own (media.CrewPullSetup). Handholes the
// plan adds along new construction, where a route turns and where new pathway joins the
// network (JoinEnds) are pull points too. A pole where only aerial spans meet, or a point
// where only tunnels and trays meet (geo.Meeting.Open), is none: the cable is placed along the
// strand or racks through it, turned there with corner hardware, with no set-up of its own
// (common practice, no published source).
func PullPoint(s *site.Site, j string) bool { return s.IsStructure(j) }

// JoinEnds counts the ends of span sp where a route along it passes a handhole the plan adds
// because new pathway joins the network there (site.JoinsNetwork): the ends of a proposed
// span at such junctions. A leg passes each such handhole once, whichever way it comes and
// goes (routing's passesOf): a pull point, a handhole entered, a slack loop. The optimizer
// prices half a pass at each such end of a span, so that a route from one new span into
// another pays one; a route from the network into a new span pays the other half in the
// plan's evaluation (routing's passGapCents) or, where it turns there, on the turn edge
// (routing's turnShare). A route that turns into or out of it there lists no turn
// (routing.Leg.Turns).
func JoinEnds(s *site.Site, sp *geo.Span) float64 {
	n := 0.0
	for _, j := range []string{sp.From, sp.To} {
		if JoinEnd(s, sp, j) {
			n++
		}
	}
	return n
}

// JoinEnd reports whether span sp's end at junction j is one of JoinEnds: a new span's end
// where it joins the network.
func JoinEnd(s *site.Site, sp *geo.Span, j string) bool {
	return sp.Status == geo.StatusProposed && s.JoinsNetwork(j)
}

// Entered reports whether a crew enters junction j to pass a cable through it: a maintenance
// hole or handhole (site.LoopStructure), as for slack loops.
func Entered(s *site.Site, j string) bool { return s.LoopStructure(j) }

// AtJunctions is the crew labour one cable takes at junctions: share of a pull set-up at each
// of pullPoints, and share of a structure entry at each of entered (a share of ½ at each end
// of a span, so that a route passing a junction pays one whole).
func AtJunctions(p *media.PriceBook, pullPoints, entered float64) []media.Quantity {
	return append(Crew(p, media.CrewPullSetup, pullPoints), Crew(p, media.CrewStructureEntry, entered)...)
}

// TurnHandholes is n handholes or pull boxes added where a route turns from one pathway into
// another at a junction without a structure (common practice, no published source: a cable
// leaves one duct for another only where someone can reach in; TIA-569's pull point after at
// most two 90° bends of conduit is the related published rule, from memory), counted once per
// junction as JoinHandholes says.
func TurnHandholes(n int) media.Quantity {
	return media.Quantity{Category: media.CategoryConstruction, Item: "handhole where a route turns between pathways",
		Unit: media.UnitEach, Amount: float64(n), Price: media.PriceKey{Item: media.PriceStructure, Name: geo.StructureHandhole}}
}

// SurfaceOf is the surface priced for new work on a span: its own, else the design's
// assumed_surface (SurfaceAssumed). A trench beside an existing duct is dug in the existing
// pathway's surface when the campus gives one; a counted lateral has none of its own.
func SurfaceOf(d plan.Design, sp *geo.Span) string {
	if sp.Surface != "" {
		return sp.Surface
	}
	if d.AssumedSurface != "" {
		return d.AssumedSurface
	}
	return plan.Default.Design.AssumedSurface // a Design built in code, not read from a plan
}

// SurfaceAssumed reports whether new work on span sp built by method is priced on an assumed
// surface (SurfaceOf): a trench along a span the campus gives no surface. A bore restores
// no surface, nor does a pathway built new that is not dug (NewPathway).
func SurfaceAssumed(sp *geo.Span, method string) bool {
	return method == geo.MethodTrench && sp.Surface == ""
}

// KeysOf lists the prices and rates quantities need.
func KeysOf(qs []media.Quantity) []media.PriceKey {
	var keys []media.PriceKey
	for _, q := range qs {
		keys = append(keys, q.Price)
		if q.Rate.Item != "" {
			keys = append(keys, q.Rate)
		}
	}
	return keys
}

// LoopM is the slack loop one cable leaves at junction id: design.slack_loop_structure_m at a
// maintenance hole or handhole, else none.
func LoopM(s *site.Site, d plan.Design, id string) float64 {
	if s.LoopStructure(id) {
		return d.SlackLoopStructureM
	}
	return 0
}

// wasted is metres of cable with the design's waste.
func Wasted(d plan.Design, metres float64) float64 { return metres * (1 + d.WastePct/100) }

// AddedDuctWalls counts the building walls a duct added beside existing span sp enters: the
// span's ends at entrances there already (geo.Entry.Built; builtAt is
// site.Site.BuiltEntriesAt). The full duct went through the wall by a sleeve of its own; the
// new duct beside it cannot use that sleeve and needs its own penetration (AddedDuctEntrances),
// while an entrance that is new is priced a penetration anyway (Entrance).
func AddedDuctWalls(builtAt map[string]int, sp *geo.Span) int {
	return builtAt[sp.From] + builtAt[sp.To]
}

// AddedDuctEntrances is what ducts added beside full ones take where they enter buildings
// through n walls an existing pathway already enters (AddedDuctWalls): a new penetration,
// sleeve and firestop at each (one for the ducts a trench adds, however many, as the trench
// is one), priced as a new building entrance (building_entrance_each; README, "Building
// entry"). A book without that price leaves it unpriced, as Entrance does.
func AddedDuctEntrances(p *media.PriceBook, n int) []media.Quantity {
	if n <= 0 {
		return nil
	}
	return []media.Quantity{{Category: media.CategoryConstruction, Item: "building entrance for a duct added beside a full one: penetration, sleeve, firestop",
		Unit: media.UnitEach, Amount: float64(n), Price: media.PriceKey{Item: media.PriceEntrance}}}
}

// HoleWalls counts the walls of existing maintenance holes that new duct along span sp enters:
// the span's ends at a maintenance hole of the campus (every structure the campus draws is
// there already), for a proposed span opened (its ducts) or a trench beside a full existing
// one (the ducts it adds). A handhole or pull box is taken to have knockouts or an open bottom
// for a new duct (common practice, no published source), so only a maintenance hole counts.
func HoleWalls(s *site.Site, sp *geo.Span) int { return len(HolesEntered(s, sp)) }

// HolesEntered is the maintenance holes whose walls new duct along span sp enters (HoleWalls
// counts them), by junction ID, from end first: where the bill's entries are made, which the
// structures table names.
func HolesEntered(s *site.Site, sp *geo.Span) []string {
	var out []string
	for _, j := range []string{sp.From, sp.To} {
		if jn, ok := s.Net.Junction(j); ok && jn.Kind == geo.JunctionStructure && jn.StructureType == geo.StructureMaintenanceHole {
			out = append(out, j)
		}
	}
	return out
}

// HoleEntryItem is the bill item of new duct, or cable buried in a new trench, entering an
// existing maintenance hole.
const HoleEntryItem = "maintenance hole entry for new duct or buried cable: wall penetration, duct terminators or sleeve, seal"

// EntersHoles reports whether new work of pathway type typ (an opened proposed span) enters
// the existing maintenance holes at its ends through their walls (HoleWalls): new duct, and a
// new trench's direct-buried cable, which needs a sleeve through the wall and a seal as duct
// needs its terminators (tester 9's finding 1; common practice, no published source).
func EntersHoles(typ string) bool { return typ == geo.TypeDuct || typ == geo.TypeBuried }

// HoleEntries is what new duct takes where it enters existing maintenance holes through n
// walls (HoleWalls): breaking into the wall (core drill, or a knockout where the hole has one),
// the duct terminators (end bells) and sealing, one for the ducts a trench lays, however many,
// as the trench is one (common practice, no published source; tester 8's finding 13), at the
// optional maintenance_hole_entry_each, or not priced without it (media.PriceBook.NotPriced).
// The optimizer pays it with the opening or the trench beside a full duct (package routing),
// the bill from the span (package estimate).
func HoleEntries(n int) []media.Quantity {
	if n <= 0 {
		return nil
	}
	return []media.Quantity{{Category: media.CategoryConstruction, Item: HoleEntryItem,
		Unit: media.UnitEach, Amount: float64(n), Price: media.PriceKey{Item: media.PriceHoleWall}}}
}

// Times is qs with every amount multiplied by n: the items of one cable for n cables, or of
// one unit of a base for n units.
func Times(n float64, qs ...media.Quantity) []media.Quantity {
	out := make([]media.Quantity, len(qs))
	for i, q := range qs {
		q.Amount *= n
		out[i] = q
	}
	return out
}
