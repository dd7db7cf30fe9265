package main

import (
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"strings"
	"testing"

	"spanwright/geo/crs"
	"spanwright/route/plan"
)

// starterWith writes the starter files to a new folder and returns it: the invented campus,
// its plan and the price-book template.
func starterWith(t *testing.T) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "mine")
	if _, msg, code := run(t, "starter", dir); code != exitOK {
		t.Fatalf("starter: exit %d: %s", code, msg)
	}
	return dir
}

// addFarBuilding adds to the starter campus a building SILO about 1 km from every pathway, far
// beyond the plan's max_lateral_m of 30 m, as the last feature (#16).
func addFarBuilding(t *testing.T, dir string) {
	t.Helper()
	path := filepath.Join(dir, "campus.geojson")
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var fc map[string]any
	if err := json.Unmarshal(data, &fc); err != nil {
		t.Fatal(err)
	}
	feats := fc["features"].([]any)
	feats = append(feats, map[string]any{"type": "Feature",
		"properties": map[string]any{"kind": "building", "id": "SILO", "name": "Grain silo"},
		"geometry": map[string]any{"type": "Polygon", "coordinates": [][][]float64{{
			{6.995, 46.53}, {6.9951, 46.53}, {6.9951, 46.5301}, {6.995, 46.5301}, {6.995, 46.53}}}}})
	fc["features"] = feats
	if data, err = json.Marshal(fc); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
}

// editFile replaces old by new in dir/name, once; the test fails when old is not there.
func editFile(t *testing.T, dir, name, old, new string) {
	t.Helper()
	path := filepath.Join(dir, name)
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(data), old) {
		t.Fatalf("%s has no %q", name, old)
	}
	if err := os.WriteFile(path, []byte(strings.Replace(string(data), old, new, 1)), 0o644); err != nil {
		t.Fatal(err)
	}
}

// wantLines checks that msg holds every line of want, each once, and nothing was written to out.
func wantLines(t *testing.T, what, msg, out string, want []string) {
	t.Helper()
	for _, w := range want {
		if n := strings.Count(msg, w); n != 1 {
			t.Errorf("%s: %q given %d times, want once, in:\n%s", what, w, n, msg)
		}
	}
	if got := len(strings.Split(strings.TrimSpace(msg), "\n")); got != len(want) {
		t.Errorf("%s: %d lines, want %d:\n%s", what, got, len(want), msg)
	}
	if out == "" {
		return
	}
	if _, err := os.Stat(out); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("%s: the refused run made its output folder %s (%v)", what, out, err)
	}
}

// TestEveryInputProblemAtOnce (tester 10, F8): four mistakes in four files, each of which
// used to hide the next (a misspelt design key, a served building no pathway reaches, a
// transceiver price the catalog needs, the added-duct price the routes need), come out in
// one run of plan and of check: exit status 2, one line each naming the file and the
// feature (index and id) or line:col, the key and what was expected, and nothing written.
// The rule is the project's ("errors ... all at once"), not a standard's.
func TestEveryInputProblemAtOnce(t *testing.T) {
	dir := starterWith(t)
	addFarBuilding(t, dir)
	editFile(t, dir, "plan.yaml", "  snap_m: 0.5 ", "  allow_outdoor_coper: true\n  snap_m: 0.5 ")
	withoutKeys(t, dir, regexp.MustCompile(`^added_duct_per_m:`))
	editFile(t, dir, "prices.yaml", "  1000BASE-LX: 25.00\n", "")
	plan, campus, book := filepath.Join(dir, "plan.yaml"), filepath.Join(dir, "campus.geojson"), filepath.Join(dir, "prices.yaml")
	want := []string{
		plan + `:25:3: design.allow_outdoor_coper: unknown key; did you mean allow_outdoor_copper?`,
		campus + `: feature #16 "SILO": no pathway within 30 m of the footprint (design: max_lateral_m); the plan serves it (its default link HALL-SILO): draw a pathway (or an entrance on one) within reach of it, or raise design.max_lateral_m, or skip the link ({to: SILO, skip: true} in links)`,
		book + `: price "transceiver 1000BASE-LX": missing; add transceivers.1000BASE-LX`,
		book + `: price "added-duct": missing; add added_duct_per_m`,
	}
	out := filepath.Join(dir, "out")
	planAndCheckRefused(t, plan, out, want)

	// The plan right, the rest not: the campus and the price book still come out together.
	editFile(t, dir, "plan.yaml", "  allow_outdoor_coper: true\n", "")
	_, msg, code := run(t, "plan", plan, "--out", out)
	if code != exitInvalid {
		t.Fatalf("plan right: exit %d, want %d: %s", code, exitInvalid, msg)
	}
	wantLines(t, "plan right", msg, out, want[1:])
}

