package gpkg

import (
	"context"
	"database/sql"
	"encoding/binary"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"net/url"
	"os"
	"strconv"
	"strings"
	"time"

	"github.com/paulmach/orb"
	_ "modernc.org/sqlite" // the pure-Go SQLite driver, "sqlite"

	"spanwright/geo"
	"spanwright/geo/gpkgout"
	"spanwright/geo/input"
)

// Ext is the file name extension of a GeoPackage (OGC GeoPackage 1.3 §1.1.1.1.2).
const Ext = ".gpkg"

// Is reports whether path names a GeoPackage by its extension (any case).
func Is(path string) bool { return strings.EqualFold(pathExt(path), Ext) }

func pathExt(path string) string {
	if i := strings.LastIndexAny(path, "./"); i >= 0 && path[i] == '.' {
		return path[i:]
	}
	return ""
}

// ErrNotGeoPackage is a file that is not an SQLite database holding the GeoPackage tables.
var ErrNotGeoPackage = errors.New("not a GeoPackage")

// rowCheckEvery is how many rows a table's reading takes between two looks at the context.
const rowCheckEvery = 256

// Read reads the features of the GeoPackage at path into r: every row of every feature
// table (gpkg_contents data_type "features"), tables in name order, rows in feature id
// order. The file must be a regular file of at most maxBytes bytes (0:
// input.DefaultDataMiB MiB); it is opened read-only and never written. Problems, each
// naming the file and the table (and the row's fid), go to r.
func Read(ctx context.Context, r *geo.Reader, path string, maxBytes int64) {
	if !r.Open(path) {
		return
	}
	r.AddFile(path)
	fileErr := func(err error) { r.Problem(&input.Problem{File: path, Err: err}) }
	if err := input.CheckFile(path, input.Cap(maxBytes, input.DefaultDataMiB)); err != nil {
		fileErr(fmt.Errorf("read: %w", input.Cause(err)))
		return
	}
	uri, err := dsn(path, settled(path))
	if err != nil {
		fileErr(fmt.Errorf("open: %w", err))
		return
	}
	db, err := sql.Open("sqlite", uri)
	if err != nil {
		fileErr(fmt.Errorf("open: %w", err))
		return
	}
	defer db.Close()
	// One connection: the queries run one after the other, and a read-only file needs no more.
	db.SetMaxOpenConns(1)
	tables, err := featureTables(ctx, db)
	if err != nil {
		fileErr(err)
		return
	}
	if len(tables) == 0 {
		fileErr(input.Errorf(ErrNotGeoPackage, "holds no feature table (gpkg_contents lists none with data_type \"features\")"))
		return
	}
	for _, t := range tables {
		if r.Err() != nil {
			return
		}
		readTable(ctx, r, db, path, t)
	}
}

// dsn is the SQLite URI of path opened read-only (SQLite, "URI Filenames": mode=ro), with
// the statements that could write refused as well (PRAGMA query_only); immutable for a file
// that nothing can be writing (settled), so that SQLite creates nothing beside it. The path
// is escaped as gpkgout.URI escapes every SQLite file's.
func dsn(path string, immutable bool) (string, error) {
	q := url.Values{}
	q.Set("mode", "ro")
	if immutable {
		q.Set("immutable", "1")
	}
	q.Add("_pragma", "query_only(1)")
	return gpkgout.URI(path, q.Encode())
}

// settled reports whether path is an SQLite database in WAL mode (file format write version
// 2, byte 18 of the header: SQLite, "Database File Format" §1.3) without a -wal file beside
// it: no change is pending, and none is being made. Opened with mode=ro alone, SQLite would
// create the -wal and -shm files beside it and leave them there; opened immutable, it reads
// the file as it is. A database in rollback-journal mode (GDAL writes GeoPackages so) needs
// nothing beside it to be read, and a WAL database with its -wal file must be read with it.
func settled(path string) bool {
	f, err := os.Open(path)
	if err != nil {
		return false
	}
	defer f.Close()
	var h [100]byte
	if _, err := io.ReadFull(f, h[:]); err != nil || string(h[:16]) != "SQLite format 3\x00" || h[18] != 2 {
		return false
	}
	_, err = os.Lstat(path + "-wal")
	return errors.Is(err, fs.ErrNotExist)
}

