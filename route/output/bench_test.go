package output

import (
	"context"
	"testing"

	"spanwright/route/internal/testplan"
)

// BenchmarkGeoPackage renders the demo's plan.gpkg (32 legs, 86 spans, 30 buildings): the
// cost plan.gpkg adds to a plan's outputs.
func BenchmarkGeoPackage(b *testing.B) {
	r := testplan.DemoResult(b)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := planGeoPackage(context.Background(), r); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFiles renders every output of the demo but report.html, with plan.gpkg and
// without, for the share plan.gpkg takes.
func BenchmarkFiles(b *testing.B) {
	r := testplan.DemoResult(b)
	for _, bc := range []struct {
		name string
		opt  WriteOptions
	}{{"all", WriteOptions{}}, {"no_gpkg", WriteOptions{SkipGeoPackage: true}}} {
		b.Run(bc.name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				if _, err := Files(context.Background(), r, bc.opt); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
