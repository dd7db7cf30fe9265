package gpkg

import (
	"context"
	"database/sql"
	"encoding/binary"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/encoding/wkb"

	"spanwright/geo"
	"spanwright/geo/crs"
	"spanwright/geo/gpkgout"
	"spanwright/geo/input"
)

const demo = "../../testdata/demo/campus.geojson"

// needTool returns the path of a GDAL program, skipping the test without it (failing it when
// CI=true: .ci/run installs gdal-bin).
func needTool(t *testing.T, name string) string {
	t.Helper()
	p, err := exec.LookPath(name)
	if err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatalf("%s not found; CI installs gdal-bin", name)
		}
		t.Skipf("%s not found (apt-get install gdal-bin); skipping", name)
	}
	return p
}

func run(t *testing.T, name string, args ...string) {
	t.Helper()
	if out, err := exec.Command(name, args...).CombinedOutput(); err != nil {
		t.Fatalf("%s %s: %v\n%s", name, strings.Join(args, " "), err, out)
	}
}

func read(t *testing.T, path string) (*geo.Campus, error) {
	t.Helper()
	r := geo.NewReader(context.Background())
	Read(context.Background(), r, path, 0)
	return r.Campus()
}

// placeless is c without where each feature was read from, to compare campuses read from
// different sources.
func placeless(c *geo.Campus) *geo.Campus {
	d := *c
	d.Files = nil
	d.Buildings = append([]geo.Building(nil), c.Buildings...)
	d.Pathways = append([]geo.Pathway(nil), c.Pathways...)
	d.Structures = append([]geo.Structure(nil), c.Structures...)
	d.Entrances = append([]geo.Entrance(nil), c.Entrances...)
	for i := range d.Buildings {
		d.Buildings[i].Source = geo.Source{}
	}
	for i := range d.Pathways {
		d.Pathways[i].Source = geo.Source{}
	}
	for i := range d.Structures {
		d.Structures[i].Source = geo.Source{}
	}
	for i := range d.Entrances {
		d.Entrances[i].Source = geo.Source{}
	}
	return &d
}

// kindTables converts the demo campus into a GeoPackage with one table per kind, named by
// kind (TableBuildings …), without a kind column: GDAL's ogr2ogr (gdal-bin) writes it.
func kindTables(t *testing.T, ogr2ogr, out string) {
	t.Helper()
	fields := map[string]string{
		geo.TableBuildings:  "id, name, role, riser_m, transit",
		geo.TablePathways:   `id, type, status, spare_ducts, duct_mm, emi, surface, "group"`,
		geo.TableStructures: "id, type",
		geo.TableEntrances:  "id, building",
	}
	kinds := []string{geo.TableBuildings, geo.TablePathways, geo.TableStructures, geo.TableEntrances}
	for i, table := range kinds {
		args := []string{"-f", "GPKG", out, demo, "-nln", table, "-dialect", "SQLite",
			"-sql", "SELECT geometry, " + fields[table] + " FROM campus WHERE kind = '" + geo.TableKind(table) + "'"}
		if i > 0 {
			args = append([]string{"-update"}, args...)
		}
		run(t, ogr2ogr, args...)
	}
}

