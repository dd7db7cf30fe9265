package install

import (
	"errors"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// siSpec is the cable of the handbook SI example (W 3.432 N/m, μ 0.35; REFERENCES.md, seen)
// rated at 2670 N, the ANSI/TIA-568.3-D minimum for outside-plant cable (seen as fragment).
var siSpec = PullSpec{WNPerM: 3.432, Mu: 0.35, MaxTensionN: 2670}

func TestSections(t *testing.T) {
	t.Parallel()
	b90 := bend(90, 1)
	cases := []struct {
		name          string
		run           []Step
		pullPoints    []int
		spec          PullSpec
		wantAddedAtM  []float64
		wantBendDeg   []float64
		wantTensionN  []float64 // Best pull's MaxTensionN per section; nil to skip
		wantBest      []string  // nil to skip
		wantWithin    bool
		wantLengthMax float64 // every section at most this long; 0 to skip
	}{
		{
			// TIA-569 (seen): no more than two 90° bends between pull points. Of the four
			// boundaries that leave at most 180° either side, the split after the second
			// straight gives the lowest highest tension (computed: 98.48 N vs 206.69 N).
			name:         "three 90° bends get a pull point",
			run:          []Step{straight(30), b90, straight(30), b90, straight(30), b90, straight(30)},
			spec:         siSpec,
			wantAddedAtM: []float64{60},
			wantBendDeg:  []float64{90, 180},
			wantTensionN: []float64{36.036*1.7328 + 36.036, 36.036*1.7328 + 36.036},
			wantBest:     []string{Forward, Forward},
			wantWithin:   true,
		},
		{
			name:         "structure already breaks the bends",
			run:          []Step{straight(30), b90, straight(30), b90, straight(30), b90, straight(30)},
			pullPoints:   []int{4},
			spec:         siSpec,
			wantAddedAtM: nil,
			wantBendDeg:  []float64{180, 90},
			wantWithin:   true,
		},
		{
			name:         "two 90° bends are allowed",
			run:          []Step{straight(30), b90, straight(30), b90, straight(30)},
			pullPoints:   []int{0, 5},
			spec:         siSpec,
			wantAddedAtM: nil,
			wantBendDeg:  []float64{180},
			wantWithin:   true,
		},
		{
			name:         "NFPA 70 budget of 360°",
			run:          []Step{straight(30), b90, straight(30), b90, straight(30), b90, straight(30)},
			spec:         PullSpec{WNPerM: 3.432, Mu: 0.35, MaxTensionN: 2670, MaxBendDeg: 360},
			wantAddedAtM: nil,
			wantBendDeg:  []float64{270},
			wantWithin:   true,
		},
		{
			// computed: either way 1201.2 × 1.7328 + 1201.2 = 3282.7 N > 2670 N; split at the
			// bend, each half pulls 1201.2 N with the bend at its feed end.
			name:         "over tension gets a pull point",
			run:          []Step{straight(1000), bend(90, 1.2), straight(1000)},
			spec:         siSpec,
			wantAddedAtM: []float64{1000},
			wantBendDeg:  []float64{0, 90},
			wantTensionN: []float64{1201.2, 1201.2},
			wantBest:     []string{Forward, Forward},
			wantWithin:   true,
		},
		{
			// computed: 3000 m → 3603.6 N; L_max = 2670/(3.432 × 0.35) = 2222.8 m, so two halves.
			name:         "long straight is cut in two",
			run:          []Step{straight(3000)},
			spec:         siSpec,
			wantAddedAtM: []float64{1500},
			wantBendDeg:  []float64{0, 0},
			wantTensionN: []float64{1801.8, 1801.8},
			wantWithin:   true,
		},
		{
			// TIA-569 (seen): at most 30 m between pull points in conduit.
			name:          "30 m between pull points",
			run:           []Step{straight(50), b90, straight(50)},
			spec:          PullSpec{WNPerM: 3.432, Mu: 0.35, MaxTensionN: 2670, MaxLengthM: 30},
			wantAddedAtM:  []float64{25, 50, 75},
			wantBendDeg:   []float64{0, 0, 90, 0}, // tie: the last sections start as early as they can
			wantWithin:    true,
			wantLengthMax: 30,
		},
		{
			name:         "a 200° bend cannot be fixed",
			run:          []Step{straight(10), bend(200, 1), straight(10)},
			spec:         siSpec,
			wantAddedAtM: []float64{10, 10},
			wantBendDeg:  []float64{0, 200, 0},
			wantWithin:   false,
		},
		{
			name:         "empty run",
			run:          nil,
			spec:         siSpec,
			wantAddedAtM: nil,
			wantBendDeg:  nil,
			wantWithin:   true,
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			plan, err := Sections(tc.run, tc.pullPoints, tc.spec)
			if err != nil {
				t.Fatalf("%s: %v", tc.name, err)
			}
			if !slicesNear(plan.AddedAtM, tc.wantAddedAtM, 1e-9) || plan.AddedPullPoints != len(tc.wantAddedAtM) {
				t.Errorf("%s: added %d at %v, want at %v", tc.name, plan.AddedPullPoints, plan.AddedAtM, tc.wantAddedAtM)
			}
			var bends, tensions []float64
			var bests []string
			totalM, atM := 0.0, 0.0
			for k, s := range plan.Sections {
				bends = append(bends, s.BendDeg)
				tensions = append(tensions, s.MaxTensionN)
				bests = append(bests, s.Best)
				totalM += s.LengthM
				if !near(s.StartM, atM, 1e-9) {
					t.Errorf("%s: section %d starts at %v m, want %v m", tc.name, k, s.StartM, atM)
				}
				atM += s.LengthM
				if tc.wantLengthMax > 0 && s.LengthM > tc.wantLengthMax {
					t.Errorf("%s: section %d is %v m, over %v m", tc.name, k, s.LengthM, tc.wantLengthMax)
				}
				if s.WithinRating != (s.Reason() == "") {
					t.Errorf("%s: section %d WithinRating %v with reason %q", tc.name, k, s.WithinRating, s.Reason())
				}
			}
			if !slicesNear(bends, tc.wantBendDeg, 1e-9) {
				t.Errorf("%s: bends got %v, want %v", tc.name, bends, tc.wantBendDeg)
			}
			if tc.wantTensionN != nil && !slicesNear(tensions, tc.wantTensionN, 0.05) {
				t.Errorf("%s: tensions got %v, want %v", tc.name, tensions, tc.wantTensionN)
			}
			if tc.wantBest != nil && !slices.Equal(bests, tc.wantBest) {
				t.Errorf("%s: best got %v, want %v", tc.name, bests, tc.wantBest)
			}
			var runM float64
			for _, s := range tc.run {
				runM += s.LengthM
			}
			if !near(totalM, runM, 1e-9) {
				t.Errorf("%s: sections total %v m, run is %v m", tc.name, totalM, runM)
			}
			if plan.WithinRating != tc.wantWithin {
				t.Errorf("%s: WithinRating got %v, want %v", tc.name, plan.WithinRating, tc.wantWithin)
			}
		})
	}
}

