package main

import (
	"errors"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/route/plan"
	"spanwright/route/sweep"
)

// TestMessageShapes: one case per shape of input problem, for every file kind, checking the
// whole text: file:line:col (what is known of it), then the feature or item, then the key,
// then what was expected; each problem once, each one an *input.Problem.
func TestMessageShapes(t *testing.T) {
	t.Parallel()
	read := func(path string) []byte {
		data, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		return data
	}
	// replace returns the file at path with old replaced by new, and fails when old is not
	// in it (the fixture changed: update the case).
	replace := func(path, old, new string) []byte {
		data := string(read(path))
		if !strings.Contains(data, old) {
			t.Fatalf("%s: %q not found; update the case", path, old)
		}
		return []byte(strings.Replace(data, old, new, 1))
	}
	plan := func(text string) error { _, err := plan.ParsePlan("plan.yaml", []byte(text)); return err }
	// The sweep file sits beside the demo plan, its base.
	sweepFile := filepath.Join("..", "..", "testdata", "demo", "x.yaml")
	sweepText := func(text string) error {
		_, err := sweep.Parse(sweepFile, []byte("base: plan.yaml\n"+text))
		return err
	}
	catalog := func(data []byte) error { _, err := media.ParseCatalog("catalog.yaml", data); return err }
	rules := func(data []byte) error { _, err := media.ParseRules("rules.yaml", data); return err }
	prices := func(data []byte) error { _, err := media.ParsePriceBook("prices.yaml", data); return err }
	campus := func(text string) error { _, err := geo.Parse("campus.geojson", []byte(text)); return err }
	building := `{"type":"Feature","properties":{"id":"B-1","kind":"building"%s},"geometry":{"type":"Polygon","coordinates":[[[10,50],[10.001,50],[10.001,50.001],[10,50]]]}}`

	cases := []struct {
		name string
		err  error
		want string
	}{
		// Plan file: YAML 1.2.2 for the document, the README's Limits for the ranges.
		{"plan not YAML", plan("campus: ["), "plan.yaml:1: not YAML: did not find expected node content"},
		{"plan not a mapping", plan("- a\n"), "plan.yaml:1:1: want a mapping, got a list"},
		{"plan unknown key", plan("campus: [c]\nbudgit: 3\n"),
			"plan.yaml:2:1: budgit: unknown key; did you mean budget? want one of budget, campus, campus_database, catalog, defaults, design, hub, links, name, notes, prices, rules"},
		{"plan wrong type in a section", plan("campus: [c]\ndesign:\n  loss_margin_db: lots\n"),
			`plan.yaml:3:19: design.loss_margin_db: want a number, got "lots"`},
		{"plan number out of range in a link", plan("campus: [c]\nlinks:\n  - {to: A, strands: 20000}\n"),
			"plan.yaml:3:22: links[0].strands: want a whole number of strands from 0 to 10000, got 20000"},
		{"plan key given twice", plan("campus: [c]\nhub: A\nhub: B\n"), "plan.yaml:3:1: hub: given twice, at line 2 and line 3; remove one"},
		{"plan key missing", plan("name: x\n"), "plan.yaml: campus: missing; name at least one campus file (GeoJSON, or GeoPackage .gpkg), or a campus_database"},
		{"plan value not a choice", plan("campus: [c]\ndefaults: {redundancy: double}\n"),
			`plan.yaml:2:24: defaults.redundancy: want "none" or "diverse", got "double"`},
		{"plan text given as a number", plan("campus: [c]\nnotes: [3]\n"),
			`plan.yaml:2:9: notes[0]: want text, got 3, which YAML reads as a number; quote it ("3") to keep it as written`},
		{"plan amount", plan("campus: [c]\nbudget: 1.234\n"), `plan.yaml:2:9: budget: want an amount such as 1250000 or 99.95, got "1.234"`},

		// Sweep file: its own keys, and each override checked as the plan would check it.
		{"sweep unknown top key", sweepText("vary: {hub: [ADM]}\nextra: 1\n"),
			sweepFile + ":3:1: extra: unknown key; want one of base, cases, vary"},
		{"sweep override wrong type", sweepText("vary: {design.snap_m: [wide]}\n"),
			sweepFile + `:2:24: vary: design.snap_m: want a number, got "wide"`},
		{"sweep override out of range", sweepText("cases: [{name: c, design.slack_m: .nan}]\n"),
			sweepFile + `:2:35: case "c": design.slack_m: want metres from 0 to 1000, got NaN`},
		{"sweep case without a name", sweepText("cases: [{hub: ADM}]\n"), sweepFile + ":2:9: cases[0]: name: missing; every case needs a name"},

		// Catalog, rules and price book: an item and the key path inside it.
		{"catalog unknown key in an item", catalog(read("../../media/testdata/bad/unknown_field.yaml")),
			`catalog.yaml:8:5: medium "om4": colour: unknown key; want one of attenuation_db_per_km, constructions, id, jacket_colour, kind, name`},
		{"catalog key missing in an item", catalog(read("../../media/testdata/bad/missing_range.yaml")),
			`catalog.yaml:25:9: application "10GBASE-SR" on "om4": range_m: missing`},
		// TIA-568.3-D: a splice loses 0.3 dB at most; 1e308 dB is a slip.
		{"catalog number out of range", catalog(replace("../../media/catalog.yaml", "splice_db: 0.3", "splice_db: 1e308")),
			"catalog.yaml:18:14: connections.splice_db: want dB from 0 to 100, got 1e+308"},
		{"rules unknown fact", rules(read("../../media/testdata/rules/unknown_fact.yaml")),
			`rules.yaml:8:23: rule "reach": when: unknown fact "chanel_m"; did you mean "channel_m"?`},
		{"prices bad amount", prices(replace("../../media/prices-demo.yaml", "innerduct_per_m: 2.40", "innerduct_per_m: 2.405")),
			`prices.yaml:62:18: innerduct_per_m: want an amount >= 0 with at most two decimals, such as 12.35, got "2.405"`},

		// GeoJSON (RFC 7946): the whole file, or a feature by index and id and a property.
		{"campus not JSON", campus(`{"type":`), "campus.geojson: not JSON: unexpected end of JSON input (line 1, column 9)"},
		{"campus property out of range", campus(`{"type":"FeatureCollection","features":[` + strings.Replace(building, "%s", `,"riser_m":-3`, 1) + `]}`),
			`campus.geojson: feature #0 "B-1": property "riser_m": want metres from 0 to 1000, got -3`},
		{"campus geometry", campus(`{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"id":"P-1","kind":"pathway"},"geometry":null}]}`),
			`campus.geojson: feature #0 "P-1": geometry: missing (null or absent)`},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			var p *input.Problem
			if tc.err == nil || !errors.As(tc.err, &p) {
				t.Fatalf("got %v, want an *input.Problem", tc.err)
			}
			if got := tc.err.Error(); got != tc.want {
				t.Errorf("got\n%s\nwant\n%s", got, tc.want)
			}
		})
	}
}

