package gpkgout

import (
	"bytes"
	"context"
	"encoding/binary"
	"io"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/paulmach/orb"

	"spanwright/geo/ctxtest"
)

// sample is two small layers with every column type, nulls, and a feature without geometry.
func sample() []Layer {
	return []Layer{
		{Name: "lines", Description: "two lines", Geometry: LineString,
			Columns: []Column{{Name: "name", Type: Text}, {Name: "length_m", Type: Real}, {Name: "cables", Type: Integer}, {Name: "ok", Type: Boolean}},
			Features: []Feature{
				{Geometry: orb.LineString{{-3.73, 52.35}, {-3.72, 52.36}}, Values: []any{"a|b", 12.5, 3, true}},
				{Geometry: orb.LineString{{-3.74, 52.34}, {-3.73, 52.35}, {-3.7, 52.3}}, Values: []any{"ü \"quoted\"", nil, int64(0), false}},
				{Geometry: nil, Values: []any{"no line", 0.0, nil, nil}},
			}},
		{Name: "points", Geometry: Point, Columns: []Column{{Name: "id", Type: Text}},
			Features: []Feature{{Geometry: orb.Point{-3.7285293, 52.352}, Values: []any{"P-1"}}}},
		{Name: "areas", Geometry: MultiPolygon, Columns: []Column{{Name: "id", Type: Text}},
			Features: []Feature{{Geometry: orb.MultiPolygon{{{{0, 0}, {1, 0}, {1, 1}, {0, 0}}}}, Values: []any{"A"}}}},
	}
}

// TestEncodePoint checks the geometry blob byte by byte against OGC GeoPackage 1.3
// §2.1.3.1.1 (StandardGeoPackageBinary) and OGC 06-103r4 §8.2 (WKB).
func TestEncodePoint(t *testing.T) {
	t.Parallel()
	b, err := Encode(orb.Point{1.5, -2})
	if err != nil {
		t.Fatal(err)
	}
	le := binary.LittleEndian
	f := func(off int) float64 { return math.Float64frombits(le.Uint64(b[off:])) }
	// header: magic "GP", version 0, flags 0b0000_0011 (envelope [minx,maxx,miny,maxy], little endian)
	if string(b[:2]) != "GP" || b[2] != 0 || b[3] != 0x03 {
		t.Errorf("header % x", b[:4])
	}
	if got := le.Uint32(b[4:]); got != 4326 {
		t.Errorf("srs_id %d", got)
	}
	if f(8) != 1.5 || f(16) != 1.5 || f(24) != -2 || f(32) != -2 {
		t.Errorf("envelope %v %v %v %v", f(8), f(16), f(24), f(32))
	}
	// WKB: byte order 1 (NDR), type 1 (Point), x, y
	if b[40] != 1 || le.Uint32(b[41:]) != 1 || f(45) != 1.5 || f(53) != -2 || len(b) != 61 {
		t.Errorf("WKB % x", b[40:])
	}
}

// TestBytesSame: the same layers give the same bytes, and the SQLite header carries the
// GeoPackage marks (OGC GeoPackage 1.3 Requirement 2; SQLite file format §1.3: user_version
// at offset 60, application_id at 68, big-endian).
func TestBytesSame(t *testing.T) {
	t.Parallel()
	a, err := Bytes(context.Background(), sample())
	if err != nil {
		t.Fatal(err)
	}
	b, err := Bytes(context.Background(), sample())
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a, b) {
		t.Fatal("two writes of the same layers differ")
	}
	if !bytes.HasPrefix(a, []byte("SQLite format 3\x00")) {
		t.Fatalf("not an SQLite file: %q", a[:16])
	}
	if got := binary.BigEndian.Uint16(a[16:]); got != pageSize {
		t.Errorf("page size %d", got)
	}
	if got := binary.BigEndian.Uint32(a[60:]); got != UserVersion {
		t.Errorf("user_version %d", got)
	}
	if got := string(a[68:72]); got != "GPKG" {
		t.Errorf("application_id %q", got)
	}
}

func TestBytesRefuses(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name string
		edit func(ls []Layer)
	}{
		{"layer name", func(ls []Layer) { ls[0].Name = "Lines" }},
		{"reserved layer name", func(ls []Layer) { ls[0].Name = "gpkg_contents" }},
		{"layer twice", func(ls []Layer) { ls[1].Name = "lines" }},
		{"column named geom", func(ls []Layer) { ls[0].Columns[0].Name = "geom" }},
		{"column type", func(ls []Layer) { ls[0].Columns[0].Type = "BLOB" }},
		{"value type", func(ls []Layer) { ls[0].Features[0].Values[2] = "3" }},
		{"NaN", func(ls []Layer) { ls[0].Features[0].Values[1] = math.NaN() }},
		{"values count", func(ls []Layer) { ls[0].Features[0].Values = ls[0].Features[0].Values[1:] }},
		{"geometry type", func(ls []Layer) { ls[0].Features[0].Geometry = orb.Point{1, 2} }},
		{"short line", func(ls []Layer) { ls[0].Features[0].Geometry = orb.LineString{{1, 2}} }},
	} {
		ls := sample()
		tc.edit(ls)
		if b, err := Bytes(context.Background(), ls); err == nil || b != nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if b, err := Bytes(ctx, sample()); err != context.Canceled || b != nil {
		t.Errorf("cancelled: %v, %d bytes", err, len(b))
	}
}

