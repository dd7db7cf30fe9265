// Package campusgen generates campuses that look like the ones facilities GIS draws, for
// tests: a jittered street grid of existing ducts (some full, some broken short), parallel
// duct banks, tunnels near the centre, aerial spans at the edge, high- and low-EMI runs,
// proposed trench (10–30 % of the pathways), maintenance holes at some junctions, buildings of
// different sizes joined by laterals drawn as pathways (or reached by a counted lateral), and
// risers from 0 to 40 m with one decimal. The same seed gives the same campus.
//
// Every number here is invented for testing; none describes a real campus.
package campusgen

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
)

// Feature is one GeoJSON feature: a geometry type, its coordinates as [lon, lat] rings or
// lines, and properties written in the order given.
type Feature struct {
	Geometry string         // Point, LineString, MultiLineString, Polygon
	Coords   [][][2]float64 // Point: [[p]]; LineString: [line]; MultiLineString: lines; Polygon: rings
	Props    []Prop
}

// Prop is one property of a feature.
type Prop struct {
	Key   string
	Value any // string, float64, int or bool
}

// Campus is a generated campus and the facts a test needs about it.
type Campus struct {
	Features []Feature
	Hub      string   // the building with role mc
	IDs      []string // every id (buildings, pathways, structures), in feature order
}

// Options shape a generated campus.
type Options struct {
	Buildings   int     // served buildings and cross-connects together
	ProposedPct float64 // share of street pathways that are proposed, 10–30 by default

	// PathwaysPerBuilding, when above zero, sizes the street grid so that the campus has
	// about this many pathway features per building (streets, parallel banks, diagonals and
	// laterals together; from 2.5 up): a denser grid than the default, with more streets than
	// buildings, as a campus whose duct network was built ahead of its buildings. Zero keeps
	// the default grid of about one street per building (about 2 pathways per building).
	PathwaysPerBuilding float64

	// DiverseEntrances draws second laterals as diverse entrances are built: from the nearest
	// vertex of another street (another trench, so that a diverse route can exist: from the
	// same street both entrances would share its trench), and one into every cross-connect
	// that drew none. False keeps the default campuses as they were drawn.
	DiverseEntrances bool

	// BetweenStreets adds this many annex buildings (ids Q00, Q01, ...) east of the grid,
	// each standing midway between two straight parallel ducts of its own, 28 m from each
	// wall, with no lateral drawn: a building two streets reach at the same distance, so
	// that only how the plan chooses between them decides which way it is joined. The two
	// ducts of annex k leave the east edge of the grid from two neighbouring junctions (rows
	// 2k and 2k+1), so routes through them differ in length. Each needs two rows of the grid:
	// fewer are added on a small grid. Zero keeps the campuses as they were drawn.
	BetweenStreets int
}

// Annex geometry (BetweenStreets), in metres: every number invented for testing.
const (
	annexGapM   = 28.0  // from each wall to its duct
	annexHalfM  = 10.0  // half the footprint's side
	annexEastM  = 100.0 // from the grid's east edge to where the ducts run straight
	annexLaneM  = 120.0 // the straight run of each duct
	annexRiserM = 10.0
)

const (
	lat0, lon0 = 46.2, 7.1 // an invented place; only the shape of the earth matters
	mPerDegLat = 111_200.0
)

// ll turns local metres into [lon, lat].
func ll(xM, yM float64) [2]float64 {
	return [2]float64{lon0 + xM/(mPerDegLat*math.Cos(lat0*math.Pi/180)), lat0 + yM/mPerDegLat}
}

