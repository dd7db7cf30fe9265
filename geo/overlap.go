package geo

import (
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/paulmach/orb"
)

// overlapJoinM is the longest overlap, in metres, of two pathways that each end on the other
// and carry the same ducts that Build takes for pieces of one run drawn to meet: a facilities
// GIS overshoots a join by a metre or two when a run is digitised in pieces (common practice,
// no published source). Longer overlaps are warned of and planned as drawn.
const overlapJoinM = 5.0

// overlapMaxDeg is the largest angle, in degrees, between two segments within SnapM of each
// other that are taken as drawn along each other (collinear) rather than crossing: lines
// drawn twice agree to far less (common practice, no published source).
const overlapMaxDeg = 2.0

// oline is one line of a pathway on the local projection, for the overlap checks.
type oline struct {
	pw, k int
	ll    orb.LineString // consecutive repeats dropped
	xy    []vec
	cum   []float64 // projected length from vertex 0 to each vertex, in metres
}

func (l *oline) lengthM() float64 { return l.cum[len(l.cum)-1] }

// at is the point at projected length s along l, in lon/lat and projected.
func (l *oline) at(s float64) (orb.Point, vec) {
	i, _ := slices.BinarySearch(l.cum, s)
	switch {
	case i == 0:
		return l.ll[0], l.xy[0]
	case i >= len(l.cum):
		n := len(l.ll) - 1
		return l.ll[n], l.xy[n]
	}
	t := (s - l.cum[i-1]) / (l.cum[i] - l.cum[i-1])
	return lerpLL(l.ll[i-1], l.ll[i], t), lerp(l.xy[i-1], l.xy[i], t)
}

// cutTo is l from projected length s0 to s1 (0 ≤ s0 < s1 ≤ length), in lon/lat.
func (l *oline) cutTo(s0, s1 float64) orb.LineString {
	p0, _ := l.at(s0)
	out := orb.LineString{p0}
	for i := range l.ll {
		if l.cum[i] > s0 && l.cum[i] < s1 {
			out = append(out, l.ll[i])
		}
	}
	p1, _ := l.at(s1)
	return append(out, p1)
}

// stretch is a stretch of one line drawn along another: from a0 to a1 along the first (a0 <
// a1), at b0 and b1 along the second (either order).
type stretch struct{ a0, a1, b0, b1 float64 }

// olPair is two lines (indices into the builder's olines, a < b) drawn along each other.
type olPair struct {
	a, b int
	st   []stretch
}

// sameProps reports whether pathways a and b say the same of their ducts in every property but
// their ids: they carry the same ducts (sameDucts), in the same setting, and give the same
// shared-risk group or none.
func sameProps(a, b *Pathway) bool {
	da, db := a.ductFacts(), b.ductFacts()
	return sameDucts(da, db) && a.EMI == b.EMI && a.Surface == b.Surface && a.Method == b.Method &&
		a.MethodSet == b.MethodSet && a.Plenum == b.Plenum && da.givenGroup() == db.givenGroup()
}

// shape is a pathway's lines in a form that does not depend on the direction each is drawn
// in, their order, or a position repeated in a row: two pathways of equal shapes are one
// drawing.
func shape(pw *Pathway) []orb.LineString {
	lines := make([]orb.LineString, 0, len(pw.Lines))
	for _, ls := range pw.Lines {
		pts := dropRepeats(make(orb.LineString, 0, len(ls)), ls)
		if n := len(pts); n > 0 && lessLL(pts[n-1], pts[0]) {
			slices.Reverse(pts)
		}
		lines = append(lines, pts)
	}
	slices.SortFunc(lines, func(x, y orb.LineString) int {
		for i := 0; i < len(x) && i < len(y); i++ {
			if x[i] != y[i] {
				if lessLL(x[i], y[i]) {
					return -1
				}
				return 1
			}
		}
		return len(x) - len(y)
	})
	return lines
}

