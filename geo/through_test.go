package geo

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// TestProposedThroughFootprint: a proposed trench drawn across a building's footprint is
// warned of with the pathway, the building and the metres inside; so is one drawn into the
// building and out again to an entrance on its wall (the new-user trial's case: 20 m east
// inside, then 10 m south to the wall), and an existing duct or direct-buried pathway drawn
// across it (tester 7: a duct drawn schematically across a building, or kept under a newer
// wing, has cable pulled along it under the slab). A proposed duct drawn through the wall to
// the telecom room (one end inside), an existing one so, and a proposed tray inside are not. The building is a 40 m square; the lengths are
// arithmetic on it (0.3 m allowed: the test's grid is a sphere's, the campus an ellipsoid's).
func TestProposedThroughFootprint(t *testing.T) {
	t.Parallel()
	proposed := func(id, typ string, xy ...float64) Pathway {
		p := pw(id, ml(xy...))
		p.Status, p.Type = StatusProposed, typ
		return p
	}
	for _, tc := range []struct {
		name  string
		p     Pathway
		wantM float64 // metres inside; 0 for no warning
	}{
		{"across", proposed("T", TypeDuct, -100, 0, 100, 0), 40},
		{"in and out to the wall", proposed("T", TypeDuct, -100, 5, 0, 5, 0, -20.0003), 20 + 25},
		{"buried across", proposed("T", TypeBuried, 0, -100, 0, 100), 40},
		{"to the telecom room", proposed("T", TypeDuct, -100, 0, 5, 0), 0},
		{"tray inside", proposed("T", TypeTray, -10, 0, 10, 0), 0},
		{"aerial over", proposed("T", TypeAerial, -100, 0, 100, 0), 0},
		{"existing across", pw("T", ml(-100, 0, 100, 0)), 40},
		{"existing to the telecom room", pw("T", ml(-100, 0, 5, 0)), 0},
		{"existing tunnel across", func() Pathway { p := pw("T", ml(-100, 0, 100, 0)); p.Type = TypeTunnel; return p }(), 0},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			n := build(t, &Campus{Buildings: []Building{box("B", 0, 0, 20)}, Pathways: []Pathway{tc.p}})
			var got []string
			for _, w := range n.Warnings {
				if strings.Contains(w.Message, "inside the footprint") {
					got = append(got, w.Message)
				}
			}
			if tc.wantM == 0 {
				if len(got) > 0 {
					t.Errorf("warned %q, want nothing", got)
				}
				return
			}
			var m float64
			prefix := `proposed pathway "T" runs `
			if tc.p.Status == StatusExisting {
				prefix = `existing pathway "T" runs `
			}
			if len(got) != 1 || !strings.HasPrefix(got[0], prefix) {
				t.Fatalf("warnings %q, want one naming pathway T", got)
			}
			if _, err := fmt.Sscanf(strings.TrimPrefix(got[0], prefix), "%g m inside the footprint of building \"B\"", &m); err != nil || math.Abs(m-tc.wantM) > 0.3 {
				t.Errorf("warning %q: %v m inside (%v), want %v", got[0], m, err, tc.wantM)
			}
		})
	}
}

// TestEnteredAtTheWall: a building with no entrance and no pathway end on its footprint,
// across which an existing duct is drawn (tester 7's finding 1), is entered where the duct
// crosses its wall, as at a pathway end on the footprint: an entrance at each wall, no
// counted lateral, never a junction inside the building (before: the nearest point of the
// duct, in the middle of the building, with lateral 0 m). The duct's spans say which
// buildings they pass beneath, wall to wall: the one it serves between its walls, and one
// with its own service duct that it runs under on the way (Span.Beneath, which routing
// lists in a leg's Crosses).
func TestEnteredAtTheWall(t *testing.T) {
	t.Parallel()
	c := &Campus{
		Buildings: []Building{box("BIO", 0, 150, 25), box("PHY", 0, 60, 20)},
		Pathways: []Pathway{
			pw("D-X", ml(0, 0, 0, 200)),
			pw("ST", ml(-100, 0, 100, 0)),
			pw("S-PHY", ml(30, 0, 30, 60, 15, 60)), // PHY's own service duct, ending inside
		},
	}
	n := build(t, c)
	a, ok := n.AccessOf("BIO")
	if !ok || a.Via != ViaFootprint || a.LateralM != 0 {
		t.Fatalf("BIO's access %+v, want a footprint entrance with no lateral", a)
	}
	f := newFootprint(newProjector(orb.Bound{Min: at(-200, -200), Max: at(200, 200)}), c.Buildings[0].Footprint)
	p := newProjector(orb.Bound{Min: at(-200, -200), Max: at(200, 200)})
	var walls []string
	for _, e := range n.EntrancesOf("BIO") {
		j, _ := n.Junction(e.Junction)
		if _, d := f.nearestBoundary(p.xy(j.Point)); d > 0.01 || e.LateralM != 0 {
			t.Errorf("entrance %s at %v: %.3f m from BIO's wall, lateral %.1f m; want on the wall, none", e.ID, j.Point, d, e.LateralM)
		}
		walls = append(walls, e.Junction)
	}
	if len(walls) != 2 {
		t.Errorf("BIO's entrances at %v, want one at each wall the duct crosses", walls)
	}
	beneath := map[string][]string{}
	for _, s := range n.Spans {
		if s.PathwayID == "D-X" {
			beneath[s.From+">"+s.To] = s.Beneath
		}
	}
	var under []string
	for _, s := range n.Spans {
		under = append(under, s.Beneath...)
	}
	if !slices.Equal(under, []string{"PHY", "BIO"}) {
		t.Errorf("spans beneath buildings: %v (%s), want PHY on the way, then BIO between its walls", beneath, spanIDs(n))
	}
	var ws []string
	for _, w := range n.Warnings {
		if strings.Contains(w.Message, `existing pathway "D-X" runs`) {
			ws = append(ws, w.Message)
		}
	}
	if len(ws) != 2 || !strings.Contains(strings.Join(ws, "\n"), `building "BIO" is entered where it crosses the wall`) {
		t.Errorf("warnings %q, want one per building D-X runs under, BIO's saying it is entered there", ws)
	}
}
