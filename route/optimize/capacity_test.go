package optimize

import (
	"math"
	"testing"
)

// TestNFPAFits checks the default fill rule at the edges of NFPA 70 Chapter 9 Table 1 (seen):
// 53 % of a duct's area for one cable, 31 % for two, 40 % for three or more. For a 100 mm duct
// the largest single cable is 100·√0.53 = 72.80 mm, two equal cables 100·√0.155 = 39.37 mm,
// three equal cables 100·√(0.4/3) = 36.51 mm (computed).
func TestNFPAFits(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name  string
		ods   []float64
		ducts int
		want  bool
	}{
		{"one cable at 53 %", []float64{72.7}, 1, true},
		{"one cable over 53 %", []float64{72.9}, 1, false},
		{"two cables at 31 %", []float64{39.3, 39.3}, 1, true},
		{"two cables over 31 %", []float64{39.5, 39.5}, 1, false},
		{"two cables over 31 %, two ducts", []float64{39.5, 39.5}, 2, true},
		{"three cables at 40 %", []float64{36.5, 36.5, 36.5}, 1, true},
		{"three cables over 40 %", []float64{36.6, 36.6, 36.6}, 1, false},
		{"second cable starts a duct, third joins the first", []float64{50, 20, 20}, 2, true},
		{"no ducts", []float64{10}, 0, false},
		{"nothing to pull", nil, 0, true},
	}
	for _, tc := range cases {
		if got := NFPAFits(100, tc.ods, tc.ducts); got != tc.want {
			t.Errorf("%s: NFPAFits(100, %v, %d) got %v, want %v", tc.name, tc.ods, tc.ducts, got, tc.want)
		}
	}
}

// capNet: node 0 to node 2 by a short existing duct bank (edge 0, then edge 1) or a long
// way round (edges 2 and 3, no duct data).
func capNet(spare int, addPerM int64) []Edge {
	return []Edge{
		{ID: "short-a", From: 0, To: 1, LengthM: 50, LabourPerMCents: 500, DuctIDMM: 50, Ducts: spare, AddDuctPerMCents: addPerM},
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
