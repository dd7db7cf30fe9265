package main

import (
	"encoding/csv"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"spanwright/route/workbook"
)

// TestImperialOneFigure: with --units imperial a length shows one figure in every output for
// people: the terminal, bom.csv, the workbook and report.html each convert the unrounded
// metres and then round to 0.1 ft. Converting the bill's metres, already rounded to 0.1 m,
// showed the demo's added duct as 631.6 ft in bom.csv and 631.7 ft on the terminal. 1 ft =
// 0.3048 m exactly (NIST SP 811, B.8); 0.1 m is 0.33 ft, so rounding metres first can move
// the last shown digit.
func TestImperialOneFigure(t *testing.T) {
	dir := t.TempDir()
	out, msg, code := run(t, "plan", "../../testdata/demo/plan.yaml", "--out", dir, "--units", "imperial")
	if code != exitOK {
		t.Fatalf("exit %d: %s", code, msg)
	}
	feet := func(re string) string {
		t.Helper()
		m := regexp.MustCompile(re).FindStringSubmatch(out)
		if m == nil {
			t.Fatalf("terminal: no %s in\n%s", re, out)
		}
		return m[1]
	}
	route, cable := feet(`, ([0-9.]+) ft of route`), feet(`\(([0-9.]+) ft in all`)
	trench, duct := feet(`new trench ([0-9.]+) ft`), feet(`added duct ([0-9.]+) ft`)
	bored := feet(`\(([0-9.]+) ft of it bored`)

	read := func(name string) []byte {
		t.Helper()
		b, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	rows, err := csv.NewReader(strings.NewReader(string(read("bom.csv")))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	xl, err := workbook.Open(read("bom.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	defer xl.Close()
	// The bill's line of added duct, and of trench in the demo's one trenched surface (the
	// laterals and the trench beside full duct banks: the rest of its new work is bored, so
	// the line is the new trench less the bored, 0.1 ft apart at most by rounding either, the
	// same figure on the demo), in bom.csv and on the workbook's bill.
	billed := map[string]string{}
	for i, row := range rows {
		switch {
		case row[1] == "added duct" && row[2] == "ft":
			billed["added duct"] = row[3]
			v, _ := xl.Value("bill of materials", fmt.Sprintf("D%d", i+1))
			billed["added duct, workbook"] = v
		case strings.HasPrefix(row[1], "trench, ") && row[2] == "ft":
			billed["trench"] = row[3]
		}
	}
	tenths := func(ft string) int64 {
		t.Helper()
		x, err := strconv.ParseFloat(ft, 64)
		if err != nil {
			t.Fatal(err)
		}
		return int64(math.Round(x * 10))
	}
	trenched := strconv.FormatFloat(float64(tenths(trench)-tenths(bored))/10, 'f', 1, 64)
	want := map[string]string{"added duct": duct, "added duct, workbook": duct, "trench": trenched}
	for k, w := range want {
		if got := billed[k]; !sameFeet(got, w) {
			t.Errorf("%s: bill shows %q ft, terminal %s ft", k, got, w)
		}
	}
	// The workbook's summary sheet.
	sum := map[string]string{}
	for row := 2; row < 40; row++ {
		name, _ := xl.Value("summary", fmt.Sprintf("A%d", row))
		v, _ := xl.Value("summary", fmt.Sprintf("B%d", row))
		sum[name] = v
	}
	for k, w := range map[string]string{"route": route, "cable bought": cable, "new trench": trench} {
		if !sameFeet(sum[k], w) {
			t.Errorf("workbook summary %s: %q ft, terminal %s ft", k, sum[k], w)
		}
	}
	// report.html writes thousands separators.
	html := string(read("report.html"))
	for k, w := range map[string]string{"route": route, "new trench": trench} {
		if !strings.Contains(html, grouped(w)+" ft") {
			t.Errorf("report.html: no %s of %s ft (terminal)", k, grouped(w))
		}
	}
}

// sameFeet reports whether two texts are one length in feet, as numbers.
func sameFeet(a, b string) bool {
	x, errA := strconv.ParseFloat(a, 64)
	y, errB := strconv.ParseFloat(b, 64)
	return errA == nil && errB == nil && x == y
}

// grouped writes a number with one decimal with thousands separators, as the report does.
func grouped(s string) string {
	whole, frac, _ := strings.Cut(s, ".")
	for i := len(whole) - 3; i > 0; i -= 3 {
		whole = whole[:i] + "," + whole[i:]
	}
	return whole + "." + frac
}
