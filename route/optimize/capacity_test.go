package optimize

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"spanwright/media/install"
)

// TestNFPAFits checks the default fill rule at the edges of NFPA 70 Chapter 9 Table 1 (seen): 53 %
// of a duct's area for one cable, 31 % for two, 40 % for three or more. For a 100 mm duct the
// largest single cable is 100·√0.53 = 72.80 mm, two equal cables 100·√0.155 = 39.37 mm, three equal
// cables 100·√(0.4/3) = 36.51 mm (computed). Three equal cables of 32.8 to 37.5 mm are jam-prone in
// a 100 mm duct (1.05·D/d from 2.8 to 3.2, NFPA 70 Chapter 9 Table 1 Informational Note No. 2,
// seen; the 1.05 is common practice, no published source), so three unequal ones test 40 %.
// Loose cables go at most three to a duct, one pull each (install.DefaultCablesPerDuct, common
// practice, no published source), or as many as the plan's design.cables_per_duct says, 0 for
// no count; innerducts, pulled in empty, are held to the fill alone.
func TestNFPAFits(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name      string
		ods       []float64
		ducts     int
		want      bool
		innerduct bool
	}{
		{"one cable at 53 %", []float64{72.7}, 1, true, false},
		{"one cable over 53 %", []float64{72.9}, 1, false, false},
		{"two cables at 31 %", []float64{39.3, 39.3}, 1, true, false},
		{"two cables over 31 %", []float64{39.5, 39.5}, 1, false, false},
		{"two cables over 31 %, two ducts", []float64{39.5, 39.5}, 2, true, false},
		{"three cables at 40 %", []float64{40, 36, 32.9}, 1, true, false},    // 39.8 % (computed)
		{"three cables over 40 %", []float64{40, 36, 33.4}, 1, false, false}, // 40.1 % (computed)
		{"three equal cables in the jam band", []float64{36.5, 36.5, 36.5}, 1, false, false},
		{"three equal cables in the jam band, two ducts", []float64{36.5, 36.5, 36.5}, 2, true, false},
		{"three equal cables below the jam band", []float64{30, 30, 30}, 1, true, false},            // 1.05·100/30 = 3.5
		{"three equal cables over 40 %, past the jam band", []float64{38, 38, 38}, 1, false, false}, // 2 at 28.9 %, 3 at 43.3 % (computed)
		{"third cable 6 % apart is no jam", []float64{36.5, 36.5, 34.3}, 1, true, false},
		{"second cable starts a duct, third joins the first", []float64{50, 20, 20}, 2, true, false},
		{"no ducts", []float64{10}, 0, false, false},
		{"nothing to pull", nil, 0, true, false},
		// 4·13² = 6.8 % of the area, far within 40 %: the count of pulls decides.
		{"four loose cables, one duct", []float64{13, 13, 13, 13}, 1, false, false},
		{"four loose cables, two ducts", []float64{13, 13, 13, 13}, 2, true, false},
		{"seven loose cables, two ducts", slices.Repeat([]float64{13}, 7), 2, false, false},
		{"seven loose cables, three ducts", slices.Repeat([]float64{13}, 7), 3, true, false},
		{"four innerducts, one duct", []float64{13, 13, 13, 13}, 1, true, true},
		{"23 innerducts, one duct", slices.Repeat([]float64{13}, 23), 1, true, true}, // 38.9 % (computed)
		{"innerducts over 40 %", slices.Repeat([]float64{13}, 24), 1, false, true},   // 40.6 % (computed)
	}
	for _, tc := range cases {
		if got := NFPAFits(100, tc.ods, tc.ducts, install.PullLimit(tc.innerduct, install.DefaultCablesPerDuct)); got != tc.want {
			t.Errorf("%s: NFPAFits(100, %v, %d, innerduct %v) got %v, want %v", tc.name, tc.ods, tc.ducts, tc.innerduct, got, tc.want)
		}
	}
	// Another design.cables_per_duct: 0 is the fill alone (NFPA 70 Chapter 9 Table 1: 7·13²
	// is 11.8 % of the area, 23 are 38.9 % and 24 40.6 %, computed); 2 gives seven loose
	// cables four ducts, 3 three.
	for _, tc := range []struct {
		perDuct, cables, ducts int
		want                   bool
	}{
		{0, 7, 1, true}, {0, 23, 1, true}, {0, 24, 1, false}, {0, 24, 2, true},
		{2, 7, 3, false}, {2, 7, 4, true}, {3, 7, 2, false}, {3, 7, 3, true}, {7, 7, 1, true}, {6, 7, 1, false},
	} {
		if got := NFPAFits(100, slices.Repeat([]float64{13}, tc.cables), tc.ducts, install.PullLimit(false, tc.perDuct)); got != tc.want {
			t.Errorf("cables_per_duct %d: %d loose 13 mm cables in %d ducts: fits %v, want %v", tc.perDuct, tc.cables, tc.ducts, got, tc.want)
		}
	}
}