// TestDemoAsGeoPackage converts the demo campus with GDAL's ogr2ogr (gdal-bin, the reference
// GeoPackage writer) into both layouts — one table with a kind column, and one table per kind
// — and checks each reads as the same campus as the GeoJSON: the same features in the same
// order with the same properties and coordinates, only their sources differ.
func TestDemoAsGeoPackage(t *testing.T) {
	t.Parallel()
	ogr2ogr := needTool(t, "ogr2ogr")
	want, err := geo.Load([]string{demo})
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	one := filepath.Join(dir, "campus.gpkg")
	run(t, ogr2ogr, "-f", "GPKG", one, demo)
	byKind := filepath.Join(dir, "by-kind.gpkg")
	kindTables(t, ogr2ogr, byKind)
	for _, path := range []string{one, byKind} {
		t.Run(filepath.Base(path), func(t *testing.T) {
			before, _ := os.ReadFile(path)
			st, _ := os.Stat(path)
			got, err := read(t, path)
			if err != nil {
				t.Fatal(err)
			}
			if !reflect.DeepEqual(got.Files, []string{path}) {
				t.Errorf("Files %v, want [%s]", got.Files, path)
			}
			if !reflect.DeepEqual(placeless(got), placeless(want)) {
				t.Errorf("the campus read from %s differs from the GeoJSON's", path)
			}
			// Sources name the table and the fid (ogr2ogr numbers features from 1).
			b := got.Buildings[0]
			if b.File != path || b.Table == "" || b.FID < 1 {
				t.Errorf("building %s: source %+v, want the file, a table and a fid", b.ID, b.Source)
			}
			// Inputs are never touched: OGC GeoPackage read-only, SQLite mode=ro.
			after, _ := os.ReadFile(path)
			st2, _ := os.Stat(path)
			if string(before) != string(after) || !st.ModTime().Equal(st2.ModTime()) {
				t.Errorf("reading changed %s", path)
			}
			if _, err := os.Stat(path + "-journal"); err == nil {
				t.Errorf("reading left a journal beside %s", path)
			}
			// The connection Read opens refuses to write (SQLite URI mode=ro, PRAGMA query_only).
			uri, err := dsn(path, false)
			if err != nil {
				t.Fatal(err)
			}
			db, err := sql.Open("sqlite", uri)
			if err != nil {
				t.Fatal(err)
			}
			defer db.Close()
			if _, err := db.Exec("CREATE TABLE written (x INTEGER)"); err == nil {
				t.Errorf("a connection of Read could write to %s", path)
			}
		})
	}
}

