package geo

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
)

// DefaultNearMissM is how far, in metres, Build looks from a dangling pathway end for a
// pathway or footprint it just misses, when Options.NearMissM is zero (modelling choice: a few
// metres holds the usual drawing slips, a missed snap or a line stopped short of a wall, and
// little that was meant to stop where it does).
const DefaultNearMissM = 5.0

// Meeting is what meets at one junction.
type Meeting struct {
	Junction string
	Spans    []string // IDs of the spans that end there, sorted
	Pathways []string // the pathway ID of each span in Spans
	// Degree is the number of span ends there: a span that leaves and returns to the junction
	// counts twice.
	Degree    int
	Structure bool // the junction is a maintenance hole, handhole or pull box
	// Open marks a junction without a structure where every span is aerial (a pole: the
	// cable is lashed to the strand and turns or branches on the pole) or every span is a
	// tunnel or tray (the cable lies on racks or in a tray, in reach all along): a cable
	// passes there from any span into any other with nothing built (PassOpen). Where an
	// aerial span meets a duct or a buried cable (a riser pole), or a tunnel or tray meets
	// one, the cable goes into the ground there and is not open (common practice, no
	// published source).
	Open bool
	// Buildings lists, sorted, the buildings the junction is an entrance of without a counted
	// lateral (a pathway end on the footprint, or a declared entrance on a pathway): there the
	// cable is in the building.
	Buildings []string
}

// Pass is how a cable passes from one span to another at a junction.
type Pass string

// Ways to pass a junction, the values of PassAt.
//
// Pathways drawn meeting at a point are, underground, separate ducts: a cable pulled along one
// duct can only leave it for another where someone can reach in, at a maintenance hole,
// handhole or pull box. So a route turns from one pathway into another only at a structure;
// where three or more spans meet with no structure, a turn needs one built there. Two spans
// meeting alone (a duct drawn in pieces), and spans of one run of duct through the junction
// (RunsAt: the pieces of one pathway split where another joins it, pathways carried on
// within straightOnDeg, one duct drawn as two features meeting at its bend), are the same
// duct carried on. (Common practice, no published source; TIA-569's
// rule of a pull point after at most two 90° bends of conduit is the related published rule,
// from memory.) A turn at a building's entrance (Meeting.Buildings) is made inside the
// building, where the cable leaves its duct anyway: it needs no structure, but it passes
// through the building, which Transit says whether routes may do. Where only aerial spans
// meet (a pole), or only tunnels and trays, nothing is underground: the cable is lashed to
// the strand at the pole, or lies on the racks or in the tray, and turns there as it is
// placed (Meeting.Open).
const (
	PassStraight       Pass = "straight"        // degree 2, pieces of one pathway, or one run of duct (RunsAt)
	PassAtStructure    Pass = "structure"       // a turn from one pathway into another at a structure
	PassInBuilding     Pass = "building"        // a turn at an entrance, inside the building
	PassOpen           Pass = "open"            // a turn where only aerial spans (a pole) or only tunnels and trays meet
	PassNeedsStructure Pass = "needs-structure" // a turn with three or more spans, no structure and no building
)

// Transit says whether routes may pass through a building, in at one of its entrances and
// out at another.
type Transit struct {
	Building string
	Allowed  bool     // Marked, or some pathway is drawn inside the building
	Marked   bool     // the building's "transit" property is true
	Interior []string // IDs of the pathways inside the building, sorted
	// Parted lists, for each point inside the building where pathway ends met and were parted
	// because the building is not marked (splitInside), the junctions at the walls where those
	// pathways now end, sorted; transit: true would keep them one junction. Sorted by first ID.
	Parted [][]string
}

// NearMiss is a dangling pathway end (one joined to nothing) that lies near a pathway or a
// building footprint it does not join: farther than SnapM, within Options.NearMissM.
type NearMiss struct {
	Pathway  string // the pathway whose end it is
	Source   Source // that pathway's feature
	Junction string // the junction at the end
	End      orb.Point
	// Kind is KindPathway or KindBuilding: what the end misses; Target is its ID.
	Kind   string
	Target string
	At     orb.Point // the nearest point of the target (of the footprint's boundary)
	// DistanceM is the ellipsoidal distance from End to At; SnapM the snap distance it is
	// beyond.
	DistanceM float64
	SnapM     float64
	// For a structure missed (Kind KindStructure): its type, and the pathways the end joins
	// instead (sorted; none when it dangles).
	StructureType string
	Joins         []string
	// Lateral says the end joins nothing but the counted lateral of the building whose
	// footprint it misses (Kind KindBuilding): the plan reaches the building across the gap.
	Lateral bool
}

// structureMissFactor times SnapM is how far from a structure a pathway end that does not
// join it is a near miss, whether or not the end joins something else: a structure is a point
// in the file but a box of 1 to 2 m in the ground, and a GIS office draws ducts to its wall
// (common practice, no published source).
const structureMissFactor = 4

// String says what was missed and by how much, e.g. "pathway D-12 ends 0.8 m from pathway
// T-3, beyond snap_m 0.5".
func (m NearMiss) String() string { return "pathway " + m.Pathway + " ends " + m.Gap() }

// Gap is String without the pathway's name: "0.8 m from pathway T-3, beyond snap_m 0.5". The
// warning about an end joined to nothing carries it too (tester 12 F12: the plan's report said
// "joined to nothing" where check said by how much the end misses what).
func (m NearMiss) Gap() string {
	if m.Kind == KindStructure {
		instead := ""
		if len(m.Joins) > 0 {
			instead = "; it joins pathway " + strings.Join(m.Joins, " and ") + " there instead"
		}
		return fmt.Sprintf("%s m from %s %s, beyond snap_m %s%s (drawn to its wall? snap_m %s would join it)",
			fmtBeyond(m.DistanceM, m.SnapM), m.StructureType, m.Target, fmtM(m.SnapM), instead, snapToJoin(m.DistanceM))
	}
	what := "pathway"
	if m.Kind == KindBuilding {
		what = "the footprint of building"
	}
	if m.Lateral {
		return fmt.Sprintf("%s m from %s %s, beyond snap_m %s; the plan reaches it there by a counted lateral and a new entrance (drawn to its wall? snap_m %s would join it)",
			fmtBeyond(m.DistanceM, m.SnapM), what, m.Target, fmtM(m.SnapM), snapToJoin(m.DistanceM))
	}
	return fmt.Sprintf("%s m from %s %s, beyond snap_m %s", fmtBeyond(m.DistanceM, m.SnapM), what, m.Target, fmtM(m.SnapM))
}