// Generate builds a campus from seed.
func Generate(seed uint64, opt Options) *Campus {
	r := rand.New(rand.NewPCG(seed, seed^0x9e3779b97f4a7c15))
	r2 := rand.New(rand.NewPCG(seed^0x5851f42d4c957f2d, seed)) // for what was added later, see below
	n := max(opt.Buildings, 3)
	prop := opt.ProposedPct
	if prop == 0 {
		prop = 10 + 20*r.Float64()
	}
	// A grid with about one block side per building.
	g := 2
	for 2*g*(g-1) < streetsFor(n, opt.PathwaysPerBuilding) {
		g++
	}
	step := 90 + 60*r.Float64()
	node := make([][][2]float64, g)
	for i := range node {
		node[i] = make([][2]float64, g)
		for j := range node[i] {
			node[i][j] = [2]float64{float64(i)*step + (r.Float64()-0.5)*0.3*step, float64(j)*step + (r.Float64()-0.5)*0.3*step}
		}
	}
	c := &Campus{}
	add := func(f Feature) {
		for _, p := range f.Props {
			if p.Key == "id" {
				c.IDs = append(c.IDs, p.Value.(string))
			}
		}
		c.Features = append(c.Features, f)
	}
	centre := float64(g-1) * step / 2
	type side struct {
		a, b [2]float64 // local metres
		id   string
	}
	var sides []side
	mh := 0
	for i := 0; i < g; i++ {
		for j := 0; j < g; j++ {
			if r.Float64() < 0.5 {
				mh++
				p := node[i][j]
				typ := "maintenance-hole"
				if r.Float64() < 0.4 {
					typ = "handhole"
				}
				add(Feature{Geometry: "Point", Coords: [][][2]float64{{ll(p[0], p[1])}},
					Props: []Prop{{"kind", "structure"}, {"id", fmt.Sprintf("MH-%d", mh)}, {"type", typ}}})
			}
			for _, d := range [][2]int{{1, 0}, {0, 1}} {
				ni, nj := i+d[0], j+d[1]
				if ni >= g || nj >= g {
					continue
				}
				sides = append(sides, side{node[i][j], node[ni][nj], fmt.Sprintf("S%d-%d-%c", i, j, "EN"[d[1]])})
			}
		}
	}
	// Street pathways, each drawn with two or three interior vertices.
	type street struct {
		side
		pts    [][2]float64
		broken bool
	}
	streets := make([]street, len(sides))
	for k, s := range sides {
		nv := 2 + r.IntN(2)
		pts := [][2]float64{s.a}
		for v := 1; v <= nv; v++ {
			t := float64(v) / float64(nv+1)
			pts = append(pts, [2]float64{s.a[0] + (s.b[0]-s.a[0])*t + (r.Float64()-0.5)*3, s.a[1] + (s.b[1]-s.a[1])*t + (r.Float64()-0.5)*3})
		}
		pts = append(pts, s.b)
		streets[k] = street{side: s, pts: pts}
		props := []Prop{{"kind", "pathway"}, {"id", s.id}}
		mid := [2]float64{(s.a[0] + s.b[0]) / 2, (s.a[1] + s.b[1]) / 2}
		dc := math.Hypot(mid[0]-centre, mid[1]-centre)
		edge := dc > 0.8*centre
		switch x := r.Float64(); {
		case x < prop/100:
			props = append(props, Prop{"status", "proposed"}, Prop{"type", []string{"duct", "buried"}[r.IntN(2)]},
				Prop{"surface", []string{"turf", "asphalt", "concrete"}[r.IntN(3)]})
		case dc < 0.35*centre && r.Float64() < 0.5:
			props = append(props, Prop{"type", "tunnel"})
		case edge && r.Float64() < 0.4:
			props = append(props, Prop{"type", "aerial"})
		default:
			props = append(props, Prop{"spare_ducts", []int{0, 0, 1, 1, 2, 3}[r.IntN(6)]}, Prop{"duct_mm", []int{100, 100, 50}[r.IntN(3)]})
		}
		switch x := r.Float64(); {
		case x < 0.06:
			props = append(props, Prop{"emi", "high"})
		case x < 0.15:
			props = append(props, Prop{"emi", "low"})
		}
		line := pts
		interior := s.a != node[0][0] && s.b != node[g-1][g-1] && min(s.a[0], s.a[1]) > 0.5*step && max(s.b[0], s.b[1]) < (float64(g)-1.5)*step
		if interior && r.Float64() < 0.06 {
			streets[k].broken = true
			// A broken run: the duct was never finished; it stops short of the far junction.
			line = append(slices.Clone(pts[:len(pts)-1]), [2]float64{(pts[len(pts)-2][0] + pts[len(pts)-1][0]) / 2, (pts[len(pts)-2][1] + pts[len(pts)-1][1]) / 2})
		}
		add(lineFeature(line, props))
		if r.Float64() < 0.08 {
			// A parallel duct bank between the same junctions, drawn a few metres aside.
			par := [][2]float64{s.a}
			for _, p := range pts[1 : len(pts)-1] {
				par = append(par, [2]float64{p[0] + 4, p[1] - 4})
			}
			par = append(par, s.b)
			add(lineFeature(par, []Prop{{"kind", "pathway"}, {"id", s.id + "-B"}, {"spare_ducts", r.IntN(3)}, {"group", s.id}}))
		}
	}
	// Proposed diagonals across some blocks.
	for i := 0; i+1 < g; i++ {
		for j := 0; j+1 < g; j++ {
			if r.Float64() < 0.08 {
				a, b := node[i][j], node[i+1][j+1]
				add(lineFeature([][2]float64{a, {(a[0] + b[0]) / 2, (a[1] + b[1]) / 2}, b}, []Prop{{"kind", "pathway"},
					{"id", fmt.Sprintf("D%d-%d", i, j)}, {"status", "proposed"}, {"type", "buried"}, {"surface", "turf"}}))
			}
		}
	}
	// Buildings beside streets, each joined at an interior vertex of its street.
	order := r.Perm(len(streets))
	var placedAt []int // feature index of each building
	// Per building placed: its street's vertices, the vertex its lateral leaves from, its
	// centre and half size, and whether it has a second lateral (DiverseEntrances).
	type entry struct {
		pts      [][2]float64
		p        [2]float64
		cx, cy   float64
		half     float64
		first    bool // a lateral drawn (else a counted one)
		second   bool
		building string
		street   int
	}
	// toward is the point inside building en's footprint where a lateral from q ends.
	toward := func(en entry, q [2]float64) [2]float64 {
		ux, uy := q[0]-en.cx, q[1]-en.cy
		l := math.Hypot(ux, uy)
		return [2]float64{en.cx + 0.6*en.half*ux/l, en.cy + 0.6*en.half*uy/l}
	}
	// secondFrom is the street vertex a second lateral into building en leaves from, q as
	// drawn by default; with DiverseEntrances the nearest vertex of another unbroken street
	// within 150 m of the building's centre, if any.
	secondFrom := func(en entry, q [2]float64) [2]float64 {
		if !opt.DiverseEntrances {
			return q
		}
		best := 150.0
		for k, st := range streets {
			if k == en.street || st.broken {
				continue
			}
			for _, v := range st.pts {
				if d := math.Hypot(v[0]-en.cx, v[1]-en.cy); d < best {
					q, best = v, d
				}
			}
		}
		return q
	}
	var entries []entry
	type placed struct{ cx, cy, half float64 }
	var done []placed
	// The street segments and the buildings placed, bucketed by cell of the grid, so that a
	// building's clearance looks only at its neighbourhood; the answer is the one a scan of
	// every street and building gives.
	cell := 2 * step
	key := func(x, y float64) [2]int { return [2]int{int(math.Floor(x / cell)), int(math.Floor(y / cell))} }
	segs := map[[2]int][][2][2]float64{}
	addSegs := func(pts [][2]float64) {
		for k := 1; k < len(pts); k++ {
			a, b := pts[k-1], pts[k]
			lo, hi := key(min(a[0], b[0]), min(a[1], b[1])), key(max(a[0], b[0]), max(a[1], b[1]))
			for i := lo[0]; i <= hi[0]; i++ {
				for j := lo[1]; j <= hi[1]; j++ {
					segs[[2]int{i, j}] = append(segs[[2]int{i, j}], [2][2]float64{a, b})
				}
			}
		}
	}
	for _, st := range streets {
		addSegs(st.pts)
	}
	near := map[[2]int][]int{} // index into done
	clear := func(cx, cy, half float64) bool {
		// half ≤ 20 m and a street segment is shorter than a cell: the segments and buildings
		// that can be within reach lie in the building's cell or the eight around it.
		k := key(cx, cy)
		for i := k[0] - 1; i <= k[0]+1; i++ {
			for j := k[1] - 1; j <= k[1]+1; j++ {
				for _, d := range near[[2]int{i, j}] {
					q := done[d]
					if math.Abs(q.cx-cx) < q.half+half+8 && math.Abs(q.cy-cy) < q.half+half+8 {
						return false
					}
				}
				for _, sg := range segs[[2]int{i, j}] {
					if segDist(cx, cy, sg[0], sg[1]) < half*math.Sqrt2+4 {
						return false
					}
				}
			}
		}
		return true
	}
	// The annexes (BetweenStreets), before the other buildings so that those keep clear of
	// them and of their ducts.
	for k := 0; k < opt.BetweenStreets && 2*k+1 < g; k++ {
		south, north := node[g-1][2*k], node[g-1][2*k+1]
		y := (south[1] + north[1]) / 2
		x0 := max(south[0], north[0]) + annexEastM
		gap := annexGapM + annexHalfM
		for _, lane := range []struct {
			from [2]float64
			y    float64
			side string
		}{{south, y - gap, "S"}, {north, y + gap, "N"}} {
			pts := [][2]float64{lane.from, {x0, lane.y}, {x0 + annexLaneM, lane.y}}
			add(lineFeature(pts, []Prop{{"kind", "pathway"}, {"id", fmt.Sprintf("Q%02d-%s", k, lane.side)}, {"spare_ducts", 2}, {"duct_mm", 100}}))
			addSegs(pts)
		}
		cx, cy, half := x0+annexLaneM/2, y, annexHalfM
		near[key(cx, cy)] = append(near[key(cx, cy)], len(done))
		done = append(done, placed{cx, cy, half})
		add(Feature{Geometry: "Polygon", Coords: [][][2]float64{{ll(cx-half, cy-half), ll(cx+half, cy-half),
			ll(cx+half, cy+half), ll(cx-half, cy+half), ll(cx-half, cy-half)}},
			Props: []Prop{{"kind", "building"}, {"id", fmt.Sprintf("Q%02d", k)}, {"name", "Annex " + strconv.Itoa(k)}, {"riser_m", annexRiserM}}})
	}
	b := 0
	for _, si := range order {
		if b >= n {
			break
		}
		s := streets[si]
		if s.broken {
			continue
		}
		var p [2]float64
		var dx, dy, off, half, cx, cy float64
		ok := false
		for try := 0; try < 8 && !ok; try++ {
			p = s.pts[1+r.IntN(len(s.pts)-2)]
			dx, dy = s.b[1]-s.a[1], -(s.b[0] - s.a[0]) // a normal of the street
			l := math.Hypot(dx, dy)
			dx, dy = dx/l, dy/l
			if r.IntN(2) == 0 {
				dx, dy = -dx, -dy
			}
			off = 12 + 18*r.Float64()
			half = 6 + 14*r.Float64()
			cx, cy = p[0]+dx*(off+half), p[1]+dy*(off+half)
			ok = clear(cx, cy, half)
		}
		if !ok {
			continue
		}
		near[key(cx, cy)] = append(near[key(cx, cy)], len(done))
		done = append(done, placed{cx, cy, half})
		id := fmt.Sprintf("B%03d", b)
		props := []Prop{{"kind", "building"}, {"id", id}, {"name", "Hall " + strconv.Itoa(b)},
			{"riser_m", math.Round(400*r.Float64()) / 10}}
		placedAt = append(placedAt, len(c.Features))
		entries = append(entries, entry{pts: s.pts, p: p, cx: cx, cy: cy, half: half, building: id, street: si})
		add(Feature{Geometry: "Polygon", Coords: [][][2]float64{{ll(cx-half, cy-half), ll(cx+half, cy-half),
			ll(cx+half, cy+half), ll(cx-half, cy+half), ll(cx-half, cy-half)}}, Props: props})
		// The lateral, drawn as a pathway from the street vertex to the footprint's edge; a
		// few buildings have none and are reached by a counted lateral (within 30 m).
		if off > 20 || r.Float64() < 0.7 {
			add(lineFeature([][2]float64{p, {p[0] + dx*off, p[1] + dy*off}}, []Prop{{"kind", "pathway"},
				{"id", id + "-L"}, {"spare_ducts", r.IntN(3)}}))
			entries[len(entries)-1].first = true
			// Drawn from a stream of their own, so that every feature above is the same for a
			// seed as before they were added: a second lateral from another vertex of the street
			// into the footprint (a building with two entrances), and a building that routes
			// may cross (transit: true).
			if q := s.pts[1+r2.IntN(len(s.pts)-2)]; q != p && r2.Float64() < 0.15 {
				q = secondFrom(entries[len(entries)-1], q)
				add(lineFeature([][2]float64{q, toward(entries[len(entries)-1], q)}, []Prop{{"kind", "pathway"}, {"id", id + "-L2"}, {"spare_ducts", r2.IntN(3)}}))
				entries[len(entries)-1].second = true
			}
			if r2.Float64() < 0.05 {
				c.Features[placedAt[len(placedAt)-1]].Props = append(c.Features[placedAt[len(placedAt)-1]].Props, Prop{"transit", true})
			}
		}
		b++
	}
	// The main cross-connect and up to two intermediate ones, among the buildings placed.
	roles := r.Perm(len(placedAt))
	for k, bi := range roles[:min(3, len(roles))] {
		f := &c.Features[placedAt[bi]]
		if k == 0 {
			f.Props = append(f.Props, Prop{"role", "mc"})
			c.Hub = f.Props[1].Value.(string)
			continue
		}
		f.Props = append(f.Props, Prop{"role", "ic"})
	}
	if opt.DiverseEntrances {
		// A second lateral into each cross-connect that has none (drawn last, from the second
		// stream, so the rest of the campus is as without it).
		for _, bi := range roles[:min(3, len(roles))] {
			en := entries[bi]
			if !en.first { // reached by a counted lateral only: draw it
				add(lineFeature([][2]float64{en.p, toward(en, en.p)}, []Prop{{"kind", "pathway"}, {"id", en.building + "-L"}, {"spare_ducts", 1 + r2.IntN(2)}}))
			}
			if en.second {
				continue
			}
			q, far := en.p, -1.0
			for _, v := range en.pts {
				if d := math.Hypot(v[0]-en.p[0], v[1]-en.p[1]); d > far {
					q, far = v, d
				}
			}
			q = secondFrom(en, q)
			add(lineFeature([][2]float64{q, toward(en, q)}, []Prop{{"kind", "pathway"}, {"id", en.building + "-L2"}, {"spare_ducts", 1 + r2.IntN(2)}}))
		}
	}
	return c
}

