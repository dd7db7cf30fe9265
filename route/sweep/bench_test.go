package sweep

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"testing"
)

// benchSweep writes, once per size, a sweep of the demo campus with n scenarios: the product
// of strand counts, growth fractions and slack lengths, none of which changes the network.
var benchSweep = struct {
	once  sync.Once
	dir   string
	files map[int]*File
	err   error
}{files: map[int]*File{}}

var benchSizes = map[int][3]int{100: {5, 5, 4}, 1000: {10, 10, 10}}

func benchFile(b *testing.B, n int) *File {
	b.Helper()
	benchSweep.once.Do(func() {
		benchSweep.dir, benchSweep.err = os.MkdirTemp("", "sweep-bench-")
		if benchSweep.err != nil {
			return
		}
		base, _ := filepath.Abs("../../testdata/demo/plan.yaml")
		for size, dims := range benchSizes {
			var strands, growth, slack []string
			for i := 0; i < dims[0]; i++ {
				strands = append(strands, fmt.Sprint(6+6*i))
			}
			for i := 0; i < dims[1]; i++ {
				growth = append(growth, fmt.Sprint(float64(i)/10))
			}
			for i := 0; i < dims[2]; i++ {
				slack = append(slack, fmt.Sprint(2+i))
			}
			src := fmt.Sprintf("base: %s\nvary:\n  defaults.strands: [%s]\n  defaults.growth: [%s]\n  design.slack_m: [%s]\n",
				base, strings.Join(strands, ", "), strings.Join(growth, ", "), strings.Join(slack, ", "))
			path := filepath.Join(benchSweep.dir, fmt.Sprintf("sweep-%d.yaml", size))
			if benchSweep.err = os.WriteFile(path, []byte(src), 0o644); benchSweep.err != nil {
				return
			}
			f, err := Load(path)
			if err != nil {
				benchSweep.err = err
				return
			}
			benchSweep.files[size] = f
		}
	})
	if benchSweep.err != nil {
		b.Fatal(benchSweep.err)
	}
	return benchSweep.files[n]
}

// BenchmarkSweep runs a whole sweep per iteration, writing every scenario folder and the
// comparison; it reports scenarios per second and the largest live heap seen, which should
// not grow with the number of scenarios.
func BenchmarkSweep(b *testing.B) {
	for _, n := range []int{100, 1000} {
		b.Run(fmt.Sprintf("scenarios_%d", n), func(b *testing.B) {
			f := benchFile(b, n)
			if len(f.Scenarios()) != n {
				b.Fatalf("got %d scenarios, want %d", len(f.Scenarios()), n)
			}
			b.ReportAllocs()
			var peak uint64
			var ms runtime.MemStats
			for i := 0; i < b.N; i++ {
				out := b.TempDir()
				rep, err := Run(context.Background(), f, Options{Out: out, Progress: func(p Progress) {
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