// snapToJoin is the snap_m, in whole tenths of a metre, that takes in distance d.
func snapToJoin(d float64) string {
	return strconv.FormatFloat(math.Ceil(d*10-1e-9)/10, 'f', 1, 64)
}

// fmtBeyond prints distance d with one decimal, or as many more (up to three) as it takes not
// to print a value that does not exceed snap.
func fmtBeyond(d, snap float64) string {
	for prec := 1; ; prec++ {
		s := strconv.FormatFloat(d, 'f', prec, 64)
		if x, _ := strconv.ParseFloat(s, 64); x > snap || prec == 3 {
			return s
		}
	}
}

// EndName names the junction with the given ID as the end of a span a crew measures from: the
// building it enters (Meeting.Buildings, joined by "/" where several), else its ID (a
// structure's own id, "J" and a number, which the outputs place by its coordinates, or the
// two spans that meet there end to end, "A+B").
func (n *Network) EndName(junction string) string {
	if m, ok := n.MeetingAt(junction); ok && len(m.Buildings) > 0 {
		return strings.Join(m.Buildings, "/")
	}
	return junction
}

// MeetingAt returns what meets at the junction with the given ID. It takes O(1) on a Network
// from Build and O(spans) on one assembled by hand.
func (n *Network) MeetingAt(junction string) (Meeting, bool) {
	if n.junctionIdx != nil && len(n.Meetings) == len(n.Junctions) {
		i, ok := n.junctionIdx[junction]
		if !ok {
			return Meeting{}, false
		}
		return n.Meetings[i], true
	}
	j, ok := n.Junction(junction)
	if !ok {
		return Meeting{}, false
	}
	return meetingOf(j, n), true
}

// meetingOf gathers from the spans and entrances of n what meets at junction j.
func meetingOf(j Junction, n *Network) Meeting {
	m := Meeting{Junction: j.ID, Structure: j.Kind == JunctionStructure}
	var open openWays
	for _, s := range n.Spans {
		if s.From != j.ID && s.To != j.ID {
			continue
		}
		open.add(s.Type)
		m.Spans = append(m.Spans, s.ID)
		m.Pathways = append(m.Pathways, s.PathwayID)
		if s.From == j.ID {
			m.Degree++
		}
		if s.To == j.ID {
			m.Degree++
		}
	}
	for _, e := range n.Entrances {
		if e.Junction == j.ID && (e.Via == ViaFootprint || (e.Via == ViaEntrance && e.LateralM == 0)) && !contains(m.Buildings, e.Building) {
			m.Buildings = append(m.Buildings, e.Building)
		}
	}
	sort.Strings(m.Buildings)
	m.Open = !m.Structure && open.open()
	return m
}

// openWays gathers the types of the spans that meet at a junction, for Meeting.Open.
type openWays struct{ aerial, inside, other int }

func (o *openWays) add(typ string) {
	switch typ {
	case TypeAerial:
		o.aerial++
	case TypeTunnel, TypeTray:
		o.inside++
	default:
		o.other++
	}
}

// open reports whether the spans are all aerial, or all tunnels and trays (Meeting.Open).
func (o openWays) open() bool {
	return o.other == 0 && (o.aerial == 0) != (o.inside == 0)
}

// PassAt says how a cable passes from span from to span to at the junction with the given ID
// (see Pass); ok is false when the junction is unknown or either span does not end there.
func (n *Network) PassAt(junction, from, to string) (p Pass, ok bool) {
	m, ok := n.MeetingAt(junction)
	if !ok {
		return "", false
	}
	pf, pt := "", ""
	for i, s := range m.Spans {
		if s == from {
			pf = m.Pathways[i]
		}
		if s == to {
			pt = m.Pathways[i]
		}
	}
	switch {
	case pf == "" || pt == "":
		return "", false
	case m.Degree <= 2 || pf == pt:
		return PassStraight, true
	case m.Structure:
		return PassAtStructure, true
	case len(m.Buildings) > 0:
		return PassInBuilding, true
	case m.Open:
		return PassOpen, true
	}
	var at []int // the spans ending there, in index order (the order of m.Spans)
	if n.spanIdx != nil {
		for _, id := range m.Spans {
			at = append(at, n.spanIdx[id])
		}
	} else {
		for i := range n.Spans {
			if s := &n.Spans[i]; s.From == junction || s.To == junction {
				at = append(at, i)
			}
		}
	}
	for _, run := range n.RunsAt(junction, at) {
		in := func(id string) bool { return slices.ContainsFunc(run, func(i int) bool { return n.Spans[i].ID == id }) }
		if in(from) && in(to) {
			return PassStraight, true
		}
	}
	return PassNeedsStructure, true
}

// straightOnDeg is the largest deflection, in degrees, at which a cable passing a junction
// from one span into another is carried on in the same duct run rather than turned: a duct
// bank drawn as several pathways meets itself end to end at small angles (common practice, no
// published source).
const straightOnDeg = 30

// maxBendDeg is the largest deflection, in degrees, of a bend of one duct where two features
// meet (RunsAt's third rule): a conduit bend is at most a 90° sweep (TIA-569's limit for one
// bend between pull points, from memory); two ducts that meet at a sharper angle are turned
// between in a structure.
const maxBendDeg = 90

// ductFacts is what a pathway, or a span of one, says of its ducts: the facts sameDucts
// compares.
type ductFacts struct {
	typ, status string
	spare       int
	ductMM      float64
	group, own  string // the shared-risk group and the pathway's own id (its group when none is given)
}

