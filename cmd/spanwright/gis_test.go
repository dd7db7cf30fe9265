package main

import (
	"context"
	"encoding/json"
	"html"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/jackc/pgx/v5"

	"spanwright/internal/pgtest"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// demoFolder copies the demo plan and campus into a new folder and returns it.
func demoFolder(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	for _, f := range []string{"plan.yaml", "campus.geojson"} {
		data, err := os.ReadFile(filepath.Join("../../testdata/demo", f))
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, f), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// withCampus writes a copy of the demo plan whose campus line is line, and returns its path.
func withCampus(t *testing.T, dir, name, line string) string {
	t.Helper()
	data, err := os.ReadFile(filepath.Join(dir, "plan.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	text := strings.Replace(string(data), "campus: [campus.geojson]", line, 1)
	if text == string(data) && line != "campus: [campus.geojson]" {
		t.Fatal("the demo plan has no line campus: [campus.geojson]")
	}
	path := filepath.Join(dir, name)
	if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// planFiles plans the plan with the arguments given and returns its output files by name.
func planFiles(t *testing.T, planPath string, args ...string) map[string][]byte {
	t.Helper()
	out := filepath.Join(t.TempDir(), "out")
	if _, msg, code := run(t, append([]string{"plan", planPath, "--out", out}, args...)...); code != exitOK {
		t.Fatalf("plan %s: status %d: %s", planPath, code, msg)
	}
	entries, err := os.ReadDir(out)
	if err != nil {
		t.Fatal(err)
	}
	files := map[string][]byte{}
	for _, e := range entries {
		data, err := os.ReadFile(filepath.Join(out, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		files[e.Name()] = data
	}
	return files
}

// sourceNames returns, for each warning of the campus read from the plan (in the order the
// outputs list them), where it names its feature: "campus.geojson: #47 (SR-3)".
func sourceNames(t *testing.T, planPath, db string) []string {
	t.Helper()
	p, err := plan.LoadPlanOptions(planPath, plan.LoadOptions{CampusDatabase: db})
	if err != nil {
		t.Fatal(err)
	}
	s, err := site.Load(context.Background(), nil, campusPaths(p), siteOptions(p))
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, w := range s.Net.Warnings {
		out = append(out, w.File+": "+w.Feature)
	}
	return out
}

// sameOutputs checks that the plan from tables wrote the same files as the plan from GeoJSON,
// byte for byte, but for the one thing that must differ: where a warning's feature was read
// (campus.geojson: #47 (SR-3) against campus.gpkg: table campus fid 48 (SR-3)), which
// summary.json and report.html print. Each such name is replaced, in its JSON or HTML
// escaping, by the name it must have from the tables, and then every byte must match.
func sameOutputs(t *testing.T, fromJSON, fromTables map[string][]byte, jsonNames, tableNames []string) {
	t.Helper()
	if len(jsonNames) != len(tableNames) {
		t.Fatalf("%d warnings from GeoJSON, %d from the tables", len(jsonNames), len(tableNames))
	}
	// As each kind of file writes the name: JSON escapes quotes with a backslash, HTML as &#34;.
	var raw, inJSON, inHTML []string
	for i, j := range jsonNames {
		jq, _ := json.Marshal(j)
		tq, _ := json.Marshal(tableNames[i])
		raw = append(raw, j, tableNames[i])
		inJSON = append(inJSON, string(jq[1:len(jq)-1]), string(tq[1:len(tq)-1]))
		inHTML = append(inHTML, html.EscapeString(j), html.EscapeString(tableNames[i]))
	}
	renames := map[string]*strings.Replacer{".json": strings.NewReplacer(inJSON...), ".html": strings.NewReplacer(inHTML...)}
	if len(fromJSON) != len(fromTables) {
		t.Errorf("%d files from GeoJSON, %d from the tables", len(fromJSON), len(fromTables))
	}
	for name, want := range fromJSON {
		got, ok := fromTables[name]
		if !ok {
			t.Errorf("%s: not written from the tables", name)
			continue
		}
		rename, ok := renames[filepath.Ext(name)]
		if !ok {
			rename = strings.NewReplacer(raw...)
		}
		if w := rename.Replace(string(want)); w != string(got) {
			i := 0
			for i < len(w) && i < len(got) && w[i] == got[i] {
				i++
			}
			t.Errorf("%s differs at byte %d: %.80q, want %.80q", name, i, got[i:], w[i:])
		}
	}
}

// TestPlanFromGeoPackage plans the demo from a GeoPackage that GDAL's ogr2ogr (gdal-bin, the
// reference writer) made of the demo's GeoJSON, and checks every output equals the one from
// the GeoJSON byte for byte (sameOutputs).
func TestPlanFromGeoPackage(t *testing.T) {
	t.Parallel()
	ogr2ogr := pgtest.Need(t, "ogr2ogr", "gdal-bin")
	dir := demoFolder(t)
	if out, err := exec.Command(ogr2ogr, "-f", "GPKG", filepath.Join(dir, "campus.gpkg"), filepath.Join(dir, "campus.geojson")).CombinedOutput(); err != nil {
		t.Fatalf("ogr2ogr: %v\n%s", err, out)
	}
	jsonPlan := filepath.Join(dir, "plan.yaml")
	gpkgPlan := withCampus(t, dir, "plan-gpkg.yaml", "campus: [campus.gpkg]")
	jsonNames, tableNames := sourceNames(t, jsonPlan, ""), sourceNames(t, gpkgPlan, "")
	if len(tableNames) == 0 || !strings.Contains(tableNames[0], "campus.gpkg: table campus fid ") {
		t.Errorf("warnings name %q, want the GeoPackage's table and fid", tableNames)
	}
	sameOutputs(t, planFiles(t, jsonPlan), planFiles(t, gpkgPlan), jsonNames, tableNames)
}

// TestPlanFromPostGIS loads the demo campus with ogr2ogr into a throwaway PostgreSQL 15 with
// PostGIS 3 (Debian postgresql-15, postgresql-15-postgis-3) and checks the plan read from it,
// through the plan's campus_database and through --campus-db, writes the same outputs as
// the plan from GeoJSON (sameOutputs).
func TestPlanFromPostGIS(t *testing.T) {
	t.Parallel()
	ogr2ogr := pgtest.Need(t, "ogr2ogr", "gdal-bin")
	srv := pgtest.Start(t)
	ctx := pgtest.Context(t)
	db := srv.ConnString("postgres")
	conn, err := pgx.Connect(ctx, db)
	if err != nil {
		t.Fatal(err)
	}
	if _, err := conn.Exec(ctx, "CREATE EXTENSION postgis"); err != nil {
		t.Fatal(err)
	}
	conn.Close(ctx)
	dir := demoFolder(t)
	if out, err := exec.Command(ogr2ogr, "-f", "PostgreSQL", srv.PGSource("postgres"), filepath.Join(dir, "campus.geojson")).CombinedOutput(); err != nil {
		t.Fatalf("ogr2ogr: %v\n%s", err, out)
	}
	jsonPlan := filepath.Join(dir, "plan.yaml")
	dbPlan := withCampus(t, dir, "plan-db.yaml", "campus_database: '"+db+"'")
	bare := withCampus(t, dir, "plan-bare.yaml", "")
	jsonNames, tableNames := sourceNames(t, jsonPlan, ""), sourceNames(t, dbPlan, "")
	if len(tableNames) == 0 || !strings.Contains(tableNames[0], `database "postgres" (user "spanwright" on `+srv.Socket+`:5432): table campus fid `) {
		t.Errorf("warnings name %q, want the database's table and fid", tableNames)
	}
	want := planFiles(t, jsonPlan)
	sameOutputs(t, want, planFiles(t, dbPlan), jsonNames, tableNames)
	sameOutputs(t, want, planFiles(t, bare, "--campus-db", db), jsonNames, tableNames)

	if out, msg, code := run(t, "check", "--campus-db", db); code != exitInfeasible && code != exitOK || !strings.Contains(out, "buildings") {
		t.Errorf("check --campus-db: status %d, %s\n%s", code, msg, out)
	}

	// A sweep of the plan without a campus, given the database on the command line: its
	// scenario with the demo's own hub writes the demo's routes.
	sweepFile := filepath.Join(dir, "sweep.yaml")
	if err := os.WriteFile(sweepFile, []byte("base: plan-bare.yaml\nvary:\n  hub: [ADM, ENG]\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "sweep")
	for pass := 0; pass < 2; pass++ { // the second with --resume, which plans again
		stdout, msg, code := run(t, "sweep", sweepFile, "--quiet", "--resume", "--out", out, "--campus-db", db)
		if code != exitOK && code != exitInfeasible {
			t.Fatalf("sweep --campus-db: status %d: %s", code, msg)
		}
		if strings.Contains(stdout, "unchanged, kept") || !strings.Contains(stdout, "2 scenarios: 2 ok") {
			t.Errorf("pass %d: a scenario that reads a database was skipped:\n%s", pass, stdout)
		}
	}
	matches, _ := filepath.Glob(filepath.Join(out, "adm-*", "routes.geojson"))
	if len(matches) != 1 {
		t.Fatalf("sweep: %d scenario folders of hub ADM with routes.geojson", len(matches))
	}
	if got, _ := os.ReadFile(matches[0]); string(got) != string(want["routes.geojson"]) {
		t.Errorf("%s differs from the plan's routes.geojson", matches[0])
	}
}

// TestCheckBrokenGeoPackage converts bad GeoJSON fixtures with ogr2ogr (gdal-bin) into the
// tables of one GeoPackage and checks that `check` exits with status 2 and reports each
// fixture's problem at its table and fid, in messages that show no Go.
func TestCheckBrokenGeoPackage(t *testing.T) {
	t.Parallel()
	ogr2ogr := pgtest.Need(t, "ogr2ogr", "gdal-bin")
	path := filepath.Join(t.TempDir(), "bad.gpkg")
	for i, f := range []string{"unknown_type", "zero_duct", "unknown_role"} {
		args := []string{"-f", "GPKG", path, "../../testdata/bad/" + f + ".geojson", "-nln", f}
		if i > 0 {
			args = append([]string{"-update"}, args...)
		}
		if out, err := exec.Command(ogr2ogr, args...).CombinedOutput(); err != nil {
			t.Fatalf("ogr2ogr: %v\n%s", err, out)
		}
	}
	_, msg, code := run(t, "check", path)
	if code != exitInvalid {
		t.Errorf("status %d, want %d: %s", code, exitInvalid, msg)
	}
	if m := goWords.FindString(msg); m != "" {
		t.Errorf("message shows Go (%q):\n%s", m, msg)
	}
	// The fixtures' features, numbered from 1 by ogr2ogr in file order.
	for _, want := range []string{
		path + `: table unknown_type fid 2 (id "P-1"): property "type": want one of "duct", "tunnel", "aerial", "buried", "tray", got string "conduit"`,
		path + `: table zero_duct fid 2 (id "P-1"): property "duct_mm": want millimetres above 0 and at most 1000, got 0`,
		path + `: table unknown_role fid 1 (id "B-1"): property "role": want one of "mc", "ic", got string "hub"`,
	} {
		if !strings.Contains(msg, want) {
			t.Errorf("no problem\n  %s\nin\n%s", want, msg)
		}
	}
}

// TestShapefileHabits plans the demo campus as an export from a shapefile writes it: every
// optional text or number property it leaves out given as "" (a dBASE table has no NULL:
// ESRI Shapefile Technical Description, 1998, from memory) and true as 1 (a logical field
// exported as an integer, as a GeoPackage stores a BOOLEAN: OGC GeoPackage 1.3, Table 1). "" is
// absent and 1 is true, so every output equals the demo's, byte for byte, when the blanks are
// properties whose default is what a blank means (name, role, transit, plenum, group, an
// entrance's id). Blanks of the properties the plan prices or routes by (a pathway's type,
// status, ducts, EMI, surface, method; a building's riser) take their defaults too, and
// `check` warns once per kind and property that they did.
func TestShapefileHabits(t *testing.T) {
	t.Parallel()
	dir := demoFolder(t)
	data, err := os.ReadFile(filepath.Join(dir, "campus.geojson"))
	if err != nil {
		t.Fatal(err)
	}
	quiet := map[string][]string{
		"building": {"name", "role", "transit"},
		"pathway":  {"plenum", "group"},
		"entrance": {"id"},
	}
	warned := map[string][]string{
		"building": {"riser_m"},
		"pathway":  {"type", "status", "spare_ducts", "duct_mm", "emi", "surface", "method"},
	}
	// blank writes a copy of the demo campus with the properties of keys left out given as "".
	blank := func(name string, keys ...map[string][]string) (blanked map[string]bool) {
		var fc struct {
			Type     string           `json:"type"`
			Features []map[string]any `json:"features"`
		}
		if err := json.Unmarshal(data, &fc); err != nil {
			t.Fatal(err)
		}
		blanked = map[string]bool{}
		n := 0
		for _, f := range fc.Features {
			props := f["properties"].(map[string]any)
			kind := props["kind"].(string)
			for _, ks := range keys {
				for _, k := range ks[kind] {
					switch v, ok := props[k]; {
					case !ok:
						props[k] = ""
						blanked[kind+" "+k] = true
						n++
					case v == true:
						props[k] = 1
					case v == false:
						props[k] = 0
					}
				}
			}
		}
		if n < 50 {
			t.Fatalf("only %d properties left out to blank: the demo campus changed?", n)
		}
		out, err := json.Marshal(fc)
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, name), out, 0o644); err != nil {
			t.Fatal(err)
		}
		return blanked
	}
	blank("habits.geojson", quiet)
	demoPlan := filepath.Join(dir, "plan.yaml")
	habitsPlan := withCampus(t, dir, "plan-habits.yaml", "campus: [habits.geojson]")
	// The warnings name their file: campus.geojson against habits.geojson, the one difference.
	sameOutputs(t, planFiles(t, demoPlan), planFiles(t, habitsPlan), sourceNames(t, demoPlan, ""), sourceNames(t, habitsPlan, ""))

	blanked := blank("all-habits.geojson", quiet, warned)
	allPlan := withCampus(t, dir, "plan-all-habits.yaml", "campus: [all-habits.geojson]")
	out, msg, code := run(t, "check", allPlan)
	if code != exitOK {
		t.Fatalf("check: status %d: %s", code, msg)
	}
	want := 0
	for kind, ks := range warned {
		for _, k := range ks {
			if blanked[kind+" "+k] {
				want++
			}
		}
	}
	if got := strings.Count(out, "as an empty string, taken as absent"); got != want || want == 0 {
		t.Errorf("%d warnings of blanks taken as absent, want one per kind and property blanked (%d):\n%s", got, want, out)
	}
}
