package media

import (
	"errors"
	"path/filepath"
	"strings"
	"testing"
)

// factsFor builds fact values from a few named ones; the rest are zero.
func factsFor(t *testing.T, set map[string]any) []value {
	t.Helper()
	f := make([]value, nFacts)
	for name, v := range set {
		i, ok := factIndex[name]
		if !ok {
			t.Fatalf("no fact %q", name)
		}
		switch v := v.(type) {
		case float64:
			f[i].num = v
		case int:
			f[i].num = float64(v)
		case string:
			f[i].str = v
		case bool:
			f[i].b = v
		}
	}
	return f
}

func TestConditionEval(t *testing.T) {
	t.Parallel()
	facts := map[string]any{"channel_m": 612.0, "kind": "copper", "outdoor": true, "max_emi": "high",
		"reach_m": 400.0, "margin_db": -0.5, "loss_margin_db": 1.0, "allow_outdoor_copper": false}
	cases := []struct {
		cond string
		want bool
	}{
		{"channel_m > 100", true},
		{"channel_m > 100 and kind == \"copper\"", true},
		{"channel_m <= 612", true},
		{"channel_m < 612", false},
		{"channel_m != 612", false},
		{"channel_m >= 612.0", true},
		{"reach_m >= channel_m", false},
		{"not outdoor", false},
		{"not not outdoor", true},
		{"outdoor and not allow_outdoor_copper", true},
		{"kind == \"multimode\" or max_emi == \"high\"", true},
		{"kind == \"multimode\" or max_emi == \"low\"", false},
		{"(kind == \"multimode\" or outdoor) and channel_m > 600", true},
		{"kind == \"multimode\" or outdoor and channel_m > 700", false}, // and binds tighter than or
		{"margin_db >= -0.5", true},
		{"margin_db >= loss_margin_db", false},
		{"outdoor == true", true},
		{"\"copper\" == kind", true},
		{"true", true},
		{"false or (((false)))", false},
	}
	f := factsFor(t, facts)
	for _, tc := range cases {
		t.Run(tc.cond, func(t *testing.T) {
			c, err := parseCondition(tc.cond)
			if err != nil {
				t.Fatalf("%q: %v", tc.cond, err)
			}
			if got := c.eval(f); got != tc.want {
				t.Errorf("%q: got %v, want %v", tc.cond, got, tc.want)
			}
		})
	}
}

func TestConditionErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		cond string
		off  int
		kind error
		want string
	}{
		{"channel_m > > 100", 12, ErrSyntax, `want a fact, number or string, got ">"`},
		{"chanel_m > 100", 0, ErrUnknownFact, `unknown fact "chanel_m"; did you mean "channel_m"?`},
		{"zzz > 1", 0, ErrUnknownFact, `unknown fact "zzz"`},
		{"channel_m > 100m", 15, ErrSyntax, `runs into a name`},
		{"channel_m = 100", 10, ErrSyntax, `use "=="`},
		{"outdoor && true", 8, ErrSyntax, `use "and"`},
		{"!outdoor", 0, ErrSyntax, `use "not"`},
		{"(outdoor", 8, ErrSyntax, `want ")" to close`},
		{"outdoor)", 7, ErrSyntax, `unexpected ")" after a complete condition`},
		{"kind == \"copper", 8, ErrSyntax, `string not closed`},
		{"", 0, ErrSyntax, `empty condition`},
		{"channel_m", 0, ErrBadValue, `a condition must be true/false, got a number`},
		{"kind > \"a\"", 5, ErrBadValue, `">" orders numbers, got a string`},
		{"kind == 3", 5, ErrBadValue, `"==" compares a string with a number`},
		{"channel_m and outdoor", 0, ErrBadValue, `"and" takes true/false, got a number`},
		{"not channel_m", 4, ErrBadValue, `"not" takes true/false`},
		{"max_emi == \"severe\"", 11, ErrBadValue, `max_emi is one of none, low, high, got "severe"`},
		{"kind == \"fibre\"", 8, ErrBadValue, `kind is one of copper, multimode, singlemode`},
		{"channel_m > 1.2.3", 12, ErrSyntax, `bad number "1.2.3"`},
		{"outdoor and", 11, ErrSyntax, `want a fact, number or string, got end of condition`},
		{"channel_m > 100 #", 16, ErrSyntax, `unexpected character "#"`},
	}
	for _, tc := range cases {
		t.Run(tc.cond, func(t *testing.T) {
			_, err := parseCondition(tc.cond)
			var ce *condError
			if !errors.As(err, &ce) {
				t.Fatalf("%q: got %v, want a condError", tc.cond, err)
			}
			if ce.Off != tc.off || ce.Kind != tc.kind || !strings.Contains(ce.Msg, tc.want) {
				t.Errorf("%q: got offset %d %v %q, want offset %d %v containing %q", tc.cond, ce.Off, ce.Kind, ce.Msg, tc.off, tc.kind, tc.want)
			}
		})
	}
}

