package geo

import (
	"errors"
	"fmt"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/planar"

	"spanwright/geo/input"
)

// gisCampus is a FeatureCollection of features, each a JSON object without its "type".
func gisCampus(features ...string) []byte {
	for i, f := range features {
		features[i] = `{"type":"Feature",` + f + `}`
	}
	return []byte(`{"type":"FeatureCollection","features":[` + strings.Join(features, ",\n") + `]}`)
}

const (
	gisSquare = `"geometry":{"type":"Polygon","coordinates":[[[10,50],[10.001,50],[10.001,50.001],[10,50.001],[10,50]]]}`
	gisLine   = `"geometry":{"type":"LineString","coordinates":[[10.0005,50.001],[10.0005,50.002]]}`
	gisPoint  = `"geometry":{"type":"Point","coordinates":[10.0005,50.002]}`
)

// TestEmptyStringIsAbsent: a shapefile's dBASE table has no NULL, so a GIS export from one
// writes "" for every empty text attribute (ESRI Shapefile Technical Description, 1998, and
// dBASE's field types, from memory). Every optional property given as "" reads as the
// campus without it, as null does.
func TestEmptyStringIsAbsent(t *testing.T) {
	t.Parallel()
	read := func(bld, pw, st string) *Campus {
		t.Helper()
		c, err := Parse("c.geojson", gisCampus(
			`"properties":{"id":"B"`+bld+`},`+gisSquare,
			`"properties":{"id":"P"`+pw+`},`+gisLine,
			`"properties":{"id":"S"`+st+`},`+gisPoint))
		if err != nil {
			t.Fatalf("got %v", err)
		}
		c.Files = nil
		for i := range c.Buildings {
			c.Buildings[i].Source = Source{}
		}
		for i := range c.Pathways {
			c.Pathways[i].Source = Source{}
		}
		for i := range c.Structures {
			c.Structures[i].Source = Source{}
		}
		c.warns = nil // TestBlankDefaultsWarned
		return c
	}
	want := read("", "", "")
	empty := read(`,"kind":"","name":"","role":"","riser_m":"","transit":""`,
		`,"kind":"","type":"","status":"","spare_ducts":"","duct_mm":"","emi":"","surface":"","method":"","plenum":"","group":""`,
		`,"kind":"","type":""`)
	null := read(`,"kind":null,"name":null,"role":null,"riser_m":null,"transit":null`,
		`,"kind":null,"type":null,"status":null,"spare_ducts":null,"duct_mm":null,"emi":null,"surface":null,"method":null,"plenum":null,"group":null`,
		`,"kind":null,"type":null`)
	if !reflect.DeepEqual(empty, want) {
		t.Errorf("every property \"\":\ngot  %+v\nwant %+v", empty, want)
	}
	if !reflect.DeepEqual(null, want) {
		t.Errorf("every property null:\ngot  %+v\nwant %+v", null, want)
	}
	if b := want.Buildings[0]; b.Role != "" || b.RiserM != DefaultRiserM || b.Transit {
		t.Errorf("building defaults: got %+v", b)
	}
	if p := want.Pathways[0]; p.Type != TypeDuct || p.Status != StatusExisting || p.EMI != EMINone || p.Surface != "" ||
		p.Method != MethodTrench || p.MethodSet || p.Group != "P" || p.SpareDucts != DefaultSpareDucts {
		t.Errorf("pathway defaults: got %+v", p)
	}
}

// TestRequiredEmptyStringRefused: "" for a property that is required (a feature's id, an
// entrance's building) is refused as missing, and the message says why.
func TestRequiredEmptyStringRefused(t *testing.T) {
	t.Parallel()
	_, err := Parse("c.geojson", gisCampus(
		`"properties":{"id":""},`+gisSquare,
		`"properties":{"kind":"entrance","building":""},`+gisPoint))
	for _, want := range []string{
		`c.geojson: feature #0 (no id): property "id": missing (an empty string counts as missing); every building needs a unique id`,
		`c.geojson: feature #1 (no id): property "building": missing (an empty string counts as missing); an entrance names the id of its building`,
	} {
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("got %v, want %q", err, want)
		}
	}
}

