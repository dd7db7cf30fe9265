package geo

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// at turns metres east (x) and north (y) of an invented campus origin at 10°E, 50°N into
// lon/lat, roughly; tests that need exact lengths compare with DistanceM.
func at(x, y float64) orb.Point {
	const mPerDeg = 111195.0
	return orb.Point{10 + x/(mPerDeg*math.Cos(50*deg)), 50 + y/mPerDeg}
}

func ml(xy ...float64) orb.LineString {
	var ls orb.LineString
	for i := 0; i+1 < len(xy); i += 2 {
		ls = append(ls, at(xy[i], xy[i+1]))
	}
	return ls
}

func pw(id string, lines ...orb.LineString) Pathway {
	return Pathway{Source: Source{File: "t.geojson", Index: 0}, ID: id, Type: TypeDuct, Status: StatusExisting,
		SpareDucts: 1, DuctMM: DefaultDuctMM, EMI: EMINone, Group: id, Lines: lines}
}

// withSpare is p with n spare ducts.
func withSpare(p Pathway, n int) Pathway {
	p.SpareDucts = n
	return p
}

// box is a square building of side 2h metres centred on (x, y).
func box(id string, x, y, h float64) Building {
	r := orb.Ring{at(x-h, y-h), at(x+h, y-h), at(x+h, y+h), at(x-h, y+h), at(x-h, y-h)}
	return Building{Source: Source{File: "t.geojson", Index: 0}, ID: id, RiserM: DefaultRiserM, Footprint: orb.MultiPolygon{{r}}}
}

func build(t *testing.T, c *Campus) *Network {
	t.Helper()
	n, err := Build(c, Options{})
	if err != nil {
		t.Fatalf("build: %v", err)
	}
	return n
}

func spanIDs(n *Network) string {
	var ids []string
	for _, s := range n.Spans {
		ids = append(ids, s.ID+":"+s.From+">"+s.To)
	}
	return strings.Join(ids, " ")
}

