package output

import (
	"context"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
)

// TestScheduleColumns holds links.csv's cable schedule to the workbook's links sheet (the
// same takeoff figures, in metres and in feet), the jacket colours to TIA-598's premises
// colours and the labels to one per cable, none twice.
func TestScheduleColumns(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	for _, opt := range []WriteOptions{{}, {Units: UnitsImperial}} {
		files, err := Files(context.Background(), r, opt)
		if err != nil {
			t.Fatal(err)
		}
		rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "links.csv"))
		u := UnitsOf(opt).Length
		col := func(name string) int {
			i := slices.Index(rows[0], name)
			if i < 0 {
				t.Fatalf("links.csv (%s): no column %s in %q", u, name, rows[0])
			}
			return i
		}
		cables, cut, reels, slack, structs := col("cables"), col("cut_length_"+u), col("reels"), col("slack_loops_"+u), col("structures_passed")
		jacket, label := col("jacket_colour"), col("cable_label")
		xl, sheet := linksSheet(t, files)
		xl.Close()
		xcol := func(name string) int {
			i := slices.Index(sheet[0], name)
			if i < 0 {
				t.Fatalf("links sheet (%s): no column %s in %q", u, name, sheet[0])
			}
			return i
		}
		pairs := [][2]int{{cables, xcol("cables")}, {cut, xcol("cable bought (" + u + ")")}, {reels, xcol("reels")},
			{slack, xcol("slack loops (" + u + ")")}, {structs, xcol("structures passed")}, {jacket, xcol("jacket colour")}, {label, xcol("cable labels")}}
		seen := map[string]bool{}
		for i, row := range rows[1:] {
			l := &r.Legs[i]
			for _, p := range pairs {
				a, b := row[p[0]], sheet[i+1][p[1]]
				if x, err := strconv.ParseFloat(a, 64); err == nil {
					// The sheet holds the figure unrounded, shown to one decimal.
					if y, err := strconv.ParseFloat(b, 64); err != nil || x != roundHalfAway(y, 1) {
						t.Errorf("%s (%s) %s: links.csv %q, links sheet %q", l.Label(), u, rows[0][p[0]], a, b)
					}
				} else if a != b {
					t.Errorf("%s (%s) %s: links.csv %q, links sheet %q", l.Label(), u, rows[0][p[0]], a, b)
				}
			}
			if !l.Feasible {
				continue
			}
			// TIA-598-D premises cable jacket colours: yellow single-mode, aqua OM3 and OM4,
			// lime green OM5 (as the catalog cites them); outside-plant jackets black.
			want := map[string]string{"os2": "yellow", "om3": "aqua", "om4": "aqua", "om5": "lime green"}[l.Medium]
			if c := r.Engine.Catalog().Medium(l.Medium).Construction(l.Construction); c != nil && c.OutdoorRated && !c.PlenumRated && c.Listing == "" {
				want = "black"
			}
			if got, _, _ := strings.Cut(row[jacket], " + "); want != "" && got != want {
				t.Errorf("%s: jacket %q, want %q (%s %s)", l.Label(), row[jacket], want, l.Medium, l.Construction)
			}
			labels := strings.Fields(row[label])
			if n, _ := strconv.Atoi(row[cables]); len(labels) != n || n != l.Cable.Cables {
				t.Errorf("%s: labels %q for %s cables", l.Label(), labels, row[cables])
			}
			for _, lb := range labels {
				if seen[lb] || !strings.HasPrefix(lb, l.Link.From+"/"+l.Link.To+"-") {
					t.Errorf("%s: label %q twice or not of its link", l.Label(), lb)
				}
				seen[lb] = true
			}
		}
	}
}
