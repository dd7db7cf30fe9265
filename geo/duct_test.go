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
		`#0 (P-1): "duct_mm" is 4 mm, smaller than the inside of any conduit trade size: they run from trade size 16 (½ in, 15.8 mm inside) to 155 (6 in, 153.2 mm inside); inches? 4 in is 101.6 mm; a microduct`,
		`#1 (P-2): "duct_mm" is 10 mm, smaller than the inside of any conduit trade size: they run from trade size 16 (½ in, 15.8 mm inside) to 155 (6 in, 153.2 mm inside); centimetres? 10 cm is 100 mm;`,
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

// TestUnitSlipMarked (tester 15 F4): the warnings on a number that reads as typed in another
// unit, or on a property slip whose default is planned (verify 18 V9: "riser" for riser_m),
// and only those, are marked so (Warning.Slip) through Build, so that a plan's
// terminal can print them in full: a duct_mm of 4 (inches typed as millimetres: 4 in is
// 101.6 mm, 1 in = 25.4 mm exactly, NIST SP 811 B.8) and a riser_m of 750 (centimetres), not
// a blank riser_m nor two pathways crossing with no shared vertex.
func TestUnitSlipMarked(t *testing.T) {
	t.Parallel()
	fs := []string{
		`{"type":"Feature","properties":{"kind":"pathway","id":"P-1","duct_mm":4},"geometry":{"type":"LineString","coordinates":[[10,50],[10.002,50]]}}`,
		`{"type":"Feature","properties":{"kind":"pathway","id":"P-2"},"geometry":{"type":"LineString","coordinates":[[10.001,49.999],[10.001,50.001]]}}`,
		`{"type":"Feature","properties":{"kind":"building","id":"B-1","riser_m":750},"geometry":{"type":"Polygon","coordinates":[[[10.0021,49.9999],[10.0025,49.9999],[10.0025,50.0001],[10.0021,50.0001],[10.0021,49.9999]]]}}`,
		`{"type":"Feature","properties":{"kind":"building","id":"B-2","riser_m":""},"geometry":{"type":"Polygon","coordinates":[[[10.0031,49.9999],[10.0035,49.9999],[10.0035,50.0001],[10.0031,50.0001],[10.0031,49.9999]]]}}`,
		`{"type":"Feature","properties":{"kind":"building","id":"B-4","riser_ft":24.6,"riser_m":12},"geometry":{"type":"Polygon","coordinates":[[[10.0051,49.9999],[10.0055,49.9999],[10.0055,50.0001],[10.0051,50.0001],[10.0051,49.9999]]]}}`,
		`{"type":"Feature","properties":{"kind":"building","id":"B-3","riser":7.5},"geometry":{"type":"Polygon","coordinates":[[[10.0041,49.9999],[10.0045,49.9999],[10.0045,50.0001],[10.0041,50.0001],[10.0041,49.9999]]]}}`,
	}
	c, err := Parse("c.geojson", []byte(`{"type":"FeatureCollection","features":[`+strings.Join(fs, ",")+`]}`))
	if err != nil {
		t.Fatal(err)
	}
	n, err := Build(c, Options{SnapM: 0.5, MaxLateralM: 30})
	if err != nil {
		t.Fatal(err)
	}
	slips, others := 0, 0
	for _, w := range n.Warnings {
		// And a property spelt near riser_m, whose default the plan takes (verify 18 V9).
		slip := strings.Contains(w.Message, `"duct_mm" is 4 mm`) || strings.Contains(w.Message, `"riser_m" is 750 m`) ||
			strings.Contains(w.Message, `property "riser" is not read: did you mean "riser_m"? The building is planned with a riser of 15 m`) ||
			// riser_ft beside a riser_m it disagrees with: 24.6 ft is 7.498 m (1 ft = 0.3048 m
			// exactly, NIST SP 811), shown as written (review 22 F10).
			strings.Contains(w.Message, `property "riser_ft" is a length in feet and is not read: riser_ft 24.6 is 7.498 m, but riser_m gives 12 m`)
		if w.Slip != slip {
			t.Errorf("%s: %s: Slip %v, want %v", w.Feature, w.Message, w.Slip, slip)
		}
		if slip {
			slips++
		} else {
			others++
		}
	}
	if slips != 4 || others == 0 {
		t.Errorf("%d slips and %d other warnings, want 4 and some: %+v", slips, others, n.Warnings)
	}
}