func slicesNear(got, want []float64, tol float64) bool {
	if len(got) != len(want) {
		return false
	}
	for i := range got {
		if !near(got[i], want[i], tol) {
			return false
		}
	}
	return true
}

func TestSectionsDetail(t *testing.T) {
	t.Parallel()
	t.Run("flags and spans", func(t *testing.T) {
		run := []Step{straight(1000), bend(90, 1.2), straight(1000), straight(20), bend(90, 1)}
		plan, err := Sections(run, []int{3}, siSpec)
		if err != nil {
			t.Fatal(err)
		}
		type flags struct {
			span       int
			start, end bool
		}
		var got []flags
		for _, s := range plan.Sections {
			got = append(got, flags{s.Span, s.StartAdded, s.EndAdded})
		}
		want := []flags{{0, false, true}, {0, true, false}, {1, false, false}}
		if !slices.Equal(got, want) {
			t.Errorf("got %v, want %v", got, want)
		}
		if s := plan.Sections[1]; len(s.Steps) != 2 || s.Steps[0] != run[1] || s.Steps[1] != run[2] {
			t.Errorf("second section steps: got %+v, want the bend and the straight", s.Steps)
		}
	})
	t.Run("unfixable reason", func(t *testing.T) {
		plan, err := Sections([]Step{straight(10), bend(200, 1), straight(10)}, nil, siSpec)
		if err != nil {
			t.Fatal(err)
		}
		if got, want := plan.Sections[1].Reason(), "bends 200.0° over 180.0° between pull points"; got != want {
			t.Errorf("got %q, want %q", got, want)
		}
	})
	t.Run("cut straight keeps its parts together", func(t *testing.T) {
		plan, err := Sections([]Step{straight(5000)}, nil, siSpec)
		if err != nil {
			t.Fatal(err)
		}
		// computed: ceil(5000 / 2222.8) = 3 parts of 1666.7 m
		if plan.AddedPullPoints != 2 || len(plan.Sections) != 3 {
			t.Fatalf("got %d added, %d sections, want 2 and 3", plan.AddedPullPoints, len(plan.Sections))
		}
		for k, s := range plan.Sections {
			if len(s.Steps) != 1 || !near(s.LengthM, 5000.0/3, 1e-9) || !s.WithinRating {
				t.Errorf("section %d: got %+v, want one straight of 1666.7 m within rating", k, s)
			}
		}
	})
	t.Run("sidewall limit chooses the direction", func(t *testing.T) {
		// computed: forward peaks at 244.2 N with 104.1 N/m at the tight bend, reverse at
		// 220.2 N but 1040.8 N/m; with a 500 N/m limit only forward is within rating.
		run := []Step{straight(10), bend(90, 0.2), straight(100), bend(90, 10)}
		_, _, best := PullBothWays(run, siSpec.WNPerM, siSpec.Mu, 0)
		spec := siSpec
		spec.MaxSWBPNPerM = 500
		plan, err := Sections(run, nil, spec)
		if err != nil {
			t.Fatal(err)
		}
		s := plan.Sections[0]
		if best != Reverse || s.Best != Forward || plan.AddedPullPoints != 0 || !s.WithinRating {
			t.Errorf("got PullBothWays %s, section %s within %v added %d; want reverse, forward, true, 0", best, s.Best, s.WithinRating, plan.AddedPullPoints)
		}
		if !near(s.MaxSWBPNPerM, 20.815/0.2, 0.1) {
			t.Errorf("SWBP got %.2f N/m, want 104.1", s.MaxSWBPNPerM)
		}
	})
	t.Run("back tension counts", func(t *testing.T) {
		spec := siSpec
		spec.TInN = 1000
		// computed: L_max from 1000 N back tension = 1670/1.2012 = 1390.3 m, so 2000 m → 2 parts
		plan, err := Sections([]Step{straight(2000)}, nil, spec)
		if err != nil || plan.AddedPullPoints != 1 || !near(plan.Sections[0].MaxTensionN, 1000+1201.2, 1e-9) {
			t.Errorf("got %+v, %v; want one added pull point, 2201.2 N", plan, err)
		}
	})
}

