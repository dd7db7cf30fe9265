package install

// Exact conversion factors, by definition.
const (
	// NPerLbf is newtons per pound-force: 1 lbf = 0.45359237 kg × 9.80665 m/s² =
	// 4.4482216152605 N exactly (international avoirdupois pound, 1959; standard gravity, CGPM 1901).
	NPerLbf = 4.4482216152605

	// MPerFt is metres per foot: 1 ft = 0.3048 m exactly (international foot, 1959).
	MPerFt = 0.3048

	// MMPerIn is millimetres per inch: 1 in = 25.4 mm exactly (international inch, 1959).
	MMPerIn = 25.4
)

// NToLbf converts a force in newtons to pound-force.
func NToLbf(n float64) float64 { return n / NPerLbf }

// LbfToN converts a force in pound-force to newtons.
func LbfToN(lbf float64) float64 { return lbf * NPerLbf }

// MToFt converts a length in metres to feet.
func MToFt(m float64) float64 { return m / MPerFt }

// FtToM converts a length in feet to metres.
func FtToM(ft float64) float64 { return ft * MPerFt }

// NPerMToLbfPerFt converts newtons per metre (cable weight, sidewall bearing pressure) to
// pound-force per foot.
func NPerMToLbfPerFt(v float64) float64 { return v * MPerFt / NPerLbf }

// LbfPerFtToNPerM converts pound-force per foot (cable weight, sidewall bearing pressure) to
// newtons per metre.
func LbfPerFtToNPerM(v float64) float64 { return v * NPerLbf / MPerFt }
