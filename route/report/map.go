package report

import (
	"context"
	"fmt"
	"html/template"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"spanwright/geo"
	"spanwright/route"
	"spanwright/route/items"
	"spanwright/route/output"
	"spanwright/route/routing"
)

// Map drawing sizes, in SVG pixels.
const (
	mapWidthPx     = 1000.0
	mapMaxHeightPx = 1100.0
	mapMarginPx    = 36.0
	// diverseOffsetPx shifts a diverse leg to the right of its travel direction, so that it
	// stays visible where it runs beside its primary leg or shares an entrance with it.
	diverseOffsetPx = 6.0
)

type svgPath struct {
	D     string
	Class string
	Title string
}

type buildingShape struct {
	svgPath
	ID       string
	LabelX   string
	LabelY   string
	LabelCls string
}

type routePath struct {
	D      string
	Stroke string
	Dash   string
	Leg    string // link id + "/" + leg name: the data-leg attribute
	Medium string
	Title  string
}

type mark struct {
	X, Y  string
	Shape string // "circle", "square", "diamond", or "dot" (a building entrance)
	Class string
	Title string
}

// countLabel is the cable count of a span, at its middle.
type countLabel struct {
	X, Y  string
	Text  string
	Title string
	at    xy // where it is drawn, for the labels placed after it
}

type scaleBar struct {
	X, Y      string
	Segs      []scaleSeg
	Label     string
	LabelX    string
	LabelY    string
	ZeroX     string
	EndX      string
	TickY     string
	TextY     string
	TotalW    string
	BarHeight string
}

type scaleSeg struct {
	X, W  string
	Class string
}

type mapView struct {
	W, H       string
	Halos      []svgPath
	Buildings  []buildingShape
	Pathways   []svgPath
	Laterals   []svgPath
	Routes     []routePath
	Structures []mark
	Turns      []mark // handholes the plan adds: where a route turns between pathways, or new pathway joins
	// Carriers mark, over the routes, the spans in a tunnel or on a pole line that carry cable.
	Carriers []svgPath
	// Works are the new construction, drawn over the routes: opened proposed spans and the
	// trench or bore for ducts added beside existing spans, by method.
	Works  []svgPath
	Counts []countLabel // the number of cables in each span that carries any
	// Keys are the structures' numbers (output.Structure.Mark), beside their marks, keyed to
	// the structures table; those that would crowd another label are left out.
	Keys      []countLabel
	Entrances []mark // every way into every building, at its junction
	Crossed   bool   // some building is drawn as one a route passes through
	Scale     scaleBar
	NorthX    string
	NorthY    string
	Empty     bool // nothing to draw
	// Frame outlines, on the whole campus's map, the core drawn larger below it (coreMap);
	// nil on the core's map and when there is none.
	Frame *svgPath
	// Label is the SVG's accessible name; "" means the whole campus's.
	Label  string
	pxPerM float64 // the drawing's scale, pixels a metre
}

// Building labels: a label is a box labelCharPx wide a character (labelCharXCPx for a
// cross-connect's, in bold) and labelHeightPx high about its point, the font sizes of
// style.css (.lbl 11 px, .lbl.xc 12 px bold) measured generously (capitals). A label that would overlap
// one placed before it is moved above or below its building by labelStepPx, or, when neither
// is free, left out: the building's tooltip still names it (and on a large campus the core's
// map draws it larger).
const (
	labelCharPx   = 7.2
	labelCharXCPx = 8.4
	labelHeightPx = 13.0
	labelStepPx   = 13.0
)

// labelBox is a placed label's box, in pixels.
type labelBox struct{ x0, y0, x1, y1 float64 }

// placeLabel places text centred at want, or above or below it when that overlaps a box
// already placed, adds its box to boxes and returns where; false when it fits nowhere.
func placeLabel(boxes *[]labelBox, want xy, text string, bold bool) (xy, bool) {
	w := labelCharPx
	if bold {
		w = labelCharXCPx
	}
	half := float64(len([]rune(text)))*w/2 + 1
	for _, dy := range []float64{0, -labelStepPx, labelStepPx} {
		at := xy{X: want.X, Y: want.Y + dy}
		b := labelBox{at.X - half, at.Y - labelHeightPx/2, at.X + half, at.Y + labelHeightPx/2}
		if !slices.ContainsFunc(*boxes, func(o labelBox) bool { return b.x0 < o.x1 && o.x0 < b.x1 && b.y0 < o.y1 && o.y0 < b.y1 }) {
			*boxes = append(*boxes, b)
			return at, true
		}
	}
	return xy{}, false
}