// sameShape reports whether shapes x and y are one drawing.
func sameShape(x, y []orb.LineString) bool {
	return slices.EqualFunc(x, y, func(a, b orb.LineString) bool { return slices.Equal(a, b) })
}

// shapeHint is what two pathways of one shape share, cheap to find: the least of their lines'
// ends (each line's ends in order), their counts of lines and of positions (a position
// repeated in a row counted once).
type shapeHint struct {
	lo, hi      orb.Point
	lines, npts int
}

// hintOf is pw's shapeHint; buf is scratch, returned for the next call.
func hintOf(pw *Pathway, buf orb.LineString) (shapeHint, orb.LineString) {
	h := shapeHint{lines: len(pw.Lines)}
	first := true
	for _, ls := range pw.Lines {
		buf = dropRepeats(buf[:0], ls)
		h.npts += len(buf)
		if len(ls) == 0 {
			continue
		}
		lo, hi := ls[0], ls[len(ls)-1]
		if lessLL(hi, lo) {
			lo, hi = hi, lo
		}
		if first || lessLL(lo, h.lo) || (lo == h.lo && lessLL(hi, h.hi)) {
			h.lo, h.hi, first = lo, hi, false
		}
	}
	return h, buf
}

// overlaps looks for pathways drawn on top of one another before noding, on a copy of the
// campus (b.c is replaced; the caller's campus is not changed):
//   - a pathway that is another drawn again (the same lines, in any direction and order, and
//     the same properties but its id) is dropped, with a Warning on it naming the one kept
//     (the lower id): a segment exported twice is one duct, not two;
//   - two pathways that carry the same ducts (sameDucts), each ending on the other, drawn
//     along each other for more than SnapM and at most overlapJoinM are cut back to meet at
//     one point (a structure within SnapM of the overlap, else its middle), with a Warning:
//     one run drawn in pieces that overshoot their join;
//   - any other two pathways drawn along each other (within SnapM, within overlapMaxDeg) for
//     more than SnapM in all are warned of with the metres, and planned as drawn: two
//     pathways, each with its own ducts.
//
// Two lines of one MultiLineString are taken as two pathways of the same ducts.
//
// It needs b.proj. Time O(n) in the number of segments with the grid, as crossings.
func (b *builder) overlaps() {
	c := *b.c
	c.Pathways = slices.Clone(c.Pathways)
	b.c = &c
	dropped := b.dropDuplicates()

	nl, ns := 0, 0
	for pi := range c.Pathways {
		nl += len(c.Pathways[pi].Lines)
		for _, src := range c.Pathways[pi].Lines {
			ns += max(0, len(src)-1)
		}
	}
	lines := make([]oline, 0, nl)
	for pi := range c.Pathways {
		for k, src := range c.Pathways[pi].Lines {
			l := oline{pw: pi, k: k}
			l.ll, l.xy, l.cum = b.projectLine(src) // two distinct positions at least (validate)
			lines = append(lines, l)
		}
	}
	type segID struct{ line, i int }
	segs := make([]segID, 0, ns)
	g := newGrid(b.cellM)
	for li := range lines {
		l := &lines[li]
		for i := 1; i < len(l.xy); i++ {
			g.addSeg(len(segs), l.xy[i-1], l.xy[i])
			segs = append(segs, segID{li, i - 1})
		}
	}
	pairs := make(map[[2]int]*olPair)
	var order [][2]int
	sinMax := math.Sin(overlapMaxDeg * deg)
	seen := make([]int32, len(segs)) // the segment (+1) whose search last met each segment
	for s, sr := range segs {
		la := &lines[sr.line]
		a, c2 := la.xy[sr.i], la.xy[sr.i+1]
		lo := vec{math.Min(a.x, c2.x) - b.snap, math.Min(a.y, c2.y) - b.snap}
		hi := vec{math.Max(a.x, c2.x) + b.snap, math.Max(a.y, c2.y) + b.snap}
		g.visit(lo, hi, func(o int32) {
			if int(o) <= s || seen[o] == int32(s)+1 {
				return
			}
			seen[o] = int32(s) + 1
			or := segs[o]
			lb := &lines[or.line]
			if or.line == sr.line {
				return // a line along itself is no overlap of two
			}
			// Measured along the line of the lower pathway id (then line number), whatever
			// the order of the features: the metres and the meeting point do not follow it.
			key, sa, sb := [2]int{sr.line, or.line}, sr, or
			if x, y := &c.Pathways[la.pw], &c.Pathways[lb.pw]; y.ID < x.ID || (y.ID == x.ID && lb.k < la.k) {
				key, sa, sb = [2]int{or.line, sr.line}, or, sr
			}
			l0, l1 := &lines[sa.line], &lines[sb.line]
			st, ok := alongEach(l0.xy[sa.i], l0.xy[sa.i+1], l1.xy[sb.i], l1.xy[sb.i+1], b.snap, sinMax)
			if !ok {
				return
			}
			st.a0, st.a1 = l0.cum[sa.i]+st.a0, l0.cum[sa.i]+st.a1
			st.b0, st.b1 = l1.cum[sb.i]+st.b0, l1.cum[sb.i]+st.b1
			p := pairs[key]
			if p == nil {
				p = &olPair{a: key[0], b: key[1]}
				pairs[key] = p
				order = append(order, key)
			}
			p.st = append(p.st, st)
		})
	}
	slices.SortFunc(order, func(x, y [2]int) int { // any fixed order: each pair is decided alone
		if x[0] != y[0] {
			return x[0] - y[0]
		}
		return x[1] - y[1]
	})
	type trim struct{ from, to float64 } // the stretch of a line kept
	trims := make(map[int]*trim)
	keep := func(li int) *trim {
		if trims[li] == nil {
			trims[li] = &trim{0, lines[li].lengthM()}
		}
		return trims[li]
	}
	for _, key := range order {
		p := pairs[key]
		la, lb := &lines[p.a], &lines[p.b]
		merged := mergeStretches(p.st)
		total := 0.0
		for _, m := range merged {
			total += m.a1 - m.a0
		}
		if total <= b.snap {
			continue
		}
		pa, pb := &c.Pathways[la.pw], &c.Pathways[lb.pw] // pa.ID < pb.ID
		// Up to overlapJoinM to the millimetre: an overshoot drawn as 5 m is 5 m.
		if len(merged) == 1 && total <= overlapJoinM+1e-3 && sameDucts(pa.ductFacts(), pb.ductFacts()) {
			m := merged[0]
			// Where the stretch's ends lie along lb.
			_, x0 := la.at(m.a0)
			_, x1 := la.at(m.a1)
			b0, b1 := lb.along(x0), lb.along(x1)
			endA1, endA0 := la.lengthM()-m.a1 <= b.snap, m.a0 <= b.snap
			endB0 := b0 <= b.snap || lb.lengthM()-b0 <= b.snap
			endB1 := b1 <= b.snap || lb.lengthM()-b1 <= b.snap
			longer := la.lengthM() > total+b.snap && lb.lengthM() > total+b.snap
			if longer && ((endA1 && !endA0 && endB0 && !endB1) || (endA0 && !endA1 && endB1 && !endB0)) {
				meetA := (m.a0 + m.a1) / 2
				where := "the middle of the overlap"
				if sid, s, ok := b.structureOn(la, m.a0, m.a1); ok {
					meetA, where = s, fmt.Sprintf("structure %q", sid)
				}
				_, mxy := la.at(meetA)
				meetB := lb.along(mxy)
				ka, kb := keep(p.a), keep(p.b)
				if endA1 {
					ka.to = min(ka.to, meetA)
				} else {
					ka.from = max(ka.from, meetA)
				}
				if b0 <= b.snap || b1 <= b.snap { // lb starts in the stretch
					kb.from = max(kb.from, meetB)
				} else {
					kb.to = min(kb.to, meetB)
				}
				b.warns = append(b.warns, warnRec{pb.Source, pb.ID, fmt.Sprintf(
					"%s overlap end to end for %s m: pathways that carry the same ducts and overshoot each other by up to %s m are taken as one run drawn in pieces; both cut to meet at %s",
					twoLines(pa, pb, la, lb), shortM(total), fmtM(overlapJoinM), where)})
				continue
			}
		}
		b.warns = append(b.warns, warnRec{pb.Source, pb.ID, fmt.Sprintf(
			"%s are drawn along each other for %s m (within snap_m %s): planned as two pathways there, each with its own ducts; if one is the other drawn again, delete it or cut it where the other ends",
			twoLines(pa, pb, la, lb), shortM(total), fmtM(b.snap))})
	}
	if len(trims) == 0 {
		if !dropped {
			// The lines are the parts setup makes, in its order: its segment index is this one.
			b.segGrid, b.olines = g, lines
		}
		return
	}
	lis := make([]int, 0, len(trims))
	for li := range trims {
		lis = append(lis, li)
	}
	slices.Sort(lis)
	for _, li := range lis {
		l, t := &lines[li], trims[li]
		if t.to-t.from <= b.snap {
			continue // cut from both ends to (almost) nothing: left as drawn
		}
		pw := &c.Pathways[l.pw]
		if !slices.ContainsFunc(lis, func(x int) bool { return x < li && lines[x].pw == l.pw }) {
			pw.Lines = slices.Clone(pw.Lines)
		}
		pw.Lines[l.k] = l.cutTo(t.from, t.to)
	}
}

