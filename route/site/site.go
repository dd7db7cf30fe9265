package site

import (
	"context"
	"io/fs"
	"math"
	"sync"

	lru "github.com/hashicorp/golang-lru/v2"

	"spanwright/geo"
	"spanwright/geo/gpkg"
	"spanwright/geo/postgis"
	"spanwright/media"
	"spanwright/media/install"
	"spanwright/route/optimize"
)

// Site is a campus read and noded once, shared read-only by every scenario planned on it.
type Site struct {
	Campus *geo.Campus
	Net    *geo.Network
	Graph  *Graph // weighted by span length, in metres

	building map[string]*geo.Building
	access   map[string]geo.Access
	junction map[string]int // junction ID → index in Net.Junctions
	part     []int          // by junction index: its connected part of the network, entrances joined (components)
	spanPart []int          // the same by spans alone (SpanPart)
	// existingPart is part over the pathways that exist, proposed ones left out (JoinedExisting).
	existingPart []int
	entrance     map[string]bool // junction IDs of every entrance and access (JoinsNetwork)
	unjoined     map[string]bool // buildings no pathway joins (geo.Network.Unjoined)
	interior     []bool          // by junction index: inside a run of new construction (InRun)
	carried      []bool          // by junction index: new pathway of one type carried on (JoinsNetwork)
	dist         sync.Map        // building ID → map[string]float64, see distancesFrom
	adjOnce      sync.Once
	adj          *adjacency // junctions joined by spans (spanAdjacency)
	segOnce      sync.Once
	segs         map[string][]float64 // span ID → geo.Span.SegmentsM (SegmentsM)

	// Solved keeps the optimizer's solutions of the routing problems solved on this site, by
	// fingerprint of the canonical problem (see package routing), and Pulls the pull plans of
	// duct runs (see package estimate): scenarios of a sweep share both.
	Solved *lru.Cache[[32]byte, *optimize.Solution]
	Pulls  *install.Memo
	// Reaches keeps how far each medium reaches on a link (media.Engine.MaxChannelM) across
	// the engines of a sweep's price books, which seldom change it (see media.ReachMemo).
	Reaches *media.ReachMemo
}

// solvedCacheSize bounds the optimizer solutions a site keeps: a sweep's scenarios often
// share a routing problem (axes such as slack, growth or the budget that change no route
// cost), and a bounded cache keeps a long sweep's memory flat when they do not.
const solvedCacheSize = 64

// pullCacheSize bounds the pull plans a site keeps, by stretch of duct between structures:
// the stretches of a few scenarios of a 1,000-building campus (2,400 distinct in one plan),
// and many more of a mid-sized one.
const pullCacheSize = 16384

// reachCacheSize is the media reaches a site keeps at first: every medium on every link of a
// 1,000-building campus (five media), and every span class. A plan makes room for twice what
// it asks (media.ReachMemo.Hold, from routing), so a larger campus's sweep keeps its answers.
const reachCacheSize = 16384

// Options are the noding options a site is built with, and the cap on its files.
type Options struct {
	SnapM       float64
	MaxLateralM float64
	// MaxInputBytes caps each campus file, in bytes; 0 for input.DefaultDataMiB MiB.
	MaxInputBytes int64
	// Database is the connection string of a PostgreSQL/PostGIS database whose tables hold
	// (more of) the campus (package geo/postgis); "" for none.
	Database string
}

// read reads the campus from the files (from fsys when not nil: GeoJSON only) and the
// database: every feature through one geo.Reader, so every source's features take the same
// checks. With problems, it also returns the buildings read (geo.Reader.Partial).
func read(ctx context.Context, fsys fs.FS, files []string, opt Options) (c *geo.Campus, partial *geo.Partial, err error) {
	r := geo.NewReader(ctx)
	for _, f := range files {
		if err := ctx.Err(); err != nil {
			return nil, nil, err
		}
		switch {
		case fsys != nil:
			r.ReadFS(fsys, f)
		case gpkg.Is(f):
			gpkg.Read(ctx, r, f, opt.MaxInputBytes)
		default:
			r.ReadFile(f, opt.MaxInputBytes)
		}
	}
	if opt.Database != "" && ctx.Err() == nil && fsys == nil {
		postgis.Read(ctx, r, opt.Database)
	}
	c, err = r.Campus()
	if err != nil {
		return nil, r.Partial(), err
	}
	return c, nil, nil
}

// Load reads the campus and builds the network: the files (GeoJSON, or GeoPackage by the
// extension .gpkg) and the tables of opt.Database, as one campus. fsys, when not nil, is read
// instead of the disk (the embedded demo; GeoJSON only). When ctx is done, reading and
// building stop and Load returns ctx's error.
func Load(ctx context.Context, fsys fs.FS, files []string, opt Options) (*Site, error) {
	s, _, err := LoadRead(ctx, fsys, files, opt)
	return s, err
}

// LoadRead is Load that, when the campus has problems, also returns the buildings it read
// (nil when a feature or file could not be read far enough to know them: geo.Reader.Partial;
// the whole campus when only building the network found problems), so that what names them,
// the plan's hub and links, is checked in the same run (CheckNames; tester 14 F8).
func LoadRead(ctx context.Context, fsys fs.FS, files []string, opt Options) (*Site, *geo.Partial, error) {
	c, partial, err := read(ctx, fsys, files, opt)
	if err != nil {
		return nil, partial, err
	}
	net, err := geo.BuildContext(ctx, c, geo.Options{SnapM: opt.SnapM, MaxLateralM: opt.MaxLateralM})
	if err != nil {
		return nil, geo.PartialOf(c), err
	}
	return NewSite(c, net), nil, nil
}