// gdalTool finds a GDAL program or validator: a failure under CI=true (.ci/run installs
// gdal-bin and python3-gdal), a skip elsewhere.
func gdalTool(t *testing.T, path string) string {
	t.Helper()
	p, err := exec.LookPath(path)
	if err == nil {
		return p
	}
	if os.Getenv("CI") == "true" {
		t.Fatalf("%s not found; CI installs gdal-bin and python3-gdal", path)
	}
	t.Skipf("%s not found (apt-get install gdal-bin python3-gdal)", path)
	return ""
}

// TestGDAL reads the file with GDAL, the reference GeoPackage reader: ogrinfo (gdal-bin)
// lists the layers, geometry types, SRS, counts, field types and values; GDAL's own
// GeoPackage validator (validate_gpkg.py, python3-gdal) checks it against the
// requirements of OGC GeoPackage 1.3 and reports nothing.
func TestGDAL(t *testing.T) {
	t.Parallel()
	ogrinfo := gdalTool(t, "ogrinfo")
	data, err := Bytes(context.Background(), sample())
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "sample.gpkg")
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command(ogrinfo, "-ro", "-al", "-so", path).CombinedOutput()
	if err != nil {
		t.Fatalf("ogrinfo: %v\n%s", err, out)
	}
	text := string(out)
	for _, want := range []string{
		"using driver `GPKG' successful",
		"Layer name: lines\n", "Geometry: Line String\nFeature Count: 3\n",
		"Layer name: points\n", "Geometry: Point\nFeature Count: 1\n",
		"Layer name: areas\n", "Geometry: Multi Polygon\nFeature Count: 1\n",
		`ID["EPSG",4326]`, "Data axis to CRS axis mapping: 2,1",
		"name: String (0.0)", "length_m: Real (0.0)", "cables: Integer64 (0.0)", "ok: Integer(Boolean) (0.0)",
		"Extent: (-3.740000, 52.300000) - (-3.700000, 52.360000)",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("ogrinfo lacks %q:\n%s", want, text)
		}
	}
	if strings.Contains(text, "Warning") || strings.Contains(text, "ERROR") {
		t.Errorf("ogrinfo warns:\n%s", text)
	}
	out, err = exec.Command(ogrinfo, "-ro", "-q", "-sql", "SELECT name, length_m, cables, ok FROM lines ORDER BY fid", path).CombinedOutput()
	if err != nil {
		t.Fatalf("ogrinfo -sql: %v\n%s", err, out)
	}
	vals := regexp.MustCompile(`(?m)^\s+(\w+) \(\w+(?:\(\w+\))?\) = (.*)$`).FindAllStringSubmatch(string(out), -1)
	var got []string
	for _, v := range vals {
		got = append(got, v[1]+"="+v[2])
	}
	want := "name=a|b length_m=12.5 cables=3 ok=1 name=ü \"quoted\" length_m=(null) cables=0 ok=0 name=no line length_m=0 cables=(null) ok=(null)"
	if strings.Join(got, " ") != want {
		t.Errorf("ogrinfo -sql values:\n got %s\nwant %s\n%s", strings.Join(got, " "), want, out)
	}

	validator := "/usr/lib/python3/dist-packages/osgeo_utils/samples/validate_gpkg.py"
	if _, err := os.Stat(validator); err != nil {
		gdalTool(t, validator)
	}
	out, err = exec.Command("/usr/bin/python3", validator, path).CombinedOutput()
	if err != nil || len(bytes.TrimSpace(out)) > 0 {
		t.Errorf("validate_gpkg.py: %v\n%s", err, out)
	}
}

