package optimize

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"spanwright/media/install"
)

// verify checks a Solution against its Problem independently of the solver: every leg is a
// walk from Source to Target over usable edges within reach, diverse legs share no edge,
// interior node or group, and the cost breakdown is recomputed from the package cost formula.
func verify(t *testing.T, name string, p *Problem, sol *Solution) {
	t.Helper()
	if err := verifyErr(p, sol); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
}

func verifyErr(p *Problem, sol *Solution) error {
	if sol.LowerBoundCents > sol.TotalCents {
		return fmt.Errorf("lower bound %d above the plan's cost %d", sol.LowerBoundCents, sol.TotalCents)
	}
	if len(sol.Routes) != len(p.Demands) {
		return fmt.Errorf("got %d routes, want %d", len(sol.Routes), len(p.Demands))
	}
	users := make([][]int, len(p.Edges))
	cablesOn := make([]int, len(p.Edges)) // cables per edge, each of an option's Cables
	infeasible := map[int]bool{}
	for _, inf := range sol.Infeasible {
		infeasible[inf.Demand] = true
	}
	var total int64
	var totalM float64
	for d, r := range sol.Routes {
		dm := &p.Demands[d]
		if !r.Feasible {
			if !infeasible[d] {
				return fmt.Errorf("demand %d: infeasible but not listed", d)
			}
			continue
		}
		if infeasible[d] {
			return fmt.Errorf("demand %d: feasible and listed infeasible", d)
		}
		op := dm.Options[r.Option]
		var b Breakdown
		legs := []Leg{r.Primary}
		if len(r.Secondary.Hops) > 0 {
			legs = append(legs, r.Secondary)
		}
		if dm.Diverse && len(legs) == 1 && r.SinglePoint == nil && r.Note == "" {
			return fmt.Errorf("demand %d: diverse with one leg and no explanation", d)
		}
		if !dm.Diverse && len(legs) != 1 {
			return fmt.Errorf("demand %d: not diverse but two legs", d)
		}
		if got, want := r.Primary.ConstructionCents+r.Secondary.ConstructionCents, r.Cost.ConstructionShareCents+r.Cost.AddedDuctCents+r.Cost.ChargeShareCents; got != want {
			return fmt.Errorf("demand %d: legs' construction %d, route's shares %d", d, got, want)
		}
		for li, leg := range legs {
			v := dm.Source
			var lm float64
			for _, h := range leg.Hops {
				e := p.Edges[h.Edge]
				from, to := e.From, e.To
				if !h.Forward {
					from, to = to, from
				}
				if from != v {
					return fmt.Errorf("demand %d leg %d: hop over edge %d starts at %d, walk is at %d", d, li, h.Edge, from, v)
				}
				if e.Proposed && !p.AllowNew {
					return fmt.Errorf("demand %d: uses proposed edge %d without AllowNew", d, h.Edge)
				}
				if e.Flags&op.ExcludeFlags != 0 {
					return fmt.Errorf("demand %d: option %q uses excluded edge %d", d, op.Name, h.Edge)
				}
				v = to
				lm += e.LengthM
				cableM := e.CableM
				if cableM == 0 {
					cableM = e.LengthM
				}
				b.CableCents += int64(math.Round(cableM * float64(op.CablePerMCents)))
				// Labour per cable, for each of the option's cables (Option.Cables, 0 meaning 1).
				b.LabourCents += int64(max(op.Cables, 1)) * (int64(math.Round(e.LengthM*float64(e.LabourPerMCents))) + e.PerCableCents)
				users[h.Edge] = append(users[h.Edge], d)
				cablesOn[h.Edge] += max(op.Cables, 1)
			}
			if v != dm.Target {
				return fmt.Errorf("demand %d leg %d: ends at %d, want %d", d, li, v, dm.Target)
			}
			if len(p.NoTransit) > 0 {
				nodes := leg.Nodes(p.Edges)
				for _, u := range nodes[1 : len(nodes)-1] {
					if p.NoTransit[u] {
						return fmt.Errorf("demand %d leg %d: passes transit-free node %d", d, li, u)
					}
				}
			}
			if math.Abs(lm-leg.LengthM) > 1e-6 {
				return fmt.Errorf("demand %d leg %d: length %v, edges sum to %v", d, li, leg.LengthM, lm)
			}
			if op.MaxRouteM > 0 && lm > op.MaxRouteM+1e-3 {
				return fmt.Errorf("demand %d leg %d: %v m exceeds reach %v m", d, li, lm, op.MaxRouteM)
			}
			totalM += lm
		}
		if len(legs) == 2 {
			if err := disjointErr(p, dm.Source, dm.Target, legs[0], legs[1]); err != nil {
				return fmt.Errorf("demand %d: %v", d, err)
			}
		}
		b.FixedCents = op.FixedCents
		if len(legs) == 2 {
			b.FixedCents += op.SecondLegCents
		}
		r.Cost.ConstructionShareCents, r.Cost.AddedDuctCents, r.Cost.ChargeShareCents = 0, 0, 0
		if b != r.Cost {
			return fmt.Errorf("demand %d: breakdown %+v, recomputed %+v", d, r.Cost, b)
		}
	}
	var opened []int
	for e, us := range users {
		if len(us) == 0 {
			continue
		}
		if p.Edges[e].Proposed {
			opened = append(opened, e)
		}
	}
	if fmt.Sprint(opened) != fmt.Sprint(sol.Opened) {
		return fmt.Errorf("opened %v, edges used %v", sol.Opened, opened)
	}
	// Construction shares: equal split, remainder to the first user in demand order.
	shares := make([]int64, len(p.Demands))
	for _, e := range opened {
		us := users[e]
		f := p.Edges[e].FixedCents
		share := f / int64(len(us))
		first := us[0]
		for _, u := range us {
			first = min(first, u)
			shares[u] += share
		}
		shares[first] += f - share*int64(len(us))
	}
	// Charges: paid once when any of their edges carries a route, split like construction.
	chShares := make([]int64, len(p.Demands))
	var charged []int
	for k, c := range p.Charges {
		var us []int
		for d := range p.Demands {
			for _, e := range c.Edges {
				if slices.Contains(users[e], d) {
					us = append(us, d)
					break
				}
			}
		}
		if len(us) == 0 {
			continue
		}
		charged = append(charged, k)
		share := c.Cents / int64(len(us))
		for _, u := range us {
			chShares[u] += share
		}
		chShares[us[0]] += c.Cents - share*int64(len(us))
	}
	if fmt.Sprint(charged) != fmt.Sprint(sol.Charged) {
		return fmt.Errorf("charged %v, charges used %v", sol.Charged, charged)
	}
	var ducts int64
	for d, r := range sol.Routes {
		if r.Cost.ConstructionShareCents != shares[d] {
			return fmt.Errorf("demand %d: construction share %d, want %d", d, r.Cost.ConstructionShareCents, shares[d])
		}
		if r.Cost.ChargeShareCents != chShares[d] {
			return fmt.Errorf("demand %d: charge share %d, want %d", d, r.Cost.ChargeShareCents, chShares[d])
		}
		ducts += r.Cost.AddedDuctCents
		total += r.Cost.Total()
	}
	var wantDucts int64
	for _, f := range sol.Fill {
		if cablesOn[f.Edge] != f.Cables {
			return fmt.Errorf("edge %d: fill says %d cables, routes put %d", f.Edge, f.Cables, cablesOn[f.Edge])
		}
		ed := &p.Edges[f.Edge]
		duct := int64(math.Round(ed.LengthM * float64(ed.AddDuctPerMCents)))
		switch {
		case ed.Proposed && f.Limited:
			// The fill counts every duct laid; the opening (FixedCents) pays Edge.Ducts of them.
			if f.Ducts != 0 || f.AddedDucts < ed.Ducts {
				return fmt.Errorf("edge %d (proposed): fill says %d spare and %d laid, want 0 and at least the %d its opening lays", f.Edge, f.Ducts, f.AddedDucts, ed.Ducts)
			}
			wantDucts += int64(f.AddedDucts-ed.Ducts) * duct
		case f.AddedDucts > 0:
			// The trench once, laid with the ducts the cables need or AddTrenchDucts, whichever
			// is more: the fill counts the ducts laid.
			if f.AddedDucts < ed.AddTrenchDucts {
				return fmt.Errorf("edge %d: fill says %d ducts laid, fewer than the trench's %d", f.Edge, f.AddedDucts, ed.AddTrenchDucts)
			}
			wantDucts += int64(f.AddedDucts)*duct + int64(math.Round(ed.LengthM*float64(ed.AddTrenchPerMCents))) + ed.AddTrenchCents
		}
		if f.Limited && f.UsedAreaMM2 > f.AllowedAreaMM2+1e-6 && f.AddedDucts == 0 && p.Fits == nil {
			return fmt.Errorf("edge %d: %.1f mm² used exceeds %.1f mm² allowed", f.Edge, f.UsedAreaMM2, f.AllowedAreaMM2)
		}
		if f.Limited && p.Fits == nil {
			// The ducts bought are those the bill's packing needs (install.DuctBank.Pull in the
			// order the fill gives, by install.Load.Takes): the one packing rule.
			us := slices.Clone(users[f.Edge])
			slices.Sort(us)
			if !slices.Equal(us, f.Demands) {
				return fmt.Errorf("edge %d: fill packs demands %v, routes put %v", f.Edge, f.Demands, us)
			}
			var ods []float64 // each cable of each demand (Option.Cables), in the fill's order
			for _, d := range f.Demands {
				op := &p.Demands[d].Options[sol.Routes[d].Option]
				for range max(op.Cables, 1) {
					ods = append(ods, op.CableODMM)
				}
			}
			a := install.DuctBank{Ducts: min(len(ods), install.MaxBankDucts), IDMM: p.Edges[f.Edge].DuctIDMM, Innerduct: p.Edges[f.Edge].Innerduct,
				CablesPerDuct: p.Edges[f.Edge].CablesPerDuct}.Pull(ods)
			used := 0
			for _, df := range a.Ducts {
				if len(df.CablesODMM) > 0 {
					used++
				}
			}
			// The ducts laid for the packing's: on a proposed edge its own or as many as the
			// packing uses, whichever is more; on an existing one the added, or none, or the
			// trench's fewest, whichever is more.
			laid := max(0, used-ed.Ducts)
			if ed.Proposed {
				laid = max(ed.Ducts, used)
			} else if laid > 0 {
				laid = max(laid, ed.AddTrenchDucts)
			}
			if a.OK && (ed.Proposed || ed.AddDuctPerMCents > 0 || used <= ed.Ducts) && f.AddedDucts != laid {
				return fmt.Errorf("edge %d: %d ducts laid, the bill's packing of %v in %g mm ducts uses %d of %d spare",
					f.Edge, f.AddedDucts, ods, p.Edges[f.Edge].DuctIDMM, used, p.Edges[f.Edge].Ducts)
			}
		}
	}
	if ducts != wantDucts {
		return fmt.Errorf("added-duct cents %d, fill report prices %d", ducts, wantDucts)
	}
	if total != sol.TotalCents {
		return fmt.Errorf("total %d, breakdowns sum to %d", sol.TotalCents, total)
	}
	if math.Abs(totalM-sol.TotalM) > 1e-6 {
		return fmt.Errorf("total metres %v, legs sum to %v", sol.TotalM, totalM)
	}
	return nil
}

