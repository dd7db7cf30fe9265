package geo

import (
	"cmp"
	"fmt"
	"slices"
	"strconv"
	"strings"
)

// index builds the lookup maps; Build calls it once, and a Network is read-only afterwards,
// so the maps are safe to share across goroutines.
func (n *Network) index() {
	n.spanIdx = make(map[string]int, len(n.Spans))
	for i, s := range n.Spans {
		n.spanIdx[s.ID] = i
	}
	n.junctionIdx = make(map[string]int, len(n.Junctions))
	for i, j := range n.Junctions {
		n.junctionIdx[j.ID] = i
	}
	n.accessIdx = make(map[string]int, len(n.Access))
	for i, a := range n.Access {
		n.accessIdx[a.Building] = i
	}
}

// Span returns the span with the given ID. It takes O(1) on a Network from Build and O(n) on
// one assembled by hand.
func (n *Network) Span(id string) (Span, bool) {
	if n.spanIdx != nil {
		i, ok := n.spanIdx[id]
		if !ok {
			return Span{}, false
		}
		return n.Spans[i], true
	}
	for _, s := range n.Spans {
		if s.ID == id {
			return s, true
		}
	}
	return Span{}, false
}

// Junction returns the junction with the given ID, as Span does.
func (n *Network) Junction(id string) (Junction, bool) {
	if n.junctionIdx != nil {
		i, ok := n.junctionIdx[id]
		if !ok {
			return Junction{}, false
		}
		return n.Junctions[i], true
	}
	for _, j := range n.Junctions {
		if j.ID == id {
			return j, true
		}
	}
	return Junction{}, false
}

// AccessOf returns how the building with the given ID reaches the network, as Span does.
func (n *Network) AccessOf(building string) (Access, bool) {
	if n.accessIdx != nil {
		i, ok := n.accessIdx[building]
		if !ok {
			return Access{}, false
		}
		return n.Access[i], true
	}
	for _, a := range n.Access {
		if a.Building == building {
			return a, true
		}
	}
	return Access{}, false
}

// Stretches names the work on the spans with the given IDs by the pathways drawn, so that
// the names do not depend on where a pathway is cut into spans (a junction where a building's
// counted lateral might tap it, used or not, cuts a span in two): the spans of one pathway
// that follow one another along it (Span.ID's piece order, each meeting the next at a
// junction) are one stretch, named "pathway P" when it is the whole pathway, else "pathway P,
// A m to B m", A and B the metres along the pathway's spans from its first (its west or south end,
// pieceOrder), to 0.1 m. An ID that is no span, or a span Build did not name, is named "span
// ID". The names are distinct and sorted.
func (n *Network) Stretches(ids []string) []string {
	type piece struct {
		k  int // the piece's number along its pathway, 0 when its ID has none
		sp *Span
	}
	want := map[string]bool{}
	byPathway := map[string]bool{}
	var out []string
	for _, id := range ids {
		if sp, ok := n.Span(id); ok {
			want[id], byPathway[sp.PathwayID] = true, true
		} else {
			out = append(out, "span "+id)
		}
	}
	pieces := map[string][]piece{}
	for i := range n.Spans {
		sp := &n.Spans[i]
		if !byPathway[sp.PathwayID] {
			continue
		}
		k := 1
		if sp.ID != sp.PathwayID {
			var err error
			if k, err = strconv.Atoi(strings.TrimPrefix(sp.ID, sp.PathwayID+"/")); err != nil || k < 1 {
				k = 0
			}
		}
		if k == 0 {
			if want[sp.ID] {
				out = append(out, "span "+sp.ID)
			}
			continue
		}
		pieces[sp.PathwayID] = append(pieces[sp.PathwayID], piece{k, sp})
	}
	meets := func(a, b *Span) bool { return a.From == b.From || a.From == b.To || a.To == b.From || a.To == b.To }
	for pw, ps := range pieces {
		slices.SortFunc(ps, func(a, b piece) int { return cmp.Compare(a.k, b.k) })
		atM, startM, start := 0.0, 0.0, -1
		flush := func(end int) {
			if start == 0 && end == len(ps) {
				out = append(out, "pathway "+pw)
			} else {
				out = append(out, fmt.Sprintf("pathway %s, %.1f m to %.1f m", pw, startM, atM))
			}
			start = -1
		}
		for i, p := range ps {
			if start >= 0 && (!want[p.sp.ID] || !meets(ps[i-1].sp, p.sp)) {
				flush(i)
			}
			if want[p.sp.ID] && start < 0 {
				start, startM = i, atM
			}
			atM += p.sp.LengthM
		}
		if start >= 0 {
			flush(len(ps))
		}
	}
	slices.Sort(out)
	return slices.Compact(out)
}
