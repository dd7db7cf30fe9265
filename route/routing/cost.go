package routing

import (
	"container/heap"
	"fmt"
	"maps"
	"math"
	"slices"
	"strings"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/media/install"
	"spanwright/route/items"
	"spanwright/route/optimize"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// StandardStrandCounts are the fibre counts a required strand count rounds up to
// (common practice, no published source).
var StandardStrandCounts = []int{12, 24, 48, 72, 96, 144, 288}

// CableStrands rounds required × (1 + growth) up to a standard cable count; beyond the
// largest, to as many of the largest as leave less than one more, and the standard count
// that holds the rest: 300 strands are 288 + 12, not 2 × 288 (the set of cables the media
// engine then buys them in, media.Engine.Cables, on the book's prices).
func CableStrands(required int, growth float64) int {
	n := int(math.Ceil(float64(required)*(1+growth) - 1e-9))
	big := StandardStrandCounts[len(StandardStrandCounts)-1]
	full := 0
	if n > big {
		full = (n - 1) / big
	}
	for _, c := range StandardStrandCounts {
		if n-full*big <= c {
			return full*big + c
		}
	}
	panic("routing: no standard strand count holds the rest") // unreachable: the rest is at most big
}

// CopperCables is the number of 4-pair cables a copper link of required strands (two per port
// pair) with growth needs: one per port pair asked, not per strand of the fibre cable size the
// count would round up to (ANSI/TIA-568.2: a 4-pair cable serves one port).
func CopperCables(required int, growth float64) int {
	n := int(math.Ceil(float64(required)*(1+growth) - 1e-9))
	return max(1, (n+1)/2)
}

// PairsPerCable is the pairs of a copper backbone cable, the only copper cable the catalog
// lists: 4-pair (ANSI/TIA-568.2).
const PairsPerCable = 4

// ConnectorPairs is the number of mated connector pairs in a backbone channel: one patch
// panel at each end (ANSI/TIA-568.3-D channel model).
const ConnectorPairs = 2

// Model prices a plan's pathways and media from the engine and its price book, with the
// item functions of package items, which the bill of materials (package estimate) calls too.
type Model struct {
	eng         *media.Engine
	prices      *media.PriceBook
	design      plan.Design
	allowedMemo map[allowedKey]bool
	cableMemo   map[cableKey]cabled
	// laysMemo and layingMemo remember lays and layingFor, reachMemo maxChannelMAs.
	laysMemo   map[layingKey]bool
	layingMemo map[layingKey]laid
	reachMemo  map[reachKey]float64
	bidMemo    map[media.BidBases][]media.Quantity // items.BidPer by bases, for the model's book
}

// Edge flags. flagDuct marks a duct edge, so that a cable too large for the design's
// innerduct can be kept off ducts. flagTurn, the top bit, marks a turn edge where turning
// adds a handhole for that alone (not into a run where new pathway joins, whose joining builds
// one) when design.turn_handholes is false, and every option excludes it then; with the
// default the problem is the same as before the setting was (its fingerprint too). Every other
// flag is a span class (spanClass): the bit firstClassFlag << k marks the edges of the k-th
// class in the campus, and an option excludes the classes on which the rule engine does not
// let its medium run.
const (
	flagDuct       = optimize.FlagOutdoor << 1
	firstClassFlag = flagDuct << 1
	flagTurn       = uint64(1) << 63
)

// spanClass is what a span tells the rule engine about a route that runs on it: its EMI
// level, whether it is outdoors (every pathway but a tray), whether it is in a plenum, and its
// pathway type. Which media may run on a span is the rule engine's answer for a route with
// these facts (allowed), so a rule added to or removed from a rules file changes where the
// optimizer may route a medium; no medium rule is written in Go.
type spanClass struct {
	emi             string
	outdoor, plenum bool
	typ             string
}

func classOf(sp *geo.Span) spanClass {
	emi := sp.EMI
	if emi == "" {
		emi = geo.EMINone
	}
	return spanClass{emi: emi, outdoor: sp.Type != geo.TypeTray, plenum: sp.Plenum, typ: sp.Type}
}

// lateralClass is a counted lateral: a run out of the building with no EMI data, built as
// duct (items.Entrance lays new_ducts ducts in it), so not direct-buried.
var lateralClass = spanClass{emi: geo.EMINone, outdoor: true, typ: geo.TypeDuct}

func (c spanClass) facts(l media.Link) media.Link {
	l.MaxEMI, l.Outdoor, l.Plenum, l.PathwayTypes = c.emi, c.outdoor, c.plenum, []string{c.typ}
	return l
}

func (c spanClass) String() string {
	s := c.typ
	if c.emi != geo.EMINone {
		s += ", " + c.emi + " EMI"
	}
	if c.plenum {
		s += ", plenum"
	}
	return s
}

// allowedKey is what allowed's answer depends on: allowed hands the engine a link made of
// these fields alone (no ID, no names), so nothing else can change it.
type allowedKey struct {
	medium       string
	rate, future float64
	strands      int
	class        spanClass
}

// allowed reports whether the rules let medium carry a link of rate (and future rate) and
// strands on spans of class c, at some length, with no risers or slack: the rules that depend
// on the whole route or its ends are the media choice's to apply, on the route's own facts.
func (m *Model) allowed(s *site.Site, medium string, rate, future float64, strands int, c spanClass) bool {
	k := allowedKey{medium, rate, future, strands, c}
	if v, ok := m.allowedMemo[k]; ok {
		return v
	}
	l := c.facts(media.Link{ConnectorPairs: ConnectorPairs, Strands: strands})
	m.hold(s, 1, 0)
	v := s.Reaches.MaxChannelM(m.eng, medium, rate, future, l) > 0
	m.allowedMemo[k] = v
	return v
}

// explain puts the optimizer's account of link l's unroutable demand in the plan's words:
// options by their medium and, for a medium no pathway on its own spans joins, the span
// classes on the shortest way between the link's buildings that the rules keep it off, each
// with the rule engine's reason (why; whyNot), not every class of the campus it may not use;
// for an option that full ducts keep out, the spans of prob without room on its shortest way
// (ductsFull). The options the rules let onto the pathways come first (full ducts, then
// reach), those the rules keep off them after (tester 12 F5: the reason led with copper the
// plan never allows): the fibre cause is what the reader acts on.
func (lay *layout) explain(in optimize.Infeasible, l *site.Link, prob *optimize.Problem, why func(medium string, c spanClass) string) string {
	if len(in.Options) == 0 {
		return in.Reason
	}
	msgs := make([]string, len(in.Options))
	rank := make([]int, len(in.Options))
	for i, f := range in.Options {
		rank[i] = slices.Index([]string{optimize.FailDucts, optimize.FailReach, optimize.FailNoPathFlags}, f.Kind)
		if rank[i] < 0 {
			rank[i] = 3
		}
		switch f.Kind {
		case optimize.FailNoPath:
			msgs[i] = f.Name + ": no pathway joins its two ends"
		case optimize.FailNoPathFlags:
			block := f.BlockFlags
			if block == 0 {
				block = f.ExcludeFlags // no shortest way known: every class it may not use
			}
			// The classes on the way, grouped by the rule that keeps the medium off them, in
			// the layout's order of classes.
			var reasons []string
			on := map[string][]string{}
			for _, c := range lay.classes {
				if block&lay.classBit[c] != 0 {
					r := why(f.Name, c)
					if on[r] == nil {
						reasons = append(reasons, r)
					}
					on[r] = append(on[r], c.String())
				}
			}
			var parts []string
			if block&flagDuct != 0 {
				parts = append(parts, "ducts, where its cable does not fit the innerduct")
			}
			if block&flagTurn != 0 {
				parts = append(parts, turnsWords)
			}
			for _, r := range reasons {
				parts = append(parts, strings.Join(on[r], " and ")+" spans ("+r+")")
			}
			msgs[i] = fmt.Sprintf("%s: every pathway between %s and %s runs on spans it may not use; the shortest runs on %s",
				f.Name, l.From, l.To, strings.Join(parts, "; and on "))
		case optimize.FailReach:
			msgs[i] = fmt.Sprintf("%s: the shortest route it may use is %.1f m along pathways with the slack loops it leaves in structures, beyond the %.1f m it reaches there", f.Name, f.ShortestM, f.ReachM)
		default:
			od := 0.0
			if prob != nil && in.Demand >= 0 && in.Demand < len(prob.Demands) && f.Option >= 0 && f.Option < len(prob.Demands[in.Demand].Options) {
				od = prob.Demands[in.Demand].Options[f.Option].CableODMM
			}
			msgs[i] = f.Name + ": every route within reach crosses ducts too full for the cable" + ductsFull(prob, f.Full, od, lay.heldSpans)
		}
	}
	order := make([]int, len(msgs))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return rank[a] - rank[b] })
	sorted := make([]string, len(msgs))
	for k, i := range order {
		sorted[k] = msgs[i]
	}
	return strings.Join(sorted, "; ")
}

