package install

import (
	"fmt"
	"sync"
	"testing"
)

var (
	benchOnce sync.Once
	benchRuns map[string][]Step
)

// benchRun is n straights of 150 m, every other one followed by a 45° bend; incline gives the
// straights alternating slopes, which turns off the level-run shortcut in Sections.
func benchRun(n int, incline bool) []Step {
	var run []Step
	for i := 0; i < n; i++ {
		s := Step{Kind: KindStraight, LengthM: 150}
		if incline {
			s.InclineDeg = float64(i%5) - 2
		}
		run = append(run, s)
		if i%2 == 1 {
			run = append(run, Step{Kind: KindBend, AngleDeg: 45, RadiusM: 1})
		}
	}
	return run
}

func BenchmarkSections(b *testing.B) {
	benchOnce.Do(func() {
		benchRuns = map[string][]Step{}
		for _, n := range []int{20, 200} {
			benchRuns[fmt.Sprintf("level_%d", n)] = benchRun(n, false)
			benchRuns[fmt.Sprintf("incline_%d", n)] = benchRun(n, true)
		}
	})
	for _, name := range []string{"level_20", "level_200", "incline_20", "incline_200"} {
		run := benchRuns[name]
		b.Run(name, func(b *testing.B) {
			for b.Loop() {
				if _, err := Sections(run, nil, siSpec); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func BenchmarkDuctBankAssign(b *testing.B) {
	bank := DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 6, IDMM: 102}
	ods := []float64{22, 15.5, 30, 15.5, 9, 22, 41, 12, 18, 18, 25, 9}
	for b.Loop() {
		bank.Assign(ods)
	}
}

// BenchmarkDuctBankSpread packs the cables of a crowded bank (first fit puts 12 of them in one
// duct of six) first fit, then spread, against Pull alone; and a large bank, 2,000 cables in
// 200 ducts, as a campus trunk of many innerduct-free cables would have.
func BenchmarkDuctBankSpread(b *testing.B) {
	small := DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 6, IDMM: 102}
	smallODs := []float64{22, 15.5, 30, 15.5, 9, 22, 41, 12, 18, 18, 25, 9}
	large := DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 200, IDMM: 100}
	var largeODs []float64
	for i := range 2000 {
		largeODs = append(largeODs, []float64{10, 10.5, 13, 18}[i%4])
	}
	for _, c := range []struct {
		name string
		bank DuctBank
		ods  []float64
	}{{"6_ducts_12_cables", small, smallODs}, {"200_ducts_2000_cables", large, largeODs}} {
		b.Run("pull_"+c.name, func(b *testing.B) {
			for b.Loop() {
				c.bank.Pull(c.ods)
			}
		})
		b.Run("spread_"+c.name, func(b *testing.B) {
			for b.Loop() {
				c.bank.Spread(c.ods, nil)
			}
		})
	}
}
