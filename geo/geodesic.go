package geo

import (
	"math"

	"github.com/paulmach/orb"
)

// WGS84 ellipsoid: semi-major axis in metres and flattening.
const (
	WGS84AM = 6378137.0
	WGS84F  = 1 / 298.257223563
)

// wgs84BM is the semi-minor axis in metres.
const wgs84BM = WGS84AM * (1 - WGS84F)

// meanRadiusM is the mean radius (2a+b)/3 of the WGS84 ellipsoid in metres, used by the
// spherical fallback.
const meanRadiusM = (2*WGS84AM + wgs84BM) / 3

// DistanceM returns the length in metres of the shortest path on the WGS84 ellipsoid between
// a and b, given as [longitude, latitude] in degrees.
//
// It uses Vincenty's inverse formula (T. Vincenty, "Direct and inverse solutions of geodesics
// on the ellipsoid with application of nested equations", Survey Review 23(176), 1975), good
// to well under a millimetre at campus scale. Vincenty's iteration does not converge for
// nearly antipodal points (Karney 2013, "Algorithms for geodesics", section 9); there
// DistanceM falls back to the great-circle distance on a sphere of the ellipsoid's mean
// radius, which may be off by up to about 0.5 %. Campuses are never in that regime.
func DistanceM(a, b orb.Point) float64 {
	if s, ok := vincentyM(a[1], a[0], b[1], b[0]); ok {
		return s
	}
	return sphericalM(a, b)
}

// LengthM returns the length in metres of ls on the WGS84 ellipsoid: the sum of DistanceM
// over its segments. It is 0 for fewer than two points.
func LengthM(ls orb.LineString) float64 {
	var s float64
	for i := 1; i < len(ls); i++ {
		s += DistanceM(ls[i-1], ls[i])
	}
	return s
}

const deg = math.Pi / 180

// vincentyM solves the inverse problem; ok is false when the iteration does not converge.
func vincentyM(lat1, lon1, lat2, lon2 float64) (s float64, ok bool) {
	const f = WGS84F
	dLon := math.Remainder(lon2-lon1, 360) * deg
	tanU1 := (1 - f) * math.Tan(lat1*deg)
	cosU1 := 1 / math.Sqrt(1+tanU1*tanU1)
	sinU1 := tanU1 * cosU1
	tanU2 := (1 - f) * math.Tan(lat2*deg)
	cosU2 := 1 / math.Sqrt(1+tanU2*tanU2)
	sinU2 := tanU2 * cosU2

	lambda := dLon
	var sinSigma, cosSigma, sigma, cosSqAlpha, cos2SigmaM float64
	converged := false
	for iter := 0; iter < 200; iter++ {
		sinL, cosL := math.Sincos(lambda)
		t1 := cosU2 * sinL
		t2 := cosU1*sinU2 - sinU1*cosU2*cosL
		sinSigma = math.Sqrt(t1*t1 + t2*t2)
		if sinSigma == 0 {
			return 0, true // coincident points
		}
		cosSigma = sinU1*sinU2 + cosU1*cosU2*cosL
		sigma = math.Atan2(sinSigma, cosSigma)
		sinAlpha := cosU1 * cosU2 * sinL / sinSigma
		cosSqAlpha = 1 - sinAlpha*sinAlpha
		if cosSqAlpha != 0 {
			cos2SigmaM = cosSigma - 2*sinU1*sinU2/cosSqAlpha
		} else {
			cos2SigmaM = 0 // both points on the equator
		}
		c := f / 16 * cosSqAlpha * (4 + f*(4-3*cosSqAlpha))
		prev := lambda
		lambda = dLon + (1-c)*f*sinAlpha*
			(sigma+c*sinSigma*(cos2SigmaM+c*cosSigma*(-1+2*cos2SigmaM*cos2SigmaM)))
		if math.Abs(lambda) > math.Pi || math.IsNaN(lambda) {
			return 0, false
		}
		if math.Abs(lambda-prev) < 1e-12 {
			converged = true
			break
		}
	}
	if !converged {
		return 0, false
	}
	uSq := cosSqAlpha * (WGS84AM*WGS84AM - wgs84BM*wgs84BM) / (wgs84BM * wgs84BM)
	a := 1 + uSq/16384*(4096+uSq*(-768+uSq*(320-175*uSq)))
	b := uSq / 1024 * (256 + uSq*(-128+uSq*(74-47*uSq)))
	c2 := cos2SigmaM * cos2SigmaM
	dSigma := b * sinSigma * (cos2SigmaM + b/4*(cosSigma*(-1+2*c2)-
		b/6*cos2SigmaM*(-3+4*sinSigma*sinSigma)*(-3+4*c2)))
	return wgs84BM * a * (sigma - dSigma), true
}

// sphericalM is the haversine distance in metres on a sphere of radius meanRadiusM.
func sphericalM(a, b orb.Point) float64 {
	lat1, lat2 := a[1]*deg, b[1]*deg
	dLat := lat2 - lat1
	dLon := math.Remainder(b[0]-a[0], 360) * deg
	h := math.Sin(dLat/2)*math.Sin(dLat/2) + math.Cos(lat1)*math.Cos(lat2)*math.Sin(dLon/2)*math.Sin(dLon/2)
	return 2 * meanRadiusM * math.Asin(math.Min(1, math.Sqrt(h)))
}
