package report

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"spanwright/geo"
	"spanwright/route"
)

// The core's map. On a campus whose drawn extent is much larger than the part where most of its
// buildings stand (a link or two running kilometres out to a pump house or a farm), the whole
// campus's map draws that part as a strip, its labels on top of one another (tester 13's F-E).
// The rule: the core is the box of the footprints of the buildings nearest the campus's middle
// (the median of the buildings' centres, longitude and latitude apart, so that far buildings do
// not move it), by distance from it, ties by id: all but the farthest tenth (1 - coreShare,
// rounded down, at least one left out); padded by corePadM and cut to the whole extent.
// When the core, fitted to the map's size, is drawn at least coreZoom times the scale of the
// whole campus, the report draws it as a second map below the first, which outlines it. Common
// practice, no published source (a drawing set's key plan and enlarged plan).
const (
	coreShare        = 0.9 // of the buildings in the core: all but a tenth, at least one out
	coreMinBuildings = 4   // fewer in the core: no core map
	coreZoom         = 2.5 // the least scale of the core's map over the whole's
	corePadM         = 40.0
)

// coreView is the core's map and what its caption says.
type coreView struct {
	Map                   mapView
	Buildings, Of         int
	Zoom                  string // the core's scale over the whole's, e.g. "4.8"
	WidthText, HeightText string
}

// coreBounds is the core's box (see the rule above), its buildings' count, and whether the
// report draws it: false when the campus has too few buildings or the core is not drawn
// coreZoom times larger than the whole.
func coreBounds(r *route.Result, whole bounds) (bounds, int, bool) {
	bs := r.Site.Campus.Buildings
	if !whole.any || len(bs) < coreMinBuildings {
		return bounds{}, 0, false
	}
	type centre struct {
		id       string
		lon, lat float64
		box      bounds
	}
	cs := make([]centre, 0, len(bs))
	for _, bd := range bs {
		var b bounds
		for _, poly := range bd.Footprint {
			for _, ring := range poly {
				for _, q := range ring {
					b.add(q[0], q[1])
				}
			}
		}
		if b.any {
			cs = append(cs, centre{id: bd.ID, lon: (b.minLon + b.maxLon) / 2, lat: (b.minLat + b.maxLat) / 2, box: b})
		}
	}
	k := len(cs) - max(1, int(math.Floor((1-coreShare)*float64(len(cs))+1e-9)))
	if k < coreMinBuildings {
		return bounds{}, 0, false
	}
	median := func(v []float64) float64 {
		slices.Sort(v)
		n := len(v)
		if n%2 == 1 {
			return v[n/2]
		}
		return (v[n/2-1] + v[n/2]) / 2
	}
	lons, lats := make([]float64, len(cs)), make([]float64, len(cs))
	for i, c := range cs {
		lons[i], lats[i] = c.lon, c.lat
	}
	mid := geo.NewLocal(median(lons), median(lats))
	dist := func(c centre) float64 {
		x, y := mid.XY(c.lon, c.lat)
		return math.Hypot(x, y)
	}
	slices.SortStableFunc(cs, func(a, b centre) int { return cmp.Or(cmp.Compare(dist(a), dist(b)), cmp.Compare(a.id, b.id)) })
	var core bounds
	for _, c := range cs[:k] {
		core.add(c.box.minLon, c.box.minLat)
		core.add(c.box.maxLon, c.box.maxLat)
	}
	padLon, padLat := corePadM/mid.MPerDegX, corePadM/mid.MPerDegY
	core.minLon, core.maxLon = math.Max(core.minLon-padLon, whole.minLon), math.Min(core.maxLon+padLon, whole.maxLon)
	core.minLat, core.maxLat = math.Max(core.minLat-padLat, whole.minLat), math.Min(core.maxLat+padLat, whole.maxLat)
	zoom := newProjection(core, mapWidthPx, mapMaxHeightPx, mapMarginPx).pxPerM / newProjection(whole, mapWidthPx, mapMaxHeightPx, mapMarginPx).pxPerM
	if zoom < coreZoom {
		return bounds{}, 0, false
	}
	return core, k, true
}

// coreCaption fills the caption's figures of v, drawn from core at scale zoom over the whole.
func (v *coreView) caption(core bounds, zoom float64, opt Options) {
	l := geo.NewLocal((core.minLon+core.maxLon)/2, (core.minLat+core.maxLat)/2)
	v.Zoom = fmt.Sprintf("%.1f", zoom)
	v.WidthText = opt.lengthU((core.maxLon - core.minLon) * l.MPerDegX)
	v.HeightText = opt.lengthU((core.maxLat - core.minLat) * l.MPerDegY)
}
