package optimize

// WarmPays reports whether a warm start (Settings.Start) of p saves search worth what it
// changes: true only when p is too large for the second start and the perturbation phase
// that Solve gives a plan from scratch (demands × (proposed edges, when AllowNew, and charges)
// above maxSecondStart), which a warm start skips. On a smaller problem a plan from scratch
// gets Solve's full search, and a warm one, searched with the local moves only, comes out
// dearer or cheaper by which plan it started from, not by the problem; a caller choosing
// between the two (a sweep's scenario) plans such a problem from scratch. It reads the
// bounds of the search for the cost objective; with ObjectiveLength neither runs, whatever
// the size.
func WarmPays(p *Problem) bool {
	fixed := len(p.Charges)
	if p.AllowNew {
		for i := range p.Edges {
			if p.Edges[i].Proposed {
				fixed++
			}
		}
	}
	return fixed > 0 && len(p.Demands)*fixed > maxSecondStart
}
