package optimize

import (
	"fmt"
	"slices"
	"testing"
)

// repriced returns p with its trench and cable prices scaled (a price-book scenario of the
// same campus: same network and demands, other prices).
func repriced(p *Problem, trench, cable float64) *Problem {
	q := clone(p)
	for i := range q.Edges {
		q.Edges[i].FixedCents = int64(float64(q.Edges[i].FixedCents) * trench)
	}
	for d := range q.Demands {
		for o := range q.Demands[d].Options {
			q.Demands[d].Options[o].CablePerMCents = int64(float64(q.Demands[d].Options[o].CablePerMCents) * cable)
		}
	}
	return q
}

// warmBase is the campus the warm-start tests reprice, its plan and that plan as a start.
func warmBase(t *testing.T) (*Problem, *Solution, []StartRoute) {
	t.Helper()
	base := campus(campusSpec{buildings: 40, seed: 31, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 15})
	bs, err := Solve(base, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	return base, bs, StartFrom(bs)
}

// TestWarmStart solves price scenarios of one campus from the base scenario's plan: each plan
// is valid (verify), never costs more than the start it was given priced in the scenario,
// and is the same on a second solve; start routes that do not fit (another demand ID, an edge
// out of range, a leg that does not reach the anchor) are ignored.
func TestWarmStart(t *testing.T) {
	t.Parallel()
	base, bs, start := warmBase(t)
	for _, sc := range []struct{ trench, cable float64 }{{1, 1}, {0.3, 1}, {3, 1}, {1, 4}} {
		name := fmt.Sprintf("trench×%.1f cable×%.1f", sc.trench, sc.cable)
		p := repriced(base, sc.trench, sc.cable)
		warm, err := Solve(p, Settings{Start: start})
		if err != nil {
			t.Fatal(err)
		}
		verify(t, name, p, warm)
		again, _ := Solve(p, Settings{Start: start})
		if again.TotalCents != warm.TotalCents || fmt.Sprint(again.Opened) != fmt.Sprint(warm.Opened) {
			t.Errorf("%s: a second warm solve differs: %d against %d cents", name, again.TotalCents, warm.TotalCents)
		}
		cold, _ := Solve(p, Settings{})
		t.Logf("%s: warm %d cents (bound %d), cold %d cents", name, warm.TotalCents, warm.LowerBoundCents, cold.TotalCents)
		if warm.LowerBoundCents > warm.TotalCents || warm.LowerBoundCents != cold.LowerBoundCents {
			t.Errorf("%s: bound %d warm, %d cold: the bound must not depend on the start", name, warm.LowerBoundCents, cold.LowerBoundCents)
		}
	}
	// Same prices, own plan as the start: the search cannot end above it.
	own, _ := Solve(base, Settings{Start: start})
	if own.TotalCents > bs.TotalCents {
		t.Errorf("started from its own plan: %d cents, above the plan's %d", own.TotalCents, bs.TotalCents)
	}
	// Broken starts are ignored, demand by demand.
	bad := append([]StartRoute(nil), start...)
	bad[0].ID += "x"
	bad[1].Legs = [][]Hop{{{Edge: len(base.Edges) + 5, Forward: true}}}
	if len(bad[2].Legs) > 0 {
		bad[2].Legs = [][]Hop{bad[2].Legs[0][:len(bad[2].Legs[0])-1]}
	}
	got, err := Solve(base, Settings{Start: bad})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, "broken start", base, got)
	// Reported demand by demand (Solution.StartUnused): the three broken ones, and the third
	// only when its leg had a hop to drop; none when the start is whole.
	want := []int{0, 1}
	if len(bad[2].Legs) > 0 && bad[2].Option >= 0 {
		want = append(want, 2)
	}
	if fmt.Sprint(got.StartUnused) != fmt.Sprint(want) {
		t.Errorf("start routes reported unused: %v, want %v", got.StartUnused, want)
	}
	if own.StartUnused != nil {
		t.Errorf("its own plan as the start: %v reported unused, want none", own.StartUnused)
	}
}

