package media

import (
	"bytes"
	"errors"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite golden files")

// The catalog's operating ranges and channel insertion losses against IEEE 802.3.
func TestCatalogReachIEEE(t *testing.T) {
	t.Parallel()
	c := DefaultCatalog()
	cases := []struct {
		app, medium string
		rangeM      float64
		lossDB      float64
	}{
		{"1000BASE-T", "cat6a", 100, 0},      // IEEE 802.3 Clause 40 on an ANSI/TIA-568.2 channel (seen)
		{"10GBASE-T", "cat6a", 100, 0},       // IEEE 802.3 Clause 55 on Cat 6A (seen)
		{"1000BASE-SX", "om3", 550, 3.56},    // IEEE 802.3 Clause 38, OM2 values used for OM3 (seen)
		{"1000BASE-SX", "om4", 550, 3.56},    // IEEE 802.3 Clause 38, OM2 values used for OM4 (seen)
		{"1000BASE-SX", "om5", 550, 3.56},    // OM4's values for OM5 (from memory)
		{"1000BASE-LX", "os2", 5000, 4.5},    // IEEE 802.3 Clause 38, SMF: 4.5 dB (the TIA FOTC 1000BASE-LX overview, a summary of Clause 38)
		{"10GBASE-SR", "om3", 300, 2.6},      // IEEE 802.3 Clause 52: range seen, CIL from memory
		{"10GBASE-SR", "om4", 400, 2.9},      // IEEE 802.3 Clause 52, 10GBASE-SR on OM4 (seen)
		{"10GBASE-SR", "om5", 400, 2.9},      // OM4's values for OM5 (from memory)
		{"10GBASE-LR", "os2", 10000, 6.2},    // IEEE 802.3 Clause 52 (from memory)
		{"10GBASE-ER", "os2", 30000, 11},     // IEEE 802.3 Clause 52 (seen)
		{"25GBASE-SR", "om3", 70, 1.8},       // IEEE 802.3 Clause 112 (seen)
		{"25GBASE-SR", "om4", 100, 1.9},      // IEEE 802.3 Clause 112 (seen)
		{"25GBASE-SR", "om5", 100, 1.9},      // IEEE 802.3 Clause 112 (seen)
		{"25GBASE-LR", "os2", 10000, 6.3},    // IEEE 802.3 Clause 114: reach seen, CIL from memory
		{"40GBASE-SR4", "om3", 100, 1.9},     // IEEE 802.3 Clause 86: reach seen, CIL from memory
		{"40GBASE-SR4", "om4", 150, 1.5},     // IEEE 802.3 Clause 86 (seen)
		{"40GBASE-SR4", "om5", 150, 1.5},     // OM4's values for OM5 (from memory)
		{"40GBASE-LR4", "os2", 10000, 6.7},   // IEEE 802.3 Clause 87 (seen)
		{"100GBASE-SR4", "om3", 70, 1.8},     // IEEE 802.3 Clause 95: OM3 reach seen, CIL from memory
		{"100GBASE-SR4", "om4", 100, 1.9},    // IEEE 802.3 Clause 95 (from memory)
		{"100GBASE-SR4", "om5", 100, 1.9},    // IEEE 802.3 Clause 95 (from memory)
		{"100GBASE-LR4", "os2", 10000, 6.3},  // IEEE 802.3 Clause 88 (from memory)
		{"100GBASE-ER4", "os2", 40000, 18},   // IEEE 802.3 Clause 88, 30 km plus engineered links (seen)
		{"100GBASE-DR", "os2", 500, 3.0},     // IEEE 802.3 Clause 140 (from memory)
		{"100GBASE-FR1", "os2", 2000, 4.0},   // IEEE 802.3 Clause 140 (from memory)
		{"100GBASE-LR1", "os2", 10000, 6.3},  // IEEE 802.3 Clause 140 (from memory)
		{"400GBASE-SR8", "om3", 70, 1.8},     // IEEE 802.3 Clause 138 (from memory)
		{"400GBASE-SR8", "om4", 100, 1.9},    // IEEE 802.3 Clause 138 (from memory)
		{"400GBASE-SR8", "om5", 100, 1.9},    // IEEE 802.3 Clause 138 (from memory)
		{"400GBASE-SR4.2", "om3", 70, 1.8},   // IEEE 802.3 Clause 150 (from memory)
		{"400GBASE-SR4.2", "om4", 100, 1.9},  // IEEE 802.3 Clause 150 (from memory)
		{"400GBASE-SR4.2", "om5", 150, 2.0},  // IEEE 802.3 Clause 150 (from memory)
		{"400GBASE-DR4", "os2", 500, 3.0},    // IEEE 802.3 Clause 124 (from memory)
		{"400GBASE-FR4", "os2", 2000, 4.0},   // IEEE 802.3 Clause 151 (from memory)
		{"400GBASE-LR4-6", "os2", 6000, 6.3}, // IEEE 802.3 Clause 151 (from memory)
		{"400GBASE-LR8", "os2", 10000, 6.3},  // IEEE 802.3 Clause 122 (from memory)
	}
	n := 0
	for _, a := range c.Applications {
		n += len(a.Reach)
	}
	if n != len(cases) {
		t.Errorf("catalog has %d application-medium pairs, the table checks %d", n, len(cases))
	}
	for _, tc := range cases {
		t.Run(tc.app+" on "+tc.medium, func(t *testing.T) {
			a := c.Application(tc.app)
			if a == nil {
				t.Fatalf("%s: not in the catalog", tc.app)
			}
			r, ok := a.On(tc.medium)
			if !ok {
				t.Fatalf("%s: does not run on %s", tc.app, tc.medium)
			}
			if r.RangeM != tc.rangeM || r.MaxLossDB != tc.lossDB {
				t.Errorf("%s on %s: got %g m %g dB, want %g m %g dB", tc.app, tc.medium, r.RangeM, r.MaxLossDB, tc.rangeM, tc.lossDB)
			}
		})
	}
}

func TestCatalogApplications(t *testing.T) {
	t.Parallel()
	c := DefaultCatalog()
	cases := []struct {
		app         string
		rateGbps    float64
		wavelengths string
		strands     int
	}{
		{"1000BASE-T", 1, "", 1},           // IEEE 802.3 Clause 40: one 4-pair cable (seen)
		{"10GBASE-T", 10, "", 1},           // IEEE 802.3 Clause 55 (seen)
		{"1000BASE-SX", 1, "850", 2},       // IEEE 802.3 Clause 38 (seen)
		{"1000BASE-LX", 1, "1310", 2},      // IEEE 802.3 Clause 38 (seen)
		{"10GBASE-SR", 10, "850", 2},       // IEEE 802.3 Clause 52 (seen)
		{"10GBASE-LR", 10, "1310", 2},      // IEEE 802.3 Clause 52 (from memory)
		{"10GBASE-ER", 10, "1550", 2},      // IEEE 802.3 Clause 52 (seen)
		{"25GBASE-SR", 25, "850", 2},       // IEEE 802.3 Clause 112 (seen)
		{"25GBASE-LR", 25, "1310", 2},      // IEEE 802.3 Clause 114 (seen)
		{"40GBASE-SR4", 40, "850", 8},      // IEEE 802.3 Clause 86, 8 fibres (seen)
		{"40GBASE-LR4", 40, "1310", 2},     // IEEE 802.3 Clause 87, CWDM (seen)
		{"100GBASE-SR4", 100, "850", 8},    // IEEE 802.3 Clause 95, 8 fibres (seen)
		{"100GBASE-LR4", 100, "1310", 2},   // IEEE 802.3 Clause 88, LAN-WDM (from memory)
		{"100GBASE-ER4", 100, "1310", 2},   // IEEE 802.3 Clause 88, LAN-WDM (seen)
		{"100GBASE-DR", 100, "1310", 2},    // IEEE 802.3 Clause 140, one wavelength (from memory)
		{"100GBASE-FR1", 100, "1310", 2},   // IEEE 802.3 Clause 140 (from memory)
		{"100GBASE-LR1", 100, "1310", 2},   // IEEE 802.3 Clause 140 (from memory)
		{"400GBASE-SR8", 400, "850", 16},   // IEEE 802.3 Clause 138, 8 lanes each way (from memory)
		{"400GBASE-SR4.2", 400, "850", 8},  // IEEE 802.3 Clause 150, two wavelengths per fibre (from memory)
		{"400GBASE-DR4", 400, "1310", 8},   // IEEE 802.3 Clause 124, 4 lanes each way (from memory)
		{"400GBASE-FR4", 400, "1310", 2},   // IEEE 802.3 Clause 151, CWDM (from memory)
		{"400GBASE-LR4-6", 400, "1310", 2}, // IEEE 802.3 Clause 151, CWDM (from memory)
		{"400GBASE-LR8", 400, "1310", 2},   // IEEE 802.3 Clause 122, LAN-WDM (from memory)
	}
	if len(c.Applications) != len(cases) {
		t.Errorf("catalog has %d applications, the table checks %d", len(c.Applications), len(cases))
	}
	for _, tc := range cases {
		t.Run(tc.app, func(t *testing.T) {
			a := c.Application(tc.app)
			if a == nil {
				t.Fatalf("%s: not in the catalog", tc.app)
			}
			if a.RateGbps != tc.rateGbps || joinInts(a.WavelengthsNM, "/") != tc.wavelengths || a.Strands != tc.strands || a.Transceiver != tc.app {
				t.Errorf("%s: got %g Gb/s %q nm %d strands key %q, want %g %q %d %q", tc.app, a.RateGbps,
					joinInts(a.WavelengthsNM, "/"), a.Strands, a.Transceiver, tc.rateGbps, tc.wavelengths, tc.strands, tc.app)
			}
		})
	}
}

// Cabled attenuation maxima per medium and construction, and connection defaults.
func TestCatalogTIA5683D(t *testing.T) {
	t.Parallel()
	c := DefaultCatalog()
	if c.MatedPairDB != 0.75 { // ANSI/TIA-568.3-D mated connector pair (seen as fragment)
		t.Errorf("mated pair: got %g dB, want 0.75", c.MatedPairDB)
	}
	if c.SpliceDB != 0.3 { // ANSI/TIA-568.3-D splice (from memory)
		t.Errorf("splice: got %g dB, want 0.3", c.SpliceDB)
	}
	cases := []struct {
		medium, construction string
		nm                   int
		want                 float64
	}{
		{"om3", "ofnr-riser", 850, 3.5},      // ANSI/TIA-568.3-D multimode (from memory)
		{"om3", "ofnr-riser", 1300, 1.5},     // ANSI/TIA-568.3-D multimode (from memory)
		{"om4", "osp-loose-tube", 850, 3.5},  // ANSI/TIA-568.3-D multimode, any construction (from memory)
		{"om5", "indoor-outdoor", 1300, 1.5}, // ANSI/TIA-568.3-D multimode (from memory)
		{"os2", "ofnr-riser", 1310, 1.0},     // ANSI/TIA-568.3-D inside plant (from memory)
		{"os2", "ofnp-plenum", 1550, 1.0},    // ANSI/TIA-568.3-D inside plant (from memory)
		{"os2", "indoor-outdoor", 1310, 0.5}, // ANSI/TIA-568.3-D indoor/outdoor (from memory)
		{"os2", "osp-loose-tube", 1310, 0.5}, // ANSI/TIA-568.3-D outside plant (OSP seen as fragment)
		{"os2", "osp-loose-tube", 1550, 0.5}, // ANSI/TIA-568.3-D outside plant (OSP seen as fragment)
	}
	for _, tc := range cases {
		t.Run(tc.medium+" "+tc.construction, func(t *testing.T) {
			got, ok := c.Medium(tc.medium).Construction(tc.construction).AttenDBPerKm(tc.nm)
			if !ok || got != tc.want {
				t.Errorf("%s %s at %d nm: got %g (%v), want %g dB/km", tc.medium, tc.construction, tc.nm, got, ok, tc.want)
			}
		})
	}
	if _, ok := c.Medium("cat6a").Constructions[0].AttenDBPerKm(850); ok {
		t.Error("copper has an optical attenuation")
	}
}

func TestCatalogMechanical(t *testing.T) {
	t.Parallel()
	c := DefaultCatalog()
	eng, err := NewEngine(c, nil, nil, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name, medium, construction string
		unloadedOD, loadedOD       float64
		maxPullN                   float64
	}{
		{"OSP fibre", "os2", "osp-loose-tube", 10, 20, 2670},      // ANSI/TIA-568.3-D: 10/20 x OD (from memory, seen in a secondary guide); 2670 N (seen as fragment)
		{"OSP multimode", "om4", "osp-loose-tube", 10, 20, 2670},  // ANSI/TIA-568.3-D, as above
		{"indoor/outdoor", "om3", "indoor-outdoor", 10, 20, 2670}, // ANSI/TIA-568.3-D, more than 12 fibres (from memory)
		{"riser backbone", "os2", "ofnr-riser", 10, 20, 1335},     // bend: ANSI/TIA-568.3-D backbone (from memory); tension: typical manufacturer value, no published standard
		{"4-pair UTP", "cat6a", "cmr-riser", 4, 4, 110},           // ANSI/TIA-568.2: 4 x OD, 110 N = 25 lbf (seen)
		{"4-pair UTP plenum", "cat6a", "cmp-plenum", 4, 4, 110},   // ANSI/TIA-568.2 (seen)
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			k := c.Medium(tc.medium).Construction(tc.construction)
			if k.BendRadiusUnloadedOD != tc.unloadedOD || k.BendRadiusLoadedOD != tc.loadedOD || k.MaxPullN != tc.maxPullN {
				t.Errorf("%s: got %g/%g x OD, %g N; want %g/%g x OD, %g N", tc.name, k.BendRadiusUnloadedOD,
					k.BendRadiusLoadedOD, k.MaxPullN, tc.unloadedOD, tc.loadedOD, tc.maxPullN)
			}
		})
	}
	t.Run("pull rating by size", func(t *testing.T) {
		// ANSI/TIA-568.3-D: indoor-outdoor cable of 12 fibres or fewer 1335 N (300 lbf), of
		// more 2670 N (600 lbf) (from memory); other constructions one rating for every size.
		for _, tc := range []struct {
			medium, construction string
			strands              int
			wantN                float64
		}{{"os2", "indoor-outdoor", 12, 1335}, {"om4", "indoor-outdoor", 6, 1335}, {"os2", "indoor-outdoor", 24, 2670},
			{"os2", "osp-loose-tube", 12, 2670}, {"os2", "ofnr-riser", 12, 1335}} {
			m := c.Medium(tc.medium)
			k := m.Construction(tc.construction)
			cables, _ := eng.Cables(m, k, tc.strands)
			s := cables.Largest()
			if got := k.PullRatingN(s); got != tc.wantN {
				t.Errorf("%s %s, %d strands (size %d): rated %g N, want %g N", tc.medium, tc.construction, tc.strands, s.Count, got, tc.wantN)
			}
		}
	})
	t.Run("bend radius in mm", func(t *testing.T) {
		m := c.Medium("os2")
		k := m.Construction("osp-loose-tube")
		cables, _ := eng.Cables(m, k, 24)
		s, n := cables.Largest(), len(cables)
		// computed: 20 x 10.5 mm loaded, 10 x 10.5 mm unloaded (OD is a typical manufacturer value)
		if n != 1 || s.Count != 24 || k.BendRadiusMM(s, true) != 210 || k.BendRadiusMM(s, false) != 105 {
			t.Errorf("got size %d x%d, %g/%g mm, want 24 x1, 210/105 mm", s.Count, n, k.BendRadiusMM(s, true), k.BendRadiusMM(s, false))
		}
	})
	t.Run("cables", func(t *testing.T) {
		// The demo book prices every size dearer than the next smaller one, so the cheapest set
		// of the fewest cables is the smallest size that holds the strands, with the largest
		// sizes before it beyond the largest (the catalog's TIA-598 common-practice counts).
		m := c.Medium("om4")
		k := m.Construction("ofnr-riser")
		for _, tc := range []struct {
			strands int
			want    string
		}{{0, "12"}, {2, "12"}, {13, "24"}, {288, "288"}, {300, "288 + 12"}, {576, "2 × 288"}, {600, "288 + 288 + 24"}} {
			cables, _ := eng.Cables(m, k, tc.strands)
			if got := cables.Text(); got != tc.want {
				t.Errorf("%d strands: got %s, want %s", tc.strands, got, tc.want)
			}
		}
	})
	t.Run("strand counts", func(t *testing.T) {
		// TIA-598 common practice counts include 12, 24, 48, 72, 96, 144, 288 (seen)
		for _, m := range c.Media {
			if !m.Fibre() {
				continue
			}
			for _, k := range m.Constructions {
				var got []int
				for _, s := range k.Sizes {
					got = append(got, s.Count)
				}
				if joinInts(got, ",") != "12,24,48,72,96,144,288" {
					t.Errorf("%s %s: sizes %v", m.ID, k.ID, got)
				}
			}
		}
	})
}

