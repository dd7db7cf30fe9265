package optimize

import "testing"

// TestWarmPays: a warm start pays only where Solve from scratch skips its second start and
// its kicks (demands × (proposed edges and charges) above maxSecondStart), read from the same
// bounds the search reads; proposed edges count only when AllowNew. The campus of
// TestWarmNoKicks, whose cold solve has both, is not such a problem. Common practice, no
// published source.
func TestWarmPays(t *testing.T) {
	p := campus(campusSpec{buildings: 60, seed: 7, diverseFrac: 0.1, options: 3, capacity: true, proposedPct: 20})
	if WarmPays(p) {
		t.Errorf("60 buildings, %d demands × %d proposed: warm start pays; want the full search", len(p.Demands), countProposed(p))
	}
	big := &Problem{Nodes: 2, Demands: make([]Demand, 1000), AllowNew: true, Edges: make([]Edge, maxSecondStart/1000+1)}
	for i := range big.Edges {
		big.Edges[i].Proposed = true
	}
	if !WarmPays(big) {
		t.Errorf("1000 demands × %d proposed edges (> %d): warm start does not pay; want it to", len(big.Edges), maxSecondStart)
	}
	big.AllowNew = false
	if WarmPays(big) {
		t.Errorf("the same without new construction (nothing to open): warm start pays; want the full search")
	}
	big.Charges = make([]Charge, len(big.Edges))
	if !WarmPays(big) {
		t.Errorf("1000 demands × %d charges: warm start does not pay; want it to", len(big.Charges))
	}
	big.Edges = big.Edges[:maxSecondStart/1000-1]
	big.Charges, big.AllowNew = nil, true
	if WarmPays(big) {
		t.Errorf("1000 demands × %d proposed edges (≤ %d): warm start pays; want the full search", len(big.Edges), maxSecondStart)
	}
}
