package optimize

import (
	"math/rand/v2"
	"testing"
)

// checkPlanTree verifies one plan tree's invariants against a recomputation (bound.go):
// counters, pend a superset of the bad edges, hash, exactness for its freeAt against a tree
// built afresh by Dijkstra, and the same for its kept trees.
func checkPlanTree(t *testing.T, sv *solver, pt *planTree, fresh *search[int64], when string) {
	t.Helper()
	bad, loose := 0, 0
	inPend := map[int32]bool{}
	for _, pi := range pt.pend {
		inPend[pi] = true
	}
	var h uint64
	for pi, e := range sv.proposed {
		f := sv.freeNow(e)
		if pt.freeAt[pi] {
			h ^= freeKey(e)
		}
		switch {
		case f && !pt.freeAt[pi]:
			bad++
			if !inPend[int32(pi)] {
				t.Fatalf("%s: anchor %d prof %d: edge %d bad but not pending", when, pt.anchor, pt.prof, e)
			}
		case !f && pt.freeAt[pi]:
			loose++
		}
	}
	if bad != pt.bad || loose != pt.loose {
		t.Fatalf("%s: anchor %d prof %d: counters bad %d loose %d, recomputed %d %d (undoFree %d)", when, pt.anchor, pt.prof, pt.bad, pt.loose, bad, loose, len(pt.undoFree))
	}
	if h != pt.hash {
		t.Fatalf("%s: hash mismatch", when)
	}
	base := sv.profBase[pt.prof]
	w := sv.planWeight(base, pt.freeAt)
	want := buildTree(fresh, pt.anchor, w)
	for v := range want.dist {
		if pt.t.dist[v] != want.dist[v] {
			t.Fatalf("%s: anchor %d prof %d node %d: dist %d, afresh %d", when, pt.anchor, pt.prof, v, pt.t.dist[v], want.dist[v])
		}
		if pt.t.dist[v] >= 0 {
			var sum, mm int64
			for _, hp := range pt.t.pathFrom(sv.net, v) {
				we, _ := w(int32(hp.Edge))
				sum += we
				mm += sv.net.lenMM[hp.Edge]
			}
			if sum != pt.t.dist[v] || mm != pt.t.lenMM[v] {
				t.Fatalf("%s: node %d path weighs %d/%d, tree %d/%d", when, v, sum, mm, pt.t.dist[v], pt.t.lenMM[v])
			}
		}
	}
	for _, kt := range pt.kept {
		var kh uint64
		for pi, e := range sv.proposed {
			if kt.freeAt[pi] {
				kh ^= freeKey(e)
			}
		}
		if kh != kt.hash {
			t.Fatalf("%s: kept hash mismatch", when)
		}
		wantK := buildTree(fresh, pt.anchor, sv.planWeight(base, kt.freeAt))
		for v := range wantK.dist {
			if kt.t.dist[v] != wantK.dist[v] {
				t.Fatalf("%s: kept tree anchor %d node %d: dist %d, afresh %d", when, pt.anchor, v, kt.t.dist[v], wantK.dist[v])
			}
		}
	}
}