// planAndCheckRefused runs plan (into out) and check on the plan file, and checks that each
// exits 2 with the lines of want, each once, and that plan wrote nothing.
func planAndCheckRefused(t *testing.T, plan, out string, want []string) {
	t.Helper()
	_, msg, code := run(t, "plan", plan, "--out", out)
	if code != exitInvalid {
		t.Fatalf("plan: exit %d, want %d: %s", code, exitInvalid, msg)
	}
	wantLines(t, "plan", msg, out, want)
	_, msg, code = run(t, "check", plan)
	if code != exitInvalid {
		t.Fatalf("check: exit %d, want %d: %s", code, exitInvalid, msg)
	}
	wantLines(t, "check", msg, "", want)
}

// TestSkippedBuildingNeedsNoEntrance (tester 10, F9): a building no pathway reaches stops no
// plan that does not serve it. With its link skipped, plan writes the plan of the rest (exit
// 0, as without the building) with one warning naming the building's feature, and check
// exits 0 too; served, plan is refused (exit 2, nothing written) with the fix named
// (TestEveryInputProblemAtOnce). Common practice, no published source: a campus GIS layer
// holds buildings no backbone serves.
func TestSkippedBuildingNeedsNoEntrance(t *testing.T) {
	dir := starterWith(t)
	addFarBuilding(t, dir)
	editFile(t, dir, "plan.yaml", "  - {to: MAST, rate: 1G}", "  - {to: MAST, rate: 1G}\n  - {to: SILO, skip: true}")
	plan, out := filepath.Join(dir, "plan.yaml"), filepath.Join(dir, "out")
	stdout, msg, code := run(t, "plan", plan, "--out", out)
	if code != exitOK {
		t.Fatalf("plan with SILO skipped: exit %d, want 0: %s\n%s", code, msg, stdout)
	}
	summary, err := os.ReadFile(filepath.Join(out, "summary.json"))
	if err != nil {
		t.Fatal(err)
	}
	var s struct {
		Warnings []string `json:"warnings"`
	}
	if err := json.Unmarshal(summary, &s); err != nil {
		t.Fatal(err)
	}
	const warn = `campus.geojson: #16 (SILO): no pathway within 30 m of the footprint (design: max_lateral_m); no link of the plan serves it, so it needs none`
	n := 0
	for _, w := range s.Warnings {
		if strings.HasSuffix(w, warn) {
			n++
		}
	}
	if n != 1 {
		t.Errorf("summary.json warns %d times of SILO, want once: %q", n, s.Warnings)
	}
	stdout, msg, code = run(t, "check", plan)
	if code != exitOK {
		t.Errorf("check with SILO skipped: exit %d, want 0: %s\n%s", code, msg, stdout)
	}
	if !strings.Contains(stdout, "#16 (SILO): no pathway within 30 m of the footprint (design: max_lateral_m); a plan that serves it is refused") {
		t.Errorf("check does not warn of SILO:\n%s", stdout)
	}
	// A link from it needs it again: refused, the link and the fix named, nothing written.
	editFile(t, dir, "plan.yaml", "  - {to: SILO, skip: true}", "  - {to: SILO, skip: true}\n  - {from: SILO, to: STORE}")
	out2 := filepath.Join(dir, "out2")
	_, msg, code = run(t, "plan", plan, "--out", out2)
	if code != exitInvalid {
		t.Fatalf("plan with a link from SILO: exit %d, want %d: %s", code, exitInvalid, msg)
	}
	wantLines(t, "link from SILO", msg, out2, []string{filepath.Join(dir, "campus.geojson") +
		`: feature #16 "SILO": no pathway within 30 m of the footprint (design: max_lateral_m); the plan serves links from it (link SILO-STORE, the links entry at line 20 of the plan): draw a pathway (or an entrance on one) within reach of it, or raise design.max_lateral_m, or serve them from another building (from: in links)`})
	editFile(t, dir, "plan.yaml", "\n  - {from: SILO, to: STORE}", "")

	// The plan of the rest is the plan without the building: the same links and total.
	bare := starterWith(t)
	bareOut := filepath.Join(bare, "out")
	if _, msg, code := run(t, "plan", filepath.Join(bare, "plan.yaml"), "--out", bareOut); code != exitOK {
		t.Fatalf("plan without SILO: exit %d: %s", code, msg)
	}
	for _, name := range []string{"links.csv", "bom.csv"} {
		a, errA := os.ReadFile(filepath.Join(out, name))
		b, errB := os.ReadFile(filepath.Join(bareOut, name))
		if errA != nil || errB != nil || string(a) != string(b) {
			t.Errorf("%s differs from the plan of the campus without SILO (%v, %v)", name, errA, errB)
		}
	}
}

