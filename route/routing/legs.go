package routing

import (
	"fmt"
	"slices"
	"sort"
	"strconv"
	"strings"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/route/items"
	"spanwright/route/optimize"
	"spanwright/route/site"
)

// Leg names.
const (
	LegPrimary = "primary"
	LegDiverse = "diverse"
)

// PrimaryInfeasible is the reason of a diverse leg whose primary is infeasible.
const PrimaryInfeasible = "the primary leg is infeasible"

// Codes of a leg's reason made here (the media engine's are media.Code*): at most 10
// characters, stable.
const (
	CodeNoRoute   = "NO-ROUTE"   // the optimizer found no route a medium can carry
	CodeExcluded  = "EXCLUDED"   // every medium was left out before routing
	CodePrimary   = "PRIMARY"    // a diverse leg not planned because its primary is infeasible
	CodeNoDiverse = "NO-DIVERSE" // no second route independent of the primary
	CodeSharedPt  = "SPOF"       // a feasible diverse leg that shares a single point of failure with its primary
)

// Leg is one routed cable of a link: the primary, or the diverse second route.
type Leg struct {
	Link     *site.Link
	Name     string     // LegPrimary or LegDiverse
	Steps    []geo.Step // spans from the served building's access junction to the cross-connect's
	Pathways []string   // pathway IDs in travel order, each once
	RouteM   float64    // along pathways, laterals at both ends included, in metres
	LateralM float64    // the laterals alone, in metres
	// RiserM is the risers at both ends, in metres: the buildings' (riser_m) and, where a
	// counted lateral leaves a pole line, the riser down the pole (PoleRiserM of it).
	RiserM     float64
	PoleRiserM float64 // the part of RiserM down poles (items.PoleRiserM), outdoors
	// Outdoor is whether the route leaves the buildings (a span other than a tray, or a
	// lateral; media.Link.Outdoor): its cable then enters both end buildings from outside.
	Outdoor  bool
	Feasible bool
	Reason   string // why the leg is infeasible, or notes
	// ReasonCode is the short stable code of why the leg is infeasible, or of how its medium
	// was chosen (a media.Code* or Code* constant), set where the reason is made.
	ReasonCode string

	// EntranceTo and EntranceFrom are the entrances (geo.Entry IDs) the leg uses at the
	// served building (Link.To) and at the cross-connect (Link.From).
	EntranceTo, EntranceFrom string
	// Crosses lists, in travel order, the buildings the route passes through (in at one of
	// their entrances and out at another), which the campus allows (geo.Transit), and those
	// it passes beneath in a duct drawn across them (geo.Span.Beneath).
	Crosses []string
	// Turns lists, in travel order, the junctions where the route turns from one pathway into
	// another at a handhole or pull box the plan adds (geo.PassNeedsStructure: never on a pole
	// or a rack, geo.PassOpen, where it turns with nothing built); not where it
	// turns into or out of new pathway that joins the network there, whose handhole that is
	// (items.JoinEnds; layout.turnsListed).
	Turns []string

	// The medium decision, filled by the media rule engine.
	Medium       string // catalog medium id, e.g. "os2"; "" when infeasible
	Application  string // IEEE 802.3 PHY, e.g. "10GBASE-LR"
	Construction string // cable construction id
	Inside       string // with an entrance transition: the listed construction spliced on at the entrances of InsideAt; "" without
	// InsideAt is, with an entrance transition, its ends: media.EndA the served building
	// (Link.To), media.EndB the cross-connect's (Link.From), or both (TransitionAt names them).
	InsideAt media.Ends
	// StrandsCable is the strands of the cable installed, after growth and rounding to a
	// cable size; on a feasible copper leg its pairs instead, PairsPerCable per 4-pair cable
	// (an infeasible leg keeps the strands asked, rounded as fibre).
	StrandsCable  int
	Losses        []media.Loss // per wavelength, fibre only
	WorstMarginDB float64      // smallest loss margin over the operating wavelengths; 0 for copper
	Choice        string       // the rule engine's reason for the medium
	Rejected      []media.Rejection

	// Cable is the leg's cable takeoff: slack loops, length bought, reels and the mid-span
	// splices between them, which the loss budget counts (see CableTakeoff).
	Cable CableTakeoff

	// CrossingAvoidedCents is, on a diverse leg, what keeping the link's two legs off a
	// junction drawn as several nodes (ducts crossing with no structure), which a cheaper pair
	// would share, costs by the optimizer's objective (optimize.Route.CrossingAvoidedCents);
	// 0 on a primary leg and when no cheaper pair would share one.
	CrossingAvoidedCents int64

	// Option is the optimizer's option the leg was routed in (optimize.Option.Name: its
	// medium, and how it priced the cable when the medium has several; routing's optionName).
	Option string

	// Attenuators is the bill item of the attenuators a receiver needs on a channel below
	// its application's least loss (receiver overload); empty when none.
	Attenuators []media.Quantity

	Cost LegCost

	// facts are the facts its medium was judged on (fillLeg), its own cable's slack and
	// joins in them; the zero Link on a leg with no route.
	facts media.Link
}

