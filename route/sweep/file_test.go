package sweep

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"

	"spanwright/geo/input"
	"spanwright/route/plan"
)

const fixtures = "../../testdata/sweep"

func load(t *testing.T, name string) *File {
	t.Helper()
	f, err := Load(filepath.Join(fixtures, name))
	if err != nil {
		t.Fatal(err)
	}
	return f
}

func TestExpandOrderAndIDs(t *testing.T) {
	t.Parallel()
	f := load(t, "sweep.yaml")
	sc := f.Scenarios()
	if len(sc) != 2*2*2*2+2 {
		t.Fatalf("got %d scenarios, want 18", len(sc))
	}
	// The first axis varies slowest, values in file order, then the cases.
	want := []string{
		"hub=ADM defaults.rate=10G prices=prices-low.yaml design.allow_new_trench=true",
		"hub=ADM defaults.rate=10G prices=prices-low.yaml design.allow_new_trench=false",
		"hub=ADM defaults.rate=10G prices=prices-high.yaml design.allow_new_trench=true",
	}
	for i, w := range want {
		if got := sc[i].Describe(); got != w {
			t.Errorf("scenario %d: got %q, want %q", i, got, w)
		}
	}
	if got := sc[8].Describe(); !strings.HasPrefix(got, "hub=ENG defaults.rate=10G prices=prices-low.yaml") {
		t.Errorf("scenario 8: got %q, want the second hub's first", got)
	}
	if got := sc[16].Describe(); got != "case all-diverse: defaults.redundancy=diverse" {
		t.Errorf("scenario 16: got %q", got)
	}
	if sc[17].Case != "bad-hub" {
		t.Errorf("scenario 17: got case %q, want bad-hub", sc[17].Case)
	}
	for i, s := range sc {
		if s.Index != i {
			t.Errorf("scenario %d has index %d", i, s.Index)
		}
	}
	// The id is the slug and the first 8 hex digits of the SHA-256 of the canonical list:
	// sorted "key=JSON value" lines.
	canon := "defaults.rate=\"10G\"\ndesign.allow_new_trench=true\nhub=\"ADM\"\nprices=\"prices-low.yaml\"\n"
	sum := sha256.Sum256([]byte(canon))
	wantID := "adm-10g-prices-low-allow_new_trench-" + hex.EncodeToString(sum[:])[:8]
	if sc[0].ID != wantID {
		t.Errorf("id: got %q, want %q", sc[0].ID, wantID)
	}
	if !strings.HasPrefix(sc[1].ID, "adm-10g-prices-low-no-allow_new_trench-") {
		t.Errorf("id of a false value: got %q", sc[1].ID)
	}
	if !strings.HasPrefix(sc[16].ID, "all-diverse-") {
		t.Errorf("id of a case: got %q", sc[16].ID)
	}
	// Cross-check the hash with GNU coreutils sha256sum.
	if path, err := exec.LookPath("sha256sum"); err == nil {
		cmd := exec.Command(path)
		cmd.Stdin = strings.NewReader(canon)
		out, err := cmd.Output()
		if err != nil || !strings.HasPrefix(string(out), wantID[len(wantID)-8:]) {
			t.Errorf("sha256sum: got %q (%v), want it to start %s", out, err, wantID[len(wantID)-8:])
		}
	}
	if got, want := strings.Join(f.Keys(), ","), "hub,defaults.rate,prices,design.allow_new_trench,defaults.redundancy"; got != want {
		t.Errorf("keys: got %s, want %s", got, want)
	}
}

// TestIDCanonical checks that how a value is written does not change the id.
func TestIDCanonical(t *testing.T) {
	t.Parallel()
	ids := func(src string) []string {
		t.Helper()
		f := parseInline(t, src)
		var out []string
		for _, s := range f.Scenarios() {
			out = append(out, s.ID)
		}
		return out
	}
	cases := []struct{ name, a, b string }{
		{"float written as integer", "vary: {design.snap_m: [1]}", "vary: {design.snap_m: [1.0]}"},
		{"money with decimals", "vary: {budget: [850000]}", "vary: {budget: [850000.00]}"},
		{"quoted text", "vary: {hub: [ADM]}", "vary: {hub: ['ADM']}"},
		{"override order", "cases: [{name: c, hub: ADM, defaults.rate: 10G}]", "cases: [{name: c, defaults.rate: 10G, hub: ADM}]"},
		{"yes for true", "vary: {design.allow_new_trench: [true]}", "vary: {design.allow_new_trench: [yes]}"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			a, b := ids(tc.a), ids(tc.b)
			if strings.Join(a, ",") != strings.Join(b, ",") {
				t.Errorf("%s: ids differ: %v and %v", tc.name, a, b)
			}
		})
	}
	if a, b := ids("vary: {hub: [ADM]}"), ids("cases: [{name: adm, hub: ADM}]"); a[0] != b[0] {
		t.Errorf("a case named like the product's slug: got %s and %s, want the same id", a[0], b[0])
	}
	long := ids("cases: [{name: " + strings.Repeat("very-long-name-", 10) + ", hub: ADM}]")[0]
	if slug := long[:len(long)-9]; len(slug) > maxSlug || strings.HasSuffix(slug, "-") {
		t.Errorf("long slug: got %q", long)
	}
}

