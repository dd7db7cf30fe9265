package geo

import (
	"fmt"
	"slices"
	"strings"

	"github.com/paulmach/orb"

	"spanwright/geo/input"
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
// (pathways meeting in a basement), and so are trays and tunnels (indoor pathways), a pathway
// whose span lies wholly inside the footprint, and an end inside two footprints at once.
// It runs after spans, before the junctions take their points, and moves the end's junction to
// the wall; one warning names the pathways cut and by how much.
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
			xy := make([]vec, len(kept))
			for i, p := range kept {
				xy[i] = b.proj.xy(p)
			}
			sp.Line, sp.LengthM = kept, LengthM(kept)
			sp.BendsDeg, sp.near = bendsDeg(xy)
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
	var total float64
	texts := make([]string, len(cuts))
	for i, c := range cuts {
		total += c.cutM
		texts[i] = fmt.Sprintf("%s %.1f m in %s", c.pw, c.cutM, c.building)
	}
	shown, more := input.Shown(texts, 10)
	first := b.pathway(cuts[0].pw)
	b.warns = append(b.warns, warnRec{first.Source, first.ID, fmt.Sprintf(
		"%d pathway ends drawn through a building's wall to a point inside it are cut at the wall, %.1f m in all not counted as route, cable or trench (riser_m takes the cable from the entrance to the telecom room): %s%s",
		len(cuts), total, strings.Join(shown, ", "), more)})
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
