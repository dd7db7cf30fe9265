package site

import (
	"cmp"
	"slices"

	"spanwright/geo"
)

// NewRun is a run of new construction: proposed duct spans joined end to end at junctions
// where nothing else meets (no structure, no entrance, no third span). Proposed pathways of
// other types (tunnel, tray, aerial, direct-buried) are not pulled through a duct and get no
// handholes. A route that takes one of
// its spans takes them all, so a plan opens a run whole or not at all, and its pull points are
// placed along the whole run: a pathway split at a vertex is the same run.
type NewRun struct {
	Steps []geo.Step // the run's spans in walk order (see NewRuns)
	// Handholes are the pull points the run needs between its ends, in walk order. The run's
	// ends are pull points already: a structure, a building's entrance, or a junction where
	// the plan adds a handhole (JoinsNetwork).
	Handholes []RunHandhole
	first     int // the smallest index in Net.Spans of the run's spans, for the run's order
}

// RunHandhole is a handhole placed along a run of new construction.
type RunHandhole struct {
	Step int     // index in NewRun.Steps of the span it stands on
	AtM  float64 // distance from the span's From end (its Line order), in metres
}

// runInterior marks the junctions inside runs of new construction: a plain junction (no
// structure, not an entrance) where exactly two span ends meet, both of proposed duct spans,
// of two different spans.
func runInterior(net *geo.Network, junction map[string]int, entrance map[string]bool) []bool {
	ends := make([]int, len(net.Junctions))
	proposed := make([]int, len(net.Junctions))
	for i := range net.Spans {
		sp := &net.Spans[i]
		for _, j := range [2]string{sp.From, sp.To} {
			k := junction[j]
			ends[k]++
			if newDuct(sp) && sp.From != sp.To {
				proposed[k]++
			}
		}
	}
	in := make([]bool, len(net.Junctions))
	for k, jn := range net.Junctions {
		in[k] = jn.Kind == geo.JunctionNode && !entrance[jn.ID] && ends[k] == 2 && proposed[k] == 2
	}
	return in
}

// carriedOn marks the plain junctions (no structure, not an entrance) where exactly two span
// ends meet, of two different proposed spans of one pathway type: new pathway drawn in two
// pieces carries on there, a duct inside its run (runInterior), a direct-buried cable, tunnel,
// tray or aerial span simply on, with nothing to join and no handhole to add (JoinsNetwork).
func carriedOn(net *geo.Network, junction map[string]int, entrance map[string]bool) []bool {
	ends := make([]int, len(net.Junctions))
	types := make([][]string, len(net.Junctions)) // the types of the proposed spans ending there
	for i := range net.Spans {
		sp := &net.Spans[i]
		for _, j := range [2]string{sp.From, sp.To} {
			k := junction[j]
			ends[k]++
			if sp.Status == geo.StatusProposed && sp.From != sp.To {
				types[k] = append(types[k], sp.Type)
			}
		}
	}
	in := make([]bool, len(net.Junctions))
	for k, jn := range net.Junctions {
		in[k] = jn.Kind == geo.JunctionNode && !entrance[jn.ID] && ends[k] == 2 && len(types[k]) == 2 && types[k][0] == types[k][1]
	}
	return in
}

// InRun reports whether junction j lies inside a run of new construction (NewRun): no
// handhole is added there for the new pathway joining, it carries on.
func (s *Site) InRun(j string) bool {
	k, ok := s.junction[j]
	return ok && s.interior[k]
}

// NewRuns lists the site's runs of new construction, each with the handholes it needs so that
// no pull section along it is longer than spacingM (0: no limit) or bends more than
// bendBudgetDeg (0: no limit) in all. Handholes are placed greedily from the run's first end,
// as far as each limit allows: the fewest a run can have. A bend at a handhole is taken inside
// it and counts towards neither section. A run is walked from its westmost end (the smaller
// longitude, then latitude; for a loop whose ends are one junction, the end whose first vertex
// is westmost), so that ids and drawing direction decide nothing; a closed ring of new spans
// starts at its westmost junction. Runs are listed by their first
// span's index. Time O(spans + vertices).
func (s *Site) NewRuns(spacingM, bendBudgetDeg float64) []NewRun {
	net := s.Net
	spansAt := make([][]int, len(net.Junctions))
	for i := range net.Spans {
		sp := &net.Spans[i]
		if !newDuct(sp) {
			continue
		}
		spansAt[s.junction[sp.From]] = append(spansAt[s.junction[sp.From]], i)
		if sp.To != sp.From {
			spansAt[s.junction[sp.To]] = append(spansAt[s.junction[sp.To]], i)
		}
	}
	pos := func(j string) lonLat {
		p := net.Junctions[s.junction[j]].Point
		return lonLat{p[0], p[1]}
	}
	done := make([]bool, len(net.Spans))
	var runs []NewRun
	walk := func(start string, first int) NewRun {
		r := NewRun{first: first}
		at, i := start, first
		for !done[i] {
			done[i] = true
			sp := &net.Spans[i]
			st := geo.Step{SpanID: sp.ID, Reverse: sp.From != at}
			r.Steps = append(r.Steps, st)
			r.first = min(r.first, i)
			at = sp.To
			if st.Reverse {
				at = sp.From
			}
			k := s.junction[at]
			if !s.interior[k] {
				break
			}
			next := spansAt[k][0]
			if next == i {
				next = spansAt[k][1]
			}
			i = next
		}
		r.Handholes = s.place(r.Steps, spacingM, bendBudgetDeg)
		return r
	}
	// Runs with ends: walk each from its better end.
	for i := range net.Spans {
		sp := &net.Spans[i]
		if !newDuct(sp) || done[i] {
			continue
		}
		// Find both ends of the run through span i.
		endA, okA := s.runEnd(spansAt, i, sp.From)
		endB, okB := s.runEnd(spansAt, i, sp.To)
		if !okA || !okB {
			continue // a closed ring: below
		}
		start, first := endA.junction, endA.span
		a, b := pos(endA.junction), pos(endB.junction)
		if endA.junction == endB.junction {
			// Both ends at one junction (a loop off it): from the end whose first vertex away
			// from the junction lies further west, then further south.
			a, b = s.awayFrom(endA), s.awayFrom(endB)
		}
		if b.less(a) {
			start, first = endB.junction, endB.span
		}
		runs = append(runs, walk(start, first))
	}
	// Closed rings of new spans: start at the westmost junction.
	for i := range net.Spans {
		if !newDuct(&net.Spans[i]) || done[i] {
			continue
		}
		best, bestSpan := "", -1
		at, k := net.Spans[i].From, i
		for range len(net.Spans) {
			if bestSpan < 0 || pos(at).less(pos(best)) {
				best, bestSpan = at, k
			}
			sp := &net.Spans[k]
			if sp.From == at {
				at = sp.To
			} else {
				at = sp.From
			}
			if k = otherSpan(spansAt[s.junction[at]], k); k == i {
				break
			}
		}
		// The ring is walked from best along the lower-indexed of its two spans there.
		first := min(bestSpan, otherSpan(spansAt[s.junction[best]], bestSpan))
		runs = append(runs, walk(best, first))
	}
	slices.SortFunc(runs, func(a, b NewRun) int { return cmp.Compare(a.first, b.first) })
	return runs
}

