package install

import (
	"math"
	"slices"
)

// Spread is which cable goes in which duct of the bank, as the bill shows it and the crew
// pulls it. Pull's first fit decides which cables are placed and how many ducts they need (the
// optimizer's count, which it priced): Spread places exactly those cables and leaves the others
// unplaced, in the bank's ducts, never needing another. Every packing here is by Load.Takes
// (NFPA 70 Chapter 9 Table 1 fill, the jam band and PullLimit), so no duct is given more loose
// cables than a sound set of pulls: first fit goes on to the next duct at the count.
//
// prefer (nil, or one entry per cable) gives each cable the duct it holds on the span it comes
// from, -1 for none: a cable carried on keeps its duct, placed before the others, where that
// duct takes it and holds fewer than CablesPerDuct cables (or an even share of the cables over
// the ducts, when that is more: innerducts, which PullLimit does not count, hold to it too),
// or,
// in a second packing, where it takes it at all; the others go first fit. Each is tried in
// pull order and largest first (a large cable may need a duct of its own). Of first fit and
// these, Spread keeps the packing that places every cable first fit placed with the fewest
// cables out of their preferred duct; first fit, then the order above, wins a tie. So a bank
// whose cables keep the ducts they come from is packed first fit.
//
// Every duct is within fill, free of jam risk and within PullLimit after every placement, its
// cables listed in the order placed (the order to pull them in; Assignment.Cables names them).
// The ducts are numbered as Pull numbers them, so the lowest (the existing spare ducts, before
// any the plan adds) fill first. The packing depends only on the cables' diameters in the
// order given, the preferences and the bank. Invalid input gives Pull's answer (OK false, a
// non-nil Err); it panics only on a prefer of another length than the cables (a programmer's
// error). Time O(n·Ducts) for n cables.
func (b DuctBank) Spread(cableODsMM []float64, prefer []int) Assignment {
	ff := b.Pull(cableODsMM)
	if ff.Err != nil {
		return ff
	}
	if prefer != nil && len(prefer) != len(cableODsMM) {
		panic("install: Spread: prefer must have one entry per cable")
	}
	best, bestMissed := ff, missed(ff, prefer)
	if bestMissed == 0 {
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
	// A cable carried on keeps its duct while the duct holds fewer than a sound set of pulls
	// (or an even share of the cables, when that is more), or while it takes it at all.
	share := max(b.CablesPerDuct, (len(placed)+b.Ducts-1)/max(b.Ducts, 1))
	for _, most := range []int{share, math.MaxInt} {
		for _, order := range [][]int{placed, largest} {
			if bestMissed == 0 {
				break
			}
			a, ok := b.preferred(cableODsMM, order, prefer, most)
			if !ok {
				continue
			}
			if miss := missed(a, prefer); miss < bestMissed {
				best, bestMissed = a, miss
			}
		}
	}
	best.Unplaced, best.OK = ff.Unplaced, ff.OK
	return best
}

// preferred packs the cables of the given indices, in that order: first those with a
// preferred duct (prefer) that takes them (Load.Takes) and holds fewer than most cables go
// into it, then the others each into the lowest duct that takes it. ok is false when a cable
// fits no duct. Cables not in order are left unplaced (DuctOf -1). The bank and the cables
// are valid (Pull checked them).
func (b DuctBank) preferred(cableODsMM []float64, order []int, prefer []int, most int) (a Assignment, ok bool) {
	a.DuctOf = make([]int, len(cableODsMM))
	for i := range a.DuctOf {
		a.DuctOf[i] = -1
	}
	held := make([][]float64, b.Ducts)
	a.Cables = make([][]int, b.Ducts)
	loads := make([]Load, b.Ducts)
	pulls := b.PullLimit()
	put := func(c, d int) {
		held[d] = append(held[d], cableODsMM[c])
		a.Cables[d] = append(a.Cables[d], c)
		loads[d].Add(cableODsMM[c])
		a.DuctOf[c] = d
	}
	for _, c := range order {
		if d := prefer[c]; d >= 0 && d < b.Ducts && loads[d].Cables < most && loads[d].Takes(b.IDMM, cableODsMM[c], pulls) {
			put(c, d)
		}
	}
	for _, c := range order {
		if a.DuctOf[c] >= 0 {
			continue
		}
		at := -1
		for d := range loads {
			if loads[d].Takes(b.IDMM, cableODsMM[c], pulls) {
				at = d
				break
			}
		}
		if at < 0 {
			return Assignment{}, false
		}
		put(c, at)
	}
	a.Ducts = make([]Fill, b.Ducts)
	for d := range held {
		a.Ducts[d] = CheckFill(b.IDMM, held[d])
	}
	return a, true
}

// missed is the number of placed cables not in the duct prefer gives them (nil: none).
func missed(a Assignment, prefer []int) int {
	n := 0
	for c, p := range prefer {
		if p >= 0 && a.DuctOf[c] >= 0 && a.DuctOf[c] != p {
			n++
		}
	}
	return n
}
