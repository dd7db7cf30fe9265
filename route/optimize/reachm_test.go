package optimize

import "testing"

// TestReachCountsLoops: reach (Option.MaxRouteM) counts what each edge adds to the channel
// (Edge.ReachM: its metres and the slack loops stored along it), as the loss budget does; a
// leg's LengthM stays the route's own metres. Path a (0-1-3) is 900 m of route through
// structures whose loops make 1,030 m of channel; path b (0-2-3) is 990 m with none. With a
// reach of 1,000 m only b closes, though a is shorter and cheaper.
func TestReachCountsLoops(t *testing.T) {
	p := &Problem{Nodes: 4, Edges: []Edge{
		{ID: "a1", From: 0, To: 1, LengthM: 450, ReachM: 515, LabourPerMCents: 100},
		{ID: "a2", From: 1, To: 3, LengthM: 450, ReachM: 515, LabourPerMCents: 100},
		{ID: "b1", From: 0, To: 2, LengthM: 495, LabourPerMCents: 100},
		{ID: "b2", From: 2, To: 3, LengthM: 495, LabourPerMCents: 100},
	}}
	for _, reach := range []float64{1000, 1100} {
		p.Demands = []Demand{{ID: "d", Source: 0, Target: 3, Options: []Option{{Name: "os2", CablePerMCents: 50, MaxRouteM: reach}}}}
		sol, err := Solve(p, Settings{})
		if err != nil {
			t.Fatal(err)
		}
		leg := sol.Routes[0].Primary
		if len(leg.Hops) == 0 {
			t.Fatalf("reach %g: no route", reach)
		}
		want, wantM := "b1", 990.0
		if reach > 1030 {
			want, wantM = "a1", 900 // both close: the cheaper
		}
		if got := p.Edges[leg.Hops[0].Edge].ID; got != want || leg.LengthM != wantM {
			t.Errorf("reach %g m: route starts %s, %g m; want %s, %g m (route metres, loops aside)", reach, got, leg.LengthM, want, wantM)
		}
	}
}
