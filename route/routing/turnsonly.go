package routing

import (
	"fmt"

	"spanwright/route/optimize"
	"spanwright/route/site"
)

// TurnsOnly lists, by index into links, the links whose two ends the plan's routes could join
// only by changing pathway at a junction without a structure, which design.turn_handholes:
// false does not let a route do; each with the words plan's reason for such a leg uses. It
// asks the problem plan routes on: which turns those are is decided where the problem is built
// (flagTurn, every option excludes it then), so that `check` judges them as plan does (one
// decision, one place). A link that no route joins even turning there is left out: what keeps
// it apart is something else (cut off, through buildings, only proposed pathways), which the
// check names on its own. Nil with the setting on.
func TurnsOnly(s *site.Site, m *Model, links []site.Link) (map[int]string, error) {
	if m.design.TurnHandholes || len(links) == 0 {
		return nil, nil
	}
	prob, _, _, err := problem(s, m, links, m.runsOf(s))
	if err != nil {
		return nil, err
	}
	out := map[int]string{}
	noTurn, all := usableAdjacency(prob, flagTurn), usableAdjacency(prob, 0)
	for i, d := range prob.Demands {
		if !joins(prob, noTurn, d) && joins(prob, all, d) {
			out[i] = fmt.Sprintf("every route between %s and %s %s", links[i].From, links[i].To, turnsWords)
		}
	}
	return out, nil
}

// turnsWords say, in plan's reason of an infeasible leg (layout.explain) and check's, what
// design.turn_handholes: false keeps a route from.
const turnsWords = "turns between pathways at junctions without a structure (design.turn_handholes: false builds no handhole there)"

// usableAdjacency lists, per node of prob, the nodes an edge a route may use leads to
// (optimize.Problem: a proposed edge only with AllowNew), the edges with a flag of exclude left
// out.
func usableAdjacency(prob *optimize.Problem, exclude uint64) [][]int {
	adj := make([][]int, prob.Nodes)
	for i := range prob.Edges {
		e := &prob.Edges[i]
		if (e.Proposed && !prob.AllowNew) || e.Flags&exclude != 0 {
			continue
		}
		adj[e.From] = append(adj[e.From], e.To)
		adj[e.To] = append(adj[e.To], e.From)
	}
	return adj
}

// joins reports whether some route over adj (usableAdjacency) joins demand d's two ends,
// never passing through a node routes may not pass (Problem.NoTransit).
func joins(prob *optimize.Problem, adj [][]int, d optimize.Demand) bool {
	seen := make([]bool, prob.Nodes)
	seen[d.Source] = true
	queue := []int{d.Source}
	for len(queue) > 0 {
		v := queue[0]
		queue = queue[1:]
		if v == d.Target {
			return true
		}
		if v != d.Source && prob.NoTransit != nil && prob.NoTransit[v] {
			continue // reached, not passed
		}
		for _, w := range adj[v] {
			if !seen[w] {
				seen[w] = true
				queue = append(queue, w)
			}
		}
	}
	return false
}
