package output

import (
	"bytes"
	"context"
	"encoding/json"
	"slices"
	"strings"
	"testing"

	"spanwright/route/fileset"
	"spanwright/route/internal/testplan"
	"spanwright/route/workbook"
)

// TestPassageOutputs checks that every writer carries a leg's entrances, the buildings it
// passes through and its turns at added handholes (issue 13): links.csv and the workbook's
// links sheet as four last columns, every other column where it was; routes.geojson as
// properties (lists as arrays, [] when empty); summary.json and the terminal as counts.
func TestPassageOutputs(t *testing.T) {
	t.Parallel()
	r := testplan.PassageResult(t, nil, "A", "B", "C", "HH-1")
	files, err := Files(context.Background(), r, WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}

	rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "links.csv"))
	head := rows[0]
	n := slices.Index(head, "reason_code") + 1 // the cable schedule's columns follow it (scheduleHead)
	if got := strings.Join(head[n-6:n], ","); got != "reason,from_entrance,to_entrance,crosses,turns,reason_code" {
		t.Fatalf("links.csv: last columns %s", got)
	}
	// The columns before them keep their places (a user's spreadsheet refers to them by
	// position).
	if got := strings.Join(head[:11], ","); got != "link,leg,from,to,rate,future_rate,strands,route_m,lateral_m,riser_m,pathways" {
		t.Errorf("links.csv: first columns moved: %s", got)
	}
	// Lists in the order of the leg's line, from A to C: HH-1 is met before J0002
	// (TestLegLineFromTo checks the order against the geometry).
	want := map[string]string{"A-C": "A:1,C:1,B,HH-1 J0002", "A-B": "A:1,B:1,,"}
	for _, row := range rows[1:] {
		if len(row) != len(head) {
			t.Errorf("links.csv row %q: %d cells, header has %d", row[0], len(row), len(head))
		}
		if got := strings.Join(row[n-5:n-1], ","); got != want[row[0]] {
			t.Errorf("links.csv %s: passage %q, want %q", row[0], got, want[row[0]])
		}
	}

	var fc struct {
		Features []struct {
			Properties map[string]any `json:"properties"`
		} `json:"features"`
	}
	if err := json.Unmarshal(testplan.FileOf(t, files, "routes.geojson"), &fc); err != nil {
		t.Fatal(err)
	}
	if len(fc.Features) != 2 {
		t.Fatalf("routes.geojson: %d features, want 2", len(fc.Features))
	}
	for _, f := range fc.Features {
		p := f.Properties
		got, _ := json.Marshal([]any{p["from_entrance"], p["to_entrance"], p["crosses"], p["turns"]})
		wantJSON := `["A:1","C:1",["B"],["HH-1","J0002"]]`
		if p["link"] == "A-B" {
			wantJSON = `["A:1","B:1",[],[]]` // RFC 8259: an empty list is [], never null
		}
		if string(got) != wantJSON {
			t.Errorf("routes.geojson %v: from_entrance, to_entrance, crosses, turns %s, want %s", p["link"], got, wantJSON)
		}
	}

	xl, sheet := linksSheet(t, files)
	defer xl.Close()
	xn := slices.Index(sheet[0], "reason code") + 1 // the jacket colour and the labels follow it
	if got := strings.Join(sheet[0][xn-6:xn], ","); got != "note,from entrance,to entrance,buildings crossed,turns at added handholes,reason code" {
		t.Fatalf("bom.xlsx links: last columns %s", got)
	}
	found := false
	for _, row := range sheet[1:] {
		if row[0] == "A-C" {
			found = true
			if got := strings.Join(row[xn-5:xn-1], ","); got != want["A-C"] {
				t.Errorf("bom.xlsx links A-C: %q, want %q", got, want["A-C"])
			}
		}
	}
	if !found {
		t.Error("bom.xlsx links: no row A-C")
	}

	var s Summary
	if err := json.Unmarshal(testplan.FileOf(t, files, "summary.json"), &s); err != nil {
		t.Fatal(err)
	}
	if s.CrossingLegs != 1 || s.TurnHandholes != 2 {
		t.Errorf("summary.json: crossing_legs %d, turn_handholes %d, want 1 and 2", s.CrossingLegs, s.TurnHandholes)
	}
	var out bytes.Buffer
	if err := PrintSummary(&out, r, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	const line = "legs through a building: 1; handholes to add where a route turns between pathways: 2 (see links.csv)\n"
	if !strings.Contains(out.String(), line) {
		t.Errorf("terminal summary lacks %q:\n%s", line, out.String())
	}
}

