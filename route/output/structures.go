package output

import (
	"fmt"
	"slices"
	"strings"
	"sync"

	"github.com/paulmach/orb"

	"spanwright/geo"
	"spanwright/route"
	"spanwright/route/estimate"
	"spanwright/route/routing"
)

// Status of a structure in the structures table (StructuresOf).
const (
	StructureExisting = "existing" // on the campus; a leg passes it
	StructureToBuild  = "to build" // a handhole the plan adds
)

// Purposes of an existing structure a leg passes: what the plan does there.
const (
	PurposePassed    = "passed"     // the cable only passes through
	PurposeSlackLoop = "slack loop" // a slack loop is left there (site.Site.LoopStructure)
	PurposePullPoint = "pull point" // a pull section starts or ends there
	// PurposeSpliceClosure is added to the purposes of a structure where a leg's mid-span join
	// is placed (routing.CableTakeoff.Splices): an existing one, or a handhole the plan adds
	// at a junction or along new construction; Structure.Joined names the legs.
	PurposeSpliceClosure = "splice closure"
)

// Structure is one row of the structures table: a handhole the plan adds, or an existing
// structure a feasible leg passes, with where it is and the legs through it. The report,
// bom.xlsx's structures sheet and plan.gpkg's structures layer are written from these rows
// (StructuresOf), so that a structure's mark is the same in all three.
type Structure struct {
	Mark int    // 1-based number, the label on the report's map
	ID   string // the structure's or junction's id; "" for a handhole on a span or lateral
	// Span and AtM place a handhole that stands on a span (or a counted lateral, named
	// "lateral of" and its entrance) and not at a junction: AtM metres from the span's from
	// end (a lateral's from its building), which End names (geo.Network.EndName).
	Span   string
	AtM    float64
	End    string
	Status string // StructureExisting or StructureToBuild
	// Type is the structure's type (geo.Structure.Type: maintenance-hole, handhole,
	// pull-box); a structure to build is a handhole.
	Type string
	// Purpose says why it is built (join, tap, turn, run, pull or splice: the added_structures
	// layer's purposes) or what the plan does at an existing one (slack loop, pull point,
	// both joined by ", ", or passed); then what else the bill builds there: "new duct entry
	// (SPAN)" at a maintenance hole new duct enters (estimate.HoleEntryPurpose) and "pole
	// riser (lateral of ENTRANCE)" at the handhole a lateral's riser comes down into
	// (estimate.PoleRiserPurpose); where legs are joined (Joined), ", splice closure"
	// after them (PurposeSpliceClosure), but at a splice point to build, whose purpose splice
	// says it. An existing maintenance hole no leg passes is listed when new duct enters it.
	Purpose string
	Point   orb.Point // WGS84 longitude and latitude, in degrees, rounded as geo.Rounded does
	Legs    []string  // the feasible legs through it, "link/leg", in leg order
	// Joined is the feasible legs with a mid-span join there (routing.CableTakeoff.Splices:
	// the crew sets a splice closure and the next reel starts there), "link/leg", in leg
	// order; empty where none is.
	Joined []string
	// CoiledM is the cable coiled there, in metres over every cable: a slack loop
	// (design.slack_loop_structure_m) for each cable of each leg whose structures passed hold
	// it, and the splicing slack at both ends of each cable joined there, which the crew stores
	// with the closure: the larger of the two, once, at a join in a structure passed
	// (routing.SplicePoint.SlackM adds what the splicing slack adds to the loop). 0 where
	// nothing is coiled.
	CoiledM float64
}

// Place is where a structure is, for a person: its id, or "new handhole on SPAN, LENGTH from
// the END end" (estimate.PullPoint.Text) with the offset written by length; a splice point on
// an aerial span is no handhole but a closure on the strand, "new splice closure on SPAN, …"
// (tester 8 finding 16).
func (s Structure) Place(length func(m float64) string) string {
	if s.Type == TypeSpliceClosure && s.ID == "" {
		return "new splice closure " + routing.AlongText(s.Span, s.End, s.AtM, length) + " (on the strand)"
	}
	return estimate.PullPoint{ID: s.ID, Span: s.Span, AtM: s.AtM, End: s.End}.Text(length)
}

