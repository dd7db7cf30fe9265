package install

import (
	"fmt"
)

// DefaultCablesPerDuct is the most cables, each pulled on its own, that one duct is given
// before a practitioner would not pull another into it: every later pull drags its rope and
// cable over the cables already in the duct (the rope can saw through a jacket at a bend),
// and a duct of many loose cables can be neither sorted nor re-pulled. Past it the cables get
// innerduct (one cable to a cell or subduct) or ducts of their own. Common practice, no
// published source; NFPA 70 Chapter 9 Table 1 limits the fill only, not the number of pulls.
// It is the default of the plan's design.cables_per_duct, which every packer is given
// (PullLimit); no packer reads this constant.
const DefaultCablesPerDuct = 3 // common practice, no published source

// PullLimit is the most cables one duct takes, each pulled on its own, or 0 for no count (fill
// and the jam band alone): cablesPerDuct (the plan's design.cables_per_duct; 0 there is no
// count) for loose cables; for innerducts (innerduct true: what goes into the duct are
// innerducts, each pulled in empty and holding one cable in a cell of its own) no count. It
// is the one count of pulls: Load.Takes refuses a cable to a duct that holds it, so every
// packer (DuctBank, the optimizer's duct capacity) keeps to it, and Crowded flags a duct
// beyond it. A negative cablesPerDuct is no count.
func PullLimit(innerduct bool, cablesPerDuct int) int {
	if innerduct || cablesPerDuct <= 0 {
		return 0
	}
	return cablesPerDuct
}

// Crowded reports whether a duct holding cables holds more than most, its count of pulls
// (PullLimit; 0: no count, never crowded). No packing of this package gives a duct that many
// (Load.Takes); a duct holds them only when its cables were put there by hand, a check of
// what was given rather than what was packed.
func Crowded(cables, most int) bool { return most > 0 && cables > most }

// CrowdedNote says, as a practitioner would, why a duct of that many separate cables is not
// a sound set of pulls; "" when it is not Crowded.
func CrowdedNote(cables, most int) string {
	if !Crowded(cables, most) {
		return ""
	}
	return fmt.Sprintf("%d cables pulled one by one into one duct: more than %d (design.cables_per_duct; common practice, no published source) is not a sound pull (each pull drags over the cables already in): give them innerduct or a duct of their own; fill within NFPA 70 Chapter 9 Table 1 does not make it one",
		cables, most)
}
