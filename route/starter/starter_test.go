package starter_test

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route"
	"spanwright/route/plan"
	"spanwright/route/routing"
	"spanwright/route/site"
	"spanwright/route/starter"
)

// TestStarterPlans writes the starter files and plans them as `spanwright plan` would: every
// leg feasible, priced from the template (not the embedded demo book), and the starter shows
// what the kinds of pathway do: a diverse link, a pole line, a tunnel and new trench.
func TestStarterPlans(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "new", "folder")
	written, err := starter.Write(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(written) != len(starter.Names) {
		t.Fatalf("wrote %v, want %v", written, starter.Names)
	}
	p, err := plan.LoadPlan(filepath.Join(dir, starter.PlanFile))
	if err != nil {
		t.Fatal(err)
	}
	files := make([]string, len(p.Campus))
	for i, f := range p.Campus {
		files[i] = p.Path(f)
	}
	st, err := site.Load(context.Background(), nil, files, site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
	if err != nil {
		t.Fatal(err)
	}
	if len(st.Net.Warnings) > 0 {
		t.Errorf("starter campus warnings: %v", st.Net.Warnings)
	}
	res, err := route.Solve(context.Background(), st, p)
	if err != nil {
		t.Fatal(err)
	}
	if err := res.Infeasible(); err != nil {
		t.Fatalf("starter plan: %v", err)
	}
	if f := res.Engine.PriceBook().File; f == media.DefaultPricesFile || !strings.HasSuffix(f, "prices.yaml") {
		t.Errorf("price book %s, want the template prices.yaml", f)
	}
	if len(res.Opened) == 0 {
		t.Error("no new trench: the starter should show new construction")
	}
	types := map[string]bool{}
	diverse := 0
	for _, l := range res.Legs {
		if l.Name == routing.LegDiverse {
			diverse++
		}
		for _, step := range l.Steps {
			sp, _ := st.Net.Span(step.SpanID)
			types[sp.Type] = true
		}
	}
	if diverse != 1 || !types[geo.TypeAerial] || !types[geo.TypeTunnel] || !types[geo.TypeDuct] {
		t.Errorf("diverse legs %d, pathway types used %v: want one diverse leg over duct, tunnel and aerial", diverse, types)
	}
}

// TestStarterNeverReplaces checks that Write refuses a folder holding any starter file,
// names every one, and writes nothing.
func TestStarterNeverReplaces(t *testing.T) {
	dir := t.TempDir()
	mine := []byte("my own plan\n")
	if err := os.WriteFile(filepath.Join(dir, "plan.yaml"), mine, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink("nowhere", filepath.Join(dir, "prices.yaml")); err != nil {
		t.Fatal(err)
	}
	_, err := starter.Write(dir)
	if !errors.Is(err, starter.ErrExists) {
		t.Fatalf("got %v, want ErrExists", err)
	}
	for _, n := range []string{"plan.yaml", "prices.yaml"} {
		if !strings.Contains(err.Error(), filepath.Join(dir, n)) {
			t.Errorf("error %q does not name %s", err, n)
		}
	}
	if got, _ := os.ReadFile(filepath.Join(dir, "plan.yaml")); !bytes.Equal(got, mine) {
		t.Error("plan.yaml was replaced")
	}
	if _, err := os.Lstat(filepath.Join(dir, "campus.geojson")); err == nil {
		t.Error("campus.geojson written although the folder was refused")
	}
	ents, _ := os.ReadDir(dir)
	if len(ents) != 2 {
		t.Errorf("folder holds %d entries, want the 2 it had", len(ents))
	}
}

// TestTemplateExplainsEveryKey checks the price-book template: it parses, holds every
// top-level key of the embedded demo book (which uses every section the price book knows),
// and each top-level key has a comment on its line or in the lines just above it; the plan's
// top-level keys likewise.
func TestTemplateExplainsEveryKey(t *testing.T) {
	data, err := starter.File("prices.yaml")
	if err != nil {
		t.Fatal(err)
	}
	if _, err := media.ParsePriceBook("prices.yaml", data); err != nil {
		t.Fatal(err)
	}
	demo, err := os.ReadFile("../../media/prices-demo.yaml")
	if err != nil {
		t.Fatal(err)
	}
	have := explained(t, "prices.yaml", data)
	for k := range topKeys(demo) {
		if !have[k] {
			t.Errorf("prices.yaml: key %s of the demo book missing from the template", k)
		}
	}
	plan, err := starter.File("plan.yaml")
	if err != nil {
		t.Fatal(err)
	}
	explained(t, "plan.yaml", plan)
}

// topKeys lists the keys at the start of a line (a YAML mapping's top level).
func topKeys(data []byte) map[string]bool {
	keys := map[string]bool{}
	sc := bufio.NewScanner(bytes.NewReader(data))
	for sc.Scan() {
		l := sc.Text()
		if l == "" || l[0] == ' ' || l[0] == '#' || l[0] == '-' {
			continue
		}
		if k, _, ok := strings.Cut(l, ":"); ok {
			keys[k] = true
		}
	}
	return keys
}

// explained returns the top-level keys of a file and fails on one with no comment on its
// line or in the block of comment lines just above it.
func explained(t *testing.T, name string, data []byte) map[string]bool {
	t.Helper()
	keys := map[string]bool{}
	lines := strings.Split(string(data), "\n")
	for i, l := range lines {
		if l == "" || l[0] == ' ' || l[0] == '#' || l[0] == '-' {
			continue
		}
		k, _, ok := strings.Cut(l, ":")
		if !ok {
			continue
		}
		keys[k] = true
		above := i > 0 && strings.HasPrefix(lines[i-1], "#")
		// A key in a group of keys under one comment (no blank line between) shares it.
		for j := i - 1; !above && j >= 0 && lines[j] != "" && !strings.HasPrefix(lines[j], "#"); j-- {
			above = j > 0 && strings.HasPrefix(lines[j-1], "#")
		}
		if !strings.Contains(l, "#") && !above {
			t.Errorf("%s:%d: key %s has no comment", name, i+1, k)
		}
	}
	return keys
}

// templateKey is a key line of a starter file, live or commented out ("# key: value"):
// its indent, name and whether a comment holds it.
var templateKey = regexp.MustCompile(`^(#\s?)?( *)([a-z][a-z0-9_]*):(\s|$)`)

// TestTemplateKeysOnce checks that each starter file gives every key once, counting the
// keys commented out, which a comment invites the user to uncomment: a key both
// commented and live (review: tester 15 F13, maintenance_hole_entry_each at two prices
// with two paragraphs) would be refused as given twice once uncommented. And each
// commented key of the price book, uncommented alone, parses (a key of the book, not
// given live as well). Common practice, no published source: one key, one paragraph.
func TestTemplateKeysOnce(t *testing.T) {
	for _, name := range []string{"prices.yaml", "plan.yaml"} {
		data, err := starter.File(name)
		if err != nil {
			t.Fatal(err)
		}
		lines := strings.Split(string(data), "\n")
		at := map[string]int{}
		var parents []string // the key path by indent, a level per two spaces
		commented := 0
		for i, l := range lines {
			m := templateKey.FindStringSubmatch(l)
			if m == nil {
				continue
			}
			depth := len(m[2]) / 2
			if depth > len(parents) {
				depth = len(parents)
			}
			parents = append(parents[:depth], m[3])
			path := strings.Join(parents, ".")
			if first, ok := at[path]; ok {
				t.Errorf("%s: key %s at line %d and again at line %d", name, path, first, i+1)
			}
			at[path] = i + 1
			if m[1] == "" || name != "prices.yaml" {
				continue
			}
			commented++
			un := slices.Clone(lines)
			un[i] = strings.TrimPrefix(strings.TrimPrefix(l, "#"), " ")
			if _, err := media.ParsePriceBook(name, []byte(strings.Join(un, "\n"))); err != nil {
				t.Errorf("%s:%d: uncommenting %s: %v", name, i+1, m[3], err)
			}
		}
		if name == "prices.yaml" && commented == 0 {
			t.Errorf("%s: no commented key found: the test reads the template's form wrongly", name)
		}
	}
}

// TestTemplateSmallItems (tester 15 F14): the template offers, commented out, the small items
// every US outside-plant bid carries (tracer wire and warning tape over new buried work:
// common practice, no published source) as bid items per metre of new trench and bore, and the
// bonding of metallic members at entrances (NFPA 70 770.93, from memory); each example is a
// valid entry once its # is taken off, and says where pull tape and duct plugs are priced.
func TestTemplateSmallItems(t *testing.T) {
	data, err := starter.File("prices.yaml")
	if err != nil {
		t.Fatal(err)
	}
	text := string(data)
	for _, want := range []string{"  # - {id: tracer-wire,", "  # - {id: warning-tape,", "# metallic_member_bonding_each: ", "Pull tape", "Duct plugs"} {
		if !strings.Contains(text, want) {
			t.Errorf("template lacks %q", want)
		}
	}
	on := strings.NewReplacer("  # - {id: tracer-wire,", "  - {id: tracer-wire,", "  # - {id: warning-tape,", "  - {id: warning-tape,",
		"# metallic_member_bonding_each: ", "metallic_member_bonding_each: ").Replace(text)
	p, err := media.ParsePriceBook("prices.yaml", []byte(on))
	if err != nil {
		t.Fatalf("the template with its examples taken in: %v", err)
	}
	var ids []string
	for _, b := range p.BidItems {
		if b.Basis == media.BasisNewBuriedM {
			ids = append(ids, b.ID)
		}
	}
	if got := strings.Join(ids, ","); got != "locates,tracer-wire,warning-tape" {
		t.Errorf("bid items per metre of new buried work %q, want locates,tracer-wire,warning-tape", got)
	}
	if p.NotPriced(media.PriceKey{Item: media.PriceBonding}) {
		t.Error("metallic_member_bonding_each taken in but not priced")
	}
}
