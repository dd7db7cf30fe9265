package optimize

import "testing"

// TestSaveBoundCoversEstimate: saveBound bounds from above what estimate finds a demand
// would save with a proposed span open (the bound only screens open moves, but a bound below
// the estimate would discard moves that pay), on campuses with full ducts and shared trenches
// where every other building has one entrance; and each edge forcedFrom finds lies on every
// route of its demand: without it the demand's ends are apart (an edge whose removal
// disconnects two nodes is on every path between them).
func TestSaveBoundCoversEstimate(t *testing.T) {
	for _, seed := range []uint64{4, 5} {
		p := campus(campusSpec{buildings: 120, seed: seed, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 25})
		oneEntrance(p)
		p = withTransitCharges(p, 3) // handholes at turns and where new spans join, after oneEntrance
		sv := newSolver(p, Settings{})
		sv.dual = sv.ascend()
		sv.start(false)
		sv.rounds = sv.improve()
		sv.flush()
		forced, ownTrench := 0, 0
		for d := range p.Demands {
			if sv.invalid[d] != "" {
				continue
			}
			for _, e := range sv.forcedFrom(d) {
				forced++
				if sv.fixedE[e] > 0 && sv.st.count[e] == 1 {
					ownTrench++
				}
				if joinedWithout(p, sv.from[d], sv.to[d], e) {
					t.Fatalf("seed %d demand %d: edge %d is called forced, but the ends stay joined without it", seed, d, e)
				}
			}
		}
		if forced == 0 || ownTrench == 0 {
			t.Fatalf("seed %d: %d forced edges, %d of them a trench only its demand opened; the test checks nothing", seed, forced, ownTrench)
		}
		checked := 0
		for _, e := range sv.proposed {
			if sv.st.count[e] > 0 || checked > 3000 {
				continue
			}
			sv.sbVer++
			open := []int32{e}
			for d := range p.Demands {
				if sv.invalid[d] != "" || sv.st.ch[d].opt < 0 {
					continue
				}
				b := sv.saveBound(d, open)
				sv.setPhantom(e, true)
				g := sv.estimate(d)
				sv.setPhantom(e, false)
				checked++
				if g > b {
					t.Fatalf("seed %d span %d demand %d: estimate saves %d, saveBound %d", seed, e, d, g, b)
				}
			}
		}
	}
}

// oneEntrance leaves every other demand's free end with one edge, a new lateral (proposed, its
// trench priced as the campus's shortcuts): the others are dropped.
func oneEntrance(p *Problem) {
	drop := map[int]bool{}
	for d, dm := range p.Demands {
		if d%2 == 1 {
			drop[dm.Source] = true
		}
	}
	kept := p.Edges[:0]
	seen := map[int]bool{}
	for _, e := range p.Edges {
		end := -1
		if drop[e.From] {
			end = e.From
		} else if drop[e.To] {
			end = e.To
		}
		if end >= 0 && seen[end] {
			continue
		}
		if end >= 0 {
			seen[end] = true
			e.Proposed, e.FixedCents = true, centsFor(e.LengthM, 9000)+150000
			e.Ducts, e.DuctIDMM, e.AddDuctPerMCents = 0, 0, 0
		}
		kept = append(kept, e)
	}
	p.Edges = kept
}

// joinedWithout reports whether nodes a and b are joined by edges other than skip
// (breadth-first, over every edge).
func joinedWithout(p *Problem, a, b int, skip int32) bool {
	adj := make([][]int, p.Nodes)
	for i, e := range p.Edges {
		if int32(i) != skip {
			adj[e.From] = append(adj[e.From], e.To)
			adj[e.To] = append(adj[e.To], e.From)
		}
	}
	seen := make([]bool, p.Nodes)
	seen[a] = true
	q := []int{a}
	for len(q) > 0 {
		v := q[0]
		q = q[1:]
		if v == b {
			return true
		}
		for _, w := range adj[v] {
			if !seen[w] {
				seen[w] = true
				q = append(q, w)
			}
		}
	}
	return false
}