// LegCost breaks down what one leg costs, in integer cents of the price book's currency: its
// bill items (estimate's legItems) priced one by one, and its share of new construction. The
// four parts are links.csv's cost columns; README ("links.csv") maps them onto the bill's
// categories.
type LegCost struct {
	CableCents  int64 // bill material: cable, entrance transition enclosures, mid-span closures, their splice trays, attenuators, the bonding of metallic members
	LabourCents int64 // bill labour: pulls, splicing, terminating, testing, crew tasks
	// ConstructionCents is its innerduct (bill material) and its share of new construction as
	// the optimizer prices it (bill construction: trench, added duct, handholes, entrances),
	// with the bid items per metre of new buried work the optimizer prices with the trench.
	ConstructionCents int64
	OpticsCents       int64 // terminations, patch cords and primary protectors (bill material), transceivers (bill optics)
}

// TotalCents is the sum of the breakdown.
func (c LegCost) TotalCents() int64 {
	return c.CableCents + c.LabourCents + c.ConstructionCents + c.OpticsCents
}

// legsOf turns the optimizer's route of one link into its legs, with media and costs.
func legsOf(s *site.Site, cm *Model, lay *layout, prob *optimize.Problem, rt *optimize.Route, l *site.Link, info demandInfo, why string, built builtOn) []Leg {
	from, to := lay.endEntry[l.To], lay.endEntry[l.From]
	pole := items.PoleRiserM(cm.design, from.LateralM, from.PoleRiser) + items.PoleRiserM(cm.design, to.LateralM, to.PoleRiser)
	base := Leg{Link: l, RiserM: info.facts.RiserM, PoleRiserM: pole, LateralM: from.LateralM + to.LateralM, StrandsCable: info.strands}
	primary := base
	primary.Name = LegPrimary
	if !rt.Feasible {
		primary.Reason, primary.ReasonCode = why, CodeNoRoute
		if primary.Reason == "" {
			primary.Reason = "no route and medium satisfy the rules"
		}
		switch {
		case len(info.options) == 0 && len(info.excluded) > 0:
			// Nothing was routed: the optimizer's reason would only restate that.
			primary.Reason, primary.ReasonCode = strings.Join(info.excluded, "; "), CodeExcluded
		case len(info.excluded) > 0:
			primary.Reason += "; before routing: " + strings.Join(info.excluded, "; ")
		}
		legs := []Leg{primary}
		if l.Diverse {
			d := base
			d.Name, d.Reason, d.ReasonCode = LegDiverse, PrimaryInfeasible, CodePrimary
			legs = append(legs, d)
		}
		return legs
	}
	fillLeg(s, cm, lay, &primary, rt.Primary, rt.Medium, info, built)
	// Each leg's share of new trench, added duct and handholes is set once every leg is
	// routed (shareConstruction).
	legs := []Leg{primary}
	if l.Diverse {
		d := base
		d.Name = LegDiverse
		if len(rt.Secondary.Hops) > 0 {
			fillLeg(s, cm, lay, &d, rt.Secondary, rt.Medium, info, built)
			// Both legs leave a building with one entrance by it: diverse outside, not there.
			for _, b := range []string{l.To, l.From} {
				if w, one := stemOf(lay, prob, b); one && d.Feasible {
					d.Choice += fmt.Sprintf("; both legs use %s, a single point of failure: %s", w.text(s, lay),
						secondEntrance(s, lay, w, cm.design.MaxLateralM, cm.design.AllowNewTrench))
					d.ReasonCode = CodeSharedPt
				}
			}
			// The optimizer keeps the legs off each other's nodes; a junction drawn as several
			// nodes (runs of duct crossing with no structure) may still be on both.
			if shared := sharedJunctions(s, &primary, &d); len(shared) > 0 && d.Feasible {
				d.Choice += fmt.Sprintf("; both legs pass junction %s, where their ducts cross with no structure: a single point of failure", strings.Join(shared, ", "))
				d.ReasonCode = CodeSharedPt
			} else if rt.CrossingAvoidedCents > 0 && d.Feasible {
				d.CrossingAvoidedCents = rt.CrossingAvoidedCents
				d.Choice += "; the legs are kept off a junction where ducts cross with no structure, which a cheaper pair would share"
			}
		} else {
			why := onlyWayIn(s, cm, lay, prob, l, rt.SinglePoint)
			if why == "" {
				why = singlePoint(s, lay, prob, rt.SinglePoint, rt.Note)
			}
			d.Reason, d.ReasonCode = NoDiverseRoute+why, CodeNoDiverse
		}
		legs = append(legs, d)
	}
	return legs
}