// table is a feature table and its geometry column (gpkg_geometry_columns) and spatial
// reference system (gpkg_spatial_ref_sys).
type table struct {
	name, geom string
	srsID      int64
	org        sql.NullString
	code       sql.NullInt64
	srsName    sql.NullString
}

func featureTables(ctx context.Context, db *sql.DB) ([]table, error) {
	var n int
	err := db.QueryRowContext(ctx, `SELECT count(*) FROM sqlite_master WHERE type IN ('table', 'view') AND name IN ('gpkg_contents', 'gpkg_geometry_columns', 'gpkg_spatial_ref_sys')`).Scan(&n)
	if err != nil {
		return nil, input.Errorf(ErrNotGeoPackage, "not a GeoPackage (not an SQLite database: %v)", err)
	}
	if n < 3 {
		return nil, input.Errorf(ErrNotGeoPackage, "not a GeoPackage: an SQLite database without the tables gpkg_contents, gpkg_geometry_columns and gpkg_spatial_ref_sys")
	}
	// OGC GeoPackage 1.3 §1.1.3.1 (gpkg_contents), §2.1.5.1 (gpkg_geometry_columns),
	// §1.1.2.1 (gpkg_spatial_ref_sys).
	rows, err := db.QueryContext(ctx, `
		SELECT c.table_name, g.column_name, g.srs_id, s.organization, s.organization_coordsys_id, s.srs_name
		FROM gpkg_contents c
		LEFT JOIN gpkg_geometry_columns g ON g.table_name = c.table_name
		LEFT JOIN gpkg_spatial_ref_sys s ON s.srs_id = g.srs_id
		WHERE c.data_type = 'features'
		ORDER BY c.table_name`)
	if err != nil {
		return nil, input.Errorf(ErrNotGeoPackage, "not a readable GeoPackage: %v", err)
	}
	defer rows.Close()
	var out []table
	for rows.Next() {
		var t table
		var geom sql.NullString
		var srs sql.NullInt64
		if err := rows.Scan(&t.name, &geom, &srs, &t.org, &t.code, &t.srsName); err != nil {
			return nil, input.Errorf(ErrNotGeoPackage, "not a readable GeoPackage: %v", err)
		}
		t.geom, t.srsID = geom.String, srs.Int64
		if !geom.Valid {
			t.geom = "" // reported by readTable
		}
		out = append(out, t)
	}
	if err := rows.Err(); err != nil {
		return nil, input.Errorf(ErrNotGeoPackage, "not a readable GeoPackage: %v", err)
	}
	return out, nil
}

// column is one column of a feature table.
type column struct {
	name, decl string
}

