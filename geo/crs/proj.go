//go:build proj

package crs

import (
	"fmt"
	"math"
	"strconv"
	"sync"

	"github.com/paulmach/orb"
	"github.com/twpayne/go-proj/v11"
)

// transform is the PROJ transformation of one code, or why there is none.
type transform struct {
	pj  *proj.PJ
	err error
}

var (
	transformsMu sync.Mutex
	transforms   = map[int]*transform{} // by EPSG code; never evicted: a run meets a few codes
)

// toWGS84 builds, once per code, PROJ's transformation from EPSG:epsg to EPSG:4326 normalised
// for visualisation (x longitude or easting, y latitude or northing, on both sides), each in a
// PROJ context of its own. The projection it returns is safe for concurrent use: go-proj locks
// the transformation's context around every call.
func toWGS84(epsg int) (orb.Projection, error) {
	transformsMu.Lock()
	t, ok := transforms[epsg]
	if !ok {
		t = newTransform(epsg)
		transforms[epsg] = t
	}
	transformsMu.Unlock()
	if t.err != nil {
		return nil, t.err
	}
	pj := t.pj
	return func(p orb.Point) orb.Point {
		c, err := pj.Forward(proj.NewCoord(p[0], p[1], 0, 0))
		x, y := c.X(), c.Y()
		// PROJ marks a point it cannot take with HUGE_VAL (+Inf) as well as an error number.
		if err != nil || math.IsInf(x, 0) || math.IsInf(y, 0) || math.IsNaN(x) || math.IsNaN(y) {
			return orb.Point{math.NaN(), math.NaN()}
		}
		return orb.Point{x, y}
	}, nil
}

// newTransform asks PROJ for the transformation of EPSG:epsg. A code that names no coordinate
// reference system of PROJ's database, or one that is not geographic or projected
// (checkHorizontal), is an error.
func newTransform(epsg int) *transform {
	if err := checkHorizontal(epsg); err != nil {
		return &transform{err: err}
	}
	ctx := proj.NewContext()
	name := "EPSG:" + strconv.Itoa(epsg)
	src, err := ctx.New(name)
	if err != nil {
		return &transform{err: fmt.Errorf("%s: PROJ cannot build it: %v", name, err)}
	}
	dst, err := ctx.New("EPSG:4326")
	if err != nil {
		return &transform{err: fmt.Errorf("EPSG:4326: PROJ cannot build WGS84 (is its database, proj.db, installed?): %v", err)}
	}
	raw, err := ctx.NewCRSToCRSFromPJ(src, dst, nil, "")
	if err != nil {
		return &transform{err: fmt.Errorf("%s: PROJ has no transformation to WGS84 longitude/latitude: %v", name, err)}
	}
	pj, err := raw.NormalizeForVisualization()
	if err != nil {
		return &transform{err: fmt.Errorf("%s: PROJ cannot put the transformation to WGS84 in longitude, latitude order: %v", name, err)}
	}
	return &transform{pj: pj}
}
