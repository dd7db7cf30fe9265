package optimize

// NoDiversePair finds, without a search, the diverse demands that can have no second route,
// and names what every route of each shares, as Solve names it (Route.SinglePoint): a map
// from demand index to the point. Only a proved point is named, under every option of the
// demand: an edge or node every route passes, or a shared-risk group that on its own
// separates the demand's ends; an option with no route at all is passed over. A pair that
// exists but fits no medium's reach or the ducts, a group only shared by every pair the
// heuristic finds, or a demand with no route at all is left to Solve. The point named is one
// every route of every option passes where there is one (found on the edges any option may
// use), which Solve names too; else that of the demand's first option, where Solve names that
// of the option it chose.
func NoDiversePair(p *Problem) (map[int]SinglePoint, error) {
	if err := validate(p, Settings{}); err != nil {
		return nil, err
	}
	sv := newSolver(p, Settings{})
	out := map[int]SinglePoint{}
	for d := range p.Demands {
		dm := &p.Demands[d]
		if !dm.Diverse || sv.invalid[d] != "" || len(dm.Options) == 0 {
			continue
		}
		if !sv.routableAny(d) {
			continue
		}
		// A point every route passes over the edges some option may use: every option's
		// routes pass it, and Solve names it whichever option it routes (singlePoint).
		if sp, _ := sv.singlePointOn(d, sv.anyOption(d)); sp != nil && sp.Separates {
			out[d] = *sp
			continue
		}
		var first *SinglePoint
		proved := true
		for o := range dm.Options {
			if !sv.routable(d, o) {
				continue // a medium with no route at all is never the one routed
			}
			sp, _ := sv.singlePoint(d, o)
			if sp == nil || !sp.Separates {
				proved = false
				break
			}
			if first == nil {
				first = sp
			}
		}
		if proved && first != nil {
			out[d] = *first
		}
	}
	return out, nil
}

// routableAny reports whether demand d has a route at all under some option, reach aside.
func (sv *solver) routableAny(d int) bool {
	for o := range sv.p.Demands[d].Options {
		if sv.routable(d, o) {
			return true
		}
	}
	return false
}

// routable reports whether demand d has a route at all under its option o, reach aside.
func (sv *solver) routable(d, o int) bool {
	base := sv.profBase[sv.optProf[d][o]]
	return sv.srch.run(sv.from[d], sv.to[d], func(e int32) (int64, bool) { return base[e], base[e] >= 0 }, nil)
}
