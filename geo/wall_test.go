package geo

import (
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// TestCutAtWalls: pathway ends drawn into a building's footprint. B is a 20 m square at the
// origin (walls at ±10 m); every pathway comes from the street along y = -50.
func TestCutAtWalls(t *testing.T) {
	t.Parallel()
	type want struct {
		span        string
		lengthM     float64 // the span's length after Build, projected-grid metres (within 0.1 m)
		cut         bool    // named in the warning
		entranceAtY float64 // the B entrance's y, when the lateral is an entrance of B
	}
	street := pw("S", ml(-100, -50, 100, -50))
	cases := []struct {
		name  string
		endY  float64 // where the lateral L from the street ends, on x = 0
		extra []Pathway
		kind  string // the lateral's pathway type
		st    []Structure
		w     want
	}{
		// A service duct drawn through the wall to the middle of the building: cut at the
		// wall (y = -10), 40 m of outside plant, 10 m left off.
		{name: "service duct to the middle", w: want{"L", 40, true, -10}},
		// The same with a duct X drawn inside B across L's inside stretch, joining it nowhere:
		// L is cut the same, and the crossing, on the stretch left off, is not warned of.
		{name: "crossed inside", extra: []Pathway{pw("X", ml(-5, -5, 5, -5))}, w: want{"L", 40, true, -10}},
		// The same drawn to 0.3 m inside the wall, within snap_m (0.5 m): left as drawn.
		{name: "end within snap_m of the wall", endY: -9.7, w: want{"L", 40.3, false, 0}},
		// A tray inside the building starts where the duct ends: the two meet inside, and
		// the duct is left as drawn (a basement meeting), 50 m.
		{name: "meets a tray inside", extra: []Pathway{trayAt("TR", ml(0, 0, 0, 8))}, w: want{"L", 50, false, 0}},
		// A handhole drawn at the end inside: left as drawn.
		{name: "ends in a structure", st: []Structure{{Source: Source{File: "t.geojson", Index: 7}, ID: "HH-1", Type: StructureHandhole, Point: at(0, 0)}}, w: want{"L", 50, false, 0}},
		// A tunnel into the basement is an indoor pathway there: left as drawn.
		{name: "tunnel", kind: TypeTunnel, w: want{"L", 50, false, 0}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			lat := pw("L", ml(0, -50, 0, tc.endY))
			if tc.kind != "" {
				lat.Type = tc.kind
			}
			c := Campus{Buildings: []Building{box("B", 0, 0, 10)}, Pathways: append([]Pathway{street, lat}, tc.extra...), Structures: tc.st}
			n := build(t, &c)
			checkNetwork(t, n)
			var sp *Span
			for i := range n.Spans {
				if n.Spans[i].PathwayID == tc.w.span {
					sp = &n.Spans[i]
				}
			}
			if sp == nil {
				t.Fatalf("%s: no span of %s in %s", tc.name, tc.w.span, spanIDs(n))
			}
			warned := ""
			for _, w := range n.Warnings {
				if strings.Contains(w.Message, "cut at the wall") {
					warned = w.Feature + ": " + w.Message
				}
			}
			for _, w := range n.Warnings {
				if strings.Contains(w.Message, "cross at") {
					t.Errorf("%s: warning %q about a crossing inside B", tc.name, w.Message)
				}
			}
			if tc.w.cut != (warned != "") {
				t.Fatalf("%s: cut warning %q, want cut %v", tc.name, warned, tc.w.cut)
			}
			if !tc.w.cut {
				if tc.w.lengthM > 0 && math.Abs(sp.LengthM-tc.w.lengthM) > 0.1 {
					t.Errorf("%s: span %s is %.2f m, want %.0f m as drawn", tc.name, sp.ID, sp.LengthM, tc.w.lengthM)
				}
				return
			}
			if math.Abs(sp.LengthM-tc.w.lengthM) > 0.1 || len(sp.SegmentsM()) != len(sp.BendsDeg)+1 {
				t.Errorf("%s: span %s is %.2f m with %d bends, want %.0f m", tc.name, sp.ID, sp.LengthM, len(sp.BendsDeg), tc.w.lengthM)
			}
			var j Junction
			for _, e := range n.EntrancesOf("B") {
				if e.Junction == sp.From || e.Junction == sp.To {
					j, _ = n.Junction(e.Junction)
				}
			}
			if j.ID == "" {
				t.Fatalf("%s: entrances %s, none at an end of %s", tc.name, entryList(n), sp.ID)
			}
			if DistanceM(j.Point, at(0, tc.w.entranceAtY)) > 0.02 {
				t.Errorf("%s: entrance at %v (junction %s), want where L crosses the wall, at (0, %.0f), the end of %s", tc.name, j.Point, j.ID, tc.w.entranceAtY, sp.ID)
			}
			if want := `(L): drawn through the wall of building "B" to a point 10.0 m inside it: cut at the wall, the 10.0 m not counted`; !strings.Contains(warned, want) {
				t.Errorf("%s: warning %q, want it to say %q and name L", tc.name, warned, want)
			}
		})
	}
}