// TestNumericIDs: GIS exports write integer asset ids as numbers (a key built on ArcGIS's
// OBJECTID, say: common practice, no published source). A whole number is the id as its
// decimal text, given as the "id" property or as the Feature's "id" member (RFC 7946 §3.2:
// "either a JSON string or number"), and an entrance names its building the same way.
func TestNumericIDs(t *testing.T) {
	t.Parallel()
	c, err := Parse("c.geojson", gisCampus(
		`"properties":{"id":1021},`+gisSquare,
		`"id":5068,"properties":{},`+gisLine,
		`"properties":{"id":7.0},`+gisPoint,
		`"properties":{"kind":"entrance","building":1021},"geometry":{"type":"Point","coordinates":[10.0005,50.001]}`))
	if err != nil {
		t.Fatal(err)
	}
	if got := []string{c.Buildings[0].ID, c.Pathways[0].ID, c.Structures[0].ID, c.Entrances[0].Building}; !reflect.DeepEqual(got, []string{"1021", "5068", "7", "1021"}) {
		t.Errorf("got ids %q, want 1021 5068 7 1021", got)
	}
	// The same number as text and as a number is one id: the second is a duplicate.
	_, err = Parse("c.geojson", gisCampus(`"properties":{"id":"1021"},`+gisSquare, `"properties":{"id":1021},`+gisLine))
	if want := `feature #1 "1021": property "id": duplicate id "1021"`; err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("got %v, want %q", err, want)
	}
	_, err = Parse("c.geojson", gisCampus(`"properties":{"id":true},`+gisSquare))
	if want := `feature #0 (no id): property "id": want a string or a whole number, got true`; err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("got %v, want %q", err, want)
	}
}

// TestIDMemberDiffers: when a feature's "id" property and its Feature "id" member differ,
// the property is the id, and Build says so: one warning per feature, or one per file when
// a file has more than idWarningsEach such features.
func TestIDMemberDiffers(t *testing.T) {
	t.Parallel()
	warnings := func(data []byte) []string {
		t.Helper()
		c, err := Parse("c.geojson", data)
		if err != nil {
			t.Fatal(err)
		}
		n, err := Build(c, Options{})
		if err != nil {
			t.Fatal(err)
		}
		var out []string
		for _, w := range n.Warnings {
			if strings.Contains(w.Message, `"id" member`) {
				out = append(out, w.Feature+": "+w.Message)
			}
		}
		return out
	}
	got := warnings(gisCampus(`"id":17,"properties":{"id":"B"},`+gisSquare, `"id":"P","properties":{"id":"P"},`+gisLine))
	want := []string{`#0 (B): the Feature's "id" member 17 differs from its "id" property "B"; the property is the feature's id`}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("one feature: got %q, want %q", got, want)
	}
	var fs []string
	fs = append(fs, `"id":"XB","properties":{"id":"B"},`+gisSquare)
	for i := range 4 {
		fs = append(fs, fmt.Sprintf(`"id":"XP%d","properties":{"id":"P%d"},"geometry":{"type":"LineString","coordinates":[[10.0005,50.001],[10.000%d,50.002]]}`, i, i, i+5))
	}
	got = warnings(gisCampus(fs...))
	want = []string{`#0 (B): the Feature's "id" member "XB" differs from its "id" property "B", and so do those of 4 more features of this file; the property is each feature's id`}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("five features: got %q, want %q", got, want)
	}
}