func TestCatalogJacketColours(t *testing.T) {
	t.Parallel()
	c := DefaultCatalog()
	cases := []struct{ medium, construction, want string }{
		{"om3", "ofnr-riser", "aqua"},       // TIA-598, aqua OM3/OM4 (seen)
		{"om4", "ofnp-plenum", "aqua"},      // TIA-598 (seen)
		{"om5", "ofnr-riser", "lime green"}, // TIA-598, lime green OM5 (seen)
		{"os2", "ofnr-riser", "yellow"},     // TIA-598, yellow single-mode (seen)
		{"os2", "osp-loose-tube", "black"},  // TIA-598: outside-plant jackets usually black (seen)
		{"om4", "osp-loose-tube", "black"},  // TIA-598 (seen)
		{"cat6a", "cmr-riser", ""},          // TIA-598 covers fibre only
	}
	for _, tc := range cases {
		t.Run(tc.medium+" "+tc.construction, func(t *testing.T) {
			if got := c.Medium(tc.medium).Construction(tc.construction).JacketColour; got != tc.want {
				t.Errorf("%s %s: got %q, want %q", tc.medium, tc.construction, got, tc.want)
			}
		})
	}
}

func TestParseRate(t *testing.T) {
	t.Parallel()
	cases := []struct {
		in      string
		want    float64
		wantErr string
	}{
		{"1G", 1, ""},
		{"10G", 10, ""},
		{"25G", 25, ""},
		{"40G", 40, ""},
		{"100G", 100, ""},
		{"10", 10, ""},
		{"10g", 10, ""},
		{"10Gb/s", 10, ""},
		{" 40G ", 40, ""},
		{"2.5G", 0, `no application runs at 2.5G; the catalog has 1G, 10G, 25G, 40G, 100G`},
		{"400G", 400, ""},
		{"800G", 0, `no application runs at 800G`},
		{"fast", 0, `rate "fast": want a rate such as 10G`},
		{"", 0, `want a rate such as 10G`},
		{"-10G", 0, `want a rate such as 10G`},
	}
	for _, tc := range cases {
		t.Run(tc.in, func(t *testing.T) {
			got, err := ParseRate(tc.in)
			if tc.wantErr == "" {
				if err != nil || got != tc.want {
					t.Errorf("%q: got %g, %v; want %g", tc.in, got, err, tc.want)
				}
				return
			}
			if err == nil || !strings.Contains(err.Error(), tc.wantErr) || !errors.Is(err, ErrBadValue) {
				t.Errorf("%q: got error %v, want one containing %q", tc.in, err, tc.wantErr)
			}
		})
	}
}