// trayAt is a tray pathway along the line.
func trayAt(id string, ls ...orb.LineString) Pathway {
	p := pw(id, ls...)
	p.Type = TypeTray
	return p
}

// TestSplitInside: two laterals drawn from two streets to the middle of building B (a 20 m
// square at the origin, walls at ±10 m) meet 10 m inside it. Unless something joins them
// there, they are two service ducts through two walls: each is cut at its own wall crossing
// and B has an entrance at each, 40 m of outside plant each (README, wall cut; modelling
// choice, common practice, no published source: a duct bank meeting inside a building is
// drawn with a vault, a structure, where it joins).
func TestSplitInside(t *testing.T) {
	t.Parallel()
	streets := []Pathway{pw("SS", ml(-100, -50, 100, -50)), pw("SN", ml(-100, 50, 100, 50)), pw("W", ml(-100, -50, -100, 50))}
	cases := []struct {
		name    string
		meetY   float64 // where L1 (from the south street) and L2 (from the north) meet, on x = 0
		transit bool
		l2Type  string
		st      []Structure
		parted  bool
	}{
		{name: "laterals to the middle", parted: true},
		// Marked transit: the meeting point is how routes pass through it (README): as drawn.
		{name: "transit building", transit: true},
		// A vault drawn where they meet joins them: as drawn.
		{name: "meet at a structure", st: []Structure{{Source: Source{File: "t.geojson", Index: 9}, ID: "V-1", Type: StructureHandhole, Point: at(0, 0)}}},
		// A tray is an indoor pathway: as drawn.
		{name: "one is a tray", l2Type: TypeTray},
		// Meeting within snap_m (0.5 m) of the wall: the meeting is the entrance, as drawn.
		{name: "meet at the wall", meetY: -9.8},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			l1, l2 := pw("L1", ml(0, -50, 0, tc.meetY)), pw("L2", ml(0, 50, 0, tc.meetY))
			if tc.l2Type != "" {
				l2.Type = tc.l2Type
			}
			bl := box("B", 0, 0, 10)
			bl.Transit = tc.transit
			c := Campus{Buildings: []Building{bl}, Pathways: append(slices.Clone(streets), l1, l2), Structures: tc.st}
			n := build(t, &c)
			checkNetwork(t, n)
			s1, ok1 := n.Span("L1")
			s2, ok2 := n.Span("L2")
			if !ok1 || !ok2 {
				t.Fatalf("%s: spans %s, want L1 and L2 whole", tc.name, spanIDs(n))
			}
			var warned string
			for _, w := range n.Warnings {
				if strings.Contains(w.Message, "join nothing else there") {
					warned = w.Feature + ": " + w.Message
				}
			}
			tr, _ := n.TransitOf("B")
			if !tc.parted {
				if warned != "" || len(tr.Parted) > 0 {
					t.Errorf("%s: warning %q, parted %v; want L1 and L2 left joined", tc.name, warned, tr.Parted)
				}
				if s1.To != s2.To && s1.To != s2.From && s1.From != s2.To {
					t.Errorf("%s: L1 %s-%s and L2 %s-%s share no junction, want them joined where drawn", tc.name, s1.From, s1.To, s2.From, s2.To)
				}
				return
			}
			for _, c := range []struct {
				s     Span
				wallY float64
			}{{s1, -10}, {s2, 10}} {
				if math.Abs(c.s.LengthM-40) > 0.1 {
					t.Errorf("%s: span %s is %.2f m, want 40 m (cut at its wall)", tc.name, c.s.ID, c.s.LengthM)
				}
				found := false
				for _, e := range n.EntrancesOf("B") {
					if j, _ := n.Junction(e.Junction); (e.Junction == c.s.From || e.Junction == c.s.To) && DistanceM(j.Point, at(0, c.wallY)) < 0.02 {
						found = true
					}
				}
				if !found {
					t.Errorf("%s: entrances %s, none at (0, %.0f) where %s crosses the wall", tc.name, entryList(n), c.wallY, c.s.ID)
				}
			}
			if len(n.EntrancesOf("B")) != 2 {
				t.Errorf("%s: entrances %s, want 2", tc.name, entryList(n))
			}
			if want := `(L1): pathways L1 and L2 meet 10.0 m inside building "B" and join nothing else there: each is taken as its own duct through the wall, cut where it crosses it, one entrance each`; !strings.Contains(warned, want) {
				t.Errorf("%s: warning %q, want it to say %q", tc.name, warned, want)
			}
			if len(tr.Parted) != 1 || len(tr.Parted[0]) != 2 {
				t.Errorf("%s: parted %v, want the two wall junctions", tc.name, tr.Parted)
			}
		})
	}
}

