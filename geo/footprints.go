package geo

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"
)

// SameFootprintShare is the share of the smaller of two building footprints that must lie
// inside the other for the two to be warned about as one building drawn twice: a GIS join or
// a re-survey that leaves the old polygon behind under a new id, which would otherwise be
// planned as a building of its own (common practice, no published source: buildings that
// share a wall overlap by a sliver, a building drawn twice by most of its area).
const SameFootprintShare = 0.5

// footprintSamples is how many points a side sameFootprints samples the smaller footprint's
// bounding box at: 64 × 64 points measure the share to within about 1/64 of the box a side.
const footprintSamples = 64

// maxFootprintWarnings is how many pairs of overlapping footprints sameFootprints names:
// past it, the search stops with one more warning, so that a file of buildings all drawn on
// top of one another (every floor of every building, say) costs no more than that many.
const maxFootprintWarnings = 100

// sameFootprints warns of every two buildings whose footprints overlap by at least
// SameFootprintShare of the smaller, on the smaller (the later id of two equal ones), naming
// the other. bs is in id order; so are the warnings, whatever the order of the input.
func sameFootprints(bs []Building) []warnRec {
	type box struct {
		i     int
		bound orb.Bound
	}
	boxes := make([]box, 0, len(bs))
	for i, b := range bs {
		if len(b.Footprint) > 0 {
			boxes = append(boxes, box{i, b.Footprint.Bound()})
		}
	}
	slices.SortFunc(boxes, func(a, b box) int { return cmp.Or(cmp.Compare(a.bound.Min[0], b.bound.Min[0]), cmp.Compare(a.i, b.i)) })
	var out []warnRec
search:
	for k, a := range boxes {
		for _, b := range boxes[k+1:] {
			if b.bound.Min[0] > a.bound.Max[0] {
				break
			}
			if !a.bound.Intersects(b.bound) {
				continue
			}
			i, j := min(a.i, b.i), max(a.i, b.i)
			w, ok := overlapWarning(bs[i], bs[j])
			if !ok {
				continue
			}
			if len(out) == maxFootprintWarnings {
				out = append(out, warnRec{src: w.src, id: w.id, msg: fmt.Sprintf(
					"its footprint overlaps another building's too, and more may: the search for buildings drawn twice stopped after %d pairs (is a layer of the campus drawn twice?)",
					maxFootprintWarnings)})
				break search
			}
			out = append(out, w)
		}
	}
	slices.SortFunc(out, func(a, b warnRec) int { return cmp.Or(cmp.Compare(a.id, b.id), cmp.Compare(a.msg, b.msg)) })
	return out
}

// overlapWarning is the warning on two buildings whose footprints overlap by at least
// SameFootprintShare of the smaller; a comes before b in id order.
func overlapWarning(a, b Building) (warnRec, bool) {
	if a.Footprint.Equal(b.Footprint) { // drawn twice to the last digit: no sampling needed
		return warnRec{src: b.Source, id: b.ID, msg: sameText("its footprint is the same as", a)}, true
	}
	ba, bb := a.Footprint.Bound(), b.Footprint.Bound()
	c := ba.Union(bb).Center()
	loc := NewLocal(c[0], c[1])
	pa, pb := localFootprint(loc, a.Footprint), localFootprint(loc, b.Footprint)
	areaA, areaB := footprintAreaM2(pa), footprintAreaM2(pb)
	small, large, smallB, largeB := pa, pb, a, b
	if areaB <= areaA || math.Abs(areaA-areaB) <= 1e-9*areaA { // of two equal, b, the later id
		small, large, smallB, largeB = pb, pa, b, a
	}
	smallArea := min(areaA, areaB)
	if !(smallArea > 0) {
		return warnRec{}, false
	}
	// The overlap lies in both bounding boxes: a box overlap below the share rules it out
	// (two buildings that share a wall), before any point is tested.
	sb, lb := small.Bound(), large.Bound()
	wx := min(sb.Max[0], lb.Max[0]) - max(sb.Min[0], lb.Min[0])
	wy := min(sb.Max[1], lb.Max[1]) - max(sb.Min[1], lb.Min[1])
	if wx <= 0 || wy <= 0 || wx*wy < SameFootprintShare*smallArea {
		return warnRec{}, false
	}
	inSmall, inBoth := 0, 0
	dx := (sb.Max[0] - sb.Min[0]) / footprintSamples
	dy := (sb.Max[1] - sb.Min[1]) / footprintSamples
	for ix := range footprintSamples {
		for iy := range footprintSamples {
			p := orb.Point{sb.Min[0] + (float64(ix)+0.5)*dx, sb.Min[1] + (float64(iy)+0.5)*dy}
			if !evenOdd(small, p) {
				continue
			}
			inSmall++
			if lb.Contains(p) && evenOdd(large, p) {
				inBoth++
			}
		}
	}
	if inSmall == 0 {
		return warnRec{}, false
	}
	share := float64(inBoth) / float64(inSmall)
	if share < SameFootprintShare {
		return warnRec{}, false
	}
	what := fmt.Sprintf("%.0f %% of its footprint lies inside", math.Round(100*share))
	if share == 1 && math.Abs(areaA-areaB) <= 0.01*smallArea {
		what = "its footprint is the same as"
	}
	return warnRec{src: smallB.Source, id: smallB.ID, msg: sameText(what, largeB)}, true
}

// sameText is the warning on a building whose footprint (what of it: "its footprint is the
// same as", "80 % of its footprint lies inside") lies in other's.
func sameText(what string, other Building) string {
	return fmt.Sprintf("%s that of building %q (%s): one building drawn twice (an old polygon left by a re-survey or a GIS join)? Both are planned, each with its own links and entrances; remove the one that is not a building, or draw one building's parts as one MultiPolygon",
		what, other.ID, other.Source)
}

// evenOdd reports whether p is inside the footprint mp by the even-odd rule over all its
// rings (a hole's points are outside, as are those of a ring's self-crossing's second lap).
// Points on a ring count either way: the share sampled is of areas, not of edges.
func evenOdd(mp orb.MultiPolygon, p orb.Point) bool {
	in := false
	for _, poly := range mp {
		for _, r := range poly {
			for i, j := 0, len(r)-1; i < len(r); j, i = i, i+1 {
				a, b := r[i], r[j]
				if (a[1] > p[1]) != (b[1] > p[1]) && p[0] < a[0]+(p[1]-a[1])*(b[0]-a[0])/(b[1]-a[1]) {
					in = !in
				}
			}
		}
	}
	return in
}

// localFootprint is a footprint in metres of loc.
func localFootprint(loc Local, mp orb.MultiPolygon) orb.MultiPolygon {
	out := make(orb.MultiPolygon, len(mp))
	for i, poly := range mp {
		out[i] = make(orb.Polygon, len(poly))
		for j, r := range poly {
			q := make(orb.Ring, len(r))
			for k, p := range r {
				q[k][0], q[k][1] = loc.XY(p[0], p[1])
			}
			out[i][j] = q
		}
	}
	return out
}

// footprintAreaM2 is the area of a footprint in metres, in square metres: each polygon's
// outer ring less its holes, whatever way they wind.
func footprintAreaM2(mp orb.MultiPolygon) float64 {
	total := 0.0
	for _, poly := range mp {
		for j, r := range poly {
			a := math.Abs(planar.Area(r))
			if j > 0 {
				a = -a
			}
			total += a
		}
	}
	return total
}