func readTable(ctx context.Context, r *geo.Reader, db *sql.DB, path string, t table) {
	tableErr := func(err error) {
		r.Problem(&input.Problem{File: path, Item: "table " + input.TableName(t.name), Err: err})
	}
	if t.geom == "" {
		tableErr(input.Errorf(ErrNotGeoPackage, "a feature table without a row in gpkg_geometry_columns"))
		return
	}
	fid, cols, err := columns(ctx, db, t)
	if err != nil {
		tableErr(err)
		return
	}
	proj, projErr := projection(t)
	if projErr != nil {
		tableErr(projErr)
	}
	var sel strings.Builder
	sel.WriteString("SELECT " + quote(fid) + ", " + quote(t.geom))
	for _, c := range cols {
		sel.WriteString(", " + quote(c.name))
	}
	sel.WriteString(" FROM " + quote(t.name) + " ORDER BY " + quote(fid))
	rows, err := db.QueryContext(ctx, sel.String())
	if err != nil {
		tableErr(fmt.Errorf("query: %w", err))
		return
	}
	defer rows.Close()
	vals := make([]any, 2+len(cols))
	ptrs := make([]any, len(vals))
	for i := range vals {
		ptrs[i] = &vals[i]
	}
	kind := geo.TableKind(t.name)
	for n := 0; rows.Next(); n++ {
		if n%rowCheckEvery == 0 && r.Err() != nil {
			return
		}
		if err := rows.Scan(ptrs...); err != nil {
			tableErr(fmt.Errorf("row %d: %w", n+1, err))
			return
		}
		id, ok := vals[0].(int64)
		if !ok {
			tableErr(input.Errorf(input.ErrWrongType, "row %d: want an integer feature id in column %s, got %s", n+1, quote(fid), describe(vals[0])))
			continue
		}
		row := geo.Row{Source: geo.Source{File: path, Table: t.name, FID: id}, Kind: kind, Props: make(map[string]any, len(cols))}
		for i, c := range cols {
			row.Props[c.name] = property(vals[2+i], c.decl)
		}
		row.Geometry, row.GeometryErr = geometry(vals[1], t.srsID, proj, projErr != nil)
		row.Unprojected = projErr != nil
		r.Row(row)
	}
	if err := rows.Err(); err != nil {
		tableErr(fmt.Errorf("query: %w", err))
	}
}

// columns returns the table's feature id column (its INTEGER PRIMARY KEY, OGC GeoPackage 1.3
// §2.1.6.1.1, or SQLite's rowid) and its other columns but the geometry, in table order.
func columns(ctx context.Context, db *sql.DB, t table) (string, []column, error) {
	rows, err := db.QueryContext(ctx, `SELECT name, type, pk FROM pragma_table_info(?) ORDER BY cid`, t.name)
	if err != nil {
		return "", nil, fmt.Errorf("columns: %w", err)
	}
	defer rows.Close()
	var cols []column
	var pks []column
	for rows.Next() {
		var c column
		var pk int
		if err := rows.Scan(&c.name, &c.decl, &pk); err != nil {
			return "", nil, fmt.Errorf("columns: %w", err)
		}
		switch {
		case pk > 0:
			pks = append(pks, c)
		case strings.EqualFold(c.name, t.geom):
		default:
			cols = append(cols, c)
		}
	}
	if err := rows.Err(); err != nil {
		return "", nil, fmt.Errorf("columns: %w", err)
	}
	if len(cols) == 0 && len(pks) == 0 {
		return "", nil, input.Errorf(ErrNotGeoPackage, "listed in gpkg_contents but no such table")
	}
	if len(pks) == 1 && strings.EqualFold(pks[0].decl, "INTEGER") {
		return pks[0].name, cols, nil
	}
	// No integer primary key: the rowid stands for the feature id, and any key column is a
	// property like the rest.
	return "rowid", append(pks, cols...), nil
}

// projection is the table's way to WGS84, from its srs's organization and code.
func projection(t table) (orb.Projection, error) {
	if !t.org.Valid || !t.code.Valid {
		return nil, fmt.Errorf("%w: srs_id %d has no row in gpkg_spatial_ref_sys", geo.ErrCRS, t.srsID)
	}
	proj, err := geo.TableProjection(t.org.String, t.code.Int64)
	if err != nil {
		return nil, fmt.Errorf("srs_id %d (%s): %w", t.srsID, t.srsName.String, err)
	}
	return proj, nil
}

// property is a column value as a GeoJSON property's: SQLite's integers and reals as numbers,
// a BOOLEAN column's 0 and 1 as false and true (OGC GeoPackage 1.3 §1.1.1.1.3, Table 1), text
// as a string, NULL as nil (absent).
func property(v any, decl string) any {
	switch t := v.(type) {
	case nil:
		return nil
	case int64:
		if strings.EqualFold(decl, "BOOLEAN") && (t == 0 || t == 1) {
			return t == 1
		}
		return geo.Int(t)
	case float64:
		return geo.Float(t, 64)
	case string:
		return t
	case bool:
		return t
	case []byte:
		if decl == "" {
			decl = "BLOB"
		}
		return geo.Value{Type: decl}
	case time.Time:
		return geo.Value{Type: decl}
	}
	return geo.Value{Type: decl}
}

