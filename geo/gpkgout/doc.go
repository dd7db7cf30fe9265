// Package gpkgout writes vector layers as an OGC GeoPackage 1.3 file (OGC 12-128r18): an
// SQLite database with the tables the standard requires (gpkg_spatial_ref_sys,
// gpkg_contents, gpkg_geometry_columns), the application_id "GPKG" and user_version 10300,
// one feature table per layer with typed columns, and geometries in
// StandardGeoPackageBinary with an envelope, all in EPSG:4326 (WGS 84 longitude, latitude).
//
// The file is built with the pure-Go SQLite driver modernc.org/sqlite in a temporary file
// and then copied to the caller's writer (WriteTo), so the default build needs only Go, the
// caller writes the file as it writes any other, and a large file is never held in memory.
// The bytes depend only on the layers and the SQLite library's version (which the file's
// header records): a fixed page size, rows in the order given, no timestamps
// (gpkg_contents.last_change is pinned to LastChange) and a VACUUM once every layer is
// written.
package gpkgout
