package geo

import (
	"fmt"
	"slices"
	"strings"

	"github.com/paulmach/orb"
)

// wallCut is a pathway end drawn through a building's wall that cutAtWalls cut back to it.
type wallCut struct {
	pw       string // pathway ID
	building string
	cutM     float64 // metres of the line inside the footprint, left off
}

// cutAtWalls cuts back to the wall every pathway end drawn into a building's footprint (more
// than SnapM inside it) that joins nothing there: a service duct drawn through the wall to the
// telecom room. The entrance is where the pathway crosses into the footprint, so the
// inside stretch is not outside plant: no route or cable metres (the building's riser_m takes
// the cable from the entrance to its telecom room), no trench for ducts added beside it. An end
// that meets another pathway, a structure or an entrance inside the building is left as drawn
// (pathways meeting in a basement; splitInside has already parted ends that meet only one
// another there, outside transit buildings), and so are trays and tunnels (indoor pathways), a pathway
// whose span lies wholly inside the footprint, and an end inside two footprints at once.
// It runs after spans, before the junctions take their points, and moves the end's junction to
// the wall; each end cut is warned about on its pathway, with the metres left off.
func (b *builder) cutAtWalls(n *Network) {
	degree := make(map[string]int, len(n.Spans)*2)
	at := make(map[string]int, len(n.Spans)*2) // junction ID → a span ending there
	for i, s := range n.Spans {
		degree[s.From]++
		degree[s.To]++
		at[s.From], at[s.To] = i, i
	}
	inFeet := make(map[int]int) // junction root → how many buildings have it as a footprint end
	for bi := range b.c.Buildings {
		for _, d := range b.doors[bi] {
			if d.via == ViaFootprint {
				inFeet[b.find(d.target)]++
			}
		}
	}
	var cuts []wallCut
	for bi, bl := range b.c.Buildings {
		f := &b.feet[bi]
		for _, d := range b.doors[bi] {
			if d.via != ViaFootprint {
				continue
			}
			r := b.find(d.target)
			id, ok := b.ids[r]
			if !ok || inFeet[r] != 1 || b.labeled[r] || degree[id] != 1 {
				continue // in two footprints at once (buildings drawn overlapping): left as drawn
			}
			sp := &n.Spans[at[id]]
			if sp.From == sp.To || sp.Type == TypeTray || sp.Type == TypeTunnel || len(sp.Line) < 2 {
				continue
			}
			end := b.proj.xy(b.rep[r])
			if !f.contains(end) {
				continue
			}
			if _, dm := f.nearestBoundary(end); dm <= b.snap {
				continue
			}
			line := slices.Clone(sp.Line) // from the other end to this one
			if sp.From == id {
				slices.Reverse(line)
			}
			if f.contains(b.proj.xy(line[0])) {
				continue // the span starts inside too: drawn inside the building, or across it
			}
			kept, wall, ok := b.wallCrossing(f, line)
			if !ok {
				continue
			}
			cutM := LengthM(line) - LengthM(kept)
			if sp.From == id {
				slices.Reverse(kept)
			}
			sp.Line, sp.LengthM = kept, LengthM(kept)
			sp.BendsDeg, sp.near = b.lineBends(kept)
			b.rep[r] = wall
			if b.cutIn == nil {
				b.cutIn = make(map[string][]int)
			}
			b.cutIn[sp.PathwayID] = append(b.cutIn[sp.PathwayID], bi)
			cuts = append(cuts, wallCut{pw: sp.PathwayID, building: bl.ID, cutM: cutM})
		}
	}
	if len(cuts) == 0 {
		return
	}
	slices.SortFunc(cuts, func(x, y wallCut) int {
		return strings.Compare(x.pw+"\x00"+x.building, y.pw+"\x00"+y.building)
	})
	// One warning per end cut, each naming its own feature (file, index and id).
	for _, c := range cuts {
		pw := b.pathway(c.pw)
		b.warns = append(b.warns, warnRec{pw.Source, pw.ID, fmt.Sprintf(
			"drawn through the wall of building %q to a point %s m inside it: cut at the wall, the %s m not counted as route, cable or trench (riser_m takes the cable from the entrance to the telecom room)",
			c.building, shortM(c.cutM), shortM(c.cutM))})
	}
}

