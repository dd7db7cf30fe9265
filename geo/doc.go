// Package geo reads a campus from GeoJSON, validates it, and turns its geometry into
// topology: junctions, spans with geodesic lengths in metres, and building access points.
//
// Coordinates are WGS84 longitude/latitude in degrees (RFC 7946). Everything geo hands to
// other packages is measured in metres; only the writers in this package touch coordinates.
package geo
