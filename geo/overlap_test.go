package geo

import (
	"fmt"
	"math"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
)

var forM = regexp.MustCompile(`for ([0-9.]+) m`)

// overlapM is the metres a warning says two pathways run along each other, or -1.
func overlapM(w Warning) float64 {
	m := forM.FindStringSubmatch(w.Message)
	if m == nil {
		return -1
	}
	x, _ := strconv.ParseFloat(m[1], 64)
	return x
}

// nearM reports whether got is want within 1 % and 0.1 m (at() is a rough projection: the
// build's local one measures its lengths a few tenths of a percent apart).
func nearM(got, want float64) bool { return math.Abs(got-want) <= 0.1+want/100 }

// sumSpansM is the total length of n's spans, in metres.
func sumSpansM(n *Network) float64 {
	var m float64
	for _, s := range n.Spans {
		m += s.LengthM
	}
	return m
}

// maxDegree is the most span ends at any one junction of n.
func maxDegree(n *Network) int {
	d := 0
	for _, m := range n.Meetings {
		d = max(d, m.Degree)
	}
	return d
}

func warningsWith(n *Network, part string) []Warning {
	var out []Warning
	for _, w := range n.Warnings {
		if strings.Contains(w.Message, part) {
			out = append(out, w)
		}
	}
	return out
}

// A facilities GIS that exports a segment twice (a join, a re-survey) gives it a new id: the
// same line, the same properties. It is one duct bank in the ground, not two: counted once,
// with a warning naming both features (a GIS topology check's "duplicate geometry"; common
// practice, no published source). Before, it became a second parallel span with its own
// spare ducts, doubling the capacity shown.
func TestDuplicatePathwayCountedOnce(t *testing.T) {
	t.Parallel()
	a := pw("D-05", ml(0, 0, 100, 0, 200, 10))
	b := pw("D-05-1", ml(200, 10, 100, 0, 0, 0)) // the same line drawn the other way
	b.Source.Index = 7
	street := pw("D-10", ml(0, -50, 0, 50))
	n := build(t, &Campus{Pathways: []Pathway{a, b, street}})
	for _, s := range n.Spans {
		if s.PathwayID == "D-05-1" {
			t.Errorf("the copy is a span: %s", spanIDs(n))
		}
	}
	if got := sumSpansM(n); math.Abs(got-(LengthM(a.Lines[0])+LengthM(street.Lines[0]))) > 1e-6 {
		t.Errorf("spans sum to %.3f m, want the line once and the street (%s)", got, spanIDs(n))
	}
	ws := warningsWith(n, "drawn again")
	if len(ws) != 1 || ws[0].Feature != "#7 (D-05-1)" || !strings.Contains(ws[0].Message, `"D-05" (t.geojson feature #0)`) {
		t.Errorf("got warnings %v, want one on D-05-1 naming D-05 and its feature", n.Warnings)
	}

	// The same line with other properties is another pathway (another duct bank laid along
	// it): kept, and warned of as drawn along the first.
	c := withSpare(pw("D-05-2", ml(200, 10, 100, 0, 0, 0)), 4)
	n = build(t, &Campus{Pathways: []Pathway{a, c, street}})
	if !slices.ContainsFunc(n.Spans, func(s Span) bool { return s.PathwayID == "D-05-2" }) {
		t.Errorf("a pathway with other ducts on the same line was dropped: %s", spanIDs(n))
	}
	if ws := warningsWith(n, "drawn along each other"); len(ws) != 1 || !nearM(overlapM(ws[0]), 200.2) || !strings.Contains(ws[0].Message, `"D-05"`) {
		t.Errorf("got warnings %v, want one naming both and the metres", n.Warnings)
	}
}