// StructuresOf lists the structures of the plan: first the handholes it adds (at junctions,
// by junction id; along new construction, by span and offset; the pulling plan's, as
// addedPullPoints sorts them; the splice points to build on spans, as the estimate lists
// them, splicePointsOnSpans), then the existing structures its feasible legs pass, by id.
// Marks number them in that order; rows may share their Legs, which are not to be changed.
// The legs of a maintenance hole or handhole where slack loops are stored (one the plan adds
// at a junction or along new construction, or an existing one, site.Site.LoopStructure) are
// those whose structures passed hold it (routing.CableTakeoff.Passed: the one list links.csv
// counts too), each leaving one slack loop there per cable. A structure that stores no loop
// (an existing pull box or vault, a handhole the pulling plan adds) lists the legs through it:
// those whose spans meet there, those on its span, or those pulled there on a lateral. The
// legs joined at a structure (Joined) are those whose joins (routing.CableTakeoff.Splices, the
// one list links.csv's mid_span_splices_at and the links sheet write too) are placed there.
func StructuresOf(r *route.Result) ([]Structure, error) { return structuresOf(r, addedPullPoints(r)) }

// structureList is a plan's added pull points (addedPullPoints) and its structures table
// (StructuresOf), as the files that list them read them.
type structureList struct {
	pulls []pullPoint
	all   []Structure
}

// structuresOnce finds r's structureList on its first call and returns it on every call:
// Outputs finds it once for plan.gpkg and bom.xlsx, which may render side by side.
func structuresOnce(r *route.Result) func() (structureList, error) {
	return sync.OnceValues(func() (structureList, error) {
		pulls := addedPullPoints(r)
		all, err := structuresOf(r, pulls)
		return structureList{pulls: pulls, all: all}, err
	})
}

