package site

import (
	"cmp"
	"container/heap"
	"fmt"
	"math"
	"slices"
	"strings"

	"spanwright/geo"
	"spanwright/geo/input"
)

// components labels every junction (by index in Net.Junctions) with its connected part of the
// pathway network: junctions joined by spans share a label, and, with entrances, so do the
// entrances of one building (a cable can go through a building: whether a route may is
// another question, see ThroughOnly). With use, only the spans it accepts join junctions.
func components(net *geo.Network, junction map[string]int, entrances bool, use func(*geo.Span) bool) []int {
	parent := make([]int, len(net.Junctions))
	for i := range parent {
		parent[i] = i
	}
	find := func(x int) int {
		for parent[x] != x {
			parent[x] = parent[parent[x]]
			x = parent[x]
		}
		return x
	}
	join := func(x, y string) {
		a, b := find(junction[x]), find(junction[y])
		if a != b {
			parent[max(a, b)] = min(a, b)
		}
	}
	for i := range net.Spans {
		if sp := &net.Spans[i]; use == nil || use(sp) {
			join(sp.From, sp.To)
		}
	}
	for i := 1; entrances && i < len(net.Entrances); i++ {
		if e, f := net.Entrances[i-1], net.Entrances[i]; e.Building == f.Building {
			join(e.Junction, f.Junction)
		}
	}
	for i := range parent {
		parent[i] = find(i)
	}
	return parent
}

// SpanPart is the connected part of the network junction j is in, by spans alone (buildings
// do not join their entrances here); -1 for an unknown junction.
func (s *Site) SpanPart(j string) int {
	if i, ok := s.junction[j]; ok {
		return s.spanPart[i]
	}
	return -1
}

// partsOf lists the parts of the network (components labels) the building's entrances are in.
func (s *Site) partsOf(b string) []int { return s.partsIn(b, s.part) }

// partsIn lists the labels of part (a components labelling) the building's entrances have.
func (s *Site) partsIn(b string, part []int) []int {
	var out []int
	for _, e := range s.Net.EntrancesOf(b) {
		if j, ok := s.junction[e.Junction]; ok && !slices.Contains(out, part[j]) {
			out = append(out, part[j])
		}
	}
	if len(out) == 0 { // a building assembled by hand with an Access and no Entrances
		if a, ok := s.access[b]; ok {
			if j, ok := s.junction[a.Junction]; ok {
				out = append(out, part[j])
			}
		}
	}
	return out
}

// JoinedExisting is Joined over the pathways that exist: proposed ones, which a plan with
// design.allow_new_trench: false may not use, left out.
func (s *Site) JoinedExisting(a, b string) bool { return s.joinedIn(a, b, s.existingPart) }

// OnlyOverProposed lists, in campus order, the buildings joined to the hub (Joined) only over
// proposed pathways (not JoinedExisting): a plan with design.allow_new_trench: false cannot
// serve them.
func (s *Site) OnlyOverProposed(hub string) []string {
	var out []string
	for _, b := range s.Campus.Buildings {
		if b.ID != hub && s.Joined(b.ID, hub) && !s.JoinedExisting(b.ID, hub) {
			out = append(out, b.ID)
		}
	}
	return out
}

// ProposedOnlyReason is the reason a link between buildings a and b that only proposed
// pathways join carries when design.allow_new_trench is false ("" when that is not why).
func (s *Site) ProposedOnlyReason(a, b string) string {
	if !s.Joined(a, b) || s.JoinedExisting(a, b) {
		return ""
	}
	return fmt.Sprintf("building %s reaches %s only over proposed pathways (design.allow_new_trench: false keeps new trench out of the plan)", b, a)
}

// Joined reports whether some entrance of building a and some entrance of building b are in
// one part of the pathway network.
func (s *Site) Joined(a, b string) bool { return s.joinedIn(a, b, s.part) }

// joinedIn reports whether some entrance of a and some entrance of b have one label of part
// (a components labelling).
func (s *Site) joinedIn(a, b string, part []int) bool {
	pb := s.partsIn(b, part)
	for _, p := range s.partsIn(a, part) {
		if slices.Contains(pb, p) {
			return true
		}
	}
	return false
}