// Pieces of one run drawn to meet end to end are one duct (README, "Answers that do not
// depend on how the campus is drawn"); a GIS overshoots such a join by a metre or two. An
// overlap of up to overlapJoinM between pathways that carry the same ducts must plan as the
// pieces meeting: the same total length, no junction where three spans meet (which needs a
// turn handhole) and one warning naming both. Before, the overlap became two junctions and a
// doubled span, and the turn between the pieces a phantom handhole (tester 7, +1.45 %).
func TestOverlapEndToEndPlansAsMeeting(t *testing.T) {
	t.Parallel()
	side := pw("S-1", ml(60, 0, 60, 40)) // a service duct off the first piece
	meet := build(t, &Campus{Pathways: []Pathway{pw("D-01", ml(0, 0, 125, 0)), pw("D-01b", ml(125, 0, 250, 0)), side}})
	for _, over := range []float64{0.8, 2, 4.5} {
		for _, rev := range []bool{false, true} {
			b := ml(125, 0, 250, 0)
			if rev {
				b = ml(250, 0, 125, 0)
			}
			c := &Campus{Pathways: []Pathway{pw("D-01", ml(0, 0, 125+over, 0)), pw("D-01b", b), side}}
			n := build(t, c)
			if got, want := sumSpansM(n), sumSpansM(meet); math.Abs(got-want) > 1e-6 {
				t.Errorf("overlap %g m (reversed %v): spans sum to %.4f m, want %.4f as the pieces meeting (%s)", over, rev, got, want, spanIDs(n))
			}
			if len(n.Spans) != len(meet.Spans) || maxDegree(n) != maxDegree(meet) {
				t.Errorf("overlap %g m (reversed %v): %d spans, junction degree up to %d; want %d and %d (%s)",
					over, rev, len(n.Spans), maxDegree(n), len(meet.Spans), maxDegree(meet), spanIDs(n))
			}
			if ws := warningsWith(n, "overlap end to end"); len(ws) != 1 || !strings.Contains(ws[0].Message, `"D-01" (t.geojson feature #0) and "D-01b"`) {
				t.Errorf("overlap %g m: got warnings %v, want one naming both", over, n.Warnings)
			}
			if len(c.Pathways[0].Lines[0]) != 2 || c.Pathways[0].Lines[0][1] != ml(0, 0, 125+over, 0)[1] {
				t.Errorf("overlap %g m: the caller's campus was changed", over)
			}
		}
	}
	// The pieces meet at a structure drawn within the overlap, not at its middle.
	n := build(t, &Campus{
		Pathways:   []Pathway{pw("D-01", ml(0, 0, 128, 0)), pw("D-01b", ml(125, 0, 250, 0))},
		Structures: []Structure{{ID: "MH-1", Type: "maintenance-hole", Point: at(125.5, 0)}},
	})
	if m, ok := n.MeetingAt("MH-1"); !ok || m.Degree != 2 || len(n.Spans) != 2 {
		t.Errorf("got spans %s, meeting %+v; want the two pieces meeting at MH-1", spanIDs(n), m)
	}
	// Pieces of different ducts (another spare count) overlapping: not the same run, warned
	// of as drawn along each other and planned as drawn.
	n = build(t, &Campus{Pathways: []Pathway{pw("D-01", ml(0, 0, 127, 0)), withSpare(pw("D-01b", ml(125, 0, 250, 0)), 0)}})
	if ws := warningsWith(n, "drawn along each other"); len(ws) != 1 || !nearM(overlapM(ws[0]), 2) || maxDegree(n) != 3 {
		t.Errorf("different ducts: got %s, warnings %v", spanIDs(n), n.Warnings)
	}
}

// Longer overlaps, and a piece drawn on top of a longer line, are ambiguous (the same duct
// digitised again, or a second duct in the trench): warned of with both features and the
// metres, planned as drawn. Two lines that cross at a shallow angle, or run side by side
// beyond snap_m (a duct bank drawn as two lines 1 m apart), are not drawn along each other.
func TestOverlapWarned(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name  string
		a, b  Pathway
		wantM float64 // 0 for no warning
	}{
		{"20 m end to end", pw("D-01", ml(0, 0, 135, 0)), pw("D-01b", ml(115, 0, 250, 0)), 20},
		{"a piece on top", pw("D-01", ml(0, 0, 250, 0)), pw("D-01x", ml(100, 0.1, 120, 0.1)), 20},
		{"bent line along a straight one", pw("D-01", ml(0, 0, 250, 0)), pw("D-02", ml(50, 80, 50, 0.2, 90, 0.2, 90, -50)), 40},
		{"crossing at 10°", pw("D-01", ml(0, 0, 250, 0)), pw("D-02", ml(0, -20, 250, 24.08)), 0},
		{"side by side 1 m apart", pw("D-01", ml(0, 0, 250, 0)), pw("D-02", ml(0, 1, 250, 1)), 0},
		{"meeting end to end", pw("D-01", ml(0, 0, 125, 0)), pw("D-01b", ml(125, 0, 250, 0)), 0},
		{"overshoot within snap_m", pw("D-01", ml(0, 0, 125.3, 0)), pw("D-01b", ml(125, 0, 250, 0)), 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			tc.b.Source.Index = 3
			n := build(t, &Campus{Pathways: []Pathway{tc.a, tc.b}})
			ws := append(warningsWith(n, "drawn along each other"), warningsWith(n, "overlap end to end")...)
			if tc.wantM == 0 {
				if len(ws) != 0 {
					t.Errorf("got %v, want no overlap warning", ws)
				}
				return
			}
			if len(ws) != 1 || !nearM(overlapM(ws[0]), tc.wantM) || ws[0].Feature != "#3 ("+tc.b.ID+")" ||
				!strings.Contains(ws[0].Message, `"`+tc.a.ID+`" (t.geojson feature #0)`) {
				t.Errorf("got %v, want one on %s naming %s and %g m", n.Warnings, tc.b.ID, tc.a.ID, tc.wantM)
			}
		})
	}
}

