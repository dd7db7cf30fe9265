package output

import (
	"bytes"
	"cmp"
	"context"
	"fmt"
	"io"
	"math"
	"slices"
	"strings"

	"spanwright/geo"
	"spanwright/geo/gpkgout"
	"spanwright/route"
	"spanwright/route/estimate"
	"spanwright/route/fileset"
	"spanwright/route/internal/ctxio"
	"spanwright/route/items"
	"spanwright/route/routing"
)

// GeoPackage layer names of plan.gpkg.
const (
	LayerLegs          = "legs"
	LayerSpans         = "spans"
	LayerConstruction  = "new_construction"
	LayerStructures    = "added_structures"
	LayerAllStructures = "structures"
	LayerBuildings     = "buildings"
	LayerEntrances     = "entrances"
	geoPackageFileName = "plan.gpkg"
)

// Work kinds of the new construction layer.
const (
	WorkOpened    = "opened"     // a proposed pathway the plan builds
	WorkAddedDuct = "added duct" // ducts added beside an existing duct span: one trench or bore
	WorkLateral   = "lateral"    // the counted lateral to an entrance the plan uses
)

// Purposes of an added structure.
const (
	// At a junction without a structure, one handhole whatever its reasons, under the first
	// of them (routing.Handhole.Purpose): join, tap, turn.
	PurposeJoin = routing.PurposeJoin // where a pathway the plan opens joins the network
	PurposeTurn = routing.PurposeTurn // where a route turns from one pathway into another
	PurposePull = "pull"              // an intermediate pull point the pulling plan adds (estimate.Estimate.AddedPullPoints)
	PurposeRun  = "run"               // along new construction, at handhole_spacing_m or the bend budget (site.NewRuns)
	PurposeTap  = routing.PurposeTap  // where a counted lateral taps the side of a duct (site.Site.Tap)
	// A splice point to build: a mid-span join with no structure within its reel's reach
	// (estimate.Estimate.SplicePoints), a handhole, or on an aerial span a splice closure on
	// the strand (TypeSpliceClosure).
	PurposeSplice = "splice"
	// TypeSpliceClosure is the type of a splice point built on an aerial span.
	TypeSpliceClosure = "splice closure"
)

