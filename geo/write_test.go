package geo

import (
	"bytes"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

func routeNetwork(t *testing.T) *Network {
	t.Helper()
	c := Campus{
		Buildings: []Building{box("B1", 50, 22, 10), box("B2", 250, 22, 10), box("B3", 300, 5, 10)},
		Pathways:  []Pathway{pw("T", ml(0, 0, 300, 0))},
	}
	return build(t, &c)
}

func TestWriteRoutes(t *testing.T) {
	t.Parallel()
	n := routeNetwork(t)
	checkNetwork(t, n)
	if got := spanIDs(n); got != "T/1:J0001>J0002 T/2:J0002>J0003 T/3:J0003>J0004" {
		t.Fatalf("spans: %s", got)
	}
	feats := []RouteFeature{
		{FromBuilding: "B2", ToBuilding: "B1", Steps: []Step{{SpanID: "T/2", Reverse: true}},
			Props: map[string]any{"media": "OS2", "length_m": 224.5, "a<b": "&"}},
		{FromBuilding: "B1", ToBuilding: "B3", Steps: []Step{{SpanID: "T/2"}, {SpanID: "T/3"}}},
	}
	var out bytes.Buffer
	if err := n.WriteRoutes(&out, feats); err != nil {
		t.Fatal(err)
	}
	var fc struct {
		Type     string
		Features []struct {
			Type     string
			Geometry struct {
				Type        string
				Coordinates [][2]float64
			}
			Properties map[string]any
		}
	}
	if err := json.Unmarshal(out.Bytes(), &fc); err != nil {
		t.Fatalf("output is not JSON: %v\n%s", err, out.String())
	}
	if fc.Type != "FeatureCollection" || len(fc.Features) != 2 {
		t.Fatalf("got %s", out.String())
	}
	// Route 1: B2's lateral (boundary, then junction), the span backwards, B1's lateral
	// reversed (junction, then boundary).
	want := []orb.Point{at(250, 12), at(250, 0), at(50, 0), at(50, 12)}
	got := fc.Features[0].Geometry.Coordinates
	if len(got) != len(want) {
		t.Fatalf("route 1: got %v, want %v", got, want)
	}
	for i := range want {
		if DistanceM(orb.Point(got[i]), want[i]) > 0.02 {
			t.Errorf("route 1 point %d: got %v, want %v", i, got[i], want[i])
		}
	}
	if fc.Features[0].Properties["media"] != "OS2" {
		t.Errorf("properties: got %v", fc.Features[0].Properties)
	}
	if !strings.Contains(out.String(), `"properties":{"a<b":"&","length_m":224.5,"media":"OS2"}`) {
		t.Errorf("properties not sorted or escaped: %s", out.String())
	}
	// Route 2 ends in B3's footprint, where T crosses its west wall (T is drawn on to the
	// footprint's middle and cut back to the wall): no lateral at that end.
	if g := fc.Features[1].Geometry.Coordinates; len(g) != 4 || DistanceM(orb.Point(g[3]), at(290, 0)) > 0.02 {
		t.Errorf("route 2: got %v", g)
	}
	// Same input, same bytes.
	var again bytes.Buffer
	if err := n.WriteRoutes(&again, feats); err != nil || !bytes.Equal(out.Bytes(), again.Bytes()) {
		t.Errorf("second write differs (%v)", err)
	}
	// Coordinates carry at most 7 decimals.
	for _, f := range strings.FieldsFunc(out.String(), func(r rune) bool { return strings.ContainsRune("[],", r) }) {
		if i := strings.IndexByte(f, '.'); i >= 0 && len(f)-i-1 > CoordDecimals && !strings.ContainsAny(f, `":{}`) {
			t.Errorf("coordinate %q has more than %d decimals", f, CoordDecimals)
		}
	}
}

func TestWriteRoutesErrors(t *testing.T) {
	t.Parallel()
	n := routeNetwork(t)
	cases := []struct {
		name string
		f    RouteFeature
		want string
	}{
		{"unknown span", RouteFeature{FromBuilding: "B1", Steps: []Step{{SpanID: "X"}}}, `unknown span "X"`},
		{"unknown building", RouteFeature{FromBuilding: "B9"}, `unknown building "B9"`},
		{"steps do not meet", RouteFeature{FromBuilding: "B1", Steps: []Step{{SpanID: "T/2", Reverse: true}}}, `starts at junction "J0003", want "J0002"`},
		{"wrong end", RouteFeature{FromBuilding: "B1", ToBuilding: "B3", Steps: []Step{{SpanID: "T/2"}}}, `building "B3" is reached at "J0004"`},
		{"NaN property", RouteFeature{FromBuilding: "B1", Props: map[string]any{"x": math.NaN()}}, "properties: json: unsupported value: NaN"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			var out bytes.Buffer
			err := n.WriteRoutes(&out, []RouteFeature{tc.f})
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: got %v, want %q", tc.name, err, tc.want)
			}
			if out.Len() != 0 {
				t.Errorf("%s: wrote %d bytes on error", tc.name, out.Len())
			}
		})
	}
}

