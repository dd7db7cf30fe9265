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
// to end is no junction that takes a number). Before (tester 10, F7), junctions on a
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
		sameNames(t, "every vertex moved 1 mm", want, numbered(res), 0.01)

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
		// end (noding prefers a place the drawing marks): the same junction, moved.
		sameNames(t, fmt.Sprintf("streets split into %d features", pieces), want, numbered(res), 0.5)
	})
}