// Two lines of one MultiLineString that cross with no shared vertex stay apart, as two
// pathways do (README), and are warned of as two pathways' crossing is (tester 7: an X drawn
// as one feature gave no warning). Lines of one feature meeting end to end are not.
func TestMultiLineCrossingWarned(t *testing.T) {
	t.Parallel()
	n := build(t, &Campus{Pathways: []Pathway{
		pw("D-XX", ml(0, 100, 250, 100), ml(125, 0, 125, 200)),
		pw("D-YY", ml(0, 300, 100, 300), ml(100, 300, 200, 320)),
	}})
	ws := warningsWith(n, "cross at")
	if len(ws) != 1 || !strings.HasPrefix(ws[0].Message, `lines 1 and 2 of pathway "D-XX" cross at `) || ws[0].Feature != "#0 (D-XX)" {
		t.Errorf("got warnings %v, want one for D-XX's two lines", n.Warnings)
	}
	for _, s := range n.Spans {
		if s.PathwayID == "D-XX" && s.ID != "D-XX/1" && s.ID != "D-XX/2" {
			t.Errorf("D-XX's lines were joined where they cross: %s", spanIDs(n))
		}
	}
}

// The overlap pass decides the same whatever the order of the features: which copy is kept,
// where overshooting pieces meet (measured along the lower id's line), the metres in each
// warning. Spans and warnings are compared whole, coordinates bit for bit.
func TestOverlapFeatureOrder(t *testing.T) {
	t.Parallel()
	pws := []Pathway{
		pw("Z", ml(0, 0, 100, 0)), pw("M", ml(100, 0, 0, 0)), pw("A", ml(0, 0, 100, 0)), // one line three times
		pw("P-1", ml(0, 50, 126.3, 50.2)), pw("P-2", ml(250, 50, 124.1, 50.1)), // overshooting by 2.2 m
		pw("Q-1", ml(0, 90, 135, 90)), pw("Q-2", ml(115, 90.2, 250, 90.2)), // along each other for 20 m
		pw("X", ml(50, -20, 50, 120)), // across them all
	}
	n1 := build(t, &Campus{Pathways: slices.Clone(pws)})
	rev := slices.Clone(pws)
	slices.Reverse(rev)
	n2 := build(t, &Campus{Pathways: rev})
	type spanOf struct {
		ID, From, To string
		Line         string
	}
	key := func(n *Network) []spanOf {
		var out []spanOf
		for _, s := range n.Spans {
			out = append(out, spanOf{s.ID, s.From, s.To, fmt.Sprint(s.Line)})
		}
		return out
	}
	if !slices.Equal(key(n1), key(n2)) {
		t.Errorf("spans differ with the features reversed:\n%v\n%v", key(n1), key(n2))
	}
	if len(warningsWith(n1, `"P-1" (t.geojson feature #0) and "P-2" overlap end to end`)) != 1 {
		t.Errorf("got %v, want P-1 and P-2 cut to meet", n1.Warnings)
	}
	if !slices.Equal(n1.Warnings, n2.Warnings) {
		t.Errorf("warnings differ with the features reversed:\n%v\n%v", n1.Warnings, n2.Warnings)
	}
	if ws := warningsWith(n1, "drawn again:"); len(ws) != 2 || !strings.Contains(ws[0].Message+ws[1].Message, `counted once, as "A"`) {
		t.Errorf("got %v, want M and Z counted once as A", ws)
	}
}

// Two lines of one MultiLineString (a GIS dissolve of pieces) are checked as two pathways of
// the same ducts: overshooting end to end by 2 m they meet as pieces drawn to meet; along
// each other for 20 m they are warned of, naming the lines.
func TestOverlapWithinMultiLine(t *testing.T) {
	t.Parallel()
	n := build(t, &Campus{Pathways: []Pathway{pw("D", ml(0, 0, 127, 0), ml(125, 0, 250, 0))}})
	if ws := warningsWith(n, `lines 1 and 2 of pathway "D" overlap end to end`); len(ws) != 1 || len(n.Spans) != 2 || maxDegree(n) != 2 {
		t.Errorf("overshoot: got %s, warnings %v; want two spans meeting, one warning", spanIDs(n), n.Warnings)
	}
	n = build(t, &Campus{Pathways: []Pathway{pw("D", ml(0, 0, 135, 0), ml(115, 0, 250, 0))}})
	if ws := warningsWith(n, `lines 1 and 2 of pathway "D" are drawn along each other`); len(ws) != 1 || !nearM(overlapM(ws[0]), 20) {
		t.Errorf("20 m along: got warnings %v", n.Warnings)
	}
}

