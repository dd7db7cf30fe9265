package gpkgout

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/binary"
	"fmt"
	"io"
	"math"
	"net/url"
	"os"
	"path/filepath"
	"strings"

	"github.com/paulmach/orb"

	_ "modernc.org/sqlite" // the pure-Go SQLite driver, registered as "sqlite"
)

// Column types a feature table's attribute may have (OGC GeoPackage 1.3 §1.1.1.1.3, Table 1).
const (
	Integer = "INTEGER" // Go int, int64; or nil
	Real    = "REAL"    // Go float64 (finite); or nil
	Text    = "TEXT"    // Go string (valid UTF-8); or nil
	Boolean = "BOOLEAN" // Go bool, stored as 0 or 1; or nil
)

// Geometry types of a layer (OGC GeoPackage 1.3 Annex G, Table 30); each layer has one.
const (
	Point        = "POINT"
	LineString   = "LINESTRING"
	MultiPolygon = "MULTIPOLYGON"
)

// SRSID is the spatial reference system of every geometry written: EPSG:4326, longitude
// then latitude in degrees (GeoPackage geometries are always x, y).
const SRSID = 4326

// LastChange is the pinned gpkg_contents.last_change of every layer, so that the same
// layers give the same bytes (ISO 8601 with milliseconds and Z, as §1.1.3.1.1 asks).
const LastChange = "1970-01-01T00:00:00.000Z"

// ApplicationID and UserVersion are the SQLite header fields that mark a GeoPackage 1.3
// (OGC GeoPackage 1.3 §1.1.1.1.1, Requirement 2: "GPKG" as a 32-bit integer; 10300 for 1.3.0).
const (
	ApplicationID = 0x47504B47
	UserVersion   = 10300
)

// pageSize is the SQLite page size, fixed so that the file does not depend on a default.
const pageSize = 4096

// Column is one attribute of a layer.
type Column struct {
	Name string
	Type string // Integer, Real, Text or Boolean
	// Description is a short text of what the column holds, for the caller's documentation;
	// it is not written to the file.
	Description string
}

// Geometry is a feature's geometry: an orb.Point, orb.LineString or orb.MultiPolygon.
type Geometry = orb.Geometry

// Feature is one row of a layer: its geometry (orb.Point, orb.LineString or
// orb.MultiPolygon as the layer's type says; nil for none) and one value per column.
type Feature struct {
	Geometry Geometry
	Values   []any
}

// Layer is one feature table.
type Layer struct {
	Name        string // table name and identifier: lower-case letters, digits and _, not starting with a digit
	Description string
	Geometry    string // Point, LineString or MultiPolygon
	Columns     []Column
	Features    []Feature // written in this order, fid 1, 2, ...
}

// Reserved column names: every feature table has its fid and geom.
const (
	FIDColumn  = "fid"
	GeomColumn = "geom"
)

// rowCheckEvery is how many rows Bytes writes between two looks at the context.
const rowCheckEvery = 256

