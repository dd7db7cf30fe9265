package geo

import (
	"errors"
	"fmt"
	"strings"
	"testing"

	"spanwright/geo/input"
)

// TestLengthInOtherUnit (tester 15 F10): a property named like one the reader reads but for
// its unit ("riser_ft" beside riser_m, "duct_in" beside duct_mm) is a length in another
// unit. With the property meant absent it is refused, as a slip of letter case is (the README
// refuses RISER_M when the default would change the plan), with the conversion; with both
// given and differing, a warning; agreeing within what either says, nothing. Conversions
// from NIST SP 811 (2008) B.8: 1 ft = 0.3048 m, 1 in = 25.4 mm, 1 yd = 0.9144 m, exactly.
func TestLengthInOtherUnit(t *testing.T) {
	t.Parallel()
	sq := func(i int) string {
		x := 10 + float64(i)*0.002
		return fmt.Sprintf(`"geometry":{"type":"Polygon","coordinates":[[[%g,50],[%g,50],[%g,50.001],[%g,50.001],[%g,50]]]}`, x, x+0.001, x+0.001, x, x)
	}
	read := func(fs ...string) (problems, warnings []string) {
		t.Helper()
		c, err := Parse("c.geojson", gisCampus(fs...))
		var ps *input.Problems
		if err != nil && !errors.As(err, &ps) {
			t.Fatal(err)
		}
		if ps != nil {
			for _, p := range ps.List {
				problems = append(problems, p.Error())
			}
			return problems, nil
		}
		for _, w := range c.warns {
			warnings = append(warnings, w.src.Short(w.id)+": "+w.msg)
		}
		return nil, warnings
	}
	check := func(name string, got []string, want ...string) {
		t.Helper()
		if strings.Join(got, "\n") != strings.Join(want, "\n") {
			t.Errorf("%s:\ngot  %q\nwant %q", name, got, want)
		}
	}

	// NIST SP 811 B.8: 24.6 ft × 0.3048 = 7.49808 m, to the millimetre 7.498.
	p, _ := read(`"properties":{"id":"B","riser_ft":24.6},` + sq(0))
	check("riser_ft", p, `c.geojson: feature #0 "B": property "riser_ft": a length in feet, not read: riser_ft 24.6 is 7.498 m: write riser_m: 7.498 (1 ft = 0.3048 m exactly); without riser_m the building is planned with a riser of 15 m`)
	// NIST SP 811 B.8: 4 in × 25.4 = 101.6 mm; letter case and separators as a GIS writes them.
	p, _ = read(`"properties":{"id":"P","DUCT_IN":4},` + gisLine)
	check("DUCT_IN", p, `c.geojson: feature #0 "P": property "DUCT_IN": a length in inches, not read: DUCT_IN 4 is 101.6 mm: write duct_mm: 101.6 (1 in = 25.4 mm exactly); but if 4 in is the conduit's trade size, trade size 103 (4 in) PVC conduit is 101.5 mm inside in Schedule 40, 96.2 mm in Schedule 80 (NFPA 70 Chapter 9 Table 4): write its inside diameter; without duct_mm the pathway is planned with ducts of 101.5 mm`) // the default, geo.DefaultDuctMM; Table 4 as geo.PVCConduits gives it (review 22 F6)
	// NIST SP 811 B.8: 80 ft = 24.384 m; a number written as text (an export's text column).
	p, _ = read(`"properties":{"id":"B","Riser Feet":"80"},` + sq(0))
	check("Riser Feet", p, `c.geojson: feature #0 "B": property "Riser Feet": a length in feet, not read: Riser Feet 80 is 24.384 m: write riser_m: 24.384 (1 ft = 0.3048 m exactly); without riser_m the building is planned with a riser of 15 m`)
	// No number to convert: still refused, with the unit to give.
	p, _ = read(`"properties":{"id":"B","riser_ft":"two floors"},` + sq(0))
	check("riser_ft text", p, `c.geojson: feature #0 "B": property "riser_ft": a length in feet, not read: give it in metres as riser_m (1 ft = 0.3048 m exactly); without riser_m the building is planned with a riser of 15 m`)
	// Many features of a file: one problem, on the first, NIST SP 811 B.8: 3 yd = 2.7432 m.
	var fs []string
	for i := range 3 {
		fs = append(fs, fmt.Sprintf(`"properties":{"id":"B%d","riser_yd":%d},`, i, 3+i)+sq(i))
	}
	p, _ = read(fs...)
	check("grouped", p, `c.geojson: feature #0 "B0": property "riser_yd": a length in yards, not read (nor on 2 more buildings of this file): riser_yd 3 is 2.743 m: write riser_m: 2.743 (1 yd = 0.9144 m exactly), and convert the others the same way; without riser_m the building is planned with a riser of 15 m`)

	// Both given: 24.6 ft is 7.498 m, which 7.5 m is within a twentieth of a foot: nothing;
	// 80 ft is not 7.5 m: a warning, and riser_m is planned.
	p, w := read(`"properties":{"id":"B1","riser_m":7.5,"riser_ft":24.6},`+sq(0),
		`"properties":{"id":"B2","riser_m":7.5,"riser_ft":80},`+sq(1))
	check("both: problems", p)
	check("both: warnings", w, `#1 (B2): property "riser_ft" is a length in feet and is not read: riser_ft 80 is 24.384 m, but riser_m gives 7.5 m, which is what is planned`)
	// A length the reader does not read in any unit (a line's length comes from its
	// geometry): the export's own attribute, nothing; nor a unit on a property of another kind.
	p, w = read(`"properties":{"id":"P","length_ft":320.5,"riser_ft":10},` + gisLine)
	check("length_ft", append(p, w...))
}

// TestConvertAgrees checks otherUnit.converted and agrees on NIST SP 811 (2008) B.8's exact
// factors: 1 ft = 0.3048 m, 1 in = 25.4 mm.
func TestConvertAgrees(t *testing.T) {
	t.Parallel()
	ft, in := otherUnits[0], otherUnits[2]
	for _, c := range []struct {
		u    otherUnit
		x    float64
		want string
	}{
		{ft, 1, "0.305"},    // 0.3048 m to the millimetre
		{ft, 10, "3.048"},   // NIST SP 811 B.8
		{ft, 100, "30.48"},  // NIST SP 811 B.8
		{in, 1, "25.4"},     // NIST SP 811 B.8
		{in, 0.75, "19.05"}, // NIST SP 811 B.8: 19.05 mm exactly
		{in, 6, "152.4"},    // NIST SP 811 B.8
	} {
		if got := c.u.converted(c.x); got != c.want {
			t.Errorf("%g %s: got %s %s, want %s", c.x, c.u.symbol, got, c.u.metric, c.want)
		}
	}
	if !ft.agrees(24.6, 1, 7.5, 1) || ft.agrees(24.6, 1, 7.6, 1) || !ft.agrees(10, -1, 3.048, -1) {
		t.Error("agrees: 24.6 ft is 7.5 m, not 7.6 m, within a tenth; 10 ft is 3.048 m exactly")
	}
}