func TestBuildNoding(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name          string
		c             Campus
		wantSpans     int
		wantJunctions int
		wantWarnings  int
		check         func(t *testing.T, n *Network)
	}{
		{
			name: "shared vertex joins",
			c: Campus{Pathways: []Pathway{
				pw("P1", ml(0, 0, 100, 0, 200, 0)),
				pw("P2", ml(100, -100, 100, 0, 100, 100)),
			}},
			wantSpans: 4, wantJunctions: 5,
			check: func(t *testing.T, n *Network) {
				s1, _ := n.Span("P1/1")
				s2, _ := n.Span("P2/1")
				if s1.To != s2.To {
					t.Errorf("P1/1 ends at %s, P2/1 at %s; want the same junction", s1.To, s2.To)
				}
			},
		},
		{
			name: "end on another line splits it",
			c: Campus{Pathways: []Pathway{
				pw("P1", ml(0, 0, 200, 0)),
				pw("P2", ml(100, 0.3, 100, 100)),
			}},
			wantSpans: 3, wantJunctions: 4,
			check: func(t *testing.T, n *Network) {
				a, _ := n.Span("P1/1")
				b, _ := n.Span("P1/2")
				p2, _ := n.Span("P2")
				if a.To != b.From || a.To != p2.From {
					t.Errorf("T junction not shared: %s", spanIDs(n))
				}
				j, _ := n.Junction(a.To)
				if j.Point != at(100, 0.3) {
					t.Errorf("T junction at %v, want the end vertex %v", j.Point, at(100, 0.3))
				}
				if math.Abs(a.LengthM-LengthM(a.Line)) > 1e-9 || math.Abs(a.LengthM-100) > 1 {
					t.Errorf("P1/1 length %.3f m, want about 100", a.LengthM)
				}
			},
		},
		{
			name: "crossing without vertex does not join",
			c: Campus{Pathways: []Pathway{
				pw("P1", ml(0, 0, 200, 0)),
				pw("P2", ml(100, -100, 100, 100)),
			}},
			wantSpans: 2, wantJunctions: 4, wantWarnings: 1,
			check: func(t *testing.T, n *Network) {
				w := n.Warnings[0]
				if !strings.Contains(w.Message, `pathways "P1" and "P2" cross at`) || w.Feature != "#0 (P1)" {
					t.Errorf("warning: got %+v", w)
				}
			},
		},
		{
			name: "structure splits both",
			c: Campus{
				Pathways:   []Pathway{pw("P1", ml(0, 0, 200, 0)), pw("P2", ml(100, -100, 100, 100))},
				Structures: []Structure{{ID: "MH-1", Type: StructureMaintenanceHole, Point: at(100.2, 0.2)}},
			},
			wantSpans: 4, wantJunctions: 5,
			check: func(t *testing.T, n *Network) {
				j, ok := n.Junction("MH-1")
				if !ok || j.Kind != JunctionStructure || j.StructureType != StructureMaintenanceHole || j.Point != at(100.2, 0.2) {
					t.Errorf("MH-1: got %+v", j)
				}
				for _, id := range []string{"P1/1", "P2/1"} {
					if s, _ := n.Span(id); s.To != "MH-1" {
						t.Errorf("%s ends at %q, want MH-1", id, s.To)
					}
				}
			},
		},
		{
			name: "parallel duct banks stay two spans",
			c: Campus{Pathways: []Pathway{
				pw("DB-A", ml(0, 0, 100, 0)),
				withSpare(pw("DB-B", ml(0, 0, 100, 0)), 3), // the same line, other ducts: warned of, kept
				pw("DB-C", ml(0, 0.2, 50, 5, 100, 0.2)),
			}},
			wantSpans: 3, wantJunctions: 2, wantWarnings: 1,
			check: func(t *testing.T, n *Network) {
				for _, s := range n.Spans {
					if s.From != n.Spans[0].From || s.To != n.Spans[0].To {
						t.Errorf("spans do not share ends: %s", spanIDs(n))
					}
				}
			},
		},
		{
			name:      "right-angle bend",
			c:         Campus{Pathways: []Pathway{pw("L", ml(0, 0, 100, 0, 100, 100))}},
			wantSpans: 1, wantJunctions: 2,
			check: func(t *testing.T, n *Network) {
				s := n.Spans[0]
				if len(s.BendsDeg) != 1 || math.Abs(s.BendsDeg[0]-90) > 0.01 {
					t.Errorf("bends: got %v, want [90]", s.BendsDeg)
				}
			},
		},
		{
			name: "multi-line numbering continues",
			c: Campus{Pathways: []Pathway{
				pw("M", ml(0, 0, 100, 0), ml(0, 50, 100, 50)),
				pw("X", ml(50, 50, 50, 100)),
			}},
			wantSpans: 4, wantJunctions: 6,
			check: func(t *testing.T, n *Network) {
				if got := spanIDs(n); !strings.Contains(got, "M/1:") || !strings.Contains(got, "M/3:") || strings.Contains(got, "M/4") {
					t.Errorf("got %s, want M/1..M/3", got)
				}
			},
		},
		{
			name:      "closed loop",
			c:         Campus{Pathways: []Pathway{pw("O", ml(0, 0, 100, 0, 100, 100, 0, 0))}},
			wantSpans: 1, wantJunctions: 1,
			check: func(t *testing.T, n *Network) {
				if s := n.Spans[0]; s.From != s.To || len(s.BendsDeg) != 2 {
					t.Errorf("loop: got %+v", s)
				}
			},
		},
		{
			name: "structure off the pathways warns",
			c: Campus{
				Pathways:   []Pathway{pw("P", ml(0, 0, 100, 0))},
				Structures: []Structure{{Source: Source{File: "t.geojson", Index: 3}, ID: "HH-9", Point: at(50, 5)}},
			},
			wantSpans: 1, wantJunctions: 2, wantWarnings: 1,
			check: func(t *testing.T, n *Network) {
				if w := n.Warnings[0]; w.Feature != "#3 (HH-9)" || !strings.Contains(w.Message, "not within 0.5 m of any pathway") {
					t.Errorf("warning: got %+v", w)
				}
			},
		},
		{
			name: "overshoot within SnapM joins",
			c: Campus{Pathways: []Pathway{
				pw("P1", ml(0, 0, 200, 0)),
				pw("P2", ml(100, -0.4, 100, 100)),
			}},
			wantSpans: 3, wantJunctions: 4,
		},
		{
			name: "gap beyond SnapM stays apart",
			c: Campus{Pathways: []Pathway{
				pw("P1", ml(0, 0, 200, 0)),
				pw("P2", ml(100, 0.8, 100, 100)),
			}},
			wantSpans: 2, wantJunctions: 4,
		},
		{
			name: "two structures on one vertex keep their names",
			c: Campus{
				Pathways: []Pathway{pw("P", ml(0, 0, 50, 0, 100, 0))},
				Structures: []Structure{
					{Source: Source{File: "t.geojson", Index: 1}, ID: "HH-1", Point: at(50, 0.1)},
					{Source: Source{File: "t.geojson", Index: 2}, ID: "HH-2", Point: at(50, -0.1)},
				},
			},
			wantSpans: 2, wantJunctions: 3, wantWarnings: 1,
			check: func(t *testing.T, n *Network) {
				if _, ok := n.Junction("HH-1"); !ok || !strings.Contains(n.Warnings[0].Message, `"HH-2"`) {
					t.Errorf("got junctions %v, warnings %v", n.Junctions, n.Warnings)
				}
			},
		},
		{
			name: "densely drawn lines meeting",
			c: Campus{Pathways: []Pathway{
				pw("D1", ml(0, 0, 49.9, 0, 50, 0, 50.1, 0, 100, 0)),
				pw("D2", ml(50, -50, 50, -0.1, 50.05, 0.05, 50, 0.1, 50, 50)),
			}},
			wantSpans: 4, wantJunctions: 5,
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			n := build(t, &tc.c)
			n.Warnings = notDangling(n.Warnings) // these campuses have no buildings: every free end dangles
			if len(n.Spans) != tc.wantSpans || len(n.Junctions) != tc.wantJunctions || len(n.Warnings) != tc.wantWarnings {
				t.Fatalf("%s: got %d spans, %d junctions, %d warnings; want %d, %d, %d\nspans %s\nwarnings %v",
					tc.name, len(n.Spans), len(n.Junctions), len(n.Warnings), tc.wantSpans, tc.wantJunctions, tc.wantWarnings,
					spanIDs(n), n.Warnings)
			}
			checkNetwork(t, n)
			if tc.check != nil {
				tc.check(t, n)
			}
		})
	}
}

