//go:build !proj

package geo

import (
	"errors"
	"strings"
	"testing"

	"spanwright/geo/crs"
	"spanwright/geo/input"
)

// TestProjectedCRSWithoutPROJ: a build without PROJ meets a file in UTM zone 30N (as GDAL's
// ogr2ogr writes it): one problem of the file, at its crs member, saying what to install and
// how to build, which unwraps to crs.ErrNoPROJ; its features are not read (they would each
// look projected).
func TestProjectedCRSWithoutPROJ(t *testing.T) {
	t.Parallel()
	_, err := Parse("utm.geojson", []byte(`{"type": "FeatureCollection", "crs": {"type": "name", "properties": {"name": "urn:ogc:def:crs:EPSG::32630"}}, "features": [
 {"type": "Feature", "properties": {"kind": "pathway", "id": "P-1"}, "geometry": {"type": "LineString", "coordinates": [[450299.19, 5800410.24], [450359.30, 5800409.63]]}}
]}`))
	var list *input.Problems
	if !errors.As(err, &list) || len(list.List) != 1 {
		t.Fatalf("got %v, want one problem", err)
	}
	if !errors.Is(err, crs.ErrNoPROJ) {
		t.Errorf("%v: want it to unwrap to crs.ErrNoPROJ", err)
	}
	msg := err.Error()
	if !strings.HasPrefix(msg, "utm.geojson: crs: EPSG:32630 is not WGS84 longitude/latitude: ") {
		t.Errorf("%q: want the file, its crs member and the code first", msg)
	}
	for _, want := range []string{"libproj-dev", "go build -tags proj ./cmd/spanwright", "reproject the input to EPSG:4326"} {
		if !strings.Contains(msg, want) {
			t.Errorf("%q: want it to say %q", msg, want)
		}
	}
}
