package output

import (
	"bytes"
	"context"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/plan"
	"spanwright/route/routing"
)

// gdal finds a GDAL program: a failure under CI=true (.ci/run installs gdal-bin and
// python3-gdal), a skip elsewhere.
func gdal(t *testing.T, name string) string {
	t.Helper()
	if p, err := exec.LookPath(name); err == nil {
		return p
	}
	if os.Getenv("CI") == "true" {
		t.Fatalf("%s not found; CI installs gdal-bin", name)
	}
	t.Skipf("%s not found (apt-get install gdal-bin)", name)
	return ""
}

// ogrRows runs ogrinfo -sql on path and returns each feature's fields by name, the
// geometry (as GDAL prints it, WKT) under "geom".
func ogrRows(t *testing.T, path, sql string) []map[string]string {
	t.Helper()
	out, err := exec.Command(gdal(t, "ogrinfo"), "-ro", "-q", "-sql", sql, path).CombinedOutput()
	if err != nil {
		t.Fatalf("ogrinfo -sql %q: %v\n%s", sql, err, out)
	}
	field := regexp.MustCompile(`^  (\w+) \([\w()]+\) = (.*)$`)
	var rows []map[string]string
	for _, line := range strings.Split(string(out), "\n") {
		switch {
		case strings.HasPrefix(line, "OGRFeature("):
			rows = append(rows, map[string]string{})
		case len(rows) == 0:
		case field.MatchString(line):
			m := field.FindStringSubmatch(line)
			rows[len(rows)-1][m[1]] = m[2]
		case strings.HasPrefix(line, "  LINESTRING") || strings.HasPrefix(line, "  POINT") || strings.HasPrefix(line, "  MULTIPOLYGON"):
			rows[len(rows)-1]["geom"] = strings.TrimSpace(line)
		}
	}
	return rows
}