// coords copies a line of [lon, lat] points (a geo line or ring) as plain pairs.
func coords[P ~[2]float64](ls []P) [][2]float64 {
	out := make([][2]float64, len(ls))
	for i, q := range ls {
		out[i] = q
	}
	return out
}

// pathwayClass is the CSS class of a span: by type for existing pathways; proposed pathways
// are dashed, heavier when the plan opens them.
func pathwayClass(s *geo.Span, opened bool) string {
	if s.Status == geo.StatusProposed {
		if opened {
			return "pw-new"
		}
		return "pw-proposed"
	}
	switch s.Type {
	case geo.TypeDuct, geo.TypeTunnel, geo.TypeAerial, geo.TypeBuried, geo.TypeTray:
		return "pw-" + s.Type
	}
	return "pw-other"
}

func structureShape(t string) string {
	switch t {
	case "maintenance-hole":
		return "circle"
	case "handhole":
		return "square"
	}
	return "diamond"
}

// drawnBounds is the box of everything the map draws: footprints, spans, structures and
// laterals.
func drawnBounds(r *route.Result) bounds {
	c, net := r.Site.Campus, r.Site.Net
	var b bounds
	for _, bd := range c.Buildings {
		for _, poly := range bd.Footprint {
			for _, ring := range poly {
				for _, q := range ring {
					b.add(q[0], q[1])
				}
			}
		}
	}
	for _, s := range net.Spans {
		for _, q := range s.Line {
			b.add(q[0], q[1])
		}
	}
	for _, s := range c.Structures {
		b.add(s.Point[0], s.Point[1])
	}
	for _, a := range net.Access {
		for _, q := range a.Lateral {
			b.add(q[0], q[1])
		}
	}
	for _, e := range net.Entrances {
		for _, q := range e.Lateral {
			b.add(q[0], q[1])
		}
	}
	return b
}

