package output

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"maps"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route"
	"spanwright/route/estimate"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestNotPricedListed plans the demo with a price book that leaves out the optional prices
// of building entrances, the firestop of entrances there already and patch cords. A bid lists
// what it does not price as exclusions, with their quantities (common practice, no published
// source): the bill keeps a line for each with the quantity the plan needs and no price, in
// bom.csv too; the total is the sum of the priced lines; one warning per price left out names
// the book and the key, among the warnings and on the terminal.
func TestNotPricedListed(t *testing.T) {
	t.Parallel()
	r, path := notPricedResult(t)
	b, con := r.Estimate.BOM, r.Estimate.Construction

	var newEntries, builtEntries float64
	for _, en := range con.Entrances {
		if en.Built {
			builtEntries++
		} else {
			newEntries++
		}
	}
	cords := 0.0
	for _, l := range r.Legs {
		if l.Feasible {
			cords += 2
		}
	}
	want := map[string]float64{ // item prefix → quantity the plan needs
		"building entrance: penetration":            newEntries,
		"building entrance already there":           builtEntries,
		"building entrance for a duct added beside": float64(con.AddedDuctWalls),
		"patch cord ": cords,
	}
	got := map[string]float64{}
	var priced int64
	for _, l := range b.Lines {
		for prefix := range want {
			if strings.HasPrefix(l.Item, prefix) {
				got[prefix] += l.Quantity
				if !l.NotPriced || l.ExtendedCents != 0 {
					t.Errorf("%s: not priced %v, extended %d", l.Item, l.NotPriced, l.ExtendedCents)
				}
			}
		}
		if !l.NotPriced {
			priced += l.ExtendedCents
		} else if !strings.Contains(l.NotPricedText(), "not priced") {
			t.Errorf("%s: text %q", l.Item, l.NotPricedText())
		}
	}
	for prefix, n := range want {
		if got[prefix] != n {
			t.Errorf("%q: quantity %g in the bill, the plan needs %g", prefix, got[prefix], n)
		}
	}
	if newEntries+builtEntries == 0 || cords == 0 {
		t.Fatalf("the demo uses %g entrances and %g patch cords: nothing to test", newEntries+builtEntries, cords)
	}
	if priced != b.SubtotalCents {
		t.Errorf("priced lines sum to %d, subtotal %d", priced, b.SubtotalCents)
	}

	files, err := Files(context.Background(), r, WriteOptions{SkipWorkbook: true})
	if err != nil {
		t.Fatal(err)
	}
	rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "bom.csv"))
	n := 0
	for _, row := range rows[1:] {
		if strings.HasPrefix(row[4], "not priced (no ") {
			n++
			if row[5] != "" || row[3] == "" || row[3] == "0" {
				t.Errorf("bom.csv row %q: want a quantity and no extended price", row)
			}
		}
	}
	lines := 0
	for _, l := range b.Lines {
		if l.NotPriced {
			lines++
		}
	}
	if n != lines || n < 3 {
		t.Errorf("bom.csv: %d rows not priced, the bill %d; want one per line and at least 3 (new entrance, firestop, patch cords)", n, lines)
	}
	// summary.json names the keys, in bill order (material first), for programs; the report
	// and a sweep's comparison print Summary.NotPricedNote.
	sum := Summarize(r)
	if want := []string{"patch_cords_each", "building_entrance_each", "entrance_firestop_each"}; !slices.Equal(sum.NotPriced, want) {
		t.Errorf("summary not_priced %q, want %q", sum.NotPriced, want)
	}
	if !strings.Contains(string(testplan.FileOf(t, files, "summary.json")), `"not_priced": [`) {
		t.Errorf("summary.json has no not_priced")
	}
	if got := Summarize(testplan.DemoResult(t)); got.NotPriced != nil || got.NotPricedNote() != "" {
		t.Errorf("demo: not priced %q, note %q", got.NotPriced, got.NotPricedNote())
	}
	keys := []string{"building_entrance_each", "entrance_firestop_each", "patch_cords_each"}
	var term bytes.Buffer
	if err := PrintSummary(&term, r, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	for _, k := range keys {
		w := 0
		for _, x := range r.Warnings {
			if strings.HasPrefix(x, path+": "+k+": not in the price book, so not priced") {
				w++
			}
		}
		if w != 1 {
			t.Errorf("%s: %d warnings, want 1: %q", k, w, r.Warnings)
		}
		if !strings.Contains(term.String(), "warning: "+path+": "+k+": not in the price book") {
			t.Errorf("terminal lacks the warning for %s:\n%s", k, term.String())
		}
	}
	// The demo book prices them all: no line of it is left unpriced.
	for _, l := range testplan.DemoResult(t).Estimate.BOM.Lines {
		if l.NotPriced {
			t.Errorf("demo: %s not priced", l.Item)
		}
	}
}