// writeTemp writes data to name in a temporary folder and returns the path.
func writeTemp(t *testing.T, name string, data []byte) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), name)
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestGeoPackageGDAL reads the demo's plan.gpkg with GDAL, the reference GeoPackage reader
// (OGC GeoPackage 1.3): ogrinfo lists each layer with its geometry type, EPSG:4326 and as
// many features as the plan has legs, cable-carrying spans, pieces of new work, added
// handholes, buildings and entrances; the figures read back match the plan's own
// (new work to summary.json's new_trench_m, the legs' costs, the cables on spans); each leg
// starts at its from building's entrance and ends at its to building's; and GDAL's
// validator (validate_gpkg.py) finds nothing against the standard.
func TestGeoPackageGDAL(t *testing.T) {
	t.Parallel()
	ogrinfo := gdal(t, "ogrinfo")
	r := testplan.DemoResult(t)
	files, err := Files(context.Background(), r, WriteOptions{SkipWorkbook: true})
	if err != nil {
		t.Fatal(err)
	}
	data := testplan.FileOf(t, files, "plan.gpkg")
	path := writeTemp(t, "plan.gpkg", data)

	out, err := exec.Command(ogrinfo, "-ro", "-al", "-so", path).CombinedOutput()
	if err != nil {
		t.Fatalf("ogrinfo: %v\n%s", err, out)
	}
	text := string(out)
	if strings.Contains(text, "Warning") || strings.Contains(text, "ERROR") {
		t.Errorf("ogrinfo warns:\n%s", text)
	}
	works := len(r.Opened)
	for _, en := range r.Estimate.Construction.Entrances {
		if en.LateralM > 0 {
			works++ // a counted lateral built (items.Entrance)
		}
	}
	cables := 0
	for _, f := range r.Fill {
		cables += f.Cables
		if !slices.Contains(r.Opened, f.Span) && f.AddedDucts > 0 {
			works++ // a trench beside a full duct (an opened span's ducts are its own work's)
		}
	}
	layer := regexp.MustCompile(`(?s)Layer name: (\w+)\n.*?Geometry: ([\w ]+)\nFeature Count: (\d+)\n.*?ID\["EPSG",(\d+)\]`)
	got := map[string]string{}
	for _, m := range layer.FindAllStringSubmatch(text, -1) {
		got[m[1]] = m[2] + " " + m[3] + " EPSG:" + m[4]
	}
	// Existing structures a feasible leg passes, counted from the legs' junctions.
	passed := map[string]bool{}
	for i := range r.Legs {
		if r.Legs[i].Feasible {
			for _, j := range r.Site.JunctionsOf(r.Legs[i].Steps) {
				if r.Site.IsStructure(j) {
					passed[j] = true
				}
			}
		}
	}
	added := len(r.Handholes) + len(r.Estimate.Construction.RunHandholes) + r.Estimate.AddedPullPoints
	want := map[string]string{
		LayerAllStructures: "Point " + strconv.Itoa(added+len(passed)) + " EPSG:4326",
		LayerLegs:          "Line String " + strconv.Itoa(len(r.Legs)) + " EPSG:4326",
		LayerSpans:         "Line String " + strconv.Itoa(len(r.Fill)) + " EPSG:4326",
		LayerConstruction:  "Line String " + strconv.Itoa(works) + " EPSG:4326",
		LayerStructures:    "Point " + strconv.Itoa(added) + " EPSG:4326",
		LayerBuildings:     "Multi Polygon " + strconv.Itoa(len(r.Site.Campus.Buildings)) + " EPSG:4326",
		LayerEntrances:     "Point " + strconv.Itoa(len(r.Site.Net.Entrances)) + " EPSG:4326",
	}
	for name, w := range want {
		if got[name] != w {
			t.Errorf("layer %s: %q, want %q", name, got[name], w)
		}
	}
	if len(got) != len(want) {
		t.Errorf("layers %v, want %v", got, want)
	}
	// Typed columns: GDAL maps INTEGER to Integer64, BOOLEAN to Integer(Boolean), REAL to Real.
	for _, w := range []string{"feasible: Integer(Boolean)", "cost_cents: Integer64", "route_m: Real", "reason_code: String", "cables: Integer64", "fill_pct: Real"} {
		if !strings.Contains(text, w) {
			t.Errorf("ogrinfo lacks the column %q", w)
		}
	}

	s := Summarize(r)
	num := func(layer, expr string) float64 {
		t.Helper()
		rows := ogrRows(t, path, "SELECT "+expr+" AS v FROM "+layer)
		if len(rows) != 1 {
			t.Fatalf("%s of %s: %v", expr, layer, rows)
		}
		v, err := strconv.ParseFloat(rows[0]["v"], 64)
		if err != nil {
			t.Fatalf("%s of %s: %q", expr, layer, rows[0]["v"])
		}
		return v
	}
	// Lengths are kept to the decimetre, apportioned within each bill line so that they add
	// up to new_trench_m (estimate.Construction.listPieces; tester 5, finding 16), and a
	// counted lateral reads the same in the entrances layer.
	if got, want := num(LayerConstruction, "SUM(length_m)"), s.NewTrenchM; math.Abs(got-want) > 1e-6 {
		t.Errorf("new construction: %.1f m, want summary's new_trench_m %.1f", got, want)
	}
	if got, want := num(LayerEntrances, "SUM(CASE WHEN used AND via = 'lateral' THEN lateral_m ELSE 0 END)"), num(LayerConstruction, "SUM(CASE WHEN work = 'lateral' THEN length_m ELSE 0 END)"); math.Abs(got-want) > 1e-6 || want == 0 {
		t.Errorf("laterals: entrances used %.1f m, new construction %.1f m", got, want)
	}
	// The ducts laid, as the bill lays them (tester 13's finding B: counted laterals read 0
	// while the bill laid new_ducts in each): Σ length × added_ducts is the bill's added
	// duct line, within the 0.05 m each listed piece may be from its drawn length, per duct.
	billDuct := 0.0
	for _, l := range r.Estimate.BOM.Lines {
		if l.Item == "added duct" {
			billDuct = l.Quantity
		}
	}
	if got, ducts := num(LayerConstruction, "SUM(length_m * added_ducts)"), num(LayerConstruction, "SUM(added_ducts)"); math.Abs(got-billDuct) > 0.05*ducts+0.05 || billDuct == 0 {
		t.Errorf("new construction: %.1f m of duct laid, the bill's added duct %.1f m", got, billDuct)
	}
	if got := num(LayerConstruction, "MIN(CASE WHEN work = 'lateral' THEN added_ducts END)"); int(got) != r.Plan.Design.NewDucts {
		t.Errorf("new construction: a lateral laid with %v ducts, want new_ducts %d", got, r.Plan.Design.NewDucts)
	}
	var legCents int64
	feasible := 0
	for _, l := range r.Legs {
		legCents += l.Cost.TotalCents()
		if l.Feasible {
			feasible++
		}
	}
	if got := num(LayerLegs, "SUM(cost_cents)"); int64(got) != legCents || int64(got) != s.ModelCents-r.ExtraCents {
		t.Errorf("legs: cost_cents sum %v, want %d", got, legCents)
	}
	if got := num(LayerLegs, "SUM(feasible)"); int(got) != feasible {
		t.Errorf("legs: %v feasible, want %d", got, feasible)
	}
	if got := num(LayerSpans, "SUM(cables)"); int(got) != cables {
		t.Errorf("spans: %v cables, want %d", got, cables)
	}
	taps := len(r.Estimate.Construction.TapJunctions)
	if got := num(LayerStructures, "COUNT(*)"); int(got) != s.TurnHandholes+len(r.Estimate.Construction.NewJunctions)+taps+s.AddedPullPoints {
		t.Errorf("added structures: %v, want %d turns, %d joins, %d taps and %d pull points", got, s.TurnHandholes,
			len(r.Estimate.Construction.NewJunctions), taps, s.AddedPullPoints)
	}
	// The demo's counted laterals run to junctions (none taps a duct since every pathway
	// within max_lateral_m is offered): its tap rows, none, are the estimate's.
	if got := num(LayerStructures, "SUM(purpose = 'tap')"); int(got) != taps {
		t.Errorf("added structures: %v taps, want %d (the demo's laterals that tap a duct)", got, taps)
	}

	// Each leg runs from its from building's entrance to its to building's.
	rows := ogrRows(t, path, "SELECT link, leg, from_building, from_entrance, to_building, to_entrance, pathways_text, reason_code, geom FROM legs ORDER BY fid")
	if len(rows) != len(r.Legs) {
		t.Fatalf("legs: %d rows read back, want %d", len(rows), len(r.Legs))
	}
	for i, row := range rows {
		l := &r.Legs[i]
		if row["link"] != l.Link.ID || row["leg"] != l.Name || row["reason_code"] != l.ReasonCode || row["pathways_text"] != ListText(travelOf(r.Site.Net, l).pathways) {
			t.Errorf("legs row %d: %v, want leg %s %s (%s)", i+1, row, l.Link.ID, l.Name, l.ReasonCode)
		}
		if !l.Feasible {
			continue
		}
		first, last := wktEnds(t, row["geom"])
		if want := entrancePoint(t, r.Site.Net, l.Link.From, l.EntranceFrom); math.Abs(first[0]-want[0]) > 1e-9 || math.Abs(first[1]-want[1]) > 1e-9 {
			t.Errorf("%s %s: starts at %v, want %s's entrance %s at %v", l.Link.ID, l.Name, first, l.Link.From, l.EntranceFrom, want)
		}
		if want := entrancePoint(t, r.Site.Net, l.Link.To, l.EntranceTo); math.Abs(last[0]-want[0]) > 1e-9 || math.Abs(last[1]-want[1]) > 1e-9 {
			t.Errorf("%s %s: ends at %v, want %s's entrance %s at %v", l.Link.ID, l.Name, last, l.Link.To, l.EntranceTo, want)
		}
	}

	validator := "/usr/lib/python3/dist-packages/osgeo_utils/samples/validate_gpkg.py"
	if _, err := os.Stat(validator); err != nil {
		gdal(t, validator)
	}
	if out, err := exec.Command("/usr/bin/python3", validator, path).CombinedOutput(); err != nil || len(bytes.TrimSpace(out)) > 0 {
		t.Errorf("validate_gpkg.py: %v\n%s", err, out)
	}
}

