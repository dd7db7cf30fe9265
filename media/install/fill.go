package install

import (
	"fmt"
	"math"
	"slices"
	"sort"
)

// Maximum duct fill, in percent of the duct's internal cross-section area, from NFPA 70
// Chapter 9 Table 1 (seen).
const (
	FillOneCablePct      = 53.0 // one cable
	FillTwoCablesPct     = 31.0 // two cables
	FillOverTwoCablesPct = 40.0 // three or more cables
)

// Jam check for three cables in one duct. NFPA 70 Chapter 9 Table 1, Informational Note
// No. 2 (seen): three cables whose duct-ID-to-cable-OD ratio lies between 2.8 and 3.2 can jam,
// one cable wedging between the other two. Many pulling guides first multiply D/d by 1.05
// because a duct goes oval in a bend (common practice, no published source).
const (
	JamRatioLowest  = 2.8  // lowest jam-prone 1.05·D/d, inclusive
	JamRatioHighest = 3.2  // highest jam-prone 1.05·D/d, inclusive
	JamBendFactor   = 1.05 // ovality allowance on D/d
	// JamEqualODTol is the largest relative spread (max−min)/max of the three cable ODs for
	// which they count as of equal diameter and the jam check applies (common practice, no
	// published source).
	JamEqualODTol = 0.05
)

// AllowedFillPct is the largest share of a duct's internal area, in percent, that cables may
// fill when the duct holds the given number of cables (NFPA 70 Chapter 9 Table 1): 53 for one,
// 31 for two, 40 for more. It is 0 for cables < 1.
func AllowedFillPct(cables int) float64 {
	switch {
	case cables < 1:
		return 0
	case cables == 1:
		return FillOneCablePct
	case cables == 2:
		return FillTwoCablesPct
	}
	return FillOverTwoCablesPct
}

// DuctAreaMM2 is the internal cross-section area, in mm², of a duct of internal diameter idMM
// (mm): π/4·ID².
func DuctAreaMM2(idMM float64) float64 { return math.Pi / 4 * idMM * idMM }

// CableAreaMM2 is the cross-section area, in mm², of a round cable of outside diameter odMM
// (mm): π/4·OD².
func CableAreaMM2(odMM float64) float64 { return math.Pi / 4 * odMM * odMM }

// Fill is the fill check of one duct.
type Fill struct {
	DuctIDMM   float64   // duct internal diameter, mm
	CablesODMM []float64 // outside diameter of each cable in the duct, mm
	UsedMM2    float64   // total cable cross-section area, mm²
	AllowedMM2 float64   // AllowedPct of the duct's internal area, mm²
	Pct        float64   // UsedMM2 as a percentage of the duct's internal area
	AllowedPct float64   // AllowedFillPct(len(CablesODMM))
	OK         bool      // inputs valid and UsedMM2 <= AllowedMM2 (an empty duct is OK)
	// JamRisk is true for exactly three cables of equal diameter (within JamEqualODTol) whose
	// JamRatio lies in [JamRatioLowest, JamRatioHighest]. It does not clear OK: the caller decides.
	JamRisk bool
	// JamRatio is JamBendFactor × DuctIDMM / mean cable OD when the jam check applies (three
	// cables of equal diameter), and 0 otherwise.
	JamRatio float64
	// Err is non-nil, and OK false, when the duct ID or a cable OD is not a finite number > 0;
	// it is an ErrorList of *InputError.
	Err error
}

// CheckFill checks cables of the given outside diameters (mm) in one duct of internal diameter
// ductIDMM (mm) against NFPA 70 Chapter 9 Table 1, and the jam ratio for three equal cables.
// Invalid input gives OK false and a non-nil Err; it never panics.
func CheckFill(ductIDMM float64, cableODsMM []float64) Fill {
	f := Fill{DuctIDMM: ductIDMM, CablesODMM: append([]float64(nil), cableODsMM...)}
	var errs ErrorList
	errs.checkPos("", 0, "ductIDMM", ductIDMM)
	for i, od := range cableODsMM {
		errs.checkPos("cable", i, "odMM", od)
	}
	if f.Err = errs.Err(); f.Err != nil {
		return f
	}
	for _, od := range cableODsMM {
		f.UsedMM2 += CableAreaMM2(od)
	}
	area := DuctAreaMM2(ductIDMM)
	f.AllowedPct = AllowedFillPct(len(cableODsMM))
	f.AllowedMM2 = f.AllowedPct / 100 * area
	f.Pct = f.UsedMM2 / area * 100
	f.OK = f.UsedMM2 <= f.AllowedMM2
	if len(cableODsMM) == 3 {
		f.JamRatio, f.JamRisk = Jam(ductIDMM, cableODsMM[0], cableODsMM[1], cableODsMM[2])
	}
	return f
}

