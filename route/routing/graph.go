package routing

import (
	"cmp"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sort"
	"strings"
	"sync"
	"weak"

	"spanwright/geo"
	"spanwright/route/items"
	"spanwright/route/site"
)

// The optimizer's graph is the site's network redrawn so that the optimizer's rules are the
// campus's:
//
//   - Edge i is span i, for every span; the edges no span draws come after them.
//   - A building with two or more entrances is a node of its own, the end of every demand to or
//     from it, joined by an entrance edge to each entrance (as long as the entrance's counted
//     lateral, if any). The node is transit-free (optimize.Problem.NoTransit), so no route goes
//     in at one entrance and out at another through it; a diverse link's two legs leave by two
//     entrance edges, that is by two entrances. A building with one entrance ends its demands
//     at the entrance's junction, as before.
//   - Routes may pass through a building only where the campus allows it (geo.Transit: a
//     pathway drawn inside it, or its transit property). Where it does not, an entrance in the
//     building is transit-free when it is the building's only one; when the building has several,
//     an entrance where two or more spans end is split into one node per span, each joined to
//     the building's node by its own entrance edge, the edges of one entrance sharing a
//     shared-risk group (so two legs of a diverse link do not use one entrance twice).
//   - A junction where three or more spans of different pathways meet with no structure and no
//     building, and not aerial spans only (a pole) nor tunnels and trays only, where a route
//     turns on the pole or the rack with nothing built (geo.Meeting.Open), is split into one node per run of duct through it (geo.Network.RunsAt: a span,
//     or two matched as one duct carried on: pieces of one pathway, spans that carry on within
//     straightOnDeg of a straight line, as one duct bank drawn as several pathways, and two
//     pathways of the same ducts that meet at a bend of the duct, as a facilities GIS splits
//     one where another joins it) joined by turn edges of no length: a route that turns there
//     from one run into another takes a turn edge (geo.PassNeedsStructure). A run of
//     proposed spans only (one, or pieces of new pathway carried on through the junction),
//     where new pathway joins the network, is marked (joinNode): the handhole its joining adds
//     is the one a route turning into it passes, and the crew's work there is shared between
//     the turn edge and the span (turnShare). In a run where new pathway carries on a street's
//     duct the new span's end there is priced nothing and the turn edges are ordinary
//     (carriedEnd, joinEnds), so no route pays more than the one pass the bill counts.
//   - A handhole at a junction without a structure — where the route turns (a turn edge),
//     where new pathway joins the network (an opened proposed span ends, site.JoinsNetwork),
//     or where the counted lateral of an entrance used taps a duct (the entrance edges of a
//     building with several entrances, site.Site.TapOf) — is one charge (optimize.Charge) over
//     all those edges, paid once however many routes use it and for however many reasons: the
//     model's count of added handholes is the bill's. The lateral of a building with one
//     entrance is used whatever the routes, so its tap's handhole is paid as a constant and
//     the junction's charge costs nothing (problem; Routed.ConstantCents).

// edgeKind tells an edge of the optimizer's graph that no span draws.
type edgeKind int

const (
	edgeEntrance edgeKind = iota + 1 // a building's node to one of its entrances
	edgeTurn                         // between two pathways at a junction split for turns
)

// extraEdge is an edge of the optimizer's graph after the spans.
type extraEdge struct {
	kind     edgeKind
	from, to int // nodes
	building string
	entry    geo.Entry // edgeEntrance: the entrance
	junction string    // edgeTurn: the junction; edgeEntrance: the entrance's junction
	group    int       // edgeEntrance: the shared-risk group of the entrance's copies, 0 for none
}

// junctionCharge is a handhole the plan may add at a junction without a structure: the edges
// that need it (turn edges there, opened proposed spans that end there, entrance edges whose
// counted lateral taps a duct there).
type junctionCharge struct {
	junction string
	edges    []int
	turns    bool // the junction is split for turns
}

// entranceEdges are the entrance edges of one entrance of a building with several: a plan
// pays for the entrance (items.Entrance) once when any of them is used.
type entranceEdges struct {
	building string
	entry    geo.Entry
	edges    []int
}

