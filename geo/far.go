package geo

import (
	"fmt"
	"maps"
	"math"
	"slices"

	"github.com/paulmach/orb"

	"spanwright/geo/input"
)

// FarM is how far from the middle of the campus (middleOf) a position of a feature may lie,
// in metres. The longest channel the catalog's media carry is 40 km (IEEE 802.3 Clause 88,
// engineered single-mode links), so no route of a campus backbone runs farther than that
// from its middle; 100 km leaves room for a campus that lies to one side of its middle, and
// a position farther out is a drawing error: longitude and latitude swapped (the commonest
// slip of a GIS export), a sign lost, or 0, 0 written for a geometry that was lost. Such a
// position is refused on reading (loader.checkFar), and never moves the local projection
// (builder.project). The margin over the reach is common practice, no published source.
const FarM = 100e3

// nullIslandM is how close to longitude 0, latitude 0 a far position is taken for one an
// export wrote for a geometry that was lost, in metres: common practice, no published source.
const nullIslandM = 1000.0

// middleOf returns the middle of the campus: per axis, the median of the centres of its
// features' bounding boxes (each feature counted once, however many vertices it has), so
// that no minority of features, however far, moves it. ok is false for a campus without
// features.
func middleOf(c *Campus) (mid orb.Point, ok bool) {
	var xs, ys []float64
	add := func(b orb.Bound) {
		p := b.Center()
		xs, ys = append(xs, p[0]), append(ys, p[1])
	}
	for _, bl := range c.Buildings {
		if len(bl.Footprint) > 0 {
			add(bl.Footprint.Bound())
		}
	}
	for _, pw := range c.Pathways {
		if len(pw.Lines) > 0 {
			add(pw.Lines.Bound())
		}
	}
	for _, s := range c.Structures {
		add(s.Point.Bound())
	}
	for _, e := range c.Entrances {
		add(e.Point.Bound())
	}
	if len(xs) == 0 {
		return orb.Point{}, false
	}
	// Longitudes are taken around the first one, so that a campus astride the 180th meridian
	// has its middle there, not half a world away (review 18 F4), and put back in range.
	ref := xs[0]
	for i, x := range xs {
		xs[i] = ref + math.Remainder(x-ref, 360)
	}
	return orb.Point{math.Remainder(median(xs), 360), median(ys)}, true
}

// straddles reports whether position p, near mid (far says no), lies across the 180th meridian
// from it: their longitudes are more than 180 degrees apart as written.
func straddles(mid, p orb.Point) bool { return finite(p) && math.Abs(p[0]-mid[0]) > 180 }

// median returns the median of xs (the mean of the two middle values of an even count),
// sorting xs.
func median(xs []float64) float64 {
	slices.Sort(xs)
	n := len(xs)
	if n%2 == 1 {
		return xs[n/2]
	}
	return (xs[n/2-1] + xs[n/2]) / 2
}

// farBoundR is a radius no radius of curvature of the WGS84 ellipsoid exceeds (its polar
// radius of curvature, a²/b, 6,399,594 m, rounded up), in metres: far's quick bound.
const farBoundR = 6.4e6

// far reports whether position p lies farther than FarM from mid, and how far, in metres
// (0 when it does not). A position whose quick bound, the length of a way from mid along its
// meridian and then along p's parallel, at farBoundR, is within FarM is not measured further.
func far(mid, p orb.Point) (distM float64, isFar bool) {
	if !finite(p) {
		return 0, false // validate reports it
	}
	dLat, dLon := math.Abs(p[1]-mid[1])*deg, math.Abs(math.Remainder(p[0]-mid[0], 360))*deg
	if farBoundR*(dLat+dLon*math.Cos(p[1]*deg)) <= FarM {
		return 0, false
	}
	d := DistanceM(mid, p)
	return d, d > FarM
}

// featurePositions calls fn with each position of the campus's features, kind by kind in
// the campus's order, and the feature's source and id; fn returns false to go on to the next
// feature.
func featurePositions(c *Campus, fn func(src Source, id string, p orb.Point) bool) {
	for _, bl := range c.Buildings {
	building:
		for _, poly := range bl.Footprint {
			for _, r := range poly {
				for _, p := range r {
					if !fn(bl.Source, bl.ID, p) {
						break building
					}
				}
			}
		}
	}
	for _, pw := range c.Pathways {
	pathway:
		for _, ls := range pw.Lines {
			for _, p := range ls {
				if !fn(pw.Source, pw.ID, p) {
					break pathway
				}
			}
		}
	}
	for _, s := range c.Structures {
		fn(s.Source, s.ID, s.Point)
	}
	for _, e := range c.Entrances {
		fn(e.Source, e.ID, e.Point)
	}
}