// wallCrossing cuts line (its last point inside footprint f, its first outside) at the last
// place it crosses into f: the line up to there and that point, in lon/lat.
func (b *builder) wallCrossing(f *footprint, line orb.LineString) (orb.LineString, orb.Point, bool) {
	for i := len(line) - 1; i > 0; i-- {
		a, c := b.proj.xy(line[i-1]), b.proj.xy(line[i])
		best, found := 0.0, false
		for _, poly := range f.rings {
			for _, ring := range poly {
				for k := 1; k < len(ring); k++ {
					if t, _, ok := segIntersect(a, c, ring[k-1], ring[k]); ok && (!found || t > best) {
						best, found = t, true
					}
				}
			}
		}
		if !found {
			continue
		}
		wall := lerpLL(line[i-1], line[i], best)
		kept := append(slices.Clone(line[:i]), wall)
		if best == 0 {
			kept = kept[:i]
			wall = line[i-1]
		}
		return kept, wall, len(kept) >= 2
	}
	return nil, orb.Point{}, false
}

// cutOff reports whether point p (lon/lat) lies inside a building where cutAtWalls cut an end
// of pathway id: on the stretch left off, unless the pathway also runs through that building
// elsewhere (taken as not).
func (b *builder) cutOff(id string, p orb.Point) bool {
	for _, bi := range b.cutIn[id] {
		if b.feet[bi].contains(b.proj.xy(p)) {
			return true
		}
	}
	return false
}