// goWords are the marks of Go in a message: a package-qualified identifier (plan.Design),
// a Go type phrase ("in type", "into float64") or a YAML library tag (!!str).
var goWords = regexp.MustCompile(`\b(route|media|geo|sweep|input|optimize|install|workbook|yaml|json)\.[A-Z]\w*|\btype [a-z]+\.|\binto (float|int|string|bool|\[\])|\b(float64|int64|\[\]string|map\[)|!!(str|int|float|bool|map|seq|null)\b|cannot unmarshal`)

// TestNoGoInMessages runs every bad fixture (testdata/bad, this command's testdata/plans,
// the bad sweep files and the media package's bad catalogs and rule files) through the
// command that reads it, and checks that no message shows a Go identifier or phrase, and
// that no problem is printed twice.
func TestNoGoInMessages(t *testing.T) {
	t.Parallel()
	ok := "testdata/plans/ok.yaml"
	var runs [][]string
	glob := func(pattern string) []string {
		files, err := filepath.Glob(pattern)
		if err != nil || len(files) == 0 {
			t.Fatalf("%s: no fixtures (%v)", pattern, err)
		}
		return files
	}
	for _, f := range glob("../../testdata/bad/*.geojson") {
		runs = append(runs, []string{"check", f})
	}
	for _, f := range glob("testdata/plans/*.yaml") {
		runs = append(runs, []string{"check", f})
	}
	for _, f := range glob("../../testdata/sweep/*.yaml") {
		runs = append(runs, []string{"sweep", f, "--quiet", "--out", t.TempDir()})
	}
	for _, f := range glob("../../media/testdata/bad/*.yaml") {
		runs = append(runs, []string{"plan", ok, "--out", t.TempDir(), "--catalog", f})
	}
	for _, f := range glob("../../media/testdata/rules/*.yaml") {
		runs = append(runs, []string{"plan", ok, "--out", t.TempDir(), "--rules", f})
	}
	failed := 0
	for _, args := range runs {
		_, msg, code := run(t, args...)
		if code == exitOK {
			continue
		}
		failed++
		if m := goWords.FindString(msg); m != "" {
			t.Errorf("%s: message shows Go (%q):\n%s", strings.Join(args, " "), m, msg)
		}
		seen := map[string]bool{}
		for _, line := range strings.Split(msg, "\n") {
			if seen[line] && strings.TrimSpace(line) != "" {
				t.Errorf("%s: printed twice: %s", strings.Join(args, " "), line)
			}
			seen[line] = true
		}
	}
	if failed < 40 {
		t.Errorf("only %d of %d fixtures failed; the scan reads too little", failed, len(runs))
	}
}