// notDangling drops the warnings about pathway ends that join nothing.
func notDangling(ws []Warning) []Warning {
	var out []Warning
	for _, w := range ws {
		if !strings.Contains(w.Message, "joined to nothing") {
			out = append(out, w)
		}
	}
	return out
}

// checkNetwork checks the invariants every Network keeps.
func checkNetwork(t *testing.T, n *Network) {
	t.Helper()
	for i, s := range n.Spans {
		if i > 0 && n.Spans[i-1].ID >= s.ID {
			t.Errorf("spans not sorted: %s before %s", n.Spans[i-1].ID, s.ID)
		}
		from, ok1 := n.Junction(s.From)
		to, ok2 := n.Junction(s.To)
		if !ok1 || !ok2 {
			t.Errorf("span %s: unknown junction %q or %q", s.ID, s.From, s.To)
			continue
		}
		if len(s.Line) < 2 || s.Line[0] != from.Point || s.Line[len(s.Line)-1] != to.Point {
			t.Errorf("span %s: line %v does not run from %v to %v", s.ID, s.Line, from.Point, to.Point)
		}
		if !(s.LengthM >= 0) || math.Abs(s.LengthM-LengthM(s.Line)) > 1e-9 {
			t.Errorf("span %s: length %v", s.ID, s.LengthM)
		}
		if len(s.BendsDeg) != max(0, len(s.Line)-2) {
			t.Errorf("span %s: %d bends for %d points", s.ID, len(s.BendsDeg), len(s.Line))
		}
	}
	for i, j := range n.Junctions {
		if i > 0 && n.Junctions[i-1].ID >= j.ID {
			t.Errorf("junctions not sorted: %s before %s", n.Junctions[i-1].ID, j.ID)
		}
	}
	for i, a := range n.Access {
		if i > 0 && n.Access[i-1].Building >= a.Building {
			t.Errorf("access not sorted")
		}
		j, ok := n.Junction(a.Junction)
		if !ok {
			t.Errorf("access %s: unknown junction %q", a.Building, a.Junction)
			continue
		}
		if (a.LateralM == 0) != (len(a.Lateral) == 0) {
			t.Errorf("access %s: LateralM %v with lateral %v", a.Building, a.LateralM, a.Lateral)
		}
		if len(a.Lateral) > 0 && a.Lateral[len(a.Lateral)-1] != j.Point {
			t.Errorf("access %s: lateral ends at %v, junction at %v", a.Building, a.Lateral[len(a.Lateral)-1], j.Point)
		}
		// The chosen access is one of the building's entrances, the same in every field.
		found := false
		for _, e := range n.EntrancesOf(a.Building) {
			if e.Junction == a.Junction {
				found = true
				if !reflect.DeepEqual(e.Access, a) {
					t.Errorf("access %+v differs from its entrance %+v", a, e)
				}
			}
		}
		if !found {
			t.Errorf("access %s at %s is not among its entrances %v", a.Building, a.Junction, n.EntrancesOf(a.Building))
		}
	}
	ids := make(map[string]bool)
	for i, e := range n.Entrances {
		if i > 0 {
			p := n.Entrances[i-1]
			if p.Building > e.Building || (p.Building == e.Building && p.Junction >= e.Junction) {
				t.Errorf("entrances not sorted by building and junction: %s@%s before %s@%s", p.Building, p.Junction, e.Building, e.Junction)
			}
		}
		if e.ID == "" || ids[e.ID] {
			t.Errorf("entrance %+v: empty or repeated id", e)
		}
		ids[e.ID] = true
		if _, ok := n.Junction(e.Junction); !ok {
			t.Errorf("entrance %s: unknown junction %q", e.ID, e.Junction)
		}
	}
	if len(n.Meetings) != len(n.Junctions) {
		t.Errorf("%d meetings for %d junctions", len(n.Meetings), len(n.Junctions))
	}
	for i, m := range n.Meetings {
		if i < len(n.Junctions) && m.Junction != n.Junctions[i].ID {
			t.Errorf("meeting %d is at %s, junction %d is %s", i, m.Junction, i, n.Junctions[i].ID)
		}
	}
}

func TestBuildLengthEllipsoidal(t *testing.T) {
	t.Parallel()
	// REFERENCES.md, campus scale (computed with GeographicLib): (40.0, -75.0) → (40.0045,
	// -75.0) is 499.656 m.
	c := Campus{Pathways: []Pathway{pw("N", orb.LineString{{-75, 40}, {-75, 40.0045}})}}
	n := build(t, &c)
	if got := n.Spans[0].LengthM; math.Abs(got-499.656) > 0.001 {
		t.Errorf("got %.4f m, want 499.656", got)
	}
}

