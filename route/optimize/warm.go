package optimize

// Warm starts (Settings.Start): the search begins from the routes of an earlier solution
// instead of routing the demands one by one.

// startWarm builds the first plan from the warm start: every demand whose start route fits the
// problem takes it, in demand order, where its cables fit the ducts with the routes taken
// before it (fullEdges: the packing and overfull rule place holds the start to, so the first
// plan is never overfull where place would not leave it; a bank with no room, where this
// problem may add no duct, keeps no start route through it), then the others are placed in
// demand order as start places them.
func (sv *solver) startWarm() {
	sv.st = newState(sv)
	sv.recount()
	var later []int
	for d := range sv.p.Demands {
		if sv.stopped() {
			break
		}
		c, ok := sv.warmChoice(d)
		if ok {
			before := sv.key().overfull
			sv.add(d, c)
			full := sv.fullEdges(c, before)
			if full == nil {
				continue
			}
			sv.remove(d)
			sv.startNoRoom = append(sv.startNoRoom, StartNoRoom{Demand: d, Edges: full})
		}
		later = append(later, d)
		if d >= len(sv.warm) || sv.warm[d].Option >= 0 {
			sv.startUnused = append(sv.startUnused, d)
		}
	}
	for _, d := range later {
		if sv.stopped() {
			break
		}
		sv.place(d)
	}
	sv.flush()
	sv.newEpoch()
}

// warmChoice returns demand d's start route as a choice, and whether it fits the problem (see
// Settings.Start).
func (sv *solver) warmChoice(d int) (choice, bool) {
	p := sv.p
	if d >= len(sv.warm) || sv.invalid[d] != "" {
		return choice{}, false
	}
	r, dm := &sv.warm[d], &p.Demands[d]
	if r.ID != dm.ID || r.Option < 0 || r.Option >= len(dm.Options) || len(r.Legs) == 0 || len(r.Legs) > 2 || (len(r.Legs) == 2 && !dm.Diverse) {
		return choice{}, false
	}
	o := r.Option
	base, cents := sv.profBase[sv.optProf[d][o]], sv.profCent[sv.optProf[d][o]]
	c := choice{opt: o}
	var edges, inner []int
	for _, leg := range r.Legs {
		hops := leg
		if sv.from[d] != dm.Source {
			hops = reverseHops(leg)
		}
		v := sv.from[d]
		var mm int64
		for i, h := range hops {
			e := h.Edge
			if e < 0 || e >= len(p.Edges) || base[e] < 0 {
				return choice{}, false
			}
			ed := &p.Edges[e]
			if i > 0 {
				if len(p.NoTransit) > 0 && p.NoTransit[v] {
					return choice{}, false
				}
				inner = append(inner, v)
			}
			switch {
			case h.Forward && ed.From == v:
				v = ed.To
			case !h.Forward && ed.To == v:
				v = ed.From
			default:
				return choice{}, false
			}
			c.varCost += cents[e]
			mm += sv.net.lenMM[e]
			edges = append(edges, e)
		}
		if v != sv.to[d] || len(hops) == 0 || mm > sv.reach[d][o] {
			return choice{}, false
		}
		c.lenMM += mm
		c.legs = append(c.legs, hops)
	}
	// One leg may pass several edges of one group; two legs may share none (sharedGroup).
	if hasDup(edges) || hasDup(inner) || (len(c.legs) == 2 && sv.sharedGroup([2][]Hop{c.legs[0], c.legs[1]}) != 0) {
		return choice{}, false
	}
	return c, true
}

// hasDup reports whether xs holds a value twice (xs is short: a route's edges).
func hasDup(xs []int) bool {
	seen := make(map[int]bool, len(xs))
	for _, x := range xs {
		if seen[x] {
			return true
		}
		seen[x] = true
	}
	return false
}