// nearMissesOf lists the near misses that could join building b's parts of the network to
// the rest: a dangling end in one of them, or an end elsewhere that misses a pathway in one of
// them or misses b itself; nearest first, at most n.
func (s *Site) nearMissesOf(b string, n int) []geo.NearMiss {
	parts := s.partsOf(b)
	in := func(junction string) bool {
		j, ok := s.junction[junction]
		return ok && slices.Contains(parts, s.part[j])
	}
	pathwayIn := func(id string) bool {
		for _, sp := range s.Net.Spans {
			if sp.PathwayID == id && (in(sp.From) || in(sp.To)) {
				return true
			}
		}
		return false
	}
	var out []geo.NearMiss
	for _, m := range s.Net.NearMisses {
		if in(m.Junction) || (m.Kind == geo.KindBuilding && m.Target == b) || (m.Kind == geo.KindPathway && pathwayIn(m.Target)) {
			out = append(out, m)
		}
	}
	slices.SortStableFunc(out, func(x, y geo.NearMiss) int { return cmp.Compare(x.DistanceM, y.DistanceM) })
	return out[:min(n, len(out))]
}

// TurnsNeedingStructure lists, by junction ID, the junctions where three or more spans of
// different pathways meet with no structure and no building: a route that turns there from one
// pathway into another needs a handhole or pull box built (geo.PassNeedsStructure). Not where
// only aerial spans meet (a pole) or only tunnels and trays (geo.Meeting.Open): a turn there
// is made on the pole or the rack, with nothing built.
func (s *Site) TurnsNeedingStructure() []string {
	var out []string
	for _, m := range s.Net.Meetings {
		if m.Degree < 3 || m.Structure || m.Open || len(m.Buildings) > 0 {
			continue
		}
		if slices.ContainsFunc(m.Pathways, func(p string) bool { return p != m.Pathways[0] }) {
			out = append(out, m.Junction)
		}
	}
	return out
}

// ThroughOnly lists, sorted, the buildings that can reach the hub only by passing through
// another building that routes may not cross (in at one entrance, out at another; see
// geo.Transit): every path from them to the hub enters some other building first.
func (s *Site) ThroughOnly(hub string) []string {
	seen, _ := s.search(hub, hub)
	var out []string
	for _, b := range s.Campus.Buildings {
		if b.ID == hub || !s.Joined(b.ID, hub) {
			continue
		}
		if !seen.any(s, s.Net.EntrancesOf(b.ID)) {
			out = append(out, b.ID)
		}
	}
	return out
}

// Through says in words why building b reaches the hub only through other buildings: which
// buildings stand in the way, and how routes may cross one. It is the reason every leg to b
// carries when no route reaches it.
//
// It ends with what would let a route through, as the campus stands: transit: true on the
// buildings in the way when their pathways meet at one point inside them (the search run
// again with them open reaches the hub), else that transit alone would not do and a pathway
// must be drawn inside them; a pathway to b that passes no building; or serving b from a
// building in the way (role ic, and a link from it).
func (s *Site) Through(b, hub string) string {
	in := s.inTheWay(b, hub)
	if len(in) == 0 { // not joined to the hub at all: name what the search met
		_, in = s.search(b, hub)
	}
	shown, more := input.Shown(in, maxInTheWay)
	list := strings.Join(shown, ", ") + more
	them, one := "them", "one of them"
	if len(in) == 1 {
		them, one = in[0], in[0]
	}
	transit := fmt.Sprintf("setting %s: true on %s lets routes through where its pathways meet", geo.PropTransit, them)
	if seen, _ := s.search(b, hub, in...); !seen.any(s, s.Net.EntrancesOf(hub)) {
		transit = fmt.Sprintf("%s: true on %s would not do, its pathways do not meet at one point inside it: draw a tray or tunnel inside it between its entrances",
			geo.PropTransit, them)
	}
	return fmt.Sprintf("building %s reaches %s only through %s: a route crosses a building only along a pathway drawn inside it (a tunnel or tray), "+
		"or where pathways meet at one point inside it and it has the property %s: true; to serve %s, %s; or draw a pathway to %s that passes no building; "+
		"or serve it from %s (role ic, and a link from it)", b, hub, list, geo.PropTransit, b, transit, b, one)
}

// maxInTheWay is the most buildings in the way a reason names (a row of buildings each
// reached through the one before would otherwise make the reasons grow with its square).
const maxInTheWay = 10

