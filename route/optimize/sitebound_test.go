package optimize

import (
	"fmt"
	"math"
	"reflect"
	"testing"
)

// crossingCampus is campus(cs) with the hub beyond a railway (names and places invented):
// the only two ducts under it leave the grid's east edge from two junctions and cross each
// other on the far side where no structure is, drawn as one node per duct (X1, X2) joined by a
// turn edge and marked as one place (Problem.Sites), then run on to the hub H. Every diverse
// demand goes to H, so both legs of every pair it can have pass that place (physically
// diverse pathways, ANSI/TIA-569 (from memory); a crossing as a shared point: common
// practice, no published source); the other demands keep the grid's cross-connects.
func crossingCampus(cs campusSpec) *Problem {
	p := campus(cs)
	side := int(math.Ceil(math.Sqrt(float64(cs.buildings)/4))) + 1
	junction := func(x, y int) int { return x*(side+1) + y } // campus numbers the grid first
	jA, jB := junction(side, side/2-1), junction(side, side/2+1)
	x1, x2, hA, hB, hub := p.Nodes, p.Nodes+1, p.Nodes+2, p.Nodes+3, p.Nodes+4
	p.Nodes += 5
	duct := func(id string, a, b int, lengthM float64) {
		p.Edges = append(p.Edges, Edge{ID: id, From: a, To: b, LengthM: lengthM, LabourPerMCents: 800, Flags: FlagOutdoor})
	}
	duct("rail D1 west", jA, x1, 95)
	duct("rail D1 east", x1, hA, 70)
	duct("rail D2 west", jB, x2, 95)
	duct("rail D2 east", x2, hB, 70)
	duct("turn X", x1, x2, 0)
	duct("hub A", hA, hub, 15)
	duct("hub B", hB, hub, 15)
	p.Sites = make([]int, p.Nodes)
	p.Sites[x1], p.Sites[x2] = 1, 1
	for i := range p.Demands {
		if p.Demands[i].Diverse {
			p.Demands[i].Target = hub
		}
	}
	return p
}

// solveBound solves p as Solve does, with siteBound on or (off true) proving nothing.
func solveBound(p *Problem, off bool) (*Solution, *solver) {
	sv := newSolver(p, Settings{})
	sv.noSiteBound = off
	sv.run()
	return sv.solution(), sv
}

// TestSiteBound: siteBound proves that no pair avoids the crossing exactly when none does
// (two internally disjoint paths exist iff no single node separates the ends, Menger's
// theorem (from memory), the crossing merged into one node): siteProblem without its third
// way has only pairs through X; with it, one leg may go round.
func TestSiteBound(t *testing.T) {
	t.Parallel()
	for _, far := range []bool{false, true} {
		sv := newSolver(siteProblem(far), Settings{})
		if got := sv.siteBound(0, 0); got == far {
			t.Errorf("third way %v: siteBound %v, want %v", far, got, !far)
		}
	}
	// On the crossing campus every diverse demand is bound to the crossing, no other demand
	// is (they need no pair, but may have one: the grid gives each building two laterals),
	// and each diverse pair of the plan passes it.
	p := crossingCampus(campusSpec{buildings: 60, seed: 3, diverseFrac: 0.4, options: 3, capacity: true, proposedPct: 12})
	sol, sv := solveBound(p, false)
	verify(t, "crossing campus", p, sol)
	bound := 0
	for d, dm := range p.Demands {
		if got := sv.siteBoundAll(d); got != dm.Diverse {
			t.Errorf("demand %s (diverse %v): siteBound %v", dm.ID, dm.Diverse, got)
		}
		if dm.Diverse {
			bound++
			r := sol.Routes[d]
			if !r.Feasible || sv.sharedSite([][]Hop{r.Primary.Hops, r.Secondary.Hops}) == 0 {
				t.Errorf("demand %s: feasible %v, legs %v and %v; want a pair through the crossing", dm.ID, r.Feasible, r.Primary.Hops, r.Secondary.Hops)
			}
		}
	}
	if bound < 10 {
		t.Fatalf("%d diverse demands, want at least 10 to exercise the proof", bound)
	}
}

// TestSiteBoundSamePlan: what siteBound lets the searches skip (review 19 F4) changes no
// plan: on crossing campuses, with and without charges and transit-free nodes, the solution
// with the proof is the solution without it, field for field (the answer must not depend on
// how fast it is found).
func TestSiteBoundSamePlan(t *testing.T) {
	t.Parallel()
	for _, seed := range []uint64{1, 3} { // seed 2 plans alike, in 12 s without the proof
		cs := campusSpec{buildings: 40, seed: seed, diverseFrac: 0.3, options: 3, capacity: true, proposedPct: 12, trenchScale: 0.5}
		p := crossingCampus(cs)
		for _, q := range []*Problem{p, withTransitCharges(p, 6)} {
			if len(q.Sites) < q.Nodes { // withTransitCharges adds nodes: no place among them
				q.Sites = append(q.Sites, make([]int, q.Nodes-len(q.Sites))...)
			}
			name := fmt.Sprintf("seed %d, %d charges", seed, len(q.Charges))
			on, sv := solveBound(q, false)
			off, _ := solveBound(q, true)
			verify(t, name, q, on)
			if !reflect.DeepEqual(on, off) {
				t.Errorf("%s: the plan with siteBound (%d cents, %d rounds) differs from the plan without (%d cents, %d rounds)",
					name, on.TotalCents, on.Rounds, off.TotalCents, off.Rounds)
			}
			proved := 0
			for _, x := range sv.siteless {
				if x == 2 {
					proved++
				}
			}
			if proved == 0 {
				t.Errorf("%s: siteBound proved nothing; the test exercises nothing", name)
			}
		}
	}
}

var crossingBench = map[int]*Problem{}

// BenchmarkSolveCrossing solves crossing campuses (crossingCampus: every diverse demand, a
// fifth of them, must cross at one place) with siteBound ("bound") and without it
// ("unbound"), the searches as before it: the same plan, the difference its saving.
func BenchmarkSolveCrossing(b *testing.B) {
	for _, n := range []int{100, 300} {
		p, ok := crossingBench[n]
		if !ok {
			p = crossingCampus(campusSpec{buildings: n, seed: 7, diverseFrac: 0.2, options: 3, capacity: true, proposedPct: 10})
			crossingBench[n] = p
		}
		for _, off := range []bool{false, true} {
			name := fmt.Sprintf("buildings_%d/bound", n)
			if off {
				name = fmt.Sprintf("buildings_%d/unbound", n)
			}
			b.Run(name, func(b *testing.B) {
				b.ReportAllocs()
				var sol *Solution
				for b.Loop() {
					sol, _ = solveBound(p, off)
				}
				b.ReportMetric(float64(sol.TotalCents), "cents")
				b.ReportMetric(float64(sol.Rounds), "rounds")
			})
		}
	}
}