// TestSweepFileProblemsAtOnce (tester 10, F14): a sweep file with an unknown axis key, a case
// value of the wrong type, a hub no building has and a price book that cannot be read gives
// all four problems in one run, each at its value's line:col, exit 2, nothing written.
func TestSweepFileProblemsAtOnce(t *testing.T) {
	dir := starterWith(t)
	sw := write(t, dir, "sweep.yaml", `base: plan.yaml
vary:
  hub: [HALL, LIBRARY]
  prices: [prices.yaml, prices-c.yaml]
  design.allow_new_trenches: [true, false]
cases:
  - {name: fast, defaults.strands: many}
`)
	out := filepath.Join(dir, "sw-out")
	_, msg, code := run(t, "sweep", sw, "--out", out)
	if code != exitInvalid {
		t.Fatalf("sweep: exit %d, want %d: %s", code, exitInvalid, msg)
	}
	wantLines(t, "sweep", msg, out, []string{
		sw + `:3:15: vary: hub: want the id of a building, got "LIBRARY", which no building has`,
		sw + `:4:25: vary: prices: cannot read ` + filepath.Join(dir, "prices-c.yaml") + `: no such file or directory`,
		sw + `:5:3: vary: design.allow_new_trenches: unknown key; did you mean design.allow_new_trench?`,
		sw + `:7:36: case "fast": defaults.strands: want an integer, got "many"`,
	})

	// A price book one scenario reads that lacks a price the catalog needs and one the
	// routes need: both named in the one run, as plan names them.
	editFile(t, dir, "prices.yaml", "  1000BASE-LX: 25.00\n", "")
	withoutKeys(t, dir, regexp.MustCompile(`^added_duct_per_m:`))
	short := filepath.Join(dir, "prices.yaml")
	sw = write(t, dir, "sweep2.yaml", "base: plan.yaml\nvary:\n  design.waste_pct: [5, 8]\n")
	_, msg, code = run(t, "sweep", sw, "--out", out)
	if code != exitInvalid {
		t.Fatalf("sweep2: exit %d, want %d: %s", code, exitInvalid, msg)
	}
	wantLines(t, "sweep2", msg, out, []string{
		short + `: price "transceiver 1000BASE-LX": missing; add transceivers.1000BASE-LX`,
		short + `: price "added-duct": missing; add added_duct_per_m`,
	})
}