// layout is the optimizer's graph of a site.
type layout struct {
	nodes     int
	junction  []int        // node → index in Net.Junctions, -1 for a building's node
	name      []string     // node → a name, for the canonical order of nodes at one position
	at        [][2]float64 // node → position (lon, lat)
	spanEnds  [][2]int     // span index → its end nodes (From, To)
	extra     []extraEdge  // edge len(Spans)+k is extra[k]
	end       map[string]int
	endEntry  map[string]geo.Entry // a building ending at one entrance: that entrance
	noTransit []bool
	// heldSpans are the spans of pathways nothing may be built beside (geo.MethodNone), by id:
	// a reason that finds them full says why no duct is added (ductsFull).
	heldSpans map[string]bool
	// namedGroups are the groups some span gives other than its pathway's id (layout.given).
	namedGroups map[string]bool
	// site marks, by node, the junctions split for turns (runs of duct crossing or meeting
	// with no structure, an entrance's or not): the nodes of one junction share a number > 0,
	// one place for a diverse link's legs (optimize.Problem.Sites), numbered in junction
	// order (canonicalize renumbers them). Nil when there is none. Two legs that both leave
	// their end through one place (a one-entrance building's entrance) are not counted as
	// sharing it by the optimizer: they cannot help it, and the plan names it as the single
	// point of failure.
	site []int
	// joinNode marks, by node, a run of proposed spans only at a junction split for turns where
	// new pathway joins the network (site.JoinsNetwork): a route along one of them passes the
	// handhole its joining adds, turning there or not (turnShare).
	joinNode []bool
	// carriedEnd marks, by span index, its ends (From, To) where new pathway joins the network
	// at a junction split for turns in a run with a span that is not new (new pathway carrying
	// on a street's duct): the span's end is not priced half a pass there (joinEnds), and the
	// turn edges into that run are ordinary ones, so a route pays one pass there at most.
	carriedEnd [][2]bool
	charges    []junctionCharge
	entrances  []entranceEdges // of buildings with several entrances, in building then entrance order
	groups     int             // the shared-risk groups the entrance copies use, numbered after the spans'
	lateral    bool            // some entrance edge carries a lateral
	// groupOf numbers the shared-risk groups given on the campus (geo.Span.Group, where it is
	// not the span's pathway id) from 1, in name order.
	groupOf map[string]int
	// spanGroup is each span's shared-risk group number (optimize.Edge.Group): groupOf of a
	// group given on the campus, else the number of the span's run (runGroups), and runGroup
	// marks the latter (optimize.Edge.EndParted).
	spanGroup []int
	runGroup  []bool
	// classes are the span classes of the campus in a fixed order, and classBit each one's
	// edge flag.
	classes  []spanClass
	classBit map[spanClass]uint64
}

// layouts holds the layout of each site that is still in use, keyed weakly: a site is
// read-only and shared by a sweep's scenarios, and its layout depends on nothing else, so it
// is drawn once per site; the entry goes when the site is collected.
var layouts sync.Map // weak.Pointer[site.Site] → *layout

// layoutOf is the optimizer's graph of the site, drawn once (newLayout) and shared.
func layoutOf(s *site.Site) *layout {
	k := weak.Make(s)
	if l, ok := layouts.Load(k); ok {
		return l.(*layout)
	}
	l, loaded := layouts.LoadOrStore(k, newLayout(s))
	if !loaded {
		runtime.AddCleanup(s, func(k weak.Pointer[site.Site]) { layouts.Delete(k) }, k)
	}
	return l.(*layout)
}

// isExtra reports whether edge e is one no span draws, and which.
func (l *layout) isExtra(spans, e int) (*extraEdge, bool) {
	if e < spans {
		return nil, false
	}
	return &l.extra[e-spans], true
}