func (p *Pathway) ductFacts() ductFacts {
	return ductFacts{p.Type, p.Status, p.SpareDucts, p.DuctMM, p.Group, p.ID}
}

func (s *Span) ductFacts() ductFacts {
	return ductFacts{s.Type, s.Status, s.SpareDucts, s.DuctMM, s.Group, s.PathwayID}
}

// givenGroup is the shared-risk group when one is given, else "".
func (d ductFacts) givenGroup() string {
	if d.group == d.own {
		return ""
	}
	return d.group
}

// sameDucts reports whether a and b (two spans, or two pathways) carry the same ducts, as far
// as the campus says: the same pathway type and status, the same spare ducts and duct size,
// and no two different shared-risk groups given (a group left out is the pathway's own id,
// which says nothing). Two such pathways meeting end to end are one duct drawn in two
// features, as a facilities GIS splits a pathway where another joins it (common practice, no
// published source).
func sameDucts(a, b ductFacts) bool {
	return a.typ == b.typ && a.status == b.status && a.spare == b.spare && a.ductMM == b.ductMM &&
		(a.group == b.group || a.group == a.own || b.group == b.own)
}

// RunsAt groups spans, the spans ending at junction j as indices into Spans in index order,
// into runs of duct through j: a cable carried from one span into another of its run stays in
// its duct, from one run into another it turns (at a junction without a structure, a turn
// that needs one built). A duct carries on into at most one other, so a run is one span or
// two: RunsAt matches the spans in pairs, greedily, each pair taken when neither of its spans
// is taken yet, in this order of priority (and within one, the straighter pair first):
//
//  1. pieces of one pathway drawn through j;
//  2. two spans of one type and status, one carrying on from the other within straightOnDeg
//     (a duct bank drawn as several pathways);
//  3. two spans that carry the same ducts (sameDucts) and are each other's one way on, the
//     turn between them (a bend of the duct, at most maxBendDeg) the least at j for both by
//     at least straightOnDeg and neither carried on straight (within straightOnDeg) by
//     another span of its type and status nor by a piece of its own pathway: one duct drawn
//     as two features that meet at its bend, where another pathway joins;
//  4. two spans of different kinds, one carrying on from the other within straightOnDeg (new
//     trench from an existing duct, an aerial span from a duct riser).
//
// So a run never turns sharply: a lateral within straightOnDeg of one piece of a street is
// not carried on into the other piece, and a narrow fork's branches, or duct, aerial and duct
// again, are not one run (before, runs were joined transitively and chained so). A cable goes
// from one run into another in a handhole or pull box (common practice, no published source;
// TIA-569's pull point after at most two 90° bends of conduit is the related published rule,
// from memory): where new pathway joins there, the handhole it gets is that one (package
// routing).
//
// The decision rests on the geometry and the spans' properties, never on their ids beyond
// "the same pathway", so splitting a pathway into two features where another joins it changes
// no run; equal priority and deflection are settled by span index. Runs are in the order of
// their first span, the spans of each in the order of spans. Time O(k² log k) for k spans.
func (n *Network) RunsAt(j string, spans []int) [][]int {
	k := len(spans)
	turn := make([][]float64, k) // turn[a][b]: the deflection from span a into span b at j
	for a := range spans {
		turn[a] = make([]float64, k)
		for b := range spans {
			if a != b {
				sa, sb := &n.Spans[spans[a]], &n.Spans[spans[b]]
				in := Step{SpanID: sa.ID, Reverse: sa.From == j}
				out := Step{SpanID: sb.ID, Reverse: sb.To == j}
				turn[a][b] = n.TurnDeg(in, out)
			}
		}
	}
	span := func(a int) *Span { return &n.Spans[spans[a]] }
	sameKind := func(a, b int) bool { return span(a).Type == span(b).Type && span(a).Status == span(b).Status }
	carriedOn := make([]bool, k) // by a piece of its own pathway, or straight by its own kind
	for a := range spans {
		for b := range spans {
			if a != b && (span(a).PathwayID == span(b).PathwayID || (turn[a][b] <= straightOnDeg && sameKind(a, b))) {
				carriedOn[a] = true
			}
		}
	}
	// bend[a] is the span a's duct bends into at j, or -1.
	bend := make([]int, k)
	for a := range spans {
		bend[a] = -1
		if carriedOn[a] {
			continue
		}
		best, next := -1, math.Inf(1)
		for b := range spans {
			if b == a || carriedOn[b] || !sameDucts(span(a).ductFacts(), span(b).ductFacts()) {
				continue
			}
			switch d := turn[a][b]; {
			case best < 0 || d < turn[a][best]:
				if best >= 0 {
					next = turn[a][best]
				}
				best = b
			case d < next:
				next = d
			}
		}
		if best >= 0 && next-turn[a][best] >= straightOnDeg && turn[a][best] <= maxBendDeg {
			bend[a] = best
		}
	}
	// The pairs that may be one run, each with its priority (1 to 4, as above).
	type pair struct {
		a, b, prio int
		deg        float64
	}
	var pairs []pair
	for a := range spans {
		for b := a + 1; b < k; b++ {
			deg := math.Max(turn[a][b], turn[b][a])
			prio := 0
			switch {
			case span(a).PathwayID == span(b).PathwayID:
				prio = 1
			case deg <= straightOnDeg && sameKind(a, b):
				prio = 2
			case bend[a] == b && bend[b] == a:
				prio = 3
			case deg <= straightOnDeg:
				prio = 4
			}
			if prio > 0 {
				pairs = append(pairs, pair{a, b, prio, deg})
			}
		}
	}
	slices.SortStableFunc(pairs, func(x, y pair) int {
		if x.prio != y.prio {
			return x.prio - y.prio
		}
		return cmp.Compare(x.deg, y.deg)
	})
	mate := make([]int, k)
	for i := range mate {
		mate[i] = -1
	}
	for _, p := range pairs {
		if mate[p.a] < 0 && mate[p.b] < 0 {
			mate[p.a], mate[p.b] = p.b, p.a
		}
	}
	var runs [][]int
	for a, i := range spans {
		switch m := mate[a]; {
		case m < 0:
			runs = append(runs, []int{i})
		case m > a:
			runs = append(runs, []int{i, spans[m]})
		}
	}
	return runs
}

