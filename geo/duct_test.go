package geo

import (
	"fmt"
	"strings"
	"testing"
)

// TestReadingNits: tester 13's F-D. A duct_mm below the smallest conduit trade size is
// warned of with the unit that makes sense of it (trade sizes: NFPA 70 Chapter 9 Table 4,
// from memory; 1 in = 25.4 mm exactly, NIST SP 811 B.8); riser_m given as null is warned
// of as "" is (both taken as absent, the default 15 m); "7,5" is refused with a hint at
// the decimal comma.
func TestReadingNits(t *testing.T) {
	t.Parallel()
	pathway := func(i int, props string) string {
		return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"P-%d"%s},"geometry":{"type":"LineString","coordinates":[[10,%g],[10.001,%g]]}}`,
			i, props, 50+float64(i)*0.001, 50+float64(i)*0.001)
	}
	building := func(id, props string) string {
		x := 11 + float64(id[len(id)-1]-'0')*0.001
		return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":%q%s},"geometry":{"type":"Polygon","coordinates":[[[%g,50],[%g,50],[%g,50.0002],[%g,50.0002],[%g,50]]]}}`,
			id, props, x, x+0.0003, x+0.0003, x, x)
	}
	fs := []string{
		pathway(1, `,"duct_mm":4`),
		pathway(2, `,"duct_mm":10`),
		pathway(3, `,"duct_mm":15.8`), // trade size 16 (½ in): no warning
		pathway(4, `,"duct_mm":27`),
		building("B-1", `,"riser_m":null`),
		building("B-2", `,"riser_m":null`),
		building("B-3", `,"riser_m":""`),
	}
	c, err := Parse("c.geojson", []byte(`{"type":"FeatureCollection","features":[`+strings.Join(fs, ",")+`]}`))
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, w := range c.warns {
		got = append(got, w.src.Short(w.id)+": "+w.msg)
	}
	want := []string{
		`#0 (P-1): "duct_mm" is 4 mm, smaller than the inside of any conduit trade size: they run from trade size 16 (½ in, 15.8 mm inside) to 155 (6 in, 154.1 mm inside); inches? 4 in is 101.6 mm; a microduct`,
		`#1 (P-2): "duct_mm" is 10 mm, smaller than the inside of any conduit trade size: they run from trade size 16 (½ in, 15.8 mm inside) to 155 (6 in, 154.1 mm inside); centimetres? 10 cm is 100 mm;`,
		`#4 (B-1): 2 buildings of this file give "riser_m" as null, taken as absent: a riser of 15 m; give the value`,
		`#6 (B-3): this feature gives "riser_m" as an empty string, taken as absent: a riser of 15 m;`,
	}
	if len(got) != len(want) {
		t.Fatalf("got %d warnings, want %d:\n%s", len(got), len(want), strings.Join(got, "\n"))
	}
	for i, w := range want {
		if !strings.HasPrefix(got[i], w) {
			t.Errorf("got\n%s\nwant it to start with\n%s", got[i], w)
		}
	}

	// More than idWarningsEach small ducts in a file: one warning, on the first.
	fs = nil
	for i := range 5 {
		fs = append(fs, pathway(i, `,"duct_mm":4`))
	}
	c, err = Parse("c.geojson", []byte(`{"type":"FeatureCollection","features":[`+strings.Join(fs, ",")+`]}`))
	if err != nil {
		t.Fatal(err)
	}
	if len(c.warns) != 1 || !strings.Contains(c.warns[0].msg, `"duct_mm" is 4 mm (4 more pathways of this file give less than 15.8 mm too), smaller than`) {
		t.Errorf("got %+v, want one warning for the file", c.warns)
	}

	_, err = Parse("c.geojson", []byte(`{"type":"FeatureCollection","features":[`+building("B-1", `,"riser_m":"7,5"`)+","+building("B-2", `,"riser_m":"1,234.5"`)+","+building("B-3", `,"riser_m":"1,200"`)+`]}`))
	for _, w := range []string{
		`c.geojson: feature #0 "B-1": property "riser_m": want metres from 0 to 1000, got string "7,5" (a decimal comma? write 7.5, with a point and without quotes)`,
		`c.geojson: feature #1 "B-2": property "riser_m": want metres from 0 to 1000, got string "1,234.5"` + "\n",
		// Three digits after the comma read as well as a thousands separator (review 18 F7).
		`c.geojson: feature #2 "B-3": property "riser_m": want metres from 0 to 1000, got string "1,200" (a thousands separator? write 1200; a decimal comma? write 1.200; with no quotes)`,
	} {
		if err == nil || !strings.Contains(err.Error()+"\n", w) {
			t.Errorf("got %v, want it to contain %s", err, w)
		}
	}
}

// TestTallRiser (tester 14 F6): a riser_m above TallRiserM (a tower of some 75 storeys;
// common practice, no published source) is warned of with the centimetres that would make
// sense of it, and planned as given; one at the bound, or a tall building's 120 m, is not.
func TestTallRiser(t *testing.T) {
	t.Parallel()
	building := func(i int, riser string) string {
		x := 11 + float64(i)*0.001
		return fmt.Sprintf(`{"type":"Feature","properties":{"id":"T-%d","riser_m":%s},"geometry":{"type":"Polygon","coordinates":[[[%g,50],[%g,50],[%g,50.0002],[%g,50.0002],[%g,50]]]}}`,
			i, riser, x, x+0.0003, x+0.0003, x, x)
	}
	c, err := Parse("c.geojson", []byte(`{"type":"FeatureCollection","features":[`+
		strings.Join([]string{building(1, "750"), building(2, "300"), building(3, "120"), building(4, "22.5")}, ",")+`]}`))
	if err != nil {
		t.Fatal(err)
	}
	if len(c.warns) != 1 {
		t.Fatalf("got %d warnings, want 1: %+v", len(c.warns), c.warns)
	}
	w := c.warns[0]
	if want := `#0 (T-1): "riser_m" is 750 m, more than the 300 m riser of a tower of some 75 storeys; centimetres? 750 cm is 7.5 m.`; !strings.HasPrefix(w.src.Short(w.id)+": "+w.msg, want) {
		t.Errorf("got %s: %s\nwant it to start with %s", w.src.Short(w.id), w.msg, want)
	}
	if c.Buildings[0].RiserM != 750 {
		t.Errorf("riser %g, want 750 as given", c.Buildings[0].RiserM)
	}

	// More than idWarningsEach in a file: one warning, on the first.
	var fs []string
	for i := range 5 {
		fs = append(fs, building(i, "450"))
	}
	c, err = Parse("c.geojson", []byte(`{"type":"FeatureCollection","features":[`+strings.Join(fs, ",")+`]}`))
	if err != nil {
		t.Fatal(err)
	}
	if len(c.warns) != 1 || !strings.Contains(c.warns[0].msg, `"riser_m" is 450 m (4 more buildings of this file give more than 300 m too)`) {
		t.Errorf("got %+v, want one warning for the file", c.warns)
	}
}
