package geo

import (
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"testing/fstest"

	"github.com/paulmach/orb"

	"spanwright/geo/input"
)

const badDir = "../testdata/bad"

// TestParseBad reads each fixture under testdata/bad and checks the message names the file,
// the feature and the property, and that the error matches its sentinel.
func TestParseBad(t *testing.T) {
	t.Parallel()
	cases := []struct {
		file  string
		want  string
		is    error
		build bool // the problem shows only when the network is built
	}{
		{"not_json.geojson", "not_json.geojson: not JSON: unexpected end of JSON input", ErrNotJSON, false},
		{"not_collection.geojson", `not_collection.geojson: not a FeatureCollection: "type" is "Feature"; wrap it in a FeatureCollection`, ErrNotCollection, false},
		{"missing_id.geojson", `missing_id.geojson: feature #0 (no id): property "id": missing; every building needs a unique id`, ErrMissingProperty, false},
		{"duplicate_id.geojson", `duplicate_id.geojson: feature #1 "B-1": property "id": duplicate id "B-1": first used by ../testdata/bad/duplicate_id.geojson feature #0`, ErrDuplicateID, false},
		{"unknown_kind.geojson", `unknown_kind.geojson: feature #0 "T-1": property "kind": want one of "building", "pathway", "structure", "entrance", got string "tree"`, ErrBadValue, false},
		{"unknown_type.geojson", `unknown_type.geojson: feature #1 "P-1": property "type": want one of "duct", "tunnel", "aerial", "buried", "tray", got string "conduit"; did you mean "duct"? ("conduit" is the trade's other word for it)`, ErrBadValue, false},
		{"case_type.geojson", `case_type.geojson: feature #1 "P-1": property "type": want one of "duct", "tunnel", "aerial", "buried", "tray", got string "Tunnel"; did you mean "tunnel"? (letter case matters)`, ErrBadValue, false},
		{"typo_type.geojson", `typo_type.geojson: feature #1 "P-1": property "type": want one of "duct", "tunnel", "aerial", "buried", "tray", got string "aerail"; did you mean "aerial"?`, ErrBadValue, false},
		{"unknown_status.geojson", `unknown_status.geojson: feature #1 "P-1": property "status": want one of "existing", "proposed", got string "planned"; did you mean "proposed"? ("planned" is the trade's other word for it)`, ErrBadValue, false},
		{"unknown_emi.geojson", `unknown_emi.geojson: feature #1 "P-1": property "emi": want one of "none", "low", "high", got string "medium"`, ErrBadValue, false},
		{"plenum_on_duct.geojson", `plenum_on_duct.geojson: feature #1 "P-1": property "plenum": want true only on a tray pathway (type "tray"); this one is "duct"`, ErrBadValue, false},
		{"plenum_on_duct.geojson", `plenum_on_duct.geojson: feature #2 "P-2": property "plenum": want true or false (or 1 or 0), got string "yes"; write true or false without quotes`, ErrWrongType, false},
		{"unknown_method.geojson", `unknown_method.geojson: feature #1 "P-1": property "method": want one of "trench", "bore", "none", got string "tunnel-boring"`, ErrBadValue, false},
		// Tester 15 F12: none is for an existing pathway nothing may be built beside.
		{"aerial_method_none.geojson", `aerial_method_none.geojson: feature #1 "P-1": property "method": want "none" only on a pathway of type "duct", whose full ducts it keeps from getting more beside them; this one is "aerial"`, ErrBadValue, false},
		{"proposed_method_none.geojson", `proposed_method_none.geojson: feature #1 "P-1": property "method": want "trench" or "bore" on a proposed pathway (status "proposed"), got "none", which is for an existing pathway nothing may be built beside`, ErrBadValue, false},
		{"unknown_surface.geojson", `unknown_surface.geojson: feature #1 "P-1": property "surface": want one of "turf", "asphalt", "concrete", got string "gravel"`, ErrBadValue, false},
		{"unknown_role.geojson", `unknown_role.geojson: feature #0 "B-1": property "role": want one of "mc", "ic", got string "hub"`, ErrBadValue, false},
		{"wrong_property_type.geojson", `wrong_property_type.geojson: feature #0 "B-1": property "riser_m": want metres from 0 to 1000, got string "15" (write numbers without quotes)`, ErrWrongType, false},
		{"wrong_geometry.geojson", `wrong_geometry.geojson: feature #0 "B-1": geometry: want Polygon or MultiPolygon for a building, got LineString`, ErrBadGeometry, false},
		{"missing_geometry.geojson", `missing_geometry.geojson: feature #0 "P-1": geometry: missing (null or absent)`, ErrMissingProperty, false},
		// JSON has no NaN or Infinity literal; 1e999 is valid JSON that overflows a float64.
		{"nan_coord.geojson", `nan_coord.geojson: feature #0 "P-1": geometry: coordinate 1e999 is not a finite number`, ErrBadGeometry, false},
		{"out_of_range.geojson", `out_of_range.geojson: feature #1 "P-1": geometry: latitude 95.5 outside [-90, 90] (are longitude and latitude swapped?`, ErrBadGeometry, false},
		{"short_line.geojson", `short_line.geojson: feature #1 "P-1": geometry: want a line of at least two distinct positions, got 1 position(s)`, ErrBadGeometry, false},
		{"unclosed_ring.geojson", `unclosed_ring.geojson: feature #0 "B-1": geometry: ring 1: not closed: first position [10, 50], last [10, 50.0003]`, ErrBadGeometry, false},
		// GeoJSON 2008 §3.1: a linked CRS; spanwright reads only a named one.
		{"crs_member.geojson", `crs_member.geojson: crs: want {"type": "name", "properties": {"name": …}} naming an EPSG code ("EPSG:32617" or "urn:ogc:def:crs:EPSG::32617") or OGC CRS84, got "type" string "link"; or reproject to WGS84 longitude/latitude and drop "crs"`, ErrBadValue, false},
		{"projected.geojson", `projected.geojson: feature #0 "B-1": geometry: ring 1: got [500000, 5538000]: coordinates look projected (metres or feet?); reproject to WGS84 longitude/latitude, or name their system in a "crs" member`, ErrProjected, false},
		{"negative_spare.geojson", `negative_spare.geojson: feature #1 "P-17": property "spare_ducts": want an integer from 0 to 1000000, got -2`, ErrBadValue, false},
		{"fractional_spare.geojson", `fractional_spare.geojson: feature #1 "P-17": property "spare_ducts": want an integer from 0 to 1000000, got 1.5`, ErrBadValue, false},
		{"zero_duct.geojson", `zero_duct.geojson: feature #1 "P-1": property "duct_mm": want millimetres above 0 and at most 1000, got 0`, ErrBadValue, false},
		{"slash_in_id.geojson", `slash_in_id.geojson: feature #1 "P/1": property "id": want a pathway id without "/"`, ErrBadValue, false},
		{"unknown_entrance_building.geojson", `unknown_entrance_building.geojson: feature #2 "E-9": property "building": want the id of a building, got "B-9", which no feature has`, ErrUnknownReference, false},
		{"entrance_without_building.geojson", `entrance_without_building.geojson: feature #1 "E-1": property "building": missing`, ErrMissingProperty, false},
		{"two_mc.geojson", `two_mc.geojson: feature #1 "B-2": property "role": want at most one "mc" building in the campus, got a second: "B-1"`, ErrBadValue, false},
		// RFC 8259 §4: names within an object SHOULD be unique; readers keep either value.
		{"duplicate_property.geojson", `duplicate_property.geojson: feature #0 "B-1": property "riser_m": given twice, at line 2 and line 3; remove one`, ErrDuplicateKey, false},
		{"duplicate_geometry.geojson", `duplicate_geometry.geojson: feature #0 "B-1": member "geometry": given twice, at line 3 and line 4; remove one`, ErrDuplicateKey, false},
		{"duplicate_features.geojson", `duplicate_features.geojson: member "features": given twice, at line 2 and line 5; remove one`, ErrDuplicateKey, false},
		// JSON has no Infinity; 1e999 overflows a float64 (IEEE 754 binary64 max ~1.8e308).
		{"huge_riser.geojson", `huge_riser.geojson: feature #0 "B-1": property "riser_m": want metres from 0 to 1000, got 1e999`, ErrBadValue, false},
		// Tester 14 F5: a property spelt like riser_m, which the building lacks.
		{"near_property.geojson", `near_property.geojson: feature #0 "B-1": property "Riser_M": not read: did you mean "riser_m"? Without it the building is planned with a riser of 15 m; rename the property (property names are matched exactly)`, ErrUnknownProperty, false},
		// Tester 14 F4: an entrance on B-2's wall that names B-1, 0.0018° of longitude (129 m at 50° N) away.
		{"entrance_too_far.geojson", `entrance_too_far.geojson: feature #3 "E-1": property "building": entrance "E-1" is 129.1 m from the footprint of its building "B-1", farther than the longest lateral the design draws to a building (30 m, design: max_lateral_m)`, ErrBadValue, true},
		{"entrance_too_far.geojson", `; it lies on the wall of building "B-2" (../testdata/bad/entrance_too_far.geojson feature #1): the wrong building id?`, ErrBadValue, true},
		// Tester 14 F13: a file written on one line names both columns.
		{"duplicate_one_line.geojson", `duplicate_one_line.geojson: feature #0 "B-1": property "riser_m": given twice on line 1, at columns 112 and 127; remove one`, ErrDuplicateKey, false},
		// common practice, no published source: no duct is a metre across.
		{"huge_duct.geojson", `huge_duct.geojson: feature #1 "P-1": property "duct_mm": want millimetres above 0 and at most 1000, got 5000`, ErrBadValue, false},
	}
	for _, tc := range cases {
		t.Run(tc.file, func(t *testing.T) {
			t.Parallel()
			c, err := Load([]string{filepath.Join(badDir, tc.file)})
			if tc.build {
				if err != nil {
					t.Fatalf("%s: load: %v", tc.file, err)
				}
				_, err = Build(c, Options{})
			}
			if err == nil {
				t.Fatalf("%s: got no error, want %q", tc.file, tc.want)
			}
			var list *input.Problems
			if !errors.As(err, &list) {
				t.Fatalf("%s: got %T, want *input.Problems", tc.file, err)
			}
			var fe *input.Problem
			if !errors.As(err, &fe) {
				t.Errorf("%s: no *input.Problem in %v", tc.file, err)
			}
			if !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: got\n%v\nwant substring\n%s", tc.file, err, tc.want)
			}
			if !errors.Is(err, tc.is) {
				t.Errorf("%s: errors.Is(err, %v) is false", tc.file, tc.is)
			}
		})
	}
}

