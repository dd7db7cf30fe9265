package route_test

import (
	"math"
	"strings"
	"testing"

	"spanwright/media"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/items"
	"spanwright/route/plan"
)

// poleLineCampus is a hub A whose duct D runs out to a riser pole at x = 100 m, where the pole
// line P (existing, poles at x = 100, 200, 300 and 400 m) is hung east. Building C stands 12 m
// north of the pole at x = 200 and has no pathway of its own: one counted lateral, down that
// pole. Building G stands 15 m south of the pole at x = 300; a proposed duct Q, from the riser
// pole south and east, passes 10 m from G's other side, so G gets a counted lateral to each
// (an existing and a proposed pathway): two entrances, the one down the pole the cheaper by far.
func poleLineCampus() string {
	return `{"type":"FeatureCollection","features":[` + strings.Join([]string{
		testsite.Box("A", "mc", 10, 25), testsite.Box("C", "", 200, 22), testsite.Box("G", "", 300, -25),
		line("D", `,"spare_ducts":2`, 10, 15, 10, 0, 100, 0),
		testsite.Pathway("P", "aerial", 100, 0, 200, 0, 300, 0, 400, 0),
		line("Q", `,"status":"proposed","surface":"turf"`, 100, 0, 100, -45, 300, -45),
	}, ",") + `]}`
}

// tiaMaxAttenuation is the maximum cabled attenuation of ANSI/TIA-568.3-D, in dB/km, by
// medium and wavelength: multimode 3.5 at 850 nm and 1.5 at 1300 nm, single-mode outside
// plant and indoor/outdoor 0.5 at 1310 and 1550 nm.
var tiaMaxAttenuation = map[string]map[int]float64{
	"om3": {850: 3.5, 1300: 1.5}, "om4": {850: 3.5, 1300: 1.5}, "os2": {1310: 0.5, 1550: 0.5},
}

// TestPoleRiserCable: a counted lateral that leaves a pole line comes down the pole in a
// riser (README "Pathway types"), and the cable in it, design.pole_riser_m (6 m by default:
// a communication cable is attached some 5 to 6 m up, from memory; common practice, no
// published source), is a riser of the leg: the leg's risers, its channel, its loss budget
// (ANSI/TIA-568.3-D maximum cabled attenuation over the 6 m), its cut length (ceil(channel ×
// 1.05), the design's 5 % waste) and the optimizer's objective all move by it, at an end with
// one entrance (C) and at one with two (G, whose entrance edge carries it), while a pole
// riser of 0 m counts none. Before the fix the 6 m were in no leg (installer's reel 6 m short).
func TestPoleRiserCable(t *testing.T) {
	t.Parallel()
	solve := func(poleM float64) *route.Result {
		r, err := testplan.PullSolveJSON(t, poleLineCampus(), func(p *plan.Plan) { p.Design.PoleRiserM = poleM })
		if err != nil {
			t.Fatal(err)
		}
		return r
	}
	if plan.Default.Design.PoleRiserM != 6 {
		t.Fatalf("default pole_riser_m %g; want 6", plan.Default.Design.PoleRiserM)
	}
	with, without := solve(6), solve(0)
	if n := len(with.Site.Net.EntrancesOf("G")); n != 2 {
		t.Fatalf("G has %d entrances; the test wants two (a lateral to each pathway status)", n)
	}
	buildingRisersM := 2 * 15.0 // riser_m defaults to 15 m a building
	for _, id := range []string{"A-C", "A-G"} {
		_, l := testplan.LegOf(t, with, id)
		_, l0 := testplan.LegOf(t, without, id)
		e, _ := with.Site.Net.Entry(l.Link.To, l.EntranceTo)
		if !e.PoleRiser {
			t.Fatalf("%s: enters %s by %s, not down a pole; the test wants the pole's lateral", id, l.Link.To, e.ID)
		}
		if l.EntranceTo != l0.EntranceTo || l.Medium != l0.Medium || l.Construction != l0.Construction || l.Cable.Joins != 0 || l0.Cable.Joins != 0 {
			t.Fatalf("%s: the plans differ beyond the riser (%s %s %s, %s %s %s, joins %d, %d)", id,
				l.EntranceTo, l.Medium, l.Construction, l0.EntranceTo, l0.Medium, l0.Construction, l.Cable.Joins, l0.Cable.Joins)
		}
		if l.PoleRiserM != 6 || l.RiserM != buildingRisersM+6 || l0.PoleRiserM != 0 || l0.RiserM != buildingRisersM {
			t.Errorf("%s: risers %.1f m (%.1f down the pole), without %.1f (%.1f); want 36 (6), 30 (0)", id, l.RiserM, l.PoleRiserM, l0.RiserM, l0.PoleRiserM)
		}
		if got := l.Cable.ChannelM - l0.Cable.ChannelM; math.Abs(got-6) > 1e-9 {
			t.Errorf("%s: channel moved %.3f m; want 6", id, got)
		}
		if want := math.Ceil(l.Cable.ChannelM*1.05 - 1e-9); l.Cable.LengthM != want {
			t.Errorf("%s: cut %.0f m; want %.0f (channel %.2f m with 5 %% waste)", id, l.Cable.LengthM, want, l.Cable.ChannelM)
		}
		att, ok := tiaMaxAttenuation[l.Medium]
		if !ok {
			t.Fatalf("%s: medium %s; the test knows om3, om4 and os2", id, l.Medium)
		}
		for k, x := range l.Losses {
			if want := att[x.WavelengthNM] * 0.006; math.Abs(x.LossDB-l0.Losses[k].LossDB-want) > 1e-9 {
				t.Errorf("%s at %d nm: loss moved %.5f dB; want %.5f (6 m at %.1f dB/km)", id, x.WavelengthNM, x.LossDB-l0.Losses[k].LossDB, want, att[x.WavelengthNM])
			}
		}
	}
	// The optimizer pays what the bill counts for the riser's cable: its metres with waste at
	// the option's price and its pull, as duct, for each leg.
	pb := with.Engine.PriceBook()
	var want int64
	for _, id := range []string{"A-C", "A-G"} {
		_, l := testplan.LegOf(t, with, id)
		var perMCents int64 // every cable of the leg (media.Cables)
		for _, c := range l.Cable.Cables {
			price, _ := pb.Price(media.PriceKey{Item: media.PriceCable, Medium: l.Medium, Construction: l.Construction, Count: c.Count})
			perMCents += price
		}
		want += media.MulCents(perMCents, 6*1.05) + pb.Cents(items.Pull("duct", 6))
	}
	if got := with.ObjectiveCents - without.ObjectiveCents; math.Abs(float64(got-want)) > 2 {
		t.Errorf("objective moved %s; want %s (2 × 6.3 m of cable and 6 m pulled)", media.FormatCents(got), media.FormatCents(want))
	}
}