// inTheWay lists, sorted, the buildings a route from building b to the hub must cross: not
// every building the search from b meets (a building at the end of a spur is met and is in
// nobody's way), but those of a route that crosses the fewest (a building is crossed at a
// junction inside it, or in at one entrance and out at another, as walk's cross lets it).
// One search over the junctions, each pass through a building counted once (Dijkstra by the
// buildings crossed, ties by junction order): on a row of buildings each reached only through
// the one before, the old leave-one-out search grew with the cube of the row's length. Nil when
// no route reaches the hub even crossing every building (b is cut off: CutOff).
func (s *Site) inTheWay(b, hub string) []string {
	adj := s.spanAdjacency()
	n := len(s.Net.Junctions)
	closed := func(x string) bool {
		if x == b || x == hub {
			return false
		}
		t, ok := s.Net.TransitOf(x)
		return !ok || !t.Allowed
	}
	goal := make([]bool, n)
	for _, e := range s.Net.EntrancesOf(hub) {
		goal[s.junction[e.Junction]] = true
	}
	best := make([]int, n)
	for i := range best {
		best[i] = math.MaxInt
	}
	pred := make([]int32, n)
	done := make([]bool, n)
	h := &nodeQueue{} // junctions by buildings crossed, then by index (DistancesM's queue)
	relax := func(k, d int, from int32) {
		if d < best[k] {
			best[k], pred[k] = d, from
			heap.Push(h, queued{int64(k), float64(d)})
		}
	}
	linked := func(x string, d int, from int32) { // in at one entrance of x, out at another
		for _, e := range s.Net.EntrancesOf(x) {
			relax(s.junction[e.Junction], d, from)
		}
	}
	// closedAt lists the buildings a route passing junction j crosses there.
	closedAt := func(j int) []string {
		m, ok := s.Net.MeetingAt(s.Net.Junctions[j].ID)
		if !ok {
			return nil
		}
		var out []string
		for _, x := range m.Buildings {
			if closed(x) {
				out = append(out, x)
			}
		}
		return out
	}
	linked(b, 0, -1) // every entrance of b starts at 0: b itself is never crossed
	for h.Len() > 0 {
		it := heap.Pop(h).(queued)
		j := int(it.n)
		if done[j] {
			continue
		}
		done[j] = true
		if goal[j] {
			var out []string
			for k := pred[j]; k >= 0; k = pred[k] {
				out = append(out, closedAt(int(k))...)
			}
			slices.Sort(out)
			return slices.Compact(out)
		}
		crossed := closedAt(j)
		d := int(it.d) + len(crossed)
		for _, k := range adj.to[adj.start[j]:adj.start[j+1]] {
			relax(int(k), d, int32(j))
		}
		for _, x := range crossed {
			linked(x, d, int32(j))
		}
	}
	return nil
}

// Apart says why no route joins buildings a and b, when the network is the cause: a is cut
// off from b (CutOff), or reaches it only through buildings routes may not cross (Through).
// It returns false when a route between them exists as far as the network goes.
func (s *Site) Apart(a, b string) (string, bool) {
	if !s.Joined(a, b) {
		return s.CutOff(a, b), true
	}
	seen, _ := s.search(a, b)
	if seen.any(s, s.Net.EntrancesOf(b)) {
		return "", false
	}
	return s.Through(a, b), true
}

// search walks the network from the entrances of building from, as routes may go: along
// spans, between the entrances of from and of the hub (a route may start at any of them), and
// through a junction inside another building only when that building allows transit. It
// returns the junctions it reached and, sorted, the other buildings whose entrances it reached.
// The buildings in also are passed as if they allowed transit (what setting it would do).
func (s *Site) search(from, hub string, also ...string) (reached, []string) {
	return s.walk(from, hub, also, nil)
}

