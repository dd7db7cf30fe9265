package install

import (
	"errors"
	"math"
	"strings"
	"testing"
)

func straight(m float64) Step { return Step{Kind: KindStraight, LengthM: m} }

func bend(deg, radiusM float64) Step { return Step{Kind: KindBend, AngleDeg: deg, RadiusM: radiusM} }

func near(got, want, tol float64) bool { return math.Abs(got-want) <= tol }

func TestMaxStraight(t *testing.T) {
	t.Parallel()
	// Duct-installation handbook worked example, as reproduced in REFERENCES.md (seen):
	// T_max 340 lbf, W 0.144 lbf/ft, μ 0.5 → L_max 4722 ft.
	if got := MaxStraightM(340, 0.144, 0.5); !near(got, 4722, 0.5) {
		t.Errorf("handbook L_max: got %.2f ft, want 4722 ft", got)
	}
	// The same in SI units gives metres.
	gotM := MaxStraightM(LbfToN(340), LbfPerFtToNPerM(0.144), 0.5)
	if !near(MToFt(gotM), 4722, 0.5) {
		t.Errorf("handbook L_max in SI: got %.2f m = %.2f ft, want 4722 ft", gotM, MToFt(gotM))
	}
	if got := MaxStraightM(340, 0, 0.5); !math.IsInf(got, 1) {
		t.Errorf("weightless cable: got %v, want +Inf", got)
	}
}

func TestHandbookExample(t *testing.T) {
	t.Parallel()
	// Duct-installation handbook worked example, as reproduced in REFERENCES.md (seen):
	// 500 ft straight at W 0.144 lbf/ft, μ 0.5 → 36.0 lbf; then a 90° bend ×2.193 → 78.96 lbf.
	run := []Step{straight(500), bend(90, 3)}
	out, swbp, per := Tension(run, 0.144, 0.5, 0)
	if !near(per[0], 36.0, 0.05) {
		t.Errorf("after 500 ft: got %.4f lbf, want 36.0 lbf", per[0])
	}
	if f := per[1] / per[0]; !near(f, 2.193, 0.0005) {
		t.Errorf("90° bend factor: got %.5f, want 2.193", f)
	}
	if !near(out, 78.96, 0.005) {
		t.Errorf("after the bend: got %.4f lbf, want 78.96 lbf", out)
	}
	// SWBP = T_out/R (seen): 78.96 lbf over a 3 ft radius.
	if !near(swbp, out/3, 1e-12) {
		t.Errorf("SWBP: got %.4f lbf/ft, want %.4f", swbp, out/3)
	}

	// The same pull in SI, converted back at the edge.
	outN, _, _ := Tension([]Step{straight(FtToM(500)), bend(90, FtToM(3))}, LbfPerFtToNPerM(0.144), 0.5, 0)
	if got := NToLbf(outN); !near(got, 78.96, 0.005) {
		t.Errorf("SI pull: got %.4f N = %.4f lbf, want 78.96 lbf", outN, got)
	}
}

func TestCapstanFactor(t *testing.T) {
	t.Parallel()
	// e^(μθ) at 90°, from REFERENCES.md, Cable pulling (seen, handbook worked example).
	cases := []struct {
		name string
		mu   float64
		want float64
	}{
		{"mu 0.7", 0.7, 3.00},
		{"mu 0.5", 0.5, 2.19},
		{"mu 0.3", 0.3, 1.60},
		{"mu 0.15", 0.15, 1.27},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got, _, _ := Tension([]Step{bend(90, 1)}, 1, tc.mu, 1)
			if !near(got, tc.want, 0.005) {
				t.Errorf("%s: got %.4f, want %.2f", tc.name, got, tc.want)
			}
		})
	}
}