// A copy need not be exact to be a copy: a re-export or a reprojection round trip moves a
// vertex by a millimetre, adds a vertex on a straight run or splits the line in two, and the
// duct in the ground is still one (README: pathways drawn on top of one another, within
// snap_m of each other and within 2° of one direction; common practice, no published
// source). Tester 10 (F6): one vertex of a copy moved 1 mm made it a second duct bank with
// its own spare ducts, capacity that does not exist. Each such copy must give the network of
// the exact copy, spans and warnings alike; a copy with other properties, or one drawn beyond
// snap_m, is planned as drawn (two pathways) as before.
func TestNearCopyCountedOnce(t *testing.T) {
	t.Parallel()
	const mm = 1e-3
	orig := pw("D-05", ml(0, 0, 100, 0, 200, 10, 260, 60))
	street := pw("D-10", ml(0, -50, 0, 50))
	lateral := pw("L-1", ml(150, 5, 150, 40)) // ends on the copied line, between its vertices
	campus := func(cp Pathway) *Campus {
		cp.Source.Index = 7
		return &Campus{Pathways: []Pathway{orig, street, lateral, cp}}
	}
	exact := build(t, campus(pw("D-05-copy", ml(0, 0, 100, 0, 200, 10, 260, 60))))
	if ws := warningsWith(exact, "drawn again"); len(ws) != 1 || ws[0].Feature != "#7 (D-05-copy)" {
		t.Fatalf("exact copy: got warnings %v, want one on D-05-copy", exact.Warnings)
	}
	type spanOf struct{ ID, From, To, Line string }
	key := func(n *Network) []spanOf {
		var out []spanOf
		for _, s := range n.Spans {
			out = append(out, spanOf{s.ID, s.From, s.To, fmt.Sprint(s.Line)})
		}
		return out
	}
	copies := []struct {
		name string
		cp   Pathway
	}{
		{"one vertex 1 mm off", pw("D-05-copy", ml(0, 0, 100, mm, 200, 10, 260, 60))},
		{"every vertex 1 mm off", pw("D-05-copy", ml(mm, 0, 100, -mm, 200-mm*0.7, 10+mm*0.7, 260, 60+mm))},
		{"drawn the other way, 1 mm off", pw("D-05-copy", ml(260, 60+mm, 200, 10, 100, mm, 0, 0))},
		{"a vertex added on a straight run", pw("D-05-copy", ml(0, 0, 50, 0, 100, 0, 200, 10, 260, 60))},
		{"in two lines meeting at a vertex", pw("D-05-copy", ml(200, 10, 260, 60), ml(0, 0, 100, 0, 200, 10))},
		{"ends 0.3 m short", pw("D-05-copy", ml(0.3, 0, 100, 0, 200, 10, 260, 60))},
	}
	for _, tc := range copies {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			n := build(t, campus(tc.cp))
			if !slices.Equal(key(n), key(exact)) {
				t.Errorf("spans differ from the exact copy's:\n%v\n%v", key(n), key(exact))
			}
			if !slices.Equal(n.Warnings, exact.Warnings) {
				t.Errorf("warnings differ from the exact copy's:\n%v\n%v", n.Warnings, exact.Warnings)
			}
		})
	}
	kept := []struct {
		name string
		cp   Pathway
	}{
		{"other spare ducts, 1 mm off", withSpare(pw("D-05-copy", ml(0, 0, 100, mm, 200, 10, 260, 60)), 4)},
		{"a bank 0.6 m beside it", pw("D-05-copy", ml(0, 0.6, 100, 0.6, 200, 10.6, 260, 60.6))},
		{"1 m longer", pw("D-05-copy", ml(-1, 0, 100, 0, 200, 10, 260, 60))},
		{"on top of half of it", pw("D-05-copy", ml(0, 0, 100, 0, 200, 10))},
	}
	for _, tc := range kept {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			n := build(t, campus(tc.cp))
			if len(warningsWith(n, "drawn again:")) != 0 || !slices.ContainsFunc(n.Spans, func(s Span) bool { return s.PathwayID == "D-05-copy" }) {
				t.Errorf("got spans %s, warnings %v; want D-05-copy planned as drawn", spanIDs(n), n.Warnings)
			}
		})
	}
}
