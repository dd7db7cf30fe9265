package media

import (
	"fmt"
	"slices"
	"testing"
)

// namedRules are the default rules and three rules a practitioner might add that decide on a
// name: an owner's standard for one building (single-mode only to the hospital, MED), a
// feeder span named as the EMI area to keep multimode and copper off, and a building passed
// through whose roof space is a plenum (the chapel, CHAPEL). The names and the requirements
// are invented for the test; the rule shapes are the rule language's (media.FactList).
func namedRules(t *testing.T) *Rules {
	t.Helper()
	return rulesAnd(t, `
  - id: med-singlemode
    when: (end_a == "MED" or end_b == "MED") and kind != "singlemode"
    effect: exclude
    reason: "{end_a} to {end_b}: the owner's standard asks single-mode to every telecom room of MED"
    source: test rule, an owner's building-specific requirement (invented)

  - id: feeder-emi
    when: emi_spans == "span SUB-FEED" and kind != "singlemode"
    effect: exclude
    reason: "{emi_spans} runs beside the substation feeder: single-mode only there"
    source: test rule, an EMI area named by its span (invented)

  - id: chapel-plenum
    when: crossed_building == "CHAPEL" and crossed_inside_max_m > 0 and not construction_plenum_rated
    effect: exclude
    reason: "the route runs {crossed_inside_max_m} m through {crossed_building}, whose roof space is a plenum"
    source: test rule, a building-specific requirement (invented)
`)
}

// namedPairs are two links each that differ only in one name (Link.EndA, EndB, EMISpans,
// CrossedBuilding), one of them the name a rule of namedRules reads.
func namedPairs() []struct {
	name string
	a, b Link
} {
	base := Link{ID: "L1", RiserM: 20, SlackM: 10, MaxEMI: "low", EMISpans: "span D-EW02", Outdoor: true, PathwayTypes: []string{"duct"},
		ConnectorPairs: 2, Strands: 12, InsideAM: 12, InsideBM: 12, EndA: "GYM", EndB: "ADM"}
	with := func(f func(l *Link)) Link {
		l := base
		f(&l)
		return l
	}
	crossed := func(building string) func(l *Link) {
		return func(l *Link) { l.CrossedInsideM, l.CrossedInsideMaxM, l.CrossedBuilding = 8, 8, building }
	}
	return []struct {
		name string
		a, b Link
	}{
		{"end_a", with(func(l *Link) { l.EndA = "MED" }), with(func(l *Link) { l.ID = "L2" })},
		{"end_b", with(func(l *Link) { l.EndB = "MED" }), with(func(l *Link) { l.ID = "L2" })},
		{"emi_spans", with(func(l *Link) { l.EMISpans = "span SUB-FEED" }), with(func(l *Link) { l.ID = "L2" })},
		{"crossed_building", with(crossed("CHAPEL")), with(crossed("HALL"))},
	}
}

// TestMemosReadNames: two links that differ only in a name a rule's condition compares (an
// end building, the EMI spans, the building crossed) get each its own answer from every
// remembered verdict of the engine (Engine.MaxChannelMAs's memo, ReachMemo.MaxChannelMAs and
// ReachMemo.Lays), asked in either order: the answers of an engine that remembers nothing.
// With a key that left the name out, the second link asked got the first's answer, so a
// plan's media depended on which link was asked first (on ids and feature order).
func TestMemosReadNames(t *testing.T) {
	t.Parallel()
	rules := namedRules(t)
	type ask struct {
		name  string
		memo  func(e *Engine, r *ReachMemo, medium string, lay Laying, l Link) string
		fresh func(e *Engine, medium string, lay Laying, l Link) string
	}
	asks := []ask{
		{"Engine.MaxChannelMAs",
			func(e *Engine, _ *ReachMemo, medium string, lay Laying, l Link) string {
				return fmt.Sprint(e.MaxChannelMAs(medium, lay, 10, 0, l))
			},
			func(e *Engine, medium string, lay Laying, l Link) string {
				return fmt.Sprint(e.maxChannelM(medium, lay, 10, 0, l))
			}},
		{"ReachMemo.MaxChannelMAs",
			func(e *Engine, r *ReachMemo, medium string, lay Laying, l Link) string {
				return fmt.Sprint(r.MaxChannelMAs(e, medium, lay, 10, 0, l))
			},
			func(e *Engine, medium string, lay Laying, l Link) string {
				return fmt.Sprint(e.maxChannelM(medium, lay, 10, 0, l))
			}},
		{"ReachMemo.Lays",
			func(e *Engine, r *ReachMemo, medium string, lay Laying, l Link) string {
				return fmt.Sprint(r.Lays(e, medium, lay, 10, l))
			},
			func(e *Engine, medium string, lay Laying, l Link) string {
				return fmt.Sprint(e.feasibleAt(new(candidate), withRate(l, 10), mediumIndex(e, medium), shortLengths(l).channelM, lay))
			}},
	}
	ref := engineWith(t, nil, rules, nil, EngineOptions{})
	for _, p := range namedPairs() {
		for _, a := range asks {
			differ := 0
			for _, med := range ref.Media() {
				lays := []Laying{{}}
				for _, k := range ref.Catalog().Medium(med).Constructions {
					lays = append(lays, Laying{Construction: k.ID})
				}
				for _, lay := range lays {
					if a.name == "ReachMemo.Lays" && lay.Construction == "" {
						continue // Lays remembers only a laying with its construction named
					}
					wantA, wantB := a.fresh(ref, med, lay, p.a), a.fresh(ref, med, lay, p.b)
					if wantA != wantB {
						differ++
					}
					links, want := [2]Link{p.a, p.b}, [2]string{wantA, wantB}
					for _, order := range [][2]int{{0, 1}, {1, 0}} {
						e := engineWith(t, nil, rules, nil, EngineOptions{}) // nothing remembered
						r := NewReachMemo(1 << 10)
						first, second := a.memo(e, r, med, lay, links[order[0]]), a.memo(e, r, med, lay, links[order[1]])
						if first != want[order[0]] || second != want[order[1]] {
							t.Errorf("%s, %s, %s laid %q: asked for %s then %s: got %s, %s; an engine remembering nothing answers %s, %s",
								p.name, a.name, med, lay.Construction, nameOf(links[order[0]], p.name), nameOf(links[order[1]], p.name),
								first, second, want[order[0]], want[order[1]])
						}
					}
				}
			}
			if differ == 0 {
				t.Errorf("%s, %s: the rule on the name changes no answer: the test checks nothing", p.name, a.name)
			}
		}
	}
}