// newLayout draws the optimizer's graph of the site, and numbers its shared-risk groups and
// span classes.
func newLayout(s *site.Site) *layout {
	net := s.Net
	l := &layout{end: map[string]int{}, endEntry: map[string]geo.Entry{}, spanEnds: make([][2]int, len(net.Spans)), carriedEnd: make([][2]bool, len(net.Spans)),
		groupOf: map[string]int{}}
	// A group is given (not a pathway's own by default, which runGroups parts at branch
	// points) when it is not the pathway's id, or when another pathway gives that id as its
	// group: naming a duct bank after one of its pathways declares them one risk (review 22 F1).
	l.namedGroups = map[string]bool{}
	for _, sp := range net.Spans {
		if sp.Group != sp.PathwayID {
			l.namedGroups[sp.Group] = true
		}
	}
	var names []string
	for i := range net.Spans {
		sp := &net.Spans[i]
		if sp.Method == geo.MethodNone {
			if l.heldSpans == nil {
				l.heldSpans = map[string]bool{}
			}
			l.heldSpans[sp.ID] = true
		}
		if _, ok := l.groupOf[sp.Group]; !ok && sp.Group != "" && l.given(sp) {
			l.groupOf[sp.Group] = 0
			names = append(names, sp.Group)
		}
	}
	sort.Strings(names)
	for i, n := range names {
		l.groupOf[n] = i + 1
	}
	firstGroup := len(names) + 1 // the first shared-risk group number free after the spans'
	jIndex := make(map[string]int, len(net.Junctions))
	for i, j := range net.Junctions {
		jIndex[j.ID] = i
	}
	spansAt := make([][]int, len(net.Junctions)) // junction → spans ending there, in span order
	for i, sp := range net.Spans {
		spansAt[jIndex[sp.From]] = append(spansAt[jIndex[sp.From]], i)
		if sp.To != sp.From {
			spansAt[jIndex[sp.To]] = append(spansAt[jIndex[sp.To]], i)
		}
	}
	allows := func(b string) bool {
		t, ok := net.TransitOf(b)
		return ok && t.Allowed
	}
	// Each building's entrance junctions, in junction order, and each entry of them.
	entrances := map[string][]geo.Entry{}
	for _, b := range s.Campus.Buildings {
		seen := map[string]bool{}
		for _, e := range net.EntrancesOf(b.ID) {
			if !seen[e.Junction] {
				seen[e.Junction] = true
				entrances[b.ID] = append(entrances[b.ID], e)
			}
		}
		if len(entrances[b.ID]) == 0 { // a network built by hand: its Access alone
			if a := s.Access(b.ID); a.Junction != "" {
				entrances[b.ID] = []geo.Entry{{ID: a.Junction, Access: a}}
			}
		}
	}
	// An entrance whose pathways reach no other building's entrance leads nowhere: a building
	// keeps only those that lead somewhere (all, when none does), so that one usable entrance
	// is planned as a building's only one (both legs of a diverse link through it, named as
	// the single point of failure) rather than as one of two.
	reach := map[int]map[string]bool{} // part → buildings with an entrance in it
	for b, es := range entrances {
		for _, e := range es {
			p := s.SpanPart(e.Junction)
			if reach[p] == nil {
				reach[p] = map[string]bool{}
			}
			reach[p][b] = true
		}
	}
	for b, es := range entrances {
		keep := slices.DeleteFunc(slices.Clone(es), func(e geo.Entry) bool { return len(reach[s.SpanPart(e.Junction)]) < 2 })
		if len(keep) > 0 && len(keep) < len(es) {
			entrances[b] = keep
		}
	}
	// How each junction is drawn: whole, split per span (an entrance of a building routes may
	// not cross and that has other entrances), or split per pathway (for turns).
	perSpan := make([]bool, len(net.Junctions))
	for b, es := range entrances {
		if len(es) < 2 || allows(b) {
			continue
		}
		for _, e := range es {
			if j := jIndex[e.Junction]; len(spansAt[j]) >= 2 && inBuilding(net, e.Junction, b) {
				perSpan[j] = true
			}
		}
	}
	turnAt := map[int]bool{}
	for _, j := range s.TurnsNeedingStructure() {
		if i := jIndex[j]; !perSpan[i] {
			turnAt[i] = true
		}
	}
	add := func(j int, name string, at [2]float64) int {
		l.junction = append(l.junction, j)
		l.name = append(l.name, name)
		l.at = append(l.at, at)
		l.nodes++
		return l.nodes - 1
	}
	copies := make([][]int, len(net.Junctions)) // junction → its nodes
	for j, jn := range net.Junctions {
		at := [2]float64{jn.Point[0], jn.Point[1]}
		switch {
		case perSpan[j]:
			for _, i := range spansAt[j] {
				n := add(j, tieName(1, bearingAt(net, i, jn.ID), jn.ID+"#"+net.Spans[i].ID), at)
				copies[j] = append(copies[j], n)
				l.setEnd(net, i, jn.ID, n)
			}
		case turnAt[j]:
			joins := s.JoinsNetwork(jn.ID)
			for _, run := range net.RunsAt(jn.ID, spansAt[j]) {
				name, bearing := net.Spans[run[0]].PathwayID, bearingAt(net, run[0], jn.ID)
				for _, i := range run[1:] {
					name, bearing = min(name, net.Spans[i].PathwayID), min(bearing, bearingAt(net, i, jn.ID))
				}
				n := add(j, tieName(1, bearing, jn.ID+"#"+name), at)
				copies[j] = append(copies[j], n)
				for _, i := range run {
					l.setEnd(net, i, jn.ID, n)
				}
				switch {
				case !joins || !slices.ContainsFunc(run, func(i int) bool { return net.Spans[i].Status == geo.StatusProposed }):
				case slices.ContainsFunc(run, func(i int) bool { return net.Spans[i].Status != geo.StatusProposed }):
					for _, i := range run {
						if net.Spans[i].Status != geo.StatusProposed {
							continue
						}
						l.carriedEnd[i] = [2]bool{l.carriedEnd[i][0] || net.Spans[i].From == jn.ID, l.carriedEnd[i][1] || net.Spans[i].To == jn.ID}
					}
				default:
					l.markJoin(n)
				}
			}
		default:
			n := add(j, tieName(0, 0, jn.ID), at)
			copies[j] = []int{n}
			for _, i := range spansAt[j] {
				l.setEnd(net, i, jn.ID, n)
			}
		}
	}
	l.noTransit = make([]bool, l.nodes)
	// Buildings: their ends, and their nodes and entrance edges.
	group := firstGroup
	for _, b := range s.Campus.Buildings {
		es := entrances[b.ID]
		switch {
		case len(es) == 0:
		case len(es) == 1 && len(copies[jIndex[es[0].Junction]]) == 1:
			j := jIndex[es[0].Junction]
			l.end[b.ID], l.endEntry[b.ID] = copies[j][0], es[0]
			if !allows(b.ID) && inBuilding(net, es[0].Junction, b.ID) {
				l.noTransit[copies[j][0]] = true
			}
		default:
			// The building's own node: several entrances, or one at a junction drawn as several
			// nodes (split for turns, or shared with a building split per span). It is only
			// ever an end: a route crosses a building over pathways drawn in it, or through
			// one junction where they meet inside it (when the building allows it).
			at := net.Junctions[jIndex[es[0].Junction]].Point
			for _, e := range es[1:] {
				if p := net.Junctions[jIndex[e.Junction]].Point; p[0] < at[0] || (p[0] == at[0] && p[1] < at[1]) {
					at = p // the westmost, then southmost entrance: a place names do not move
				}
			}
			v := add(-1, tieName(2, 0, "building "+b.ID), [2]float64{at[0], at[1]})
			l.noTransit = append(l.noTransit, true)
			l.end[b.ID] = v
			if len(es) == 1 {
				l.endEntry[b.ID] = es[0] // one entrance: its lateral is the demand's, as above
			}
			for _, e := range es {
				j := jIndex[e.Junction]
				g := 0
				if len(copies[j]) > 1 && len(es) > 1 {
					g = group
					group++
				}
				if len(es) == 1 {
					e.LateralM = 0 // counted by the demand (endEntry)
				}
				l.lateral = l.lateral || e.LateralM > 0
				var edges []int
				for _, n := range copies[j] {
					edges = append(edges, len(net.Spans)+len(l.extra))
					l.extra = append(l.extra, extraEdge{kind: edgeEntrance, from: v, to: n, building: b.ID, entry: e, junction: e.Junction, group: g})
				}
				if len(es) > 1 {
					l.entrances = append(l.entrances, entranceEdges{building: b.ID, entry: e, edges: edges})
				}
			}
		}
	}
	l.groups = group - firstGroup
	l.markSites(copies, turnAt)
	l.runGroups(net, spansAt, group)
	l.numberClasses(net)
	// The entrance edges whose counted lateral taps a duct, by junction: they need the
	// junction's handhole.
	tapEdges := map[string][]int{}
	for _, en := range l.entrances {
		if s.TapOf(en.entry) {
			tapEdges[en.entry.Junction] = append(tapEdges[en.entry.Junction], en.edges...)
		}
	}
	// Turn edges and the handholes they, opened spans and tapping laterals may need.
	for j, jn := range net.Junctions {
		var c junctionCharge
		if turnAt[j] {
			c.turns = true
			for a := 0; a < len(copies[j]); a++ {
				for b := a + 1; b < len(copies[j]); b++ {
					c.edges = append(c.edges, len(net.Spans)+len(l.extra))
					l.extra = append(l.extra, extraEdge{kind: edgeTurn, from: copies[j][a], to: copies[j][b], junction: jn.ID})
				}
			}
		}
		if s.JoinsNetwork(jn.ID) {
			for _, i := range spansAt[j] {
				if net.Spans[i].Status == geo.StatusProposed {
					c.edges = append(c.edges, i)
				}
			}
		}
		c.edges = append(c.edges, tapEdges[jn.ID]...)
		if len(c.edges) > 0 {
			c.junction = jn.ID
			slices.Sort(c.edges)
			l.charges = append(l.charges, c)
		}
	}
	return l
}