// TestPassageCounts: a handhole where two legs turn is one handhole; an infeasible leg's
// fields are not counted; without crossings and turns the terminal prints no line of them.
func TestPassageCounts(t *testing.T) {
	t.Parallel()
	r := testplan.PassageResult(t, nil, "A", "B", "C", "J0002")
	_, ab := testplan.LegOf(t, r, "A-B")
	ab.Turns = []string{"J0002"}
	s := Summarize(r)
	// The turn handholes are the bill's (estimate.Construction.TurnJunctions), each once.
	if s.CrossingLegs != 1 || s.TurnHandholes != 1 {
		t.Errorf("crossing_legs %d, turn_handholes %d, want 1 and 1", s.CrossingLegs, s.TurnHandholes)
	}
	for i := range r.Legs {
		r.Legs[i].Feasible = false
	}
	if s := Summarize(r); s.CrossingLegs != 0 {
		t.Errorf("infeasible legs counted: crossing_legs %d", s.CrossingLegs)
	}
	plain, err := testplan.PullSolve(t, 100, 1, nil)
	if err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	if err := PrintSummary(&out, plain, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if strings.Contains(out.String(), "legs through a building") {
		t.Errorf("terminal summary names crossings the plan has none of:\n%s", out.String())
	}
}

// TestPassagePayloads gives the new fields ids that are spreadsheet formulas, bidi controls
// and ESC: links.csv and bom.xlsx show them as text, as every other id, and routes.geojson
// (data for programs) keeps them exactly.
func TestPassagePayloads(t *testing.T) {
	t.Parallel()
	ids := strings.NewReplacer(`"id":"A"`, `"id":"=A1+1"`, `"id":"B"`, `"id":"-B\u202E"`, `"id":"C"`, `"id":"@C\u001b[2J"`,
		`"id":"HH-1"`, `"id":"+HH\u2066"`)
	r := testplan.PassageResult(t, ids, "=A1+1", "-B\u202E", "@C\x1b[2J", "+HH\u2066")
	files, err := Files(context.Background(), r, WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "links.csv"))
	n := slices.Index(rows[0], "reason_code") + 1 // the cable schedule's columns follow it
	var row []string
	for _, rec := range rows[1:] {
		if rec[0] == "'=A1+1-@C<U+001B>[2J" {
			row = rec
		}
	}
	if row == nil {
		t.Fatalf("links.csv has no row of the leg to @C:\n%q", rows)
	}
	wantCells := []string{
		// OWASP CSV injection guidance: a text cell beginning with = + - @ gets a leading quote;
		// Unicode TR #9 / CVE-2021-42574 (Trojan Source) for bidi controls, ECMA-48 for ESC
		"'=A1+1:1", "'@C<U+001B>[2J:1", "'-B<U+202E>", "'+HH<U+2066> J0002",
	}
	if got := row[n-5 : n-1]; !slices.Equal(got, wantCells) {
		t.Errorf("links.csv passage cells %q, want %q", got, wantCells)
	}
	// The payload second in the list (the leg's own order is the line's reversed).
	_, leg := testplan.LegOf(t, r, "=A1+1-@C\x1b[2J")
	leg.Turns = []string{"+HH\u2066", "J0002"}
	files, err = Files(context.Background(), r, WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rows = testplan.ReadCSV(t, testplan.FileOf(t, files, "links.csv"))
	for _, rec := range rows[1:] {
		if rec[0] == row[0] && rec[n-2] != "J0002 +HH<U+2066>" {
			t.Errorf("links.csv turns %q, want %q", rec[n-2], "J0002 +HH<U+2066>")
		}
	}

	// ECMA-376 Part 1 §18.3.1.4: a formula is an f element; text beginning with = is a string.
	xl, sheet := linksSheet(t, files)
	defer xl.Close()
	xn := slices.Index(sheet[0], "reason code") + 1 // the jacket colour and the labels follow it
	checked := 0
	for r, rec := range sheet[1:] {
		if len(rec) < xn || rec[xn-5] != "=A1+1:1" || rec[xn-3] == "" {
			continue // the leg to @C, through -B
		}
		checked++
		if got, want := rec[xn-5:xn-1], []string{"=A1+1:1", "@C<U+001B>[2J:1", "-B<U+202E>", "J0002 +HH<U+2066>"}; !slices.Equal(got, want) {
			t.Errorf("bom.xlsx links passage %q, want %q", got, want)
		}
		if f, err := xl.Formula("links", workbook.Ref(xn-5, r+2)); err != nil || f != "" {
			t.Errorf("bom.xlsx links %s: entrance stored as formula %q (%v)", workbook.Ref(xn-5, r+2), f, err)
		}
	}
	if checked != 1 {
		t.Errorf("bom.xlsx links: %d rows with an entrance, want 1", checked)
	}

	var fc struct {
		Features []struct {
			Properties struct {
				From    string   `json:"from_entrance"`
				To      string   `json:"to_entrance"`
				Crosses []string `json:"crosses"`
				Turns   []string `json:"turns"`
			} `json:"properties"`
		} `json:"features"`
	}
	if err := json.Unmarshal(testplan.FileOf(t, files, "routes.geojson"), &fc); err != nil {
		t.Fatal(err)
	}
	ok := false
	for _, f := range fc.Features {
		p := f.Properties
		ok = ok || p.From == "=A1+1:1" && p.To == "@C\x1b[2J:1" && slices.Equal(p.Crosses, []string{"-B\u202E"}) &&
			slices.Equal(p.Turns, []string{"J0002", "+HH\u2066"})
	}
	if !ok {
		t.Errorf("routes.geojson does not keep the ids exactly: %+v", fc.Features)
	}
}

// linksSheet opens the workbook of files and reads its links sheet.
func linksSheet(t *testing.T, files []fileset.OutputFile) (*workbook.Reader, [][]string) {
	t.Helper()
	xl, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	sheet, err := xl.Rows("links")
	if err != nil {
		xl.Close()
		t.Fatal(err)
	}
	return xl, sheet
}