// Bytes renders layers as one GeoPackage file and returns its bytes (WriteTo into memory).
// It fails, returning no bytes, on a layer or column name that is not a plain lower-case
// identifier or is used twice, a value whose Go type does not fit its column, a geometry of
// another type than its layer's, a non-finite number, or when ctx is done (ctx's error).
func Bytes(ctx context.Context, layers []Layer) ([]byte, error) {
	var buf bytes.Buffer
	if err := WriteTo(ctx, &buf, layers); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// build writes layers into the SQLite database dsn names and closes it; its errors are
// SQLite's (and the schema step or layer they happened in), for the caller to name the file.
func build(ctx context.Context, dsn string, layers []Layer) error {
	db, err := sql.Open("sqlite", dsn)
	if err != nil {
		return err
	}
	defer db.Close()
	db.SetMaxOpenConns(1)
	conn, err := db.Conn(ctx)
	if err != nil {
		return err
	}
	defer conn.Close()
	if err := write(ctx, conn, layers); err != nil {
		if ctx.Err() != nil {
			return ctx.Err()
		}
		return err
	}
	if err := conn.Close(); err != nil {
		return err
	}
	if err := db.Close(); err != nil {
		return err
	}
	return nil
}

// WriteTo renders layers as one GeoPackage file and writes it to w. The database is built
// in a temporary file (in os.TempDir, removed before WriteTo returns; without a rollback
// journal, as nothing else reads it) and then copied to w, so that a large GeoPackage is never
// held in memory: SQLite keeps its own small page cache. What fails Bytes fails WriteTo,
// before anything is written to w; an error of w is returned as it is.
func WriteTo(ctx context.Context, w io.Writer, layers []Layer) error {
	return WriteToIn(ctx, w, layers, "")
}

// WriteToIn is WriteTo building the database in a scratch file in folder dir ("" for the
// system's temporary folder). A caller that writes into a staging folder passes it, so that a
// killed process leaves its scratch file where the next run clears it, not in the temporary
// folder. Any folder name will do (URI opens it whatever it holds); an error of SQLite names
// the scratch file, and a build that leaves the file empty is an error naming it.
func WriteToIn(ctx context.Context, w io.Writer, layers []Layer, dir string) error {
	if err := check(layers); err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	tmp, err := os.CreateTemp(dir, ".spanwright-gpkg-*.gpkg")
	if err != nil {
		return fmt.Errorf("gpkgout: %w", err)
	}
	name := tmp.Name()
	defer os.Remove(name)
	if err := tmp.Close(); err != nil {
		return fmt.Errorf("gpkgout: %w", err)
	}
	uri, err := URI(name, "_pragma=journal_mode(OFF)&_pragma=synchronous(OFF)")
	if err != nil {
		return fmt.Errorf("gpkgout: %s: %w", name, err)
	}
	if err := build(ctx, uri, layers); err != nil {
		if ctx.Err() != nil {
			return ctx.Err()
		}
		return fmt.Errorf("gpkgout: build %s: %w", name, err)
	}
	return copyBuilt(w, name)
}

// copyBuilt copies the database SQLite built in the file name to w; a file still empty is an
// error naming it (SQLite wrote elsewhere: a path its URI did not name whole), as is one that
// cannot be read. An error of w is returned as it is.
func copyBuilt(w io.Writer, name string) error {
	f, err := os.Open(name)
	if err != nil {
		return fmt.Errorf("gpkgout: %w", err)
	}
	defer f.Close()
	if st, err := f.Stat(); err != nil {
		return fmt.Errorf("gpkgout: %w", err)
	} else if st.Size() == 0 {
		return fmt.Errorf("gpkgout: build %s: the file is empty after the build (SQLite wrote elsewhere)", name)
	}
	_, err = io.Copy(w, f)
	return err
}

// URI returns the SQLite URI filename (SQLite, "URI Filenames") that opens the file at path
// (made absolute) with the given query ("" for none; its parameters as SQLite and the
// driver read them, already escaped). The path is percent-encoded as a URL path, so that a
// '#', '?' or '%' in it is part of the name, not a fragment, a query or an escape; a plain
// "file:"+path would open another file. Every SQLite file of the module is opened through it.
func URI(path, query string) (string, error) {
	abs, err := filepath.Abs(path)
	if err != nil {
		return "", err
	}
	slash := filepath.ToSlash(abs)
	if !strings.HasPrefix(slash, "/") {
		slash = "/" + slash // C:/dir on Windows: file:///C:/dir, not C: as the URI's host
	}
	u := url.URL{Scheme: "file", Path: slash, RawQuery: query}
	return u.String(), nil
}

// schema is the GeoPackage's required tables, as OGC GeoPackage 1.3 Annex C gives them
// (Tables 18, 19 and 20 of §1.1.2.1, §1.1.3.1 and §2.1.5.1), and their required rows
// (§1.1.2.1.2, Requirement 11: EPSG:4326, and -1 and 0 for undefined Cartesian and
// geographic systems).
var schema = []string{
	`PRAGMA page_size = ` + fmt.Sprint(pageSize),
	`PRAGMA application_id = ` + fmt.Sprint(ApplicationID),
	`PRAGMA user_version = ` + fmt.Sprint(UserVersion),
	`CREATE TABLE gpkg_spatial_ref_sys (
  srs_name TEXT NOT NULL,
  srs_id INTEGER NOT NULL PRIMARY KEY,
  organization TEXT NOT NULL,
  organization_coordsys_id INTEGER NOT NULL,
  definition TEXT NOT NULL,
  description TEXT
)`,
	`CREATE TABLE gpkg_contents (
  table_name TEXT NOT NULL PRIMARY KEY,
  data_type TEXT NOT NULL,
  identifier TEXT UNIQUE,
  description TEXT DEFAULT '',
  last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')),
  min_x DOUBLE,
  min_y DOUBLE,
  max_x DOUBLE,
  max_y DOUBLE,
  srs_id INTEGER,
  CONSTRAINT fk_gc_r_srs_id FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys(srs_id)
)`,
	`CREATE TABLE gpkg_geometry_columns (
  table_name TEXT NOT NULL,
  column_name TEXT NOT NULL,
  geometry_type_name TEXT NOT NULL,
  srs_id INTEGER NOT NULL,
  z TINYINT NOT NULL,
  m TINYINT NOT NULL,
  CONSTRAINT pk_geom_cols PRIMARY KEY (table_name, column_name),
  CONSTRAINT uk_gc_table_name UNIQUE (table_name),
  CONSTRAINT fk_gc_tn FOREIGN KEY (table_name) REFERENCES gpkg_contents(table_name),
  CONSTRAINT fk_gc_srs FOREIGN KEY (srs_id) REFERENCES gpkg_spatial_ref_sys (srs_id)
)`,
	`INSERT INTO gpkg_spatial_ref_sys VALUES
  ('WGS 84 geodetic', 4326, 'EPSG', 4326, '` + wkt4326 + `', 'longitude/latitude coordinates in decimal degrees on the WGS 84 spheroid'),
  ('Undefined cartesian SRS', -1, 'NONE', -1, 'undefined', 'undefined cartesian coordinate reference system'),
  ('Undefined geographic SRS', 0, 'NONE', 0, 'undefined', 'undefined geographic coordinate reference system')`,
}

// wkt4326 is EPSG:4326 in OGC WKT 1 (OGC 01-009), as the EPSG registry gives it (from memory).
const wkt4326 = `GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]],PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]],UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]],AXIS["Latitude",NORTH],AXIS["Longitude",EAST],AUTHORITY["EPSG","4326"]]`

func write(ctx context.Context, conn *sql.Conn, layers []Layer) error {
	for _, s := range schema {
		if _, err := conn.ExecContext(ctx, s); err != nil {
			return fmt.Errorf("schema: %w", err)
		}
	}
	for i := range layers {
		if err := writeLayer(ctx, conn, &layers[i]); err != nil {
			return fmt.Errorf("layer %s: %w", layers[i].Name, err)
		}
	}
	// VACUUM leaves no free pages behind, so the bytes depend on the content only.
	if _, err := conn.ExecContext(ctx, "VACUUM"); err != nil {
		return fmt.Errorf("vacuum: %w", err)
	}
	return nil
}

func writeLayer(ctx context.Context, conn *sql.Conn, l *Layer) error {
	var cols strings.Builder
	fmt.Fprintf(&cols, "%s INTEGER PRIMARY KEY AUTOINCREMENT NOT NULL, %s %s", FIDColumn, GeomColumn, l.Geometry)
	for _, c := range l.Columns {
		fmt.Fprintf(&cols, ", %q %s", c.Name, c.Type)
	}
	tx, err := conn.BeginTx(ctx, nil)
	if err != nil {
		return err
	}
	defer tx.Rollback()
	if _, err := tx.ExecContext(ctx, fmt.Sprintf("CREATE TABLE %q (%s)", l.Name, cols.String())); err != nil {
		return err
	}
	names := []string{GeomColumn}
	marks := []string{"?"}
	for _, c := range l.Columns {
		names = append(names, fmt.Sprintf("%q", c.Name))
		marks = append(marks, "?")
	}
	ins, err := tx.PrepareContext(ctx, fmt.Sprintf("INSERT INTO %q (%s) VALUES (%s)", l.Name, strings.Join(names, ", "), strings.Join(marks, ", ")))
	if err != nil {
		return err
	}
	defer ins.Close()
	var box orb.Bound
	boxed := false
	args := make([]any, 1+len(l.Columns))
	// The rows look at ctx every rowCheckEvery rows; given ctx itself, the driver would
	// start a goroutine per row to watch it.
	rowCtx := context.WithoutCancel(ctx)
	var blob []byte // each geometry's blob, built into the same buffer (the driver copies it)
	for i, f := range l.Features {
		if i%rowCheckEvery == 0 {
			if err := ctx.Err(); err != nil {
				return err
			}
		}
		args[0] = nil
		if f.Geometry != nil {
			var err error
			if blob, err = appendEncoded(blob[:0], f.Geometry); err != nil {
				return fmt.Errorf("feature %d: %w", i+1, err)
			}
			args[0] = blob
			b := f.Geometry.Bound()
			if !boxed {
				box, boxed = b, true
			} else {
				box = box.Union(b)
			}
		}
		for c, v := range f.Values {
			args[1+c] = v
			if b, ok := v.(bool); ok {
				args[1+c] = 0
				if b {
					args[1+c] = 1
				}
			}
		}
		if _, err := ins.ExecContext(rowCtx, args...); err != nil {
			return fmt.Errorf("feature %d: %w", i+1, err)
		}
	}
	bounds := []any{nil, nil, nil, nil}
	if boxed {
		bounds = []any{box.Min[0], box.Min[1], box.Max[0], box.Max[1]}
	}
	if _, err := tx.ExecContext(ctx, `INSERT INTO gpkg_contents (table_name, data_type, identifier, description, last_change, min_x, min_y, max_x, max_y, srs_id)
VALUES (?, 'features', ?, ?, ?, ?, ?, ?, ?, ?)`, l.Name, l.Name, l.Description, LastChange, bounds[0], bounds[1], bounds[2], bounds[3], SRSID); err != nil {
		return err
	}
	if _, err := tx.ExecContext(ctx, `INSERT INTO gpkg_geometry_columns VALUES (?, ?, ?, ?, 0, 0)`, l.Name, GeomColumn, l.Geometry, SRSID); err != nil {
		return err
	}
	return tx.Commit()
}

// check validates the layers before anything is written.
func check(layers []Layer) error {
	seen := map[string]bool{}
	for _, l := range layers {
		if !plainName(l.Name) || strings.HasPrefix(l.Name, "gpkg_") || strings.HasPrefix(l.Name, "sqlite_") || seen[l.Name] {
			return fmt.Errorf("gpkgout: layer name %q: want a lower-case identifier, not gpkg_ or sqlite_, used once", l.Name)
		}
		seen[l.Name] = true
		switch l.Geometry {
		case Point, LineString, MultiPolygon:
		default:
			return fmt.Errorf("gpkgout: layer %s: geometry type %q: want POINT, LINESTRING or MULTIPOLYGON", l.Name, l.Geometry)
		}
		cols := map[string]bool{FIDColumn: true, GeomColumn: true}
		for _, c := range l.Columns {
			if !plainName(c.Name) || cols[c.Name] {
				return fmt.Errorf("gpkgout: layer %s: column name %q: want a lower-case identifier, not fid or geom, used once", l.Name, c.Name)
			}
			cols[c.Name] = true
			switch c.Type {
			case Integer, Real, Text, Boolean:
			default:
				return fmt.Errorf("gpkgout: layer %s: column %s: type %q: want INTEGER, REAL, TEXT or BOOLEAN", l.Name, c.Name, c.Type)
			}
		}
		for i, f := range l.Features {
			if len(f.Values) != len(l.Columns) {
				return fmt.Errorf("gpkgout: layer %s: feature %d: %d values for %d columns", l.Name, i+1, len(f.Values), len(l.Columns))
			}
			if f.Geometry != nil && f.Geometry.GeoJSONType() != geoJSONType[l.Geometry] {
				return fmt.Errorf("gpkgout: layer %s: feature %d: a %s in a %s layer", l.Name, i+1, f.Geometry.GeoJSONType(), l.Geometry)
			}
			for c, v := range f.Values {
				if !fits(l.Columns[c].Type, v) {
					return fmt.Errorf("gpkgout: layer %s: feature %d: column %s (%s): value %#v does not fit", l.Name, i+1, l.Columns[c].Name, l.Columns[c].Type, v)
				}
			}
		}
	}
	return nil
}

var geoJSONType = map[string]string{Point: "Point", LineString: "LineString", MultiPolygon: "MultiPolygon"}

func fits(typ string, v any) bool {
	if v == nil {
		return true
	}
	switch typ {
	case Integer:
		switch v.(type) {
		case int, int64:
			return true
		}
	case Real:
		x, ok := v.(float64)
		return ok && !math.IsNaN(x) && !math.IsInf(x, 0)
	case Text:
		_, ok := v.(string)
		return ok
	case Boolean:
		_, ok := v.(bool)
		return ok
	}
	return false
}

func plainName(s string) bool {
	if s == "" || s[0] >= '0' && s[0] <= '9' {
		return false
	}
	for _, r := range s {
		if !(r >= 'a' && r <= 'z' || r >= '0' && r <= '9' || r == '_') {
			return false
		}
	}
	return true
}

// WKB geometry type codes (OGC 06-103r4 Simple Features §8.2.8, 2D).
const (
	wkbPoint        = 1
	wkbLineString   = 2
	wkbPolygon      = 3
	wkbMultiPolygon = 6
)

// Encode returns g as a GeoPackage geometry blob (OGC GeoPackage 1.3 §2.1.3.1.1,
// StandardGeoPackageBinary): "GP", version 0, flags (little-endian, envelope [minx, maxx,
// miny, maxy]), srs_id SRSID, the envelope, then g in little-endian ISO WKB. g is an
// orb.Point, orb.LineString or orb.MultiPolygon with finite coordinates; a LineString needs
// two points.
func Encode(g orb.Geometry) ([]byte, error) { return appendEncoded(nil, g) }

// appendEncoded appends g's blob (Encode) to b.
func appendEncoded(b []byte, g orb.Geometry) ([]byte, error) {
	b = append(b, 'G', 'P', 0, flagsEnvelopeXY|flagLittleEndian)
	b = binary.LittleEndian.AppendUint32(b, uint32(SRSID))
	box := g.Bound()
	for _, x := range []float64{box.Min[0], box.Max[0], box.Min[1], box.Max[1]} {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return nil, fmt.Errorf("a coordinate is not finite")
		}
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(x))
	}
	switch t := g.(type) {
	case orb.Point:
		b = wkbHead(b, wkbPoint)
		return appendPoint(b, t), nil
	case orb.LineString:
		if len(t) < 2 {
			return nil, fmt.Errorf("a line of %d points", len(t))
		}
		b = wkbHead(b, wkbLineString)
		return appendPoints(b, []orb.Point(t)), nil
	case orb.MultiPolygon:
		b = wkbHead(b, wkbMultiPolygon)
		b = binary.LittleEndian.AppendUint32(b, uint32(len(t)))
		for _, p := range t {
			b = wkbHead(b, wkbPolygon)
			b = binary.LittleEndian.AppendUint32(b, uint32(len(p)))
			for _, r := range p {
				b = appendPoints(b, []orb.Point(r))
			}
		}
		return b, nil
	}
	return nil, fmt.Errorf("geometry %s: want Point, LineString or MultiPolygon", g.GeoJSONType())
}

// Flags of the GeoPackage binary header (§2.1.3.1.1): bit 0 the byte order (1: little
// endian), bits 1 to 3 the envelope contents indicator (1: [minx, maxx, miny, maxy]).
const (
	flagLittleEndian = 1
	flagsEnvelopeXY  = 1 << 1
)

func wkbHead(b []byte, typ uint32) []byte {
	b = append(b, 1) // NDR, little endian
	return binary.LittleEndian.AppendUint32(b, typ)
}

func appendPoint(b []byte, p orb.Point) []byte {
	b = binary.LittleEndian.AppendUint64(b, math.Float64bits(p[0]))
	return binary.LittleEndian.AppendUint64(b, math.Float64bits(p[1]))
}

func appendPoints(b []byte, ps []orb.Point) []byte {
	b = binary.LittleEndian.AppendUint32(b, uint32(len(ps)))
	for _, p := range ps {
		b = appendPoint(b, p)
	}
	return b
}