// ductsFull names the edges of prob with no room for an option's cable on its shortest way
// (optimize.OptionFailure.Full), each with its ducts and the cables the plan pulls in them, as
// words to follow "crosses ducts too full for the cable": where ducts would have to be added
// (tester 12 F5). A cable no empty duct takes is named with its diameter, odMM (what the ducts
// take: the cable, or its innerduct; 0 unknown), and the ducts' inside diameter (wideWords). ""
// when there are none to name (or no problem to name them by).
// held are the spans nothing may be built beside (layout.heldSpans): their name says so.
func ductsFull(prob *optimize.Problem, full []optimize.FullEdge, odMM float64, held map[string]bool) string {
	if prob == nil || len(full) == 0 {
		return ""
	}
	var noRoom []string
	var wide []int
	for _, f := range full {
		ed := &prob.Edges[f.Edge]
		none := ""
		if held[ed.ID] {
			none = fmt.Sprintf("; its pathway's method is %q: nothing may be built beside it", geo.MethodNone)
		}
		switch {
		case ed.MayAddDucts():
			wide = append(wide, f.Edge)
		case f.Ducts == 0:
			noRoom = append(noRoom, ed.ID+" (no spare duct"+none+")")
		default:
			noRoom = append(noRoom, fmt.Sprintf("%s (%s, %s of this plan in them%s)", ed.ID,
				plural(f.Ducts, "spare duct", "spare ducts"), plural(f.Cables, "cable", "cables"), none))
		}
	}
	var parts []string
	if len(noRoom) > 0 {
		spans := "spans " + strings.Join(noRoom, ", ")
		if len(noRoom) == 1 {
			spans = "span " + noRoom[0]
		}
		parts = append(parts, "no room on "+spans+", where this plan may add no duct (NFPA 70 Chapter 9 fill)")
	}
	if len(wide) > 0 {
		parts = append(parts, wideWords(prob, wide, odMM))
	}
	return ": on the shortest way it may take, " + strings.Join(parts, "; and ")
}

// wideWords says that a cable of outside diameter odMM (0: not known) is wider than an empty
// duct of the given edges of prob takes, naming the ducts' inside diameter with the spans of
// each size (tester 15 F4: a duct_mm of 4, inches typed as millimetres, made 49 legs
// infeasible, and the reason did not say how small the ducts are): one cable may fill 53 % of
// a duct's area (NFPA 70 Chapter 9 Table 1), so at most 0.728 of its inside diameter across.
// Diameters are in millimetres, which the outputs write in the run's units (output.InUnits).
func wideWords(prob *optimize.Problem, edges []int, odMM float64) string {
	bySize := map[float64][]string{}
	innerduct := false
	for _, e := range edges {
		ed := &prob.Edges[e]
		bySize[ed.DuctIDMM] = append(bySize[ed.DuctIDMM], ed.ID)
		innerduct = innerduct || ed.Innerduct
	}
	var sizes []string
	for _, d := range slices.Sorted(maps.Keys(bySize)) {
		ids := bySize[d]
		on := "span " + ids[0]
		if len(ids) > 1 {
			on = "spans " + strings.Join(ids, ", ")
		}
		sizes = append(sizes, fmt.Sprintf("%g mm inside (%s) takes, at most %.1f mm", d, on, math.Sqrt(install.FillOneCablePct/100)*d))
	}
	what := "its cable"
	if innerduct {
		what = "its innerduct"
	}
	if odMM > 0 {
		what += fmt.Sprintf(", %g mm across,", odMM)
	}
	return what + " is wider than an empty duct of " + strings.Join(sizes, ", or one of ") + " (NFPA 70 Chapter 9 Table 1: one cable fills at most 53 % of a duct)"
}

// plural is n with the noun for its count, e.g. "1 spare duct", "3 spare ducts".
func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}

// whyNot is the rule engine's reason for keeping the option named name off spans of class c:
// where the medium may be laid there another way (an option of its own), why the option's
// laying may not; otherwise the rules' reasons for every construction of its medium there on
// the link's ends, and that an entrance transition was not tried for want of its price, when
// so.
func (m *Model) whyNot(name string, info demandInfo, c spanClass) string {
	medium := optionMedium(name)
	l := c.facts(info.facts)
	l.RouteM = 1
	var why []string
	if lay := info.layings[name]; lay.Construction != "" && m.allowedFor(medium, info, c) {
		if other, ok := m.layingFor(medium, info, c); ok && other.laying != lay {
			return m.eng.WhyNotLaid(medium, lay, info.rate, classFacts(info, c))
		}
		l.Outdoor = true // as the option's laying was priced: a route that leaves the buildings
	}
	for _, r := range m.eng.Choose(l).Rejected {
		if r.Medium == medium {
			why = append(why, r.Reason)
		}
	}
	if note := m.eng.UntriedTransition(medium, l); note != "" {
		why = append(why, note)
	}
	if len(why) == 0 {
		return medium + " is not allowed there"
	}
	return strings.Join(why, "; ")
}

// NewModel builds the cost model of the plan's design on the engine's price book. The prices
// the optimizer's problem asks of the book are checked by CheckPrices, all at once.
func NewModel(eng *media.Engine, d plan.Design) *Model {
	return &Model{eng: eng, prices: eng.PriceBook(), design: d, allowedMemo: map[allowedKey]bool{}, cableMemo: map[cableKey]cabled{},
		laysMemo: map[layingKey]bool{}, layingMemo: map[layingKey]laid{}, reachMemo: map[reachKey]float64{},
		bidMemo: map[media.BidBases][]media.Quantity{}}
}

// CheckPrices reports every price and labour rate the optimizer's problem of links on site s
// asks of the book and the book lacks, at once (media.PriceBook.Check: an *input.Problems
// with media.ErrMissingPrice, each naming the book, the key and where to add it); nil when the
// book has them all. Those prices are checked before routing (check runs it) and again by
// problem, before it prices anything, with the same list (priceNeeds). The bill asks for more
// once the routes are known (panels and enclosures of the strands routed, splice trays,
// tests), all at once too.
func (m *Model) CheckPrices(s *site.Site, links []site.Link) error {
	lay := layoutOf(s)
	return m.prices.Check(m.priceNeeds(s, lay, m.runsOf(s), prepaidTaps(s, lay, links)))
}

// priceNeeds lists the prices and rates the optimizer's problem of links prices with (problem),
// whatever the routes: every pathway type's pull (and innerduct); opening each proposed span by
// its method, with the handholes along its run; a handhole at a junction when a charge or a
// prepaid tap (prepaidTaps of the links) may add one; and the entry and counted lateral of
// every entrance a route may use. Prices a book may leave out whole
// (media.PriceBook.NotPriced) are listed; Check passes them.
func (m *Model) priceNeeds(s *site.Site, lay *layout, runs []site.NewRun, prepaid map[string]bool) []media.PriceKey {
	d := m.design
	var needs []media.PriceKey
	for _, t := range items.PathwayTypes {
		needs = append(needs, items.KeysOf(items.AlongSpan(d, t, 1))...)
	}
	hh := false
	for _, r := range runs {
		hh = hh || (len(r.Handholes) > 0 && d.AllowNewTrench)
	}
	for i := range s.Net.Spans {
		if sp := &s.Net.Spans[i]; sp.Status == geo.StatusProposed {
			needs = append(needs, items.KeysOf(items.Opening(d, sp, items.MethodOf(m.prices, d, sp)))...)
		}
	}
	if hh || len(lay.charges) > 0 || len(prepaid) > 0 {
		needs = append(needs, items.KeysOf([]media.Quantity{items.JoinHandholes(1)})...)
	}
	for _, en := range lay.entrances {
		needs = append(needs, items.KeysOf(items.Entrance(m.prices, d, en.entry.LateralM, en.entry.Built, en.entry.PoleRiser))...)
	}
	for _, b := range slices.Sorted(maps.Keys(lay.endEntry)) {
		e := lay.endEntry[b]
		needs = append(needs, items.KeysOf(items.Entrance(m.prices, d, e.LateralM, e.Built, e.PoleRiser))...)
	}
	return needs
}