func TestBuildAccess(t *testing.T) {
	t.Parallel()
	trunk := pw("T", ml(0, 0, 300, 0))
	cases := []struct {
		name         string
		c            Campus
		want         Access // Junction "" means any
		wantLateralM float64
		wantSpans    int
	}{
		{
			name: "entrance on the pathway",
			c: Campus{Buildings: []Building{box("B", 100, 20, 10)}, Pathways: []Pathway{trunk, pw("S", ml(100, 0, 100, 10))},
				Entrances: []Entrance{{Building: "B", Point: at(100, 10.2)}}},
			want: Access{Building: "B", Junction: "E-B", Via: ViaEntrance}, wantSpans: 3,
		},
		{
			name: "entrance off the pathway takes a lateral",
			c: Campus{Buildings: []Building{box("B", 100, 20, 10)}, Pathways: []Pathway{trunk},
				Entrances: []Entrance{{ID: "E1", Building: "B", Point: at(120, 10)}}},
			want: Access{Building: "B", Via: ViaEntrance}, wantLateralM: 10, wantSpans: 2,
		},
		{
			name: "pathway end inside the footprint",
			c:    Campus{Buildings: []Building{box("B", 100, 20, 10)}, Pathways: []Pathway{trunk, pw("S", ml(100, 0, 100, 15))}},
			want: Access{Building: "B", Via: ViaFootprint}, wantSpans: 3,
		},
		{
			name: "nearest pathway within the lateral limit",
			c:    Campus{Buildings: []Building{box("B", 100, 22, 10)}, Pathways: []Pathway{trunk}},
			want: Access{Building: "B", Via: ViaLateral}, wantLateralM: 12, wantSpans: 2,
		},
		{
			name: "lateral to a vertex",
			c:    Campus{Buildings: []Building{box("B", 100, 22, 10)}, Pathways: []Pathway{pw("T", ml(0, 0, 100.3, 0, 300, 0))}},
			want: Access{Building: "B", Via: ViaLateral}, wantLateralM: 12, wantSpans: 2,
		},
		{
			// entered where it crosses the wall (the west one, J0002), not at a junction
			// inside: the trunk is cut at both walls
			name: "pathway through the building",
			c:    Campus{Buildings: []Building{box("B", 100, 0, 10)}, Pathways: []Pathway{trunk}},
			want: Access{Building: "B", Via: ViaFootprint, Junction: "J0002"}, wantSpans: 3,
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			n := build(t, &tc.c)
			checkNetwork(t, n)
			a, ok := n.AccessOf("B")
			if !ok {
				t.Fatalf("no access for B")
			}
			if a.Via != tc.want.Via || (tc.want.Junction != "" && a.Junction != tc.want.Junction) {
				t.Errorf("%s: got %+v, want %+v", tc.name, a, tc.want)
			}
			if math.Abs(a.LateralM-tc.wantLateralM) > 0.1 {
				t.Errorf("%s: lateral %.3f m, want %.1f", tc.name, a.LateralM, tc.wantLateralM)
			}
			if len(n.Spans) != tc.wantSpans {
				t.Errorf("%s: got spans %s, want %d", tc.name, spanIDs(n), tc.wantSpans)
			}
		})
	}
}

func TestBuildFootprintPicksBusiestEnd(t *testing.T) {
	t.Parallel()
	// Two pathway ends on the footprint's walls: a dead-end spur (1 span) and the end where
	// two pathways meet (2 spans); the busier one wins. (Ends meeting farther inside than
	// snap_m are parted, TestSplitInside.)
	c := Campus{
		Buildings: []Building{box("B", 0, 0, 10)},
		Pathways: []Pathway{
			pw("SPUR", ml(-10, 0, -100, 0)),
			pw("A", ml(10, 0, 100, 0)),
			pw("C", ml(10, 0, 100, -100)),
		},
	}
	n := build(t, &c)
	a, _ := n.AccessOf("B")
	s, _ := n.Span("A")
	if a.Via != ViaFootprint || a.Junction != s.From {
		t.Errorf("got %+v, want the junction %s shared by A and C", a, s.From)
	}
}

func TestBuildErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name string
		c    Campus
		opt  Options
		want string
	}{
		{"bad options", Campus{}, Options{SnapM: -1}, "bad options"},
		{"bad near-miss option", Campus{}, Options{NearMissM: math.Inf(1)}, "NearMissM +Inf"},
		{"hand-built short line", Campus{Pathways: []Pathway{pw("T", orb.LineString{at(0, 0), at(0, 0)})}},
			Options{}, `feature #0 "T": geometry: want a line of at least two distinct positions`},
		{"hand-built duplicate", Campus{Pathways: []Pathway{pw("T", ml(0, 0, 1, 1)), pw("T", ml(0, 0, 1, 1))}},
			Options{}, `duplicate pathway id "T"`},
		{"hand-built NaN", Campus{Structures: []Structure{{ID: "S", Point: orb.Point{math.NaN(), 0}}}},
			Options{}, `not a finite number`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			_, err := Build(&tc.c, tc.opt)
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: got %v, want %q", tc.name, err, tc.want)
			}
		})
	}
}