// TestBlankDefaultsWarned: a property the plan prices or routes by, given as "" (a
// shapefile's empty text field, which may mean "unknown"), takes its default as if absent,
// and one warning per file, kind and property says so: a blank status taken as existing duct
// (no new work priced) must not be silent. Name and group blanks are not warned of.
// Common practice, no published source.
func TestBlankDefaultsWarned(t *testing.T) {
	t.Parallel()
	var fs []string
	fs = append(fs, `"properties":{"id":"B","riser_m":"","name":""},`+gisSquare)
	for i := range 3 {
		fs = append(fs, fmt.Sprintf(`"properties":{"id":"P%d","status":"","group":""},"geometry":{"type":"LineString","coordinates":[[10.0005,50.001],[10.000%d,50.002]]}`, i, i+5))
	}
	c, err := Parse("c.geojson", gisCampus(fs...))
	if err != nil {
		t.Fatal(err)
	}
	n, err := Build(c, Options{})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, w := range n.Warnings {
		if strings.Contains(w.Message, "empty string") {
			got = append(got, w.Feature+": "+w.Message)
		}
	}
	want := []string{ // warnings are listed by what they say
		`#1 (P0): 3 pathways of this file give "status" as an empty string, taken as absent: status "existing" (no new work is priced on it); give the value if that is not what the drawing means`,
		`#0 (B): this feature gives "riser_m" as an empty string, taken as absent: a riser of 15 m; give the value if that is not what the drawing means`,
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("got %q\nwant %q", got, want)
	}
}

// TestFlagNumbers: a GeoPackage stores a BOOLEAN as an INTEGER 0 or 1 (OGC GeoPackage 1.3,
// Table 1), and shapefile-born exports write 1 and 0 too; every source reads them as false
// and true. Text is refused, with a hint.
func TestFlagNumbers(t *testing.T) {
	t.Parallel()
	c, err := Parse("c.geojson", gisCampus(`"properties":{"id":"B","transit":1},`+gisSquare,
		`"properties":{"id":"C","transit":0},"geometry":{"type":"Polygon","coordinates":[[[11,50],[11.001,50],[11.001,50.001],[11,50]]]}`))
	if err != nil {
		t.Fatal(err)
	}
	if !c.Buildings[0].Transit || c.Buildings[1].Transit {
		t.Errorf("transit 1, 0: got %v, %v", c.Buildings[0].Transit, c.Buildings[1].Transit)
	}
	for v, want := range map[string]string{
		`2`:   `property "transit": want true or false (or 1 or 0), got 2`,
		`"Y"`: `property "transit": want true or false (or 1 or 0), got string "Y"; write true or false without quotes`,
		`"T"`: `got string "T"; write true or false without quotes`,
	} {
		_, err := Parse("c.geojson", gisCampus(`"properties":{"id":"B","transit":`+v+`},`+gisSquare))
		if err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("transit %s: got %v, want %q", v, err, want)
		}
	}
}

