package routing

import (
	"context"
	"fmt"
	"slices"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// passCampus is hub A and building Z lengthM metres east of it, joined by duct D, straight,
// and by duct E, which bends 100 m south halfway and so is a few metres longer. Ducts leave
// D north at three junctions near Z to buildings B1–B3, whose routes turn there: the plan
// builds a handhole at each, and a cable along D to Z passes the three straight through.
func passCampus(lengthM float64) []byte {
	f := []string{testsite.Box("A", "mc", 0, 0), testsite.Box("Z", "", lengthM, 0)}
	d := []float64{0, 0}
	for i, back := range []float64{1500, 1000, 500} {
		x := lengthM - back
		d = append(d, x, 0)
		f = append(f, testsite.Box(fmt.Sprintf("B%d", i+1), "", x, 130), testsite.Pathway(fmt.Sprintf("N%d", i+1), geo.TypeDuct, x, 0, x, 120))
	}
	f = append(f, testsite.Pathway("D", geo.TypeDuct, append(d, lengthM, 0)...), testsite.Pathway("E", geo.TypeDuct, 0, 0, lengthM/2, -100, lengthM, 0))
	return testsite.Features(f...)
}

// TestLoopsInOthersHandholesWithinReach: a leg's channel counts a slack loop in every
// handhole it passes (passesOf), also those other routes' turns build at junctions it passes
// straight through, which the search's reach does not see. Z lies just within single-mode
// reach along D, and its slack loops (100 m each here, to make them tell) in the three
// handholes B1–B3's turns build on D take it beyond; along E it stays within. The plan must
// route Z along E: every leg feasible. (Before SolveFrom searched again with those loops in
// the reach, passLoops, Z's leg came back infeasible: "no medium carries 10G".)
func TestLoopsInOthersHandholesWithinReach(t *testing.T) {
	t.Parallel()
	p := plan.Default
	p.Hub = "A"
	p.Design.SlackLoopStructureM = 100
	eng, err := plan.Engine(&p)
	if err != nil {
		t.Fatal(err)
	}
	setup := func(lengthM float64) (*site.Site, *Model, []site.Link) {
		t.Helper()
		s := testsite.Campus(t, "t.geojson", passCampus(lengthM))
		links, _, errs := s.Links(&p, "A")
		if len(errs) > 0 {
			t.Fatal(errs)
		}
		return s, NewModel(eng, p.Design), links
	}
	// Z's reach along D, less 50 m: the route's reach metres along D (the search's, with
	// no loop at B1–B3's junctions) over the longest of Z's options' route limits, found on a
	// first campus and scaled, then checked on the campus built to it.
	zReach := func(lengthM float64) (alongDM, maxM float64) {
		s, m, links := setup(lengthM)
		prob, _, _, err := problem(s, m, links, m.runsOf(s))
		if err != nil {
			t.Fatal(err)
		}
		z := slices.IndexFunc(links, func(l site.Link) bool { return l.To == "Z" })
		for _, o := range prob.Demands[z].Options {
			maxM = max(maxM, o.MaxRouteM)
		}
		for _, e := range prob.Edges {
			if strings.HasPrefix(e.ID, "D") {
				alongDM += e.ReachM
			}
		}
		return alongDM, maxM
	}
	lengthM := 10000.0
	for range 3 {
		along, maxM := zReach(lengthM)
		lengthM += maxM - 50 - along
	}
	if along, maxM := zReach(lengthM); along > maxM-45 || along < maxM-55 {
		t.Fatalf("campus of %.1f m: Z is %.1f m along D, its reach %.1f m: want 50 m within", lengthM, along, maxM)
	}
	s, m, links := setup(lengthM)
	r, err := Solve(context.Background(), s, m, links)
	if err != nil {
		t.Fatal(err)
	}
	turns := 0
	for _, h := range r.Handholes {
		if h.Turns {
			turns++
		}
	}
	if turns != 3 {
		t.Fatalf("%d turn handholes, want 3 (B1–B3's routes turn off D): %+v", turns, r.Handholes)
	}
	for _, l := range r.Legs {
		if !l.Feasible {
			t.Errorf("%s: infeasible: %s", l.Link.ID, l.Reason)
			continue
		}
		if l.Link.To != "Z" {
			continue
		}
		if !strings.Contains(strings.Join(l.Pathways, " "), "E") {
			t.Errorf("Z's leg takes %v, want E (along D its loops in B1–B3's handholes take it beyond reach)", l.Pathways)
		}
	}
}