// TestProjected reprojects the demo to UTM zone 30N (EPSG:32630) with ogr2ogr: a build with
// PROJ reads it back within 1e-7 degrees (about 1 cm) of the GeoJSON; a build without reports
// one problem naming the table, its srs and what to install.
func TestProjected(t *testing.T) {
	t.Parallel()
	ogr2ogr := needTool(t, "ogr2ogr")
	path := filepath.Join(t.TempDir(), "utm.gpkg")
	run(t, ogr2ogr, "-f", "GPKG", "-t_srs", "EPSG:32630", path, demo)
	got, err := read(t, path)
	if _, perr := crs.ToWGS84(32630); errors.Is(perr, crs.ErrNoPROJ) {
		var ps *input.Problems
		if !errors.As(err, &ps) || ps.Len() != 1 {
			t.Fatalf("got %v, want one problem", err)
		}
		msg := ps.List[0].Error()
		if !strings.HasPrefix(msg, path+": table campus: srs_id 32630 (") || !errors.Is(err, crs.ErrNoPROJ) ||
			!errors.Is(err, geo.ErrCRS) || !strings.Contains(msg, "libproj-dev") {
			t.Errorf("got %q", msg)
		}
		return
	}
	if err != nil {
		t.Fatal(err)
	}
	want, _ := geo.Load([]string{demo})
	if len(got.Buildings) != len(want.Buildings) || len(got.Pathways) != len(want.Pathways) {
		t.Fatalf("got %d buildings, %d pathways, want %d, %d", len(got.Buildings), len(got.Pathways), len(want.Buildings), len(want.Pathways))
	}
	for i, p := range got.Pathways {
		w := want.Pathways[i]
		for j, l := range p.Lines {
			for k, pt := range l {
				q := w.Lines[j][k]
				if d := max(abs(pt[0]-q[0]), abs(pt[1]-q[1])); d > 1e-7 {
					t.Fatalf("pathway %s point %d: %v, want %v", p.ID, k, pt, q)
				}
			}
		}
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// gp is a GeoPackage geometry blob: the binary header of OGC GeoPackage 1.3 §2.1.3.1.1
// (magic "GP", version 0, flags with little-endian byte order and no envelope, srs_id) then
// the geometry's WKB.
func gp(srsID int32, g orb.Geometry) []byte {
	b := []byte{'G', 'P', 0, 1}
	b = binary.LittleEndian.AppendUint32(b, uint32(srsID))
	return append(b, wkb.MustMarshal(g)...)
}

// gpEnvelope is gp with the big-endian header and an [minx, maxx, miny, maxy] envelope
// (envelope contents indicator 1).
func gpEnvelope(srsID int32, g orb.Geometry) []byte {
	b := []byte{'G', 'P', 0, 1 << 1}
	b = binary.BigEndian.AppendUint32(b, uint32(srsID))
	bound := g.Bound()
	for _, x := range []float64{bound.Min[0], bound.Max[0], bound.Min[1], bound.Max[1]} {
		b = binary.BigEndian.AppendUint64(b, math.Float64bits(x))
	}
	return append(b, wkb.MustMarshal(g, binary.BigEndian)...)
}

// The tables every GeoPackage has (OGC GeoPackage 1.3 §1.1.2.1.1, §1.1.3.1.1, §2.1.5.1.1)
// and its application id, "GPKG" (§1.1.1.1.1); srs 4326 is EPSG's WGS 84, 990001 a system
// of another organization.
const gpkgDDL = `
PRAGMA application_id = 1196444487;
PRAGMA user_version = 10300;
CREATE TABLE gpkg_spatial_ref_sys (srs_name TEXT NOT NULL, srs_id INTEGER PRIMARY KEY, organization TEXT NOT NULL,
	organization_coordsys_id INTEGER NOT NULL, definition TEXT NOT NULL, description TEXT);
INSERT INTO gpkg_spatial_ref_sys VALUES ('Undefined cartesian SRS', -1, 'NONE', -1, 'undefined', NULL),
	('Undefined geographic SRS', 0, 'NONE', 0, 'undefined', NULL),
	('WGS 84 geodetic', 4326, 'EPSG', 4326, 'GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563]],PRIMEM["Greenwich",0],UNIT["degree",0.0174532925199433]]', NULL),
	('Local grid', 990001, 'LOCAL', 1, 'undefined', NULL);
CREATE TABLE gpkg_contents (table_name TEXT NOT NULL PRIMARY KEY, data_type TEXT NOT NULL, identifier TEXT UNIQUE,
	description TEXT DEFAULT '', last_change DATETIME NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ','now')),
	min_x DOUBLE, min_y DOUBLE, max_x DOUBLE, max_y DOUBLE, srs_id INTEGER);
CREATE TABLE gpkg_geometry_columns (table_name TEXT NOT NULL, column_name TEXT NOT NULL, geometry_type_name TEXT NOT NULL,
	srs_id INTEGER NOT NULL, z TINYINT NOT NULL, m TINYINT NOT NULL, PRIMARY KEY (table_name, column_name));
`

// featureTable adds a feature table with a fid, a geometry column and the given columns.
func featureTable(t *testing.T, db *sql.DB, name, geomType string, srsID int, cols string) {
	t.Helper()
	for _, q := range []string{
		`CREATE TABLE "` + name + `" (fid INTEGER PRIMARY KEY AUTOINCREMENT, geom ` + geomType + `, ` + cols + `)`,
		`INSERT INTO gpkg_contents (table_name, data_type, identifier, srs_id) VALUES ('` + name + `', 'features', '` + name + `', ` + strconv.Itoa(srsID) + `)`,
		`INSERT INTO gpkg_geometry_columns VALUES ('` + name + `', 'geom', '` + geomType + `', ` + strconv.Itoa(srsID) + `, 0, 0)`,
	} {
		if _, err := db.Exec(q); err != nil {
			t.Fatalf("%s: %v", q, err)
		}
	}
}

// openRW opens the SQLite file at path to write, by its URI (gpkgout.URI).
func openRW(t *testing.T, path string) *sql.DB {
	t.Helper()
	uri, err := gpkgout.URI(path, "")
	if err != nil {
		t.Fatal(err)
	}
	db, err := sql.Open("sqlite", uri)
	if err != nil {
		t.Fatal(err)
	}
	return db
}

func square(x, y, d float64) orb.Polygon {
	return orb.Polygon{{{x, y}, {x + d, y}, {x + d, y + d}, {x, y + d}, {x, y}}}
}

// brokenGeoPackage writes by hand, through SQLite, a GeoPackage with a problem in almost
// every row, in both layouts.
func brokenGeoPackage(t *testing.T, path string) {
	t.Helper()
	db := openRW(t, path)
	defer db.Close()
	if _, err := db.Exec(gpkgDDL); err != nil {
		t.Fatal(err)
	}
	featureTable(t, db, "buildings", "POLYGON", 4326, "id TEXT, role TEXT, riser_m REAL, transit BOOLEAN")
	featureTable(t, db, "pathways", "LINESTRING", 4326, `id TEXT, type TEXT, spare_ducts MEDIUMINT, duct_mm REAL, kind TEXT`)
	featureTable(t, db, "entrances", "POINT", 4326, "id TEXT, building TEXT")
	featureTable(t, db, "site", "GEOMETRY", 4326, "kind TEXT, id TEXT, type TEXT")
	featureTable(t, db, "local", "POINT", 990001, "id TEXT, kind TEXT")
	ins := func(q string, args ...any) {
		t.Helper()
		if _, err := db.Exec(q, args...); err != nil {
			t.Fatalf("%s: %v", q, err)
		}
	}
	ins(`INSERT INTO buildings VALUES (1, ?, 'B-1', 'mc', 15, 1)`, gp(4326, square(10, 50, 0.001)))
	ins(`INSERT INTO buildings VALUES (2, ?, 'B-2', 'hub', -3, 2)`, gpEnvelope(4326, square(10.01, 50, 0.001)))
	ins(`INSERT INTO buildings VALUES (3, ?, 'B-3', NULL, 'tall', NULL)`, gp(4326, orb.LineString{{10, 50}, {10.1, 50}}))
	ins(`INSERT INTO buildings VALUES (4, ?, NULL, NULL, NULL, NULL)`, gp(4326, square(10.02, 50, 0.001)))
	ins(`INSERT INTO pathways VALUES (7, ?, 'P-1', 'conduit', 1, 100, NULL)`, gp(4326, orb.LineString{{10, 50}, {10.01, 50}}))
	ins(`INSERT INTO pathways VALUES (8, ?, 'B-1', 'duct', 1.5, 0, NULL)`, gp(4326, orb.LineString{{10, 50}, {10.01, 50.001}}))
	ins(`INSERT INTO pathways VALUES (9, ?, 'P-3', 'duct', 1, 100, 'building')`, gp(4326, orb.LineString{{10, 50}, {10.02, 50}}))
	ins(`INSERT INTO pathways VALUES (10, ?, 'P-4', 'duct', 1, 100, NULL)`, gp(4326, orb.LineString{{10, 50}, {10, 95.5}}))
	ins(`INSERT INTO pathways VALUES (11, ?, 'P-5', 'duct', 1, 100, NULL)`, []byte("not a geometry"))
	ins(`INSERT INTO pathways VALUES (12, ?, 'P-6', 'duct', 1, 100, NULL)`, gp(3857, orb.LineString{{10, 50}, {10.03, 50}}))
	ins(`INSERT INTO pathways VALUES (13, NULL, 'P-7', 'duct', 1, 100, NULL)`)
	ins(`INSERT INTO entrances VALUES (1, ?, 'E-1', 'B-9')`, gp(4326, orb.Point{10, 50}))
	ins(`INSERT INTO site VALUES (1, ?, 'tree', 'T-1', NULL)`, gp(4326, orb.Point{10, 50}))
	ins(`INSERT INTO site VALUES (2, ?, 'structure', 'MH-1', 'vault')`, gp(4326, orb.Point{10.01, 50}))
	ins(`INSERT INTO site VALUES (3, ?, NULL, 'MH-2', 'handhole')`, gp(4326, orb.Point{10.02, 50}))
	ins(`INSERT INTO local VALUES (1, ?, 'L-1', 'structure')`, gp(990001, orb.Point{3, 4}))
}

// TestBrokenGeoPackage checks that a hand-made GeoPackage, which GDAL's ogrinfo (gdal-bin)
// opens as one, reports every problem at once, each naming the file, the table and the fid
// (or the table alone for a problem of the table), the property and what was expected.
func TestBrokenGeoPackage(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "broken.gpkg")
	brokenGeoPackage(t, path)
	if bin, err := exec.LookPath("ogrinfo"); err == nil {
		out, err := exec.Command(bin, "-ro", "-q", path).CombinedOutput()
		if err != nil || !strings.Contains(string(out), "pathways (Line String)") {
			t.Errorf("ogrinfo does not read the hand-made GeoPackage: %v\n%s", err, out)
		}
	} else if os.Getenv("CI") == "true" {
		t.Fatal("ogrinfo not found; CI installs gdal-bin")
	}
	_, err := read(t, path)
	var ps *input.Problems
	if !errors.As(err, &ps) {
		t.Fatalf("got %v, want problems", err)
	}
	got := strings.Split(ps.Error(), "\n")
	p := path + ": "
	want := []string{
		p + `table buildings fid 2 (id "B-2"): property "role": want one of "mc", "ic", got string "hub"`,
		p + `table buildings fid 2 (id "B-2"): property "riser_m": want metres from 0 to 1000, got -3`,
		p + `table buildings fid 2 (id "B-2"): property "transit": want true or false (or 1 or 0), got 2`,
		p + `table buildings fid 3 (id "B-3"): geometry: want Polygon or MultiPolygon for a building, got LineString`,
		p + `table buildings fid 3 (id "B-3"): property "riser_m": want metres from 0 to 1000, got string "tall"`,
		p + `table buildings fid 4 (no id): property "id": missing; every building needs a unique id`,
		p + `table entrances fid 1 (id "E-1"): property "building": want the id of a building, got "B-9", which no feature has`,
		p + `table local: srs_id 990001 (Local grid): unusable coordinate reference system: LOCAL:1 is not an EPSG system; assign or transform it to one (EPSG:4326 for longitude/latitude)`,
		p + `table pathways fid 7 (id "P-1"): property "type": want one of "duct", "tunnel", "aerial", "buried", "tray", got string "conduit"; did you mean "duct"? ("conduit" is the trade's other word for it)`,
		p + `table pathways fid 8 (id "B-1"): property "id": duplicate id "B-1": first used by ` + path + ` table buildings fid 1`,
		p + `table pathways fid 8 (id "B-1"): property "spare_ducts": want an integer from 0 to 1000000, got 1.5`,
		p + `table pathways fid 8 (id "B-1"): property "duct_mm": want millimetres above 0 and at most 1000, got 0`,
		p + `table pathways fid 9 (id "P-3"): property "kind": want "pathway" in table pathways, which holds pathways (or no kind), got "building"`,
		p + `table pathways fid 10 (id "P-4"): geometry: latitude 95.5 outside [-90, 90] (are longitude and latitude swapped? GeoJSON and GeoPackage put longitude first)`,
		p + `table pathways fid 11 (id "P-5"): geometry: not a GeoPackage geometry: magic "no", want "GP"`,
		p + `table pathways fid 12 (id "P-6"): geometry: srs_id 3857 in the geometry's header, but the table's column is in srs_id 4326`,
		p + `table pathways fid 13 (id "P-7"): geometry: missing (null or absent)`,
		p + `table site fid 1 (id "T-1"): property "kind": want one of "building", "pathway", "structure", "entrance", got string "tree"`,
		p + `table site fid 2 (id "MH-1"): property "type": want one of "maintenance-hole", "handhole", "pull-box", got string "vault"; a vault large enough for a person to enter is a "maintenance-hole", a smaller one a "handhole"`,
	}
	if len(got) != len(want) {
		t.Errorf("got %d problems, want %d:\n%s", len(got), len(want), ps.Error())
	}
	for _, w := range want {
		found := false
		for _, g := range got {
			found = found || g == w
		}
		if !found {
			t.Errorf("no problem\n  %s\namong\n  %s", w, strings.Join(got, "\n  "))
		}
	}
}

// TestNotGeoPackage checks the messages for files that are not GeoPackages.
func TestNotGeoPackage(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	text := filepath.Join(dir, "text.gpkg")
	os.WriteFile(text, []byte("just some text, not SQLite at all, long enough to fill a header page"), 0o644)
	plain := filepath.Join(dir, "plain.gpkg")
	db := openRW(t, plain)
	if _, err := db.Exec("CREATE TABLE t (x INTEGER)"); err != nil {
		t.Fatal(err)
	}
	db.Close()
	for _, tc := range []struct{ path, want string }{
		{text, text + ": not a GeoPackage (not an SQLite database: "},
		{plain, plain + ": not a GeoPackage: an SQLite database without the tables gpkg_contents"},
		{dir, dir + ": read: not a regular file but a folder"},
		{filepath.Join(dir, "absent.gpkg"), filepath.Join(dir, "absent.gpkg") + ": read: no such file or directory"},
	} {
		_, err := read(t, tc.path)
		if err == nil || !strings.HasPrefix(err.Error(), tc.want) {
			t.Errorf("%s: got %v, want %q…", tc.path, err, tc.want)
		}
	}
	_, err := read(t, text)
	if !errors.Is(err, ErrNotGeoPackage) {
		t.Errorf("got %v, want ErrNotGeoPackage", err)
	}
}

// TestStops checks that the reading gives up when its context is done.
func TestStops(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "broken.gpkg")
	brokenGeoPackage(t, path)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	r := geo.NewReader(ctx)
	Read(ctx, r, path, 0)
	if _, err := r.Campus(); !errors.Is(err, context.Canceled) {
		t.Errorf("got %v, want context.Canceled", err)
	}
}