// Jam returns the jam ratio JamBendFactor·ductIDMM/mean OD of three cables of outside
// diameters a, b and c (mm) in one duct of internal diameter ductIDMM (mm), and whether it lies
// in [JamRatioLowest, JamRatioHighest]. The check applies only to cables of equal diameter
// (spread within JamEqualODTol); otherwise it returns 0, false.
func Jam(ductIDMM, a, b, c float64) (ratio float64, risk bool) {
	lo, hi := math.Min(a, math.Min(b, c)), math.Max(a, math.Max(b, c))
	if (hi-lo)/hi > JamEqualODTol {
		return 0, false
	}
	ratio = JamBendFactor * ductIDMM / ((a + b + c) / 3)
	return ratio, ratio >= JamRatioLowest && ratio <= JamRatioHighest
}

// JamTolerancePct is how near, in per cent of a duct's inside diameter, another diameter may
// be and still be taken for the same duct when a jam verdict is checked for a flip (JamEdge):
// the inside diameters of rigid PVC conduit of one trade size differ by 4.9 to 6.0 % between
// Schedule 40 and Schedule 80 from trade size 78 to 155 (NFPA 70 Chapter 9 Table 4, seen in a
// secondary copy), and a duct_mm that names the size but not the wall, or a round
// nominal such as 100, is uncertain by that much; it is also the size of JamBendFactor's
// allowance itself. A modelling choice.
const JamTolerancePct = 5.0

// JamEdge is the inside diameter, in mm, nearest ductIDMM and within tolPct per cent of it, at
// which three cables of outside diameter odMM would get the other jam verdict than in a duct
// of ductIDMM (the 1.05·D/d of an edge of the band, JamRatioLowest or JamRatioHighest), and
// whether there is one. A duct of the edge's diameter itself is in the band (inclusive): the
// other verdict lies just beyond the edge, seen from ductIDMM. It is 0, false for invalid input.
func JamEdge(ductIDMM, odMM, tolPct float64) (edgeMM float64, ok bool) {
	if !finite(ductIDMM) || ductIDMM <= 0 || !finite(odMM) || odMM <= 0 || !finite(tolPct) || tolPct < 0 {
		return 0, false
	}
	best := math.Inf(1)
	for _, ratio := range []float64{JamRatioLowest, JamRatioHighest} {
		at := ratio * odMM / JamBendFactor
		if d := math.Abs(at - ductIDMM); d <= tolPct/100*ductIDMM && d < best {
			edgeMM, best, ok = at, d, true
		}
	}
	return edgeMM, ok
}

// Load is what one duct holds as cables are pulled into it one at a time: how many, their
// areas summed in pull order (as CheckFill sums them), and the first two cables' outside
// diameters, which the jam check of a third needs. The zero Load is an empty duct.
type Load struct {
	Cables     int
	UsedMM2    float64
	FirstODsMM [2]float64
}

// Takes reports whether a cable of outside diameter odMM (mm) may be pulled into a duct of
// internal diameter ductIDMM (mm) holding l: the duct holds fewer cables than most, its count
// of pulls (PullLimit: for loose cables the plan's design.cables_per_duct, a sound set of
// pulls, common practice, no published source; 0, for innerducts or a plan of fill alone, no
// count), with it the duct stays within the NFPA 70 Chapter 9 Table 1 fill for its new cable
// count, and, as the third cable, it makes no jam-prone trio (Jam). It is the one rule that
// decides whether a cable goes into a duct: the bill's fill check and spread (DuctBank) and the
// optimizer's duct capacity all pack with it. It is false for invalid input.
func (l Load) Takes(ductIDMM, odMM float64, most int) bool {
	if !finite(ductIDMM) || ductIDMM <= 0 || !finite(odMM) || odMM <= 0 {
		return false
	}
	if most > 0 && l.Cables >= most {
		return false
	}
	if l.UsedMM2+CableAreaMM2(odMM) > AllowedFillPct(l.Cables+1)/100*DuctAreaMM2(ductIDMM) {
		return false
	}
	if l.Cables == 2 {
		if _, risk := Jam(ductIDMM, l.FirstODsMM[0], l.FirstODsMM[1], odMM); risk {
			return false
		}
	}
	return true
}

