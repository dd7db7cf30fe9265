package geo

import (
	"cmp"
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

// olSeg is segment i (from vertex i) of line (an index into the builder's olines).
type olSeg struct{ line, i int }

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

// overlaps looks for pathways drawn on top of one another before noding, on a copy of the
// campus (b.c is replaced; the caller's campus is not changed):
//   - a pathway that is another drawn again (copies: the same properties but the id, and
//     each line of either drawn along lines of the other, within SnapM and overlapMaxDeg,
//     for all of its length but at most SnapM) is dropped, with a Warning on it naming the
//     one kept (the lower id): a segment exported twice is one duct, not two, whether the
//     copy is exact or a re-export moved a vertex by a millimetre;
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
// When it drops copies it stops there and reports true: the caller projects the campus
// without them (a copy a millimetre off must move nothing, the projection's centre included)
// and calls it again for the rest. It needs b.proj. Time O(n) in the number of segments with
// the grid, as crossings.
func (b *builder) overlaps() bool {
	c := *b.c
	c.Pathways = slices.Clone(c.Pathways)
	b.c = &c

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
	segs := make([]olSeg, 0, ns)
	g := newGrid(b.cellM)
	for li := range lines {
		l := &lines[li]
		for i := 1; i < len(l.xy); i++ {
			g.addSeg(len(segs), l.xy[i-1], l.xy[i])
			segs = append(segs, olSeg{li, i - 1})
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
	if dropped := b.dropCopies(lines, pairs, order); len(dropped) > 0 {
		// setup projects the campus without them and calls again for the rest.
		c.Pathways = withoutDropped(c.Pathways, dropped)
		return true
	}
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
		// The lines are the parts setup makes, in its order: its segment index is this one.
		b.segGrid, b.olines = g, lines
		return false
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
	return false
}

// withoutDropped is pws without the pathways (by index) in dropped.
func withoutDropped(pws []Pathway, dropped map[int]bool) []Pathway {
	if len(dropped) == 0 {
		return pws
	}
	kept := pws[:0:0]
	for i, pw := range pws {
		if !dropped[i] {
			kept = append(kept, pw)
		}
	}
	return kept
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

// dropCopies returns the pathways (indices into b.c.Pathways) that are another drawn again
// (see overlaps), each with a Warning naming the one kept: of two copies the lower id is
// kept, in id order, so that a dropped one drops no other and the same ones are dropped
// whatever the order of the features. pairs and order are the lines drawn along each other.
// The warning is the same for an exact copy and for one a millimetre off, so that the plan
// is too.
func (b *builder) dropCopies(lines []oline, pairs map[[2]int]*olPair, order [][2]int) map[int]bool {
	c := b.c
	type pwPair struct{ a, b int }      // pathway indices, a's id the lower
	cover := make(map[[2]int][]stretch) // {line, pathway} → the stretches of the line drawn along lines of the pathway (a0..a1)
	seen := make(map[pwPair]bool)
	var cands []pwPair
	for _, key := range order {
		p := pairs[key]
		la, lb := &lines[p.a], &lines[p.b]
		if la.pw == lb.pw || !sameProps(&c.Pathways[la.pw], &c.Pathways[lb.pw]) {
			continue
		}
		for _, st := range p.st {
			cover[[2]int{p.a, lb.pw}] = append(cover[[2]int{p.a, lb.pw}], stretch{a0: st.a0, a1: st.a1})
			cover[[2]int{p.b, la.pw}] = append(cover[[2]int{p.b, la.pw}], stretch{a0: min(st.b0, st.b1), a1: max(st.b0, st.b1)})
		}
		if pp := (pwPair{la.pw, lb.pw}); !seen[pp] { // key[0] is the lower id's line
			seen[pp] = true
			cands = append(cands, pp)
		}
	}
	if len(cands) == 0 {
		return nil
	}
	linesOf := make(map[int][]int) // pathway → its lines
	for li := range lines {
		linesOf[lines[li].pw] = append(linesOf[lines[li].pw], li)
	}
	// covered reports whether every line of pathway x is drawn along lines of pathway y for
	// all of its length but at most SnapM.
	covered := func(x, y int) bool {
		for _, li := range linesOf[x] {
			along := 0.0
			for _, m := range mergeStretches(cover[[2]int{li, y}]) {
				along += m.a1 - m.a0
			}
			if lines[li].lengthM()-along > b.snap {
				return false
			}
		}
		return true
	}
	slices.SortFunc(cands, func(x, y pwPair) int {
		return cmp.Or(strings.Compare(c.Pathways[x.a].ID, c.Pathways[y.a].ID), strings.Compare(c.Pathways[x.b].ID, c.Pathways[y.b].ID))
	})
	dropped := make(map[int]bool)
	for _, pp := range cands {
		if dropped[pp.a] || dropped[pp.b] || !covered(pp.a, pp.b) || !covered(pp.b, pp.a) {
			continue
		}
		dropped[pp.b] = true
		pi, pj := &c.Pathways[pp.a], &c.Pathways[pp.b]
		b.warns = append(b.warns, warnRec{pj.Source, pj.ID, fmt.Sprintf(
			"pathway %q is pathway %q (%s) drawn again: the same properties and the same line within snap_m %s; counted once, as %q",
			pj.ID, pi.ID, pi.Source, fmtM(b.snap), pi.ID)})
	}
	return dropped
}
