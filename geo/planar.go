package geo

import (
	"math"
	"sort"

	"github.com/paulmach/orb"
)

// This file holds the planar helpers used for snapping and intersection tests. They work on
// a local projection in metres, never on longitude/latitude; lengths handed out are always
// ellipsoidal (DistanceM).

// vec is a point on the local projection, in metres east (x) and north (y) of its origin.
type vec struct{ x, y float64 }

func (a vec) sub(b vec) vec        { return vec{a.x - b.x, a.y - b.y} }
func (a vec) add(b vec) vec        { return vec{a.x + b.x, a.y + b.y} }
func (a vec) scale(k float64) vec  { return vec{a.x * k, a.y * k} }
func (a vec) dot(b vec) float64    { return a.x*b.x + a.y*b.y }
func (a vec) cross(b vec) float64  { return a.x*b.y - a.y*b.x }
func (a vec) dist2(b vec) float64  { d := a.sub(b); return d.dot(d) }
func (a vec) dist(b vec) float64   { return math.Sqrt(a.dist2(b)) }
func lerp(a, b vec, t float64) vec { return a.add(b.sub(a).scale(t)) }
func lerpLL(a, b orb.Point, t float64) orb.Point {
	return orb.Point{a[0] + (b[0]-a[0])*t, a[1] + (b[1]-a[1])*t}
}

// projector is the campus's local projection (Local) about its centre, giving vecs.
type projector struct{ Local }

func newProjector(b orb.Bound) projector {
	c := b.Center()
	return projector{NewLocal(c[0], c[1])}
}

func (p projector) xy(q orb.Point) vec {
	x, y := p.XY(q[0], q[1])
	return vec{x, y}
}

// closestOnSeg returns the parameter t in [0, 1] of the point of segment ab nearest p, and
// the squared distance to it.
func closestOnSeg(p, a, b vec) (t, d2 float64) {
	ab := b.sub(a)
	l2 := ab.dot(ab)
	if l2 > 0 {
		t = math.Max(0, math.Min(1, p.sub(a).dot(ab)/l2))
	}
	return t, p.dist2(lerp(a, b, t))
}

// segIntersect reports whether segments ab and cd meet, with the parameters of the meeting
// point along each; parallel segments never meet here.
func segIntersect(a, b, c, d vec) (t, u float64, ok bool) {
	r, s := b.sub(a), d.sub(c)
	den := r.cross(s)
	if math.Abs(den) <= 1e-12*math.Sqrt(r.dot(r)*s.dot(s)) || den == 0 {
		return 0, 0, false
	}
	ca := c.sub(a)
	t, u = ca.cross(s)/den, ca.cross(r)/den
	if t < 0 || t > 1 || u < 0 || u > 1 {
		return 0, 0, false
	}
	return t, u, true
}

// footprint is a building's polygons on the local projection.
type footprint struct {
	rings  [][][]vec    // per polygon, per ring (ring 0 outer), closed
	ll     [][]orb.Ring // the same in lon/lat
	lo, hi vec          // bounding box
}

func newFootprint(p projector, mp orb.MultiPolygon) footprint {
	f := footprint{lo: vec{math.Inf(1), math.Inf(1)}, hi: vec{math.Inf(-1), math.Inf(-1)}}
	for _, poly := range mp {
		var rs [][]vec
		var ls []orb.Ring
		for _, r := range poly {
			if len(r) < 2 {
				continue
			}
			xs := make([]vec, len(r))
			for i, q := range r {
				xs[i] = p.xy(q)
				f.lo = vec{math.Min(f.lo.x, xs[i].x), math.Min(f.lo.y, xs[i].y)}
				f.hi = vec{math.Max(f.hi.x, xs[i].x), math.Max(f.hi.y, xs[i].y)}
			}
			rs = append(rs, xs)
			ls = append(ls, r)
		}
		if len(rs) > 0 {
			f.rings = append(f.rings, rs)
			f.ll = append(f.ll, ls)
		}
	}
	return f
}

func (f *footprint) empty() bool { return len(f.rings) == 0 }

// boxesMiss reports whether the boxes lo0–hi0 and lo1–hi1 share no point (boxes that touch
// share their edge).
func boxesMiss(lo0, hi0, lo1, hi1 vec) bool {
	return hi0.x < lo1.x || lo0.x > hi1.x || hi0.y < lo1.y || lo0.y > hi1.y
}