// TestUnjoined: a building no pathway joins (none within max_lateral_m of its footprint, nor
// of its declared entrance) does not stop the build, since a campus holds buildings no plan
// serves: it gets no Access and no entrance, and is listed in Unjoined with the problem that
// a plan serving it reports (naming its file and feature); the building beside it that a
// pathway reaches is joined as before.
func TestUnjoined(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name string
		c    Campus
		opt  Options
		want string
	}{
		{"too far", Campus{Buildings: []Building{box("B", 0, 100, 10)}},
			Options{}, `t.geojson: feature #0 "B": no pathway within 30 m of the footprint (design: max_lateral_m)`},
		{"entrance too far", Campus{Buildings: []Building{box("B", 0, 100, 10)},
			Entrances: []Entrance{{Building: "B", Point: at(0, 90)}}},
			Options{}, `t.geojson: feature #0 "B": no pathway within 30 m of its entrance (design: max_lateral_m)`},
		{"limit option", Campus{Buildings: []Building{box("B", 0, 30, 10)}},
			Options{MaxLateralM: 5}, `t.geojson: feature #0 "B": no pathway within 5 m of the footprint (design: max_lateral_m)`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			tc.c.Buildings = append(tc.c.Buildings, box("A", 50, 0, 5))
			tc.c.Pathways = []Pathway{pw("T", ml(0, 0, 100, 0))}
			n, err := Build(&tc.c, tc.opt)
			if err != nil {
				t.Fatalf("%s: got %v, want no error", tc.name, err)
			}
			if _, ok := n.AccessOf("B"); ok || len(n.EntrancesOf("B")) > 0 {
				t.Errorf("%s: building B has a way in: %v", tc.name, n.EntrancesOf("B"))
			}
			if _, ok := n.AccessOf("A"); !ok {
				t.Errorf("%s: building A, on the pathway, has no access", tc.name)
			}
			if len(n.Unjoined) != 1 || n.Unjoined[0].Building != "B" {
				t.Fatalf("%s: got unjoined %+v, want building B alone", tc.name, n.Unjoined)
			}
			p := n.Unjoined[0].Problem("; what fixes it")
			if !errors.Is(p, ErrUnreachable) || p.Error() != tc.want+"; what fixes it" {
				t.Errorf("%s: got %q (ErrUnreachable %v), want %q", tc.name, p.Error(), errors.Is(p, ErrUnreachable), tc.want+"; what fixes it")
			}
			if w := n.Unjoined[0].Warning(""); w.File != "t.geojson" || w.Feature != "#0 (B)" || !strings.HasSuffix(tc.want, w.Message) {
				t.Errorf("%s: got warning %+v", tc.name, w)
			}
		})
	}
}

// grid campus: a street grid of duct pathways with buildings in the blocks, entrances on some.
func gridCampus(nx, ny int, rng *rand.Rand) Campus {
	var c Campus
	const blockM = 80.0
	for i := 0; i <= nx; i++ {
		var ls orb.LineString
		for j := 0; j <= ny; j++ {
			ls = append(ls, at(float64(i)*blockM, float64(j)*blockM+rng.Float64()*0.1))
		}
		c.Pathways = append(c.Pathways, pw("V"+itoa(i), ls))
	}
	for j := 0; j <= ny; j++ {
		var ls orb.LineString
		for i := 0; i <= nx; i++ {
			ls = append(ls, at(float64(i)*blockM+rng.Float64()*0.1, float64(j)*blockM))
		}
		c.Pathways = append(c.Pathways, pw("H"+itoa(j), ls))
	}
	for i := 0; i < nx; i++ {
		for j := 0; j < ny; j++ {
			id := "B" + itoa(i) + "-" + itoa(j)
			x, y := (float64(i)+0.5)*blockM, (float64(j)+0.5)*blockM
			c.Buildings = append(c.Buildings, box(id, x, y, 20+rng.Float64()*5))
			switch (i + j) % 3 {
			case 0:
				c.Entrances = append(c.Entrances, Entrance{Building: id, Point: at(x, y-blockM/2)})
			case 1:
				c.Pathways = append(c.Pathways, pw("S"+id, ml(x, y, x, y-blockM/2)))
			}
			if (i+2*j)%5 == 0 {
				c.Structures = append(c.Structures, Structure{ID: "MH" + id, Point: at(float64(i)*blockM, y)})
			}
		}
	}
	return c
}

func itoa(i int) string { return string(rune('a'+i/26)) + string(rune('a'+i%26)) }

