package routing

import (
	"math"
	"math/rand/v2"
	"slices"
	"strconv"
	"testing"

	"spanwright/geo"
	"spanwright/route/plan"
)

// TestPlaceJoins: with the fewest splice points to build, each join goes in a structure passed
// (a reel of reel_m carries reel_m / (1 + waste) of channel), the next reel starting there, and
// at a reel's end on its span only where no structure serves; reels are cut in whole metres
// with waste. The rule is common practice, no published source (splice closures in
// maintenance holes and handholes: TIA-758-B, from memory).
func TestPlaceJoins(t *testing.T) {
	d := plan.Design{ReelM: 105, WastePct: 5, SlackLoopStructureM: 3} // 100 m of channel a reel
	passes := []SplicePoint{{ID: "MH-1", ChannelM: 30}, {ID: "HH-2", ChannelM: 90}, {ID: "J7", Added: true, ChannelM: 150}, {ID: "MH-3", ChannelM: 260}}
	sp := &geo.Span{ID: "A-1", LengthM: 200}
	spans := []spanOnChannel{{span: sp, fromEnd: "MH-9", reverse: true, startM: 100}} // channel 100 → 300 m, drawn the other way
	splices, reels := fewerPoints(d, passes, spans, 300, 315, "B1")
	var at []string
	for _, p := range splices {
		at = append(at, p.Text(func(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) + " m" }))
	}
	// 300 m over structures at 30, 90, 150 and 260 m: no placement without a splice point
	// (none between 150 + 100 and 300 − 100 can follow J7, nor MH-3 anything before 160), and
	// with one, 3 joins: HH-2, J7 and the reel's end at 250 m, or HH-2, the reel's end at 190 m
	// and MH-3; the last join farthest on wins: 190 m is 90 m into A-1 in travel order, 110 m
	// from its from end, named as the end the distance counts from (tester 8 finding 9).
	want := []string{"HH-2", "no structure: on A-1, 110.0 m from the MH-9 end", "MH-3"}
	if !slices.Equal(at, want) {
		t.Errorf("joins at %q, want %q", at, want)
	}
	// 90, 100, 70 and 40 m of channel with 5 % waste, each up to a whole metre.
	if wantM := []float64{95, 105, 74, 42}; !slices.Equal(reels, wantM) {
		t.Errorf("reels %v, want %v", reels, wantM)
	}
	if s, r := fewerPoints(plan.Design{ReelM: 0}, passes, spans, 300, 315, "B1"); s != nil || !slices.Equal(r, []float64{315}) {
		t.Errorf("no reel limit: %v, %v", s, r)
	}
	if s, r := fewerPoints(d, passes, spans, 100, 105, "B1"); s != nil || !slices.Equal(r, []float64{105}) {
		t.Errorf("one reel's channel: %v, %v", s, r)
	}
}

