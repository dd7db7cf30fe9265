package optimize

import (
	"reflect"
	"runtime"
	"testing"
)

// TestPlanTreesStayExact: a plan tree brought up to date in place (freeUp) as trenches open
// is the shortest-path tree of its weights, as a tree built afresh with the same free edges:
// the same distance from every node (Dijkstra's optimality; which of two equal paths a node
// keeps may differ), and a pred path whose weights and metres add up to dist and lenMM; the
// same while a move holds phantom edges, and the trees are as before once it is over.
func TestPlanTreesStayExact(t *testing.T) {
	for _, seed := range []uint64{1, 2, 3} {
		p := campus(campusSpec{buildings: 200, seed: seed, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 25})
		sv := newSolver(p, Settings{})
		sv.plainBounds = false // the campus is under planTreeNodes: use plan trees all the same
		sv.dual = sv.ascend()
		sv.start(false)
		sv.rounds = sv.improve()
		if sv.freeUps == 0 {
			t.Fatalf("seed %d: no plan tree was brought up to date in place; the test checks nothing", seed)
		}
		fresh := newSearch[int64](sv.net)
		// check compares every plan tree, brought up to date, with a tree built afresh, and
		// returns their distances.
		check := func(when string) [][]int64 {
			var out [][]int64
			for _, pt := range sv.planList {
				b := sv.bound(pt.anchor, pt.prof)
				if b.pt != pt {
					t.Fatalf("seed %d %s: the plain tree serves; want the plan tree", seed, when)
				}
				out = append(out, append([]int64(nil), pt.t.dist...))
				base := sv.profBase[pt.prof]
				w := func(e int32) (int64, bool) { return sv.treeWeight(b, base, e), base[e] >= 0 }
				want := buildTree(fresh, pt.anchor, w)
				for v := 0; v < p.Nodes; v++ {
					if pt.t.dist[v] != want.dist[v] {
						t.Fatalf("seed %d %s anchor %d profile %d node %d: dist %d, afresh %d", seed, when, pt.anchor, pt.prof, v, pt.t.dist[v], want.dist[v])
					}
					if pt.t.dist[v] < 0 {
						continue
					}
					var sum, mm int64
					for _, h := range pt.t.pathFrom(sv.net, v) {
						we, _ := w(int32(h.Edge))
						sum += we
						mm += sv.net.lenMM[h.Edge]
					}
					if sum != pt.t.dist[v] || mm != pt.t.lenMM[v] {
						t.Fatalf("seed %d %s node %d: path weighs %d over %d mm, tree says %d over %d", seed, when, v, sum, mm, pt.t.dist[v], pt.t.lenMM[v])
					}
				}
			}
			return out
		}
		before := check("after the search")
		// A move holds a few unopened edges phantom: the trees are lowered in place, exactly,
		// and rolled back to what they were when the move is over.
		var held []int32
		for _, e := range sv.proposed {
			if !sv.freeNow(e) && len(held) < 5 {
				held = append(held, e)
			}
		}
		for _, e := range held {
			sv.setPhantom(e, true)
		}
		during := check("with phantom edges")
		for _, e := range held {
			sv.setPhantom(e, false)
		}
		after := check("after the move")
		lowered := false
		for i := range before {
			for v := range before[i] {
				lowered = lowered || during[i][v] != before[i][v]
				if after[i][v] != before[i][v] {
					t.Fatalf("seed %d tree %d node %d: dist %d after the move, %d before", seed, i, v, after[i][v], before[i][v])
				}
			}
		}
		if !lowered {
			t.Errorf("seed %d: holding %d edges phantom lowered no distance; the test checks nothing", seed, len(held))
		}
	}
}

// TestAscentBesideSearch: the lower bound's ascent, run beside the search as Solve runs it
// (ascendAsync, taken by joinDual after the first start where the dual steers the search and
// at the first local optimum where it does not), gives the same dual as run alone before
// anything else, field for field, from a cold and from a warm start, with and without
// transit-free buildings and charges; under `go test -race` it also shows that the two
// goroutines share nothing they write. And a solve on one core equals a solve on all. (The
// ascent is a function of the problem alone: Balakrishnan, Magnanti & Wong, Operations
// Research 37(5), 1989.)
func TestAscentBesideSearch(t *testing.T) {
	plain := campus(campusSpec{buildings: 120, seed: 5, diverseFrac: 0.2, options: 3, capacity: true, proposedPct: 25})
	charged := withTransitCharges(campus(campusSpec{buildings: 300, seed: 6, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 15}), 4)
	large := campus(campusSpec{buildings: 300, seed: 6, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 40})
	for i, p := range []*Problem{plain, charged, large} {
		steers := newSolver(p, Settings{}).dualSteers()
		if want := i < 2; steers != want {
			t.Fatalf("problem %d (%d demands): the dual steers the search %v, want %v; the test checks the wrong join", i, len(p.Demands), steers, want)
		}
		alone := newSolver(p, Settings{}).ascend()
		if alone == nil || len(alone.wanted) == 0 {
			t.Fatalf("problem %d: the ascent priced no span; the test checks nothing", i)
		}
		want, err := Solve(p, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		if want.LowerBoundCents <= 0 {
			t.Errorf("problem %d: lower bound %d, want one", i, want.LowerBoundCents)
		}
		for _, warm := range []bool{false, true} {
			opt := Settings{}
			if warm {
				opt.Start = StartFrom(want)
			}
			sv := newSolver(p, opt)
			sv.run()
			if !reflect.DeepEqual(alone, sv.dual) {
				t.Errorf("problem %d, warm %v: the ascent beside the search differs from the ascent alone", i, warm)
			}
		}
		// GOMAXPROCS is global: this test does not run in parallel with others.
		prev := runtime.GOMAXPROCS(1)
		got, err := Solve(p, Settings{})
		runtime.GOMAXPROCS(prev)
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("problem %d: the solve with GOMAXPROCS 1 differs from the solve with %d", i, prev)
		}
	}
}