func TestParseBadEveryFixtureTested(t *testing.T) {
	t.Parallel()
	// Every fixture must be bad: Load or Build fails on each.
	ents, err := os.ReadDir(badDir)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range ents {
		c, err := Load([]string{filepath.Join(badDir, e.Name())})
		if err == nil {
			_, err = Build(c, Options{})
		}
		if err == nil {
			t.Errorf("%s: got no error", e.Name())
		}
	}
}

func TestParseSeveralProblemsAtOnce(t *testing.T) {
	t.Parallel()
	_, err := Load([]string{filepath.Join(badDir, "several_problems.geojson")})
	if err == nil {
		t.Fatal("got no error")
	}
	want := []string{
		`feature #1 (no id): property "id": missing`,
		`feature #2 "P-1": property "type": want one of`,
		`feature #2 "P-1": property "spare_ducts": want an integer from 0 to 1000000, got -1`,
		`feature #3 "B-1": property "id": duplicate id "B-1"`,
		`feature #4 "S-1": geometry: latitude 91 outside [-90, 90]`,
		`feature #5 (no id): property "building": want the id of a building, got "B-404"`,
		`feature #6 "B-3": property "role": want at most one "mc" building`,
	}
	msg := err.Error()
	for _, w := range want {
		if !strings.Contains(msg, w) {
			t.Errorf("missing %q in\n%s", w, msg)
		}
	}
	var list *input.Problems
	if !errors.As(err, &list) || list.Len() != len(want) {
		t.Errorf("got %d problems, want %d:\n%s", list.Len(), len(want), msg)
	}
}