func describe(v any) string {
	switch t := v.(type) {
	case nil:
		return "NULL"
	case string:
		return strconv.Quote(t)
	case float64:
		return strconv.FormatFloat(t, 'g', -1, 64)
	}
	return "a value of another type"
}

// quote is an SQL identifier quoted for SQLite.
func quote(id string) string {
	if id == "rowid" {
		return id
	}
	return `"` + strings.ReplaceAll(id, `"`, `""`) + `"`
}

// geometry decodes a GeoPackage geometry blob: its header (OGC GeoPackage 1.3 §2.1.3.1.1,
// GeoPackageBinaryHeader) then the standard WKB, taken to WGS84 with proj; when raw, the
// table's system is unusable (already reported) and the coordinates are left as they are.
func geometry(v any, srsID int64, proj orb.Projection, raw bool) (orb.Geometry, error) {
	var blob []byte
	switch t := v.(type) {
	case nil:
		return nil, nil // missing: the check says so
	case []byte:
		blob = t
	case string:
		blob = []byte(t)
	default:
		return nil, input.Errorf(geo.ErrBadGeometry, "want a GeoPackage geometry blob, got %s", describe(v))
	}
	wkb, empty, hdrSRS, err := header(blob)
	if err != nil {
		return nil, input.Errorf(geo.ErrBadGeometry, "not a GeoPackage geometry: %v", err)
	}
	if empty {
		return nil, input.Errorf(geo.ErrMissingProperty, "missing (an empty geometry)")
	}
	if int64(hdrSRS) != srsID {
		return nil, input.Errorf(geo.ErrBadGeometry, "srs_id %d in the geometry's header, but the table's column is in srs_id %d", hdrSRS, srsID)
	}
	if raw {
		proj = nil
	}
	return geo.DecodeWKB(wkb, proj)
}

// Envelope sizes in bytes by the envelope contents indicator, flag bits 1-3 (OGC GeoPackage
// 1.3 §2.1.3.1.1): none, [minx, maxx, miny, maxy], with z, with m, with z and m.
var envelopeBytes = [...]int{0, 32, 48, 48, 64}

// header reads a GeoPackageBinaryHeader and returns the WKB after it, whether the empty
// flag is set, and the header's srs_id.
func header(b []byte) (wkb []byte, empty bool, srsID int32, err error) {
	if len(b) < 8 {
		return nil, false, 0, fmt.Errorf("%d bytes, shorter than its 8-byte header", len(b))
	}
	if b[0] != 'G' || b[1] != 'P' {
		return nil, false, 0, fmt.Errorf("magic %q, want \"GP\"", b[:2])
	}
	if b[2] != 0 {
		return nil, false, 0, fmt.Errorf("version %d, want 0 (GeoPackage version 1)", b[2])
	}
	flags := b[3]
	if flags&0x20 != 0 {
		return nil, false, 0, errors.New("an ExtendedGeoPackageBinary, whose extension spanwright does not read")
	}
	var order binary.ByteOrder = binary.BigEndian
	if flags&1 != 0 {
		order = binary.LittleEndian
	}
	e := int(flags>>1) & 7
	if e >= len(envelopeBytes) {
		return nil, false, 0, fmt.Errorf("envelope contents indicator %d, want 0 to 4", e)
	}
	n := 8 + envelopeBytes[e]
	if len(b) < n {
		return nil, false, 0, fmt.Errorf("%d bytes, shorter than its %d-byte header", len(b), n)
	}
	return b[n:], flags&0x10 != 0, int32(order.Uint32(b[4:8])), nil
}
