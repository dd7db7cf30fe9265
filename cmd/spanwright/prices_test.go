package main

import (
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// withoutKeys rewrites the price book of a starter folder without the top-level keys that
// drop matches (and the lines indented under them).
func withoutKeys(t *testing.T, dir string, drop *regexp.Regexp) {
	t.Helper()
	path := filepath.Join(dir, "prices.yaml")
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var keep []string
	skip := false
	for _, line := range strings.Split(string(data), "\n") {
		if drop.MatchString(line) {
			skip = true
			continue
		}
		if skip && strings.HasPrefix(line, "  ") {
			continue
		}
		skip = false
		keep = append(keep, line)
	}
	if err := os.WriteFile(path, []byte(strings.Join(keep, "\n")), 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestPricesLeftOut: on the starter files, a price book without the prices a book may leave
// out (entrances, firestop, patch cords) plans (status 0) and its bill lists those items with
// their quantity, not priced, each price left out warned on the terminal; one without required
// prices (restoration, added duct, handholes) is refused by check and by plan alike (status 2),
// every missing price named at once with the book and the key to add.
func TestPricesLeftOut(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "mine")
	if _, msg, code := run(t, "starter", dir); code != exitOK {
		t.Fatalf("starter: exit %d: %s", code, msg)
	}
	book := filepath.Join(dir, "prices.yaml")
	withoutKeys(t, dir, regexp.MustCompile(`^(building_entrance_each|entrance_firestop_each|patch_cords_each):`))
	out, msg, code := run(t, "plan", filepath.Join(dir, "plan.yaml"), "--out", filepath.Join(dir, "out"))
	if code != exitOK {
		t.Fatalf("plan without optional prices: exit %d: %s\n%s", code, msg, out)
	}
	for _, k := range []string{"building_entrance_each", "patch_cords_each"} {
		if !strings.Contains(out, "warning: "+book+": "+k+": not in the price book, so not priced: the plan needs ") {
			t.Errorf("terminal lacks the warning for %s:\n%s", k, out)
		}
	}
	report, err := os.ReadFile(filepath.Join(dir, "out", "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(report), "not priced, left out of the total: building_entrance_each, entrance_firestop_each, patch_cords_each") ||
		!strings.Contains(string(report), book+": patch_cords_each: not in the price book, so not priced") {
		t.Errorf("report.html does not say, beside the total and among the warnings, what is not priced")
	}
	bom, err := os.ReadFile(filepath.Join(dir, "out", "bom.csv"))
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"material,\"patch cord ", "construction,\"building entrance: penetration, sleeve, firestop\",each,"} {
		found := false
		for _, line := range strings.Split(string(bom), "\n") {
			if strings.HasPrefix(line, want) && strings.Contains(line, ",not priced (no ") && !strings.Contains(line, ",0,") {
				found = true
			}
		}
		if !found {
			t.Errorf("bom.csv has no line %q… with a quantity, not priced:\n%s", want, bom)
		}
	}

	withoutKeys(t, dir, regexp.MustCompile(`^(restoration_per_m|added_duct_per_m|structures_each):`))
	_, checkMsg, code := run(t, "check", filepath.Join(dir, "plan.yaml"))
	if code != exitInvalid {
		t.Fatalf("check without required prices: exit %d, want 2: %s", code, checkMsg)
	}
	_, planMsg, code := run(t, "plan", filepath.Join(dir, "plan.yaml"), "--out", filepath.Join(dir, "out2"))
	if code != exitInvalid {
		t.Fatalf("plan without required prices: exit %d, want 2: %s", code, planMsg)
	}
	for _, msg := range []string{checkMsg, planMsg} {
		for _, key := range []string{"add added_duct_per_m", "add restoration_per_m.turf", "add structures_each.handhole"} {
			if !strings.Contains(msg, book+`: price "`) || !strings.Contains(msg, key) {
				t.Errorf("message lacks %q with the book's name:\n%s", key, msg)
			}
		}
	}
}