// structuresOf is StructuresOf given the plan's added pull points (addedPullPoints), for a
// caller that has them already.
func structuresOf(r *route.Result, pulls []pullPoint) ([]Structure, error) {
	net := r.Site.Net
	// The junctions and spans of structures storing no loop, whose legs are those through
	// them: only these, for a large plan's legs pass tens of thousands of others.
	atJunction, onSpan := map[string][]string{}, map[string][]string{}
	for _, st := range r.Site.Campus.Structures {
		if !r.Site.LoopStructure(st.ID) {
			atJunction[st.ID] = nil
		}
	}
	for _, p := range pulls {
		switch {
		case p.junction != "":
			atJunction[p.junction] = nil
		case !p.lateral:
			onSpan[p.span] = nil
		}
	}
	// addTo appends label to m[k] when k is wanted, once per leg (a leg's labels come
	// together).
	addTo := func(m map[string][]string, k, label string) {
		legs, ok := m[k]
		if ok && (len(legs) == 0 || legs[len(legs)-1] != label) {
			m[k] = append(legs, label)
		}
	}
	// The legs of the structures storing loops, from the legs' own lists.
	type place struct {
		id, span string
		atM      float64
	}
	passed, joined, coiled := map[place][]string{}, map[place][]string{}, map[place]float64{}
	loopM := r.Plan.Design.SlackLoopStructureM
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		label := l.Label()
		for _, st := range l.Steps {
			sp, ok := net.Span(st.SpanID)
			if !ok {
				continue
			}
			addTo(atJunction, sp.From, label)
			addTo(atJunction, sp.To, label)
			addTo(onSpan, st.SpanID, label)
		}
		cables := float64(len(l.Cable.Cables))
		for _, p := range l.Cable.Passed {
			k := place{p.ID, p.Span, p.AtM}
			passed[k] = append(passed[k], label) // each structure once in a leg's list
			coiled[k] += loopM * cables
		}
		for _, p := range l.Cable.Splices { // in structures passed, but a splice point to build (below)
			if k := (place{p.ID, p.Span, p.AtM}); !p.NoStructure {
				if !slices.Contains(joined[k], label) {
					joined[k] = append(joined[k], label)
				}
				coiled[k] += p.SlackM * cables
			}
		}
	}
	legsAt := func(k place) []string {
		if legs := passed[k]; legs != nil {
			return legs
		}
		return []string{}
	}
	// What else the bill builds at a structure, named on its row (tester 11's finding 12):
	// the maintenance hole entries of new duct, and the pole risers of counted laterals
	// coming down into the handhole at the pole's foot.
	builtAt := map[string][]string{}
	if r.Estimate != nil {
		for _, h := range r.Estimate.Construction.HoleEntries {
			builtAt[h.Hole] = append(builtAt[h.Hole], estimate.HoleEntryPurpose(h.Span))
		}
		for _, en := range r.Estimate.Construction.Entrances {
			if en.PoleRiser && en.LateralM > 0 && en.Tap != "" {
				builtAt[en.Tap] = append(builtAt[en.Tap], estimate.PoleRiserPurpose(en.Entrance))
			}
		}
	}
	var out []Structure
	add := func(s Structure) {
		s.Mark = len(out) + 1
		if s.ID != "" {
			for _, what := range builtAt[s.ID] {
				if s.Purpose != "" {
					s.Purpose += ", "
				}
				s.Purpose += what
			}
		}
		s.Point = geo.Rounded(s.Point).(orb.Point)
		if s.Legs == nil {
			s.Legs = []string{}
		}
		if s.Joined == nil {
			s.Joined = []string{}
		}
		if len(s.Joined) > 0 && s.Purpose != PurposeSplice {
			s.Purpose += ", " + PurposeSpliceClosure
		}
		out = append(out, s)
	}
	for _, h := range handholesByJunction(r.Handholes) {
		j, ok := net.Junction(h.Junction)
		if !ok {
			return nil, fmt.Errorf("handhole at %s: not a junction of the network", h.Junction)
		}
		add(Structure{ID: h.Junction, Status: StructureToBuild, Type: geo.StructureHandhole, Purpose: h.Purpose(),
			Point: j.Point, Legs: legsAt(place{id: h.Junction}), Joined: joined[place{id: h.Junction}], CoiledM: coiled[place{id: h.Junction}]})
	}
	if r.Estimate != nil {
		for _, h := range r.Estimate.Construction.RunHandholes {
			sp, ok := net.Span(h.Span)
			if !ok {
				return nil, fmt.Errorf("handhole along new construction on %s: not a span of the network", h.Span)
			}
			add(Structure{Span: h.Span, AtM: h.AtM, End: net.EndName(sp.From), Status: StructureToBuild, Type: geo.StructureHandhole, Purpose: PurposeRun,
				Point: sp.PointAt(h.AtM), Legs: legsAt(place{span: h.Span, atM: h.AtM}), Joined: joined[place{span: h.Span, atM: h.AtM}],
				CoiledM: coiled[place{span: h.Span, atM: h.AtM}]})
		}
	}
	for _, p := range pulls {
		s := Structure{Status: StructureToBuild, Type: geo.StructureHandhole, Purpose: PurposePull}
		switch {
		case p.junction != "":
			j, ok := net.Junction(p.junction)
			if !ok {
				return nil, fmt.Errorf("pull point at %s: not a junction of the network", p.junction)
			}
			s.ID, s.Point, s.Legs = p.junction, j.Point, atJunction[p.junction]
		case p.lateral:
			s.Span, s.AtM, s.End, s.Point, s.Legs = p.span, p.offM, p.end, p.lat.PointAt(p.offM), p.legs
		default:
			sp, ok := net.Span(p.span)
			if !ok {
				return nil, fmt.Errorf("pull point on %s: not a span of the network", p.span)
			}
			s.Span, s.AtM, s.End, s.Point, s.Legs = p.span, p.offM, net.EndName(sp.From), sp.PointAt(p.offM), onSpan[p.span]
		}
		add(s)
	}
	for _, sp := range splicePointsOnSpans(r) {
		legs := make([]string, 0, len(sp.Legs))
		coiledM, at := 0.0, sp.At.Text(estimate.MetresText) // the estimate's one place a text
		for _, i := range sp.Legs {
			l := &r.Legs[i]
			legs = append(legs, l.Label())
			for _, p := range l.Cable.Splices {
				if p.NoStructure && p.Text(estimate.MetresText) == at {
					coiledM += p.SlackM * float64(len(l.Cable.Cables))
				}
			}
		}
		add(Structure{Span: sp.At.Span, AtM: sp.At.AtM, End: sp.At.End, Status: StructureToBuild, Type: sp.typ, Purpose: PurposeSplice,
			Point: sp.point, Legs: legs, Joined: legs, CoiledM: coiledM})
	}
	// Existing structures passed, with what is done there.
	pulled := map[string]bool{}
	if r.Estimate != nil {
		for _, p := range r.Estimate.Pulls {
			pulled[p.From.ID], pulled[p.To.ID] = true, true
		}
	}
	existing := slices.Clone(r.Site.Campus.Structures)
	slices.SortStableFunc(existing, func(a, b geo.Structure) int { return strings.Compare(a.ID, b.ID) })
	for _, st := range existing {
		legs := atJunction[st.ID]
		if r.Site.LoopStructure(st.ID) {
			legs = passed[place{id: st.ID}]
		}
		if len(legs) == 0 && len(builtAt[st.ID]) == 0 {
			continue
		}
		var what []string
		if r.Site.LoopStructure(st.ID) {
			what = append(what, PurposeSlackLoop)
		}
		if pulled[st.ID] {
			what = append(what, PurposePullPoint)
		}
		if len(what) == 0 && len(legs) > 0 {
			what = append(what, PurposePassed)
		}
		add(Structure{ID: st.ID, Status: StructureExisting, Type: st.Type, Purpose: strings.Join(what, ", "),
			Point: st.Point, Legs: legs, Joined: joined[place{id: st.ID}], CoiledM: coiled[place{id: st.ID}]})
	}
	return out, nil
}