// buildMap draws the campus and the result's feasible legs, fitted to box b; what lies
// outside b is cut off at the drawing's edge. A non-nil frame is outlined on it (the core's
// box, on the whole campus's map).
func buildMap(ctx context.Context, r *route.Result, opt Options, med map[string]mediumInfo, sts []output.Structure, b bounds, frame *bounds) (mapView, error) {
	c, net := r.Site.Campus, r.Site.Net
	p := newProjection(b, mapWidthPx, mapMaxHeightPx, mapMarginPx)
	m := mapView{W: num(p.widthPx), H: num(p.heightPx), Empty: !b.any, pxPerM: p.pxPerM}
	// Where labels go: inside the drawing's margins, and not inside the frame, whose labels
	// the core's map draws (on this scale they would lie on top of one another).
	inFrame := func(xy) bool { return false }
	if frame != nil {
		lo, hi := p.at(frame.minLon, frame.minLat), p.at(frame.maxLon, frame.maxLat)
		m.Frame = &svgPath{D: fmt.Sprintf("M%s %sH%sV%sH%sZ", num(lo.X), num(lo.Y), num(hi.X), num(hi.Y), num(lo.X)), Class: "core-frame",
			Title: "the core, drawn larger in the map below, with its labels"}
		inFrame = func(q xy) bool { return q.X >= lo.X && q.X <= hi.X && q.Y >= hi.Y && q.Y <= lo.Y }
	}
	inside := func(q xy) bool {
		return q.X >= mapMarginPx/2 && q.X <= p.widthPx-mapMarginPx/2 && q.Y >= mapMarginPx/2 && q.Y <= p.heightPx-bandPx && !inFrame(q)
	}

	ps := passagesOf(r)
	var taken []xy // the labels placed: buildings', then structures' numbers
	var boxes []labelBox
	for _, bd := range c.Buildings {
		var d strings.Builder
		var best xy
		bestA := -1.0
		for _, poly := range bd.Footprint {
			for k, ring := range poly {
				px := p.line(coords(ring))
				ringD(&d, px)
				if k == 0 {
					if cen, a := ringCentroid(px); a > bestA {
						best, bestA = cen, a
					}
				}
			}
		}
		cls, lcls := "bldg", "lbl"
		role := ""
		switch {
		case bd.ID == r.Hub:
			cls, lcls, role = "bldg hub", "lbl xc", "hub, main cross-connect"
		case bd.Role == geo.RoleIC:
			cls, lcls, role = "bldg ic", "lbl xc", "intermediate cross-connect"
		}
		title := bd.ID
		if bd.Name != "" {
			title += ": " + bd.Name
		}
		if role != "" {
			title += " (" + role + ")"
		}
		if legs := ps.crossedBy[bd.ID]; len(legs) > 0 {
			cls += " crossed"
			m.Crossed = true
			title += "; routes pass through it: " + strings.Join(legs, ", ")
		}
		shape := buildingShape{svgPath: svgPath{D: d.String(), Class: cls, Title: title}, ID: bd.ID, LabelCls: lcls}
		if bestA >= 0 && inside(best) {
			if at, ok := placeLabel(&boxes, best, bd.ID, lcls != "lbl"); ok {
				taken = append(taken, at)
				shape.LabelX, shape.LabelY = num(at.X), num(at.Y+4)
			}
		}
		m.Buildings = append(m.Buildings, shape)
	}

	opened := map[string]bool{}
	for _, id := range r.Opened {
		opened[id] = true
	}
	// Existing pathways first, proposed above them; high EMI as a halo below everything.
	spans := make([]int, len(net.Spans))
	for i := range spans {
		spans[i] = i
	}
	rank := func(s *geo.Span) int {
		switch {
		case s.Status != geo.StatusProposed:
			return 0
		case !opened[s.ID]:
			return 1
		}
		return 2
	}
	sort.SliceStable(spans, func(i, j int) bool { return rank(&net.Spans[spans[i]]) < rank(&net.Spans[spans[j]]) })
	for _, i := range spans {
		s := &net.Spans[i]
		d := pathD(p.line(coords(s.Line)))
		if d == "" {
			continue
		}
		status := s.Status
		if opened[s.ID] {
			status = "proposed, opened by this plan"
		}
		title := fmt.Sprintf("%s (pathway %s): %s, %s, %s", s.ID, s.PathwayID, s.Type, status, opt.lengthU(s.LengthM))
		if s.EMI != "" && s.EMI != geo.EMINone {
			title += ", EMI " + s.EMI
		}
		if s.EMI == geo.EMIHigh {
			m.Halos = append(m.Halos, svgPath{D: d, Class: "emi-high", Title: s.ID + ": high EMI"})
		}
		m.Pathways = append(m.Pathways, svgPath{D: d, Class: pathwayClass(s, opened[s.ID]), Title: title})
	}
	drawn := map[[2]string]bool{}
	for _, a := range net.Access {
		drawn[[2]string{a.Building, a.Junction}] = true
		if d := pathD(p.line(coords(a.Lateral))); d != "" {
			m.Laterals = append(m.Laterals, svgPath{D: d, Class: "lateral",
				Title: fmt.Sprintf("lateral to %s, %s", a.Building, opt.lengthU(a.LateralM))})
		}
	}
	// The laterals of the other entrances.
	for _, e := range net.Entrances {
		if drawn[[2]string{e.Building, e.Junction}] {
			continue
		}
		if d := pathD(p.line(coords(e.Lateral))); d != "" {
			m.Laterals = append(m.Laterals, svgPath{D: d, Class: "lateral",
				Title: fmt.Sprintf("lateral to %s (entrance %s), %s", e.Building, e.ID, opt.lengthU(e.LateralM))})
		}
	}
	for i := range r.Legs {
		if i%legCheckEvery == 0 && ctx.Err() != nil {
			return mapView{}, ctx.Err()
		}
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		ls, err := net.RouteLine(output.LegRoute(l))
		if err != nil {
			return mapView{}, fmt.Errorf("report: map of %s %s: %w", l.Link.ID, l.Name, err)
		}
		px := p.line(coords(ls))
		if l.Name == routing.LegDiverse {
			px = offsetLine(px, diverseOffsetPx)
		}
		d := pathD(px)
		if d == "" {
			// A leg with no length (both ends at one junction) still gets its path, so that
			// the map holds one path per feasible leg.
			if len(px) == 1 {
				d = "M" + num(px[0].X) + " " + num(px[0].Y) + "l0 0"
			} else {
				d = "M0 0"
			}
		}
		mi := med[l.Medium]
		m.Routes = append(m.Routes, routePath{D: d, Stroke: mi.Hex, Dash: mi.Dash, Leg: l.Label(), Medium: l.Medium,
			Title: fmt.Sprintf("%s %s leg, %s to %s: %s (%s), %s", l.Link.ID, l.Name, l.Link.From, l.Link.To, mi.Label, mi.ColourLabel, opt.lengthU(l.RouteM))})
	}
	m.Carriers, m.Works, m.Counts = overRoutes(r, p, opt)
	for _, s := range c.Structures {
		q := p.at(s.Point[0], s.Point[1])
		m.Structures = append(m.Structures, mark{X: num(q.X), Y: num(q.Y), Shape: structureShape(s.Type), Class: "st",
			Title: s.ID + ": " + s.Type})
	}
	// One mark per handhole the plan adds at a junction, whatever it is for (routing.Handhole).
	added := map[string]routing.Handhole{}
	for _, h := range r.Handholes {
		added[h.Junction] = h
	}
	// The entrances whose laterals tap a duct, by the junction of the tap, in the order of the
	// entrances used: looked up per junction, not scanned for each.
	tapsAt := map[string][]string{}
	if r.Estimate != nil {
		for _, en := range r.Estimate.Construction.Entrances {
			if en.Tap != "" {
				tapsAt[en.Tap] = append(tapsAt[en.Tap], en.Entrance)
			}
		}
	}
	// why says what else, besides routes turning, a handhole at junction id is for.
	why := func(id string) []string {
		var out []string
		if added[id].Joins {
			out = append(out, "new pathway joins the network there")
		}
		for _, en := range tapsAt[id] {
			out = append(out, "the lateral of "+en+" taps a duct or a pole line")
		}
		return out
	}
	for _, id := range ps.turnIDs {
		j, ok := net.Junction(id)
		if !ok {
			continue // a junction the network does not draw: the legs table still names it
		}
		q := p.at(j.Point[0], j.Point[1])
		title := id + ": handhole to add, where a route turns between pathways (" + strings.Join(ps.turns[id], ", ") + ")"
		if w := why(id); len(w) > 0 {
			title += "; " + strings.Join(w, "; ")
		}
		m.Turns = append(m.Turns, mark{X: num(q.X), Y: num(q.Y), Shape: "square", Class: "st turn", Title: title})
	}
	// Then those no route turns at: where new pathway joins, then where laterals tap (in the
	// order of the entrances used), each junction once.
	var rest []string
	inRest := map[string]bool{}
	for _, h := range r.Handholes {
		if h.Joins {
			rest = append(rest, h.Junction)
			inRest[h.Junction] = true
		}
	}
	if r.Estimate != nil {
		for _, en := range r.Estimate.Construction.Entrances {
			if en.Tap != "" && !inRest[en.Tap] {
				rest = append(rest, en.Tap)
				inRest[en.Tap] = true
			}
		}
	}
	for _, id := range rest {
		j, ok := net.Junction(id)
		if !ok || ps.turns[id] != nil {
			continue
		}
		q := p.at(j.Point[0], j.Point[1])
		m.Turns = append(m.Turns, mark{X: num(q.X), Y: num(q.Y), Shape: "square", Class: "st turn",
			Title: id + ": handhole to add, where " + strings.Join(why(id), "; ")})
	}
	// The handholes to build that no mark above draws (along new construction, pull points),
	// then every structure's number.
	drawnAt := map[string]bool{}
	for _, id := range ps.turnIDs {
		drawnAt[id] = true
	}
	for _, id := range rest {
		drawnAt[id] = true
	}
	for _, st := range sts {
		if st.Status != output.StructureToBuild || (st.ID != "" && drawnAt[st.ID]) {
			continue
		}
		q := p.at(st.Point[0], st.Point[1])
		what := "handhole to add"
		if st.Type == output.TypeSpliceClosure {
			what = "to add" // Place says what it is: a splice closure on the strand
		}
		m.Turns = append(m.Turns, mark{X: num(q.X), Y: num(q.Y), Shape: "square", Class: "st turn",
			Title: st.Place(opt.lengthU) + ": " + what + ", " + purposeWords(st.Purpose)})
	}
	for _, c := range m.Counts {
		taken = append(taken, c.at)
	}
	m.Keys = structureKeys(sts, p, taken, opt.lengthU)
	m.Keys = slices.DeleteFunc(m.Keys, func(k countLabel) bool { return !inside(k.at) })
	// A count on a building's label is left out too (the span's tooltip gives it).
	m.Counts = slices.DeleteFunc(m.Counts, func(k countLabel) bool {
		return !inside(k.at) || slices.ContainsFunc(boxes, func(b labelBox) bool {
			return k.at.X > b.x0-countHalfPx && k.at.X < b.x1+countHalfPx && k.at.Y > b.y0-countHalfPx && k.at.Y < b.y1+countHalfPx
		})
	})
	for _, e := range net.Entrances {
		j, ok := net.Junction(e.Junction)
		if !ok {
			continue
		}
		q := p.at(j.Point[0], j.Point[1])
		cls, title := "ent", e.ID+": entrance of "+e.Building+" ("+entranceWay(e.Via)
		if e.LateralM > 0 {
			title += ", lateral " + opt.lengthU(e.LateralM)
		}
		title += ")"
		if n := ps.entranceUse[e.ID]; n > 0 {
			cls = "ent used"
			title += ", used by " + strconv.Itoa(n) + " leg"
			if n > 1 {
				title += "s"
			}
		}
		m.Entrances = append(m.Entrances, mark{X: num(q.X), Y: num(q.Y), Shape: "dot", Class: cls, Title: title})
	}
	m.Scale = newScaleBar(p, opt)
	m.NorthX, m.NorthY = num(p.widthPx-mapMarginPx), num(p.heightPx-bandPx-8)
	return m, nil
}