// capNet: node 0 to node 2 by a short existing duct bank (edge 0, then edge 1; three loose
// cables a duct, install.DefaultCablesPerDuct) or a long way round (edges 2 and 3, no duct
// data).
func capNet(spare int, addPerM int64) []Edge {
	return []Edge{
		{ID: "short-a", From: 0, To: 1, LengthM: 50, LabourPerMCents: 500, DuctIDMM: 50, Ducts: spare, AddDuctPerMCents: addPerM,
			CablesPerDuct: install.DefaultCablesPerDuct},
		{ID: "short-b", From: 1, To: 2, LengthM: 50, LabourPerMCents: 500},
		{ID: "long-a", From: 0, To: 3, LengthM: 150, LabourPerMCents: 500},
		{ID: "long-b", From: 3, To: 2, LengthM: 150, LabourPerMCents: 500},
	}
}

func capDemands(n int, odMM float64) []Demand {
	var ds []Demand
	for i := 0; i < n; i++ {
		ds = append(ds, Demand{ID: string(rune('A' + i)), Source: 0, Target: 2,
			Options: []Option{{Name: "os2", CablePerMCents: 300, MaxRouteM: math.Inf(1), CableODMM: odMM}}})
	}
	return ds
}

// TestCapacity checks that full ducts send cables the long way round or buy a duct, whichever
// is cheaper, and that the fill report and the added-duct charge agree.
func TestCapacity(t *testing.T) {
	t.Parallel()
	// A 50 mm duct takes one 36 mm cable (53 % allows 36.4 mm) and no second (31 % of the
	// area is 27.8 mm for two equal cables): each 36 mm cable needs its own duct.
	cases := []struct {
		name        string
		spare       int
		addPerM     int64
		demands     int
		fits        FitsFunc
		wantShort   int // demands on the short way
		wantAdded   int
		wantDuctCts int64
	}{
		{"spare duct", 1, 0, 1, nil, 1, 0, 0},
		{"full, no duct can be added", 0, 0, 2, nil, 0, 0, 0},
		{"one spare, second goes round", 1, 0, 2, nil, 1, 0, 0},
		{"adding a duct is cheaper than going round", 1, 1000, 2, nil, 2, 1, 50_000},
		{"adding a duct is dearer than going round", 1, 90_000, 2, nil, 1, 0, 0},
		{"hook: one cable per duct", 2, 0, 3, func(edge int, ods []float64, ducts int) bool { return len(ods) <= ducts }, 2, 0, 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			p := &Problem{Nodes: 4, Edges: capNet(tc.spare, tc.addPerM), Demands: capDemands(tc.demands, 36), Fits: tc.fits}
			sol, err := Solve(p, Settings{})
			if err != nil {
				t.Fatal(err)
			}
			verify(t, tc.name, p, sol)
			short := 0
			var ductCents int64
			for _, r := range sol.Routes {
				if r.Primary.Hops[0].Edge == 0 {
					short++
				}
				ductCents += r.Cost.AddedDuctCents
			}
			added := 0
			for _, f := range sol.Fill {
				if f.Edge == 0 {
					added = f.AddedDucts
					if !f.Limited || f.Ducts != tc.spare {
						t.Errorf("%s: fill of edge 0 %+v", tc.name, f)
					}
				}
			}
			if short != tc.wantShort || added != tc.wantAdded || ductCents != tc.wantDuctCts {
				t.Errorf("%s: short way %d, added ducts %d, duct cents %d; want %d, %d, %d",
					tc.name, short, added, ductCents, tc.wantShort, tc.wantAdded, tc.wantDuctCts)
			}
		})
	}
}

