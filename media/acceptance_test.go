package media

import (
	"math"
	"slices"
	"testing"
)

// TestFieldLimitFutureRate: a link planned at 1 Gb/s that must carry 10 Gb/s later is
// accepted for 10 Gb/s too. 250 m of OM3 channel: ANSI/TIA-568.3-D link limit at 850 nm
// 0.25 km x 3.5 dB/km + 2 x 0.75 + 2 x 0.3 = 2.975 dB (from memory, REFERENCES.md);
// 1000BASE-SX allows 3.56 dB (IEEE 802.3 Clause 38, seen), 10GBASE-SR on OM3 2.6 dB (IEEE
// 802.3 Clause 52, from memory, REFERENCES.md), so 10GBASE-SR sets the field limit, 2.6 dB,
// though the link runs 1000BASE-SX today. At 1300 nm no application of the two operates: the
// link limit, 0.25 x 1.5 + 2.1 = 2.475 dB.
func TestFieldLimitFutureRate(t *testing.T) {
	t.Parallel()
	c := DefaultCatalog()
	c.Media = slices.DeleteFunc(c.Media, func(m *Medium) bool { return m.ID != "om3" })
	e := newEngine(t, c, nil, EngineOptions{})
	l := Link{ID: "F", RouteM: 230, RiserM: 10, SlackM: 10, RateGbps: 1, FutureRateGbps: 10, ConnectorPairs: 2, Strands: 2}
	ch := e.Choose(l)
	if !ch.Feasible || ch.Application != "1000BASE-SX" {
		t.Fatalf("1000BASE-SX on 250 m of OM3 with a future 10 Gb/s: %s", ch.Reason)
	}
	want := map[int]struct {
		limitDB, cablingDB float64
		by                 string
	}{850: {2.6, 2.975, "10GBASE-SR"}, 1300: {2.475, 2.475, FieldLimitByCabling}}
	for _, x := range ch.Losses {
		w := want[x.WavelengthNM]
		if math.Abs(x.FieldLimitDB-w.limitDB) > 1e-9 || math.Abs(x.CablingLimitDB-w.cablingDB) > 1e-9 || x.FieldLimitBy != w.by {
			t.Errorf("%d nm: field limit %.3f dB by %s (cabling %.3f), want %.3f by %s (cabling %.3f)",
				x.WavelengthNM, x.FieldLimitDB, x.FieldLimitBy, x.CablingLimitDB, w.limitDB, w.by, w.cablingDB)
		}
	}
	// Without the future rate 1000BASE-SX's 3.56 dB is above the link limit, which decides.
	l.FutureRateGbps = 0
	for _, x := range e.Choose(l).Losses {
		if x.FieldLimitBy != FieldLimitByCabling || x.FieldLimitDB != x.CablingLimitDB {
			t.Errorf("%d nm without the future rate: field limit %.3f by %s, want the link limit %.3f", x.WavelengthNM, x.FieldLimitDB, x.FieldLimitBy, x.CablingLimitDB)
		}
	}
}

// TestFieldLimitLessAttenuator: the attenuator at the receiver uses up part of the
// application's channel insertion loss in service, though the link is tested without it, so
// the field limit the application sets is its loss limit less the attenuator. 10GBASE-ER's
// receiver takes at least 5 dB (IEEE 802.3 Clause 52, Tables 52-16 and 52-17, seen in a vendor
// manual), here with a synthetic channel insertion loss of 6 dB (not IEEE's 11 dB, so that the
// application decides) over 2 km of outside-plant single-mode at 1550 nm: design 2 x 0.5 dB/km
// (ANSI/TIA-568.3-D maximum, from memory) + 2 x 0.5 + 2 x 0.3 = 2.6 dB, 2.4 dB short of 5, so the
// demo book's 3 dB attenuator; link limit 1.0 + 2 x 0.75 + 0.6 = 3.1 dB (ANSI/TIA-568.3-D,
// from memory); the application leaves 6 − 3 = 3.0 dB, which sets the field limit.
func TestFieldLimitLessAttenuator(t *testing.T) {
	t.Parallel()
	c := DefaultCatalog()
	e := newEngine(t, c, nil, EngineOptions{})
	er := c.Application("10GBASE-ER")
	k := c.Medium("os2").Construction("osp-loose-tube")
	b := e.budgetFor(k, er, []Reach{{RangeM: 40000, MaxLossDB: 6}}, 2000, 2, 2, 0.5)
	if b.attDB != 3 {
		t.Fatalf("attenuator %d dB, want 3", b.attDB)
	}
	x := b.losses[slices.IndexFunc(b.losses, func(x Loss) bool { return x.WavelengthNM == 1550 })]
	if x.LossDB != 5.6 || x.CablingLimitDB != 3.1 || x.FieldLimitDB != 3 || x.FieldLimitBy != "10GBASE-ER" {
		t.Errorf("1550 nm: loss %.3f, cabling limit %.3f, field limit %.3f by %s; want 5.6, 3.1, 3.0 by 10GBASE-ER",
			x.LossDB, x.CablingLimitDB, x.FieldLimitDB, x.FieldLimitBy)
	}
	// With IEEE's 11 dB the application leaves 8 dB: the link limit decides.
	b = e.budgetFor(k, er, []Reach{{RangeM: 40000, MaxLossDB: 11}}, 2000, 2, 2, 0.5)
	x = b.losses[slices.IndexFunc(b.losses, func(x Loss) bool { return x.WavelengthNM == 1550 })]
	if x.FieldLimitDB != 3.1 || x.FieldLimitBy != FieldLimitByCabling {
		t.Errorf("1550 nm, 11 dB: field limit %.3f by %s, want 3.1 by TIA-568.3-D", x.FieldLimitDB, x.FieldLimitBy)
	}
}