// TransitOf returns whether routes may pass through the building with the given ID, as Span
// does.
func (n *Network) TransitOf(building string) (Transit, bool) {
	i := sort.Search(len(n.Transit), func(i int) bool { return n.Transit[i].Building >= building })
	if i < len(n.Transit) && n.Transit[i].Building == building {
		return n.Transit[i], true
	}
	for _, t := range n.Transit {
		if t.Building == building {
			return t, true
		}
	}
	return Transit{}, false
}

// facts fills the junction meetings, the buildings' transit, the dangling-end warnings and
// the near misses, once spans, junctions and entrances are known.
func (b *builder) facts(n *Network) {
	n.Meetings = make([]Meeting, len(n.Junctions))
	at := make(map[string]int, len(n.Junctions))
	for i, j := range n.Junctions {
		n.Meetings[i] = Meeting{Junction: j.ID, Structure: j.Kind == JunctionStructure}
		at[j.ID] = i
	}
	// Two passes, so that every meeting's lists share two backing arrays.
	for _, s := range n.Spans {
		n.Meetings[at[s.From]].Degree++
		n.Meetings[at[s.To]].Degree++
	}
	spans, pathways := make([]string, 2*len(n.Spans)), make([]string, 2*len(n.Spans))
	off := 0
	for i := range n.Meetings {
		m := &n.Meetings[i]
		m.Spans, m.Pathways = spans[off:off:off+m.Degree], pathways[off:off:off+m.Degree]
		off += m.Degree
	}
	open := make([]openWays, len(n.Meetings))
	for _, s := range n.Spans {
		for _, end := range [2]string{s.From, s.To} {
			m := &n.Meetings[at[end]]
			if k := len(m.Spans); k == 0 || m.Spans[k-1] != s.ID {
				m.Spans = append(m.Spans, s.ID)
				m.Pathways = append(m.Pathways, s.PathwayID)
				open[at[end]].add(s.Type)
			}
		}
	}
	for i := range n.Meetings {
		n.Meetings[i].Open = !n.Meetings[i].Structure && open[i].open()
	}
	for _, e := range n.Entrances { // sorted by building
		if e.Via == ViaFootprint || (e.Via == ViaEntrance && e.LateralM == 0) {
			m := &n.Meetings[at[e.Junction]]
			if k := len(m.Buildings); k == 0 || m.Buildings[k-1] != e.Building {
				m.Buildings = append(m.Buildings, e.Building)
			}
		}
	}
	built(n, at)
	b.transit(n)
	b.dangling(n)
}

// built marks the entries that are there already (Entry.Built), from what meets at their
// junctions; at maps a junction ID to its index in n.Meetings.
func built(n *Network, at map[string]int) {
	span := func(id string) *Span { // n.Spans is sorted by ID
		i, _ := slices.BinarySearchFunc(n.Spans, id, func(s Span, id string) int { return strings.Compare(s.ID, id) })
		return &n.Spans[i]
	}
	for i := range n.Entrances {
		e := &n.Entrances[i]
		if e.LateralM > 0 {
			e.PoleRiser = poleRiser(n.Meetings[at[e.Junction]].Spans, span)
			continue
		}
		existing, proposed := false, false
		for _, id := range n.Meetings[at[e.Junction]].Spans {
			switch sp := span(id); {
			case sp.Type == TypeTray:
			case sp.Status == StatusProposed:
				proposed = true
			default:
				existing = true
			}
		}
		e.Built = existing && !proposed
	}
}

// poleRiser reports whether a counted lateral that joins the network where spans meet leaves
// a pole line at a pole where nothing comes down it yet: an aerial span ends there and no
// duct or direct-buried pathway does (Entry.PoleRiser).
func poleRiser(spans []string, span func(string) *Span) bool {
	aerial := false
	for _, id := range spans {
		switch sp := span(id); sp.Type {
		case TypeAerial:
			aerial = true
		case TypeDuct, TypeBuried:
			return false // a riser pole already: its duct or cable comes down the pole
		}
	}
	return aerial
}

// through warns about every proposed pathway of outside work (not a tray, not aerial) among
// pws (the pathways with a segment near footprint f of building id; partsOf gives each
// pathway's first and past-last part) that runs inside f for more than SnapM, past the
// stretch from an end inside f back to its wall: a service duct drawn through the wall to
// the telecom room enters once and is not warned of; a trench drawn across a building, or
// into it and out again to an entrance, is, with the metres inside (projected). The plan
// still prices those metres as new work: only the campus's author can say where it goes.
//
// An existing duct or direct-buried pathway drawn so (a duct drawn schematically straight
// across a building, an old duct under a newer wing, a service duct run on through a wing to
// a courtyard) is warned of too: the cable pulled along it passes under the building in the
// duct, which only the campus's author can confirm. walled says the building is entered
// where such pathways cross its wall (wallDoors), which the warning then says.
//
// It returns the pathways (index, ascending) that run inside f for more than SnapM so, in
// b.pws's storage: good until the next call.
func (b *builder) through(id string, f *footprint, pws []int, partsOf [][2]int, walled bool) []int {
	b.pws = b.pws[:0]
	for _, pw := range pws {
		p := &b.c.Pathways[pw]
		if p.Status == StatusProposed && p.Type != TypeTray && p.Type != TypeAerial ||
			p.Status != StatusProposed && (p.Type == TypeDuct || p.Type == TypeBuried) {
			b.pws = append(b.pws, pw)
		}
	}
	slices.Sort(b.pws)
	b.pws = slices.Compact(b.pws)
	passing := b.pws[:0]
	for _, pw := range b.pws {
		p := &b.c.Pathways[pw]
		var inM float64
		for q := partsOf[pw][0]; q < partsOf[pw][1]; q++ {
			inM += f.passedM(&b.parts[q])
		}
		if inM <= b.snap {
			continue
		}
		passing = append(passing, pw)
		if p.Status == StatusProposed {
			b.warns = append(b.warns, warnRec{p.Source, p.ID, fmt.Sprintf(
				"proposed pathway %q runs %.1f m inside the footprint of building %q, not only to its wall: new work there is priced as if dug outside; draw it around the building, or to the wall where it enters",
				p.ID, inM, id)})
			continue
		}
		entered := ""
		if walled {
			entered = fmt.Sprintf(" building %q is entered where it crosses the wall;", id)
		}
		b.warns = append(b.warns, warnRec{p.Source, p.ID, fmt.Sprintf(
			"existing pathway %q runs %.1f m inside the footprint of building %q, not only to its wall: routes along it pass beneath the building, and those metres count as outside plant;%s check that it runs there, or draw it around the building, or to the wall where it enters",
			p.ID, inM, id, entered)})
	}
	return passing
}

