package optimize_test

import (
	"fmt"
	"math"

	"spanwright/route/optimize"
)

// Two buildings share a proposed trench to the cross-connect (node 0); a third reaches it over
// an existing duct bank. OM4 reaches 400 m, OS2 has no reach limit but dearer optics. Without
// the trench Aster Hall's 530 m route would need OS2 (722800 cents alone); with it all three
// take OM4 and split nothing but the trench they share (Aster Hall 210 m: 180 m × (420 + 700)
// + 30 m × (420 + 1200) + 48000 + 100000 = 398200 cents).
func ExampleSolve() {
	om4 := optimize.Option{Name: "om4", CablePerMCents: 420, FixedCents: 48_000, MaxRouteM: 400, CableODMM: 9.5}
	os2 := optimize.Option{Name: "os2", CablePerMCents: 360, FixedCents: 96_000, MaxRouteM: math.Inf(1), CableODMM: 9}
	p := &optimize.Problem{
		Nodes:    5,
		AllowNew: true,
		Edges: []optimize.Edge{
			{ID: "bank-1", From: 0, To: 1, LengthM: 260, LabourPerMCents: 800, DuctIDMM: 100, Ducts: 2},
			{ID: "bank-2", From: 1, To: 2, LengthM: 240, LabourPerMCents: 800, DuctIDMM: 100, Ducts: 2},
			{ID: "lateral", From: 2, To: 3, LengthM: 30, LabourPerMCents: 1200},
			{ID: "trench", From: 0, To: 2, LengthM: 180, LabourPerMCents: 700, Proposed: true, FixedCents: 200_000},
			{ID: "riser", From: 1, To: 4, LengthM: 20, LabourPerMCents: 1200},
		},
		Demands: []optimize.Demand{
			{ID: "Aster Hall", Source: 3, Target: 0, Options: []optimize.Option{om4, os2}},
			{ID: "Birch Lab", Source: 2, Target: 0, Options: []optimize.Option{om4, os2}},
			{ID: "Cedar House", Source: 4, Target: 0, Options: []optimize.Option{om4, os2}},
		},
	}
	sol, err := optimize.Solve(p, optimize.Settings{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, r := range sol.Routes {
		fmt.Printf("%-11s %s %6.1f m %8d cents (trench share %d)\n", r.ID, r.Medium, r.Primary.LengthM, r.Cost.Total(), r.Cost.ConstructionShareCents)
	}
	fmt.Println("opened:", sol.Opened, "total:", sol.TotalCents)
	// Output:
	// Aster Hall  om4  210.0 m   398200 cents (trench share 100000)
	// Birch Lab   om4  180.0 m   349600 cents (trench share 100000)
	// Cedar House om4  280.0 m   397600 cents (trench share 0)
	// opened: [3] total: 1145400
}
