// Package gpkg reads a campus from an OGC GeoPackage (1.3): every feature table's rows as
// features, their columns as properties, their geometry (GeoPackage binary header and WKB)
// taken to WGS84 from the table's spatial reference system, into a geo.Reader, which checks
// them as it checks GeoJSON features. The file is opened read-only.
package gpkg