// passedM is the projected length of part p inside footprint f, less the stretches from an
// end of p inside f back to where p crosses into f (the way in to a room).
func (f *footprint) passedM(p *part) float64 {
	type span struct{ from, to float64 }
	var inArr [4]span
	var tsArr [8]float64
	in := inArr[:0]
	for i := 1; i < len(p.xy); i++ {
		f.insideParts(p.xy[i-1], p.xy[i], tsArr[:0], func(t0, t1 float64) {
			from, to := p.along(i-1, t0), p.along(i-1, t1)
			if n := len(in); n > 0 && from-in[n-1].to <= 1e-9 {
				in[n-1].to = to // one stretch inside across a vertex
				return
			}
			in = append(in, span{from, to})
		})
	}
	total := p.cum[len(p.cum)-1]
	var m float64
	for k, s := range in {
		if (k == 0 && s.from <= 1e-9 && f.contains(p.xy[0])) || (k == len(in)-1 && s.to >= total-1e-9 && f.contains(p.xy[len(p.xy)-1])) {
			continue
		}
		m += s.to - s.from
	}
	return m
}

// transit finds, for every building, the pathways drawn inside it: both ends of every line in
// the footprint (or within SnapM of its boundary), or, for a tunnel or tray, more than half
// the pathway's length inside it (projected). A duct with more than half its length inside is
// not enough: service ducts are often drawn through the wall to the telecom room (half of the
// demo campus's are, one end outside), and a building is not a through-route for that.
func (b *builder) transit(n *Network) {
	partsOf := make([][2]int, len(b.c.Pathways)) // first and past-last part of each pathway
	for pi := range partsOf {
		partsOf[pi] = [2]int{-1, -1}
	}
	for q, p := range b.parts {
		if partsOf[p.pw][0] < 0 {
			partsOf[p.pw][0] = q
		}
		partsOf[p.pw][1] = q + 1
	}
	spansOf := make(map[string][]int)  // pathway ID → its duct and buried spans (index)
	indoorOf := make(map[string][]int) // pathway ID → its tunnel and tray spans (index), for indoors
	for i, s := range n.Spans {
		if s.Type == TypeDuct || s.Type == TypeBuried {
			spansOf[s.PathwayID] = append(spansOf[s.PathwayID], i)
		}
		if indoorType(s.Type) {
			indoorOf[s.PathwayID] = append(indoorOf[s.PathwayID], i)
		}
	}
	type under struct {
		building string
		alongM   float64 // where the span enters the footprint, from its From end
		share    float64 // the share of the span's length inside it, wall to wall (through)
	}
	beneath := make(map[int][]under)
	through := make(map[int][]under) // tunnel and tray spans across a footprint, wall to wall
	// Each duct or buried span's line on the local projection, with its bounding box,
	// projected the first time a building it may pass beneath asks for it (by span index).
	type spanXY struct {
		xy     []vec
		lo, hi vec
	}
	spanXYs := make(map[int]*spanXY)
	xyOf := func(si int) *spanXY {
		s := spanXYs[si]
		if s == nil {
			line := n.Spans[si].Line
			s = &spanXY{xy: make([]vec, len(line)), lo: vec{math.Inf(1), math.Inf(1)}, hi: vec{math.Inf(-1), math.Inf(-1)}}
			spanXYs[si] = s
			for i, p := range line {
				s.xy[i] = b.proj.xy(p)
				s.lo = vec{math.Min(s.lo.x, s.xy[i].x), math.Min(s.lo.y, s.xy[i].y)}
				s.hi = vec{math.Max(s.hi.x, s.xy[i].x), math.Max(s.hi.y, s.xy[i].y)}
			}
		}
		return s
	}
	for bi, bl := range b.c.Buildings {
		t := Transit{Building: bl.ID, Marked: bl.Transit}
		f := &b.feet[bi]
		if !f.empty() {
			b.buf = b.segGrid.query(f.lo.sub(vec{b.snap, b.snap}), f.hi.add(vec{b.snap, b.snap}), b.buf)
			var pws []int
			for _, s := range b.buf {
				if pw := b.parts[b.segs[s].part].pw; len(pws) == 0 || pws[len(pws)-1] != pw {
					pws = append(pws, pw)
				}
			}
			for _, pw := range pws {
				if b.inside(f, partsOf[pw]) {
					t.Interior = append(t.Interior, b.c.Pathways[pw].ID)
				}
			}
			for _, pw := range pws {
				for _, si := range indoorOf[b.c.Pathways[pw].ID] {
					if s := xyOf(si); !boxesMiss(s.lo, s.hi, f.lo, f.hi) {
						b.indoors(&n.Spans[si], bl.ID, f, s.xy)
						if at, share, ok := b.passesBeneath(f, s.xy); ok {
							through[si] = append(through[si], under{bl.ID, at, share})
						}
					}
				}
			}
			passing := b.through(bl.ID, f, pws, partsOf, b.walled[bi])
			for _, pw := range passing { // a span passes beneath only where its pathway does
				for _, si := range spansOf[b.c.Pathways[pw].ID] {
					s := xyOf(si)
					if boxesMiss(s.lo, s.hi, f.lo, f.hi) {
						continue // nowhere near f: passesBeneath would find nothing
					}
					if at, _, ok := b.passesBeneath(f, s.xy); ok {
						beneath[si] = append(beneath[si], under{bl.ID, at, 0})
					}
				}
			}
		}
		sort.Strings(t.Interior)
		for _, rs := range b.parted[bi] {
			ids := make([]string, len(rs))
			for i, r := range rs {
				ids[i] = b.ids[b.find(r)]
			}
			sort.Strings(ids)
			t.Parted = append(t.Parted, ids)
		}
		sort.Slice(t.Parted, func(i, j int) bool { return t.Parted[i][0] < t.Parted[j][0] })
		t.Allowed = t.Marked || len(t.Interior) > 0
		n.Transit = append(n.Transit, t)
	}
	sort.Slice(n.Transit, func(i, j int) bool { return n.Transit[i].Building < n.Transit[j].Building })
	for si := range n.Spans {
		slices.SortFunc(n.Spans[si].Indoors, func(x, y IndoorEnd) int {
			if x.AtTo != y.AtTo {
				if y.AtTo {
					return -1
				}
				return 1
			}
			return strings.Compare(x.Building, y.Building)
		})
	}
	for si, us := range beneath {
		slices.SortFunc(us, func(x, y under) int {
			return cmp.Or(cmp.Compare(x.alongM, y.alongM), strings.Compare(x.building, y.building))
		})
		for _, u := range us {
			n.Spans[si].Beneath = append(n.Spans[si].Beneath, u.building)
		}
	}
	for si, us := range through {
		slices.SortFunc(us, func(x, y under) int {
			return cmp.Or(cmp.Compare(x.alongM, y.alongM), strings.Compare(x.building, y.building))
		})
		sp := &n.Spans[si]
		for _, u := range us {
			// The share of the projected line, of the span's ellipsoidal length: the local
			// projection keeps ratios along a line of campus size to well under a millimetre.
			sp.Through = append(sp.Through, Crossing{Building: u.building, LengthM: u.share * sp.LengthM})
		}
	}
}