// gpkgLayers are plan.gpkg's layers, their columns and what each holds: the README's table
// is written from the same words.
func gpkgLayers() []gpkgout.Layer {
	c := func(name, typ, desc string) gpkgout.Column {
		return gpkgout.Column{Name: name, Type: typ, Description: desc}
	}
	const (
		in, re, tx, bo = gpkgout.Integer, gpkgout.Real, gpkgout.Text, gpkgout.Boolean
	)
	return []gpkgout.Layer{
		{Name: LayerLegs, Geometry: gpkgout.LineString,
			Description: "one row per leg, the line from its from building to its to building (none when infeasible)",
			Columns: []gpkgout.Column{
				c("link", tx, "link id"), c("leg", tx, "primary or diverse"),
				c("from_building", tx, "the link's from building (the cross-connect)"), c("to_building", tx, "the building served"),
				c("rate", tx, "the link's rate"), c("future_rate", tx, "the rate the cable is sized for; empty when none"),
				c("feasible", bo, "whether the leg could be planned"),
				c("medium", tx, "catalog medium"), c("application", tx, "IEEE 802.3 PHY"), c("construction", tx, "cable construction (and the listed one spliced on inside)"),
				c("strands", in, "strands (or pairs) of the cable"), c("cables", in, "cables pulled for the leg"),
				c("route_m", re, "route length along pathways and laterals, metres"), c("lateral_m", re, "laterals alone, metres"),
				c("riser_m", re, "risers at both ends, metres"), c("cable_m", re, "cable bought for the leg, every cable, waste included, metres"),
				c("limit_db", re, "loss limit at the worst wavelength"), c("margin_db", re, "loss margin at the worst wavelength"),
				c("cost_cents", in, "the leg's cost in the cost model, integer cents"),
				c("from_entrance", tx, "entrance used at the from building"), c("to_entrance", tx, "entrance used at the to building"),
				c("pathways_text", tx, "pathways in the order of the line, joined by |"),
				c("crosses_text", tx, "buildings passed through, joined by |"),
				c("turns_text", tx, "junctions turned at where a handhole is added, joined by |"),
				c("reason_code", tx, "short stable code of the reason"), c("reason", tx, "why infeasible, or how the medium was chosen"),
			}},
		{Name: LayerSpans, Geometry: gpkgout.LineString,
			Description: "every span that carries cable, with its cable count and duct fill",
			Columns: []gpkgout.Column{
				c("span", tx, "span id"), c("pathway", tx, "pathway id"), c("type", tx, "pathway type"), c("status", tx, "existing or proposed"),
				c("length_m", re, "span length, metres"), c("cables", in, "cables the plan puts on the span"),
				c("ducts", in, "spare ducts on the span before the plan (0 on new construction and where capacity is not limited)"),
				c("added_ducts", in, "ducts the plan lays along the span: every duct of an opened duct span; beside an existing span a trench of them, at least design.new_ducts"),
				c("limited", bo, "whether the span's capacity is limited (ducts)"),
				c("fill_pct", re, "highest duct fill on the span, percent; none without duct fill"),
				c("fill_limit_pct", re, "the NFPA 70 limit of that duct, percent"), c("fill_ok", bo, "every duct of the span within its limit"),
				c("opened", bo, "a proposed span the plan builds"), c("links_text", tx, "links whose legs use the span, joined by |"),
			}},
		{Name: LayerConstruction, Geometry: gpkgout.LineString,
			Description: "new civil work, one row per span and kind of work: trenched on a surface or bored",
			Columns: []gpkgout.Column{
				c("span", tx, "span id"), c("pathway", tx, "pathway id"), c("work", tx, "opened (a proposed pathway), added duct, or lateral (to an entrance)"),
				c("method", tx, "trench or bore"), c("surface", tx, "surface trenched and restored; none for a bore"),
				c("length_m", re, "length of new work, metres"), c("added_ducts", in, "ducts laid: beside an existing span, at least design.new_ducts; in an opened duct span, all of its ducts (0 for other pathway types)"),
				c("entrance", tx, "for work lateral: the entrance whose counted lateral is built"),
			}},
		{Name: LayerStructures, Geometry: gpkgout.Point,
			Description: "handholes the plan adds: at junctions without a structure, and pull points on spans",
			Columns: []gpkgout.Column{
				c("junction", tx, "junction id; none for a pull point on a span"),
				c("span", tx, "span id of a pull point on a span"), c("at_m", re, "its distance from the span's from end, metres"),
				c("purpose", tx, "join (an opened pathway joins there), tap (a counted lateral taps the side of a duct), turn (a route turns between pathways), run (along new construction, at the design's spacing or bend budget) pull (the pulling plan needs a pull point) or splice (a mid-span join with no structure within its reel's reach: a splice point to build); one row per junction, under the first of join, tap and turn that it is for"),
				c("links_text", tx, "links whose legs turn, tap, pass (as the structures layer lists them), are pulled or join there, joined by |"),
			}},
		{Name: LayerAllStructures, Geometry: gpkgout.Point,
			Description: "the structures table: handholes the plan adds, then the existing structures its legs pass, numbered as on the report's map",
			Columns: []gpkgout.Column{
				c("mark", in, "the structure's number on the report's map and in bom.xlsx's structures sheet"),
				c("structure", tx, "structure or junction id; none for a handhole on a span or lateral"),
				c("span", tx, "for a handhole on a span: the span id (a lateral's: lateral of and its entrance)"),
				c("at_m", re, "its distance from the span's from end (a lateral's building end), metres"),
				c("status", tx, "existing or to build"), c("type", tx, "maintenance-hole, handhole or pull-box; to build: handhole, or splice closure (a splice point on an aerial span's strand)"),
				c("purpose", tx, "to build: join, tap, turn, run, pull or splice (as added_structures); existing: slack loop, pull point (both joined by a comma) or passed; then new duct entry (SPAN) where new duct enters a maintenance hole and pole riser (lateral of ENTRANCE) where a lateral's riser comes down a pole into the handhole; then splice closure where a leg's mid-span join is placed (joined_text)"),
				c("legs_text", tx, "legs through it, link/leg, joined by |"),
				c("joined_text", tx, "legs with a mid-span join there (a splice closure, the next reel starting there), link/leg, joined by |; empty where none is"),
				c("coiled_m", re, "cable coiled there over every cable, metres: a slack loop per cable of each leg through it that leaves one, and the splicing slack at both ends of each cable joined there"),
			}},
		{Name: LayerBuildings, Geometry: gpkgout.MultiPolygon,
			Description: "every building of the campus",
			Columns: []gpkgout.Column{
				c("building", tx, "building id"), c("name", tx, "building name"), c("role", tx, "mc, ic or empty for served"),
				c("hub", bo, "the plan's hub"), c("transit", bo, "routes may pass through"),
				c("entrances", in, "ways into the building"), c("entrances_used", in, "of them, used by a leg"),
				c("used_text", tx, "the entrances used, joined by |"),
			}},
		{Name: LayerEntrances, Geometry: gpkgout.Point,
			Description: "every way into every building, at the building end of its lateral",
			Columns: []gpkgout.Column{
				c("entrance", tx, "entrance id"), c("building", tx, "building id"), c("via", tx, "entrance, footprint or lateral"),
				c("lateral_m", re, "lateral length, metres"), c("used", bo, "used by a leg"), c("links_text", tx, "links whose legs use it, joined by |"),
			}},
	}
}