// twoLines names, for a warning, two pathways (the second's feature is the warning's own), or
// two lines of one MultiLineString.
func twoLines(pa, pb *Pathway, la, lb *oline) string {
	if pa == pb {
		return fmt.Sprintf("lines %d and %d of pathway %q", la.k+1, lb.k+1, pa.ID)
	}
	return fmt.Sprintf("pathways %q (%s) and %q", pa.ID, pa.Source, pb.ID)
}

// along is the projected length along l to the point of l nearest xy.
func (l *oline) along(xy vec) float64 {
	best, bestD := 0.0, math.Inf(1)
	for i := 1; i < len(l.xy); i++ {
		t, d2 := closestOnSeg(xy, l.xy[i-1], l.xy[i])
		if d2 < bestD {
			best, bestD = l.cum[i-1]+t*(l.cum[i]-l.cum[i-1]), d2
		}
	}
	return best
}

// structureOn returns the structure within SnapM of line l between s0 and s1 along it that
// lies nearest the middle of that stretch, with its place along l.
func (b *builder) structureOn(l *oline, s0, s1 float64) (string, float64, bool) {
	id, at, bestD := "", 0.0, math.Inf(1)
	mid := (s0 + s1) / 2
	for _, st := range b.c.Structures {
		xy := b.proj.xy(st.Point)
		s := l.along(xy)
		if s < s0-b.snap || s > s1+b.snap {
			continue
		}
		if _, p := l.at(s); p.dist(xy) > b.snap {
			continue
		}
		if d := math.Abs(s - mid); d < bestD || (d == bestD && st.ID < id) {
			id, at, bestD = st.ID, math.Max(s0, math.Min(s1, s)), d
		}
	}
	return id, at, id != ""
}

