package geo

import "github.com/paulmach/orb"

// PointAt returns the point offM metres along the span from its From end, measured as
// SegmentsM measures (ellipsoidal), placed on its segment by linear interpolation of
// longitude and latitude (on a campus segment of some hundred metres, within millimetres of
// the geodesic). An offset below 0 or beyond LengthM gives the end; a span without a line
// gives the zero point.
func (s *Span) PointAt(offM float64) orb.Point {
	if len(s.Line) == 0 {
		return orb.Point{}
	}
	if offM <= 0 {
		return s.Line[0]
	}
	for i, segM := range s.SegmentsM() {
		if offM <= segM {
			t := 0.0
			if segM > 0 {
				t = offM / segM
			}
			a, b := s.Line[i], s.Line[i+1]
			return orb.Point{a[0] + t*(b[0]-a[0]), a[1] + t*(b[1]-a[1])}
		}
		offM -= segM
	}
	return s.Line[len(s.Line)-1]
}
