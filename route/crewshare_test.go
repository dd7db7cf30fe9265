package route_test

import (
	"fmt"
	"math"
	"slices"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route"
	"spanwright/route/items"
	"spanwright/route/optimize"
)

// TestSearchCrewNoMoreThanTheBill holds the search's lower bound to the bill, leg by leg: at
// every junction a leg passes, the crew's set-up and entry the optimizer's edges charge it
// (read off the turn edges' prices in the problem, and the half a joining span's end carries)
// is at most the one pass the bill counts there (a handhole the plan builds and the leg
// passes, routing.SplicePoint.Added) — one pull set-up and one structure entry per cable per
// structure passed (BICSI OSP design practice: a pull point is set up, and a structure
// entered, once per pass; common practice, no published source for the count). The search's
// costs must not exceed the plan's true costs, or its lower bound is not one (README, "One
// cost model"). It reads the shares from the priced edges, not from the layout's join rule,
// so a turn priced at a whole share into a joining span that carries on through a street
// junction (review 4, F1) fails here.
func TestSearchCrewNoMoreThanTheBill(t *testing.T) {
	t.Parallel()
	book := costBook(t)
	pb, err := media.ParsePriceBook("prices.yaml", book)
	if err != nil {
		t.Fatal(err)
	}
	var whole int64
	for _, q := range items.AtJunctions(pb, 1, 1) {
		whole += pb.Cents(q)
	}
	if whole <= 0 {
		t.Fatal("the book prices no crew set-up or entry")
	}
	checked := 0
	for _, seed := range []uint64{1, 2, 3, 4} {
		r := costScenario(t, seed, book)
		prob, _ := problemOf(t, r)
		checked += crewWithinBill(t, fmt.Sprint("seed ", seed), r, prob, whole)
	}
	if checked == 0 {
		t.Fatal("no leg passed a junction where new pathway joins or a route turns: the test checks nothing")
	}
}

// crewWithinBill checks r's legs as TestSearchCrewNoMoreThanTheBill says and returns how many
// junction passes it checked where the search charged a crew share.
func crewWithinBill(t *testing.T, name string, r *route.Result, prob *optimize.Problem, whole int64) int {
	t.Helper()
	net := r.Site.Net
	index := map[string]int{}
	for i := range net.Spans {
		index[net.Spans[i].ID] = i
	}
	turns := map[string][]*optimize.Edge{} // junction → its turn edges
	for i := range prob.Edges {
		if j, ok := strings.CutPrefix(prob.Edges[i].ID, "turn at "); ok {
			turns[j] = append(turns[j], &prob.Edges[i])
		}
	}
	nodeAt := func(i int, j string) int {
		if net.Spans[i].From == j {
			return prob.Edges[i].From
		}
		return prob.Edges[i].To
	}
	checked := 0
	for li := range r.Legs {
		l := &r.Legs[li]
		if !l.Feasible {
			continue
		}
		passed := map[string]int{}
		for _, p := range l.Cable.Passed {
			if p.Added && p.Span == "" {
				passed[p.ID]++
			}
		}
		for k := 1; k < len(l.Steps); k++ {
			a, b := index[l.Steps[k-1].SpanID], index[l.Steps[k].SpanID]
			j := net.Spans[a].To
			if l.Steps[k-1].Reverse {
				j = net.Spans[a].From
			}
			// Half a pass on each proposed span's end where new pathway joins (items.JoinEnds),
			// but in a run of duct carried on from a span that is not new (README, "One cost
			// model").
			charged := 0.0
			for _, i := range []int{a, b} {
				if sp := &net.Spans[i]; sp.Status == geo.StatusProposed && r.Site.JoinsNetwork(j) && !carriedOn(r, i, j) {
					charged += 0.5
				}
			}
			// The cheapest way over the junction's turn edges from a's node to b's, in shares
			// of a whole pass read off each edge's price.
			from, to := nodeAt(a, j), nodeAt(b, j)
			best := map[int]float64{from: 0}
			for range len(turns[j]) + 1 {
				for _, e := range turns[j] {
					share := math.Round(2*float64(e.PerCableCents)/float64(whole)) / 2
					for _, uv := range [][2]int{{e.From, e.To}, {e.To, e.From}} {
						if c, ok := best[uv[0]]; ok {
							if d, seen := best[uv[1]]; !seen || c+share < d {
								best[uv[1]] = c + share
							}
						}
					}
				}
			}
			turn, ok := best[to]
			if !ok {
				continue // not over turn edges (through a building's node): no turn priced here
			}
			charged += turn
			if charged == 0 {
				continue
			}
			checked++
			bill := float64(passed[j])
			if charged > bill {
				t.Errorf("%s: leg %s %s at %s (from %s into %s): the search charges %.1f crew passes, the bill counts %.0f",
					name, l.Link.ID, l.Name, j, net.Spans[a].ID, net.Spans[b].ID, charged, bill)
			}
		}
	}
	return checked
}

// carriedOn reports whether span i is, at junction j where turns are split, in a run of duct
// (geo.Network.RunsAt) with a span that is not new.
func carriedOn(r *route.Result, i int, j string) bool {
	net := r.Site.Net
	if !slices.Contains(r.Site.TurnsNeedingStructure(), j) {
		return false
	}
	var at []int
	for k := range net.Spans {
		if s := &net.Spans[k]; s.From == j || s.To == j {
			at = append(at, k)
		}
	}
	for _, run := range net.RunsAt(j, at) {
		if slices.Contains(run, i) {
			return slices.ContainsFunc(run, func(k int) bool { return net.Spans[k].Status != geo.StatusProposed })
		}
	}
	return false
}
