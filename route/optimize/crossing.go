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
// alt is that cheaper pair as a choice of d (opt -1 when the figure is 0).
func (sv *solver) crossingAvoided(d int) (cents int64, alt choice) {
	alt.opt = -1
	c := sv.st.ch[d]
	if sv.siteOf == nil || sv.length || c.opt < 0 || len(c.legs) != 2 || sv.sharedSite(c.legs) != 0 {
		return 0, alt
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
	legs, ok := sv.groupPair(sv.from[d], sv.to[d], w, treeH(sv.bound(sv.to[d], sv.optProf[d][c.opt]).t), chosenW, nil)
	sv.siteOf = sites
	if !ok || sv.sharedSite(legs[:]) == 0 {
		return 0, alt
	}
	limit := sv.reach[d][c.opt]
	c0, l0 := pathEval(sv.net, legs[0], w)
	c1, l1 := pathEval(sv.net, legs[1], w)
	if l0 > limit || l1 > limit || c0+c1 >= chosenW {
		return 0, alt
	}
	alt = choice{opt: c.opt, legs: [][]Hop{legs[0], legs[1]}}
	alt.varCost, alt.lenMM = sv.legsCost(d, c.opt, alt.legs)
	return chosenW - c0 - c1, alt
}

// crossingJoint is what keeping the diverse demands off shared places costs together: the
// plan's objective less that of the plan with each demand of alts (those crossingAvoided
// found a cheaper pair for, ascending) moved onto its cheaper pair, all at once. The demands'
// own figures each hold the rest of the plan as it is, and two whose pairs share construction
// each count it as paid: they do not add up. The plan is put back as it was.
func (sv *solver) crossingJoint(ds []int, alts []choice) int64 {
	if len(ds) == 0 {
		return 0
	}
	before := sv.key().total
	olds := make([]choice, len(ds))
	for i, d := range ds {
		olds[i] = sv.remove(d)
		sv.add(d, alts[i])
	}
	after := sv.key().total
	for i := len(ds) - 1; i >= 0; i-- {
		sv.remove(ds[i])
		sv.add(ds[i], olds[i])
	}
	sv.flush()
	return before - after
}
