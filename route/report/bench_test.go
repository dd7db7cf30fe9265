package report

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/campusgen"
	"spanwright/route/plan"
	"spanwright/route/site"
	"spanwright/route/sweep"
)

// BenchmarkPlan renders the plan report of the demo (30 buildings, 85 pathways, 32 legs) and
// of a generated campus of 1,000 buildings (about 2,900 pathways, 1,000 legs).
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
	b.Run("buildings_1000", func(b *testing.B) {
		r := generated(b, 1000)
		b.ReportAllocs()
		b.ResetTimer()
		for b.Loop() {
			if _, err := Plan(context.Background(), r, Options{}); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// generated plans a campus of n buildings from campusgen.
func generated(b *testing.B, n int) *route.Result {
	b.Helper()
	c := campusgen.Generate(1, campusgen.Options{Buildings: n})
	dir := b.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "campus.geojson"), campusgen.GeoJSON(c.Features), 0o644); err != nil {
		b.Fatal(err)
	}
	p, err := plan.ParsePlan(filepath.Join(dir, "plan.yaml"), []byte(fmt.Sprintf("name: generated\ncampus: [campus.geojson]\nhub: %s\n", c.Hub)))
	if err != nil {
		b.Fatal(err)
	}
	site, err := site.Load(context.Background(), nil, []string{filepath.Join(dir, "campus.geojson")}, site.Options{})
	if err != nil {
		b.Fatal(err)
	}
	r, err := route.Solve(context.Background(), site, p)
	if err != nil {
		b.Fatal(err)
	}
	return r
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
