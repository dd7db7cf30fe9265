package geo

import (
	"math"
	"testing"
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