// GeoPackageLayers describes plan.gpkg's layers and columns (without features), for
// documentation and tests.
func GeoPackageLayers() []gpkgout.Layer { return gpkgLayers() }

// optional is v, or nil (a NULL) when ok is false.
func optional(v any, ok bool) any {
	if !ok {
		return nil
	}
	return v
}

// planGeoPackage renders plan.gpkg: the layers of gpkgLayers, metric whatever the units (as
// routes.geojson), lengths to the decimetre and decibels to the hundredth as there.
func planGeoPackage(ctx context.Context, r *route.Result) ([]byte, error) {
	var buf bytes.Buffer
	if err := writeGeoPackage(ctx, &buf, r, structuresOnce(r)); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// writeGeoPackage renders plan.gpkg into w, as planGeoPackage does, without holding the file
// in memory (gpkgout.WriteTo builds it in a temporary file); sts gives the added pull points
// and the structures table.
func writeGeoPackage(ctx context.Context, w io.Writer, r *route.Result, sts func() (structureList, error)) error {
	layers, err := planLayers(ctx, r, sts)
	if err != nil {
		return err
	}
	return gpkgout.WriteToIn(ctx, w, layers, fileset.ScratchDir(ctx))
}

// planLayers lays out plan.gpkg's layers (gpkgLayers) with the plan's features.
func planLayers(ctx context.Context, r *route.Result, sts func() (structureList, error)) ([]gpkgout.Layer, error) {
	layers := gpkgLayers()
	byName := map[string]*gpkgout.Layer{}
	for i := range layers {
		byName[layers[i].Name] = &layers[i]
	}
	net := r.Site.Net
	add := func(layer string, g gpkgout.Geometry, vals ...any) {
		l := byName[layer]
		f := gpkgout.Feature{Values: vals}
		if g != nil {
			f.Geometry = geo.Rounded(g)
		}
		l.Features = append(l.Features, f)
	}

	// Legs, and who uses which span, entrance and turn.
	spanLinks, turnLinks := map[string][]string{}, map[string][]string{}
	type ent struct{ building, id string }
	entLinks := map[ent][]string{}
	for i := range r.Legs {
		if err := ctxio.StopEvery(ctx, i); err != nil {
			return nil, err
		}
		l := &r.Legs[i]
		tr := travelOf(net, l)
		var line gpkgout.Geometry
		if l.Feasible {
			ls, err := net.RouteLine(LegRoute(l))
			if err != nil {
				return nil, fmt.Errorf("leg %s %s: %w", l.Link.ID, l.Name, err)
			}
			if len(ls) >= 2 {
				line = ls
			}
			for _, st := range l.Steps {
				addOnce(spanLinks, st.SpanID, l.Link.ID)
			}
			for _, j := range l.Turns {
				addOnce(turnLinks, j, l.Link.ID)
			}
			for _, e := range []ent{{l.Link.From, l.EntranceFrom}, {l.Link.To, l.EntranceTo}} {
				addOnce(entLinks, e, l.Link.ID)
			}
		}
		w, worst := l.WorstLoss()
		add(LayerLegs, line, l.Link.ID, l.Name, l.Link.From, l.Link.To, l.Link.Rate, l.Link.FutureRate, l.Feasible,
			l.Medium, l.Application, l.ConstructionText(), l.StrandsCable, len(l.Cable.Cables),
			round1(l.RouteM), round1(l.LateralM), round1(l.RiserM), round1(l.Cable.LengthM*float64(len(l.Cable.Cables))),
			optional(round2(w.LimitDB), worst), optional(round2(w.MarginDB), worst), l.Cost.TotalCents(),
			l.EntranceFrom, l.EntranceTo, ListText(tr.pathways), ListText(tr.crosses), ListText(tr.turns),
			l.ReasonCode, l.Explain())
	}

	// Spans that carry cable, with their fill.
	type fillAt struct {
		pct, limit float64
		ok, any    bool
	}
	fills := map[string]fillAt{}
	if r.Estimate != nil {
		for _, f := range r.Estimate.Fill {
			a := fills[f.Span]
			if !a.any || f.FillPct > a.pct {
				a.pct, a.limit = f.FillPct, f.AllowedPct
			}
			a.ok = (a.ok || !a.any) && f.OK
			a.any = true
			fills[f.Span] = a
		}
	}
	opened := map[string]bool{}
	for _, id := range r.Opened {
		opened[id] = true
	}
	for _, f := range r.Fill {
		sp, ok := net.Span(f.Span)
		if !ok {
			return nil, fmt.Errorf("span %s of the fill: not in the network", f.Span)
		}
		a := fills[f.Span]
		add(LayerSpans, sp.Line, sp.ID, sp.PathwayID, sp.Type, sp.Status, round1(sp.LengthM), f.Cables, f.Ducts, f.AddedDucts,
			f.Limited, optional(round1(a.pct), a.any), optional(a.limit, a.any), optional(a.ok, a.any),
			opened[sp.ID], ListText(spanLinks[sp.ID]))
	}

	// New construction: opened spans, then added ducts, as the estimate counts them.
	type work struct {
		span, kind string
		added      int
	}
	var works []work
	laid := map[string]int{}
	for _, f := range r.Fill {
		laid[f.Span] = f.AddedDucts // the ducts laid, as billed
	}
	for _, id := range r.Opened {
		works = append(works, work{id, WorkOpened, laid[id]})
	}
	for _, f := range r.Fill {
		if f.AddedDucts > 0 && !opened[f.Span] {
			works = append(works, work{f.Span, WorkAddedDuct, f.AddedDucts})
		}
	}
	slices.SortStableFunc(works, func(a, b work) int {
		if c := strings.Compare(a.span, b.span); c != 0 {
			return c
		}
		return strings.Compare(a.kind, b.kind)
	})
	for _, w := range works {
		sp, ok := net.Span(w.span)
		if !ok {
			return nil, fmt.Errorf("span %s of the new construction: not in the network", w.span)
		}
		pc, ok := r.Estimate.Construction.PieceOf(sp.ID) // its method, surface and listed metres (the pieces add up to the bill's lines)
		if !ok {
			return nil, fmt.Errorf("span %s of the new construction: not in the estimate's pieces", w.span)
		}
		add(LayerConstruction, sp.Line, sp.ID, sp.PathwayID, w.kind, pc.Method, surfaceOf(pc), pc.ListedM, w.added, nil)
	}
	// Counted laterals the plan builds to the entrances it uses, as the estimate counts them.
	for _, en := range r.Estimate.Construction.Entrances {
		if en.LateralM <= 0 {
			continue
		}
		var line gpkgout.Geometry
		for _, e := range net.EntrancesOf(en.Building) {
			if e.ID == en.Entrance && len(e.Lateral) > 1 {
				line = e.Lateral
			}
		}
		pc, ok := r.Estimate.Construction.LateralPiece(en.Building, en.Entrance)
		if !ok {
			return nil, fmt.Errorf("lateral to entrance %s of building %s: not in the estimate's pieces", en.Entrance, en.Building)
		}
		// Its ducts as billed (estimate's construction): the design's, items.NewDucts (tester
		// 13's finding B: 0 here while the bill laid them).
		add(LayerConstruction, line, nil, nil, WorkLateral, pc.Method, surfaceOf(pc), pc.ListedM, items.NewDucts(r.Design()), en.Entrance)
	}

	// Handholes the plan adds: where routes join or turn, then the pulling plan's.
	found, err := sts()
	if err != nil {
		return nil, err
	}
	// The legs the structures table lists at each handhole the plan adds at a junction (those
	// that pass it, leaving their slack loops), by link: a handhole where new pathway joins
	// has no turn or tap of its own, and its links are these (tester 10's finding 17).
	linkOf := make(map[string]string, len(r.Legs))
	for i := range r.Legs {
		linkOf[r.Legs[i].Label()] = r.Legs[i].Link.ID
	}
	tableLegs := map[string][]string{}
	for _, st := range found.all {
		if _, seen := tableLegs[st.ID]; !seen && st.Status == StructureToBuild && st.ID != "" {
			tableLegs[st.ID] = st.Legs
		}
	}
	for _, h := range handholesByJunction(r.Handholes) {
		j, ok := net.Junction(h.Junction)
		if !ok {
			return nil, fmt.Errorf("handhole at %s: not a junction of the network", h.Junction)
		}
		// The links that use it: those that turn there, then those whose laterals tap there.
		links := slices.Clone(turnLinks[h.Junction])
		for _, en := range r.Estimate.Construction.Entrances {
			if en.Tap == h.Junction {
				for _, id := range entLinks[ent{en.Building, en.Entrance}] {
					if !slices.Contains(links, id) {
						links = append(links, id)
					}
				}
			}
		}
		for _, label := range tableLegs[h.Junction] {
			if id := linkOf[label]; id != "" && !slices.Contains(links, id) {
				links = append(links, id)
			}
		}
		add(LayerStructures, j.Point, h.Junction, nil, nil, h.Purpose(), ListText(links))
	}
	for _, h := range r.Estimate.Construction.RunHandholes {
		sp, ok := net.Span(h.Span)
		if !ok {
			return nil, fmt.Errorf("handhole along new construction on %s: not a span of the network", h.Span)
		}
		add(LayerStructures, sp.PointAt(h.AtM), nil, h.Span, round1(h.AtM), PurposeRun, ListText(spanLinks[h.Span]))
	}
	for _, p := range found.pulls {
		if p.junction != "" {
			j, ok := net.Junction(p.junction)
			if !ok {
				return nil, fmt.Errorf("pull point at %s: not a junction of the network", p.junction)
			}
			add(LayerStructures, j.Point, p.junction, nil, nil, PurposePull, ListText(p.links))
			continue
		}
		if p.lateral {
			add(LayerStructures, p.lat.PointAt(p.offM), nil, p.span, round1(p.offM), PurposePull, ListText(p.links))
			continue
		}
		sp, ok := net.Span(p.span)
		if !ok {
			return nil, fmt.Errorf("pull point on %s: not a span of the network", p.span)
		}
		add(LayerStructures, sp.PointAt(p.offM), nil, p.span, round1(p.offM), PurposePull, ListText(p.links))
	}

	for _, sp := range splicePointsOnSpans(r) {
		var links []string
		for _, i := range sp.Legs {
			if id := r.Legs[i].Link.ID; !slices.Contains(links, id) {
				links = append(links, id)
			}
		}
		add(LayerStructures, sp.point, nil, sp.At.Span, round1(sp.At.AtM), PurposeSplice, ListText(links))
	}

	// The structures table.
	for _, st := range found.all {
		add(LayerAllStructures, st.Point, st.Mark, optional(st.ID, st.ID != ""), optional(st.Span, st.Span != ""),
			optional(round1(st.AtM), st.Span != ""), st.Status, st.Type, st.Purpose, ListText(st.Legs), ListText(st.Joined), round1(st.CoiledM))
	}

	// Buildings and their entrances.
	for _, b := range r.Site.Campus.Buildings {
		es := net.EntrancesOf(b.ID)
		var used []string
		for _, e := range es {
			if len(entLinks[ent{b.ID, e.ID}]) > 0 {
				used = append(used, e.ID)
			}
		}
		var fp gpkgout.Geometry
		if len(b.Footprint) > 0 {
			fp = b.Footprint
		}
		add(LayerBuildings, fp, b.ID, b.Name, b.Role, b.ID == r.Hub, b.Transit, len(es), len(used), ListText(used))
	}
	for _, e := range net.Entrances {
		var at gpkgout.Geometry
		if len(e.Lateral) > 0 {
			at = e.Lateral[0]
		} else if j, ok := net.Junction(e.Junction); ok {
			at = j.Point
		}
		links := entLinks[ent{e.Building, e.ID}]
		lateralM := round1(e.LateralM)
		if r.Estimate != nil { // a counted lateral the plan builds: as new_construction lists it
			if pc, ok := r.Estimate.Construction.LateralPiece(e.Building, e.ID); ok {
				lateralM = pc.ListedM
			}
		}
		add(LayerEntrances, at, e.ID, e.Building, e.Via, lateralM, len(links) > 0, ListText(links))
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	return layers, nil
}

// addOnce appends link to m[k] unless it is there already. Legs come in link order
// (route.Result.Legs), a link's legs one after the other, so only the last one is looked at.
func addOnce[K comparable](m map[K][]string, k K, link string) {
	if n := len(m[k]); n == 0 || m[k][n-1] != link {
		m[k] = append(m[k], link)
	}
}

// pullPoint is a handhole the pulling plan adds: at a junction without a structure, or on a
// span offM metres from its From end; links are the links whose pulls end there.
type pullPoint struct {
	junction, span string
	offM           float64
	links          []string
	legs           []string // the legs pulled there, "link/leg" (routing.Leg.Label), in leg order
	// lateral: the point is on a counted lateral (drawn as lat), offM metres from its
	// building, end; span is then "lateral of" and the entrance.
	lateral bool
	lat     geo.Span
	end     string
}

// addedPullPoints places the intermediate pull points of the estimate's pulls (the ends of
// sections marked added), each once, as the bill counts them (estimate.Estimate.
// AddedPullPoints: by junction, or by span and whole metre), sorted by junction, then span and
// offset. A pull section's StartM is along the leg's route from its served building, its
// spans (the router's order, routing.Leg.Steps) from SpansStartM.
func addedPullPoints(r *route.Result) []pullPoint {
	if r.Estimate == nil {
		return nil
	}
	type key struct {
		junction, span string
		m              float64
	}
	byKey := map[key]*pullPoint{}
	isJunction := func(id string) bool {
		_, ok := r.Site.Net.Junction(id)
		return id != "" && ok
	}
	// endOf is the pull point of section p at x: its From at its start, else its To.
	endOf := func(p estimate.PullSection, x float64) estimate.PullPoint {
		if x == p.StartM {
			return p.From
		}
		return p.To
	}
	var keys []key
	// A leg's junctions, spans and distances along it, for the pulls of one leg after the
	// other (pulls come in leg order, a leg's sections together): worked out once per leg.
	leg := -1
	var juncs []string
	var cum []float64
	var spans []geoSpan
	for _, p := range r.Estimate.Pulls {
		l := &r.Legs[p.Leg]
		if p.Leg != leg {
			leg = p.Leg
			juncs = r.Site.JunctionsOf(l.Steps)
			cum, spans = append(cum[:0], 0), spans[:0]
			for j, st := range l.Steps {
				sp, _ := r.Site.Net.Span(st.SpanID)
				spans = append(spans, geoSpan{id: sp.ID, lengthM: sp.LengthM})
				cum = append(cum, cum[j]+sp.LengthM)
			}
		}
		for _, end := range []struct {
			added bool
			x     float64
		}{{p.AddedFrom, p.StartM}, {p.AddedTo, p.StartM + p.LengthM}} {
			if !end.added || len(spans) == 0 {
				continue
			}
			x := end.x - p.SpansStartM // along the spans, a lateral at the served end below 0
			var k key
			pp := pullPoint{}
			if x < -0.01 || x > cum[len(cum)-1]+0.01 {
				// On a counted lateral pulled with the leg (estimate.PullSection.Lateral): the
				// estimate named it by the lateral and metres from its building.
				pt, b := p.From, l.Link.To
				if end.x != p.StartM {
					pt = p.To
				}
				if x > 0 {
					b = l.Link.From
				}
				for _, en := range r.Site.Net.EntrancesOf(b) {
					if en.ID == p.Lateral {
						pp.lateral, pp.lat = true, geo.Span{Line: en.Lateral, LengthM: en.LateralM}
					}
				}
				k, pp.span, pp.offM, pp.end = key{span: pt.Span, m: math.Round(pt.AtM)}, pt.Span, pt.AtM, pt.End
			} else if j := slices.IndexFunc(cum, func(c float64) bool { return math.Abs(x-c) < 0.01 }); j > 0 && j < len(cum)-1 {
				k, pp.junction = key{junction: juncs[j]}, juncs[j]
			} else if j < 0 {
				q, _ := slices.BinarySearch(cum, x)
				q = min(max(q-1, 0), len(spans)-1)
				off := x - cum[q]
				if l.Steps[q].Reverse {
					off = spans[q].lengthM - off
				}
				k, pp.span, pp.offM = key{span: spans[q].id, m: math.Round(off)}, spans[q].id, off
			} else if pt := endOf(p, end.x); isJunction(pt.ID) {
				// The end of the leg's spans where a counted lateral pulled with the leg
				// (estimate.PullSection.Lateral) joins them: a junction, as the bill counts it.
				k, pp.junction = key{junction: pt.ID}, pt.ID
			} else {
				continue // a building: never an added point
			}
			at, ok := byKey[k]
			if !ok {
				at = &pp
				byKey[k] = at
				keys = append(keys, k)
			}
			if n := len(at.links); n == 0 || at.links[n-1] != l.Link.ID {
				at.links = append(at.links, l.Link.ID) // pulls come in leg order, a link's legs together
			}
			if n := len(at.legs); n == 0 || at.legs[n-1] != l.Label() {
				at.legs = append(at.legs, l.Label())
			}
		}
	}
	slices.SortFunc(keys, func(a, b key) int {
		if c := strings.Compare(a.junction, b.junction); c != 0 {
			return c
		}
		if c := strings.Compare(a.span, b.span); c != 0 {
			return c
		}
		return cmp.Compare(a.m, b.m)
	})
	out := make([]pullPoint, len(keys))
	for i, k := range keys {
		out[i] = *byKey[k]
	}
	return out
}

// geoSpan is what addedPullPoints needs of a span.
type geoSpan struct {
	id      string
	lengthM float64
}

// surfaceOf is a piece of new work's surface for new_construction: NULL for a bore and for
// a pathway that is not dug (items.Dug), which restores none.
func surfaceOf(pc estimate.WorkPiece) any {
	if pc.Method != geo.MethodTrench {
		return nil
	}
	return pc.Surface
}
