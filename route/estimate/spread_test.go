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
// one 100 mm duct (40 % for more than two cables), so fill alone would pull all six into its
// first spare duct. More than install.DefaultCablesPerDuct (3) loose cables in one duct is not
// a sound set of pulls (common practice, no published source): with two or three spare ducts
// T's cables go three to a duct and the third spare duct stays empty; with one spare duct the
// optimizer lays a trench beside T with the design's two ducts (new_ducts) and the second three
// go into the first of them. No row has the pulling note.
func TestSpreadOverSpareDucts(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		spare     int
		want      []int  // cables per duct of T, duct 1 first
		wantAdded []bool // whether each of those ducts is one the plan lays
	}{
		{3, []int{3, 3}, []bool{false, false}},
		{2, []int{3, 3}, []bool{false, false}},
		{1, []int{3, 3}, []bool{false, true}},
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
			var added []bool
			for _, f := range r.Estimate.Fill {
				if f.Span != "T" {
					continue
				}
				if f.Duct != len(got)+1 || !f.OK {
					t.Errorf("row %+v: want duct %d, OK", f, len(got)+1)
				}
				got, added = append(got, len(f.CablesODMM)), append(added, f.Added)
				if note := f.Note(); note != "" {
					t.Errorf("duct %d: note %q", f.Duct, note)
				}
			}
			if !slices.Equal(got, tc.want) || !slices.Equal(added, tc.wantAdded) {
				t.Errorf("cables per duct of T %v (added %v), want %v (added %v)", got, added, tc.want, tc.wantAdded)
			}
			if install.Crowded(slices.Max(got), install.DefaultCablesPerDuct) {
				t.Errorf("a duct of T crowded: %v", got)
			}
		})
	}
}

// TestSpreadDemo: on the demo campus no duct is crowded beside an empty one of its span
// (fillHolds), and EA-2/2's seven cables, which the fill alone would let into one of its three
// spare 100 mm ducts (7.3 % fill, within NFPA 70 Chapter 9 Table 1's 40 %), are given three,
// three and one (more than 3 loose cables in a duct is not a sound pull: common practice, no
// published source); a cable carried on into the next piece of its pathway with as many ducts
// stays in its duct (a duct is one tube from structure to structure: common practice, no
// published source).
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
	if want := []int{3, 3, 1}; !slices.Equal(got, want) {
		t.Errorf("EA-2/2: cables per duct %v, want %v", got, want)
	}
	// EA-2/3 and QS-3/2 carry on cables of EA-2/2 and QS-3/1: each keeps its duct.
	if changed, carried, first := ductChanges(r); changed != 0 || carried == 0 {
		t.Errorf("%d of %d cables carried on into the next piece of their pathway change duct (%s)", changed, carried, first)
	}
}

// ductChanges counts, of the cables carried on from one span into the next piece of the same
// pathway (two spans of limited capacity, one after the other on a leg), those given another
// duct number on the second where both spans have as many ducts (spare and laid), and how
// many were carried on so. Where the plan lays a different number of ducts along the pieces
// (a span whose cables need more ducts than the next), a duct of one may have no counterpart,
// or be at its count of pulls with cables the other does not carry: those are not counted.
func ductChanges(r *route.Result) (changed, carried int, first string) {
	ductOf, pathway, ducts := map[string]int{}, map[string]string{}, map[string]int{}
	for _, f := range r.Fill {
		ducts[f.Span] = f.Ducts + f.AddedDucts
	}
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
			if !okA || !okB || pathway[a] != pathway[b] || ducts[a] != ducts[b] {
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