// wktEnds is the first and last position of a WKT LINESTRING as GDAL prints it.
func wktEnds(t *testing.T, wkt string) ([2]float64, [2]float64) {
	t.Helper()
	body, ok := strings.CutPrefix(wkt, "LINESTRING (")
	if !ok {
		t.Fatalf("not a line: %q", wkt)
	}
	pts := strings.Split(strings.TrimSuffix(body, ")"), ",")
	pos := func(s string) [2]float64 {
		f := strings.Fields(s)
		if len(f) != 2 {
			t.Fatalf("position %q in %q", s, wkt)
		}
		x, err1 := strconv.ParseFloat(f[0], 64)
		y, err2 := strconv.ParseFloat(f[1], 64)
		if err1 != nil || err2 != nil {
			t.Fatalf("position %q in %q", s, wkt)
		}
		return [2]float64{x, y}
	}
	return pos(pts[0]), pos(pts[len(pts)-1])
}

// TestGeoPackageSameBytes: the same result gives the same plan.gpkg, byte for byte (the
// cmd golden test holds the demo's file to the bytes committed), in either unit system.
func TestGeoPackageSameBytes(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	a, err := planGeoPackage(context.Background(), r)
	if err != nil {
		t.Fatal(err)
	}
	b, err := planGeoPackage(context.Background(), r)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a, b) {
		t.Error("two renderings of plan.gpkg differ")
	}
	// Data for programs: metric whatever the units of the files for people.
	files, err := Files(context.Background(), r, WriteOptions{Units: UnitsImperial, SkipWorkbook: true})
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(testplan.FileOf(t, files, "plan.gpkg"), a) {
		t.Error("plan.gpkg differs with --units imperial")
	}
}