// TestWALLeftAlone reads a GeoPackage in WAL mode (SQLite "Write-Ahead Logging"): it reads
// as the same campus, and the reading creates no -wal or -shm file beside it.
func TestWALLeftAlone(t *testing.T) {
	t.Parallel()
	ogr2ogr := needTool(t, "ogr2ogr")
	dir := t.TempDir()
	path := filepath.Join(dir, "campus.gpkg")
	run(t, ogr2ogr, "-f", "GPKG", path, demo)
	db := openRW(t, path)
	var mode string
	if err := db.QueryRow("PRAGMA journal_mode = WAL").Scan(&mode); err != nil || mode != "wal" {
		t.Fatalf("journal_mode %q, %v", mode, err)
	}
	db.Close()
	names := func() []string {
		es, _ := os.ReadDir(dir)
		var out []string
		for _, e := range es {
			out = append(out, e.Name())
		}
		return out
	}
	before := names()
	got, err := read(t, path)
	if err != nil {
		t.Fatal(err)
	}
	if after := names(); !reflect.DeepEqual(after, before) {
		t.Errorf("the folder held %v before the reading, %v after", before, after)
	}
	want, _ := geo.Load([]string{demo})
	if !reflect.DeepEqual(placeless(got), placeless(want)) {
		t.Error("the campus read from the WAL GeoPackage differs from the GeoJSON's")
	}
}

