package geo

import (
	"math"
	"testing"

	"github.com/paulmach/orb"
)

// TestSpanIndoors: the stretch of a span from an end inside a building's footprint back to
// its wall (Span.Indoors) is what NFPA 70 770.48(A) counts from the point of entrance, where
// the cable emerges through the external wall; it is measured along the line as Span.LengthM is
// (ellipsoidal, DistanceM). A tunnel from A's wall 90 m into the long building B has 90 m
// there; one that ends on B's wall has none; one that starts 10 m inside A has 10 m at A; a
// span between two junctions inside B (the tunnel split where a tray meets it) lies inside
// throughout, its whole length at both ends. A duct drawn 50 m into B to meet a tray there has
// none: its cable emerges from the floor slab where it ends (NFPA 70 770.2, point of entrance,
// from memory).
func TestSpanIndoors(t *testing.T) {
	t.Parallel()
	long := Building{Source: Source{File: "t.geojson", Index: 1}, ID: "B", RiserM: DefaultRiserM,
		Footprint: orb.MultiPolygon{{orb.Ring{at(200, -10), at(300, -10), at(300, 10), at(200, 10), at(200, -10)}}}}
	tunnel := func(xy ...float64) Pathway {
		p := pw("T", ml(xy...))
		p.Type, p.SpareDucts = TypeTunnel, 0
		return p
	}
	tray := pw("R", ml(250, 0, 250, 8))
	tray.Type, tray.SpareDucts = TypeTray, 0
	type want struct {
		span     string
		building string
		atTo     bool
		lengthM  float64
	}
	for _, tc := range []struct {
		name     string
		pathways []Pathway
		want     []want
	}{
		{"90 m into B", []Pathway{tunnel(10, 0, 290, 0)}, []want{{"T", "B", true, DistanceM(at(200, 0), at(290, 0))}}},
		{"to B's wall", []Pathway{tunnel(10, 0, 200, 0)}, nil},
		{"within snap_m of B's wall", []Pathway{tunnel(10, 0, 200.4, 0)}, nil},
		{"from 10 m inside A to B's wall", []Pathway{tunnel(0, 0, 200, 0)}, []want{{"T", "A", false, DistanceM(at(0, 0), at(10, 0))}}},
		{"a duct into B to a tray there", []Pathway{pw("D", ml(10, 0, 250, 0)), tray}, []want{
			{"R", "B", false, DistanceM(at(250, 0), at(250, 8))}, {"R", "B", true, DistanceM(at(250, 0), at(250, 8))}}},
		{"split inside B", []Pathway{tunnel(10, 0, 290, 0), tray}, []want{
			{"R", "B", false, DistanceM(at(250, 0), at(250, 8))}, {"R", "B", true, DistanceM(at(250, 0), at(250, 8))},
			{"T/1", "B", true, DistanceM(at(200, 0), at(250, 0))},
			{"T/2", "B", false, DistanceM(at(250, 0), at(290, 0))}, {"T/2", "B", true, DistanceM(at(250, 0), at(290, 0))}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := Campus{Buildings: []Building{box("A", 0, 0, 10), long}, Pathways: tc.pathways}
			n := build(t, &c)
			var got []want
			for _, s := range n.Spans {
				for _, in := range s.Indoors {
					got = append(got, want{s.ID, in.Building, in.AtTo, in.LengthM})
				}
			}
			if len(got) != len(tc.want) {
				t.Fatalf("indoors %+v, want %+v (spans %s)", got, tc.want, spanIDs(n))
			}
			for i, w := range tc.want {
				g := got[i]
				if g.span != w.span || g.building != w.building || g.atTo != w.atTo || math.Abs(g.lengthM-w.lengthM) > 0.001 {
					t.Errorf("indoors %d: %+v, want %+v", i, g, w)
				}
				s, _ := n.Span(g.span)
				if m, ok := s.IndoorM(w.building, w.atTo); !ok || m != g.lengthM {
					t.Errorf("%s.IndoorM(%s, %v) = %v, %v; want %v", g.span, w.building, w.atTo, m, ok, g.lengthM)
				}
				if (w.span == "R" || w.span == "T/2") && g.lengthM != s.LengthM {
					t.Errorf("%s lies inside B throughout: %v m of %v", w.span, g.lengthM, s.LengthM)
				}
			}
		})
	}
}

// TestSpanThrough (inside13): a tunnel that runs beneath a building from one wall to the other
// puts its cable inside that building there (NFPA 70 770.48(A) counts unlisted cable from the
// point of entrance, where it crosses the wall; from memory), though the building is at
// neither end: Span.Through lists it with the metres inside, measured along the line as
// Span.LengthM is. The plant building M, 40 m across with an entrance of its own (a duct to
// its north wall, so that its walls are not its entrances), has the tunnel from A to B
// crossing it for 40 m; a tray does as a tunnel; a duct drawn across M runs beneath its slab
// (Span.Beneath) and has no Through; a tunnel that only grazes M's corner within snap_m has
// none.
func TestSpanThrough(t *testing.T) {
	t.Parallel()
	plant := Building{Source: Source{File: "t.geojson", Index: 2}, ID: "M", RiserM: DefaultRiserM,
		Footprint: orb.MultiPolygon{{orb.Ring{at(80, -10), at(120, -10), at(120, 10), at(80, 10), at(80, -10)}}}}
	way := func(typ string, xy ...float64) Pathway {
		p := pw("T", ml(xy...))
		p.Type = typ
		if typ != TypeDuct {
			p.SpareDucts = 0
		}
		return p
	}
	for _, tc := range []struct {
		name    string
		way     Pathway
		through float64 // metres inside M, 0 for none
		beneath bool
	}{
		{"tunnel across M", way(TypeTunnel, 10, 0, 200, 0), DistanceM(at(80, 0), at(120, 0)), false},
		{"tray across M", way(TypeTray, 10, 0, 200, 0), DistanceM(at(80, 0), at(120, 0)), false},
		{"duct across M", way(TypeDuct, 10, 0, 200, 0), 0, true},
		{"tunnel along M's wall", way(TypeTunnel, 10, -10.3, 200, -10.3), 0, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := Campus{Buildings: []Building{box("A", 0, 0, 10), plant, box("B", 210, 0, 10)},
				Pathways: []Pathway{tc.way, pw("E", ml(100, 10, 100, 40, 5, 40, 5, 10))}}
			n := build(t, &c)
			s, ok := n.Span("T")
			if !ok {
				t.Fatalf("no span T: %s", spanIDs(n))
			}
			var got float64
			for _, x := range s.Through {
				if x.Building != "M" {
					t.Errorf("through %s; want M alone", x.Building)
				}
				got += x.LengthM
			}
			if math.Abs(got-tc.through) > 0.001 || (tc.through > 0) != (len(s.Through) == 1) {
				t.Errorf("through %+v; want %.3f m inside M", s.Through, tc.through)
			}
			if beneath := len(s.Beneath) == 1 && s.Beneath[0] == "M"; beneath != tc.beneath {
				t.Errorf("beneath %q; want M %v", s.Beneath, tc.beneath)
			}
		})
	}
}
