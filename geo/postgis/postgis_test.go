package postgis

import (
	"context"
	"errors"
	"os/exec"
	"reflect"
	"strings"
	"testing"

	"github.com/jackc/pgx/v5"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/internal/pgtest"
)

const demo = "../../testdata/demo/campus.geojson"

func read(ctx context.Context, conn string) (*geo.Campus, error) {
	r := geo.NewReader(ctx)
	Read(ctx, r, conn)
	return r.Campus()
}

func exec1(t *testing.T, ctx context.Context, conn *pgx.Conn, sql string, args ...any) {
	t.Helper()
	if _, err := conn.Exec(ctx, sql, args...); err != nil {
		t.Fatalf("%s: %v", sql, err)
	}
}

// TestPostGIS runs a throwaway PostgreSQL 15 with PostGIS 3 (Debian postgresql-15,
// postgresql-15-postgis-3): the demo campus loaded by GDAL's ogr2ogr (gdal-bin) reads as the
// same campus as the GeoJSON; hand-made tables in another schema report every problem with
// the table and the fid; nothing is written.
func TestPostGIS(t *testing.T) {
	ogr2ogr := pgtest.Need(t, "ogr2ogr", "gdal-bin")
	srv := pgtest.Start(t)
	ctx := pgtest.Context(t)
	connString := srv.ConnString("postgres")
	conn, err := pgx.Connect(ctx, connString)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close(ctx)
	exec1(t, ctx, conn, "CREATE EXTENSION postgis")
	if out, err := exec.Command(ogr2ogr, "-f", "PostgreSQL", srv.PGSource("postgres"), demo).CombinedOutput(); err != nil {
		t.Fatalf("ogr2ogr: %v\n%s", err, out)
	}

	t.Run("demo", func(t *testing.T) {
		want, err := geo.Load([]string{demo})
		if err != nil {
			t.Fatal(err)
		}
		got, err := read(ctx, connString)
		if err != nil {
			t.Fatal(err)
		}
		if len(got.Files) != 0 {
			t.Errorf("Files %v, want none: a database is not a file", got.Files)
		}
		for i := range got.Buildings {
			if s := got.Buildings[i].Source; s.Table != "campus" || s.FID < 1 || strings.Contains(s.File, "password") {
				t.Fatalf("building %s: source %+v", got.Buildings[i].ID, s)
			}
			got.Buildings[i].Source, want.Buildings[i].Source = geo.Source{}, geo.Source{}
		}
		for i := range got.Pathways {
			got.Pathways[i].Source, want.Pathways[i].Source = geo.Source{}, geo.Source{}
		}
		for i := range got.Structures {
			got.Structures[i].Source, want.Structures[i].Source = geo.Source{}, geo.Source{}
		}
		for i := range got.Entrances {
			got.Entrances[i].Source, want.Entrances[i].Source = geo.Source{}, geo.Source{}
		}
		want.Files = nil
		if !reflect.DeepEqual(got, want) {
			t.Error("the campus read from PostGIS differs from the GeoJSON's")
		}
	})

	t.Run("broken", func(t *testing.T) {
		// OGC Simple Features for SQL tables by hand, in schema "broken"; SRID 990001 is a
		// system of another authority than EPSG.
		for _, q := range []string{
			`CREATE SCHEMA broken`,
			`INSERT INTO spatial_ref_sys (srid, auth_name, auth_srid, proj4text) VALUES (990001, 'LOCAL', 1, '+proj=longlat +datum=WGS84')`,
			`CREATE TABLE broken.buildings (gid serial PRIMARY KEY, id text, role text, riser_m numeric, transit boolean, built date, geom geometry(Polygon, 4326))`,
			`CREATE TABLE broken.pathways (gid bigserial PRIMARY KEY, id text, type text, duct_mm real, geom geometry(LineStringZ, 4326))`,
			`CREATE TABLE broken.local (gid integer PRIMARY KEY, id text, geom geometry(Point, 990001))`,
			`CREATE TABLE broken.nokey (id text, geom geometry(Point, 4326))`,
			`INSERT INTO broken.buildings VALUES (1, 'B-1', 'mc', 15, true, NULL, 'SRID=4326;POLYGON((10 50, 10.001 50, 10.001 50.001, 10 50.001, 10 50))')`,
			`INSERT INTO broken.buildings VALUES (2, 'B-2', 'hub', 1e4, NULL, '2020-01-01', 'SRID=4326;POLYGON((10.01 50, 10.011 50, 10.011 50.001, 10.01 50.001, 10.01 50))')`,
			`INSERT INTO broken.pathways VALUES (5, 'P-1', 'conduit', 100, 'SRID=4326;LINESTRING Z (10 50 3, 10.01 50 4)')`,
			`INSERT INTO broken.pathways VALUES (6, 'P-2', 'duct', 0, 'SRID=4326;LINESTRING Z (10 50 3, 10 50 4)')`,
			`INSERT INTO broken.local VALUES (1, 'L-1', 'SRID=990001;POINT(3 4)')`,
		} {
			exec1(t, ctx, conn, q)
		}
		var before int64
		if err := conn.QueryRow(ctx, `SELECT pg_current_wal_lsn() - '0/0'`).Scan(&before); err != nil {
			t.Fatal(err)
		}
		broken := connString + " options='-c search_path=broken,public'"
		_, err := read(ctx, broken)
		var ps *input.Problems
		if !errors.As(err, &ps) {
			t.Fatalf("got %v, want problems", err)
		}
		name := `database "postgres" (user "spanwright" on ` + srv.Socket + `:5432): `
		want := []string{
			name + `table buildings fid 2 (id "B-2"): property "role": want one of "mc", "ic", got string "hub"`,
			name + `table buildings fid 2 (id "B-2"): property "riser_m": want metres from 0 to 1000, got 10000`,
			name + `table local: SRID 990001: unusable coordinate reference system: LOCAL:1 is not an EPSG system; assign or transform it to one (EPSG:4326 for longitude/latitude)`,
			name + `table nokey: want a primary key of one integer column (the feature id, as ogr2ogr's ogc_fid), got none`,
			name + `table pathways fid 5 (id "P-1"): property "type": want one of "duct", "tunnel", "aerial", "buried", "tray", got string "conduit"; did you mean "duct"? ("conduit" is the trade's other word for it)`,
			name + `table pathways fid 6 (id "P-2"): geometry: want a line of at least two distinct positions, got 2 position(s), 1 distinct`,
			name + `table pathways fid 6 (id "P-2"): property "duct_mm": want millimetres above 0 and at most 1000, got 0`,
		}
		got := strings.Split(ps.Error(), "\n")
		if !reflect.DeepEqual(got, want) {
			t.Errorf("got\n  %s\nwant\n  %s", strings.Join(got, "\n  "), strings.Join(want, "\n  "))
		}
		// Read-only: the reading wrote no WAL record (PostgreSQL 15 manual §9.27.3,
		// pg_current_wal_lsn).
		var after int64
		if err := conn.QueryRow(ctx, `SELECT pg_current_wal_lsn() - '0/0'`).Scan(&after); err != nil {
			t.Fatal(err)
		}
		if after != before {
			t.Errorf("the WAL moved from %d to %d while the campus was read", before, after)
		}
	})

	t.Run("no postgis tables", func(t *testing.T) {
		exec1(t, ctx, conn, `CREATE SCHEMA empty`)
		_, err := read(ctx, connString+" options='-c search_path=empty,public'")
		if err == nil || !strings.Contains(err.Error(), "no table with a geometry column in the current schema") || !errors.Is(err, ErrDatabase) {
			t.Errorf("got %v", err)
		}
	})
}

// TestNoPassword checks that no message names the password, whether the string does not
// parse or the server cannot be reached.
func TestNoPassword(t *testing.T) {
	t.Parallel()
	const pw = "s3cret-Pa55"
	ctx := context.Background()
	for _, conn := range []string{
		"postgresql://campus:" + pw + "@/nowhere?host=/nonexistent-socket-folder&sslmode=disable",
		"host=/nonexistent-socket-folder user=campus password=" + pw + " dbname=campus sslmode=disable",
		"postgresql://campus:" + pw + "@[bad/campus",
		"host='unterminated password=" + pw,
	} {
		_, err := read(ctx, conn)
		if err == nil || !errors.Is(err, ErrDatabase) {
			t.Errorf("%q: got %v, want ErrDatabase", conn, err)
			continue
		}
		if strings.Contains(err.Error(), pw) {
			t.Errorf("the message shows the password: %v", err)
		}
		if n := Name(conn); strings.Contains(n, pw) {
			t.Errorf("Name shows the password: %s", n)
		}
	}
}