// TestWithGeoJSON reads one campus from a GeoJSON file without the demo's entrances and a
// GeoPackage holding them alone (table entrances, by ogr2ogr): the entrances name buildings
// of the other source, and the campus is the demo's. A GeoPackage named twice is refused once.
func TestWithGeoJSON(t *testing.T) {
	t.Parallel()
	ogr2ogr := needTool(t, "ogr2ogr")
	dir := t.TempDir()
	data, err := os.ReadFile(demo)
	if err != nil {
		t.Fatal(err)
	}
	var fc struct {
		Type     string           `json:"type"`
		Features []map[string]any `json:"features"`
	}
	if err := json.Unmarshal(data, &fc); err != nil {
		t.Fatal(err)
	}
	var rest []map[string]any
	for _, f := range fc.Features {
		if f["properties"].(map[string]any)["kind"] != geo.KindEntrance {
			rest = append(rest, f)
		}
	}
	if len(rest) == len(fc.Features) {
		t.Fatal("the demo has no entrances")
	}
	fc.Features = rest
	noEntrances := filepath.Join(dir, "rest.geojson")
	out, _ := json.Marshal(fc)
	if err := os.WriteFile(noEntrances, out, 0o644); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, "entrances.gpkg")
	run(t, ogr2ogr, "-f", "GPKG", path, demo, "-nln", geo.TableEntrances, "-where", "kind = 'entrance'")

	r := geo.NewReader(context.Background())
	r.ReadFile(noEntrances, 0)
	Read(context.Background(), r, path, 0)
	got, err := r.Campus()
	if err != nil {
		t.Fatal(err)
	}
	want, _ := geo.Load([]string{demo})
	if !reflect.DeepEqual(placeless(got), placeless(want)) {
		t.Error("the campus read from GeoJSON and a GeoPackage differs from the demo's")
	}
	if !reflect.DeepEqual(got.Files, []string{noEntrances, path}) {
		t.Errorf("Files %v", got.Files)
	}

	r = geo.NewReader(context.Background())
	Read(context.Background(), r, path, 0)
	Read(context.Background(), r, filepath.Join(dir, ".", "entrances.gpkg"), 0)
	_, err = r.Campus()
	var ps *input.Problems
	if !errors.As(err, &ps) || ps.Len() < 1 || !strings.Contains(ps.List[0].Error(), "the same file as "+path+", given twice") {
		t.Errorf("got %v, want the file refused as given twice", err)
	}
}

