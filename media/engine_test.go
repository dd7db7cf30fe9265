package media

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"sync"
	"testing"
)

func newEngine(t *testing.T, c *Catalog, r *Rules, opt EngineOptions) *Engine {
	t.Helper()
	e, err := NewEngine(c, r, nil, opt)
	if err != nil {
		t.Fatal(err)
	}
	return e
}

// setReach changes an application's range and loss limit on a medium (0 keeps the loss).
func setReach(t *testing.T, c *Catalog, app, medium string, rangeM, lossDB float64) {
	t.Helper()
	a := c.Application(app)
	for i := range a.Reach {
		if a.Reach[i].Medium == medium {
			a.Reach[i].RangeM = rangeM
			if lossDB > 0 {
				a.Reach[i].MaxLossDB = lossDB
			}
			return
		}
	}
	t.Fatalf("%s does not run on %s", app, medium)
}

// ieeeSingleMode sets every single-mode construction to IEEE 802.3's budget assumption:
// 0.4 dB/km at 1310 nm and 0.3 dB/km at 1550 nm (seen).
func ieeeSingleMode(c *Catalog) {
	for _, k := range c.Medium("os2").Constructions {
		k.Attenuation = []Attenuation{{1310, 0.4}, {1550, 0.3}}
	}
}

// tiaMaxima plans with the ANSI/TIA-568.3-D maxima (0.75 dB per mated pair, 0.3 dB per
// splice), connectors without splices and no margin policy: IEEE 802.3's own budget model,
// against which a channel insertion loss is reproduced, plus the plan's margin.
func tiaMaxima(planMarginDB float64) EngineOptions {
	return EngineOptions{LossMarginDB: planMarginDB, PairLossDB: 0.75, SpliceLossDB: 0.3, Termination: TerminationFactory, Margins: &MarginPolicy{}}
}

func rejectionFor(ch Choice, medium string) []Rejection {
	var out []Rejection
	for _, r := range ch.Rejected {
		if r.Medium == medium {
			out = append(out, r)
		}
	}
	return out
}

