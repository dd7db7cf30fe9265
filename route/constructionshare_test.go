package route_test

import (
	"fmt"
	"hash/fnv"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
)

// TestConstructionSharedEqually (tester 13's finding F): hub A serves B1…B4 over one
// existing duct T with one spare duct of 100 mm, which holds 3 loose cables (the default
// design.cables_per_duct; common practice, no published source), so the plan lays a trench
// with ducts beside T for the fourth cable, and a handhole where the routes turn from T into
// the direct-buried fan. Every leg uses the same trench, ducts and handhole, A's entrance and
// its own building's: each leg's construction share (links.csv construction_…) is the same
// to a cent, and the shares add up to what the bill's construction and bid items per new
// buried metre cost (priced by the optimizer, as README's links.csv says). The optimizer's
// own split gave the trench to the leg whose cable needed it, in packing order. Renaming the
// buildings moves no share by more than a cent; moving every point by under a millimetre
// keeps them equal.
func TestConstructionSharedEqually(t *testing.T) {
	t.Parallel()
	shares := func(campus string) (map[string]int64, *route.Result) {
		t.Helper()
		r, err := testplan.PullSolveJSON(t, campus, nil)
		if err != nil {
			t.Fatal(err)
		}
		out := map[string]int64{}
		for _, l := range r.Legs {
			if !l.Feasible {
				t.Fatalf("leg %s infeasible: %s", l.Link.ID, l.Reason)
			}
			out[l.Link.To] = l.Cost.ConstructionCents
		}
		return out, r
	}
	campus := testsite.FanN(100, 1, 4, false)
	base, r := shares(campus)
	con := r.Estimate.Construction
	if len(con.Pieces) != 1 || con.Pieces[0].Span != "T" || len(base) != 4 {
		t.Fatalf("new work %+v, legs %v: want a trench beside T and 4 legs", con.Pieces, base)
	}
	var lo, hi, sum int64 = math.MaxInt64, 0, 0
	for _, c := range base {
		lo, hi, sum = min(lo, c), max(hi, c), sum+c
	}
	if hi-lo > 1 || lo == 0 {
		t.Errorf("construction shares %v: want equal shares to a cent", base)
	}
	// The bill's construction (trench, restoration, ducts, the trench's wall entry, the
	// handhole, the entrances' firestop) and the bid items per new buried metre: what the
	// shares carry, each line's metres rounded to 0.1 m there (half of it at the line's unit
	// price at most).
	var bill int64
	var bound float64
	for _, l := range r.Estimate.BOM.Lines {
		if l.Category == "construction" || strings.HasSuffix(l.Item, "new buried work") {
			bill += l.ExtendedCents
			if l.Unit == "m" {
				bound += 0.05 * float64(l.UnitCents)
			}
		}
	}
	if d := math.Abs(float64(sum - bill)); d > bound+1 {
		t.Errorf("shares add up to %d cents, the bill's construction to %d: %.0f apart, more than its rounding %.0f", sum, bill, d, bound)
	}
	// The same buildings renamed (B1 ↔ B2, B3 → Q3): the same share at the same place.
	renamed := strings.NewReplacer(`"B1"`, `"B2"`, `"B2"`, `"B1"`, `"FB1"`, `"FB2"`, `"FB2"`, `"FB1"`, `"B3"`, `"Q3"`, `"FB3"`, `"FQ3"`).Replace(campus)
	again, _ := shares(renamed)
	for from, to := range map[string]string{"B1": "B2", "B2": "B1", "B3": "Q3", "B4": "B4"} {
		if d := again[to] - base[from]; d > 1 || d < -1 {
			t.Errorf("renamed: %s's share %d cents, as %s %d", from, base[from], to, again[to])
		}
	}
	// Every point moved by 0.7 mm east or west (a re-export): the trench is a millimetre or
	// so shorter or longer, and the shares stay equal, each within a few cents of before.
	moved, _ := shares(jitter(campus))
	lo, hi = math.MaxInt64, 0
	for b, c := range base {
		lo, hi = min(lo, moved[b]), max(hi, moved[b])
		if d := moved[b] - c; d > 5 || d < -5 {
			t.Errorf("moved 0.7 mm: %s's share %d → %d cents", b, c, moved[b])
		}
	}
	if hi-lo > 1 {
		t.Errorf("moved 0.7 mm: shares %v, want equal to a cent", moved)
	}
}

// jitter moves every position of a campus's GeoJSON text by 1e-8° of longitude east or west
// (0.7 mm at the test grid's latitude), the same way wherever the same position recurs (a
// ring's closing point, a vertex two lines share).
func jitter(campus string) string {
	re := regexp.MustCompile(`\[(-?\d+\.\d+),(-?\d+\.\d+)\]`)
	return re.ReplaceAllStringFunc(campus, func(p string) string {
		m := re.FindStringSubmatch(p)
		lon, _ := strconv.ParseFloat(m[1], 64)
		h := fnv.New32a()
		h.Write([]byte(p))
		if h.Sum32()%2 == 0 {
			lon += 1e-8
		} else {
			lon -= 1e-8
		}
		return fmt.Sprintf("[%.9f,%s]", lon, m[2])
	})
}