// streetsFor is how many street sides the grid needs for n buildings: n by default, or
// enough for about perBuilding pathway features per building, counting a lateral for 0.8 of
// the buildings, a second one for 0.1, and 0.12 parallel banks and diagonals per street.
func streetsFor(n int, perBuilding float64) int {
	if perBuilding <= 0 {
		return n
	}
	return max(n, int(math.Ceil(float64(n)*(perBuilding-0.9)/1.12)))
}

// segDist is the distance in metres from (x, y) to the segment a–b.
func segDist(x, y float64, a, b [2]float64) float64 {
	vx, vy := b[0]-a[0], b[1]-a[1]
	t := ((x-a[0])*vx + (y-a[1])*vy) / (vx*vx + vy*vy)
	t = min(max(t, 0), 1)
	return math.Hypot(x-a[0]-t*vx, y-a[1]-t*vy)
}

func lineFeature(pts [][2]float64, props []Prop) Feature {
	line := make([][2]float64, len(pts))
	for i, p := range pts {
		line[i] = ll(p[0], p[1])
	}
	return Feature{Geometry: "LineString", Coords: [][][2]float64{line}, Props: props}
}

// GeoJSON writes features as a FeatureCollection.
func GeoJSON(fs []Feature) []byte {
	var b strings.Builder
	b.WriteString(`{"type":"FeatureCollection","features":[`)
	for i, f := range fs {
		if i > 0 {
			b.WriteString(",\n")
		}
		b.WriteString(`{"type":"Feature","properties":{`)
		for k, p := range f.Props {
			if k > 0 {
				b.WriteByte(',')
			}
			b.WriteString(strconv.Quote(p.Key) + ":")
			switch v := p.Value.(type) {
			case string:
				b.WriteString(strconv.Quote(v))
			case float64:
				b.WriteString(strconv.FormatFloat(v, 'f', -1, 64))
			case int:
				b.WriteString(strconv.Itoa(v))
			case bool:
				b.WriteString(strconv.FormatBool(v))
			default:
				panic(fmt.Sprintf("campusgen: property %s: unsupported %T", p.Key, v))
			}
		}
		b.WriteString(`},"geometry":{"type":"` + f.Geometry + `","coordinates":`)
		switch f.Geometry {
		case "Point":
			b.WriteString(pos(f.Coords[0][0]))
		case "LineString":
			b.WriteString(line(f.Coords[0]))
		default: // MultiLineString, Polygon
			b.WriteByte('[')
			for i, l := range f.Coords {
				if i > 0 {
					b.WriteByte(',')
				}
				b.WriteString(line(l))
			}
			b.WriteByte(']')
		}
		b.WriteString("}}")
	}
	b.WriteString("]}\n")
	return []byte(b.String())
}

