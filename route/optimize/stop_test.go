package optimize

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"reflect"
	"testing"
	"time"

	"spanwright/geo/ctxtest"
)

// stopCampuses are the problems the stop tests solve: a small one that runs every phase
// (second start and kicks) and a larger one.
var stopCampuses = []campusSpec{
	{buildings: 60, seed: 3, diverseFrac: 0.2, options: 3, capacity: true, proposedPct: 10},
	{buildings: 300, seed: 4, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 10},
}

// TestSolveContextNeverDone checks that a context that is never done changes nothing: the
// solution equals Solve's, field for field, while the solver looks at the context often.
func TestSolveContextNeverDone(t *testing.T) {
	t.Parallel()
	for _, cs := range stopCampuses {
		p := campus(cs)
		want, err := Solve(p, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		ctx := ctxtest.New(0)
		got, err := SolveContext(ctx, p, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("%d buildings: SolveContext with a context never done differs from Solve", cs.buildings)
		}
		if ctx.Looks() < int64(len(p.Demands)) {
			t.Errorf("%d buildings: the solver looked at its context %d times, want at least once per demand (%d)",
				cs.buildings, ctx.Looks(), len(p.Demands))
		}
	}
}

// searches counts the shortest-path searches a solver has run: A* and tree builds, LARAC's
// steps and the pair searches' Dijkstras.
func (sv *solver) searches() int64 {
	return int64(sv.srch.stamp) + int64(sv.rc.fs.stamp) + int64(sv.ps.stamp)
}

// TestSolveContextCancelled cancels the solve at the first, a quarter, half and three quarters
// of the looks an uncancelled solve takes at its context, and before it starts: each returns
// context.Canceled and no solution, and once the solver has seen the stop it runs at most a
// handful of searches more (one loop body), where without the checks it would run the rest
// of the solve's.
func TestSolveContextCancelled(t *testing.T) {
	t.Parallel()
	for _, cs := range stopCampuses {
		p := campus(cs)
		count := ctxtest.New(0)
		whole := newSolver(p, Settings{})
		whole.ctx = count
		whole.run()
		total, all := count.Looks(), whole.searches()
		for _, at := range []int64{1, total / 4, total / 2, 3 * total / 4} {
			sv := newSolver(p, Settings{})
			var seenAt int64 = -1
			probe := ctxtest.New(at)
			probe.OnStop = func() { seenAt = sv.searches() }
			sv.ctx = probe
			sv.run()
			if !sv.stopped() || seenAt < 0 {
				t.Errorf("%d buildings, cancelled at look %d of %d: the solver did not stop", cs.buildings, at, total)
				continue
			}
			more := sv.searches() - seenAt
			t.Logf("%d buildings, cancelled at look %d of %d: %d searches after the stop, of %d in a whole solve", cs.buildings, at, total, more, all)
			if more > maxSearchesAfterStop {
				t.Errorf("%d buildings, cancelled at look %d of %d: %d searches after the stop was seen, want at most %d (a whole solve runs %d)",
					cs.buildings, at, total, more, maxSearchesAfterStop, all)
			}
		}
		sol, err := SolveContext(ctxtest.New(total/2), p, Settings{})
		if !errors.Is(err, context.Canceled) || sol != nil {
			t.Errorf("%d buildings: SolveContext cancelled halfway: got %v, %v; want no solution and context.Canceled", cs.buildings, sol != nil, err)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if sol, err := SolveContext(ctx, campus(campusSpec{buildings: 20, seed: 1, options: 1}), Settings{}); !errors.Is(err, context.Canceled) || sol != nil {
		t.Errorf("a context done before the solve: got %v, %v; want no solution and context.Canceled", sol != nil, err)
	}
}

// maxSearchesAfterStop bounds the searches a stopped solver still runs: what is left of one
// loop body, such as one demand's choice (a few searches per option) or one kick's moved
// demands on a small problem.
const maxSearchesAfterStop = 40

// TestSolveContextStopsPromptly cancels a 1,000-building solve from another goroutine once it
// is under way and logs how long it took to return (the bound is asserted where the user
// sees it, from signal to exit, in cmd/spanwright; here only that it stops with the error).
func TestSolveContextStopsPromptly(t *testing.T) {
	if testing.Short() {
		t.Skip("solves a 1,000-building campus")
	}
	t.Parallel()
	p := campus(campusSpec{buildings: 1000, seed: 7, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 10})
	probe := ctxtest.New(0)
	done := make(chan error, 1)
	go func() {
		_, err := SolveContext(probe, p, Settings{})
		done <- err
	}()
	for probe.Looks() <= int64(len(p.Demands)) { // until past the first start, in the local search
		select {
		case err := <-done:
			t.Fatalf("the solve ended (%v) before it was under way", err)
		case <-time.After(time.Millisecond):
		}
	}
	probe.Cancel()
	t0 := time.Now()
	err := <-done
	t.Logf("returned %v after the cancel", time.Since(t0))
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("got %v, want context.Canceled", err)
	}
}

// TestLabelSearchStops checks that the exact reach search gives up, as exhausted, at its
// first look at the stopper, after labelCheckEvery labels, on a grid where it needs many
// more; and that LARAC returns the path within reach it was given without iterating.
func TestLabelSearchStops(t *testing.T) {
	t.Parallel()
	// A 30 × 30 grid whose cheap edges are long and short edges dear: many labels per node.
	const side = 30
	r := rand.New(rand.NewPCG(9, 10))
	var edges []Edge
	var cost []int64
	id := func(x, y int) int { return x*side + y }
	for x := 0; x < side; x++ {
		for y := 0; y < side; y++ {
			for _, d := range [][2]int{{1, 0}, {0, 1}} {
				if x+d[0] < side && y+d[1] < side {
					l := 1 + r.IntN(50)
					edges = append(edges, Edge{From: id(x, y), To: id(x+d[0], y+d[1]), LengthM: float64(l)})
					cost = append(cost, int64(60-l+r.IntN(10)))
				}
			}
		}
	}
	net := NewNetwork(side*side, edges)
	w := func(e int32) (int64, bool) { return cost[e], true }
	lw := func(e int32) (int64, bool) { return net.lenMM[e], true }
	s, tt := id(0, 0), id(side-1, side-1)
	sr := newSearch[int64](net)
	tc, tl := buildTree(sr, tt, w), buildTree(sr, tt, lw)
	limit := tl.dist[s] * 13 / 10
	rc := newRCSPScratch(net)
	if _, ok, exhausted := labelSearch(net, rc, s, tt, limit, w, tc.dist, tl.dist, 1<<62); !ok || exhausted {
		t.Fatalf("unstopped label search: ok %v, exhausted %v", ok, exhausted)
	}
	if len(rc.labels) <= 2*labelCheckEvery {
		t.Fatalf("the grid makes only %d labels, want more than %d for the test to mean anything", len(rc.labels), 2*labelCheckEvery)
	}
	looks := 0
	rc.stop = func() bool { looks++; return true }
	hops, ok, exhausted := labelSearch(net, rc, s, tt, limit, w, tc.dist, tl.dist, 1<<62)
	if ok || !exhausted || hops != nil || looks != 1 {
		t.Errorf("stopped label search: ok %v, exhausted %v, %d hops, %d looks; want a give-up at the first look", ok, exhausted, len(hops), looks)
	}
	if len(rc.labels) > labelCheckEvery+4*len(edges) {
		t.Errorf("stopped label search made %d labels, want about %d at most", len(rc.labels), labelCheckEvery)
	}
	sr.run(s, tt, w, treeH(tc))
	pc := sr.pathTo(tt)
	sr.run(s, tt, lw, treeH(tl))
	pd := sr.pathTo(tt)
	looks = 0
	if got := larac(net, rc, s, tt, limit, w, tc.dist, tl.dist, pc, pd, math.MaxInt64); !reflect.DeepEqual(got, pd) || looks != 1 {
		t.Errorf("stopped LARAC: %d looks, returned the shortest path given: %v; want 1 look and that path", looks, reflect.DeepEqual(got, pd))
	}
}