// isTurn reports whether edge e of the layout of a network of spans spans is a turn edge.
func isTurn(lay *layout, spans, e int) bool {
	x, ok := lay.isExtra(spans, e)
	return ok && x.kind == edgeTurn
}

// fillLeg sets a leg's route and its medium from the rule engine on the route's own facts;
// the estimate prices it (package estimate). option is the optimizer's option the route is
// for (optionName). built is where the plan builds handholes (passesOf).
func fillLeg(s *site.Site, cm *Model, lay *layout, leg *Leg, ol optimize.Leg, option string, info demandInfo, built builtOn) {
	leg.Option = option
	if e, ok := lay.endEntry[leg.Link.To]; ok {
		leg.EntranceTo = e.ID
	}
	if e, ok := lay.endEntry[leg.Link.From]; ok {
		leg.EntranceFrom = e.ID
	}
	// The lateral at an end with one entrance is the demand's; those of entrance edges are
	// added as the route takes them.
	for _, h := range ol.Hops {
		if x, ok := lay.isExtra(len(s.Net.Spans), h.Edge); ok && x.kind == edgeEntrance {
			leg.LateralM += x.entry.LateralM
			pole := items.PoleRiserM(cm.design, x.entry.LateralM, x.entry.PoleRiser)
			leg.RiserM += pole
			leg.PoleRiserM += pole
			switch x.building {
			case leg.Link.To:
				leg.EntranceTo = x.entry.ID
			case leg.Link.From:
				leg.EntranceFrom = x.entry.ID
			}
		}
	}
	leg.RouteM = leg.LateralM
	emi := geo.EMINone
	var emiSpans []string // the spans at emi, in travel order
	outdoor := leg.LateralM > 0
	plenum := false
	types := map[string]bool{}
	seen := map[string]bool{}
	var pass []int // the nodes of the turn edges the route is passing, in travel order
	for k, h := range ol.Hops {
		x, extra := lay.isExtra(len(s.Net.Spans), h.Edge)
		if extra && x.kind == edgeTurn {
			from, to := x.from, x.to
			if !h.Forward {
				from, to = to, from
			}
			if len(pass) == 0 {
				pass = append(pass, from)
			}
			pass = append(pass, to)
			if k+1 == len(ol.Hops) || !isTurn(lay, len(s.Net.Spans), ol.Hops[k+1].Edge) {
				for range lay.turnsListed(pass) {
					leg.Turns = append(leg.Turns, x.junction)
				}
				pass = pass[:0]
			}
			continue
		}
		if extra {
			continue
		}
		sp := &s.Net.Spans[h.Edge]
		// The buildings the span runs beneath wall to wall (geo.Span.Beneath), or, a tunnel or
		// tray, across inside them (geo.Span.Through), in travel order.
		beneath := sp.Beneath
		for _, c := range sp.Through {
			beneath = append(slices.Clip(beneath), c.Building)
		}
		if !h.Forward && len(beneath) > 1 {
			beneath = slices.Clone(beneath)
			slices.Reverse(beneath)
		}
		leg.crossing(beneath)
		if k+1 < len(ol.Hops) {
			// The junction the route passes after this span: in a building other than the
			// leg's own, the route crosses that building (allowed there, or it would not pass).
			j := sp.To
			if !h.Forward {
				j = sp.From
			}
			if m, ok := s.Net.MeetingAt(j); ok {
				leg.crossing(m.Buildings)
			}
		}
		leg.Steps = append(leg.Steps, geo.Step{SpanID: sp.ID, Reverse: !h.Forward})
		leg.RouteM += sp.LengthM
		if !seen[sp.PathwayID] {
			seen[sp.PathwayID] = true
			leg.Pathways = append(leg.Pathways, sp.PathwayID)
		}
		types[sp.Type] = true
		plenum = plenum || sp.Plenum
		if sp.Type != geo.TypeTray {
			outdoor = true
		}
		if emiRank[sp.EMI] > emiRank[emi] {
			emi, emiSpans = sp.EMI, emiSpans[:0]
		}
		if sp.EMI == emi && emi != geo.EMINone && !slices.Contains(emiSpans, sp.ID) {
			emiSpans = append(emiSpans, sp.ID)
		}
	}
	facts := info.facts
	facts.RouteM, facts.RiserM = leg.RouteM, leg.RiserM
	// The spans of the route drawn inside an end's building are inside it too, and so is the
	// route from that end back to where it crosses the building's wall.
	// (The demand counted the stretch every route takes, endIndoorM: the route's own replaces it.)
	facts.InsideAM += interiorM(s, leg.Link.To, ol) + indoorM(s, leg.Link.To, ol, true) - info.indoorTo
	facts.InsideBM += interiorM(s, leg.Link.From, ol) + indoorM(s, leg.Link.From, ol, false) - info.indoorFrom
	// Inside a building the route passes through: its longest run inside it (crossedM; NFPA
	// 70 770.48(A) counts from the wall where the cable enters it; the rule through-15m), each
	// building once however often it is crossed.
	for _, b := range slices.Compact(slices.Sorted(slices.Values(leg.Crosses))) {
		in := crossedM(s, b, ol)
		facts.CrossedInsideM += in
		if in > facts.CrossedInsideMaxM {
			facts.CrossedInsideMaxM, facts.CrossedBuilding = in, b
		}
	}
	facts.MaxEMI, facts.EMISpans = emi, spansText(emiSpans)
	facts.Outdoor, leg.Outdoor = outdoor, outdoor
	facts.Plenum = plenum
	for t := range types {
		facts.PathwayTypes = append(facts.PathwayTypes, t)
	}
	sort.Strings(facts.PathwayTypes)
	// The installation's slack loops, reel joins and their splicing slack go into the loss
	// budget, the slack as the entrances' coils do (media.Link.SlackM).
	leg.Cable = takeoff(s, cm.design, leg, built)
	splices := facts.Splices
	withCable := func(f media.Link, t CableTakeoff) media.Link {
		f.SlackM, f.Splices = t.SlackM(), splices+t.Joins
		return f
	}
	d := cm.design
	// The joins are placed over the cable a laying buys from reels: the whole cable, or with an
	// entrance transition the outside-plant cable between its splices (the inside pieces are
	// cut from other reels), which may take fewer joins and less splicing slack. cutAt is the
	// one placement of the cable each way of laying the ends buys, with the fewest joins or
	// (fewerPoints) the fewest splice points to build: what the engine judges that laying on,
	// what its loss budget counts and what the leg buys when it is chosen.
	whole := leg.Cable // takeoff's: the whole cable, the fewest joins
	cutAt := func(at media.Ends, fewerPoints bool) CableTakeoff {
		if at == media.EndsNone && !fewerPoints {
			return whole
		}
		insideAM, insideBM := facts.InsideAM, facts.InsideBM
		if !at.Has(media.EndA) {
			insideAM = 0
		}
		if !at.Has(media.EndB) {
			insideBM = 0
		}
		return whole.cut(d, insideAM, insideBM, fewerPoints)
	}
	// Each way of laying the ends is judged on its own cut, and the engine ranks them all in
	// its own order (media.Engine.ChooseOwn: review 15 F0, F1, review 16 F1: a laying judged on
	// another cut's joins or slack was reported on a budget not its cable's, or refused where
	// its own cable closes). With none feasible, the reason is the whole cable's.
	var cuts [media.EndsBoth + 1]CableTakeoff
	ch := cm.eng.ChooseOwn(facts, func(at media.Ends) media.OwnCable {
		cuts[at] = cutAt(at, false)
		f := withCable(facts, cuts[at])
		return media.OwnCable{SlackM: f.SlackM, Splices: f.Splices}
	})
	leg.Cable = cuts[ch.InsideAt]
	facts = withCable(facts, leg.Cable)
	leg.facts = facts
	leg.Rejected = ch.Rejected
	leg.Choice, leg.ReasonCode = ch.Reason, ch.Code
	if !ch.Feasible {
		leg.Reason = ch.Reason
		return
	}
	leg.Feasible = true
	// The fewest splice points to build may take more joins than the fewest joins: that
	// placement is kept when it costs less (joinsCents,
	// with the chosen cable; without splice_point_each, which the bill then leaves out of its
	// total, a splice point is never traded for joins: the fewer splice points are kept) and
	// the chosen laying closes on it.
	if leg.Cable.SplicePoints() > 0 { // with none there is nothing to spare
		_, pointPriced := cm.prices.Price(media.PriceKey{Item: media.PriceSplicePoint})
		if alt := cutAt(ch.InsideAt, true); alt.Joins > leg.Cable.Joins && alt.SplicePoints() < leg.Cable.SplicePoints() &&
			(!pointPriced || cm.joinsCents(alt, ch, s.Net) < cm.joinsCents(leg.Cable, ch, s.Net)) {
			// The chosen laying alone is judged on that placement (review 16 F7: no other laying
			// is weighed on a count of joins not its own); its reason is its own there, and how
			// it was chosen a note.
			f := withCable(facts, alt)
			if again := cm.eng.ChooseLaid(f, ch.Medium, media.Laying{Construction: ch.Construction, Inside: ch.Inside, At: ch.InsideAt}); again.Feasible {
				again.Rejected, again.Code = ch.Rejected, ch.Code
				again.Reason = fmt.Sprintf("%s; chosen as %s on its fewest joins (%d), laid on %d for fewer splice points to build (%d, not %d)",
					again.Reason, media.Verdict(ch.Code), leg.Cable.Joins, alt.Joins, alt.SplicePoints(), leg.Cable.SplicePoints())
				ch, leg.Cable, leg.facts = again, alt, f
				leg.Rejected, leg.Choice, leg.ReasonCode = ch.Rejected, ch.Reason, ch.Code
			}
		}
	}
	leg.Cable.Fit(ch, cm.design.WastePct)
	if m := cm.eng.Catalog().Medium(ch.Medium); m != nil && !m.Fibre() {
		// Copper counts pairs, four to each 4-pair cable, not the fibre cable size the
		// plan's strands would round up to (ANSI/TIA-568.2: a 4-pair cable serves one port).
		leg.StrandsCable = PairsPerCable * len(leg.Cable.Cables)
	}
	leg.Medium, leg.Application, leg.Construction, leg.Inside, leg.InsideAt = ch.Medium, ch.Application, ch.Construction, ch.Inside, ch.InsideAt
	leg.Losses = ch.Losses
	if q, ok := ch.AttenuatorQuantity(); ok {
		leg.Attenuators = []media.Quantity{q}
	}
	leg.WorstMarginDB = worstMargin(ch.Losses)
	if ch.Medium != optionMedium(option) {
		leg.Choice += fmt.Sprintf(" (the optimizer routed it for %s)", optionMedium(option))
	}
}

