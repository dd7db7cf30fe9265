package optimize

import "testing"

// TestPlanTreesStayExact: a plan tree brought up to date in place (freeUp) as trenches open
// is the shortest-path tree of its weights, as a tree built afresh with the same free edges:
// the same distance from every node (Dijkstra's optimality; which of two equal paths a node
// keeps may differ), and a pred path whose weights and metres add up to dist and lenMM.
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
		for _, pt := range sv.planList {
			b := sv.bound(pt.anchor, pt.prof)
			if b.pt != pt {
				continue // the plain tree serves (phantom edges); nothing to compare
			}
			base := sv.profBase[pt.prof]
			w := func(e int32) (int64, bool) { return sv.treeWeight(b, base, e), base[e] >= 0 }
			want := buildTree(fresh, pt.anchor, w)
			for v := 0; v < p.Nodes; v++ {
				if pt.t.dist[v] != want.dist[v] {
					t.Fatalf("seed %d anchor %d profile %d node %d: dist %d, afresh %d", seed, pt.anchor, pt.prof, v, pt.t.dist[v], want.dist[v])
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
					t.Fatalf("seed %d node %d: path weighs %d over %d mm, tree says %d over %d", seed, v, sum, mm, pt.t.dist[v], pt.t.lenMM[v])
				}
			}
		}
	}
}
