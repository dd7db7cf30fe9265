//go:build !proj

package crs

import (
	"fmt"

	"github.com/paulmach/orb"
)

func toWGS84(epsg int) (orb.Projection, error) {
	return nil, fmt.Errorf("EPSG:%d is not WGS84 longitude/latitude: %w; install libproj-dev (Debian) and build with `go build -tags proj ./cmd/spanwright`, or reproject the input to EPSG:4326 first", epsg, ErrNoPROJ)
}
