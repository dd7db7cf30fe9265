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
		// A duct curving along a road: the line simplified keeps vertices 3, 7, …, 23, 26 (one
		// every 12° of arc, 9° and 12° from the ends), and each takes the turns of the
		// vertices around it, so the bends sum to the turn between the simplified line's end
		// chords, which cut 9° and 12° of arc: 90° − 4.5° − 6° = 79.5° (plane geometry: a
		// chord runs at half its arc's turn from the tangent at either end). The rest of the
		// curve is turned at the junctions at its ends, measured on the same chords (TurnDeg;
		// TestTurnsAndBendsAddUp).
		{"quarter circle of radius 30 m", arc, 79.5, 0.01},
		// The same radius 5 m: vertices 8, 15 and 22 kept, the end chords cut 24° each:
		// 90° − 12° − 12° = 66°.
		{"quarter circle of radius 5 m", scaled(arc, 5.0/30), 66, 0.01},
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

func TestTurnDegDrawingNoise(t *testing.T) {
	t.Parallel()
	// A runs east into the junction at (100, 0), where B goes on north and C straight on east;
	// a lateral from the south reaches the same point. A's last metres are drawn with noise
	// within BendToleranceM of the line; on the drawn end segment each reads as a turn there
	// (21.8° and 11.3°: the arc tangent of offset over length). Expectations are plane geometry on
	// the test grid: the noise is no turn, so A → C is straight on, A → B and the lateral
	// turns are right angles, and A bends nowhere (or, with a corner drawn, 90° there).
	cases := []struct {
		name      string
		a         []float64
		bendsDeg  float64
		rawOffDeg float64 // what the drawn end segment reads, to show the case is one
	}{
		{"spike of 20 cm 0.5 m from the junction", []float64{0, 0, 99.5, 0.2, 100, 0}, 0, 21.8},
		{"jitter of 10 cm every 0.5 m", []float64{0, 0, 97, 0, 97.5, 0.1, 98, -0.1, 98.5, 0.1, 99, -0.1, 99.5, 0.1, 100, 0}, 0, 11.3},
		// Measured on the drawn segments, the corner's bend took the spike's turn too (66.9°)
		// and the junction read 21.8°: the same 90° in all, in the wrong places.
		{"corner, then a spike 0.5 m from the junction", []float64{0, -60, 0, 0, 99.5, 0.2, 100, 0}, 90, 21.8},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			n := build(t, &Campus{Pathways: []Pathway{
				pw("A", ml(tc.a...)),
				pw("B", ml(100, 0, 100, 80)),
				pw("C", ml(100, 0, 200, 0)),
			}})
			id := map[string]string{}
			for _, s := range n.Spans {
				id[s.PathwayID] = s.ID
			}
			sa, _ := n.Span(id["A"])
			if raw := turnAt(sa.Line[len(sa.Line)-2], sa.Line[len(sa.Line)-1], at(200, 0)); math.Abs(raw-tc.rawOffDeg) > 0.1 {
				t.Fatalf("the drawn end segment reads %.2f°, want %.1f° (the case is not the one meant)", raw, tc.rawOffDeg)
			}
			lateral := orb.LineString{at(100, -20), at(100, 0)}
			for _, c := range []struct {
				what string
				got  float64
				want float64
			}{
				{"A straight on into C", n.TurnDeg(Step{SpanID: id["A"]}, Step{SpanID: id["C"]}), 0},
				{"A turning into B", n.TurnDeg(Step{SpanID: id["A"]}, Step{SpanID: id["B"]}), 90},
				{"C back into A", n.TurnDeg(Step{SpanID: id["C"], Reverse: true}, Step{SpanID: id["A"], Reverse: true}), 0},
				{"the lateral into A, westward", n.LateralTurnDeg(lateral, Step{SpanID: id["A"], Reverse: true}, true), 90},
				{"out of A into the lateral", n.LateralTurnDeg(lateral, Step{SpanID: id["A"]}, false), 90},
			} {
				if math.Abs(c.got-c.want) > 0.05 {
					t.Errorf("%s: %.3f°, want %.0f°", c.what, c.got, c.want)
				}
			}
			sum := 0.0
			for _, b := range sa.BendsDeg {
				sum += b
			}
			if math.Abs(sum-tc.bendsDeg) > 0.05 {
				t.Errorf("A's bends sum to %.3f° (%v), want %.0f°", sum, sa.BendsDeg, tc.bendsDeg)
			}
		})
	}
}

