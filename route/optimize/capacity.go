package optimize

import (
	"math"
	"slices"

	"spanwright/media/install"
)

// FillOneCable is the share of a conduit's internal cross-section one cable may fill, NFPA 70
// Chapter 9 Table 1 (seen), as a fraction of the percentage media/install holds.
const FillOneCable = install.FillOneCablePct / 100

// FillLimit returns the NFPA 70 Chapter 9 Table 1 fill fraction for n cables in one duct
// (install.AllowedFillPct); n <= 1 is one cable.
func FillLimit(n int) float64 { return install.AllowedFillPct(max(n, 1)) / 100 }

// ductPack is the state of first-fit packing of cables into ducts of one diameter, each duct
// taking a cable by install.Load.Takes (fill, the jam check for a third cable, and the count
// of pulls: Edge.PullLimit, the plan's design.cables_per_duct loose cables a duct, no count
// for innerducts or a plan of fill alone), the rule
// the bill's duct fill check packs by. A max segment tree over the ducts' free area finds the
// first duct with room for a cable in O(log ducts), which matters when thousands of cables
// share a duct bank; a duct at its count of pulls has no room in it. A duct that may jam a
// third cable (install.Load.MayJam: two cables of one size) is kept out of the tree in a group
// of the ducts holding the same two cables: they are alike, so one Takes answers for the group
// and its lowest duct is the one first fit would try. Placing a cable is then O(log ducts + groups), however many ducts hold a pair
// that refuses it (innerducts of one size, two to a duct, on a trunk).
type ductPack struct {
	ductIDMM float64
	most     int            // the count of pulls a duct (Edge.PullLimit); 0: none
	areaMM2  float64        // one duct's internal area
	load     []install.Load // per duct: what it holds
	seg      []float64      // seg[1] is the root; leaves seg[size+j] hold duct j's room
	size     int
	twos     []twoGroup // the ducts that may jam a third cable, by the two cables they hold
}

// twoGroup is the ducts holding the same two cables of one size (install.Load.MayJam).
type twoGroup struct {
	load  install.Load // what each of them holds
	ducts []int32      // a min-heap of their indices
}

// room is the area duct j has for one more cable by fill alone (an upper bound of what Takes
// allows), or -Inf for a duct at its count of pulls (Takes refuses it any cable) and for a
// duct that may jam a third cable: those are found through p.twos.
func (p *ductPack) room(j int) float64 {
	l := &p.load[j]
	if l.Cables == 2 && l.MayJam() {
		return math.Inf(-1)
	}
	return p.roomOf(l)
}

// roomOf is the area a duct holding l has for one more cable by fill alone, or -Inf at its
// count of pulls (Edge.PullLimit, which Takes keeps to).
func (p *ductPack) roomOf(l *install.Load) float64 {
	if p.most > 0 && l.Cables >= p.most {
		return math.Inf(-1)
	}
	return FillLimit(l.Cables+1)*p.areaMM2 - l.UsedMM2
}

// maxRoom is the most area any duct has for one more cable by fill alone; -Inf with no duct.
func (p *ductPack) maxRoom() float64 {
	m := math.Inf(-1)
	if p.size > 0 {
		m = p.seg[1]
	}
	for i := range p.twos {
		if g := &p.twos[i]; len(g.ducts) > 0 {
			m = max(m, p.roomOf(&g.load))
		}
	}
	return m
}

// reset empties the packing for ducts of internal diameter ductIDMM, each taking at most most
// cables (Edge.PullLimit; 0: no count).
func (p *ductPack) reset(ductIDMM float64, most int) {
	p.ductIDMM, p.most, p.areaMM2, p.load, p.twos = ductIDMM, most, circleMM2(ductIDMM), p.load[:0], p.twos[:0]
	for i := range p.seg {
		p.seg[i] = math.Inf(-1)
	}
}

// copyFrom makes p the packing saved in s, for the ducts of edge e.
func (p *ductPack) copyFrom(s *packState, e *Edge) {
	p.ductIDMM, p.most, p.areaMM2 = e.DuctIDMM, e.PullLimit(), circleMM2(e.DuctIDMM)
	p.copyParts(s.load, s.seg, s.size, s.twos)
}

// copyOf makes p a copy of packing q.
func (p *ductPack) copyOf(q *ductPack) {
	p.ductIDMM, p.most, p.areaMM2 = q.ductIDMM, q.most, q.areaMM2
	p.copyParts(q.load, q.seg, q.size, q.twos)
}