// passages is how the feasible legs pass the campus, for the map: the legs (link id and leg
// name) that pass through each building, the junctions where a leg turns at a handhole the
// plan adds (in id order) with the legs that turn there, and how many legs use each entrance.
type passages struct {
	crossedBy   map[string][]string
	turns       map[string][]string
	turnIDs     []string
	entranceUse map[string]int
}

func passagesOf(r *route.Result) passages {
	ps := passages{crossedBy: map[string][]string{}, turns: map[string][]string{}, entranceUse: map[string]int{}}
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		name := l.Link.ID + " " + l.Name
		for _, b := range l.Crosses {
			ps.crossedBy[b] = append(ps.crossedBy[b], name)
		}
		for _, j := range l.Turns {
			if ps.turns[j] == nil {
				ps.turnIDs = append(ps.turnIDs, j)
			}
			ps.turns[j] = append(ps.turns[j], name)
		}
		for _, e := range []string{l.EntranceFrom, l.EntranceTo} {
			if e != "" {
				ps.entranceUse[e]++
			}
		}
	}
	sort.Strings(ps.turnIDs)
	return ps
}

// entranceWay says in words how an entrance joins its building (geo.Access.Via).
func entranceWay(via string) string {
	switch via {
	case geo.ViaEntrance:
		return "declared entrance"
	case geo.ViaFootprint:
		return "pathway end at the footprint"
	case geo.ViaLateral:
		return "lateral to the nearest pathway"
	}
	return via
}