// indoorType reports whether a span of pathway type typ carries its cable inside a building
// where it runs within the footprint (Span.Indoors): a tunnel or a tray. A duct or
// direct-buried span drawn into a footprint runs beneath the floor slab, and its cable emerges
// where the span ends (NFPA 70 770.2, point of entrance: where the cable emerges from an
// external wall or a concrete floor slab; from memory).
func indoorType(typ string) bool { return typ == TypeTunnel || typ == TypeTray }

// indoors adds to s.Indoors, for a span of an indoorType, the stretch from each end of s (xy:
// its line on the local projection) that lies more than SnapM inside footprint f of building
// id, measured along the line (ellipsoidal, as Span.LengthM) back to where it crosses f's wall
// (wallCrossing, as cutAtWalls cuts there): the whole span when it crosses none. An end within
// SnapM of the wall is at the wall, with nothing inside.
func (b *builder) indoors(s *Span, id string, f *footprint, xy []vec) {
	if !indoorType(s.Type) || len(xy) < 2 || len(s.Line) != len(xy) {
		return
	}
	for _, atTo := range [2]bool{false, true} {
		end := xy[0]
		if atTo {
			end = xy[len(xy)-1]
		}
		if !f.contains(end) {
			continue
		}
		if _, d := f.nearestBoundary(end); d <= b.snap {
			continue
		}
		line := slices.Clone(s.Line) // from the other end to this one
		if !atTo {
			slices.Reverse(line)
		}
		m := s.LengthM
		if kept, _, ok := b.wallCrossing(f, line); ok {
			m = LengthM(line) - LengthM(kept)
		}
		s.Indoors = append(s.Indoors, IndoorEnd{Building: id, AtTo: atTo, LengthM: m})
	}
}

// passesBeneath reports whether line xy (a span's, on the local projection) runs across
// footprint f for more than SnapM (projected) in stretches that begin and end at its
// boundary, not at an end of the line inside it, where along the line (projected metres
// from its first point) the first such stretch begins, and the share of the line's length
// those stretches take (0 to 1).
func (b *builder) passesBeneath(f *footprint, xy []vec) (float64, float64, bool) {
	if len(xy) < 2 {
		return 0, 0, false
	}
	deep := func(p vec) bool { // an end more than SnapM inside the footprint
		if !f.contains(p) {
			return false
		}
		_, d := f.nearestBoundary(p)
		return d > b.snap
	}
	first, last := deep(xy[0]), deep(xy[len(xy)-1])
	type stretch struct{ from, to float64 }
	var in []stretch
	cum := 0.0
	for i := 1; i < len(xy); i++ {
		l := xy[i].dist(xy[i-1])
		f.insideParts(xy[i-1], xy[i], nil, func(t0, t1 float64) {
			from, to := cum+t0*l, cum+t1*l
			if k := len(in); k > 0 && from-in[k-1].to <= 1e-9 {
				in[k-1].to = to
				return
			}
			in = append(in, stretch{from, to})
		})
		cum += l
	}
	var m, at float64
	found := false
	for k, s := range in {
		if (k == 0 && first && s.from <= 1e-9) || (k == len(in)-1 && last && s.to >= cum-1e-9) {
			continue
		}
		if !found {
			at, found = s.from, true
		}
		m += s.to - s.from
	}
	if !found || m <= b.snap || cum <= 0 {
		return 0, 0, false
	}
	return at, m / cum, true
}

// inside reports whether the pathway made of parts r[0]..r[1]-1 lies inside footprint f.
func (b *builder) inside(f *footprint, r [2]int) bool {
	touches := func(xy vec) bool {
		if f.contains(xy) {
			return true
		}
		_, d := f.nearestBoundary(xy)
		return d <= b.snap
	}
	ends := true
	var in, all float64
	for q := r[0]; q < r[1]; q++ {
		p := &b.parts[q]
		if !touches(p.xy[0]) || !touches(p.xy[len(p.xy)-1]) {
			ends = false
		}
		for i := 1; i < len(p.xy); i++ {
			in += f.insideLen(p.xy[i-1], p.xy[i])
		}
		all += p.cum[len(p.cum)-1]
	}
	if ends {
		return true
	}
	typ := b.c.Pathways[b.parts[r[0]].pw].Type
	return (typ == TypeTunnel || typ == TypeTray) && in > all/2
}