// TestTradeWordHints: a value refused is answered with the value the trade word means, never
// with one it is only spelt like. Maintenance hole is ANSI/TIA-758's and BICSI's term for
// what NFPA 70 Article 110 Part V calls a manhole (from memory); "conduit", "overhead",
// "direct buried", "planned" are everyday site words (common practice, no published source).
func TestTradeWordHints(t *testing.T) {
	t.Parallel()
	structure := func(typ string) []byte {
		return gisCampus(`"properties":{"id":"S","kind":"structure","type":"` + typ + `"},` + gisPoint)
	}
	pathway := func(key, v string) []byte {
		return gisCampus(`"properties":{"id":"P","` + key + `":"` + v + `"},` + gisLine)
	}
	building := func(role string) []byte {
		return gisCampus(`"properties":{"id":"B","role":"` + role + `"},` + gisSquare)
	}
	cases := []struct {
		name string
		data []byte
		want string // the hint after the value
	}{
		{"manhole", structure("manhole"), `got string "manhole"; did you mean "maintenance-hole"? ("manhole" is the trade's other word for it)`},
		{"MH", structure("MH"), `got string "MH"; did you mean "maintenance-hole"?`},
		{"Manhole", structure("Manhole"), `got string "Manhole"; did you mean "maintenance-hole"?`},
		{"manhole misspelt", structure("manhol"), `got string "manhol"; did you mean "maintenance-hole"? ("manhole" is the trade's other word for it)`},
		{"HH", structure("HH"), `got string "HH"; did you mean "handhole"?`},
		{"hand hole", structure("hand hole"), `got string "hand hole"; did you mean "handhole"?`},
		{"pull box", structure("pull box"), `got string "pull box"; did you mean "pull-box"?`},
		{"maintenance hole", structure("Maintenance Hole"), `got string "Maintenance Hole"; did you mean "maintenance-hole"?`},
		{"vault", structure("vault"), `got string "vault"; a vault large enough for a person to enter is a "maintenance-hole", a smaller one a "handhole"`},
		// A pole is the junction of aerial spans, not a structure (Meeting.Open).
		{"pole", structure("pole"), `got string "pole"; ` + poleWhy},
		{"utility pole", structure("Utility Pole"), `got string "Utility Pole"; ` + poleWhy},
		{"pole line pathway", pathway("type", "pole line"), `got string "pole line"; did you mean "aerial"?`},
		{"conduit", pathway("type", "conduit"), `got string "conduit"; did you mean "duct"?`},
		{"duct bank", pathway("type", "Duct Bank"), `got string "Duct Bank"; did you mean "duct"?`},
		{"overhead", pathway("type", "overhead"), `got string "overhead"; did you mean "aerial"?`},
		{"direct buried", pathway("type", "direct buried"), `got string "direct buried"; did you mean "buried"?`},
		{"direct-buried", pathway("type", "direct-buried"), `got string "direct-buried"; did you mean "buried"?`},
		{"planned", pathway("status", "planned"), `got string "planned"; did you mean "proposed"?`},
		{"abandoned", pathway("status", "abandoned"), `got string "abandoned"; a pathway that can carry no cable is left out of the campus`},
		{"HDD", pathway("method", "HDD"), `got string "HDD"; did you mean "bore"?`},
		{"grass", pathway("surface", "grass"), `got string "grass"; did you mean "turf"?`},
		{"typo", pathway("type", "aerail"), `got string "aerail"; did you mean "aerial"?`},
		// Tester 14 F17: MDF and IDF are the everyday words for the main and intermediate
		// cross-connect of ANSI/TIA-568 (common practice, no published source).
		{"idf", building("idf"), `got string "idf"; did you mean "ic"? ("idf" is the trade's other word for it)`},
		{"MDF", building("MDF"), `got string "MDF"; did you mean "mc"? ("MDF" is the trade's other word for it)`},
		{"campus distributor", building("Campus Distributor"), `got string "Campus Distributor"; did you mean "mc"?`},
		{"hc", building("HC"), `got string "HC"; ` + hcWhy},
		// A structure type said of a pathway: no structure value is offered for it.
		{"manhole pathway", pathway("type", "manhole"), `got string "manhole"` + "\n"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			_, err := Parse("c.geojson", tc.data)
			if err == nil || !strings.Contains(err.Error()+"\n", tc.want) {
				t.Errorf("got %v, want %q", err, tc.want)
			}
		})
	}
}

// TestSameFootprints: a building exported twice under two ids (one footprint, or nearly)
// is warned about on the smaller, naming the other; buildings that share a wall, or overlap
// by less than SameFootprintShare of the smaller, are not (common practice, no published
// source).
func TestSameFootprints(t *testing.T) {
	t.Parallel()
	square := func(id string, x0, y0, x1, y1 float64) string {
		return fmt.Sprintf(`"properties":{"id":%q},"geometry":{"type":"Polygon","coordinates":[[[%g,%g],[%g,%g],[%g,%g],[%g,%g],[%g,%g]]]}`,
			id, x0, y0, x1, y0, x1, y1, x0, y1, x0, y0)
	}
	warned := func(fs ...string) []string {
		t.Helper()
		c, err := Parse("c.geojson", gisCampus(append(fs, `"properties":{"id":"P"},"geometry":{"type":"LineString","coordinates":[[10,49.999],[10.01,49.999]]}`)...))
		if err != nil {
			t.Fatal(err)
		}
		var out []string
		for _, w := range sameFootprints(c.Buildings) {
			out = append(out, w.id+": "+w.msg)
		}
		return out
	}
	const tail = `: one building drawn twice (an old polygon left by a re-survey or a GIS join)? Both are planned, each with its own links and entrances; remove the one that is not a building, or draw one building's parts as one MultiPolygon`
	// 0.001° is about 72 m east-west and 111 m north-south at 50° N.
	cases := []struct {
		name string
		fs   []string
		want []string
	}{
		{"same footprint", []string{square("CHM", 10, 50, 10.001, 50.001), square("CHM-OLD", 10, 50, 10.001, 50.001)},
			[]string{`CHM-OLD: its footprint is the same as that of building "CHM" (c.geojson feature #0)` + tail}},
		{"smaller inside", []string{square("A", 10, 50, 10.001, 50.001), square("B", 10.0002, 50.0002, 10.0006, 50.0006)},
			[]string{`B: 100 % of its footprint lies inside that of building "A" (c.geojson feature #0)` + tail}},
		{"shifted by a fifth", []string{square("A", 10, 50, 10.001, 50.001), square("B", 10.0002, 50, 10.0012, 50.001)},
			[]string{`B: 80 % of its footprint lies inside that of building "A" (c.geojson feature #0)` + tail}},
		{"shared wall", []string{square("A", 10, 50, 10.001, 50.001), square("B", 10.001, 50, 10.002, 50.001)}, nil},
		{"overlap of 30 %", []string{square("A", 10, 50, 10.001, 50.001), square("B", 10.0007, 50, 10.0017, 50.001)}, nil},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			if got := warned(tc.fs...); !reflect.DeepEqual(got, tc.want) {
				t.Errorf("got\n%q\nwant\n%q", got, tc.want)
			}
		})
	}
}