// joinsCents is what a leg's mid-span joins cost laid as ch: per join and cable its
// closure, trays and splicing (items.Join), its two cable ends prepared (crew and bid items),
// the closure installed and the splicing slack (cable with waste, pulled as duct); and each
// splice point to build (splice_point_each, 0 when the book leaves it out) with the crew's work
// there per cable (CableTakeoff.SplicePointCrew, as the bill counts it; review 15 F4). The one
// price the placements of a leg's joins are compared on (fillLeg). Common practice, no
// published source.
func (m *Model) joinsCents(t CableTakeoff, ch media.Choice, net *geo.Network) int64 {
	md := m.eng.Catalog().Medium(ch.Medium)
	if md == nil || t.Joins == 0 {
		return 0
	}
	var slackM float64 // the joins' splicing slack a cable, each join's own (joinSlackM)
	for _, p := range t.Splices {
		slackM += p.SlackM
	}
	pull, entered := t.SplicePointCrew(net) // the crew's at the splice points to build, per cable
	var cents int64
	for _, c := range ch.Cables { // each cable of the leg joined (media.Cables)
		per := slices.Concat(items.Join(m.prices, c.Count),
			items.Crew(m.prices, media.CrewCableEndPrep, 2), items.Crew(m.prices, media.CrewEnclosureInstall, 1),
			m.bidItems(media.BidBases{CableEnds: 2}))
		cents += int64(t.Joins)*m.cents(per...) + m.cents(append(items.StructureLoops(slackM),
			items.Cable(ch.Medium, ch.Construction, c.Count, md.Fibre(), items.Wasted(m.design, slackM)))...) +
			m.cents(items.AtJunctions(m.prices, pull, entered)...)
	}
	point, _ := m.prices.Price(media.PriceKey{Item: media.PriceSplicePoint})
	return cents + int64(t.SplicePoints())*point
}

