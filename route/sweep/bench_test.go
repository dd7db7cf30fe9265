package sweep

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"strconv"
	"strings"
	"sync"
	"testing"

	"go.yaml.in/yaml/v3"

	"spanwright/route/internal/campusgen"
	"spanwright/route/output"
)

// benchSizes are the axes' lengths of each benchmarked sweep size.
var benchSizes = map[int][3]int{100: {5, 5, 4}, 1000: {10, 10, 10}}

// benchFile writes a sweep of the demo campus with n scenarios into a temporary folder. None
// of its axes changes the network, so the site is built once. By default the axes are strand
// counts, growth fractions and slack lengths, which share 100 routing problems between them
// (growth mostly rounds to the same cables), as sweeps over design options do. With distinct
// set they are 100 price books of different labour rates and ten slack lengths: every
// scenario is a routing problem of its own and every tenth uses another media engine, the
// worst case for what a sweep remembers between scenarios.
func benchFile(b *testing.B, n int, distinct bool) *File {
	b.Helper()
	dims := benchSizes[n]
	base, err := filepath.Abs("../../testdata/demo/plan.yaml")
	if err != nil {
		b.Fatal(err)
	}
	dir := b.TempDir()
	var axes []string
	axis := func(key string, n int, value func(i int) string) {
		var vs []string
		for i := 0; i < n; i++ {
			vs = append(vs, value(i))
		}
		axes = append(axes, fmt.Sprintf("  %s: [%s]\n", key, strings.Join(vs, ", ")))
	}
	if distinct {
		book, err := os.ReadFile("../../media/prices-demo.yaml")
		if err != nil {
			b.Fatal(err)
		}
		axis("prices", dims[0]*dims[1], func(i int) string {
			name := fmt.Sprintf("prices-%d.yaml", i)
			rate := fmt.Sprintf("hourly_rate: %d.00", 40+i)
			data := strings.Replace(string(book), "hourly_rate: 92.00", rate, 1)
			if !strings.Contains(data, rate) {
				b.Fatal("the demo price book has no hourly_rate: 92.00 to change")
			}
			if err := os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644); err != nil {
				b.Fatal(err)
			}
			return name
		})
	} else {
		axis("defaults.strands", dims[0], func(i int) string { return fmt.Sprint(6 + 6*i) })
		axis("defaults.growth", dims[1], func(i int) string { return fmt.Sprint(float64(i) / 10) })
	}
	axis("design.slack_m", dims[2], func(i int) string { return fmt.Sprint(2 + i) })
	src := "base: " + base + "\nvary:\n" + strings.Join(axes, "")
	path := filepath.Join(dir, fmt.Sprintf("sweep-%d.yaml", n))
	if err := os.WriteFile(path, []byte(src), 0o644); err != nil {
		b.Fatal(err)
	}
	f, err := Load(path)
	if err != nil {
		b.Fatal(err)
	}
	return f
}

// BenchmarkSweep runs sweeps of the demo campus as `spanwright sweep` does by default (lean
// scenario folders: no bom.xlsx) and, for comparison, with the workbook in every folder.
// The garbage collector runs at GOGC 400, as `spanwright sweep` sets it.
func BenchmarkSweep(b *testing.B) {
	defer debug.SetGCPercent(debug.SetGCPercent(400))
	for _, bc := range []struct {
		n              int
		full, distinct bool
	}{{100, false, false}, {1000, false, false}, {100, false, true}, {1000, false, true}, {100, true, false}} {
		name := fmt.Sprintf("scenarios_%d", bc.n)
		if bc.distinct {
			name += "_distinct"
		}
		if bc.full {
			name += "_workbooks"
		}
		b.Run(name, func(b *testing.B) {
			n := bc.n
			f := benchFile(b, n, bc.distinct)
			if len(f.Scenarios()) != n {
				b.Fatalf("got %d scenarios, want %d", len(f.Scenarios()), n)
			}
			b.ReportAllocs()
			var peak uint64
			var ms runtime.MemStats
			for i := 0; i < b.N; i++ {
				out := benchOut(b)
				rep, err := Run(context.Background(), f, Options{Out: out, Write: output.WriteOptions{SkipWorkbook: !bc.full, SkipGeoPackage: !bc.full},
					Progress: func(p Progress) {
						if p.Done%50 == 0 {
							runtime.ReadMemStats(&ms)
							peak = max(peak, ms.HeapAlloc)
						}
					}})
				if err != nil {
					b.Fatal(err)
				}
				if rep.Failed > 0 {
					b.Fatalf("%d scenarios failed, first: %s", rep.Failed, rep.Failures[0].Error)
				}
			}
			b.ReportMetric(float64(n*b.N)/b.Elapsed().Seconds(), "scenarios/s")
			b.ReportMetric(float64(peak)/(1<<20), "peak-heap-MiB")
		})
	}
}

