package media

import (
	"math"
	"testing"
)

// IEEE 802.3 builds each optical PHY's maximum channel insertion loss (CIL) from the
// operating range, a cabled attenuation and a connection allowance. With IEEE's own
// assumptions (multimode 3.5 dB/km at 850 nm and 1.5 dB of connections, 1.0 dB for
// 40GBASE-SR4 on OM4; single-mode 0.4 dB/km at 1310 nm, 0.3 at 1550 nm, and 2.0 dB) LossDB
// must reproduce the published CIL within 0.1 dB (CILs are published rounded to 0.1 dB).
func TestLossDBReproducesIEEE(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name                  string
		attenDBPerKm, lengthM float64
		allowanceDB           float64
		wantDB                float64
	}{
		{"10GBASE-SR OM3 300 m", 3.5, 300, 1.5, 2.6},   // IEEE 802.3 Clause 52, 10GBASE-SR on OM3: range seen, CIL from memory
		{"10GBASE-SR OM4 400 m", 3.5, 400, 1.5, 2.9},   // IEEE 802.3 Clause 52, 10GBASE-SR on OM4 (seen)
		{"25GBASE-SR OM3 70 m", 3.5, 70, 1.5, 1.8},     // IEEE 802.3 Clause 112, 25GBASE-SR on OM3 (seen)
		{"25GBASE-SR OM4 100 m", 3.5, 100, 1.5, 1.9},   // IEEE 802.3 Clause 112, 25GBASE-SR on OM4 (seen)
		{"40GBASE-SR4 OM3 100 m", 3.5, 100, 1.5, 1.9},  // IEEE 802.3 Clause 86, 40GBASE-SR4 on OM3: range seen, CIL from memory
		{"40GBASE-SR4 OM4 150 m", 3.5, 150, 1.0, 1.5},  // IEEE 802.3 Clause 86, 40GBASE-SR4 on OM4 (seen), 1.0 dB allowance
		{"100GBASE-SR4 OM3 70 m", 3.5, 70, 1.5, 1.8},   // IEEE 802.3 Clause 95, 100GBASE-SR4 on OM3: range seen, CIL from memory
		{"100GBASE-SR4 OM4 100 m", 3.5, 100, 1.5, 1.9}, // IEEE 802.3 Clause 95 (from memory)
		{"10GBASE-ER 30 km", 0.3, 30000, 2.0, 11},      // IEEE 802.3 Clause 52, 10GBASE-ER (seen)
		{"100GBASE-ER4 40 km", 0.4, 40000, 2.0, 18},    // IEEE 802.3 Clause 88, 100GBASE-ER4 (seen)
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			// The allowance is passed as one "pair" so that LossDB adds it once.
			got := LossDB(tc.attenDBPerKm, tc.lengthM, 1, 0, tc.allowanceDB, 0)
			if math.Abs(got-tc.wantDB) > 0.1+1e-9 {
				t.Errorf("%s: got %.3f dB, want %.1f dB within 0.1", tc.name, got, tc.wantDB)
			}
		})
	}
}

// These published CILs are NOT reproduced within 0.1 dB by IEEE's budget model with the
// assumptions above: IEEE used a different attenuation for them (for the long-wavelength
// PHYs the worst wavelength of the transmitter window, for 1000BASE-SX a higher multimode
// figure). The catalog carries the published value, which is what the engine checks against;
// the test pins the documented gap so a change of assumptions shows up here.
func TestLossDBDocumentedGaps(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name                  string
		attenDBPerKm, lengthM float64
		allowanceDB           float64
		modelDB               float64 // computed
		publishedDB           float64
	}{
		{"1000BASE-SX OM2 550 m", 3.5, 550, 1.5, 3.425, 3.56},  // IEEE 802.3 Clause 38 (seen); (3.56-1.5)/0.55 = 3.75 dB/km implied (computed)
		{"1000BASE-SX OM1 275 m", 3.5, 275, 1.5, 2.4625, 2.60}, // IEEE 802.3 Clause 38 (seen)
		{"1000BASE-LX SMF 5 km", 0.4, 5000, 2.0, 4.0, 4.5},     // IEEE 802.3 Clause 38 (seen)
		{"10GBASE-LR 10 km", 0.4, 10000, 2.0, 6.0, 6.2},        // IEEE 802.3 Clause 52 (from memory): worst wavelength of the window
		{"25GBASE-LR 10 km", 0.4, 10000, 2.0, 6.0, 6.3},        // IEEE 802.3 Clause 114 (CIL from memory)
		{"40GBASE-LR4 10 km", 0.4, 10000, 2.0, 6.0, 6.7},       // IEEE 802.3 Clause 87 (seen): CWDM lanes down to about 1271 nm
		{"100GBASE-LR4 10 km", 0.4, 10000, 2.0, 6.0, 6.3},      // IEEE 802.3 Clause 88 (from memory)
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got := LossDB(tc.attenDBPerKm, tc.lengthM, 1, 0, tc.allowanceDB, 0)
			if math.Abs(got-tc.modelDB) > 1e-9 {
				t.Errorf("%s: model got %.4f dB, want %.4f dB (computed)", tc.name, got, tc.modelDB)
			}
			if math.Abs(got-tc.publishedDB) <= 0.1 {
				t.Errorf("%s: model %.3f dB now reproduces the published %.2f dB: update the comments and move the row", tc.name, got, tc.publishedDB)
			}
		})
	}
}