func TestWriteRoutesEmptyAndPoint(t *testing.T) {
	t.Parallel()
	n := routeNetwork(t)
	var out bytes.Buffer
	if err := n.WriteRoutes(&out, nil); err != nil || out.String() != "{\"type\":\"FeatureCollection\",\"features\":[\n]}\n" {
		t.Errorf("empty: got %q, %v", out.String(), err)
	}
	out.Reset()
	// B3 to itself: no steps and no lateral, so no line to draw.
	if err := n.WriteRoutes(&out, []RouteFeature{{FromBuilding: "B3", ToBuilding: "B3"}}); err != nil ||
		!strings.Contains(out.String(), `"geometry":null`) {
		t.Errorf("point route: got %q, %v", out.String(), err)
	}
}

func TestWriteNetwork(t *testing.T) {
	t.Parallel()
	n := routeNetwork(t)
	var a, b bytes.Buffer
	if err := n.WriteNetwork(&a); err != nil {
		t.Fatal(err)
	}
	if err := n.WriteNetwork(&b); err != nil || !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Fatalf("second write differs (%v)", err)
	}
	var fc struct{ Features []json.RawMessage }
	if err := json.Unmarshal(a.Bytes(), &fc); err != nil {
		t.Fatalf("not JSON: %v", err)
	}
	// 3 spans, 4 junctions, 2 laterals.
	if len(fc.Features) != 9 {
		t.Errorf("got %d features, want 9:\n%s", len(fc.Features), a.String())
	}
}

func TestNetworkLookupsByHand(t *testing.T) {
	t.Parallel()
	n := &Network{Spans: []Span{{ID: "b"}, {ID: "a"}}, Junctions: []Junction{{ID: "J"}}, Access: []Access{{Building: "B", Junction: "J"}}}
	if s, ok := n.Span("a"); !ok || s.ID != "a" {
		t.Errorf("Span: got %v %v", s, ok)
	}
	if _, ok := n.Span("z"); ok {
		t.Errorf("Span z found")
	}
	if j, ok := n.Junction("J"); !ok || j.ID != "J" {
		t.Errorf("Junction: got %v %v", j, ok)
	}
	if a, ok := n.AccessOf("B"); !ok || a.Junction != "J" {
		t.Errorf("AccessOf: got %v %v", a, ok)
	}
}

// TestRounded: every coordinate to CoordDecimals (1e-7°, about 1 cm), as the GeoJSON writer
// rounds them, in a copy: the geometry given is not changed.
func TestRounded(t *testing.T) {
	t.Parallel()
	p := orb.Point{-3.72852934999, 52.35200005}
	want := orb.Point{-3.7285293, 52.3520001}
	if got := Rounded(p); got != want {
		t.Errorf("point: %v, want %v", got, want)
	}
	ls := orb.LineString{p, {0.000000049, -0.00000004}}
	got := Rounded(ls).(orb.LineString)
	if got[0] != want || got[1] != (orb.Point{0, 0}) || ls[0] != p {
		t.Errorf("line: %v (given %v)", got, ls)
	}
	mp := orb.MultiPolygon{{{p, {1, 1}, {1, 0}, p}}}
	if gm := Rounded(mp).(orb.MultiPolygon); gm[0][0][0] != want || gm[0][0][3] != want || mp[0][0][0] != p {
		t.Errorf("multipolygon: %v", gm)
	}
	if got := Rounded(orb.Collection{p}); got.(orb.Collection)[0] != p {
		t.Errorf("collection: %v, want it as given", got)
	}
}

// TestPointAt: a point along a span of two segments is on the segment its offset falls in,
// its distance from the span's start the offset (DistanceM, Karney's geodesic, within 1 mm
// on these 100 m segments), and the ends are clamped.
func TestPointAt(t *testing.T) {
	t.Parallel()
	a, b, c := orb.Point{-3.73, 52.35}, orb.Point{-3.7285, 52.35}, orb.Point{-3.7285, 52.351}
	s := &Span{Line: orb.LineString{a, b, c}}
	segs := s.SegmentsM()
	for _, off := range []float64{0, 10, segs[0] - 1, segs[0], segs[0] + 5, segs[0] + segs[1]} {
		p := s.PointAt(off)
		var along float64
		if off <= segs[0] {
			along = DistanceM(a, p)
		} else {
			along = segs[0] + DistanceM(b, p)
		}
		if diff := along - off; diff > 0.001 || diff < -0.001 {
			t.Errorf("PointAt(%.3f) = %v, %.4f m along", off, p, along)
		}
	}
	if s.PointAt(-1) != a || s.PointAt(1e6) != c {
		t.Errorf("ends not clamped: %v %v", s.PointAt(-1), s.PointAt(1e6))
	}
}
