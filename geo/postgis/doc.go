// Package postgis reads a campus from the tables of a PostgreSQL database with PostGIS, as
// package gpkg reads a GeoPackage's: rows as features, columns as properties, geometry as WKB
// taken to WGS84 from its SRID, into a geo.Reader. It reads in one read-only transaction with
// SELECT statements only, and never prints the connection's password.
package postgis