// problem builds the optimizer's problem: one edge per span (same index), one demand per link;
// and the site's graph it is drawn on (layoutOf).
func problem(s *site.Site, m *Model, links []site.Link, runs []site.NewRun) (*optimize.Problem, *layout, []demandInfo, error) {
	net := s.Net
	lay := layoutOf(s)
	p := &optimize.Problem{Nodes: lay.nodes, AllowNew: m.design.AllowNewTrench,
		Edges: make([]optimize.Edge, len(net.Spans), len(net.Spans)+len(lay.extra))}
	if slices.Contains(lay.noTransit, true) {
		p.NoTransit = lay.noTransit
	}
	p.Sites = lay.site
	d := m.design
	// Handholes along runs of new construction (runsOf), by span: each is paid with its span,
	// and a run is opened whole (site.NewRun).
	runHH := site.HandholesBySpan(runs)
	prepaid := prepaidTaps(s, lay, links)
	if err := m.prices.Check(m.priceNeeds(s, lay, runs, prepaid)); err != nil {
		return nil, nil, nil, err // every price the problem needs and the book lacks, at once
	}
	// Duct fill: the optimizer's incremental NFPA 70 Chapter 9 Table 1 packing (nil Fits).
	builtAt := s.BuiltEntriesAt()
	for i := range net.Spans {
		sp := &net.Spans[i]
		u, v := lay.spanEnds[i][0], lay.spanEnds[i][1]
		// Half the slack loop and the crew's work at each end's structure: a route passing a
		// structure crosses two of its spans; the halves at a route's two ends are its
		// demand's (demand).
		pull, entered := crewHalves(s, sp.From, sp.To)
		// Handholes along its run, and its share of those where it joins the network
		// (pricedPasses). Each is a structure passed as the campus's are (passesOf): a slack
		// loop, a crew entry, the bid items per structure passed.
		joinLoops, joinCrews := pricedPasses(s, lay, i)
		along := float64(len(runHH[sp.ID]))
		loops := (items.LoopM(s, d, sp.From)+items.LoopM(s, d, sp.To))/2 + (along+joinLoops)*d.SlackLoopStructureM
		crews := along + joinCrews
		// The loops count in the channel too (the loss budget's), so in the reach (ReachM).
		e := optimize.Edge{ID: sp.ID, From: int(u), To: int(v), LengthM: sp.LengthM, CableM: items.Wasted(d, sp.LengthM+loops), ReachM: sp.LengthM + loops,
			PerCableCents: m.cents(items.AlongSpan(d, sp.Type, sp.LengthM)...) + m.cents(items.StructureLoops(loops)...) +
				m.cents(items.AtJunctions(m.prices, pull+crews, entered+crews)...) + m.bidPer(media.BidBases{Structures: 1}, entered+crews),
			Group: lay.spanGroup[i], EndParted: lay.runGroup[i], Flags: lay.classBit[classOf(sp)]}
		if sp.Type == geo.TypeDuct {
			e.Flags |= flagDuct
		}
		if sp.Status == geo.StatusProposed {
			open := items.Opening(d, sp, items.MethodOf(m.prices, d, sp))
			e.Proposed, e.FixedCents = true, m.cents(open...)+m.bidPer(media.BidBases{NewBuriedM: 1}, items.NewBuriedM(sp))
			if items.EntersHoles(sp.Type) {
				e.FixedCents += m.cents(items.HoleEntries(items.HoleWalls(s, sp))...) // into existing maintenance holes
			}
			if n := len(runHH[sp.ID]); n > 0 {
				e.FixedCents += m.cents(items.RunHandholes(n))
			}
			if sp.Type == geo.TypeDuct && sp.DuctMM > 0 {
				// Built to size: the opening lays the design's ducts, and every duct its
				// cables need beyond them is an added duct in the same trench
				// (optimize.Edge.Ducts; the bill lays what the optimizer packed).
				e.Ducts, e.DuctIDMM = items.NewDucts(d), sp.DuctMM
				e.AddDuctPerMCents = m.perM(items.AddedDuct(1))
			}
		} else if sp.Type == geo.TypeDuct {
			e.Ducts, e.DuctIDMM = sp.SpareDucts, sp.DuctMM
			// One trench or bore beside the span however many ducts it gets, and the ducts;
			// new civil work, so only when the plan allows new trench.
			// Never beside a pathway the campus says nothing may be built beside (method none).
			var work []media.Quantity
			if sp.Method != geo.MethodNone {
				work = items.NewWork(d, sp, items.MethodOf(m.prices, d, sp), 1)
			}
			if work != nil && d.AllowNewTrench && m.prices.Check(items.KeysOf(append(work, items.AddedDuct(1)))) == nil && m.perM(items.AddedDuct(1)) > 0 {
				e.AddDuctPerMCents = m.perM(items.AddedDuct(1))
				e.AddTrenchPerMCents = m.perM(append(work, m.bidItems(media.BidBases{NewBuriedM: 1})...)...)
				e.AddTrenchDucts = items.NewDucts(d) // the trench is laid with the design's ducts at least (optimize.Edge.LaidDucts)
				// The ducts enter a building through a wall the full ones already enter: a
				// penetration of their own, paid with the trench.
				// Likewise where they enter an existing maintenance hole.
				e.AddTrenchCents = m.cents(items.AddedDuctEntrances(m.prices, items.AddedDuctWalls(builtAt, sp))...) +
					m.cents(items.HoleEntries(items.HoleWalls(s, sp))...)
			}
		}
		// Innerduct: the ducts take innerducts (each pulled in empty, one cable in it), not
		// loose cables held to the design's count a duct (design.cables_per_duct,
		// install.PullLimit).
		e.Innerduct = e.DuctIDMM > 0 && d.Innerduct()
		if e.DuctIDMM > 0 {
			e.CablesPerDuct = d.CablesPerDuct
		}
		p.Edges[i] = e
	}
	for k, x := range lay.extra {
		e := optimize.Edge{From: x.from, To: x.to}
		loops, crews := pricedPasses(s, lay, len(net.Spans)+k)
		switch x.kind {
		case edgeEntrance:
			e.ID, e.Group = "entrance "+x.entry.ID+" of "+x.building, x.group
			if lat := x.entry.LateralM; lat > 0 {
				// The entrance's lateral: cable and its pull in the duct the plan builds, outdoors,
				// and up the pole where it leaves a pole line (a riser of the leg, fillLeg).
				pole := items.PoleRiserM(d, lat, x.entry.PoleRiser)
				e.LengthM, e.CableM, e.ReachM = lat, items.Wasted(d, lat+pole), lat+pole
				e.PerCableCents = m.cents(items.LegEnds(pole, pole, 0, lat)...)
				e.Flags = lay.classBit[lateralClass]
				if loops > 0 { // the tap's handhole, a structure passed (passesOf)
					loopM := loops * d.SlackLoopStructureM
					e.CableM += items.Wasted(d, loopM)
					e.ReachM += loopM
					e.PerCableCents += m.cents(items.AtJunctions(m.prices, crews, crews)...) + m.cents(items.StructureLoops(loopM)...) +
						m.bidPer(media.BidBases{Structures: 1}, loops)
				}
			}
			if loop := items.LoopM(s, d, x.junction) / 2; loop > 0 {
				// The other half of the slack loop at an entrance that is a structure: the
				// route's first span carries one half (as every span does at its ends).
				e.CableM += items.Wasted(d, loop)
				e.ReachM = max(e.ReachM, e.LengthM) + loop
				e.PerCableCents += m.cents(items.StructureLoops(loop)...)
			}
			pull, entered := crewHalves(s, x.junction)
			e.PerCableCents += m.cents(items.AtJunctions(m.prices, pull, entered)...) + m.bidPer(media.BidBases{Structures: 1}, entered)
		case edgeTurn:
			// The handhole added where the route turns: a pull point the crew enters (its
			// share, when a joining span's run is at one end: layout.turnShare).
			// It is a structure passed (passesOf), but its slack loop and the bid items per
			// structure passed are left out here: a pass through a junction split for turns
			// may take one turn edge or two halves (through a joining span's run), and a loop
			// priced in halves rounds to a cent apart, which would let cents of rounding pick
			// between equal routes (TestStartRoutesRebuildsSolution). The plan's evaluation
			// prices them on the routes returned (passGapCents; README, "One cost model").
			e.ID, e.PerCableCents = "turn at "+x.junction, m.cents(items.AtJunctions(m.prices, crews, crews)...)
			if !d.TurnHandholes && !lay.isJoin(x.from) && !lay.isJoin(x.to) {
				e.Flags = flagTurn
			}
			// Its loop is in the channel all the same (its share of it: reach is not priced, so
			// halves that round apart choose nothing).
			e.ReachM = crews * d.SlackLoopStructureM
		}
		p.Edges = append(p.Edges, e)
	}
	if len(lay.charges) > 0 || len(prepaid) > 0 {
		hh := m.cents(items.JoinHandholes(1))
		for _, c := range lay.charges {
			cents := hh
			if prepaid[c.junction] {
				cents = 0 // the tap of a building with one entrance pays it (SolveFrom)
			}
			p.Charges = append(p.Charges, optimize.Charge{ID: "handhole at " + c.junction, Edges: c.edges, Cents: cents})
		}
	}
	// An entrance of a building with several is paid once when a route uses it (those of a
	// building with one are paid whatever the routes: Routed.ConstantCents).
	for _, en := range lay.entrances {
		if c := m.entranceCents(en.entry); c > 0 {
			p.Charges = append(p.Charges, optimize.Charge{ID: "entrance " + en.entry.ID + " of " + en.building, Edges: en.edges, Cents: c})
		}
	}
	infos := make([]demandInfo, len(links))
	sh := &shortest{p: p} // the edges are all in
	for i := range links {
		d, info := demand(s, m, lay, &links[i], sh)
		p.Demands = append(p.Demands, d)
		infos[i] = info
	}
	return p, lay, infos, nil
}

