// Package geo reads a campus from GeoJSON, validates it, and turns its geometry into
// topology: junctions, spans with geodesic lengths in metres, and building access points.
//
// Coordinates are WGS84 longitude/latitude in degrees (RFC 7946). Everything geo hands to
// other packages is measured in metres; only the writers in this package touch coordinates.
//
// A Reader takes features from any number of sources, GeoJSON files and the rows of tables
// (Row, fed by packages gpkg and postgis), and checks every one by the same rules, so a
// campus read from a GeoPackage or a database is the campus read from the same features in
// GeoJSON.
package geo
