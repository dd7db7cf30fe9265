package geo

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"spanwright/geo/input"
)

// lateralCampus is a building whose nearest pathway is 20 m east of its wall, with another
// 24 m north: the lateral runs east. A projection stretched east-west by a third (one about
// the latitude of a point 5,000 km south, tester 13's F-C: 20.0 m laterals became 25.1 m ones
// to the other street) would send it north.
func lateralCampus() *Campus {
	s := Structure{Source: Source{File: "t.geojson", Index: 3}, ID: "MH-1", Type: StructureMaintenanceHole, Point: at(30, -40)}
	return &Campus{
		Buildings:  []Building{box("B", 0, 0, 10)},
		Pathways:   []Pathway{pw("E", ml(30, -40, 30, 60)), pw("N", ml(-40, 34, 28, 34))},
		Structures: []Structure{s},
	}
}

// withStray is c with a handhole at p that joins nothing, as a campus built by hand (the
// loader refuses one beyond FarM) may hold.
func withStray(c *Campus, p orb.Point) *Campus {
	d := *c
	d.Structures = append(slices.Clone(c.Structures), Structure{Source: Source{File: "stray.geojson"}, ID: "HH-99",
		Type: StructureHandhole, Point: p})
	d.sortFeatures()
	return &d
}

// sameNetwork fails unless a and b have the same junctions, spans, access and entrances.
func sameNetwork(t *testing.T, name string, a, b *Network) {
	t.Helper()
	switch {
	case !reflect.DeepEqual(a.Junctions, b.Junctions):
		t.Errorf("%s: junctions differ:\n%v\n%v", name, a.Junctions, b.Junctions)
	case !reflect.DeepEqual(a.Spans, b.Spans):
		t.Errorf("%s: spans differ:\n%s\n%s", name, spanIDs(a), spanIDs(b))
	case !reflect.DeepEqual(a.Access, b.Access):
		t.Errorf("%s: access differs:\n%+v\n%+v", name, a.Access, b.Access)
	case !reflect.DeepEqual(a.Entrances, b.Entrances):
		t.Errorf("%s: entrances differ", name)
	}
}

// TestFarFeatureMovesNothing adds one handhole that joins nothing to a campus, anywhere on
// Earth farther than FarM from it (the slips of tester 13's F-C among them: longitude and
// latitude swapped, 0, 0, a lost sign), and requires the very same network: the projection
// about the campus's positions within FarM of its middle does not see it. Within FarM (a
// mistyped digit of latitude) the projection may move by up to half that distance, and
// spans keep their ellipsoidal lengths exactly (but for one a counted lateral's tap ends
// between two vertices) while a lateral moves by at most its length times the scale error
// such a move makes (equirectangular: about Δφ·tan φ in x).
func TestFarFeatureMovesNothing(t *testing.T) {
	t.Parallel()
	demo, err := LoadFS(os.DirFS("../testdata/demo"), []string{"campus.geojson"})
	if err != nil {
		t.Fatal(err)
	}
	for _, cc := range []struct {
		name string
		c    *Campus
	}{{"lateral", lateralCampus()}, {"demo", demo}} {
		base := build(t, cc.c)
		if cc.name == "lateral" {
			a, ok := base.AccessOf("B")
			if !ok || math.Abs(a.LateralM-20) > 0.1 {
				t.Fatalf("lateral campus: access %+v, want a 20 m lateral east", a)
			}
		}
		mid, _ := middleOf(cc.c)
		farOnes := []orb.Point{{mid[1], mid[0]}, {0, 0}, {-mid[0], mid[1]}, {mid[0], -mid[1]}}
		r := rand.New(rand.NewPCG(13, 1))
		for len(farOnes) < 40 {
			p := orb.Point{r.Float64()*360 - 180, r.Float64()*170 - 85}
			if _, isFar := far(mid, p); isFar {
				farOnes = append(farOnes, p)
			}
		}
		for _, p := range farOnes {
			name := fmt.Sprintf("%s + handhole at %.4f, %.4f", cc.name, p[0], p[1])
			sameNetwork(t, name, base, build(t, withStray(cc.c, p)))
		}
		// Within FarM: 2 to 95 km away, any bearing.
		latRad := mid[1] * deg
		for range 12 {
			dM, bearing := 2e3+r.Float64()*93e3, r.Float64()*2*math.Pi
			loc := NewLocal(mid[0], mid[1])
			p := orb.Point{mid[0] + dM*math.Sin(bearing)/loc.MPerDegX, mid[1] + dM*math.Cos(bearing)/loc.MPerDegY}
			name := fmt.Sprintf("%s + handhole %.0f m away", cc.name, dM)
			got := build(t, withStray(cc.c, p))
			if len(got.Spans) != len(base.Spans) || len(got.Access) != len(base.Access) {
				t.Errorf("%s: %d spans, %d access; want %d, %d", name, len(got.Spans), len(got.Access), len(base.Spans), len(base.Access))
				continue
			}
			// The centre moves by at most dM/2 north or south; x's scale error is then at
			// most (dM/2)/R·tan φ (first order), plus a millimetre for the tap's rounding.
			scaleErr := dM / 2 / WGS84AM * math.Abs(math.Tan(latRad)) * 1.01
			// A span keeps its length exactly unless a counted lateral's tap, placed in the
			// projection, ends it between two vertices: the tap then moves along it as the
			// lateral does, by at most the span's length times the scale error.
			for i, s := range got.Spans {
				if w := base.Spans[i]; s.ID != w.ID || math.Abs(s.LengthM-w.LengthM) > w.LengthM*scaleErr+1e-3 {
					t.Errorf("%s: span %s %.4f m, want %s %.4f m (±%.4f)", name, s.ID, s.LengthM, w.ID, w.LengthM, w.LengthM*scaleErr+1e-3)
				}
			}
			for i, a := range got.Access {
				w := base.Access[i]
				if a.Building != w.Building || a.Junction != w.Junction || a.Via != w.Via ||
					math.Abs(a.LateralM-w.LateralM) > w.LateralM*scaleErr+1e-3 {
					t.Errorf("%s: access %s %s %s %.4f m, want %s %s %s %.4f m (±%.4f)", name, a.Building, a.Junction, a.Via,
						a.LateralM, w.Building, w.Junction, w.Via, w.LateralM, w.LateralM*scaleErr+1e-3)
				}
			}
		}
	}
}