// markSites sets site (see layout) from each junction's nodes.
func (l *layout) markSites(copies [][]int, turnAt map[int]bool) {
	n := 0
	for j, ns := range copies {
		if !turnAt[j] || len(ns) < 2 {
			continue
		}
		if l.site == nil {
			l.site = make([]int, l.nodes)
		}
		n++
		for _, v := range ns {
			l.site[v] = n
		}
	}
}

// given reports whether span sp's shared-risk group is the campus's (geo.Span.Group given,
// or its pathway's id named as a group by another pathway), not its pathway's own by default,
// which runGroups parts into runs.
func (l *layout) given(sp *geo.Span) bool {
	return sp.Group != sp.PathwayID || l.namedGroups[sp.Group]
}

// runGroups sets spanGroup and runGroup. A span with a shared-risk group given on the
// campus keeps it (groupOf), never parted: the campus says those ducts fail together. A span
// with none (geo.Span.Group is its pathway's id) is in the group of its run: the spans joined
// end to end through junctions that are no branch point, whatever the pathways they were drawn
// as, numbered from next in the order of the runs' first spans. A branch point (branchAt) is
// a junction where a structure stands, where three or more span ends meet, where the pathway
// enters a building (geo.Meeting.Buildings), or where the kind of pathway changes: one
// trench or duct bank between two places where it can be reached or where ways part, as a
// designer names a street's duct bank between its manholes and side streets (common
// practice, no published source). A counted lateral's tap is none: it is a candidate that no
// route may use, and until one does nothing is built there (the tap of a link's own end is
// parted for that link alone, optimize.Edge.EndParted). So a run does not depend on other
// buildings, on pathway ids, on feature order or on where a pathway was split at a vertex. A
// site fact: the same for every plan on the site.
func (l *layout) runGroups(net *geo.Network, spansAt [][]int, next int) {
	l.spanGroup = make([]int, len(net.Spans))
	l.runGroup = make([]bool, len(net.Spans))
	own := func(i int) bool { return !l.given(&net.Spans[i]) }
	up := make([]int, len(net.Spans)) // union-find over the spans of no given group
	for i := range up {
		up[i] = i
	}
	find := func(i int) int {
		for up[i] != i {
			up[i] = up[up[i]]
			i = up[i]
		}
		return i
	}
	for j, at := range spansAt {
		if len(at) != 2 || !own(at[0]) || !own(at[1]) || branchAt(net, j, at) {
			continue
		}
		if a, b := find(at[0]), find(at[1]); a != b {
			up[max(a, b)] = min(a, b)
		}
	}
	run := map[int]int{} // root → group
	for i, sp := range net.Spans {
		if !own(i) {
			l.spanGroup[i] = l.groupOf[sp.Group]
			continue
		}
		r := find(i)
		if _, ok := run[r]; !ok {
			run[r] = next
			next++
		}
		l.spanGroup[i], l.runGroup[i] = run[r], true
	}
}