func inRing(p vec, r []vec) bool {
	in := false
	for i, j := 0, len(r)-1; i < len(r); j, i = i, i+1 {
		a, b := r[i], r[j]
		if (a.y > p.y) != (b.y > p.y) && p.x < (b.x-a.x)*(p.y-a.y)/(b.y-a.y)+a.x {
			in = !in
		}
	}
	return in
}

// contains reports whether p is inside the footprint (inside an outer ring and no hole).
func (f *footprint) contains(p vec) bool {
	if p.x < f.lo.x || p.x > f.hi.x || p.y < f.lo.y || p.y > f.hi.y {
		return false
	}
	for _, poly := range f.rings {
		if !inRing(p, poly[0]) {
			continue
		}
		hole := false
		for _, h := range poly[1:] {
			if inRing(p, h) {
				hole = true
				break
			}
		}
		if !hole {
			return true
		}
	}
	return false
}

// nearestBoundary returns the point of the footprint's boundary nearest p, in lon/lat, and
// its distance in projected metres.
func (f *footprint) nearestBoundary(p vec) (orb.Point, float64) {
	best, bestLL := math.Inf(1), orb.Point{}
	for pi, poly := range f.rings {
		for ri, r := range poly {
			ll := f.ll[pi][ri]
			for i := 1; i < len(r); i++ {
				t, d2 := closestOnSeg(p, r[i-1], r[i])
				if d2 < best {
					best, bestLL = d2, lerpLL(ll[i-1], ll[i], t)
				}
			}
		}
	}
	return bestLL, math.Sqrt(best)
}

// distTo is the distance in projected metres from p to the footprint, 0 inside it.
func (f *footprint) distTo(p vec) float64 {
	if f.contains(p) {
		return 0
	}
	_, d := f.nearestBoundary(p)
	return d
}

// lateralTieM is how much farther than the nearest pathway another place may be and still
// count as as near, when a building is reached by a counted lateral (modelling choice:
// a metre is well inside what a survey of a lateral's route can tell apart).
const lateralTieM = 1.0

// segDist returns the distance in projected metres from segment ab to the footprint (0 when
// the segment reaches inside it), and the parameter along ab of the nearest point.
func (f *footprint) segDist(a, b vec) (d, t float64) {
	if f.contains(a) {
		return 0, 0
	}
	if f.contains(b) {
		return 0, 1
	}
	best, bestT := math.Inf(1), 0.0
	for _, poly := range f.rings {
		for _, r := range poly {
			for i := 1; i < len(r); i++ {
				c, e := r[i-1], r[i]
				if tt, _, ok := segIntersect(a, b, c, e); ok {
					if best > 0 || tt < bestT {
						best, bestT = 0, tt
					}
					continue
				}
				if best == 0 {
					continue
				}
				if _, d2 := closestOnSeg(a, c, e); d2 < best {
					best, bestT = d2, 0
				}
				if _, d2 := closestOnSeg(b, c, e); d2 < best {
					best, bestT = d2, 1
				}
				if tt, d2 := closestOnSeg(c, a, b); d2 < best {
					best, bestT = d2, tt
				}
				if tt, d2 := closestOnSeg(e, a, b); d2 < best {
					best, bestT = d2, tt
				}
				// An edge parallel to the segment is equally near all along their overlap:
				// take the middle of it rather than a corner.
				if tm, d2, ok := parallelMid(a, b, c, e); ok && d2 <= best+1e-6 {
					best, bestT = math.Min(best, d2), tm
				}
			}
		}
	}
	return math.Sqrt(best), bestT
}

// parallelMid reports, for an edge ce parallel to segment ab whose projection overlaps ab,
// the parameter along ab of the middle of the overlap and the squared distance there.
func parallelMid(a, b, c, e vec) (t, d2 float64, ok bool) {
	ab, ce := b.sub(a), e.sub(c)
	l2 := ab.dot(ab)
	if l2 == 0 || math.Abs(ab.cross(ce)) > 1e-9*math.Sqrt(l2*ce.dot(ce)) {
		return 0, 0, false
	}
	t0, t1 := c.sub(a).dot(ab)/l2, e.sub(a).dot(ab)/l2
	if t0 > t1 {
		t0, t1 = t1, t0
	}
	t0, t1 = math.Max(t0, 0), math.Min(t1, 1)
	if t0 > t1 {
		return 0, 0, false
	}
	t = (t0 + t1) / 2
	_, d2 = closestOnSeg(lerp(a, b, t), c, e)
	return t, d2, true
}