// TestSectionsFewest checks the pull point placement against an exhaustive search over every
// set of step boundaries: no valid plan uses fewer pull points, and none with as few has a
// lower highest tension.
func TestSectionsFewest(t *testing.T) {
	t.Parallel()
	hill := func(m, deg float64) Step { return Step{Kind: KindStraight, LengthM: m, InclineDeg: deg} }
	runs := []struct {
		name string
		run  []Step
	}{
		{"level bends", []Step{straight(200), bend(45, 1), straight(700), bend(90, 1), straight(300), bend(90, 1), straight(600), bend(30, 1), straight(400)}},
		{"inclines", []Step{hill(300, 8), bend(90, 1), hill(800, -12), bend(60, 1), hill(500, 4), bend(90, 1), hill(900, -3), bend(45, 1)}},
		{"many bends", []Step{straight(100), bend(90, 1), straight(100), bend(90, 1), straight(100), bend(90, 1), straight(100), bend(90, 1), straight(100), bend(90, 1), straight(100)}},
	}
	for _, tc := range runs {
		t.Run(tc.name, func(t *testing.T) {
			plan, err := Sections(tc.run, nil, siSpec)
			if err != nil {
				t.Fatal(err)
			}
			if !plan.WithinRating {
				t.Fatalf("%s: plan not within rating: %+v", tc.name, plan)
			}
			pcs := make([]piece, len(tc.run))
			for i, s := range tc.run {
				pcs[i] = piece{step: s, origin: i, parts: 1}
			}
			spec := siSpec
			spec.MaxBendDeg = DefaultMaxBendDeg
			bestCount, bestT := math.MaxInt, math.Inf(1)
			n := len(tc.run)
			for mask := 0; mask < 1<<(n-1); mask++ {
				start, ok, maxT := 0, true, 0.0
				for b := 1; b <= n && ok; b++ {
					if b < n && mask&(1<<(b-1)) == 0 {
						continue
					}
					sec := spec.evaluate(pcs[start:b])
					ok = sec.WithinRating
					maxT = math.Max(maxT, sec.MaxTensionN)
					start = b
				}
				if c := popcount(mask); ok && (c < bestCount || c == bestCount && maxT < bestT) {
					bestCount, bestT = c, maxT
				}
			}
			gotT := 0.0
			for _, s := range plan.Sections {
				gotT = math.Max(gotT, s.MaxTensionN)
			}
			if plan.AddedPullPoints != bestCount || gotT != bestT {
				t.Errorf("%s: got %d pull points, max %.3f N; exhaustive search %d, %.3f N", tc.name, plan.AddedPullPoints, gotT, bestCount, bestT)
			}
		})
	}
}