// TestPlanKeysInREADME (tester 10, F16): every key a plan file may hold (the fields of
// plan.Plan that YAML reads, and of its defaults, links and design) is named in the README's
// "Plan (YAML)" section, as `key` or as `key:` in its example, so that no valid key is found
// only in an error message. The rule is the project's.
func TestPlanKeysInREADME(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	text := string(readme)
	start := strings.Index(text, "### Plan (YAML)")
	if start < 0 {
		t.Fatal(`README.md has no "### Plan (YAML)" section`)
	}
	section := text[start:]
	if end := strings.Index(section[len("###"):], "\n### "); end >= 0 {
		section = section[:end+len("###")]
	}
	var keys []string
	var walk func(prefix string, typ reflect.Type)
	walk = func(prefix string, typ reflect.Type) {
		for i := 0; i < typ.NumField(); i++ {
			f := typ.Field(i)
			name, _, _ := strings.Cut(f.Tag.Get("yaml"), ",")
			if name == "" || name == "-" {
				continue
			}
			ft := f.Type
			if ft.Kind() == reflect.Slice {
				ft = ft.Elem()
			}
			if ft.Kind() == reflect.Struct && ft.NumField() > 0 {
				keys = append(keys, prefix+name)
				walk(prefix+name+".", ft)
				continue
			}
			keys = append(keys, prefix+name)
		}
	}
	walk("", reflect.TypeOf(plan.Plan{}))
	if len(keys) < 30 {
		t.Fatalf("found only %d plan keys: %q", len(keys), keys)
	}
	for _, k := range keys {
		leaf := k[strings.LastIndex(k, ".")+1:]
		if !strings.Contains(section, "`"+leaf+"`") && !strings.Contains(section, leaf+":") {
			t.Errorf("plan key %s is not in the README's Plan (YAML) section", k)
		}
	}
}

// TestSkippedCutOffBuilding: a building whose pathways join none that reaches the hub, with
// its link skipped, is no problem of the plan: plan exits 0, and check, which says the same
// as plan before planning, lists it as cut off and served by no link and exits 0 too (it
// exits 3 when the building is served, TestBadInput's "check names unreachable").
func TestSkippedCutOffBuilding(t *testing.T) {
	plan := "testdata/plans/island_skip.yaml"
	stdout, msg, code := run(t, "check", plan)
	if code != exitOK {
		t.Errorf("check: exit %d, want 0: %s\n%s", code, msg, stdout)
	}
	const want = "  cut off: building ISLE is cut off from HQ: the pathways that reach it (D2) join none that reaches HQ; no link of the plan serves it\n"
	if !strings.Contains(stdout, want) {
		t.Errorf("check lacks %q:\n%s", want, stdout)
	}
	if _, msg, code := run(t, "plan", plan, "--out", filepath.Join(t.TempDir(), "out")); code != exitOK {
		t.Errorf("plan: exit %d, want 0: %s", code, msg)
	}
}

