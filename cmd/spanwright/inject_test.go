package main

import (
	"database/sql"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/geo/gpkgout"
	"spanwright/route/workbook"

	_ "modernc.org/sqlite" // reads plan.gpkg back
)

// Payloads are ids and names an attacker (or an unlucky export) could put in a campus or a
// sweep file, each of which must come out as text in every output.
const (
	// OWASP CSV injection guidance: a cell that begins with = + - @ tab or CR is a formula
	idHyperlink = `=HYPERLINK("http://e.invalid","x")`
	idPlus      = "+1+2"
	idMinus     = "-2+3"
	idAt        = "@SUM(A1)"
	idTab       = "\tTAB"
	idDDE       = "=cmd|' -C calc'!A0" // as pathway id, which may not hold "/"
	// Markdown and HTML markup
	idMarkup = "<script>alert(1)</script>|*x*`y`"
	// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls
	idBidi = "B\u202Eevil\u2066"
	// ECMA-48 control functions: ESC [ starts a control sequence on a terminal
	idEscape = "\x1b[31mRED"
)

// payloadBuildings are the campus's buildings, hub first, west to east.
var payloadBuildings = []string{idHyperlink, idPlus, idMinus, idAt, idTab, idMarkup, idBidi, idEscape}

// payloadCampus writes into dir a campus of payloadBuildings in a row, 60 m apart, served by a
// duct trunk whose ids are payloads too, and a plan of it whose name is one; it returns the
// plan's path.
func payloadCampus(t *testing.T, dir string) string {
	t.Helper()
	const lat, stepDeg, sizeDeg = 53.0, 0.0009, 0.0003 // about 60 m and 20 m east-west at 53° N
	var feats []string
	for i, id := range payloadBuildings {
		x := -1.5 + float64(i)*stepDeg
		props := map[string]any{"kind": "building", "id": id, "name": "Hall " + id}
		if i == 0 {
			props["role"] = "mc"
		}
		feats = append(feats, feature(props, "Polygon", [][][2]float64{{{x, lat}, {x + sizeDeg, lat}, {x + sizeDeg, lat + 0.0002}, {x, lat + 0.0002}, {x, lat}}}))
		if i > 0 {
			// A trunk 5 m south of the row, one duct per gap, joined end to end; each
			// building reaches it by a lateral.
			ducts := []string{idDDE, idMinus, idAt, idPlus, idTab, "<img src=x onerror=alert(2)>", idBidi, idEscape}
			mid := sizeDeg / 2
			feats = append(feats, feature(map[string]any{"kind": "pathway", "id": ducts[i-1] + fmt.Sprint(i), "type": "duct"},
				"LineString", [][2]float64{{x - stepDeg + mid, lat - 0.00005}, {x + mid, lat - 0.00005}}))
		}
	}
	campus := `{"type":"FeatureCollection","features":[` + strings.Join(feats, ",\n") + "]}\n"
	if err := os.WriteFile(filepath.Join(dir, "campus.geojson"), []byte(campus), 0o644); err != nil {
		t.Fatal(err)
	}
	name, _ := json.Marshal("<script>alert('plan')</script> \u202E =1+2 \x1b[2J")
	plan := fmt.Sprintf("name: %s\ncampus: [campus.geojson]\nbudget: 100\ndefaults: {rate: 10G, strands: 12}\n", name)
	path := filepath.Join(dir, "plan.yaml")
	if err := os.WriteFile(path, []byte(plan), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

func feature(props map[string]any, typ string, coords any) string {
	f := map[string]any{"type": "Feature", "properties": props, "geometry": map[string]any{"type": typ, "coordinates": coords}}
	b, err := json.Marshal(f)
	if err != nil {
		panic(err)
	}
	return string(b)
}

// hidden are raw characters no output meant for people may hold: bidi controls (Unicode TR #9
// / CVE-2021-42574) and ESC (ECMA-48).
var hidden = []string{"\u202E", "\u2066", "\x1b"}

func assertNoHidden(t *testing.T, name string, data []byte) {
	t.Helper()
	for _, h := range hidden {
		if strings.Contains(string(data), h) {
			t.Errorf("%s holds the raw character %q", name, h)
		}
	}
}

// TestPayloadPlan plans the payload campus and checks every output meant for a person:
// links.csv and bom.csv have no cell a spreadsheet would run, report.html no markup from the
// input and no raw bidi control, and summary.json keeps the ids exactly.
func TestPayloadPlan(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	out := filepath.Join(dir, "out")
	// The demo price book with a label that is a formula, a bidi override and ESC.
	book, err := os.ReadFile("../../media/prices-demo.yaml")
	if err != nil {
		t.Fatal(err)
	}
	book = []byte(strings.Replace(string(book), "label: demo prices, invented, not a quotation", `label: "=1+2 \u202E \e[1m"`, 1))
	prices := filepath.Join(dir, "prices.yaml")
	if err := os.WriteFile(prices, book, 0o644); err != nil {
		t.Fatal(err)
	}
	_, msg, code := run(t, "plan", payloadCampus(t, dir), "--out", out, "--prices", prices)
	if code != exitOK {
		t.Fatalf("plan: exit %d: %s", code, msg)
	}
	read := func(name string) []byte {
		b, err := os.ReadFile(filepath.Join(out, name))
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	for _, name := range []string{"links.csv", "bom.csv"} {
		data := read(name)
		assertNoHidden(t, name, data)
		recs, err := csv.NewReader(strings.NewReader(string(data))).ReadAll()
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		for r, rec := range recs {
			for c, cell := range rec {
				// OWASP CSV injection guidance: no cell may begin with = + - @ tab or CR,
				// except a plain number
				if cell != "" && strings.ContainsRune("=+-@\t\r", rune(cell[0])) && !isNumber(cell) {
					t.Errorf("%s row %d column %d: %q would run as a formula", name, r+1, c+1, cell)
				}
			}
		}
	}
	links := string(read("links.csv"))
	for _, want := range []string{
		`"'=HYPERLINK(""http://e.invalid"",""x"")-+1+2",primary,"'=HYPERLINK(""http://e.invalid"",""x"")",'+1+2,`,
		",'-2+3,", ",'@SUM(A1),", ",'\tTAB,", "B<U+202E>evil<U+2066>", "<U+001B>[31mRED", ",'=cmd|' -C calc'!A01 -2+32 ",
	} {
		if !strings.Contains(links, want) {
			t.Errorf("links.csv lacks %q:\n%s", want, links)
		}
	}

	// The entrance used at each end is named after its building (geo.Entry: building id, ":",
	// number) and neutralised as the building's id is: the same leading quote, the same
	// code points.
	recs, err := csv.NewReader(strings.NewReader(links)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := map[string]int{}
	for i, h := range recs[0] {
		col[h] = i
	}
	for _, rec := range recs[1:] {
		for _, end := range []string{"from", "to"} {
			if e := rec[col[end+"_entrance"]]; e != "" && !strings.HasPrefix(e, rec[col[end]]+":") {
				t.Errorf("links.csv %s: %s_entrance %q is not its building %q neutralised alike", rec[0], end, e, rec[col[end]])
			}
		}
	}

	if bom := string(read("bom.csv")); !strings.Contains(bom, "\ntotal,'=1+2 <U+202E> <U+001B>[1m,,,,") {
		t.Errorf("bom.csv: the total row's label is not neutralised:\n%s", bom)
	}

	// bom.xlsx: every cell whose text begins with = is a string, not a formula (ECMA-376
	// Part 1 §18.3.1.4: a formula is an f element), and no cell holds a raw hidden character.
	xl, err := workbook.Open(read("bom.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	defer xl.Close()
	texts := 0
	for _, sheet := range xl.Sheets() {
		rows, err := xl.Rows(sheet)
		if err != nil {
			t.Fatal(err)
		}
		for r, row := range rows {
			for c, v := range row {
				assertNoHidden(t, "bom.xlsx "+sheet, []byte(v))
				if !strings.HasPrefix(v, "=") {
					continue
				}
				texts++
				if f, err := xl.Formula(sheet, workbook.Ref(c, r+1)); err != nil || f != "" {
					t.Errorf("bom.xlsx %s!%s: text %q stored as formula %q (%v)", sheet, workbook.Ref(c, r+1), v, f, err)
				}
			}
		}
	}
	if texts == 0 {
		t.Error("bom.xlsx: no text beginning with = found: the payloads are missing")
	}

	page := string(read("report.html"))
	assertNoHidden(t, "report.html", []byte(page))
	for _, bad := range []string{"<script>alert", "<U+202E>"} {
		if strings.Contains(page, bad) {
			t.Errorf("report.html holds %q unescaped", bad)
		}
	}
	for _, want := range []string{"&lt;script&gt;alert(1)&lt;/script&gt;|*x*`y`", "B&lt;U+202E&gt;evil&lt;U+2066&gt;", "&lt;U+001B&gt;[31mRED",
		// the map's entrance marks name each entrance after its building
		"<title>&lt;script&gt;alert(1)&lt;/script&gt;|*x*`y`:1: entrance of &lt;script&gt;alert(1)&lt;/script&gt;|*x*`y` (",
		"<title>B&lt;U+202E&gt;evil&lt;U+2066&gt;:1: entrance of B&lt;U+202E&gt;evil&lt;U+2066&gt; ("} {
		if !strings.Contains(page, want) {
			t.Errorf("report.html lacks %q", want)
		}
	}

	// summary.json is data for programs: the plan's name exactly as given.
	var s struct{ Scenario string }
	if err := json.Unmarshal(read("summary.json"), &s); err != nil || !strings.Contains(s.Scenario, "\u202E") {
		t.Errorf("summary.json: scenario %q (%v), want the plan's name exactly", s.Scenario, err)
	}

	// plan.gpkg is data for programs too: its text columns hold the ids exactly as given,
	// as SQLite TEXT (a GeoPackage column is never a formula).
	uri, err := gpkgout.URI(filepath.Join(out, "plan.gpkg"), "mode=ro")
	if err != nil {
		t.Fatal(err)
	}
	db, err := sql.Open("sqlite", uri)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	var n int
	if err := db.QueryRow(`SELECT COUNT(*) FROM buildings WHERE building IN (?, ?)`, idHyperlink, "B\u202Eevil\u2066").Scan(&n); err != nil || n != 2 {
		t.Errorf("plan.gpkg: %d buildings with the payload ids exactly (%v), want 2", n, err)
	}
}

func isNumber(s string) bool {
	s = strings.TrimPrefix(s, "-")
	whole, frac, point := strings.Cut(s, ".")
	return whole != "" && strings.Trim(whole, "0123456789") == "" && (!point || (frac != "" && strings.Trim(frac, "0123456789") == ""))
}

// TestPayloadSweep sweeps the payload campus with case names and override values that carry
// the payloads and checks compare.csv, compare.md and compare.html.
func TestPayloadSweep(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	plan := payloadCampus(t, dir)
	hubA, _ := json.Marshal(idPlus)
	hubB, _ := json.Marshal(idEscape) // written back into the scenario's plan.yaml
	caseA, _ := json.Marshal("=1+2 <script>alert('md')</script> # *x* [l](http://e.invalid)")
	caseB, _ := json.Marshal("\u202Eesrever | `tick` \x1b[1m")
	sweepFile := filepath.Join(dir, "s.yaml")
	src := fmt.Sprintf("base: %s\ncases:\n  - {name: %s, hub: %s}\n  - {name: %s, hub: %s}\n", plan, caseA, hubA, caseB, hubB)
	if err := os.WriteFile(sweepFile, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	_, msg, code := run(t, "sweep", sweepFile, "--out", out, "--quiet")
	if code != exitOK {
		t.Fatalf("sweep: exit %d: %s", code, msg)
	}
	read := func(name string) string {
		b, err := os.ReadFile(filepath.Join(out, name))
		if err != nil {
			t.Fatal(err)
		}
		assertNoHidden(t, name, b)
		return string(b)
	}
	csvText := read("compare.csv")
	for _, want := range []string{`,'=1+2 <script>alert('md')</script> # *x* [l](http://e.invalid),'+1+2,`, ",<U+001B>[31mRED,"} {
		if !strings.Contains(csvText, want) {
			t.Errorf("compare.csv lacks %q:\n%s", want, csvText)
		}
	}
	md := read("compare.md")
	// CommonMark 0.31 §2.4 backslash escapes; GitHub Flavored Markdown 0.29 §4.10 table pipes
	for _, want := range []string{
		`| \=1+2 \<script\>alert('md')\</script\> # \*x\* \[l\](http://e.invalid) |`,
		"| \\<U+202E\\>esrever \\| \\`tick\\` \\<U+001B\\>\\[1m |",
		`| \+1+2 |`, `| \<U+001B\>\[31mRED |`,
	} {
		if !strings.Contains(md, want) {
			t.Errorf("compare.md lacks %q:\n%s", want, md)
		}
	}
	// GitHub Flavored Markdown 0.29 §4.10: every row of the table has the header's cells
	var cells []int
	for _, line := range strings.Split(md, "\n") {
		if strings.HasPrefix(line, "|") {
			cells = append(cells, strings.Count(strings.ReplaceAll(line, `\\`, ""), "|")-strings.Count(strings.ReplaceAll(line, `\\`, ""), `\|`))
		}
	}
	if len(cells) != 4 {
		t.Fatalf("compare.md: %d table lines, want 4 (head, alignment, two cases):\n%s", len(cells), md)
	}
	for i, n := range cells {
		if n != cells[0] {
			t.Errorf("compare.md table line %d: %d cell borders, the head has %d:\n%s", i+1, n, cells[0], md)
		}
	}
	html := read("compare.html")
	if strings.Contains(html, "<script>alert") {
		t.Error("compare.html holds markup from a case name")
	}
	if !strings.Contains(html, "&lt;U+202E&gt;esrever") {
		t.Errorf("compare.html does not show the bidi control visibly")
	}
}

// TestPayloadTerminal runs the real main (as a child process) on the payload campus and on a
// campus with a line feed in an id: what it prints on stdout and stderr holds no raw ESC or
// bidi control and no line an id added, the ids shown escaped.
func TestPayloadTerminal(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	payloadCampus(t, dir)
	// The hub is the building whose id starts with ESC (YAML's \e); every link asks for a
	// diverse route the single trunk cannot give, so plan prints each infeasible leg's id.
	plan := filepath.Join(dir, "esc.yaml")
	src := "name: esc hub\ncampus: [campus.geojson]\nhub: \"\\e[31mRED\"\ndefaults: {rate: 10G, strands: 12, redundancy: diverse}\n"
	if err := os.WriteFile(plan, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	// A building whose id holds a line feed and a forged line, which cannot reach the hub.
	island, err := os.ReadFile("testdata/plans/island.geojson")
	if err != nil {
		t.Fatal(err)
	}
	forged := "hub         HQ: every building can reach it"
	island = []byte(strings.Replace(string(island), `"id":"ISLE"`, `"id":"ISLE\n`+forged+`"`, 1))
	if err := os.WriteFile(filepath.Join(dir, "island.geojson"), island, 0o644); err != nil {
		t.Fatal(err)
	}
	islandPlan := filepath.Join(dir, "island.yaml")
	if err := os.WriteFile(islandPlan, []byte("name: island\ncampus: [island.geojson]\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		args []string
		code int
		want string // on stdout or stderr
	}{
		{[]string{"check", islandPlan}, exitInfeasible, "cannot reach it: [ISLE<U+000A>" + forged + "]"},
		// check, as plan, finds the diverse routes the single trunk cannot give (exit 3).
		{[]string{"check", plan}, exitInfeasible, "hub         <U+001B>[31mRED: every building can reach it"},
		{[]string{"check", plan}, exitInfeasible, "building B<U+202E>evil<U+2066>, <U+001B>[31mRED-B<U+202E>evil<U+2066>/diverse: no diverse route: "},
		{[]string{"plan", plan, "--out", filepath.Join(dir, "out")}, exitInfeasible, "  <U+001B>[31mRED-B<U+202E>evil<U+2066>/diverse: "},
		{[]string{"plan", plan, "--out", filepath.Join(dir, "out2"), "--prices", filepath.Join(dir, "none\x1b[2J.yaml")}, exitInvalid, "none<U+001B>[2J.yaml"},
	} {
		cmd := exec.Command(os.Args[0], tc.args...)
		cmd.Env = append(os.Environ(), "SPANWRIGHT_AS_MAIN=1")
		var stdout, stderr strings.Builder
		cmd.Stdout, cmd.Stderr = &stdout, &stderr
		err := cmd.Run()
		if code := cmd.ProcessState.ExitCode(); code != tc.code {
			t.Errorf("%q: exit %d (%v), want %d\n%s", tc.args, code, err, tc.code, stderr.String())
		}
		assertNoHidden(t, tc.args[0]+" stdout", []byte(stdout.String()))
		assertNoHidden(t, tc.args[0]+" stderr", []byte(stderr.String()))
		all := stdout.String() + stderr.String()
		if !strings.Contains(all, tc.want) {
			t.Errorf("%q: output lacks %q:\n%s", tc.args, tc.want, all)
		}
		if strings.Contains("\n"+all, "\n"+forged) {
			t.Errorf("%q: an id added the line %q:\n%s", tc.args, forged, all)
		}
	}
}
