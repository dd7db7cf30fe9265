package geo

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