// alongEach returns the stretch of segment ac (from a) that segment ef is drawn along: ef
// within sinMax of ac's direction, and ac there within snap of ef; with the places along ef.
func alongEach(a, c, e, f vec, snap, sinMax float64) (stretch, bool) {
	u, v := c.sub(a), f.sub(e)
	lu, lv := math.Sqrt(u.dot(u)), math.Sqrt(v.dot(v))
	if lu == 0 || lv == 0 || math.Abs(u.cross(v)) > sinMax*lu*lv {
		return stretch{}, false
	}
	ux := u.scale(1 / lu)
	// ef's ends projected on ac's line, clamped to ac.
	te, tf := e.sub(a).dot(ux), f.sub(a).dot(ux)
	s0, s1 := math.Max(0, math.Min(te, tf)), math.Min(lu, math.Max(te, tf))
	if s1-s0 <= 0 {
		return stretch{}, false
	}
	// Keep the part of ac within snap of ef's line: the distance changes linearly along it.
	vx := v.scale(1 / lv)
	dist := func(s float64) float64 { return a.add(ux.scale(s)).sub(e).cross(vx) }
	d0, d1 := dist(s0), dist(s1)
	if math.Abs(d0) > snap || math.Abs(d1) > snap {
		if d0 == d1 {
			return stretch{}, false
		}
		// Parameters where the signed distance is ±snap, clipped to [s0, s1].
		k := (d1 - d0) / (s1 - s0)
		lo, hi := s0+(-snap-d0)/k, s0+(snap-d0)/k
		if lo > hi {
			lo, hi = hi, lo
		}
		s0, s1 = math.Max(s0, lo), math.Min(s1, hi)
		if s1-s0 <= 0 {
			return stretch{}, false
		}
	}
	back := func(s float64) float64 { return a.add(ux.scale(s)).sub(e).dot(vx) }
	return stretch{a0: s0, a1: s1, b0: math.Max(0, math.Min(lv, back(s0))), b1: math.Max(0, math.Min(lv, back(s1)))}, true
}

