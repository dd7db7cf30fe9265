package report

import (
	"math"
	"strings"

	"spanwright/geo"
)

// xy is a point on the drawing, in SVG pixels (y down).
type xy struct{ X, Y float64 }

// projection maps longitude/latitude in degrees to drawing pixels: geo's local projection
// (geo.Local) about the centre of the drawn area, scaled to pixels, north up.
type projection struct {
	local              geo.Local
	pxPerM             float64
	cx, cy             float64 // pixel position of the centre
	widthPx, heightPx  float64
	marginPx           float64
	extentXM, extentYM float64 // drawn extent, in metres
}

// bounds accumulates a longitude/latitude bounding box.
type bounds struct {
	minLon, minLat, maxLon, maxLat float64
	any                            bool
}

func (b *bounds) add(lon, lat float64) {
	if math.IsNaN(lon) || math.IsNaN(lat) {
		return
	}
	if !b.any {
		b.minLon, b.maxLon, b.minLat, b.maxLat, b.any = lon, lon, lat, lat, true
		return
	}
	b.minLon, b.maxLon = math.Min(b.minLon, lon), math.Max(b.maxLon, lon)
	b.minLat, b.maxLat = math.Min(b.minLat, lat), math.Max(b.maxLat, lat)
}

// bandPx is the band below the drawn area that holds the scale bar and the north arrow.
const bandPx = 30.0

// newProjection fits b into a drawing widthPx wide and at most maxHeightPx high, with
// marginPx on every side and a band of bandPx below.
func newProjection(b bounds, widthPx, maxHeightPx, marginPx float64) *projection {
	if !b.any {
		b = bounds{any: true}
	}
	p := &projection{local: geo.NewLocal((b.minLon+b.maxLon)/2, (b.minLat+b.maxLat)/2), marginPx: marginPx}
	p.extentXM = math.Max((b.maxLon-b.minLon)*p.local.MPerDegX, 1)
	p.extentYM = math.Max((b.maxLat-b.minLat)*p.local.MPerDegY, 1)
	inner := widthPx - 2*marginPx
	p.pxPerM = inner / p.extentXM
	if h := p.extentYM * p.pxPerM; h > maxHeightPx-2*marginPx-bandPx {
		p.pxPerM = (maxHeightPx - 2*marginPx - bandPx) / p.extentYM
	}
	p.widthPx = widthPx
	p.heightPx = math.Ceil(p.extentYM*p.pxPerM + 2*marginPx + bandPx)
	p.cx, p.cy = widthPx/2, (p.heightPx-bandPx)/2
	return p
}

// at projects one longitude/latitude pair.
func (p *projection) at(lon, lat float64) xy {
	x, y := p.local.XY(lon, lat)
	return xy{p.cx + x*p.pxPerM, p.cy - y*p.pxPerM}
}

// line projects a line given as [lon, lat] pairs.
func (p *projection) line(pts [][2]float64) []xy {
	out := make([]xy, len(pts))
	for i, q := range pts {
		out[i] = p.at(q[0], q[1])
	}
	return out
}

// pathD is the SVG path data of an open polyline; "" for fewer than two points.
func pathD(pts []xy) string {
	if len(pts) < 2 {
		return ""
	}
	var b strings.Builder
	for i, q := range pts {
		if i == 0 {
			b.WriteByte('M')
		} else {
			b.WriteByte('L')
		}
		b.WriteString(num(q.X))
		b.WriteByte(' ')
		b.WriteString(num(q.Y))
	}
	return b.String()
}

// ringD appends the path data of a closed ring.
func ringD(b *strings.Builder, pts []xy) {
	for i, q := range pts {
		if i == 0 {
			b.WriteByte('M')
		} else {
			b.WriteByte('L')
		}
		b.WriteString(num(q.X))
		b.WriteByte(' ')
		b.WriteString(num(q.Y))
	}
	b.WriteByte('Z')
}

// offsetLine shifts a polyline d pixels to its right (seen along its direction, y down),
// joining segments with a miter no longer than 3d.
func offsetLine(pts []xy, d float64) []xy {
	if d == 0 || len(pts) < 2 {
		return pts
	}
	normal := func(a, b xy) (xy, bool) {
		dx, dy := b.X-a.X, b.Y-a.Y
		l := math.Hypot(dx, dy)
		if l < 1e-9 {
			return xy{}, false
		}
		// Right of the direction of travel on a y-down canvas.
		return xy{-dy / l, dx / l}, true
	}
	out := make([]xy, len(pts))
	for i := range pts {
		var n1, n2 xy
		ok1, ok2 := false, false
		for j := i; j > 0 && !ok1; j-- {
			n1, ok1 = normal(pts[j-1], pts[j])
		}
		for j := i; j < len(pts)-1 && !ok2; j++ {
			n2, ok2 = normal(pts[j], pts[j+1])
		}
		switch {
		case ok1 && !ok2:
			n2 = n1
		case ok2 && !ok1:
			n1 = n2
		case !ok1 && !ok2:
			out[i] = pts[i]
			continue
		}
		nx, ny := n1.X+n2.X, n1.Y+n2.Y
		l := math.Hypot(nx, ny)
		if l < 1e-9 { // a full reversal
			nx, ny, l = n1.X, n1.Y, 1
		}
		nx, ny = nx/l, ny/l
		k := d / math.Max(nx*n1.X+ny*n1.Y, 1.0/3)
		out[i] = xy{pts[i].X + nx*k, pts[i].Y + ny*k}
	}
	return out
}

// ringCentroid is the area centroid of a closed ring, or its vertex mean when it has no area.
func ringCentroid(pts []xy) (xy, float64) {
	var a, cx, cy float64
	n := len(pts)
	for i := 0; i < n; i++ {
		p, q := pts[i], pts[(i+1)%n]
		c := p.X*q.Y - q.X*p.Y
		a += c
		cx += (p.X + q.X) * c
		cy += (p.Y + q.Y) * c
	}
	if math.Abs(a) < 1e-9 {
		var m xy
		for _, p := range pts {
			m.X += p.X / float64(n)
			m.Y += p.Y / float64(n)
		}
		return m, 0
	}
	return xy{cx / (3 * a), cy / (3 * a)}, math.Abs(a / 2)
}

// niceLength is the largest 1, 2 or 5 × 10^k not above x.
func niceLength(x float64) float64 {
	if x <= 0 {
		return 1
	}
	k := math.Pow(10, math.Floor(math.Log10(x)))
	for _, f := range []float64{5, 2, 1} {
		if f*k <= x {
			return f * k
		}
	}
	return k
}
