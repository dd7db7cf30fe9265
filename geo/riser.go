package geo

import (
	"fmt"

	"spanwright/geo/input"
)

// TallRiserM is the riser_m above which a building's riser is warned of, in metres: a riser
// runs from the building's entrance to its telecom room, and 300 m is the height of a tower of
// some 75 storeys, taller than any building a campus backbone serves. Common practice, no
// published source. A value above it is most likely centimetres typed as metres (750 for
// 7.5 m), and it lengthens the leg's cable and loss by the whole slip (tester 14 F6). MaxRiserM
// still refuses what no building could have.
const TallRiserM = 300.0

// tallRiserWarnings warns of each building whose riser_m is above TallRiserM, naming the
// unit that would make sense of the number; one warning per file, on the first, when more
// than idWarningsEach do.
func (l *loader) tallRiserWarnings() {
	l.unitSlipWarnings(l.tallRisers, tallRiserText, func(n int) string {
		return fmt.Sprintf(" (%s of this file give more than %g m too)", input.Counted(n, "more building", "more buildings"), TallRiserM)
	})
}

// tallRiserText is the warning on a riser_m of riserM above TallRiserM; more is said of the
// other buildings of the file.
func tallRiserText(riserM float64, more string) string {
	return fmt.Sprintf("%q is %g m%s, more than the %g m riser of a tower of some 75 storeys; centimetres? %g cm is %g m. The riser is planned as given: its cable, loss and cost follow it",
		PropRiserM, riserM, more, TallRiserM, riserM, riserM/100)
}
