package media

import (
	"errors"
	"strings"
	"testing"
)

func TestDefaultPriceBook(t *testing.T) {
	t.Parallel()
	p := DefaultPriceBook()
	if p.Label != "demo prices, invented, not a quotation" || p.Currency != "USD" || p.PricesDate != "2026-01-15" {
		t.Errorf("header: got %q %q %q", p.Label, p.Currency, p.PricesDate)
	}
	if !strings.Contains(string(pricesYAML[:200]), "INVENTED") {
		t.Error("the demo book's top comment does not say its prices are invented")
	}
	if p.ContingencyBP != 1000 || p.OverheadBP != 1200 || p.TaxBP != 725 || p.SpliceTrayStrands != 12 {
		t.Errorf("markups: got %d %d %d bp, tray %d", p.ContingencyBP, p.OverheadBP, p.TaxBP, p.SpliceTrayStrands)
	}
	money := []struct {
		key  PriceKey
		want int64
	}{
		{PriceKey{Item: PriceCable, Medium: "os2", Construction: "osp-loose-tube", Count: 12}, 143},
		{PriceKey{Item: PriceCable, Medium: "cat6a", Construction: "cmr-riser", Count: 1}, 95},
		{PriceKey{Item: PriceTermination, Medium: "om4"}, 1600},
		{PriceKey{Item: PriceSpliceTray}, 3800},
		{PriceKey{Item: PriceSpliceClosure}, 64000},
		{PriceKey{Item: PriceTransition}, 26000},
		{PriceKey{Item: PriceEnclosure, Count: 48}, 46000},
		{PriceKey{Item: PriceAdapterPanel, Count: 12}, 6800},
		{PriceKey{Item: PriceCopperPanel, Count: 24}, 16500},
		{PriceKey{Item: PriceInnerduct}, 240},
		{PriceKey{Item: PriceStructure, Name: "handhole"}, 240000},
		{PriceKey{Item: PriceTrench, Name: "asphalt"}, 9600},
		{PriceKey{Item: PriceBore}, 11500},
		{PriceKey{Item: PriceRestoration, Name: "concrete"}, 8800},
		{PriceKey{Item: PriceAddedDuct}, 750},
		{PriceKey{Item: PriceLabourHour}, 9200},
		{PriceKey{Item: PriceTransceiver, Name: "100GBASE-ER4"}, 145000},
	}
	for _, tc := range money {
		t.Run(tc.key.String(), func(t *testing.T) {
			if got, ok := p.Price(tc.key); !ok || got != tc.want {
				t.Errorf("%s: got %d (%v), want %d", tc.key, got, ok, tc.want)
			}
		})
	}
	rates := []struct {
		key  PriceKey
		want float64
	}{
		{PriceKey{Item: RatePull, Name: "aerial"}, 45},
		{PriceKey{Item: RateSplice}, 12},
		{PriceKey{Item: RateTermination}, 8},
		{PriceKey{Item: RateLossTest}, 20},
		{PriceKey{Item: RateOTDRTest}, 12},
	}
	for _, tc := range rates {
		if got, ok := p.Rate(tc.key); !ok || got != tc.want {
			t.Errorf("%s: got %g (%v), want %g", tc.key, got, ok, tc.want)
		}
	}
	if err := p.Check(Needs(DefaultCatalog())); err != nil {
		t.Errorf("demo book lacks catalog prices: %v", err)
	}
	keys := p.Keys()
	if len(keys) == 0 || keys[0].Item > keys[len(keys)-1].Item {
		t.Errorf("keys not sorted: %v", keys)
	}
}