// TestFarFeatureRefused reads campuses with a position farther than FarM from the rest and
// checks the problem names the file, the feature, the geometry, where the middle is and the
// slip that would bring it back; and that a position within FarM is no problem.
func TestFarFeatureRefused(t *testing.T) {
	t.Parallel()
	const head = `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"kind":"building","id":"B-1"},"geometry":{"type":"Polygon","coordinates":[[[7.42,46.87],[7.4203,46.87],[7.4203,46.8702],[7.42,46.8702],[7.42,46.87]]]}},
{"type":"Feature","properties":{"kind":"pathway","id":"P-1","type":"duct"},"geometry":{"type":"LineString","coordinates":[[7.4199,46.8703],[7.4215,46.8703]]}},
{"type":"Feature","properties":{"kind":"structure","id":"MH-1","type":"maintenance-hole"},"geometry":{"type":"Point","coordinates":[7.4215,46.8703]}},
`
	cases := []struct {
		name, feature string
		want          []string // substrings of the one problem; none: no problem
	}{
		{"lon lat swapped",
			`{"type":"Feature","properties":{"kind":"structure","id":"HH-99","type":"handhole"},"geometry":{"type":"Point","coordinates":[46.8703,7.4205]}}`,
			[]string{`t.geojson: feature #3 "HH-99": geometry: want positions within 100 km of the middle of the campus (7.4211, 46.8702), got 46.8703, 7.4205, 5759 km away`,
				"km away; longitude and latitude swapped? GeoJSON and GeoPackage put longitude first (7.4205, 46.8703 would lie 47 m from the middle)"}},
		{"null island",
			`{"type":"Feature","properties":{"kind":"structure","id":"HH-98","type":"handhole"},"geometry":{"type":"Point","coordinates":[0,0]}}`,
			[]string{`feature #3 "HH-98": geometry: want positions within 100 km`, "got 0, 0, 5243 km away; a position at 0, 0 is what an export writes for a feature whose geometry was lost"}},
		{"sign of longitude lost",
			`{"type":"Feature","properties":{"kind":"structure","id":"HH-97","type":"handhole"},"geometry":{"type":"Point","coordinates":[-7.4205,46.8703]}}`,
			[]string{`feature #3 "HH-97"`, "1130 km away; the sign of the longitude lost? (7.4205, 46.8703 would lie 6 m from the middle)"}},
		{"one vertex of a pathway",
			`{"type":"Feature","properties":{"kind":"pathway","id":"P-2","type":"duct"},"geometry":{"type":"LineString","coordinates":[[7.4215,46.8703],[46.8703,7.4230],[7.4230,46.8703]]}}`,
			[]string{`feature #3 "P-2": geometry: want positions within 100 km`, "got 46.8703, 7.423,", "longitude and latitude swapped?"}},
		{"a whole pathway, once",
			`{"type":"Feature","properties":{"kind":"pathway","id":"P-3","type":"duct"},"geometry":{"type":"LineString","coordinates":[[46.8703,7.4215],[46.8703,7.4230],[46.8704,7.4230]]}}`,
			[]string{`feature #3 "P-3"`, "km away (and 2 more positions as far); longitude and latitude swapped?"}},
		{"no slip fits",
			`{"type":"Feature","properties":{"kind":"structure","id":"HH-96","type":"handhole"},"geometry":{"type":"Point","coordinates":[151.2,-33.9]}}`,
			[]string{`feature #3 "HH-96"`, "km away"}},
		// a latitude's digit mistyped, 55 km north: within FarM, no problem (a warning of
		// Build's says it joins nothing)
		{"within FarM", `{"type":"Feature","properties":{"kind":"structure","id":"HH-95","type":"handhole"},"geometry":{"type":"Point","coordinates":[7.4215,47.3703]}}`, nil},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			_, err := Parse("t.geojson", []byte(head+tc.feature+"\n]}"))
			if tc.want == nil {
				if err != nil {
					t.Fatalf("%s: %v", tc.name, err)
				}
				return
			}
			var ps *input.Problems
			if !errors.As(err, &ps) || ps.Len() != 1 {
				t.Fatalf("%s: got %v, want one problem", tc.name, err)
			}
			if !errors.Is(err, ErrBadGeometry) {
				t.Errorf("%s: %v is no ErrBadGeometry", tc.name, err)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("%s: got\n%v\nwant it to contain\n%s", tc.name, err, w)
				}
			}
			if strings.Contains(tc.name, "no slip") && strings.Contains(err.Error(), "?") {
				t.Errorf("%s: a hint where none fits: %v", tc.name, err)
			}
		})
	}
}