// TestTextFormsSurviveOGR exports routes.geojson with ogr2ogr to a Shapefile and to a
// GeoPackage and reads both back with ogrinfo: the list properties' text forms and the
// reason code come through whole (a Shapefile's DBF has no list fields, so GDAL drops
// pathways there; its field names have at most 10 characters, so GDAL launders
// pathways_text to pathways_t, crosses_text to crosses_te and reason_code to reason_cod).
func TestTextFormsSurviveOGR(t *testing.T) {
	t.Parallel()
	ogr2ogr := gdal(t, "ogr2ogr")
	r := testplan.PassageResult(t, nil, "A", "B", "C", "HH-1")
	files, err := Files(context.Background(), r, WriteOptions{SkipWorkbook: true, SkipGeoPackage: true})
	if err != nil {
		t.Fatal(err)
	}
	src := writeTemp(t, "routes.geojson", testplan.FileOf(t, files, "routes.geojson"))
	dir := t.TempDir()
	for _, tc := range []struct {
		driver, file                string
		pathways, crosses, turns, c string
	}{
		{"ESRI Shapefile", "routes.shp", "pathways_t", "crosses_te", "turns_text", "reason_cod"},
		{"GPKG", "routes.gpkg", "pathways_text", "crosses_text", "turns_text", "reason_code"},
	} {
		dst := filepath.Join(dir, tc.file)
		if out, err := exec.Command(ogr2ogr, "-f", tc.driver, dst, src).CombinedOutput(); err != nil {
			t.Fatalf("ogr2ogr -f %s: %v\n%s", tc.driver, err, out)
		}
		rows := ogrRows(t, dst, "SELECT link, "+tc.pathways+", "+tc.crosses+", "+tc.turns+", "+tc.c+" FROM routes")
		checked := 0
		for _, l := range feasibleLegs(r) {
			tr := travelOf(r.Site.Net, l)
			for _, row := range rows {
				if row["link"] != l.Link.ID {
					continue
				}
				checked++
				got := []string{row[tc.pathways], row[tc.crosses], row[tc.turns], row[tc.c]}
				want := []string{ListText(tr.pathways), ListText(tr.crosses), ListText(tr.turns), l.ReasonCode}
				for i := range want {
					if want[i] == "" {
						want[i] = "(null)" // GDAL prints an empty DBF string as null
					}
					if tc.driver == "GPKG" && want[i] == "(null)" {
						want[i] = ""
					}
				}
				if strings.Join(got, "\x00") != strings.Join(want, "\x00") {
					t.Errorf("%s %s: %q, want %q", tc.driver, l.Link.ID, got, want)
				}
			}
		}
		if checked != 2 {
			t.Errorf("%s: %d legs checked, want 2", tc.driver, checked)
		}
		// The passage leg's lists are not empty, so the check above saw real text.
		if tr := travelOf(r.Site.Net, feasibleLegs(r)[1]); len(tr.turns) != 2 || len(tr.crosses) != 1 {
			t.Fatalf("passage leg: %v", tr)
		}
	}
}

