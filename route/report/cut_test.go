package report

import (
	"context"
	"fmt"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/output"
	"spanwright/route/workbook"
)

// TestDetailTablesCut plans a generated campus with more legs, pull sections and ducts than
// a table lists (DetailRows; common practice, no published source): each table lists
// DetailRows rows, the ones that most need a look, and a note above it says how many there
// are and which file lists every one; the summary counts every row; and bom.xlsx, the file
// the notes name, does list every leg, pull section and duct (read back with excelize).
func TestDetailTablesCut(t *testing.T) {
	if testing.Short() {
		t.Skip("plans a campus of 300 buildings")
	}
	t.Parallel()
	s, p := testplan.CampusSite(t, 300)
	r, err := route.Solve(context.Background(), s, p)
	if err != nil {
		t.Fatal(err)
	}
	e := r.Estimate
	if len(r.Legs) <= DetailRows || len(e.Pulls) <= DetailRows || len(e.Fill) <= DetailRows {
		t.Fatalf("%d legs, %d pull sections, %d ducts: the campus is too small to cut every table", len(r.Legs), len(e.Pulls), len(e.Fill))
	}
	v, err := planViewOf(context.Background(), r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(v.Legs) != DetailRows || len(v.Pulls) != DetailRows || len(v.Ducts) != DetailRows {
		t.Errorf("tables list %d legs, %d pulls, %d ducts; want %d each", len(v.Legs), len(v.Pulls), len(v.Ducts), DetailRows)
	}
	want := map[string]listed{"legs": {DetailRows, len(r.Legs)}, "pulls": {DetailRows, len(e.Pulls)}, "ducts": {DetailRows, len(e.Fill)}}
	got := map[string]listed{"legs": v.LegsListed, "pulls": v.PullsListed, "ducts": v.DuctsListed}
	for k := range want {
		if got[k] != want[k] {
			t.Errorf("%s listed %+v, want %+v", k, got[k], want[k])
		}
	}

	// The legs listed: every infeasible one first, then the feasible ones with the thinnest
	// loss margins, thinnest first.
	infeasible := 0
	var margins []float64
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			infeasible++
		} else if w, ok := l.WorstLoss(); ok && w.LimitDB > 0 {
			margins = append(margins, w.MarginDB)
		}
	}
	slices.Sort(margins)
	if v.Infeasible != infeasible {
		t.Errorf("%d infeasible legs counted, want %d", v.Infeasible, infeasible)
	}
	var listedMargins []string
	for k, row := range v.Legs {
		if row.Feasible != (k >= infeasible) {
			t.Fatalf("row %d (%s %s): feasible %v, want the %d infeasible legs first", k, row.Link, row.Leg, row.Feasible, infeasible)
		}
		if row.Feasible {
			listedMargins = append(listedMargins, row.Margin)
		}
	}
	for k, m := range listedMargins {
		if k >= len(margins) || m != dB(margins[k]) {
			t.Fatalf("feasible row %d shows margin %s; want the thinnest margins in order, %s at this row", k, m, dB(margins[min(k, len(margins)-1)]))
		}
	}

	page, err := Plan(context.Background(), r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	html := string(page)
	for _, note := range []string{
		fmt.Sprintf("%d legs are more than this page lists: these are %d of them", len(r.Legs), DetailRows),
		fmt.Sprintf("%d pull sections are more than this page lists: these are the %d", len(e.Pulls), DetailRows),
		fmt.Sprintf("%d ducts are more than this page lists: these are the %d", len(e.Fill), DetailRows),
		"<tr><th>Pull sections</th><td>" + strconv.Itoa(len(e.Pulls)),
	} {
		if !strings.Contains(html, note) {
			t.Errorf("the report does not say %q", note)
		}
	}
	if n := strings.Count(html, `<tr class="main">`); n != DetailRows {
		t.Errorf("%d link rows in the page, want %d", n, DetailRows)
	}

	// bom.xlsx lists every row the report leaves out.
	files, err := output.Files(context.Background(), r, output.WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	xl, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	defer xl.Close()
	for sheet, n := range map[string]int{"links": len(r.Legs), "pull sections": len(e.Pulls), "duct fill": len(e.Fill)} {
		rows, err := xl.Rows(sheet)
		if err != nil {
			t.Fatal(err)
		}
		if len(rows)-1 != n {
			t.Errorf("bom.xlsx %s: %d rows under the header, want %d", sheet, len(rows)-1, n)
		}
	}
}
