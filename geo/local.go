package geo

import "math"

// Local is the one local projection of spanwright: equirectangular about a centre, in metres
// east (x) and north (y) of it, scaled by the WGS84 ellipsoid's prime-vertical and meridian
// radii of curvature at the centre's latitude. Over a campus a few kilometres across its
// scale error stays far below the snapping tolerance and a pixel of the report's map. Noding
// uses it to decide what is near what, the report to draw; no length is ever taken from it
// (lengths are ellipsoidal, DistanceM).
type Local struct {
	Lon0, Lat0         float64 // centre, degrees
	MPerDegX, MPerDegY float64 // metres per degree of longitude and of latitude at Lat0
}

// NewLocal is the local projection about the centre at lon0, lat0 (degrees).
func NewLocal(lon0, lat0 float64) Local {
	phi := lat0 * deg
	e2 := WGS84F * (2 - WGS84F)
	w := 1 - e2*math.Sin(phi)*math.Sin(phi)
	n := WGS84AM / math.Sqrt(w)                  // prime-vertical radius of curvature
	m := WGS84AM * (1 - e2) / (w * math.Sqrt(w)) // meridian radius of curvature
	return Local{Lon0: lon0, Lat0: lat0, MPerDegX: n * math.Cos(phi) * deg, MPerDegY: m * deg}
}

// XY projects lon, lat (degrees) to metres east and north of the centre.
func (p Local) XY(lon, lat float64) (xM, yM float64) {
	return (lon - p.Lon0) * p.MPerDegX, (lat - p.Lat0) * p.MPerDegY
}