func TestParseErrorCap(t *testing.T) {
	t.Parallel()
	var b strings.Builder
	b.WriteString(`{"type":"FeatureCollection","features":[`)
	for i := 0; i < input.MaxProblems+20; i++ {
		if i > 0 {
			b.WriteByte(',')
		}
		b.WriteString(`{"type":"Feature","properties":{"kind":"building"},"geometry":null}`)
	}
	b.WriteString(`]}`)
	_, err := Parse("many.geojson", []byte(b.String()))
	var list *input.Problems
	if !errors.As(err, &list) {
		t.Fatalf("got %v, want *input.Problems", err)
	}
	if len(list.List) != input.MaxProblems || list.Dropped == 0 {
		t.Errorf("kept %d, dropped %d; want %d kept and some dropped", len(list.List), list.Dropped, input.MaxProblems)
	}
	if !strings.Contains(err.Error(), "more errors)") {
		t.Errorf("message does not count the dropped problems")
	}
}

const validCampus = `{"type": "FeatureCollection", "features": [
 {"type": "Feature", "properties": {"id": "B-1", "name": "Tollgate Hall", "role": "mc", "riser_m": 22.5},
  "geometry": {"type": "Polygon", "coordinates": [[[10.0, 50.0], [10.0004, 50.0], [10.0004, 50.0003], [10.0, 50.0003], [10.0, 50.0]]]}},
 {"type": "Feature", "properties": {"id": "B-2"},
  "geometry": {"type": "MultiPolygon", "coordinates": [[[[10.0, 50.002], [10.0004, 50.002], [10.0004, 50.0023], [10.0, 50.0023], [10.0, 50.002]]]]}},
 {"type": "Feature", "id": 7, "properties": {"type": "tunnel", "status": "proposed", "spare_ducts": 3, "duct_mm": 50, "emi": "high", "surface": "asphalt", "group": "north bank"},
  "geometry": {"type": "LineString", "coordinates": [[10.0002, 50.0003, 101.5], [10.0002, 50.0003], [10.0002, 50.001], [10.0002, 50.002]]}},
 {"type": "Feature", "properties": {"id": "MH-1", "type": "maintenance-hole"}, "geometry": {"type": "Point", "coordinates": [10.0002, 50.001]}},
 {"type": "Feature", "properties": {"kind": "entrance", "building": "B-2", "note": null}, "geometry": {"type": "Point", "coordinates": [10.0002, 50.002]}}
]}`