// disjointErr checks two legs share no edge, no interior node and no group > 0, but a group
// parted at ends (Edge.EndParted) along which both leave s, or both reach t: the hops of
// each along it from there do not count.
func disjointErr(p *Problem, s, t int, a, b Leg) error {
	edges := map[int]bool{}
	for _, h := range a.Hops {
		edges[h.Edge] = true
	}
	for _, h := range b.Hops {
		if edges[h.Edge] {
			return fmt.Errorf("legs share edge %d", h.Edge)
		}
	}
	// Each leg's edges from s to t.
	var es [2][]int
	for k, l := range []Leg{a, b} {
		for _, h := range l.Hops {
			es[k] = append(es[k], h.Edge)
		}
		if ns := l.Nodes(p.Edges); len(ns) > 0 && ns[0] != s {
			slices.Reverse(es[k])
		}
	}
	for end := range 2 {
		if len(es[0]) == 0 || len(es[1]) == 0 {
			break
		}
		at := func(k int) int { // the edge at this end of leg k
			if end == 0 {
				return es[k][0]
			}
			return es[k][len(es[k])-1]
		}
		g := p.Edges[at(0)].Group
		if !p.Edges[at(0)].EndParted || p.Edges[at(1)].Group != g {
			continue
		}
		for k := range 2 {
			for len(es[k]) > 0 && p.Edges[at(k)].Group == g {
				if end == 0 {
					es[k] = es[k][1:]
				} else {
					es[k] = es[k][:len(es[k])-1]
				}
			}
		}
	}
	groups := map[int]bool{}
	for _, e := range es[0] {
		if g := p.Edges[e].Group; g > 0 {
			groups[g] = true
		}
	}
	for _, e := range es[1] {
		if g := p.Edges[e].Group; g > 0 && groups[g] {
			return fmt.Errorf("legs share group %d", g)
		}
	}
	nodes := map[int]bool{}
	for _, v := range a.Nodes(p.Edges) {
		if v != s && v != t {
			nodes[v] = true
		}
	}
	for _, v := range b.Nodes(p.Edges) {
		if nodes[v] {
			return fmt.Errorf("legs share node %d", v)
		}
	}
	return nil
}

