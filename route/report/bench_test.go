package report

import (
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"runtime/metrics"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"spanwright/route"
	"spanwright/route/internal/campusgen"
	"spanwright/route/internal/testplan"
	"spanwright/route/output"
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

// BenchmarkPlanOutputs plans a generated campus that looks like a real one
// (campusgen.BenchOptions, as BenchmarkCommands of cmd/spanwright) once, then writes every
// output, report.html included, as `spanwright plan` does (output.WriteSet), b.N times. It
// reports the heap before writing (live-MB, after a collection: the plan, the site and the
// caches) and at its highest while writing (peak-MB: heap objects, live and not yet
// collected, sampled every millisecond from runtime/metrics), and for each file the highest
// heap while it was rendered (FILE-peak-MB; files rendered side by side share their peaks),
// and the process's CPU time per write of the set (cpu-ms/op, the heap sampler's included).
// -cpu 1 renders the files one after the other, -cpu 2 two side by side (WriteSet renders
// on GOMAXPROCS goroutines):
//
//	go test -run '^$' -bench PlanOutputs -benchtime 1x -count 3 -cpu 1,2 ./route/report/
func BenchmarkPlanOutputs(b *testing.B) {
	for _, n := range []int{1000, 5000} {
		b.Run(fmt.Sprintf("buildings_%d", n), func(b *testing.B) {
			s, p := testplan.CampusSite(b, n)
			r, err := route.Solve(context.Background(), s, p)
			if err != nil {
				b.Fatal(err)
			}
			files := append(output.Outputs(r, output.WriteOptions{}), Output(r, Options{}))
			var rendering atomic.Uint64 // the files being rendered, one bit per index into files
			peaks := make([]atomic.Uint64, len(files))
			for i := range files {
				f := files[i]
				files[i].Render = func(ctx context.Context, w io.Writer) error {
					rendering.Or(1 << i)
					defer rendering.And(^uint64(1 << i))
					return f.Render(ctx, w)
				}
			}
			out := filepath.Join(b.TempDir(), "out")
			runtime.GC()
			live := heapObjects()
			stop := make(chan struct{})
			var top uint64 // the heap at its highest, read once the sampler has stopped
			var sampled sync.WaitGroup
			sampled.Go(func() {
				tick := time.NewTicker(time.Millisecond)
				defer tick.Stop()
				for {
					select {
					case <-stop:
						return
					case <-tick.C:
						h, on := heapObjects(), rendering.Load()
						for i := range files {
							if at := &peaks[i]; on&(1<<i) != 0 && h > at.Load() {
								at.Store(h)
							}
						}
						if h > top {
							top = h
						}
					}
				}
			})
			b.ReportAllocs()
			cpu0 := cpuTime()
			b.ResetTimer()
			for b.Loop() {
				if err := output.WriteSet(context.Background(), out, files, r.Inputs()); err != nil {
					b.Fatal(err)
				}
			}
			b.StopTimer()
			b.ReportMetric(float64(cpuTime()-cpu0)/float64(b.N)/1e6, "cpu-ms/op")
			close(stop)
			sampled.Wait()
			const mb = 1 << 20
			b.ReportMetric(float64(live)/mb, "live-MB")
			for i := range files {
				b.ReportMetric(float64(peaks[i].Load())/mb, files[i].Name+"-peak-MB")
			}
			b.ReportMetric(float64(top)/mb, "peak-MB")
		})
	}
}

// heapObjects is the heap's objects in bytes, live and not yet collected.
func heapObjects() uint64 {
	s := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	metrics.Read(s)
	return s[0].Value.Uint64()
}