func popcount(x int) int {
	c := 0
	for ; x != 0; x &= x - 1 {
		c++
	}
	return c
}

func TestSectionsBadInput(t *testing.T) {
	t.Parallel()
	run := []Step{straight(10), {Kind: KindBend, AngleDeg: 90, RadiusM: -1}, straight(5)}
	spec := PullSpec{WNPerM: 3.432, Mu: math.Inf(1), TInN: 300, MaxTensionN: 200, MaxBendDeg: -90}
	_, err := Sections(run, []int{2, 2, 7}, spec)
	if !errors.Is(err, ErrBadInput) {
		t.Fatalf("got %v, want ErrBadInput", err)
	}
	var list ErrorList
	if !errors.As(err, &list) {
		t.Fatalf("got %T, want ErrorList", err)
	}
	want := []string{
		"install: Mu: want finite >= 0, got +Inf",
		"install: TInN: want < MaxTensionN 200, got 300",
		"install: MaxBendDeg: want finite >= 0, got -90",
		"install: pull point 1: boundary: want > 2 (strictly ascending), got 2",
		"install: pull point 2: boundary: want in [0, 3], got 7",
		"install: step 1: RadiusM: want finite > 0, got -1",
	}
	if got := list.String(); got != strings.Join(want, "\n") {
		t.Errorf("got\n%s\nwant\n%s", got, strings.Join(want, "\n"))
	}
}