// TestRateText (tester 14 F8): every spelling ParseRate reads is written in one form, so that
// outputs (links.csv's rate column) and a sweep mixing spellings show one rate; what is no
// rate is left as given for ParseRate to refuse. The project's rule, not a standard's.
func TestRateText(t *testing.T) {
	t.Parallel()
	for in, want := range map[string]string{
		"10G": "10G", "10Gb": "10G", "10 Gbps": "10G", "10g": "10G", "10": "10G", "10Gb/s": "10G", " 40G ": "40G",
		"2.5G": "2.5G", "100 gbit/s": "100G", "fast": "fast", "": "", "-10G": "-10G",
	} {
		if got := RateText(in); got != want {
			t.Errorf("RateText(%q) = %q, want %q", in, got, want)
		}
		if r, err := ParseRate(in); err == nil && RateText(in) != FormatRate(r) {
			t.Errorf("RateText(%q) = %q, ParseRate reads %s", in, RateText(in), FormatRate(r))
		}
	}
}

func TestCatalogTable(t *testing.T) {
	t.Parallel()
	c := DefaultCatalog()
	cases := []struct {
		name     string
		rateGbps float64
		golden   string
	}{
		{"all rates", 0, "table_all.golden.txt"},
		{"10G", 10, "table_10g.golden.txt"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			var a, b bytes.Buffer
			if err := c.Table(&a, tc.rateGbps); err != nil {
				t.Fatal(err)
			}
			if err := c.Table(&b, tc.rateGbps); err != nil || a.String() != b.String() {
				t.Fatalf("%s: two runs differ", tc.name)
			}
			golden(t, filepath.Join("testdata", tc.golden), a.Bytes())
		})
	}
	t.Run("10G rows", func(t *testing.T) {
		var buf bytes.Buffer
		if err := c.Table(&buf, 10); err != nil {
			t.Fatal(err)
		}
		out := buf.String()
		// "52": IEEE 802.3 Clause 52, the clause the catalog gives 10GBASE-SR and -ER (tester 14
		// F12: the report says spanwright media prints the clauses).
		for _, want := range []string{"10GBASE-SR   52 ", "om4", "400", "2.90", "aqua", "10GBASE-ER   52 ", "30000", "11.00"} {
			if !strings.Contains(out, want) {
				t.Errorf("10G table lacks %q:\n%s", want, out)
			}
		}
		if strings.Contains(out, "1000BASE-SX") || strings.Contains(out, "100GBASE") {
			t.Errorf("10G table lists other rates:\n%s", out)
		}
	})
	t.Run("unknown rate", func(t *testing.T) {
		if err := c.Table(&bytes.Buffer{}, 2.5); err == nil || !strings.Contains(err.Error(), "no application runs at 2.5G") {
			t.Errorf("got %v, want an error naming 2.5G", err)
		}
	})
}