// TestWriteToLeavesNoTemporaryFile: WriteTo's temporary database is gone when it returns,
// written, refused or stopped; the file written is a whole SQLite database whose header
// counts its changes consistently (SQLite file format §1.3: the change counter at offset 24
// equals the version-valid-for number at 92, so the page count at 28 is trusted; no rollback
// journal is left to replay). Not parallel: it points TMPDIR at a folder of its own.
func TestWriteToLeavesNoTemporaryFile(t *testing.T) {
	tmp := t.TempDir()
	t.Setenv("TMPDIR", tmp)
	var buf bytes.Buffer
	if err := WriteTo(context.Background(), &buf, sample()); err != nil {
		t.Fatal(err)
	}
	a := buf.Bytes()
	if got, want := binary.BigEndian.Uint32(a[24:]), binary.BigEndian.Uint32(a[92:]); got != want || got == 0 {
		t.Errorf("change counter %d, version-valid-for %d: want equal and set", got, want)
	}
	if pages := binary.BigEndian.Uint32(a[28:]); int(pages)*pageSize != len(a) {
		t.Errorf("header says %d pages, the file is %d bytes", pages, len(a))
	}
	bad := sample()
	bad[0].Features[0].Values[1] = "not a number"
	if err := WriteTo(context.Background(), io.Discard, bad); err == nil {
		t.Error("a text in a REAL column was written")
	}
	for at := int64(1); at <= 4; at++ { // before the file, while writing the layers
		if err := WriteTo(ctxtest.New(at), io.Discard, sample()); err != context.Canceled {
			t.Errorf("stopped at look %d: %v", at, err)
		}
	}
	if ents, _ := os.ReadDir(tmp); len(ents) != 0 {
		t.Errorf("left in the temporary folder: %v", ents)
	}
}

// TestWriteToInScratchThere: WriteToIn builds its scratch database in the folder it is given
// (a caller's staging folder, which the next run clears after a killed one), with a name
// starting with a dot, and removes it; the system's temporary folder is not used. The folder's
// name may hold what an SQLite URI reads otherwise ('#' a fragment, '?' a query, '%41' an
// escaped "A", SQLite "URI Filenames" §3.1): the database is built in that folder all the
// same, and what is copied out is the whole GeoPackage Bytes gives. Not parallel: it points
// TMPDIR at a folder of its own.
func TestWriteToInScratchThere(t *testing.T) {
	want, err := Bytes(context.Background(), sample())
	if err != nil {
		t.Fatal(err)
	}
	// The cases' names are plain, so that the test's own temporary folders hold none of these.
	for _, tc := range []struct{ name, folder string }{
		{"plain", "plain"}, {"hash", "x#1"}, {"question mark", "what?now"}, {"percent", "a%41b"},
		{"space", "two words"}, {"all", "#?%41 all"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			sys, top := t.TempDir(), t.TempDir()
			t.Setenv("TMPDIR", sys)
			dir := filepath.Join(top, tc.folder)
			if err := os.Mkdir(dir, 0o755); err != nil {
				t.Fatal(err)
			}
			seen := &scratchSpy{dir: dir}
			if err := WriteToIn(context.Background(), seen, sample(), dir); err != nil {
				t.Fatal(err)
			}
			if len(seen.names) != 1 || !strings.HasPrefix(seen.names[0], ".spanwright-gpkg-") {
				t.Errorf("while writing, %s held %v; want one scratch file named .spanwright-gpkg-*", dir, seen.names)
			}
			if !bytes.Equal(seen.buf.Bytes(), want) {
				t.Errorf("wrote %d bytes, want the %d of Bytes", seen.buf.Len(), len(want))
			}
			for _, d := range []string{sys, dir} {
				if ents, _ := os.ReadDir(d); len(ents) != 0 {
					t.Errorf("left in %s: %v", d, ents)
				}
			}
			if ents, _ := os.ReadDir(top); len(ents) != 1 {
				t.Errorf("beside %s: %v; want nothing else", dir, ents)
			}
		})
	}
}

// scratchSpy is a writer that lists dir when first written to.
type scratchSpy struct {
	dir   string
	names []string
	done  bool
	buf   bytes.Buffer
}

func (s *scratchSpy) Write(p []byte) (int, error) {
	if !s.done {
		s.done = true
		ents, _ := os.ReadDir(s.dir)
		for _, e := range ents {
			s.names = append(s.names, e.Name())
		}
	}
	return s.buf.Write(p)
}

// TestCopyBuiltRefusesEmpty: a scratch file SQLite left empty (it built the database in
// another file, as a URI cut short at a '#' made it do) is an error naming the file, and
// nothing is written; a built one is copied whole.
func TestCopyBuiltRefusesEmpty(t *testing.T) {
	t.Parallel()
	name := filepath.Join(t.TempDir(), ".spanwright-gpkg-1.gpkg")
	if err := os.WriteFile(name, nil, 0o644); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	err := copyBuilt(&buf, name)
	if err == nil || !strings.Contains(err.Error(), name+": the file is empty") || buf.Len() != 0 {
		t.Errorf("empty scratch file: got %v and %d bytes; want an error naming %s, nothing written", err, buf.Len(), name)
	}
	want, err := Bytes(context.Background(), sample())
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(name, want, 0o644); err != nil {
		t.Fatal(err)
	}
	if err := copyBuilt(&buf, name); err != nil || !bytes.Equal(buf.Bytes(), want) {
		t.Errorf("built file: %v, %d bytes of %d", err, buf.Len(), len(want))
	}
}