// TestEntranceInside: a declared entrance is a point on the wall (README); one drawn more
// than 1 m inside the footprint (common practice, no published source) is warned about with
// its distance inside, as one outside it is.
func TestEntranceInside(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name string
		y    float64 // the entrance, at the end of lateral L, on x = 0; B's south wall at y = -10
		want string  // "" for no warning
	}{
		{name: "10 m inside", y: 0, want: `entrance "E-1" of building "B" is 10.0 m inside the building's footprint`},
		{name: "half a metre inside", y: -9.5},
		{name: "on the wall", y: -10},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := Campus{Buildings: []Building{box("B", 0, 0, 10)},
				Pathways:  []Pathway{pw("S", ml(-100, -50, 100, -50)), pw("L", ml(0, -50, 0, tc.y))},
				Entrances: []Entrance{{Source: Source{File: "t.geojson", Index: 3}, ID: "E-1", Building: "B", Point: at(0, tc.y)}}}
			n := build(t, &c)
			var got string
			for _, w := range n.Warnings {
				if strings.Contains(w.Message, "inside the building's footprint") {
					got = w.Message
				}
			}
			if (tc.want == "") != (got == "") || !strings.Contains(got, tc.want) {
				t.Errorf("%s: warning %q, want %q", tc.name, got, tc.want)
			}
		})
	}
}

// TestShortM: lengths below a metre keep their centimetres, so 0.514 m cut off does not read as
// the default snap_m, 0.5 m, which is not cut.
func TestShortM(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		m    float64
		want string
	}{{0.514, "0.51"}, {0.5, "0.50"}, {0.996, "1.0"}, {10.04, "10.0"}, {12.06, "12.1"}} {
		if got := shortM(tc.m); got != tc.want {
			t.Errorf("shortM(%v) = %q, want %q", tc.m, got, tc.want)
		}
	}
}