// TestAddedDuctTrenchOnce checks that the trench beside a full duct bank is paid once however
// many ducts it takes (one trench holds several ducts: common practice, no published source):
// three 36 mm cables with no spare duct take three added 50 mm ducts (NFPA 70 Chapter 9
// Table 1: 53 % of a 50 mm duct holds one 36 mm cable), 3 × 50 m × 10.00 plus 50 m × 20.00
// once, 2500.00, cheaper than the long way round (200 m more each at 8.00 a metre, 3 ×
// 1600.00); a trench per duct would have charged 4500.00.
func TestAddedDuctTrenchOnce(t *testing.T) {
	t.Parallel()
	edges := capNet(0, 1000)
	edges[0].AddTrenchPerMCents = 2000
	p := &Problem{Nodes: 4, Edges: edges, Demands: capDemands(3, 36)}
	sol, err := Solve(p, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, "trench once", p, sol)
	var ducts int64
	for _, r := range sol.Routes {
		ducts += r.Cost.AddedDuctCents
	}
	if want := int64(3*50*1000 + 50*2000); ducts != want {
		t.Errorf("added-duct cents %d, want %d (three ducts, one trench)", ducts, want)
	}
}

// TestAddedDuctTrenchDucts checks a trench beside a full duct bank laid with at least
// AddTrenchDucts ducts (a new trench gets the design's ducts: common practice, no published
// source): one 36 mm cable needs one added 50 mm duct (NFPA 70 Chapter 9 Table 1: 53 % of a
// 50 mm duct holds one 36 mm cable), but the trench is laid with two, 2 × 50 m × 10.00 plus
// 50 m × 20.00, 2000.00; three cables need three ducts, three paid, 2500.00.
func TestAddedDuctTrenchDucts(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name   string
		cables int
		want   int64
	}{
		{"one cable, two ducts laid", 1, 2*50*1000 + 50*2000},
		{"three cables, three ducts laid", 3, 3*50*1000 + 50*2000},
	} {
		edges := capNet(0, 1000)
		edges[0].AddTrenchPerMCents, edges[0].AddTrenchDucts = 2000, 2
		edges[2].LabourPerMCents, edges[3].LabourPerMCents = 10000, 10000 // the long way round is dearer
		p := &Problem{Nodes: 4, Edges: edges, Demands: capDemands(tc.cables, 36)}
		sol, err := Solve(p, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		verify(t, tc.name, p, sol)
		var ducts int64
		for _, r := range sol.Routes {
			ducts += r.Cost.AddedDuctCents
		}
		if ducts != tc.want {
			t.Errorf("%s: added-duct cents %d, want %d", tc.name, ducts, tc.want)
		}
	}
}