// branchAt reports whether junction j, where spans at end (a span ending there twice is
// listed once and counts twice), parts a run of duct: see runGroups.
func branchAt(net *geo.Network, j int, at []int) bool {
	m := net.Meetings[j]
	if m.Structure || m.Degree >= 3 || len(m.Buildings) > 0 {
		return true
	}
	return len(at) == 2 && net.Spans[at[0]].Type != net.Spans[at[1]].Type
}

// markJoin records node n as a run, with a proposed span in it, where new pathway joins the
// network.
func (l *layout) markJoin(n int) {
	for len(l.joinNode) <= n {
		l.joinNode = append(l.joinNode, false)
	}
	l.joinNode[n] = true
}

// isJoin reports whether node n is a joining run (markJoin).
func (l *layout) isJoin(n int) bool { return n < len(l.joinNode) && l.joinNode[n] }

// joinEnds is the ends of span i the optimizer prices half a pass at (items.JoinEnds), less
// those in a run carried on from a span that is not new (carriedEnd): there a route from the
// street's duct straight on into the new span would pay half, and one turning into the run a
// whole share on the turn edge besides; the plan's evaluation prices the rest (passGapCents).
func (l *layout) joinEnds(s *site.Site, i int) float64 {
	n := 0.0
	for k := range 2 {
		if l.joinEnd(s, i, k) {
			n++
		}
	}
	return n
}

