package estimate_test

import (
	"fmt"
	"slices"
	"strings"
	"testing"

	"spanwright/media/install"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
)

// sixFan is hub A and six buildings, every one reached over one existing duct T (spare ducts
// of 100 mm) that ends at a junction where direct-buried pathways (no duct limit) fan out:
// six cables cross T, and there is no other way.
func sixFan(spare int) string {
	f := []string{
		testsite.Box("A", "mc", 10, 25),
		fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"T","type":"duct","spare_ducts":%d,"duct_mm":100},"geometry":{"type":"LineString","coordinates":[[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f]]}}`,
			spare, testsite.X(10), testsite.Y(15), testsite.X(10), testsite.Y(0), testsite.X(200), testsite.Y(0)),
	}
	for i, b := range [][4]float64{ // building centre, then where its pathway meets the wall
		{300, 25, 300, 15}, {200, 125, 200, 115}, {200, -125, 200, -115},
		{100, 125, 100, 115}, {100, -125, 100, -115}, {300, -125, 300, -115},
	} {
		id := fmt.Sprintf("B%d", i+1)
		f = append(f, testsite.Box(id, "", b[0], b[1]), testsite.Pathway("F"+id, "buried", 200, 0, b[2], b[3]))
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// TestSpreadOverSpareDucts: six cables cross T, far within NFPA 70 Chapter 9 Table 1 fill of
// one 100 mm duct (40 % for more than two cables), so first fit would pull all six into its
// first spare duct. More than install.SeparateCablesPerDuct (3) loose cables in one duct is not
// a sound set of pulls (common practice, no published source): with two or three spare ducts
// the bill gives T's cables three to a duct and leaves the third spare duct empty; with one
// spare duct (a full span) the six stay in it, and its row says so.
func TestSpreadOverSpareDucts(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		spare     int
		want      []int // cables per duct of T, duct 1 first
		wantNoted int   // rows of T with the pulling note
	}{
		{3, []int{3, 3}, 0},
		{2, []int{3, 3}, 0},
		{1, []int{6}, 1},
	} {
		t.Run(fmt.Sprintf("%d spare ducts", tc.spare), func(t *testing.T) {
			r, err := testplan.PullSolveJSON(t, sixFan(tc.spare), nil)
			if err != nil {
				t.Fatal(err)
			}
			if n := fillHolds(t, r); n != 0 {
				t.Fatalf("%d cables in no duct (%s)", n, noDuctWarning(r))
			}
			var got []int
			noted := 0
			for _, f := range r.Estimate.Fill {
				if f.Span != "T" {
					continue
				}
				if f.Duct != len(got)+1 || f.Added || !f.OK {
					t.Errorf("row %+v: want spare duct %d, OK", f, len(got)+1)
				}
				got = append(got, len(f.CablesODMM))
				if note := f.Note(); note != "" {
					noted++
					if !strings.Contains(note, "6 cables pulled one by one into one duct") {
						t.Errorf("duct %d: note %q", f.Duct, note)
					}
				}
			}
			if !slices.Equal(got, tc.want) || noted != tc.wantNoted {
				t.Errorf("cables per duct of T %v with %d noted, want %v with %d", got, noted, tc.want, tc.wantNoted)
			}
			if tc.spare > 1 && install.Crowded(slices.Max(got), false) {
				t.Errorf("a duct of T crowded beside a spare one: %v", got)
			}
		})
	}
}

// TestSpreadDemo: on the demo campus no duct is crowded beside an empty one of its span
// (fillHolds), and EA-2/2's eight cables, which first fit pulled into one of its three spare
// 100 mm ducts (8.3 % fill, within NFPA 70 Chapter 9 Table 1's 40 %), are given three, three
// and two (more than 3 loose cables in a duct is not a sound pull: common practice, no
// published source); a cable carried on into the next piece of its pathway stays in its duct
// (a duct is one tube from structure to structure: common practice, no published source).
func TestSpreadDemo(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	if n := fillHolds(t, r); n != 0 {
		t.Fatalf("%d cables in no duct (%s)", n, noDuctWarning(r))
	}
	var got []int
	for _, f := range r.Estimate.Fill {
		if f.Span == "EA-2/2" {
			got = append(got, len(f.CablesODMM))
		}
	}
	if want := []int{3, 3, 2}; !slices.Equal(got, want) {
		t.Errorf("EA-2/2: cables per duct %v, want %v", got, want)
	}
	// EA-2/3 and QS-3/2 carry on cables of EA-2/2 and QS-3/1: each keeps its duct.
	if changed, carried, first := ductChanges(r); changed != 0 || carried == 0 {
		t.Errorf("%d of %d cables carried on into the next piece of their pathway change duct (%s)", changed, carried, first)
	}
}

// ductChanges counts, of the cables carried on from one span into the next piece of the same
// pathway (two spans of limited capacity, one after the other on a leg), those given another
// duct number on the second, and how many were carried on so.
func ductChanges(r *route.Result) (changed, carried int, first string) {
	ductOf, pathway := map[string]int{}, map[string]string{}
	for _, f := range r.Estimate.Fill {
		pathway[f.Span] = f.PathwayID
		if !f.Unplaced {
			for _, l := range f.Legs {
				ductOf[f.Span+"\x00"+l] = f.Duct
			}
		}
	}
	for i := range r.Legs {
		l := &r.Legs[i]
		for k := 1; k < len(l.Steps); k++ {
			a, b := l.Steps[k-1].SpanID, l.Steps[k].SpanID
			da, okA := ductOf[a+"\x00"+l.Label()]
			db, okB := ductOf[b+"\x00"+l.Label()]
			if !okA || !okB || pathway[a] != pathway[b] {
				continue
			}
			carried++
			if da != db {
				changed++
				if first == "" {
					first = fmt.Sprintf("leg %s: duct %d of %s, duct %d of %s", l.Label(), da, a, db, b)
				}
			}
		}
	}
	return changed, carried, first
}