// MayJam reports whether the duct holds two cables of equal diameter (within JamEqualODTol),
// so that Takes may refuse some third cable for the jam band: a duct that does not MayJam
// takes any cable its fill allows.
func (l Load) MayJam() bool {
	if l.Cables != 2 {
		return false
	}
	lo, hi := l.FirstODsMM[0], l.FirstODsMM[1] // valid ODs, so no NaN to order
	if lo > hi {
		lo, hi = hi, lo
	}
	return (hi-lo)/hi <= JamEqualODTol
}

// Add records a cable of outside diameter odMM (mm) pulled into the duct.
func (l *Load) Add(odMM float64) {
	if l.Cables < len(l.FirstODsMM) {
		l.FirstODsMM[l.Cables] = odMM
	}
	l.Cables++
	l.UsedMM2 += CableAreaMM2(odMM)
}

// FitsDuct reports whether one more cable of outside diameter cableODMM (mm) fits a duct of
// internal diameter ductIDMM (mm) that already holds cables of the given ODs, pulled in that
// order (Load.Takes; most: the duct's count of pulls, PullLimit). It is false for invalid
// input.
func FitsDuct(ductIDMM, cableODMM float64, existingODsMM []float64, most int) bool {
	var l Load
	for _, od := range existingODsMM {
		if !finite(od) || od <= 0 {
			return false
		}
		l.Add(od)
	}
	return l.Takes(ductIDMM, cableODMM, most)
}

// MaxBankDucts is the most ducts a DuctBank may have; more is taken as an input error.
const MaxBankDucts = 1000

// MaxCablesPerDuct caps the count DuctBank.MaxCables reports per duct.
const MaxCablesPerDuct = 1 << 20

// DuctBank is the set of spare ducts of one pathway segment that new cables may use: Ducts
// ducts of equal internal diameter IDMM (mm).
type DuctBank struct {
	Ducts int     // number of spare ducts, in [0, MaxBankDucts]
	IDMM  float64 // internal diameter of each duct, mm
	// Innerduct says the cables placed are innerducts, each pulled in empty and holding one
	// cable: a duct then takes as many as fill and the jam band allow (PullLimit); false,
	// loose cables, at most CablesPerDuct to a duct.
	Innerduct bool
	// CablesPerDuct is the most loose cables a duct takes, one pull each (the plan's
	// design.cables_per_duct, DefaultCablesPerDuct unless it says otherwise); 0: no count,
	// fill and the jam band alone. Not read for innerducts.
	CablesPerDuct int
}

// PullLimit is the bank's count of pulls a duct (PullLimit of Innerduct and CablesPerDuct;
// 0: no count).
func (b DuctBank) PullLimit() int { return PullLimit(b.Innerduct, b.CablesPerDuct) }

// Assignment is how Assign, Pull or Spread placed cables into the ducts of a DuctBank.
type Assignment struct {
	Ducts []Fill // fill of each duct, in duct order; cables appear in the order placed
	// Cables is, for each duct, the input indices of its cables in the order placed (parallel
	// to Ducts[d].CablesODMM).
	Cables   [][]int
	DuctOf   []int // for each input cable (input order), its 0-based duct, or -1 if it fits none
	Unplaced int   // number of cables with DuctOf -1
	OK       bool  // inputs valid and every cable placed
	Err      error // non-nil when the bank or a cable OD is invalid; then nothing is placed
}

// Assign packs cables of the given outside diameters (mm) into the bank's ducts, first fit
// decreasing: cables are taken largest OD first (equal ODs in input order) and placed as Pull
// places them. Because cables are sorted first, the result does not depend on the order of the
// input. Invalid input gives OK false and a non-nil Err; it never panics. Time
// O(n log n + n·Ducts) for n cables.
func (b DuctBank) Assign(cableODsMM []float64) Assignment {
	order := make([]int, len(cableODsMM))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(x, y int) bool { return cableODsMM[order[x]] > cableODsMM[order[y]] })
	return b.pack(cableODsMM, order)
}