// newScaleBar draws a bar of a round length near a fifth of the map's width, in four
// alternating segments, at the bottom left.
func newScaleBar(p *projection, opt Options) scaleBar {
	unitM := 1.0
	if opt.imperial() {
		unitM = 1 / output.FtPerM
	}
	targetPx := p.widthPx / 5
	length := niceLength(targetPx / p.pxPerM / unitM) // in display units
	w := length * unitM * p.pxPerM
	x0, y0 := mapMarginPx, p.heightPx-bandPx/2-3
	sb := scaleBar{X: num(x0), Y: num(y0), TotalW: num(w), BarHeight: "6",
		ZeroX: num(x0), EndX: num(x0 + w), TextY: num(y0 - 4),
		Label: group(fmt.Sprintf("%g", length)) + " " + opt.units().Length}
	for k := 0; k < 4; k++ {
		cls := "sb-dark"
		if k%2 == 1 {
			cls = "sb-light"
		}
		sb.Segs = append(sb.Segs, scaleSeg{X: num(x0 + float64(k)*w/4), W: num(w / 4), Class: cls})
	}
	return sb
}

// HTML is the map as an inline SVG element. The map has hundreds of elements, so it is
// written here rather than in the template; every text and attribute value goes through
// html/template's escaper, and attribute values are always double-quoted.
func (m mapView) HTML() template.HTML {
	var p page
	p.b.Grow(64 << 10)
	w := p.w
	paths := func(group string, ps []svgPath, extra markup) {
		w(`<g class="`, t(group), `">`)
		for _, q := range ps {
			w(`<path d="`, t(q.D), `" class="`, t(q.Class), `"`, extra, `><title>`, t(q.Title), `</title></path>`)
		}
		w("</g>\n")
	}
	label := m.Label
	if label == "" {
		label = "campus map with the planned routes"
	}
	w(`<svg class="map" viewBox="0 0 `, t(m.W), " ", t(m.H), `" role="img" aria-label="`, t(label), `">`, "\n")
	w(`<rect x="0" y="0" width="`, t(m.W), `" height="`, t(m.H), `" class="map-bg"/>`, "\n")
	paths("halos", m.Halos, "")
	bs := make([]svgPath, len(m.Buildings))
	for i, bd := range m.Buildings {
		bs[i] = bd.svgPath
	}
	paths("buildings", bs, ` fill-rule="evenodd"`)
	paths("pathways", m.Pathways, "")
	paths("laterals", m.Laterals, "")
	w(`<g class="casings">`)
	for _, r := range m.Routes {
		w(`<path d="`, t(r.D), `" class="casing"/>`)
	}
	w("</g>\n", `<g class="routes">`)
	for _, r := range m.Routes {
		w(`<path d="`, t(r.D), `" class="route" stroke="`, t(r.Stroke), `"`)
		if r.Dash != "" {
			w(` stroke-dasharray="`, t(r.Dash), `"`)
		}
		w(` data-leg="`, t(r.Leg), `" data-medium="`, t(r.Medium), `"><title>`, t(r.Title), `</title></path>`)
	}
	w("</g>\n")
	paths("carriers", m.Carriers, "")
	paths("works", m.Works, "")
	marks := func(group string, ms []mark) {
		w(`<g class="`, t(group), `">`)
		for _, s := range ms {
			title := `<title>` + t(s.Title) + `</title>`
			x, y, cls := t(s.X), t(s.Y), t(s.Class)
			switch s.Shape {
			case "circle":
				w(`<circle cx="`, x, `" cy="`, y, `" r="4.5" class="`, cls, `">`, title, `</circle>`)
			case "dot":
				w(`<circle cx="`, x, `" cy="`, y, `" r="2.5" class="`, cls, `">`, title, `</circle>`)
			case "square":
				w(`<rect x="`, x, `" y="`, y, `" width="9" height="9" transform="translate(-4.5 -4.5)" class="`, cls, `">`, title, `</rect>`)
			default:
				w(`<path d="M0 -5.5L5.5 0L0 5.5L-5.5 0Z" transform="translate(`, x, " ", y, `)" class="`, cls, `">`, title, `</path>`)
			}
		}
		w("</g>\n")
	}
	marks("structures", m.Structures)
	marks("turns", m.Turns)
	marks("entrances", m.Entrances)
	if f := m.Frame; f != nil {
		w(`<path d="`, t(f.D), `" class="`, t(f.Class), `"><title>`, t(f.Title), `</title></path>`, "\n")
	}
	w(`<g class="labels">`)
	for _, bd := range m.Buildings {
		if bd.LabelX == "" {
			continue // it would overlap another label (placeLabel) or lies outside the drawing
		}
		w(`<text x="`, t(bd.LabelX), `" y="`, t(bd.LabelY), `" class="`, t(bd.LabelCls), `" text-anchor="middle">`, t(bd.ID), `</text>`)
	}
	w("</g>\n", `<g class="keys">`)
	for _, k := range m.Keys {
		w(`<text x="`, t(k.X), `" y="`, t(k.Y), `" class="key">`, t(k.Text), `<title>`, t(k.Title), `</title></text>`)
	}
	w("</g>\n", `<g class="counts">`)
	for _, c := range m.Counts {
		w(`<text x="`, t(c.X), `" y="`, t(c.Y), `" class="cnt" text-anchor="middle" dy="3.5">`, t(c.Text), `<title>`, t(c.Title), `</title></text>`)
	}
	w("</g>\n")
	w(`<g class="north" transform="translate(`, t(m.NorthX), " ", t(m.NorthY), `)"><path d="M0 0L-7 22L0 17L7 22Z" class="north-arrow"/><text x="-12" y="20" text-anchor="end" class="lbl xc">N</text></g>`, "\n")
	sb := m.Scale
	w(`<g class="scalebar">`)
	for _, s := range sb.Segs {
		w(`<rect x="`, t(s.X), `" y="`, t(sb.Y), `" width="`, t(s.W), `" height="`, t(sb.BarHeight), `" class="`, t(s.Class), `"/>`)
	}
	w("\n", `<text x="`, t(sb.ZeroX), `" y="`, t(sb.TextY), `" class="small" text-anchor="middle">0</text><text x="`, t(sb.EndX), `" y="`, t(sb.TextY),
		`" class="small" text-anchor="middle">`, t(sb.Label), `</text></g>`, "\n")
	if m.Empty {
		w(`<text x="50%" y="50%" text-anchor="middle" class="lbl">nothing to draw</text>`, "\n")
	}
	w("</svg>")
	return p.html()
}

