package install

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// counts is the number of cables Spread put in each duct.
func counts(a Assignment) []int {
	out := make([]int, len(a.Ducts))
	for d, f := range a.Ducts {
		out[d] = len(f.CablesODMM)
	}
	return out
}

// TestSpread: the cables of a duct bank are given at most DefaultCablesPerDuct loose cables a
// duct (common practice, no published source), each duct within NFPA 70 Chapter 9 Table 1 fill
// (seen: 53 % of the area for one cable, 31 % for two, 40 % for more); cables carried on keep
// their ducts. 13 mm cables (132.7 mm² each) in 100 mm ducts (7,854 mm²) are far from the fill
// limit: only the count of pulls keeps more than three of them out of duct 1.
func TestSpread(t *testing.T) {
	t.Parallel()
	small := func(n int) []float64 { return slices.Repeat([]float64{13}, n) }
	for _, tc := range []struct {
		name     string
		bank     DuctBank
		ods      []float64
		prefer   []int // the duct each cable holds on the span it comes from
		want     []int // cables per duct
		unplaced int   // cables the bank has no duct for (the optimizer adds ducts for them)
	}{
		// Three spare ducts, eight cables: three, three and two, as a designer would lay them.
		{"eight cables, three spare ducts", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 3, IDMM: 100}, small(8), nil, []int{3, 3, 2}, 0},
		// Five cables need two ducts; the third spare duct stays empty for later.
		{"five cables, three spare ducts", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 3, IDMM: 100}, small(5), nil, []int{3, 2, 0}, 0},
		// Three cables are a sound set of pulls: two ducts stay spare.
		{"three cables stay in one duct", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 3, IDMM: 100}, small(3), nil, []int{3, 0, 0}, 0},
		// Eleven cables, two spare ducts: six pulled, five need ducts the bank does not have.
		{"eleven cables, two spare ducts", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 2, IDMM: 100}, small(11), nil, []int{3, 3}, 5},
		// One usable duct takes three of eleven.
		{"a full span takes three", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 1, IDMM: 100}, small(11), nil, []int{3}, 8},
		// Each cable in an innerduct of its own, pulled in empty: the fill alone counts.
		{"innerducts share a duct", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 3, IDMM: 100, Innerduct: true}, small(8), nil, []int{8, 0, 0}, 0},
		// A 70 mm cable (3,848 mm²) takes an empty 100 mm duct alone (53 %: 4,163 mm²) and
		// shares it with nothing (31 % for two: 2,435 mm²): pulled last it gets the third duct.
		{"a large cable pulled last gets a duct of its own", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 3, IDMM: 100},
			append(small(6), 70), nil, []int{3, 3, 1}, 0},
		// Cables carried on from a span where they lay in ducts 1, 1 and 2 keep those ducts,
		// though first fit would put all three into duct 1.
		{"carried-on cables keep their ducts", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 3, IDMM: 100}, small(3), []int{0, 0, 1}, []int{2, 1, 0}, 0},
		// A preference for a duct that already holds three gives way to the next duct.
		{"a preference gives way to a sound pull", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 3, IDMM: 100}, small(5), []int{0, 0, 0, 0, 0}, []int{3, 2, 0}, 0},
		// Six cables over two ducts, three and three the other way round: they keep them.
		{"a full bank keeps its cables' ducts", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 2, IDMM: 100}, small(6),
			[]int{1, 1, 1, 0, 0, 0}, []int{3, 3}, 0},
		// Innerducts carried on keep their ducts too.
		{"carried-on innerducts keep their ducts", DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 2, IDMM: 100, Innerduct: true}, small(5),
			[]int{1, 1, 0, 1, 1}, []int{1, 4}, 0},
	} {
		a := tc.bank.Spread(tc.ods, tc.prefer)
		if a.OK != (tc.unplaced == 0) || a.Err != nil || a.Unplaced != tc.unplaced {
			t.Errorf("%s: got OK %v, err %v, %d unplaced; want %d unplaced", tc.name, a.OK, a.Err, a.Unplaced, tc.unplaced)
			continue
		}
		if got := counts(a); !slices.Equal(got, tc.want) {
			t.Errorf("%s: cables per duct got %v, want %v", tc.name, got, tc.want)
		}
		if tc.name != "a preference gives way to a sound pull" && tc.prefer != nil && !slices.Equal(a.DuctOf, tc.prefer) {
			t.Errorf("%s: ducts %v, want those the cables come from, %v", tc.name, a.DuctOf, tc.prefer)
		}
		for d, f := range a.Ducts {
			if !f.OK || f.JamRisk {
				t.Errorf("%s: duct %d: %+v, want within fill and free of jam risk", tc.name, d+1, f)
			}
			if note := CrowdedNote(len(f.CablesODMM), tc.bank.PullLimit()); note != "" {
				t.Errorf("%s: duct %d is crowded (%q)", tc.name, d+1, note)
			}
		}
	}
}