// TestCableMetresAndPerCableCents checks the two per-edge cost fields a caller prices itself:
// an option pays its cable over CableM, not LengthM, and every cable pays PerCableCents, on
// top of labour per metre (the package documentation's cost, computed by hand).
func TestCableMetresAndPerCableCents(t *testing.T) {
	t.Parallel()
	p := &Problem{Nodes: 2, Edges: []Edge{{ID: "e", From: 0, To: 1, LengthM: 100, CableM: 107.5, LabourPerMCents: 50, PerCableCents: 1234}},
		Demands: []Demand{{ID: "d", Source: 0, Target: 1, Options: []Option{{Name: "os2", CablePerMCents: 231, FixedCents: 999, MaxRouteM: 100}}}}}
	sol, err := Solve(p, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, "cable metres", p, sol)
	// 107.5 m × 2.31 = 248.33 (rounded), 100 m × 0.50 = 50.00, 12.34, 9.99; the reach counts
	// the 100 m of the edge, within 100 m.
	if want := int64(24833 + 5000 + 1234 + 999); sol.TotalCents != want {
		t.Errorf("total %d cents, want %d", sol.TotalCents, want)
	}
}

// TestFillReport checks the NFPA areas of the fill report: two 20 mm cables in a 100 mm duct
// use 2 × 314.16 mm² against 31 % of 7853.98 mm² = 2434.73 mm² (computed).
func TestFillReport(t *testing.T) {
	t.Parallel()
	p := &Problem{Nodes: 2, Edges: []Edge{{ID: "bank", From: 0, To: 1, LengthM: 10, DuctIDMM: 100, Ducts: 2}}, Demands: capDemands(2, 20)}
	for i := range p.Demands {
		p.Demands[i].Target = 1
	}
	sol, err := Solve(p, Settings{})
	if err != nil {
		t.Fatal(err)
	}
	verify(t, "fill", p, sol)
	if len(sol.Fill) != 1 {
		t.Fatalf("fill: got %d edges, want 1", len(sol.Fill))
	}
	f := sol.Fill[0]
	if f.Cables != 2 || math.Abs(f.UsedAreaMM2-628.32) > 0.01 || math.Abs(f.AllowedAreaMM2-2434.73) > 0.01 {
		t.Errorf("fill: got %+v, want 2 cables, 628.32 mm² used, 2434.73 mm² allowed", f)
	}
}

// TestPackIsPull holds the optimizer's duct packing to the bill's: for random cables, many of
// one size near the jam band, first-fit in pull order puts the same cables in the same ducts
// as install.DuctBank.Pull, the packing the estimate's duct fill sheet shows (one rule:
// install.Load.Takes), loose cables or innerducts.
func TestPackIsPull(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(7, 11))
	sizes := []float64{10, 18, 25.4, 31, 33, 34.2, 35, 36.5, 40, 52, 75}
	for trial := range 3000 {
		ductIDMM := []float64{29, 50, 100, 103}[rng.IntN(4)]
		innerduct := rng.IntN(2) == 0
		perDuct := rng.IntN(5) // design.cables_per_duct: 0 (fill alone) to 4
		most := install.PullLimit(innerduct, perDuct)
		ods := make([]float64, rng.IntN(40))
		for i := range ods {
			ods[i] = sizes[rng.IntN(len(sizes))]
			if rng.IntN(4) == 0 {
				ods[i] *= 1 + (rng.Float64()-0.5)/10 // within or just past the 5 % of equal sizes
			}
		}
		var p ductPack
		p.reset(ductIDMM, most)
		var placed []float64
		for _, od := range ods {
			if p.place(od) {
				placed = append(placed, od)
			}
		}
		a := install.DuctBank{Ducts: len(placed), IDMM: ductIDMM, Innerduct: innerduct, CablesPerDuct: perDuct}.Pull(placed)
		if !a.OK {
			t.Fatalf("trial %d: Pull left %d of %v unplaced in %d ducts of %g mm, the optimizer placed them all",
				trial, a.Unplaced, placed, len(placed), ductIDMM)
		}
		used := 0
		for j, f := range a.Ducts {
			if len(f.CablesODMM) == 0 {
				continue
			}
			used++
			if j >= len(p.load) || p.load[j].Cables != len(f.CablesODMM) || p.load[j].UsedMM2 != f.UsedMM2 {
				t.Fatalf("trial %d: duct %d of %g mm: Pull holds %v, the optimizer %+v", trial, j, ductIDMM, f.CablesODMM, p.load)
			}
		}
		if used != len(p.load) {
			t.Fatalf("trial %d: Pull uses %d ducts, the optimizer %d (cables %v in %g mm)", trial, used, len(p.load), ods, ductIDMM)
		}
		// A cable the optimizer could not place fits not even an empty duct.
		for _, od := range ods {
			if !(install.Load{}).Takes(ductIDMM, od, most) && slices.Contains(placed, od) {
				t.Fatalf("trial %d: a %g mm cable no empty %g mm duct takes was placed", trial, od, ductIDMM)
			}
		}
	}
}

