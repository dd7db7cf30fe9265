package geo

import "testing"

// TestEntryBuilt: an entry is there already (Entry.Built) when an existing pathway outside
// the building ends at it and no proposed one does; a proposed duct to the same wall point
// needs its own penetration, a tray is inside the building, and a counted lateral is new work
// (common practice, no published source).
func TestEntryBuilt(t *testing.T) {
	t.Parallel()
	proposed := func(p Pathway) Pathway { p.Status = StatusProposed; return p }
	tray := func(p Pathway) Pathway { p.Type = TypeTray; return p }
	for _, tc := range []struct {
		name     string
		pathways []Pathway
		want     bool
	}{
		{"existing duct to the wall", []Pathway{pw("D", ml(-100, 0, -20, 0))}, true},
		{"existing duct to the telecom room", []Pathway{pw("D", ml(-100, 0, 5, 0))}, true},
		{"proposed duct to the wall", []Pathway{proposed(pw("P", ml(-100, 0, -20, 0)))}, false},
		{"existing and proposed to one wall point", []Pathway{pw("D", ml(-100, 0, -20, 0)), proposed(pw("P", ml(-20, -100, -20, 0)))}, false},
		{"a tray inside, a proposed duct to it", []Pathway{tray(pw("T", ml(-20, 0, 0, 0))), proposed(pw("P", ml(-100, 0, -20, 0)))}, false},
		{"counted lateral from an existing duct", []Pathway{pw("D", ml(-100, 30, 100, 30))}, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			n := build(t, &Campus{Buildings: []Building{box("B", 0, 0, 20)}, Pathways: tc.pathways})
			es := n.EntrancesOf("B")
			if len(es) == 0 {
				t.Fatal("building B has no entry")
			}
			for _, e := range es {
				if e.Built != tc.want {
					t.Errorf("entry %s (via %s, lateral %.1f m): built %v, want %v", e.ID, e.Via, e.LateralM, e.Built, tc.want)
				}
			}
		})
	}
}