// insideLen is the projected length of segment ac inside footprint f.
func (f *footprint) insideLen(a, c vec) float64 {
	l, sum := a.dist(c), 0.0
	f.insideParts(a, c, nil, func(t0, t1 float64) { sum += (t1 - t0) * l })
	return sum
}

// crossings appends to ts the fractions along segment ac where it crosses the rings of
// footprint f (holes included), in ring order.
func (f *footprint) crossings(a, c vec, ts []float64) []float64 {
	for _, poly := range f.rings {
		for _, ring := range poly {
			for i := 1; i < len(ring); i++ {
				if t, _, ok := segIntersect(a, c, ring[i-1], ring[i]); ok {
					ts = append(ts, t)
				}
			}
		}
	}
	return ts
}

// insideParts calls each, in order along segment ac, with the fractions t0 < t1 of every
// stretch of it inside footprint f (between two crossings of its rings); ts is scratch.
func (f *footprint) insideParts(a, c vec, ts []float64, each func(t0, t1 float64)) {
	if boxesMiss(vec{math.Min(a.x, c.x), math.Min(a.y, c.y)}, vec{math.Max(a.x, c.x), math.Max(a.y, c.y)}, f.lo, f.hi) {
		return
	}
	ts = f.crossings(a, c, append(ts[:0], 0, 1))
	sort.Float64s(ts)
	for i := 1; i < len(ts); i++ {
		if ts[i] > ts[i-1] && f.contains(lerp(a, c, (ts[i-1]+ts[i])/2)) {
			each(ts[i-1], ts[i])
		}
	}
}

// dangling warns about every pathway end that joins nothing (no other span, structure,
// entrance or footprint there) and lists what such ends nearly reach. An end that joins
// nothing but the counted lateral of a building whose footprint it stops short of (beyond
// SnapM, within NearMissM: the lateral taps the end, the nearest place) is a near miss of
// that footprint too, warned about as such: the plan builds a new entrance and lateral there.
func (b *builder) dangling(n *Network) {
	entry := make(map[string]int, len(n.Entrances)) // junction → entrances there
	tapped := make(map[string][]Entry)              // junction → the counted laterals of buildings with no other way in that end there
	for _, e := range n.Entrances {
		entry[e.Junction]++
		if e.Via == ViaLateral {
			tapped[e.Junction] = append(tapped[e.Junction], e)
		}
	}
	degree := make(map[string]int, len(n.Meetings))
	for _, m := range n.Meetings {
		degree[m.Junction] = m.Degree
	}
	seen := make(map[string]bool)
	type dangle struct {
		warn              int // index in b.warns
		pathway, junction string
	}
	var dangles []dangle
	for pi := range b.parts {
		p := &b.parts[pi]
		for _, v := range [2]int{0, len(p.xy) - 1} {
			r := b.find(p.v0 + v)
			id, ok := b.ids[r]
			if !ok || b.labeled[r] || degree[id] != 1 || seen[id] {
				continue
			}
			if entry[id] > 0 {
				if laterals := tapped[id]; len(laterals) == entry[id] {
					seen[id] = true
					n.NearMisses = append(n.NearMisses, b.lateralMisses(pi, v, id, laterals)...)
				}
				continue
			}
			seen[id] = true
			pw := b.c.Pathways[p.pw]
			dangles = append(dangles, dangle{len(b.warns), pw.ID, id})
			b.warns = append(b.warns, warnRec{pw.Source, pw.ID, fmt.Sprintf(
				"pathway %q ends at %s, %s joined to nothing: no other pathway, structure, entrance or building footprint within %s m (design: snap_m)",
				pw.ID, fmtLL(p.ll[v][0]), fmtLL(p.ll[v][1]), fmtM(b.snap))})
			n.NearMisses = append(n.NearMisses, b.nearMisses(pi, v, id)...)
		}
	}
	n.NearMisses = append(n.NearMisses, b.structureMisses(n)...)
	sort.SliceStable(n.NearMisses, func(i, j int) bool {
		x, y := n.NearMisses[i], n.NearMisses[j]
		if x.Pathway != y.Pathway {
			return x.Pathway < y.Pathway
		}
		if x.End != y.End {
			return lessLL(x.End, y.End)
		}
		if dx, dy := math.Round(x.DistanceM*1000), math.Round(y.DistanceM*1000); dx != dy {
			return dx < dy
		}
		if x.Kind != y.Kind {
			return x.Kind < y.Kind
		}
		return x.Target < y.Target
	})
	// Each end joined to nothing is warned about with what it nearly reaches, as check lists it.
	for _, d := range dangles {
		var gaps []string
		for _, m := range n.NearMisses {
			if m.Pathway == d.pathway && m.Junction == d.junction {
				gaps = append(gaps, m.Gap())
			}
		}
		if len(gaps) > 0 {
			b.warns[d.warn].msg += "; it ends " + strings.Join(gaps, "; and ")
		}
	}
}

