package metamorphic_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/campusgen"
)

// onLine draws, on every pathway in used (the plan's), a vertex on the drawn segment on
// either side of each junction the segment passes within a centimetre of (its ends, a lateral
// ending on it, a structure or an entrance on it), 5 to 60 cm from the junction (r picks
// each): interpolated between the segment's ends in longitude and latitude, so on the line as
// drawn (to the file's 1e-9°) and adding no metres. A vertex that would come within 1 cm of a segment's end, or within snap_m plus
// 2 cm of a junction other than its own, is left out: there the drawing says something else.
// So is every vertex on a pole line (aerial): there a vertex is a pole, where a counted lateral
// may leave the line (README "Pathway types"), not a point on a straight run; r draws its
// places all the same, so the other lines get the vertices they got before that rule.
// It returns the features and the number of vertices drawn.
func onLine(fs []campusgen.Feature, used map[string]bool, junctions [][2]float64, r *rand.Rand) ([]campusgen.Feature, int) {
	o := [2]float64{7.1, 46.2} // campusgen's origin
	js := make([][2]float64, len(junctions))
	for i, j := range junctions {
		js[i] = local(o, j)
	}
	alone := func(p [2]float64, own int) bool {
		for i, q := range js {
			if i != own && math.Hypot(p[0]-q[0], p[1]-q[1]) <= 0.52 {
				return false
			}
		}
		return true
	}
	added := 0
	for i := range fs {
		f := &fs[i]
		if f.Geometry != "LineString" || !used[propID(f)] {
			continue
		}
		l := f.Coords[0]
		pole := propString(f, "type") == "aerial" // its vertices are drawn (r draws alike) and left out
		line := [][2]float64{l[0]}
		for k := 1; k < len(l); k++ {
			a, b := local(o, l[k-1]), local(o, l[k])
			d := math.Hypot(b[0]-a[0], b[1]-a[1])
			var ts []float64 // where to draw, as fractions of the segment
			for ji, j := range js {
				if d == 0 {
					break
				}
				t := ((j[0]-a[0])*(b[0]-a[0]) + (j[1]-a[1])*(b[1]-a[1])) / (d * d)
				t = max(0, min(1, t))
				foot := [2]float64{a[0] + t*(b[0]-a[0]), a[1] + t*(b[1]-a[1])}
				if math.Hypot(j[0]-foot[0], j[1]-foot[1]) > 0.01 {
					continue
				}
				for _, side := range []float64{-1, 1} {
					m := 0.05 + 0.55*r.Float64()
					u := t + side*m/d
					p := [2]float64{a[0] + u*(b[0]-a[0]), a[1] + u*(b[1]-a[1])}
					if u*d < 0.01 || (1-u)*d < 0.01 || !alone(p, ji) {
						continue
					}
					ts = append(ts, u)
				}
			}
			slices.Sort(ts)
			ts = slices.Compact(ts)
			for _, u := range ts {
				if pole {
					break
				}
				p, q := l[k-1], l[k]
				line = append(line, [2]float64{p[0] + u*(q[0]-p[0]), p[1] + u*(q[1]-p[1])})
				added++
			}
			line = append(line, l[k])
		}
		f.Coords = [][][2]float64{line}
	}
	return fs, added
}

// TestVertexOnLineNearJunction: a vertex drawn on a straight line, 5 to 60 cm from a
// junction, means nothing (it adds no metres and turns nowhere), so it changes nothing of the
// plan: every leg's route (pathways in travel order), medium and feasibility, the total and
// the proved lower bound. Such a vertex lies within snap_m of the junction's other members,
// so Build takes it into the junction's group; the junction's point must stay where the
// pathways meet (geo's noding: a structure or entrance, else a pathway end, else a vertex
// where a line bends), not move to the new vertex. Before that rule (junction point: the
// westernmost vertex of the group) it changed the total on all 8 quick campuses, by 10 to
// 13,551 USD.
//
// The routes and the total are compared exactly; the proved lower bound within 1e-5 of it.
// The file gives coordinates to 1e-9° (campusgen's, as GIS exports do), so a vertex "on" the
// line lies up to 0.08 mm off it, and each segment's ellipsoidal length (DistanceM) is good
// to about a micrometre, so a segment cut in two sums to its length within micrometres: the
// spans' metres, the wall cuts and the lateral taps move by micrometres, and no bill line
// moves (0.1 m steps, cable in whole metres per leg). The bound is a heuristic dual ascent
// cut off by a work limit (route/optimize/lowerbound.go): its choices turn on the edges'
// costs to the cent, so micrometres moved it by up to 145 cents of 292,955 USD (5e-6, soak
// seed 1014; at most 2 cents on the quick campuses). Before geo placed lateral taps on the
// lines simplified within BendToleranceM, the foot of a building's centre on the short
// segment between two such vertices moved the tap by up to 3 mm, which bought a metre more
// cable on one soak campus (seed 1016, +4.38 USD).
func TestVertexOnLineNearJunction(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		_, base := outputs(t, sc)
		used := map[string]bool{}
		for i := range base.Legs {
			for _, p := range base.Legs[i].Pathways {
				used[p] = true
			}
		}
		var junctions [][2]float64
		for _, j := range base.Site.Net.Junctions {
			junctions = append(junctions, [2]float64(j.Point))
		}
		r := rand.New(rand.NewPCG(seed, 41))
		var added int
		sc2 := rewrite(sc, c, func(fs []campusgen.Feature) []campusgen.Feature {
			fs, added = onLine(fs, used, junctions, r)
			return fs
		})
		if added == 0 {
			t.Fatalf("no vertex drawn")
		}
		_, res := outputs(t, sc2)
		if d := diffVerdicts(routeDigest(base), routeDigest(res)); len(d) > 0 {
			t.Errorf("%d vertices on the lines changed %d legs: %s", added, len(d), strings.Join(d, "; "))
		}
		if b, g := base.Estimate.BOM.TotalCents, res.Estimate.BOM.TotalCents; b != g {
			t.Errorf("%d vertices on the lines: total %d → %d cents (%+d)", added, b, g, g-b)
		}
		if b, g := base.LowerBoundCents, res.LowerBoundCents; math.Abs(float64(g-b)) > 1e-5*float64(b) {
			t.Errorf("%d vertices on the lines: lower bound %d → %d cents (%+d), more than 1e-5 of it apart", added, b, g, g-b)
		}
		t.Logf("%d vertices drawn on %d pathways", added, len(used))
	})
}

// routeDigest is each leg's feasibility, medium and pathways in travel order.
func routeDigest(res *route.Result) map[string]string {
	out := map[string]string{}
	for i := range res.Legs {
		l := &res.Legs[i]
		out[legKey(l)] = fmt.Sprintf("feasible %v, %s, over %s", l.Feasible, l.Medium, strings.Join(l.Pathways, " "))
	}
	return out
}
