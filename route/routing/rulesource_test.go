package routing

import (
	"strings"
	"testing"

	"spanwright/media"
	"spanwright/route/internal/testsite"
	"spanwright/route/optimize"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// rulesWith is the default rule file with the rule id dropped (when drop is set) and extra
// YAML rules appended.
func rulesWith(t *testing.T, drop, extra string) *media.Rules {
	t.Helper()
	def := media.DefaultRules()
	var keep []*media.Rule
	for _, r := range def.Rules {
		if r.ID != drop {
			keep = append(keep, r)
		}
	}
	r := *def
	r.Rules = keep
	if extra != "" {
		more, err := media.ParseRules("extra.yaml", []byte("rules:\n"+extra))
		if err != nil {
			t.Fatal(err)
		}
		r.Rules = append(r.Rules, more.Rules...)
	}
	return &r
}

// excluded lists, for the demo campus's problem under rules, the span classes each medium is
// kept off, as "medium:class".
func excluded(t *testing.T, rules *media.Rules) map[string]bool {
	t.Helper()
	s, p := testsite.Demo(t)
	eng, err := media.NewEngine(nil, rules, nil, plan.EngineOptions(p))
	if err != nil {
		t.Fatal(err)
	}
	hub, _ := s.Hub(p)
	links, _, errs := s.Links(p, hub)
	if len(errs) > 0 {
		t.Fatal(errs)
	}
	cm := NewModel(eng, p.Design)
	prob, lay, _, err := problem(s, cm, links, cm.runsOf(s))
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]bool{}
	for _, d := range prob.Demands {
		for _, o := range d.Options {
			for _, c := range lay.classes {
				if o.ExcludeFlags&lay.classBit[c] != 0 {
					out[o.Name+":"+c.String()] = true
				}
			}
		}
	}
	// Every edge carries its class's flag.
	for i, e := range prob.Edges[:len(s.Net.Spans)] { // the entrance and turn edges after them carry no span
		if e.Flags&lay.classBit[classOf(&s.Net.Spans[i])] == 0 {
			t.Fatalf("edge %s lacks its class flag", e.ID)
		}
	}
	return out
}

// TestOneRuleSource: which spans a medium may use comes from the rule file, both ways. The
// default copper-emi rule (common practice, no published source) keeps copper off high-EMI
// spans; without it copper may use them. A rule added to the file keeps its medium off the
// spans it names.
func TestOneRuleSource(t *testing.T) {
	t.Parallel()
	def := excluded(t, nil)
	if !def["cat6a:duct, high EMI"] {
		t.Fatalf("default rules: copper not kept off high-EMI ducts; excluded: %v", def)
	}
	if def["os2:duct, high EMI"] {
		t.Errorf("default rules: fibre kept off high-EMI ducts")
	}
	noEMI := excluded(t, rulesWith(t, "copper-emi", ""))
	for k := range noEMI {
		if strings.Contains(k, "high EMI") && strings.HasPrefix(k, "cat6a:") && !def[strings.Replace(k, ", high EMI", "", 1)] {
			t.Errorf("without copper-emi: %s still excluded", k)
		}
	}
	aerial := excluded(t, rulesWith(t, "", `  - {id: om3-not-aerial, media: [om3], when: "has_aerial", effect: exclude, reason: "test rule", source: test}
`))
	if !aerial["om3:aerial"] || def["om3:aerial"] {
		t.Errorf("an added rule keeping om3 off aerial spans: default %v, with the rule %v", def["om3:aerial"], aerial["om3:aerial"])
	}
	if aerial["om4:aerial"] {
		t.Errorf("the added om3 rule kept om4 off aerial spans")
	}
}