func TestChoose(t *testing.T) {
	t.Parallel()
	indoor := func(channelM float64) Link {
		return Link{ID: "L", RouteM: channelM - 20, RiserM: 10, SlackM: 10, RateGbps: 10, MaxEMI: "none", ConnectorPairs: 2, Strands: 1}
	}
	cases := []struct {
		name         string
		link         Link
		opt          EngineOptions
		catalog      func(*Catalog)
		rules        string // file under testdata/rules, "" for the default rules
		wantFeasible bool
		wantMedium   string
		wantApp      string
		wantCons     string
		wantCents    int64    // computed from prices-demo.yaml
		wantRejected []string // substrings of Rejected reasons
		wantReason   []string // substrings of Choice.Reason
	}{
		{
			// ANSI/TIA-568.2: a 90 m permanent link is the installed copper limit (seen); common practice picks copper there
			name: "copper at exactly 90 m installed", link: indoor(90), opt: tiaMaxima(1),
			wantFeasible: true, wantMedium: "cat6a", wantApp: "10GBASE-T", wantCons: "cmr-riser",
			wantCents: 8550 + 2*1100 + 2*5500, // 90 m x 0.95 + 2 jacks + 2 x 10GBASE-T
			// computed: 0.09 km x 3.5 dB/km + 2 x 0.75 dB = 1.815 dB against IEEE 802.3 Clause 52's 2.6 dB
			wantRejected: []string{"om3 rejected by loss-budget: 10GBASE-SR on ofnr-riser loses 1.81 dB at 850 nm against a limit of 2.6 dB; margin 0.79 dB is below the required 1 dB", "os2 rejected by cost"},
			wantReason:   []string{"cat6a with 10GBASE-T on cmr-riser is the cheapest of 4 feasible media at 217.50 USD of cable, terminations and transceivers for a 90 m channel, within its 100 m reach"},
		},
		{
			// ANSI/TIA-568.2, 90 m permanent link (seen): 96 m of installed Cat 6A is not a channel
			name: "copper past 90 m installed", link: indoor(96), opt: tiaMaxima(1),
			wantFeasible: true, wantMedium: "os2", wantApp: "10GBASE-LR", wantCons: "ofnr-riser",
			wantCents:    16128 + 2*2*1350 + 2*4500, // 96 m x 1.68 + 2 strands x 2 ends + 2 x 10GBASE-LR
			wantRejected: []string{"cat6a rejected by copper-90m: installed copper (the permanent link) is at most 90 m; this link installs 96 m"},
		},
		{
			// ANSI/TIA-568.2, 100 m channel (seen): 85 m installed with 20 m of cords is 105 m
			name: "copper channel with long cords", link: indoor(85), opt: EngineOptions{CopperCordsM: 20},
			wantFeasible: true, wantMedium: "os2",
			wantRejected: []string{"cat6a rejected by copper-100m: a copper channel is at most 100 m; this one is 85 m installed plus 20 m of cords"},
		},
		{
			// common practice, no published source: fibre on a high-EMI route
			// OM3 keeps 0.825 dB of 2.6 (0.05 km x 3.5 + 2 x 0.5 + 2 pigtail splices x 0.3, computed), under the plan's 1 dB
			name: "fibre on a high-EMI route", link: func() Link { l := indoor(50); l.MaxEMI = "high"; return l }(), opt: EngineOptions{LossMarginDB: 1},
			wantFeasible: true, wantMedium: "os2", wantApp: "10GBASE-LR", wantCons: "ofnr-riser",
			wantCents:    8400 + 2*2*1350 + 2*4500,
			wantRejected: []string{"cat6a rejected by copper-emi: the route crosses a high-EMI segment"},
		},
		{
			// common practice, no published source: the reason names the high-EMI span, so that
			// the designer can judge a detour (tester 10's finding 18)
			name: "copper-emi names the span", link: func() Link { l := indoor(50); l.MaxEMI, l.EMISpans = "high", "span D-EW02b"; return l }(),
			wantFeasible: true, wantMedium: "om3",
			wantRejected: []string{"cat6a rejected by copper-emi: the route crosses a high-EMI segment on span D-EW02b; all-dielectric fibre is immune to EMI"},
		},
		{
			// IEEE 802.3 Clause 52: 10GBASE-SR reaches 400 m on OM4 (seen)
			name: "reach rejects multimode at 612 m",
			link: Link{ID: "B", RouteM: 580, RiserM: 20, SlackM: 12, RateGbps: 10, MaxEMI: "low", Outdoor: true, ConnectorPairs: 2, Strands: 12},
			opt:  EngineOptions{LossMarginDB: 1}, wantFeasible: true, wantMedium: "os2", wantApp: "10GBASE-LR", wantCons: "osp-loose-tube",
			wantCents: 87516 + 2*12*1350 + 2*4500, // 612 m x 1.43
			wantRejected: []string{
				"om3 rejected by reach: 10GBASE-SR reaches 300 m, channel is 612 m",
				"om4 rejected by reach: 10GBASE-SR reaches 400 m, channel is 612 m",
				"cat6a rejected by copper-90m",
			},
			// computed: 0.612 km x 0.5 dB/km + 2 x 0.5 dB + 2 pigtail splices x 0.3 dB = 1.906 dB
			wantReason: []string{"os2 with 10GBASE-LR on osp-loose-tube is the only feasible medium, at 1289.16 USD of cable, terminations and transceivers for a 612 m channel, loss 1.91 dB against 6.2 dB at 1310 nm (margin 4.29 dB)"},
		},
		{
			// NFPA 70 800.90: copper between buildings needs primary protection (seen)
			name: "no copper between buildings", link: Link{RouteM: 60, RateGbps: 1, Outdoor: true, ConnectorPairs: 2, Strands: 1},
			wantFeasible: true, wantMedium: "os2", wantApp: "1000BASE-LX", wantCons: "osp-loose-tube",
			wantCents:    8580 + 2*2*1350 + 2*2200,
			wantRejected: []string{"cat6a rejected by copper-outdoor: the channel leaves the building"},
		},
		{
			name: "copper between buildings when allowed", link: Link{RouteM: 60, RateGbps: 1, Outdoor: true, ConnectorPairs: 2, Strands: 1},
			opt: EngineOptions{AllowOutdoorCopper: true}, wantFeasible: true, wantMedium: "cat6a", wantApp: "1000BASE-T", wantCons: "outdoor",
			wantCents:    9600 + 2*1100 + 2*2500,
			wantRejected: []string{"os2 rejected by cost: os2 with 1000BASE-LX on osp-loose-tube costs 183.80 USD of cable, terminations and transceivers, 15.80 more than cat6a"},
		},
		{
			// NFPA 70 Article 770: unlisted OSP cable at most 15 m inside the entrance (seen as fragment)
			name: "long risers and no transition splice", link: Link{RouteM: 300, RiserM: 40, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 2},
			wantFeasible: true, wantMedium: "os2", wantApp: "10GBASE-LR", wantCons: "indoor-outdoor",
			wantCents: 340*202 + 2*2*1350 + 2*4500,
		},
		{
			// Mid-span splices are not entrance transitions: the 15 m rule still applies.
			name: "long risers with mid-span splices", link: Link{RouteM: 300, RiserM: 40, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Splices: 2, Strands: 2},
			wantFeasible: true, wantMedium: "os2", wantApp: "10GBASE-LR", wantCons: "indoor-outdoor",
			wantCents: 340*202 + 2*2*1350 + 2*4500,
		},
		{
			// common practice, no published source: multimode is not used beyond 2 km. The
			// catalog is changed so that reach does not reject first.
			name: "multimode beyond 2 km", link: Link{RouteM: 2500, RateGbps: 1, ConnectorPairs: 2, Strands: 2},
			catalog:      func(c *Catalog) { setReach(t, c, "1000BASE-SX", "om4", 5000, 0) },
			wantFeasible: true, wantMedium: "os2",
			wantRejected: []string{"om4 rejected by multimode-2km: multimode is not used beyond 2 km (modal delay distortion); channel is 2500 m", "om3 rejected by reach"},
		},
		{
			name: "multimode under 2 km falls to the loss budget", link: Link{RouteM: 1900, RateGbps: 1, ConnectorPairs: 2, Strands: 2},
			catalog: func(c *Catalog) { setReach(t, c, "1000BASE-SX", "om4", 5000, 0) }, opt: tiaMaxima(0),
			wantFeasible: true, wantMedium: "os2",
			wantRejected: []string{"om4 rejected by loss-budget: 1000BASE-SX on ofnr-riser loses 8.15 dB at 850 nm against a limit of 3.56 dB"},
		},
		{
			// IEEE 802.3 Clause 88: 100GBASE-ER4 40 km, 18 dB (seen); with TIA-568.3-D's OSP
			// maximum of 0.5 dB/km a 30 km channel closes: 15 + 1.5 = 16.5 dB (computed)
			name: "single-mode serves 30 km at 100G", link: Link{RouteM: 30000, RateGbps: 100, Outdoor: true, ConnectorPairs: 2, Strands: 12},
			opt: tiaMaxima(1), wantFeasible: true, wantMedium: "os2", wantApp: "100GBASE-ER4", wantCons: "osp-loose-tube",
			wantCents:  30000*143 + 2*12*1350 + 2*145000,
			wantReason: []string{"loss 16.5 dB against 18 dB at 1310 nm (margin 1.5 dB)"},
		},
		{
			// IEEE 802.3 Clause 88 (seen): 40 km at IEEE's own 0.4 dB/km: 16 + 1.5 = 17.5 dB (computed)
			name: "single-mode serves 40 km at 100G with IEEE attenuation", link: Link{RouteM: 40000, RateGbps: 100, Outdoor: true, ConnectorPairs: 2, Strands: 2},
			catalog: ieeeSingleMode, opt: tiaMaxima(0), wantFeasible: true, wantMedium: "os2", wantApp: "100GBASE-ER4",
			wantReason: []string{"loss 17.5 dB against 18 dB at 1310 nm (margin 0.5 dB)"},
		},
		{
			// computed: 40 km x 0.5 dB/km + 1.5 dB = 21.5 dB > 18 dB with the TIA-568.3-D OSP maximum
			name: "40 km at TIA maximum attenuation does not close", link: Link{RouteM: 40000, RateGbps: 100, Outdoor: true, ConnectorPairs: 2, Strands: 2},
			opt: tiaMaxima(0), wantFeasible: false,
			wantReason: []string{"no medium carries 100G over 40000 m", "os2 rejected by loss-budget: 100GBASE-ER4 on indoor-outdoor loses 21.5 dB at 1310 nm against a limit of 18 dB"},
		},
		{
			// IEEE 802.3 Clause 52: 10GBASE-ER 30 km, 11 dB = 30 x 0.3 + 2.0 (seen)
			name: "single-mode serves 30 km at 10G with IEEE attenuation", link: Link{RouteM: 30000, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 2},
			catalog: ieeeSingleMode, opt: tiaMaxima(0), wantFeasible: true, wantMedium: "os2", wantApp: "10GBASE-ER",
			wantReason: []string{"loss 10.5 dB against 11 dB at 1550 nm (margin 0.5 dB)"},
		},
		{
			// The link carries 10G now and 40G later: OM3's 40GBASE-SR4 reaches 100 m (IEEE 802.3
			// Clause 86, seen); OM4's closes no budget with two 0.75 dB pairs (computed)
			name: "future rate", link: Link{RouteM: 100, RiserM: 10, SlackM: 10, RateGbps: 10, FutureRateGbps: 40, ConnectorPairs: 2, Strands: 12},
			opt: tiaMaxima(0), wantFeasible: true, wantMedium: "os2", wantApp: "10GBASE-LR",
			// Which 40G application it is ready for, and its margin (tester 15 F11): 40GBASE-LR4
			// allows 6.7 dB (IEEE 802.3 Clause 87, from memory), the channel loses 0.12 km x
			// 1.0 dB/km + 2 x 0.75 = 1.62 dB (ANSI/TIA-568.3-D maxima, as tiaMaxima sets them).
			wantReason: []string{"; ready for 40G: 40GBASE-LR4, margin 5.08 dB"},
			wantRejected: []string{
				"om3 rejected by future-rate: it cannot carry the future rate of 40 Gb/s over 120 m: 40GBASE-SR4 reaches 100 m",
				"om4 rejected by future-rate: it cannot carry the future rate of 40 Gb/s over 120 m: 40GBASE-SR4 leaves a loss margin of -0.42 dB, below the required 0 dB",
				"cat6a rejected by copper-90m",
			},
		},
		{
			// Multimode does not carry 40G later with spliced pigtails: 40GBASE-SR4 on OM3 allows
			// 1.9 dB (IEEE 802.3 Clause 86, from memory), and 0.04 km x 3.5 + 1.6 dB of design
			// connections + the 0.5 dB multimode margin (the TIA-568.3-D gap, tester 14 F7) is 2.24 dB.
			name: "future rate copper has no application", link: Link{RouteM: 40, RateGbps: 10, FutureRateGbps: 40, ConnectorPairs: 2, Strands: 1},
			wantFeasible: true, wantMedium: "os2",
			wantRejected: []string{"cat6a rejected by future-rate: it cannot carry the future rate of 40 Gb/s over 40 m: no application at 40G runs on cat6a"},
		},
		{
			// Copper ready for 10G later: 10GBASE-T reaches 100 m on Category 6A (IEEE 802.3
			// Clause 55, seen; ANSI/TIA-568.2-D channel).
			name: "future rate copper ready", link: Link{RouteM: 40, RateGbps: 1, FutureRateGbps: 10, ConnectorPairs: 2, Strands: 1},
			wantFeasible: true, wantMedium: "cat6a", wantApp: "1000BASE-T",
			wantReason: []string{"; ready for 10G: 10GBASE-T, within its 100 m reach"},
		},
		{
			name: "prefer rule outranks cost", link: indoor(50), rules: "prefer_sm.yaml",
			wantFeasible: true, wantMedium: "os2", wantApp: "10GBASE-LR",
			wantRejected: []string{"cat6a rejected by prefer-singlemode: cat6a with 10GBASE-T on cmr-riser is feasible at 179.50 USD, but rule prefer-singlemode prefers os2: single-mode is preferred for growth"},
			wantReason:   []string{"among those rule prefer-singlemode prefers"},
		},
		{
			name: "nothing reaches 45 km", link: Link{ID: "far", RouteM: 45000, RateGbps: 10, Outdoor: true, ConnectorPairs: 2},
			wantFeasible: false,
			wantReason: []string{"link far: no medium carries 10G over 45000 m: cat6a rejected by copper-90m",
				"om3 rejected by reach", "om4 rejected by reach", "om5 rejected by reach", "os2 rejected by reach: 10GBASE-ER reaches 30000 m, channel is 45000 m"},
		},
		{
			name: "bad link facts", link: Link{ID: "x", RouteM: -5, RateGbps: 10, MaxEMI: "medium", Strands: -1},
			wantReason: []string{`link x: bad facts: route_m is -5, want >= 0; max_emi is "medium", want none, low or high; strands is -1, want >= 0`},
		},
		{
			name: "rate not in the catalog", link: Link{RouteM: 50, RateGbps: 2.5},
			wantReason: []string{"link: no application runs at 2.5G; the catalog has 1G, 10G, 25G, 40G, 100G, 400G"},
		},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			c := DefaultCatalog()
			if tc.catalog != nil {
				tc.catalog(c)
			}
			var r *Rules
			if tc.rules != "" {
				var err error
				if r, err = LoadRules(filepath.Join("testdata", "rules", tc.rules)); err != nil {
					t.Fatal(err)
				}
			}
			e := newEngine(t, c, r, tc.opt)
			ch := e.Choose(tc.link)
			if ch.Feasible != tc.wantFeasible {
				t.Fatalf("%s: feasible %v, want %v: %s", tc.name, ch.Feasible, tc.wantFeasible, ch.Reason)
			}
			if tc.wantMedium != "" && ch.Medium != tc.wantMedium {
				t.Errorf("%s: medium %q, want %q: %s", tc.name, ch.Medium, tc.wantMedium, ch.Reason)
			}
			if tc.wantApp != "" && ch.Application != tc.wantApp {
				t.Errorf("%s: application %q, want %q", tc.name, ch.Application, tc.wantApp)
			}
			if tc.wantCons != "" && ch.Construction != tc.wantCons {
				t.Errorf("%s: construction %q, want %q", tc.name, ch.Construction, tc.wantCons)
			}
			if tc.wantCents != 0 && ch.CostCents != tc.wantCents {
				t.Errorf("%s: cost %d cents, want %d", tc.name, ch.CostCents, tc.wantCents)
			}
			var all []string
			for _, r := range ch.Rejected {
				all = append(all, r.Reason)
			}
			joined := strings.Join(all, "\n")
			for _, w := range tc.wantRejected {
				if !strings.Contains(joined, w) {
					t.Errorf("%s: no rejection containing %q in:\n%s", tc.name, w, joined)
				}
			}
			for _, w := range tc.wantReason {
				if !strings.Contains(ch.Reason, w) {
					t.Errorf("%s: reason %q lacks %q", tc.name, ch.Reason, w)
				}
			}
			if again := e.Choose(tc.link); !reflect.DeepEqual(again, ch) {
				t.Errorf("%s: two runs differ", tc.name)
			}
			// The code set beside the reason says what the reason's words say.
			if want := codeOfWords(ch.Reason); ch.Code != want || len(ch.Code) > 10 {
				t.Errorf("%s: code %q, want %q (at most 10 characters) for %q", tc.name, ch.Code, want, ch.Reason)
			}
			codesMu.Lock()
			codesSeen[ch.Code] = true
			codesRun++
			codesMu.Unlock()
		})
	}
	t.Cleanup(func() {
		if codesRun < len(cases) {
			return // some cases filtered out by -run
		}
		for _, c := range []string{CodeOnly, CodeCheapest, CodePreferred, CodeNoMedium, CodeNoApplication, CodeBadFacts} {
			if !codesSeen[c] {
				t.Errorf("no case gives the code %s", c)
			}
		}
	})
}

var (
	codesMu   sync.Mutex
	codesSeen = map[string]bool{}
	codesRun  int
)

// codeOfWords is the reason code a reason's words call for, for the test to hold the codes
// set in the engine to them.
func codeOfWords(reason string) string {
	switch {
	case strings.Contains(reason, ": bad facts: "):
		return CodeBadFacts
	case strings.Contains(reason, ": no application runs at "):
		return CodeNoApplication
	case strings.Contains(reason, ": no medium carries "):
		return CodeNoMedium
	case strings.Contains(reason, " among those rule "):
		return CodePreferred
	case strings.Contains(reason, " is the cheapest of "):
		return CodeCheapest
	case strings.Contains(reason, " is the only feasible medium"):
		return CodeOnly
	}
	return "?"
}

