package geo

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"sort"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"spanwright/geo/input"
)

// entryList prints a network's entrances as building:id:via@junction.
func entryList(n *Network) string {
	var s []string
	for _, e := range n.Entrances {
		s = append(s, e.Building+":"+e.ID+":"+e.Via+"@"+e.Junction)
	}
	return strings.Join(s, " ")
}

// twoStreets: building B (20 m square at the origin) is reached by lateral L1 from the south
// street S and lateral L2 from the east street E; the streets meet at MH-1 and run on into the
// hub H.
func twoStreets() Campus {
	return Campus{
		Buildings: []Building{box("B", 0, 0, 10), box("H", -110, -50, 10)},
		Pathways: []Pathway{
			pw("S", ml(-110, -50, 0, -50, 60, -50)),
			pw("E", ml(60, -50, 60, 0, 60, 100)),
			pw("L1", ml(0, -50, 0, -5)),
			pw("L2", ml(60, 0, 5, 0)),
		},
		Structures: []Structure{{Source: Source{File: "t.geojson", Index: 9}, ID: "MH-1", Type: StructureMaintenanceHole, Point: at(60, -50)}},
	}
}

// TestEntrancesTwoLaterals: a building with a lateral from each of two streets has two
// entrances, one at each lateral's end; the old Build kept one and dropped the other.
func TestEntrancesTwoLaterals(t *testing.T) {
	t.Parallel()
	c := twoStreets()
	n := build(t, &c)
	checkNetwork(t, n)
	es := n.EntrancesOf("B")
	if len(es) != 2 {
		t.Fatalf("got entrances %s; want two for B", entryList(n))
	}
	ends := map[string]orb.Point{}
	for _, e := range es {
		j, _ := n.Junction(e.Junction)
		ends[e.ID] = j.Point
		if e.Via != ViaFootprint || e.LateralM != 0 || e.Lateral != nil {
			t.Errorf("entrance %+v: want via footprint with no counted lateral", e)
		}
	}
	// Named B:1, B:2 from west to east: L1's end (x 0) is west of L2's (x 10). Both laterals
	// are drawn 5 m through the wall and cut back to it (cutAtWalls): each entrance is where
	// its lateral crosses the wall.
	if DistanceM(ends["B:1"], at(0, -10)) > 0.02 || DistanceM(ends["B:2"], at(10, 0)) > 0.02 {
		t.Errorf("got entrance points %v; want B:1 where L1 crosses the wall, B:2 where L2 does", ends)
	}
	a, _ := n.AccessOf("B")
	if a.Junction != es[0].Junction && a.Junction != es[1].Junction {
		t.Errorf("access %+v is not one of the entrances", a)
	}
	// The street S ends inside the hub's footprint: an entrance, not a dangling end.
	if hs := n.EntrancesOf("H"); len(hs) != 1 || hs[0].ID != "H:1" {
		t.Errorf("hub entrances %v", hs)
	}
	// Entry finds an entrance by its building and ID, and nothing under another building.
	if e, ok := n.Entry("B", "B:2"); !ok || e.ID != "B:2" || e.Building != "B" {
		t.Errorf("Entry(B, B:2) = %+v, %v; want B's entrance B:2", e, ok)
	} else if j, _ := n.Junction(e.Junction); DistanceM(j.Point, ends["B:2"]) != 0 {
		t.Errorf("Entry(B, B:2) is at %v, want %v", j.Point, ends["B:2"])
	}
	for _, q := range [][2]string{{"H", "B:1"}, {"B", "B:3"}, {"X", "B:1"}} {
		if e, ok := n.Entry(q[0], q[1]); ok {
			t.Errorf("Entry(%s, %s) = %+v, want none", q[0], q[1], e)
		}
	}
}