// newDuct reports whether a span is new duct: a proposed duct pathway.
func newDuct(sp *geo.Span) bool { return sp.Status == geo.StatusProposed && sp.Type == geo.TypeDuct }

// awayFrom is the first vertex of the run's end span away from its end junction.
func (s *Site) awayFrom(e runEndAt) lonLat {
	sp := &s.Net.Spans[e.span]
	p := sp.Line[1]
	if sp.To == e.junction && sp.From != e.junction {
		p = sp.Line[len(sp.Line)-2]
	}
	return lonLat{p[0], p[1]}
}

// lonLat is a position, compared westmost first, then southmost.
type lonLat [2]float64

func (a lonLat) less(b lonLat) bool { return a[0] < b[0] || (a[0] == b[0] && a[1] < b[1]) }

func otherSpan(at []int, i int) int {
	if at[0] == i && len(at) > 1 {
		return at[1]
	}
	return at[0]
}

type runEndAt struct {
	junction string
	span     int // the run's span that ends there
}

// runEnd follows the run through span i past junction j to its end; false for a closed ring.
func (s *Site) runEnd(spansAt [][]int, i int, j string) (runEndAt, bool) {
	net := s.Net
	for range len(net.Spans) + 1 {
		k := s.junction[j]
		if !s.interior[k] {
			return runEndAt{junction: j, span: i}, true
		}
		i = otherSpan(spansAt[k], i)
		sp := &net.Spans[i]
		if sp.From == j {
			j = sp.To
		} else {
			j = sp.From
		}
	}
	return runEndAt{}, false
}

// place puts handholes along steps so that no section is longer than spacingM or bends more
// than budgetDeg (0: no limit of that kind); see NewRuns.
func (s *Site) place(steps []geo.Step, spacingM, budgetDeg float64) []RunHandhole {
	const tol = 1e-6
	var out []RunHandhole
	var runM, bentDeg float64 // since the last pull point
	at := func(step int, sp *geo.Span, travelM float64) {
		atM := travelM
		if steps[step].Reverse {
			atM = sp.LengthM - travelM
		}
		out = append(out, RunHandhole{Step: step, AtM: atM})
		runM, bentDeg = 0, 0
	}
	bend := func(step int, sp *geo.Span, travelM, deg float64) {
		if deg <= 0 {
			return
		}
		if budgetDeg > 0 && bentDeg+deg > budgetDeg+tol {
			at(step, sp, travelM) // the bend is taken inside the new handhole
			return
		}
		bentDeg += deg
	}
	for k, st := range steps {
		sp, _ := s.Net.Span(st.SpanID)
		if k > 0 {
			bend(k, &sp, 0, s.Net.TurnDeg(steps[k-1], st))
		}
		segs := sp.SegmentsM()
		travelM := 0.0
		for q := range segs {
			qq, bq := q, q-1
			if st.Reverse {
				qq, bq = len(segs)-1-q, len(segs)-1-q
			}
			if q > 0 && bq < len(sp.BendsDeg) {
				bend(k, &sp, travelM, sp.BendsDeg[bq])
			}
			segM := segs[qq]
			for spacingM > 0 && runM+segM > spacingM+tol {
				step := spacingM - runM
				travelM += step
				segM -= step
				at(k, &sp, travelM)
			}
			runM += segM
			travelM += segM
		}
	}
	return out
}

// HandholesBySpan lists the handholes along runs by span ID, each at metres from the span's
// from end, in run order.
func HandholesBySpan(runs []NewRun) map[string][]float64 {
	out := map[string][]float64{}
	for _, r := range runs {
		for _, h := range r.Handholes {
			id := r.Steps[h.Step].SpanID
			out[id] = append(out[id], h.AtM)
		}
	}
	return out
}