// TestPlanNamesWithCampusProblems (tester 14 F8): a campus with a problem in one feature still
// has its other buildings read, so the plan's hub and links are checked against them in the
// same run, not after the campus is mended: "hub: hall" (with its hint) and a link to GHOST
// come out beside the campus's problem. A feature whose kind could not be read may be the
// building a link names, and that link is not blamed. The rule is the project's ("errors ...
// all at once"), not a standard's.
func TestPlanNamesWithCampusProblems(t *testing.T) {
	dir := starterWith(t)
	editFile(t, dir, "campus.geojson", `"id":"LAB",`, `"id":"LAB","Riser_M":40,`)
	editFile(t, dir, "plan.yaml", "hub: HALL ", "hub: hall ")
	editFile(t, dir, "plan.yaml", "  - {to: MAST, rate: 1G}", "  - {to: MAST, rate: 1G}\n  - {to: GHOST}")
	plan, campus := filepath.Join(dir, "plan.yaml"), filepath.Join(dir, "campus.geojson")
	want := []string{
		plan + `:9:6: hub: want the id of a building, got "hall", which no building has; did you mean "HALL" (` + campus + ` feature #0)? (letter case matters)`,
		plan + `:19:10: links[2].to: want the id of a building, got "GHOST", which no building has`,
		campus + `: feature #1 "LAB": property "Riser_M": not read: did you mean "riser_m"? Without it the building is planned with a riser of 15 m; rename the property (property names are matched exactly)`,
	}
	out := filepath.Join(dir, "out")
	planAndCheckRefused(t, plan, out, want)

	// KILN's kind misspelt: it may be a building, so a link to it is no problem of the plan's.
	editFile(t, dir, "campus.geojson", `"kind":"building","id":"KILN"`, `"kind":"buidling","id":"KILN"`)
	editFile(t, dir, "plan.yaml", "  - {to: GHOST}", "  - {to: GHOST}\n  - {to: KILN}")
	_, msg, code := run(t, "check", plan)
	if code != exitInvalid {
		t.Fatalf("check with KILN's kind misspelt: exit %d, want %d: %s", code, exitInvalid, msg)
	}
	wantLines(t, "KILN's kind misspelt", msg, "", append(want[:2:2], want[2],
		campus+`: feature #4 "KILN": property "kind": want one of "building", "pathway", "structure", "entrance", got string "buidling"; did you mean "building"?`))

	// A sweep's pre-flight likewise: the hub an axis names, beside the campus's problem.
	editFile(t, dir, "campus.geojson", `"kind":"buidling","id":"KILN"`, `"kind":"building","id":"KILN"`)
	editFile(t, dir, "plan.yaml", "hub: hall ", "hub: HALL ")
	editFile(t, dir, "plan.yaml", "\n  - {to: GHOST}\n  - {to: KILN}", "")
	sw := write(t, dir, "sweep.yaml", "base: plan.yaml\nvary:\n  hub: [HALL, LIBRARY]\n")
	out = filepath.Join(dir, "sw-out")
	_, msg, code = run(t, "sweep", sw, "--out", out)
	if code != exitInvalid {
		t.Fatalf("sweep: exit %d, want %d: %s", code, exitInvalid, msg)
	}
	wantLines(t, "sweep", msg, out, []string{
		sw + `:3:15: vary: hub: want the id of a building, got "LIBRARY", which no building has`,
		want[2],
	})
}

