package install

import (
	"math"
	"slices"
)

// Spread is which cable goes in which duct of the bank, as the bill shows it and the crew
// pulls it. Pull's first fit decides which cables are placed and how many ducts they need (the
// optimizer's count, which it priced): Spread places exactly those cables and leaves the others
// unplaced, in the bank's ducts, never needing another.
//
// First fit puts a cable into the first duct whose fill takes it, so a duct of a bank with
// spare ducts can be given more cables than a sound set of pulls (Crowded) while the next spare
// duct stays empty. Spread also packs with a cap: each cable goes into the lowest-numbered duct
// holding fewer than SeparateCablesPerDuct cables whose Load takes it (Load.Takes, NFPA 70
// Chapter 9 Table 1 fill and the jam band), and only when none does into the duct holding the
// fewest cables that takes it (the lowest-numbered of those).
//
// prefer (nil, or one entry per cable) gives each cable the duct it holds on the span it comes
// from, -1 for none: a cable carried on keeps its duct, placed before the others, where that
// duct takes it and holds fewer than SeparateCablesPerDuct cables (or an even share of the
// cables over the ducts, when that is more), or in a second packing with no such limit. The
// capped packing is tried with the preferences so limited, unlimited, and without them, each in
// pull order and largest first (a large cable may need a duct of its own). Of first fit and
// these, Spread keeps the packing that places every cable first fit placed with the fewest
// cables over the sound-pull count in all, then the fewest cables out of their preferred duct;
// first fit, then the order above, wins a tie. So no duct of the bank is given more than
// SeparateCablesPerDuct loose cables while another stays empty whenever a capped packing finds
// room for all of them, and a bank first fit does not crowd, whose cables keep the ducts they
// come from, is packed first fit. Cables each in an innerduct of their own (innerduct) are
// never crowded: they are packed first fit, but for those that keep the duct they come from.
//
// Every duct is within fill and free of jam risk after every placement, its cables listed in
// the order placed (the order to pull them in; Assignment.Cables names them). The ducts are
// numbered as Pull numbers them, so the lowest (the existing spare ducts, before any the plan
// adds) fill first. The packing depends only on the cables' diameters in the order given, the
// preferences and the bank. Invalid input gives Pull's answer (OK false, a non-nil Err); it
// panics only on a prefer of another length than the cables (a programmer's error). Time
// O(n·Ducts) for n cables.
func (b DuctBank) Spread(cableODsMM []float64, innerduct bool, prefer []int) Assignment {
	ff := b.Pull(cableODsMM)
	if ff.Err != nil {
		return ff
	}
	if prefer != nil && len(prefer) != len(cableODsMM) {
		panic("install: Spread: prefer must have one entry per cable")
	}
	// over counts the cables beyond a sound set of pulls; an innerduct is never crowded, and
	// the other cables of an innerduct plan go first fit (no cap).
	over, capAt := overSoundPull, SeparateCablesPerDuct
	if innerduct {
		over, capAt = func([]Fill) int { return 0 }, math.MaxInt
	}
	best, bestOver, bestMissed := ff, over(ff.Ducts), missed(ff, prefer)
	if bestOver == 0 && bestMissed == 0 {
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
	// (or an even share of the cables, when that is more), or while it takes it at all; or
	// the cables take no preference.
	share := max(SeparateCablesPerDuct, (len(placed)+b.Ducts-1)/max(b.Ducts, 1))
	// No packing has fewer cables over the count than those beyond SeparateCablesPerDuct in
	// every duct: one that reaches it with every preference kept ends the search.
	least := over(nil)
	if !innerduct {
		least = max(0, len(placed)-SeparateCablesPerDuct*b.Ducts)
	}
	for _, most := range []int{share, math.MaxInt, 0} {
		if bestOver == least && bestMissed == 0 {
			break
		}
		pref := prefer
		if most == 0 {
			pref = nil
		} else if prefer == nil {
			continue
		}
		for _, order := range [][]int{placed, largest} {
			a, ok := b.capped(cableODsMM, order, pref, most, capAt)
			if !ok {
				continue
			}
			if o, miss := over(a.Ducts), missed(a, prefer); o < bestOver || o == bestOver && miss < bestMissed {
				best, bestOver, bestMissed = a, o, miss
			}
		}
	}
	best.Unplaced, best.OK = ff.Unplaced, ff.OK
	return best
}

// capped packs the cables of the given indices, in that order, each into the lowest duct
// holding fewer than capAt cables that takes it, or else into the duct holding the fewest that
// takes it; first, those with a preferred duct (prefer, nil for none) that takes them and holds
// fewer than most cables go into it. ok is false when a cable fits no duct. Cables not in order are left unplaced (DuctOf -1). The bank and the cables are
// valid (Pull checked them).
func (b DuctBank) capped(cableODsMM []float64, order []int, prefer []int, most, capAt int) (a Assignment, ok bool) {
	a.DuctOf = make([]int, len(cableODsMM))
	for i := range a.DuctOf {
		a.DuctOf[i] = -1
	}
	held := make([][]float64, b.Ducts)
	a.Cables = make([][]int, b.Ducts)
	loads := make([]Load, b.Ducts)
	put := func(c, d int) {
		held[d] = append(held[d], cableODsMM[c])
		a.Cables[d] = append(a.Cables[d], c)
		loads[d].Add(cableODsMM[c])
		a.DuctOf[c] = d
	}
	if prefer != nil {
		for _, c := range order {
			if d := prefer[c]; d >= 0 && d < b.Ducts && loads[d].Cables < most && loads[d].Takes(b.IDMM, cableODsMM[c]) {
				put(c, d)
			}
		}
	}
	for _, c := range order {
		if a.DuctOf[c] >= 0 {
			continue
		}
		od := cableODsMM[c]
		best := -1
		for d := range loads {
			if !loads[d].Takes(b.IDMM, od) {
				continue
			}
			if loads[d].Cables < capAt {
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
		put(c, best)
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
