package geo

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// TestLateralTapsAtPole: building B has no pathway end and no entrance; the pole line A
// (aerial, poles at its vertices, x = -100, 0 and 100 m) passes 12 m from its wall mid-span,
// and its nearest pole, at (0, 0), is 19.2 m from the footprint's corner. A counted lateral
// from a pole line leaves it at a pole, down the pole in a riser into a handhole at its foot,
// never from under the strand between two poles, where nothing can come down (README
// "Pathway types": a riser pole's turn is made in the handhole at its foot; common practice,
// no published source, for the tap at the pole). Beyond max_lateral_m from every pole, B is
// not joined there, and the problem names the pole line and its nearest pole. A duct nearer
// than the pole, though farther than the strand, is tapped instead. A declared entrance off
// the pathways is joined at the pole as well, and a pole line branching off A between two of
// its vertices stands a pole where it joins.
func TestLateralTapsAtPole(t *testing.T) {
	t.Parallel()
	aerial := func() Pathway {
		a := pw("A", ml(-100, 0, 0, 0, 100, 0))
		a.Type, a.SpareDucts, a.DuctMM = TypeAerial, 0, 0
		return a
	}
	poleM := DistanceM(at(15, 12), at(0, 0)) // from B's corner to the pole, on the ellipsoid
	branch := aerial()                       // a pole line branching off A at (10, 0): a pole there
	branch.ID, branch.Group, branch.Lines = "A-BR", "A-BR", []orb.LineString{ml(10, 0, 10, -50)}
	for _, tc := range []struct {
		name  string
		extra []Pathway
		opt   Options
		want  [2]float64 // B's tap, x and y in metres
		latM  float64
		riser bool
	}{
		{"the pole, not mid-span", nil, Options{}, [2]float64{0, 0}, poleM, true},
		{"a duct nearer than the pole", []Pathway{pw("D", ml(-100, -6, 100, -6))}, Options{}, [2]float64{20, -6}, 18, false},
		{"a duct farther than the pole", []Pathway{pw("D", ml(-100, -9, 100, -9))}, Options{}, [2]float64{0, 0}, poleM, true},
		{"a branch pole between two vertices", []Pathway{branch}, Options{}, [2]float64{10, 0}, DistanceM(at(15, 12), at(10, 0)), true},
	} {
		t.Run(tc.name, func(t *testing.T) {
			c := Campus{Buildings: []Building{box("B", 20, 17, 5)}, Pathways: append([]Pathway{aerial()}, tc.extra...)}
			_, e, j := buildOneLateral(t, &c, tc.opt)
			if d := DistanceM(j.Point, at(tc.want[0], tc.want[1])); d > 0.01 {
				t.Errorf("B taps at %v (%.2f m off); want %v", j.Point, d, tc.want)
			}
			if math.Abs(e.LateralM-tc.latM) > 0.02 {
				t.Errorf("B's lateral %.3f m; want %.3f", e.LateralM, tc.latM)
			}
			if e.PoleRiser != tc.riser {
				t.Errorf("B's lateral comes down a pole: %v; want %v", e.PoleRiser, tc.riser)
			}
		})
	}

	// A declared entrance off the pathways, on B's wall at (20, 12): its counted lateral
	// leaves the pole line at the pole too, not 12 m below it.
	c0 := Campus{Buildings: []Building{box("B", 20, 17, 5)}, Pathways: []Pathway{aerial()},
		Entrances: []Entrance{{Source: Source{File: "t.geojson"}, ID: "E-1", Building: "B", Point: at(20, 12)}}}
	n0 := build(t, &c0)
	if es := n0.EntrancesOf("B"); len(es) != 1 || es[0].ID != "E-1" || !es[0].PoleRiser {
		t.Errorf("declared entrance: %+v; want E-1, its lateral down a pole", es)
	} else if j, _ := n0.Junction(es[0].Junction); DistanceM(j.Point, at(0, 0)) > 0.01 {
		t.Errorf("declared entrance: taps at %v; want the pole at (0, 0)", j.Point)
	} else if want := DistanceM(at(20, 12), at(0, 0)); math.Abs(es[0].LateralM-want) > 0.02 {
		t.Errorf("declared entrance: lateral %.3f m; want %.3f", es[0].LateralM, want)
	}

	// Beyond max_lateral_m from every pole: not joined, though the strand passes within it.
	c := Campus{Buildings: []Building{box("B", 20, 17, 5)}, Pathways: []Pathway{aerial()}}
	n, berr := Build(&c, Options{MaxLateralM: 15})
	if berr != nil || len(n.Unjoined) != 1 {
		t.Fatalf("max_lateral_m 15: got %v, %d unjoined; want B unjoined", berr, len(n.Unjoined))
	}
	err := n.Unjoined[0].Problem("")
	if !errors.Is(err, ErrUnreachable) {
		t.Fatalf("max_lateral_m 15: got %v; want ErrUnreachable", err)
	}
	for _, want := range []string{"no pathway within 15 m", "aerial pathway A passes 12.0 m away", "its nearest pole is 19.2 m away"} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("max_lateral_m 15: %q; want it to say %q", err, want)
		}
	}
}

