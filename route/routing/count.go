package routing

import (
	"spanwright/media/install"
	"spanwright/route/optimize"
)

// ForCount is what the count of pulls (design.cables_per_duct, install.PullLimit) lays along
// one span beyond what the NFPA 70 Chapter 9 Table 1 fill and the jam band alone would, on the
// plan's own routes: the same cables in the same order packed first fit (install.DuctBank.Pull,
// as the optimizer packs them) with the design's count and with none, each priced as the
// optimizer's objective prices added ducts (optimize.Edge.AddedCents). It is exact for these
// routes; with fill alone the optimizer might have chosen other routes, which it does not say.
type ForCount struct {
	// Ducts is the ducts laid for the count: Edge.LaidDucts with the count less without it
	// (beside an existing bank, all of them when the fill alone needs no trench there).
	Ducts int
	// Trench is true on an existing duct span where the count alone makes the plan lay a
	// trench or bore beside the full ducts: the fill alone would need none.
	Trench bool
	// Cents is what they cost: Edge.AddedCents with the count less without it.
	Cents int64
}

// forCount is ForCount of edge fill f: zero on an unlimited edge, for innerducts and on a
// design of fill alone (no count: both packings are one).
func forCount(prob *optimize.Problem, sol *optimize.Solution, f *optimize.EdgeFill) ForCount {
	ed := &prob.Edges[f.Edge]
	if !f.Limited || ed.PullLimit() == 0 {
		return ForCount{}
	}
	var ods []float64 // each cable of each demand, in the fill's order
	for _, d := range f.Demands {
		r := &sol.Routes[d]
		if r.Option < 0 {
			continue
		}
		op := &prob.Demands[d].Options[r.Option]
		if op.CableODMM <= 0 {
			continue // a cable of no diameter takes no duct (the optimizer's placeAll)
		}
		for range max(op.Cables, 1) {
			ods = append(ods, op.CableODMM)
		}
	}
	added := func(perDuct int) int {
		b := install.DuctBank{Ducts: min(ed.Ducts+len(ods), install.MaxBankDucts), IDMM: ed.DuctIDMM, Innerduct: ed.Innerduct, CablesPerDuct: perDuct}
		a := b.Pull(ods)
		used := 0
		for d, df := range a.Ducts {
			if len(df.CablesODMM) > 0 {
				used = d + 1
			}
		}
		if !ed.MayAddDucts() {
			return 0 // no duct may be added here: the plan lays none, with or without the count
		}
		return max(0, used-ed.Ducts)
	}
	withCount, fillAlone := added(ed.CablesPerDuct), added(0)
	out := ForCount{
		Ducts: max(0, ed.LaidDucts(withCount)-ed.LaidDucts(fillAlone)),
		Cents: max(0, ed.AddedCents(withCount)-ed.AddedCents(fillAlone)),
	}
	out.Trench = !ed.Proposed && withCount > 0 && fillAlone == 0
	return out
}