// TestProposedBuiltToSize checks an opened proposed edge built to size: its opening lays
// Edge.Ducts ducts (paid in FixedCents), and each duct its cables need beyond them costs
// AddDuctPerMCents a metre, or nothing at 0, never a trench again. A 50 mm duct takes one
// 36 mm cable and no second (NFPA 70 Chapter 9 Table 1: 53 % of the area for one cable allows
// 36.4 mm, 31 % for two allows 27.8 mm each), so three cables over the proposed P need three
// ducts, two beyond the one its opening lays. The way round costs 200 m more at 3.00 cable
// and 5.00 labour a metre, 1,600.00 per cable: a duct of 50 m at 10.00 a metre (500.00) is
// cheaper and all three take P; at 40.00 a metre (2,000.00) only the first does. A 60 mm cable
// fits no empty 50 mm duct, so P is no way for it: it goes round, and P is not opened.
func TestProposedBuiltToSize(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name      string
		addPerM   int64
		odMM      float64
		wantOnP   int
		wantLaid  int   // EdgeFill.AddedDucts on P: every duct laid
		wantDucts int64 // Σ AddedDuctCents: the ducts beyond the opening's one
	}{
		{"ducts cheaper than the way round", 1000, 36, 3, 3, 2 * 50 * 1000},
		{"ducts dearer than the way round", 4000, 36, 1, 1, 0},
		{"ducts at no price", 0, 36, 3, 3, 0},
		{"a cable no empty duct takes", 1000, 60, 0, 0, 0},
	} {
		edges := []Edge{
			{ID: "P", From: 0, To: 1, LengthM: 50, LabourPerMCents: 500, Proposed: true, FixedCents: 100000,
				DuctIDMM: 50, Ducts: 1, AddDuctPerMCents: tc.addPerM,
				AddTrenchPerMCents: 99999, AddTrenchCents: 99999, AddTrenchDucts: 5}, // not read on a proposed edge
			{ID: "short-b", From: 1, To: 2, LengthM: 50, LabourPerMCents: 500},
			{ID: "long-a", From: 0, To: 3, LengthM: 150, LabourPerMCents: 500},
			{ID: "long-b", From: 3, To: 2, LengthM: 150, LabourPerMCents: 500},
		}
		p := &Problem{Nodes: 4, Edges: edges, Demands: capDemands(3, tc.odMM), AllowNew: true}
		sol, err := Solve(p, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		verify(t, tc.name, p, sol)
		onP, laid, limited := 0, 0, false
		for _, f := range sol.Fill {
			if f.Edge == 0 {
				onP, laid, limited = f.Cables, f.AddedDucts, f.Limited
				if f.Ducts != 0 {
					t.Errorf("%s: P has %d spare ducts in the fill, want 0 (new construction)", tc.name, f.Ducts)
				}
			}
		}
		var ducts int64
		for _, r := range sol.Routes {
			ducts += r.Cost.AddedDuctCents
		}
		if onP != tc.wantOnP || laid != tc.wantLaid || ducts != tc.wantDucts || (onP > 0 && !limited) {
			t.Errorf("%s: %d cables on P, %d ducts laid, added-duct cents %d, limited %v; want %d, %d, %d, true",
				tc.name, onP, laid, ducts, limited, tc.wantOnP, tc.wantLaid, tc.wantDucts)
		}
		if opened := len(sol.Opened) > 0; opened != (tc.wantOnP > 0) {
			t.Errorf("%s: opened %v", tc.name, sol.Opened)
		}
	}
}

