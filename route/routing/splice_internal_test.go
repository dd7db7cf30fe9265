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
