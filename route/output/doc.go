// Package output renders a planned scenario's files (routes.geojson, links.csv,
// summary.json, bom.csv, bom.xlsx) and its terminal summaries, in metric or imperial units at
// this edge only, and writes them as one set through package fileset.
package output
