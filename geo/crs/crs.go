// Package crs takes coordinates given in a named coordinate reference system to WGS84
// longitude/latitude, the only system the rest of spanwright works in.
//
// EPSG:4326 and OGC CRS84 need no transformation. Every other system is transformed with PROJ,
// the reference implementation, which needs cgo and Debian's libproj-dev: build with
// `-tags proj`. A default build (only Go) reports ErrNoPROJ for a projected input and says what
// to install.
package crs

import (
	"errors"
	"fmt"

	"github.com/paulmach/orb"
)

// WGS84 is the EPSG code of WGS84 longitude/latitude.
const WGS84 = 4326

// ErrNoPROJ is returned for a projected system by a build without PROJ.
var ErrNoPROJ = errors.New("this spanwright was built without PROJ")

// ToWGS84 returns the projection that takes a point in the system of the EPSG code (x east or
// longitude, y north or latitude, whatever the system's declared axis order) to WGS84
// longitude/latitude. A point the transformation cannot take comes back as NaN, which the
// reader's coordinate checks report. Code 4326 gives the identity.
func ToWGS84(epsg int) (orb.Projection, error) {
	if epsg == WGS84 {
		return func(p orb.Point) orb.Point { return p }, nil
	}
	if epsg <= 0 {
		return nil, fmt.Errorf("EPSG code %d: want a positive code", epsg)
	}
	return toWGS84(epsg)
}
