package report

import (
	"context"
	"testing"

	"spanwright/route/sweep"
)

// BenchmarkPlan renders the demo's plan report (30 buildings, 85 pathways, 32 legs).
func BenchmarkPlan(b *testing.B) {
	t := &testing.T{}
	r := result(t, demoPlan)
	b.Run("demo", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := Plan(context.Background(), r, Options{}); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// BenchmarkSweep renders a comparison of 1,000 scenarios.
func BenchmarkSweep(b *testing.B) {
	rows := make([]sweep.Row, 1000)
	for i := range rows {
		m := 1 + float64(i%37)/10
		rows[i] = sweep.Row{Index: i, ID: "s-" + string(rune('a'+i%26)), Status: sweep.StatusOK, Currency: "USD",
			TotalCents: int64(100_000_00 + (i*7919)%50_000_00), WorstMarginDB: &m}
	}
	c := sweep.Judge(rows, nil)
	b.Run("rows_1000", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := Sweep(c, SweepOptions{}); err != nil {
				b.Fatal(err)
			}
		}
	})
}
