package routing

import (
	"cmp"
	"slices"

	"spanwright/route/optimize"
	"spanwright/route/site"
)

// shareConstruction sets the construction share of every leg of r (r.Legs, which flattens
// legs, the legs of each link): what the optimizer's plan sol of prob pays for new
// construction, each thing the plan builds split among the legs that use it (links.csv's
// construction column, README "links.csv"): an opened span's FixedCents (its new work, ducts,
// handholes along its run and the bid items per new buried metre) among the legs routed
// along it, the ducts added along an edge (optimize.Edge.AddedCents of those laid,
// EdgeFill.AddedDucts) among the legs whose cables it carries, and a charge paid (a handhole
// at a junction, an entrance of a building with several) among the legs that use any of its
// edges, each in equal shares (shareAmong). The optimizer's own split (optimize.Leg's
// ConstructionCents) gives each added duct to the leg whose cable needed it, in packing
// order, and a remainder cent to the first demand in its order: twin legs of one trench came
// out thousands apart and swapped on a re-export moved by a millimetre (tester 13's finding
// F). The shares add up to what the optimizer's legs carry.
func shareConstruction(s *site.Site, prob *optimize.Problem, sol *optimize.Solution, legs [][]Leg, r *Routed) {
	usersOf := make([][]int, len(prob.Edges))
	k := 0
	for i := range legs {
		rt := &sol.Routes[i]
		for j := range legs[i] {
			if rt.Feasible {
				hops := rt.Primary.Hops
				if j == 1 {
					hops = rt.Secondary.Hops
				}
				for _, h := range hops {
					if u := usersOf[h.Edge]; len(u) == 0 || u[len(u)-1] != k {
						usersOf[h.Edge] = append(u, k)
					}
				}
			}
			k++
		}
	}
	rank := shareRank(s, r.Legs)
	for _, e := range sol.Opened {
		shareAmong(r.Legs, rank, prob.Edges[e].FixedCents, usersOf[e])
	}
	for _, f := range sol.Fill {
		ed := &prob.Edges[f.Edge]
		added := f.AddedDucts
		if ed.Proposed {
			added -= ed.Ducts // its own ducts are in FixedCents
		}
		if c := ed.AddedCents(added); c > 0 {
			shareAmong(r.Legs, rank, c, usersOf[f.Edge])
		}
	}
	for _, c := range sol.Charged {
		ch := &prob.Charges[c]
		var users []int
		for _, e := range ch.Edges {
			users = append(users, usersOf[e]...)
		}
		slices.Sort(users)
		shareAmong(r.Legs, rank, ch.Cents, slices.Compact(users))
	}
}

// shareRank orders legs for the cents a split leaves over (shareAmong), by what the campus
// draws and not by names: the position of the junction each leg starts from (its served
// building's way in: longitude, then latitude), then its route's length in whole
// millimetres, then the order of the plan's links. A campus whose ids are renamed or whose
// features are reordered gives every leg the same share; moved by a millimetre, a leg gets a
// cent more or less at most.
func shareRank(s *site.Site, legs []Leg) []int {
	type key struct {
		lon, lat float64
		mm       int64
	}
	keys := make([]key, len(legs))
	for i := range legs {
		l := &legs[i]
		keys[i].mm = int64(l.RouteM*1000 + 0.5)
		if len(l.Steps) == 0 {
			continue
		}
		sp, ok := s.Net.Span(l.Steps[0].SpanID)
		if !ok {
			continue
		}
		j := sp.From
		if l.Steps[0].Reverse {
			j = sp.To
		}
		if jn, ok := s.Net.Junction(j); ok {
			keys[i].lon, keys[i].lat = jn.Point[0], jn.Point[1]
		}
	}
	order := make([]int, len(legs))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int {
		ka, kb := keys[a], keys[b]
		return cmp.Or(cmp.Compare(ka.lon, kb.lon), cmp.Compare(ka.lat, kb.lat), cmp.Compare(ka.mm, kb.mm))
	})
	rank := make([]int, len(legs))
	for r, i := range order {
		rank[i] = r
	}
	return rank
}

// shareAmong adds cents to the construction of the legs users (indexes into legs), in equal
// shares, the cents left over one each to the users first in rank (shareRank).
func shareAmong(legs []Leg, rank []int, cents int64, users []int) {
	if len(users) == 0 {
		return
	}
	byRank := slices.Clone(users)
	slices.SortFunc(byRank, func(a, b int) int { return cmp.Compare(rank[a], rank[b]) })
	n := int64(len(byRank))
	part, left := cents/n, cents%n
	for i, u := range byRank {
		c := part
		if int64(i) < left {
			c++
		}
		legs[u].Cost.ConstructionCents += c
	}
}