// TestFewestJoins: the one placement of a leg's joins (CableTakeoff.cut) takes the fewest
// joins the reels allow, a structure wherever that costs no join more, a splice point to build
// only where none serves. Common practice, no published source (reel and slack figures
// invented; splice closures kept in maintenance holes and handholes: TIA-758-B, from memory).
func TestFewestJoins(t *testing.T) {
	at := func(ps []SplicePoint) []string {
		var out []string
		for _, p := range ps {
			out = append(out, p.Text(func(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) + " m" }))
		}
		return out
	}
	d := plan.Design{ReelM: 105, WastePct: 5, SlackLoopStructureM: 3} // 100 m of channel a reel
	// TestPlaceJoins's campus, 300 m: in structures HH-2, J7 and a splice point (3 joins);
	// three reels of 100 m take 2, at 100 and 200 m, each with a structure passed over.
	passes := []SplicePoint{{ID: "MH-1", ChannelM: 30}, {ID: "HH-2", ChannelM: 90}, {ID: "J7", Added: true, ChannelM: 150}, {ID: "MH-3", ChannelM: 260}}
	got := fewestJoins(d, passes, nil, 300, "B1")
	if want := []string{"no structure: 100.0 m along the cable from B1", "no structure: 200.0 m along the cable from B1"}; !slices.Equal(at(got), want) || !got[0].AtReelEnd || !got[1].AtReelEnd {
		t.Errorf("300 m: joins %q (%+v), want %q at the reels' ends", at(got), got, want)
	}
	// 280 m: still 2 joins, and now J7 (150) serves as the second: from HH-2 (90) or a splice
	// point at 100, J7 is within reach and 280 − 150 > 100 needs one more; from J7 the last
	// reel does not reach 280. From a splice point at 100, one at 200 reaches it; from HH-2
	// at 90 one at 190 does too, and HH-2 needs no splice point: HH-2 and a splice point at 190.
	got = fewestJoins(d, passes, nil, 280, "B1")
	if want := []string{"HH-2", "no structure: 190.0 m along the cable from B1"}; !slices.Equal(at(got), want) {
		t.Errorf("280 m: joins %q, want %q", at(got), want)
	}
	// Every structure serves: 250 m with HH-2 at 90 and J7 at 150: 2 joins, both in them.
	got = fewestJoins(d, passes[:3], nil, 250, "B1")
	if want := []string{"HH-2", "J7 (handhole to add)"}; !slices.Equal(at(got), want) {
		t.Errorf("250 m: joins %q, want %q", at(got), want)
	}
	// Tester 11 F4 (a 676 m channel on 500 m reels with 5 % waste and 15 m of splicing slack
	// a cable end: 476.19 m of channel a reel): a handhole 29.5 m from the building and the
	// next structure at 499.6 m. A join in the handhole leaves the next reel reaching
	// 29.5 + 476.19 − 30 = 475.7 m (499.5 on its waste): a splice point still, and 2 joins (the
	// plan before). One splice point 461.19 m out (476.19 − 15) does with one, whichever
	// order: the fewest joins, or the fewest splice points and then joins.
	d2 := plan.Design{ReelM: 500, WastePct: 5, SpliceSlackM: 15, SlackLoopStructureM: 3}
	farm := []SplicePoint{{ID: "J0010", Added: true, ChannelM: 29.5}, {ID: "MH-1", ChannelM: 499.6}}
	fewer, _ := fewerPoints(d2, farm, nil, 676.1, 710, "FARM")
	for _, got := range [][]SplicePoint{fewestJoins(d2, farm, nil, 676.1, "FARM"), fewer} {
		if len(got) != 1 || !got[0].NoStructure || !got[0].AtReelEnd || math.Abs(got[0].ChannelM-(500/1.05-15)) > 1e-9 {
			t.Errorf("joins %+v, want one splice point at %.2f m", got, 500/1.05-15)
		}
	}
}

// TestPlaceJoinsSpliceSlack: each cable end at a mid-span join carries design.splice_slack_m
// of splicing slack (the join is made above ground beside the structure and the slack is
// coiled there with the closure; common practice, no published source: 10–15 m an end, from
// memory), so a reel reaches splice_slack_m less before a join at its end, 2 × less between
// two joins, and each reel is cut with the slack of its joined ends. TestPlaceJoins's campus
// with 5 m of splicing slack: HH-2 (90 m, within 100 − 5), a splice point at 180 m (90 + 100
// − 10), 120 m from A-1's MH-9 end, then MH-3 (260 m, within 180 + 100 − 10), one splice
// point and 3 joins as the fewest placement with a splice point has (J7 at 150 m leaves
// the next reel short of MH-3: 240 m).
func TestPlaceJoinsSpliceSlack(t *testing.T) {
	d := plan.Design{ReelM: 105, WastePct: 5, SlackLoopStructureM: 3, SpliceSlackM: 5}
	passes := []SplicePoint{{ID: "MH-1", ChannelM: 30}, {ID: "HH-2", ChannelM: 90}, {ID: "J7", Added: true, ChannelM: 150}, {ID: "MH-3", ChannelM: 260}}
	sp := &geo.Span{ID: "A-1", LengthM: 200}
	spans := []spanOnChannel{{span: sp, fromEnd: "MH-9", reverse: true, startM: 100}}
	splices, reelsM := fewerPoints(d, passes, spans, 300, 315, "B1")
	var at []string
	for _, p := range splices {
		at = append(at, p.Text(func(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) + " m" }))
	}
	if want := []string{"HH-2", "no structure: on A-1, 120.0 m from the MH-9 end", "MH-3"}; !slices.Equal(at, want) {
		t.Errorf("joins at %q, want %q", at, want)
	}
	// HH-2 and MH-3 are structures the cable passes, whose 3 m slack loop is in the channel
	// (passes' ChannelM): there the 2 × 5 m of the ends' splicing slack is stored instead of
	// the loop, the larger once (common practice, no published source), 7 m more than the
	// loop; the splice point at 180 m adds its 10 m. So 90 − 3 + 10 − 5, 90 + 5 + 10 − 5,
	// 80 + 5 − 3 + 10 − 5 and 40 + 5 m with 5 % waste, each up to a whole metre: every reel
	// within its 105 m.
	if wantM := []float64{97, 105, 92, 48}; !slices.Equal(reelsM, wantM) {
		t.Errorf("reels %v, want %v", reelsM, wantM)
	}
	if got := []float64{splices[0].SlackM, splices[1].SlackM, splices[2].SlackM}; !slices.Equal(got, []float64{7, 10, 7}) {
		t.Errorf("slack the joins add %v m, want [7 10 7] (in structures the larger of 10 and the 3 m loop, once)", got)
	}
	tk := CableTakeoff{ChannelM: 300}
	if got := tk.setReels(d, splices, reelsM); got != 342 || tk.SpliceSlackM != 24 || tk.ChannelM != 324 || tk.beforeJoinsM() != 300 || tk.SlackM() != 24 {
		t.Errorf("takeoff: bought %.0f m, splicing slack %.0f m, channel %.0f m, slack %.0f m; want 342, 24 (7 + 10 + 7), 324, 24", got, tk.SpliceSlackM, tk.ChannelM, tk.SlackM())
	}
	// Splicing slack below the loop (1 m an end against the 3 m loop): a join in a structure
	// adds nothing, the loop there holds both ends' 2 m; the splice point still adds its 2 m.
	d.SpliceSlackM = 1
	if s1 := fewestJoins(d, passes, spans, 300, "B1"); len(s1) == 0 || s1[0].NoStructure || s1[0].SlackM != 0 {
		t.Errorf("1 m an end: first join %+v, want in a structure, adding 0 m", s1)
	}
}

