package geo

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/simplify"
)

func TestSegmentsM(t *testing.T) {
	t.Parallel()
	n := build(t, &Campus{Pathways: []Pathway{pw("L", ml(0, 0, 100, 0, 100, 60, 130, 100))}})
	if len(n.Spans) != 1 {
		t.Fatalf("spans: %s", spanIDs(n))
	}
	sp := n.Spans[0]
	segs := sp.SegmentsM()
	if len(segs) != len(sp.BendsDeg)+1 {
		t.Fatalf("segments: got %d, want %d", len(segs), len(sp.BendsDeg)+1)
	}
	sum := 0.0
	for i, s := range segs {
		// Each segment is measured by DistanceM, checked against GeographicLib in geodesic_test.go.
		if want := DistanceM(sp.Line[i], sp.Line[i+1]); s != want {
			t.Errorf("segment %d: got %v, want %v", i, s, want)
		}
		sum += s
	}
	if math.Abs(sum-sp.LengthM) > 1e-9 {
		t.Errorf("segments sum to %v, want LengthM %v", sum, sp.LengthM)
	}
	// The metre grid of at() is a rough one: 100, 60 and 50 m (a 3-4-5 triangle) within 0.5 %.
	for i, want := range []float64{100, 60, 50} {
		if math.Abs(segs[i]-want) > 0.005*want {
			t.Errorf("segment %d: got %.2f m, want about %.0f m", i, segs[i], want)
		}
	}
	if (&Span{}).SegmentsM() != nil {
		t.Errorf("a span without a line has segments")
	}
}

func TestTurnDeg(t *testing.T) {
	t.Parallel()
	// Four pathways meeting at structure-free junctions: A west to east, then B north, C
	// straight on east, and E north-east from B's end.
	n := build(t, &Campus{Pathways: []Pathway{
		pw("A", ml(0, 0, 100, 0)),
		pw("B", ml(100, 0, 100, 80)),
		pw("C", ml(100, 0, 200, 0)),
		pw("E", ml(100, 80, 160, 160)),
	}})
	id := func(p string) string {
		for _, s := range n.Spans {
			if s.PathwayID == p {
				return s.ID
			}
		}
		t.Fatalf("no span of %s in %s", p, spanIDs(n))
		return ""
	}
	a, b, c, e := id("A"), id("B"), id("C"), id("E")
	// Expected angles are plane geometry on the test grid (computed): a right angle, straight
	// on, a full reversal, and the 3-4-5 triangle's 36.87° (atan(3/4)) from north to E.
	cases := []struct {
		name string
		x, y Step
		want float64
	}{
		{"right-angle turn north", Step{SpanID: a}, Step{SpanID: b}, 90},
		{"straight on", Step{SpanID: a}, Step{SpanID: c}, 0},
		{"doubling back", Step{SpanID: a}, Step{SpanID: a, Reverse: true}, 180},
		{"reverse travel, turn south then west", Step{SpanID: b, Reverse: true}, Step{SpanID: a, Reverse: true}, 90},
		{"reverse travel, straight on west", Step{SpanID: c, Reverse: true}, Step{SpanID: a, Reverse: true}, 0},
		{"north then north-east", Step{SpanID: b}, Step{SpanID: e}, math.Atan2(3, 4) * 180 / math.Pi},
		{"spans that do not meet", Step{SpanID: a}, Step{SpanID: e}, 0},
		{"wrong direction", Step{SpanID: a, Reverse: true}, Step{SpanID: b}, 0},
		{"unknown span", Step{SpanID: "nope"}, Step{SpanID: b}, 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if got := n.TurnDeg(tc.x, tc.y); math.Abs(got-tc.want) > 0.05 {
				t.Errorf("%s: got %.3f°, want %.3f°", tc.name, got, tc.want)
			}
		})
	}
}