// parseInline parses a sweep file whose base is the demo plan.
func parseInline(t *testing.T, body string) *File {
	t.Helper()
	abs, err := filepath.Abs("../../testdata/demo/plan.yaml")
	if err != nil {
		t.Fatal(err)
	}
	f, err := Parse(filepath.Join(fixtures, "inline.yaml"), []byte("base: "+abs+"\n"+body+"\n"))
	if err != nil {
		t.Fatal(err)
	}
	return f
}

func TestParseErrors(t *testing.T) {
	t.Parallel()
	_, err := Load(filepath.Join(fixtures, "bad.yaml"))
	if err == nil {
		t.Fatal("bad.yaml: got no error")
	}
	if !errors.Is(err, ErrInvalid) {
		t.Errorf("bad.yaml: error does not match ErrInvalid: %v", err)
	}
	want := []struct {
		text     string
		sentinel error
	}{
		{"bad.yaml:5:3: vary: defaults.speed: unknown key; did you mean defaults.rate? want one of budget,", ErrUnknownKey},
		{`bad.yaml:6:24: vary: design.snap_m: want a number, got "wide"`, ErrWrongType},
		{`bad.yaml:7:28: vary: design.allow_new_trench: want a non-empty list of values, got "yes"`, ErrWrongType},
		{`bad.yaml:9:44: case "strands-text": defaults.strands: want an integer, got "many"`, ErrWrongType},
		{`bad.yaml:10:12: case "strands-text": name: used twice: the case at line 9 has the same name`, ErrDuplicate},
		{"bad.yaml:11:5: cases[2]: name: missing; every case needs a name", nil},
		{`bad.yaml:12:19: case "links": links: unknown key;`, ErrUnknownKey},
		{`bad.yaml:13:33: case "budget-list": budget: want an amount such as 1250000 or 99.95, got a list`, ErrWrongType},
	}
	var list *input.Problems
	if !errors.As(err, &list) || len(list.List) != len(want) {
		t.Fatalf("bad.yaml: got %v, want %d errors", err, len(want))
	}
	for i, w := range want {
		got := list.List[i].Error()
		if !strings.Contains(got, w.text) {
			t.Errorf("error %d: got %q, want it to contain %q", i, got, w.text)
		}
		if w.sentinel != nil && !errors.Is(list.List[i], w.sentinel) {
			t.Errorf("error %d: %v does not match %v", i, got, w.sentinel)
		}
	}

	inline := []struct{ name, src, want string }{
		{"no base", "vary: {hub: [ADM]}", "base: missing"},
		{"base missing", "base: nowhere.yaml\nvary: {hub: [ADM]}", "nowhere.yaml: no such file"},
		{"base not a plan", "base: bad-base.yaml\nvary: {hub: [ADM]}", "bad-base.yaml:2:1: want a mapping of plan keys, got a list"},
		{"nothing to sweep", "base: ../demo/plan.yaml", "nothing to sweep"},
		{"empty sections", "base: ../demo/plan.yaml\nvary: {}\ncases: []", "nothing to sweep"},
		// A misspelt dotted key gets the hint a plan's key gets (input.DidYouMean).
		{"dotted key typo", "base: ../demo/plan.yaml\nvary: {design.snap_mm: [1]}", "x.yaml:2:8: vary: design.snap_mm: unknown key; did you mean design.snap_m? want one of budget,"},
		{"section typo", "base: ../demo/plan.yaml\ncases: [{name: c, desgin.slack_m: 3}]", `x.yaml:2:19: case "c": desgin.slack_m: unknown key; did you mean design.slack_m? want one of budget,`},
		{"unknown top key", "base: ../demo/plan.yaml\nvary: {hub: [ADM]}\nextra: 1", "x.yaml:3:1: extra: unknown key; want one of base, cases, vary"},
		{"not a mapping", "[1, 2]", "x.yaml:1:1: want a mapping, got a list"},
		{"a plan file", "name: p\ncampus: [c.geojson]\nhub: ADM\n", "x.yaml:2:1: campus: this is a plan file (it has campus: and no base:, vary: or cases:), not a sweep file; run `spanwright plan "},
		{"a plan of a database", "campus_database: {table: t}\n", "campus_database: this is a plan file"},
		{"not YAML", "base: [", "not YAML"},
		{"empty axis", "base: ../demo/plan.yaml\nvary: {hub: []}", "x.yaml:2:13: vary: hub: want a non-empty list of values, got an empty list"},
		{"same scenario twice", "base: ../demo/plan.yaml\nvary: {hub: [ADM, ADM]}", `x.yaml:2: vary: scenario id "adm-4de93e1a" used twice: scenario 0 (hub=ADM) has the same overrides`},
		{"campus not a name", "base: ../demo/plan.yaml\ncases: [{name: c, campus: [1]}]", `x.yaml:2:27: case "c": campus: want a file name or a list of file names, got a list`},
		{"defaults alone", "base: ../demo/plan.yaml\ncases: [{name: c, defaults: {rate: 10G}}]", `case "c": defaults: unknown key`},
		{"mapping for text", "base: ../demo/plan.yaml\nvary: {hub: [{a: 1}]}", "x.yaml:2:14: vary: hub: want a string, got a mapping"},
		// YAML 1.2.2 §3.2.1.1: the keys of a mapping are unique; yaml.v3 keeps the last.
		{"base twice", "base: ../demo/plan.yaml\nvary: {hub: [ADM]}\nbase: other.yaml", "x.yaml:3:1: base: given twice, at line 1 and line 3; remove one"},
		{"axis twice", "base: ../demo/plan.yaml\nvary:\n  hub: [ADM]\n  hub: [LIB]", "x.yaml:4:3: vary.hub: given twice, at line 3 and line 4; remove one"},
		{"case key twice", "base: ../demo/plan.yaml\ncases:\n  - name: c\n    hub: ADM\n    hub: LIB", "x.yaml:5:5: cases[0].hub: given twice, at line 4 and line 5; remove one"},
		{"base plan key twice", "base: dup-base.yaml\nvary: {hub: [ADM]}", "dup-base.yaml:3:1: hub: given twice, at line 2 and line 3; remove one"},
		// IEEE 754: NaN fails every comparison; each value is checked against the plan's range.
		{"NaN value", "base: ../demo/plan.yaml\nvary: {design.slack_m: [1, .nan]}", "x.yaml:2:28: vary: design.slack_m: want metres from 0 to 1000, got NaN"},
		{"infinite value", "base: ../demo/plan.yaml\ncases: [{name: c, design.max_lateral_m: .inf}]", `x.yaml:2:41: case "c": design.max_lateral_m: want metres above 0 and at most 1000, got +Inf`},
		{"strands overflow", "base: ../demo/plan.yaml\nvary: {defaults.strands: [9223372036854775807]}", "defaults.strands: want a whole number of strands from 1 to 10000, got 9223372036854775807"},
		// Linux null(4): /dev/zero never ends.
		{"base a device", "base: /dev/zero\nvary: {hub: [ADM]}", "base: read /dev/zero: not a regular file but a character device"},
	}
	for _, tc := range inline {
		t.Run(tc.name, func(t *testing.T) {
			_, err := Parse(filepath.Join(fixtures, "x.yaml"), []byte(tc.src))
			if err == nil || !strings.Contains(err.Error(), tc.want) || !errors.Is(err, ErrInvalid) {
				t.Errorf("%s: got %v, want an invalid sweep error containing %q", tc.name, err, tc.want)
			}
		})
	}
}

