package output

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
)

// TestNotPricedListed plans the demo with a price book that leaves out the optional prices
// of building entrances, the firestop of entrances there already and patch cords. A bid lists
// what it does not price as exclusions, with their quantities (common practice, no published
// source): the bill keeps a line for each with the quantity the plan needs and no price, in
// bom.csv too; the total is the sum of the priced lines; one warning per price left out names
// the book and the key, among the warnings and on the terminal.
func TestNotPricedListed(t *testing.T) {
	t.Parallel()
	data, err := os.ReadFile(filepath.Join("..", "..", "media", "prices-demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	var keep []string
	skip := false
	for _, line := range strings.Split(string(data), "\n") {
		if strings.HasPrefix(line, "building_entrance_each:") || strings.HasPrefix(line, "entrance_firestop_each:") {
			continue
		}
		if strings.HasPrefix(line, "patch_cords_each:") {
			skip = true
			continue
		}
		if skip && strings.HasPrefix(line, "  ") {
			continue
		}
		skip = false
		keep = append(keep, line)
	}
	path := filepath.Join(t.TempDir(), "prices.yaml")
	if err := os.WriteFile(path, []byte(strings.Join(keep, "\n")), 0o644); err != nil {
		t.Fatal(err)
	}
	s, p := testsite.Demo(t)
	q := *p
	q.Prices = path
	r := testplan.SolvePlan(t, s, &q)
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