// TestProblemsInFeatureOrder: the problems found once every feature is read (an entrance's
// unknown building) are listed among the others in the order of the features.
func TestProblemsInFeatureOrder(t *testing.T) {
	t.Parallel()
	_, err := Parse("c.geojson", gisCampus(
		`"properties":{"id":"B"},`+gisSquare,
		`"properties":{"kind":"entrance","id":"E-1","building":"XYZ"},`+gisPoint,
		`"properties":{"kind":"entrance","id":"E-2"},`+gisPoint,
		`"properties":{"kind":"entrance","id":"E-3","building":true},`+gisPoint))
	if err == nil {
		t.Fatal("got no error")
	}
	var at []string
	for _, line := range strings.Split(err.Error(), "\n") {
		at = append(at, strings.Fields(line)[2])
	}
	if want := []string{"#1", "#2", "#3"}; !reflect.DeepEqual(at, want) {
		t.Errorf("got features %v in\n%v\nwant %v", at, err, want)
	}
}

// TestUnclosedRingGap: RFC 7946 §3.1.6 asks the last position of a ring to be the first;
// when the two differ below the digits a message prints, both are printed in full and the
// gap is given.
func TestUnclosedRingGap(t *testing.T) {
	t.Parallel()
	_, err := Parse("c.geojson", gisCampus(`"properties":{"id":"B"},"geometry":{"type":"Polygon","coordinates":[[[10.000000000001,50],[10.001,50],[10.001,50.001],[10,50]]]}`))
	want := `feature #0 "B": geometry: ring 1: not closed: first position [10.000000000001, 50], last [10, 50], 7.2e-05 mm apart; end the ring at its first position`
	if err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("got %v, want %q", err, want)
	}
	_, err = Parse("c.geojson", gisCampus(`"properties":{"id":"B"},"geometry":{"type":"Polygon","coordinates":[[[10.0001,50],[10.001,50],[10.001,50.001],[10,50]]]}`))
	want = `ring 1: not closed: first position [10.0001, 50], last [10, 50], 7.2 m apart`
	if err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("got %v, want %q", err, want)
	}
}

// TestSameFootprintsCapped: a campus whose buildings are all drawn on one another names
// maxFootprintWarnings pairs and says the search stopped, rather than comparing every pair.
func TestSameFootprintsCapped(t *testing.T) {
	t.Parallel()
	var bs []Building
	for i := range 300 {
		d := float64(i) * 1e-7 // about a centimetre apart: no two the same to the last digit
		bs = append(bs, Building{Source: Source{File: "c.geojson", Index: i}, ID: fmt.Sprintf("B%03d", i),
			Footprint: orb.MultiPolygon{{{{10 + d, 50}, {10.001 + d, 50}, {10.001 + d, 50.001}, {10 + d, 50.001}, {10 + d, 50}}}}})
	}
	ws := sameFootprints(bs)
	stopped := 0
	for _, w := range ws {
		if strings.Contains(w.msg, "stopped after 100 pairs") {
			stopped++
		}
	}
	if len(ws) != maxFootprintWarnings+1 || stopped != 1 {
		t.Errorf("got %d warnings, %d saying the search stopped; want %d and 1", len(ws), stopped, maxFootprintWarnings+1)
	}
}

