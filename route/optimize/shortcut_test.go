package optimize

import (
	"slices"
	"testing"
)

// TestShortcutChargePaidOnce: a building (1) reaches the hub (0) only over a new span (10 m,
// 1,000 cents) into a junction drawn as two nodes (2 on the span's run, 3 on the run to the
// hub, joined by a turn edge), whose new handhole (5,000 cents) is one charge of the span and
// the turn. Turning there costs 1,000 + 1,000 + 5,000 (span) + 0 (turn) + 1,000 (10 m to the
// hub) = 8,000 cents; going round the block (30 m of existing duct from 2 back to 3) 11,000.
// A search that prices the charge on each edge sees the turn at 13,000 and takes the block;
// the plan, which pays the handhole once, must turn (shorten). Solve's second start, with every
// charge free, finds the turn by itself here; the first start and its descent alone do so only
// by shorten (without it they stay at 11,000: checked by removing its call from improve).
func TestShortcutChargePaidOnce(t *testing.T) {
	t.Parallel()
	p := &Problem{Nodes: 6, AllowNew: true,
		Edges: named([]Edge{
			{ID: "new span", From: 1, To: 2, LengthM: 10, Proposed: true, FixedCents: 1000},
			{ID: "turn", From: 2, To: 3},
			{ID: "to hub", From: 3, To: 0, LengthM: 10},
			{From: 2, To: 4, LengthM: 10}, {From: 4, To: 5, LengthM: 10}, {From: 5, To: 3, LengthM: 10},
		}),
		Charges: []Charge{{ID: "handhole at the junction", Edges: []int{0, 1}, Cents: 5000}},
		Demands: []Demand{{ID: "A", Source: 1, Target: 0, Options: []Option{metreOption}}}}
	sol := solveOK(t, "shortcut", p)
	if sol.TotalCents != 8000 {
		t.Errorf("total %d cents, want 8000 (turn at the junction, its handhole paid once)", sol.TotalCents)
	}
	if got := sol.Routes[0].Primary.Nodes(p.Edges); !slices.Equal(got, []int{1, 2, 3, 0}) {
		t.Errorf("route %v, want [1 2 3 0]", got)
	}
	sv := newSolver(p, Settings{})
	sv.start(false)
	sv.improve()
	if got := sv.key().total; got != 8000 {
		t.Errorf("first start and descent: %d cents, want 8000", got)
	}
}