// TestWarmNoKicks: a warm solve searches its start with the local moves only, not the
// perturbation phase (kicks) nor a second start, which the plan it starts from had where the
// problem is small enough: started from its own cold plan (second start and kicks on this
// size), the search ends where it began, after one round that finds nothing. A sweep's
// scenarios are otherwise ranked by how hard each was searched (README "Sweeps with a warm
// start": a warm scenario 0.6-1 % cheaper than the same problem cold at 200 buildings).
func TestWarmNoKicks(t *testing.T) {
	t.Parallel()
	p := campus(campusSpec{buildings: 60, seed: 7, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 20})
	if n := len(p.Demands) * countProposed(p); n > maxKickWork || n > maxSecondStart {
		t.Fatalf("demands × proposed = %d: too large for the kicks this test is about", n)
	}
	cold, err := Solve(p, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	warm, err := Solve(p, Settings{Start: StartFrom(cold)})
	if err != nil {
		t.Fatal(err)
	}
	if warm.TotalCents != cold.TotalCents || fmt.Sprint(warm.Opened) != fmt.Sprint(cold.Opened) || warm.Rounds != 1 {
		t.Errorf("started from its own plan (%d cents): %d cents after %d rounds, opened %v against %v; want the plan after 1 round",
			cold.TotalCents, warm.TotalCents, warm.Rounds, warm.Opened, cold.Opened)
	}
}

func countProposed(p *Problem) int {
	n := 0
	for i := range p.Edges {
		if p.Edges[i].Proposed {
			n++
		}
	}
	return n
}

// TestPlaceOnly: with Settings.PlaceOnly a start that fits is the answer route for route,
// searched no further even where prices moved (a start from cheaper trench), and a demand
// whose start route no longer fits is placed again while every other keeps its route; the
// plan is valid and its bound the same as without PlaceOnly.
func TestPlaceOnly(t *testing.T) {
	t.Parallel()
	base, _, start := warmBase(t)
	p := repriced(base, 3, 1)
	got, err := Solve(p, Settings{Start: start, PlaceOnly: true})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, "place only", p, got)
	for d, r := range StartFrom(got) {
		if fmt.Sprint(r) != fmt.Sprint(start[d]) {
			t.Errorf("demand %d: route changed with a start that fits", d)
		}
	}
	searched, _ := Solve(p, Settings{Start: start})
	if got.LowerBoundCents != searched.LowerBoundCents {
		t.Errorf("bound %d placing only, %d searching: want the same", got.LowerBoundCents, searched.LowerBoundCents)
	}
	// Demand 3's route broken: only it moves.
	broken := append([]StartRoute(nil), start...)
	broken[3].Legs = [][]Hop{{{Edge: len(base.Edges) + 5, Forward: true}}}
	mended, err := Solve(base, Settings{Start: broken, PlaceOnly: true})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, "mended", base, mended)
	if fmt.Sprint(mended.StartUnused) != "[3]" {
		t.Errorf("start routes unused %v, want [3]", mended.StartUnused)
	}
	for d, r := range StartFrom(mended) {
		if d != 3 && fmt.Sprint(r) != fmt.Sprint(start[d]) {
			t.Errorf("demand %d: route changed, want only demand 3 placed again", d)
		}
	}
	if !mended.Routes[3].Feasible {
		t.Errorf("demand 3 not placed again")
	}
}

