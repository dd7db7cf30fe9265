package output

import (
	"slices"
	"strings"

	"spanwright/geo"
	"spanwright/route/routing"
)

// The router walks a leg from the served building (Link.To) to the cross-connect
// (Link.From): routing.Leg keeps its steps and lists in that order. Every output draws and
// lists a leg the way its link is named, from Link.From to Link.To; LegRoute and travelOf
// are the one place that turns it round.

// LegRoute is what a leg's line is drawn from: the cross-connect (Link.From) at the entrance
// the leg uses there, the leg's steps taken back to front, and the served building (Link.To),
// without properties. The line runs from the leg's from building to its to building;
// routes.geojson, plan.gpkg and the report's map all draw legs by it.
func LegRoute(l *routing.Leg) geo.RouteFeature {
	steps := make([]geo.Step, len(l.Steps))
	for i, st := range l.Steps {
		steps[len(steps)-1-i] = geo.Step{SpanID: st.SpanID, Reverse: !st.Reverse}
	}
	return geo.RouteFeature{FromBuilding: l.Link.From, ToBuilding: l.Link.To,
		FromEntrance: l.EntranceFrom, ToEntrance: l.EntranceTo, Steps: steps}
}

// travel is how a leg passes the campus, each list in the order of its line (from Link.From
// to Link.To): the pathways it uses, each once; the buildings it passes through; the
// junctions where it turns between pathways at a handhole the plan adds.
type travel struct {
	pathways, crosses, turns []string
}

// travelOf is l's travel in the order LegRoute draws it. Pathways are looked up on net by
// span, in the line's order, so that a pathway used twice is listed where the line first
// takes it; a span net does not know (never, for a leg of net) falls back to l.Pathways
// reversed.
func travelOf(net *geo.Network, l *routing.Leg) travel {
	t := travel{crosses: reversedList(l.Crosses), turns: reversedList(l.Turns)}
	seen := map[string]bool{}
	for i := len(l.Steps) - 1; i >= 0; i-- {
		sp, ok := net.Span(l.Steps[i].SpanID)
		if !ok {
			return travel{pathways: reversedList(l.Pathways), crosses: t.crosses, turns: t.turns}
		}
		if !seen[sp.PathwayID] {
			seen[sp.PathwayID] = true
			t.pathways = append(t.pathways, sp.PathwayID)
		}
	}
	if t.pathways == nil {
		t.pathways = []string{}
	}
	return t
}

// reversedList is a reversed copy of xs, never nil.
func reversedList(xs []string) []string {
	out := slices.Clone(xs)
	if out == nil {
		out = []string{}
	}
	slices.Reverse(out)
	return out
}

// ListSep separates the ids of a list's text form (ListText).
const ListSep = "|"

// listEscaper writes the two characters of an id that would make a list's text form
// ambiguous as RFC 3986 percent-encodings: "%" as %25 and ListSep as %7C.
var listEscaper = strings.NewReplacer("%", "%25", ListSep, "%7C")

// ListText is a list of ids as one plain-text value, for clients that keep no list
// properties (a Shapefile's DBF, a GeoPackage column): the ids in order, joined by ListSep,
// with "%" and "|" inside an id percent-encoded (%25, %7C), so that a "|" in the text always
// separates two ids. An empty list is "". Ids without "%" or "|" (every id spanwright makes)
// read as they are: "S-CEP|SR-4|FR-1".
func ListText(ids []string) string {
	parts := make([]string, len(ids))
	for i, id := range ids {
		parts[i] = listEscaper.Replace(id)
	}
	return strings.Join(parts, ListSep)
}

// LegLists is a leg's pathways, the buildings it passes through and the junctions where it
// turns at an added handhole, each in the order of LegRoute's line (from Link.From to
// Link.To), as every file of this package lists them; for writers elsewhere (the report).
func LegLists(net *geo.Network, l *routing.Leg) (pathways, crosses, turns []string) {
	t := travelOf(net, l)
	return t.pathways, t.crosses, t.turns
}
