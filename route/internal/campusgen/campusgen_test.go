package campusgen

import (
	"crypto/sha256"
	"fmt"
	"slices"
	"strings"
	"testing"
)

// TestDefaultCampusesUnchanged pins the campuses the default options draw: the metamorphic
// and cost-model tests rely on them, so an option added to Options must leave them be. The
// digest was taken before PathwaysPerBuilding and the bucketed clearance were added (and
// over seeds 0–29 at 11, 40, 100, 300 and 1,000 buildings, which matched too).
func TestDefaultCampusesUnchanged(t *testing.T) {
	t.Parallel()
	h := sha256.New()
	for seed := uint64(0); seed < 10; seed++ {
		for _, n := range []int{11, 40, 300} {
			h.Write(GeoJSON(Generate(seed, Options{Buildings: n}).Features))
		}
	}
	const want = "e7bc760e12a2dd7364c6ff3e0d4f2cf92615ad409c04e47bb0e839db5abd3d09"
	if got := fmt.Sprintf("%x", h.Sum(nil)); got != want {
		t.Errorf("default campuses changed: digest %s, want %s", got, want)
	}
}

// TestBenchCampus: the benchmark campus has the share of pathways asked for (issue 16: about
// 4–5 pathway features per building, 10–30 % proposed) and every kind of trouble real
// campuses have: full ducts with no spare, broken runs, parallel duct banks, laterals drawn
// as pathways, EMI, aerial and tunnel spans (common practice, no published source).
func TestBenchCampus(t *testing.T) {
	t.Parallel()
	c := Generate(1, BenchOptions(1000))
	s := c.Stats()
	if s.Buildings != 1000 {
		t.Fatalf("buildings: got %d, want 1000", s.Buildings)
	}
	if per := float64(s.Pathways) / float64(s.Buildings); per < 4 || per > 5 {
		t.Errorf("pathways per building: got %.2f, want 4 to 5", per)
	}
	if pct := 100 * float64(s.Proposed) / float64(s.Pathways); pct < 10 || pct > 30 {
		t.Errorf("proposed: got %.1f %%, want 10 to 30 %%", pct)
	}
	if s.Aerial == 0 || s.Tunnel == 0 || s.EMI == 0 || s.NoSpare == 0 {
		t.Errorf("want aerial, tunnel, EMI and full ducts, got %v", s)
	}
	var laterals, banks int
	for _, id := range c.IDs {
		laterals += b2i(strings.HasSuffix(id, "-L"))
		banks += b2i(strings.HasSuffix(id, "-B"))
	}
	if laterals < 500 || banks == 0 {
		t.Errorf("laterals drawn %d (want most buildings), parallel banks %d", laterals, banks)
	}
	broken := 0
	for _, f := range c.Features {
		if f.Geometry != "LineString" || !strings.HasPrefix(f.Props[1].Value.(string), "S") || strings.HasSuffix(f.Props[1].Value.(string), "-B") {
			continue
		}
		// A street ends on a grid node unless it is a broken run, which stops halfway along its
		// last stretch: its end is then no other street's end.
		broken += b2i(!endsOnNode(c, f))
	}
	if broken == 0 {
		t.Errorf("no broken runs")
	}
	// Every cross-connect has two entrances (common practice, no published source).
	for _, f := range c.Features {
		if f.Props[0].Value != "building" || !slices.ContainsFunc(f.Props, func(p Prop) bool { return p.Key == "role" }) {
			continue
		}
		if id := f.Props[1].Value.(string); !slices.Contains(c.IDs, id+"-L2") {
			t.Errorf("cross-connect %s has one entrance; want two", id)
		}
	}
	plan := c.PlanYAML([]string{"campus.geojson"}, 4)
	if !strings.Contains(plan, "hub: "+c.Hub) || !strings.Contains(plan, "redundancy: diverse}") {
		t.Errorf("plan lacks the hub or diverse links:\n%s", plan)
	}
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

// endsOnNode reports whether street f's last point is the first or last point of another
// street.
func endsOnNode(c *Campus, f Feature) bool {
	line := f.Coords[0]
	end := line[len(line)-1]
	for _, g := range c.Features {
		if g.Geometry != "LineString" || g.Props[1].Value == f.Props[1].Value || !strings.HasPrefix(g.Props[1].Value.(string), "S") {
			continue
		}
		l := g.Coords[0]
		if l[0] == end || l[len(l)-1] == end {
			return true
		}
	}
	return false
}