// notPricedResult plans the demo with a copy of the demo price book without
// building_entrance_each, entrance_firestop_each and patch_cords_each, and returns the result
// and the book's path.
func notPricedResult(t *testing.T) (*route.Result, string) {
	t.Helper()
	data, err := os.ReadFile(filepath.Join("..", "..", "media", "prices-demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "prices.yaml")
	if err := os.WriteFile(path, testplan.DropPriceKeys(data, "building_entrance_each", "entrance_firestop_each", "patch_cords_each"), 0o644); err != nil {
		t.Fatal(err)
	}
	s, p := testsite.Demo(t)
	q := *p
	q.Prices = path
	return testplan.SolvePlan(t, s, &q), path
}

// TestNotPricedWorkbook reads bom.xlsx of the demo without the optional prices with openpyxl:
// a line not priced keeps its quantity, has the words in place of the unit price and no
// extended price, and the total recomputed from the priced lines is the bill's.
func TestNotPricedWorkbook(t *testing.T) {
	t.Parallel()
	py := testplan.Openpyxl(t)
	r, _ := notPricedResult(t)
	files, err := Files(context.Background(), r, WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "bom.xlsx")
	if err := os.WriteFile(path, testplan.FileOf(t, files, "bom.xlsx"), 0o644); err != nil {
		t.Fatal(err)
	}
	script := `import sys, openpyxl
from decimal import Decimal, ROUND_HALF_UP
ws = openpyxl.load_workbook(sys.argv[1], data_only=True)["bill of materials"]
total, notpriced, sub = None, 0, Decimal(0)
for row in ws.iter_rows(min_row=2, values_only=True):
    a, d, e, f = row[0], row[3], row[4], row[5]
    if a in ("material", "labour", "construction", "optics", "bid items"):
        if isinstance(e, str) and e.startswith("not priced (no "):
            assert d and d > 0 and f is None, row
            notpriced += 1
        else:
            sub += Decimal(repr(f))
    elif a == "subtotal" and row[1] == "all categories":
        total = Decimal(repr(f))
print(notpriced, int(sub * 100), int(total * 100))
`
	out, err := exec.Command(py, "-c", script, path).CombinedOutput()
	if err != nil {
		t.Fatalf("openpyxl: %v\n%s", err, out)
	}
	b := r.Estimate.BOM
	n := 0
	for _, l := range b.Lines {
		if l.NotPriced {
			n++
		}
	}
	if want := fmt.Sprintf("%d %d %d\n", n, b.SubtotalCents, b.SubtotalCents); string(out) != want {
		t.Errorf("openpyxl read %q, want %q (lines not priced, priced lines' sum, subtotal in cents)", out, want)
	}
}

// TestPricedNoteInBill: a plan with infeasible legs says in bom.csv and bom.xlsx, after the
// total, the sentence the terminal and the report print beside it (Summary.PricedNote), so
// an estimator handed the bill alone knows what it leaves out (tester 5, finding 9).
func TestPricedNoteInBill(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	for _, i := range []int{1, 3} {
		r.Legs[i].Feasible, r.Legs[i].Reason = false, "made infeasible by the test"
	}
	note := Summarize(r).PricedNote()
	if note == "" || PricedNoteOf(r) != note {
		t.Fatalf("note %q, PricedNoteOf %q", note, PricedNoteOf(r))
	}
	files, err := Files(context.Background(), r, WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "bom.csv"))
	// The total, this note, then the safety pointer (SafetyNote).
	if n := len(rows); n < 3 || rows[n-3][0] != rowTotal || rows[n-2][0] != rowNote || rows[n-2][1] != note || rows[n-1][1] != SafetyNote(r) {
		t.Errorf("bom.csv ends %q, want the total, %q and the safety note", rows[max(0, n-3):], note)
	}
	var term bytes.Buffer
	if err := PrintSummary(&term, r, WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(term.String(), "warning: "+note+"\n") {
		t.Errorf("terminal lacks %q:\n%s", note, term.String())
	}
	py := testplan.Openpyxl(t)
	path := filepath.Join(t.TempDir(), "bom.xlsx")
	if err := os.WriteFile(path, testplan.FileOf(t, files, "bom.xlsx"), 0o644); err != nil {
		t.Fatal(err)
	}
	script := `import sys, openpyxl
wb = openpyxl.load_workbook(sys.argv[1])
for name in ("bill of materials", "summary"):
    rows = [r for r in wb[name].iter_rows(values_only=True) if r and r[0] is not None]
    i = [r[0] for r in rows].index("note")
    print(rows[i - 1][0], "|", rows[i][1])
`
	out, err := exec.Command(py, "-c", script, path).CombinedOutput()
	if err != nil {
		t.Fatalf("openpyxl: %v\n%s", err, out)
	}
	if want := "total | " + note + "\ntotal | " + note + "\n"; string(out) != want {
		t.Errorf("bom.xlsx: got\n%s\nwant\n%s", out, want)
	}
}

// TestSplicePointsNotPriced plans the demo with reels of 400 m (tester 6's finding 6): some
// mid-span splices have no maintenance hole or handhole within their reel's reach, and each
// such place needs a splice point built (a handhole, or a closure on an aerial strand). With
// the demo book, which has no splice_point_each, the bill lists them with their count and no
// price, and summary.json's not_priced and the total's note name the key; with the price, the
// line is priced at it. One splice point per place, whatever the legs and cables that join
// there (common practice, no published source: one structure serves every cable through it).
func TestSplicePointsNotPriced(t *testing.T) {
	t.Parallel()
	s, p := testsite.Demo(t)
	q := *p
	q.Design.ReelM = 400
	r := testplan.SolvePlan(t, s, &q)
	places := map[string]bool{}
	for _, l := range r.Legs {
		for _, sp := range l.Cable.Splices {
			if l.Feasible && sp.NoStructure {
				places[sp.Text(func(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) })] = true
			}
		}
	}
	if len(places) == 0 {
		t.Fatal("no mid-span splice without a structure: nothing to test")
	}
	line, ok := testplan.BOMLine(r.Estimate.BOM, estimate.SplicePointItem)
	if !ok || line.Quantity != float64(len(places)) || !line.NotPriced || line.ExtendedCents != 0 {
		t.Errorf("splice point line %+v (found %v), want %d not priced", line, ok, len(places))
	}
	sum := Summarize(r)
	if !slices.Contains(sum.NotPriced, "splice_point_each") || !strings.Contains(sum.NotPricedNote(), "splice_point_each") {
		t.Errorf("summary not_priced %q, note %q: want splice_point_each", sum.NotPriced, sum.NotPricedNote())
	}

	// Priced, a leg may take a join more in a structure where that costs less than the splice
	// point it spares (routing's joinsCents, TestJoinsCheaperInStructures): as many or fewer
	// places, each at 2400.00.
	q.Prices = testplan.DemoBookWith(t, "splice_point_each: 2400.00\n")
	r2 := testplan.SolvePlan(t, s, &q)
	line, ok = testplan.BOMLine(r2.Estimate.BOM, estimate.SplicePointItem)
	if !ok || line.NotPriced || line.Quantity > float64(len(places)) || line.ExtendedCents != int64(line.Quantity)*240000 {
		t.Errorf("priced: splice point line %+v (found %v), want at most %d at 2400.00", line, ok, len(places))
	}
	if got := Summarize(r2).NotPriced; slices.Contains(got, "splice_point_each") {
		t.Errorf("priced: not_priced %q", got)
	}
	// The other lines (a percentage bid item aside, whose base grows with it) go up by no more
	// than the splice points the first plan builds, priced: a join kept in a structure costs
	// less than the splice point it spares.
	lines := func(b *media.BOM) (c int64) {
		for _, l := range b.Lines {
			if l.Category != media.CategoryBidItems {
				c += l.ExtendedCents
			}
		}
		return c
	}
	if d := lines(r2.Estimate.BOM) - lines(r.Estimate.BOM); d > int64(len(places))*240000 || d < int64(line.Quantity)*240000 {
		t.Errorf("priced: lines up by %d cents, want from %d to %d", d, int64(line.Quantity)*240000, int64(len(places))*240000)
	}
}

// TestSplicePointsInStructuresTable plans the demo with reels of 400 m and holds the structures
// table (and so plan.gpkg's structures layer and report) and the added_structures layer to the
// bill: every splice point to build on a span is a "to build" row of purpose splice at the
// place the leg's join was put, naming the legs that join there, one row a place (review 4
// F8: the bill counted them, no table listed them). Expected places are taken from the legs'
// joins, keyed by span and offset to 0.1 m (the schedule's precision), not from the bill.
func TestSplicePointsInStructuresTable(t *testing.T) {
	t.Parallel()
	r := reelDemo(t)
	want := legJoins(r, false)
	if len(want) == 0 {
		t.Fatal("no splice point to build on a span: nothing to test")
	}
	rows, err := StructuresOf(r)
	if err != nil {
		t.Fatal(err)
	}
	got := map[joinKey][]string{}
	for _, st := range rows {
		if st.Purpose != PurposeSplice {
			continue
		}
		k := joinKey{"", st.Span, int64(math.Round(st.AtM * 10))}
		if _, twice := got[k]; twice || st.Status != StructureToBuild || st.Type != geo.StructureHandhole && st.Type != TypeSpliceClosure {
			t.Errorf("splice row %+v: want one %s handhole or closure a place", st, StructureToBuild)
		}
		got[k] = st.Legs
	}
	if !maps.EqualFunc(got, want, slices.Equal) {
		t.Errorf("structures table's splice points %v, the legs' joins %v", got, want)
	}
	line, ok := testplan.BOMLine(r.Estimate.BOM, estimate.SplicePointItem)
	if !ok || line.Quantity != float64(len(r.Estimate.SplicePoints)) || len(r.Estimate.SplicePoints) < len(want) {
		t.Errorf("bill's splice points %v, estimate's list %d, on spans %d", line.Quantity, len(r.Estimate.SplicePoints), len(want))
	}
}

// TestAerialSplicePointIsAClosure: hub A and building C 1,200 m apart on one existing aerial
// span, with reels of 500 m: no structure on the pole line takes the joins, so each is a
// splice point to build, and on an aerial span that is a splice closure on the strand, not a
// handhole (tester 8 finding 16: "new handhole on A-1 at 136.3 m", typed splice closure): its
// type is the closure and its place names no handhole. Common practice, no published source
// (aerial cable is joined in a closure lashed to the strand).
func TestAerialSplicePointIsAClosure(t *testing.T) {
	t.Parallel()
	line := fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"AER","type":"aerial"},"geometry":{"type":"LineString","coordinates":[[%.7f,%.7f],[%.7f,%.7f]]}}`,
		testsite.X(10), testsite.Y(0), testsite.X(1200), testsite.Y(0))
	campus := `{"type":"FeatureCollection","features":[` + strings.Join([]string{testsite.Box("A", "mc", 0, 0), testsite.Box("C", "", 1210, 0), line}, ",") + `]}`
	r, err := testplan.PullSolveJSON(t, campus, func(p *plan.Plan) { p.Design.ReelM = 500 })
	if err != nil {
		t.Fatal(err)
	}
	rows, err := StructuresOf(r)
	if err != nil {
		t.Fatal(err)
	}
	metres := func(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) + " m" }
	n := 0
	for _, st := range rows {
		if st.Purpose != PurposeSplice {
			continue
		}
		n++
		if place := st.Place(metres); st.Type != TypeSpliceClosure || strings.Contains(place, "handhole") || !strings.HasPrefix(place, "new splice closure on AER, ") {
			t.Errorf("splice point on the aerial span: type %q, place %q; want a splice closure on the strand, no handhole", st.Type, place)
		}
	}
	if n == 0 {
		t.Fatalf("no splice point to build on the aerial span: %+v", rows)
	}
}

// TestJoinsInStructuresTable plans the demo with reels of 400 m and holds the structures table
// (and so the report's, bom.xlsx's structures sheet and plan.gpkg's structures layer) and
// links.csv to the legs' joins (routing.CableTakeoff.Splices): a structure where a leg's
// mid-span join is placed, existing or a handhole the plan adds, has the purpose splice closure
// and names the leg among those joined there, and no other row does; links.csv's last column
// lists each leg's join places as the links sheet does (tester 8 finding 3: the joins showed
// only in the links sheet). A splice closure is stored in the structure with its slack
// (TIA-758-B, from memory).
func TestJoinsInStructuresTable(t *testing.T) {
	t.Parallel()
	r := reelDemo(t)
	want := legJoins(r, true)
	if len(want) == 0 {
		t.Fatal("no join in a structure: nothing to test")
	}
	rows, err := StructuresOf(r)
	if err != nil {
		t.Fatal(err)
	}
	got := map[joinKey][]string{}
	for _, st := range rows {
		closure := strings.HasSuffix(st.Purpose, ", "+PurposeSpliceClosure)
		switch {
		case st.Purpose == PurposeSplice: // a splice point to build: TestSplicePointsInStructuresTable
			if !slices.Equal(st.Joined, st.Legs) {
				t.Errorf("splice point %d: joined %v, want its legs %v", st.Mark, st.Joined, st.Legs)
			}
		case closure != (len(st.Joined) > 0):
			t.Errorf("structure %d %s: purpose %q with legs joined %v", st.Mark, st.ID, st.Purpose, st.Joined)
		case closure:
			got[joinKey{st.ID, st.Span, int64(math.Round(st.AtM * 10))}] = st.Joined
			for _, l := range st.Joined {
				if !slices.Contains(st.Legs, l) {
					t.Errorf("structure %d %s: %s joined there but not through it (%v)", st.Mark, st.ID, l, st.Legs)
				}
			}
		}
	}
	if !maps.EqualFunc(got, want, slices.Equal) {
		t.Errorf("structures table's joins %v, the legs' joins %v", got, want)
	}
	files, err := Files(context.Background(), r, WriteOptions{SkipGeoPackage: true})
	if err != nil {
		t.Fatal(err)
	}
	csvRows := testplan.ReadCSV(t, testplan.FileOf(t, files, "links.csv"))
	last := len(csvRows[0]) - 2 // before the safety pointer (SafetyNote)
	if csvRows[0][last] != "mid_span_splices_at" {
		t.Fatalf("links.csv's last column but one is %q", csvRows[0][last])
	}
	joins := 0
	for i, l := range r.Legs {
		want := ""
		if l.Feasible {
			want = SplicesText(WriteOptions{}, l.Cable.Splices)
			joins += len(l.Cable.Splices)
		}
		if got := csvRows[i+1][last]; got != want {
			t.Errorf("links.csv %s: joins at %q, want %q", l.Label(), got, want)
		}
	}
	if joins < len(want) {
		t.Errorf("links.csv lists %d joins, fewer than the %d places", joins, len(want))
	}
}

// reelDemo is the demo planned with reels of 400 m, which joins cables mid-span.
func reelDemo(t *testing.T) *route.Result {
	t.Helper()
	return reelDemoOf(t, 400)
}

// reelDemoOf is the demo planned with reels of reelM metres.
func reelDemoOf(t *testing.T, reelM float64) *route.Result {
	t.Helper()
	return testplan.DemoDesign(t, func(d *plan.Design) { d.ReelM = reelM })
}

// joinKey is a place of a mid-span join: a structure by id, or a span and decimetres from its
// from end (the schedule's precision).
type joinKey struct {
	id, span string
	dm       int64
}

// legJoins is the feasible legs' mid-span joins (routing.CableTakeoff.Splices) by place, each
// with the legs joined there in leg order: those placed in structures (inStructure), or else
// the splice points to build on spans.
func legJoins(r *route.Result, inStructure bool) map[joinKey][]string {
	out := map[joinKey][]string{}
	for _, l := range r.Legs {
		for _, sp := range l.Cable.Splices {
			if !l.Feasible || sp.NoStructure == inStructure || !inStructure && sp.Span == "" {
				continue
			}
			k := joinKey{sp.ID, sp.Span, int64(math.Round(sp.AtM * 10))}
			if !inStructure {
				k.id = "" // a splice point's ID is the building its distance along the cable counts from
			}
			if !slices.Contains(out[k], l.Label()) {
				out[k] = append(out[k], l.Label())
			}
		}
	}
	return out
}

// TestPullsEndAtSplicePoints: a splice point to build on a duct span is where one reel ends
// and the next begins, so no pull runs through it: a pull section of the leg ends there
// (tester 9's finding 3: a 5.9 km pull through the joins of 3.8 km reels, within rating on
// paper, which no reel could carry). The demo with 250 m reels has one, ENG-LDG's on S-LDG.
func TestPullsEndAtSplicePoints(t *testing.T) {
	t.Parallel()
	r := reelDemoOf(t, 250)
	checked := 0
	for i, l := range r.Legs {
		if !l.Feasible {
			continue
		}
		for _, p := range l.Cable.Splices {
			sp, ok := r.Site.Net.Span(p.Span)
			if !p.NoStructure || !ok || sp.Type != geo.TypeDuct {
				continue
			}
			at := func(q estimate.PullPoint) bool { return q.Span == p.Span && math.Abs(q.AtM-p.AtM) < 0.05 }
			if !slices.ContainsFunc(r.Estimate.Pulls, func(ps estimate.PullSection) bool { return ps.Leg == i && (at(ps.From) || at(ps.To)) }) {
				t.Errorf("%s: no pull ends at its splice point on %s at %.1f m", l.Label(), p.Span, p.AtM)
			}
			checked++
		}
	}
	if checked == 0 {
		t.Fatal("no splice point to build on a duct span: nothing to test")
	}
}

// TestCrewEntriesFollowTheStructuresTable plans the demo with reels of 300 m, so that joins
// fall where no structure is (one on S-LDG, a handhole; three on the pole line, closures) (splice points to build), and holds the bill's crew entries
// to the structures table (tester 11's finding 5: the splice point the plan builds had no entry):
// each cable of each leg is entered once into every maintenance hole and handhole row that
// lists the leg, the splice points to build that are handholes among them, but a pull box
// (no slack loop stored, no entry) and the pulling plan's added pull points, which the README
// leaves to the pulls. And every splice point to build starts a pull of its own (the next
// reel), so the set-ups grow by one per cable joined there over the demo's reels of 4,000 m.
// README "Crews": a set-up per pull between pull points, an entry per cable per maintenance
// hole or handhole passed (common practice, no published source).
func TestCrewEntriesFollowTheStructuresTable(t *testing.T) {
	t.Parallel()
	r := reelDemoOf(t, 300)
	rows, err := StructuresOf(r)
	if err != nil {
		t.Fatal(err)
	}
	cables := map[string]int{}
	for _, l := range r.Legs {
		if l.Feasible {
			cables[l.Label()] = len(l.Cable.Cables)
		}
	}
	want, handholeSplices := 0, 0
	for _, st := range rows {
		if st.Type == geo.StructurePullBox || st.Type == TypeSpliceClosure || st.Purpose == PurposePull {
			continue
		}
		if st.Purpose == PurposeSplice {
			handholeSplices++
		}
		for _, leg := range st.Legs {
			want += cables[leg]
		}
	}
	if handholeSplices == 0 {
		t.Fatal("no splice point to build as a handhole: nothing to test")
	}
	entries, ok := testplan.BOMLine(r.Estimate.BOM, "crew entry into a structure, per cable")
	if !ok || entries.Quantity != float64(want) {
		t.Errorf("bill's crew entries %v (found %v), the structures table's %d", entries.Quantity, ok, want)
	}

	// The set-ups: the same plan's legs with their splice points to build taken out add one
	// set-up per cable per such join, and no other line of crew labour moves.
	extra := 0
	for _, l := range r.Legs {
		for _, sp := range l.Cable.Splices {
			if l.Feasible && sp.NoStructure {
				extra += len(l.Cable.Cables)
			}
		}
	}
	setups, _ := testplan.BOMLine(r.Estimate.BOM, "crew set-up, per pull")
	pulls := 0
	for _, l := range r.Legs {
		if !l.Feasible {
			continue
		}
		points := 1 // the pulls of a cable are its pull points passed plus one
		for _, j := range r.Site.JunctionsOf(l.Steps) {
			if r.Site.IsStructure(j) {
				points++
			}
		}
		pulls += len(l.Cable.Cables) * (points + l.Cable.AddedStructures)
	}
	if setups.Quantity != float64(pulls+extra) {
		t.Errorf("bill's crew set-ups %v, want %d: %d from the structures and handholes passed, %d from the splice points to build", setups.Quantity, pulls+extra, pulls, extra)
	}
}

// TestCautionsNameEveryPit holds the excavation cautions to the structures table (tester 11's
// finding 1): every handhole the table lists to build is a pit a crew digs and enters, which
// the cave-in caution names and the locates count (29 CFR 1926.650(b): an excavation is any
// man-made cut, cavity, trench or depression formed by earth removal, from memory; one-call
// laws, from memory); a splice closure on an aerial strand digs nothing. The demo with reels
// of 300 m builds a splice point in a handhole on S-LDG and three closures on the pole line.
func TestCautionsNameEveryPit(t *testing.T) {
	t.Parallel()
	for _, reelM := range []float64{300, 4000} {
		r := reelDemoOf(t, reelM)
		rows, err := StructuresOf(r)
		if err != nil {
			t.Fatal(err)
		}
		var pits []string
		for _, st := range rows {
			if st.Status == StructureToBuild && st.Type == geo.StructureHandhole {
				pits = append(pits, st.Place(estimate.MetresText))
			}
		}
		where := map[string]string{}
		for _, c := range r.Cautions {
			where[c.ID] = c.Where
		}
		count := Counted(len(pits), "handhole to set", "handholes to set")
		if !strings.Contains(where[route.CautionLocates], count) || !strings.Contains(where[route.CautionTrench], count+": ") {
			t.Errorf("reels of %g m: %d handholes to build in the structures table; locates %q, cave-in %q", reelM, len(pits), where[route.CautionLocates], where[route.CautionTrench])
		}
		for _, p := range pits {
			if !strings.Contains(where[route.CautionTrench], p) {
				t.Errorf("reels of %g m: the cave-in caution does not name %q: %q", reelM, p, where[route.CautionTrench])
			}
		}
		// In feet, as the structures table of an imperial run writes each place (1 ft =
		// 0.3048 m exactly), not the metric text converted (a 0.1 ft difference).
		feet := func(m float64) string { return LengthText(WriteOptions{Units: UnitsImperial}, m) }
		for _, c := range r.Cautions {
			if c.ID != route.CautionTrench {
				continue
			}
			for _, st := range rows {
				if st.Status == StructureToBuild && st.Type == geo.StructureHandhole && !strings.Contains(c.WhereIn(feet), st.Place(feet)) {
					t.Errorf("reels of %g m: in feet, the cave-in caution %q does not name %q", reelM, c.WhereIn(feet), st.Place(feet))
				}
			}
			if c.WhereIn(estimate.MetresText) != c.Where {
				t.Errorf("reels of %g m: in metres the cave-in caution says %q, not its Where %q", reelM, c.WhereIn(estimate.MetresText), c.Where)
			}
		}
		// The terminal says the splice points to build beside its handholes, which leave them
		// out (the bill's handhole lines), so that its figures add up to the cautions'.
		var term bytes.Buffer
		if err := PrintSummary(&term, r, WriteOptions{}); err != nil {
			t.Fatal(err)
		}
		s := Summarize(r)
		// summary.json counts them too, the terminal's figure (review 15 F6: a reader of the
		// JSON could not reconcile its handholes with the cautions').
		if s.SplicePointsToBuild != len(r.Estimate.SplicePoints) {
			t.Errorf("reels of %g m: splice_points_to_build %d, the bill's splice points %d", reelM, s.SplicePointsToBuild, len(r.Estimate.SplicePoints))
		}
		if js, err := json.Marshal(s); err != nil || !strings.Contains(string(js), fmt.Sprintf(`"splice_points_to_build":%d,`, len(r.Estimate.SplicePoints))) {
			t.Errorf("reels of %g m: summary.json lacks splice_points_to_build %d: %s %v", reelM, len(r.Estimate.SplicePoints), js, err)
		}
		if reelM == 300 && s.SplicePointsToBuild == 0 {
			t.Errorf("reels of 300 m: no splice point to build: the count is not tested")
		}
		want := fmt.Sprintf("(%s to build in all, with the %d where routes turn)", Counted(s.HandholesToBuild, "handhole", "handholes"), s.TurnHandholes)
		if n := len(r.Estimate.SplicePoints); n > 0 {
			want = fmt.Sprintf("(%s to build in all, with the %d where routes turn; and %s to build)", Counted(s.HandholesToBuild, "handhole", "handholes"), s.TurnHandholes,
				Counted(n, "splice point", "splice points"))
		}
		if !strings.Contains(term.String(), want) {
			t.Errorf("reels of %g m: terminal lacks %q:\n%s", reelM, want, term.String())
		}
		dug := 0
		for _, sp := range r.Estimate.SplicePoints {
			if sp.At.BuildsHandhole(r.Site.Net) {
				dug++
			}
		}
		if s.HandholesToBuild+dug != len(pits) {
			t.Errorf("reels of %g m: %d handholes to build and %d splice points dug, the cautions' %d handholes to set", reelM, s.HandholesToBuild, dug, len(pits))
		}
	}
}