// ANSI/TIA-568.3-D Tier 1 acceptance limit: length × maximum attenuation + 0.75 dB per mated
// pair + 0.3 dB per splice (from memory); the figures are computed from that formula.
func TestLossDBTier1(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name                  string
		attenDBPerKm, lengthM float64
		pairs, splices        int
		wantDB                float64
	}{
		{"OM3 300 m 850 nm 2 pairs 1 splice", 3.5, 300, 2, 1, 2.85},      // computed
		{"OM3 300 m 1300 nm 2 pairs 1 splice", 1.5, 300, 2, 1, 2.25},     // computed
		{"OS2 OSP 2 km 1310 nm 2 pairs 2 splices", 0.5, 2000, 2, 2, 3.1}, // computed
		{"OS2 inside 90 m 3 pairs", 1.0, 90, 3, 0, 2.34},                 // computed
		{"connections only", 3.5, 0, 2, 0, 1.5},                          // computed
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got := LossDB(tc.attenDBPerKm, tc.lengthM, tc.pairs, tc.splices, 0.75, 0.3)
			if math.Abs(got-tc.wantDB) > 1e-9 {
				t.Errorf("%s: got %.4f dB, want %.4f dB", tc.name, got, tc.wantDB)
			}
		})
	}
}

func TestMaxLengthM(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name                   string
		attenDBPerKm, budgetDB float64
		pairs, splices         int
		want                   float64
	}{
		{"10GBASE-SR OM4, IEEE allowance as two pairs", 3.5, 2.9, 2, 0, 400},          // IEEE 802.3 Clause 52 (seen): 400 m back from 2.9 dB
		{"10GBASE-SR OM4 with 1 dB margin", 3.5, 1.9, 2, 0, (1.9 - 1.5) / 3.5 * 1000}, // computed: (1.9-1.5)/3.5 km
		{"100GBASE-ER4 OSP with 1 dB margin", 0.5, 17, 2, 0, 31000},                   // computed: (17-1.5)/0.5 km
		{"connections exceed budget", 3.5, 1.0, 2, 0, 0},                              // computed
		{"no attenuation", 0, 2, 2, 0, math.Inf(1)},                                   // computed
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got := MaxLengthM(tc.attenDBPerKm, tc.budgetDB, tc.pairs, tc.splices, 0.75, 0.3)
			if !(got == tc.want || math.Abs(got-tc.want) < 1e-6) {
				t.Errorf("%s: got %.6f m, want %.6f m", tc.name, got, tc.want)
			}
		})
	}
}