// TestSeveralCables checks a demand whose option pulls three 36 mm cables side by side
// (Option.Cables, as a copper link of three 4-pair cables: ANSI/TIA-568.2, one per port): each
// takes a duct place (a 50 mm duct holds one 36 mm cable: NFPA 70 Chapter 9 Table 1, 53 % for
// one cable, 31 % for two), and each pays the labour per metre, so the fill counts three
// cables and three ducts. The short way has one spare duct: three cables need two more. The
// way round is 200 m longer at 3.00 cable (all three together) and 3 × 5.00 labour a metre,
// 3,600.00: two 50 m ducts at 10.00 a metre (1,000.00) are cheaper, at 40.00 (4,000.00) dearer.
func TestSeveralCables(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name       string
		addPerM    int64
		wantShort  bool
		wantLabour int64
		wantDucts  int64
	}{
		{"ducts cheaper than the way round", 1000, true, 3 * 100 * 500, 2 * 50 * 1000},
		{"ducts dearer than the way round", 4000, false, 3 * 300 * 500, 0},
	} {
		dm := capDemands(1, 36)
		dm[0].Options[0].Cables = 3
		p := &Problem{Nodes: 4, Edges: capNet(1, tc.addPerM), Demands: dm}
		sol, err := Solve(p, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		verify(t, tc.name, p, sol)
		r := sol.Routes[0]
		short := r.Primary.Hops[0].Edge == 0 || r.Primary.Hops[len(r.Primary.Hops)-1].Edge == 0
		if short != tc.wantShort || r.Cost.LabourCents != tc.wantLabour || r.Cost.AddedDuctCents != tc.wantDucts {
			t.Errorf("%s: short way %v, labour %d, added-duct cents %d; want %v, %d, %d",
				tc.name, short, r.Cost.LabourCents, r.Cost.AddedDuctCents, tc.wantShort, tc.wantLabour, tc.wantDucts)
		}
		for _, f := range sol.Fill {
			if f.Cables != 3 {
				t.Errorf("%s: edge %d carries %d cables, want 3", tc.name, f.Edge, f.Cables)
			}
			if f.Edge == 0 && f.AddedDucts != 2 {
				t.Errorf("%s: %d ducts added on the short way, want 2", tc.name, f.AddedDucts)
			}
		}
	}
}

// TestAddedCentsIsTheObjective: Edge.AddedCents, which the routing's count of pulls
// (routing.ForCount) prices ducts and trench by, is what Solve's objective charges for k
// added ducts (solver.ductsCents; doc.go), on existing and proposed edges, with and without
// a trench's fewest ducts.
func TestAddedCentsIsTheObjective(t *testing.T) {
	t.Parallel()
	edges := capNet(1, 4500)
	edges[0].AddTrenchPerMCents, edges[0].AddTrenchCents, edges[0].AddTrenchDucts = 12345, 6789, 2
	edges = append(edges,
		Edge{ID: "bank-2", From: 0, To: 3, LengthM: 33.3, DuctIDMM: 100, Ducts: 2, AddDuctPerMCents: 777, AddTrenchPerMCents: 999},
		Edge{ID: "new", From: 1, To: 3, LengthM: 71.7, Proposed: true, FixedCents: 100000, DuctIDMM: 100, Ducts: 2, AddDuctPerMCents: 4321})
	p := &Problem{Nodes: 4, AllowNew: true, Edges: edges, Demands: capDemands(1, 10)}
	sv := newSolver(p, Settings{})
	for e := range p.Edges {
		if !p.Edges[e].limited() {
			continue
		}
		for k := range 6 {
			if got, want := p.Edges[e].AddedCents(k), sv.ductsCents(e, k); got != want {
				t.Errorf("edge %s, %d added: AddedCents %d, the objective's %d", p.Edges[e].ID, k, got, want)
			}
		}
	}
}