func TestSIExample(t *testing.T) {
	t.Parallel()
	// Duct-installation handbook worked example, as reproduced in REFERENCES.md (seen):
	// W 3.432 N/m, μ 0.35: 50 m → 60.07 N; 90° → 104.09 N; 40 m → 152.14 N; 90° → 263.64 N.
	const w, mu = 3.432, 0.35
	run := []Step{straight(50), bend(90, 1), straight(40), bend(90, 1)}
	published := []float64{60.07, 104.09, 152.14, 263.64}

	// Each step from the published tension before it: the formulas reproduce every figure
	// to its rounding, except the first, where 3.432 × 50 × 0.35 = 60.060 N exactly (the
	// source's W was presumably rounded to 3.432).
	prev := 0.0
	for i, s := range run {
		got, _, _ := Tension([]Step{s}, w, mu, prev)
		tol := 0.006
		if i == 0 {
			tol = 0.011
		}
		if !near(got, published[i], tol) {
			t.Errorf("step %d from %.2f N: got %.4f N, want %.2f N", i, prev, got, published[i])
		}
		prev = published[i]
	}

	// The whole pull at once carries that 0.01 N along: within 0.035 N (0.013 %).
	out, swbp, per := Tension(run, w, mu, 0)
	for i := range per {
		if !near(per[i], published[i], 0.035) {
			t.Errorf("cumulative step %d: got %.4f N, want %.2f N", i, per[i], published[i])
		}
	}
	if out != per[len(per)-1] {
		t.Errorf("tOut %v differs from the last step %v", out, per[len(per)-1])
	}
	// SWBP = T_out/R (seen): the last bend carries the most, R 1 m.
	if !near(swbp, out, 1e-12) {
		t.Errorf("SWBP: got %.4f N/m, want %.4f N/m", swbp, out)
	}
}

func TestPullOrder(t *testing.T) {
	t.Parallel()
	// A bend multiplies whatever tension reaches it (capstan equation): near the pulling end it
	// costs ×2.193, near the feed end almost nothing. Handbook figures (seen).
	const w, mu = 0.144, 0.5
	cases := []struct {
		name        string
		run         []Step
		wantForward float64
		wantReverse float64
		wantBest    string
	}{
		{"bend at pulling end", []Step{straight(500), bend(90, 3)}, 78.96, 36.0, Reverse},
		{"bend at feed end", []Step{bend(90, 3), straight(500)}, 36.0, 78.96, Forward},
		// computed: 250 ft → 18 lbf, ×2.1933, +18 lbf, the same from both ends
		{"symmetric run", []Step{straight(250), bend(90, 3), straight(250)}, 18*2.1933 + 18, 18*2.1933 + 18, Forward},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			fwd, rev, best := PullBothWays(tc.run, w, mu, 0)
			if !near(fwd.TOutN, tc.wantForward, 0.01) || !near(rev.TOutN, tc.wantReverse, 0.01) {
				t.Errorf("%s: got forward %.3f reverse %.3f, want %.3f and %.3f", tc.name, fwd.TOutN, rev.TOutN, tc.wantForward, tc.wantReverse)
			}
			if best != tc.wantBest {
				t.Errorf("%s: best got %s, want %s", tc.name, best, tc.wantBest)
			}
			if fwd.MaxTensionN != fwd.TOutN || rev.MaxTensionN != rev.TOutN {
				t.Errorf("%s: on a level run the maximum is the final tension: got %+v %+v", tc.name, fwd, rev)
			}
		})
	}
	t.Run("reverse lists steps in pulling order", func(t *testing.T) {
		_, rev, _ := PullBothWays([]Step{straight(500), bend(90, 3)}, w, mu, 0)
		if rev.PerStepN[0] != 0 || !near(rev.PerStepN[1], 36, 1e-9) {
			t.Errorf("got %v, want [0 36]: the bend first, at zero tension", rev.PerStepN)
		}
	})
}