// shortest is the shortest distance in reach metres between nodes of a problem over every
// edge, whatever may use it (reachFrom), worked out from each target node asked (a link's
// from building, which links share: the hub) the first time.
type shortest struct {
	p    *optimize.Problem
	adj  [][]int
	dist map[int][]float64
}

// betweenM is the shortest distance in reach metres between nodes a and b, from b.
func (sh *shortest) betweenM(a, b int) float64 {
	if sh.adj == nil {
		sh.adj = make([][]int, sh.p.Nodes)
		for i := range sh.p.Edges {
			e := &sh.p.Edges[i]
			sh.adj[e.From] = append(sh.adj[e.From], i)
			sh.adj[e.To] = append(sh.adj[e.To], i)
		}
		sh.dist = map[int][]float64{}
	}
	if sh.dist[b] == nil {
		sh.dist[b] = reachFrom(sh.p, sh.adj, b)
	}
	return sh.dist[b][a]
}

// reachFrom is the shortest distance in reach metres (optimize.Edge.ReachM, or LengthM) from
// node src to every node over every edge of p, either way, whatever may use it (adj: the
// edges at each node): +Inf where none joins.
func reachFrom(p *optimize.Problem, adj [][]int, src int) []float64 {
	dist := make([]float64, p.Nodes)
	for i := range dist {
		dist[i] = math.Inf(1)
	}
	dist[src] = 0
	q := &nodeHeap{{node: src}}
	for q.Len() > 0 {
		it := heap.Pop(q).(nodeAt)
		if it.m > dist[it.node] {
			continue
		}
		for _, i := range adj[it.node] {
			e := &p.Edges[i]
			w := e.ReachM
			if w == 0 {
				w = e.LengthM
			}
			v := e.To
			if v == it.node {
				v = e.From
			}
			if nd := it.m + w; nd < dist[v] {
				dist[v] = nd
				heap.Push(q, nodeAt{node: v, m: nd})
			}
		}
	}
	return dist
}

// nodeAt is a node and its distance, in metres, for reachFrom's heap.
type nodeAt struct {
	node int
	m    float64
}

type nodeHeap []nodeAt

func (h nodeHeap) Len() int { return len(h) }
func (h nodeHeap) Less(i, j int) bool {
	return h[i].m < h[j].m || (h[i].m == h[j].m && h[i].node < h[j].node)
}
func (h nodeHeap) Swap(i, j int) { h[i], h[j] = h[j], h[i] }
func (h *nodeHeap) Push(x any)   { *h = append(*h, x.(nodeAt)) }
func (h *nodeHeap) Pop() any {
	old := *h
	x := old[len(old)-1]
	*h = old[:len(old)-1]
	return x
}

// prepaidTaps lists the junctions where the counted lateral of a building with one entrance
// (layout.endEntry) that ends some link taps a duct (site.Site.TapOf): the plan builds that
// handhole whatever its routes, as it builds the lateral, so it is paid with the entrances of
// such buildings (Routed.ConstantCents) and the junction's charge costs nothing more. The
// optimizer takes the lateral as used whenever its building ends a link; when every leg to
// the building is infeasible the bill has no tap there, and a route that turns or joins there
// is priced by SolveFrom afterwards (README, "One cost model").
func prepaidTaps(s *site.Site, lay *layout, links []site.Link) map[string]bool {
	out := map[string]bool{}
	for _, l := range links {
		for _, b := range []string{l.To, l.From} {
			if e, ok := lay.endEntry[b]; ok && s.TapOf(e) {
				out[e.Junction] = true
			}
		}
	}
	return out
}

// pricedPasses is what edge e of the optimizer's problem prices of the passes through
// handholes at junctions (passesOf), in passes of one cable: the slack loops (with their bid
// items per structure passed) and the crew's pull set-ups and entries. A span prices half a
// pass at each end where it joins the network (layout.joinEnds: a route from one joining span
// into another passes that handhole once, half on each; one from the network into it pays
// the other half in the plan's evaluation, or, where the junction is split for turns, its
// crew share on the turn edge); a turn edge its crew share (layout.turnShare) and no loop
// (problem says why); an entrance edge a whole pass at its lateral's tap (site.Site.TapOf).
// A route's end taps are its demand's (endTaps). problem prices the edges with it and
// passGapCents the passes it leaves out, so the two cannot disagree.
func pricedPasses(s *site.Site, lay *layout, e int) (loops, crews float64) {
	x, extra := lay.isExtra(len(s.Net.Spans), e)
	switch {
	case !extra:
		n := 0.5 * lay.joinEnds(s, e)
		return n, n
	case x.kind == edgeTurn:
		return 0, float64(lay.turnShare(x.from, x.to)) / 2
	case x.kind == edgeEntrance && s.TapOf(x.entry):
		return 1, 1
	}
	return 0, 0
}

// endTaps is the passes link l's demand prices at its ends, whatever the route: one at the
// handhole where the counted lateral of an end building with one entrance (layout.endEntry)
// taps a duct (site.Site.TapOf), at each end.
func endTaps(s *site.Site, lay *layout, l *site.Link) float64 {
	n := 0.0
	for _, b := range []string{l.To, l.From} {
		if e, ok := lay.endEntry[b]; ok && s.TapOf(e) {
			n++
		}
	}
	return n
}

// demandInfo is what the pipeline keeps about a link's demand to cost and explain its legs.
type demandInfo struct {
	facts    media.Link // route-independent facts; RouteM and the route facts are filled per leg
	rate     float64
	strands  int // cable strands after growth and rounding
	options  []string
	excluded []string // media left out before routing, with why
	// layings are the options' layings by option name: how each prices its cable (the zero
	// Laying when the medium's cheapest construction passes on no route of the link's ends).
	layings map[string]media.Laying
	// indoorTo and indoorFrom are the metres of every route inside the end buildings (Link.To,
	// Link.From) along a tunnel or tray from the wall to the entrance (endIndoorM), in
	// facts.InsideAM and InsideBM; fillLeg counts the route's own in their place.
	indoorTo, indoorFrom float64
}

