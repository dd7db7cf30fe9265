package geo

import (
	"cmp"
	"fmt"
	"slices"
	"sort"
	"strconv"
	"strings"
)

// EntrySep joins a building's ID and a number in the ID of an entrance that is not a declared
// one: "ENG:1", "ENG:2".
const EntrySep = ":"

// Entry is one way into a building: one of its entrances. Access is the one Build chose for
// the building; Network.Entrances lists them all.
type Entry struct {
	// ID is a declared entrance's junction ID (its id, or the one EntranceIDs gives it). An
	// entry that is not a declared entrance is named by its building's ID, EntrySep and a
	// number from 1, in the order of the entries' junction points (as junctions are numbered:
	// by the cells of junctionCellDeg, so that a millimetre does not reorder them) among the
	// building's undeclared entries; a number whose name a declared entrance has is
	// skipped. So the name depends on where the building's entrances are, not on the order of
	// the features or on other features' ids.
	ID string
	Access
	// Built says the entry is there already: no counted lateral, and an existing pathway
	// outside the building (not a tray) ends at its junction while no proposed one does, so
	// the wall is penetrated and sleeved where that pathway meets it. A proposed pathway there
	// needs its own penetration. Set with the network's Meetings.
	Built bool
	// PoleRiser says the entry's counted lateral leaves a pole line (Build joins it at a pole,
	// never between two) where no duct or direct-buried pathway comes down the pole yet: its
	// cable comes down the pole in a riser of its own into the handhole at the pole's foot.
	// Set with the network's Meetings.
	PoleRiser bool
}

// entryRank orders the ways one junction can be an entry of a building: a declared entrance
// names it before a pathway end on the footprint, before a counted lateral.
var entryRank = map[string]int{ViaEntrance: 0, ViaFootprint: 1, ViaLateral: 2}

// entrances lists every way into every building: each declared entrance on a pathway or
// within MaxLateralM of one, each pathway end inside the footprint or within SnapM of its
// boundary, and the counted lateral of a building with neither. A junction is one entry of a
// building however many of these meet there.
func (b *builder) entrances(n *Network) {
	declared := make(map[string]bool, len(b.entIDs))
	for _, id := range b.entIDs {
		declared[id] = true
	}
	type found struct {
		Entry
		root int
		ent  int // declared entrance index, -1 for another way in
	}
	for bi, bl := range b.c.Buildings {
		var list []found
		for _, d := range b.doors[bi] {
			r := b.find(d.target)
			id, ok := b.ids[r]
			if !ok {
				continue // a pathway end on a piece dropped as noise
			}
			e := found{Entry{Access: Access{Building: bl.ID, Junction: id, Via: d.via}}, r, d.entrance}
			if d.entrance >= 0 {
				e.ID = b.entIDs[d.entrance]
			}
			e.LateralM, e.Lateral = b.lateralTo(bi, d.via, r, d.from, d.lateral)
			if e.LateralM > b.maxLat {
				src := bl.Source
				if d.entrance >= 0 {
					src = b.c.Entrances[d.entrance].Source
				}
				b.warns = append(b.warns, warnRec{src, e.ID, fmt.Sprintf(
					"the lateral of building %q to junction %s is %s m, longer than %s m (design: max_lateral_m); it is not an entrance",
					bl.ID, id, fmtM(e.LateralM), fmtM(b.maxLat))})
				continue
			}
			if k := slices.IndexFunc(list, func(o found) bool { return o.Junction == id }); k >= 0 { // a building has few
				o := list[k]
				if entryRank[e.Via] < entryRank[o.Via] || (e.Via == o.Via && e.ID < o.ID) {
					list[k], e, o = e, o, e
				}
				if e.ent >= 0 && o.ent >= 0 {
					// Two declared entrances that reach the network at one point are one way in:
					// say which one stands for both rather than drop one silently.
					b.warns = append(b.warns, warnRec{b.c.Entrances[e.ent].Source, e.ID, fmt.Sprintf(
						"entrance %q of building %q reaches the network at the same point as entrance %q (junction %s): the two are one entrance, %q; draw a pathway to %q to make it a way in of its own",
						e.ID, bl.ID, o.ID, id, o.ID, e.ID)})
				}
				continue
			}
			list = append(list, e)
		}
		var unnamed []int
		for i, e := range list {
			if e.ID == "" {
				unnamed = append(unnamed, i)
			}
		}
		slices.SortFunc(unnamed, func(i, j int) int {
			x, y := list[i], list[j]
			return cmp.Or(cmpPlaces(placeOf(b.rep[x.root]), placeOf(b.rep[y.root])), strings.Compare(x.Junction, y.Junction))
		})
		k := 0
		for _, i := range unnamed {
			for {
				k++
				if id := bl.ID + EntrySep + strconv.Itoa(k); !declared[id] {
					list[i].ID = id
					break
				}
			}
		}
		for _, e := range list {
			n.Entrances = append(n.Entrances, e.Entry)
		}
	}
	sort.Slice(n.Entrances, func(i, j int) bool {
		x, y := n.Entrances[i], n.Entrances[j]
		if x.Building != y.Building {
			return x.Building < y.Building
		}
		return x.Junction < y.Junction
	})
}

// EntrancesOf returns the entrances of the building with the given ID, sorted by junction ID
// (nil when it has none), from Entrances sorted by building as Build leaves them. It shares
// Network.Entrances' storage; do not modify it.
func (n *Network) EntrancesOf(building string) []Entry {
	lo := sort.Search(len(n.Entrances), func(i int) bool { return n.Entrances[i].Building >= building })
	hi := lo
	for hi < len(n.Entrances) && n.Entrances[hi].Building == building {
		hi++
	}
	if lo == hi {
		return nil
	}
	return n.Entrances[lo:hi:hi]
}

// Entry returns the entrance with the given ID of the building with the given ID (an entry's
// ID names one entrance of its building), and false when the building has none by that ID.
func (n *Network) Entry(building, id string) (Entry, bool) {
	for _, e := range n.EntrancesOf(building) {
		if e.ID == id {
			return e, true
		}
	}
	return Entry{}, false
}
