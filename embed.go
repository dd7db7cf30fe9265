// Package spanwright holds the files embedded in the binary: the demo campus and its plan.
package spanwright

import "embed"

// Demo holds testdata/demo: campus.geojson and plan.yaml, an invented campus.
//
//go:embed testdata/demo/campus.geojson testdata/demo/plan.yaml
var Demo embed.FS

// DemoDir is the folder of the demo files inside Demo.
const DemoDir = "testdata/demo"