// TestEvenOddMatchesPlanar holds sameFootprints' point-in-footprint test to orb/planar's
// MultiPolygonContains (the reference library) on random points around a footprint of two
// polygons, one with a hole, away from their edges, and its area to planar.Area.
func TestEvenOddMatchesPlanar(t *testing.T) {
	t.Parallel()
	mp := orb.MultiPolygon{
		{{{0, 0}, {10, 0}, {10, 10}, {5, 14}, {0, 10}, {0, 0}}, {{3, 3}, {3, 6}, {6, 6}, {6, 3}, {3, 3}}},
		{{{20, 0}, {30, 5}, {20, 10}, {24, 5}, {20, 0}}},
	}
	f := localFootprint(Local{MPerDegX: 1, MPerDegY: 1}, mp) // metres = degrees: the same numbers
	if got, want := f.areaM2(), planar.Area(mp); got != want {
		t.Errorf("area: got %v, want %v", got, want)
	}
	r := rand.New(rand.NewPCG(3, 4))
	for range 20000 {
		p := orb.Point{r.Float64()*40 - 5, r.Float64()*20 - 5}
		if got, want := f.evenOdd(vec{p[0], p[1]}), planar.MultiPolygonContains(mp, p); got != want {
			t.Fatalf("point %v: got %v, want %v", p, got, want)
		}
	}
}