func TestBuildDeterministic(t *testing.T) {
	t.Parallel()
	c := gridCampus(6, 5, rand.New(rand.NewPCG(1, 2)))
	n1 := build(t, &c)
	checkNetwork(t, n1)
	if len(n1.Access) != len(c.Buildings) {
		t.Fatalf("got %d accesses for %d buildings", len(n1.Access), len(c.Buildings))
	}
	n2 := build(t, &c)
	if !reflect.DeepEqual(n1, n2) {
		t.Fatal("two builds of the same campus differ")
	}
	// Reorder every feature list: junction and span IDs must not change.
	rng := rand.New(rand.NewPCG(3, 4))
	s := c
	s.Pathways = append([]Pathway(nil), c.Pathways...)
	s.Buildings = append([]Building(nil), c.Buildings...)
	s.Structures = append([]Structure(nil), c.Structures...)
	s.Entrances = append([]Entrance(nil), c.Entrances...)
	rng.Shuffle(len(s.Pathways), func(i, j int) { s.Pathways[i], s.Pathways[j] = s.Pathways[j], s.Pathways[i] })
	rng.Shuffle(len(s.Buildings), func(i, j int) { s.Buildings[i], s.Buildings[j] = s.Buildings[j], s.Buildings[i] })
	rng.Shuffle(len(s.Structures), func(i, j int) { s.Structures[i], s.Structures[j] = s.Structures[j], s.Structures[i] })
	rng.Shuffle(len(s.Entrances), func(i, j int) { s.Entrances[i], s.Entrances[j] = s.Entrances[j], s.Entrances[i] })
	n3 := build(t, &s)
	if got, want := spanIDs(n3), spanIDs(n1); got != want {
		t.Errorf("shuffled input: spans\n%s\nwant\n%s", got, want)
	}
	if !reflect.DeepEqual(n3, n1) {
		t.Errorf("shuffled input: networks differ")
	}
}

func TestParseThenBuild(t *testing.T) {
	t.Parallel()
	c, err := Parse("campus.geojson", []byte(validCampus))
	if err != nil {
		t.Fatal(err)
	}
	n := build(t, c)
	checkNetwork(t, n)
	// Pathway "7" runs from B-1's edge through MH-1 to B-2's entrance.
	if got := spanIDs(n); got != "7/1:J0001>MH-1 7/2:MH-1>E-B-2" {
		t.Errorf("spans: got %s", got)
	}
	a1, _ := n.AccessOf("B-1")
	a2, _ := n.AccessOf("B-2")
	if a1.Via != ViaFootprint || a1.Junction != "J0001" || a2.Via != ViaEntrance || a2.Junction != "E-B-2" {
		t.Errorf("access: got %+v and %+v", a1, a2)
	}
	if j, _ := n.Junction("E-B-2"); j.Kind != JunctionEntrance {
		t.Errorf("entrance junction: got %+v", j)
	}
	s, _ := n.Span("7/1")
	if s.Type != TypeTunnel || s.Status != StatusProposed || s.SpareDucts != 3 || s.DuctMM != 50 ||
		s.EMI != EMIHigh || s.Surface != SurfaceAsphalt || s.Group != "north bank" || s.PathwayID != "7" {
		t.Errorf("span properties: got %+v", s)
	}
}

// TestLateralBesideParallelEdge: a building whose edge runs parallel to a pathway is equally
// near the pathway all along the edge; its lateral joins the pathway opposite the building's
// centre, and tilting the pathway by a millimetre either way moves the join by millimetres,
// not from one end of the edge to the other.
func TestLateralBesideParallelEdge(t *testing.T) {
	t.Parallel()
	join := func(tiltM float64) orb.Point {
		c := &Campus{Buildings: []Building{box("B", 50, 20, 10)},
			Pathways: []Pathway{pw("P", ml(0, 0, 100, tiltM))}}
		n := build(t, c)
		for _, a := range n.Access {
			j, _ := n.Junction(a.Junction)
			return j.Point
		}
		t.Fatal("no access")
		return orb.Point{}
	}
	flat := join(0)
	for _, tilt := range []float64{-0.001, 0.001} {
		if d := DistanceM(flat, join(tilt)); d > 0.01 {
			t.Errorf("tilt %+g m: the lateral's join moved %.3f m", tilt, d)
		}
	}
	if d := DistanceM(flat, at(50, 0)); d > 0.01 {
		t.Errorf("the lateral joins %.3f m from the point opposite the centre", d)
	}
}

// TestLateralToSlantedPathway: a long building beside a pathway that comes within 2 m of it
// at one end and slants away: the lateral joins where the pathway is near, not opposite the
// centre where it is 12 m off.
func TestLateralToSlantedPathway(t *testing.T) {
	t.Parallel()
	r := orb.Ring{at(-100, 0), at(100, 0), at(100, 5), at(-100, 5), at(-100, 0)}
	c := &Campus{Buildings: []Building{{Source: Source{File: "t.geojson", Index: 0}, ID: "B", RiserM: DefaultRiserM, Footprint: orb.MultiPolygon{{r}}}},
		Pathways: []Pathway{pw("P", ml(-100, 7, 100, 27))}}
	n, err := Build(c, Options{MaxLateralM: 10})
	if err != nil {
		t.Fatalf("build: %v", err)
	}
	if len(n.Access) != 1 || n.Access[0].LateralM > 3 {
		t.Errorf("access %+v: want a lateral of about 2 m", n.Access)
	}
}