func TestBendsDegDrawingNoise(t *testing.T) {
	t.Parallel()
	// jitter densifies a line every stepM metres, each new vertex offM to alternate sides.
	jitter := func(stepM, offM float64, xy ...float64) []float64 {
		out := []float64{xy[0], xy[1]}
		k := 0
		for i := 2; i+1 < len(xy); i += 2 {
			x0, y0, x1, y1 := xy[i-2], xy[i-1], xy[i], xy[i+1]
			l := math.Hypot(x1-x0, y1-y0)
			m := int(l / stepM)
			for j := 1; j < m; j++ {
				k++
				s := offM
				if k%2 == 0 {
					s = -offM
				}
				f := float64(j) / float64(m)
				out = append(out, x0+(x1-x0)*f-(y1-y0)/l*s, y0+(y1-y0)*f+(x1-x0)/l*s)
			}
			out = append(out, x1, y1)
		}
		return out
	}
	// A quarter circle of radius 30 m drawn with a vertex every 3° of arc: 30 vertices.
	var arc []float64
	for a := 0; a <= 90; a += 3 {
		r := float64(a) * math.Pi / 180
		arc = append(arc, 30*math.Sin(r), 30-30*math.Cos(r))
	}
	scaled := func(xy []float64, k float64) []float64 {
		out := make([]float64, len(xy))
		for i, v := range xy {
			out[i] = v * k
		}
		return out
	}
	cases := []struct {
		name string
		line []float64
		// want is the sum of the span's bends in degrees; the expectations are plane
		// geometry (the lines are drawn on a metre grid), with BendToleranceM's reasoning:
		// a vertex within it of the straight line is no bend.
		want, tolDeg float64
	}{
		// A straight 30.6 m duct with a vertex 1 mm off the line at mid-length and one back on
		// the line 2 mm on (as a digitizing spike is drawn): no bend, where the raw vertices
		// read 90° + ~143° + ~53°.
		{"digitizing spike of 1 mm", []float64{0, 0, 15.3, 0, 15.3, 0.001, 15.302, 0, 30.6, 0}, 0, 0.01},
		// A 40 m duct densified every 2 m with vertices ±10 cm to either side: no bend.
		{"jitter of 10 cm every 2 m", jitter(2, 0.1, 0, 0, 40, 0), 0, 0.01},
		{"jittered L keeps its corner", jitter(2, 0.1, 0, 0, 30, 0, 30, 30), 90, 1},
		{"a real right angle", []float64{0, 0, 30, 0, 30, 30}, 90, 0.01},
		// A right-angle bend drawn as two 45° turns with a 1 m chamfer: still 90° in all.
		{"right angle with a 1 m chamfer", []float64{0, 0, 20 - math.Sqrt2/2, 0, 20, math.Sqrt2 / 2, 20, 20}, 90, 0.01},
		// The same with a 0.2 m chamfer, shorter than the tolerance: one vertex kept, its
		// turn within 1° of 90° (the chamfer's 0.14 m offset over 20 m legs).
		{"right angle with a 0.2 m chamfer", []float64{0, 0, 20 - 0.1*math.Sqrt2, 0, 20, 0.1 * math.Sqrt2, 20, 20}, 90, 1},
		// A duct curving along a road: the line simplified keeps a vertex every 12°, and each
		// takes the turns of the vertices around it, so the bends sum to the drawn line's
		// 29 × 3° = 87° (its ends are chords, 1.5° off the circle's tangents).
		{"quarter circle of radius 30 m", arc, 87, 0.01},
		// The same radius 5 m, where the chords of the simplified line are shorter.
		{"quarter circle of radius 5 m", scaled(arc, 5.0/30), 87, 0.01},
		// A jog: two opposite 45° bends 2 m aside, far beyond the tolerance: 90° of bends
		// (within 0.5°: the test grid's metres, at(), are not quite the projection's, which
		// skews a diagonal a little; lines along the axes keep their angles).
		{"jog of two 45° bends", []float64{0, 0, 10, 0, 12, 2, 22, 2}, 90, 0.5},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			n := build(t, &Campus{Pathways: []Pathway{pw("L", ml(tc.line...))}})
			if len(n.Spans) != 1 {
				t.Fatalf("%s: spans %s, want one", tc.name, spanIDs(n))
			}
			sp := n.Spans[0]
			if len(sp.BendsDeg)+1 != len(sp.SegmentsM()) {
				t.Fatalf("%s: %d bends for %d segments", tc.name, len(sp.BendsDeg), len(sp.SegmentsM()))
			}
			sum := 0.0
			for _, b := range sp.BendsDeg {
				sum += b
			}
			if math.Abs(sum-tc.want) > tc.tolDeg {
				t.Errorf("%s: bends sum to %.3f° (%v), want %.1f°", tc.name, sum, sp.BendsDeg, tc.want)
			}
		})
	}
}

func TestKeptVerticesAsOrb(t *testing.T) {
	t.Parallel()
	// keptVertices against the Douglas–Peucker simplifier of github.com/paulmach/orb/simplify
	// (a reference implementation) on random walks: the same vertices kept.
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 200 {
		nv := 3 + rng.IntN(40)
		xy := make([]vec, nv)
		ls := make(orb.LineString, nv)
		for i := 1; i < nv; i++ {
			xy[i] = vec{xy[i-1].x + rng.Float64()*3, xy[i-1].y + rng.NormFloat64()*0.3}
		}
		for i, v := range xy {
			ls[i] = orb.Point{v.x, v.y}
		}
		tol := []float64{0.05, BendToleranceM, 1}[trial%3]
		want := simplify.DouglasPeucker(tol).LineString(ls)
		kept := keptVertices(xy, tol)
		got := make(orb.LineString, len(kept))
		for i, k := range kept {
			got[i] = orb.Point{xy[k].x, xy[k].y}
		}
		if !got.Equal(want) {
			t.Fatalf("trial %d (tolerance %.2f m): kept %v, orb keeps %v", trial, tol, got, want)
		}
	}
}
