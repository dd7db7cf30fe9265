package geo

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
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
	areaA, areaB := pa.areaM2(), pb.areaM2()
	small, large, smallB, largeB := &pa, &pb, a, b
	if areaB <= areaA || math.Abs(areaA-areaB) <= 1e-9*areaA { // of two equal, b, the later id
		small, large, smallB, largeB = &pb, &pa, b, a
	}
	smallArea := min(areaA, areaB)
	if !(smallArea > 0) {
		return warnRec{}, false
	}
	// The overlap lies in both bounding boxes: a box overlap below the share rules it out
	// (two buildings that share a wall), before any point is tested.
	wx := min(small.hi.x, large.hi.x) - max(small.lo.x, large.lo.x)
	wy := min(small.hi.y, large.hi.y) - max(small.lo.y, large.lo.y)
	if wx <= 0 || wy <= 0 || wx*wy < SameFootprintShare*smallArea {
		return warnRec{}, false
	}
	inSmall, inBoth := 0, 0
	dx := (small.hi.x - small.lo.x) / footprintSamples
	dy := (small.hi.y - small.lo.y) / footprintSamples
	for ix := range footprintSamples {
		for iy := range footprintSamples {
			p := vec{small.lo.x + (float64(ix)+0.5)*dx, small.lo.y + (float64(iy)+0.5)*dy}
			if !small.evenOdd(p) {
				continue
			}
			inSmall++
			if large.inBox(p) && large.evenOdd(p) {
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

// localFoot is a footprint in metres of a Local, for sameFootprints.
type localFoot struct {
	rings  [][][]vec // per polygon, per ring (ring 0 outer)
	lo, hi vec       // bounding box of the outer rings
}

// localFootprint is footprint mp in metres of loc.
func localFootprint(loc Local, mp orb.MultiPolygon) localFoot {
	f := localFoot{rings: make([][][]vec, len(mp)), lo: vec{math.Inf(1), math.Inf(1)}, hi: vec{math.Inf(-1), math.Inf(-1)}}
	for i, poly := range mp {
		f.rings[i] = make([][]vec, len(poly))
		for j, r := range poly {
			q := make([]vec, len(r))
			for k, p := range r {
				q[k].x, q[k].y = loc.XY(p[0], p[1])
				if j == 0 {
					f.lo = vec{math.Min(f.lo.x, q[k].x), math.Min(f.lo.y, q[k].y)}
					f.hi = vec{math.Max(f.hi.x, q[k].x), math.Max(f.hi.y, q[k].y)}
				}
			}
			f.rings[i][j] = q
		}
	}
	return f
}

// inBox reports whether p lies in f's bounding box, edges included.
func (f *localFoot) inBox(p vec) bool {
	return f.lo.x <= p.x && p.x <= f.hi.x && f.lo.y <= p.y && p.y <= f.hi.y
}

// evenOdd reports whether p is inside f by the even-odd rule over all its rings (a hole's
// points are outside, as are those of a ring's self-crossing's second lap). Points on a ring
// count either way: the share sampled is of areas, not of edges.
func (f *localFoot) evenOdd(p vec) bool {
	in := false
	for _, poly := range f.rings {
		for _, r := range poly {
			in = in != inRing(p, r)
		}
	}
	return in
}

// areaM2 is f's area, in square metres: each polygon's outer ring less its holes, whatever
// way they wind.
func (f *localFoot) areaM2() float64 {
	total := 0.0
	for _, poly := range f.rings {
		for j, r := range poly {
			a := math.Abs(ringArea(r))
			if j > 0 {
				a = -a
			}
			total += a
		}
	}
	return total
}

// ringArea is the signed area of ring r (closed, its first position repeated last), positive
// counterclockwise: the shoelace sum taken about r[0], as orb/planar's Area takes it, to keep
// the rounding small.
func ringArea(r []vec) float64 {
	if len(r) == 0 {
		return 0
	}
	sum := 0.0
	for i := 1; i < len(r)-1; i++ {
		sum += r[i].sub(r[0]).cross(r[i+1].sub(r[0]))
	}
	return sum / 2
}
