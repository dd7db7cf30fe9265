package gpkgout

import (
	"context"
	"fmt"
	"io"
	"testing"

	"github.com/paulmach/orb"
)

// BenchmarkWriteTo writes a GeoPackage the size of a 1,000-building plan's plan.gpkg: 20,000
// lines of 12 points with ten attributes (about 8 MB).
func BenchmarkWriteTo(b *testing.B) {
	l := Layer{Name: "lines", Geometry: LineString}
	for c := range 10 {
		typ := []string{Text, Real, Integer, Boolean}[c%4]
		l.Columns = append(l.Columns, Column{Name: fmt.Sprintf("c%d", c), Type: typ})
	}
	for i := range 20000 {
		line := make(orb.LineString, 12)
		for p := range line {
			line[p] = orb.Point{-3.7 + float64(i)*1e-5 + float64(p)*1e-6, 52.3 + float64(p)*1e-6}
		}
		vals := make([]any, len(l.Columns))
		for c := range vals {
			vals[c] = []any{fmt.Sprintf("L-%d-%d", i, c), float64(i) / 7, int64(i * c), i%2 == 0}[c%4]
		}
		l.Features = append(l.Features, Feature{Geometry: line, Values: vals})
	}
	b.ReportAllocs()
	for b.Loop() {
		if err := WriteTo(context.Background(), io.Discard, []Layer{l}); err != nil {
			b.Fatal(err)
		}
	}
}