// optionName is the name of the option of medium laid as lay: the medium alone for its
// first option (priced as the cheapest cable its ends allow, media.Engine.CableLayingFor), the
// medium and the laying for an option that may use spans the first may not (a buried span,
// laid as outside-plant cable spliced at the entrances): "os2 as osp-loose-tube + ofnr-riser
// at entrances", or at one end "… at CAF entrance", as the leg's construction reads
// (Leg.ConstructionText) with its link's ends, a the served building (media.EndA) and b the
// cross-connect's.
func optionName(medium string, lay media.Laying, first bool, a, b string) string {
	if first {
		return medium
	}
	if lay.Inside == "" {
		return medium + " as " + lay.Construction
	}
	return medium + " as " + lay.Construction + " + " + lay.Inside + " " + transitionText(lay.At, a, b)
}

// optionMedium is the medium of an option named by optionName (catalog ids hold no space).
func optionMedium(name string) string {
	medium, _, _ := strings.Cut(name, " ")
	return medium
}

// demand turns a link into the optimizer's demand with one option per medium that can carry it.
func demand(s *site.Site, m *Model, lay *layout, l *site.Link, sh *shortest) (optimize.Demand, demandInfo) {
	// A building with one entrance ends at it, with its lateral counted here; one with several
	// ends at its own node, each entrance edge carrying its lateral (layout).
	src, dst := lay.endEntry[l.To], lay.endEntry[l.From]
	srcN, okS := lay.end[l.To]
	dstN, okD := lay.end[l.From]
	rate, _ := m.eng.Catalog().ParseRate(l.Rate)
	future := 0.0
	if l.FutureRate != "" {
		future, _ = m.eng.Catalog().ParseRate(l.FutureRate)
	}
	strands := CableStrands(l.Strands, l.Growth)
	// The risers: the buildings' and, at an end with one entrance, the riser down the pole
	// where its counted lateral leaves a pole line (entrance edges carry theirs, layout).
	pole := items.PoleRiserM(m.design, src.LateralM, src.PoleRiser) + items.PoleRiserM(m.design, dst.LateralM, dst.PoleRiser)
	riser := s.RiserM(l.To) + s.RiserM(l.From) + pole
	lateral := src.LateralM + dst.LateralM
	d := m.design
	slack := 2 * d.SlackM
	coils := slack + 2*d.SlackLoopEntranceM
	// The halves of the slack loops at the end structures, and a whole one in the handhole
	// where a lateral taps a duct (a structure passed, passesOf; a pull point more).
	endLoops := (items.LoopM(s, d, src.Junction) + items.LoopM(s, d, dst.Junction)) / 2
	taps := endTaps(s, lay, l)
	endSlack := coils + 2*endLoops + taps*d.SlackLoopStructureM // the ends' slack whole, for the cable's price (cableFor)
	endLoops += taps * d.SlackLoopStructureM
	ends := riser + lateral + coils + endLoops
	endItems := append(items.LegEnds(riser, pole, coils, lateral), items.StructureLoops(endLoops)...)
	// The crew: one pull set-up more than the pull points the route passes, the halves at its
	// ends its spans leave out, and both cable ends prepared.
	pull, entered := crewHalves(s, src.Junction, dst.Junction) // "" at an end with several entrances: none
	endItems = append(endItems, items.AtJunctions(m.prices, 1+pull, entered)...)
	for range int(taps) {
		endItems = append(endItems, items.TapCrew(m.prices)...)
	}
	entered += taps
	endItems = append(endItems, items.Crew(m.prices, media.CrewCableEndPrep, 2)...)
	endItems = append(endItems, m.bidItems(media.BidBases{CableEnds: 2})...)
	// endItems are per cable (the bill counts each of a leg's cables, estimate's legItems);
	// the bid items per leg once.
	legBid := m.cents(m.bidItems(media.BidBases{Legs: 1})...)
	// Inside each end's building: its riser, its service coil and its entrance loop (the
	// route's own spans inside it are added per leg, fillLeg) — NFPA 70 770.48 counts
	// unlisted cable from the point of entrance.
	// A tunnel or tray from the wall to an entrance inside an end building that every route
	// takes is inside it too (endIndoorM), so the cable is priced and chosen on it before
	// routing, as the bill buys it.
	indoorTo, indoorFrom := endIndoorM(s, lay, l.To), endIndoorM(s, lay, l.From)
	insideTo := s.RiserM(l.To) + d.SlackM + d.SlackLoopEntranceM + indoorTo
	insideFrom := s.RiserM(l.From) + d.SlackM + d.SlackLoopEntranceM + indoorFrom
	facts := media.Link{ID: l.ID, RiserM: riser, SlackM: slack, RateGbps: rate, FutureRateGbps: future,
		MaxEMI: geo.EMINone, ConnectorPairs: ConnectorPairs, Strands: strands, CopperCables: CopperCables(l.Strands, l.Growth),
		InsideAM: insideTo, InsideBM: insideFrom, EndA: l.To, EndB: l.From}
	info := demandInfo{facts: facts, rate: rate, strands: strands, indoorTo: indoorTo, indoorFrom: indoorFrom}
	dm := optimize.Demand{ID: l.ID, Source: int(srcN), Target: int(dstN), Diverse: l.Diverse}
	if !okS || !okD {
		return dm, info // no entrance: no option, so no route (the reason comes from the site, route.Result.cutOff)
	}
	if srcN == dstN {
		// Two buildings drawn touching, entered at one point: no cable route between them
		// that spanwright can measure.
		info.excluded = append(info.excluded, fmt.Sprintf("%s and %s are entered at one and the same point (%s): draw the pathway between their telecom rooms, or give each its own entrance",
			l.To, l.From, lay.name[srcN]))
		return dm, info
	}
	outside := lateral > 0 || slices.ContainsFunc(lay.classes, func(c spanClass) bool { return c.outdoor })
	for _, med := range m.eng.Media() {
		if lateral > 0 && !m.allowed(s, med, rate, future, strands, lateralClass) {
			info.excluded = append(info.excluded, fmt.Sprintf("%s: the route leaves a building over a lateral: %s", med, m.whyNot(med, info, lateralClass)))
			continue
		}
		// The medium's first option prices its cable as the cheapest construction its ends
		// allow (cableFor) and keeps off the span classes the rules keep the medium off, and
		// those on which that construction may not be laid (a buried span, for indoor/outdoor
		// cable: rule direct-burial). Such a class gets options of its own, each the laying the
		// rules allow there at the least cost (media.Engine.LayingFor: outside-plant cable,
		// spliced at the entrances to listed cable when the ends are long), priced, reached and
		// kept off classes as that laying: so a route over a buried span is priced and
		// reach-checked as the cable that will be laid there, or kept off it when no laying
		// the book prices may be.
		base, perM := m.cableFor(med, rate, facts, endSlack)
		var exclude uint64
		var others []laid // the layings of the classes the first option may not use, in class order, with their prices
		// Another laying's option is left out when no application at the rate on the medium
		// reaches the shortest route (addOption): then none is looked for.
		reaches := m.eng.LongestRangeM(med, rate)-riser-coils-endLoops-lateral >= sh.betweenM(dm.Source, dm.Target)
		for _, c := range lay.classes {
			switch {
			case !m.allowed(s, med, rate, future, strands, c):
				exclude |= lay.classBit[c]
			case base.Construction != "" && !m.lays(s, med, base, info, c):
				exclude |= lay.classBit[c]
				if !reaches {
					continue
				}
				if other, ok := m.layingFor(med, info, c); ok && other.laying != base && !slices.ContainsFunc(others, func(o laid) bool { return o.laying == other.laying }) {
					others = append(others, other)
				}
			}
		}
		oe := optionEnds{riser: riser, lateral: lateral, coils: coils, endLoops: endLoops,
			ends: ends, endItems: endItems, entered: entered, legBid: legBid, outside: outside, diverse: l.Diverse, sh: sh}
		m.addOption(s, &dm, &info, med, laid{laying: base, price: media.LayingPrice{PerMCents: perM}}, true, exclude, oe)
		for _, other := range others {
			var ex uint64
			for _, c := range lay.classes {
				if !m.allowed(s, med, rate, future, strands, c) || !m.lays(s, med, other.laying, info, c) {
					ex |= lay.classBit[c]
				}
			}
			m.addOption(s, &dm, &info, med, other, false, ex, oe)
		}
		dropOutpriced(&dm, &info, med, sh)
	}
	return dm, info
}

