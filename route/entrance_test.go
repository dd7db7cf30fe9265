package route_test

import (
	"fmt"
	"maps"
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

// TestLegCostUnusedEntrance: a leg's cost does not depend on whether its building has an
// entrance no leg uses. Building C is reached by the existing duct R, off the duct D from the
// hub A; with the proposed duct P drawn to another wall of C as well, C has two entrances
// (and its entrance is the optimizer's charge rather than a constant), of which P's stays
// unused (R costs less than opening P). The legs carry the entrance they use in both cases,
// so their costs and the model cost are the same. The project's own rule (one cost model,
// README "Report"): no outside source.
func TestLegCostUnusedEntrance(t *testing.T) {
	t.Parallel()
	line := func(id, extra string, pts ...float64) string {
		var s []string
		for i := 0; i+1 < len(pts); i += 2 {
			s = append(s, fmt.Sprintf("[%.7f,%.7f]", testsite.X(pts[i]), testsite.Y(pts[i+1])))
		}
		return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":%q,"type":"duct","duct_mm":100%s},"geometry":{"type":"LineString","coordinates":[%s]}}`,
			id, extra, strings.Join(s, ","))
	}
	features := []string{
		testsite.Box("A", "mc", 10, 25), testsite.Box("B", "", 210, 125), testsite.Box("C", "", 300, 25),
		line("D", `,"spare_ducts":2`, 10, 15, 10, 0, 110, 0, 210, 0, 210, 30, 210, 115),
		line("R", `,"spare_ducts":2`, 210, 30, 290, 30),
	}
	withP := append(slices.Clone(features), line("P", `,"status":"proposed","surface":"asphalt"`, 210, 0, 300, 0, 300, 15))
	costs := func(fs []string) (map[string]int64, int64, int) {
		r, err := testplan.PullSolveJSON(t, `{"type":"FeatureCollection","features":[`+strings.Join(fs, ",")+`]}`, nil)
		if err != nil {
			t.Fatal(err)
		}
		out := map[string]int64{}
		var model int64
		for _, l := range r.Legs {
			if !l.Feasible || l.EntranceTo != "C:1" && l.Link.To == "C" {
				t.Fatalf("leg %s/%s: feasible %v, entrance %s; want feasible through R's entrance", l.Link.ID, l.Name, l.Feasible, l.EntranceTo)
			}
			out[l.Link.ID+"/"+l.Name] = l.Cost.TotalCents()
			model += l.Cost.TotalCents()
		}
		return out, model, len(r.Site.Net.EntrancesOf("C"))
	}
	a, modelA, nA := costs(features)
	b, modelB, nB := costs(withP)
	if nA != 1 || nB != 2 {
		t.Fatalf("C has %d entrances without P, %d with; want 1 and 2", nA, nB)
	}
	if !maps.Equal(a, b) || modelA != modelB {
		t.Errorf("leg costs with one entrance %v (model %d), with an unused second %v (model %d); want the same", a, modelA, b, modelB)
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
		if f.AddedDucts == 0 || prob.Edges[index[f.Span]].Proposed { // beside full ducts only
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

// TestEntrancesAtOnePoint: two declared entrances of building C whose laterals reach the
// network at one junction (the end of the proposed duct P at C's wall, the second 4 m along
// the wall) are one way in; the one that stands for both is said in a warning naming the
// other's feature, instead of the second being dropped without a word. The project's own
// rule (README "A building may have any number of entrances"): no outside source.
func TestEntrancesAtOnePoint(t *testing.T) {
	t.Parallel()
	entrance := `,{"type":"Feature","properties":{"kind":"entrance","id":%q,"building":"C"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`
	campus := strings.TrimSuffix(testsite.PullCampus(100, 2), "]}") +
		fmt.Sprintf(entrance, "C-1", testsite.X(300), testsite.Y(15)) + fmt.Sprintf(entrance, "C-2", testsite.X(304), testsite.Y(15)) + "]}"
	r, err := testplan.PullSolveJSON(t, campus, nil)
	if err != nil {
		t.Fatal(err)
	}
	if es := r.Site.Net.EntrancesOf("C"); len(es) != 1 || es[0].ID != "C-1" {
		t.Fatalf("entrances of C: %+v, want C-1 alone", es)
	}
	want := `entrance "C-2" of building "C" reaches the network at the same point as entrance "C-1"`
	found := false
	for _, w := range r.Site.Net.Warnings {
		if strings.Contains(w.Message, want) && strings.Contains(w.Feature, "C-2") {
			found = true
		}
	}
	if !found {
		t.Errorf("no warning %q among %v", want, r.Site.Net.Warnings)
	}
}