// benchRoot holds the benchmarks' output folders until the test binary exits. Removing each
// sweep's folder right after it would slow the next one on a journal-less ext4 (this
// project's machines): for a few minutes after inodes are deleted, ext4 scans past them on
// every new inode of their block group. The benchmark would then measure its own clean-up.
var benchRoot struct {
	sync.Mutex
	dir string
}

func TestMain(m *testing.M) {
	code := m.Run()
	if benchRoot.dir != "" {
		os.RemoveAll(benchRoot.dir)
	}
	os.Exit(code)
}

// benchOut is a fresh output folder for one benchmarked sweep: under $SPANWRIGHT_BENCH_OUT
// when it is set (to compare file systems, e.g. /dev/shm), else under the system's temporary
// folder; see benchRoot.
func benchOut(b *testing.B) string {
	b.Helper()
	benchRoot.Lock()
	if benchRoot.dir == "" {
		d, err := os.MkdirTemp(os.Getenv("SPANWRIGHT_BENCH_OUT"), "spanwright-bench-")
		if err != nil {
			benchRoot.Unlock()
			b.Fatal(err)
		}
		benchRoot.dir = d
	}
	parent := benchRoot.dir
	benchRoot.Unlock()
	dir, err := os.MkdirTemp(parent, "sweep-")
	if err != nil {
		b.Fatal(err)
	}
	return dir
}

// priceSweep writes a sweep of a generated campus of n buildings (campusgen.BenchOptions,
// seed 1) over price books that scale the demo book's new construction (trench_per_m,
// restoration_per_m, directional_bore_per_m) by each of trench and its cable_per_m by each of
// cable: len(trench)×len(cable) scenarios in one prices axis, the first (the base scenario)
// at trench[0] and cable[0].
func priceSweep(tb testing.TB, n int, trench, cable []float64) *File {
	tb.Helper()
	dir := tb.TempDir()
	if err := campusgen.WriteFiles(dir, campusgen.Generate(1, campusgen.BenchOptions(n)), 4); err != nil {
		tb.Fatal(err)
	}
	src, err := os.ReadFile("../../media/prices-demo.yaml")
	if err != nil {
		tb.Fatal(err)
	}
	var names []string
	for i, t := range trench {
		for j, c := range cable {
			var doc yaml.Node
			if err := yaml.Unmarshal(src, &doc); err != nil {
				tb.Fatal(err)
			}
			root := doc.Content[0]
			for k := 0; k+1 < len(root.Content); k += 2 {
				switch root.Content[k].Value {
				case "trench_per_m", "restoration_per_m", "directional_bore_per_m":
					scaleAmounts(root.Content[k+1], t)
				case "cable_per_m":
					scaleAmounts(root.Content[k+1], c)
				}
			}
			data, err := yaml.Marshal(&doc)
			if err != nil {
				tb.Fatal(err)
			}
			name := fmt.Sprintf("prices-t%d-c%d.yaml", i, j)
			if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
				tb.Fatal(err)
			}
			names = append(names, name)
		}
	}
	path := filepath.Join(dir, "sweep.yaml")
	if err := os.WriteFile(path, []byte("base: plan.yaml\nvary:\n  prices: ["+strings.Join(names, ", ")+"]\n"), 0o644); err != nil {
		tb.Fatal(err)
	}
	f, err := Load(path)
	if err != nil {
		tb.Fatal(err)
	}
	return f
}