func TestParseDecimal2(t *testing.T) {
	t.Parallel()
	cases := []struct {
		in   string
		want int64
		ok   bool
	}{
		{"12.35", 1235, true}, // a float would give 1234.9999…
		{"0.1", 10, true},
		{"0.29", 29, true}, // 0.29*100 = 28.999999999999996 in float64
		{"7", 700, true},
		{"1_000.5", 100050, true},
		{"19.99", 1999, true},
		{"12.345", 0, false},
		{"-1", 0, false},
		{"1e3", 0, false},
		{"", 0, false},
		{".5", 0, false},
		{"12.", 0, false},
		{"99999999999999999", 0, false},
	}
	for _, tc := range cases {
		t.Run(tc.in, func(t *testing.T) {
			got, ok := parseDecimal2(tc.in)
			if got != tc.want || ok != tc.ok {
				t.Errorf("%q: got %d %v, want %d %v", tc.in, got, ok, tc.want, tc.ok)
			}
		})
	}
}

func TestMoney(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		cents int64
		want  string
	}{{123456, "1234.56"}, {5, "0.05"}, {0, "0.00"}, {-1230, "-12.30"}} {
		if got := FormatCents(tc.cents); got != tc.want {
			t.Errorf("FormatCents(%d): got %q, want %q", tc.cents, got, tc.want)
		}
	}
	for _, tc := range []struct {
		cents, bp, want int64
	}{{10000, 725, 725}, {1999, 1000, 200}, {15, 5000, 8}, {-15, 5000, -8}, {123456, 0, 0}} {
		if got := ApplyBP(tc.cents, tc.bp); got != tc.want {
			t.Errorf("ApplyBP(%d, %d): got %d, want %d", tc.cents, tc.bp, got, tc.want)
		}
	}
	for _, tc := range []struct {
		cents int64
		qty   float64
		want  int64
	}{{143, 612, 87516}, {95, 100.5, 9548}, {168, 100.5, 16884}, {1, 0.5, 1}, {1, 0.49, 0}} {
		if got := MulCents(tc.cents, tc.qty); got != tc.want {
			t.Errorf("MulCents(%d, %g): got %d, want %d", tc.cents, tc.qty, got, tc.want)
		}
	}
}