// NewSite wraps an already built network.
func NewSite(c *geo.Campus, net *geo.Network) *Site {
	s := &Site{Campus: c, Net: net, Graph: NewGraph(net),
		building: make(map[string]*geo.Building, len(c.Buildings)),
		access:   make(map[string]geo.Access, len(net.Access))}
	s.Solved, _ = lru.New[[32]byte, *optimize.Solution](solvedCacheSize) // errs only on size <= 0
	s.Pulls = install.NewMemo(pullCacheSize)
	s.Reaches = media.NewReachMemo(reachCacheSize)
	for i := range c.Buildings {
		s.building[c.Buildings[i].ID] = &c.Buildings[i]
	}
	for _, a := range net.Access {
		s.access[a.Building] = a
	}
	s.junction = make(map[string]int, len(net.Junctions))
	for i, j := range net.Junctions {
		s.junction[j.ID] = i
	}
	s.part = components(net, s.junction, true, nil)
	s.spanPart = components(net, s.junction, false, nil)
	s.existingPart = components(net, s.junction, true, func(sp *geo.Span) bool { return sp.Status != geo.StatusProposed })
	s.entrance = make(map[string]bool, len(net.Entrances)+len(net.Access))
	for _, a := range net.Access {
		s.entrance[a.Junction] = true
	}
	for _, e := range net.Entrances {
		s.entrance[e.Junction] = true
	}
	s.unjoined = make(map[string]bool, len(net.Unjoined))
	for _, u := range net.Unjoined {
		s.unjoined[u.Building] = true
	}
	s.interior = runInterior(net, s.junction, s.entrance)
	s.carried = carriedOn(net, s.junction, s.entrance)
	return s
}

// Building returns the building with the given ID.
func (s *Site) Building(id string) (*geo.Building, bool) {
	b, ok := s.building[id]
	return b, ok
}

// MainCrossConnect returns the ID of the building whose role is mc, or "".
func (s *Site) MainCrossConnect() string {
	for _, b := range s.Campus.Buildings {
		if b.Role == geo.RoleMC {
			return b.ID
		}
	}
	return ""
}

// distancesFrom returns, for every building, the network distance in metres from building
// id (laterals included); unreachable buildings are absent. The site never changes, so the
// answer is computed once per building and shared: callers must not modify the map.
func (s *Site) distancesFrom(id string) map[string]float64 {
	if d, ok := s.dist.Load(id); ok {
		return d.(map[string]float64)
	}
	d := s.computeDistances(id)
	s.dist.Store(id, d)
	return d
}

// computeDistances measures from every entrance of building id at once (each starting at
// its counted lateral) to every entrance of every building, and keeps each building's
// nearest: a building with a pathway end that joins nothing (a dangling lateral) is as near
// as its other entrances make it.
func (s *Site) computeDistances(id string) map[string]float64 {
	src := map[int64]float64{}
	for _, e := range s.entriesOf(id) {
		if n, ok := s.Graph.NodeOf(e.Junction); ok {
			if d, seen := src[n]; !seen || e.LateralM < d {
				src[n] = e.LateralM
			}
		}
	}
	if len(src) == 0 {
		return nil
	}
	dist := s.Graph.DistancesM(src)
	out := make(map[string]float64, len(s.access))
	for _, b := range s.Campus.Buildings {
		best := math.Inf(1)
		for _, e := range s.entriesOf(b.ID) {
			if n, ok := s.Graph.NodeOf(e.Junction); ok {
				best = min(best, dist[n]+e.LateralM)
			}
		}
		if !math.IsInf(best, 1) {
			out[b.ID] = best
		}
	}
	return out
}

// entriesOf is every way into building b (geo.Network.EntrancesOf), or its access alone for
// a building assembled by hand with an Access and no Entrances.
func (s *Site) entriesOf(b string) []geo.Access {
	es := s.Net.EntrancesOf(b)
	if len(es) == 0 {
		if a, ok := s.access[b]; ok {
			return []geo.Access{a}
		}
		return nil
	}
	out := make([]geo.Access, len(es))
	for i, e := range es {
		out[i] = e.Access
	}
	return out
}

// Unreachable lists, sorted, the buildings that have no path to building hub: none of their
// entrances is in a part of the pathway network that one of the hub's is in. A building no
// pathway joins at all is not among them (Unjoined says what of it).
func (s *Site) Unreachable(hub string) []string {
	var out []string
	for _, b := range s.Campus.Buildings {
		if b.ID != hub && !s.unjoined[b.ID] && !s.Joined(b.ID, hub) {
			out = append(out, b.ID)
		}
	}
	return out
}

// SegmentsM is the lengths of span sp's segments in metres (geo.Span.SegmentsM), computed
// once per site for every span of its network: the estimate asks them for every span of every
// leg of every scenario. The slice is shared and must not be modified.
func (s *Site) SegmentsM(sp *geo.Span) []float64 {
	s.segOnce.Do(func() {
		s.segs = make(map[string][]float64, len(s.Net.Spans))
		for i := range s.Net.Spans {
			s.segs[s.Net.Spans[i].ID] = s.Net.Spans[i].SegmentsM()
		}
	})
	if v, ok := s.segs[sp.ID]; ok {
		return v
	}
	return sp.SegmentsM() // a span not of this site's network
}

// Access is the building's access point to the network (zero when the building has none).
func (s *Site) Access(building string) geo.Access { return s.access[building] }

// RiserM is the building's riser in metres, 0 for an unknown building.
func (s *Site) RiserM(building string) float64 {
	if b, ok := s.building[building]; ok {
		return b.RiserM
	}
	return 0
}