// splitInside parts a junction where two or more pathway ends meet inside a building's
// footprint (more than SnapM inside it, in one footprint only) and nothing else does: no
// structure, no entrance, no pathway running on through it, no tray or tunnel. Laterals drawn
// from two streets to the building's centre are two service ducts through two walls, not one
// duct: each end becomes a junction of its own, which cutAtWalls then cuts at its own wall
// crossing, so the building has an entrance at each wall and the metres inside count as no
// outside plant. It runs after cut, before number, and only where every end will be cut (the
// far end of each piece outside the footprint, the line crossing its wall); each point is
// warned about on the first of its pathways. A structure drawn at the meeting point keeps them joined.
func (b *builder) splitInside() {
	in := make(map[int][]int) // root → the buildings (index) with a footprint door there
	for bi := range b.c.Buildings {
		for _, d := range b.doors[bi] {
			if r := b.find(d.target); d.via == ViaFootprint && !slices.Contains(in[r], bi) {
				in[r] = append(in[r], bi)
			}
		}
	}
	if len(in) == 0 {
		return
	}
	ends := make(map[int][]int) // root in a footprint → indices of the pieces with an end there
	for k, pc := range b.pieces {
		if _, ok := in[pc.from]; ok {
			ends[pc.from] = append(ends[pc.from], k)
		}
		if _, ok := in[pc.to]; ok && pc.to != pc.from {
			ends[pc.to] = append(ends[pc.to], k)
		}
	}
	roots := make([]int, 0, len(ends))
	for r, ks := range ends {
		if len(ks) >= 2 && !b.labeled[r] {
			roots = append(roots, r)
		}
	}
	if len(roots) == 0 {
		return
	}
	slices.Sort(roots)
	cluster := make(map[int][]int, len(roots)) // candidate root → its members
	for _, r := range roots {
		cluster[r] = nil
	}
	for i := range b.mem {
		if ms, ok := cluster[b.find(i)]; ok {
			cluster[b.find(i)] = append(ms, i)
		}
	}
	type parted struct {
		building, pws string
		insideM       float64
		src           Source
		first         string
	}
	var split []parted
	for _, r := range roots {
		bi, ok := b.insideOne(r, in)
		if !ok || b.c.Buildings[bi].Transit {
			continue
		}
		f := &b.feet[bi]
		byPart := make(map[int]int) // part → its member at r
		good := true
		for _, m := range cluster[r] {
			mm := b.mem[m]
			if mm.part < 0 || mm.kind != memVertex || (mm.seg != 0 && mm.seg != len(b.parts[mm.part].xy)-1) {
				good = false // a structure, an entrance, or a pathway running on through the point
				break
			}
			if _, twice := byPart[mm.part]; twice {
				good = false
				break
			}
			byPart[mm.part] = m
		}
		if !good {
			continue
		}
		var ids []string
		for _, k := range ends[r] {
			pc := b.pieces[k]
			typ := b.c.Pathways[b.parts[pc.part].pw].Type
			if _, ok := byPart[pc.part]; !ok || pc.from == pc.to || typ == TypeTray || typ == TypeTunnel {
				good = false
				break
			}
			line := slices.Clone(pc.pts)
			if pc.from == r {
				slices.Reverse(line)
			}
			if f.contains(b.proj.xy(line[0])) {
				good = false
				break
			}
			if _, _, ok := b.wallCrossing(f, line); !ok {
				good = false
				break
			}
			ids = append(ids, b.c.Pathways[b.parts[pc.part].pw].ID)
		}
		if !good {
			continue
		}
		pt := b.rep[r]
		group := make([]int, 0, len(byPart))
		for _, m := range byPart {
			b.parent[m], b.labeled[m], b.rep[m] = m, false, pt
			group = append(group, m)
		}
		slices.Sort(group)
		if b.parted == nil {
			b.parted = make(map[int][][]int)
		}
		b.parted[bi] = append(b.parted[bi], group)
		for _, k := range ends[r] {
			pc := &b.pieces[k]
			if pc.from == r {
				pc.from = byPart[pc.part]
			}
			if pc.to == r {
				pc.to = byPart[pc.part]
			}
		}
		slices.Sort(ids)
		ids = slices.Compact(ids)
		_, dm := f.nearestBoundary(b.proj.xy(pt))
		first := b.pathway(ids[0])
		split = append(split, parted{building: b.c.Buildings[bi].ID, pws: strings.Join(ids, " and "), insideM: dm, src: first.Source, first: first.ID})
	}
	if len(split) == 0 {
		return
	}
	slices.SortFunc(split, func(x, y parted) int { return strings.Compare(x.building+"\x00"+x.pws, y.building+"\x00"+y.pws) })
	// One warning per point, on the first of its pathways (file, index and id).
	for _, s := range split {
		b.warns = append(b.warns, warnRec{s.src, s.first, fmt.Sprintf(
			"pathways %s meet %s m inside building %q and join nothing else there: each is taken as its own duct through the wall, cut where it crosses it, one entrance each (draw a structure where they meet if they are joined inside, or mark the building transit: true)",
			s.pws, shortM(s.insideM), s.building)})
	}
}

// insideOne returns the building whose footprint holds the point of junction root r more than
// SnapM inside it, when no other footprint holds an end at r (the footprint doors of
// planAccess: every pathway end in or within SnapM of a footprint).
func (b *builder) insideOne(r int, in map[int][]int) (int, bool) {
	bs := in[r]
	if len(bs) != 1 {
		return -1, false
	}
	f, xy := &b.feet[bs[0]], b.proj.xy(b.rep[r])
	if !f.contains(xy) {
		return -1, false
	}
	if _, d := f.nearestBoundary(xy); d <= b.snap {
		return -1, false
	}
	return bs[0], true
}

// shortM prints a length cut off or inside a building: to 0.1 m, or to the centimetre below
// 1 m, where 0.514 m rounded to "0.5" would read as exactly snap_m (default 0.5 m) though it is
// more.
func shortM(m float64) string {
	if m < 0.995 {
		return fmt.Sprintf("%.2f", m)
	}
	return fmt.Sprintf("%.1f", m)
}
