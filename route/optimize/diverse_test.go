package optimize

import (
	"math"
	"testing"
)

// TestNoDiversePair: the points named before any search are those Solve names for a diverse
// demand that gets one leg, and only proved ones. A ring 0-1-2-3-0 gives 0 and 2 two
// independent routes; a spur 2-4 hangs off node 2, which every route to 4 passes (the first cut on the way); a ring whose two sides lie
// in one shared-risk group (two ducts in one trench) is no diversity (Bhandari, Survivable
// Networks, 1999: diverse routes share no edge, node or group); an option that may use no
// edge at all is passed over.
func TestNoDiversePair(t *testing.T) {
	ring := func(groupA, groupB int) []Edge {
		return []Edge{
			{ID: "a", From: 0, To: 1, LengthM: 100, Group: groupA}, {ID: "b", From: 1, To: 2, LengthM: 100, Group: groupA},
			{ID: "c", From: 2, To: 3, LengthM: 100, Group: groupB}, {ID: "d", From: 3, To: 0, LengthM: 100, Group: groupB},
			{ID: "spur", From: 2, To: 4, LengthM: 50},
		}
	}
	opts := []Option{{Name: "copper", CablePerMCents: 100, MaxRouteM: math.Inf(1), ExcludeFlags: 1},
		{Name: "os2", CablePerMCents: 300, MaxRouteM: math.Inf(1)}}
	cases := []struct {
		name   string
		edges  []Edge
		target int
		want   *SinglePoint
	}{
		{"ring", ring(0, 0), 2, nil},
		{"spur", ring(0, 0), 4, &SinglePoint{Kind: PointNode, Index: 2, Separates: true}},
		{"one trench", ring(7, 7), 2, &SinglePoint{Kind: PointGroup, Index: 7, Separates: true}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			for i := range tc.edges {
				tc.edges[i].Flags = 1 // no edge the copper option may use
			}
			p := &Problem{Nodes: 5, Edges: tc.edges, Demands: []Demand{
				{ID: "plain", Source: 0, Target: tc.target, Options: opts},
				{ID: "diverse", Source: 0, Target: tc.target, Diverse: true, Options: opts}}}
			got, err := NoDiversePair(p)
			if err != nil {
				t.Fatal(err)
			}
			if _, ok := got[0]; ok {
				t.Errorf("%s: a demand that is not diverse named", tc.name)
			}
			sp, ok := got[1]
			switch {
			case tc.want == nil && ok:
				t.Errorf("%s: got %+v, want no point", tc.name, sp)
			case tc.want != nil && (!ok || sp != *tc.want):
				t.Errorf("%s: got %+v (%v), want %+v", tc.name, sp, ok, *tc.want)
			}
			// Solve names the same point.
			sol, err := Solve(p, Settings{})
			if err != nil {
				t.Fatal(err)
			}
			if r := sol.Routes[1]; tc.want != nil && (r.SinglePoint == nil || *r.SinglePoint != *tc.want) {
				t.Errorf("%s: Solve names %+v, want %+v", tc.name, r.SinglePoint, *tc.want)
			}
		})
	}
}

// TestNoDiversePairEveryOption: where the demand's options may use different edges, the point
// named is one every route of every option passes, and check (NoDiversePair) and Solve name the
// same one whichever option Solve routes (tester 11 F6: check named an entrance only the first
// medium had to use, plan a junction). Building 0 has two entrances, 0-1 and 0-2, both reaching
// junction 3, which two parallel ducts join to the hub 4; the first, dearer option may not use
// the entrance 0-1, so for it every route also uses the other entrance, and for both every route
// passes junction 3 (a node every route passes: Bhandari, Survivable Networks, 1999, ch. 3).
func TestNoDiversePairEveryOption(t *testing.T) {
	edges := []Edge{
		{ID: "entrance-1", From: 0, To: 1, LengthM: 10, Flags: 2}, {ID: "entrance-2", From: 0, To: 2, LengthM: 10},
		{ID: "lateral-1", From: 1, To: 3, LengthM: 40}, {ID: "lateral-2", From: 2, To: 3, LengthM: 40},
		{ID: "duct-a", From: 3, To: 4, LengthM: 200}, {ID: "duct-b", From: 3, To: 4, LengthM: 200},
	}
	opts := []Option{{Name: "os2 plain", CablePerMCents: 300, MaxRouteM: math.Inf(1), ExcludeFlags: 2},
		{Name: "os2 spliced", CablePerMCents: 200, MaxRouteM: math.Inf(1)}}
	want := SinglePoint{Kind: PointNode, Index: 3, Separates: true}
	for _, ends := range [][2]int{{0, 4}, {4, 0}} {
		p := &Problem{Nodes: 5, Edges: edges, Demands: []Demand{
			{ID: "diverse", Source: ends[0], Target: ends[1], Diverse: true, Options: opts}}}
		got, err := NoDiversePair(p)
		if err != nil {
			t.Fatal(err)
		}
		if sp, ok := got[0]; !ok || sp != want {
			t.Errorf("ends %v: NoDiversePair names %+v (%v), want junction 3 %+v", ends, sp, ok, want)
		}
		sol, err := Solve(p, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		if r := sol.Routes[0]; r.SinglePoint == nil || *r.SinglePoint != want {
			t.Errorf("ends %v: Solve names %+v, want %+v", ends, r.SinglePoint, want)
		}
	}
}
