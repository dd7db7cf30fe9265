package geo

import (
	"fmt"
	"math"
)

// selfCrossings warns of each building footprint ring whose edges cross one another: a
// bow-tie (two vertices drawn in the wrong order) or a ring digitized twice round. Such a ring
// is not a valid polygon (OGC Simple Features / ISO 19125-1: a polygon's rings are simple; the
// clause from memory),
// and which side of it is inside is then a matter of convention: pathway ends may be cut at the
// wrong wall and entrances found off the footprint, warnings that would send the user looking
// elsewhere. One warning per ring, at its first crossing (in ring order); the plan goes on.
func (b *builder) selfCrossings() {
	for i := range b.feet {
		f := &b.feet[i]
		bl := &b.c.Buildings[i]
		for pi, poly := range f.rings {
			for ri, r := range poly {
				k, t, ok := ringCrossing(r, b.snap)
				if !ok {
					continue
				}
				ll := f.ll[pi][ri]
				at := lerpLL(ll[k], ll[k+1], t)
				which := "its footprint's outer ring"
				if ri > 0 {
					which = fmt.Sprintf("its footprint's inner ring %d", ri)
				}
				if len(f.rings) > 1 {
					which += fmt.Sprintf(" (polygon %d)", pi+1)
				}
				b.warns = append(b.warns, warnRec{bl.Source, bl.ID, fmt.Sprintf(
					"building %q: %s crosses itself at %s, %s (longitude, latitude): which side is inside is then ambiguous, so pathway ends may be cut at the wrong wall and entrances found off the footprint; redraw the ring so that its edges meet only at their shared vertices",
					bl.ID, which, fmtLL(at[0]), fmtLL(at[1]))})
			}
		}
	}
}

// ringCrossing returns the first edge k of closed ring r (r[k]..r[k+1]) that another
// edge crosses, and where along it (t in [0, 1]): edges that share a vertex meet there and
// do not count, nor do meetings within tolM of a vertex of either edge (a ring that touches
// itself at a vertex, or a digitizing wobble); nor do collinear overlaps. Edges are paired
// through a uniform grid, so a ring of n edges costs about n checks, not n².
func ringCrossing(r []vec, tolM float64) (k int, t float64, ok bool) {
	n := len(r) - 1 // closed: r[n] == r[0]
	if n < 4 {
		return 0, 0, false // a triangle cannot cross itself
	}
	lo, hi := vec{math.Inf(1), math.Inf(1)}, vec{math.Inf(-1), math.Inf(-1)}
	for _, p := range r {
		lo = vec{math.Min(lo.x, p.x), math.Min(lo.y, p.y)}
		hi = vec{math.Max(hi.x, p.x), math.Max(hi.y, p.y)}
	}
	// About one edge per cell on average, and never cells so small that the index explodes.
	cell := math.Max(math.Max(hi.x-lo.x, hi.y-lo.y)/math.Sqrt(float64(n)), 0.01)
	g := newGrid(cell)
	for i := 0; i < n; i++ {
		g.addSeg(i, r[i], r[i+1])
	}
	var ids []int32
	for i := 0; i < n; i++ {
		a, c := r[i], r[i+1]
		ids = g.query(vec{math.Min(a.x, c.x), math.Min(a.y, c.y)}, vec{math.Max(a.x, c.x), math.Max(a.y, c.y)}, ids)
		for _, o := range ids {
			j := int(o)
			if j <= i || j == i+1 || (i == 0 && j == n-1) {
				continue // itself, or a neighbour sharing a vertex
			}
			tt, _, hit := segIntersect(a, c, r[j], r[j+1])
			if !hit {
				continue
			}
			p := lerp(a, c, tt)
			if p.dist(a) <= tolM || p.dist(c) <= tolM || p.dist(r[j]) <= tolM || p.dist(r[j+1]) <= tolM {
				continue
			}
			return i, tt, true
		}
	}
	return 0, 0, false
}