// Cable count labels: a span shorter than countMinPx on the map gets none, nor one whose
// middle is within countGapPx of a label already placed (larger counts are placed first);
// the span's tooltip and the duct fill table still give its count.
const (
	countMinPx = 18.0
	countGapPx = 16.0
	// countHalfPx is half a one-digit count label's box (.cnt 10.5 px bold), for the building
	// labels it must not cover.
	countHalfPx = 4.0
)

// overRoutes draws what the routes would hide: the spans in a tunnel or on a pole line that
// carry cable (a thin line of the pathway's colour along the route), the new construction
// (trench, bore and each pathway type built new told apart by their dashes) and each span's cable count.
func overRoutes(r *route.Result, p *projection, opt Options) (carriers, works []svgPath, counts []countLabel) {
	net := r.Site.Net
	opened := map[string]bool{}
	for _, id := range r.Opened {
		opened[id] = true
	}
	cables, added := map[string]int{}, map[string]int{}
	for _, f := range r.Fill {
		cables[f.Span] = f.Cables
		added[f.Span] = f.AddedDucts
	}
	type placed struct {
		px     xy
		n      int
		lenPx  float64
		spanID string
	}
	var cand []placed
	for i := range net.Spans {
		s := &net.Spans[i]
		px := p.line(coords(s.Line))
		d := pathD(px)
		if d == "" {
			continue
		}
		n := cables[s.ID]
		if n > 0 && (s.Type == geo.TypeTunnel || s.Type == geo.TypeAerial) && s.Status != geo.StatusProposed {
			what := "in a utility tunnel"
			if s.Type == geo.TypeAerial {
				what = "on a pole line (aerial)"
			}
			carriers = append(carriers, svgPath{D: d, Class: "on-" + s.Type,
				Title: fmt.Sprintf("%s (pathway %s): cable %s, %s", s.ID, s.PathwayID, what, opt.lengthU(s.LengthM))})
		}
		if opened[s.ID] || added[s.ID] > 0 {
			method := geo.MethodTrench
			if pb := r.Engine; pb != nil {
				method = items.MethodOf(pb.PriceBook(), r.Design(), s)
			}
			cls, what := "nw-trench", "new trench in "+items.SurfaceOf(r.Design(), s)
			if items.SurfaceAssumed(s, method) {
				what += " (assumed: the pathway gives no surface)"
			}
			if method == geo.MethodBore {
				cls, what = "nw-bore", "new directional bore"
			} else if method != geo.MethodTrench { // not dug (items.Dug): built as its type, drawn as its own kind
				cls, what = "nw-"+method, "new "+output.KindName(method)+", not dug"
			}
			if opened[s.ID] {
				what += ", the proposed pathway this plan builds"
			} else {
				what += fmt.Sprintf(" for %d ducts added beside the existing pathway", added[s.ID])
			}
			works = append(works, svgPath{D: d, Class: cls, Title: fmt.Sprintf("%s (pathway %s): %s, %s", s.ID, s.PathwayID, what, opt.lengthU(s.LengthM))})
		}
		if n > 0 {
			mid, l := midpoint(px)
			cand = append(cand, placed{px: mid, n: n, lenPx: l, spanID: s.ID})
		}
	}
	// Larger counts first, then in span order: the same labels whatever the map's size.
	sort.SliceStable(cand, func(a, b int) bool { return cand[a].n > cand[b].n })
	var at []xy
	for _, c := range cand {
		if c.lenPx < countMinPx {
			continue
		}
		near := false
		for _, q := range at {
			if dx, dy := q.X-c.px.X, q.Y-c.px.Y; dx*dx+dy*dy < countGapPx*countGapPx {
				near = true
				break
			}
		}
		if near {
			continue
		}
		at = append(at, c.px)
		word := "cables"
		if c.n == 1 {
			word = "cable"
		}
		counts = append(counts, countLabel{X: num(c.px.X), Y: num(c.px.Y), Text: strconv.Itoa(c.n),
			Title: fmt.Sprintf("%s: %d %s", c.spanID, c.n, word), at: c.px})
	}
	return carriers, works, counts
}

