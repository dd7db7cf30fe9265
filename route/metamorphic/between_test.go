package metamorphic_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route"
	"spanwright/route/internal/campusgen"
	"spanwright/route/output"
)

// TestBetweenStreets: annexes that stand midway between two ducts, 28 m from each wall, with
// no lateral drawn (campusgen BetweenStreets), are offered a counted lateral to each
// (geo lateralDoors), and the optimizer chooses. Moving every annex 1 mm north, or 1 mm
// south, renaming every id, and shifting every vertex 1 mm east give the same total to the
// cent and every leg the same pathways, the same entrances and laterals to the millimetre
// (the project brief: plans must not change with id names or a millimetre). Before, only the
// nearer duct was offered, and a tie went by the ducts' ids: a millimetre or a rename moved
// an annex's route from one duct to the other.
func TestBetweenStreets(t *testing.T) {
	for _, seed := range seeds()[:min(3, len(seeds()))] {
		c := campusgen.Generate(seed, campusgen.Options{Buildings: size(), BetweenStreets: 2})
		sc := scenario{seed: seed, files: map[string][]byte{"campus.geojson": campusgen.GeoJSON(c.Features)},
			plan: planYAML(c, []string{"campus.geojson"}, "")}
		t.Run(fmt.Sprintf("seed_%d", seed), func(t *testing.T) {
			t.Parallel()
			_, base := outputs(t, sc)
			for _, q := range []string{"Q00", "Q01"} {
				if es := base.Site.Net.EntrancesOf(q); len(es) != 2 || es[0].Via != geo.ViaLateral || es[1].Via != geo.ViaLateral {
					t.Fatalf("annex %s's entrances %+v; want a counted lateral to each of its two ducts", q, es)
				}
			}
			want := lateralDigest(base, nil)
			const mmDeg = 1e-3 / 111_200.0 // a millimetre of latitude (campusgen's scale)
			move := func(what string, f func(id string, p [2]float64) [2]float64) {
				sc2 := rewrite(sc, c, func(fs []campusgen.Feature) []campusgen.Feature {
					for _, ft := range fs {
						for _, l := range ft.Coords {
							for k, p := range l {
								l[k] = f(propID(&ft), p)
							}
						}
					}
					return fs
				})
				_, res := outputs(t, sc2)
				sameLaterals(t, what, base, res, want, nil)
			}
			annex := func(id string) bool { return len(id) == 3 && id[0] == 'Q' }
			move("annexes 1 mm north", func(id string, p [2]float64) [2]float64 {
				if annex(id) {
					p[1] += mmDeg
				}
				return p
			})
			move("annexes 1 mm south", func(id string, p [2]float64) [2]float64 {
				if annex(id) {
					p[1] -= mmDeg
				}
				return p
			})
			move("every vertex 1 mm east", func(_ string, p [2]float64) [2]float64 {
				p[0] += mmDeg / math.Cos(46.2*math.Pi/180)
				return p
			})
			for trial := range 2 {
				sc2, back := renameAll(sc, c, rand.New(rand.NewPCG(seed, 200+uint64(trial))))
				_, res := outputs(t, sc2)
				sameLaterals(t, fmt.Sprintf("ids renamed (trial %d)", trial), base, res, want, back)
			}
		})
	}
}

// lateralDigest is each leg (from>to/name) with its pathways, the entrances it uses at both
// ends and its laterals to the millimetre, every id named back by back (nil: as it is); an
// entrance that is not a declared one is named by its building and a number (geo.EntrySep),
// which follows the places of the building's entrances, not the ids.
func lateralDigest(res *route.Result, back map[string]string) map[string]string {
	name := func(id string) string {
		if back == nil {
			return id
		}
		if b, n, ok := strings.Cut(id, geo.EntrySep); ok {
			return back[b] + geo.EntrySep + n
		}
		return back[id]
	}
	out := map[string]string{}
	for i := range res.Legs {
		l := &res.Legs[i]
		ps := make([]string, len(l.Pathways))
		for k, p := range l.Pathways {
			ps[k] = name(p)
		}
		out[name(l.Link.From)+">"+name(l.Link.To)+"/"+l.Name] = fmt.Sprintf("%s | %s %s | lateral %.3f m",
			strings.Join(ps, " "), name(l.EntranceFrom), name(l.EntranceTo), l.LateralM)
	}
	return out
}

// sameLaterals holds res to base (want is base's lateralDigest): the same total to the cent,
// and every leg's digest, but for its laterals within 2 mm (a millimetre moves them by one).
func sameLaterals(t *testing.T, what string, base, res *route.Result, want, back map[string]string) {
	t.Helper()
	if a, b := output.Summarize(base).TotalCents, output.Summarize(res).TotalCents; a != b {
		t.Errorf("%s: total %d → %d cents", what, a, b)
	}
	got := lateralDigest(res, back)
	if len(got) != len(want) {
		t.Errorf("%s: %d legs, want %d", what, len(got), len(want))
	}
	for k, w := range want {
		g := got[k]
		wp, wm, _ := strings.Cut(w, " | lateral ")
		gp, gm, _ := strings.Cut(g, " | lateral ")
		var wl, gl float64
		fmt.Sscanf(wm, "%f", &wl)
		fmt.Sscanf(gm, "%f", &gl)
		if gp != wp || math.Abs(gl-wl) > 0.002 {
			t.Errorf("%s: leg %s: %s, want %s", what, k, g, w)
		}
	}
}