func TestParseValid(t *testing.T) {
	t.Parallel()
	c, err := Parse("campus.geojson", []byte("\xef\xbb\xbf"+validCampus))
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Buildings) != 2 || len(c.Pathways) != 1 || len(c.Structures) != 1 || len(c.Entrances) != 1 {
		t.Fatalf("got %d buildings, %d pathways, %d structures, %d entrances; want 2, 1, 1, 1",
			len(c.Buildings), len(c.Pathways), len(c.Structures), len(c.Entrances))
	}
	b1, b2 := c.Buildings[0], c.Buildings[1]
	if b1.ID != "B-1" || b1.Name != "Tollgate Hall" || b1.Role != RoleMC || b1.RiserM != 22.5 || len(b1.Footprint) != 1 {
		t.Errorf("building 1: got %+v", b1)
	}
	if b2.Role != "" || b2.RiserM != DefaultRiserM || b2.Index != 1 || b2.File != "campus.geojson" {
		t.Errorf("building 2 defaults: got %+v", b2)
	}
	p := c.Pathways[0]
	wantP := Pathway{Source: Source{File: "campus.geojson", Index: 2}, ID: "7", Type: TypeTunnel, Status: StatusProposed,
		SpareDucts: 3, DuctMM: 50, EMI: EMIHigh, Surface: SurfaceAsphalt, Method: MethodTrench, Group: "north bank"}
	lines := p.Lines
	p.Lines = nil
	if !reflect.DeepEqual(p, wantP) {
		t.Errorf("pathway: got %+v, want %+v", p, wantP)
	}
	// The repeated first position (after dropping elevation) is removed.
	if len(lines) != 1 || len(lines[0]) != 3 || lines[0][0] != (orb.Point{10.0002, 50.0003}) {
		t.Errorf("pathway lines: got %v", lines)
	}
	if s := c.Structures[0]; s.ID != "MH-1" || s.Type != StructureMaintenanceHole {
		t.Errorf("structure: got %+v", s)
	}
	if e := c.Entrances[0]; e.ID != "" || e.Building != "B-2" {
		t.Errorf("entrance: got %+v", e)
	}
}

