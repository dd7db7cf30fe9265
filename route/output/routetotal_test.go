package output

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
)

// TestRouteRowsAddUp: links.csv's route column, summed over the feasible legs, is the route
// total summary.json, the terminal and bom.xlsx's summary print, in metres and in feet
// (tester 14 F14: rows rounded one by one added up to 28,096.8 m under a total of 28,096.7 m,
// the total rounded from the exact lengths). Arithmetic, no published source.
func TestRouteRowsAddUp(t *testing.T) {
	r := testplan.DemoResult(t)
	for _, opt := range []WriteOptions{{}, {Units: UnitsImperial}} {
		u := UnitsOf(opt)
		files, err := Files(context.Background(), r, WriteOptions{Units: opt.Units, SkipWorkbook: true, SkipGeoPackage: true})
		if err != nil {
			t.Fatal(err)
		}
		rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "links.csv"))
		col, feas := -1, -1
		for i, h := range rows[0] {
			switch h {
			case "route_" + u.Length:
				col = i
			case "feasible":
				feas = i
			}
		}
		if col < 0 || feas < 0 {
			t.Fatalf("links.csv header %v lacks route_%s or feasible", rows[0], u.Length)
		}
		var dm int64
		for _, row := range rows[1:] {
			if row[feas] != "true" {
				continue
			}
			v, err := strconv.ParseFloat(row[col], 64)
			if err != nil {
				t.Fatal(err)
			}
			dm += int64(math.Round(v * 10))
		}
		sum := float64(dm) / 10
		if got := RouteListed(u, r); got != sum {
			t.Errorf("%s: RouteListed %.1f, links.csv rows add up to %.1f", u.Length, got, sum)
		}
		var term bytes.Buffer
		if err := PrintSummary(&term, r, opt); err != nil {
			t.Fatal(err)
		}
		if want := strconv.FormatFloat(sum, 'f', 1, 64) + " " + u.Length + " of route"; !strings.Contains(term.String(), want) {
			t.Errorf("terminal lacks %q:\n%s", want, term.String())
		}
		if opt.Units == "" {
			var s struct {
				TotalRouteM float64 `json:"total_route_m"`
			}
			if err := json.Unmarshal(testplan.FileOf(t, files, "summary.json"), &s); err != nil {
				t.Fatal(err)
			}
			if s.TotalRouteM != sum {
				t.Errorf("summary.json total_route_m %.1f, links.csv rows add up to %.1f", s.TotalRouteM, sum)
			}
		}
	}
}

// TestRouteListedSumsRows: three legs of 10.04 m list 10.0 m each, so their total is 30.0 m,
// not the 30.1 m their exact 30.12 m rounds to (tester 14 F14); in feet each is 32.9 ft
// (10.04 m / 0.3048 = 32.94 ft), 98.7 ft in all (the exact 98.82 ft would print 98.8). An
// infeasible leg adds nothing. Arithmetic, no published source.
func TestRouteListedSumsRows(t *testing.T) {
	r := testplan.DemoResult(t)
	r2 := *r
	r2.Legs = slices.Clone(r.Legs[:4])
	for i := range r2.Legs {
		r2.Legs[i].RouteM = 10.04
		r2.Legs[i].Feasible = i < 3
	}
	if got := RouteListed(UnitsOf(WriteOptions{}), &r2); got != 30 {
		t.Errorf("metres: %v, want 30.0", got)
	}
	if got := RouteListed(UnitsOf(WriteOptions{Units: UnitsImperial}), &r2); got != 98.7 {
		t.Errorf("feet: %v, want 98.7", got)
	}
}