// mergeStretches joins stretches (by their a0..a1) that touch or overlap, in order along the
// first line.
func mergeStretches(st []stretch) []stretch {
	slices.SortFunc(st, func(x, y stretch) int {
		if x.a0 != y.a0 {
			if x.a0 < y.a0 {
				return -1
			}
			return 1
		}
		return 0
	})
	var out []stretch
	for _, s := range st {
		if n := len(out); n > 0 && s.a0 <= out[n-1].a1+1e-6 {
			out[n-1].a1 = math.Max(out[n-1].a1, s.a1)
			continue
		}
		out = append(out, stretch{a0: s.a0, a1: s.a1})
	}
	return out
}

// dropDuplicates drops every pathway of b.c that is another drawn again: the same lines
// (shapeKey) and the same properties but the id; the lowest id is kept. Each dropped one is a
// Warning. It reports whether it dropped any.
func (b *builder) dropDuplicates() bool {
	c := b.c
	// Only pathways with one hint can be one drawing.
	first := make(map[shapeHint][]int)
	var buf orb.LineString
	for i := range c.Pathways {
		var k shapeHint
		k, buf = hintOf(&c.Pathways[i], buf)
		first[k] = append(first[k], i)
	}
	drop := make(map[int]bool)
	for _, same := range first {
		if len(same) < 2 {
			continue
		}
		// In id order, each kept one the lowest of its drawing: the same warnings whatever
		// the order of the features.
		slices.SortFunc(same, func(x, y int) int { return strings.Compare(c.Pathways[x].ID, c.Pathways[y].ID) })
		shapes := make([][]orb.LineString, len(same))
		for x, i := range same {
			shapes[x] = shape(&c.Pathways[i])
		}
		for x, i := range same {
			if drop[i] {
				continue
			}
			for y, j := range same[x+1:] {
				pi, pj := &c.Pathways[i], &c.Pathways[j]
				if drop[j] || !sameProps(pi, pj) || !sameShape(shapes[x], shapes[x+1+y]) {
					continue
				}
				drop[j] = true // pj.ID > pi.ID
				b.warns = append(b.warns, warnRec{pj.Source, pj.ID, fmt.Sprintf(
					"pathway %q is pathway %q (%s) drawn again: the same line and properties; counted once, as %q",
					pj.ID, pi.ID, pi.Source, pi.ID)})
			}
		}
	}
	if len(drop) == 0 {
		return false
	}
	kept := c.Pathways[:0:0]
	for i, pw := range c.Pathways {
		if !drop[i] {
			kept = append(kept, pw)
		}
	}
	c.Pathways = kept
	return true
}