// TestEntrancesDeclaredAndFootprint: a building with a declared entrance on a pathway, one off
// the pathways, one beyond MaxLateralM and a pathway end on its footprint has three entrances;
// the access stays the declared one on a pathway, as before.
func TestEntrancesDeclaredAndFootprint(t *testing.T) {
	t.Parallel()
	c := Campus{
		Buildings: []Building{box("B", 0, 0, 10)},
		Pathways:  []Pathway{pw("S", ml(-100, -20, 50, -20, 100, -20)), pw("L", ml(50, -20, 0, 8))},
		Entrances: []Entrance{
			{Source: Source{File: "t.geojson", Index: 3}, ID: "E1", Building: "B", Point: at(0, -20)},
			{Source: Source{File: "t.geojson", Index: 4}, ID: "E2", Building: "B", Point: at(-30, 0)},
			// 29.7 m from the footprint's corner (within max_lateral_m: farther it is refused,
			// TestEntranceTooFar), 36 m from L's end.
			{Source: Source{File: "t.geojson", Index: 5}, ID: "E3", Building: "B", Point: at(-20, 38)},
		},
	}
	n := build(t, &c)
	checkNetwork(t, n)
	got := map[string]Entry{}
	for _, e := range n.EntrancesOf("B") {
		got[e.ID] = e
	}
	if len(got) != 3 || got["E1"].Via != ViaEntrance || got["E2"].Via != ViaEntrance || got["B:1"].Via != ViaFootprint {
		t.Fatalf("got entrances %s; want E1 and E2 (declared) and B:1 (L's end)", entryList(n))
	}
	if a, _ := n.AccessOf("B"); a.Junction != "E1" || a.Via != ViaEntrance || a.LateralM != 0 {
		t.Errorf("access %+v; want E1, the declared entrance on a pathway", a)
	}
	// E2 is 20 m north of S: its own counted lateral, from the entrance point.
	e2 := got["E2"]
	j, _ := n.Junction(e2.Junction)
	if math.Abs(e2.LateralM-DistanceM(at(-30, 0), j.Point)) > 1e-9 || math.Abs(e2.LateralM-20) > 0.05 ||
		len(e2.Lateral) != 2 || e2.Lateral[0] != at(-30, 0) || e2.Lateral[1] != j.Point {
		t.Errorf("E2: %+v; want a 20 m lateral from the entrance to S", e2)
	}
	warned := false
	for _, w := range n.Warnings {
		if w.Feature == "#5 (E3)" && strings.Contains(w.Message, `entrance "E3" of building "B" is not within 30 m`) {
			warned = true
		}
	}
	if !warned {
		t.Errorf("no warning for E3, 36 m from any pathway: %v", n.Warnings)
	}
}

// entrySig is an entrance as it reads beside the names: its building (through un), its ID
// with the building's name put back, how it is reached and where.
func entrySig(n *Network, un func(string) string) []string {
	var out []string
	for _, e := range n.Entrances {
		j, _ := n.Junction(e.Junction)
		b := un(e.Building)
		id := e.ID
		if strings.HasPrefix(id, e.Building+EntrySep) {
			id = b + strings.TrimPrefix(id, e.Building)
		}
		out = append(out, fmt.Sprintf("%s %s %s %.7f,%.7f %.6f %v", b, id, e.Via, j.Point[0], j.Point[1], e.LateralM, e.Lateral))
	}
	sort.Strings(out)
	return out
}