// TestPoleLineEndOnWall: the pole line A-1 is drawn from building C's wall (x = 0) east, with
// poles at 50 and 100 m; building B stands 20 m north of the line's end on the wall. That end
// is where the strand is fastened to C, C's way in, and no pole (README "Pathway types": a
// lateral from a pole line comes down a pole; a way into a building is no place to tap, common
// practice, no published source): B gets no lateral down C's wall (review 14 F8: it tapped C's
// entrance with a "pole riser"), and with the next pole 45 m off, beyond max_lateral_m, it is
// not joined, the problem naming that pole. With max_lateral_m 60 it comes down the pole at 50 m.
func TestPoleLineEndOnWall(t *testing.T) {
	t.Parallel()
	campus := func() *Campus {
		p := pw("A-1", ml(0, 0, 50, 0, 100, 0))
		p.Type, p.SpareDucts, p.DuctMM = TypeAerial, 0, 0
		return &Campus{Buildings: []Building{box("C", -10, 0, 10), box("B", 5, 25, 5)}, Pathways: []Pathway{p}}
	}
	n := build(t, campus())
	if es := n.EntrancesOf("C"); len(es) != 1 || es[0].Via != ViaFootprint {
		t.Errorf("C's entrances %+v; want the line's end on its wall", es)
	}
	if es := n.EntrancesOf("B"); len(es) != 0 {
		t.Errorf("B's entrances %+v; want none: the line's end on C's wall is no pole", es)
	}
	if len(n.Unjoined) != 1 || n.Unjoined[0].Building != "B" {
		t.Fatalf("unjoined %+v; want B", n.Unjoined)
	}
	poleM := DistanceM(at(10, 20), at(50, 0)) // B's south-east corner to the pole at 50 m
	msg := n.Unjoined[0].Problem("").Error()
	for _, want := range []string{"no pathway within 30 m", "aerial pathway A-1 passes 20.0 m away", fmt.Sprintf("its nearest pole is %.1f m away", poleM)} {
		if !strings.Contains(msg, want) {
			t.Errorf("B unjoined: %q; want it to say %q", msg, want)
		}
	}

	_, e, j := buildOneLateral(t, campus(), Options{MaxLateralM: 60})
	if d := DistanceM(j.Point, at(50, 0)); d > 0.01 || !e.PoleRiser {
		t.Errorf("max_lateral_m 60: B taps at %v (%.2f m from the pole at 50 m), pole riser %v; want the pole, down it", j.Point, d, e.PoleRiser)
	}
	if math.Abs(e.LateralM-poleM) > 0.02 {
		t.Errorf("max_lateral_m 60: B's lateral %.3f m; want %.3f", e.LateralM, poleM)
	}
}