func TestChooseConstructions(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	for _, channelM := range []float64{20, 90, 150, 400, 1500, 8000} {
		for _, outdoor := range []bool{false, true} {
			for _, rate := range []float64{1, 10, 25, 40, 100} {
				l := Link{RouteM: channelM, RateGbps: rate, Outdoor: outdoor, ConnectorPairs: 2, Strands: 12}
				ch := e.Choose(l)
				if !ch.Feasible {
					continue
				}
				k := e.cat.Medium(ch.Medium).Construction(ch.Construction)
				// ANSI/TIA-568.3-D outdoor cable (from memory); NFPA 70 Article 770 listings (seen as fragment)
				if outdoor && !k.OutdoorRated {
					t.Errorf("%g m %gG outdoor: chose %s %s, not outdoor rated", channelM, rate, ch.Medium, k.ID)
				}
				if !outdoor && k.Listing == "" {
					t.Errorf("%g m %gG indoor: chose unlisted %s %s", channelM, rate, ch.Medium, k.ID)
				}
				for _, loss := range ch.Losses {
					if loss.Operating && loss.MarginDB < 0 {
						t.Errorf("%g m %gG: negative margin %+v", channelM, rate, loss)
					}
				}
				if got := len(rejectionFor(ch, ch.Medium)); got != 0 {
					t.Errorf("%g m %gG: chosen medium also rejected", channelM, rate)
				}
			}
		}
	}
}

func TestChooseRejectionPerMedium(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	ch := e.Choose(Link{RouteM: 30, RateGbps: 25, ConnectorPairs: 2, Strands: 2})
	if !ch.Feasible {
		t.Fatal(ch.Reason)
	}
	got := map[string]string{}
	for _, r := range ch.Rejected {
		if _, dup := got[r.Medium]; dup {
			t.Errorf("medium %s rejected twice", r.Medium)
		}
		got[r.Medium] = r.Rule
	}
	if got["cat6a"] != RuleNoApplication {
		t.Errorf("cat6a at 25G: rule %q, want %q", got["cat6a"], RuleNoApplication)
	}
	if len(got) != 4 {
		t.Errorf("got rejections for %v, want the 4 media not chosen", got)
	}
}

func TestBetter(t *testing.T) {
	t.Parallel()
	a := &candidate{costCents: 100, marginDB: 1, mi: 2}
	b := &candidate{costCents: 100, marginDB: 2, mi: 3}
	c := &candidate{costCents: 100, marginDB: 2, mi: 1}
	d := &candidate{costCents: 99, marginDB: 0, mi: 4}
	cases := []struct {
		name string
		x, y *candidate
		want bool
	}{
		{"cheaper wins", d, a, true},
		{"tie goes to the larger margin", b, a, true},
		{"then catalog order", c, b, true},
		{"not the other way", a, b, false},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			if got := better(tc.x, tc.y); got != tc.want {
				t.Errorf("%s: got %v, want %v", tc.name, got, tc.want)
			}
		})
	}
}

func TestMaxChannelM(t *testing.T) {
	t.Parallel()
	two := Link{ConnectorPairs: 2}
	one := Link{ConnectorPairs: 1}
	out := Link{ConnectorPairs: 2, Outdoor: true}
	cases := []struct {
		name         string
		opt          EngineOptions
		catalog      func(*Catalog)
		medium       string
		rate, future float64
		link         Link
		want         float64
	}{
		{"copper 90 m installed", EngineOptions{}, nil, "cat6a", 10, 0, two, 90},                                                                              // ANSI/TIA-568.2, 90 m permanent link (seen)
		{"copper cap holds over a longer range", EngineOptions{}, func(c *Catalog) { setReach(t, c, "10GBASE-T", "cat6a", 150, 0) }, "cat6a", 10, 0, two, 90}, // ANSI/TIA-568.2 (seen)
		{"copper with 15 m of cords", EngineOptions{CopperCordsM: 15}, nil, "cat6a", 10, 0, two, 85},                                                          // ANSI/TIA-568.2, 100 m channel (seen)
		{"copper outdoors", EngineOptions{}, nil, "cat6a", 10, 0, out, 0},                                                                                     // NFPA 70 800.90 (seen)
		{"copper outdoors allowed", EngineOptions{AllowOutdoorCopper: true}, nil, "cat6a", 10, 0, out, 90},                                                    // ANSI/TIA-568.2 (seen)
		{"copper high EMI", EngineOptions{}, nil, "cat6a", 10, 0, Link{ConnectorPairs: 2, MaxEMI: "high"}, 0},                                                 // common practice, no published source
		{"copper at 25G", EngineOptions{}, nil, "cat6a", 25, 0, two, 0},
		{"om4 10G reach and budget meet", tiaMaxima(0), nil, "om4", 10, 0, two, 400},                                                      // IEEE 802.3 Clause 52 (seen): 400 m, 2.9 dB
		{"om4 10G with 1 dB margin", tiaMaxima(1), nil, "om4", 10, 0, two, 400.0 / 3.5},                                                   // computed: (2.9-1-1.5)/3.5 km
		{"om3 10G reach first", tiaMaxima(0), nil, "om3", 10, 0, two, 300},                                                                // IEEE 802.3 Clause 52 (seen)
		{"om3 1G reach", tiaMaxima(0), nil, "om3", 1, 0, two, 550},                                                                        // IEEE 802.3 Clause 38 (seen); the budget alone allows 588.6 m (computed)
		{"om3 1G budget", tiaMaxima(1), nil, "om3", 1, 0, two, (3.56 - 1 - 1.5) / 3.5 * 1000},                                             // computed from IEEE 802.3 Clause 38's 3.56 dB (seen)
		{"om4 10G now, 40G later", tiaMaxima(0), nil, "om4", 10, 40, one, 150},                                                            // IEEE 802.3 Clause 86 (seen): 150 m
		{"om4 40G on OM3's pair with two pairs", tiaMaxima(0), nil, "om4", 40, 0, two, 100},                                               // IEEE 802.3 Clause 86: OM4's 1.5 dB closes nothing after 1.5 dB of pairs, OM3's 100 m and 1.9 dB do (grade order)
		{"multimode 2 km cap", tiaMaxima(0), func(c *Catalog) { setReach(t, c, "1000BASE-SX", "om4", 5000, 20) }, "om4", 1, 0, two, 2000}, // common practice, no published source
		{"os2 10G outdoors", tiaMaxima(0), nil, "os2", 10, 0, out, 19000},                                                                 // computed: 10GBASE-ER (11-1.5)/0.5 km
		{"os2 10G indoors", tiaMaxima(0), nil, "os2", 10, 0, two, 19000},                                                                  // computed: the indoor/outdoor construction is riser listed, so 10GBASE-ER at 0.5 dB/km serves indoors too
		{"os2 100G outdoors 1 dB", tiaMaxima(1), nil, "os2", 100, 0, out, 31000},                                                          // computed: (18-1-1.5)/0.5 km
		{"os2 splices count", tiaMaxima(0), nil, "os2", 100, 0, Link{ConnectorPairs: 2, Splices: 5, Outdoor: true}, 30000},                // computed: 100GBASE-ER4 (18-1.5-1.5)/0.5 km
		// The default policy: design losses 0.5 dB per pair and 0.3 dB per splice, two pigtail
		// splices (1.6 dB of connections), a margin of what the parts may lose at their
		// ANSI/TIA-568.3-D maxima beyond that (two pairs at 0.75 dB, from memory: 0.5 dB; splices
		// at their maximum: nothing; tester 14 F7, review 20 F4), one repair splice per 2 km of
		// outside plant for single-mode (common practice, no published source), no fixed extra.
		{"policy: om3 10G", EngineOptions{}, nil, "om3", 10, 0, two, 500.0 / 3.5},                                           // IEEE 802.3 Clause 52, 2.6 dB (memory): (2.6-1.6-0.5)/3.5 km, 143 m (README)
		{"policy: om4 10G", EngineOptions{}, nil, "om4", 10, 0, two, 800.0 / 3.5},                                           // IEEE 802.3 Clause 52, OM4 2.9 dB (seen): (2.9-1.6-0.5)/3.5 km, 229 m (README)
		{"policy: om3 25G", EngineOptions{}, nil, "om3", 25, 0, two, 0},                                                     // IEEE 802.3 Clause 112, 1.8 dB (seen): 1.6 + 0.5 leaves nothing (README)
		{"policy: om4 25G", EngineOptions{}, nil, "om4", 25, 0, two, 0},                                                     // IEEE 802.3 Clause 112, 1.9 dB (seen): 1.6 + 0.5 leaves nothing (README)
		{"policy: om4 25G factory-terminated", EngineOptions{Termination: TerminationFactory}, nil, "om4", 25, 0, two, 100}, // IEEE 802.3 Clause 112, 1.9 dB (seen): (1.9-1.0-0.5)/3.5 km = 114 m, beyond the 100 m range
		{"policy: om4 40G on OM3's pair", EngineOptions{}, nil, "om4", 40, 0, two, 0},                                       // IEEE 802.3 Clause 86, OM3 1.9 dB (memory): 1.6 + 0.5 leaves nothing
		{"policy: om4 40G factory-terminated", EngineOptions{Termination: TerminationFactory}, nil, "om4", 40, 0, two, 100}, // IEEE 802.3 Clause 86: OM4's own 1.5 dB (seen) leaves (1.5-1.0-0.5) = 0, OM3's 1.9 dB (memory) 114 m, beyond its 100 m range
		{"policy: os2 10G outdoors", EngineOptions{}, nil, "os2", 10, 0, out, 13600},                                        // computed: 10GBASE-ER with 7 repair splices (0.5 per km) at 13.6 km: 11-1.6-(0.5+7 x 0.3)-6.8 = 0 dB left
		{"policy: os2 100G indoors", EngineOptions{}, nil, "os2", 100, 0, two, 31800},                                       // computed: 100GBASE-ER4 (18-1.6-0.5)/0.5 km, no repair splices inside
		// Review 20 F4's worked cases. A plan that designs pairs at the TIA maximum (0.75 dB) has
		// no gap to cover: with connectors (no splices) its 1.5 dB of connections are IEEE's own
		// allowance, and it gets IEEE's whole range (a fixed 0.5 dB gave OM3 171 m). Designed at
		// 0.3 dB a pair, the margin covers 2 x 0.45 dB: the reach is that of parts at their maxima,
		// as with the default design (a fixed 0.5 dB gave OM3 257 m, where parts at their maxima
		// read 3.0 dB against 2.6).
		{"pair_loss_db 0.75, connectors: om4 10G", EngineOptions{PairLossDB: 0.75, Termination: TerminationFactory}, nil, "om4", 10, 0, two, 400},                // IEEE 802.3 Clause 52, 10GBASE-SR on OM4 (seen): 400 m, 2.9 dB = 0.4 km x 3.5 + 1.5
		{"pair_loss_db 0.75, connectors: om3 10G", EngineOptions{PairLossDB: 0.75, Termination: TerminationFactory}, nil, "om3", 10, 0, two, 300},                // IEEE 802.3 Clause 52, 10GBASE-SR on OM3: 300 m (seen), 2.6 dB (memory) against 0.3 km x 3.5 + 1.5 = 2.55
		{"pair_loss_db 0.75, pigtails: om3 10G", EngineOptions{PairLossDB: 0.75}, nil, "om3", 10, 0, two, 500.0 / 3.5},                                           // IEEE 802.3 Clause 52, 2.6 dB (memory): (2.6-1.5-0.6-0)/3.5 km, 143 m
		{"pair_loss_db 0.3: om3 10G", EngineOptions{PairLossDB: 0.3}, nil, "om3", 10, 0, two, 500.0 / 3.5},                                                       // IEEE 802.3 Clause 52, 2.6 dB (memory): (2.6-0.6-0.6-2 x 0.45)/3.5 km, 143 m
		{"pair_loss_db 0.3, splices 0.1: om4 10G", EngineOptions{PairLossDB: 0.3, SpliceLossDB: 0.1}, nil, "om4", 10, 0, two, 800.0 / 3.5},                       // IEEE 802.3 Clause 52, OM4 2.9 dB (seen): (2.9-0.6-0.2-(0.9+0.4))/3.5 km, 229 m
		{"pair_loss_db 0.3, connectors: om3 10G", EngineOptions{PairLossDB: 0.3, Termination: TerminationFactory}, nil, "om3", 10, 0, two, 300},                  // IEEE 802.3 Clause 52: (2.6-0.6-0.9)/3.5 km = 314 m, beyond the 300 m range (seen)
		{"catalog extra 0.2 dB: om3 10G", EngineOptions{Margins: &MarginPolicy{MultimodeDB: 0.2, RepairSplicesPerKm: 0.5}}, nil, "om3", 10, 0, two, 300.0 / 3.5}, // IEEE 802.3 Clause 52, 2.6 dB (memory): (2.6-1.6-0.5-0.2)/3.5 km, 86 m
		{"three panels: om4 10G", EngineOptions{}, nil, "om4", 10, 0, Link{ConnectorPairs: 3}, 50.0 / 3.5},                                                       // IEEE 802.3 Clause 52, OM4 2.9 dB (seen): (2.9-1.5-0.6-3 x 0.25)/3.5 km, 14 m; OM3's 2.6 dB closes nothing
		{"policy and a 1 dB floor: om4 10G", EngineOptions{LossMarginDB: 1}, nil, "om4", 10, 0, two, 300.0 / 3.5},                                                // IEEE 802.3 Clause 52, OM4 2.9 dB (seen): (2.9-1.6-1)/3.5 km, 86 m (README); OM3's 2.6 dB closes nothing
		{"policy and a 0.3 dB floor: os2 10G outdoors", EngineOptions{LossMarginDB: 0.3}, nil, "os2", 10, 0, out, 13600},                                         // computed: a floor under the single-mode policy (0.5 dB of pairs and repair splices) changes nothing
		{"unknown medium", EngineOptions{}, nil, "om9", 10, 0, two, 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			c := DefaultCatalog()
			if tc.catalog != nil {
				tc.catalog(c)
			}
			e := newEngine(t, c, nil, tc.opt)
			got := e.MaxChannelM(tc.medium, tc.rate, tc.future, tc.link)
			if got < tc.want-1e-3 || got > tc.want+1e-6 {
				t.Errorf("%s: got %.6f m, want %.6f m", tc.name, got, tc.want)
			}
			if got > 0 {
				// Choose agrees at the answer and rejects the medium just past it.
				l := tc.link
				l.RouteM, l.RateGbps, l.FutureRateGbps = got, tc.rate, tc.future
				if !e.feasibleAt(new(candidate), l, indexOf(e.Media(), tc.medium), got, Laying{}) {
					t.Errorf("%s: infeasible at its own maximum %.6f m", tc.name, got)
				}
				if e.feasibleAt(new(candidate), l, indexOf(e.Media(), tc.medium), got+0.01, Laying{}) {
					t.Errorf("%s: still feasible past its maximum %.6f m", tc.name, got)
				}
			}
		})
	}
}