// randomInstance makes a small seeded instance: a connected network of existing edges, a few
// proposed shortcuts, demands to one or two targets with one to three options, ample capacity.
func randomInstance(seed uint64, maxProposed, maxDemands int) *Problem {
	r := rand.New(rand.NewPCG(seed, 0x5eed))
	n := 8 + r.IntN(7)
	p := &Problem{Nodes: n, AllowNew: true}
	type pt struct{ x, y float64 }
	pos := make([]pt, n)
	for i := range pos {
		pos[i] = pt{r.Float64() * 400, r.Float64() * 400}
	}
	dist := func(a, b int) float64 {
		return math.Round(math.Hypot(pos[a].x-pos[b].x, pos[a].y-pos[b].y)*1.2 + 5)
	}
	labour := []int64{300, 800, 1500}
	addEdge := func(a, b int, proposed bool) {
		e := Edge{ID: fmt.Sprintf("e%d", len(p.Edges)), From: a, To: b, LengthM: dist(a, b),
			LabourPerMCents: labour[r.IntN(len(labour))], Proposed: proposed}
		if proposed {
			e.LengthM = math.Round(e.LengthM * 0.7)
			e.FixedCents = int64(e.LengthM) * int64(2000+r.IntN(6000))
		}
		if r.IntN(8) == 0 {
			e.Flags = FlagHighEMI
		}
		p.Edges = append(p.Edges, e)
	}
	for v := 1; v < n; v++ { // random spanning tree
		addEdge(v, r.IntN(v), false)
	}
	for k := r.IntN(n / 2); k > 0; k-- {
		a, b := r.IntN(n), r.IntN(n)
		if a != b {
			addEdge(a, b, false)
		}
	}
	np := 3 + r.IntN(maxProposed-2)
	for k := 0; k < np; k++ {
		a, b := r.IntN(n), r.IntN(n)
		for a == b {
			b = r.IntN(n)
		}
		addEdge(a, b, true)
	}
	targets := []int{0}
	if r.IntN(2) == 0 {
		targets = append(targets, 1)
	}
	nd := 2 + r.IntN(maxDemands-1)
	for d := 0; d < nd; d++ {
		s := 2 + r.IntN(n-2)
		dm := Demand{ID: fmt.Sprintf("d%d", d), Source: s, Target: targets[r.IntN(len(targets))]}
		mm := Option{Name: "om4", CablePerMCents: 300 + int64(r.IntN(200)), FixedCents: 20000, MaxRouteM: 400 + float64(r.IntN(300)), CableODMM: 8}
		sm := Option{Name: "os2", CablePerMCents: 250 + int64(r.IntN(300)), FixedCents: 60000 + int64(r.IntN(40000)), MaxRouteM: math.Inf(1), CableODMM: 8}
		cu := Option{Name: "cat6a", CablePerMCents: 150, FixedCents: 5000, MaxRouteM: 90 + float64(r.IntN(200)), ExcludeFlags: FlagHighEMI | FlagOutdoor, CableODMM: 7.5}
		switch r.IntN(4) {
		case 0:
			dm.Options = []Option{mm}
		case 1:
			dm.Options = []Option{mm, sm}
		default:
			dm.Options = []Option{cu, mm, sm}
		}
		p.Demands = append(p.Demands, dm)
	}
	return p
}

func TestSolveSmoke(t *testing.T) {
	t.Parallel()
	for seed := uint64(1); seed <= 30; seed++ {
		p := randomInstance(seed, 12, 10)
		sol, err := Solve(p, Settings{})
		if err != nil {
			t.Fatalf("seed %d: %v", seed, err)
		}
		verify(t, fmt.Sprintf("seed %d", seed), p, sol)
	}
}