// golden compares got with the golden file, or rewrites it under -update.
func golden(t *testing.T, path string, got []byte) {
	t.Helper()
	if *update {
		if err := os.WriteFile(path, got, 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./media/ -update to create it)", err)
	}
	if !bytes.Equal(got, want) {
		t.Errorf("%s differs from the output (go test ./media/ -update rewrites it):\ngot:\n%s\nwant:\n%s", path, got, want)
	}
}

// Bad catalogs are rejected with the file, line, item and field of every problem.
func TestCatalogBad(t *testing.T) {
	t.Parallel()
	cases := []struct {
		file     string
		sentinel error
		want     []string
	}{
		{"neg_atten.yaml", ErrBadValue, []string{`neg_atten.yaml:8:34: medium "om4": attenuation_db_per_km.850: want dB/km from 0 to 1000, got -3.5`}},
		{"missing_range.yaml", ErrMissingField, []string{`missing_range.yaml:25:9: application "10GBASE-SR" on "om4": range_m: missing`}},
		{"unknown_field.yaml", ErrUnknownField, []string{`unknown_field.yaml:8:5: medium "om4": colour: unknown key`}},
		// Review 21 F6: the keys that held the derived margin before 2026-12-06 are refused,
		// not added on top of it.
		{"old_margins.yaml", ErrBadValue, []string{
			`old_margins.yaml:4:3: margins: multimode_db: no longer read: since 2026-12-06 the margin of each link is derived from its mated pairs and splices`,
			`old_margins.yaml:5:3: margins: singlemode_db: no longer read: `,
		}},
		{"dup_id.yaml", ErrDuplicateID, []string{`dup_id.yaml:18:5: medium "om4": id: medium "om4" already defined at line 4`}},
		{"unknown_medium.yaml", ErrUnknownReference, []string{`unknown_medium.yaml:25:9: application "10GBASE-SR" on "om9": medium: no medium "om9"`}},
		{"many.yaml", ErrWrongType, []string{
			`many.yaml:8:5: medium "om4": colour: unknown key`,
			`many.yaml:9:34: medium "om4": attenuation_db_per_km.850: `,
			`many.yaml:18:36: medium "om4" construction "riser": sizes[0].od_mm: want a number, got "six"`,
			`many.yaml:26:9: application "10GBASE-SR" on "om4": range_m: missing`,
		}},
	}
	for _, tc := range cases {
		t.Run(tc.file, func(t *testing.T) {
			_, err := LoadCatalog(filepath.Join("testdata", "bad", tc.file))
			if err == nil {
				t.Fatalf("%s: no error", tc.file)
			}
			if !errors.Is(err, tc.sentinel) {
				t.Errorf("%s: error %v is not %v", tc.file, err, tc.sentinel)
			}
			lines := strings.Split(err.Error(), "\n")
			if len(lines) != len(tc.want) {
				t.Errorf("%s: got %d problems, want %d:\n%v", tc.file, len(lines), len(tc.want), err)
			}
			for i, w := range tc.want {
				if i < len(lines) && !strings.Contains(lines[i], w) {
					t.Errorf("%s: problem %d:\ngot  %s\nwant %s", tc.file, i, lines[i], w)
				}
			}
		})
	}
}

