package install

import (
	"slices"
)

// Spread is which cable goes in which duct of the bank, as the bill shows it and the crew
// pulls it. Pull's first fit decides which cables are placed and how many ducts they need (the
// optimizer's count, which it priced): Spread places exactly those cables and leaves the others
// unplaced, in the bank's ducts, never needing another.
//
// First fit puts a cable into the first duct whose fill takes it, so a duct of a bank with spare
// ducts can be given more cables than a sound set of pulls (Crowded) while the next spare duct
// stays empty. When first fit crowds a duct of loose cables (not innerduct: an innerduct takes
// one cable and is never crowded), Spread packs again with a cap: each cable goes into the
// lowest-numbered duct holding fewer than SeparateCablesPerDuct cables whose Load takes it
// (Load.Takes, NFPA 70 Chapter 9 Table 1 fill and the jam band), and only when none does into
// the duct holding the fewest cables that takes it (the lowest-numbered of those). It tries
// the cables in pull order, then largest first (a large cable may need a duct of its own), and
// keeps the first packing that places every cable first fit placed with fewer cables over the
// sound-pull count in all; otherwise first fit stands. So no duct of the bank is given more
// than SeparateCablesPerDuct loose cables while another stays empty, whenever a packing above
// finds room for all of them, and a bank first fit does not crowd is packed first fit.
//
// Every duct is within fill and free of jam risk after every placement, its cables listed in
// the order placed (the order to pull them in). The ducts are numbered as Pull numbers them,
// so the lowest (the existing spare ducts, before any the plan adds) fill first. The packing
// depends only on the cables' diameters in the order given and the bank. Invalid input gives
// Pull's answer (OK false, a non-nil Err); it never panics. Time O(n·Ducts) for n cables.
func (b DuctBank) Spread(cableODsMM []float64, innerduct bool) Assignment {
	ff := b.Pull(cableODsMM)
	if ff.Err != nil || innerduct || overSoundPull(ff.Ducts) == 0 {
		return ff
	}
	var placed []int // the cables first fit placed, in pull order
	for c, d := range ff.DuctOf {
		if d >= 0 {
			placed = append(placed, c)
		}
	}
	largest := slices.Clone(placed)
	slices.SortStableFunc(largest, func(x, y int) int {
		switch a, b := cableODsMM[x], cableODsMM[y]; {
		case a > b:
			return -1
		case a < b:
			return 1
		}
		return 0
	})
	for _, order := range [][]int{placed, largest} {
		if a, ok := b.capped(cableODsMM, order); ok && overSoundPull(a.Ducts) < overSoundPull(ff.Ducts) {
			a.Unplaced = ff.Unplaced
			a.OK = ff.OK
			return a
		}
	}
	return ff
}

// capped packs the cables of the given indices, in that order, each into the lowest duct
// holding fewer than SeparateCablesPerDuct cables that takes it, or else into the duct holding
// the fewest that takes it; ok is false when a cable fits no duct. Cables not in order are
// left unplaced (DuctOf -1). The bank and the cables are valid (Pull checked them).
func (b DuctBank) capped(cableODsMM []float64, order []int) (a Assignment, ok bool) {
	a.DuctOf = make([]int, len(cableODsMM))
	for i := range a.DuctOf {
		a.DuctOf[i] = -1
	}
	held := make([][]float64, b.Ducts)
	a.Cables = make([][]int, b.Ducts)
	loads := make([]Load, b.Ducts)
	for _, c := range order {
		od := cableODsMM[c]
		best := -1
		for d := range loads {
			if !loads[d].Takes(b.IDMM, od) {
				continue
			}
			if loads[d].Cables < SeparateCablesPerDuct {
				best = d
				break
			}
			if best < 0 || loads[d].Cables < loads[best].Cables {
				best = d
			}
		}
		if best < 0 {
			return Assignment{}, false
		}
		held[best] = append(held[best], od)
		a.Cables[best] = append(a.Cables[best], c)
		loads[best].Add(od)
		a.DuctOf[c] = best
	}
	a.Ducts = make([]Fill, b.Ducts)
	for d := range held {
		a.Ducts[d] = CheckFill(b.IDMM, held[d])
	}
	return a, true
}

// overSoundPull is the number of cables beyond SeparateCablesPerDuct in every duct, summed.
func overSoundPull(ducts []Fill) int {
	n := 0
	for _, f := range ducts {
		n += max(0, len(f.CablesODMM)-SeparateCablesPerDuct)
	}
	return n
}