// TestFarWithOtherProblems: a far feature is listed with the campus's other problems, in
// the order of the features, and a feature whose geometry is bad already is not called far.
func TestFarWithOtherProblems(t *testing.T) {
	t.Parallel()
	data := `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"kind":"structure","id":"HH-1","type":"handhole"},"geometry":{"type":"Point","coordinates":[46.87,7.42]}},
{"type":"Feature","properties":{"kind":"structure","id":"HH-2","type":"hand hole"},"geometry":{"type":"Point","coordinates":[7.42,46.87]}},
{"type":"Feature","properties":{"kind":"structure","id":"HH-3","type":"handhole"},"geometry":{"type":"Point","coordinates":[7.42,96.87]}},
{"type":"Feature","properties":{"kind":"structure","id":"HH-4","type":"handhole"},"geometry":{"type":"Point","coordinates":[7.4201,46.87]}}
]}`
	_, err := Parse("t.geojson", []byte(data))
	var ps *input.Problems
	if !errors.As(err, &ps) {
		t.Fatalf("got %v, want problems", err)
	}
	var got []string
	for _, p := range ps.List {
		got = append(got, fmt.Sprintf("#%d %s", p.Feature.Index, p.Key))
	}
	if want := []string{"#0 geometry", "#1 type", "#2 geometry"}; !reflect.DeepEqual(got, want) {
		t.Errorf("got %v, want %v:\n%v", got, want, err)
	}
	if !strings.Contains(ps.List[0].Error(), "longitude and latitude swapped?") || strings.Contains(ps.List[2].Error(), "100 km") {
		t.Errorf("got\n%v", err)
	}
}

// TestAntimeridianCampus: a campus astride the 180th meridian (a building at 179.9995 E, its
// pathway running on to 179.9995 W) has its middle there, not half a world away (review 18
// F4: every feature was refused as "6493 km away"), and is refused once, naming a feature
// across the meridian and how to shift the campus: the local projection takes longitudes as
// written. The same campus shifted west by one degree (every longitude, as the message says)
// plans; so does one just short of the meridian.
func TestAntimeridianCampus(t *testing.T) {
	t.Parallel()
	campus := func(lonA, lonB float64) string {
		return fmt.Sprintf(`{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"kind":"building","id":"B-1"},"geometry":{"type":"Polygon","coordinates":[[[%[1]g,-16.5],[%[2]g,-16.5],[%[2]g,-16.4998],[%[1]g,-16.4998],[%[1]g,-16.5]]]}},
{"type":"Feature","properties":{"kind":"pathway","id":"P-1","type":"duct"},"geometry":{"type":"LineString","coordinates":[[%[1]g,-16.4997],[%[3]g,-16.4997]]}},
{"type":"Feature","properties":{"kind":"structure","id":"MH-1","type":"maintenance-hole"},"geometry":{"type":"Point","coordinates":[%[3]g,-16.4997]}}
]}`, lonA, lonA+0.0002, lonB)
	}
	_, err := Parse("t.geojson", []byte(campus(179.9995, -179.9995)))
	var ps *input.Problems
	if !errors.As(err, &ps) || ps.Len() != 1 {
		t.Fatalf("astride: got %v, want one problem", err)
	}
	for _, w := range []string{"want a campus on one side of the 180th meridian", "across it from the middle of the campus (179.9996, -16.4997)", "shift every longitude"} {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("astride: got\n%v\nwant it to contain %q", err, w)
		}
	}
	if strings.Contains(err.Error(), "km away") {
		t.Errorf("astride: a feature called far: %v", err)
	}
	for _, ok := range [][2]float64{{178.9995, 179.0005}, {179.9985, 179.9995}} {
		if _, err := Parse("t.geojson", []byte(campus(ok[0], ok[1]))); err != nil {
			t.Errorf("%v: %v", ok, err)
		}
	}
}