// TestMeasureIsEvaluate: the figures partition's search reads from measure (no per-step
// tensions, no reason, steps in a reused buffer) are evaluate's, bit for bit, on random
// sections of level and inclined runs with bends, cut straights and every limit in play, so
// the pull plan cannot depend on which one the search used. The reference is evaluate, whose
// arithmetic the tests above hold to the capstan equation (REFERENCES.md, seen).
func TestMeasureIsEvaluate(t *testing.T) {
	t.Parallel()
	r := uint64(12345)
	next := func() float64 { // a small LCG: the same sections every run
		r = r*6364136223846793005 + 1442695040888963407
		return float64(r>>11) / (1 << 53)
	}
	spec := PullSpec{WNPerM: 3.432, Mu: 0.35, MaxTensionN: 2670, TInN: 50, MaxLengthM: 150, MaxSWBPNPerM: 1500}
	var buf []Step
	for trial := 0; trial < 2000; trial++ {
		var pcs []piece
		for k := 0; k < 1+int(next()*12); k++ {
			if next() < 0.3 {
				pcs = append(pcs, piece{step: Step{Kind: KindBend, AngleDeg: 90 * next(), RadiusM: 0.3 + next()}, origin: k, parts: 1})
				continue
			}
			s := Step{Kind: KindStraight, LengthM: 400 * next()}
			if next() < 0.3 {
				s.InclineDeg = 20*next() - 10
			}
			parts := 1 + int(next()*3)
			for p := 0; p < parts; p++ {
				if p == 0 || next() < 0.8 {
					pcs = append(pcs, piece{step: s, origin: k, part: p, parts: parts})
				}
			}
		}
		want := spec.evaluate(pcs)
		buf = merge(buf[:0], pcs)
		got := spec.measure(buf, false)
		if got.LengthM != want.LengthM || got.BendDeg != want.BendDeg || got.MaxTensionN != want.MaxTensionN ||
			got.MaxSWBPNPerM != want.MaxSWBPNPerM || got.Best != want.Best || got.WithinRating != want.WithinRating ||
			(want.Reason() == "") != want.WithinRating || !slices.Equal(got.Steps, want.Steps) {
			t.Fatalf("trial %d: measure %+v, evaluate %+v", trial, got, want)
		}
	}
}

// TestExcessText: a section's excesses stay numbers in their SI units and are written by the
// output's units: SI with one decimal by default, each quantity by its own formatter when
// given (1 ft = 0.3048 m and 1 lbf = 4.4482216152605 N exactly, NIST SP 811 B.8).
func TestExcessText(t *testing.T) {
	t.Parallel()
	over := []Excess{
		{Limit: OverTension, Value: 3000, Max: 2670},
		{Limit: OverSidewall, Value: 1800, Max: 1460},
		{Limit: OverBends, Value: 200, Max: 180},
		{Limit: OverLength, Value: 160.24, Max: 150},
	}
	si := "tension 3000.0 N over rating 2670.0 N; sidewall pressure 1800.0 N/m over 1460.0 N/m; " +
		"bends 200.0° over 180.0° between pull points; length 160.2 m over 150.0 m between pull points"
	if got := Why(over, Units{}); got != si {
		t.Errorf("SI: got %q, want %q", got, si)
	}
	one := func(v float64, unit string) string { return strconv.FormatFloat(v, 'f', 1, 64) + " " + unit }
	imp := Units{
		Length:   func(m float64) string { return one(m/0.3048, "ft") },
		Force:    func(n float64) string { return one(n/4.4482216152605, "lbf") },
		Pressure: func(v float64) string { return one(v*0.3048/4.4482216152605, "lbf/ft") },
	}
	want := "tension 674.4 lbf over rating 600.2 lbf; sidewall pressure 123.3 lbf/ft over 100.0 lbf/ft; " +
		"bends 200.0° over 180.0° between pull points; length 525.7 ft over 492.1 ft between pull points"
	if got := Why(over, imp); got != want {
		t.Errorf("imperial: got %q, want %q", got, want)
	}
	if got := (Section{}).Reason(); got != "" {
		t.Errorf("within rating: reason %q", got)
	}
}
