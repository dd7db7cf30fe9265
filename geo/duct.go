package geo

import (
	"fmt"

	"spanwright/geo/input"
)

// Conduit trade sizes run from 16 (½ in) to 155 (6 in) for the raceways NFPA 70 Chapter 9
// Table 4 lists, the sizes ANSI/TIA-569 gives pathways in (from memory); a campus backbone duct is usually 103
// (4 in). The inside diameters of the two ends, in millimetres: EMT ½ in is 0.622 in inside,
// rigid PVC Schedule 40 6 in is 6.065 in (NFPA 70 Chapter 9 Table 4, from memory).
const (
	// SmallestDuctMM is the inside diameter of the smallest conduit trade size, 16 (½ in)
	// EMT, in millimetres: a duct_mm below it is warned of (smallDuctWarnings).
	SmallestDuctMM = 15.8
	// LargestTradeDuctMM is the inside diameter of the largest, 155 (6 in) PVC Schedule 40,
	// in millimetres, for the message.
	LargestTradeDuctMM = 154.1
	// largestTradeIn is the largest trade size in inches: a duct_mm up to it may be inches.
	largestTradeIn = 6
)

// unitSlip is a feature whose value of a length property looks typed in another unit: a
// duct_mm below SmallestDuctMM, a riser_m above TallRiserM.
type unitSlip struct {
	src   Source
	id    string
	value float64
}

// unitSlipWarnings warns of each of slips with text(value, ""), or, for a file with more
// than idWarningsEach of them, once on its first, text given what more(n) says of the n
// others.
func (l *loader) unitSlipWarnings(slips []unitSlip, text func(value float64, more string) string, more func(n int) string) {
	warnPerFile(l, slips, func(u unitSlip) (Source, string) { return u.src, u.id },
		func(u unitSlip) string { return text(u.value, "") },
		func(u unitSlip, n int) string { return text(u.value, more(n)) })
}

// smallDuctWarnings warns of each pathway whose duct_mm is below SmallestDuctMM (inches or
// centimetres typed as millimetres, most likely: a 4 mm duct takes no cable the catalog
// lists, and the ducts a plan adds beside it are taken as alike), naming the trade sizes'
// range and the unit that would make sense of the number; one warning per file, on the
// first, when more than idWarningsEach do.
func (l *loader) smallDuctWarnings() {
	l.unitSlipWarnings(l.smallDucts, smallDuctText, func(n int) string {
		return fmt.Sprintf(" (%s of this file give less than %g mm too)", input.Counted(n, "more pathway", "more pathways"), SmallestDuctMM)
	})
}

// smallDuctText is the warning on a duct_mm of ductMM below SmallestDuctMM; more is said of
// the other pathways of the file.
func smallDuctText(ductMM float64, more string) string {
	hint := ""
	switch {
	case ductMM <= largestTradeIn:
		hint = fmt.Sprintf("; inches? %g in is %.1f mm", ductMM, ductMM*25.4)
	default:
		hint = fmt.Sprintf("; centimetres? %g cm is %g mm", ductMM, ductMM*10)
	}
	return fmt.Sprintf("%q is %g mm%s, smaller than the inside of any conduit trade size: they run from trade size 16 (½ in, %g mm inside) to 155 (6 in, %g mm inside)%s; a microduct for blown fibre is that small, but no cable is pulled into one",
		PropDuctMM, ductMM, more, SmallestDuctMM, LargestTradeDuctMM, hint)
}
