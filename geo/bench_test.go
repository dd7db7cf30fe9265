package geo

import (
	"fmt"
	"math/rand/v2"
	"sync"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/geojson"

	"spanwright/geo/input"
)

var (
	benchOnce   sync.Once
	benchCampus map[string]*Campus
	benchSizes  = []struct {
		name   string
		nx, ny int
	}{{"grid_10x10", 10, 10}, {"grid_70x72", 70, 72}}
)

func benchCampuses() map[string]*Campus {
	benchOnce.Do(func() {
		benchCampus = make(map[string]*Campus)
		for _, s := range benchSizes {
			c := gridCampus(s.nx, s.ny, rand.New(rand.NewPCG(5, 6)))
			benchCampus[s.name] = &c
		}
	})
	return benchCampus
}

// BenchmarkBuild nodes street-grid campuses; grid_70x72 has 5,040 buildings.
func BenchmarkBuild(b *testing.B) {
	cs := benchCampuses()
	for _, s := range benchSizes {
		c := cs[s.name]
		b.Run(s.name, func(b *testing.B) {
			var n *Network
			for b.Loop() {
				var err error
				if n, err = Build(c, Options{}); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(len(n.Spans)), "spans")
			b.ReportMetric(float64(len(n.Junctions)), "junctions")
		})
	}
}

// campusGeoJSON writes a campus as one GeoJSON FeatureCollection, with the properties a
// surveyed campus carries.
func campusGeoJSON(c *Campus) []byte {
	fc := geojson.NewFeatureCollection()
	add := func(g orb.Geometry, props geojson.Properties) {
		f := geojson.NewFeature(g)
		f.Properties = props
		fc.Append(f)
	}
	for _, b := range c.Buildings {
		add(b.Footprint, geojson.Properties{PropKind: KindBuilding, PropID: b.ID, PropName: "Hall " + b.ID, PropRiserM: 12.5})
	}
	for _, p := range c.Pathways {
		var g orb.Geometry = p.Lines
		if len(p.Lines) == 1 {
			g = p.Lines[0]
		}
		add(g, geojson.Properties{PropKind: KindPathway, PropID: p.ID, PropType: TypeDuct, PropStatus: StatusExisting,
			PropSpareDucts: 2, PropDuctMM: 100})
	}
	for _, s := range c.Structures {
		add(s.Point, geojson.Properties{PropKind: KindStructure, PropID: s.ID, PropType: StructureHandhole})
	}
	for _, e := range c.Entrances {
		add(e.Point, geojson.Properties{PropKind: KindEntrance, PropBuilding: e.Building})
	}
	data, err := fc.MarshalJSON()
	if err != nil {
		panic(err)
	}
	return data
}

// BenchmarkParse reads the street-grid campuses from GeoJSON text; grid_70x72 is about
// 2.5 MB.
func BenchmarkParse(b *testing.B) {
	cs := benchCampuses()
	for _, s := range benchSizes {
		data := campusGeoJSON(cs[s.name])
		b.Run(s.name, func(b *testing.B) {
			b.SetBytes(int64(len(data)))
			for b.Loop() {
				if _, err := Parse("bench.geojson", data); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// BenchmarkDuplicateKeys is the duplicate-member pass of Parse alone, on the same text.
func BenchmarkDuplicateKeys(b *testing.B) {
	data := campusGeoJSON(benchCampuses()["grid_70x72"])
	b.SetBytes(int64(len(data)))
	for b.Loop() {
		if d := input.JSONDuplicates(data); len(d) != 0 {
			b.Fatal(d)
		}
	}
}

// BenchmarkSameFootprints is the search for buildings drawn twice on its worst input: 300
// buildings drawn on one another, a centimetre apart, which stops after
// maxFootprintWarnings pairs.
func BenchmarkSameFootprints(b *testing.B) {
	var bs []Building
	for i := range 300 {
		d := float64(i) * 1e-7
		bs = append(bs, Building{Source: Source{File: "c.geojson", Index: i}, ID: fmt.Sprintf("B%03d", i),
			Footprint: orb.MultiPolygon{{{{10 + d, 50}, {10.001 + d, 50}, {10.001 + d, 50.001}, {10 + d, 50.001}, {10 + d, 50}}}}})
	}
	for b.Loop() {
		if len(sameFootprints(bs)) != maxFootprintWarnings+1 {
			b.Fatal("want the search capped")
		}
	}
}

// BenchmarkNearBound measures what the far-position rule adds to each projection Build makes
// (nearBound: the middle, then every position against FarM); checkFar on reading does the same.
func BenchmarkNearBound(b *testing.B) {
	c := benchCampuses()["grid_70x72"]
	n := 0
	featurePositions(c, func(Source, string, orb.Point) bool { n++; return true })
	for b.Loop() {
		if _, ok := nearBound(c); !ok {
			b.Fatal("no bound")
		}
	}
	b.ReportMetric(float64(n), "positions")
}
