package routing

import (
	"fmt"
	"testing"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// TestModelMemosKeyWhatTheRulesRead: the plan's memos of the rules' verdicts (Model.lays,
// layingFor, cableFor) give two links that differ only in what a rule reads each its own
// answer, asked in either order: the answers of a model that remembers nothing. The links
// differ in the building at one end, which an owner's building-specific rule reads (single-mode
// only to the hospital, MED: an invented requirement in a real rule shape), and, for the
// copper cable's price, in the 4-pair cables a copper link asks (Link.CopperCables: 6 and 8
// strands both round up to a 12-strand fibre cable, but are 3 and 4 copper cables). With keys
// that left them out, the second link asked got the first's answer.
func TestModelMemosKeyWhatTheRulesRead(t *testing.T) {
	t.Parallel()
	rules := rulesWith(t, "", `
  - id: med-singlemode
    when: (end_a == "MED" or end_b == "MED") and kind != "singlemode"
    effect: exclude
    reason: "{end_a} to {end_b}: the owner's standard asks single-mode to every telecom room of MED"
    source: test rule, an owner's building-specific requirement (invented)
`)
	named, err := media.NewEngine(nil, rules, nil, media.EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	copper, err := media.NewEngine(nil, nil, nil, media.EngineOptions{AllowOutdoorCopper: true})
	if err != nil {
		t.Fatal(err)
	}
	infoOf := func(to string, copperCables int) demandInfo {
		f := media.Link{ID: fmt.Sprintf("L-%s-%d", to, copperCables), RiserM: 20, SlackM: 10, RateGbps: 10, MaxEMI: geo.EMINone, ConnectorPairs: ConnectorPairs,
			Strands: 12, CopperCables: copperCables, InsideAM: 12, InsideBM: 12, EndA: to, EndB: "ADM"}
		return demandInfo{facts: f, rate: 10, strands: 12}
	}
	duct := spanClass{emi: geo.EMINone, outdoor: true, typ: geo.TypeDuct}
	s := &site.Site{} // no shared memo (Site.Reaches nil): the model's own memos alone
	type ask func(m *Model, medium string, info demandInfo) string
	asks := map[string]ask{
		"lays": func(m *Model, medium string, info demandInfo) string {
			var out string
			for _, k := range m.eng.Catalog().Medium(medium).Constructions {
				out += fmt.Sprint(m.lays(s, medium, media.Laying{Construction: k.ID}, info, duct), " ")
			}
			return out
		},
		"layingFor": func(m *Model, medium string, info demandInfo) string {
			l, ok := m.layingFor(medium, info, duct)
			return fmt.Sprint(l, ok)
		},
		"cableFor": func(m *Model, medium string, info demandInfo) string {
			lay, perM := m.cableFor(medium, info.rate, info.facts, 14)
			return fmt.Sprint(lay, perM)
		},
	}
	for _, c := range []struct {
		name   string
		eng    *media.Engine
		medium string
		a, b   demandInfo
		asks   []string
	}{
		{"end_a", named, "om4", infoOf("MED", 6), infoOf("GYM", 6), []string{"lays", "layingFor", "cableFor"}},
		{"copper cables", copper, "cat6a", infoOf("GYM", 3), infoOf("GYM", 4), []string{"cableFor"}},
	} {
		for _, name := range c.asks {
			a := asks[name]
			want := [2]string{a(NewModel(c.eng, plan.Design{}), c.medium, c.a), a(NewModel(c.eng, plan.Design{}), c.medium, c.b)}
			if want[0] == want[1] {
				t.Errorf("%s, %s: both links get %s from a model remembering nothing: the test checks nothing", c.name, name, want[0])
				continue
			}
			infos := [2]demandInfo{c.a, c.b}
			for _, order := range [][2]int{{0, 1}, {1, 0}} {
				m := NewModel(c.eng, plan.Design{})
				first, second := a(m, c.medium, infos[order[0]]), a(m, c.medium, infos[order[1]])
				if first != want[order[0]] || second != want[order[1]] {
					t.Errorf("%s, %s of %s: asked for %s then %s: got %s, %s; a model remembering nothing answers %s, %s", c.name, name, c.medium,
						infos[order[0]].facts.ID, infos[order[1]].facts.ID, first, second, want[order[0]], want[order[1]])
				}
			}
		}
	}
}

// TestProblemHoldsItsQuestions: building a plan's problem makes room in the site's memo of
// reaches for every question the plan asks it (media.ReachMemo.Hold), so a memo first made
// for one reach and four layings ends holding all the demo plan's: the next scenario of a
// sweep finds them, where an LRU smaller than a plan's questions, asked in the same order by
// every scenario, would keep nothing it asks first.
func TestProblemHoldsItsQuestions(t *testing.T) {
	t.Parallel()
	s, p := testsite.DemoFresh(t)
	s.Reaches = media.NewReachMemo(1)
	m, links := generatedLinks(t, s, p) // the demo plan's model and links
	if _, _, _, err := problem(s, m, links, m.runsOf(s)); err != nil {
		t.Fatal(err)
	}
	reaches, lays := s.Reaches.Held()
	if reaches < len(m.reachMemo) || lays != len(m.laysMemo) || len(m.reachMemo) < 2 || len(m.laysMemo) < 5 {
		t.Errorf("the site's memo holds %d reaches and %d layings; the plan asked %d reaches (and %d span classes allowed) and %d layings",
			reaches, lays, len(m.reachMemo), len(m.allowedMemo), len(m.laysMemo))
	}
}
