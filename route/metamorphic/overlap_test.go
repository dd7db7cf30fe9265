package metamorphic_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"spanwright/route/internal/campusgen"
)

// piecesAt returns fs with one street drawn as two features (ids + "-a" and "-b", the same
// properties) along a straight segment of it at least 12 m long, 3 m from its start, where no
// other feature has a vertex within 15 m and no building stands: meeting there (overlapM 0),
// or overshooting each other by overlapM, the "-a" piece drawn on overlapM/2 past the point
// and the "-b" piece starting overlapM/2 before it. It returns nil when no street has such a
// segment.
func piecesAt(fs []campusgen.Feature, overlapM float64) []campusgen.Feature {
	var pts [][2]float64
	owner := []int{}
	for i, f := range fs {
		for _, l := range f.Coords {
			for _, p := range l {
				pts, owner = append(pts, p), append(owner, i)
			}
		}
	}
	for i, f := range fs {
		id := ""
		for _, p := range f.Props {
			if p.Key == "id" {
				id, _ = p.Value.(string)
			}
		}
		if f.Geometry != "LineString" || !street.MatchString(id) {
			continue
		}
		l := f.Coords[0]
		for k := 0; k+1 < len(l); k++ {
			d := local(l[k], l[k+1])
			segM := math.Hypot(d[0], d[1])
			if segM < 12 {
				continue
			}
			at := func(m float64) [2]float64 { // m metres from l[k] toward l[k+1]
				t := m / segM
				return [2]float64{l[k][0] + (l[k+1][0]-l[k][0])*t, l[k][1] + (l[k+1][1]-l[k][1])*t}
			}
			p := at(3)
			clear := !inBuilding(fs, p)
			for j, q := range pts {
				if owner[j] != i {
					if e := local(p, q); math.Hypot(e[0], e[1]) < 15 {
						clear = false
						break
					}
				}
			}
			if !clear {
				continue
			}
			out := slices.Clone(fs)
			a, b := f, f
			a.Props, b.Props = slices.Clone(f.Props), slices.Clone(f.Props)
			for n, pr := range f.Props {
				if pr.Key == "id" {
					a.Props[n].Value, b.Props[n].Value = id+"-a", id+"-b"
				}
			}
			aEnd, bStart := p, p
			if overlapM > 0 {
				aEnd, bStart = at(3+overlapM/2), at(3-overlapM/2)
			}
			a.Coords = [][][2]float64{append(slices.Clone(l[:k+1]), aEnd)}
			b.Coords = [][][2]float64{append([][2]float64{bStart}, l[k+1:]...)}
			out[i] = a
			return append(out, b)
		}
	}
	return nil
}

// TestOverlappingPiecesPlanAsMeeting: a street drawn as two features that overshoot each
// other end to end by 2 m (a GIS join overshot; tester 7's pieces_over2) plans as the two
// pieces drawn to meet at the middle of the overlap: every leg the same feasibility, medium,
// turns and length, the same pull sections and turn handholes, the total and each leg's cost
// within a cent or two (the meeting point is found by projection); the pieces meet at a
// junction of two span ends, and one warning names both. Before, the overlap made two
// junctions of three span ends each and a doubled span: a turn handhole for any leg that
// passed (+1.45 % on tester 7's campus).
func TestOverlappingPiecesPlanAsMeeting(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		meet, over := piecesAt(c.Features, 0), piecesAt(c.Features, 2)
		if meet == nil {
			t.Skip("no street with a clear 12 m segment")
		}
		scMeet, scOver := sc, sc
		scMeet.files = map[string][]byte{"campus.geojson": campusgen.GeoJSON(meet)}
		scOver.files = map[string][]byte{"campus.geojson": campusgen.GeoJSON(over)}
		_, a := outputs(t, scMeet)
		_, b := outputs(t, scOver)
		var id string
		for _, p := range over[len(over)-1].Props {
			if p.Key == "id" {
				id = strings.TrimSuffix(p.Value.(string), "-b")
			}
		}
		for _, m := range b.Site.Net.Meetings {
			if slices.Contains(m.Pathways, id+"-a") && slices.Contains(m.Pathways, id+"-b") && m.Degree != 2 {
				t.Errorf("%s: %d span ends meet at %s where the pieces overlap (%v), want 2", id, m.Degree, m.Junction, m.Spans)
			}
		}
		warned := 0
		for _, w := range b.Site.Net.Warnings {
			if strings.Contains(w.Message, fmt.Sprintf("%q", id+"-a")) && strings.Contains(w.Message, "overlap end to end") {
				warned++
			}
		}
		if warned != 1 {
			t.Errorf("%s: %d warnings of the overlap, want 1", id, warned)
		}
		samePlan(t, id, a, b)
	})
}

// copyStreets returns fs with every street exported a second time under id + "-copy" (after
// the original in id order, so the original is the one kept), its vertices moved by moveM
// metres each in a direction r draws (0: an exact copy).
func copyStreets(fs []campusgen.Feature, moveM float64, r *rand.Rand) []campusgen.Feature {
	out := slices.Clone(fs)
	for _, f := range fs {
		id := ""
		for _, p := range f.Props {
			if p.Key == "id" {
				id, _ = p.Value.(string)
			}
		}
		if f.Geometry != "LineString" || !street.MatchString(id) {
			continue
		}
		cp := f
		cp.Props = slices.Clone(f.Props)
		for n, p := range cp.Props {
			if p.Key == "id" {
				cp.Props[n].Value = id + "-copy"
			}
		}
		cp.Coords = cloneCoords(f.Coords)
		for _, l := range cp.Coords {
			for k, p := range l {
				if moveM > 0 {
					a := r.Float64() * 2 * math.Pi
					const mPerDeg = 111_200.0
					l[k] = [2]float64{p[0] + moveM*math.Cos(a)/(mPerDeg*math.Cos(p[1]*math.Pi/180)), p[1] + moveM*math.Sin(a)/mPerDeg}
				}
			}
		}
		out = append(out, cp)
	}
	return out
}

// TestCopyMovedMillimetre: every street exported twice (a GIS join, a re-survey) with each
// vertex of the copies moved 1 mm gives the same bytes in every output as the exact copies:
// each copy counted once, as its original, with the same warning. Before (tester 10, F6), a
// copy 1 mm off was a second duct bank with its own spare ducts, capacity that does not
// exist; README: pathways drawn within snap_m of each other and within 2° of one direction
// are one duct bank when their properties are the same (common practice, no published
// source).
func TestCopyMovedMillimetre(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		exact, moved := sc, sc
		exact.files = map[string][]byte{"campus.geojson": campusgen.GeoJSON(copyStreets(c.Features, 0, nil))}
		fs := copyStreets(c.Features, 1e-3, rand.New(rand.NewPCG(seed, 13)))
		moved.files = map[string][]byte{"campus.geojson": campusgen.GeoJSON(fs)}
		a, _ := outputs(t, exact)
		b, res := outputs(t, moved)
		copies := len(fs) - len(c.Features)
		counted := 0
		for _, w := range res.Site.Net.Warnings {
			if strings.Contains(w.Message, "-copy\" is pathway") && strings.Contains(w.Message, "drawn again") {
				counted++
			}
		}
		if copies == 0 || counted != copies {
			t.Errorf("%d streets copied 1 mm off, %d counted once", copies, counted)
		}
		if d := diffFiles(a, b); len(d) > 0 {
			t.Errorf("copies 1 mm off changed %d files from the exact copies':\n%s", len(d), strings.Join(d, "\n"))
		}
	})
}
