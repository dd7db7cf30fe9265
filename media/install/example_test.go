package install_test

import (
	"fmt"

	"spanwright/media/install"
)

// A duct run with three 90° bends and no structure on the way needs one pull point
// (TIA-569: at most two 90° bends between pull points).
func ExampleSections() {
	run := []install.Step{
		{Kind: install.KindStraight, LengthM: 50},
		{Kind: install.KindBend, AngleDeg: 90, RadiusM: 1},
		{Kind: install.KindStraight, LengthM: 40},
		{Kind: install.KindBend, AngleDeg: 90, RadiusM: 1},
		{Kind: install.KindStraight, LengthM: 60},
		{Kind: install.KindBend, AngleDeg: 90, RadiusM: 1},
		{Kind: install.KindStraight, LengthM: 30},
	}
	spec := install.PullSpec{WNPerM: 3.432, Mu: 0.35, MaxTensionN: 2670}
	plan, err := install.Sections(run, nil, spec)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range plan.Sections {
		fmt.Printf("from %5.1f m: %5.1f m, %3.0f°, pull %s, %6.1f N (%5.1f lbf), SWBP %6.1f N/m\n",
			s.StartM, s.LengthM, s.BendDeg, s.Best, s.MaxTensionN, install.NToLbf(s.MaxTensionN), s.MaxSWBPNPerM)
	}
	fmt.Printf("added pull points %d at %.1f m, within rating %v\n", plan.AddedPullPoints, plan.AddedAtM, plan.WithinRating)
	// Output:
	// from   0.0 m:  90.0 m, 180°, pull reverse,  143.3 N ( 32.2 lbf), SWBP   83.3 N/m
	// from  90.0 m:  90.0 m,  90°, pull reverse,  134.5 N ( 30.2 lbf), SWBP   62.4 N/m
	// added pull points 1 at [90.0] m, within rating true
}

// Packing cables into the spare ducts of a segment.
func ExampleDuctBank_Assign() {
	bank := install.DuctBank{CablesPerDuct: install.DefaultCablesPerDuct, Ducts: 2, IDMM: 4.334 * install.MMPerIn} // EMT 4 in
	a := bank.Assign([]float64{25.4, 61.2, 25.4, 18.0})
	for d, f := range a.Ducts {
		fmt.Printf("duct %d: %v mm, %.1f %% of %.0f %%, ok %v\n", d, f.CablesODMM, f.Pct, f.AllowedPct, f.OK)
	}
	fmt.Println("duct of each cable:", a.DuctOf, "unplaced:", a.Unplaced)
	fmt.Println("another 25.4 mm cable fits:", bank.Fits([]float64{25.4, 61.2, 25.4, 18.0}, 25.4))
	fmt.Println("25.4 mm cables in the empty bank:", bank.MaxCables(25.4))
	// Output:
	// duct 0: [61.2] mm, 30.9 % of 53 %, ok true
	// duct 1: [25.4 25.4 18] mm, 13.3 % of 40 %, ok true
	// duct of each cable: [1 0 1 1] unplaced: 0
	// another 25.4 mm cable fits: false
	// 25.4 mm cables in the empty bank: 6
}
