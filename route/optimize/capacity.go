package optimize

import (
	"math"
	"slices"

	"spanwright/media/install"
)

// NFPA 70 Chapter 9 Table 1: the share of a conduit's internal cross-section that its cables may
// fill (seen), as fractions of the percentages media/install holds.
const (
	FillOneCable   = install.FillOneCablePct / 100      // one cable
	FillTwoCables  = install.FillTwoCablesPct / 100     // two cables
	FillMoreCables = install.FillOverTwoCablesPct / 100 // three or more cables
)

// FillLimit returns the NFPA 70 Chapter 9 Table 1 fill fraction for n cables in one duct
// (install.AllowedFillPct); n <= 1 is one cable.
func FillLimit(n int) float64 { return install.AllowedFillPct(max(n, 1)) / 100 }

// ductPack is the state of first-fit packing of cables into ducts of one diameter, each duct
// taking a cable by install.Load.Takes (fill and the jam check for a third cable), the rule
// the bill's duct fill check packs by. A max segment tree over the ducts' free area finds the
// first duct with room for a cable in O(log ducts), which matters when thousands of cables
// share a duct bank; the duct it finds is then asked Takes, and the search goes on past a duct
// that refuses (a third cable that would jam).
type ductPack struct {
	ductIDMM float64
	areaMM2  float64        // one duct's internal area
	load     []install.Load // per duct: what it holds
	seg      []float64      // seg[1] is the root; leaves seg[size+j] hold duct j's room
	size     int
}

// room is the area duct j has for one more cable by fill alone: an upper bound of what Takes
// allows.
func (p *ductPack) room(j int) float64 {
	return FillLimit(p.load[j].Cables+1)*p.areaMM2 - p.load[j].UsedMM2
}

// reset empties the packing for ducts of internal diameter ductIDMM.
func (p *ductPack) reset(ductIDMM float64) {
	p.ductIDMM, p.areaMM2, p.load = ductIDMM, circleMM2(ductIDMM), p.load[:0]
	for i := range p.seg {
		p.seg[i] = math.Inf(-1)
	}
}

func (p *ductPack) update(j int) {
	i := p.size + j
	p.seg[i] = p.room(j)
	for i /= 2; i >= 1; i /= 2 {
		m := p.seg[2*i]
		if r := p.seg[2*i+1]; r > m {
			m = r
		}
		if p.seg[i] == m {
			break // unchanged here, so unchanged above
		}
		p.seg[i] = m
	}
}

func (p *ductPack) grow() {
	size := max(8, 2*p.size)
	p.seg = make([]float64, 2*size)
	for i := range p.seg {
		p.seg[i] = math.Inf(-1)
	}
	p.size = size
	for j := range p.load {
		p.seg[size+j] = p.room(j)
	}
	for i := size - 1; i >= 1; i-- {
		p.seg[i] = p.seg[2*i]
		if r := p.seg[2*i+1]; r > p.seg[i] {
			p.seg[i] = r
		}
	}
}

func circleMM2(dMM float64) float64 { return install.CableAreaMM2(dMM) }

// first returns the lowest duct index >= from whose room is at least a, or -1; node i of the
// tree covers ducts [lo, hi).
func (p *ductPack) first(i, lo, hi, from int, a float64) int {
	if hi <= from || p.seg[i] < a {
		return -1
	}
	if hi-lo == 1 {
		return lo
	}
	mid := (lo + hi) / 2
	if j := p.first(2*i, lo, mid, from, a); j >= 0 {
		return j
	}
	return p.first(2*i+1, mid, hi, from, a)
}

// place puts a cable of outside diameter odMM into the first duct that takes it
// (install.Load.Takes), opening a new duct when none does; it returns false when the cable
// does not fit even an empty duct.
func (p *ductPack) place(odMM float64) bool {
	const eps = 1e-9 // the tree screens by area; Takes decides
	a := circleMM2(odMM) - eps
	for from := 0; p.size > 0; {
		j := p.first(1, 0, p.size, from, a)
		if j < 0 {
			break
		}
		if p.load[j].Takes(p.ductIDMM, odMM) {
			p.load[j].Add(odMM)
			p.update(j)
			return true
		}
		from = j + 1
	}
	if !(install.Load{}).Takes(p.ductIDMM, odMM) {
		return false
	}
	p.open(odMM)
	return true
}

// open adds a duct holding one cable of outside diameter odMM.
func (p *ductPack) open(odMM float64) {
	var l install.Load
	l.Add(odMM)
	p.load = append(p.load, l)
	if len(p.load) > p.size {
		p.grow()
	} else {
		p.update(len(p.load) - 1)
	}
}

// NFPAFits reports whether cables of the given outside diameters (mm) fit in ducts ducts of
// internal diameter ductIDMM, placing them first-fit in the given order by install.Load.Takes:
// each duct held to the NFPA 70 Chapter 9 Table 1 fill for its cable count (53 % one, 31 % two,
// 40 % three or more), and no third cable that would jam. First-fit in a fixed order is a
// packing rule, not an optimal bin packing: it may use a duct more than the best arrangement
// would. install.DuctBank.Pull places the same cables in the same ducts.
func NFPAFits(ductIDMM float64, cableODsMM []float64, ducts int) bool {
	var p ductPack
	p.reset(ductIDMM)
	for _, od := range cableODsMM {
		if !p.place(od) || len(p.load) > ducts {
			return false
		}
	}
	return true
}

