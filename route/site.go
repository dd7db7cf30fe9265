package route

import (
	"io/fs"
	"sort"
	"sync"

	"gonum.org/v1/gonum/graph/path"

	"spanwright/geo"
)

// Site is a campus read and noded once, shared read-only by every scenario planned on it.
type Site struct {
	Campus *geo.Campus
	Net    *geo.Network
	Graph  *Graph // weighted by span length, in metres

	building map[string]*geo.Building
	access   map[string]geo.Access
	dist     sync.Map // building ID → map[string]float64, see distancesFrom
}

// SiteOptions are the noding options a site is built with.
type SiteOptions struct {
	SnapM       float64
	MaxLateralM float64
}

// LoadSite reads the campus files and builds the network. fsys, when not nil, is read
// instead of the disk (the embedded demo).
func LoadSite(fsys fs.FS, files []string, opt SiteOptions) (*Site, error) {
	var c *geo.Campus
	var err error
	if fsys != nil {
		c, err = geo.LoadFS(fsys, files)
	} else {
		c, err = geo.Load(files)
	}
	if err != nil {
		return nil, err
	}
	net, err := geo.Build(c, geo.Options{SnapM: opt.SnapM, MaxLateralM: opt.MaxLateralM})
	if err != nil {
		return nil, err
	}
	return NewSite(c, net), nil
}

// NewSite wraps an already built network.
func NewSite(c *geo.Campus, net *geo.Network) *Site {
	s := &Site{Campus: c, Net: net, Graph: NewGraph(net),
		building: make(map[string]*geo.Building, len(c.Buildings)),
		access:   make(map[string]geo.Access, len(net.Access))}
	for i := range c.Buildings {
		s.building[c.Buildings[i].ID] = &c.Buildings[i]
	}
	for _, a := range net.Access {
		s.access[a.Building] = a
	}
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

func (s *Site) computeDistances(id string) map[string]float64 {
	a, ok := s.access[id]
	if !ok {
		return nil
	}
	src, _ := s.Graph.NodeOf(a.Junction)
	sh := path.DijkstraFrom(s.Graph.Node(src), s.Graph)
	out := make(map[string]float64, len(s.access))
	for b, ab := range s.access {
		n, _ := s.Graph.NodeOf(ab.Junction)
		d := sh.WeightTo(n)
		if d < 1e300 {
			out[b] = d + a.LateralM + ab.LateralM
		}
	}
	return out
}

// Unreachable lists, sorted, the buildings that have no path to building hub.
func (s *Site) Unreachable(hub string) []string {
	d := s.distancesFrom(hub)
	var out []string
	for _, b := range s.Campus.Buildings {
		if _, ok := d[b.ID]; !ok && b.ID != hub {
			out = append(out, b.ID)
		}
	}
	sort.Strings(out)
	return out
}
