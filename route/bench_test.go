package route

import (
	"context"
	"os"
	"path/filepath"
	"sync"
	"testing"
)

var demoOnce struct {
	sync.Once
	site *Site
	plan *Plan
	err  error
}

// demoSite loads the demo campus once for the benchmarks.
func demoSite(tb testing.TB) (*Site, *Plan) {
	tb.Helper()
	demoOnce.Do(func() {
		p, err := LoadPlan(filepath.Join("..", "testdata", "demo", "plan.yaml"))
		if err != nil {
			demoOnce.err = err
			return
		}
		files := make([]string, len(p.Campus))
		for i, f := range p.Campus {
			files[i] = p.Path(f)
		}
		demoOnce.site, demoOnce.err = LoadSite(nil, files, SiteOptions{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
		demoOnce.plan = p
	})
	if demoOnce.err != nil {
		tb.Fatal(demoOnce.err)
	}
	return demoOnce.site, demoOnce.plan
}

func BenchmarkSolveDemo(b *testing.B) {
	s, p := demoSite(b)
	eng, err := Engine(p)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := SolveWith(context.Background(), s, p, eng); err != nil {
			b.Fatal(err)
		}
	}
}

var _ = os.Getenv
