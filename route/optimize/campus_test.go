package optimize

import (
	"fmt"
	"math"
	"math/rand/v2"

	"spanwright/media/install"
)

// campusSpec describes a synthetic campus for tests and benchmarks.
type campusSpec struct {
	buildings   int
	seed        uint64
	diverseFrac float64 // share of demands that need a diverse pair
	options     int     // 1: one medium per demand; 3: OM4, OS2 and, near the hub, Cat 6A
	capacity    bool    // duct data on existing edges (otherwise unlimited)
	proposedPct int     // proposed edges as a share of all edges, in percent
	trenchScale float64 // multiplies trench prices; 0 means 1
}

// campus builds a grid of streets (blocks of 80 m, one duct bank per block side, some sides
// with a second parallel bank) with buildings along them. Each building sits on a tap that
// splits its street side, enters by a lateral from the tap and by a second lateral from the
// nearer corner (so diverse routes can exist), and has one demand to the nearer of two
// intermediate cross-connects. About a tenth of the edges are proposed trenches: shortcuts
// across blocks and between neighbouring buildings. Names and places are invented.
func campus(cs campusSpec) *Problem {
	r := rand.New(rand.NewPCG(cs.seed, 0xca4b))
	const blockM = 80.0
	side := int(math.Ceil(math.Sqrt(float64(cs.buildings)/4))) + 1
	p := &Problem{AllowNew: true}
	node := func() int { p.Nodes++; return p.Nodes - 1 }
	junction := make([][]int, side+1)
	for x := range junction {
		junction[x] = make([]int, side+1)
		for y := range junction[x] {
			junction[x][y] = node()
		}
	}
	group := 0
	ductEdge := func(a, b int, lengthM float64, g int, idMM float64, ducts int) {
		e := Edge{ID: fmt.Sprintf("S%d", len(p.Edges)), From: a, To: b, LengthM: math.Round(lengthM*10) / 10,
			LabourPerMCents: 800, Group: g, Flags: FlagOutdoor}
		if cs.capacity && idMM > 0 {
			e.DuctIDMM, e.Ducts, e.AddDuctPerMCents = idMM, ducts, 4500
			e.CablesPerDuct = install.DefaultCablesPerDuct // the plan's default
		}
		p.Edges = append(p.Edges, e)
	}
	type sideRef struct{ a, b int }
	var sides []sideRef
	for x := 0; x <= side; x++ {
		for y := 0; y <= side; y++ {
			if x < side {
				sides = append(sides, sideRef{junction[x][y], junction[x+1][y]})
			}
			if y < side {
				sides = append(sides, sideRef{junction[x][y], junction[x][y+1]})
			}
		}
	}
	// Buildings along sides, spread evenly over the sides in a seeded order.
	perm := r.Perm(len(sides))
	taps := make([][]int, len(sides))
	for b := 0; b < cs.buildings; b++ {
		sd := perm[b%len(sides)]
		taps[sd] = append(taps[sd], b)
	}
	bnode := make([]int, cs.buildings)
	for si, sd := range sides {
		group++
		k := len(taps[si])
		prev := sd.a
		pieceM := blockM / float64(k+1)
		ducts := 2 + r.IntN(3)
		for i, b := range taps[si] {
			t := node()
			ductEdge(prev, t, pieceM, group, 100, ducts)
			prev = t
			bnode[b] = node()
			ductEdge(t, bnode[b], 12+r.Float64()*18, 0, 50, 1)
			corner := sd.a
			cornerM := pieceM * float64(i+1)
			if i >= k/2 {
				corner, cornerM = sd.b, pieceM*float64(k-i)
			}
			ductEdge(corner, bnode[b], cornerM+10+r.Float64()*10, 0, 50, 1)
		}
		ductEdge(prev, sd.b, pieceM, group, 100, ducts)
		if r.IntN(4) == 0 { // a second, older bank along the side: parallel edge, same trench
			ductEdge(sd.a, sd.b, blockM*1.05, group, 75, 1)
		}
	}
	// Proposed trenches: shortcuts across blocks and between neighbouring buildings.
	want := cs.proposedPct * len(p.Edges) / (100 - cs.proposedPct)
	for k := 0; k < want; k++ {
		var a, b int
		var lengthM float64
		if k%2 == 0 {
			x, y := r.IntN(side), r.IntN(side)
			a, b = junction[x][y], junction[x+1][y+1]
			lengthM = blockM * math.Sqrt2 * 0.95
		} else {
			i := r.IntN(cs.buildings)
			j := (i + 1 + r.IntN(3)) % cs.buildings
			a, b = bnode[i], bnode[j]
			lengthM = 25 + r.Float64()*60
		}
		if a == b {
			continue
		}
		lengthM = math.Round(lengthM*10) / 10
		surface := []int64{9000, 16000, 28000}[r.IntN(3)] // soft, paved, bored under road: cents per metre
		scale := cs.trenchScale
		if scale == 0 {
			scale = 1
		}
		fixed := int64(scale * (lengthM*float64(surface) + 150000))
		p.Edges = append(p.Edges, Edge{ID: fmt.Sprintf("P%d", len(p.Edges)), From: a, To: b, LengthM: lengthM,
			LabourPerMCents: 700, Proposed: true, FixedCents: fixed, Flags: FlagOutdoor})
	}
	// Two cross-connects, at a third and two thirds of the grid diagonal.
	ic := []int{junction[side/3][side/3], junction[2*side/3][2*side/3]}
	for b := 0; b < cs.buildings; b++ {
		src := bnode[b]
		tgt := ic[0]
		if b%2 == 1 {
			tgt = ic[1]
		}
		dm := Demand{ID: fmt.Sprintf("B%04d", b), Source: src, Target: tgt, Diverse: r.Float64() < cs.diverseFrac}
		om4 := Option{Name: "om4-12", CablePerMCents: 420, FixedCents: 48000, MaxRouteM: 380, CableODMM: 9.5}
		os2 := Option{Name: "os2-12", CablePerMCents: 360, FixedCents: 96000, MaxRouteM: math.Inf(1), CableODMM: 9.0}
		cu := Option{Name: "cat6a", CablePerMCents: 180, FixedCents: 9000, MaxRouteM: 90, ExcludeFlags: FlagHighEMI, CableODMM: 7.4}
		switch {
		case cs.options == 1 && b%3 == 0:
			dm.Options = []Option{om4}
		case cs.options == 1:
			dm.Options = []Option{os2}
		case b%10 == 0:
			dm.Options = []Option{cu, om4, os2}
		default:
			dm.Options = []Option{om4, os2}
		}
		p.Demands = append(p.Demands, dm)
	}
	return p
}