// joinEnd reports whether end k (0 From, 1 To) of span i is one joinEnds counts: a new span's
// end where it joins the network (items.JoinEnds), not in a run carried on (carriedEnd).
func (l *layout) joinEnd(s *site.Site, i, k int) bool {
	sp := &s.Net.Spans[i]
	return items.JoinEnd(s, sp, [2]string{sp.From, sp.To}[k]) && !l.carriedEnd[i][k]
}

// Crew shares at a junction split for turns where new pathway joins (joinNode). A route along
// a joining span passes a pull point and enters a handhole where it joins (items.JoinEnds, on
// the span, a half at each end); a route that turns there from one run into another does so
// too (Leg.Turns). One pass through the one handhole there is one set-up and one entry per
// cable (passesOf), so the optimizer's graph shares it out, in halves:
//
//	turn edge between two ordinary runs:                        1
//	turn edge between an ordinary run and a joining one:        ½
//	turn edge between two joining runs:                         0
//	a joining span's end there:                                 ½
//
// A route from a street into the joining span pays ½ + ½, one from one joining span into
// another ½ + ½, one from one street into another over the joining span's node ½ + ½, one
// straight on along the street nothing here (it passes the handhole all the same when the
// plan builds it; the plan's evaluation prices that pass, passGapCents). turnsListed gives the
// turns the leg lists for a pass over turn edges. (A route that reached a joining span's node
// by an entrance edge, not along the span, and turned on would pay the optimizer half a share
// less than the bill; the entrance has an edge to every run there, so no plan takes that way.)
// A run where new pathway carries on a street's duct is not a joining run: its new span's end
// there is priced nothing (joinEnds), a route turning into it pays the turn edge's 1, one
// straight on from the street's duct nothing, and the plan's evaluation prices what is left
// (passGapCents stays ≥ 0 on every leg): the search never charges more than the bill
// (TestSearchCrewNoMoreThanTheBill).

// turnShare is the crew share, in halves, of the turn edge between nodes u and v.
func (l *layout) turnShare(u, v int) int {
	switch ju, jv := l.isJoin(u), l.isJoin(v); {
	case ju && jv:
		return 0
	case ju != jv:
		return 1
	}
	return 2
}