// TestPlanTreeRandomOps runs random sequences of what the local search does to the plan
// trees (reroutes, phantom edges set and cleared, new rounds, recounts, restored states, asks)
// and checks every tree's invariants after each step; a tree served must never charge an edge
// free now (it would weigh more than the searches).
func TestPlanTreeRandomOps(t *testing.T) {
	for _, seed := range []uint64{1, 2} {
		p := campus(campusSpec{buildings: 120, seed: seed, diverseFrac: 0.2, options: 3, capacity: true, proposedPct: 25})
		sv := newSolver(p, Settings{})
		sv.plainBounds = false
		sv.dual = sv.ascend()
		sv.start(false)
		fresh := newSearch[int64](sv.net)
		r := rand.New(rand.NewPCG(seed, 99))
		nd := len(p.Demands)
		checkAll := func(when string) {
			for _, pt := range sv.planList {
				checkPlanTree(t, sv, pt, fresh, when)
			}
		}
		checkAll("after start")
		var phantomOn []int32
		var stRoll, stLogged, stFree, stSwap, stPlain int
		defer func() {
			t.Logf("seed %d: rollBacks %d, logged asks %d, freeUps %d, swaps/rebuilds %d, plain %d", seed, stRoll, stLogged, stFree, stSwap, stPlain)
		}()
		for step := 0; step < 400; step++ {
			switch op := r.IntN(10); op {
			case 0, 1: // reroute a demand for real (opens/closes edges; calls bound)
				d := r.IntN(nd)
				sv.remove(d)
				c := sv.best(d)
				sv.add(d, c)
			case 2: // set a phantom
				e := sv.proposed[r.IntN(len(sv.proposed))]
				if !sv.phantom[e] {
					sv.setPhantom(e, true)
					phantomOn = append(phantomOn, e)
				}
			case 3: // clear all phantoms
				for _, e := range phantomOn {
					sv.setPhantom(e, false)
				}
				phantomOn = phantomOn[:0]
			case 4:
				sv.roundNo++
			case 5:
				sv.recount()
			case 6, 7: // ask a tree
				if len(sv.planList) == 0 {
					continue
				}
				pt := sv.planList[r.IntN(len(sv.planList))]
				if sv.nPhantom == 0 && len(pt.undoFree) > 0 {
					stRoll++
				}
				if sv.nPhantom > 0 && pt.bad > 0 {
					stLogged++
				}
				oldT := pt.t
				fu := sv.freeUps
				b := sv.bound(pt.anchor, pt.prof)
				if sv.freeUps > fu {
					stFree++
				} else if b.pt != nil && pt.t != oldT {
					stSwap++
				} else if b.pt == nil {
					stPlain++
				}
				if b.pt != nil {
					for pi, e := range sv.proposed {
						if sv.freeNow(e) && !b.pt.freeAt[pi] {
							t.Fatalf("seed %d step %d: bound served a tree charging free edge %d (nPhantom %d)", seed, step, e, sv.nPhantom)
						}
					}
				}
			case 8: // restore the state from its choices (state replaced, recount)
				saved := append([]choice(nil), sv.st.ch...)
				sv.restore(saved)
			case 9: // a remove without re-add then add back (edge close while phantom etc.)
				d := r.IntN(nd)
				c := sv.remove(d)
				if r.IntN(2) == 0 && len(sv.proposed) > 0 {
					e := sv.proposed[r.IntN(len(sv.proposed))]
					sv.setPhantom(e, !sv.phantom[e])
					if sv.phantom[e] {
						phantomOn = append(phantomOn, e)
					}
				}
				sv.add(d, c)
			}
			checkAll("step")
		}
	}
}

// TestPlanTreesOpenStart: the open start makes every proposed edge phantom; the trees stay
// exact through it, the search after it and the return to the first plan.
func TestPlanTreesOpenStart(t *testing.T) {
	for _, seed := range []uint64{1, 2, 3, 5, 8} {
		p := campus(campusSpec{buildings: 60, seed: seed, diverseFrac: 0.2, options: 3, capacity: true, proposedPct: 8})
		sv := newSolver(p, Settings{})
		sv.plainBounds = false
		sv.dual = sv.ascend()
		sv.start(false)
		sv.improve()
		fresh := newSearch[int64](sv.net)
		check := func(when string) {
			for _, pt := range sv.planList {
				checkPlanTree(t, sv, pt, fresh, when)
			}
		}
		check("first")
		fu := sv.freeUps
		sv.flush()
		first := sv.st
		sv.start(true)
		logged := 0
		for _, pt := range sv.planList {
			logged += len(pt.undoFree)
		}
		t.Logf("seed %d: %d proposed, freeUps in open start %d, undoFree entries %d", seed, len(sv.proposed), sv.freeUps-fu, logged)
		check("after open start")
		sv.improve()
		check("after improve")
		sv.keepCheaper(first)
		check("after swap back")
		for _, pt := range sv.planList {
			b := sv.bound(pt.anchor, pt.prof)
			_ = b
		}
		check("after asks")
	}
}

// TestPlanTreesZeroFixed: proposed edges of no FixedCents (valid input) keep the counters
// exact too (they were left out of the counting once, which let loose fall below zero).
func TestPlanTreesZeroFixed(t *testing.T) {
	p := campus(campusSpec{buildings: 120, seed: 1, diverseFrac: 0.2, options: 3, capacity: true, proposedPct: 25})
	for i := range p.Edges {
		if p.Edges[i].Proposed && i%2 == 0 {
			p.Edges[i].FixedCents = 0
		}
	}
	sv := newSolver(p, Settings{})
	sv.plainBounds = false
	sv.dual = sv.ascend()
	sv.start(false)
	fresh := newSearch[int64](sv.net)
	r := rand.New(rand.NewPCG(1, 99))
	nd := len(p.Demands)
	var on []int32
	for step := 0; step < 300; step++ {
		switch r.IntN(5) {
		case 0, 1:
			d := r.IntN(nd)
			sv.remove(d)
			sv.add(d, sv.best(d))
		case 2:
			e := sv.proposed[r.IntN(len(sv.proposed))]
			if !sv.phantom[e] {
				sv.setPhantom(e, true)
				on = append(on, e)
			}
		case 3:
			for _, e := range on {
				sv.setPhantom(e, false)
			}
			on = on[:0]
		case 4:
			pt := sv.planList[r.IntN(len(sv.planList))]
			sv.bound(pt.anchor, pt.prof)
		}
		if step%10 == 0 {
			for _, pt := range sv.planList {
				checkPlanTree(t, sv, pt, fresh, "step")
			}
		}
	}
}