// grid is a uniform spatial index on the local projection: each cell lists the items
// (points or segments) that touch it.
type grid struct {
	cell   float64
	cells  map[[2]int32][]int32
	lo, hi [2]int32 // occupied cell range
}

func newGrid(cellM float64) *grid {
	return &grid{cell: cellM, cells: make(map[[2]int32][]int32),
		lo: [2]int32{math.MaxInt32, math.MaxInt32}, hi: [2]int32{math.MinInt32, math.MinInt32}}
}

func (g *grid) idx(v float64) int32 {
	return int32(math.Max(-1e9, math.Min(1e9, math.Floor(v/g.cell))))
}

func (g *grid) put(ix, iy int32, id int) {
	k := [2]int32{ix, iy}
	g.cells[k] = append(g.cells[k], int32(id))
	g.lo = [2]int32{min(g.lo[0], ix), min(g.lo[1], iy)}
	g.hi = [2]int32{max(g.hi[0], ix), max(g.hi[1], iy)}
}

func (g *grid) addPoint(id int, p vec) { g.put(g.idx(p.x), g.idx(p.y), id) }

// addSeg lists segment ab in every cell it crosses, column by column.
func (g *grid) addSeg(id int, a, b vec) {
	if a.x > b.x {
		a, b = b, a
	}
	ix0, ix1 := g.idx(a.x), g.idx(b.x)
	for ix := ix0; ix <= ix1; ix++ {
		xl := math.Max(a.x, float64(ix)*g.cell)
		xr := math.Min(b.x, float64(ix+1)*g.cell)
		yl, yr := a.y, b.y
		if b.x > a.x {
			yl = a.y + (b.y-a.y)*(xl-a.x)/(b.x-a.x)
			yr = a.y + (b.y-a.y)*(xr-a.x)/(b.x-a.x)
		}
		if yl > yr {
			yl, yr = yr, yl
		}
		for iy := g.idx(yl); iy <= g.idx(yr); iy++ {
			g.put(ix, iy, id)
		}
	}
}

// query appends to out, sorted and without repeats, the items listed in any cell touching the
// box lo..hi.
func (g *grid) query(lo, hi vec, out []int32) []int32 {
	out = out[:0]
	ix0, ix1 := max(g.idx(lo.x), g.lo[0]), min(g.idx(hi.x), g.hi[0])
	iy0, iy1 := max(g.idx(lo.y), g.lo[1]), min(g.idx(hi.y), g.hi[1])
	for ix := ix0; ix <= ix1; ix++ {
		for iy := iy0; iy <= iy1; iy++ {
			out = append(out, g.cells[[2]int32{ix, iy}]...)
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i] < out[j] })
	w := 0
	for i, v := range out {
		if i == 0 || v != out[w-1] {
			out[w] = v
			w++
		}
	}
	return out[:w]
}

// visit calls fn with each item listed in a cell touching the box lo..hi, in no set order and
// once per cell it is listed in (query without the sort; the caller drops repeats).
func (g *grid) visit(lo, hi vec, fn func(id int32)) {
	ix0, ix1 := max(g.idx(lo.x), g.lo[0]), min(g.idx(hi.x), g.hi[0])
	iy0, iy1 := max(g.idx(lo.y), g.lo[1]), min(g.idx(hi.y), g.hi[1])
	for ix := ix0; ix <= ix1; ix++ {
		for iy := iy0; iy <= iy1; iy++ {
			for _, id := range g.cells[[2]int32{ix, iy}] {
				fn(id)
			}
		}
	}
}

// around returns the box of radius r around p.
func around(p vec, r float64) (vec, vec) {
	return vec{p.x - r, p.y - r}, vec{p.x + r, p.y + r}
}

// deflectionDeg returns the turn in degrees at b on the way a → b → c (0 is straight on).
func deflectionDeg(a, b, c vec) float64 {
	u, v := b.sub(a), c.sub(b)
	return math.Atan2(math.Abs(u.cross(v)), u.dot(v)) / deg
}
