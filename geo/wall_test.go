package geo

import (
	"math"
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
					warned = w.Message
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
			if want := "1 pathway ends drawn through a building's wall to a point inside it are cut at the wall, 10.0 m in all"; !strings.Contains(warned, want) || !strings.Contains(warned, "L 10.0 m in B") {
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