func TestCatalogParseErrors(t *testing.T) {
	t.Parallel()
	good, err := os.ReadFile(filepath.Join("testdata", "good_small.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	if _, err := ParseCatalog("good_small.yaml", good); err != nil {
		t.Fatalf("good_small.yaml: %v", err)
	}
	cases := []struct {
		name, old, new, want string
	}{
		{"not YAML", "media:", "media: [", "x.yaml:"},
		{"empty", string(good), "", "x.yaml: not YAML: empty file"},
		{"bad kind", "kind: multimode", "kind: plastic", `medium "om4": kind: want copper, multimode or singlemode, got "plastic"`},
		{"bad id", "id: om4", "id: OM 4", `id: want lower-case letters`},
		{"duplicate key", "    name: OM4\n", "    name: OM4\n    name: OM4b\n", `:6:5: media[0].name: given twice, at line 5 and line 6; remove one`},
		{"wrong wavelength", "wavelengths_nm: [850]", "wavelengths_nm: [1310]", `medium "om4" construction "riser" has no attenuation at 1310 nm`},
		{"copper loss", "kind: multimode", "kind: copper", `copper has no optical attenuation`},
		{"zero range", "range_m: 400", "range_m: 0", `range_m: want metres above 0 and at most 1000000, got 0`},
		{"missing loss", "        max_loss_db: 2.9\n", "", `max_loss_db: missing`},
		{"bool as number", "outdoor_rated: false", "outdoor_rated: 0", `outdoor_rated: want true or false, got "0"`},
		{"infinite", "range_m: 400", "range_m: .inf", `want metres above 0 and at most 1000000, got +Inf`},
		{"rate zero", "rate_gbps: 10", "rate_gbps: 0", `rate_gbps: `},
		{"no sizes", "sizes: [{count: 12, od_mm: 6, weight_kg_per_m: 0.035}]", "sizes: []", `want at least one size`},
		// IEEE 754: NaN fails every comparison, so a "< 0" check lets it through.
		{"NaN loss", "splice_db: 0.3", "splice_db: .nan", `connections.splice_db: want dB from 0 to 100, got NaN`},
		// Go spec: int is 64 bits here; the largest int64 is no strand count.
		{"huge strands", "strands: 2", "strands: 9223372036854775807", `strands: want an integer from 1 to 10000, got 9223372036854775807`},
		{"huge reach", "range_m: 400", "range_m: 1e308", `range_m: want metres above 0 and at most 1000000, got 1e+308`},
		// ITU-T G.Sup39: the optical bands end at 1675 nm.
		{"wavelength out of range", "wavelengths_nm: [850]", "wavelengths_nm: [85000]", `wavelengths_nm[0]: want a whole number of nm from 400 to 2000, got 85000`},
		// YAML 1.2.2 §3.2.1.1: the keys of a mapping are unique.
		{"duplicate nested key", "connections: {mated_pair_db: 0.75, splice_db: 0.3}", "connections: {mated_pair_db: 0.75, splice_db: 0.3, splice_db: 0.1}", `x.yaml:2:52: connections.splice_db: given twice on line 2, at columns 36 and 52`},
		{"duplicate top-level key", "connections: {mated_pair_db: 0.75, splice_db: 0.3}\n", "connections: {mated_pair_db: 0.75, splice_db: 0.3}\nconnections: {mated_pair_db: 0.1, splice_db: 0.1}\n", `x.yaml:3:1: connections: given twice, at line 2 and line 3; remove one`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			data := strings.Replace(string(good), tc.old, tc.new, 1)
			if data == string(good) {
				t.Fatalf("%s: replacement did not apply", tc.name)
			}
			_, err := ParseCatalog("x.yaml", []byte(data))
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: got %v, want an error containing %q", tc.name, err, tc.want)
			}
		})
	}
}

func TestDefaultCatalogFresh(t *testing.T) {
	t.Parallel()
	a, b := DefaultCatalog(), DefaultCatalog()
	a.Media[0].ID = "changed"
	if b.Media[0].ID != "cat6a" {
		t.Error("DefaultCatalog returns shared data")
	}
	ids := []string{}
	for _, m := range b.Media {
		ids = append(ids, m.ID)
	}
	if strings.Join(ids, ",") != "cat6a,om3,om4,om5,os2" {
		t.Errorf("media ids %v", ids)
	}
}
