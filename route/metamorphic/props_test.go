package metamorphic_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spanwright/route/internal/campusgen"
)

// Seeds and sizes of the campuses every property runs on in make test; make soak runs more.
var (
	quickSeeds = []uint64{1, 2, 3, 4, 5, 6, 7, 8}
	quickSize  = 40
)

// each runs f on every quick campus.
func each(t *testing.T, f func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario)) {
	for _, seed := range seeds() {
		c, sc := newScenario(seed, size())
		t.Run(fmt.Sprintf("seed_%d", seed), func(t *testing.T) {
			t.Parallel()
			f(t, seed, c, sc)
		})
	}
}

// rewrite makes a scenario from c's features after edit.
func rewrite(sc scenario, c *campusgen.Campus, edit func([]campusgen.Feature) []campusgen.Feature) scenario {
	fs := make([]campusgen.Feature, len(c.Features))
	for i, f := range c.Features {
		f.Props = slices.Clone(f.Props)
		f.Coords = cloneCoords(f.Coords)
		fs[i] = f
	}
	out := sc
	out.files = map[string][]byte{"campus.geojson": campusgen.GeoJSON(edit(fs))}
	return out
}

func cloneCoords(c [][][2]float64) [][][2]float64 {
	out := make([][][2]float64, len(c))
	for i, l := range c {
		out[i] = slices.Clone(l)
	}
	return out
}

// TestMillimetre: moving every vertex by up to a millimetre (each distinct point by one
// offset, so that shared vertices stay shared) changes no leg's feasibility or medium.
func TestMillimetre(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		_, base := outputs(t, sc)
		for trial := range 2 {
			r := rand.New(rand.NewPCG(seed, uint64(trial)))
			moved := map[[2]float64][2]float64{}
			const mmDeg = 1e-3 / 111_200.0
			sc2 := rewrite(sc, c, func(fs []campusgen.Feature) []campusgen.Feature {
				for _, f := range fs {
					for _, l := range f.Coords {
						for k, p := range l {
							q, ok := moved[p]
							if !ok {
								a := r.Float64() * 2 * math.Pi
								q = [2]float64{p[0] + mmDeg*math.Cos(a)/math.Cos(46.2*math.Pi/180), p[1] + mmDeg*math.Sin(a)}
								moved[p] = q
							}
							l[k] = q
						}
					}
				}
				return fs
			})
			_, res := outputs(t, sc2)
			if d := diffVerdicts(verdicts(base), verdicts(res)); len(d) > 0 {
				t.Errorf("trial %d: a millimetre changed %d legs: %s", trial, len(d), strings.Join(d, "; "))
			}
		}
	})
}

// TestSmallNumbers: ±1 mm of every riser_m, of slack_m and of max_lateral_m changes no
// leg's feasibility or medium.
func TestSmallNumbers(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		_, base := outputs(t, sc)
		for _, delta := range []float64{-0.001, 0.001} {
			sc2 := rewrite(sc, c, func(fs []campusgen.Feature) []campusgen.Feature {
				for _, f := range fs {
					for k, p := range f.Props {
						if p.Key == "riser_m" {
							f.Props[k].Value = max(0, p.Value.(float64)+delta)
						}
					}
				}
				return fs
			})
			sc2.plan = planYAML(c, []string{"campus.geojson"}, fmt.Sprintf("slack_m: %g, max_lateral_m: %g", 5+delta, 30+delta))
			_, res := outputs(t, sc2)
			if d := diffVerdicts(verdicts(base), verdicts(res)); len(d) > 0 {
				t.Errorf("%+g m changed %d legs: %s", delta, len(d), strings.Join(d, "; "))
			}
		}
	})
}

// TestFeatureOrder: the same features in another order give the same bytes in every output.
func TestFeatureOrder(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		base, _ := outputs(t, sc)
		r := rand.New(rand.NewPCG(seed, 7))
		sc2 := rewrite(sc, c, func(fs []campusgen.Feature) []campusgen.Feature {
			r.Shuffle(len(fs), func(i, j int) { fs[i], fs[j] = fs[j], fs[i] })
			return fs
		})
		got, _ := outputs(t, sc2)
		if d := diffFiles(base, got); len(d) > 0 {
			t.Errorf("feature order changed %d files:\n%s", len(d), strings.Join(d, "\n"))
		}
	})
}