// TestFolderNames reads the demo's GeoPackage from folders whose names hold what an SQLite
// URI reads otherwise ('#' a fragment, '?' a query, '%41' an escaped "A", a space: SQLite,
// "URI Filenames" §3.1), in rollback-journal mode and in WAL mode (opened immutable), and by
// a path relative to the working folder: each reads as the demo campus, and nothing is
// created beside the file or where a cut path would point.
func TestFolderNames(t *testing.T) {
	ogr2ogr := needTool(t, "ogr2ogr")
	src := filepath.Join(t.TempDir(), "campus.gpkg")
	run(t, ogr2ogr, "-f", "GPKG", src, demo)
	srcBytes, err := os.ReadFile(src)
	if err != nil {
		t.Fatal(err)
	}
	want, _ := geo.Load([]string{demo})
	// The cases' names are plain, so that the test's own temporary folders hold none of these.
	for _, tc := range []struct{ name, folder string }{
		{"hash", "x#1"}, {"question mark", "what?now"}, {"percent", "a%41b"}, {"space", "two words"},
		{"all", "#?%41 all"},
	} {
		for _, wal := range []bool{false, true} {
			t.Run(fmt.Sprintf("%s wal %v", tc.name, wal), func(t *testing.T) {
				top := t.TempDir()
				dir := filepath.Join(top, tc.folder)
				if err := os.Mkdir(dir, 0o755); err != nil {
					t.Fatal(err)
				}
				path := filepath.Join(dir, "campus.gpkg")
				if err := os.WriteFile(path, srcBytes, 0o644); err != nil {
					t.Fatal(err)
				}
				if wal {
					db := openRW(t, path)
					var mode string
					if err := db.QueryRow("PRAGMA journal_mode = WAL").Scan(&mode); err != nil || mode != "wal" {
						t.Fatalf("journal_mode %q, %v", mode, err)
					}
					db.Close()
					if !settled(path) {
						t.Fatal("the WAL GeoPackage is not settled")
					}
				}
				got, err := read(t, path)
				if err != nil {
					t.Fatal(err)
				}
				if !reflect.DeepEqual(placeless(got), placeless(want)) {
					t.Error("the campus read differs from the GeoJSON's")
				}
				for d, n := range map[string]int{top: 1, dir: 1} {
					if ents, _ := os.ReadDir(d); len(ents) != n {
						t.Errorf("%s holds %v after the reading; want %d", d, ents, n)
					}
				}
			})
		}
	}
	t.Run("relative", func(t *testing.T) {
		dir := filepath.Join(t.TempDir(), "x#1")
		if err := os.Mkdir(dir, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, "campus.gpkg"), srcBytes, 0o644); err != nil {
			t.Fatal(err)
		}
		t.Chdir(filepath.Dir(dir))
		got, err := read(t, filepath.Join("x#1", "campus.gpkg"))
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(placeless(got), placeless(want)) {
			t.Error("the campus read differs from the GeoJSON's")
		}
	})
}