// nearMisses lists the pathways and footprints within NearMissM of vertex v of part pi (an
// end at junction id) but beyond SnapM, each once at its nearest point.
func (b *builder) nearMisses(pi, v int, id string) []NearMiss {
	p := &b.parts[pi]
	xy, end := p.xy[v], p.ll[v]
	pw := b.c.Pathways[p.pw]
	near := NearMiss{Pathway: pw.ID, Source: pw.Source, Junction: id, End: end, SnapM: b.snap}
	type hit struct {
		d  float64
		at orb.Point
	}
	best := make(map[int]hit) // pathway index → nearest place
	b.nearParts(xy, b.nearMiss, -1, func(q int, segIDs []int32) {
		o := &b.parts[q]
		if o.pw == p.pw {
			return
		}
		for _, s := range segIDs {
			i := b.segs[s].i
			t, d2 := closestOnSeg(xy, o.xy[i], o.xy[i+1])
			if h, ok := best[o.pw]; !ok || d2 < h.d {
				best[o.pw] = hit{d2, lerpLL(o.ll[i], o.ll[i+1], t)}
			}
		}
	})
	var out []NearMiss
	for pw, h := range best {
		if d := math.Sqrt(h.d); d > b.snap && d <= b.nearMiss {
			m := near
			m.Kind, m.Target, m.At, m.DistanceM = KindPathway, b.c.Pathways[pw].ID, h.at, DistanceM(end, h.at)
			out = append(out, m)
		}
	}
	for bi, bl := range b.c.Buildings {
		f := &b.feet[bi]
		r := b.nearMiss
		if f.empty() || xy.x < f.lo.x-r || xy.x > f.hi.x+r || xy.y < f.lo.y-r || xy.y > f.hi.y+r || f.contains(xy) {
			continue
		}
		if at, d := f.nearestBoundary(xy); d > b.snap && d <= r {
			m := near
			m.Kind, m.Target, m.At, m.DistanceM = KindBuilding, bl.ID, at, DistanceM(end, at)
			out = append(out, m)
		}
	}
	return out
}

// lateralMisses lists, as near misses of footprints, the counted laterals (of buildings with
// no other way in) that end at vertex v of part pi, a pathway end at junction id that joins
// nothing else, and warns about each: the line was most likely drawn to the wall and stops a
// little short of it, and the plan builds a new entrance and a counted lateral across the gap
// (trench, restoration, duct) beside the pathway that already reaches the building.
func (b *builder) lateralMisses(pi, v int, id string, laterals []Entry) []NearMiss {
	p := &b.parts[pi]
	pw := b.c.Pathways[p.pw]
	var out []NearMiss
	for _, e := range laterals {
		if e.LateralM <= b.snap || e.LateralM > b.nearMiss || len(e.Lateral) == 0 {
			continue
		}
		m := NearMiss{Pathway: pw.ID, Source: pw.Source, Junction: id, End: p.ll[v], Kind: KindBuilding, Target: e.Building,
			At: e.Lateral[0], DistanceM: e.LateralM, SnapM: b.snap, Lateral: true}
		out = append(out, m)
		b.warns = append(b.warns, warnRec{pw.Source, pw.ID, fmt.Sprintf(
			"pathway %q ends %s m from the footprint of building %q, beyond %s m (design: snap_m), and joins nothing else: the plan reaches %q there by a counted lateral of %s m, a new entrance with its own wall penetration; if the line is drawn to the wall, snap_m %s would join it",
			pw.ID, fmtBeyond(m.DistanceM, b.snap), e.Building, fmtM(b.snap), e.Building, fmtBeyond(m.DistanceM, b.snap), snapToJoin(m.DistanceM))})
	}
	return out
}

// structureMisses lists every pathway end within structureMissFactor×SnapM of a structure
// it does not join, beyond SnapM: one that dangles, or one that joins another pathway there
// (a duct bank's line ending short of the maintenance hole taps the cross street instead).
// A structure joined to the end's own line elsewhere (a line run on past it) is not one. When
// two or more ends miss structures so, one Warning names the snap_m that would join them all.
func (b *builder) structureMisses(n *Network) []NearMiss {
	if len(b.c.Structures) == 0 {
		return nil
	}
	r := structureMissFactor * b.snap
	g := newGrid(b.cellM)
	xys := make([]vec, len(b.c.Structures))  // each structure's point, as joinStructures projected it
	root := make([]int, len(b.c.Structures)) // the structure's junction root
	for i, m := range b.mem {
		if m.kind == memStructure {
			xys[m.ref], root[m.ref] = m.xy, b.find(i)
			g.addPoint(m.ref, m.xy)
		}
	}
	var out []NearMiss
	var ids []int32
	for pi := range b.parts {
		p := &b.parts[pi]
		var onLine map[int]bool // the roots along this line, when a structure is near an end
		for _, v := range [2]int{0, len(p.xy) - 1} {
			lo, hi := around(p.xy[v], r)
			ids = g.query(lo, hi, ids)
			er := b.find(p.v0 + v)
			for _, s := range ids {
				si := int(s)
				if d := p.xy[v].dist(xys[si]); d <= b.snap || d > r || root[si] == er {
					continue
				}
				if onLine == nil {
					onLine = make(map[int]bool)
					for _, e := range b.entries[pi] {
						onLine[b.find(e.m)] = true
					}
				}
				if onLine[root[si]] {
					continue
				}
				st, pw := b.c.Structures[si], b.c.Pathways[p.pw]
				m := NearMiss{Pathway: pw.ID, Source: pw.Source, Junction: b.ids[er], End: p.ll[v], Kind: KindStructure,
					Target: st.ID, At: st.Point, DistanceM: DistanceM(p.ll[v], st.Point), SnapM: b.snap, StructureType: st.Type}
				if mt, ok := n.MeetingAt(m.Junction); ok && m.Junction != "" {
					for _, other := range mt.Pathways {
						if other != pw.ID && !slices.Contains(m.Joins, other) {
							m.Joins = append(m.Joins, other)
						}
					}
					slices.Sort(m.Joins)
				}
				out = append(out, m)
			}
		}
	}
	if len(out) >= 2 {
		far, first := 0.0, out[0]
		for _, m := range out {
			far = max(far, m.DistanceM)
			if m.Pathway < first.Pathway {
				first = m
			}
		}
		b.warns = append(b.warns, warnRec{first.Source, first.Pathway, fmt.Sprintf(
			"%d pathway ends lie beyond snap_m %s but within %s m of a structure they do not join (see the near misses): if the lines are drawn to the structures' walls rather than their points, snap_m %s would join them",
			len(out), fmtM(b.snap), fmtBeyond(far, b.snap), snapToJoin(far))})
	}
	return out
}
