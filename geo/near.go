package geo

import (
	"cmp"
	"slices"
)

// NearPathway is a pathway that passes near a building's footprint: its id and the least
// distance, in metres, from the footprint to its line (0 where it reaches the footprint).
type NearPathway struct {
	PathwayID string
	DistM     float64
}

// PathwaysNear lists the pathways whose spans pass within maxM metres of building b's
// footprint, each once at its least distance, nearest first (ties by id); none for a building
// the campus lacks. Distances are measured as Build measures laterals (footprint.segDist) on
// the local projection about the footprint's first vertex (Local: far below a metre's error
// over the few tens of metres asked). It tells where a building could be given another
// entrance (a lateral of at most maxM, as Build lays them).
func (n *Network) PathwaysNear(c *Campus, b string, maxM float64) []NearPathway {
	var fp footprint
	var proj projector
	for _, bd := range c.Buildings {
		if bd.ID != b || len(bd.Footprint) == 0 || len(bd.Footprint[0]) == 0 || len(bd.Footprint[0][0]) == 0 {
			continue
		}
		first := bd.Footprint[0][0][0]
		proj = projector{NewLocal(first[0], first[1])}
		fp = newFootprint(proj, bd.Footprint)
		break
	}
	if fp.empty() {
		return nil
	}
	best := map[string]float64{}
	for _, sp := range n.Spans {
		for i := 1; i < len(sp.Line); i++ {
			d, _ := fp.segDist(proj.xy(sp.Line[i-1]), proj.xy(sp.Line[i]))
			if d > maxM {
				continue
			}
			if o, ok := best[sp.PathwayID]; !ok || d < o {
				best[sp.PathwayID] = d
			}
		}
	}
	out := make([]NearPathway, 0, len(best))
	for id, d := range best {
		out = append(out, NearPathway{PathwayID: id, DistM: d})
	}
	slices.SortFunc(out, func(a, b NearPathway) int {
		return cmp.Or(cmp.Compare(a.DistM, b.DistM), cmp.Compare(a.PathwayID, b.PathwayID))
	})
	return out
}