func feasibleLegs(r *route.Result) []*routing.Leg {
	var out []*routing.Leg
	for i := range r.Legs {
		if r.Legs[i].Feasible {
			out = append(out, &r.Legs[i])
		}
	}
	return out
}

// TestGeoPackagePullPoints: with at most 100 m between pull points the pull campus needs
// intermediate pull points (TestPullPointAdded in route/estimate); plan.gpkg's added
// structures hold one row per point the bill counts (estimate.Estimate.AddedPullPoints), read
// back with ogrinfo, each where the pull sections name it ("new handhole on S, X m from the
// E end", X from the span's from end E) and on its span.
func TestGeoPackagePullPoints(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolve(t, 100, 2, func(p *plan.Plan) { p.Design.PullMaxM = 100 })
	if err != nil {
		t.Fatal(err)
	}
	n := r.Estimate.AddedPullPoints
	if n == 0 {
		t.Fatal("no pull point added")
	}
	named := map[string]bool{}
	for _, p := range r.Estimate.Pulls {
		if p.AddedFrom {
			named[p.From.String()] = true
		}
		if p.AddedTo {
			named[p.To.String()] = true
		}
	}
	pts := addedPullPoints(r)
	if len(pts) != n {
		t.Fatalf("%d pull points placed, the bill counts %d: %+v", len(pts), n, pts)
	}
	for _, p := range pts {
		label := p.junction
		if p.span != "" {
			sp, _ := r.Site.Net.Span(p.span)
			label = fmt.Sprintf("new handhole on %s, %.1f m from the %s end", p.span, p.offM, r.Site.Net.EndName(sp.From))
			if p.offM <= 0 || p.offM >= sp.LengthM {
				t.Errorf("%s: off the span of %.1f m", label, sp.LengthM)
			}
		}
		if !named[label] || len(p.links) == 0 {
			t.Errorf("pull point %q (links %q) is not one the pull sections name: %v", label, p.links, named)
		}
	}
	data, err := planGeoPackage(context.Background(), r)
	if err != nil {
		t.Fatal(err)
	}
	path := writeTemp(t, "plan.gpkg", data)
	rows := ogrRows(t, path, "SELECT COUNT(*) AS n, SUM(at_m) AS m FROM added_structures WHERE purpose = 'pull'")
	var sum float64
	for _, p := range pts {
		sum += round1(p.offM)
	}
	if len(rows) != 1 || rows[0]["n"] != strconv.Itoa(n) || rows[0]["m"] != strconv.FormatFloat(sum, 'f', -1, 64) {
		t.Errorf("ogrinfo: %v, want %d pull points, %g m from their spans' ends in all", rows, n, sum)
	}
}