// TestPlaceJoinsCarriedOn: where no structure lies within a reel's reach, a structure just
// beyond it that the reel's whole length reaches (its waste spent) takes the join, and the
// piece is cut to the whole reel; without that the join was a splice point to build 2 m short
// of the structure, where the next reel, reaching no other, was joined again (review 12b:
// two joins 0.8 m apart on 120 m reels). A structure beyond the reel's whole length does not.
// Common practice, no published source: a crew carries the reel on to the structure.
func TestPlaceJoinsCarriedOn(t *testing.T) {
	d := plan.Design{ReelM: 105, WastePct: 5, SlackLoopStructureM: 3} // 100 m of channel a reel
	for _, tc := range []struct {
		name   string
		atM    float64
		joins  []string
		reelsM []float64
	}{
		{"within the reel's waste", 102, []string{"HH-1", "no structure: 202.0 m along the cable from B1"}, []float64{105, 105, 51}},
		{"on the reel's last metre", 105, []string{"HH-1", "no structure: 205.0 m along the cable from B1"}, []float64{105, 105, 48}},
		// Review 14 F6: a join in HH-1 6 m after a splice point at the reel's end was a join
		// more for no splice point fewer ([105 7 105 47]); the reels' ends take 2.
		{"beyond the whole reel", 106, []string{"no structure: 100.0 m along the cable from B1", "no structure: 200.0 m along the cable from B1"}, []float64{105, 105, 53}},
	} {
		// With the fewest splice points (above) and with the fewest joins alike, 250 m takes 2
		// joins whatever the structure, in HH-1 when the reel reaches it, never one a few
		// metres after a splice point.
		fewest := fewestJoins(d, []SplicePoint{{ID: "HH-1", ChannelM: tc.atM}}, nil, 250, "B1")
		if len(fewest) != 2 || (tc.atM <= 105) != (fewest[0].ID == "HH-1" && !fewest[0].NoStructure) {
			t.Errorf("%s: fewest joins %+v, want 2, the first in HH-1 when a whole reel reaches it", tc.name, fewest)
		}
		for k := 1; k < len(fewest); k++ {
			if gap := fewest[k].ChannelM - fewest[k-1].ChannelM; gap < 90 {
				t.Errorf("%s: fewest joins %.1f m apart: %+v", tc.name, gap, fewest)
			}
		}
		t.Run(tc.name, func(t *testing.T) {
			splices, reelsM := fewerPoints(d, []SplicePoint{{ID: "HH-1", ChannelM: tc.atM}}, nil, 250, 263, "B1")
			var at []string
			for _, p := range splices {
				at = append(at, p.Text(func(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) + " m" }))
			}
			if !slices.Equal(at, tc.joins) || !slices.Equal(reelsM, tc.reelsM) {
				t.Errorf("%s: joins %q, reels %v; want %q, %v", tc.name, at, reelsM, tc.joins, tc.reelsM)
			}
			for _, m := range reelsM {
				if m > d.ReelM {
					t.Errorf("%s: a piece of %.0f m on a %.0f m reel", tc.name, m, d.ReelM)
				}
			}
		})
	}
}