// TestJoinedAllAsOneByOne: joinedAll, which takes a walk past joinBudget once per part of the
// network, says what joined says demand by demand, whatever the order of the demands and the
// forbidden edges (a one-entrance building's lateral cut off, spans on shared trunks).
func TestJoinedAllAsOneByOne(t *testing.T) {
	p := campus(campusSpec{buildings: 120, seed: 6, diverseFrac: 0.1, options: 1, capacity: true, proposedPct: 20})
	oneEntrance(p)
	sv := newSolver(p, Settings{})
	var all []int32
	for d := range p.Demands {
		if sv.invalid[d] == "" {
			all = append(all, int32(d))
		}
	}
	cuts := 0
	for trial := 0; trial < 40; trial++ {
		var forbidden []int32
		for k := 0; k < 1+trial%4; k++ {
			forbidden = append(forbidden, int32((trial*7919+k*104729)%len(p.Edges)))
		}
		for _, e := range forbidden {
			sv.forbid[e] = true
		}
		want := true
		for _, d := range all {
			j := sv.joined(int(d))
			want = want && j
			if !j {
				cuts++
			}
		}
		order := append([]int32(nil), all...)
		for i := range order { // another order every trial
			k := (i*31 + trial) % len(order)
			order[i], order[k] = order[k], order[i]
		}
		if got := sv.joinedAll(order); got != want {
			t.Fatalf("trial %d, forbidden %v: joinedAll %v, one by one %v", trial, forbidden, got, want)
		}
		for _, d := range order {
			if got, want := sv.joinedAll([]int32{d}), sv.joined(int(d)); got != want {
				t.Fatalf("trial %d demand %d: joinedAll %v, joined %v", trial, d, got, want)
			}
		}
		for _, e := range forbidden {
			sv.forbid[e] = false
		}
	}
	if cuts == 0 {
		t.Fatal("no forbidden edge cut a demand off: the test checks only the yes answers")
	}
}

// TestSaveBoundOtherMedium: the duct a demand's cable added on its building's only lateral
// (a full duct) is a saving when another of its media takes no duct area there: the bound
// must count it (a bound that left it out, as forced, fell 5,000 cents below the estimate).
// Hand-built: building 0's only edge is a full duct (50 m, a duct added at 100 cents/m);
// medium A (10 mm) runs on the street 1–2 near EMI; medium B (no duct area, excludes EMI)
// can reach the hub only over the proposed span 3–2.
func TestSaveBoundOtherMedium(t *testing.T) {
	p := &Problem{Nodes: 4, AllowNew: true, Edges: []Edge{
		{ID: "lateral", From: 0, To: 1, LengthM: 50, DuctIDMM: 50, Ducts: 0, AddDuctPerMCents: 100},
		{ID: "street", From: 1, To: 2, LengthM: 100, Flags: FlagHighEMI},
		{ID: "side", From: 1, To: 3, LengthM: 10},
		{ID: "new", From: 3, To: 2, LengthM: 100, Proposed: true, FixedCents: 1_000_000},
	}, Demands: []Demand{{ID: "L", Source: 0, Target: 2, Options: []Option{
		{Name: "A", CablePerMCents: 500, CableODMM: 10},
		{Name: "B", CablePerMCents: 100, ExcludeFlags: FlagHighEMI},
	}}}}
	sv := newSolver(p, Settings{})
	sv.start(false)
	sv.flush()
	if c := sv.st.ch[0]; c.opt != 0 || sv.st.added[0] != 1 {
		t.Fatalf("start: option %d with %d added ducts on the lateral; want A adding 1", c.opt, sv.st.added[0])
	}
	if got := sv.forcedFrom(0); len(got) != 1 || got[0] != 0 {
		t.Fatalf("forced edges %v, want the lateral [0]", got)
	}
	sv.sbVer++ // as openMoves does before its bounds
	b := sv.saveBound(0, []int32{3})
	sv.setPhantom(3, true)
	g := sv.estimate(0)
	sv.setPhantom(3, false)
	// A: 150 m × 500 + the duct 50 m × 100 = 80,000; B over the new span: 160 m × 100 = 16,000.
	if g != 64_000 || g > b {
		t.Errorf("estimate %d (want 64,000), saveBound %d: want the bound at least the estimate", g, b)
	}
}