func TestTemplate(t *testing.T) {
	t.Parallel()
	f := factsFor(t, map[string]any{"application": "10GBASE-SR", "reach_m": 400.0, "channel_m": 612.4, "loss_db": 2.555, "outdoor": true})
	cases := []struct{ src, want string }{
		{"{application} reaches {reach_m} m, channel is {channel_m} m", "10GBASE-SR reaches 400 m, channel is 612.4 m"},
		{"loss {loss_db} dB", "loss 2.56 dB"},
		{"{ outdoor }", "true"},
		{"braces {{like this}}", "braces {like this}"},
		{"plain", "plain"},
	}
	for _, tc := range cases {
		t.Run(tc.src, func(t *testing.T) {
			tm, err := parseTemplate(tc.src)
			if err != nil {
				t.Fatal(err)
			}
			if got := tm.render(f); got != tc.want {
				t.Errorf("%q: got %q, want %q", tc.src, got, tc.want)
			}
		})
	}
	for _, bad := range []struct {
		src  string
		off  int
		want string
	}{{"{reach}", 1, `unknown fact "reach"`}, {"a {channel_m", 2, "not closed"}, {"a } b", 2, `"}" without "{"`}} {
		_, err := parseTemplate(bad.src)
		var ce *condError
		if !errors.As(err, &ce) || ce.Off != bad.off || !strings.Contains(ce.Msg, bad.want) {
			t.Errorf("%q: got %v, want offset %d containing %q", bad.src, err, bad.off, bad.want)
		}
	}
}

func TestFormatNum(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		x    float64
		want string
	}{{612.4, "612.4"}, {400, "400"}, {2.555, "2.56"}, {-0.001, "0"}, {0.05, "0.05"}, {1e6, "1000000"}} {
		if got := formatNum(tc.x); got != tc.want {
			t.Errorf("formatNum(%g): got %q, want %q", tc.x, got, tc.want)
		}
	}
}

func TestDefaultRules(t *testing.T) {
	t.Parallel()
	r := DefaultRules()
	var ids []string
	for _, rule := range r.Rules {
		ids = append(ids, rule.ID)
		if rule.Source == "" {
			t.Errorf("rule %s names no source", rule.ID)
		}
	}
	want := "copper-90m,copper-100m,copper-emi,copper-outdoor,reach,multimode-2km,loss-budget,receiver-overload,future-rate,outdoor-construction,direct-burial,indoor-listing,plenum-listing,entrance-15m,through-15m"
	if got := strings.Join(ids, ","); got != want {
		t.Errorf("rule order:\ngot  %s\nwant %s", got, want)
	}
}

// A rule file with a malformed condition, an unknown fact or an unknown field is rejected
// with the file, the rule id and the line:column of the problem.
func TestRulesBad(t *testing.T) {
	t.Parallel()
	cases := []struct {
		file     string
		sentinel error
		want     []string
	}{
		{"bad_condition.yaml", ErrSyntax, []string{`bad_condition.yaml:5:23: rule "too-long": when: want a fact, number or string, got ">"`}},
		{"unknown_fact.yaml", ErrUnknownFact, []string{`unknown_fact.yaml:8:23: rule "reach": when: unknown fact "chanel_m"; did you mean "channel_m"?`}},
		{"unknown_field.yaml", ErrUnknownField, []string{
			`unknown_field.yaml:3:5: rule "copper-100m": effect: missing`,
			`unknown_field.yaml:5:5: rule "copper-100m": efect: unknown key; did you mean effect? want one of effect, id, kinds, media, reason, source, when`,
		}},
		{"many.yaml", ErrDuplicateID, []string{
			`many.yaml:10:38: rule "block": when: max_emi is one of none, low, high, got "severe"`,
			`many.yaml:15:5: rule "bad-effect": effect: want exclude, require or prefer, got "forbid"`,
			`many.yaml:20:20: rule "bad-template": reason: unknown fact "los_db"; did you mean "loss_db"?`,
			`many.yaml:21:5: rule "ok-rule": id: rule "ok-rule" already defined at line 3`,
			`many.yaml:22:42: rule "ok-rule": when: want ")" to close an open "(", got end of condition`,
		}},
	}
	for _, tc := range cases {
		t.Run(tc.file, func(t *testing.T) {
			_, err := LoadRules(filepath.Join("testdata", "rules", tc.file))
			if err == nil {
				t.Fatalf("%s: no error", tc.file)
			}
			if !errors.Is(err, tc.sentinel) {
				t.Errorf("%s: %v is not %v", tc.file, err, tc.sentinel)
			}
			lines := strings.Split(err.Error(), "\n")
			if len(lines) != len(tc.want) {
				t.Errorf("%s: got %d problems, want %d:\n%v", tc.file, len(lines), len(tc.want), err)
			}
			for i, w := range tc.want {
				if i < len(lines) && !strings.HasSuffix(lines[i], w) {
					t.Errorf("%s: problem %d:\ngot  %s\nwant %s", tc.file, i, lines[i], w)
				}
			}
		})
	}
}