// TestNearProperties (tester 14 F5): a property the reader does not read but that is spelt
// like one it does (in other letter case, with other separators, or within input.Nearest's
// edits) is answered with "did you mean …?": a problem when the property meant is absent and
// its default changes the plan, a warning when it only names, or when the property meant is
// given with another value. A GIS export's own attributes stay silent.
func TestNearProperties(t *testing.T) {
	t.Parallel()
	sq := func(i int) string {
		x := 10 + float64(i)*0.002
		return fmt.Sprintf(`"geometry":{"type":"Polygon","coordinates":[[[%g,50],[%g,50],[%g,50.001],[%g,50.001],[%g,50]]]}`, x, x+0.001, x+0.001, x, x)
	}
	problems := func(fs ...string) []string {
		t.Helper()
		_, err := Parse("c.geojson", gisCampus(fs...))
		var ps *input.Problems
		if err != nil && !errors.As(err, &ps) {
			t.Fatal(err)
		}
		var out []string
		if ps != nil {
			for _, p := range ps.List {
				out = append(out, p.Error())
			}
		}
		return out
	}
	warnings := func(fs ...string) []string {
		t.Helper()
		c, err := Parse("c.geojson", gisCampus(fs...))
		if err != nil {
			t.Fatal(err)
		}
		var out []string
		for _, w := range c.warns {
			out = append(out, w.src.Short(w.id)+": "+w.msg)
		}
		return out
	}
	check := func(name string, got []string, want ...string) {
		t.Helper()
		if strings.Join(got, "\n") != strings.Join(want, "\n") {
			t.Errorf("%s:\ngot  %q\nwant %q", name, got, want)
		}
	}

	// Near by spelling only: a warning (a GIS export has attributes of its own, review 20 F1).
	check("riser", problems(`"properties":{"id":"ORCHARD","riser":40},`+sq(0)))
	check("riser warned", warnings(`"properties":{"id":"ORCHARD","riser":40},`+sq(0)), `#0 (ORCHARD): property "riser" is not read: did you mean "riser_m"? The building is planned with a riser of 15 m (property names are matched exactly)`)
	check("spare_duct", problems(`"properties":{"id":"P","spare_duct":0},`+gisLine))
	check("spare_duct warned", warnings(`"properties":{"id":"P","spare_duct":0},`+gisLine), `#0 (P): property "spare_duct" is not read: did you mean "spare_ducts"? The pathway is planned with 1 spare duct (property names are matched exactly)`)
	// Near by spelling, but not the kind of value the property takes: the export's own.
	check("duct_id", problems(`"properties":{"id":"P","duct_id":"D-12"},`+gisLine))
	check("duct_id warned", warnings(`"properties":{"id":"P","duct_id":"D-12"},`+gisLine))
	check("Spare_Ducts", problems(`"properties":{"id":"P","Spare_Ducts":0},`+gisLine),
		`c.geojson: feature #0 "P": property "Spare_Ducts": not read: did you mean "spare_ducts"? Without it the pathway is planned with 1 spare duct; rename the property (property names are matched exactly)`)
	check("TYPE", problems(`"properties":{"id":"P","TYPE":"tunnel"},`+gisLine),
		`c.geojson: feature #0 "P": property "TYPE": not read: did you mean "type"? Without it the pathway is planned with type "duct"; rename the property (property names are matched exactly)`)
	check("Kind", problems(`"properties":{"id":"E","Kind":"entrance","building":"B"},`+gisPoint),
		`c.geojson: feature #0 "E": property "Kind": not read: did you mean "kind"? Without it the structure is planned with the kind its geometry gives (structure); rename the property (property names are matched exactly)`)
	// The same slip on many features of a file: one problem, on the first.
	var fs []string
	for i := range 4 {
		fs = append(fs, fmt.Sprintf(`"properties":{"id":"B%d","RISER_M":%d},`, i, 20+i)+sq(i))
	}
	check("grouped", problems(fs...),
		`c.geojson: feature #0 "B0": property "RISER_M": not read (nor on 3 more buildings of this file): did you mean "riser_m"? Without it the building is planned with a riser of 15 m; rename the property (property names are matched exactly)`)
	// A required property: the hint is in its problem, given once.
	check("entrance Building", problems(`"properties":{"id":"B"},`+sq(0), `"properties":{"id":"E","kind":"entrance","Building":"B"},`+gisPoint),
		`c.geojson: feature #1 "E": property "building": missing; an entrance names the id of its building; the feature gives "Building", which is not read: did you mean "building"? (property names are matched exactly)`)
	check("ID", problems(`"properties":{"ID":"B"},`+sq(0)),
		`c.geojson: feature #0 (no id): property "id": missing; every building needs a unique id; the feature gives "ID", which is not read: did you mean "id"? (property names are matched exactly)`)

	// Warnings: a name, and a property meant that is given with another value; nothing
	// when the values agree (an export that writes both), when the slip gives what the
	// default is ("TYPE": "duct", "Kind": "building" on a polygon), or for the export's own
	// attributes.
	check("warnings", warnings(
		`"properties":{"id":"B1","NAME":"Orchard Hall"},`+sq(0),
		`"properties":{"id":"B2","riser_m":12,"Riser_m":14},`+sq(1),
		`"properties":{"id":"B3","riser_m":12,"Riser_m":12,"Kind":"building"},`+sq(2),
		`"id":7,"properties":{"ID":"B4"},`+sq(3),
		`"id":"B5","properties":{"ID":"B5","OBJECTID":5,"fid":5,"Shape_Length":88.2,"Shape_Area":410.5,"TYPE":"teaching","address":"1 Quarry Lane","height_m":14,"floors":3,"rooms":40,"roof":"flat","duct":"none","state":"ok","names":null,"Role":""},`+sq(4),
		`"properties":{"id":"P1","Type":"duct","TYPE":"duct","surface_type":"asphalt","owner":"estates","material":"PVC","ducts":4},`+gisLine,
		`"properties":{"kind":"entrance","Id":"NORTH DOOR","building":"B1"},"geometry":{"type":"Point","coordinates":[10,50.0005]}`,
	),
		`#0 (B1): property "NAME" is not read: did you mean "name"? The building is planned with no name (property names are matched exactly)`,
		`#1 (B2): property "Riser_m" is not read: did you mean "riser_m"? The building gives "riser_m" as 12, which is what is planned (property names are matched exactly)`,
		`#3 (7): property "ID" is not read: did you mean "id"? The building gives "id" as "7", which is what is planned (property names are matched exactly)`,
		`#6: property "Id" is not read: did you mean "id"? The entrance is planned with the id "E-" and its building's (property names are matched exactly)`,
	)
}
