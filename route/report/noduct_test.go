package report

import (
	"bytes"
	"context"
	"database/sql"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	_ "modernc.org/sqlite" // reads plan.gpkg back

	"spanwright/geo/gpkgout"
	"spanwright/route/estimate"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/workbook"
)

// TestNoDuctShownEverywhere: new duct T, of 100 mm ducts, carries the 33 mm innerducts of
// three links; a duct takes two of them (the third is in the jam band, NFPA 70 Chapter 9
// Table 1 Informational Note No. 2, seen), so the optimizer builds T with two ducts. The
// optimizer never leaves a cable in no duct (a cable no empty duct takes makes its span over
// capacity), so the test takes the solved plan and bills it as if T had one duct, the only way
// a bill can hold a cable in no duct: every output must then show T over its limit: the fill
// sheet (a row of its own, ok false), plan.gpkg (fill_ok 0), the report (listed, with a
// badge) and the terminal (a duct fill line).
func TestNoDuctShownEverywhere(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, testsite.FanCampus(100, 0, true), func(p *plan.Plan) {
		p.Design.InnerductODMM, p.Design.InnerductIDMM, p.Design.NewDucts = 33, 27, 1
	})
	if err != nil {
		t.Fatal(err)
	}
	fill := slices.Clone(r.Fill)
	for i := range fill {
		if fill[i].Span == "T" {
			if fill[i].AddedDucts != 2 {
				t.Fatalf("T: %d ducts laid, want 2 (three innerducts, two to a duct)", fill[i].AddedDucts)
			}
			fill[i].AddedDucts = 1
		}
	}
	e, err := estimate.Build(context.Background(), estimate.Input{Site: r.Site, Plan: r.Plan, Engine: r.Engine, Legs: r.Legs, Fill: fill,
		Opened: r.Opened, Handholes: r.Handholes, Entrances: r.Estimate.Construction.Entrances})
	if err != nil {
		t.Fatal(err)
	}
	r.Fill, r.Estimate = fill, e
	unplaced := 0
	for _, f := range r.Estimate.Fill {
		if f.Span == "T" && f.Unplaced {
			unplaced += len(f.CablesODMM)
		}
	}
	if unplaced != 1 {
		t.Fatalf("T: %d innerducts in no duct, want 1; fill %+v", unplaced, r.Estimate.Fill)
	}

	var term bytes.Buffer
	if err := output.PrintSummary(&term, r, output.WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if want := "duct fill: 1 cable in no duct, on 1 span [T] (see the duct fill sheet of bom.xlsx)\n"; !strings.Contains(term.String(), want) {
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
		if n != "1" || (ok != "FALSE" && ok != "0") {
			t.Errorf("duct fill row %d: %s cables, ok %q; want 1, false", row, n, ok)
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
	for _, want := range []string{"1 cable fits no duct of its span", "<td>none</td>", "fit no duct"} {
		if !strings.Contains(string(page), want) {
			t.Errorf("report: no %q", want)
		}
	}
	if strings.Contains(string(page), "No duct is over its fill limit.") {
		t.Errorf("report says no duct is over its fill limit")
	}
}
