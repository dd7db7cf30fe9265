package optimize

// crossingAvoided returns what keeping diverse demand d's legs off a shared place
// (Problem.Sites: a junction drawn as several nodes, ducts crossing with no structure) costs
// against the final plan: the weight of its pair, which passes no place twice, less that of
// the cheapest pair within reach the search finds when places are not counted, if that pair
// passes one and weighs less; 0 otherwise (no places, a single route, a pair that already
// shares a place, the length objective). Both are weighed as bestBelow weighs a reroute of d
// (d out of the plan, its cable's place in the ducts its own, markOwn), so the figure is in
// the objective's cents; the legs' option cents are the same for both and cancel. The plan is
// left as it was: d is put back on its choice, whose edges' users stay in ascending order.
func (sv *solver) crossingAvoided(d int) int64 {
	c := sv.st.ch[d]
	if sv.siteOf == nil || sv.length || c.opt < 0 || len(c.legs) != 2 || sv.sharedSite(c.legs) != 0 {
		return 0
	}
	sv.remove(d)
	sv.markOwn(d, c)
	defer func() {
		sv.endOwn()
		sv.add(d, c)
		sv.flush()
	}()
	w := sv.weightFor(d, c.opt)
	chosenW := int64(0)
	for _, leg := range c.legs {
		cw, _ := pathEval(sv.net, leg, w)
		chosenW += cw
	}
	sites := sv.siteOf
	sv.siteOf = nil // the search as if no place were shared: sharedSite answers 0
	legs, ok := sv.groupPair(sv.from[d], sv.to[d], w, treeH(sv.bound(sv.to[d], sv.optProf[d][c.opt]).t), chosenW)
	sv.siteOf = sites
	if !ok || sv.sharedSite(legs[:]) == 0 {
		return 0
	}
	limit := sv.reach[d][c.opt]
	c0, l0 := pathEval(sv.net, legs[0], w)
	c1, l1 := pathEval(sv.net, legs[1], w)
	if l0 > limit || l1 > limit || c0+c1 >= chosenW {
		return 0
	}
	return chosenW - c0 - c1
}
