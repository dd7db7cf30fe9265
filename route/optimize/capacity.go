package optimize

import (
	"math"
	"slices"
)

// NFPA 70 Chapter 9 Table 1: the share of a conduit's internal cross-section that its cables may
// fill (seen).
const (
	FillOneCable   = 0.53 // one cable
	FillTwoCables  = 0.31 // two cables
	FillMoreCables = 0.40 // three or more cables
)

// FillLimit returns the NFPA 70 Chapter 9 Table 1 fill fraction for n cables in one duct.
func FillLimit(n int) float64 {
	switch {
	case n <= 1:
		return FillOneCable
	case n == 2:
		return FillTwoCables
	}
	return FillMoreCables
}

// ductPack is the state of first-fit packing of cables into ducts of one diameter. A max
// segment tree over the ducts' free room finds the first duct that takes a cable in
// O(log ducts), which matters when thousands of cables share a duct bank.
type ductPack struct {
	areaMM2 float64   // one duct's internal area
	count   []int     // cables per duct
	used    []float64 // cable area per duct, mm²
	seg     []float64 // seg[1] is the root; leaves seg[size+j] hold duct j's room
	size    int
}

func (p *ductPack) room(j int) float64 { return FillLimit(p.count[j]+1)*p.areaMM2 - p.used[j] }

// reset empties the packing for ducts of area areaMM2.
func (p *ductPack) reset(areaMM2 float64) {
	p.areaMM2, p.count, p.used = areaMM2, p.count[:0], p.used[:0]
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
	for j := range p.count {
		p.seg[size+j] = p.room(j)
	}
	for i := size - 1; i >= 1; i-- {
		p.seg[i] = p.seg[2*i]
		if r := p.seg[2*i+1]; r > p.seg[i] {
			p.seg[i] = r
		}
	}
}

func circleMM2(dMM float64) float64 { return math.Pi / 4 * dMM * dMM }

// place puts a cable of area a into the first duct that stays within FillLimit, opening a new
// duct when none does; it returns false when the cable does not fit even an empty duct.
func (p *ductPack) place(a float64) bool {
	const eps = 1e-9
	if p.size > 0 && p.seg[1]+eps >= a {
		i := 1
		for i < p.size {
			if p.seg[2*i]+eps >= a {
				i = 2 * i
			} else {
				i = 2*i + 1
			}
		}
		j := i - p.size
		p.count[j]++
		p.used[j] += a
		p.update(j)
		return true
	}
	if a > FillOneCable*p.areaMM2+eps {
		return false
	}
	p.count = append(p.count, 1)
	p.used = append(p.used, a)
	if len(p.count) > p.size {
		p.grow()
	} else {
		p.update(len(p.count) - 1)
	}
	return true
}

// NFPAFits reports whether cables of the given outside diameters (mm) fit in ducts ducts of
// internal diameter ductIDMM, placing them first-fit in the given order and holding each duct to
// the NFPA 70 Chapter 9 Table 1 fill for its cable count (53 % one, 31 % two, 40 % three or more).
// First-fit in a fixed order is a packing rule, not an optimal bin packing: it may use a duct
// more than the best arrangement would.
func NFPAFits(ductIDMM float64, cableODsMM []float64, ducts int) bool {
	var p ductPack
	p.reset(circleMM2(ductIDMM))
	for _, od := range cableODsMM {
		if !p.place(circleMM2(od)) || len(p.count) > ducts {
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
		p.reset(circleMM2(ed.DuctIDMM))
		for _, od := range ods {
			if od <= 0 {
				continue
			}
			if !p.place(math.Pi / 4 * od * od) {
				return 0, false
			}
		}
		added = max(0, len(p.count)-ed.Ducts)
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
	to.count = append(to.count[:0], from.count...)
	to.used = append(to.used[:0], from.used...)
	to.seg = append(to.seg[:0], from.seg...)
	to.size = from.size
	for _, od := range more {
		if od <= 0 {
			continue
		}
		if !to.place(math.Pi / 4 * od * od) {
			return 0, false
		}
	}
	maxAdd := 0
	if ed.AddDuctPerMCents > 0 {
		maxAdd = total
	}
	added = max(0, len(to.count)-ed.Ducts)
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
	p.reset(circleMM2(ed.DuctIDMM))
	failed := false
	for i, od := range ods {
		if !failed && od > 0 && !p.place(math.Pi/4*od*od) {
			failed = true // this prefix and every longer one cannot be pulled
		}
		if !failed {
			maxAdd := 0
			if ed.AddDuctPerMCents > 0 {
				maxAdd = i + 1
			}
			if added := max(0, len(p.count)-ed.Ducts); added <= maxAdd {
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
	p.reset(circleMM2(ductIDMM))
	for _, od := range ods {
		a := circleMM2(od)
		usedMM2 += a
		if od > 0 && !p.place(a) {
			p.count = append(p.count, 1) // too wide for any duct: counted as its own
			p.used = append(p.used, a)
			if len(p.count) > p.size {
				p.grow()
			} else {
				p.update(len(p.count) - 1)
			}
		}
	}
	for _, n := range p.count {
		allowedMM2 += FillLimit(n) * p.areaMM2
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