// TestVertexOnStraightRunNearJunction: a vertex drawn on a straight run 5 to 60 cm from a
// junction (the same line, no metres added) moves no junction and changes no span's length:
// a junction's point is where the pathways meet (a structure or entrance, else a pathway end,
// else a vertex two lines share, else a bend), never a vertex that only lies on a straight run
// within snap_m of the others; such a vertex is no place for a stem's end or a lateral to join
// either. Before, the junction went to the westernmost vertex of its group: the new vertex,
// up to 0.6 m away.
//
// Where the junction's point lies off the run (a structure, or a stem's end, 0.2 or 0.3 m
// beside it: within snap_m), a vertex beyond snap_m of it stays in the span's line, which then
// runs from it to the junction's point: o²/2L longer for a point o off the run and a vertex L
// before it (7 cm for 0.3 m at 0.6 m), as the drawing says; those cases stop at snap_m.
func TestVertexOnStraightRunNearJunction(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name    string
		offLine bool                    // the junction's point lies off the run, within snap_m
		c       func(dM float64) Campus // dM < 0: as drawn, without the vertex
	}{
		{"ends that do not quite meet", false, func(dM float64) Campus {
			a := ml(0, 0, 100, 0)
			if dM >= 0 {
				a = ml(0, 0, 100-dM, 0, 100, 0)
			}
			return Campus{Pathways: []Pathway{pw("A", a), pw("B", ml(100, 0, 100, 100)), pw("C", ml(100.2, 0.1, 200, 0))}}
		}},
		{"a stem's end snapped onto a run", true, func(dM float64) Campus {
			r := ml(0, 0, 200, 0)
			if dM >= 0 {
				r = ml(0, 0, 100-dM, 0, 200, 0)
			}
			return Campus{Pathways: []Pathway{pw("R", r), pw("S", ml(100, 0.3, 100, 100))}}
		}},
		{"a crossing drawn through a shared vertex", false, func(dM float64) Campus {
			a := ml(0, 0, 100, 0, 200, 0)
			if dM >= 0 {
				a = ml(0, 0, 100-dM, 0, 100, 0, 200, 0)
			}
			return Campus{Pathways: []Pathway{pw("A", a), pw("B", ml(100, -100, 100, 0, 100, 100))}}
		}},
		{"a structure beside a run", true, func(dM float64) Campus {
			r := ml(0, 0, 200, 0)
			if dM >= 0 {
				r = ml(0, 0, 100-dM, 0, 200, 0)
			}
			return Campus{Pathways: []Pathway{pw("R", r)},
				Structures: []Structure{{Source: Source{File: "t.geojson", Index: 1}, ID: "HH-1", Point: at(100, 0.2)}}}
		}},
		{"a counted lateral's tap", false, func(dM float64) Campus {
			// The building's centre is opposite x = 100.
			r := ml(0, 0, 200, 0)
			if dM >= 0 {
				r = ml(0, 0, 100-dM, 0, 200, 0)
			}
			return Campus{Pathways: []Pathway{pw("R", r)}, Buildings: []Building{box("B", 100, 15, 5)}}
		}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			c0 := tc.c(-1)
			base := build(t, &c0)
			for _, dM := range []float64{0.05, 0.3, 0.45, 0.6} {
				if tc.offLine && dM > DefaultSnapM {
					continue
				}
				c := tc.c(dM)
				n := build(t, &c)
				if len(n.Junctions) != len(base.Junctions) || len(n.Spans) != len(base.Spans) {
					t.Errorf("vertex %.2f m off: %d junctions, %d spans (%s); want %d, %d (%s)", dM,
						len(n.Junctions), len(n.Spans), spanIDs(n), len(base.Junctions), len(base.Spans), spanIDs(base))
					continue
				}
				for i, j := range n.Junctions {
					if b := base.Junctions[i]; j.ID != b.ID || DistanceM(j.Point, b.Point) > 1e-6 {
						t.Errorf("vertex %.2f m off: junction %s at %v, %.3f m from %s as drawn without it", dM, j.ID, j.Point, DistanceM(j.Point, b.Point), b.ID)
					}
				}
				for i, s := range n.Spans {
					if b := base.Spans[i]; s.ID != b.ID || math.Abs(s.LengthM-b.LengthM) > 1e-5 {
						t.Errorf("vertex %.2f m off: span %s %.4f m, want %s %.4f m", dM, s.ID, s.LengthM, b.ID, b.LengthM)
					}
				}
				if len(n.Access) != len(base.Access) || (len(n.Access) > 0 && math.Abs(n.Access[0].LateralM-base.Access[0].LateralM) > 1e-6) {
					t.Errorf("vertex %.2f m off: access %+v, want %+v", dM, n.Access, base.Access)
				}
			}
		})
	}
}