func indexOf(list []string, s string) int {
	for i, x := range list {
		if x == s {
			return i
		}
	}
	return -1
}

func TestCostParts(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	if got := strings.Join(e.Media(), ","); got != "cat6a,om3,om4,om5,os2" {
		t.Errorf("Media: got %s", got)
	}
	// Expected cents are read off prices-demo.yaml (invented prices).
	perM := []struct {
		name    string
		medium  string
		strands int
		outdoor bool
		want    int64
	}{
		{"os2 12 outdoor is OSP", "os2", 12, true, 143},
		{"os2 12 indoor is riser", "os2", 12, false, 168},
		{"os2 13 takes the 24", "os2", 13, false, 272},
		{"os2 300 takes 288 + 12", "os2", 300, true, 2142 + 143}, // the cheapest set of two cables (Engine.Cables), not two 288s
		{"cat6a 8 strands are 4 cables", "cat6a", 8, false, 4 * 95},
		{"cat6a outdoor", "cat6a", 1, true, 160},
		{"om4 0 strands", "om4", 0, false, 262},
	}
	for _, tc := range perM {
		t.Run(tc.name, func(t *testing.T) {
			if got := e.CablePerMCents(tc.medium, tc.strands, tc.outdoor); got != tc.want {
				t.Errorf("%s: got %d, want %d", tc.name, got, tc.want)
			}
		})
	}
	fixed := []struct {
		name    string
		medium  string
		rate    float64
		strands int
		want    int64
	}{
		{"os2 10G 12 strands", "os2", 10, 12, 2*12*1350 + 2*4500},
		{"om4 40G takes 8 strands", "om4", 40, 2, 2*8*1600 + 2*5500},
		{"cat6a 1G", "cat6a", 1, 1, 2*1100 + 2*2500},
		{"cat6a 25G none", "cat6a", 25, 1, -1},
	}
	for _, tc := range fixed {
		t.Run(tc.name, func(t *testing.T) {
			if got := e.FixedCents(tc.medium, tc.rate, tc.strands); got != tc.want {
				t.Errorf("%s: got %d, want %d", tc.name, got, tc.want)
			}
		})
	}
	t.Run("unknown medium panics", func(t *testing.T) {
		defer func() {
			if r := recover(); r == nil || !strings.Contains(r.(string), "media: unknown medium om9") {
				t.Errorf("got %v, want a media panic", r)
			}
		}()
		e.CablePerMCents("om9", 12, false)
	})
}