// TestFileSplit: the campus split into two files gives the same bytes in every output.
func TestFileSplit(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		base, _ := outputs(t, sc)
		var a, b []campusgen.Feature
		for i, f := range c.Features {
			if i%3 == 0 {
				a = append(a, f)
			} else {
				b = append(b, f)
			}
		}
		sc2 := sc
		sc2.files = map[string][]byte{"campus.geojson": campusgen.GeoJSON(b), "more.geojson": campusgen.GeoJSON(a)}
		sc2.plan = planYAML(c, []string{"campus.geojson", "more.geojson"}, "")
		got, _ := outputs(t, sc2)
		if d := diffFiles(base, got); len(d) > 0 {
			t.Errorf("splitting the file changed %d files:\n%s", len(d), strings.Join(d, "\n"))
		}
	})
}

// TestSplitAtVertex: a street drawn as two lines that meet at one of its vertices (a
// MultiLineString with the same id) gives the same bytes in every output.
func TestSplitAtVertex(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		base, _ := outputs(t, sc)
		sc2 := rewrite(sc, c, func(fs []campusgen.Feature) []campusgen.Feature {
			for i := range fs {
				f := &fs[i]
				if f.Geometry != "LineString" || len(f.Coords[0]) < 3 || i%2 == 0 {
					continue
				}
				l := f.Coords[0]
				k := len(l) / 2
				f.Geometry, f.Coords = "MultiLineString", [][][2]float64{slices.Clone(l[:k+1]), slices.Clone(l[k:])}
			}
			return fs
		})
		got, _ := outputs(t, sc2)
		if d := diffFiles(base, got); len(d) > 0 {
			t.Errorf("splitting pathways at a vertex changed %d files:\n%s", len(d), strings.Join(d, "\n"))
		}
	})
}

// TestLineReversal: every pathway drawn the other way (each line's vertices in reverse order;
// a MultiLineString's lines each reversed) gives the same bytes in every output: which way a
// GIS operator digitised a duct means nothing, so no length, handhole, position, fingerprint
// or float sum may follow it.
func TestLineReversal(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		base, _ := outputs(t, sc)
		sc2 := rewrite(sc, c, func(fs []campusgen.Feature) []campusgen.Feature {
			for _, f := range fs {
				if f.Geometry != "LineString" && f.Geometry != "MultiLineString" {
					continue
				}
				for _, l := range f.Coords {
					slices.Reverse(l)
				}
			}
			return fs
		})
		got, _ := outputs(t, sc2)
		if d := diffFiles(base, got); len(d) > 0 {
			t.Errorf("reversing the lines changed %d files:\n%s", len(d), strings.Join(d, "\n"))
		}
	})
}

// TestCores: one core or two, the same bytes.
// It runs its campuses one after another (not in parallel with each other), as a top-level
// test that is not parallel runs before every parallel one.
func TestCores(t *testing.T) {
	prev := runtime.GOMAXPROCS(0)
	defer runtime.GOMAXPROCS(prev)
	for _, seed := range seeds() {
		_, sc := newScenario(seed, size())
		runtime.GOMAXPROCS(1)
		one, _ := outputs(t, sc)
		runtime.GOMAXPROCS(max(2, prev))
		two, _ := outputs(t, sc)
		if d := diffFiles(one, two); len(d) > 0 {
			t.Errorf("seed %d: GOMAXPROCS changed %d files:\n%s", seed, len(d), strings.Join(d, "\n"))
		}
	}
}

// seeds are the campuses to run: the quick ones, or with SPANWRIGHT_SOAK=N (make soak) N
// campuses from seed 1000 on.
func seeds() []uint64 {
	if s, err := strconv.ParseUint(os.Getenv("SPANWRIGHT_SOAK_SEED"), 10, 64); err == nil {
		return []uint64{s} // one campus, to look into a failure of make soak
	}
	n, _ := strconv.Atoi(os.Getenv("SPANWRIGHT_SOAK"))
	if n <= 0 {
		return quickSeeds
	}
	out := make([]uint64, n)
	for i := range out {
		out[i] = 1000 + uint64(i)
	}
	return out
}

// size is the number of buildings of each campus: quickSize, or SPANWRIGHT_SOAK_BUILDINGS.
func size() int {
	if n, _ := strconv.Atoi(os.Getenv("SPANWRIGHT_SOAK_BUILDINGS")); n > 0 {
		return n
	}
	return quickSize
}