func TestTurnDegSpikeAtSplit(t *testing.T) {
	t.Parallel()
	// A from the south onto the middle of street S's segment, drawn with a vertex 1 cm aside
	// 2 cm before its end, which the drawn end segment reads as 26.6° off north (116.6° into S
	// east). Into S east or west is a right angle. Build leaves the spike out of A's span (a
	// vertex within snap_m of the span's end that marks no bend: the junction's point stands
	// for the drawing there), and TurnDeg, on the line simplified within BendToleranceM, would
	// read no turn at it either.
	n := build(t, &Campus{Pathways: []Pathway{
		pw("A", ml(100, -60, 100.01, -0.02, 100, 0)),
		pw("S", ml(0, 0, 200, 0)),
	}})
	var a Span
	var east, west string
	for _, s := range n.Spans {
		switch {
		case s.PathwayID == "A":
			a = s
		case s.PathwayID == "S" && s.Line[0] == at(0, 0):
			west = s.ID
		case s.PathwayID == "S":
			east = s.ID
		}
	}
	if len(a.Line) != 2 || east == "" || west == "" {
		t.Fatalf("spans %s, A drawn %v: want A's spike left out and S split where A ends", spanIDs(n), a.Line)
	}
	if raw := turnAt(at(100.01, -0.02), at(100, 0), at(200, 0)); math.Abs(raw-116.6) > 0.1 {
		t.Fatalf("the drawn end segment into S east reads %.2f°, want 116.6° (the case is not the one meant)", raw)
	}
	for _, c := range []struct {
		what string
		to   Step
	}{{"into S east", Step{SpanID: east}}, {"into S west", Step{SpanID: west, Reverse: true}}} {
		if got := n.TurnDeg(Step{SpanID: a.ID}, c.to); math.Abs(got-90) > 0.05 {
			t.Errorf("A %s: %.3f°, want 90°", c.what, got)
		}
	}
}

func TestTurnsAndBendsAddUp(t *testing.T) {
	t.Parallel()
	// A quarter circle of radius 30 m drawn with a vertex every 3° of arc, as one pathway and
	// as three that meet at its 10th and 20th vertices. Along the three, the bends and the
	// turns at the two junctions add up to the turn between the route's first and last chords
	// of the simplified lines (Span.AwayFrom): what the end chords of a span leave out of a
	// curve is turned at the junction, not lost and not counted twice.
	var arc []float64
	for a := 0; a <= 90; a += 3 {
		r := float64(a) * math.Pi / 180
		arc = append(arc, 30*math.Sin(r), 30-30*math.Cos(r))
	}
	n := build(t, &Campus{Pathways: []Pathway{
		pw("P1", ml(arc[:22]...)), pw("P2", ml(arc[20:42]...)), pw("P3", ml(arc[40:]...)),
	}})
	var steps []Step
	var sum float64
	for _, p := range []string{"P1", "P2", "P3"} {
		for _, s := range n.Spans {
			if s.PathwayID == p {
				steps = append(steps, Step{SpanID: s.ID})
				for _, b := range s.BendsDeg {
					sum += b
				}
			}
		}
	}
	if len(steps) != 3 {
		t.Fatalf("spans %s, want three", spanIDs(n))
	}
	for k := 1; k < 3; k++ {
		sum += n.TurnDeg(steps[k-1], steps[k])
	}
	first, _ := n.Span(steps[0].SpanID)
	last, _ := n.Span(steps[2].SpanID)
	heading := func(a, b orb.Point) float64 { return math.Atan2(b[1]-a[1], (b[0]-a[0])*math.Cos(a[1]*deg)) / deg }
	want := heading(last.AwayFrom(true), last.Line[len(last.Line)-1]) - heading(first.Line[0], first.AwayFrom(false))
	if math.Abs(sum-want) > 0.05 {
		t.Errorf("bends and turns along the arc add up to %.3f°, want %.3f° (between the end chords)", sum, want)
	}
	// An end chord cuts at most 15° of arc (five segments of 3°: their inner vertices lie
	// 30 × (cos 1.5° − cos 7.5°) = 0.247 m off it, within BendToleranceM; six would put one
	// 0.41 m off), so at least 90° − 7.5° − 7.5° of the quarter circle is counted.
	if want < 75-0.05 || want > 90 {
		t.Errorf("the end chords turn %.3f° from each other, want 75° to 90°", want)
	}
}
