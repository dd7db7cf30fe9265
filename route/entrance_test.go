package route_test

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestEntranceAlreadyThere: on the pull campus, buildings A and B are reached by the existing
// duct D drawn to their walls, C by the proposed duct P. An existing pathway that reaches a
// wall went through it when it was built, so A's and B's entrances are billed only for
// firestopping the new cables through their sleeves (entrance_firestop_each); C's new duct
// needs a new penetration, sleeve and firestop (building_entrance_each). Firestopping every
// penetration a cable passes through a fire-rated wall is NFPA 70 300.21 (from memory); which
// entries a plan makes new is common practice, no published source. A price book without
// entrance_firestop_each prices all three as new entries: the dearer, not nothing.
func TestEntranceAlreadyThere(t *testing.T) {
	t.Parallel()
	campus := testsite.PullCampus(100, 2)
	r, err := testplan.PullSolveJSON(t, campus, nil)
	if err != nil {
		t.Fatal(err)
	}
	built := map[string]bool{}
	for _, en := range r.Estimate.Construction.Entrances {
		built[en.Building] = en.Built
	}
	if want := map[string]bool{"A": true, "B": true, "C": false}; len(built) != 3 || built["A"] != want["A"] || built["B"] != want["B"] || built["C"] != want["C"] {
		t.Fatalf("entrances built already: %v, want %v", built, want)
	}
	firestop, ok := testplan.BOMLine(r.Estimate.BOM, "building entrance already there")
	if !ok || firestop.Quantity != 2 {
		t.Errorf("firestop at entrances already there: %+v, want 2", firestop)
	}
	if !slices.Equal(firestop.From, []string{"entrance A:1 of building A", "entrance B:1 of building B"}) {
		t.Errorf("firestop's sources %q, want A's and B's entrances", firestop.From)
	}
	if got := testplan.BOMQty(r.Estimate.BOM, "building entrance: penetration, sleeve, firestop"); got != 1 {
		t.Errorf("new entrances: %v, want 1 (C's)", got)
	}

	// Without the firestop price, every entrance is priced as a new one.
	book, err := os.ReadFile(filepath.Join("..", "media", "prices-demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	book = []byte(strings.Replace(string(book), "entrance_firestop_each: 190.00\n", "", 1))
	if err := os.WriteFile(filepath.Join(dir, "prices.yaml"), book, 0o644); err != nil {
		t.Fatal(err)
	}
	r, err = testplan.PullSolveJSON(t, campus, func(p *plan.Plan) { p.Dir, p.Prices = dir, "prices.yaml" })
	if err != nil {
		t.Fatal(err)
	}
	if got := testplan.BOMQty(r.Estimate.BOM, "building entrance: penetration, sleeve, firestop"); got != 3 {
		t.Errorf("a book without entrance_firestop_each: %v new entrances, want 3", got)
	}
	if _, ok := testplan.BOMLine(r.Estimate.BOM, "building entrance already there"); ok {
		t.Error("a book without entrance_firestop_each bills a firestop line")
	}
}