// Rules naming media, applications or constructions the catalog lacks fail in NewEngine.
func TestRulesUnknownCatalogNames(t *testing.T) {
	t.Parallel()
	r, err := LoadRules(filepath.Join("testdata", "rules", "unknown_medium.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	_, err = NewEngine(nil, r, nil, EngineOptions{})
	want := []string{
		`unknown_medium.yaml:4: rule "no-om6": media: no medium "om6"`,
		`unknown_medium.yaml:5:21: rule "no-om6": when: no medium "om7"`,
		`unknown_medium.yaml:5:45: rule "no-om6": when: no application "10GBASE-ZR"`,
	}
	if err == nil {
		t.Fatal("no error")
	}
	for _, w := range want {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("error lacks %q:\n%v", w, err)
		}
	}
}

func TestRulesParseErrors(t *testing.T) {
	t.Parallel()
	cases := []struct{ name, src, want string }{
		{"reserved id", "rules:\n  - {id: cost, when: outdoor, effect: exclude, reason: x}\n", `"cost" is reserved`},
		{"bad kind", "rules:\n  - {id: a, kinds: [fibre], when: outdoor, effect: exclude, reason: x}\n", `kinds[0]: `},
		{"no rules key", "rule: []\n", `rule: unknown key`},
		{"missing reason", "rules:\n  - {id: a, when: outdoor, effect: exclude}\n", `rule "a": reason: missing`},
		{"double-quoted position", "rules:\n  - id: a\n    when: \"outdoor and zz\"\n    effect: exclude\n    reason: x\n", `x.yaml:3:24: rule "a": when: `},
		{"literal block position", "rules:\n  - id: a\n    when: |\n      outdoor and\n        zz\n    effect: exclude\n    reason: x\n", `x.yaml:5:9: rule "a": when: `},
		// YAML 1.2.2 §3.2.1.1: the keys of a mapping are unique; yaml.v3 keeps the last.
		{"effect given twice", "rules:\n  - id: a\n    when: outdoor\n    effect: prefer\n    effect: exclude\n    reason: x\n", `x.yaml:5:5: rules[0].effect: given twice, at line 4 and line 5; remove one`},
		{"rules given twice", "rules: []\nrules:\n  - {id: a, when: outdoor, effect: exclude, reason: x}\n", `x.yaml:2:1: rules: given twice, at line 1 and line 2`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseRules("x.yaml", []byte(tc.src))
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: got %v, want an error containing %q", tc.name, err, tc.want)
			}
		})
	}
}

func TestFactList(t *testing.T) {
	t.Parallel()
	list := FactList()
	seen := map[string]bool{}
	for _, f := range list {
		if f.Name == "" || f.Doc == "" || seen[f.Name] {
			t.Errorf("fact %+v: empty or repeated", f)
		}
		seen[f.Name] = true
	}
	// The facts the brief names must all be there.
	for _, name := range []string{"channel_m", "route_m", "riser_m", "slack_m", "rate_gbps", "future_rate_gbps", "max_emi",
		"emi_level", "outdoor", "has_aerial", "has_tunnel", "kind", "medium", "construction_outdoor_rated", "reach_m",
		"future_reach_m", "loss_db", "limit_db", "margin_db", "loss_margin_db", "allow_outdoor_copper"} {
		if !seen[name] {
			t.Errorf("fact %q missing", name)
		}
	}
}
