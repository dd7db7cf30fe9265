package route_test

import (
	"context"
	"fmt"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/site"
	"syscall"
	"testing"
	"time"
)

func BenchmarkSolveDemo(b *testing.B) {
	s, p := testsite.Demo(b)
	b.ReportAllocs()
	solveFresh(b, s, p)
}

// BenchmarkSolveDemoAgain plans the demo again and again on one site with one engine, as a
// sweep's scenarios that share a routing problem do: the optimizer's solution, the media
// choices and the pull plans are remembered.
func BenchmarkSolveDemoAgain(b *testing.B) {
	s, p := testsite.Demo(b)
	eng, err := plan.Engine(p)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := route.SolveWith(context.Background(), s, p, eng); err != nil {
			b.Fatal(err)
		}
	}
}

func TestSynthCampus(t *testing.T) {
	t.Parallel()
	s := testsite.Synth(t, 100)
	if got := len(s.Campus.Buildings); got != 100 {
		t.Fatalf("buildings: got %d, want 100", got)
	}
	perBuilding := float64(len(s.Net.Spans)) / 100
	if perBuilding < 4 || perBuilding > 6 {
		t.Errorf("spans per building: got %.1f, want about 5", perBuilding)
	}
	r, err := route.Solve(context.Background(), s, testsite.SynthPlan(s))
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
			s := testsite.Synth(b, n)
			p := testsite.SynthPlan(s)
			b.ReportAllocs()
			b.ResetTimer()
			solveFresh(b, s, p)
		})
	}
}

// solveFresh plans p on the site b.N times, each time with nothing remembered: the site's
// caches cleared and a new engine, outside the timer, so that the benchmark measures a whole
// plan, not the memory of an earlier one. It reports the CPU time per plan (cpu-s/op, user
// and system of the process: the lower bound's ascent runs beside the search), which a shared
// machine disturbs less than the wall time.
func solveFresh(b *testing.B, s *site.Site, p *plan.Plan) {
	b.Helper()
	cpu := solveEach(b, s, p, func() {
		s.Solved.Purge()
		s.Pulls.Purge()
		s.Reaches.Purge()
	})
	b.ReportMetric(cpu.Seconds()/float64(b.N), "cpu-s/op")
}

// solveEach plans p on the site b.N times, each time with a new engine and after forget has
// cleared what the site should not remember, both outside the timer, and returns the CPU time
// (user and system, of the process) the plans took.
func solveEach(b *testing.B, s *site.Site, p *plan.Plan, forget func()) time.Duration {
	b.Helper()
	var cpu time.Duration
	for i := 0; i < b.N; i++ {
		b.StopTimer()
		forget()
		eng, err := plan.Engine(p)
		if err != nil {
			b.Fatal(err)
		}
		b.StartTimer()
		before := cpuTime(b)
		if _, err := route.SolveWith(context.Background(), s, p, eng); err != nil {
			b.Fatal(err)
		}
		cpu += cpuTime(b) - before
	}
	return cpu
}

// BenchmarkPlanCampus plans the generated campuses the command benchmarks time
// (campusgen.BenchOptions: full ducts, broken runs, banks, tunnels, aerial spans, EMI,
// laterals, about a fifth of the streets proposed), the site loaded outside the timer: what
// `spanwright plan` spends between reading the campus and writing its files. Run it on one
// core: go test -run '^$' -bench PlanCampus -benchtime 1x -cpu 1 ./route/
func BenchmarkPlanCampus(b *testing.B) {
	for _, n := range []int{1000, 5000} {
		b.Run(fmt.Sprintf("buildings_%d", n), func(b *testing.B) {
			s, p := testplan.CampusSite(b, n)
			b.ReportAllocs()
			b.ResetTimer()
			solveFresh(b, s, p)
		})
	}
}

// TestBenchCampusRoutes: the generated campus the benchmarks time plans without an infeasible
// link: its diverse links enter their buildings from two streets, so a diverse pair exists
// for each, and the benchmarks time successful pair searches, not failures.
func TestBenchCampusRoutes(t *testing.T) {
	t.Parallel()
	s, p := testplan.CampusSite(t, 300)
	r, err := route.Solve(context.Background(), s, p)
	if err != nil {
		t.Fatal(err)
	}
	if err := r.Infeasible(); err != nil {
		t.Errorf("generated campus of 300 buildings: %v", err)
	}
	diverse := 0
	for _, l := range p.Links {
		diverse += b2i(l.Redundancy == plan.RedundancyDiverse)
	}
	if diverse == 0 {
		t.Error("the plan has no diverse link; the test checks nothing")
	}
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

// BenchmarkAroundOptimizer times what a plan spends outside the optimizer and the files on the
// generated 1,000-building campus: stating the routing problem, the legs and their media, and
// the estimate. The optimizer's solution is remembered from a first solve (the site's Solved
// cache, by the problem's fingerprint) and each iteration gets a new engine. "plan" forgets
// what the site remembers besides (pull plans, media reaches), as a fresh plan has; "scenario"
// keeps it, as a sweep's next scenario on the same routes with another price book does. Run it
// on one core: go test -run '^$' -bench AroundOptimizer -benchmem -cpu 1 -count 3 ./route/
func BenchmarkAroundOptimizer(b *testing.B) {
	s, p := testplan.CampusSite(b, 1000)
	if _, err := route.Solve(context.Background(), s, p); err != nil {
		b.Fatal(err)
	}
	for _, fresh := range []bool{true, false} {
		name := "scenario"
		if fresh {
			name = "plan"
		}
		b.Run(name, func(b *testing.B) {
			b.ReportAllocs()
			// The process's CPU time, which a loaded machine stretches less than the wall time.
			cpu := solveEach(b, s, p, func() {
				if fresh {
					s.Pulls.Purge()
					s.Reaches.Purge()
				}
			})
			b.ReportMetric(cpu.Seconds()/float64(b.N), "cpu-s/op")
		})
	}
}

// cpuTime is the CPU time (user and system) the process has used so far.
func cpuTime(b *testing.B) time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		b.Fatal(err)
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
