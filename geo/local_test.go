package geo

import (
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// TestLocalScale: over 200 m east and north, the local projection's metres agree with the
// ellipsoidal distance (Vincenty, checked against GeographicLib's GeodSolve in
// geodesic_test.go) to 1 part in 10⁵, at every latitude a campus may stand.
func TestLocalScale(t *testing.T) {
	t.Parallel()
	for _, lat := range []float64{-60, -33.9, 0, 12.5, 46.2, 64.1} {
		p := NewLocal(7.1, lat)
		for _, d := range [][2]float64{{200 / p.MPerDegX, 0}, {0, 200 / p.MPerDegY}} {
			q := orb.Point{7.1 + d[0], lat + d[1]}
			x, y := p.XY(q[0], q[1])
			want := DistanceM(orb.Point{7.1, lat}, q)
			if got := math.Hypot(x, y); math.Abs(got-want) > 1e-5*want {
				t.Errorf("latitude %g: projected %.6f m, ellipsoidal %.6f m", lat, got, want)
			}
		}
	}
}