func pos(p [2]float64) string {
	return "[" + strconv.FormatFloat(p[0], 'f', 9, 64) + "," + strconv.FormatFloat(p[1], 'f', 9, 64) + "]"
}

func line(l [][2]float64) string {
	parts := make([]string, len(l))
	for i, p := range l {
		parts[i] = pos(p)
	}
	return "[" + strings.Join(parts, ",") + "]"
}

// Stats counts what a generated campus holds.
type Stats struct {
	Buildings, Pathways, Structures int
	Proposed                        int // pathways with status proposed
	Aerial, Tunnel, EMI, NoSpare    int // pathways of type aerial or tunnel, with an emi level, with spare_ducts 0
}

// Stats counts the campus's features by kind.
func (c *Campus) Stats() Stats {
	var s Stats
	for _, f := range c.Features {
		props := map[string]any{}
		for _, p := range f.Props {
			props[p.Key] = p.Value
		}
		switch props["kind"] {
		case "building":
			s.Buildings++
		case "structure":
			s.Structures++
		case "pathway":
			s.Pathways++
			if props["status"] == "proposed" {
				s.Proposed++
			}
			switch props["type"] {
			case "aerial":
				s.Aerial++
			case "tunnel":
				s.Tunnel++
			}
			if _, ok := props["emi"]; ok {
				s.EMI++
			}
			if props["spare_ducts"] == 0 {
				s.NoSpare++
			}
		}
	}
	return s
}

