package geo

import (
	"math"

	"github.com/paulmach/orb"
)

// SegmentsM returns the ellipsoidal length in metres (DistanceM) of each segment of the
// span's line in its own direction, From → To: one value per pair of consecutive points,
// so len(BendsDeg)+1 values for a span made by Build. Their sum is LengthM.
func (s *Span) SegmentsM() []float64 {
	if len(s.Line) < 2 {
		return nil
	}
	out := make([]float64, len(s.Line)-1)
	for i := range out {
		out[i] = DistanceM(s.Line[i], s.Line[i+1])
	}
	return out
}

// TurnDeg returns the deflection in degrees where a route passes from step a to step b at
// the junction they share: 0 when b carries straight on from a, 90 at a right-angle turn,
// 180 when b doubles back. It measures the angle between the end chord of a and the first
// chord of b, in their travel directions, of their lines simplified within BendToleranceM
// (Span.AwayFrom), on a local equirectangular projection around the junction (angles at
// campus scale are unaffected by its scale error): a digitizing spike or a jitter within
// BendToleranceM next to the junction is no turn there, as it is no bend along the span.
//
// It returns 0 when either span is unknown or has fewer than two points, or when a does not
// end at the junction where b starts. Time O(1) on a Network from Build.
func (n *Network) TurnDeg(a, b Step) float64 {
	sa, ok1 := n.Span(a.SpanID)
	sb, ok2 := n.Span(b.SpanID)
	if !ok1 || !ok2 || len(sa.Line) < 2 || len(sb.Line) < 2 {
		return 0
	}
	endA, startB := sa.To, sb.From
	if a.Reverse {
		endA = sa.From
	}
	if b.Reverse {
		startB = sb.To
	}
	if endA != startB {
		return 0
	}
	at := sa.Line[len(sa.Line)-1]
	if a.Reverse {
		at = sa.Line[0]
	}
	return turnAt(sa.AwayFrom(!a.Reverse), at, sb.AwayFrom(b.Reverse))
}

// AwayFrom returns the vertex of the span's line that its line simplified within
// BendToleranceM goes to first from its From end, or from its To end when atTo is true: the
// direction of the span at that end's junction is towards it (TurnDeg, LateralTurnDeg), and
// BendsDeg turns from and to those end chords. Unless it is the span's other end, it is more
// than BendToleranceM from the end (Douglas–Peucker keeps no vertex within it of a chord), so
// a vertex drawn a hair beside the junction does not set the direction. A span not made by Build, or one of two points, goes
// to its next vertex; a span without a line gives the zero point.
func (s *Span) AwayFrom(atTo bool) orb.Point {
	n := len(s.Line)
	if n == 0 {
		return orb.Point{}
	}
	i := 0
	if atTo {
		i = 1
	}
	k := min(max(s.near[i], 1), n-1)
	if atTo {
		return s.Line[n-1-k]
	}
	return s.Line[k]
}

// turnAt is the deflection in degrees at p on the way a → p → c, on an equirectangular
// projection centred on p.
func turnAt(a, p, c orb.Point) float64 {
	kx := math.Cos(p[1] * deg)
	xy := func(q orb.Point) vec { return vec{(q[0] - p[0]) * kx, q[1] - p[1]} }
	u, v := xy(a), xy(c)
	if u.dot(u) == 0 || v.dot(v) == 0 {
		return 0
	}
	return deflectionDeg(u, vec{}, v)
}

// LateralTurnDeg returns the deflection in degrees where a counted lateral (building side
// first, Access.Lateral) meets the span of step b at the junction where the lateral ends:
// into b when b starts there (into is true), or out of b into the lateral, towards the
// building, when b ends there. As TurnDeg, on the lateral's last segment (Build draws it
// straight) and the span's chord at that end (Span.AwayFrom); 0 when either has fewer than
// two points.
func (n *Network) LateralTurnDeg(lateral orb.LineString, b Step, into bool) float64 {
	sb, ok := n.Span(b.SpanID)
	nl := len(lateral)
	if !ok || nl < 2 || len(sb.Line) < 2 {
		return 0
	}
	if into {
		return turnAt(lateral[nl-2], lateral[nl-1], sb.AwayFrom(b.Reverse))
	}
	return turnAt(sb.AwayFrom(!b.Reverse), lateral[nl-1], lateral[nl-2])
}

// BendToleranceM is how far, in metres, a vertex of a span's line may stand off the straight
// line between the vertices kept on either side of it and still be taken as drawing noise
// rather than a bend: BendsDeg measures the line simplified within it (Douglas–Peucker). A
// facilities GIS draws a straight duct with vertices a hair off the line (a digitizing spike,
// a densified line's jitter); counted as bends, each fills a pull's bend budget (TIA-569: two
// 90° bends between pull points) and adds pull points no crew would build. A duct turns no
// sharper than its minimum bend radius (TIA-569: 10 × the inside diameter for conduit over
// 50 mm, 6 × up to it; from memory), 1 m for the default 100 mm duct, so two opposite bends of
// θ offset it sideways by at least 2 m × (1 − cos θ): a sideways jog of no more than 0.25 m is
// at most two bends of 29° (modelling choice: half the default snap_m, the distance at which
// the drawing's ends are already taken as one point). A real bend drawn with a short chamfer
// (two 45° vertices) keeps its 90° whatever the chamfer's length: a chamfer vertex dropped
// leaves its turn to the one kept.
const BendToleranceM = 0.25