func TestNewEngineErrors(t *testing.T) {
	t.Parallel()
	data := strings.Replace(string(pricesYAML), "  10GBASE-LR: 45.00\n", "", 1)
	data = strings.Replace(data, "    cmp-plenum: {1: 1.35}\n", "", 1)
	p, err := ParsePriceBook("short.yaml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	_, err = NewEngine(nil, nil, p, EngineOptions{LossMarginDB: -1})
	for _, w := range []string{
		`media: option loss_margin_db: bad value: want dB >= 0, got -1`,
		`short.yaml: price "cable cat6a cmp-plenum 1": missing; add cable_per_m.cat6a.cmp-plenum.1`,
		`short.yaml: price "transceiver 10GBASE-LR": missing; add transceivers.10GBASE-LR`,
	} {
		if err == nil || !strings.Contains(err.Error(), w) {
			t.Errorf("got %v, want it to contain %q", err, w)
		}
	}
}

// TestNewCheckEngine: a price book that lacks only prices the catalog needs still gives
// NewCheckEngine an engine (so that a check goes on to the plan's rates and the prices its
// routes need, all problems in one run) with every missing price, while NewEngine gives none;
// any other problem (a bad option) gives no engine from either.
func TestNewCheckEngine(t *testing.T) {
	t.Parallel()
	data := strings.Replace(string(pricesYAML), "  10GBASE-LR: 45.00\n", "", 1)
	data = strings.Replace(data, "  1000BASE-LX: 22.00\n", "", 1)
	p, err := ParsePriceBook("short.yaml", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	want := []string{
		`short.yaml: price "transceiver 1000BASE-LX": missing; add transceivers.1000BASE-LX`,
		`short.yaml: price "transceiver 10GBASE-LR": missing; add transceivers.10GBASE-LR`,
	}
	e, err := NewCheckEngine(nil, nil, p, EngineOptions{})
	if e == nil || !errors.Is(err, ErrMissingPrice) || err.Error() != strings.Join(want, "\n") {
		t.Errorf("NewCheckEngine: got engine %v, error %v; want an engine and\n%s", e != nil, err, strings.Join(want, "\n"))
	}
	if e != nil && e.Catalog() == nil {
		t.Errorf("NewCheckEngine: the engine has no catalog")
	}
	if e, err := NewEngine(nil, nil, p, EngineOptions{}); e != nil || err == nil || err.Error() != strings.Join(want, "\n") {
		t.Errorf("NewEngine: got engine %v, error %v; want no engine and the missing prices", e != nil, err)
	}
	e, err = NewCheckEngine(nil, nil, p, EngineOptions{LossMarginDB: -1})
	if e != nil || err == nil || !strings.Contains(err.Error(), "option loss_margin_db") || !strings.Contains(err.Error(), want[0]) {
		t.Errorf("NewCheckEngine with a bad option: got engine %v, error %v; want no engine, the option and the prices", e != nil, err)
	}
}

// TestChooseRemembers checks the engine's memory of its choices: every field of Link is part
// of the key (a field added to Link without a line in keyOf fails here), a remembered choice
// equals a fresh one, and a caller changing the slices it got back does not change the next
// answer.
func TestChooseRemembers(t *testing.T) {
	t.Parallel()
	l := Link{ID: "L", RouteM: 580, RiserM: 20, SlackM: 12, RateGbps: 10, FutureRateGbps: 40, MaxEMI: "low",
		Outdoor: true, PathwayTypes: []string{"duct"}, ConnectorPairs: 2, Splices: 2, Strands: 12}
	base := keyOf(l)
	v := reflect.ValueOf(l)
	for i := 0; i < v.NumField(); i++ {
		m := l
		m.PathwayTypes = append([]string(nil), l.PathwayTypes...)
		f := reflect.ValueOf(&m).Elem().Field(i)
		switch f.Kind() {
		case reflect.String:
			f.SetString(f.String() + "x")
		case reflect.Float64:
			f.SetFloat(f.Float() + 0.5)
		case reflect.Int:
			f.SetInt(f.Int() + 1)
		case reflect.Bool:
			f.SetBool(!f.Bool())
		case reflect.Slice:
			m.PathwayTypes = append(m.PathwayTypes, "tray")
		default:
			t.Fatalf("Link.%s: unhandled kind %s", v.Type().Field(i).Name, f.Kind())
		}
		if keyOf(m) == base {
			t.Errorf("changing Link.%s leaves Choose's memory key as it was", v.Type().Field(i).Name)
		}
	}
	if keyOf(Link{PathwayTypes: []string{"a,b"}}) == keyOf(Link{PathwayTypes: []string{"a", "b"}}) {
		t.Error("two pathway type lists share a key")
	}

	e := newEngine(t, nil, nil, EngineOptions{LossMarginDB: 1})
	first := e.Choose(l)
	if !first.Feasible || len(first.Losses) == 0 || len(first.Rejected) == 0 {
		t.Fatalf("want a feasible fibre choice with rejections, got %+v", first)
	}
	first.Losses[0].LossDB = -1
	first.Rejected[0].Reason = "changed by the caller"
	again := e.Choose(l)
	if !reflect.DeepEqual(again, e.choose(l)) {
		t.Errorf("remembered choice differs from a fresh one:\n%+v\n%+v", again, e.choose(l))
	}
}

// TestChoosePlenum: a route through a plenum takes a plenum-rated construction (NFPA 70
// Articles 770 and 800, cables in plenums: OFNP, CMP; from memory), which costs more than
// riser cable in the demo book, so the same link outside a plenum takes riser cable; outdoors
// and through a plenum no default construction is both, and the rejection says so.
func TestChoosePlenum(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	indoor := Link{ID: "L", RouteM: 60, RiserM: 10, RateGbps: 10, ConnectorPairs: 2, Strands: 12, PathwayTypes: []string{"tray"}}
	riser := e.Choose(indoor)
	plen := indoor
	plen.Plenum = true
	inPlenum := e.Choose(plen)
	if !riser.Feasible || !inPlenum.Feasible {
		t.Fatalf("want both feasible: %s / %s", riser.Reason, inPlenum.Reason)
	}
	if k := e.cat.Medium(riser.Medium).Construction(riser.Construction); k.PlenumRated {
		t.Errorf("outside a plenum: chose plenum-rated %s %s, want the cheaper riser cable", riser.Medium, k.ID)
	}
	if k := e.cat.Medium(inPlenum.Medium).Construction(inPlenum.Construction); !k.PlenumRated {
		t.Errorf("in a plenum: chose %s %s, not plenum rated", inPlenum.Medium, k.ID)
	}
	out := plen
	out.Outdoor, out.PathwayTypes = true, []string{"duct", "tray"}
	if ch := e.Choose(out); ch.Feasible {
		if k := e.cat.Medium(ch.Medium).Construction(ch.Construction); !k.PlenumRated || !k.OutdoorRated {
			t.Errorf("outdoors through a plenum: chose %s %s, which is not both outdoor and plenum rated", ch.Medium, k.ID)
		}
	} else if !strings.Contains(ch.Reason, "plenum") {
		t.Errorf("outdoors through a plenum: infeasible without naming the plenum: %s", ch.Reason)
	}
}

// TestChooseDirectBurial: a route that lays cable on a direct-buried pathway takes only a
// construction the catalog rates for direct burial (rule direct-burial: ICEA S-87-640 and
// Telcordia GR-20 outside-plant cable for direct-buried placement, from memory). The same
// link in duct may take the indoor/outdoor cable, which the catalog does not rate for burial;
// buried, it is rejected by that rule, naming it, and an outside-plant cable is laid. With no
// construction rated for burial the link is infeasible and says why.
func TestChooseDirectBurial(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	for _, short := range []bool{false, true} {
		// A short link keeps the outside-plant cable within NFPA 70 Article 770's 15 m inside
		// each entrance (seen as fragment); a long riser makes it a transition or indoor/outdoor.
		riser := 40.0
		if short {
			riser = 10
		}
		duct := Link{ID: "L", RouteM: 600, RiserM: riser, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12, PathwayTypes: []string{"duct"}}
		buried := duct
		buried.PathwayTypes = []string{"buried", "duct"}
		inDuct, laid := e.Choose(duct), e.Choose(buried)
		if !inDuct.Feasible || !laid.Feasible {
			t.Fatalf("riser %g m: want both feasible: %s / %s", riser, inDuct.Reason, laid.Reason)
		}
		k := e.cat.Medium(laid.Medium).Construction(laid.Construction)
		if !k.DirectBurialRated {
			t.Errorf("riser %g m, buried: chose %s %s, not rated for direct burial", riser, laid.Medium, k.ID)
		}
		if kd := e.cat.Medium(inDuct.Medium).Construction(inDuct.Construction); !short && kd.DirectBurialRated {
			t.Errorf("riser %g m in duct: chose %s %s; the test wants a link that takes the indoor/outdoor cable in duct", riser, inDuct.Medium, kd.ID)
		}
		if !short && laid.Construction == inDuct.Construction {
			t.Errorf("riser %g m: buried, the same %s as in duct", riser, laid.Construction)
		}
	}
	// No construction rated for burial: infeasible, naming the rule's reason.
	cat := DefaultCatalog()
	for _, m := range cat.Media {
		for _, k := range m.Constructions {
			k.DirectBurialRated = false
		}
	}
	none := newEngine(t, cat, nil, EngineOptions{})
	ch := none.Choose(Link{ID: "L", RouteM: 600, RiserM: 10, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12, PathwayTypes: []string{"buried"}})
	if ch.Feasible {
		t.Fatalf("no construction rated for burial, yet %s %s was chosen", ch.Medium, ch.Construction)
	}
	if !strings.Contains(ch.Reason, "not rated for direct burial") {
		t.Errorf("infeasible without naming direct burial: %s", ch.Reason)
	}
}

// TestChooseTransition: with the book pricing an entrance splice enclosure, a long outdoor
// link with long risers may run outside-plant cable between the entrances spliced to listed
// riser cable at each (NFPA 70 Article 770: unlisted cable at most 15 m inside the entrance,
// seen as fragment). The cost, the splicing and the loss budget are worked by hand from the
// demo book (invented prices) and ANSI/TIA-568.3-D maxima (outside plant 0.5 dB/km and inside
// 1.0 dB/km at 1310 nm, 0.75 dB per mated pair, 0.3 dB per splice; from memory).
func TestChooseTransition(t *testing.T) {
	t.Parallel()
	const demoLine = "transition_splice_each: 260.00\n"
	if !bytes.Contains(pricesYAML, []byte(demoLine)) {
		t.Fatal("the demo book's transition price moved")
	}
	engineWith := func(text string) *Engine {
		t.Helper()
		book, err := ParsePriceBook("prices.yaml", []byte(text))
		if err != nil {
			t.Fatal(err)
		}
		e, err := NewEngine(nil, nil, book, EngineOptions{})
		if err != nil {
			t.Fatal(err)
		}
		return e
	}
	e := engineWith(strings.Replace(string(pricesYAML), demoLine, "transition_splice_each: 180.00\n", 1))
	plain := engineWith(strings.Replace(string(pricesYAML), demoLine, "", 1))
	long := Link{ID: "L", RouteM: 3000, RiserM: 40, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 2, PathwayTypes: []string{"duct"}}

	// Without the enclosure price: indoor/outdoor cable all the way, 3,040 m at 2.02.
	if ch := plain.Choose(long); ch.Construction != "indoor-outdoor" || ch.Inside != "" || ch.CostCents != 3040*202+2*2*1350+2*4500 {
		t.Errorf("no transition price: got %s/%q at %d cents, want indoor-outdoor at %d", ch.Construction, ch.Inside, ch.CostCents, 3040*202+2*2*1350+2*4500)
	}
	ch := e.Choose(long)
	if !ch.Feasible || ch.Medium != "os2" || ch.Construction != "osp-loose-tube" || ch.Inside != "ofnr-riser" {
		t.Fatalf("got %s %s spliced to %q (%s), want os2 osp-loose-tube spliced to ofnr-riser", ch.Medium, ch.Construction, ch.Inside, ch.Reason)
	}
	// 3,000 m of 12-fibre OSP at 1.43 and 40 m of 12-fibre riser at 1.68; at each entrance an
	// enclosure at 180.00 and one 12-splice tray at 38.00; 2 × 12 splices at 12 an hour, 92.00
	// an hour; at each entrance the riser cable's two ends prepared (crew_each.cable_end_prep,
	// 30.00) and labelled (bid item per cable end, 6.00) and the enclosure installed
	// (crew_each.enclosure_install, 60.00): the crew figures are common practice, no published
	// source, and the bill counts the same (TransitionEnds); then terminations (2 × 2 at
	// 13.50) and two 10GBASE-LR transceivers at 45.00.
	cable := int64(3000*143 + 40*168 + 2*(18000+3800))
	labour := int64(2 * (9200 + 2*3000 + 2*600 + 6000))
	if ch.CableCents != cable || ch.LabourCents != labour || ch.CostCents != cable+labour+2*2*1350+2*4500 {
		t.Errorf("cost: cable %d, labour %d, total %d; want %d, %d, %d", ch.CableCents, ch.LabourCents, ch.CostCents, cable, labour, cable+labour+2*2*1350+2*4500)
	}
	for _, l := range ch.Losses {
		if l.WavelengthNM == 1310 {
			// Design: 2 pairs at 0.5 dB, 2 transition and 2 pigtail splices at 0.3 dB (the demo
			// book terminates with spliced pigtails); field: ANSI/TIA-568.3-D 0.75 and 0.3 dB.
			if want := 0.5*3.0 + 1.0*0.04 + 2*0.5 + 4*0.3; math.Abs(l.LossDB-want) > 0.005 {
				t.Errorf("loss at 1310 nm: got %.3f dB, want %.3f", l.LossDB, want)
			}
			if want := 0.5*3.0 + 1.0*0.04 + 2*0.75 + 4*0.3; math.Abs(l.FieldLimitDB-want) > 0.005 {
				t.Errorf("field limit at 1310 nm: got %.3f dB, want %.3f", l.FieldLimitDB, want)
			}
			if l.Pairs != 2 || l.Splices != 4 {
				t.Errorf("loss at 1310 nm counts %d pairs and %d splices, want 2 and 4 (2 transitions, 2 pigtails)", l.Pairs, l.Splices)
			}
		}
	}
	if !strings.Contains(ch.Reason, "osp-loose-tube spliced to ofnr-riser at both entrances") {
		t.Errorf("reason does not name the transition: %s", ch.Reason)
	}
	// A short route keeps indoor/outdoor cable: two enclosures cost more than the difference.
	short := long
	short.RouteM = 300
	if ch := e.Choose(short); ch.Construction != "indoor-outdoor" || ch.Inside != "" {
		t.Errorf("300 m: got %s spliced to %q, want indoor-outdoor without a transition", ch.Construction, ch.Inside)
	}
	// A tray inside an end building (30 m at the first end, whose riser, coil and loop take
	// 20 m; 20 m inside at the other): the inside cable takes it, 70 m of riser cable, and the
	// outside-plant cable the other 2,970 m of the 3,040 m channel.
	tray := long
	tray.PathwayTypes = []string{"duct", "tray"}
	tray.InsideAM, tray.InsideBM = 20+30, 20
	ch = e.Choose(tray)
	if ch.Construction != "osp-loose-tube" || ch.Inside != "ofnr-riser" || ch.InsideM != 70 {
		t.Fatalf("tray at an end: got %s spliced to %q over %g m (%s), want osp-loose-tube spliced to ofnr-riser over 70 m",
			ch.Construction, ch.Inside, ch.InsideM, ch.Reason)
	}
	if want := int64(2970*143 + 70*168 + 2*(18000+3800)); ch.CableCents != want {
		t.Errorf("tray at an end: cable %d cents, want %d", ch.CableCents, want)
	}
	for _, l := range ch.Losses {
		if want := 0.5*2.97 + 1.0*0.07 + 2*0.5 + 4*0.3; l.WavelengthNM == 1310 && math.Abs(l.LossDB-want) > 0.005 {
			t.Errorf("tray at an end: loss at 1310 nm %.3f dB, want %.3f (inside attenuation over the 70 m)", l.LossDB, want)
		}
	}
	// A tray in a building the route passes through: splices at the ends' entrances leave
	// outside-plant cable inside that building, so no transition.
	crossed := tray
	crossed.InsideAM, crossed.InsideBM, crossed.CrossedInsideM = 20, 20, 30
	if ch := e.Choose(crossed); ch.Inside != "" {
		t.Errorf("tray in a building passed through: transition to %q", ch.Inside)
	}
}

// TestReachWithRisersAndSlack: a link whose risers and slack have one decimal, as surveys give
// them, still reaches as far as the medium carries it. Before the fix a trial channel
// rebuilt its route as (R+S)-R-S, which floating point left at -1e-15 m for about 30 riser
// values in 0–40 m and 92 slack values in 0–20 m, and the medium was said to reach 0 m.
func TestReachWithRisersAndSlack(t *testing.T) {
	t.Parallel()
	e := newEngine(t, DefaultCatalog(), nil, EngineOptions{LossMarginDB: 1})
	want := e.MaxChannelM("os2", 10, 0, Link{ConnectorPairs: 2, Outdoor: true})
	for riserD := 0; riserD <= 400; riserD++ {
		for _, slackD := range []int{0, 2, 37, 100} {
			l := Link{ConnectorPairs: 2, Outdoor: true, RiserM: float64(riserD) / 10 * 2, SlackM: float64(slackD) / 10 * 2}
			if got := e.MaxChannelM("os2", 10, 0, l); got != want {
				t.Fatalf("risers %.1f m, slack %.1f m: os2 reaches %.3f m of channel, want %.3f m (the same as with none)",
					l.RiserM, l.SlackM, got, want)
			}
		}
	}
	for slackD := 0; slackD <= 200; slackD++ {
		l := Link{ConnectorPairs: 2, Outdoor: true, RiserM: 30, SlackM: float64(slackD) / 10 * 2}
		if got := e.MaxChannelM("os2", 10, 0, l); got != want {
			t.Fatalf("slack_m %.1f: os2 reaches %.3f m, want %.3f m", float64(slackD)/10, got, want)
		}
	}
}

// TestNoMediumNamesEveryNearMiss: a link that only fails because each construction breaks a
// different rule names each of those rules, once. Over a direct-buried span and a tray in a
// building it passes through, with 20 m inside each end's building, indoor/outdoor cable is
// not rated for burial (rule direct-burial: ICEA S-87-640 / Telcordia GR-20, from memory) and
// outside-plant cable may run at most 15 m inside (NFPA 70 770.48, seen as fragment) and takes
// no transition where it would run inside a building between the ends; the reason used to
// name only the second, which sent the user to the risers rather than to the buried span.
func TestNoMediumNamesEveryNearMiss(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	ch := e.Choose(Link{ID: "L", RouteM: 600, RiserM: 40, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12,
		PathwayTypes: []string{"buried", "duct", "tray"}, InsideAM: 20, InsideBM: 20, CrossedInsideM: 30})
	if ch.Feasible {
		t.Fatalf("feasible: %s %s; the test wants the two rules to meet", ch.Medium, ch.Construction)
	}
	for _, want := range []string{"os2 rejected by direct-burial", "os2 rejected by entrance-15m"} {
		if n := strings.Count(ch.Reason, want); n != 1 {
			t.Errorf("%q named %d times in %s", want, n, ch.Reason)
		}
	}
}

// TestThroughBuildingRule: the rule through-15m judges the cable inside a building the route
// only passes through (a tunnel across its basement from wall to wall): NFPA 70 770.48(A) lets
// unlisted outside-plant cable run at most 15 m (50 ft) inside a building from its point of
// entrance (from memory), and no transition can be spliced there. Over a direct-buried span
// too, indoor/outdoor cable is not rated for burial (rule direct-burial: ICEA S-87-640 /
// Telcordia GR-20, from memory), so with 40 m inside the plant building M no construction is
// left, and the reason names M and its 40 m; with 15 m inside M outside-plant cable carries it.
func TestThroughBuildingRule(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	l := Link{ID: "L", RouteM: 600, RiserM: 4, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12,
		PathwayTypes: []string{"buried", "tunnel"}, InsideAM: 12, InsideBM: 12, CrossedInsideM: 40, CrossedInsideMaxM: 40, CrossedBuilding: "M"}
	ch := e.Choose(l)
	if ch.Feasible {
		t.Fatalf("40 m inside M: feasible as %s %s", ch.Medium, ch.Construction)
	}
	if !strings.Contains(ch.Reason, "os2 rejected by through-15m") || !strings.Contains(ch.Reason, "runs 40 m inside M") {
		t.Errorf("40 m inside M: %s; want through-15m naming M's 40 m", ch.Reason)
	}
	l.CrossedInsideM, l.CrossedInsideMaxM = 15, 15
	if ch := e.Choose(l); !ch.Feasible || ch.Construction != "osp-loose-tube" || ch.Inside != "" {
		t.Errorf("15 m inside M: %s %s spliced to %q (%s); want osp-loose-tube, no transition", ch.Medium, ch.Construction, ch.Inside, ch.Reason)
	}
}

// TestTransitionTakesTrays: the 600 m link over a direct-buried span and a tray that used to
// have no construction (TestNoMediumNamesEveryNearMiss before the fix) takes outside-plant
// cable between the entrances spliced to listed riser cable, which runs the riser, coil and
// loop (20 m) and the 25 m of tray inside the first end's building: what installers do (NFPA
// 70 770.48, seen as fragment: unlisted cable ends within 15 m of the point of entrance;
// ANSI/TIA-568.3-D, 0.3 dB per splice, from memory). The two transition splices are in the
// loss budget.
func TestTransitionTakesTrays(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	ch := e.Choose(Link{ID: "L", RouteM: 600, RiserM: 40, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12,
		PathwayTypes: []string{"buried", "duct", "tray"}, InsideAM: 20 + 25, InsideBM: 20})
	if !ch.Feasible || ch.Construction != "osp-loose-tube" || ch.Inside == "" || ch.InsideM != 65 {
		t.Fatalf("got feasible %v, %s %s spliced to %q over %g m (%s); want osp-loose-tube spliced to listed cable over 65 m",
			ch.Feasible, ch.Medium, ch.Construction, ch.Inside, ch.InsideM, ch.Reason)
	}
	if k := e.cat.Medium(ch.Medium).Construction(ch.Inside); k.Listing == "" {
		t.Errorf("inside cable %s is not listed", k.ID)
	}
	for _, l := range ch.Losses {
		if l.Operating && l.Splices != 2+2*TerminationSplices(e.termination) {
			t.Errorf("%d nm: %d splices in the budget, want the 2 transition splices and the terminations'", l.WavelengthNM, l.Splices)
		}
	}
}

// TestNoMediumNamesMissingTransitionPrice: with no price for the entrance splice enclosure
// (transition_splice_each, optional), outside-plant cable is never spliced to listed cable at
// the entrances; when that leaves a link with no medium, the reason says which price would
// have let spanwright try it. With the price, the same link is feasible on a transition.
func TestNoMediumNamesMissingTransitionPrice(t *testing.T) {
	t.Parallel()
	link := Link{ID: "L", RouteM: 600, RiserM: 40, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12,
		PathwayTypes: []string{"buried", "duct"}}
	if ch := newEngine(t, nil, nil, EngineOptions{}).Choose(link); !ch.Feasible || ch.Inside == "" {
		t.Fatalf("with the demo book: feasible %v, inside %q (%s); the test wants a transition", ch.Feasible, ch.Inside, ch.Reason)
	}
	e := engineWith(t, nil, nil, bookWith(t, "transition_splice_each: 260.00", ""), EngineOptions{}) // no enclosure price
	ch := e.Choose(link)
	if ch.Feasible {
		t.Fatalf("feasible without the transition price: %s %s", ch.Medium, ch.Construction)
	}
	if want := "no splice to listed cable at the entrances was tried: the price book has no transition_splice_each"; !strings.Contains(ch.Reason, want) {
		t.Errorf("reason %q lacks %q", ch.Reason, want)
	}
}

// TestLayingFor: what routing prices a route of one kind as. On a link whose cable runs
// 20 m inside each building (more than NFPA 70 770.48's 15 m for unlisted cable, seen as
// fragment), a route in duct is laid as indoor/outdoor cable, and a route over a buried span
// as outside-plant cable spliced to riser cable at both entrances (direct-burial: ICEA
// S-87-640, from memory), whose two splices (ANSI/TIA-568.3-D 0.3 dB each, from memory) leave
// it less reach than the indoor/outdoor cable; without the enclosure's price no laying may
// be buried, and the reason says why indoor/outdoor may not.
func TestLayingFor(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	ends := Link{RiserM: 30, SlackM: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12, InsideAM: 20, InsideBM: 20}
	duct, buried := ends, ends
	duct.PathwayTypes, buried.PathwayTypes = []string{"duct"}, []string{"buried"}
	io := Laying{Construction: "indoor-outdoor"}
	spliced := Laying{Construction: "osp-loose-tube", Inside: "ofnr-riser", At: EndsBoth}
	if lay, _, ok := e.LayingFor("os2", 10, duct); !ok || lay != io {
		t.Errorf("in duct: laid as %v (%v), want %v", lay, ok, io)
	}
	lay, price, ok := e.LayingFor("os2", 10, buried)
	if !ok || lay != spliced {
		t.Fatalf("buried: laid as %v (%v), want %v", lay, ok, spliced)
	}
	// The demo book (invented): 12-fibre outside plant 1.43 a metre, riser 1.68; an
	// enclosure 260.00 and a 12-splice tray 38.00 at each entrance; 24 splices at 12 an hour.
	if price.PerMCents != 143 || price.InsidePerMCents != 168 || price.HardwareCents != 2*(26000+3800) || price.InsideCables != 1 {
		t.Errorf("buried: priced %+v", price)
	}
	if !e.Lays("os2", io, 10, duct) || e.Lays("os2", io, 10, buried) || !e.Lays("os2", spliced, 10, buried) {
		t.Error("Lays disagrees with LayingFor")
	}
	if why := e.WhyNotLaid("os2", io, 10, buried); !strings.Contains(why, "rejected by direct-burial") {
		t.Errorf("why not indoor/outdoor buried: %q", why)
	}
	rIO, rSpliced := e.MaxChannelMAs("os2", io, 10, 0, ends), e.MaxChannelMAs("os2", spliced, 10, 0, ends)
	if !(rSpliced > 0 && rSpliced < rIO) {
		t.Errorf("reach: indoor/outdoor %.1f m, spliced %.1f m; want the spliced shorter", rIO, rSpliced)
	}
	plain := engineWith(t, nil, nil, bookWith(t, "transition_splice_each: 260.00", ""), EngineOptions{}) // no enclosure price
	if lay, _, ok := plain.LayingFor("os2", 10, buried); ok {
		t.Errorf("no enclosure price: buried laid as %v", lay)
	}
	if note := plain.UntriedTransition("os2", buried); !strings.Contains(note, "transition_splice_each") {
		t.Errorf("no enclosure price: note %q", note)
	}
}

// TestLossReasonNamesSplicedCable: a loss-budget rejection of outside-plant cable spliced at
// the entrances names the spliced cable, whose two transition splices (ANSI/TIA-568.3-D
// 0.3 dB each, from memory) are in the loss it quotes; it used to name the outside-plant
// construction alone, as if it were laid all the way.
func TestLossReasonNamesSplicedCable(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	ch := e.Choose(Link{ID: "L", RouteM: 14000, RiserM: 30, SlackM: 10, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12,
		PathwayTypes: []string{"buried"}, InsideAM: 20, InsideBM: 20, Splices: 3})
	if ch.Feasible {
		t.Fatalf("feasible: %s; the test wants the spliced cable to miss its budget", ch.Reason)
	}
	if want := "on osp-loose-tube spliced to ofnr-riser at both entrances loses"; !strings.Contains(ch.Reason, want) {
		t.Errorf("reason lacks %q: %s", want, ch.Reason)
	}
}

// TestTransitionPerEnd is tester 8's finding 11: unlisted outside-plant cable may run 15 m
// inside a building from its point of entrance (NFPA 70 Article 770, 770.48, seen as
// fragment; the rule entrance-15m), so a link that runs 14 m inside one building (ADM: a 6 m
// riser, the 5 m coil and the 3 m loop) and 19.5 m inside the other (CAF) is spliced to listed
// cable at CAF's entrance only. Against the transition at both entrances the engine used to
// lay, it saves a splice (ANSI/TIA-568.3-D, 0.3 dB, from memory) and ADM's 14 m of riser cable
// at 1.0 dB/km instead of outside plant's 0.5 (the catalog's ANSI/TIA-568.3-D maxima, from
// memory) in the loss, and an enclosure (260.00), a 12-splice tray (38.00), 12 splices at 12
// an hour (92.00) and 14 m of riser cable at 1.68 instead of 1.43 (the demo book, invented)
// in the cost. A link over 15 m at both ends is spliced at both; one within 15 m at both at
// neither. Routes on buried pathways, where only the outside-plant cable may be laid
// (direct-burial).
func TestTransitionPerEnd(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	link := func(insideA, insideB float64) Link {
		return Link{ID: "ADM-CAF", RouteM: 1000, RiserM: 17.5, SlackM: 16, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12,
			PathwayTypes: []string{"buried"}, InsideAM: insideA, InsideBM: insideB, EndA: "CAF", EndB: "ADM"}
	}
	l := link(19.5, 14)
	ch := e.Choose(l)
	if !ch.Feasible || ch.Construction != "osp-loose-tube" || ch.Inside != "ofnr-riser" || ch.InsideAt != EndA ||
		ch.InsideAM != 19.5 || ch.InsideBM != 0 || ch.InsideM != 19.5 {
		t.Fatalf("14 m at ADM, 19.5 m at CAF: %s spliced to %q at %v (%g + %g = %g m): %s", ch.Construction, ch.Inside, ch.InsideAt, ch.InsideAM, ch.InsideBM, ch.InsideM, ch.Reason)
	}
	if !strings.Contains(ch.Reason, "osp-loose-tube spliced to ofnr-riser at the entrance of CAF") {
		t.Errorf("the reason does not name the end: %s", ch.Reason)
	}
	// The same candidate spliced at both entrances, as before.
	m := e.cat.Medium("os2")
	mi, ki := slices.Index(e.cat.Media, m), slices.IndexFunc(m.Constructions, func(k *Construction) bool { return k.ID == "osp-loose-tube" })
	ai := slices.IndexFunc(e.cat.Applications, func(a *Application) bool { return a.Name == ch.Application })
	var one, both candidate
	in := m.Construction("ofnr-riser")
	e.evaluate(&one, l, linkLengths(l), mi, ai, ki, variant{inside: in, at: EndA})
	e.evaluate(&both, l, linkLengths(l), mi, ai, ki, variant{inside: in, at: EndsBoth})
	if one.failed >= 0 || both.failed >= 0 || one.costCents != ch.CostCents {
		t.Fatalf("candidates: one end failed rule %d, both %d; one end %d cents, chosen %d", one.failed, both.failed, one.costCents, ch.CostCents)
	}
	for i, x := range one.losses {
		y := both.losses[i]
		if d := y.LossDB - x.LossDB; y.Splices != x.Splices+1 || math.Abs(d-(0.3+14*0.5/1000)) > 1e-9 {
			t.Errorf("%d nm: both entrances lose %.4f dB more with %d splices more, want 0.307 and 1", x.WavelengthNM, d, y.Splices-x.Splices)
		}
	}
	// And the items of a transition end besides (TransitionEnds; the demo book, invented): the
	// riser cable's two ends prepared at 30.00 and labelled at 6.00, the enclosure installed at
	// 60.00 (crew figures: common practice, no published source).
	if d := both.costCents - one.costCents; d < 26000+3800+9200+350+13200-1 || d > 26000+3800+9200+350+13200+1 {
		t.Errorf("both entrances cost %d cents more, want 52550 (an enclosure, a tray, 12 splices, 14 m of riser cable, 2 cable ends, the enclosure installed)", d)
	}
	for _, c := range []struct {
		name             string
		insideA, insideB float64
		inside           string
		at               Ends
	}{
		{"over 15 m at both ends", 20, 19.5, "ofnr-riser", EndsBoth},
		{"within 15 m at both ends", 14, 15, "", EndsNone},
		{"over 15 m at the other end only", 14, 19.5, "ofnr-riser", EndB},
	} {
		ch := e.Choose(link(c.insideA, c.insideB))
		if !ch.Feasible || ch.Construction != "osp-loose-tube" || ch.Inside != c.inside || ch.InsideAt != c.at {
			t.Errorf("%s: %s spliced to %q at %v, want %q at %v: %s", c.name, ch.Construction, ch.Inside, ch.InsideAt, c.inside, c.at, ch.Reason)
		}
	}
	// Routing prices and reaches a route over buried spans as the same laying: spliced at CAF
	// alone, one splice fewer than at both, so it reaches further.
	lay, price, ok := e.LayingFor("os2", 10, l)
	if want := (Laying{Construction: "osp-loose-tube", Inside: "ofnr-riser", At: EndA}); !ok || lay != want || lay.on(l) != "osp-loose-tube + ofnr-riser at CAF entrance" ||
		price.HardwareCents != 26000+3800 {
		t.Errorf("LayingFor: %v (%q, %v), hardware %d cents, want %v at CAF's entrance, 29800", lay, lay.on(l), ok, price.HardwareCents, want)
	}
	bothLay := Laying{Construction: "osp-loose-tube", Inside: "ofnr-riser", At: EndsBoth}
	if r1, r2 := e.MaxChannelMAs("os2", lay, 10, 0, l), e.MaxChannelMAs("os2", bothLay, 10, 0, l); !(r1 > r2 && r2 > 0) {
		t.Errorf("reach spliced at CAF %.1f m, at both %.1f m; want the one end's longer", r1, r2)
	}
	// Without the enclosure's price, no transition: the rule names the longer end.
	plain := engineWith(t, nil, nil, bookWith(t, "transition_splice_each: 260.00", ""), EngineOptions{}) // no enclosure price
	ch = plain.Choose(l)
	if want := "it would run 19.5 m inside one (19.5 m inside CAF and 14 m inside ADM"; ch.Feasible || !strings.Contains(ch.Reason, want) {
		t.Errorf("no enclosure price: feasible %v, reason %q, want %q", ch.Feasible, ch.Reason, want)
	}
}

// TestTransitionFactBothEnds: the fact transition keeps its meaning, spliced at both
// entrances, so that a rules file written before transitions could be at one end (such as
// this one, the shipped entrance-15m rule as it was) refuses a transition at one end where
// the other end runs over 15 m (NFPA 70 770.48, seen as fragment) instead of letting it pass.
func TestTransitionFactBothEnds(t *testing.T) {
	t.Parallel()
	old, err := ParseRules("old-rules.yaml", []byte(strings.Replace(string(rulesYAML),
		"when: outdoor and not construction_listed and unspliced_inside_max_m > 15",
		"when: outdoor and not construction_listed and not transition and inside_max_m > 15", 1)))
	if err != nil {
		t.Fatal(err)
	}
	e := newEngine(t, nil, old, EngineOptions{})
	ch := e.Choose(Link{ID: "ADM-CAF", RouteM: 1000, RiserM: 17.5, SlackM: 16, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12,
		PathwayTypes: []string{"buried"}, InsideAM: 19.5, InsideBM: 14, EndA: "CAF", EndB: "ADM"})
	if !ch.Feasible || ch.Inside != "ofnr-riser" || ch.InsideAt != EndsBoth {
		t.Errorf("with the rule as it was: %s spliced to %q at %v, want both entrances: %s", ch.Construction, ch.Inside, ch.InsideAt, ch.Reason)
	}
}

// TestChooseLaid: Choose among one laying's candidates alone. On TestLayingFor's duct link
// (20 m of cable inside each building, a 500 m route) the engine chooses os2 laid as
// indoor/outdoor cable; ChooseLaid of that laying gives the same application, losses and
// cost, and ChooseLaid of outside-plant cable spliced to riser cable at both entrances gives
// that laying with two splices more in its loss budget (ANSI/TIA-568.3-D: a splice each, from
// memory) and no medium rejected; a laying the rules refuse is not feasible.
func TestChooseLaid(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	l := Link{ID: "L", RouteM: 500, RiserM: 30, SlackM: 10, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12,
		InsideAM: 20, InsideBM: 20, PathwayTypes: []string{"duct"}, MaxEMI: "none"}
	ch := e.Choose(l)
	if !ch.Feasible || ch.Medium != "os2" || ch.Construction != "indoor-outdoor" || ch.Inside != "" {
		t.Fatalf("chosen: %+v", ch)
	}
	same := e.ChooseLaid(l, "os2", Laying{Construction: "indoor-outdoor"})
	if !same.Feasible || same.Application != ch.Application || same.CostCents != ch.CostCents || !slices.Equal(same.Losses, ch.Losses) || same.Rejected != nil {
		t.Errorf("the chosen laying alone: %+v, want %+v without rejections", same, ch)
	}
	spliced := e.ChooseLaid(l, "os2", Laying{Construction: "osp-loose-tube", Inside: "ofnr-riser", At: EndsBoth})
	if !spliced.Feasible || spliced.Construction != "osp-loose-tube" || spliced.Inside != "ofnr-riser" || spliced.InsideAt != EndsBoth ||
		spliced.Losses[0].Splices != ch.Losses[0].Splices+2 {
		t.Errorf("spliced at both entrances: %+v", spliced)
	}
	// Its reason compares it with no medium (none other was judged) and says its own cost
	// and channel (review 15 F2: "is the only feasible medium" of a laying judged alone).
	if want := fmt.Sprintf("os2 with %s on indoor-outdoor, at %s USD of cable, terminations and transceivers for a 540 m channel, loss ", same.Application, FormatCents(same.CostCents)); !strings.HasPrefix(same.Reason, want) || strings.Contains(same.Reason, "feasible medium") {
		t.Errorf("the chosen laying alone: reason %q, want it to begin %q", same.Reason, want)
	}
	buried := l
	buried.PathwayTypes = []string{"buried"}
	if refused := e.ChooseLaid(buried, "os2", Laying{Construction: "indoor-outdoor"}); refused.Feasible {
		t.Errorf("indoor/outdoor buried: %+v, want not feasible (direct-burial)", refused)
	}
}

// TestChooseOwn: each laying judged on the cable it buys. On TestChooseLaid's duct link,
// with the same cable for every laying, ChooseOwn is Choose (os2 on indoor/outdoor cable).
// With 40 mid-span joins on the whole cable (12 dB of splices at 0.3 dB each, ANSI/TIA-568.3-D,
// from memory: no medium closes, Choose says so) but none on the outside-plant cable between
// splices at both entrances, 5 m less slack there, the transition at both entrances is
// chosen, with its own cable's losses (two transition splices and no joins: ChooseLaid on
// that cable) and its own channel in the reason (535 m, not the whole's 540 m).
func TestChooseOwn(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{})
	l := Link{ID: "L", RouteM: 500, RiserM: 30, SlackM: 10, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 12,
		InsideAM: 20, InsideBM: 20, PathwayTypes: []string{"duct"}, MaxEMI: "none"}
	same := e.ChooseOwn(l, func(Ends) OwnCable { return OwnCable{SlackM: l.SlackM, Splices: l.Splices} })
	if ch := e.Choose(l); !reflect.DeepEqual(same, ch) {
		t.Errorf("one cable for every laying: %+v, Choose %+v", same, ch)
	}
	own := func(at Ends) OwnCable {
		if at == EndsBoth {
			return OwnCable{SlackM: 5}
		}
		return OwnCable{SlackM: 10, Splices: 40}
	}
	whole := l
	whole.Splices = 40
	if ch := e.Choose(whole); ch.Feasible {
		t.Fatalf("40 joins on the whole cable: %s on %s feasible, want no medium (the test would see nothing)", ch.Medium, ch.Construction)
	}
	ch := e.ChooseOwn(l, own)
	both := Laying{Construction: "osp-loose-tube", Inside: "ofnr-riser", At: EndsBoth}
	onOwn := l
	onOwn.SlackM = 5
	laid := e.ChooseLaid(onOwn, "os2", both)
	if !ch.Feasible || ch.Medium != "os2" || ch.Construction != both.Construction || ch.Inside != both.Inside || ch.InsideAt != EndsBoth ||
		!laid.Feasible || !slices.Equal(ch.Losses, laid.Losses) || ch.CostCents != laid.CostCents {
		t.Fatalf("each on its own cable: %+v; want %s on its own cable: %+v", ch, both, laid)
	}
	if !strings.Contains(ch.Reason, "for a 535 m channel") || strings.Contains(ch.Reason, "540 m") {
		t.Errorf("reason %q, want its own 535 m channel", ch.Reason)
	}
	if ch.InsideAM != 20 || ch.InsideBM != 20 {
		t.Errorf("inside cable %.2f m and %.2f m, want 20 m at each end", ch.InsideAM, ch.InsideBM)
	}
	// The engine's own order across the layings' cables, prefer rules first (review 16 F6: the
	// fallback ranked the end sets by cost alone): a rule preferring the transition at both
	// entrances picks it over indoor/outdoor cable, cheaper on its own cable.
	pref, err := ParseRules("prefer.yaml", append(slices.Clone(rulesYAML), []byte(`
  - id: prefer-both-ends
    when: transition_a and transition_b
    effect: prefer
    reason: "a test's preference"
`)...))
	if err != nil {
		t.Fatal(err)
	}
	ep := newEngine(t, nil, pref, EngineOptions{})
	slack := func(at Ends) OwnCable {
		if at == EndsBoth {
			return OwnCable{SlackM: 9}
		}
		return OwnCable{SlackM: 10}
	}
	io := ep.ChooseLaid(l, "os2", Laying{Construction: "indoor-outdoor"})
	if ch := ep.ChooseOwn(l, slack); !ch.Feasible || ch.InsideAt != EndsBoth || !io.Feasible || ch.CostCents <= io.CostCents {
		t.Errorf("a rule preferring both entrances: %s spliced at %v at %s, indoor/outdoor at %s: want the transition, dearer",
			ch.Construction, ch.InsideAt, FormatCents(ch.CostCents), FormatCents(io.CostCents))
	}
}

// TestTransitionFullPrice is review 14's finding 7: the engine weighs an entrance transition
// on every item its end puts on the bill (TransitionEnds), so a 24-strand link that saves
// 69.89 USD of cable, enclosure, trays and splicing with the transition, but spends 132.00
// more on the riser cable's two ends prepared and labelled and the enclosure installed, keeps
// indoor/outdoor cable, as quill's CAF-DAI and CAF-PWR and tester 10's ADMN-B28 and B32 now do.
// Figures from the demo book (invented): os2 24-strand indoor/outdoor 3.26, outside plant
// 2.31 and riser 2.72 a metre, an enclosure 260.00, 12-splice trays at 38.00, 12 splices an
// hour at 92.00, cable end preparation 30.00, enclosure installation 60.00 (crew figures:
// common practice, no published source), labelling 6.00 a cable end; 5 % waste on every
// metre, as the bill buys it. NFPA 70 770.48 (unlisted cable at most 15 m inside the
// entrance, seen as fragment) makes the transition at A (20 m inside) and none at B (5 m).
func TestTransitionFullPrice(t *testing.T) {
	t.Parallel()
	e := newEngine(t, nil, nil, EngineOptions{WastePct: 5})
	l := Link{ID: "CAF-DAI", RouteM: 560, RiserM: 30, SlackM: 10, RateGbps: 10, Outdoor: true, ConnectorPairs: 2, Strands: 24,
		PathwayTypes: []string{"duct"}, InsideAM: 20, InsideBM: 5, EndA: "CAF", EndB: "DAI"}
	ch := e.Choose(l)
	if !ch.Feasible || ch.Medium != "os2" || ch.Construction != "indoor-outdoor" || ch.Inside != "" {
		t.Fatalf("got %s %s spliced to %q at %v (%s), want os2 indoor-outdoor without a transition", ch.Medium, ch.Construction, ch.Inside, ch.InsideAt, ch.Reason)
	}
	// Indoor/outdoor over the 600 m channel with waste: 630 m at 3.26.
	if want := int64(630 * 326); ch.CableCents != want || ch.LabourCents != 0 {
		t.Errorf("indoor/outdoor: cable %d cents, labour %d; want %d, 0", ch.CableCents, ch.LabourCents, want)
	}
	m := e.cat.Medium("os2")
	mi, ki := slices.Index(e.cat.Media, m), slices.IndexFunc(m.Constructions, func(k *Construction) bool { return k.ID == "osp-loose-tube" })
	ai := slices.IndexFunc(e.cat.Applications, func(a *Application) bool { return a.Name == ch.Application })
	var tr candidate
	e.evaluate(&tr, l, linkLengths(l), mi, ai, ki, variant{inside: m.Construction("ofnr-riser"), at: EndA})
	if tr.failed >= 0 {
		t.Fatalf("the transition at CAF failed rule %d", tr.failed)
	}
	// 580 m of outside plant and 20 m of riser cable with waste, one enclosure and two trays:
	// 1406.79 + 57.12 + 260.00 + 76.00; 24 splices at 12 an hour, 184.00.
	narrowCable, splicing := int64(140679+5712+26000+7600), int64(18400)
	// The riser cable's two ends prepared (2 × 30.00) and labelled (2 × 6.00), the enclosure
	// installed (60.00).
	ends := int64(2*3000 + 2*600 + 6000)
	if tr.cableCents != narrowCable || tr.labourCents != splicing+ends {
		t.Errorf("transition: cable %d cents, labour %d; want %d, %d", tr.cableCents, tr.labourCents, narrowCable, splicing+ends)
	}
	// The narrower price (no ends, no installation) would have chosen the transition.
	if d := ch.CostCents - (tr.costCents - ends); d != 6989 {
		t.Errorf("indoor/outdoor against the transition without its ends: %d cents dearer, want 6989", d)
	}
	if d := tr.costCents - ch.CostCents; d != 6211 {
		t.Errorf("the transition costs %d cents more than indoor/outdoor, want 6211", d)
	}
}
