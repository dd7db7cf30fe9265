package plan

import (
	"errors"
	"strings"
	"testing"

	"spanwright/geo/input"
)

func TestParsePlan(t *testing.T) {
	t.Parallel()
	p, err := ParsePlan("dir/plan.yaml", []byte(`
name: Example backbone
campus: [campus.geojson]
hub: ADM
budget: 1250000.50
defaults: {rate: 25G, strands: 24}
links:
  - {to: LIB, rate: 40G, redundancy: diverse}
  - {from: LIB, to: GYM, rate: 1G, growth: 0}
  - {to: SHED, skip: true}
design: {loss_margin_db: 2, allow_new_trench: false}
`))
	if err != nil {
		t.Fatal(err)
	}
	if p.Name != "Example backbone" || p.Hub != "ADM" || p.Budget != 125000050 {
		t.Errorf("got name %q hub %q budget %d", p.Name, p.Hub, p.Budget)
	}
	if p.Path(p.Campus[0]) != "dir/campus.geojson" {
		t.Errorf("campus path: got %q, want dir/campus.geojson", p.Path(p.Campus[0]))
	}
	// Keys the plan leaves out keep their defaults, also inside a partly given mapping.
	if p.Defaults.Rate != "25G" || p.Defaults.Strands != 24 || p.Defaults.Growth != 0.5 || p.Defaults.Redundancy != RedundancyNone {
		t.Errorf("defaults: got %+v", p.Defaults)
	}
	if p.Design.LossMarginDB != 2 || p.Design.AllowNewTrench || p.Design.MaxLateralM != 30 || p.Design.SnapM != 0.5 || p.Design.Objective != ObjectiveCost {
		t.Errorf("design: got %+v", p.Design)
	}
	// design.cables_per_duct: 3 loose cables a duct unless the plan says otherwise (common
	// practice, no published source); 0 is the fill alone.
	if p.Design.CablesPerDuct != 3 {
		t.Errorf("design.cables_per_duct: got %d, want the default 3", p.Design.CablesPerDuct)
	}
	if z, err := ParsePlan("plan.yaml", []byte("campus: [c]\ndesign: {cables_per_duct: 0}\n")); err != nil || z.Design.CablesPerDuct != 0 {
		t.Errorf("design.cables_per_duct 0: got %v, %v; want 0, the fill alone", z, err)
	}
	if _, err := ParsePlan("plan.yaml", []byte("campus: [c]\ndesign: {cables_per_duct: 2.5}\n")); err == nil || err.Error() != `plan.yaml:2:27: design.cables_per_duct: want an integer, got "2.5"` {
		t.Errorf("design.cables_per_duct 2.5: got %v, want the integer it must be", err)
	}
	if len(p.Links) != 3 || p.Links[1].From != "LIB" || p.Links[1].Growth == nil || *p.Links[1].Growth != 0 || !p.Links[2].Skip {
		t.Errorf("links: got %+v", p.Links)
	}
	if p.Links[0].Line != 8 {
		t.Errorf("first link line: got %d, want 8", p.Links[0].Line)
	}
}

func TestParsePlanErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name, yaml string
		want       []string
	}{
		{"not yaml", "campus: [", []string{"plan.yaml:1: not YAML: did not find expected node content"}},
		{"not a mapping", "- a\n- b\n", []string{"plan.yaml:1:1: want a mapping, got a list"}},
		{"unknown key", "campus: [c.geojson]\nbudgit: 3\n", []string{"plan.yaml:2:1: budgit: unknown key; did you mean budget? want one of budget, campus, campus_database, catalog, defaults, design, hub, links, name, notes, prices, rules"}},
		{"unknown nested key", "campus: [c.geojson]\ndesign: {snap: 2}\n", []string{"plan.yaml:2:10: design.snap: unknown key; did you mean snap_m? want one of allow_new_trench, "}},
		{"unknown link key", "campus: [c.geojson]\nlinks:\n  - {to: A, speed: 10G}\n", []string{"plan.yaml:3:13: links[0].speed: unknown key; want one of from, future_rate, growth, rate, redundancy, skip, strands, to"}},
		{"no campus", "name: x\n", []string{"plan.yaml: campus: missing; name at least one campus file (GeoJSON, or GeoPackage .gpkg), or a campus_database"}},
		{"bad budget", "campus: [c]\nbudget: 12.345\n", []string{`plan.yaml:2:9: budget: want an amount such as 1250000 or 99.95, got "12.345"`}},
		{"bad redundancy", "campus: [c]\ndefaults: {redundancy: double}\n", []string{`plan.yaml:2:24: defaults.redundancy: want "none" or "diverse", got "double"`}},
		{"link without to", "campus: [c]\nlinks:\n  - {from: A}\n", []string{"plan.yaml:3:5: links[0].to: missing; a link names the building it serves"}},
		{"bad objective", "campus: [c]\ndesign: {objective: speed}\n", []string{`plan.yaml:2:21: design.objective: want "cost" or "length", got "speed"`}},
		{"bad assumed surface", "campus: [c]\ndesign: {assumed_surface: gravel}\n", []string{`plan.yaml:2:27: design.assumed_surface: want one of turf, asphalt, concrete, got "gravel"`}},
		// Each problem on its own line, with its line and column, in line order: unknown keys
		// and bad values together, named by their key path, never by a Go type.
		{"nested problems on their own lines", "campus: [c]\ndesign:\n  snap: 2\n  loss_margin_db: lots\n  pull_mu: 0.3\n  slak_m: 1\n",
			[]string{"plan.yaml:3:3: design.snap: unknown key; did you mean snap_m? want one of ", "\nplan.yaml:4:19: design.loss_margin_db: want a number, got \"lots\"\nplan.yaml:6:3: design.slak_m: unknown key"}},
		{"innerduct inside without outside", "campus: [c]\ndesign: {innerduct_id_mm: 27}\n", []string{"plan.yaml:2:27: design.innerduct_id_mm: want it only with design.innerduct_od_mm, got 27 without"}},
		{"innerduct inside not below outside", "campus: [c]\ndesign: {innerduct_od_mm: 32, innerduct_id_mm: 32}\n", []string{"plan.yaml:2:48: design.innerduct_id_mm: want millimetres above 0 and below innerduct_od_mm (32), got 32"}},
		{"negative splice slack", "campus: [c]\ndesign: {splice_slack_m: -1}\n", []string{"plan.yaml:2:26: design.splice_slack_m: want metres from 0 to 1000, got -1"}},
		{"splice slack a reel cannot carry", "campus: [c]\ndesign: {reel_m: 105, waste_pct: 5, splice_slack_m: 50}\n",
			[]string{"plan.yaml:2:53: design.splice_slack_m: want at most 49.50 metres: a reel carries reel_m / (1 + waste_pct/100) = 100.00 m of channel, the splicing slack at both its joined ends (2 × splice_slack_m) and at least 1 m of route besides; got 50"}},
		{"splice slack leaving a reel 4 cm of route", "campus: [c]\ndesign: {reel_m: 100, splice_slack_m: 47.6}\n", // review 15 F5
			[]string{"plan.yaml:2:39: design.splice_slack_m: want at most 47.11 metres: a reel carries reel_m / (1 + waste_pct/100) = 95.24 m of channel"}},
		{"negative sidewall limit", "campus: [c]\ndesign: {pull_max_swbp_n_per_m: -1}\n", []string{"plan.yaml:2:33: design.pull_max_swbp_n_per_m: want N/m from 0 to 100000, got -1"}},
		{"several problems at once", "campus: [c]\ndefaults: {strands: 0, growth: -1}\ndesign: {snap_m: 0}\n",
			[]string{"defaults.strands", "defaults.growth", "design.snap_m"}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParsePlan("plan.yaml", []byte(tc.yaml))
			if err == nil {
				t.Fatalf("%s: got no error", tc.name)
			}
			if !errors.Is(err, ErrPlan) {
				t.Errorf("%s: error does not wrap ErrPlan: %v", tc.name, err)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("%s: got %q, want it to contain %q", tc.name, err, w)
				}
			}
		})
	}
}

// TestSpliceSlackLimit: a reel between two joins carries its ends' splicing slack and at least
// MinReelRouteM (1 m) of route besides (review 15 F5; common practice, no published source):
// either side of the limit, at the default 5 % waste and at 0 %.
func TestSpliceSlackLimit(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		design string
		ok     bool
	}{
		{"{reel_m: 100, splice_slack_m: 47.11}", true}, // 95.24 m a reel, 1.02 m of route
		{"{reel_m: 100, splice_slack_m: 47.12}", false},
		{"{reel_m: 100, splice_slack_m: 45}", true},                 // 5.24 m of route: the demo at reel 100 (review 15 F0)
		{"{reel_m: 105, waste_pct: 5, splice_slack_m: 49.5}", true}, // exactly 1 m
		{"{reel_m: 105, waste_pct: 5, splice_slack_m: 49.51}", false},
		{"{reel_m: 100, waste_pct: 0, splice_slack_m: 49.5}", true},
		{"{reel_m: 100, waste_pct: 0, splice_slack_m: 49.6}", false},
	} {
		_, err := ParsePlan("plan.yaml", []byte("campus: [c]\ndesign: "+tc.design+"\n"))
		if got := err == nil; got != tc.ok {
			t.Errorf("%s: accepted %v, want %v (%v)", tc.design, got, tc.ok, err)
		}
		if err != nil && !strings.Contains(err.Error(), "design.splice_slack_m: want at most") {
			t.Errorf("%s: %v, want design.splice_slack_m named", tc.design, err)
		}
	}
}

