package optimize

import (
	"fmt"
	"math"
	"sync"
	"testing"

	"spanwright/media/install"
)

var (
	benchOnce     sync.Once
	benchCampuses map[int]*Problem
	benchSizes    = []int{100, 1000, 5000}
)

// benchCampus returns the synthetic campus of n buildings (10 % proposed edges, 10 % diverse
// demands, duct capacity on existing edges, two cross-connects), built once.
func benchCampus(n int) *Problem {
	benchOnce.Do(func() {
		benchCampuses = map[int]*Problem{}
		for _, s := range benchSizes {
			benchCampuses[s] = campus(campusSpec{buildings: s, seed: 7, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 10})
		}
	})
	return benchCampuses[n]
}

// benchSolve solves p b.N times with the default settings and returns the last solution.
func benchSolve(b *testing.B, p *Problem) *Solution {
	b.ReportAllocs()
	b.ResetTimer()
	var sol *Solution
	for i := 0; i < b.N; i++ {
		var err error
		if sol, err = Solve(p, Settings{}); err != nil {
			b.Fatal(err)
		}
	}
	return sol
}

// BenchmarkSolve solves synthetic campuses of 100, 1,000 and 5,000 buildings.
func BenchmarkSolve(b *testing.B) {
	for _, n := range benchSizes {
		b.Run(fmt.Sprintf("buildings_%d", n), func(b *testing.B) {
			p := benchCampus(n)
			sol := benchSolve(b, p)
			b.ReportMetric(float64(len(p.Edges)), "edges")
			b.ReportMetric(float64(len(sol.Infeasible)), "infeasible")
			b.ReportMetric(float64(sol.Rounds), "rounds")
		})
	}
}

var (
	benchTCOnce     sync.Once
	benchTCCampuses map[int]*Problem
	benchTCSizes    = []int{100, 1000}
)

// BenchmarkSolveTransitCharges solves the campuses of BenchmarkSolve drawn as the route layer
// draws them (withTransitCharges: buildings transit-free, a handhole charge wherever proposed
// trenches meet duct, and a tenth of the buildings' worth of junctions split into turn nodes
// under a pull-box charge): "drawn" with the marks and charges, "bare" the same graph without
// them, so the difference is the cost of the two features.
func BenchmarkSolveTransitCharges(b *testing.B) {
	benchTCOnce.Do(func() {
		benchTCCampuses = map[int]*Problem{}
		for _, s := range benchTCSizes {
			benchTCCampuses[s] = withTransitCharges(benchCampus(s), s/10)
		}
	})
	for _, n := range benchTCSizes {
		for _, drawn := range []bool{false, true} {
			name := fmt.Sprintf("buildings_%d/bare", n)
			p := benchTCCampuses[n]
			if drawn {
				name = fmt.Sprintf("buildings_%d/drawn", n)
			} else {
				bare := *p
				bare.NoTransit, bare.Charges = nil, nil
				p = &bare
			}
			b.Run(name, func(b *testing.B) {
				sol := benchSolve(b, p)
				b.ReportMetric(float64(len(sol.Charged)), "paid")
				b.ReportMetric(float64(len(sol.Infeasible)), "infeasible")
				b.ReportMetric(float64(sol.Rounds), "rounds")
			})
		}
	}
}

// BenchmarkPriceSweep solves 100 price-book scenarios (trench ×0.25–4, cable ×0.5–2, on a
// 7 × 7 × 2 grid less one) of the 1,000-building campus of BenchmarkSolve, one op being the
// whole sweep: "cold" solves each from scratch, "warm" starts each from the base scenario's
// plan (Settings.Start; the base solve is included), so every scenario's start is the same
// whatever the order or number of workers.
func BenchmarkPriceSweep(b *testing.B) {
	base := benchCampus(1000)
	var scen []*Problem
	for i := 0; len(scen) < 100; i++ {
		tr := 0.25 * math.Pow(16, float64(i%7)/6)
		cb := 0.5 * math.Pow(4, float64(i/7%7)/6)
		if i/49 == 1 {
			cb *= 1.1
		}
		scen = append(scen, repriced(base, tr, cb))
	}
	for _, mode := range []string{"cold", "warm"} {
		b.Run(mode, func(b *testing.B) {
			b.ReportAllocs()
			var total int64
			for i := 0; i < b.N; i++ {
				var start []StartRoute
				if mode == "warm" {
					bs, err := Solve(base, Settings{})
					if err != nil {
						b.Fatal(err)
					}
					start = StartFrom(bs)
				}
				total = 0
				for _, p := range scen {
					sol, err := Solve(p, Settings{Start: start})
					if err != nil {
						b.Fatal(err)
					}
					total += sol.TotalCents
				}
			}
			b.ReportMetric(float64(total)/100, "cents/scenario")
		})
	}
}

// BenchmarkDuctPack packs n cables of 10 mm into 100 mm ducts first fit (ductPack.place), loose
// (three a duct: install.PullLimit, so n/3 ducts) and as innerducts (fill only: 40 % of a
// 100 mm duct takes 40 of them). A duct at its count of pulls has no room in the segment tree,
// so loose cables cost about the same per cable at n = 300 and 3,000 (measured 58 and 50 ns).
// The innerducts do not (82 and 2,998 ns, as before the count of pulls): a duct holding 39 of
// them shows room for the 40th by area (to within the tree's 1e-9 mm²) that Takes refuses by
// one rounding of the summed areas, and it stays in the tree, so every later cable walks past
// each such duct.
func BenchmarkDuctPack(b *testing.B) {
	for _, innerduct := range []bool{false, true} {
		for _, n := range []int{300, 3000} {
			b.Run(fmt.Sprintf("innerduct_%v_cables_%d", innerduct, n), func(b *testing.B) {
				var p ductPack
				for b.Loop() {
					p.reset(100, install.PullLimit(innerduct, install.DefaultCablesPerDuct))
					for range n {
						if !p.place(10) {
							b.Fatal("a 10 mm cable fits no 100 mm duct")
						}
					}
				}
			})
		}
	}
}
