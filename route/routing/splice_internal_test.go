package routing

import (
	"slices"
	"strconv"
	"testing"

	"spanwright/geo"
	"spanwright/route/plan"
)

// TestPlaceJoins: each join goes in the last structure passed at or before where its reel
// runs out (a reel of reel_m carries reel_m / (1 + waste) of channel), the next reel starting
// there; with no structure within reach, at the reel's end on its span; reels are cut in whole
// metres with waste. The rule is common practice, no published source (splice closures in
// maintenance holes and handholes: TIA-758-B, from memory).
func TestPlaceJoins(t *testing.T) {
	d := plan.Design{ReelM: 105, WastePct: 5, SlackLoopStructureM: 3} // 100 m of channel a reel
	passes := []SplicePoint{{ID: "MH-1", ChannelM: 30}, {ID: "HH-2", ChannelM: 90}, {ID: "J7", Added: true, ChannelM: 150}, {ID: "MH-3", ChannelM: 260}}
	sp := &geo.Span{ID: "A-1", LengthM: 200}
	spans := []spanOnChannel{{span: sp, fromEnd: "MH-9", reverse: true, startM: 100}} // channel 100 → 300 m, drawn the other way
	splices, reels := placeJoins(d, passes, spans, 300, 315, "B1")
	var at []string
	for _, p := range splices {
		at = append(at, p.Text(func(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) + " m" }))
	}
	// 90 (HH-2, last of 30 and 90 within 100 m); 150 (J7 within 190); none in (150, 250]:
	// the reel's end at 250 m, 150 m into A-1 in travel order, 50 m from its from end, named
	// as the end the distance counts from (tester 8 finding 9).
	want := []string{"HH-2", "J7 (handhole to add)", "no structure: on A-1, 50.0 m from the MH-9 end"}
	if !slices.Equal(at, want) {
		t.Errorf("joins at %q, want %q", at, want)
	}
	// 90, 60, 100 and 50 m of channel with 5 % waste, each up to a whole metre.
	if wantM := []float64{95, 63, 105, 53}; !slices.Equal(reels, wantM) {
		t.Errorf("reels %v, want %v", reels, wantM)
	}
	if s, r := placeJoins(plan.Design{ReelM: 0}, passes, spans, 300, 315, "B1"); s != nil || !slices.Equal(r, []float64{315}) {
		t.Errorf("no reel limit: %v, %v", s, r)
	}
	if s, r := placeJoins(d, passes, spans, 100, 105, "B1"); s != nil || !slices.Equal(r, []float64{105}) {
		t.Errorf("one reel's channel: %v, %v", s, r)
	}
}

// TestJoinsAtReelEnds: where the joins placed in structures (TestPlaceJoins: HH-2, J7 and a
// reel's end, 3 joins for 300 m of channel) take more than the cable's length does (3 reels
// of 100 m of channel: 2 joins), the joins at the reels' ends are the splice points to build
// the length alone asks for, at 100 and 200 m, and the reels 105 m each; a takeoff whose
// joins are already as few is left alone. Common practice, no published source (a splice
// point built where a reel runs out rather than a link lost to the loss of one more splice).
func TestJoinsAtReelEnds(t *testing.T) {
	d := plan.Design{ReelM: 105, WastePct: 5, SlackLoopStructureM: 3}
	passes := []SplicePoint{{ID: "MH-1", ChannelM: 30}, {ID: "HH-2", ChannelM: 90}, {ID: "J7", Added: true, ChannelM: 150}, {ID: "MH-3", ChannelM: 260}}
	sp := &geo.Span{ID: "A-1", LengthM: 200}
	spans := []spanOnChannel{{span: sp, reverse: true, startM: 100}}
	tk := CableTakeoff{ChannelM: 300, spans: spans, served: "B1"}
	tk.LengthM, _ = reels(d, tk.ChannelM)
	tk.Splices, tk.ReelsM = placeJoins(d, passes, spans, tk.ChannelM, tk.LengthM, "B1")
	tk.Joins, tk.Reels = len(tk.Splices), len(tk.ReelsM)
	if tk.Joins != 3 {
		t.Fatalf("joins in structures: %d, want 3", tk.Joins)
	}
	alt, fewer := tk.joinsAtReelEnds(d)
	if !fewer || alt.Joins != 2 || alt.Reels != 3 || !slices.Equal(alt.ReelsM, []float64{105, 105, 105}) || alt.LengthM != 315 {
		t.Fatalf("at the reels' ends: fewer %v, %d joins, reels %v, bought %.0f m; want 2 joins, 3 reels of 105 m, 315 m", fewer, alt.Joins, alt.ReelsM, alt.LengthM)
	}
	for k, p := range alt.Splices {
		if !p.NoStructure || !p.AtReelEnd || p.ChannelM != float64(100*(k+1)) {
			t.Errorf("join %d: %+v, want a splice point to build at %d m", k+1, p, 100*(k+1))
		}
	}
	if _, fewer := alt.joinsAtReelEnds(d); fewer {
		t.Error("joins at the reels' ends again: want no change")
	}
}