func TestLossesWavelengths(t *testing.T) {
	t.Parallel()
	c := DefaultCatalog()
	tia := Connections{PairDB: 0.75, SpliceDB: 0.3}
	cases := []struct {
		name, medium, construction, app string
		lengthM                         float64
		pairs, splices                  int
		want                            []Loss
	}{
		// AttenDBPerKm is the catalog's ANSI/TIA-568.3-D maximum the loss counts (from memory):
		// 3.5 dB/km at 850 nm and 1.5 at 1300 nm multimode, 0.5 dB/km outside-plant single-mode.
		{"om4 850 operating, 1300 tested", "om4", "ofnr-riser", "10GBASE-SR", 400, 2, 0, []Loss{
			// IEEE 802.3 Clause 52 (seen): budget closes exactly at 400 m; the application's 2.9 dB
			// ties the ANSI/TIA-568.3-D link limit, which is then named.
			{WavelengthNM: 850, AttenDBPerKm: 3.5, LossDB: 2.9, LimitDB: 2.9, MarginDB: 0, FieldLimitDB: 2.9, CablingLimitDB: 2.9, FieldLimitBy: "TIA-568.3-D", Operating: true},
			{WavelengthNM: 1300, AttenDBPerKm: 1.5, LossDB: 2.1, FieldLimitDB: 2.1, CablingLimitDB: 2.1, FieldLimitBy: "TIA-568.3-D"}, // ANSI/TIA-568.3-D 1.5 dB/km (from memory), computed
		}},
		{"os2 osp 10GBASE-ER runs at 1550", "os2", "osp-loose-tube", "10GBASE-ER", 10000, 2, 2, []Loss{
			{WavelengthNM: 1310, AttenDBPerKm: 0.5, LossDB: 7.1, FieldLimitDB: 7.1, CablingLimitDB: 7.1, FieldLimitBy: "TIA-568.3-D"}, // computed: 10 km x 0.5 + 1.5 + 0.6
			// IEEE 802.3 Clause 52, 11 dB (seen): above the ANSI/TIA-568.3-D link limit, which decides.
			{WavelengthNM: 1550, AttenDBPerKm: 0.5, LossDB: 7.1, LimitDB: 11, MarginDB: 3.9, FieldLimitDB: 7.1, CablingLimitDB: 7.1, FieldLimitBy: "TIA-568.3-D", Operating: true},
		}},
		// 10GBASE-SR on OM3 over 282 m (tester 8's ADM-CHM): the ANSI/TIA-568.3-D link limit is
		// 0.282 km x 3.5 dB/km + 2 x 0.75 + 2 x 0.3 = 3.087 dB (from memory, REFERENCES.md), above
		// IEEE 802.3 Clause 52's 2.6 dB channel insertion loss on OM3 (from memory, REFERENCES.md),
		// which sets the field limit: a link read at 3.0 dB must not pass.
		{"om3 10GBASE-SR at 282 m", "om3", "ofnr-riser", "10GBASE-SR", 282, 2, 2, []Loss{
			{WavelengthNM: 850, AttenDBPerKm: 3.5, LossDB: 3.087, LimitDB: 2.6, MarginDB: -0.487, FieldLimitDB: 2.6, CablingLimitDB: 3.087, FieldLimitBy: "10GBASE-SR", Operating: true},
			{WavelengthNM: 1300, AttenDBPerKm: 1.5, LossDB: 2.523, FieldLimitDB: 2.523, CablingLimitDB: 2.523, FieldLimitBy: "TIA-568.3-D"}, // 0.282 x 1.5 + 1.5 + 0.6, ANSI/TIA-568.3-D (from memory)
		}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			k := c.Medium(tc.medium).Construction(tc.construction)
			a := c.Application(tc.app)
			r, _ := a.On(tc.medium)
			got := Losses(k, a, r, tc.lengthM, tc.pairs, tc.splices, tia, tia)
			if len(got) != len(tc.want) {
				t.Fatalf("%s: got %d losses, want %d", tc.name, len(got), len(tc.want))
			}
			for i := range got {
				if got[i] != tc.want[i] {
					t.Errorf("%s: loss %d: got %+v, want %+v", tc.name, i, got[i], tc.want[i])
				}
			}
		})
	}
	t.Run("design pair loss apart from field limit", func(t *testing.T) {
		k := c.Medium("om4").Construction("ofnr-riser")
		a := c.Application("10GBASE-SR")
		r, _ := a.On("om4")
		got := Losses(k, a, r, 400, 2, 0, Connections{PairDB: 0.5, SpliceDB: 0.15}, tia)
		// typical design values: connection 0.5 dB (seen, trade association loss-budget guide)
		if got[0].LossDB != 2.4 || got[0].FieldLimitDB != 2.9 || got[0].MarginDB != 0.5 {
			t.Errorf("got %+v, want loss 2.4, field limit 2.9, margin 0.5", got[0])
		}
	})
	t.Run("om3 10GBASE-SR design 282 m", func(t *testing.T) {
		k := c.Medium("om3").Construction("ofnr-riser")
		a := c.Application("10GBASE-SR")
		r, _ := a.On("om3")
		got := Losses(k, a, r, 282, 2, 2, Connections{PairDB: 0.5, SpliceDB: 0.3}, tia)
		// Design 0.987 + 2 x 0.5 (trade association guide, seen) + 0.6 = 2.587 dB, 0.013 dB under
		// IEEE 802.3 Clause 52's 2.6 dB on OM3 (from memory); the field limit is that 2.6 dB, not
		// the ANSI/TIA-568.3-D 3.087 dB.
		if got[0].LossDB != 2.587 || got[0].MarginDB != 0.013 || got[0].FieldLimitDB != 2.6 || got[0].CablingLimitDB != 3.087 || got[0].FieldLimitBy != "10GBASE-SR" {
			t.Errorf("got %+v, want loss 2.587, margin 0.013, field limit 2.6 by 10GBASE-SR, cabling limit 3.087", got[0])
		}
	})
}
