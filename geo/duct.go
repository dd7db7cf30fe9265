package geo

import (
	"fmt"
	"math"

	"spanwright/geo/input"
)

// Conduit trade sizes run from 16 (½ in) to 155 (6 in) for the raceways NFPA 70 Chapter 9
// Table 4 lists, the sizes ANSI/TIA-569 gives pathways in (from memory); a campus backbone duct is usually 103
// (4 in). The inside diameters of the two ends, in millimetres: EMT ½ in is 0.622 in inside,
// rigid PVC Schedule 40 6 in is 6.031 in (NFPA 70 Chapter 9 Table 4, seen in a secondary
// copy; PVCConduits).
const (
	// SmallestDuctMM is the inside diameter of the smallest conduit trade size, 16 (½ in)
	// EMT, in millimetres: a duct_mm below it is warned of (smallDuctWarnings).
	SmallestDuctMM = 15.8
	// LargestTradeDuctMM is the inside diameter of the largest, 155 (6 in) PVC Schedule 40
	// (PVCConduits), in millimetres, for the message.
	LargestTradeDuctMM = 153.2
	// largestTradeIn is the largest trade size in inches: a duct_mm up to it may be inches.
	largestTradeIn = 6
)

// Conduit is one trade size of rigid PVC conduit, the duct of campus duct banks, with its
// inside diameter in millimetres in the two wall thicknesses it is made in.
type Conduit struct {
	Trade     int     // metric designator (103 for 4 in)
	Inches    string  // trade size in inches ("4")
	In        float64 // the same as a number (4)
	Sched40MM float64 // Schedule 40 inside diameter, mm
	Sched80MM float64 // Schedule 80 inside diameter, mm
}

// PVCConduits are the trade sizes of rigid PVC conduit, NFPA 70 Chapter 9 Table 4, Article
// 352, nominal internal diameters in inches × 25.4, to 0.1 mm (seen in a secondary
// copy of the table, not in the standard itself; ../shared/REFERENCES.md recalls
// 3.998 in for Schedule 40 trade size 103 too). The ½ in Schedule 80 (13.4 mm) is smaller
// than SmallestDuctMM, the EMT figure the unit-slip warning names.
var PVCConduits = []Conduit{
	{16, "½", 0.5, 15.3, 13.4},   // 0.602, 0.526 in
	{21, "¾", 0.75, 20.4, 18.3},  // 0.804, 0.722 in
	{27, "1", 1, 26.1, 23.8},     // 1.029, 0.936 in
	{35, "1¼", 1.25, 34.5, 31.9}, // 1.360, 1.255 in
	{41, "1½", 1.5, 40.4, 37.5},  // 1.590, 1.476 in
	{53, "2", 2, 52.0, 48.6},     // 2.047, 1.913 in
	{63, "2½", 2.5, 62.1, 58.2},  // 2.445, 2.290 in
	{78, "3", 3, 77.3, 72.7},     // 3.042, 2.864 in
	{91, "3½", 3.5, 89.4, 84.5},  // 3.521, 3.326 in
	{103, "4", 4, 101.5, 96.2},   // 3.998, 3.786 in
	{129, "5", 5, 127.4, 121.1},  // 5.016, 4.768 in
	{155, "6", 6, 153.2, 145.0},  // 6.031, 5.709 in
}

// DefaultDuctMM is a pathway's inner duct diameter in millimetres when duct_mm is absent:
// trade size 103 (4 in) rigid PVC Schedule 40, the usual campus duct (PVCConduits).
const DefaultDuctMM = 101.5

// NominalHint is what to say of a duct_mm of ductMM that reads as a nominal size rather than
// an inside diameter: a whole number of millimetres that is no inside diameter of
// PVCConduits, within tolPct per cent of the Schedule 40 inside diameter of a trade size
// ("100 mm reads as a nominal size: trade size 103 (4 in) PVC conduit is 101.5 mm inside in
// Schedule 40, 96.2 mm in Schedule 80 (NFPA 70 Chapter 9 Table 4)"); "" otherwise. A plan
// whose verdicts hinge on the figure says so (the jam band's warning).
func NominalHint(ductMM, tolPct float64) string {
	if ductMM != math.Trunc(ductMM) {
		return ""
	}
	var near *Conduit
	for i := range PVCConduits {
		c := &PVCConduits[i]
		if math.Abs(c.Sched40MM-ductMM) < 0.05 || math.Abs(c.Sched80MM-ductMM) < 0.05 {
			return ""
		}
		if math.Abs(c.Sched40MM-ductMM) <= tolPct/100*ductMM && (near == nil || math.Abs(c.Sched40MM-ductMM) < math.Abs(near.Sched40MM-ductMM)) {
			near = c
		}
	}
	if near == nil {
		return ""
	}
	return fmt.Sprintf("%g mm reads as a nominal size, not an inside diameter: %s", ductMM, near.insideText())
}

// insideText says c's inside diameters: "trade size 103 (4 in) PVC conduit is 101.5 mm
// inside in Schedule 40, 96.2 mm in Schedule 80 (NFPA 70 Chapter 9 Table 4)".
func (c Conduit) insideText() string {
	return fmt.Sprintf("trade size %d (%s in) PVC conduit is %.1f mm inside in Schedule 40, %.1f mm in Schedule 80 (NFPA 70 Chapter 9 Table 4)",
		c.Trade, c.Inches, c.Sched40MM, c.Sched80MM)
}

// TradeHint is what to say of a duct diameter given in inches that is a trade size of
// PVCConduits: a GIS that keeps ducts in inches most often keeps the trade size, whose inside
// diameter is not the inches × 25.4 ("trade size 78 (3 in) PVC conduit is 77.3 mm inside in
// Schedule 40, 72.7 mm in Schedule 80 (NFPA 70 Chapter 9 Table 4)"); "" for another figure
// (review 22 F6).
func TradeHint(inches float64) string {
	for _, c := range PVCConduits {
		if c.In == inches {
			return c.insideText()
		}
	}
	return ""
}

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
	from := len(l.warns)
	warnPerFile(l, slips, func(u unitSlip) (Source, string) { return u.src, u.id },
		func(u unitSlip) string { return text(u.value, "") },
		func(u unitSlip, n int) string { return text(u.value, more(n)) })
	l.slips = append(l.slips, l.warns[from:]...)
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