// TestEntrancesIgnoreOrderNamesAndSplits: a building's entrances, their ids and their laterals
// do not change when the features come in another order, when pathways and buildings are
// renamed (beyond the names themselves), or when a pathway is drawn as two pathways meeting at
// one of its vertices.
func TestEntrancesIgnoreOrderNamesAndSplits(t *testing.T) {
	t.Parallel()
	base := twoStreets()
	base.Buildings = append(base.Buildings, box("C", 200, 0, 10))
	base.Pathways[0] = pw("S", ml(-110, -50, -50, -50, 0, -50, 60, -50))
	base.Pathways[1] = pw("E", ml(60, -50, 60, 0, 60, 30, 60, 100))
	base.Pathways = append(base.Pathways, pw("L3", ml(60, 30, 195, 5)), pw("L4", ml(60, 80, 200, 6)))
	base.Entrances = []Entrance{
		{Source: Source{File: "t.geojson", Index: 20}, Building: "C", Point: at(185, -10)},
		{Source: Source{File: "t.geojson", Index: 21}, ID: "C-N", Building: "C", Point: at(175, 30)},
	}
	same := func(s string) string { return s }
	n := build(t, &base)
	checkNetwork(t, n)
	var ids []string
	for _, e := range n.Entrances {
		ids = append(ids, e.ID)
	}
	sort.Strings(ids)
	if got := strings.Join(ids, " "); got != "B:1 B:2 C-N C:1 C:2 E-C H:1" {
		t.Fatalf("got entrances %s", entryList(n))
	}
	want := entrySig(n, same)

	r := rand.New(rand.NewPCG(13, 1))
	for k := 0; k < 20; k++ {
		c := base
		c.Buildings = append([]Building(nil), base.Buildings...)
		c.Pathways = append([]Pathway(nil), base.Pathways...)
		c.Entrances = append([]Entrance(nil), base.Entrances...)
		r.Shuffle(len(c.Buildings), func(i, j int) { c.Buildings[i], c.Buildings[j] = c.Buildings[j], c.Buildings[i] })
		r.Shuffle(len(c.Pathways), func(i, j int) { c.Pathways[i], c.Pathways[j] = c.Pathways[j], c.Pathways[i] })
		if got := entrySig(build(t, &c), same); !reflect.DeepEqual(got, want) {
			t.Fatalf("shuffle %d:\ngot  %v\nwant %v", k, got, want)
		}
	}

	renamed := base
	prefix := "zz-"
	renamed.Buildings = append([]Building(nil), base.Buildings...)
	renamed.Pathways = append([]Pathway(nil), base.Pathways...)
	renamed.Entrances = append([]Entrance(nil), base.Entrances...)
	for i := range renamed.Buildings {
		renamed.Buildings[i].ID = prefix + renamed.Buildings[i].ID
	}
	for i := range renamed.Pathways {
		renamed.Pathways[i].ID = "q" + renamed.Pathways[i].ID
		renamed.Pathways[i].Group = renamed.Pathways[i].ID
	}
	for i := range renamed.Entrances {
		renamed.Entrances[i].Building = prefix + renamed.Entrances[i].Building
	}
	// The id-less entrance's generated id follows its building's name.
	un := func(s string) string { return strings.TrimPrefix(s, prefix) }
	got := entrySig(build(t, &renamed), un)
	for i := range got {
		got[i] = strings.ReplaceAll(got[i], EntrancePrefix+prefix, EntrancePrefix)
	}
	if !reflect.DeepEqual(got, want) {
		t.Fatalf("renamed:\ngot  %v\nwant %v", got, want)
	}

	// S split at its vertex (-50, -50), where nothing joins, and E at (60, 30), where L3
	// starts: the same entrances (the junction numbers may move; the places do not).
	split := base
	split.Pathways = []Pathway{
		pw("S-a", ml(-110, -50, -50, -50)), pw("S-b", ml(-50, -50, 0, -50, 60, -50)),
		pw("E-a", ml(60, -50, 60, 0, 60, 30)), pw("E-b", ml(60, 30, 60, 100)),
	}
	split.Pathways = append(split.Pathways, base.Pathways[2:]...)
	if got := entrySig(build(t, &split), same); !reflect.DeepEqual(got, want) {
		t.Fatalf("split:\ngot  %v\nwant %v", got, want)
	}
}

// TestEntranceAwayFromFootprint (a new user's trial: an entrance 2.5 km from its building
// ended the link there without a word): a declared entrance more than entranceOffM from its
// building's footprint is warned of, with its building and distance; one on the wall is not.
func TestEntranceAwayFromFootprint(t *testing.T) {
	t.Parallel()
	c := Campus{
		Buildings: []Building{box("B", 0, 0, 10)},
		Pathways:  []Pathway{pw("S", ml(-100, -20, 100, -20)), pw("L", ml(0, -20, 0, -10)), pw("M", ml(25, -20, 25, 0))},
		Entrances: []Entrance{
			{Source: Source{File: "t.geojson", Index: 3}, ID: "WALL", Building: "B", Point: at(0, -10)},
			{Source: Source{File: "t.geojson", Index: 4}, ID: "FAR", Building: "B", Point: at(25, 0)},
		},
	}
	n := build(t, &c)
	var got []string
	for _, w := range n.Warnings {
		if strings.Contains(w.Message, "from the building's footprint") {
			got = append(got, w.Feature+": "+w.Message)
		}
	}
	if len(got) != 1 || !strings.Contains(got[0], `entrance "FAR" of building "B" is 15.0 m from the building's footprint`) {
		t.Errorf("warnings %q; want one, of FAR at 15.0 m", got)
	}
}

