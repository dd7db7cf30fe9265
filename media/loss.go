package media

import (
	"math"
	"slices"
)

// LossDB is the insertion loss of a fibre channel in dB: cabled attenuation attenDBPerKm
// (dB/km) over lengthM metres, plus pairs mated connector pairs of pairDB each and splices
// splices of spliceDB each. With the ANSI/TIA-568.3-D maxima (catalog attenuation, 0.75 dB
// per pair, 0.3 dB per splice) it is that standard's Tier 1 acceptance limit for the
// installed link; with IEEE 802.3's own assumptions it reproduces an application's maximum
// channel insertion loss (see loss_test.go for which do).
func LossDB(attenDBPerKm, lengthM float64, pairs, splices int, pairDB, spliceDB float64) float64 {
	return attenDBPerKm*lengthM/1000 + float64(pairs)*pairDB + float64(splices)*spliceDB
}

// MaxLengthM solves LossDB(attenDBPerKm, L, pairs, splices, pairDB, spliceDB) <= budgetDB for
// the longest length L in metres. It returns 0 when the connections alone exceed the budget
// and +Inf when the attenuation is 0 and the connections fit.
func MaxLengthM(attenDBPerKm, budgetDB float64, pairs, splices int, pairDB, spliceDB float64) float64 {
	left := budgetDB - float64(pairs)*pairDB - float64(splices)*spliceDB
	switch {
	case left < 0:
		return 0
	case attenDBPerKm <= 0:
		return math.Inf(1)
	}
	return left / attenDBPerKm * 1000
}

// roundDB rounds a loss to 1 µdB so that budgets that are equal on paper compare equal
// (0.4 km × 3.5 dB/km + 1.5 dB is 2.9 dB, not 2.9000000000000004).
func roundDB(x float64) float64 { return math.Round(x*1e6) / 1e6 }

// Connections holds the loss of one mated connector pair and one splice, in dB.
type Connections struct {
	PairDB, SpliceDB float64
}

// Losses is the loss budget of a fibre channel of lengthM metres with pairs connector pairs
// and splices splices, built as construction k, carrying application a whose reach on the
// medium is r. It reports every wavelength at which k has an attenuation, ascending: for
// multimode 850 and 1300 nm, for single-mode 1310 and 1550 nm, the wavelengths an installed
// link is tested at. At a's operating wavelengths Operating is true and LimitDB and MarginDB
// are set; elsewhere they are 0. LossDB uses the design connection losses, CablingLimitDB the
// acceptance ones (the catalog's ANSI/TIA-568.3-D maxima); FieldLimitDB is the lesser of
// that and, at a's operating wavelengths, r's channel insertion loss (no attenuator; see
// Loss.FieldLimitDB). It returns nil for copper.
func Losses(k *Construction, a *Application, r Reach, lengthM float64, pairs, splices int, design, field Connections) []Loss {
	if len(k.Attenuation) == 0 {
		return nil
	}
	out := make([]Loss, 0, len(k.Attenuation))
	for _, at := range k.Attenuation {
		cabling := roundDB(LossDB(at.DBPerKm, lengthM, pairs, splices, field.PairDB, field.SpliceDB))
		l := Loss{
			WavelengthNM:   at.WavelengthNM,
			AttenDBPerKm:   at.DBPerKm,
			LossDB:         roundDB(LossDB(at.DBPerKm, lengthM, pairs, splices, design.PairDB, design.SpliceDB)),
			FieldLimitDB:   cabling,
			CablingLimitDB: cabling,
			FieldLimitBy:   FieldLimitByCabling,
		}
		if slices.Contains(a.WavelengthsNM, at.WavelengthNM) {
			l.Operating = true
			l.LimitDB = r.MaxLossDB
			l.MarginDB = roundDB(r.MaxLossDB - l.LossDB)
			l.accept(a.Name, r.MaxLossDB, 0)
		}
		out = append(out, l)
	}
	return out
}

// worstLoss is the operating wavelength with the smallest margin (the shorter wavelength on
// a tie), and whether there is one.
func worstLoss(losses []Loss) (Loss, bool) {
	var worst Loss
	found := false
	for _, l := range losses {
		if l.Operating && (!found || l.MarginDB < worst.MarginDB) {
			worst, found = l, true
		}
	}
	return worst, found
}
