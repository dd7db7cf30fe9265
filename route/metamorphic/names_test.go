package metamorphic_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route"
	"spanwright/route/internal/campusgen"
)

// numbered maps each numbered junction of res's network (geo.JunctionPrefix and a number) to
// its point.
func numbered(res *route.Result) map[string][2]float64 {
	out := map[string][2]float64{}
	for _, j := range res.Site.Net.Junctions {
		if rest, ok := strings.CutPrefix(j.ID, geo.JunctionPrefix); ok && rest != "" && strings.Trim(rest, "0123456789") == "" {
			out[j.ID] = j.Point
		}
	}
	return out
}

// sameNames reports, for what, every numbered junction of got that is not the one of want
// of that name within tolM metres, and every one of want that got lacks.
func sameNames(t *testing.T, what string, want, got map[string][2]float64, tolM float64) {
	t.Helper()
	var d []string
	for id, p := range want {
		q, ok := got[id]
		if !ok {
			d = append(d, id+": gone")
			continue
		}
		if e := local(p, q); math.Hypot(e[0], e[1]) > tolM {
			d = append(d, fmt.Sprintf("%s: moved %.3f m", id, math.Hypot(e[0], e[1])))
		}
	}
	for id := range got {
		if _, ok := want[id]; !ok {
			d = append(d, id+": new")
		}
	}
	slices.Sort(d)
	if len(d) > 0 {
		t.Errorf("%s: %d of %d junction names differ: %s", what, len(d), len(want), strings.Join(d[:min(len(d), 12)], "; "))
	}
}

// nearCellEdge reports whether p lies within 2 mm of an edge of the grid junctions are
// numbered on (README: cells of 0.0001°, their edges a third of a cell past each multiple of
// 0.0001°), where a move of a millimetre (1 mm of a vertex, at most as much of the junction's
// point) may take the junction into the next cell and renumber those between.
func nearCellEdge(p [2]float64) bool {
	const cellDeg, mPerDeg = 1e-4, 111_200.0
	for k, scale := range [2]float64{math.Cos(p[1] * math.Pi / 180), 1} {
		f := p[k]/cellDeg - 1.0/3
		if d := math.Min(f-math.Floor(f), math.Ceil(f)-f) * cellDeg * mPerDeg * scale; d < 2e-3 {
			return true
		}
	}
	return false
}

// cell is the cell of the numbering grid (nearCellEdge) that p lies in.
func cell(p [2]float64) [2]float64 {
	return [2]float64{math.Floor(p[0]/1e-4 - 1.0/3), math.Floor(p[1]/1e-4 - 1.0/3)}
}

// acrossCells counts the junctions of want whose nearest junction of got, within 0.5 m, lies
// in another numbering cell.
func acrossCells(want, got map[string][2]float64) int {
	n := 0
	for _, p := range want {
		best, bestM := [2]float64{}, 0.5
		for _, q := range got {
			if e := local(p, q); math.Hypot(e[0], e[1]) <= bestM {
				best, bestM = q, math.Hypot(e[0], e[1])
			}
		}
		if bestM < 0.5 && cell(best) != cell(p) {
			n++
		}
	}
	return n
}

// splitStreets returns fs with every street drawn as one feature per segment, meeting at its
// vertices (ids + "-1", "-2", …, the same properties), as a GIS splits lines; and how many
// pieces it drew.
func splitStreets(fs []campusgen.Feature) ([]campusgen.Feature, int) {
	var out []campusgen.Feature
	n := 0
	for _, f := range fs {
		id := ""
		for _, p := range f.Props {
			if p.Key == "id" {
				id, _ = p.Value.(string)
			}
		}
		if f.Geometry != "LineString" || !street.MatchString(id) || len(f.Coords[0]) < 3 {
			out = append(out, f)
			continue
		}
		l := f.Coords[0]
		for k := 1; k < len(l); k++ {
			pc := f
			pc.Props = slices.Clone(f.Props)
			for i, p := range pc.Props {
				if p.Key == "id" {
					pc.Props[i].Value = fmt.Sprintf("%s-%d", id, k)
				}
			}
			pc.Coords = [][][2]float64{{l[k-1], l[k]}}
			out = append(out, pc)
			n++
		}
	}
	return out, n
}

// TestJunctionNamesKept: the names of the junctions that take a number (handholes to build
// are named by them in the bill, the structures table and each leg's turns) name the same
// places when every vertex moves by a millimetre (as in TestMillimetre), and when every
// street is drawn as one feature per segment (a vertex where two pieces of one run meet end
// to end is no junction that takes a number). A campus with a junction within 2 mm of a
// numbering cell's edge leaves the millimetre out: there README says a millimetre may
// renumber (2 of the first 40 campuses of make soak). Before (tester 10, F7), junctions on a
// north–south street were ordered by a longitude a millimetre flipped, and a split point
// took a number, renumbering every junction east of it: a revised drawing renamed the bid's
// handholes.
func TestJunctionNamesKept(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		_, base := outputs(t, sc)
		want := numbered(base)
		r := rand.New(rand.NewPCG(seed, 41))
		moved := map[[2]float64][2]float64{}
		const mmDeg = 1e-3 / 111_200.0
		sc2 := rewrite(sc, c, func(fs []campusgen.Feature) []campusgen.Feature {
			for _, f := range fs {
				for _, l := range f.Coords {
					for k, p := range l {
						q, ok := moved[p]
						if !ok {
							a := r.Float64() * 2 * math.Pi
							q = [2]float64{p[0] + mmDeg*math.Cos(a)/math.Cos(p[1]*math.Pi/180), p[1] + mmDeg*math.Sin(a)}
							moved[p] = q
						}
						l[k] = q
					}
				}
			}
			return fs
		})
		_, res := outputs(t, sc2)
		near := 0
		for _, p := range want {
			if nearCellEdge(p) {
				near++
			}
		}
		if near == 0 {
			sameNames(t, "every vertex moved 1 mm", want, numbered(res), 0.01)
		} else {
			t.Logf("%d junctions lie within 2 mm of a numbering cell's edge, where README allows a millimetre to renumber: not compared", near)
		}

		pieces := 0
		sc3 := rewrite(sc, c, func(fs []campusgen.Feature) []campusgen.Feature {
			out, n := splitStreets(fs)
			pieces = n
			return out
		})
		_, res = outputs(t, sc3)
		if pieces == 0 {
			t.Fatal("no street to split")
		}
		// A counted lateral's tap within snap_m of a split point goes to that point, a piece's
		// end (noding prefers a place the drawing marks): the same junction, moved, and where
		// that takes it across a numbering cell's edge it renumbers (4 of the first 40 campuses
		// of make soak).
		got := numbered(res)
		if across := acrossCells(want, got); across > 0 {
			t.Logf("%d junctions moved across a numbering cell's edge to a split point: not compared", across)
		} else {
			sameNames(t, fmt.Sprintf("streets split into %d features", pieces), want, got, 0.5)
		}
	})
}
