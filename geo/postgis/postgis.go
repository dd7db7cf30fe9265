package postgis

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgtype"
	"github.com/paulmach/orb"

	"spanwright/geo"
	"spanwright/geo/input"
)

// ErrDatabase is a database spanwright cannot read a campus from: it cannot connect, the
// connection string does not parse, or PostGIS or a table is not as expected.
var ErrDatabase = errors.New("unreadable campus database")

// rowCheckEvery is how many rows a table's reading takes between two looks at the context.
const rowCheckEvery = 256

// connectTimeout bounds the connection to the server when the connection string sets no
// connect_timeout of its own: an unreachable host is reported rather than waited for.
const connectTimeout = 30 * time.Second

// closeTimeout bounds the goodbye to the server once the reading is done or stopped.
const closeTimeout = 5 * time.Second

// Name is how messages name the database of connString: its name, user, host and port, never
// its password. A string that does not parse is named by a fixed text.
func Name(connString string) string {
	cfg, err := pgx.ParseConfig(connString)
	if err != nil {
		return "database (connection string that does not parse)"
	}
	return name(cfg)
}

func name(cfg *pgx.ConnConfig) string {
	return fmt.Sprintf("database %q (user %q on %s:%d)", cfg.Database, cfg.User, cfg.Host, cfg.Port)
}

// Read reads the campus tables of the PostgreSQL/PostGIS database at connString (a libpq
// connection string or URI; the password may also come from PGPASSWORD or a password file,
// as libpq reads them) into r: every table with a geometry column (geometry_columns) in the
// connection's current schema (the first of its search_path), tables in name order, rows in
// primary key order. It waits connectTimeout for the server unless the string sets
// connect_timeout. It reads inside one read-only, repeatable-read transaction, with
// SELECT statements only, and rolls it back. Problems, each naming the database (never its
// password) and the table (and the row's fid, its primary key), go to r.
func Read(ctx context.Context, r *geo.Reader, connString string) {
	cfg, err := pgx.ParseConfig(connString)
	if err != nil {
		// pgx masks a password in its message only on a best-effort basis: say nothing of
		// the string.
		r.Problem(&input.Problem{File: Name(connString), Err: input.Errorf(ErrDatabase,
			"the connection string does not parse (it is not shown, as it may hold a password); want a libpq key=value string or a postgresql:// URI")})
		return
	}
	if cfg.ConnectTimeout == 0 {
		cfg.ConnectTimeout = connectTimeout
	}
	db := &reader{r: r, name: name(cfg), password: cfg.Password}
	conn, err := pgx.ConnectConfig(ctx, cfg)
	if err != nil {
		db.fail("", fmt.Errorf("connect: %w", err))
		return
	}
	defer func() {
		cctx, cancel := context.WithTimeout(context.Background(), closeTimeout)
		defer cancel()
		conn.Close(cctx)
	}()
	tx, err := conn.BeginTx(ctx, pgx.TxOptions{IsoLevel: pgx.RepeatableRead, AccessMode: pgx.ReadOnly})
	if err != nil {
		db.fail("", fmt.Errorf("begin a read-only transaction: %w", err))
		return
	}
	defer func() {
		cctx, cancel := context.WithTimeout(context.Background(), closeTimeout)
		defer cancel()
		tx.Rollback(cctx)
	}()
	// BEGIN … READ ONLY has said so already; said again so that no later change to the
	// options above can make the reading write.
	if _, err := tx.Exec(ctx, "SET TRANSACTION READ ONLY"); err != nil {
		db.fail("", fmt.Errorf("set the transaction read-only: %w", err))
		return
	}
	db.tx = tx
	tables, err := db.tables(ctx)
	if err != nil {
		db.fail("", err)
		return
	}
	if len(tables) == 0 {
		db.fail("", input.Errorf(ErrDatabase, "no table with a geometry column in the current schema (geometry_columns lists none); set the schema with search_path"))
		return
	}
	for _, t := range tables {
		if r.Err() != nil {
			return
		}
		db.table(ctx, t)
	}
}

// reader reads one database's tables.
type reader struct {
	r        *geo.Reader
	tx       pgx.Tx
	name     string
	password string
}

// fail reports a problem of the database ("" table) or of one table, its text cleared of
// the password should a server or driver message have quoted it.
func (d *reader) fail(table string, err error) {
	if d.password != "" && strings.Contains(err.Error(), d.password) {
		err = errors.New(strings.ReplaceAll(err.Error(), d.password, "xxxxx"))
	}
	if !errors.Is(err, ErrDatabase) {
		err = &wrapped{err}
	}
	p := &input.Problem{File: d.name, Err: err}
	if table != "" {
		p.Item = "table " + input.TableName(table)
	}
	d.r.Problem(p)
}