// TestJoinsByLengthWithSlack: the joins the length alone takes (reels, joinsUpToM: the
// optimizer's reach) count the splicing slack of those joins, and agree with the joins placed
// at the reels' ends (placeJoins with no structure): a channel up to joinsUpToM(n) takes n
// joins, one a metre longer n + 1. Each join's slack is fibre on a reel, so 30 m of slack a
// join on 105 m reels (100 m of channel each) leaves 70 m of route to a reel between joins.
func TestJoinsByLengthWithSlack(t *testing.T) {
	d := plan.Design{ReelM: 105, WastePct: 5, SpliceSlackM: 15}
	for n := 0; n < 6; n++ {
		upM := joinsUpToM(d, n)
		if want := 100*float64(n+1) - 30*float64(n); upM > want+1e-6 || upM < want-0.01 {
			t.Errorf("joinsUpToM(%d) = %.3f m, want %.0f (%d reels of 100 m less %d × 30 m)", n, upM, want, n+1, n)
		}
		for _, x := range []float64{upM - 1, upM, upM + 1} {
			_, reels := reels(d, x)
			splices, _ := fewerPoints(d, nil, nil, x, 0, "B1")
			fewest := fewestJoins(d, nil, nil, x, "B1")
			wantN := n
			if x > upM {
				wantN = n + 1
			}
			if reels-1 != wantN || len(splices) != wantN || len(fewest) != wantN {
				t.Errorf("%.3f m: %d joins by length, %d placed, %d fewest; want %d", x, reels-1, len(splices), len(fewest), wantN)
			}
		}
	}
	if got := spliceSlackM(d, 3); got != 90 {
		t.Errorf("3 joins' splicing slack: %.0f m, want 90", got)
	}
}

// fewestJoins is placeJoins with the fewest joins.
func fewestJoins(d plan.Design, passes []SplicePoint, spans []spanOnChannel, channelM float64, served string) []SplicePoint {
	return placeJoins(d, passes, spans, channelM, served, false)
}

// fewerPoints is placeJoins with the fewest splice points to build, and its reels cut
// (cutReels; lengthM the one reel without joins).
func fewerPoints(d plan.Design, passes []SplicePoint, spans []spanOnChannel, channelM, lengthM float64, served string) ([]SplicePoint, []float64) {
	splices := placeJoins(d, passes, spans, channelM, served, true)
	return splices, cutReels(d, splices, channelM, lengthM)
}

// TestReelsStartShort checks reels' count of reels, which starts from a lower bound worked out
// from the reels' capacity, against stepping up from one reel, on random designs up to a
// splicing slack just short of half of what a reel carries (plan validation's limit): the same
// count every time (review 15 F5: with reel_m 100 and 47.6 m an end the steps took minutes).
func TestReelsStartShort(t *testing.T) {
	r := rand.New(rand.NewPCG(15, 5))
	for i := 0; i < 3000; i++ {
		d := plan.Design{ReelM: float64(100 + r.IntN(3900)), WastePct: float64(r.IntN(11))}
		d.SpliceSlackM = math.Floor(r.Float64()*0.499*d.ReelM/(1+d.WastePct/100)*10) / 10
		channelM := r.Float64() * 20000
		_, got := reels(d, channelM)
		lengthM := math.Ceil(channelM + channelM*d.WastePct/100 - 1e-9)
		want := max(1, int(math.Ceil(lengthM/d.ReelM-1e-9)))
		for math.Ceil((channelM+spliceSlackM(d, want-1))*(1+d.WastePct/100)-1e-9) > float64(want)*d.ReelM+1e-9 {
			want++
		}
		if got != want {
			t.Fatalf("reel %g m, waste %g %%, slack %g m, channel %.3f m: %d reels, stepping gives %d", d.ReelM, d.WastePct, d.SpliceSlackM, channelM, got, want)
		}
	}
}
