// Package gpkgout writes vector layers as an OGC GeoPackage 1.3 file (OGC 12-128r18): an
// SQLite database with the tables the standard requires (gpkg_spatial_ref_sys,
// gpkg_contents, gpkg_geometry_columns), the application_id "GPKG" and user_version 10300,
// one feature table per layer with typed columns, and geometries in
// StandardGeoPackageBinary with an envelope, all in EPSG:4326 (WGS 84 longitude, latitude).
//
// The file is built in memory with the pure-Go SQLite driver modernc.org/sqlite and
// returned as bytes, so the default build needs only Go and the caller writes the file as
// it writes any other. The bytes depend only on the layers: a fixed page size, rows in the
// order given, no timestamps (gpkg_contents.last_change is pinned to LastChange) and a
// VACUUM before the database is serialised.
package gpkgout
