package geo

import (
	"math/rand/v2"
	"sync"
	"testing"
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