var emiRank = map[string]int{geo.EMINone: 0, geo.EMILow: 1, geo.EMIHigh: 2}

// worstMargin is the smallest margin over the operating wavelengths, 0 when none.
func worstMargin(ls []media.Loss) float64 {
	w, any := 0.0, false
	for _, l := range ls {
		if !l.Operating {
			continue
		}
		if !any || l.MarginDB < w {
			w, any = l.MarginDB, true
		}
	}
	return w
}

// NoDiverseRoute begins the reason of a diverse leg that got no route of its own; what every
// route shares follows (singlePoint).
const NoDiverseRoute = "no diverse route: "

// NoDiverse lists, by index into links, the diverse links that can have no second route on
// the network as the plan may use it (optimize.NoDiversePair: proved before any search),
// each with the reason its diverse leg would carry: NoDiverseRoute and what every route
// shares, in the words the plan gives.
func NoDiverse(s *site.Site, m *Model, links []site.Link) (map[int]string, error) {
	// The problem of the diverse links alone: the network and its prices are the plan's, and
	// a demand's pair does not depend on the others.
	var diverse []site.Link
	var index []int
	for i, l := range links {
		if l.Diverse {
			diverse, index = append(diverse, l), append(index, i)
		}
	}
	if len(diverse) == 0 {
		return nil, nil
	}
	prob, lay, _, err := problem(s, m, diverse, m.runsOf(s))
	if err != nil {
		return nil, err
	}
	points, err := optimize.NoDiversePair(prob)
	if err != nil {
		return nil, fmt.Errorf("route: optimizer: %w", err)
	}
	out := make(map[int]string, len(points))
	for d, sp := range points {
		why := onlyWayIn(s, m, lay, prob, &diverse[d], &sp)
		if why == "" {
			why = singlePoint(s, lay, prob, &sp, "")
		}
		out[index[d]] = NoDiverseRoute + why
	}
	return out, nil
}