func TestPriceBookBad(t *testing.T) {
	t.Parallel()
	good := string(pricesYAML)
	cases := []struct {
		name, old, new string
		sentinel       error
		want           string
	}{
		{"unknown key", "innerduct_per_m: 2.40", "innerduct_per_metre: 2.40", ErrUnknownField, `x.yaml:62:1: innerduct_per_metre: unknown key`},
		{"nested unknown key", "  splices_per_hour: 12", "  splice_per_hour: 12", ErrUnknownField, `labour.splice_per_hour: unknown key`},
		{"three decimals", "innerduct_per_m: 2.40", "innerduct_per_m: 2.405", ErrBadValue, `innerduct_per_m: want an amount >= 0 with at most two decimals, such as 12.35, got "2.405"`},
		{"negative", "  om4: 16.00", "  om4: -16.00", ErrBadValue, `termination_each.om4: `},
		{"text amount", "added_duct_per_m: 7.50", "added_duct_per_m: cheap", ErrBadValue, `added_duct_per_m: `},
		{"currency", "currency: USD", "currency: dollars", ErrBadValue, `currency: want an ISO 4217 code such as USD, got "dollars"`},
		{"date", "prices_date: 2026-01-15", "prices_date: 2026-13-45", ErrBadValue, `prices_date: want a date YYYY-MM-DD`},
		{"no label", "label: demo prices, invented, not a quotation\n", "", ErrMissingField, `label: missing`},
		{"surface", "  turf: 48.00", "  gravel: 48.00", ErrBadValue, `trench_per_m.gravel: want one of turf, asphalt, concrete, got "gravel"`},
		{"structure", "  pull-box: 850.00", "  vault: 850.00", ErrBadValue, `structures_each.vault: want one of pull-box, handhole, maintenance-hole`},
		{"pathway", "{duct: 60,", "{conduit: 60,", ErrBadValue, `labour.pull_m_per_hour.conduit: want one of duct, tunnel, aerial, buried, tray`},
		{"zero rate", "  splices_per_hour: 12", "  splices_per_hour: 0", ErrBadValue, `labour.splices_per_hour: want a number per hour above 0 and at most 1000000, got 0`},
		{"tax over 100", "  tax: 7.25", "  tax: 107.25", ErrBadValue, `markups_percent.tax: want a percentage from 0 to 100`},
		{"strand count", "cmr-riser: {1: 0.95}", "cmr-riser: {0: 0.95}", ErrBadValue, `cable_per_m.cat6a.cmr-riser.0: want an integer from 1 to 10000, got 0`},
		// IEEE 754: NaN fails every comparison, so a "<= 0" check lets it through.
		{"NaN rate", "  splices_per_hour: 12", "  splices_per_hour: .nan", ErrBadValue, `labour.splices_per_hour: want a number per hour above 0 and at most 1000000, got NaN`},
		{"huge tray", "splice_tray: {each: 38.00, strands: 12}", "splice_tray: {each: 38.00, strands: 9223372036854775807}", ErrBadValue, `splice_tray.strands: want an integer from 1 to 10000, got 9223372036854775807`},
		{"huge enclosure", "fibre_enclosures: {24: 310.00,", "fibre_enclosures: {2400000: 310.00,", ErrBadValue, `fibre_enclosures.2400000: want an integer from 1 to 10000, got 2400000`},
		// YAML 1.2.2 §3.2.1.1: the keys of a mapping are unique; yaml.v3 keeps the last.
		{"duplicate price", "fibre_enclosures: {24: 310.00,", "fibre_enclosures: {24: 1.00, 24: 310.00,", ErrDuplicateKey, `x.yaml:58:30: fibre_enclosures.24: given twice on line 58, at columns 20 and 30; remove one`},
		{"duplicate section", "splice_tray: {each: 38.00, strands: 12}", "splice_tray: {each: 38.00, strands: 12}\nsplice_tray: {each: 1.00, strands: 12}", ErrDuplicateKey, `x.yaml:51:1: splice_tray: given twice, at line 50 and line 51; remove one`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			data := strings.Replace(good, tc.old, tc.new, 1)
			if data == good {
				t.Fatalf("%s: replacement did not apply", tc.name)
			}
			_, err := ParsePriceBook("x.yaml", []byte(data))
			if err == nil || !strings.Contains(err.Error(), tc.want) || !errors.Is(err, tc.sentinel) {
				t.Errorf("%s: got %v, want %v containing %q", tc.name, err, tc.sentinel, tc.want)
			}
		})
	}
}

func TestPriceBookCheck(t *testing.T) {
	t.Parallel()
	p := DefaultPriceBook()
	needs := []PriceKey{
		{Item: PriceTransceiver, Name: "800GBASE-DR8"},
		{Item: PriceCable, Medium: "om4", Construction: "ofnr-riser", Count: 36},
		{Item: PriceTransceiver, Name: "10GBASE-SR"},
		{Item: RatePull, Name: "tunnel"},
		{Item: RatePull, Name: "submarine"},
		{Item: PriceTransceiver, Name: "800GBASE-DR8"},
	}
	err := p.Check(needs)
	if err == nil || !errors.Is(err, ErrMissingPrice) {
		t.Fatalf("got %v, want missing prices", err)
	}
	want := []string{
		`prices-demo.yaml (embedded): price "cable om4 ofnr-riser 36": missing; add cable_per_m.om4.ofnr-riser.36`,
		`prices-demo.yaml (embedded): price "pull-rate submarine": missing; add labour.pull_m_per_hour.submarine`,
		`prices-demo.yaml (embedded): price "transceiver 800GBASE-DR8": missing; add transceivers.800GBASE-DR8`,
	}
	if got := err.Error(); got != strings.Join(want, "\n") {
		t.Errorf("got:\n%s\nwant:\n%s", got, strings.Join(want, "\n"))
	}
}