// TestPVCConduits checks the table of rigid PVC conduit against NFPA 70 Chapter 9 Table 4
// (Article 352; seen in a secondary copy of the table, not in the standard itself):
// π/4·d² of each inside diameter gives the table's total area (100 %) to its rounding, here
// for trade sizes 53 (2 in: 3.291 and 2.874 in²) and 103 (4 in: 12.554 and 11.258 in²); every
// Schedule 80 is narrower than its Schedule 40; the default duct_mm is trade size 103
// Schedule 40. NominalHint names the trade size a round nominal figure may mean.
func TestPVCConduits(t *testing.T) {
	t.Parallel()
	in2 := func(mm float64) float64 { d := mm / 25.4; return 3.141592653589793 / 4 * d * d } // 1 in = 25.4 mm (NIST SP 811 B.8)
	byTrade := map[int]Conduit{}
	for i, c := range PVCConduits {
		byTrade[c.Trade] = c
		if c.Sched80MM >= c.Sched40MM {
			t.Errorf("trade size %d: Schedule 80 %g mm, not narrower than Schedule 40 %g mm", c.Trade, c.Sched80MM, c.Sched40MM)
		}
		if i > 0 && c.Sched40MM <= PVCConduits[i-1].Sched40MM {
			t.Errorf("trade size %d out of order", c.Trade)
		}
	}
	for _, tc := range []struct {
		trade          int
		area40, area80 float64 // in², NFPA 70 Chapter 9 Table 4 (seen, secondary copy)
	}{{53, 3.291, 2.874}, {103, 12.554, 11.258}} {
		c := byTrade[tc.trade]
		// The table's diameters are given to 0.001 in, ours to 0.1 mm: within 0.5 % of area.
		for _, x := range []struct{ got, want float64 }{{in2(c.Sched40MM), tc.area40}, {in2(c.Sched80MM), tc.area80}} {
			if d := x.got/x.want - 1; d > 0.005 || d < -0.005 {
				t.Errorf("trade size %d: area %.3f in², want %.3f", tc.trade, x.got, x.want)
			}
		}
	}
	if DefaultDuctMM != byTrade[103].Sched40MM {
		t.Errorf("DefaultDuctMM %g, want trade size 103 Schedule 40 %g", DefaultDuctMM, byTrade[103].Sched40MM)
	}
	for _, tc := range []struct {
		ductMM float64
		want   string // a part of the hint, "" for none
	}{
		{100, "trade size 103 (4 in) PVC conduit is 101.5 mm inside in Schedule 40, 96.2 mm in Schedule 80"},
		{103, "trade size 103 (4 in)"}, // the trade size's designator given as its diameter
		{50, "trade size 53 (2 in) PVC conduit is 52.0 mm inside"},
		{150, "trade size 155 (6 in)"},
		{101.5, ""}, // an inside diameter of the table
		{96.2, ""},
		{100.5, ""}, // not a round figure
		{10, ""},    // no trade size within 5 %
	} {
		got := NominalHint(tc.ductMM, 5)
		if (tc.want == "") != (got == "") || !strings.Contains(got, tc.want) {
			t.Errorf("NominalHint(%g): %q, want it to contain %q", tc.ductMM, got, tc.want)
		}
	}
}

// TestTradeEnds: the ends of the trade sizes the unit-slip warning names are the table's.
func TestTradeEnds(t *testing.T) {
	t.Parallel()
	if last := PVCConduits[len(PVCConduits)-1]; last.Trade != 155 || LargestTradeDuctMM != last.Sched40MM {
		t.Errorf("LargestTradeDuctMM %g, want trade size 155 Schedule 40 %g", LargestTradeDuctMM, last.Sched40MM)
	}
}
