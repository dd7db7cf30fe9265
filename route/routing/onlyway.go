package routing

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"spanwright/geo"
	"spanwright/route/optimize"
	"spanwright/route/site"
)

// wayIn is how a building with one entrance (layout.endEntry) is reached: the entrance, and
// the stem from it, the edges every route from the building takes, one after another, up to
// the first node where two ways part (its far node). A diverse link's two legs share it
// whatever the routes: that, not anything beyond it, is the link's single point of failure.
type wayIn struct {
	building string
	entry    geo.Entry
	edges    []int // the stem's edges from the entrance out, in order (none: ways part at the entrance)
	nodes    []int // the entrance's node and every node of the stem, far node last
}

// stemOf is building b's way in when it has one entrance, and false when it has several (or
// none). The walk follows edges of prob from the building's end node while exactly one edge
// leads on.
func stemOf(lay *layout, prob *optimize.Problem, b string) (wayIn, bool) {
	e, one := lay.endEntry[b]
	n, ok := lay.end[b]
	if !one || !ok {
		return wayIn{}, false
	}
	at := make([][]int, prob.Nodes) // node → incident edges, in edge order
	for i, ed := range prob.Edges {
		at[ed.From] = append(at[ed.From], i)
		if ed.To != ed.From {
			at[ed.To] = append(at[ed.To], i)
		}
	}
	w := wayIn{building: b, entry: e, nodes: []int{n}}
	came := -1
	for cur := n; ; {
		next := slices.DeleteFunc(slices.Clone(at[cur]), func(i int) bool { return i == came })
		if len(next) != 1 {
			return w, true
		}
		ed := prob.Edges[next[0]]
		far := ed.To
		if far == cur {
			far = ed.From
		}
		if slices.Contains(w.nodes, far) {
			return w, true // a loop: no stem beyond
		}
		came, cur = next[0], far
		w.edges, w.nodes = append(w.edges, came), append(w.nodes, far)
	}
}

// holds reports whether single point sp lies on the way in: one of its edges or nodes, or a
// shared-risk group of an edge of it or of an edge leaving its far node (both legs leave
// there; the group is the street's duct the stem taps).
func (w wayIn) holds(prob *optimize.Problem, sp *optimize.SinglePoint) bool {
	if sp == nil {
		return false
	}
	switch sp.Kind {
	case optimize.PointEdge:
		return slices.Contains(w.edges, sp.Index)
	case optimize.PointNode:
		return slices.Contains(w.nodes, sp.Index)
	case optimize.PointGroup:
		far := w.nodes[len(w.nodes)-1]
		for i, ed := range prob.Edges {
			if ed.Group == sp.Index && (slices.Contains(w.edges, i) || ed.From == far || ed.To == far) {
				return true
			}
		}
	}
	return false
}

// text names the way in: the building's only entrance, its counted lateral and the spans of
// the stem, to the junction where ways part.
func (w wayIn) text(s *site.Site, lay *layout) string {
	var b strings.Builder
	fmt.Fprintf(&b, "building %s's only entrance %s", w.building, w.entry.ID)
	if w.entry.LateralM > 0 {
		fmt.Fprintf(&b, " and its %.1f m lateral to junction %s", w.entry.LateralM, w.entry.Junction)
	}
	var spans []string
	for _, e := range w.edges {
		if _, extra := lay.isExtra(len(s.Net.Spans), e); !extra { // a turn edge is at the junction named
			spans = append(spans, fmt.Sprintf("%s (pathway %s)", s.Net.Spans[e].ID, s.Net.Spans[e].PathwayID))
		}
	}
	if len(spans) > 0 {
		fmt.Fprintf(&b, " and its one way on, span %s", strings.Join(spans, ", "))
		if j := lay.junction[w.nodes[len(w.nodes)-1]]; j >= 0 {
			fmt.Fprintf(&b, ", to junction %s", s.Net.Junctions[j].ID)
		}
	}
	return b.String()
}

// secondEntrance is the suggestion a reason about building w.building's only way in ends
// with: what would give the link a second, independent route. It is never built: the campus
// must draw it. The nearest pathway within design.max_lateral_m of the footprint that is not
// on the way in, nor met where ways part (those share the way in's risk), is named: a
// declared entrance facing it gets a counted lateral the plan lays and prices (Build; even
// without new trench). With none, a proposed pathway to the wall, which only a plan that may
// build new trench builds.
func secondEntrance(s *site.Site, lay *layout, w wayIn, maxLateralM float64, allowNew bool) string {
	own := map[string]bool{}
	for _, e := range w.edges {
		if e < len(s.Net.Spans) {
			own[s.Net.Spans[e].PathwayID] = true
		}
	}
	for _, j := range []string{w.entry.Junction, junctionOf(s, lay, w.nodes[len(w.nodes)-1])} {
		for i := range s.Net.Spans {
			if sp := &s.Net.Spans[i]; j != "" && (sp.From == j || sp.To == j) {
				own[sp.PathwayID] = true
			}
		}
	}
	reach := strconv.FormatFloat(maxLateralM, 'f', -1, 64)
	for _, np := range s.Net.PathwaysNear(s.Campus, w.building, maxLateralM) {
		if !own[np.PathwayID] {
			return fmt.Sprintf("a second entrance to building %s facing pathway %s, %.1f m from its footprint, would make the link diverse (declared there, within design.max_lateral_m %s m, it gets a lateral the plan lays and prices)",
				w.building, np.PathwayID, np.DistM, reach)
		}
	}
	out := fmt.Sprintf("a second entrance to building %s on another pathway would make the link diverse, but no other pathway passes within design.max_lateral_m %s m of it: it needs a proposed pathway drawn to its wall", w.building, reach)
	if allowNew {
		return out + ", which the plan may build and would price"
	}
	return out + ", which design.allow_new_trench false forbids"
}

// junctionOf is the junction of node v of the layout, "" for a building's own node.
func junctionOf(s *site.Site, lay *layout, v int) string {
	if j := lay.junction[v]; j >= 0 {
		return s.Net.Junctions[j].ID
	}
	return ""
}

// onlyWayIn is the reason of a diverse leg that got no route of its own when what every route
// shares is an end building's only way in (wayIn.holds), and "" otherwise.
func onlyWayIn(s *site.Site, m *Model, lay *layout, prob *optimize.Problem, l *site.Link, sp *optimize.SinglePoint) string {
	for _, b := range []string{l.To, l.From} {
		if w, ok := stemOf(lay, prob, b); ok && w.holds(prob, sp) {
			then := ""
			if sp.Kind == optimize.PointGroup { // a group given on the campus, never parted at a link's own end (runGroups)
				then = ", and leave it along shared-risk group " + groupName(s, lay, prob, sp.Index)
			}
			return fmt.Sprintf("every route must use %s%s, a single point of failure; %s",
				w.text(s, lay), then, secondEntrance(s, lay, w, m.design.MaxLateralM, m.design.AllowNewTrench))
		}
	}
	return ""
}