// singlePoint says in words what keeps a diverse link from two independent routes.
func singlePoint(s *site.Site, lay *layout, prob *optimize.Problem, sp *optimize.SinglePoint, note string) string {
	if sp == nil {
		if note != "" {
			return note
		}
		return "no second route found"
	}
	var what string
	switch sp.Kind {
	case optimize.PointEdge:
		switch x, extra := lay.isExtra(len(s.Net.Spans), sp.Index); {
		case !extra:
			what = fmt.Sprintf("every route uses span %s (pathway %s)", s.Net.Spans[sp.Index].ID, s.Net.Spans[sp.Index].PathwayID)
		case x.kind == edgeEntrance:
			what = fmt.Sprintf("every route uses entrance %s of building %s", x.entry.ID, x.building)
		default:
			what = fmt.Sprintf("every route turns at junction %s", x.junction)
		}
	case optimize.PointNode:
		if j := lay.junction[sp.Index]; j >= 0 {
			what = fmt.Sprintf("every route passes junction %s", s.Net.Junctions[j].ID)
		} else {
			what = fmt.Sprintf("every route passes %s", lay.name[sp.Index])
		}
	case optimize.PointGroup:
		what = fmt.Sprintf("every route found shares the shared-risk group %s", groupName(s, lay, prob, sp.Index))
	}
	if !sp.Separates && sp.Kind == optimize.PointGroup {
		what += " (a heuristic finding: group-disjoint routing is NP-hard)"
	}
	return what
}

// groupName names shared-risk group g: a group given on the campus by its name; a run of
// duct (runGroups) by its pathways and the junctions at its ends ("S between H1 and H5",
// "S1 and S2 between H1 and H5"; a run closed on itself has no ends); or the entrance whose
// edges share it.
func groupName(s *site.Site, lay *layout, prob *optimize.Problem, g int) string {
	var pathways []string
	ends := map[string]int{} // junction → span ends of the run there
	for i, e := range prob.Edges {
		if e.Group != g {
			continue
		}
		if x, extra := lay.isExtra(len(s.Net.Spans), i); extra {
			return "entrance " + x.entry.ID + " of building " + x.building
		}
		sp := &s.Net.Spans[i]
		if !lay.runGroup[i] {
			return sp.Group
		}
		if !slices.Contains(pathways, sp.PathwayID) {
			pathways = append(pathways, sp.PathwayID)
		}
		ends[sp.From]++
		ends[sp.To]++
	}
	if len(pathways) == 0 {
		return strconv.Itoa(g)
	}
	slices.Sort(pathways)
	name := strings.Join(pathways, " and ")
	if len(pathways) > 2 {
		name = strings.Join(pathways[:len(pathways)-1], ", ") + " and " + pathways[len(pathways)-1]
	}
	var at []string
	for j, n := range ends {
		if n == 1 {
			at = append(at, j)
		}
	}
	if len(at) == 2 {
		slices.Sort(at)
		name += " between " + at[0] + " and " + at[1]
	}
	return name
}