// TestSpreadProperty holds Spread, on random cables and banks, to what it promises: the same
// cables placed as first fit places (the optimizer's count, install.DuctBank.Pull), every duct
// within NFPA 70 Chapter 9 Table 1 fill and free of jam risk after each cable in the order it
// lists them (Load.Takes), and no duct given more than DefaultCablesPerDuct loose cables
// (common practice, no published source), innerducts or loose cables, with random preferences
// or none. Cables carried on into a span of the same ducts (preferring the ducts Spread gave
// them) keep them.
func TestSpreadProperty(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(13, 17))
	sizes := []float64{6, 8.5, 10, 13, 18, 25.4, 31, 33, 34.2, 35, 40, 52, 70}
	moved := 0
	for trial := range 20000 {
		b := DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 1 + rng.IntN(5), IDMM: []float64{29, 50, 53, 100, 103}[rng.IntN(5)], Innerduct: rng.IntN(3) == 0}
		ods := make([]float64, rng.IntN(30))
		for i := range ods {
			ods[i] = sizes[rng.IntN(len(sizes))]
			if rng.IntN(4) == 0 {
				ods[i] *= 1 + (rng.Float64()-0.5)/10 // within or just past the 5 % of equal sizes
			}
		}
		var prefer []int
		if trial%2 == 1 {
			prefer = make([]int, len(ods))
			for i := range prefer {
				prefer[i] = rng.IntN(b.Ducts+2) - 1 // -1 (none) to one past the last duct
			}
		}
		ff, a := b.Pull(ods), b.Spread(ods, prefer)
		// The same cables carried on into a span of the same ducts keep them, unless a duct
		// does not take its cables in pull order (a third cable refused where a fourth would
		// have restored the fill).
		if again := b.Spread(ods, a.DuctOf); !slices.Equal(again.DuctOf, a.DuctOf) && inPullOrder(b, ods, a) {
			t.Errorf("trial %d: %+v %v: carried on, cables go to ducts %v, not %v", trial, b, ods, again.DuctOf, a.DuctOf)
		}
		if a.OK != ff.OK || a.Unplaced != ff.Unplaced || a.Err != nil {
			t.Fatalf("trial %d: %+v %v: Spread OK %v, %d unplaced, err %v; Pull OK %v, %d unplaced", trial, b, ods, a.OK, a.Unplaced, a.Err, ff.OK, ff.Unplaced)
		}
		for c := range ods {
			if (a.DuctOf[c] < 0) != (ff.DuctOf[c] < 0) {
				t.Fatalf("trial %d: %+v %v: cable %d in duct %d, first fit %d", trial, b, ods, c, a.DuctOf[c], ff.DuctOf[c])
			}
		}
		if !slices.Equal(a.DuctOf, ff.DuctOf) {
			moved++
		}
		for d, f := range a.Ducts {
			if len(a.Cables[d]) != len(f.CablesODMM) {
				t.Fatalf("trial %d: duct %d: %d cable indices for %d cables", trial, d+1, len(a.Cables[d]), len(f.CablesODMM))
			}
			for k, c := range a.Cables[d] {
				if a.DuctOf[c] != d || ods[c] != f.CablesODMM[k] {
					t.Fatalf("trial %d: duct %d: cable %d (%g mm, in duct %d) listed as %g mm", trial, d+1, c, ods[c], a.DuctOf[c]+1, f.CablesODMM[k])
				}
			}
			var l Load
			for _, od := range f.CablesODMM {
				if !l.Takes(b.IDMM, od, b.PullLimit()) {
					t.Fatalf("trial %d: %+v %v: duct %d refuses %g mm after %v", trial, b, ods, d+1, od, f.CablesODMM)
				}
				l.Add(od)
			}
			if !f.OK || f.JamRisk {
				t.Fatalf("trial %d: %+v %v: duct %d %+v", trial, b, ods, d+1, f)
			}
			if Crowded(len(f.CablesODMM), b.PullLimit()) {
				t.Fatalf("trial %d: %+v %v: duct %d given %d loose cables", trial, b, ods, d+1, len(f.CablesODMM))
			}
		}
	}
	if moved == 0 {
		t.Error("no random bank was packed other than first fit: the test no longer exercises the preferences")
	}
}

// TestSpreadBadInput: invalid input gives Pull's answer, an error and nothing placed.
func TestSpreadBadInput(t *testing.T) {
	t.Parallel()
	a := DuctBank{CablesPerDuct: DefaultCablesPerDuct, Ducts: 2, IDMM: 100}.Spread([]float64{13, -1, 13, 13, 13}, nil)
	if a.Err == nil || a.OK || a.Unplaced != 5 {
		t.Errorf("got err %v, OK %v, %d unplaced; want an error, nothing placed", a.Err, a.OK, a.Unplaced)
	}
}

// inPullOrder reports whether every duct of a takes its cables in input order (Load.Takes).
func inPullOrder(b DuctBank, ods []float64, a Assignment) bool {
	loads := make([]Load, b.Ducts)
	for c, d := range a.DuctOf {
		if d < 0 {
			continue
		}
		if !loads[d].Takes(b.IDMM, ods[c], b.PullLimit()) {
			return false
		}
		loads[d].Add(ods[c])
	}
	return true
}