// splicePoint is a splice point to build on a span, where it stands and what is built.
type splicePoint struct {
	estimate.SplicePointToBuild
	point orb.Point
	typ   string // a handhole, or on an aerial span a splice closure on the strand
}

// splicePointsOnSpans is the plan's splice points to build that stand on a span
// (estimate.Estimate.SplicePoints), in its order, for the structures table and the
// added_structures layer. One off the spans (in a riser, a slack loop or a lateral) has no
// place on the map; the bill and the warnings name it.
func splicePointsOnSpans(r *route.Result) []splicePoint {
	if r.Estimate == nil {
		return nil
	}
	var out []splicePoint
	for _, sp := range r.Estimate.SplicePoints {
		span, ok := r.Site.Net.Span(sp.At.Span)
		if sp.At.Span == "" || !ok {
			continue
		}
		typ := geo.StructureHandhole
		if !sp.At.BuildsHandhole(r.Site.Net) {
			typ = TypeSpliceClosure // on an aerial span's strand
		}
		out = append(out, splicePoint{SplicePointToBuild: sp, point: span.PointAt(sp.At.AtM), typ: typ})
	}
	return out
}

// handholesByJunction is a copy of the handholes the plan adds at junctions in junction order,
// the order of the structures table and plan.gpkg's added_structures.
func handholesByJunction(hs []routing.Handhole) []routing.Handhole {
	hs = slices.Clone(hs)
	slices.SortStableFunc(hs, func(a, b routing.Handhole) int { return strings.Compare(a.Junction, b.Junction) })
	return hs
}