// TestLoadRefusesUnboundedInput: the sweep file is a regular file under the cap.
func TestLoadRefusesUnboundedInput(t *testing.T) {
	t.Parallel()
	small := filepath.Join(fixtures, "small.yaml")
	for _, tc := range []struct {
		path string
		max  int64
		is   error
		want string
	}{
		// Linux null(4): /dev/zero never ends.
		{"/dev/zero", 0, input.ErrNotRegular, "/dev/zero: read: not a regular file but a character device"},
		{small, 10, input.ErrTooLarge, small + ": read: larger than the input limit of 10 bytes (raise it with --max-input-mb)"},
	} {
		_, err := LoadLimit(tc.path, tc.max)
		if !errors.Is(err, tc.is) || !errors.Is(err, ErrInvalid) || !strings.Contains(fmt.Sprint(err), tc.want) {
			t.Errorf("%s: got %v, want %q", tc.path, err, tc.want)
		}
	}
}

// TestApply checks the plan a scenario's overrides make, read back with plan.ParsePlan.
func TestApply(t *testing.T) {
	t.Parallel()
	base := "name: p\ncampus: [c.geojson]\nhub: ADM\ndesign: {snap_m: 0.5}\n"
	cases := []struct {
		name  string
		cases string
		check func(p *plan.Plan) string
	}{
		{"nested key set", "{name: a, design.snap_m: 2, defaults.rate: 25G}", func(p *plan.Plan) string {
			if p.Design.SnapM != 2 || p.Defaults.Rate != "25G" || p.Design.MaxLateralM != plan.Default.Design.MaxLateralM {
				return "design and defaults not set"
			}
			return ""
		}},
		{"null removes", "{name: a, hub: ~}", func(p *plan.Plan) string {
			if p.Hub != "" {
				return "hub kept: " + p.Hub
			}
			return ""
		}},
		{"file relative to the sweep file", "{name: a, prices: sub/p.yaml, campus: [x.geojson, y.geojson]}", func(p *plan.Plan) string {
			if p.Path(p.Prices) != filepath.Join("sweepdir", "sub", "p.yaml") {
				return "prices at " + p.Path(p.Prices)
			}
			if p.Path(p.Campus[1]) != filepath.Join("sweepdir", "y.geojson") {
				return "campus at " + p.Path(p.Campus[1])
			}
			return ""
		}},
		{"base file relative to the base", "{name: a, hub: ENG}", func(p *plan.Plan) string {
			if p.Path(p.Campus[0]) != filepath.Join("plandir", "c.geojson") {
				return "campus at " + p.Path(p.Campus[0])
			}
			return ""
		}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			dir := t.TempDir()
			os.MkdirAll(filepath.Join(dir, "plandir"), 0o755)
			os.MkdirAll(filepath.Join(dir, "sweepdir"), 0o755)
			os.WriteFile(filepath.Join(dir, "plandir", "plan.yaml"), []byte(base), 0o644)
			f, err := Parse(filepath.Join(dir, "sweepdir", "s.yaml"), []byte("base: ../plandir/plan.yaml\ncases: ["+tc.cases+"]\n"))
			if err != nil {
				t.Fatal(err)
			}
			r, err := newRunner(f, Options{Out: filepath.Join(dir, "out")})
			if err != nil {
				t.Fatal(err)
			}
			data, err := r.planYAML(f.Scenarios()[0])
			if err != nil {
				t.Fatal(err)
			}
			p, err := plan.ParsePlan(filepath.Join(dir, "out", "x", PlanFile), data)
			if err != nil {
				t.Fatalf("%s: %v\n%s", tc.name, err, data)
			}
			// Paths, relative to the scenario folder, resolve to the files named.
			rel := func(s string) string {
				r, _ := filepath.Rel(dir, s)
				return r
			}
			p.Dir = filepath.Join(dir, "out", "x")
			for i := range p.Campus {
				p.Campus[i] = rel(p.Path(p.Campus[i]))
			}
			if p.Prices != "" {
				p.Prices = rel(p.Path(p.Prices))
			}
			p.Dir = ""
			if msg := tc.check(p); msg != "" {
				t.Errorf("%s: %s\n%s", tc.name, msg, data)
			}
			var doc yaml.Node
			if err := yaml.Unmarshal(data, &doc); err != nil || !strings.Contains(doc.HeadComment, "scenario "+f.Scenarios()[0].ID) {
				t.Errorf("%s: plan does not name its scenario: %q", tc.name, doc.HeadComment)
			}
		})
	}
}

