package optimize

import (
	"math"
	"testing"
)

// TestRebestKeepsDiversePair: a reroute (rebest) searches only for a choice cheaper than
// staying, and for a diverse demand that must mean a pair: holding its pair, it keeps a pair
// (a single route always weighs less than the pair it would replace); left on a single route
// (its pair lost to a forbidden edge), it finds its pair again once the edge is free. The
// ring of four 100 m spans is invented; review 13 found both cases returning one route.
func TestRebestKeepsDiversePair(t *testing.T) {
	edges := []Edge{
		{ID: "a", From: 0, To: 1, LengthM: 100}, {ID: "b", From: 1, To: 2, LengthM: 100},
		{ID: "c", From: 2, To: 3, LengthM: 100}, {ID: "d", From: 3, To: 0, LengthM: 100},
	}
	opts := []Option{{Name: "os2", CablePerMCents: 300, MaxRouteM: math.Inf(1)}}
	p := &Problem{Nodes: 4, Edges: edges, Demands: []Demand{{ID: "dv", Source: 0, Target: 2, Diverse: true, Options: opts}}}
	sv := newSolver(p, Settings{})
	sv.st = newState(sv)
	sv.recount()
	if c := sv.best(0); len(c.legs) != 2 {
		t.Fatalf("best: %d legs, want the pair", len(c.legs))
	} else {
		sv.add(0, c)
		sv.flush()
	}
	old, nb := sv.rebest(0)
	if len(nb.legs) != 2 {
		t.Errorf("holding its pair: rebest returns %d legs, want 2", len(nb.legs))
	}
	sv.add(0, old)
	sv.flush()

	sv.remove(0)
	sv.forbid[2] = true
	single := sv.best(0)
	sv.forbid[2] = false
	if len(single.legs) != 1 {
		t.Fatalf("with span c forbidden: %d legs, want the single route", len(single.legs))
	}
	sv.add(0, single)
	sv.flush()
	if _, nb = sv.rebest(0); len(nb.legs) != 2 {
		t.Errorf("on a single route with span c free again: rebest returns %d legs, want its pair", len(nb.legs))
	}
}