func TestIncline(t *testing.T) {
	t.Parallel()
	// T_out = T_in + W·L·(sin φ + μ cos φ) (from memory, REFERENCES.md); a cable cannot push,
	// so tension stops at 0 going down (common practice, no published source).
	up30 := Step{Kind: KindStraight, LengthM: 10, InclineDeg: 30}
	cases := []struct {
		name string
		run  []Step
		tIn  float64
		want float64
	}{
		{"level", []Step{straight(10)}, 0, 10 * 10 * 0.5},
		{"up 30°", []Step{up30}, 0, 100 * (0.5 + 0.5*math.Sqrt(3)/2)},
		{"down 30° with back tension", []Step{{Kind: KindStraight, LengthM: 10, InclineDeg: -30}}, 50, 50 + 100*(-0.5+0.5*math.Sqrt(3)/2)},
		{"down 30° from zero", []Step{{Kind: KindStraight, LengthM: 10, InclineDeg: -30}}, 0, 0},
		{"vertical up", []Step{{Kind: KindStraight, LengthM: 10, InclineDeg: 90}}, 0, 100},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got, _, _ := Tension(tc.run, 10, 0.5, tc.tIn)
			if !near(got, tc.want, 1e-9) {
				t.Errorf("%s: got %.6f N, want %.6f N", tc.name, got, tc.want)
			}
		})
	}
	t.Run("reverse runs downhill", func(t *testing.T) {
		fwd, rev, best := PullBothWays([]Step{up30}, 10, 0.5, 20)
		if !near(fwd.TOutN, 20+93.30127, 1e-5) || !near(rev.TOutN, 20-6.69873, 1e-5) || best != Reverse {
			t.Errorf("got forward %.5f reverse %.5f best %s, want 113.30127, 13.30127, reverse", fwd.TOutN, rev.TOutN, best)
		}
		if rev.MaxTensionN != 20 {
			t.Errorf("reverse max: got %v, want the back tension 20", rev.MaxTensionN)
		}
	})
}

func TestValidate(t *testing.T) {
	t.Parallel()
	run := []Step{
		straight(-1),
		{Kind: KindBend, AngleDeg: 90},
		{Kind: "kink"},
		{Kind: KindBend, AngleDeg: 400, RadiusM: 1, InclineDeg: 5},
		{Kind: KindStraight, LengthM: 3, InclineDeg: 95},
	}
	err := Validate(run, math.NaN(), -0.2, 0)
	if !errors.Is(err, ErrBadInput) {
		t.Fatalf("got %v, want ErrBadInput", err)
	}
	var list ErrorList
	if !errors.As(err, &list) {
		t.Fatalf("got %T, want ErrorList", err)
	}
	want := []string{
		"install: wNPerM: want finite >= 0, got NaN",
		"install: mu: want finite >= 0, got -0.2",
		"install: step 0: LengthM: want finite >= 0, got -1",
		"install: step 1: RadiusM: want finite > 0, got 0",
		`install: step 2: Kind: want "straight" or "bend", got "kink"`,
		"install: step 3: AngleDeg: want in [0, 360], got 400",
		"install: step 3: InclineDeg: want 0 on a bend, got 5",
		"install: step 4: InclineDeg: want in [-90, 90], got 95",
	}
	if got := list.String(); got != strings.Join(want, "\n") {
		t.Errorf("got\n%s\nwant\n%s", got, strings.Join(want, "\n"))
	}
	if !strings.HasSuffix(err.Error(), "(and 7 more errors)") {
		t.Errorf("got %q, want a count of the rest", err.Error())
	}
	if err := Validate([]Step{straight(1), bend(45, 0.5)}, 1, 0.5, 0); err != nil {
		t.Errorf("valid run: got %v", err)
	}

	defer func() {
		if r := recover(); r == nil || !strings.HasPrefix(r.(string), "install: ") {
			t.Errorf("Tension on a bad run: recovered %v, want a panic starting install:", r)
		}
	}()
	Tension(run, 1, 0.5, 0)
}