func TestParseCents(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		in   string
		want int64
		ok   bool
	}{
		{"0", 0, true}, {"12.35", 1235, true}, {"12.3", 1230, true}, {"1_250_000", 125000000, true},
		{"-1", 0, false}, {"1.234", 0, false}, {"abc", 0, false}, {"1e6", 0, false}, {"", 0, false},
	} {
		got, err := ParseCents(tc.in)
		if (err == nil) != tc.ok || got != tc.want {
			t.Errorf("ParseCents(%q): got %d, %v; want %d, ok %v", tc.in, got, err, tc.want, tc.ok)
		}
	}
}

// TestParsePlanNumbers: every numeric key is finite, in its range and whole where it counts
// something, and a problem names the file, the key's line and the key.
func TestParsePlanNumbers(t *testing.T) {
	t.Parallel()
	cases := []struct{ name, yaml, want string }{
		// YAML 1.2.2 §10.2.1.4: .nan and .inf are floats; IEEE 754: NaN fails every comparison.
		{"growth NaN", "campus: [c]\ndefaults:\n  growth: .nan\n", "plan.yaml:3:11: defaults.growth: want a fraction from 0 to 10, got NaN"},
		{"growth huge", "campus: [c]\ndefaults: {growth: 1e308}\n", "plan.yaml:2:20: defaults.growth: want a fraction from 0 to 10, got 1e+308"},
		// Go spec: int is 64 bits here, so strands times growth overflows.
		{"strands overflow", "campus: [c]\ndefaults:\n  rate: 10G\n  strands: 9223372036854775807\n", "plan.yaml:4:12: defaults.strands: want a whole number of strands from 1 to 10000, got 9223372036854775807"},
		{"link strands overflow", "campus: [c]\nlinks:\n  - to: A\n    strands: 9223372036854775807\n", "plan.yaml:4:14: links[0].strands: want a whole number of strands from 0 to 10000, got 9223372036854775807"},
		{"link growth NaN", "campus: [c]\nlinks:\n  - {to: A, growth: .nan}\n", "plan.yaml:3:21: links[0].growth: want a fraction from 0 to 10, got NaN"},
		{"slack NaN", "campus: [c]\ndesign:\n  snap_m: 1\n  slack_m: .nan\n", "plan.yaml:4:12: design.slack_m: want metres from 0 to 1000, got NaN"},
		{"slack infinite", "campus: [c]\ndesign: {slack_m: .inf}\n", "plan.yaml:2:19: design.slack_m: want metres from 0 to 1000, got +Inf"},
		{"lateral infinite", "campus: [c]\ndesign: {max_lateral_m: .inf}\n", "plan.yaml:2:25: design.max_lateral_m: want metres above 0 and at most 1000, got +Inf"},
		{"margin negative infinite", "campus: [c]\ndesign: {loss_margin_db: -.inf}\n", "plan.yaml:2:26: design.loss_margin_db: want dB from 0 to 50, got -Inf"},
		{"innerduct NaN", "campus: [c]\ndesign: {innerduct_od_mm: .nan}\n", "plan.yaml:2:27: design.innerduct_od_mm: want millimetres from 0 to 1000, got NaN"},
		{"cables a duct negative", "campus: [c]\ndesign: {cables_per_duct: -1}\n", "plan.yaml:2:27: design.cables_per_duct: want a whole number of loose cables a duct from 0 to 1000, got -1"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParsePlan("plan.yaml", []byte(tc.yaml))
			if err == nil || !errors.Is(err, ErrPlan) || !errors.Is(err, input.ErrOutOfRange) || err.Error() != tc.want {
				t.Errorf("%s: got %v, want %q alone", tc.name, err, tc.want)
			}
		})
	}
}

// TestParsePlanDuplicateKeys: a key given twice at any level is refused, naming both lines;
// yaml.v3 would keep the last value of a top-level key without a word.
func TestParsePlanDuplicateKeys(t *testing.T) {
	t.Parallel()
	cases := []struct{ name, yaml, want string }{
		// YAML 1.2.2 §3.2.1.1: the keys of a mapping are unique.
		{"hub twice", "campus: [c]\nhub: ADM\nname: x\nhub: LIB\n", "plan.yaml:4:1: hub: given twice, at line 2 and line 4; remove one"},
		{"in design", "campus: [c]\ndesign:\n  slack_m: 5\n  slack_m: 6\n", "plan.yaml:4:3: design.slack_m: given twice, at line 3 and line 4; remove one"},
		{"in a link", "campus: [c]\nlinks:\n  - to: A\n    strands: 12\n    to: B\n", "plan.yaml:5:5: links[0].to: given twice, at line 3 and line 5; remove one"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParsePlan("plan.yaml", []byte(tc.yaml))
			if err == nil || !errors.Is(err, input.ErrDuplicateKey) || err.Error() != tc.want {
				t.Errorf("%s: got %v, want %q alone", tc.name, err, tc.want)
			}
		})
	}
}