// dropOutpriced takes the first option of medium med out of dm when another option of the
// medium may use every span it may, costs no more a metre (the same cables), and costs no
// more on a route as long as the shortest between the link's ends (so on every longer one),
// and reaches at least twice that: outside-plant cable spliced at the entrances on a long
// link, whose enclosures the cheaper metre has paid for before the route is that long. The
// first option would win only on a route longer than the other reaches, more than twice the
// shortest; that is given up (a model simplification, no published source) to spare the
// optimizer the searches of an option it would not choose.
func dropOutpriced(dm *optimize.Demand, info *demandInfo, med string, sh *shortest) {
	ai := slices.IndexFunc(dm.Options, func(o optimize.Option) bool { return o.Name == med })
	if ai < 0 {
		return
	}
	a := &dm.Options[ai]
	far := -1.0
	for _, b := range dm.Options {
		if b.Name == med || optionMedium(b.Name) != med || b.ExcludeFlags&^a.ExcludeFlags != 0 || b.CablePerMCents > a.CablePerMCents ||
			b.Cables != a.Cables || b.CableODMM != a.CableODMM {
			continue
		}
		if far < 0 {
			far = sh.betweenM(dm.Source, dm.Target)
		}
		if b.MaxRouteM < 2*far || float64(b.FixedCents+b.SecondLegCents)+float64(b.CablePerMCents)*far > float64(a.FixedCents+a.SecondLegCents)+float64(a.CablePerMCents)*far {
			continue
		}
		info.excluded = append(info.excluded, fmt.Sprintf("%s: %s costs less on any route of the %.1f m of the shortest or longer", med, b.Name, far))
		info.options = slices.DeleteFunc(info.options, func(n string) bool { return n == med })
		dm.Options = slices.Delete(dm.Options, ai, ai+1)
		return
	}
}

// optionEnds is what every option of a demand takes whatever its route (demand).
type optionEnds struct {
	riser, lateral, coils, endLoops, ends float64
	endItems                              []media.Quantity
	entered                               float64
	legBid                                int64
	outside, diverse                      bool
	sh                                    *shortest
}

// addOption adds to dm the option of medium laid as l.laying (optionName: first, the medium's
// first option, priced l.price.PerMCents a metre, cableFor's price; another, priced as
// layingFor found it), keeping off the edges of exclude, or lists in info why it cannot be
// one.
func (m *Model) addOption(s *site.Site, dm *optimize.Demand, info *demandInfo, med string, l laid, first bool, exclude uint64, e optionEnds) {
	d := m.design
	facts, rate, future := info.facts, info.rate, info.facts.FutureRateGbps
	lay, perM := l.laying, l.price.PerMCents
	name := optionName(med, lay, first, facts.EndA, facts.EndB)
	mm := m.eng.Catalog().Medium(med)
	var maxCh float64
	var transition int64 // what a transition adds whatever the route
	if first {
		maxCh = m.reachM(s, med, media.Laying{}, rate, future, facts, e.outside)
	} else {
		// An option besides the medium's first that reaches less than the shortest route
		// between the link's ends (over any edge: optimize.Edge.ReachM, what MaxRouteM is held
		// to) can carry no route, so it is left out and the optimizer spared its searches: a
		// multimode cable spliced at the entrances, whose two splices leave it a few tens of
		// metres, on a long link. The catalog's longest range at the rate bounds the reach
		// before it is worked out.
		far := e.sh.betweenM(dm.Source, dm.Target)
		if m.eng.LongestRangeM(med, rate)-e.riser-e.coils-e.endLoops-e.lateral < far {
			info.excluded = append(info.excluded, fmt.Sprintf("%s: no application at %s on %s reaches the %.1f m of the shortest route", name, media.FormatRate(rate), med, far))
			return
		}
		maxCh = m.reachM(s, med, lay, rate, future, facts, true)
		if lay.Inside != "" {
			price := l.price
			// The inside cable in the buildings of the transition's ends instead of the
			// outside-plant cable there (media.Engine's cost).
			insideM := items.Wasted(d, layingInsideM(lay, facts))
			// The transition ends' items besides cable (media.TransitionEnds: enclosures and
			// trays, splicing, the inside cable ends' preparation, the enclosures'
			// installation and the bid items per cable end), priced by the engine as the bill
			// prices them (media.LayingPrice).
			transition = media.MulCents(price.InsidePerMCents, insideM) - media.MulCents(price.PerMCents, insideM) +
				price.HardwareCents + price.LabourCents
		}
	}
	// The route may take what the channel leaves of the reach: the channel also holds the
	// risers, the service coils and entrance loops, the halves of the slack loops at the
	// end structures and the laterals (takeoff), whatever the route.
	maxRoute := maxCh - e.riser - e.coils - e.endLoops - e.lateral
	fixed := m.eng.FixedCentsFor(med, rate, facts)
	switch {
	case perM < 0 || fixed < 0:
		info.excluded = append(info.excluded, fmt.Sprintf("%s: the price book prices no cable, termination or transceiver it needs at %s", name, media.FormatRate(rate)))
		return
	case maxRoute <= 0:
		info.excluded = append(info.excluded, fmt.Sprintf("%s: reaches at most %.1f m of channel; risers, slack loops and laterals alone take %.1f m", name, maxCh, maxCh-maxRoute))
		return
	case !first && maxRoute < e.sh.betweenM(dm.Source, dm.Target):
		info.excluded = append(info.excluded, fmt.Sprintf("%s: reaches %.1f m of route, and the shortest route is %.1f m", name, maxRoute, e.sh.betweenM(dm.Source, dm.Target)))
		return
	}
	// The cables a leg pulls side by side and their size: known before routing only up to
	// the construction the rules pick on the route (cableFit: the largest of those it may
	// run outdoors), as the bill counts them (CableTakeoff.Fit).
	od, cables := cableFit(m.eng, mm, info.strands, facts.CopperCables)
	// What the leg takes whatever its path: the cable of its risers, laterals, service coils,
	// entrance loops and the halves of the structure loops at its ends that its spans leave
	// out (problem), with waste (perM is all its cables'), and for each cable their pulls
	// and the crew's work at its ends; a diverse link pays them again for its second leg,
	// when it gets one.
	fixed += media.MulCents(perM, items.Wasted(d, e.ends)) + m.cents(items.Times(float64(cables), e.endItems...)...) +
		m.bidPer(media.BidBases{Structures: 1}, e.entered*float64(cables)) + e.legBid + transition + m.bondingCents(mm, lay, info.strands, e.outside)
	second := int64(0)
	if e.diverse {
		second = fixed
	}
	if !d.TurnHandholes {
		exclude |= flagTurn // routes change pathway only where a structure stands
	}
	if d.Innerduct() {
		if !items.InnerductFits(d, od) {
			exclude |= flagDuct
			info.excluded = append(info.excluded, fmt.Sprintf("%s: its %g mm cable does not fit the %g mm innerduct (53 %% fill, NFPA 70 Chapter 9 Table 1), so it is kept off ducts",
				name, od, d.InnerductIDMM))
		}
		od = d.InnerductODMM // ducts hold the innerducts
	}
	dm.Options = append(dm.Options, optimize.Option{Name: name, CablePerMCents: perM, FixedCents: fixed, SecondLegCents: second,
		MaxRouteM: maxRoute, ExcludeFlags: exclude, CableODMM: od, Cables: cables})
	info.options = append(info.options, name)
	if info.layings == nil {
		info.layings = map[string]media.Laying{}
	}
	info.layings[name] = lay
}

// bondingCents is what bonding the metallic members of the cables of laying lay of medium mm
// for strands strands costs at the buildings they enter from outside (media.BondingEnds, the
// bill's and the engine's item: two ends a cable), when the laying's outside construction has
// such members and a route may leave the buildings (outside: the campus has spans outside
// them or the link a lateral, as every laying besides the medium's first). The option is priced before its route is known: a first
// option whose route stays inside is charged it all the same, a model simplification (no
// published source) that only a catalog with a listed conductive construction (OFCR, OFCP)
// meets, and none on the embedded catalog, whose constructions are all-dielectric.
func (m *Model) bondingCents(mm *media.Medium, lay media.Laying, strands int, outside bool) int64 {
	k := mm.Construction(lay.Construction)
	if k == nil || !k.MetallicMembers || !outside {
		return 0
	}
	c, _ := m.eng.Cables(mm, k, strands)
	return m.cents(media.BondingEnds(k, 2*len(c))...)
}