// turnsListed is how many turns a route lists (Leg.Turns) for a pass through one junction
// over the turn edges between nodes path[0], …, path[m] (m ≥ 1): one for every turn edge
// between two ordinary runs, and one for a way from an ordinary run to another through
// joining runs; none into or out of a joining span, whose handhole that is.
func (l *layout) turnsListed(path []int) int {
	n := 0
	from := -1 // the ordinary run the way last left, -1 while on joining runs or at the start on one
	if !l.isJoin(path[0]) {
		from = path[0]
	}
	for k := 1; k < len(path); k++ {
		if l.isJoin(path[k]) {
			continue
		}
		if from >= 0 {
			n++
		}
		from = path[k]
	}
	return n
}

// numberClasses lists the span classes of the network's spans (and of the laterals, when an
// entrance edge carries one) in a fixed order and gives each its edge flag.
func (l *layout) numberClasses(net *geo.Network) {
	l.classes, l.classBit = nil, map[spanClass]uint64{}
	for i := range net.Spans {
		if c := classOf(&net.Spans[i]); l.classBit[c] == 0 {
			l.classBit[c] = 1 // numbered below, in a fixed order
			l.classes = append(l.classes, c)
		}
	}
	if l.lateral && l.classBit[lateralClass] == 0 { // entrance edges with a lateral run in this class
		l.classBit[lateralClass] = 1
		l.classes = append(l.classes, lateralClass)
	}
	slices.SortFunc(l.classes, func(a, b spanClass) int {
		return cmp.Or(strings.Compare(a.typ, b.typ), strings.Compare(a.emi, b.emi), boolCmp(a.outdoor, b.outdoor), boolCmp(a.plenum, b.plenum))
	})
	if len(l.classes) > 60 { // bits 3 to 62: firstClassFlag is 1 << 3, flagTurn 1 << 63
		// 5 pathway types × 3 EMI levels × outdoors or not × plenum or not is 60 at most.
		panic(fmt.Sprintf("route: %d span classes do not fit the optimizer's edge flags", len(l.classes)))
	}
	for k, c := range l.classes {
		// At most 5 pathway types × 3 EMI levels × plenum or not: 30 classes, well within
		// the flags above firstClassFlag.
		l.classBit[c] = firstClassFlag << k
	}
}

// setEnd records node n as span i's end at junction j.
func (l *layout) setEnd(net *geo.Network, i int, j string, n int) {
	if net.Spans[i].From == j {
		l.spanEnds[i][0] = n
	}
	if net.Spans[i].To == j {
		l.spanEnds[i][1] = n
	}
}

// inBuilding reports whether junction j is in building b: an entrance of it without a counted
// lateral (geo.Meeting.Buildings), where a cable is inside the building.
func inBuilding(net *geo.Network, j, b string) bool {
	m, ok := net.MeetingAt(j)
	return ok && slices.Contains(m.Buildings, b)
}

// tieName names a node for the canonical order of nodes at one position (canonicalize):
// whole junctions, then the copies of a split junction by the bearing of their spans, then a
// building's node, and only then the ids, so that renaming ids reorders nothing.
func tieName(kind int, bearingDeg float64, id string) string {
	return fmt.Sprintf("%d|%08.3f|%s", kind, bearingDeg, id)
}

// bearingAt is the direction in which span i leaves junction j, in degrees from east,
// counterclockwise, in [0, 360): from j along the span's line simplified within
// geo.BendToleranceM (geo.Span.AwayFrom, as the turns there are measured), on a local flat
// projection.
func bearingAt(net *geo.Network, i int, j string) float64 {
	sp := &net.Spans[i]
	if len(sp.Line) < 2 {
		return 0
	}
	at, next := sp.Line[0], sp.AwayFrom(false)
	if sp.From != j {
		at, next = sp.Line[len(sp.Line)-1], sp.AwayFrom(true)
	}
	dx := (next[0] - at[0]) * math.Cos(at[1]*math.Pi/180)
	deg := math.Atan2(next[1]-at[1], dx) * 180 / math.Pi
	if deg < 0 {
		deg += 360
	}
	return deg
}