// copyParts makes p's loads, segment tree and groups of two copies of those given, reusing
// p's storage.
func (p *ductPack) copyParts(load []install.Load, seg []float64, size int, twos []twoGroup) {
	p.load = append(p.load[:0], load...)
	p.seg = append(p.seg[:0], seg...)
	p.size = size
	p.twos = slices.Grow(p.twos[:0], len(twos))[:len(twos)]
	for i := range twos {
		p.twos[i].load = twos[i].load
		p.twos[i].ducts = append(p.twos[i].ducts[:0], twos[i].ducts...)
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

// firstFrom returns the lowest duct index >= from whose room is at least a, or -1.
func (p *ductPack) firstFrom(from int, a float64) int {
	if from > 0 {
		return p.first(1, 0, p.size, from, a)
	}
	if p.seg[1] < a {
		return -1
	}
	i := 1
	for i < p.size {
		if p.seg[2*i] >= a {
			i = 2 * i
		} else {
			i = 2*i + 1
		}
	}
	return i - p.size
}

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
	best, group := -1, -1
	for from := 0; p.size > 0; {
		j := p.firstFrom(from, a)
		if j < 0 {
			break
		}
		if p.load[j].Takes(p.ductIDMM, odMM, p.most) {
			best = j
			break
		}
		from = j + 1 // refused at the rounding edge of its fill
	}
	for i := range p.twos {
		g := &p.twos[i]
		if len(g.ducts) > 0 && (best < 0 || int(g.ducts[0]) < best) && g.load.Takes(p.ductIDMM, odMM, p.most) {
			best, group = int(g.ducts[0]), i
		}
	}
	if best < 0 {
		if !(install.Load{}).Takes(p.ductIDMM, odMM, p.most) {
			return false
		}
		p.open(odMM)
		return true
	}
	if group >= 0 {
		heapPop(&p.twos[group].ducts)
	}
	p.load[best].Add(odMM)
	p.joinTwos(best)
	p.update(best)
	return true
}

// joinTwos puts duct j into the group of its two cables when it may jam a third.
func (p *ductPack) joinTwos(j int) {
	l := &p.load[j]
	if l.Cables != 2 || !l.MayJam() {
		return
	}
	for i := range p.twos {
		if p.twos[i].load == *l {
			heapPush(&p.twos[i].ducts, int32(j))
			return
		}
	}
	if len(p.twos) < cap(p.twos) {
		p.twos = p.twos[:len(p.twos)+1] // reuse the element's heap
	} else {
		p.twos = append(p.twos, twoGroup{})
	}
	g := &p.twos[len(p.twos)-1]
	g.load, g.ducts = *l, append(g.ducts[:0], int32(j))
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

// heapPush adds j to the min-heap h.
func heapPush(h *[]int32, j int32) {
	*h = append(*h, j)
	s := *h
	for i := len(s) - 1; i > 0; {
		up := (i - 1) / 2
		if s[up] <= s[i] {
			break
		}
		s[up], s[i] = s[i], s[up]
		i = up
	}
}

// heapPop removes the least element of the min-heap h.
func heapPop(h *[]int32) {
	s := *h
	n := len(s) - 1
	s[0] = s[n]
	s = s[:n]
	for i := 0; ; {
		l, m := 2*i+1, i
		if l < n && s[l] < s[m] {
			m = l
		}
		if r := l + 1; r < n && s[r] < s[m] {
			m = r
		}
		if m == i {
			break
		}
		s[i], s[m] = s[m], s[i]
		i = m
	}
	*h = s
}

// NFPAFits reports whether cables of the given outside diameters (mm) fit in ducts ducts of
// internal diameter ductIDMM, placing them first-fit in the given order by install.Load.Takes:
// each duct held to the NFPA 70 Chapter 9 Table 1 fill for its cable count (53 % one, 31 % two,
// 40 % three or more), no third cable that would jam, and at most most cables to a duct (the
// count of pulls, Edge.PullLimit: the plan's design.cables_per_duct loose cables, one pull
// each, common practice, no published source; 0: no count). First-fit in a fixed order is a packing rule, not an optimal bin
// packing: it may use a duct more than the best arrangement would. install.DuctBank.Pull
// places the same cables in the same ducts.
func NFPAFits(ductIDMM float64, cableODsMM []float64, ducts int, most int) bool {
	var p ductPack
	p.reset(ductIDMM, most)
	for _, od := range cableODsMM {
		if !p.place(od) || len(p.load) > ducts {
			return false
		}
	}
	return true
}

// capacity computes, for capacity-limited edges, how many ducts a set of cables needs. The
// cables come as parallel slices: ods[i] the outside diameter of the i-th demand's cables and
// cnt[i] how many of them it pulls (Option.Cables; cnt nil: one each), placed one after the
// other.
type capacity struct {
	edges []Edge
	fits  FitsFunc // nil: the NFPA first-fit rule, computed in one pass
	pack  ductPack // scratch for prefixNeeds and allowedArea
	needs []int    // prefixNeeds' result, reused
	flat  []float64
}

// countAt is cnt[i], or 1 without counts.
func countAt(cnt []int32, i int) int {
	if cnt == nil {
		return 1
	}
	return int(cnt[i])
}

// flatten lists each cable of ods and cnt once, in order (for a FitsFunc), in c.flat.
func (c *capacity) flatten(ods []float64, cnt []int32) []float64 {
	c.flat = c.flat[:0]
	for i, od := range ods {
		for range countAt(cnt, i) {
			c.flat = append(c.flat, od)
		}
	}
	return c.flat
}

// placeAll places the cables of ods and cnt into p in order; false when one fits no duct.
func placeAll(p *ductPack, ods []float64, cnt []int32) bool {
	for i, od := range ods {
		if od <= 0 {
			continue
		}
		for range countAt(cnt, i) {
			if !p.place(od) {
				return false
			}
		}
	}
	return true
}

// needed returns how many ducts must be added to edge e for the cables of ods and cnt,
// pulled in that order: the ducts added are never removed, so it is the most any prefix of
// the pull needs. ok is false when the cables cannot all be pulled (a cable wider than a duct
// allows, or full ducts on an edge where none can be added).
// With the default rule, pack (if non-nil) receives the packing.
func (c *capacity) needed(e int, ods []float64, cnt []int32, pack *ductPack) (added int, ok bool) {
	ed := &c.edges[e]
	if c.fits == nil {
		var local ductPack
		p := &local
		if pack != nil {
			p = pack
		}
		p.reset(ed.DuctIDMM, ed.PullLimit())
		if !placeAll(p, ods, cnt) {
			return 0, false
		}
		return ed.addedFor(len(p.load))
	}
	flat := c.flatten(ods, cnt)
	maxAdd := 0
	if ed.canAdd() {
		maxAdd = len(flat) // each added duct holds at least one cable
	}
	for i := range flat {
		for !c.fits(e, flat[:i+1], ed.Ducts+added) {
			added++
			if added > maxAdd {
				return 0, false
			}
		}
	}
	return added, true
}

// extend is needed for the default rule when the cables are those of packing from (all of
// which fit) followed by more (with their counts), pulled last: it copies from into to and
// places the more there.
func (c *capacity) extend(e int, from *packState, to *ductPack, more []float64, moreCnt []int32) (added int, ok bool) {
	ed := &c.edges[e]
	to.copyFrom(from, ed)
	if !placeAll(to, more, moreCnt) {
		return 0, false
	}
	return ed.addedFor(len(to.load))
}

// prefixNeeds returns, for each i, the ducts needed(e, ods[:i+1], cnt[:i+1]) adds, or the
// value for the previous prefix when that prefix cannot be pulled. The default rule packs
// first-fit online, so one pass gives every prefix (a custom Fits is asked prefix by prefix).
func (c *capacity) prefixNeeds(e int, ods []float64, cnt []int32) []int {
	out := slices.Grow(c.needs[:0], len(ods))[:len(ods)]
	c.needs = out
	prev := 0
	if c.fits != nil {
		for i := range ods {
			var sub []int32
			if cnt != nil {
				sub = cnt[:i+1]
			}
			if k, ok := c.needed(e, ods[:i+1], sub, nil); ok {
				prev = k
			}
			out[i] = prev
		}
		return out
	}
	ed := &c.edges[e]
	p := &c.pack
	p.reset(ed.DuctIDMM, ed.PullLimit())
	failed := false
	for i, od := range ods {
		for range countAt(cnt, i) {
			if !failed && od > 0 && !p.place(od) {
				failed = true // this prefix and every longer one cannot be pulled
			}
		}
		if !failed {
			if added, ok := ed.addedFor(len(p.load)); ok {
				prev = added
			}
		}
		out[i] = prev
	}
	return out
}

// allowedArea returns the cables' area and the NFPA area allowed in the ducts they occupy,
// packing first-fit in order on edge ed (install.Load.Takes), in mm².
func (c *capacity) allowedArea(ed *Edge, ods []float64, cnt []int32) (usedMM2, allowedMM2 float64) {
	p := &c.pack
	p.reset(ed.DuctIDMM, ed.PullLimit())
	for i, od := range ods {
		for range countAt(cnt, i) {
			usedMM2 += circleMM2(od)
			if od > 0 && !p.place(od) {
				p.open(od) // too wide for any duct: counted as its own
			}
		}
	}
	for _, l := range p.load {
		allowedMM2 += FillLimit(l.Cables) * p.areaMM2
	}
	return usedMM2, allowedMM2
}

// NFPAFitsFor returns the FitsFunc Solve uses when Problem.Fits is nil: NFPAFits with each
// edge's DuctIDMM and PullLimit, for callers that wrap or compare with the default rule.
func NFPAFitsFor(edges []Edge) FitsFunc {
	return func(edge int, cableODsMM []float64, ducts int) bool {
		return NFPAFits(edges[edge].DuctIDMM, cableODsMM, ducts, edges[edge].PullLimit())
	}
}