// TestPlanWaitsForUnreadCampus (tester 15 F3): the README ("Limits") promises that the plan's
// hub and links wait for the campus to read when a feature or file could not be read far
// enough to know its id (it might be the building named). A file refused whole at its
// "crs", and buildings whose ids are under "ID" (a shapefile export), are that case: the
// plan is not blamed for buildings that are in the file. A building's role under "ROLE"
// leaves unknown which building is mc, so the hub by role waits too; a link to a building
// that is not there is still named. And a slip a GIS export repeats on every feature (ids
// under "ID", positions in a projected system) is one problem per file and kind, on the
// first feature, with the count and the next features (as the other slips are), not one
// line per feature. The rules are the README's, common practice, no published source.
func TestPlanWaitsForUnreadCampus(t *testing.T) {
	dir := starterWith(t)
	plan, campus := filepath.Join(dir, "plan.yaml"), filepath.Join(dir, "campus.geojson")
	editFile(t, dir, "plan.yaml", "  - {to: MAST, rate: 1G}", "  - {to: MAST, rate: 1G}\n  - {to: GHOST}")
	starterCampus, err := os.ReadFile(campus)
	if err != nil {
		t.Fatal(err)
	}
	ghost := plan + `:19:10: links[2].to: want the id of a building, got "GHOST", which no building has`

	// Every id under "ID": one problem per kind, and the plan waits (GHOST too: it may be
	// any of the buildings whose id was not read).
	write(t, dir, "campus.geojson", strings.ReplaceAll(string(starterCampus), `"id":`, `"ID":`))
	slip := `, which is not read: did you mean "id"? (property names are matched exactly)`
	planAndCheckRefused(t, plan, filepath.Join(dir, "out"), []string{
		campus + `: feature #0 (no id): property "id": missing, and on 5 more buildings of this file (#1, #2, #3, …); every building needs a unique id; the feature gives "ID"` + slip,
		campus + `: feature #6 (no id): property "id": missing, and on 7 more pathways of this file (#7, #8, #9, …); every pathway needs a unique id; the feature gives "ID"` + slip,
		campus + `: feature #14 (no id): property "id": missing, and on 1 more structure of this file (#15); every structure needs a unique id; the feature gives "ID"` + slip,
	})

	// Only the structures' ids under "ID": every building read, so GHOST is named.
	fixed := strings.ReplaceAll(string(starterCampus), `"id":"HH1"`, `"ID":"HH1"`)
	write(t, dir, "campus.geojson", strings.ReplaceAll(fixed, `"id":"MH1"`, `"ID":"MH1"`))
	planAndCheckRefused(t, plan, filepath.Join(dir, "out"), []string{
		ghost,
		campus + `: feature #14 (no id): property "id": missing, and on 1 more structure of this file (#15); every structure needs a unique id; the feature gives "ID"` + slip,
	})

	// The mc's role under "ROLE" and no hub in the plan: the hub waits, GHOST is named.
	write(t, dir, "campus.geojson", strings.Replace(string(starterCampus), `"role":"mc"`, `"ROLE":"mc"`, 1))
	editFile(t, dir, "plan.yaml", "hub: HALL ", "# hub: HALL ")
	planAndCheckRefused(t, plan, filepath.Join(dir, "out"), []string{
		ghost,
		campus + `: feature #0 "HALL": property "ROLE": not read: did you mean "role"? Without it the building is planned with no role (a building the backbone serves); rename the property (property names are matched exactly)`,
	})
	editFile(t, dir, "plan.yaml", "# hub: HALL ", "hub: HALL ")

	// Positions in a projected system (feet, say) without a "crs": one problem for the file;
	// every feature's id read, so GHOST is named and HALL, LODGE and MAST are not.
	var fc map[string]any
	if err := json.Unmarshal(starterCampus, &fc); err != nil {
		t.Fatal(err)
	}
	var scale func(v any) any
	scale = func(v any) any {
		arr, ok := v.([]any)
		if !ok {
			return v
		}
		if x, isNum := arr[0].(float64); isNum {
			return []any{600000 + x*1000, 1650000 + arr[1].(float64)*1000}
		}
		for i := range arr {
			arr[i] = scale(arr[i])
		}
		return arr
	}
	for _, f := range fc["features"].([]any) {
		g := f.(map[string]any)["geometry"].(map[string]any)
		g["coordinates"] = scale(g["coordinates"])
	}
	data, err := json.Marshal(fc)
	if err != nil {
		t.Fatal(err)
	}
	write(t, dir, "campus.geojson", string(data))
	_, msg, code := run(t, "check", plan)
	if code != exitInvalid {
		t.Fatalf("check, projected: exit %d, want %d: %s", code, exitInvalid, msg)
	}
	wantLines(t, "check, projected", msg, "", []string{ghost,
		campus + `: feature #0 "HALL": geometry: ring 1: got [606980, 1696520]: coordinates look projected (metres or feet?), and so do positions of 15 more features of this file (#1 (LAB), #2 (LODGE), #3 (STORE), …); reproject to WGS84 longitude/latitude, or name their system in a "crs" member of the FeatureCollection ({"type": "name", "properties": {"name": "EPSG:<code>"}}; needs a build with PROJ)`,
	})

	// The file in a state-plane system its "crs" names, refused whole by a build without
	// PROJ: nothing of it is read, so the plan's names wait.
	if _, err := crs.ToWGS84(2965); !errors.Is(err, crs.ErrNoPROJ) {
		t.Skip("built with PROJ: EPSG:2965 is read")
	}
	write(t, dir, "campus.geojson", strings.Replace(string(data), `{`, `{"crs":{"type":"name","properties":{"name":"EPSG:2965"}},`, 1))
	_, msg, code = run(t, "check", plan)
	if code != exitInvalid {
		t.Fatalf("check, crs: exit %d, want %d: %s", code, exitInvalid, msg)
	}
	if n := len(strings.Split(strings.TrimSpace(msg), "\n")); n != 1 || !strings.Contains(msg, campus+": crs: EPSG:2965 is not WGS84 longitude/latitude") {
		t.Errorf("check, crs: %d lines, want the crs problem alone:\n%s", n, msg)
	}
}