// reachM is the longest channel, in metres, over which medium carries a link of facts with
// the splices the plan puts in a channel that long: the mid-span splices between reels of
// design.reel_m (reels) and, outside, the repair splices of the margin policy. The splicing
// slack those joins take (spliceSlackM) is fibre in the channel too, so it is counted and
// then left out of the length returned (CableTakeoff.beforeJoinsM), as the ends' coils are
// left out by the caller: a channel that closes its budget only without that slack is beyond
// reach. Each is loss in
// the budget (ANSI/TIA-568.3-D: 0.3 dB a fusion splice), so a long single-mode channel
// reaches less than media.Engine.MaxChannelM says for an inside link with no splices (issue
// 16: 17,760 m of route quoted with neither; 12,000 m with the three reel splices and the
// repair splices of its outside plant, where the media choice then agrees). It is the one
// reach the optimizer keeps a route within and its reasons quote (less what the channel
// holds besides the route, demand).
//
// With outside, when the campus has pathways outside the buildings (or the link a lateral),
// the reach is also measured on a route that leaves them: its outside plant then counts the
// repair splices the margin policy allows per km of single-mode outside plant, as the leg's
// own facts will (fillLeg), and the shorter of the two reaches is kept. A medium the rules
// keep out of outside plant altogether keeps its reach inside: which spans it may use is the
// span classes' matter (Model.allowed), not the reach's.
//
// With a laying (not the zero one) the reach is the medium's laid so, and is measured on the
// route that leaves the buildings only: outside-plant cable may not carry a link that stays
// inside, and a transition is outside plant spliced at the entrances.
func (m *Model) reachM(s *site.Site, medium string, lay media.Laying, rate, future float64, facts media.Link, outside bool) float64 {
	if lay.Construction != "" {
		facts.Outdoor = true
		return m.reachWithJoinsM(s, medium, lay, rate, future, facts)
	}
	r := m.reachWithJoinsM(s, medium, lay, rate, future, facts)
	if outside {
		facts.Outdoor = true
		out := m.reachWithJoinsM(s, medium, lay, rate, future, facts)
		if out > 0 {
			r = min(r, out)
		}
	}
	return r
}

// reachWithJoinsM is reachM on the facts as they are. R(n), the engine's longest channel
// with n splices more, less the splicing slack of n joins, falls as n grows while
// joinsUpToM(n) (the splicing slack likewise left out) grows, so the reach is in the band of
// the first n with R(n) ≤ joinsUpToM(n): R(n) there, or the top of the band below when R(n)
// falls short of it (that band's channels all close). That n is at most the joins of a channel
// R(0) long, and is found counting down from there: a few of the engine's answers, not one per
// band.
//
// The joins are counted over the cable the laying buys from reels (CableTakeoff.cut): with an
// entrance transition the outside-plant cable only, the channel less the inside metres at the
// transition's ends (insideM), whose pieces are cut from other reels (review 14 F3: a leg that
// closes with the joins its outside cable takes was refused on the joins of its whole channel).
func (m *Model) reachWithJoinsM(s *site.Site, medium string, lay media.Laying, rate, future float64, facts media.Link) float64 {
	at, upM, insideM := m.joinBands(s, medium, lay, rate, future, facts)
	r0 := at(0)
	if r0 <= upM(0) {
		return r0 // one reel (or no reel limit) carries it
	}
	_, reelsAt := reels(m.design, r0-insideM)
	n, rn := firstBand(at, upM, reelsAt-1) // R(n) ≤ R(0) ≤ upM(n) at the joins of a channel R(0) long
	return max(rn, upM(n-1))
}

// joinBands are reachWithJoinsM's two sides: at(n), the longest channel the medium reaches on
// the laying with n joins more (their splices and splicing slack; the engine's answer, shared
// by a sweep's price books), and upM(n), the longest channel n joins allow the reels to carry
// (with the laying's inside metres, insideM, which other reels give).
func (m *Model) joinBands(s *site.Site, medium string, lay media.Laying, rate, future float64, facts media.Link) (at, upM func(int) float64, insideM float64) {
	base, slackM := facts.Splices, facts.SlackM
	at = func(n int) float64 {
		joinsM := spliceSlackM(m.design, n)
		facts.Splices, facts.SlackM = base+n, slackM+joinsM
		return m.maxChannelMAs(s, medium, lay, rate, future, facts) - joinsM
	}
	insideM = layingInsideM(lay, facts)
	upM = func(n int) float64 { return joinsUpToM(m.design, n) + insideM }
	return at, upM, insideM
}

// reachKey is what maxChannelMAs's answer depends on: the medium, the laying, the rates and
// the link's facts as the engine's verdicts read them (media.Engine.VerdictKey).
type reachKey struct {
	medium       string
	laying       media.Laying
	rate, future float64
	link         media.LinkKey
}

// maxChannelMAs is the engine's MaxChannelMAs, remembered per plan and, across the engines of
// a sweep's price books, by the site (media.ReachMemo): a plan asks it again for every option
// of every link with the same ends' facts.
func (m *Model) maxChannelMAs(s *site.Site, medium string, lay media.Laying, rate, future float64, facts media.Link) float64 {
	k := reachKey{medium: medium, laying: lay, rate: rate, future: future, link: m.eng.VerdictKey(facts)}
	if v, ok := m.reachMemo[k]; ok {
		return v
	}
	m.hold(s, 1, 0)
	v := s.Reaches.MaxChannelMAs(m.eng, medium, lay, rate, future, facts)
	m.reachMemo[k] = v
	return v
}

// hold makes room in the site's memo of reaches for what the plan has asked it and reaches
// and lays questions more (media.ReachMemo.Hold): each once, as the model's own memos ask
// them, so that the memo drops none of them, and the next scenario of a sweep, asking them
// in the same order, finds them.
func (m *Model) hold(s *site.Site, reaches, lays int) {
	s.Reaches.Hold(len(m.reachMemo)+len(m.allowedMemo)+reaches, len(m.laysMemo)+lays)
}

// layingInsideM is the leg's cable inside the buildings at the laying's transition ends
// (facts.InsideAM, InsideBM), which the laying buys as inside cable: 0 without a transition.
func layingInsideM(lay media.Laying, facts media.Link) float64 {
	insideM := 0.0
	if lay.Inside != "" {
		if lay.At.Has(media.EndA) {
			insideM += facts.InsideAM
		}
		if lay.At.Has(media.EndB) {
			insideM += facts.InsideBM
		}
	}
	return insideM
}