// TestExplainInfeasible: the optimizer's account of an unroutable link comes out in the
// plan's words: media by name, and for a medium no pathway on its own spans joins, the span
// classes on the shortest way between the link's buildings that the rules keep it off, each
// with the rule's reason; not the other classes of the campus it may not use (here the
// aerial spans, off the way), no node numbers or flag bits.
func TestExplainInfeasible(t *testing.T) {
	t.Parallel()
	emi := spanClass{emi: "high", outdoor: true, typ: "duct"}
	air := spanClass{emi: "none", outdoor: true, typ: "aerial"}
	bur := spanClass{emi: "none", outdoor: true, typ: "buried"}
	lay := &layout{classes: []spanClass{air, bur, emi}, classBit: map[spanClass]uint64{air: firstClassFlag, bur: firstClassFlag << 1, emi: firstClassFlag << 2}}
	why := func(medium string, c spanClass) string {
		if c.emi == "high" {
			return medium + " rejected by copper-emi: EMI"
		}
		return medium + " rejected by copper-outdoor: outdoors"
	}
	all := firstClassFlag | firstClassFlag<<1 | firstClassFlag<<2
	// The options the rules let onto the pathways come first, full ducts then reach, before
	// those the rules keep off them (tester 12 F5); a full duct is named by its span, with its
	// spare ducts and the cables in them (NFPA 70 Chapter 9 fill; a span that may have ducts
	// added is full only for a cable wider than its ducts take).
	// A cable no empty duct takes is named with its diameter and the ducts' inside diameter
	// (tester 15 F4): one cable fills at most 53 % of a duct (NFPA 70 Chapter 9 Table 1, seen),
	// so a 4 mm duct takes one of at most √0.53 × 4 = 2.9 mm (computed).
	prob := &optimize.Problem{Edges: []optimize.Edge{{ID: "LAT-01", Ducts: 1, DuctIDMM: 101.5}, {ID: "SP-C-1", DuctIDMM: 101.5}, {ID: "NEW-1", Proposed: true, DuctIDMM: 4}},
		Demands: []optimize.Demand{{Options: []optimize.Option{{}, {}, {}, {CableODMM: 10.5}}}}}
	got := lay.explain(optimize.Infeasible{Reason: "raw", Options: []optimize.OptionFailure{
		{Name: "cat6a", Kind: optimize.FailNoPathFlags, ExcludeFlags: all | flagDuct, BlockFlags: firstClassFlag<<1 | firstClassFlag<<2 | flagDuct},
		{Name: "om4", Kind: optimize.FailReach, ShortestM: 612.34, ReachM: 400},
		{Name: "os2", Kind: optimize.FailNoPath},
		{Option: 3, Name: "om5", Kind: optimize.FailDucts, Full: []optimize.FullEdge{{Edge: 0, Ducts: 1, Cables: 3}, {Edge: 1}, {Edge: 2, Ducts: 1}}},
	}}, &site.Link{From: "ADM", To: "OBS"}, prob, why)
	want := "om5: every route within reach crosses ducts too full for the cable: on the shortest way it may take, no room on spans " +
		"LAT-01 (1 spare duct, 3 cables of this plan in them), SP-C-1 (no spare duct), where this plan may add no duct (NFPA 70 Chapter 9 fill); " +
		"and its cable, 10.5 mm across, is wider than an empty duct of 4 mm inside (span NEW-1) takes, at most 2.9 mm (NFPA 70 Chapter 9 Table 1: one cable fills at most 53 % of a duct); " +
		"om4: the shortest route it may use is 612.3 m along pathways with the slack loops it leaves in structures, beyond the 400.0 m it reaches there; " +
		"cat6a: every pathway between ADM and OBS runs on spans it may not use; the shortest runs on ducts, where its cable does not fit the innerduct; " +
		"and on buried spans (cat6a rejected by copper-outdoor: outdoors); and on duct, high EMI spans (cat6a rejected by copper-emi: EMI); " +
		"os2: no pathway joins its two ends"
	if got != want {
		t.Errorf("got  %s\nwant %s", got, want)
	}
}