// SegmentFill is the duct fill of one span that carries cable.
type SegmentFill struct {
	Span           string
	PathwayID      string
	Cables         int
	Limited        bool // false: unlimited capacity (proposed, tunnel, tray, aerial, buried)
	Ducts          int
	AddedDucts     int
	UsedAreaMM2    float64
	AllowedAreaMM2 float64
	// Links are the links whose cables a limited span carries, by id, in the order the
	// optimizer packed them into its ducts (optimize.EdgeFill.Demands): the estimate's duct
	// fill packs them in this order too. Nil when the span is not limited.
	Links []string
	// ForCount is what the count of pulls lays along the span beyond the fill alone
	// (forCount, count.go).
	ForCount ForCount
}

func fillReport(s *site.Site, prob *optimize.Problem, sol *optimize.Solution) []SegmentFill {
	out := make([]SegmentFill, 0, len(sol.Fill))
	for _, f := range sol.Fill {
		if f.Edge >= len(s.Net.Spans) {
			continue // an entrance or turn edge holds no cable of its own
		}
		sp := &s.Net.Spans[f.Edge]
		var links []string
		for _, d := range f.Demands {
			links = append(links, prob.Demands[d].ID)
		}
		out = append(out, SegmentFill{Span: sp.ID, PathwayID: sp.PathwayID, Cables: f.Cables, Limited: f.Limited,
			Ducts: f.Ducts, AddedDucts: f.AddedDucts, UsedAreaMM2: f.UsedAreaMM2, AllowedAreaMM2: f.AllowedAreaMM2, Links: links,
			ForCount: forCount(prob, sol, &f)})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Span < out[j].Span })
	return out
}

// crossedM is the longest run of the route inside building b, which it passes through (b is
// neither end's), in metres. NFPA 70 770.48(A) counts unlisted cable inside a building from
// its point of entrance, where it crosses the wall (from memory; the rule through-15m), so
// each time the route enters b is a run of its own, the longest counted (review 15 F7: two
// crossings of a U-shaped building are not summed), and a run goes on over the junctions
// inside b however its pathway is split into spans there: a tunnel split at a vertex inside b
// is one crossing, as drawn whole (neither piece runs wall to wall: review 15's metamorphic
// gap). A tunnel or tray span is inside b as geo measured it, from an end inside b to the
// wall (geo.Span.Indoors, the whole span when it crosses no wall) and from wall to wall across
// b (geo.Span.Through), whether or not its pathway counts as drawn inside b (a tunnel between
// two arms of a U-shaped building has both ends inside and its middle outside); a span of any
// other pathway drawn inside b (geo.Transit.Interior) is inside whole.
func crossedM(s *site.Site, b string, ol optimize.Leg) float64 {
	var interior []string
	if t, ok := s.Net.TransitOf(b); ok {
		interior = t.Interior
	}
	best, runM, in := 0.0, 0.0, false
	end := func() { // the run reaches b's wall
		if in {
			best = max(best, runM)
		}
		runM, in = 0, false
	}
	for _, h := range ol.Hops {
		if h.Edge >= len(s.Net.Spans) {
			continue // an entrance or turn edge: no length, and a run inside goes on
		}
		sp := &s.Net.Spans[h.Edge]
		if sp.Type != geo.TypeTunnel && sp.Type != geo.TypeTray {
			if slices.Contains(interior, sp.PathwayID) {
				runM, in = runM+sp.LengthM, true
			} else {
				end()
			}
			continue
		}
		// The end the route enters the span at: its From end when travelled forward.
		first, ok := sp.IndoorM(b, !h.Forward)
		if ok && first >= sp.LengthM { // inside b from end to end, across no wall
			runM, in = runM+sp.LengthM, true
			continue
		}
		if ok {
			runM, in = runM+first, true
		}
		end()
		for _, c := range sp.Through {
			if c.Building == b {
				best = max(best, c.LengthM)
			}
		}
		if last, ok := sp.IndoorM(b, h.Forward); ok {
			runM, in = last, true
		}
	}
	end()
	return best
}

// interiorM is the metres of the route's spans drawn inside building b (geo.Transit.Interior).
func interiorM(s *site.Site, b string, ol optimize.Leg) float64 {
	t, ok := s.Net.TransitOf(b)
	if !ok || len(t.Interior) == 0 {
		return 0
	}
	m := 0.0
	for _, h := range ol.Hops {
		if h.Edge >= len(s.Net.Spans) {
			continue // an entrance or turn edge: no length inside
		}
		if sp := &s.Net.Spans[h.Edge]; slices.Contains(t.Interior, sp.PathwayID) {
			m += sp.LengthM
		}
	}
	return m
}