// bendsDeg returns the bend in degrees at each interior vertex of the line xy (local metres),
// one value per interior vertex so the bends stay aligned with the segments, and, for its
// first and last point, how many vertices in from that end the line simplified within
// BendToleranceM goes on to (Span.AwayFrom: the direction at the end's junction). It is the
// one place that decides what of a drawn line is a bend and which way it leaves its ends.
//
// The vertices the simplified line keeps are its bends; every other vertex is 0, and its
// turn (signed: left positive) goes to the nearest kept interior vertex along the line, so
// that a kept vertex's bend is the net turn of the stretch around it. A spike or a jitter
// turns one way and back and adds nothing; a curve drawn with many vertices keeps all of its
// turn, which the turns between the simplified line's chords alone would cut short. The
// first and last stretches turn from and to the simplified line's end chords, not the drawn
// end segments, since the turns at the junctions are measured on those chords (TurnDeg):
// a spike next to an end, whose way back is the junction itself, adds nothing either, and
// the bends along a route and the turns at its junctions add up to the turn of the line
// drawn.
func bendsDeg(xy []vec) (bends []float64, near [2]int) {
	if len(xy) <= 2 {
		return nil, [2]int{1, 1}
	}
	kept := keptVertices(xy, BendToleranceM)
	last, m := len(xy)-1, len(kept)
	near = [2]int{kept[1], last - kept[m-2]}
	bends = make([]float64, len(xy)-2)
	if m == 2 {
		return bends, near
	}
	along := make([]float64, len(xy))
	for i := 1; i < len(xy); i++ {
		along[i] = along[i-1] + xy[i].dist(xy[i-1])
	}
	turn := func(u, v vec) float64 { return math.Atan2(u.cross(v), u.dot(v)) / deg }
	net := make([]float64, len(xy)) // by kept vertex: the signed turns of its stretch
	k := 1                          // the kept vertex that vertex i's turn goes to, 1 ≤ k < m-1
	for i := 1; i < len(xy)-1; i++ {
		for k+1 < m-1 && along[kept[k+1]]-along[i] < along[i]-along[kept[k]] {
			k++
		}
		net[kept[k]] += turn(xy[i].sub(xy[i-1]), xy[i+1].sub(xy[i]))
	}
	// From the first chord into the first drawn segment, and from the last drawn segment into
	// the last chord (a zero-length segment drawn at an end turns nowhere: the next one counts).
	first, final := 1, last-1
	for first < last && xy[first] == xy[0] {
		first++
	}
	for final > 0 && xy[final] == xy[last] {
		final--
	}
	net[kept[1]] += turn(xy[kept[1]].sub(xy[0]), xy[first].sub(xy[0]))
	net[kept[m-2]] += turn(xy[last].sub(xy[final]), xy[last].sub(xy[kept[m-2]]))
	for _, i := range kept[1 : m-1] {
		bends[i-1] = math.Abs(net[i])
	}
	return bends, near
}

// keptVertices returns, in order, the indices of the vertices of xy that the Douglas–Peucker
// simplification within tolM keeps (D. Douglas and T. Peucker, The Canadian Cartographer
// 10(2), 1973): both ends, and recursively the vertex farthest from the segment between two
// kept ones while it is more than tolM from it; of vertices as far, the first.
func keptVertices(xy []vec, tolM float64) []int {
	keep := make([]bool, len(xy))
	markKept(xy, tolM, keep, nil)
	out := make([]int, 0, len(xy))
	for i, k := range keep {
		if k {
			out = append(out, i)
		}
	}
	return out
}

// markKept sets keep[i] for each vertex i of xy that keptVertices returns (keep is as long as
// xy and all false), using stack as scratch; it returns the stack for reuse.
func markKept(xy []vec, tolM float64, keep []bool, stack [][2]int) [][2]int {
	keep[0], keep[len(xy)-1] = true, true
	stack = append(stack[:0], [2]int{0, len(xy) - 1})
	for len(stack) > 0 {
		lo, hi := stack[len(stack)-1][0], stack[len(stack)-1][1]
		stack = stack[:len(stack)-1]
		far, farD2 := -1, tolM*tolM
		for i := lo + 1; i < hi; i++ {
			if _, d2 := closestOnSeg(xy[i], xy[lo], xy[hi]); d2 > farD2 {
				far, farD2 = i, d2
			}
		}
		if far >= 0 {
			keep[far] = true
			stack = append(stack, [2]int{far, hi}, [2]int{lo, far})
		}
	}
	return stack
}

// lineBends is bendsDeg of a longitude/latitude line on the campus's local projection: how a
// span's bends are measured, whether it was built as drawn or cut at a wall.
func (b *builder) lineBends(ll orb.LineString) ([]float64, [2]int) {
	xy := make([]vec, len(ll))
	for i, p := range ll {
		xy[i] = b.proj.xy(p)
	}
	return bendsDeg(xy)
}