// firstBand is the first count of joins n in 1..last whose channel with n joins more, at(n),
// is within upM(n), the longest channel n joins allow, and at(n); at(0) is beyond upM(0) and
// at(last) within upM(last). at falls and upM grows with n, so the counts split in two runs,
// and the first of the second is found by doubling from 1 and halving back: about 2 log₂ n
// of at's answers (each the engine's), where counting down from last took one per count
// (review 15 F5: reel_m 100 with 47.6 m of splicing slack an end, a reel carrying 4 cm
// besides its slack, counted down from tens of thousands of joins, for minutes).
func firstBand(at, upM func(int) float64, last int) (int, float64) {
	last = max(last, 1)
	seen := map[int]float64{}
	within := func(n int) bool {
		r, ok := seen[n]
		if !ok {
			r = at(n)
			seen[n] = r
		}
		return r <= upM(n)
	}
	lo, hi := 0, 1 // within(lo) false (at(0) is beyond upM(0)); hi the next count to look at
	for hi < last && !within(hi) {
		lo, hi = hi, 2*hi
	}
	hi = min(hi, last) // within(hi), or hi = last, taken as within as counting down took it
	for hi-lo > 1 {
		if mid := lo + (hi-lo)/2; within(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	within(hi)
	return hi, seen[hi]
}

// cableKey is what cableFor's answer depends on: the medium, the rate and the link's facts as
// cableFor hands them to the engine, as the engine's verdicts read them
// (media.Engine.VerdictKey: every field of the link but its ID and the names no rule reads),
// so a fact the rules read is never left out (the 4-pair cables of a copper link were, and
// two links of one fibre count but three and four copper cables shared a price).
type cableKey struct {
	medium string
	rate   float64
	link   media.LinkKey
}

// cabled is cableFor's answer.
type cabled struct {
	laying media.Laying
	perM   int64
}

// cableFor is the cable price per metre the rules let medium run outdoors with the link's
// risers and slackM of slack, and the laying it prices (media.Engine.CableLayingFor),
// remembered per plan.
func (m *Model) cableFor(medium string, rate float64, facts media.Link, slackM float64) (media.Laying, int64) {
	facts.Outdoor, facts.SlackM = true, slackM
	k := cableKey{medium, rate, m.eng.VerdictKey(facts)}
	if v, ok := m.cableMemo[k]; ok {
		return v.laying, v.perM
	}
	lay, perM := m.eng.CableLayingFor(medium, rate, facts)
	m.cableMemo[k] = cabled{lay, perM}
	return lay, perM
}

// layingKey is what lays' and layingFor's answers depend on: the medium, the laying (lays
// only), the rate, and the link's facts on spans of the class as they are handed to the
// engine (classFacts), as its verdicts read them (media.Engine.VerdictKey: every field of the
// link but its ID and the names no rule's condition reads). A rule on an end's building
// (end_a, end_b) so keys the ends; a key of chosen fields left them out, and a link got the
// verdict of another with other ends.
type layingKey struct {
	medium string
	laying media.Laying
	rate   float64
	link   media.LinkKey
}

func (m *Model) layingKeyOf(medium string, lay media.Laying, rate float64, facts media.Link) layingKey {
	return layingKey{medium: medium, laying: lay, rate: rate, link: m.eng.VerdictKey(facts)}
}

// classFacts are the link's facts on a route that leaves the buildings over spans of class c
// alone, as cableFor prices a medium (outdoors): what lays and layingFor judge a laying on.
func classFacts(info demandInfo, c spanClass) media.Link {
	l := c.facts(info.facts)
	l.Outdoor = true
	return l
}

// lays reports whether the rules let medium's cable laid as lay carry the link over spans of
// class c (media.Engine.Lays), remembered per plan and, across the engines of a sweep's price
// books, by the site (media.ReachMemo.Lays).
func (m *Model) lays(s *site.Site, medium string, lay media.Laying, info demandInfo, c spanClass) bool {
	facts := classFacts(info, c)
	k := m.layingKeyOf(medium, lay, info.rate, facts)
	if v, ok := m.laysMemo[k]; ok {
		return v
	}
	m.hold(s, 0, 1)
	v := s.Reaches.Lays(m.eng, medium, lay, info.rate, facts)
	m.laysMemo[k] = v
	return v
}

// laid is a laying and its prices: layingFor's answer.
type laid struct {
	laying media.Laying
	price  media.LayingPrice
}

// layingFor is the laying of medium the rules let carry the link over spans of class c at
// the least cost, with its prices (media.Engine.LayingFor), remembered per plan; ok is false
// when none may.
func (m *Model) layingFor(medium string, info demandInfo, c spanClass) (l laid, ok bool) {
	facts := classFacts(info, c)
	k := m.layingKeyOf(medium, media.Laying{}, info.rate, facts)
	if v, ok := m.layingMemo[k]; ok {
		return v, v.laying.Construction != ""
	}
	l.laying, l.price, ok = m.eng.LayingFor(medium, info.rate, facts)
	m.layingMemo[k] = l
	return l, ok
}

// allowedFor is allowed for the demand's medium, rate and strands, as remembered: whether
// the rules let the medium run on class c at all.
func (m *Model) allowedFor(medium string, info demandInfo, c spanClass) bool {
	k := allowedKey{medium, info.rate, info.facts.FutureRateGbps, info.strands, c}
	v, ok := m.allowedMemo[k]
	return ok && v
}

// cableFit is the outside diameter in millimetres of the cable the duct capacity counts for
// the medium and strands, and how many such cables a leg pulls side by side (a copper link's
// 4-pair cables, one per port pair, ANSI/TIA-568.2; a fibre count above the largest size's):
// the largest of its outdoor-rated constructions' cables (media.Engine.Cables, the bill's, on
// the same prices) and the most of them, since the rules pick the leg's construction only
// once it is routed (on its inside runs), and a duct sized for a thinner or fewer cables
// would leave a cable in no duct; of its first construction when none is outdoor-rated. Every
// cable counts at the largest one's diameter (the optimizer's option has one diameter,
// optimize.Option.CableODMM): of 288 + 12 strands both at the 288's, more than the bill's
// duct fill (estimate) gives the 12. The count is the bill's (CableTakeoff.Fit) when the
// rules pick the construction with the most; with another, the model counts more cables than
// the bill (README, "One cost model").
func cableFit(eng *media.Engine, m *media.Medium, strands, copperCables int) (odMM float64, cables int) {
	if m.Kind == media.KindCopper {
		strands = copperCables
	}
	found := false
	for _, k := range m.Constructions {
		if k.OutdoorRated {
			c, _ := eng.Cables(m, k, strands)
			odMM, cables, found = max(odMM, c.Largest().ODMM), max(cables, len(c)), true
		}
	}
	if !found && len(m.Constructions) > 0 {
		c, _ := eng.Cables(m, m.Constructions[0], strands)
		odMM, cables = c.Largest().ODMM, len(c)
	}
	return odMM, max(cables, 1)
}

// runsOf is the site's runs of new construction with the handholes the design places along
// them (site.NewRuns).
func (m *Model) runsOf(s *site.Site) []site.NewRun {
	return s.NewRuns(m.design.HandholeSpacingM, m.design.PullBendDeg)
}

// crewHalves is the share of the crew's work one cable takes at junctions js (items.AtJunctions):
// half a pull point and half an entry at each that is one, so that a route passing a junction
// pays one whole over the two spans it takes there.
func crewHalves(s *site.Site, js ...string) (pull, entered float64) {
	for _, j := range js {
		if items.PullPoint(s, j) {
			pull += 0.5
		}
		if items.Entered(s, j) {
			entered += 0.5
		}
	}
	return pull, entered
}

// bidPer prices the bid items per unit of the basis set to 1 in bases (items.BidPer), for
// amount units.
func (m *Model) bidPer(bases media.BidBases, amount float64) int64 {
	return m.cents(items.Times(amount, m.bidItems(bases)...)...)
}

// bidItems is items.BidPer(m.prices, bases), remembered: the problem asks it for every span
// and link with a few fixed bases. The slice is shared: callers append to it only after
// copying (append to a nil or full slice copies) and never change its elements.
func (m *Model) bidItems(bases media.BidBases) []media.Quantity {
	qs, ok := m.bidMemo[bases]
	if !ok {
		qs = slices.Clip(items.BidPer(m.prices, bases))
		m.bidMemo[bases] = qs
	}
	return qs
}

// entranceCents is what using a building entrance costs whatever the cables in it: its entry
// and its counted lateral built (items.Entrance), with the bid items per metre of new buried
// work along the lateral. The handhole where the lateral taps a duct is its junction's
// (layout's charges, prepaidTaps). Its prices are checked by CheckPrices (priceNeeds).
func (m *Model) entranceCents(e geo.Entry) int64 {
	work := items.Entrance(m.prices, m.design, e.LateralM, e.Built, e.PoleRiser)
	return m.cents(work...) + m.bidPer(media.BidBases{NewBuriedM: 1}, e.LateralM)
}

// cents prices quantities one by one (media.PriceBook.Cents) and sums them.
func (m *Model) cents(qs ...media.Quantity) int64 {
	var c int64
	for _, q := range qs {
		c += m.prices.Cents(q)
	}
	return c
}

// perM is the price of quantities given per metre, in whole cents per metre (every money
// price in a book is whole cents, so for material and construction this is exact).
func (m *Model) perM(qs ...media.Quantity) int64 {
	var c float64
	for _, q := range qs {
		u, _ := m.prices.UnitCents(q)
		c += u * q.Amount
	}
	return int64(math.Round(c))
}
