package routing

import (
	"math/rand/v2"
	"testing"

	"spanwright/media"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// TestFirstBandCountsDown: firstBand finds the count of joins that counting down from the
// joins of a channel the reach long found (the way the reach was worked out before review 15
// F5), on random falling channels and growing limits, with about 2 log₂ of the counts' answers.
func TestFirstBandCountsDown(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(15, 55))
	for i := 0; i < 5000; i++ {
		last := 1 + r.IntN(1<<r.IntN(17))
		fall := make([]float64, last+1) // at(n): falls as n grows
		grow := make([]float64, last+1) // upM(n): grows
		fall[0], grow[0] = 1000+r.Float64()*1000, r.Float64()*1000
		for n := 1; n <= last; n++ {
			fall[n] = fall[n-1] - r.Float64()*float64(r.IntN(3))
			grow[n] = grow[n-1] + r.Float64()*float64(r.IntN(3))
		}
		if fall[last] > grow[last] {
			grow[last] = fall[last] // at(last) within upM(last), as reachWithJoinsM's last is
			for n := last - 1; n > 0 && grow[n] > grow[n+1]; n-- {
				grow[n] = grow[n+1]
			}
		}
		calls := 0
		at := func(n int) float64 { calls++; return fall[n] }
		upM := func(n int) float64 { return grow[n] }
		gotN, gotR := firstBand(at, upM, last)
		wantN := last // counting down while the count below is within its limit
		for wantN > 1 && fall[wantN-1] <= grow[wantN-1] {
			wantN--
		}
		if gotN != wantN || gotR != fall[wantN] {
			t.Fatalf("last %d: count %d (%.3f m), counting down %d (%.3f m)", last, gotN, gotR, wantN, fall[wantN])
		}
		if bound := 2*bitsLen(last) + 2; calls > bound {
			t.Fatalf("last %d: %d answers, want at most %d", last, calls, bound)
		}
	}
}

func bitsLen(n int) int {
	b := 0
	for ; n > 0; n >>= 1 {
		b++
	}
	return b
}

// TestReachSearchOnEngine: the optimizer's reach with joins (reachWithJoinsM) is what counting
// down one count of joins at a time gave, on the demo's engine, for OS2 and OM4 outdoors at 10G
// and OS2 at 40G, over reels of 100 to 1000 m and splicing slack up to the limit (plan's
// MinReelRouteM of route a reel): 100 m reels with 45 m an end carry 5.24 m of route a reel.
func TestReachSearchOnEngine(t *testing.T) {
	t.Parallel()
	m0, p := defaultModel(t)
	s := &site.Site{Reaches: media.NewReachMemo(1 << 14)}
	joined := 0 // cases whose reach takes joins (beyond one reel)
	for _, reel := range []float64{100, 120, 300, 1000} {
		for _, slack := range []float64{0, 15, 45, 47.11} {
			d := p.Design
			d.ReelM, d.SpliceSlackM = reel, slack
			if d.ReelM/(1+d.WastePct/100)-2*slack < plan.MinReelRouteM {
				continue
			}
			m := NewModel(m0.eng, d)
			for _, c := range []struct {
				medium string
				rate   float64
			}{{"os2", 10}, {"om4", 10}, {"os2", 40}} {
				facts := media.Link{ID: "L", RiserM: 8, ConnectorPairs: ConnectorPairs, Strands: 12, MaxEMI: "none", Outdoor: true,
					InsideAM: 12, InsideBM: 12, SlackM: 2*d.SlackM + 2*d.SlackLoopEntranceM}
				for _, lay := range []media.Laying{{}, {Construction: "osp-loose-tube", Inside: "ofnr-riser", At: media.EndsBoth}} {
					got := m.reachWithJoinsM(s, c.medium, lay, c.rate, 0, facts)
					want := countDownReachM(m, s, c.medium, lay, c.rate, facts)
					if got > joinsUpToM(d, 0)+12+12 {
						joined++
					}
					if got != want {
						t.Errorf("reel %g slack %g %s at %gG laid %+v: reach %.3f m, counting down %.3f m", reel, slack, c.medium, c.rate, lay, got, want)
					}
				}
			}
		}
	}
	if joined < 20 {
		t.Errorf("%d cases reach beyond one reel: the search is hardly tried", joined)
	}
}

// countDownReachM is reachWithJoinsM as it was before review 15 F5: counting down from the
// joins of a channel the reach without joins long, one count at a time.
// Its two sides are reachWithJoinsM's own (joinBands): only the search differs.
func countDownReachM(m *Model, s *site.Site, medium string, lay media.Laying, rate float64, facts media.Link) float64 {
	at, upM, insideM := m.joinBands(s, medium, lay, rate, 0, facts)
	r0 := at(0)
	if r0 <= upM(0) {
		return r0
	}
	_, reelsAt := reels(m.design, r0-insideM)
	n := reelsAt - 1
	rn := at(n)
	for n > 1 {
		r := at(n - 1)
		if r > upM(n-1) {
			break
		}
		n, rn = n-1, r
	}
	return max(rn, upM(n-1))
}