// Pull packs cables of the given outside diameters (mm) into the bank's ducts in the order
// given (the order they are pulled), first fit: each goes into the lowest-numbered duct whose
// Load takes it (Load.Takes) given the cables already placed there. A cable no duct takes is
// left unplaced and packing goes on with the next one. This is how the optimizer packs a duct
// bank (route/optimize), so with the optimizer's order and duct count it places what the
// optimizer placed.
//
// Every duct is therefore within fill, free of jam risk and within its count of pulls
// (PullLimit: for loose cables CablesPerDuct) after every placement, not only at the
// end; a third cable may be refused where a fourth would have restored compliance (two cables
// are held to 31 %, three to 40 %). Invalid input gives OK false and a non-nil Err; it
// never panics. Time O(n·Ducts) for n cables.
func (b DuctBank) Pull(cableODsMM []float64) Assignment {
	order := make([]int, len(cableODsMM))
	for i := range order {
		order[i] = i
	}
	return b.pack(cableODsMM, order)
}

// pack places the cables first fit, taking them in the given order of their indices.
func (b DuctBank) pack(cableODsMM []float64, order []int) Assignment {
	a := Assignment{DuctOf: make([]int, len(cableODsMM))}
	var errs ErrorList
	if b.Ducts < 0 || b.Ducts > MaxBankDucts {
		errs = append(errs, &InputError{Field: "Ducts", Got: fmt.Sprint(b.Ducts), Want: fmt.Sprintf("in [0, %d]", MaxBankDucts)})
	}
	errs.checkPos("", 0, "IDMM", b.IDMM)
	for i, od := range cableODsMM {
		errs.checkPos("cable", i, "odMM", od)
	}
	for i := range a.DuctOf {
		a.DuctOf[i] = -1
	}
	if a.Err = errs.Err(); a.Err != nil {
		a.Unplaced = len(cableODsMM)
		return a
	}
	held := make([][]float64, b.Ducts)
	a.Cables = make([][]int, b.Ducts)
	loads := make([]Load, b.Ducts)
	most := b.PullLimit()
	for _, c := range order {
		od := cableODsMM[c]
		for d := range loads {
			if loads[d].Takes(b.IDMM, od, most) {
				held[d] = append(held[d], od)
				a.Cables[d] = append(a.Cables[d], c)
				loads[d].Add(od)
				a.DuctOf[c] = d
				break
			}
		}
		if a.DuctOf[c] < 0 {
			a.Unplaced++
		}
	}
	a.Ducts = make([]Fill, b.Ducts)
	for d := range held {
		a.Ducts[d] = CheckFill(b.IDMM, held[d])
	}
	a.OK = a.Unplaced == 0
	return a
}

// Fits reports whether a cable of outside diameter odMM (mm) can join cables already assigned
// to the bank (ODs in mm, any order): Assign places all of them. It is false for invalid input.
func (b DuctBank) Fits(assignedODsMM []float64, odMM float64) bool {
	ods := make([]float64, 0, len(assignedODsMM)+1)
	return b.Assign(append(append(ods, assignedODsMM...), odMM)).OK
}

// MaxCables is the number of cables of outside diameter odMM (mm) that Assign places in an
// empty bank: the count one duct accepts cable by cable (at most its PullLimit), times Ducts.
// The count per duct is capped at MaxCablesPerDuct. It is 0 for invalid input. Time O(1)
// plus a few fill sums.
func (b DuctBank) MaxCables(odMM float64) int {
	if b.Ducts <= 0 || b.Ducts > MaxBankDucts || !finite(b.IDMM) || b.IDMM <= 0 || !finite(odMM) || odMM <= 0 {
		return 0
	}
	per, most := 0, b.PullLimit()
	for per < 3 && FitsDuct(b.IDMM, odMM, slices.Repeat([]float64{odMM}, per), most) {
		per++
	}
	if per == 3 {
		// From three cables on only the 40 % limit applies, and it stays the same.
		n := math.Floor(FillOverTwoCablesPct / 100 * DuctAreaMM2(b.IDMM) / CableAreaMM2(odMM))
		per = max(3, int(math.Min(n, MaxCablesPerDuct)))
		for per > 3 && !b.fillOK(odMM, per) {
			per--
		}
		for per < MaxCablesPerDuct && b.fillOK(odMM, per+1) {
			per++
		}
		if most > 0 {
			per = min(per, most)
		}
	}
	return per * b.Ducts
}

// fillOK sums the areas of n equal cables in the order CheckFill does and checks them
// against the limit for more than two cables.
func (b DuctBank) fillOK(odMM float64, n int) bool {
	used := 0.0
	for range n {
		used += CableAreaMM2(odMM)
	}
	return used <= FillOverTwoCablesPct/100*DuctAreaMM2(b.IDMM)
}