// TestPlaceJoinsSpliceSlack: each cable end at a mid-span join carries design.splice_slack_m
// of splicing slack (the join is made above ground beside the structure and the slack is
// coiled there with the closure; common practice, no published source: 10–15 m an end, from
// memory), so a reel reaches splice_slack_m less before a join at its end, 2 × less between
// two joins, and each reel is cut with the slack of its joined ends. TestPlaceJoins's campus
// with 5 m of splicing slack: HH-2 (90 m, within 100 − 5), J7 (150 m, within 90 + 100 − 10),
// then a splice point at 240 m (150 + 100 − 10; MH-3 at 260 m is beyond it and its waste),
// 60 m into A-1 from its MH-9 end.
func TestPlaceJoinsSpliceSlack(t *testing.T) {
	d := plan.Design{ReelM: 105, WastePct: 5, SlackLoopStructureM: 3, SpliceSlackM: 5}
	passes := []SplicePoint{{ID: "MH-1", ChannelM: 30}, {ID: "HH-2", ChannelM: 90}, {ID: "J7", Added: true, ChannelM: 150}, {ID: "MH-3", ChannelM: 260}}
	sp := &geo.Span{ID: "A-1", LengthM: 200}
	spans := []spanOnChannel{{span: sp, fromEnd: "MH-9", reverse: true, startM: 100}}
	splices, reelsM := placeJoins(d, passes, spans, 300, 315, "B1")
	var at []string
	for _, p := range splices {
		at = append(at, p.Text(func(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) + " m" }))
	}
	if want := []string{"HH-2", "J7 (handhole to add)", "no structure: on A-1, 60.0 m from the MH-9 end"}; !slices.Equal(at, want) {
		t.Errorf("joins at %q, want %q", at, want)
	}
	// HH-2 and J7 are structures the cable passes, whose 3 m slack loop is in the channel
	// (passes' ChannelM): there the 2 × 5 m of the ends' splicing slack is stored instead of
	// the loop, the larger once (common practice, no published source), 7 m more than the
	// loop; the splice point at 240 m adds its 10 m. So 90 − 3 + 10 − 5, 60 + 5 − 3 + 10 − 5,
	// 90 + 5 + 5 and 60 + 5 m with 5 % waste, each up to a whole metre: every reel within its
	// 105 m.
	if wantM := []float64{97, 71, 105, 69}; !slices.Equal(reelsM, wantM) {
		t.Errorf("reels %v, want %v", reelsM, wantM)
	}
	if got := []float64{splices[0].SlackM, splices[1].SlackM, splices[2].SlackM}; !slices.Equal(got, []float64{7, 7, 10}) {
		t.Errorf("slack the joins add %v m, want [7 7 10] (in structures the larger of 10 and the 3 m loop, once)", got)
	}
	tk := CableTakeoff{ChannelM: 300}
	if got := tk.setReels(d, splices, reelsM); got != 342 || tk.SpliceSlackM != 24 || tk.ChannelM != 324 || tk.beforeJoinsM() != 300 || tk.SlackM() != 24 {
		t.Errorf("takeoff: bought %.0f m, splicing slack %.0f m, channel %.0f m, slack %.0f m; want 342, 24 (7 + 7 + 10), 324, 24", got, tk.SpliceSlackM, tk.ChannelM, tk.SlackM())
	}
	// Splicing slack below the loop (1 m an end against the 3 m loop): a join in a structure
	// adds nothing, the loop there holds both ends' 2 m; the splice point still adds its 2 m.
	d.SpliceSlackM = 1
	if s1, _ := placeJoins(d, passes, spans, 300, 315, "B1"); len(s1) == 0 || s1[0].NoStructure || s1[0].SlackM != 0 {
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
		{"beyond the whole reel", 106, []string{"no structure: 100.0 m along the cable from B1", "HH-1", "no structure: 206.0 m along the cable from B1"}, []float64{105, 7, 105, 47}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			splices, reelsM := placeJoins(d, []SplicePoint{{ID: "HH-1", ChannelM: tc.atM}}, nil, 250, 263, "B1")
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
			splices, _ := placeJoins(d, nil, nil, x, 0, "B1")
			wantN := n
			if x > upM {
				wantN = n + 1
			}
			if reels-1 != wantN || len(splices) != wantN {
				t.Errorf("%.3f m: %d joins by length, %d placed; want %d", x, reels-1, len(splices), wantN)
			}
		}
	}
	if got := spliceSlackM(d, 3); got != 90 {
		t.Errorf("3 joins' splicing slack: %.0f m, want 90", got)
	}
}