// TestLateralTapOnDensifiedRun: a run drawn with a vertex every 10 cm around where a counted
// lateral taps it, each 0.08 mm to one side or the other of the line (a GIS file's last
// digit: 1e-9° is 0.08 to 0.11 mm), taps where the straight run does, within a tenth of a
// millimetre. The tap is the foot of the building's centre on the line simplified within
// BendToleranceM, brought back to the drawn line; on the drawn 10 cm segment it would swing
// by up to 15 m × 1.6e-3 rad, about 2.4 cm (13 mm here, before).
func TestLateralTapOnDensifiedRun(t *testing.T) {
	t.Parallel()
	straight := ml(0, 0, 200, 0)
	dense := ml(0, 0)
	for i := -10; i <= 10; i++ {
		dense = append(dense, at(100+0.1*float64(i)+0.013, 0.00008*float64(1-2*(i&1))))
	}
	dense = append(dense, at(200, 0))
	var taps [2]Access
	var points [2]orb.Point
	for k, line := range []orb.LineString{straight, dense} {
		n := build(t, &Campus{Pathways: []Pathway{pw("R", line)}, Buildings: []Building{box("B", 100, 15, 5)}})
		if len(n.Access) != 1 || n.Access[0].Via != ViaLateral {
			t.Fatalf("access %+v: want one counted lateral", n.Access)
		}
		taps[k] = n.Access[0]
		j, _ := n.Junction(taps[k].Junction)
		points[k] = j.Point
	}
	if d := DistanceM(points[0], points[1]); d > 1e-4 {
		t.Errorf("the tap is %.2f mm from the straight run's", d*1000)
	}
	if d := math.Abs(taps[0].LateralM - taps[1].LateralM); d > 1e-4 {
		t.Errorf("the lateral is %.4f m, %.4f m on the straight run", taps[1].LateralM, taps[0].LateralM)
	}
}

// Junction numbers name handholes to build in a bid (the bill, the structures table, each
// leg's turns), so a redraw that changes nothing in the ground must not change them (tester
// 10, F7): every vertex moved 1 mm (a re-export, a reprojection round trip), and a street
// split into two features at a vertex where nothing joins it. The campus is a street grid
// drawn the way hand-made and generated files are: north–south streets at one exact
// longitude (one of them a whole degree), laterals off them, so that ordering by longitude
// then latitude (as before) let a millimetre reorder a street's junctions. The split point
// takes no number: it is named by the spans that meet there.
func TestJunctionNumbersKept(t *testing.T) {
	t.Parallel()
	campus := func(split bool, move func(orb.Point) orb.Point) *Campus {
		c := &Campus{}
		add := func(id string, xy ...float64) {
			l := ml(xy...)
			for i := range l {
				l[i] = move(l[i])
			}
			c.Pathways = append(c.Pathways, pw(id, l))
		}
		for i, x := range []float64{0, 80, 160} {
			if split && i == 1 {
				add("NS-1", x, 0, x, 30)
				add("NS-1b", x, 30, x, 60, x, 120)
				continue
			}
			add(fmt.Sprintf("NS-%d", i), x, 0, x, 30, x, 60, x, 120)
		}
		for j, y := range []float64{0, 60, 120} {
			add(fmt.Sprintf("EW-%d", j), 0, y, 80, y, 160, y)
		}
		for k, y := range []float64{10, 20, 45, 75, 90, 105} { // laterals east and west of each street
			for i, x := range []float64{0, 80, 160} {
				add(fmt.Sprintf("L-%d-%d", i, k), x, y, x+6*float64(1-2*(k%2)), y)
			}
		}
		return c
	}
	same := func(p orb.Point) orb.Point { return p }
	names := func(n *Network) map[string]orb.Point {
		out := map[string]orb.Point{}
		for _, j := range n.Junctions {
			out[j.ID] = j.Point
		}
		return out
	}
	base := build(t, campus(false, same))
	want := names(base)
	if len(want) < 40 {
		t.Fatalf("%d junctions, want the grid's 40 or more", len(want))
	}
	check := func(what string, got map[string]orb.Point, tolM float64) {
		t.Helper()
		for id, p := range want {
			if q, ok := got[id]; !ok || DistanceM(p, q) > tolM {
				t.Errorf("%s: junction %s at %v, now %v (present %v)", what, id, p, q, ok)
			}
		}
	}
	for trial := range 5 {
		r := rand.New(rand.NewPCG(7, uint64(trial)))
		moved := map[orb.Point]orb.Point{}
		move := func(p orb.Point) orb.Point {
			if q, ok := moved[p]; ok {
				return q
			}
			a := r.Float64() * 2 * math.Pi
			q := orb.Point{p[0] + 1e-3*math.Cos(a)/(111195*math.Cos(50*deg)), p[1] + 1e-3*math.Sin(a)/111195}
			moved[p] = q
			return q
		}
		n := build(t, campus(false, move))
		got := names(n)
		check(fmt.Sprintf("trial %d, every vertex 1 mm off", trial), got, 0.005)
		if len(got) != len(want) {
			t.Errorf("trial %d: %d junctions, want %d", trial, len(got), len(want))
		}
	}
	n := build(t, campus(true, same))
	got := names(n)
	check("NS-1 split at (80, 30)", got, 1e-6)
	joint := "NS-1/3+NS-1b/1" // the spans that meet there: laterals cut NS-1, EW-1 NS-1b
	if p, ok := got[joint]; !ok || DistanceM(p, at(80, 30)) > 1e-6 || len(got) != len(want)+1 {
		t.Errorf("split: junctions %v; want those of the unsplit grid and %s at the split point", got, joint)
	}
	if m, ok := n.MeetingAt(joint); !ok || m.Degree != 2 {
		t.Errorf("split: meeting at %s %+v, want the two pieces", joint, m)
	}
}
