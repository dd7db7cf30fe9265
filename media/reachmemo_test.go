package media

import (
	"fmt"
	"slices"
	"strings"
	"testing"
)

// bookWith is the demo price book with each old string of its text replaced by the new one.
func bookWith(t *testing.T, pairs ...string) *PriceBook {
	t.Helper()
	src := string(pricesYAML)
	for i := 0; i+1 < len(pairs); i += 2 {
		if !strings.Contains(src, pairs[i]) {
			t.Fatalf("the demo price book has no %q", pairs[i])
		}
		src = strings.Replace(src, pairs[i], pairs[i+1], 1)
	}
	p, err := ParsePriceBook("test-prices.yaml", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// rulesAnd is the default rule file with the YAML rules extra appended.
func rulesAnd(t *testing.T, extra string) *Rules {
	t.Helper()
	r, err := ParseRules("test-rules.yaml", append(slices.Clone(rulesYAML), []byte(extra)...))
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func engineWith(t *testing.T, c *Catalog, r *Rules, p *PriceBook, opt EngineOptions) *Engine {
	t.Helper()
	e, err := NewEngine(c, r, p, opt)
	if err != nil {
		t.Fatal(err)
	}
	return e
}

// TestReachMemoAnswers: an answer remembered from one engine and given to another equals
// the other's own, for engines whose books differ in every price (the listed cable the
// entrance transition splices on chosen otherwise) or lack the transition's enclosure.
func TestReachMemoAnswers(t *testing.T) {
	books := []*PriceBook{
		DefaultPriceBook(),
		// Riser-listed cable dear: the transition splices on another listed construction.
		bookWith(t, "ofnr-riser: {12: 1.68, 24: 2.72,", "ofnr-riser: {12: 91.68, 24: 92.72,",
			"ofnr-riser: {12: 2.62, 24: 4.25,", "ofnr-riser: {12: 92.62, 24: 94.25,"),
		bookWith(t, "transition_splice_each: 260.00\n", "", "attenuators_each: {3: 16.00, 5: 16.00, 10: 18.00, 15: 18.00}", "attenuators_each: {3: 19.00, 5: 21.00, 10: 28.00, 15: 38.00}"),
	}
	memo := NewReachMemo(1 << 12)
	var fresh []*Engine
	for _, p := range books {
		fresh = append(fresh, engineWith(t, nil, nil, p, EngineOptions{}))
	}
	if fresh[0].reachID != fresh[1].reachID {
		t.Error("two books that differ only in prices give engines of different reach")
	}
	var questions []Link
	for _, strands := range []int{2, 12, 48, 288} {
		for _, riser := range []float64{0, 9, 40} {
			for _, types := range [][]string{{"duct"}, {"aerial", "duct"}, {"tray"}} {
				questions = append(questions, Link{ID: "q", RiserM: riser, SlackM: 10, MaxEMI: "none", Outdoor: types[0] != "tray",
					PathwayTypes: types, ConnectorPairs: 2, Strands: strands, InsideAM: riser / 2, InsideBM: riser / 2})
			}
		}
	}
	insides := map[string]bool{}
	checked := 0
	for round := 0; round < 2; round++ {
		for i, p := range books {
			e := engineWith(t, nil, nil, p, EngineOptions{}) // a new engine: nothing of its own remembered
			for _, med := range e.Media() {
				for _, rate := range e.Catalog().Rates() {
					for _, future := range []float64{0, 100} {
						for _, l := range questions {
							got := memo.MaxChannelM(e, med, rate, future, l)
							want := fresh[i].MaxChannelM(med, rate, future, l)
							if got != want {
								t.Fatalf("book %d, %s at %g (future %g), %+v: remembered %v m, the engine's own %v m", i, med, rate, future, l, got, want)
							}
							insides[fmt.Sprint(i, e.insideKey(med, rate, l))] = true
							checked++
						}
					}
				}
			}
		}
	}
	if fresh[0].insideKey("os2", 10, questions[4]) == fresh[1].insideKey("os2", 10, questions[4]) {
		t.Errorf("the dear riser cable leaves the transition's inside construction as it was: %q", fresh[0].insideKey("os2", 10, questions[4]))
	}
	if checked == 0 || len(insides) < 3 {
		t.Fatalf("checked %d answers over %d inside keys: the test checks nothing", checked, len(insides))
	}
}

// TestReachID: everything MaxChannelM reads besides its arguments changes the engine's
// reachID; prices alone do not.
func TestReachID(t *testing.T) {
	base := engineWith(t, nil, nil, nil, EngineOptions{}).reachID
	if base == ([32]byte{}) {
		t.Fatal("the default engine has no reach id: nothing is shared")
	}
	if id := engineWith(t, nil, nil, bookWith(t, "cable_per_m:\n  cat6a:\n    cmr-riser: {1: 0.95}", "cable_per_m:\n  cat6a:\n    cmr-riser: {1: 1.95}",
		"transition_splice_each: 260.00", "transition_splice_each: 300.00"), EngineOptions{}).reachID; id != base {
		t.Error("a change of prices alone changes the reach id")
	}
	cat := DefaultCatalog()
	cat.DesignPairDB += 0.05
	lessRules := DefaultRules()
	lessRules.Rules = lessRules.Rules[1:]
	for _, c := range []struct {
		name string
		e    *Engine
	}{
		{"catalog", engineWith(t, cat, nil, nil, EngineOptions{})},
		{"rules", engineWith(t, nil, lessRules, nil, EngineOptions{})},
		{"loss margin", engineWith(t, nil, nil, nil, EngineOptions{LossMarginDB: 1})},
		{"pair loss", engineWith(t, nil, nil, nil, EngineOptions{PairLossDB: 0.3})},
		{"splice loss", engineWith(t, nil, nil, nil, EngineOptions{SpliceLossDB: 0.2})},
		{"outdoor copper", engineWith(t, nil, nil, nil, EngineOptions{AllowOutdoorCopper: true})},
		{"termination", engineWith(t, nil, nil, nil, EngineOptions{Termination: TerminationFieldConnector})},
		{"copper cords", engineWith(t, nil, nil, nil, EngineOptions{CopperCordsM: 5})},
		{"margins", engineWith(t, nil, nil, nil, EngineOptions{Margins: &MarginPolicy{MultimodeDB: 1, SinglemodeDB: 1}})},
		{"attenuator values", engineWith(t, nil, nil, bookWith(t, "attenuators_each: {3: 16.00,", "attenuators_each: {4: 16.00,"), EngineOptions{})},
		{"no transition", engineWith(t, nil, nil, bookWith(t, "transition_splice_each: 260.00\n", ""), EngineOptions{})},
		{"book's termination", engineWith(t, nil, nil, bookWith(t, "termination_method: spliced-pigtail", "termination_method: factory-connector"), EngineOptions{})},
	} {
		if c.e.reachID == base {
			t.Errorf("a change of %s leaves the reach id as it was", c.name)
		}
	}
}

// TestReachMemoLays: a Lays answer remembered from one engine and given to another equals the
// other's own, for every medium, construction and transition laying, rate and link of
// TestReachMemoAnswers' questions (300 strands too: two cables), on engines whose books differ
// in every price, lack the transition's enclosure, or make the 12-strand cable dearer than
// the 24 (so 300 strands buy 288 + 24, not 288 + 12), under the default rules and rules with
// one more that excludes "2 × osp-loose-tube (288 + 12 strands)" by the fact cable (which the
// book picks, so the memo keys it: Engine.bookKey). Without it the last book's
// answer for 300 strands would be the first's.
func TestReachMemoLays(t *testing.T) {
	books := []*PriceBook{
		DefaultPriceBook(),
		bookWith(t, "ofnr-riser: {12: 1.68, 24: 2.72,", "ofnr-riser: {12: 91.68, 24: 92.72,",
			"ofnr-riser: {12: 2.62, 24: 4.25,", "ofnr-riser: {12: 92.62, 24: 94.25,"),
		bookWith(t, "transition_splice_each: 260.00\n", ""),
		bookWith(t, "osp-loose-tube: {12: 1.43, 24: 2.31,", "osp-loose-tube: {12: 9.43, 24: 2.31,"),
	}
	strict := rulesAnd(t, `
  - id: no-288-12
    when: cable == "2 × osp-loose-tube (288 + 12 strands)"
    effect: exclude
    reason: "test rule on the cable the book picks"
    source: common practice, no published source
`)
	var questions []Link
	for _, strands := range []int{2, 12, 48, 300} {
		for _, riser := range []float64{0, 40} {
			for _, types := range [][]string{{"duct"}, {"aerial", "duct"}, {"tray"}} {
				questions = append(questions, Link{ID: "q", RiserM: riser, SlackM: 10, MaxEMI: "none", Outdoor: types[0] != "tray",
					PathwayTypes: types, ConnectorPairs: 2, Strands: strands, InsideAM: riser / 2, InsideBM: riser / 2})
			}
		}
	}
	for _, rules := range []*Rules{nil, strict} {
		memo := NewReachMemo(1 << 12)
		var fresh []*Engine
		for _, p := range books {
			fresh = append(fresh, engineWith(t, nil, rules, p, EngineOptions{}))
		}
		checked := 0
		for round := 0; round < 2; round++ {
			for i, p := range books {
				e := engineWith(t, nil, rules, p, EngineOptions{})
				for _, med := range e.Media() {
					m := e.Catalog().Medium(med)
					for _, rate := range e.Catalog().Rates() {
						for _, l := range questions {
							var lays []Laying
							for _, k := range m.Constructions {
								lays = append(lays, Laying{Construction: k.ID})
							}
							if lay, _, ok := e.LayingFor(med, rate, l); ok {
								lays = append(lays, lay)
							}
							for _, lay := range lays {
								got, want := memo.Lays(e, med, lay, rate, l), fresh[i].Lays(med, lay, rate, l)
								if got != want {
									t.Fatalf("rules %v, book %d, %s laid %+v at %g, %+v: remembered %v, the engine's own %v", rules != nil, i, med, lay, rate, l, got, want)
								}
								checked++
							}
						}
					}
				}
			}
		}
		if checked == 0 {
			t.Fatal("checked nothing")
		}
		if rules != nil {
			// The strict rule excludes the first book's 300 strands of osp-loose-tube and not
			// the last's: the same question, two answers.
			lay := Laying{Construction: "osp-loose-tube"}
			l := questions[len(questions)-6] // 300 strands, no riser, in a duct
			if a, b := fresh[0].Lays("os2", lay, 10, l), fresh[3].Lays("os2", lay, 10, l); a || !b {
				t.Errorf("300 strands of os2 osp-loose-tube at 10G under the strict rule: book 0 lays %v, book 3 lays %v; want false, true", a, b)
			}
		}
	}
}

// TestReachMemoCables: under a rule on the fact cable, which names the cables the book picks
// for the strands (Engine.Cables: 300 strands as 288 + 12, or as 288 + 24 where the 12-strand
// cable is dearer), a reach remembered from one engine and given to another of a book that
// picks other cables equals the other's own, asked in either order, laid as a construction
// or as any: the memo keys the cables of every construction asked (Engine.bookKey), as for Lays.
func TestReachMemoCables(t *testing.T) {
	t.Parallel()
	strict := rulesAnd(t, `
  - id: no-288-12
    when: cable == "2 × osp-loose-tube (288 + 12 strands)" or cable == "2 × indoor-outdoor (288 + 12 strands)"
    effect: exclude
    reason: "test rule on the cable the book picks"
    source: common practice, no published source
`)
	books := []*PriceBook{DefaultPriceBook(),
		bookWith(t, "osp-loose-tube: {12: 1.43, 24: 2.31,", "osp-loose-tube: {12: 9.43, 24: 2.31,",
			"indoor-outdoor: {12: 2.02, 24: 3.26,", "indoor-outdoor: {12: 9.02, 24: 3.26,")}
	l := Link{ID: "q", RiserM: 0, SlackM: 10, MaxEMI: "none", Outdoor: true, PathwayTypes: []string{"duct"}, ConnectorPairs: 2, Strands: 300}
	differ := 0
	for _, lay := range []Laying{{}, {Construction: "osp-loose-tube"}, {Construction: "indoor-outdoor"}} {
		var want [2]float64
		for i, p := range books {
			want[i] = engineWith(t, nil, strict, p, EngineOptions{}).maxChannelM("os2", lay, 10, 0, l)
		}
		if want[0] != want[1] {
			differ++
		}
		for _, order := range [][2]int{{0, 1}, {1, 0}} {
			memo := NewReachMemo(1 << 10)
			for _, i := range order {
				e := engineWith(t, nil, strict, books[i], EngineOptions{})
				if got := memo.MaxChannelMAs(e, "os2", lay, 10, 0, l); got != want[i] {
					t.Errorf("os2 laid %+v, book %d asked after book %d: remembered %v m, the engine's own %v m", lay, i, order[0], got, want[i])
				}
			}
		}
	}
	if differ == 0 {
		t.Fatal("the books' cables change no reach: the test checks nothing")
	}
}

// TestReachMemoHold: a memo made room for by Hold keeps every answer of a plan larger than
// its first size, so that the next scenario, asking the same questions in the same order,
// finds them; without it, an LRU of the first size keeps only the last questions asked, and
// the next scenario's first questions drop the rest before it asks them. Hold never shrinks
// the memo.
func TestReachMemoHold(t *testing.T) {
	t.Parallel()
	e := engineWith(t, nil, nil, nil, EngineOptions{})
	var questions []Link
	for riser := 0; riser < 40; riser++ {
		questions = append(questions, Link{RiserM: float64(riser), SlackM: 10, MaxEMI: "none", Outdoor: true, PathwayTypes: []string{"duct"},
			ConnectorPairs: 2, Strands: 12, InsideAM: float64(riser) / 2, InsideBM: float64(riser) / 2})
	}
	ask := func(r *ReachMemo) {
		for _, l := range questions {
			r.MaxChannelMAs(e, "os2", Laying{}, 10, 0, l)
			r.Lays(e, "os2", Laying{Construction: "osp-loose-tube"}, 10, l)
		}
	}
	small := NewReachMemo(8)
	ask(small)
	if reaches, lays := small.Held(); reaches != 8 || lays != 8*laysPerReach {
		t.Fatalf("a memo of 8 reaches holds %d reaches, %d layings after 40 questions: want 8 and %d", reaches, lays, 8*laysPerReach)
	}
	held := NewReachMemo(8)
	held.Hold(len(questions), len(questions))
	ask(held)
	if reaches, lays := held.Held(); reaches != len(questions) || lays != len(questions) {
		t.Errorf("a memo held for 40 questions holds %d reaches, %d layings after them: want 40 and 40", reaches, lays)
	}
	held.Hold(1, 1)
	if reaches, lays := held.Held(); reaches != len(questions) || lays != len(questions) {
		t.Errorf("Hold(1, 1) shrank the memo to %d reaches, %d layings", reaches, lays)
	}
}