// nameOf is l's name of the fact named.
func nameOf(l Link, fact string) string {
	switch fact {
	case "end_a":
		return l.EndA
	case "end_b":
		return l.EndB
	case "emi_spans":
		return l.EMISpans
	}
	return l.CrossedBuilding
}

func withRate(l Link, rateGbps float64) Link {
	l.RateGbps = rateGbps
	return l
}

func mediumIndex(e *Engine, medium string) int {
	return slices.Index(e.cat.Media, e.cat.Medium(medium))
}

// TestNamesOnlyInTheirFacts: clearing a link's ID and names (names.keep) changes no fact of
// any candidate but those made from the names cleared (Fact.names), nor, under the default
// rules (whose conditions read no name), any verdict or cost; and each fact marked with a name
// does change with it. So a verdict depends on a name only through a fact a condition reads
// (Engine.reads), which is what lets the memos of verdicts key the judged link
// (Engine.judged). A fact made from a name without its mark fails here.
func TestNamesOnlyInTheirFacts(t *testing.T) {
	t.Parallel()
	e := engineWith(t, nil, nil, nil, EngineOptions{})
	if e.reads != 0 {
		t.Fatalf("the default rules read names %b: want none", e.reads)
	}
	// Outdoors with risers at both ends and inside cable at each: candidates with an entrance
	// transition at either end and both, whose cable fact names the end.
	l := Link{ID: "L1", RouteM: 300, RiserM: 20, SlackM: 10, RateGbps: 10, MaxEMI: "low", EMISpans: "span SUB-FEED", Outdoor: true,
		PathwayTypes: []string{"duct"}, ConnectorPairs: 2, Strands: 12, InsideAM: 12, InsideBM: 9, EndA: "MED", EndB: "ADM",
		CrossedInsideMaxM: 4, CrossedBuilding: "CHAPEL"}
	changed := map[int]bool{}
	evaluated, oneEnd := 0, 0
	for keep := names(0); keep <= allNames; keep++ {
		k := keep.keep(l)
		for mi, m := range e.cat.Media {
			for ai, a := range e.cat.Applications {
				if a.RateGbps != l.RateGbps || len(e.reachesOn(a, m)) == 0 {
					continue
				}
				for ki, kc := range m.Constructions {
					for _, v := range e.variants(l, a, m, kc) {
						var c, ck candidate
						e.evaluate(&c, l, linkLengths(l), mi, ai, ki, v)
						e.evaluate(&ck, k, linkLengths(k), mi, ai, ki, v)
						evaluated++
						if v.at == EndA || v.at == EndB {
							oneEnd++
						}
						for i := range facts {
							if c.f[i] == ck.f[i] {
								continue
							}
							changed[i] = true
							if facts[i].names&^keep == 0 {
								t.Errorf("%s %s %s laid %+v: fact %s is %+v, %+v with names %b kept: it is made from a name not marked (Fact.names %b)",
									m.ID, a.Name, kc.ID, layingOf(kc, v), facts[i].Name, c.f[i], ck.f[i], keep, facts[i].names)
							}
						}
						if c.failed != ck.failed || c.nFailed != ck.nFailed || c.costCents != ck.costCents || c.cableCents != ck.cableCents {
							t.Errorf("%s %s %s laid %+v: the names change the verdict or cost under rules that read none", m.ID, a.Name, kc.ID, layingOf(kc, v))
						}
					}
				}
			}
		}
	}
	if evaluated == 0 || oneEnd == 0 {
		t.Fatalf("evaluated %d candidates, %d with a transition at one end: the test checks too little", evaluated, oneEnd)
	}
	for i, f := range facts {
		if f.names != 0 && !changed[i] {
			t.Errorf("fact %s is marked as made from names %b but never changed with them", f.Name, f.names)
		}
	}
	// The engine's reads are the names of the facts its rules' conditions read.
	if got := engineWith(t, nil, namedRules(t), nil, EngineOptions{}).reads; got != allNames {
		t.Errorf("the named rules read names %b, want %b", got, allNames)
	}
	cable := rulesAnd(t, `
  - id: no-transition-at-med
    when: cable == "osp-loose-tube spliced to ofnr-riser at the entrance of MED"
    effect: exclude
    reason: "test rule on the cable's words"
    source: test rule (invented)
`)
	if got := engineWith(t, nil, cable, nil, EngineOptions{}).reads; got != nameEndA|nameEndB {
		t.Errorf("a rule on the cable reads names %b, want the ends' %b", got, nameEndA|nameEndB)
	}
}