// scaleAmounts multiplies every amount (a scalar value of a mapping, at any depth; keys are
// strand counts and stay) under n by k, rounded to cents.
func scaleAmounts(n *yaml.Node, k float64) {
	switch n.Kind {
	case yaml.MappingNode:
		for i := 1; i < len(n.Content); i += 2 {
			scaleAmounts(n.Content[i], k)
		}
	case yaml.ScalarNode:
		if v, err := strconv.ParseFloat(n.Value, 64); err == nil {
			n.Value, n.Tag = strconv.FormatFloat(math.Round(v*k*100)/100, 'f', 2, 64), "!!float"
		}
	}
}

// BenchmarkSweepWarm plans a price sweep of 20 scenarios (trench ×0.5 to ×8, cable ×0.5 to
// ×4) of a generated 300-building campus cold (each scenario from scratch) and warm (each
// from the base scenario's routes), two jobs, lean folders as `spanwright sweep` writes by
// default. It reports the mean of the scenarios' objectives, whose cold-to-warm change is
// the warm start's effect on the plans.
func BenchmarkSweepWarm(b *testing.B) {
	defer debug.SetGCPercent(debug.SetGCPercent(400))
	f := priceSweep(b, 300, []float64{0.5, 1, 2, 4, 8}, []float64{0.5, 1, 2, 4})
	for _, cold := range []bool{true, false} {
		name := "warm"
		if cold {
			name = "cold"
		}
		b.Run(name, func(b *testing.B) {
			var objective float64
			for i := 0; i < b.N; i++ {
				out := benchOut(b)
				rep, err := Run(context.Background(), f, Options{Out: out, Jobs: 2, Cold: cold,
					Write: output.WriteOptions{SkipWorkbook: true, SkipGeoPackage: true}})
				if err != nil {
					b.Fatal(err)
				}
				if rep.Failed > 0 {
					b.Fatalf("%d scenarios failed, first: %s", rep.Failed, rep.Failures[0].Error)
				}
				b.StopTimer()
				objective = 0
				for _, sc := range f.Scenarios() {
					data, err := os.ReadFile(filepath.Join(out, sc.ID, SummaryFile))
					if err != nil {
						b.Fatal(err)
					}
					var s output.Summary
					if err := json.Unmarshal(data, &s); err != nil {
						b.Fatal(err)
					}
					objective += float64(s.ObjectiveCents) / 100
				}
				b.StartTimer()
			}
			b.ReportMetric(float64(len(f.Scenarios())*b.N)/b.Elapsed().Seconds(), "scenarios/s")
			b.ReportMetric(objective/float64(len(f.Scenarios())), "mean-objective")
		})
	}
}

// BenchmarkPreflight checks the inputs of a sweep of 100 price books of a generated
// 1,000-building campus (issue 16's sweep) as Options.Preflight does before planning: each
// run from a new runner, so the campus is read and noded and every engine built (work the
// planning then finds in the runner's caches, except engines beyond engineCacheSize).
func BenchmarkPreflight(b *testing.B) {
	factors := []float64{0.5, 0.75, 1, 1.5, 2, 3, 4, 6, 8, 12}
	f := priceSweep(b, 1000, factors, factors)
	for i := 0; i < b.N; i++ {
		r, err := newRunner(f, Options{Out: filepath.Join(b.TempDir(), "out")})
		if err != nil {
			b.Fatal(err)
		}
		if err := r.preflight(context.Background(), f.Scenarios()); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(len(f.Scenarios())*b.N)/b.Elapsed().Seconds(), "scenarios/s")
}
