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
// 180 when b doubles back. It measures the angle between the last segment of a and the
// first segment of b, in their travel directions, on a local equirectangular projection
// around the junction (angles at campus scale are unaffected by its scale error).
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
	la, lb := len(sa.Line), len(sb.Line)
	prev, at := sa.Line[la-2], sa.Line[la-1]
	if a.Reverse {
		prev, at = sa.Line[1], sa.Line[0]
	}
	next := sb.Line[1]
	if b.Reverse {
		next = sb.Line[lb-2]
	}
	return turnAt(prev, at, next)
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
// building, when b ends there. As TurnDeg, on the last segments; 0 when either has fewer than
// two points.
func (n *Network) LateralTurnDeg(lateral orb.LineString, b Step, into bool) float64 {
	sb, ok := n.Span(b.SpanID)
	nl, lb := len(lateral), len(sb.Line)
	if !ok || nl < 2 || lb < 2 {
		return 0
	}
	if into {
		next := sb.Line[1]
		if b.Reverse {
			next = sb.Line[lb-2]
		}
		return turnAt(lateral[nl-2], lateral[nl-1], next)
	}
	prev := sb.Line[lb-2]
	if b.Reverse {
		prev = sb.Line[1]
	}
	return turnAt(prev, lateral[nl-1], lateral[nl-2])
}