// walk is search, and the buildings in cross are crossed as a pathway drawn inside each
// between its entrances would let a route cross it: passed, and their entrances linked.
func (s *Site) walk(from, hub string, also, cross []string) (reached, []string) {
	open := func(b string) bool {
		t, ok := s.Net.TransitOf(b)
		return b == from || b == hub || (ok && t.Allowed) || slices.Contains(also, b) || slices.Contains(cross, b)
	}
	adj := s.spanAdjacency()
	// Entrances of from, of the hub and of the buildings crossed are linked in a chain, as
	// they are listed.
	ends := map[int][]int{}
	both := []string{from}
	if hub != from {
		both = append(both, hub)
	}
	for _, b := range append(both, cross...) {
		es := s.Net.EntrancesOf(b)
		for i := 1; i < len(es); i++ {
			x, y := s.junction[es[i-1].Junction], s.junction[es[i].Junction]
			ends[x] = append(ends[x], y)
			ends[y] = append(ends[y], x)
		}
	}
	// A building opened as if marked transit: the pathway ends that met inside it, parted at
	// its walls because it is not (geo.Transit.Parted), are one junction again.
	for _, b := range also {
		t, _ := s.Net.TransitOf(b)
		for _, g := range t.Parted {
			for i := 1; i < len(g); i++ {
				x, y := s.junction[g[i-1]], s.junction[g[i]]
				ends[x] = append(ends[x], y)
				ends[y] = append(ends[y], x)
			}
		}
	}
	seen := make(reached, len(s.Net.Junctions))
	var queue []int
	var met []string
	isMet := map[string]bool{}
	for _, e := range s.Net.EntrancesOf(from) {
		if j := s.junction[e.Junction]; !seen[j] {
			seen[j] = true
			queue = append(queue, j)
		}
	}
	for len(queue) > 0 {
		j := queue[0]
		queue = queue[1:]
		if m, ok := s.Net.MeetingAt(s.Net.Junctions[j].ID); ok {
			stop := false
			for _, b := range m.Buildings {
				if b == from || b == hub {
					continue
				}
				if !isMet[b] {
					isMet[b] = true
					met = append(met, b)
				}
				stop = stop || !open(b)
			}
			if stop {
				continue // reached, not passed
			}
		}
		for _, k := range adj.to[adj.start[j]:adj.start[j+1]] {
			if !seen[k] {
				seen[k] = true
				queue = append(queue, int(k))
			}
		}
		for _, k := range ends[j] {
			if !seen[k] {
				seen[k] = true
				queue = append(queue, k)
			}
		}
	}
	slices.Sort(met)
	return seen, met
}

// reached marks the junctions a search reached, by index in Net.Junctions.
type reached []bool

// any reports whether the search reached one of the entries.
func (r reached) any(s *Site, entries []geo.Entry) bool {
	return slices.ContainsFunc(entries, func(e geo.Entry) bool { return r[s.junction[e.Junction]] })
}

// adjacency lists, per junction index, the junctions its spans lead to: to[start[j]:start[j+1]].
type adjacency struct {
	start []int32
	to    []int32
}

// spanAdjacency is the network's junctions joined by spans, built once per site: search runs
// once per link the network keeps apart and once per check.
func (s *Site) spanAdjacency() *adjacency {
	s.adjOnce.Do(func() {
		n := len(s.Net.Junctions)
		a := &adjacency{start: make([]int32, n+1), to: make([]int32, 2*len(s.Net.Spans))}
		for _, sp := range s.Net.Spans {
			a.start[s.junction[sp.From]+1]++
			a.start[s.junction[sp.To]+1]++
		}
		for i := 0; i < n; i++ {
			a.start[i+1] += a.start[i]
		}
		next := slices.Clone(a.start[:n])
		for _, sp := range s.Net.Spans {
			x, y := s.junction[sp.From], s.junction[sp.To]
			a.to[next[x]] = int32(y)
			next[x]++
			a.to[next[y]] = int32(x)
			next[y]++
		}
		s.adj = a
	})
	return s.adj
}

// CutOff says in words why building b has no path to the hub, and what might join it: the
// pathways that reach it, and the nearest pathway ends that just miss joining its part of the
// network to another (geo.NearMiss). It is the reason every leg to b carries, and what check
// reports.
func (s *Site) CutOff(b, hub string) string {
	var ids []string
	for _, e := range s.Net.EntrancesOf(b) {
		for _, sp := range s.Net.Spans {
			if (sp.From == e.Junction || sp.To == e.Junction) && !slices.Contains(ids, sp.PathwayID) {
				ids = append(ids, sp.PathwayID)
			}
		}
	}
	if len(ids) == 0 {
		if a, ok := s.access[b]; ok {
			for _, sp := range s.Net.Spans {
				if (sp.From == a.Junction || sp.To == a.Junction) && !slices.Contains(ids, sp.PathwayID) {
					ids = append(ids, sp.PathwayID)
				}
			}
		}
	}
	slices.Sort(ids)
	var why string
	if len(ids) == 0 {
		why = fmt.Sprintf("building %s is cut off from %s: no pathway reaches it (none ends on or within snap_m of its footprint, and none passes within max_lateral_m)", b, hub)
	} else {
		why = fmt.Sprintf("building %s is cut off from %s: the pathways that reach it (%s) join none that reaches %s", b, hub, strings.Join(ids, ", "), hub)
	}
	if misses := s.nearMissesOf(b, 3); len(misses) > 0 {
		texts := make([]string, len(misses))
		for i, m := range misses {
			texts[i] = m.String()
		}
		why += "; near misses: " + strings.Join(texts, "; ")
	}
	return why
}
