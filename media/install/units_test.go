package install

import (
	"math"
	"testing"
)

func TestUnits(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name      string
		got, want float64
	}{
		// 1 lbf = 0.45359237 kg × 9.80665 m/s², exact by definition.
		{"lbf in newtons", LbfToN(1), 0.45359237 * 9.80665},
		{"newtons back to lbf", NToLbf(4.4482216152605), 1},
		// 1 ft = 0.3048 m exactly (international foot, 1959).
		{"ft in metres", FtToM(1), 0.3048},
		{"metres in feet", MToFt(0.3048), 1},
		{"1000 ft", FtToM(1000), 304.8},
		{"lbf/ft in N/m", LbfPerFtToNPerM(1), 4.4482216152605 / 0.3048},
		{"N/m in lbf/ft", NPerMToLbfPerFt(4.4482216152605 / 0.3048), 1},
		// 1 in = 25.4 mm exactly.
		{"inch in mm", MMPerIn, 25.4},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if math.Abs(tc.got-tc.want) > 1e-12*math.Max(1, math.Abs(tc.want)) {
				t.Errorf("%s: got %.15g, want %.15g", tc.name, tc.got, tc.want)
			}
		})
	}
}