// capacity computes, for capacity-limited edges, how many ducts a set of cables needs.
type capacity struct {
	edges []Edge
	fits  FitsFunc // nil: the NFPA first-fit rule, computed in one pass
	pack  ductPack // scratch for prefixNeeds and allowedArea
	needs []int    // prefixNeeds' result, reused
}

// needed returns how many ducts must be added to edge e for cables of the given ODs, pulled
// in that order: the ducts added are never removed, so it is the most any prefix of the pull
// needs. ok is false when the cables cannot all be pulled (a cable wider than a duct allows,
// or full ducts on an edge where none can be added).
// With the default rule, pack (if non-nil) receives the packing.
func (c *capacity) needed(e int, ods []float64, pack *ductPack) (added int, ok bool) {
	ed := &c.edges[e]
	maxAdd := 0
	if ed.AddDuctPerMCents > 0 {
		maxAdd = len(ods)
	}
	if c.fits == nil {
		var local ductPack
		p := &local
		if pack != nil {
			p = pack
		}
		p.reset(ed.DuctIDMM)
		for _, od := range ods {
			if od <= 0 {
				continue
			}
			if !p.place(od) {
				return 0, false
			}
		}
		added = max(0, len(p.load)-ed.Ducts)
		return added, added <= maxAdd
	}
	for i := range ods {
		for !c.fits(e, ods[:i+1], ed.Ducts+added) {
			added++
			if added > maxAdd {
				return 0, false
			}
		}
	}
	return added, true
}

// extend is needed for the default rule when the cables are those of packing from (all of
// which fit) followed by more, pulled last: it copies from into to and places the more there.
// total is the number of cables in all.
func (c *capacity) extend(e int, from *packState, to *ductPack, more []float64, total int) (added int, ok bool) {
	ed := &c.edges[e]
	to.ductIDMM, to.areaMM2 = ed.DuctIDMM, circleMM2(ed.DuctIDMM)
	to.load = append(to.load[:0], from.load...)
	to.seg = append(to.seg[:0], from.seg...)
	to.size = from.size
	for _, od := range more {
		if od <= 0 {
			continue
		}
		if !to.place(od) {
			return 0, false
		}
	}
	maxAdd := 0
	if ed.AddDuctPerMCents > 0 {
		maxAdd = total
	}
	added = max(0, len(to.load)-ed.Ducts)
	return added, added <= maxAdd
}

// prefixNeeds returns, for each i, the ducts needed(e, ods[:i+1]) adds, or the value for
// the previous prefix when that prefix cannot be pulled. The default rule packs first-fit
// online, so one pass gives every prefix (a custom Fits is asked prefix by prefix).
func (c *capacity) prefixNeeds(e int, ods []float64) []int {
	out := slices.Grow(c.needs[:0], len(ods))[:len(ods)]
	c.needs = out
	prev := 0
	if c.fits != nil {
		for i := range ods {
			if k, ok := c.needed(e, ods[:i+1], nil); ok {
				prev = k
			}
			out[i] = prev
		}
		return out
	}
	ed := &c.edges[e]
	p := &c.pack
	p.reset(ed.DuctIDMM)
	failed := false
	for i, od := range ods {
		if !failed && od > 0 && !p.place(od) {
			failed = true // this prefix and every longer one cannot be pulled
		}
		if !failed {
			maxAdd := 0
			if ed.AddDuctPerMCents > 0 {
				maxAdd = i + 1
			}
			if added := max(0, len(p.load)-ed.Ducts); added <= maxAdd {
				prev = added
			}
		}
		out[i] = prev
	}
	return out
}

// allowedArea returns the cables' area and the NFPA area allowed in the ducts they occupy,
// packing first-fit in order, in mm².
func (c *capacity) allowedArea(ductIDMM float64, ods []float64) (usedMM2, allowedMM2 float64) {
	p := &c.pack
	p.reset(ductIDMM)
	for _, od := range ods {
		usedMM2 += circleMM2(od)
		if od > 0 && !p.place(od) {
			p.open(od) // too wide for any duct: counted as its own
		}
	}
	for _, l := range p.load {
		allowedMM2 += FillLimit(l.Cables) * p.areaMM2
	}
	return usedMM2, allowedMM2
}

// NFPAFitsFor returns the FitsFunc Solve uses when Problem.Fits is nil: NFPAFits with each
// edge's DuctIDMM, for callers that wrap or compare with the default rule.
func NFPAFitsFor(edges []Edge) FitsFunc {
	return func(edge int, cableODsMM []float64, ducts int) bool {
		return NFPAFits(edges[edge].DuctIDMM, cableODsMM, ducts)
	}
}