// TestSaveBoundOwnTrench: a trench only the demand opened, off its forced edges, is a saving
// when another run opens (the bound must count it). Hand-built: building 0 has two ways out
// (0–1 and 0–4, 10 m each); the demand opened the new span 1–2 (100 m, 50,000 cents); opening
// 4–2 (100 m, 60,000) lets it leave 1–2 and save its trench.
func TestSaveBoundOwnTrench(t *testing.T) {
	p := &Problem{Nodes: 5, AllowNew: true, Edges: []Edge{
		{ID: "a", From: 0, To: 1, LengthM: 10},
		{ID: "p1", From: 1, To: 2, LengthM: 100, Proposed: true, FixedCents: 50_000},
		{ID: "b", From: 0, To: 4, LengthM: 10},
		{ID: "p2", From: 4, To: 2, LengthM: 100, Proposed: true, FixedCents: 60_000},
		{ID: "long", From: 0, To: 3, LengthM: 10},
		{ID: "long2", From: 3, To: 2, LengthM: 1000},
	}, Demands: []Demand{{ID: "L", Source: 0, Target: 2, Options: []Option{{Name: "A", CablePerMCents: 100}}}}}
	sv := newSolver(p, Settings{})
	sv.start(false)
	sv.flush()
	if sv.st.count[1] != 1 {
		t.Fatalf("start: the new span 1–2 carries %d cables, want 1", sv.st.count[1])
	}
	if got := sv.forcedFrom(0); len(got) != 0 {
		t.Fatalf("forced edges %v, want none (two ways out)", got)
	}
	sv.sbVer++
	b := sv.saveBound(0, []int32{3})
	sv.setPhantom(3, true)
	g := sv.estimate(0)
	sv.setPhantom(3, false)
	// Staying: 110 m × 100 + its own trench 50,000 = 61,000; over 4–2, free while phantom: 11,000.
	if g != 50_000 || g > b {
		t.Errorf("estimate %d (want 50,000), saveBound %d: want the bound at least the estimate", g, b)
	}
}

// TestSaveBoundSharedCharge: a charge on a forced edge that another demand pays as well is not
// the demand's own: the plan pays it whatever this demand does, so it is no saving and the
// bound must not take it off what staying costs. Hand-built: two buildings (0 and 5) each
// reach the junction 1 by their only lateral, both laterals in one handhole charge (100,000);
// from 1 the hub 2 is 1,000 m away by an existing duct or 100 m by a new span (150,000), which
// neither demand opens alone. Opening it saves demand L 900 m of cable: 90,000.
func TestSaveBoundSharedCharge(t *testing.T) {
	p := &Problem{Nodes: 6, AllowNew: true, Edges: []Edge{
		{ID: "lat-L", From: 0, To: 1, LengthM: 10},
		{ID: "lat-M", From: 5, To: 1, LengthM: 10},
		{ID: "long", From: 1, To: 2, LengthM: 1000},
		{ID: "new", From: 1, To: 2, LengthM: 100, Proposed: true, FixedCents: 150_000},
	}, Charges: []Charge{{ID: "handhole", Edges: []int{0, 1}, Cents: 100_000}},
		Demands: []Demand{
			{ID: "L", Source: 0, Target: 2, Options: []Option{{Name: "A", CablePerMCents: 100}}},
			{ID: "M", Source: 5, Target: 2, Options: []Option{{Name: "A", CablePerMCents: 100}}},
		}}
	sv := newSolver(p, Settings{})
	sv.start(false)
	sv.flush()
	if sv.st.count[3] != 0 || sv.st.count[2] != 2 {
		t.Fatalf("start: the new span carries %d cables and the long duct %d; want 0 and 2", sv.st.count[3], sv.st.count[2])
	}
	if got := sv.forcedFrom(0); len(got) != 1 || got[0] != 0 {
		t.Fatalf("forced edges of L %v, want its lateral [0]", got)
	}
	sv.sbVer++
	b := sv.saveBound(0, []int32{3})
	sv.setPhantom(3, true)
	g := sv.estimate(0)
	sv.setPhantom(3, false)
	if g != 90_000 || g > b {
		t.Errorf("estimate %d (want 90,000), saveBound %d: want the bound at least the estimate", g, b)
	}
}