func TestParseShard(t *testing.T) {
	t.Parallel()
	cases := []struct {
		in   string
		want Shard
		ok   bool
	}{{"1/1", Shard{1, 1}, true}, {"3/8", Shard{3, 8}, true}, {"0/4", Shard{}, false}, {"5/4", Shard{}, false}, {"2", Shard{}, false}, {"a/b", Shard{}, false}}
	for _, tc := range cases {
		t.Run(tc.in, func(t *testing.T) {
			got, err := ParseShard(tc.in)
			if (err == nil) != tc.ok || got != tc.want {
				t.Errorf("%q: got %v, %v; want %v, ok %v", tc.in, got, err, tc.want, tc.ok)
			}
		})
	}
	s := Shard{2, 3}
	var mine []int
	for i := 0; i < 9; i++ {
		if s.Has(i) {
			mine = append(mine, i)
		}
	}
	if len(mine) != 3 || mine[0] != 1 || mine[1] != 4 || mine[2] != 7 {
		t.Errorf("shard 2/3 of 9: got %v, want [1 4 7]", mine)
	}
}

// TestFolderNamesOfNumbers checks the folder names of numeric axes: readable (the key's last
// part and the number as a person writes it), stable (a fixed id for a fixed value), unique
// across values that used to share a readable part (0.05 and 0-5-style joins of several
// axes; 1e21 and 1e-21 were both 1e-21) and across letter case, and safe as folder names on Linux, macOS and Windows: only
// a-z, 0-9, dot, underscore and hyphen (the POSIX portable file name character set, IEEE Std
// 1003.1 §3.282, without upper case), no leading dot or hyphen, no trailing dot, no device
// name before a dot (Microsoft, "Naming Files, Paths, and Namespaces", from memory).
func TestFolderNamesOfNumbers(t *testing.T) {
	t.Parallel()
	f := parseInline(t, "vary: {design.loss_margin_db: [0, 0.5, 0.05, 5, 50, 1e-3, 0.0001, 1e-7, 12.25, 3.0e-5], design.reel_m: [4000, 1e5], budget: [850000]}")
	portable := regexp.MustCompile(`^[a-z0-9][a-z0-9._-]*[a-z0-9]$`)
	slugs, ids := map[string]string{}, map[string]bool{}
	for _, s := range f.Scenarios() {
		if !portable.MatchString(s.ID) || len(s.ID) > maxSlug+1+IDLen {
			t.Errorf("%s: not a portable folder name of at most %d bytes", s.ID, maxSlug+1+IDLen)
		}
		if dev, _, _ := strings.Cut(s.ID, "."); windowsDevice[dev] {
			t.Errorf("%s: a Windows device name", s.ID)
		}
		slug := s.ID[:len(s.ID)-IDLen-1]
		if other, ok := slugs[slug]; ok {
			t.Errorf("%s and %s share the readable part %s", other, s.ID, slug)
		}
		slugs[slug] = s.ID
		ids[strings.ToLower(s.ID)] = true
	}
	if len(ids) != len(f.Scenarios()) || len(ids) != 20 {
		t.Errorf("%d distinct ids ignoring case for %d scenarios, want 20", len(ids), len(f.Scenarios()))
	}
	for _, want := range []string{"loss_margin_db-0-reel_m-4000-budget-850000-", "loss_margin_db-0.5-reel_m-4000-budget-850000-", "loss_margin_db-0.05-reel_m-4000-budget-850000-",
		"loss_margin_db-0.001-reel_m-4000-budget-850000-", "loss_margin_db-0.0001-reel_m-4000-budget-850000-", "loss_margin_db-1e-7-reel_m-4000-budget-850000-",
		"loss_margin_db-3e-5-reel_m-4000-budget-850000-", "loss_margin_db-12.25-reel_m-100000-budget-850000-"} {
		found := false
		for slug := range slugs {
			found = found || slug+"-" == want
		}
		if !found {
			t.Errorf("no folder named %s…", want)
		}
	}
	// Stable: the id of one value is pinned (the hash part from GNU coreutils:
	// printf 'design.loss_margin_db=0.5\n' | sha256sum, first 8 digits).
	if one := parseInline(t, "vary: {design.loss_margin_db: [0.5]}").Scenarios()[0].ID; one != "loss_margin_db-0.5-0d2df158" {
		t.Errorf("id of 0.5: got %s, want loss_margin_db-0.5-0d2df158", one)
	}
	for _, tc := range []struct{ canon, want string }{
		{"0.5", "0.5"}, {"1e-07", "1e-7"}, {"1e+21", "1e21"}, {"2.5e+21", "2.5e21"}, {"-0.25", "minus0.25"}, {"100000", "100000"}, {"0", "0"},
	} {
		if got := numberSlug(tc.canon); got != tc.want {
			t.Errorf("numberSlug(%s): got %s, want %s", tc.canon, got, tc.want)
		}
	}
	if id := ScenarioID("con.5", nil); strings.HasPrefix(id, "con.") {
		t.Errorf("case con.5: id %s is a Windows device name", id)
	}
}
