package report

import (
	"bytes"
	"context"
	"database/sql"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	_ "modernc.org/sqlite" // reads plan.gpkg back

	"spanwright/geo/gpkgout"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/workbook"
)

// TestNoDuctShownEverywhere: new duct T, of 40 mm ducts, carries the 33 mm innerducts of three
// links. One innerduct alone fills 33²/40² = 68 %, over the 53 % NFPA 70 Chapter 9 Table 1
// allows one cable (seen), so no duct takes it, however many the new trench gets (it is built
// to size, items.NewDucts: more ducts do not help). The optimizer does not limit new
// construction, so the plan stands; every output then shows T over its limit: the fill sheet (a
// row of its own, ok false), plan.gpkg (fill_ok 0), the report (listed, with a badge) and the
// terminal (a duct fill line).
func TestNoDuctShownEverywhere(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, testsite.FanCampus(40, 0, true), func(p *plan.Plan) {
		p.Design.InnerductODMM, p.Design.InnerductIDMM, p.Design.NewDucts = 33, 27, 1
	})
	if err != nil {
		t.Fatal(err)
	}
	unplaced := 0
	for _, f := range r.Estimate.Fill {
		if f.Span == "T" && f.Unplaced {
			unplaced += len(f.CablesODMM)
		}
	}
	if unplaced != 3 {
		t.Fatalf("T: %d innerducts in no duct, want 3; fill %+v", unplaced, r.Estimate.Fill)
	}

	var term bytes.Buffer
	if err := output.PrintSummary(&term, r, output.WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if want := "duct fill: 3 cables in no duct, on 1 span [T] (see the duct fill sheet of bom.xlsx)\n"; !strings.Contains(term.String(), want) {
		t.Errorf("terminal:\n%s\nwant the line %q", term.String(), want)
	}

	files, err := output.Files(context.Background(), r, output.WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	x, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	defer x.Close()
	found := false
	for row := 2; row < 20; row++ {
		ref := func(col string) string { return fmt.Sprintf("%s%d", col, row) }
		span, _ := x.Value("duct fill", ref("A"))
		duct, _ := x.Value("duct fill", ref("C"))
		if span != "T" || duct != "none" {
			continue
		}
		found = true
		n, _ := x.Value("duct fill", ref("F"))
		ok, _ := x.Value("duct fill", ref("L"))
		if n != "3" || (ok != "FALSE" && ok != "0") {
			t.Errorf("duct fill row %d: %s cables, ok %q; want 3, false", row, n, ok)
		}
	}
	if !found {
		t.Errorf("duct fill sheet: no row of T's cables in no duct")
	}

	dir := t.TempDir()
	path := filepath.Join(dir, "plan.gpkg")
	if err := os.WriteFile(path, testplan.FileOf(t, files, "plan.gpkg"), 0o644); err != nil {
		t.Fatal(err)
	}
	uri, err := gpkgout.URI(path, "mode=ro")
	if err != nil {
		t.Fatal(err)
	}
	db, err := sql.Open("sqlite", uri)
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	var fillOK int
	if err := db.QueryRow(`SELECT fill_ok FROM ` + output.LayerSpans + ` WHERE span = 'T'`).Scan(&fillOK); err != nil || fillOK != 0 {
		t.Errorf("plan.gpkg spans T: fill_ok %d (%v), want 0", fillOK, err)
	}

	page, err := Plan(context.Background(), r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"3 cables fit no duct of their span", "<td>none</td>", "fit no duct"} {
		if !strings.Contains(string(page), want) {
			t.Errorf("report: no %q", want)
		}
	}
	if strings.Contains(string(page), "No duct is over its fill limit.") {
		t.Errorf("report says no duct is over its fill limit")
	}
}