// String is one line of the counts.
func (s Stats) String() string {
	return fmt.Sprintf("%d buildings, %d pathways (%.2f per building; %.1f %% proposed, %d aerial, %d tunnel, %d with EMI, %d full ducts with no spare), %d structures",
		s.Buildings, s.Pathways, float64(s.Pathways)/float64(max(s.Buildings, 1)), 100*float64(s.Proposed)/float64(max(s.Pathways, 1)),
		s.Aerial, s.Tunnel, s.EMI, s.NoSpare, s.Structures)
}

// BenchOptions are the options of the campuses the benchmarks time: n buildings, about 4.5
// pathway features per building, 25 % of the street pathways proposed (with the diagonals,
// about a fifth of all pathways), and second entrances from another street, every
// cross-connect with one.
func BenchOptions(n int) Options {
	return Options{Buildings: n, PathwaysPerBuilding: 4.5, ProposedPct: 25, DiverseEntrances: true}
}

// PlanYAML is a plan for the campus in the given files: every building linked to its nearest
// cross-connect by default, and every diverseEvery-th building (none when 0) of those drawn
// with a second lateral (two entrances, so that a diverse route can exist) with a diverse
// link to the hub.
func (c *Campus) PlanYAML(files []string, diverseEvery int) string {
	var b strings.Builder
	fmt.Fprintf(&b, "name: generated\ncampus: [%s]\nhub: %s\n", strings.Join(files, ", "), c.Hub)
	b.WriteString("defaults: {rate: 10G, strands: 12, growth: 0.5, redundancy: none}\n")
	k := 0
	for _, id := range c.IDs {
		bid, ok := strings.CutSuffix(id, "-L2")
		if !ok || bid == c.Hub {
			continue
		}
		if k++; diverseEvery > 0 && k%diverseEvery == 0 {
			if k == diverseEvery {
				b.WriteString("links:\n")
			}
			fmt.Fprintf(&b, "  - {to: %s, redundancy: diverse}\n", bid)
		}
	}
	return b.String()
}

// WriteFiles writes the campus to dir/campus.geojson and its PlanYAML to dir/plan.yaml,
// creating dir.
func WriteFiles(dir string, c *Campus, diverseEvery int) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	if err := os.WriteFile(filepath.Join(dir, "campus.geojson"), GeoJSON(c.Features), 0o644); err != nil {
		return err
	}
	return os.WriteFile(filepath.Join(dir, "plan.yaml"), []byte(c.PlanYAML([]string{"campus.geojson"}, diverseEvery)), 0o644)
}