func TestParseDefaults(t *testing.T) {
	t.Parallel()
	c, err := Parse("d.geojson", []byte(`{"type":"FeatureCollection","features":[
		{"type":"Feature","properties":{"id":"P"},"geometry":{"type":"MultiLineString","coordinates":[[[1,2],[1,3]],[[2,2],[2,3]]]}}]}`))
	if err != nil {
		t.Fatal(err)
	}
	p := c.Pathways[0]
	if p.Type != TypeDuct || p.Status != StatusExisting || p.SpareDucts != DefaultSpareDucts ||
		p.DuctMM != DefaultDuctMM || p.EMI != EMINone || p.Surface != "" || p.Group != "P" || len(p.Lines) != 2 {
		t.Errorf("got %+v", p)
	}
}

func TestLoadAcrossFiles(t *testing.T) {
	t.Parallel()
	fsys := fstest.MapFS{
		"buildings.geojson": {Data: []byte(`{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"id":"B-1"},"geometry":{"type":"Polygon","coordinates":[[[10,50],[10.0004,50],[10.0004,50.0003],[10,50]]]}}]}`)},
		"pathways.geojson": {Data: []byte(`{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"id":"P-1"},"geometry":{"type":"LineString","coordinates":[[10.0002,50.0003],[10.0002,50.001]]}},
			{"type":"Feature","properties":{"kind":"entrance","building":"B-1"},"geometry":{"type":"Point","coordinates":[10.0002,50.0003]}}]}`)},
		"dup.geojson": {Data: []byte(`{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"id":"P-1"},"geometry":{"type":"LineString","coordinates":[[10.0003,50.0003],[10.0003,50.001]]}}]}`)},
	}
	c, err := LoadFS(fsys, []string{"buildings.geojson", "pathways.geojson"})
	if err != nil {
		t.Fatalf("entrance naming a building in another file: %v", err)
	}
	if len(c.Files) != 2 || c.Entrances[0].File != "pathways.geojson" {
		t.Errorf("got files %v, entrance %+v", c.Files, c.Entrances[0])
	}
	_, err = LoadFS(fsys, []string{"buildings.geojson", "pathways.geojson", "dup.geojson"})
	want := `dup.geojson: feature #0 "P-1": property "id": duplicate id "P-1": first used by pathways.geojson feature #0`
	if err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("duplicate across files: got %v, want %q", err, want)
	}
	_, err = LoadFS(fsys, []string{"missing.geojson"})
	if err == nil || !strings.Contains(err.Error(), "missing.geojson: read: file does not exist") {
		t.Errorf("missing file: got %v", err)
	}
}