// overfullEdges lists the capacity-limited edges of sol whose cables, packed first-fit in the
// fill's order, do not fit the ducts the edge has and the plan laid there: NFPA 70 Chapter 9
// Table 1 (53 % of a duct for one cable, 31 % for two, 40 % for three or more), its jam band
// and the count of pulls, the rule NFPAFits packs by (TestNFPAFits holds it to the table).
func overfullEdges(p *Problem, sol *Solution) []int {
	var over []int
	for _, f := range sol.Fill {
		if !f.Limited {
			continue
		}
		var ods []float64
		for _, d := range f.Demands {
			op := &p.Demands[d].Options[sol.Routes[d].Option]
			for range max(op.Cables, 1) {
				ods = append(ods, op.CableODMM)
			}
		}
		ed := &p.Edges[f.Edge]
		ducts := ed.Ducts
		if ed.MayAddDucts() {
			ducts += f.AddedDucts
		}
		if !NFPAFits(ed.DuctIDMM, ods, ducts, ed.PullLimit()) {
			over = append(over, f.Edge)
		}
	}
	return over
}

// TestWarmStartFullBank: the busy duct banks of a seeded campus (every existing one its plan
// pulls two or more cables through) have no spare duct; the base scenario may add duct beside
// them (and build proposed trench) and routes cables through them in added ducts. The scenario
// after it may build nothing: no added duct anywhere, no proposed edge (a sweep's "no new
// trench" alternative). Started warm from the base's routes, no start route through a full
// bank is kept (its cables find no room: Solution.StartNoRoom names the banks), no edge of the
// warm plan is overfull by NFPA 70 Chapter 9 Table 1, and the warm plan leaves as many demands
// infeasible as the scenario planned cold; the same start gives the same plan twice.
func TestWarmStartFullBank(t *testing.T) {
	t.Parallel()
	base := campus(campusSpec{buildings: 40, seed: 31, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 15})
	first, err := Solve(base, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	full := map[int]bool{}
	for _, f := range first.Fill {
		if f.Limited && !base.Edges[f.Edge].Proposed && f.Cables >= 2 {
			full[f.Edge] = true
			base.Edges[f.Edge].Ducts = 0 // full: the base may still add duct beside it
		}
	}
	bs, err := Solve(base, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	through := map[int]bool{} // demands whose base route crosses a full bank
	for _, f := range bs.Fill {
		if full[f.Edge] {
			for _, d := range f.Demands {
				through[d] = true
			}
		}
	}
	if len(full) < 3 || len(through) < 5 {
		t.Fatalf("the seeded campus has %d busy duct banks and the base routes %d demands through them: too few for this test", len(full), len(through))
	}
	if over := overfullEdges(base, bs); over != nil {
		t.Fatalf("the base plan is overfull on edges %v", over)
	}
	// The scenario: no new trench, so no duct may be added and no proposed edge built.
	nt := clone(base)
	nt.AllowNew = false
	for i := range nt.Edges {
		nt.Edges[i].AddDuctPerMCents, nt.Edges[i].AddTrenchPerMCents, nt.Edges[i].AddTrenchCents = 0, 0, 0
	}
	cold, err := Solve(nt, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	start := StartFrom(bs)
	warm, err := Solve(nt, Settings{Start: start})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, "warm", nt, warm)
	verify(t, "cold", nt, cold)
	if over := overfullEdges(nt, cold); over != nil {
		t.Fatalf("cold plan overfull on edges %v", over)
	}
	if over := overfullEdges(nt, warm); over != nil {
		t.Errorf("warm plan overfull on edges %v (the cold plan is not)", over)
	}
	for d := range through {
		r := warm.Routes[d]
		if r.Feasible && slices.ContainsFunc(append(r.Primary.Hops, r.Secondary.Hops...), func(h Hop) bool { return full[h.Edge] }) {
			t.Errorf("demand %d keeps a route through a full bank", d)
		}
	}
	if len(warm.Infeasible) != len(cold.Infeasible) || len(cold.Infeasible) == 0 {
		t.Errorf("warm plan: %d demands infeasible, cold plan: %d; want the same, and some", len(warm.Infeasible), len(cold.Infeasible))
	}
	// Why each was placed afresh: a demand whose start route fits the problem but not the
	// ducts names edges that had no room, where no duct may be added.
	for _, n := range warm.StartNoRoom {
		if !slices.Contains(warm.StartUnused, n.Demand) || !through[n.Demand] {
			t.Errorf("demand %d: no room for its start route, but not listed unused %v or not through a full bank", n.Demand, warm.StartUnused)
		}
		if len(n.Edges) == 0 || !slices.IsSorted(n.Edges) {
			t.Errorf("demand %d: no room on edges %v, want some, ascending", n.Demand, n.Edges)
		}
		for _, e := range n.Edges {
			if nt.Edges[e].MayAddDucts() || !full[e] {
				t.Errorf("demand %d: no room on edge %d, which is not a full bank", n.Demand, e)
			}
		}
	}
	if len(warm.StartNoRoom) == 0 {
		t.Errorf("no start route placed afresh for want of room")
	}
	again, err := Solve(nt, Settings{Start: start})
	if err != nil {
		t.Fatal(err)
	}
	if fmt.Sprint(again.Routes, again.StartNoRoom) != fmt.Sprint(warm.Routes, warm.StartNoRoom) {
		t.Errorf("a second warm solve from the same start differs")
	}
	t.Logf("%d full banks, %d base routes through them; warm %d infeasible, %d cents, %d placed afresh (%d for no room); cold %d infeasible, %d cents",
		len(full), len(through), len(warm.Infeasible), warm.TotalCents, len(warm.StartUnused), len(warm.StartNoRoom), len(cold.Infeasible), cold.TotalCents)
}

// TestWarmStartSoundPulls: the warm start's room check (fullEdges) keeps to the count of pulls
// as every packing does. Four thin cables (5 mm: four fill 5 % of a 50 mm duct, within NFPA 70
// Chapter 9 Table 1's 40 %) start on the short way through one spare duct where none may be
// added: three are kept (three loose cables a duct, install.DefaultCablesPerDuct: common
// practice, no published source), the fourth finds no room (StartNoRoom names the bank) and
// goes the long way round; two with a design of two a duct (Edge.CablesPerDuct, the plan's
// design.cables_per_duct), all four with a design of fill alone (0). Innerducts
// (Edge.Innerduct), pulled in empty, are held to the fill alone: all four keep the short way.
func TestWarmStartSoundPulls(t *testing.T) {
	t.Parallel()
	short := [][]Hop{{{Edge: 0, Forward: true}, {Edge: 1, Forward: true}}}
	for _, tc := range []struct {
		name      string
		innerduct bool
		perDuct   int
		noRoom    string // fmt of StartNoRoom
		onShort   int
	}{
		{"loose cables", false, 3, "[{3 [0]}]", 3},
		{"loose cables, two a duct", false, 2, "[{2 [0]} {3 [0]}]", 2},
		{"loose cables, fill alone", false, 0, "[]", 4},
		{"innerducts", true, 3, "[]", 4},
	} {
		edges := capNet(1, 0)
		edges[0].Innerduct, edges[0].CablesPerDuct = tc.innerduct, tc.perDuct
		p := &Problem{Nodes: 4, Edges: edges, Demands: capDemands(4, 5)}
		var start []StartRoute
		for _, d := range p.Demands {
			start = append(start, StartRoute{ID: d.ID, Option: 0, Legs: short})
		}
		sol, err := Solve(p, Settings{Start: start})
		if err != nil {
			t.Fatal(err)
		}
		if got := fmt.Sprint(sol.StartNoRoom); got != tc.noRoom {
			t.Errorf("%s: StartNoRoom %s, want %s", tc.name, got, tc.noRoom)
		}
		onShort := 0
		for _, r := range sol.Routes {
			if len(r.Primary.Hops) > 0 && r.Primary.Hops[0].Edge == 0 {
				onShort++
			}
		}
		if onShort != tc.onShort || len(sol.Infeasible) != 0 {
			t.Errorf("%s: %d routes the short way, %d infeasible; want %d, none", tc.name, onShort, len(sol.Infeasible), tc.onShort)
		}
		if over := overfullEdges(p, sol); len(over) != 0 {
			t.Errorf("%s: overfull edges %v", tc.name, over)
		}
	}
}