// checkFar refuses every feature with a position farther than FarM from the middle of the
// campus, one problem per feature on its geometry, naming the first such position, how far it
// lies and, when one fits, the slip that would bring it back (farHint).
func (l *loader) checkFar() {
	c := l.clearGeometries()
	mid, ok := middleOf(c)
	if !ok {
		return
	}
	type farUse struct {
		src   Source
		id    string
		first orb.Point
		distM float64
		n     int
	}
	var list []*farUse
	var cur *farUse
	var across *farUse // the first feature across the 180th meridian from the middle
	featurePositions(c, func(src Source, id string, p orb.Point) bool {
		d, isFar := far(mid, p)
		if !isFar {
			if across == nil && straddles(mid, p) {
				across = &farUse{src: src, id: id, first: p}
			}
			return true
		}
		if cur == nil || cur.src != src || cur.id != id {
			cur = &farUse{src: src, id: id, first: p, distM: d}
			list = append(list, cur)
		}
		cur.n++
		return true
	})
	for _, f := range list {
		more := ""
		if f.n > 1 {
			more = fmt.Sprintf(" (and %s)", input.Counted(f.n-1, "more position as far", "more positions as far"))
		}
		l.errs.Add(&input.Problem{File: f.src.File, Feature: f.src.Feature(f.id), Key: "geometry",
			Err: problemf(ErrBadGeometry, "want positions within %s of the middle of the campus (%s, %s), got %s, %s, %s away%s%s",
				kmText(FarM), fmtCoord(round6(mid[0])), fmtCoord(round6(mid[1])), fmtCoord(f.first[0]), fmtCoord(f.first[1]),
				kmText(f.distM), more, farHint(mid, f.first))})
	}
	if across != nil {
		// The local projection (builder.project) takes longitudes as written: across the
		// meridian it would put the two sides 360 degrees apart, or plan lengths wrong.
		l.errs.Add(&input.Problem{File: across.src.File, Feature: across.src.Feature(across.id), Key: "geometry",
			Err: problemf(ErrBadGeometry, "want a campus on one side of the 180th meridian, got %s, %s across it from the middle of the campus (%s, %s): spanwright does not plan a campus astride it; shift every longitude of the campus by the same amount (for example add 360 to the negative ones and subtract 180 from all) and plan that",
				fmtCoord(across.first[0]), fmtCoord(across.first[1]), fmtCoord(round6(mid[0])), fmtCoord(round6(mid[1])))})
	}
}

// nearBound returns the bounding box of the campus's positions within FarM of its middle;
// ok is false for a campus without features (the box is then the zero one).
func nearBound(c *Campus) (bound orb.Bound, ok bool) {
	mid, ok := middleOf(c)
	if !ok {
		return orb.Bound{}, false
	}
	first := true
	featurePositions(c, func(_ Source, _ string, p orb.Point) bool {
		if _, isFar := far(mid, p); isFar || !finite(p) {
			return true
		}
		if first {
			bound, first = orb.Bound{Min: p, Max: p}, false
		} else {
			bound = bound.Extend(p)
		}
		return true
	})
	if first { // only non-finite positions, which validate reports
		return orb.Bound{}, false
	}
	return bound, true
}

// clearGeometries returns the campus read so far without the features whose geometry has a
// problem already (they hold no position, or a made-up one) and without the rows left in
// their table's own coordinate system (a problem of the table).
func (l *loader) clearGeometries() *Campus {
	bad := maps.Clone(l.unprojected)
	for _, p := range l.errs.List {
		if p.Feature != nil && p.Key == "geometry" {
			bad[Source{File: p.File, Index: p.Feature.Index, Table: p.Feature.Table, FID: p.Feature.FID}] = true
		}
	}
	for _, p := range l.projected { // said once per file (projectedFindings), each bad
		bad[p.src] = true
	}
	if len(bad) == 0 {
		return &l.c
	}
	return &Campus{
		Buildings:  withSourceNotIn(l.c.Buildings, bad, func(x Building) Source { return x.Source }),
		Pathways:   withSourceNotIn(l.c.Pathways, bad, func(x Pathway) Source { return x.Source }),
		Structures: withSourceNotIn(l.c.Structures, bad, func(x Structure) Source { return x.Source }),
		Entrances:  withSourceNotIn(l.c.Entrances, bad, func(x Entrance) Source { return x.Source }),
	}
}

// withSourceNotIn returns the features of xs whose source (src) bad does not hold, in order.
func withSourceNotIn[T any](xs []T, bad map[Source]bool, src func(T) Source) []T {
	var out []T
	for _, x := range xs {
		if !bad[src(x)] {
			out = append(out, x)
		}
	}
	return out
}

// farHint names the slip that brings the far position p back within FarM of mid: longitude
// and latitude swapped, the sign of either lost; or says that 0, 0 is where an export puts a
// lost geometry. "" when none fits.
func farHint(mid, p orb.Point) string {
	if DistanceM(orb.Point{0, 0}, p) <= nullIslandM {
		return "; a position at 0, 0 is what an export writes for a feature whose geometry was lost: draw the feature again, or leave it out"
	}
	slips := []struct {
		q    orb.Point
		text string
	}{
		{orb.Point{p[1], p[0]}, "longitude and latitude swapped? GeoJSON and GeoPackage put longitude first"},
		{orb.Point{-p[0], p[1]}, "the sign of the longitude lost?"},
		{orb.Point{p[0], -p[1]}, "the sign of the latitude lost?"},
	}
	for _, s := range slips {
		if checkRange(s.q) != nil {
			continue
		}
		if _, isFar := far(mid, s.q); !isFar {
			return fmt.Sprintf("; %s (%s, %s would lie %s from the middle)", s.text, fmtCoord(s.q[0]), fmtCoord(s.q[1]),
				kmText(DistanceM(mid, s.q)))
		}
	}
	return ""
}

// round6 rounds degrees to 6 decimals (about 0.1 m), for a message.
func round6(x float64) float64 { return math.Round(x*1e6) / 1e6 }

// kmText prints a distance in metres for a message: in metres below a kilometre, else in
// kilometres with one decimal below 100 km and none above.
func kmText(m float64) string {
	switch {
	case m < 1000:
		return fmt.Sprintf("%.0f m", m)
	case m < 100e3:
		return fmt.Sprintf("%.1f km", m/1000)
	}
	return fmt.Sprintf("%.0f km", m/1000)
}