// wrapped is an error of the server or driver, matched by errors.Is as ErrDatabase.
type wrapped struct{ err error }

func (w *wrapped) Error() string        { return w.err.Error() }
func (w *wrapped) Is(target error) bool { return target == ErrDatabase }

// table is a table with a geometry column, from geometry_columns (OGC Simple Features for
// SQL 1.2.1 §7.1.3.2, as PostGIS provides it).
type table struct {
	schema, name, geom string
}

func (d *reader) tables(ctx context.Context) ([]table, error) {
	rows, err := d.tx.Query(ctx, `
		SELECT f_table_schema::text, f_table_name::text, f_geometry_column::text
		FROM geometry_columns
		WHERE f_table_schema = current_schema()
		ORDER BY f_table_name, f_geometry_column`)
	if err != nil {
		return nil, fmt.Errorf("list the tables (is PostGIS installed in this database?): %w", err)
	}
	ts, err := pgx.CollectRows(rows, func(row pgx.CollectableRow) (table, error) {
		var t table
		err := row.Scan(&t.schema, &t.name, &t.geom)
		return t, err
	})
	if err != nil {
		return nil, fmt.Errorf("list the tables: %w", err)
	}
	var out []table
	for i, t := range ts {
		if i > 0 && ts[i-1].name == t.name {
			if len(out) > 0 && out[len(out)-1].name == t.name {
				out = out[:len(out)-1]
				d.fail(t.name, input.Errorf(ErrDatabase, "has more than one geometry column (%s, %s); want one", ts[i-1].geom, t.geom))
			}
			continue
		}
		out = append(out, t)
	}
	return out, nil
}

// column is a table's column and its type as PostgreSQL prints it.
type column struct {
	name, typ string
}

// columns returns the table's primary key column, which must be one column of an integer
// type, and its other columns but the geometry, in table order.
func (d *reader) columns(ctx context.Context, t table) (column, []column, error) {
	rows, err := d.tx.Query(ctx, `
		SELECT a.attname::text, format_type(a.atttypid, a.atttypmod),
			EXISTS (SELECT 1 FROM pg_index i WHERE i.indrelid = a.attrelid AND i.indisprimary AND a.attnum = ANY (i.indkey))
		FROM pg_attribute a
		WHERE a.attrelid = format('%I.%I', $1::text, $2::text)::regclass AND a.attnum > 0 AND NOT a.attisdropped
		ORDER BY a.attnum`, t.schema, t.name)
	if err != nil {
		return column{}, nil, fmt.Errorf("columns: %w", err)
	}
	type attr struct {
		column
		pk bool
	}
	attrs, err := pgx.CollectRows(rows, func(row pgx.CollectableRow) (attr, error) {
		var a attr
		err := row.Scan(&a.name, &a.typ, &a.pk)
		return a, err
	})
	if err != nil {
		return column{}, nil, fmt.Errorf("columns: %w", err)
	}
	var pks, cols []column
	for _, a := range attrs {
		switch {
		case a.pk:
			pks = append(pks, a.column)
		case a.name == t.geom:
		default:
			cols = append(cols, a.column)
		}
	}
	if len(pks) != 1 || !integerType(pks[0].typ) {
		return column{}, nil, input.Errorf(ErrDatabase, "want a primary key of one integer column (the feature id, as ogr2ogr's ogc_fid), got %s", keyText(pks))
	}
	return pks[0], cols, nil
}

func integerType(typ string) bool {
	switch typ {
	case "smallint", "integer", "bigint":
		return true
	}
	return false
}

func keyText(pks []column) string {
	if len(pks) == 0 {
		return "none"
	}
	parts := make([]string, len(pks))
	for i, c := range pks {
		parts[i] = c.name + " " + c.typ
	}
	return strings.Join(parts, ", ")
}

// crsOf is the projection to WGS84 of an SRID, or why there is none.
type crsOf struct {
	proj orb.Projection
	err  error
}

