package geo

import (
	"errors"
	"reflect"
	"strings"
	"testing"

	"spanwright/geo/input"
)

// TestCRSCode reads the forms a GeoJSON "crs" member names a system in: GeoJSON 2008 §3.1.1
// (named CRS, "EPSG:n"), OGC URNs (OGC 07-092r3 §7.1, urn:ogc:def:crs:EPSG:[version]:n, what
// GDAL's ogr2ogr writes) and OGC http URIs (OGC 09-048r5 §6); OGC CRS84 is WGS84
// longitude/latitude (RFC 7946 §4).
func TestCRSCode(t *testing.T) {
	t.Parallel()
	named := func(name string) string {
		return `{"type": "name", "properties": {"name": "` + name + `"}}`
	}
	for _, tc := range []struct {
		member string
		code   int
		err    string
	}{
		{named("EPSG:32630"), 32630, ""},
		{named("epsg:2263"), 2263, ""},
		{named("urn:ogc:def:crs:EPSG::32630"), 32630, ""},
		{named("urn:ogc:def:crs:EPSG:6.6:27700"), 27700, ""},
		{named("http://www.opengis.net/def/crs/EPSG/0/3006"), 3006, ""},
		{named("EPSG:4326"), 4326, ""},
		{named("urn:ogc:def:crs:OGC:1.3:CRS84"), 4326, ""},
		{named("urn:ogc:def:crs:OGC::CRS84"), 4326, ""},
		{named("http://www.opengis.net/def/crs/OGC/1.3/CRS84"), 4326, ""},
		{named("OGC:CRS84"), 4326, ""},
		{named("EPSG:0"), 0, `got string "EPSG:0": not a positive EPSG code`},
		{named("ESRI:102100"), 0, `got string "ESRI:102100"; or reproject`},
		{named("urn:ogc:def:crs:EPSG::32630x"), 0, `got string "urn:ogc:def:crs:EPSG::32630x"`},
		{`{"type": "link", "properties": {"href": "http://example.com/crs/42"}}`, 0, `got "type" string "link"`},
		{`{"type": "name", "properties": {}}`, 0, `got "properties" without a "name" string`},
		{`{"type": "name"}`, 0, `got "properties" without a "name" string`},
		{`null`, 0, "got null"},
		{`"EPSG:32630"`, 0, `got string "EPSG:32630"`},
	} {
		code, err := crsCode([]byte(tc.member))
		if tc.err == "" {
			if err != nil || code != tc.code {
				t.Errorf("%s: got %d, %v; want %d", tc.member, code, err, tc.code)
			}
			continue
		}
		if err == nil {
			t.Errorf("%s: got %d, want an error", tc.member, code)
			continue
		}
		if msg := err.Error(); !strings.HasPrefix(msg, wantCRS) || !strings.Contains(msg, tc.err) || !errors.Is(err, ErrBadValue) {
			t.Errorf("%s: got %q, want %q then %q", tc.member, msg, wantCRS, tc.err)
		}
	}
}

// TestCRS84MemberChangesNothing: a file that names WGS84 (CRS84 or EPSG:4326) in a "crs"
// member reads as the same file without it (RFC 7946 §4: WGS84 longitude/latitude is
// GeoJSON's system), in any build.
func TestCRS84MemberChangesNothing(t *testing.T) {
	t.Parallel()
	const feats = `"features": [
 {"type": "Feature", "properties": {"kind": "building", "id": "B-1", "role": "mc"}, "geometry": {"type": "Polygon", "coordinates": [[[10.0, 50.0], [10.0004, 50.0], [10.0004, 50.0003], [10.0, 50.0003], [10.0, 50.0]]]}},
 {"type": "Feature", "properties": {"kind": "pathway", "id": "P-1"}, "geometry": {"type": "LineString", "coordinates": [[10.0002, 50.0001], [10.001, 50.0001]]}}
]}`
	want, err := Parse("a.geojson", []byte(`{"type": "FeatureCollection", `+feats))
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"urn:ogc:def:crs:OGC:1.3:CRS84", "EPSG:4326"} {
		got, err := Parse("a.geojson", []byte(`{"type": "FeatureCollection", "crs": {"type": "name", "properties": {"name": "`+name+`"}}, `+feats))
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%s: the campus differs from the file without a crs member", name)
		}
	}
}

// TestBadCRSMemberStillReadsFeatures: a crs member that names nothing usable is one problem
// of the file, and the features are still checked (all problems at once).
func TestBadCRSMemberStillReadsFeatures(t *testing.T) {
	t.Parallel()
	_, err := Parse("a.geojson", []byte(`{"type": "FeatureCollection", "crs": {"type": "name", "properties": {"name": "ESRI:102100"}}, "features": [
 {"type": "Feature", "properties": {"kind": "pathway", "id": "P-1", "status": "planned"}, "geometry": {"type": "LineString", "coordinates": [[10.0002, 50.0001], [10.001, 50.0001]]}}
]}`))
	var list *input.Problems
	if !errors.As(err, &list) || len(list.List) != 2 {
		t.Fatalf("got %v, want two problems", err)
	}
	if got := list.List[0].Error(); !strings.HasPrefix(got, `a.geojson: crs: want {"type": "name"`) {
		t.Errorf("first problem %q, want the file's crs member", got)
	}
	if got := list.List[1].Error(); !strings.HasPrefix(got, `a.geojson: feature #0 "P-1": property "status"`) {
		t.Errorf("second problem %q, want the feature's status", got)
	}
}