// midpoint returns the point halfway along a line, in map pixels, and the line's length.
func midpoint(px []xy) (xy, float64) {
	total := 0.0
	for i := 1; i < len(px); i++ {
		total += math.Hypot(px[i].X-px[i-1].X, px[i].Y-px[i-1].Y)
	}
	half := total / 2
	for i := 1; i < len(px); i++ {
		seg := math.Hypot(px[i].X-px[i-1].X, px[i].Y-px[i-1].Y)
		if seg > 0 && half <= seg {
			f := half / seg
			return xy{X: px[i-1].X + f*(px[i].X-px[i-1].X), Y: px[i-1].Y + f*(px[i].Y-px[i-1].Y)}, total
		}
		half -= seg
	}
	if len(px) == 0 {
		return xy{}, 0
	}
	return px[len(px)-1], total
}

// Structure number labels: placed up and to the right of the mark, and left out within
// keyGapPx of a label already placed (a building's, a cable count or another number), the handholes to build
// first (output.StructuresOf's order). Common practice, no published source.
const (
	keyDXPx  = 6.0
	keyDYPx  = -6.0
	keyGapPx = 11.0
)

// structureKeys places the structures' numbers on the map, avoiding the labels taken.
func structureKeys(sts []output.Structure, p *projection, taken []xy, length func(m float64) string) []countLabel {
	var out []countLabel
	for _, st := range sts {
		q := p.at(st.Point[0], st.Point[1])
		at := xy{X: q.X + keyDXPx, Y: q.Y + keyDYPx}
		near := false
		for _, o := range taken {
			if dx, dy := o.X-at.X, o.Y-at.Y; dx*dx+dy*dy < keyGapPx*keyGapPx {
				near = true
				break
			}
		}
		if near {
			continue
		}
		taken = append(taken, at)
		out = append(out, countLabel{X: num(at.X), Y: num(at.Y), at: at, Text: strconv.Itoa(st.Mark),
			Title: strconv.Itoa(st.Mark) + ": " + st.Place(length) + " (" + st.Status + ")"})
	}
	return out
}

// purposeWords says in words why a handhole is built (output.Structure.Purpose: its
// purposes joined by ", ", each put in words).
func purposeWords(purpose string) string {
	parts := strings.Split(purpose, ", ")
	for i, part := range parts {
		if w, ok := purposeText[part]; ok {
			parts[i] = w
		}
	}
	return strings.Join(parts, "; ")
}

// purposeText is each purpose of a structure to build in words (purposeWords).
var purposeText = map[string]string{
	output.PurposeJoin:          "where new pathway joins the network",
	output.PurposeTap:           "where a lateral taps a duct or a pole line",
	output.PurposeTurn:          "where a route turns between pathways",
	output.PurposeRun:           "along new construction (handhole spacing or bend budget)",
	output.PurposePull:          "an intermediate pull point",
	output.PurposeSplice:        "a mid-span join with no structure within its reel's reach",
	output.PurposeSpliceClosure: "a mid-span join's splice closure",
}