// indoorM is the metres of the route inside building b from one of its ends (first: the end
// its first hops leave, Link.To's; else the end its last hops reach, Link.From's) back to where
// it crosses b's wall (geo.Span.Indoors): a tunnel or tray that runs from another building into
// b, or a declared entrance inside b's footprint, puts the cable inside b from that wall on
// (NFPA 70 770.48(A) counts unlisted cable from the point of entrance). Spans of pathways drawn
// inside b are passed over: interiorM counts them whole.
func indoorM(s *site.Site, b string, ol optimize.Leg, first bool) float64 {
	var interior []string
	if t, ok := s.Net.TransitOf(b); ok {
		interior = t.Interior
	}
	m := 0.0
	for i := range ol.Hops {
		h := ol.Hops[i]
		if !first {
			h = ol.Hops[len(ol.Hops)-1-i]
		}
		if h.Edge >= len(s.Net.Spans) {
			continue // an entrance or turn edge: no length inside
		}
		sp := &s.Net.Spans[h.Edge]
		if slices.Contains(interior, sp.PathwayID) {
			continue
		}
		// The span's end on b's side: where the route enters it from b, or leaves it for b.
		atTo := h.Forward != first
		in, ok := sp.IndoorM(b, atTo)
		if !ok {
			break
		}
		m += in
		if in < sp.LengthM {
			break // the wall crossing
		}
	}
	return m
}

// endIndoorM is the metres inside building b, from its wall to its entrance inside it, along
// the tunnel or tray that every route from b takes (indoorM on any route): b has one entrance
// (layout.endEntry), at the end of one span alone, which runs inside b from there (geo.Span.
// Indoors), through junctions inside b where it carries on into one span alone, to the wall.
// Where routes may leave otherwise (several entrances, pathways meeting at the entrance or
// inside b, a pathway drawn inside b) it is 0, and fillLeg counts the route's own alone. The
// demand counts it in the end's inside metres, so the optimizer prices and the rules choose
// the cable on what every route will have there (the bill's inside cable of a transition).
func endIndoorM(s *site.Site, lay *layout, b string) float64 {
	e, ok := lay.endEntry[b]
	if !ok || e.LateralM > 0 {
		return 0
	}
	var interior []string
	if t, ok := s.Net.TransitOf(b); ok {
		interior = t.Interior
	}
	j, prev, m := e.Junction, "", 0.0
	for range s.Net.Spans { // each span at most once: the walk ends at the wall or a fork
		mt, ok := s.Net.MeetingAt(j)
		if !ok {
			return 0
		}
		next, n := "", 0
		for _, id := range mt.Spans {
			if id != prev {
				next, n = id, n+1
			}
		}
		if n != 1 {
			return 0
		}
		sp, ok := s.Net.Span(next)
		if !ok || slices.Contains(interior, sp.PathwayID) {
			return 0
		}
		atTo := sp.To == j
		in, inside := sp.IndoorM(b, atTo)
		if !inside {
			return m
		}
		m += in
		if in < sp.LengthM {
			return m // the wall crossing
		}
		prev, j = next, sp.From
		if !atTo {
			j = sp.To
		}
	}
	return 0
}

// sharedJunctions lists, in a's travel order, the junctions both legs pass between their
// ends.
func sharedJunctions(s *site.Site, a, b *Leg) []string {
	inner := func(l *Leg) []string {
		js := s.JunctionsOf(l.Steps)
		if len(js) < 2 {
			return nil
		}
		return js[1 : len(js)-1]
	}
	var out []string
	bs := inner(b)
	for _, j := range inner(a) {
		if slices.Contains(bs, j) && !slices.Contains(out, j) {
			out = append(out, j)
		}
	}
	return out
}

// crossing adds to the leg's Crosses each of buildings that is not one of the link's own,
// unless the route is in it already (the last listed).
func (leg *Leg) crossing(buildings []string) {
	for _, b := range buildings {
		if b != leg.Link.To && b != leg.Link.From && (len(leg.Crosses) == 0 || leg.Crosses[len(leg.Crosses)-1] != b) {
			leg.Crosses = append(leg.Crosses, b)
		}
	}
}

// emiSpansShown is how many spans spansText names before it counts the rest.
const emiSpansShown = 5

// spansText names spans for a reason (media.Link.EMISpans): "span A", "spans A, B" or
// "spans A, B, C, D, E and 2 more"; "" for none.
func spansText(ids []string) string {
	switch len(ids) {
	case 0:
		return ""
	case 1:
		return "span " + ids[0]
	}
	shown, more := input.Shown(ids, emiSpansShown)
	return "spans " + strings.Join(shown, ", ") + more
}
