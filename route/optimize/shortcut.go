package optimize

// Shortcuts: a route that comes back to a node one edge away from where it was.

// shorten tries, on demand d's route of one leg, each stretch between two of its nodes that
// one edge joins directly, replaced by that edge, and keeps the first that makes the plan
// cheaper by the plan's own count (key), which prices each charge once. The searches price
// each edge's charges on their own, so a route that pays a charge on one edge of its set pays
// it again on another: where a junction is drawn as several nodes (split for turns), a route
// that opens a proposed span into it, whose handhole is the charge its turn edges carry too,
// is priced that handhole twice to turn there, and may go round a block to come back through
// the junction straight on (the generated 200-building campus: B030-B020 round four spans,
// about 400 m of cable, to save a handhole its own span had paid). A shortcut no longer than
// the stretch (in reach) keeps every reach; it must be an edge d may use now. Diverse demands
// (two legs) are left alone: a shortcut could break their disjointness. It reports whether it
// changed d's route.
func (sv *solver) shorten(d int) bool {
	c := sv.st.ch[d]
	if c.opt < 0 || len(c.legs) != 1 || sv.length || !sv.chOn || len(c.legs[0]) < 2 {
		return false
	}
	hops := c.legs[0]
	n := sv.net
	// at[v] is 1 + the position of node v along the leg, where posSt[v] == posN.
	if len(sv.posAt) < n.nodes {
		sv.posAt = make([]int32, n.nodes)
		sv.posSt = make([]uint32, n.nodes)
	}
	sv.posN++
	if sv.posN == 0 {
		clear(sv.posSt)
		sv.posN = 1
	}
	nodes := sv.posBuf[:0]
	for i, h := range hops {
		e := &sv.p.Edges[h.Edge]
		from, to := e.From, e.To
		if !h.Forward {
			from, to = to, from
		}
		if i == 0 {
			nodes = append(nodes, int32(from))
		}
		nodes = append(nodes, int32(to))
	}
	sv.posBuf = nodes
	for i, v := range nodes {
		sv.posAt[v], sv.posSt[v] = int32(i), sv.posN // the last visit of v
	}
	w := sv.weightFor(d, c.opt)
	for i, v := range nodes {
		for _, a := range n.adj[n.start[v]:n.start[v+1]] {
			if sv.posSt[a.to] != sv.posN {
				continue
			}
			j := int(sv.posAt[a.to])
			if j <= i+1 {
				continue // the leg's own next hop, or backwards
			}
			if _, ok := w(a.edge); !ok {
				continue
			}
			var stretchMM int64
			for _, h := range hops[i:j] {
				stretchMM += n.lenMM[h.Edge]
			}
			if n.lenMM[a.edge] > stretchMM {
				continue
			}
			legs := make([]Hop, 0, len(hops)-(j-i)+1)
			legs = append(legs, hops[:i]...)
			legs = append(legs, Hop{Edge: int(a.edge), Forward: sv.p.Edges[a.edge].From == int(v)})
			legs = append(legs, hops[j:]...)
			if sv.tryChoice(d, sv.choiceOf(d, c.opt, [][]Hop{legs})) {
				return true
			}
		}
	}
	return false
}

// choiceOf is demand d's choice of option o over legs, with their cable and labour cents and
// reach, as best counts them (legsCost).
func (sv *solver) choiceOf(d, o int, legs [][]Hop) choice {
	vc, mm := sv.legsCost(d, o, legs)
	return choice{opt: o, legs: legs, varCost: vc, lenMM: mm}
}

// legsCost is the cable and labour cents (choice.varCost) and the reach in millimetres
// (choice.lenMM) of option o of demand d over legs.
func (sv *solver) legsCost(d, o int, legs [][]Hop) (varCost, lenMM int64) {
	cents := sv.profCent[sv.optProf[d][o]]
	for _, leg := range legs {
		for _, h := range leg {
			varCost += cents[h.Edge]
			lenMM += sv.net.lenMM[h.Edge]
		}
	}
	return varCost, lenMM
}

// tryChoice puts choice c in place of demand d's and keeps it if the plan is cheaper.
func (sv *solver) tryChoice(d int, c choice) bool {
	before := sv.key()
	old := sv.remove(d)
	sv.add(d, c)
	if sv.key().less(before) {
		sv.memos[d].ok = false
		return true
	}
	sv.remove(d)
	sv.add(d, old)
	sv.flush()
	return false
}
