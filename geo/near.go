package geo

import (
	"cmp"
	"math"
	"slices"
)

// NearPathway is a pathway that passes near a building's footprint: its id and the least
// distance, in metres, from the footprint's boundary to its line (0 where it crosses it).
type NearPathway struct {
	PathwayID string
	DistM     float64
}

// PathwaysNear lists the pathways whose spans pass within maxM metres of building b's
// footprint, each once at its least distance, nearest first (ties by id); none for a building
// the campus lacks. Distances are measured on the local projection about the footprint's first
// vertex (Local: far below a metre's error over the few tens of metres asked). It tells where
// a building could be given another entrance (a lateral of at most maxM, as Build lays them).
func (n *Network) PathwaysNear(c *Campus, b string, maxM float64) []NearPathway {
	var fp [][2]xyM // the footprint's boundary segments, in metres
	var loc Local
	for _, bd := range c.Buildings {
		if bd.ID != b {
			continue
		}
		for _, poly := range bd.Footprint {
			for _, ring := range poly {
				for i := 1; i < len(ring); i++ {
					if len(fp) == 0 {
						loc = NewLocal(ring[0][0], ring[0][1])
					}
					x0, y0 := loc.XY(ring[i-1][0], ring[i-1][1])
					x1, y1 := loc.XY(ring[i][0], ring[i][1])
					fp = append(fp, [2]xyM{{x0, y0}, {x1, y1}})
				}
			}
		}
	}
	if len(fp) == 0 {
		return nil
	}
	best := map[string]float64{}
	for _, sp := range n.Spans {
		for i := 1; i < len(sp.Line); i++ {
			x0, y0 := loc.XY(sp.Line[i-1][0], sp.Line[i-1][1])
			x1, y1 := loc.XY(sp.Line[i][0], sp.Line[i][1])
			for _, e := range fp {
				d := segSegM(xyM{x0, y0}, xyM{x1, y1}, e[0], e[1])
				if d > maxM {
					continue
				}
				if o, ok := best[sp.PathwayID]; !ok || d < o {
					best[sp.PathwayID] = d
				}
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

// xyM is a point on a local projection, in metres east and north.
type xyM struct{ x, y float64 }

// segSegM is the least distance between segments ab and cd, in metres: 0 when they cross.
func segSegM(a, b, c, d xyM) float64 {
	cross := func(o, p, q xyM) float64 { return (p.x-o.x)*(q.y-o.y) - (p.y-o.y)*(q.x-o.x) }
	d1, d2, d3, d4 := cross(c, d, a), cross(c, d, b), cross(a, b, c), cross(a, b, d)
	if ((d1 > 0 && d2 < 0) || (d1 < 0 && d2 > 0)) && ((d3 > 0 && d4 < 0) || (d3 < 0 && d4 > 0)) {
		return 0
	}
	return math.Min(math.Min(ptSegM(a, c, d), ptSegM(b, c, d)), math.Min(ptSegM(c, a, b), ptSegM(d, a, b)))
}

// ptSegM is the distance from p to segment ab, in metres.
func ptSegM(p, a, b xyM) float64 {
	dx, dy := b.x-a.x, b.y-a.y
	t := 0.0
	if l2 := dx*dx + dy*dy; l2 > 0 {
		t = math.Max(0, math.Min(1, ((p.x-a.x)*dx+(p.y-a.y)*dy)/l2))
	}
	return math.Hypot(p.x-(a.x+t*dx), p.y-(a.y+t*dy))
}
