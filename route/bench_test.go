package route

import (
	"context"
	"fmt"
	"math"
	"path/filepath"
	"strings"
	"sync"
	"testing"

	"spanwright/geo"
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
		demoOnce.site, demoOnce.err = LoadSite(context.Background(), nil, files, SiteOptions{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
		demoOnce.plan = p
	})
	if demoOnce.err != nil {
		tb.Fatal(demoOnce.err)
	}
	return demoOnce.site, demoOnce.plan
}

func BenchmarkSolveDemo(b *testing.B) {
	s, p := demoSite(b)
	b.ReportAllocs()
	solveFresh(b, s, p)
}

// BenchmarkSolveDemoAgain plans the demo again and again on one site with one engine, as a
// sweep's scenarios that share a routing problem do: the optimizer's solution, the media
// choices and the pull plans are remembered.
func BenchmarkSolveDemoAgain(b *testing.B) {
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

// synthCampus writes a synthetic campus of about n buildings as GeoJSON: a grid of streets
// 120 m apart (one existing duct pathway per block side), a building beside the middle of
// n block sides joined by a 15 m service duct, a handhole three quarters along each such side, (every tenth also by a second duct to the
// block corner, for diverse routes), a proposed diagonal trench across every tenth
// block, the mc at the centre and two ics. It has about five spans per building.
func synthCampus(n int) []byte {
	g := 2
	for 2*g*(g-1) < n {
		g++
	}
	const lat0, lon0, stepM = 40.0, -75.0, 120.0
	ll := func(xM, yM float64) string {
		return fmt.Sprintf("[%.7f,%.7f]", lon0+xM/(111320*math.Cos(lat0*math.Pi/180)), lat0+yM/110540)
	}
	var b strings.Builder
	b.WriteString(`{"type":"FeatureCollection","features":[`)
	first := true
	add := func(f string) {
		if !first {
			b.WriteByte(',')
		}
		first = false
		b.WriteString(f)
	}
	built := 0
	mc := n / 2
	ics := map[int]bool{n / 4: true, 3 * n / 4: true}
	side := func(x0, y0, x1, y1 float64, id string) {
		if built >= n {
			add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"%s","spare_ducts":2},"geometry":{"type":"LineString","coordinates":[%s,%s]}}`,
				id, ll(x0, y0), ll(x1, y1)))
			return
		}
		mx, my := (x0+x1)/2, (y0+y1)/2
		// The building sits 15 m off the street, to the north or east.
		dx, dy := 0.0, 15.0
		if x0 == x1 {
			dx, dy = 15, 0
		}
		hx, hy := x0+(x1-x0)*0.75, y0+(y1-y0)*0.75
		add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"%s","spare_ducts":2},"geometry":{"type":"LineString","coordinates":[%s,%s,%s,%s]}}`,
			id, ll(x0, y0), ll(mx, my), ll(hx, hy), ll(x1, y1)))
		add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"structure","id":"H-%s","type":"handhole"},"geometry":{"type":"Point","coordinates":%s}}`,
			id, ll(hx, hy)))
		add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"%s-S"},"geometry":{"type":"LineString","coordinates":[%s,%s]}}`,
			id, ll(mx, my), ll(mx+dx, my+dy)))
		bx, by := mx+dx, my+dy
		if built%10 == 5 || built == mc || ics[built] {
			// A second service duct to the block corner, so a diverse pair exists.
			add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"%s-T"},"geometry":{"type":"LineString","coordinates":[%s,%s]}}`,
				id, ll(bx, by), ll(x1, y1)))
		}
		role := ""
		if built == mc {
			role = `,"role":"mc"`
		} else if ics[built] {
			role = `,"role":"ic"`
		}
		add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":"B%05d"%s},"geometry":{"type":"Polygon","coordinates":[[%s,%s,%s,%s,%s]]}}`,
			built, role, ll(bx-8, by-8), ll(bx+8, by-8), ll(bx+8, by+8), ll(bx-8, by+8), ll(bx-8, by-8)))
		built++
	}
	for i := 0; i < g; i++ {
		for j := 0; j < g; j++ {
			x, y := float64(i)*stepM, float64(j)*stepM
			if i+1 < g {
				side(x, y, x+stepM, y, fmt.Sprintf("E%d-%d", i, j))
			}
			if j+1 < g {
				side(x, y, x, y+stepM, fmt.Sprintf("N%d-%d", i, j))
			}
			if i+1 < g && j+1 < g && (i*g+j)%10 == 3 {
				add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"P%d-%d","status":"proposed","type":"buried","surface":"turf"},"geometry":{"type":"LineString","coordinates":[%s,%s]}}`,
					i, j, ll(x, y), ll(x+stepM, y+stepM)))
			}
		}
	}
	b.WriteString("]}")
	return []byte(b.String())
}

var synthSites sync.Map // n → *Site

func synthSite(tb testing.TB, n int) *Site {
	tb.Helper()
	if s, ok := synthSites.Load(n); ok {
		return s.(*Site)
	}
	s := newSynthSite(tb, n)
	synthSites.Store(n, s)
	return s
}

// newSynthSite builds a site of its own on the synthetic campus of about n buildings.
func newSynthSite(tb testing.TB, n int) *Site {
	tb.Helper()
	c, err := geo.Parse("synthetic.geojson", synthCampus(n))
	if err != nil {
		tb.Fatal(err)
	}
	net, err := geo.Build(c, geo.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	return NewSite(c, net)
}

// synthPlan is the benchmark plan: one link per building to its nearest cross-connect,
// every tenth building diverse.
func synthPlan(s *Site) *Plan {
	p := PlanDefaults
	p.File, p.Name = "synthetic.yaml", "synthetic"
	for i, b := range s.Campus.Buildings {
		if i%10 == 5 && b.Role == "" {
			p.Links = append(p.Links, LinkSpec{To: b.ID, Redundancy: RedundancyDiverse})
		}
	}
	return &p
}

func TestSynthCampus(t *testing.T) {
	t.Parallel()
	s := synthSite(t, 100)
	if got := len(s.Campus.Buildings); got != 100 {
		t.Fatalf("buildings: got %d, want 100", got)
	}
	perBuilding := float64(len(s.Net.Spans)) / 100
	if perBuilding < 4 || perBuilding > 6 {
		t.Errorf("spans per building: got %.1f, want about 5", perBuilding)
	}
	r, err := Solve(context.Background(), s, synthPlan(s))
	if err != nil {
		t.Fatal(err)
	}
	if err := r.Infeasible(); err != nil {
		t.Errorf("synthetic plan: %v", err)
	}
}

// BenchmarkPlan plans synthetic campuses end to end (links, optimizer, media choice);
// run it on one core: go test -run '^$' -bench Plan -benchmem -cpu 1 ./route/
func BenchmarkPlan(b *testing.B) {
	for _, n := range []int{100, 1000, 5000} {
		b.Run(fmt.Sprintf("buildings_%d", n), func(b *testing.B) {
			s := synthSite(b, n)
			p := synthPlan(s)
			b.ReportAllocs()
			b.ResetTimer()
			solveFresh(b, s, p)
		})
	}
}

// solveFresh plans p on the site b.N times, each time with nothing remembered: the site's
// caches cleared and a new engine, outside the timer, so that the benchmark measures a whole
// plan, not the memory of an earlier one.
func solveFresh(b *testing.B, s *Site, p *Plan) {
	b.Helper()
	for i := 0; i < b.N; i++ {
		b.StopTimer()
		s.solved.Purge()
		s.pulls.Purge()
		eng, err := Engine(p)
		if err != nil {
			b.Fatal(err)
		}
		b.StartTimer()
		if _, err := SolveWith(context.Background(), s, p, eng); err != nil {
			b.Fatal(err)
		}
	}
}