func (d *reader) table(ctx context.Context, t table) {
	pk, cols, err := d.columns(ctx, t)
	if err != nil {
		d.fail(t.name, err)
		return
	}
	// The systems the table's rows use, looked up before its rows are read: a connection
	// runs one query at a time.
	srids := map[int32]crsOf{}
	sridRows, err := d.tx.Query(ctx, fmt.Sprintf("SELECT DISTINCT ST_SRID(%s) FROM %s WHERE %s IS NOT NULL ORDER BY 1",
		ident(t.geom), pgx.Identifier{t.schema, t.name}.Sanitize(), ident(t.geom)))
	if err != nil {
		d.fail(t.name, fmt.Errorf("query: %w", err))
		return
	}
	used, err := pgx.CollectRows(sridRows, pgx.RowTo[int32])
	if err != nil {
		d.fail(t.name, fmt.Errorf("query: %w", err))
		return
	}
	for _, srid := range used {
		c := d.projection(ctx, srid)
		srids[srid] = c
		if c.err != nil {
			d.fail(t.name, c.err)
		}
	}
	var sel strings.Builder
	fmt.Fprintf(&sel, "SELECT %s::bigint, ST_AsBinary(%s), ST_SRID(%s)", ident(pk.name), ident(t.geom), ident(t.geom))
	for _, c := range cols {
		sel.WriteString(", " + ident(c.name))
	}
	fmt.Fprintf(&sel, " FROM %s ORDER BY %s", pgx.Identifier{t.schema, t.name}.Sanitize(), ident(pk.name))
	rows, err := d.tx.Query(ctx, sel.String())
	if err != nil {
		d.fail(t.name, fmt.Errorf("query: %w", err))
		return
	}
	defer rows.Close()
	kind := geo.TableKind(t.name)
	for n := 0; rows.Next(); n++ {
		if n%rowCheckEvery == 0 && d.r.Err() != nil {
			return
		}
		vals, err := rows.Values()
		if err != nil {
			d.fail(t.name, fmt.Errorf("row %d: %w", n+1, err))
			return
		}
		fid, _ := vals[0].(int64)
		row := geo.Row{Source: geo.Source{File: d.name, Table: t.name, FID: fid}, Kind: kind, Props: make(map[string]any, len(cols))}
		for i, c := range cols {
			row.Props[c.name] = property(vals[3+i], c.typ)
		}
		if wkb, ok := vals[1].([]byte); ok {
			srid, _ := vals[2].(int32)
			c, seen := srids[srid]
			if !seen { // not met in the look-up: the transaction's one snapshot rules it out
				c.err = fmt.Errorf("%w: SRID %d appeared while the table was read", geo.ErrCRS, srid)
				srids[srid] = c
				d.fail(t.name, c.err)
			}
			row.Unprojected = c.err != nil
			row.Geometry, row.GeometryErr = geo.DecodeWKB(wkb, c.proj)
		}
		d.r.Row(row)
	}
	if err := rows.Err(); err != nil {
		d.fail(t.name, fmt.Errorf("query: %w", err))
	}
}

// projection looks the SRID up in spatial_ref_sys for its authority and code.
func (d *reader) projection(ctx context.Context, srid int32) crsOf {
	if srid == 0 {
		return crsOf{err: fmt.Errorf("%w: SRID 0 (none set); set the geometry column's SRID (EPSG:4326 for longitude/latitude)", geo.ErrCRS)}
	}
	var auth *string
	var code *int32
	err := d.tx.QueryRow(ctx, `SELECT auth_name::text, auth_srid FROM spatial_ref_sys WHERE srid = $1`, srid).Scan(&auth, &code)
	if errors.Is(err, pgx.ErrNoRows) || err == nil && (auth == nil || code == nil) {
		return crsOf{err: fmt.Errorf("%w: SRID %d has no authority and code in spatial_ref_sys", geo.ErrCRS, srid)}
	}
	if err != nil {
		return crsOf{err: fmt.Errorf("SRID %d: %w", srid, err)}
	}
	proj, err := geo.TableProjection(*auth, int64(*code))
	if err != nil {
		return crsOf{err: fmt.Errorf("SRID %d: %w", srid, err)}
	}
	return crsOf{proj: proj}
}

func ident(name string) string { return pgx.Identifier{name}.Sanitize() }

// property is a column value as a GeoJSON property's: integers and floating-point numbers
// (numeric too) as numbers, booleans, text, NULL as nil (absent); any other type is named.
func property(v any, typ string) any {
	switch t := v.(type) {
	case nil:
		return nil
	case string:
		return t
	case bool:
		return t
	case int16:
		return geo.Int(int64(t))
	case int32:
		return geo.Int(int64(t))
	case int64:
		return geo.Int(t)
	case float32:
		return geo.Float(float64(t), 32)
	case float64:
		return geo.Float(t, 64)
	case pgtype.Numeric:
		if t.Valid && !t.NaN && t.InfinityModifier == pgtype.Finite {
			if b, err := t.MarshalJSON(); err == nil {
				return json.Number(b)
			}
		}
	}
	return geo.Value{Type: typ}
}
