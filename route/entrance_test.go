package route_test

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spanwright/media"
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

// TestAddedDuctEntersItsOwnWall: on the pull campus with every duct full, the plan lays a duct
// beside D (one trench, NFPA 70 Chapter 9 Table 1 leaves no room) into A's and B's walls,
// where D's own sleeves are: those entrances are there already, but the new duct cannot use a
// full duct's sleeve, so each wall takes a new penetration, sleeve and firestop
// (building_entrance_each) besides the firestop of the entrance (common practice, no
// published source; firestopping the penetration is NFPA 70 300.21, from memory). The
// optimizer prices it with the added duct's trench (optimize.Edge.AddTrenchCents) and the
// bill bills the same, from the same spans.
func TestAddedDuctEntersItsOwnWall(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, testsite.PullCampus(100, 0), nil)
	if err != nil {
		t.Fatal(err)
	}
	prob, links := problemOf(t, r)
	index := map[string]int{}
	for i := range r.Site.Net.Spans {
		index[r.Site.Net.Spans[i].ID] = i
	}
	builtAt := r.Site.BuiltEntriesAt()
	var modelCents int64
	walls := 0
	for _, f := range r.Fill {
		if f.AddedDucts == 0 {
			continue
		}
		sp := &r.Site.Net.Spans[index[f.Span]]
		walls += builtAt[sp.From] + builtAt[sp.To]
		modelCents += prob.Edges[index[f.Span]].AddTrenchCents
	}
	if walls != 2 {
		t.Fatalf("walls entered by added ducts where a full duct enters: %d, want 2 (A's and B's); fill %+v", walls, r.Fill)
	}
	line, ok := testplan.BOMLine(r.Estimate.BOM, "building entrance for a duct added beside a full one")
	if !ok || line.Quantity != 2 || line.Price.Item != media.PriceEntrance || len(line.From) != 2 {
		t.Fatalf("added ducts' penetrations: %+v, want 2 priced as new entrances, from their two spans", line)
	}
	if line.ExtendedCents != modelCents {
		t.Errorf("bill %s for the added ducts' penetrations, the optimizer %s", media.FormatCents(line.ExtendedCents), media.FormatCents(modelCents))
	}
	if got := objectiveOf(r, prob, r.Engine.PriceBook(), links); got != r.ObjectiveCents {
		t.Errorf("objective of the plan's routes %d cents, the optimizer's %d", got, r.ObjectiveCents)
	}
	// The entrances themselves are still there already: firestopped, not new.
	if firestop, ok := testplan.BOMLine(r.Estimate.BOM, "building entrance already there"); !ok || firestop.Quantity != 2 {
		t.Errorf("firestop at entrances already there: %+v, want 2", firestop)
	}
}
