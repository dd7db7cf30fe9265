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

// Jam check for three cables in one duct. NFPA 70 Chapter 9 (Informative Annex note, seen):
// three cables whose duct-ID-to-cable-OD ratio lies between 2.8 and 3.2 can jam, one cable
// wedging between the other two. Many pulling guides first multiply D/d by 1.05 because a duct
// goes oval in a bend (common practice, no published source).
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
		lo := math.Min(cableODsMM[0], math.Min(cableODsMM[1], cableODsMM[2]))
		hi := math.Max(cableODsMM[0], math.Max(cableODsMM[1], cableODsMM[2]))
		if (hi-lo)/hi <= JamEqualODTol {
			mean := (cableODsMM[0] + cableODsMM[1] + cableODsMM[2]) / 3
			f.JamRatio = JamBendFactor * ductIDMM / mean
			f.JamRisk = f.JamRatio >= JamRatioLowest && f.JamRatio <= JamRatioHighest
		}
	}
	return f
}

// FitsDuct reports whether one more cable of outside diameter cableODMM (mm) fits a duct of
// internal diameter ductIDMM (mm) that already holds cables of the given ODs: the fill with the
// new cable is within NFPA 70 Chapter 9 Table 1 and there is no jam risk. It is false for
// invalid input.
func FitsDuct(ductIDMM, cableODMM float64, existingODsMM []float64) bool {
	ods := make([]float64, 0, len(existingODsMM)+1)
	ods = append(append(ods, existingODsMM...), cableODMM)
	f := CheckFill(ductIDMM, ods)
	return f.OK && !f.JamRisk
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
}

// Assignment is how Assign placed cables into the ducts of a DuctBank.
type Assignment struct {
	Ducts    []Fill // fill of each duct, in duct order; cables appear in the order placed
	DuctOf   []int  // for each input cable (input order), its 0-based duct, or -1 if it fits none
	Unplaced int    // number of cables with DuctOf -1
	OK       bool   // inputs valid and every cable placed
	Err      error  // non-nil when the bank or a cable OD is invalid; then nothing is placed
}

// Assign packs cables of the given outside diameters (mm) into the bank's ducts, first fit
// decreasing: cables are taken largest OD first (equal ODs in input order) and each goes into
// the lowest-numbered duct that FitsDuct accepts given the cables already placed there. A cable
// no duct accepts is left unplaced and packing continues with the next one.
//
// Every duct is therefore within fill and free of jam risk after every placement, not only at
// the end; a third cable may be refused where a fourth would have restored compliance (two
// cables are held to 31 %, three to 40 %). Because cables are sorted first, the result does not
// depend on the order of the input, so a router may ask again with each new cable appended.
// Invalid input gives OK false and a non-nil Err; it never panics. Time O(n log n + n·Ducts)
// for n cables.
func (b DuctBank) Assign(cableODsMM []float64) Assignment {
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

	order := make([]int, len(cableODsMM))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(x, y int) bool { return cableODsMM[order[x]] > cableODsMM[order[y]] })

	held := make([][]float64, b.Ducts)
	usedMM2 := make([]float64, b.Ducts) // summed in placement order, as CheckFill sums
	for _, c := range order {
		od := cableODsMM[c]
		for d := range held {
			if b.accepts(held[d], usedMM2[d], od) {
				held[d] = append(held[d], od)
				usedMM2[d] += CableAreaMM2(od)
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

// accepts is FitsDuct(b.IDMM, od, held) for a duct whose cables' areas sum to usedMM2.
func (b DuctBank) accepts(held []float64, usedMM2, od float64) bool {
	if len(held) == 2 {
		return FitsDuct(b.IDMM, od, held)
	}
	return usedMM2+CableAreaMM2(od) <= AllowedFillPct(len(held)+1)/100*DuctAreaMM2(b.IDMM)
}

// Fits reports whether a cable of outside diameter odMM (mm) can join cables already assigned
// to the bank (ODs in mm, any order): Assign places all of them. It is false for invalid input.
func (b DuctBank) Fits(assignedODsMM []float64, odMM float64) bool {
	ods := make([]float64, 0, len(assignedODsMM)+1)
	return b.Assign(append(append(ods, assignedODsMM...), odMM)).OK
}

// MaxCables is the number of cables of outside diameter odMM (mm) that Assign places in an
// empty bank: the count one duct accepts cable by cable, times Ducts. The count per duct is
// capped at MaxCablesPerDuct. It is 0 for invalid input. Time O(1) plus a few fill sums.
func (b DuctBank) MaxCables(odMM float64) int {
	if b.Ducts <= 0 || b.Ducts > MaxBankDucts || !finite(b.IDMM) || b.IDMM <= 0 || !finite(odMM) || odMM <= 0 {
		return 0
	}
	per := 0
	for per < 3 && FitsDuct(b.IDMM, odMM, slices.Repeat([]float64{odMM}, per)) {
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