// TestEntranceTooFar (tester 14 F4: a GIS join gave an entrance on a street 327 m away the
// wrong building id, and the plan routed to it and billed none of the gap): an entrance
// farther from its building's footprint than max_lateral_m is a problem of its "building"
// property, naming the distance and the building whose wall it lies on, or that none is
// near; nothing is built. One within max_lateral_m stays a warning (TestEntranceAwayFromFootprint).
func TestEntranceTooFar(t *testing.T) {
	t.Parallel()
	c := Campus{
		Buildings: []Building{box("HALL", 0, 0, 10), box("KILN", 200, 0, 10)},
		Pathways:  []Pathway{pw("S", ml(-100, -20, 300, -20)), pw("L", ml(0, -20, 0, -10)), pw("M", ml(200, -20, 200, -10))},
		Entrances: []Entrance{
			{Source: Source{File: "t.geojson", Index: 3}, ID: "HALL-S", Building: "HALL", Point: at(0, -10)},
			// On KILN's south wall, but named HALL's: the wrong building id.
			{Source: Source{File: "t.geojson", Index: 4}, ID: "HALL-X", Building: "HALL", Point: at(205, -10)},
			// 60 m north of the street, farther than 30 m from every footprint.
			{Source: Source{File: "t.geojson", Index: 5}, ID: "HALL-Y", Building: "HALL", Point: at(100, 60)},
		},
	}
	c.Buildings[1].Source.Index = 1
	_, err := Build(&c, Options{})
	var ps *input.Problems
	if !errors.As(err, &ps) || len(ps.List) != 2 {
		t.Fatalf("got %v, want 2 problems", err)
	}
	for i, want := range []string{
		`t.geojson: feature #4 "HALL-X": property "building": entrance "HALL-X" is 195.6 m from the footprint of its building "HALL", farther than the longest lateral the design draws to a building (30 m, design: max_lateral_m): an entrance is where cable goes through its building's wall, and routes to this one would end 195.6 m short of it; it lies on the wall of building "KILN" (t.geojson feature #1): the wrong building id?`,
		`t.geojson: feature #5 "HALL-Y": property "building": entrance "HALL-Y" is 103.2 m from the footprint of its building "HALL"`,
		`; no building's footprint is within 30 m of it: a mistyped position, or the wrong building id?`,
	} {
		if got := ps.List[min(i, 1)].Error(); !strings.Contains(got, want) {
			t.Errorf("problem %d:\ngot  %s\nwant it to contain %s", min(i, 1), got, want)
		}
	}
	if !errors.Is(err, ErrBadValue) {
		t.Errorf("%v: want ErrBadValue", err)
	}

	// With a longer max_lateral_m the bound follows: HALL-Y (103.2 m; 90 m east and 50 m north of its corner, as the test draws it) is then only warned of.
	c.Entrances = []Entrance{c.Entrances[0], c.Entrances[2]}
	n, err := Build(&c, Options{MaxLateralM: 120})
	if err != nil {
		t.Fatalf("max_lateral_m 120: %v", err)
	}
	warned := false
	for _, w := range n.Warnings {
		warned = warned || strings.Contains(w.Message, `entrance "HALL-Y" of building "HALL" is 103.2 m from the building's footprint`)
	}
	if !warned {
		t.Errorf("max_lateral_m 120: no warning of HALL-Y in %+v", n.Warnings)
	}
}

// TestEntranceOffWallShortLaterals (review 20 F2): an entrance 7.2 m off its building's wall,
// at a tunnel's end, with no other building near, is warned of, not refused, when the design
// draws laterals of at most 5 m: max_lateral_m is a design setting a sweep may vary, and the
// slip the refusal is for (another building's id) would put another footprint nearer.
func TestEntranceOffWallShortLaterals(t *testing.T) {
	t.Parallel()
	c := Campus{
		Buildings: []Building{box("HALL", 0, 0, 10), box("KILN", 200, 0, 10)},
		Pathways:  []Pathway{pw("T", ml(-100, -17.2, 300, -17.2))},
		Entrances: []Entrance{{Source: Source{File: "t.geojson", Index: 3}, ID: "HALL-T", Building: "HALL", Point: at(0, -17.2)}},
	}
	n, err := Build(&c, Options{MaxLateralM: 5})
	if err != nil {
		t.Fatalf("max_lateral_m 5: %v", err)
	}
	warned := false
	for _, w := range n.Warnings {
		warned = warned || strings.Contains(w.Message, `entrance "HALL-T" of building "HALL" is 7.2 m from the building's footprint`)
	}
	if !warned {
		t.Errorf("no warning of HALL-T 7.2 m off its wall: %v", n.Warnings)
	}
}