func TestParseOddInput(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name, data, want string
	}{
		{"array", `[1,2]`, "not a FeatureCollection: want a JSON object, got an array"},
		{"no features", `{"type":"FeatureCollection"}`, `missing "features"`},
		{"features not array", `{"type":"FeatureCollection","features":{}}`, `want "features" to be an array, got an object`},
		{"feature not object", `{"type":"FeatureCollection","features":[3]}`, "feature #0 (no id): want a Feature object, got 3"},
		{"not a Feature", `{"type":"FeatureCollection","features":[{"type":"Point"}]}`, `want "type" "Feature", got string "Point"`},
		{"properties array", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":[]}]}`, `want "properties" to be an object`},
		{"multipoint", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":"M"},"geometry":{"type":"MultiPoint","coordinates":[[1,2]]}}]}`,
			"want Polygon, MultiPolygon, LineString, MultiLineString or Point"},
		{"string coordinate", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":"S"},"geometry":{"type":"Point","coordinates":["1",2]}}]}`,
			`want a position [longitude, latitude] of numbers, got [string "1", 2]`},
		{"fractional id property", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":3.5},"geometry":{"type":"Point","coordinates":[1,2]}}]}`,
			`feature #0 (no id): property "id": want a string or a whole number, got 3.5`},
		{"fractional id member", `{"type":"FeatureCollection","features":[{"type":"Feature","id":3.5,"properties":{},"geometry":{"type":"Point","coordinates":[1,2]}}]}`,
			`feature #0 (no id): property "id": want the Feature "id" member to be a string or a whole number, got 3.5`},
		{"empty id", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":""},"geometry":{"type":"Point","coordinates":[1,2]}}]}`,
			`feature #0 (no id): property "id": missing (an empty string counts as missing); every structure needs a unique id`},
		{"empty entrance building", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"kind":"entrance","building":""},"geometry":{"type":"Point","coordinates":[1,2]}}]}`,
			`feature #0 (no id): property "building": missing (an empty string counts as missing); an entrance names the id of its building`},
		{"empty polygon", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":"B"},"geometry":{"type":"Polygon","coordinates":[]}}]}`,
			`geometry: want an array of at least one ring, got an empty array`},
		{"short ring", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":"B"},"geometry":{"type":"Polygon","coordinates":[[[1,2],[1,3],[1,2]]]}}]}`,
			"ring 1: want a closed ring of at least 4 positions, got 3"},
		{"longitude", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":"S"},"geometry":{"type":"Point","coordinates":[181,2]}}]}`,
			"longitude 181 outside [-180, 180]"},
		{"entrance on a pathway id", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"id":"P"},"geometry":{"type":"LineString","coordinates":[[1,2],[1,3]]}},
			{"type":"Feature","properties":{"kind":"entrance","building":"P"},"geometry":{"type":"Point","coordinates":[1,2]}}]}`,
			`got "P", which is a pathway`},
		{"generated entrance id taken", `{"type":"FeatureCollection","features":[
			{"type":"Feature","properties":{"id":"B"},"geometry":{"type":"Polygon","coordinates":[[[1,2],[1,3],[2,3],[1,2]]]}},
			{"type":"Feature","properties":{"id":"E-B"},"geometry":{"type":"Point","coordinates":[1,2]}},
			{"type":"Feature","properties":{"kind":"entrance","building":"B"},"geometry":{"type":"Point","coordinates":[1,2]}}]}`,
			`generated id "E-B" is used by`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Parse("odd.geojson", []byte(tc.data))
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: got %v, want %q", tc.name, err, tc.want)
			}
		})
	}
}

func TestEntranceIDs(t *testing.T) {
	t.Parallel()
	got := EntranceIDs([]Entrance{{Building: "B"}, {ID: "X", Building: "B"}, {Building: "B"}, {Building: "C"}})
	want := []string{"E-B", "X", "E-B-2", "E-C"}
	if strings.Join(got, ",") != strings.Join(want, ",") {
		t.Errorf("got %v, want %v", got, want)
	}
}

// TestJoinParts: a pathway drawn as parts that meet end to end is one line; parts that meet
// three at a point, or not at all, stay apart.
func TestJoinParts(t *testing.T) {
	p := func(x float64) orb.Point { return orb.Point{x, 0} }
	q := func(y float64) orb.Point { return orb.Point{0, y} }
	cases := []struct {
		name string
		in   orb.MultiLineString
		want orb.MultiLineString
	}{
		{"tail to head", orb.MultiLineString{{p(0), p(1)}, {p(1), p(2)}}, orb.MultiLineString{{p(0), p(1), p(2)}}},
		{"tail to tail", orb.MultiLineString{{p(0), p(1)}, {p(2), p(1)}}, orb.MultiLineString{{p(0), p(1), p(2)}}},
		{"head to head", orb.MultiLineString{{p(1), p(0)}, {p(1), p(2)}}, orb.MultiLineString{{p(0), p(1), p(2)}}},
		{"three pieces, any order", orb.MultiLineString{{p(2), p(3)}, {p(0), p(1)}, {p(1), p(2)}}, nil},
		{"apart", orb.MultiLineString{{p(0), p(1)}, {p(2), p(3)}}, orb.MultiLineString{{p(0), p(1)}, {p(2), p(3)}}},
		{"three meet", orb.MultiLineString{{p(0), p(1)}, {p(1), p(2)}, {p(1), q(1)}}, orb.MultiLineString{{p(0), p(1)}, {p(1), p(2)}, {p(1), q(1)}}},
	}
	for _, tc := range cases {
		got := joinParts(tc.in)
		if tc.name == "three pieces, any order" {
			// One line through all four points, in either direction.
			if len(got) != 1 || len(got[0]) != 4 || (got[0][0] != p(0) && got[0][0] != p(3)) {
				t.Errorf("%s: got %v, want one line from 0 to 3", tc.name, got)
			}
			continue
		}
		if !reflect.DeepEqual(got, tc.want) {
			t.Errorf("%s: got %v, want %v", tc.name, got, tc.want)
		}
	}
}

// TestLoadRefusesUnboundedInput: a device never ends and a file over the cap is not read;
// both are reported as a problem of the file, named as given.
func TestLoadRefusesUnboundedInput(t *testing.T) {
	t.Parallel()
	ok := filepath.Join(badDir, "zero_duct.geojson")
	cases := []struct {
		name, path string
		max        int64
		want       string
		is         error
	}{
		// Linux null(4): /dev/zero reads as zero bytes without end.
		{"device", "/dev/zero", 0, "/dev/zero: read: not a regular file but a character device", input.ErrNotRegular},
		{"over the cap", ok, 100, ok + ": read: larger than the input limit of 100 bytes (raise it with --max-input-mb)", input.ErrTooLarge},
	}
	for _, tc := range cases {
		_, err := LoadLimit([]string{tc.path}, tc.max)
		var fe *input.Problem
		if !errors.As(err, &fe) || !errors.Is(err, tc.is) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want an input.Problem %q", tc.name, err, tc.want)
		}
	}
}

// TestEntranceIDsFollowPlace: two entrances of one building without ids get the same
// generated ids at the same places whichever comes first in the file.
func TestEntranceIDsFollowPlace(t *testing.T) {
	t.Parallel()
	bldg := `{"type":"Feature","properties":{"kind":"building","id":"A"},"geometry":{"type":"Polygon","coordinates":[[[7,46],[7.001,46],[7.001,46.001],[7,46.001],[7,46]]]}}`
	west := `{"type":"Feature","properties":{"kind":"entrance","building":"A"},"geometry":{"type":"Point","coordinates":[7,46.0005]}}`
	east := `{"type":"Feature","properties":{"kind":"entrance","building":"A"},"geometry":{"type":"Point","coordinates":[7.001,46.0005]}}`
	idAt := func(order ...string) map[float64]string {
		c, err := Parse("t.geojson", []byte(`{"type":"FeatureCollection","features":[`+strings.Join(order, ",")+`]}`))
		if err != nil {
			t.Fatal(err)
		}
		out := map[float64]string{}
		for i, id := range EntranceIDs(c.Entrances) {
			out[c.Entrances[i].Point[0]] = id
		}
		return out
	}
	a, b := idAt(bldg, west, east), idAt(east, bldg, west)
	if !reflect.DeepEqual(a, b) {
		t.Errorf("generated entrance ids follow feature order: %v, then %v", a, b)
	}
}

// TestJoinPartsLinear: thousands of pieces, stars of three and a shuffled chain, are joined
// in one pass (the first version restarted its scan after every join: minutes for 8,000).
func TestJoinPartsLinear(t *testing.T) {
	t.Parallel()
	var mls orb.MultiLineString
	for i := 0; i < 2000; i++ { // stars: three pieces meeting at one point stay apart
		c := orb.Point{float64(i), 10}
		mls = append(mls, orb.LineString{c, {float64(i), 11}}, orb.LineString{c, {float64(i) + 0.3, 11}}, orb.LineString{c, {float64(i) - 0.3, 11}})
	}
	chain := make([]orb.LineString, 4000)
	for i := range chain {
		chain[i] = orb.LineString{{float64(i), 0}, {float64(i + 1), 0}}
	}
	for i := range chain { // a fixed shuffle
		j := (i * 7919) % len(chain)
		chain[i], chain[j] = chain[j], chain[i]
	}
	mls = append(mls, chain...)
	got := joinParts(mls)
	if len(got) != 6001 {
		t.Fatalf("got %d lines, want 6,000 star pieces and one chain", len(got))
	}
	long := 0
	for _, l := range got {
		long = max(long, len(l))
	}
	if long != 4001 {
		t.Errorf("the longest line has %d points, want 4,001", long)
	}
}

// TestLoadSameFileTwice: one campus file named twice (here by two spellings of its path) is
// one problem saying so, not a duplicate-id error for every feature.
func TestLoadSameFileTwice(t *testing.T) {
	t.Parallel()
	p := filepath.Join(badDir, "zero_duct.geojson")
	_, err := Load([]string{p, filepath.Join(badDir, ".", "zero_duct.geojson")})
	if err == nil || !strings.Contains(err.Error(), "given twice") || strings.Contains(err.Error(), "duplicate id") {
		t.Errorf("got %v, want one problem saying the file is given twice", err)
	}
}
