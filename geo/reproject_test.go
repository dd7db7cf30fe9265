//go:build proj

package geo_test

import (
	"context"
	"errors"
	"io/fs"
	"math"
	"os"
	"os/exec"
	"path"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spanwright"
	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/route"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// demoUTMZone is the UTM zone of the demo campus, at longitude −3.73: zone z spans
// longitudes 6z−186 to 6z−180 degrees (DMA TM 8358.2, §2-6), so zone 30, north.
const demoUTMZone = "EPSG:32630"

// writeDemo writes the embedded demo campus and plan into dir and returns the plan's path.
func writeDemo(t *testing.T, dir string) string {
	t.Helper()
	for _, name := range []string{"campus.geojson", "plan.yaml"} {
		data, err := fs.ReadFile(spanwright.Demo, path.Join(spanwright.DemoDir, name))
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return filepath.Join(dir, "plan.yaml")
}

// solve plans the plan at planPath as the plan command does.
func solve(t *testing.T, planPath string) *route.Result {
	t.Helper()
	p, err := plan.LoadPlan(planPath)
	if err != nil {
		t.Fatal(err)
	}
	files := make([]string, len(p.Campus))
	for i, f := range p.Campus {
		files[i] = p.Path(f)
	}
	s, err := site.Load(context.Background(), nil, files, site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
	if err != nil {
		t.Fatal(err)
	}
	eng, err := plan.Engine(p)
	if err != nil {
		t.Fatal(err)
	}
	r, err := route.SolveWith(context.Background(), s, p, eng)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestDemoReprojectedPlansSameRoutes reprojects the demo campus to its UTM zone with GDAL's
// ogr2ogr (Debian gdal-bin), which writes the legacy "crs" member of GeoJSON 2008
// (urn:ogc:def:crs:EPSG::32630) with -lco RFC7946=NO, and plans it: every leg takes the
// same spans and pathways with the same medium, and its length is within 1 mm per km of the
// plan from the WGS84 file (issue 17's acceptance figure).
func TestDemoReprojectedPlansSameRoutes(t *testing.T) {
	t.Parallel()
	ogr, err := exec.LookPath("ogr2ogr")
	if err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatal("ogr2ogr not found; CI installs gdal-bin")
		}
		t.Skip("ogr2ogr not found (apt-get install gdal-bin); skipping the reprojected demo")
	}
	wgsDir, utmDir := t.TempDir(), t.TempDir()
	wgsPlan := writeDemo(t, wgsDir)
	utmPlan := writeDemo(t, utmDir)
	utmCampus := filepath.Join(utmDir, "campus.geojson")
	if err := os.Remove(utmCampus); err != nil {
		t.Fatal(err)
	}
	out, err := exec.Command(ogr, "-f", "GeoJSON", "-t_srs", demoUTMZone, "-lco", "RFC7946=NO",
		utmCampus, filepath.Join(wgsDir, "campus.geojson")).CombinedOutput()
	if err != nil {
		t.Fatalf("ogr2ogr: %v\n%s", err, out)
	}
	data, err := os.ReadFile(utmCampus)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(data), `"urn:ogc:def:crs:EPSG::32630"`) {
		t.Fatalf("ogr2ogr wrote no crs member naming EPSG:32630:\n%.400s", data)
	}
	if _, err := geo.Load([]string{utmCampus}); err != nil {
		t.Fatalf("the reprojected campus: %v", err)
	}

	want, got := solve(t, wgsPlan), solve(t, utmPlan)
	if len(got.Legs) != len(want.Legs) {
		t.Fatalf("%d legs, want %d", len(got.Legs), len(want.Legs))
	}
	for i := range want.Legs {
		w, g := &want.Legs[i], &got.Legs[i]
		name := w.Link.ID + " " + w.Name
		if g.Link.ID != w.Link.ID || g.Name != w.Name {
			t.Errorf("leg %d: %s %s, want %s", i, g.Link.ID, g.Name, name)
			continue
		}
		if g.Feasible != w.Feasible || g.Medium != w.Medium {
			t.Errorf("%s: feasible %v medium %q, want %v %q", name, g.Feasible, g.Medium, w.Feasible, w.Medium)
		}
		if !slices.Equal(g.Steps, w.Steps) || !slices.Equal(g.Pathways, w.Pathways) {
			t.Errorf("%s: route %v over %v, want %v over %v", name, g.Steps, g.Pathways, w.Steps, w.Pathways)
		}
		// 1 mm per km: a relative 1e-6 of the leg's length.
		if tol := 1e-6 * w.RouteM; math.Abs(g.RouteM-w.RouteM) > tol {
			t.Errorf("%s: %.6f m, want %.6f m within %.6f m", name, g.RouteM, w.RouteM, tol)
		}
	}
	if t.Failed() {
		return
	}
	worst := 0.0
	for i := range want.Legs {
		if w := want.Legs[i].RouteM; w > 0 {
			worst = max(worst, math.Abs(got.Legs[i].RouteM-w)/w*1e6)
		}
	}
	t.Logf("%d legs; the largest difference in length is %.3g mm per km", len(want.Legs), worst)
}

// TestCRSMemberUnknownCode: a crs member naming a code PROJ's database does not have is one
// problem of the file, naming it.
func TestCRSMemberUnknownCode(t *testing.T) {
	t.Parallel()
	_, err := geo.Parse("a.geojson", []byte(`{"type": "FeatureCollection", "crs": {"type": "name", "properties": {"name": "EPSG:999999"}}, "features": [
 {"type": "Feature", "properties": {"kind": "pathway", "id": "P-1"}, "geometry": {"type": "LineString", "coordinates": [[450299.19, 5800410.24], [450359.30, 5800409.63]]}}
]}`))
	var list *input.Problems
	if !errors.As(err, &list) || len(list.List) != 1 || !errors.Is(err, geo.ErrBadValue) {
		t.Fatalf("got %v, want one bad-value problem", err)
	}
	if got, want := err.Error(), "a.geojson: crs: EPSG:999999: want the code of a coordinate reference system"; !strings.HasPrefix(got, want) {
		t.Errorf("got %q, want it to start %q", got, want)
	}
}

// TestCRSMemberPointPROJCannotTake: a position the transverse Mercator cannot invert (PROJ
// gives no answer so far off the zone) is one problem of its feature, naming the position
// as given and the code; the feature's other problems are still reported.
func TestCRSMemberPointPROJCannotTake(t *testing.T) {
	t.Parallel()
	_, err := geo.Parse("a.geojson", []byte(`{"type": "FeatureCollection", "crs": {"type": "name", "properties": {"name": "EPSG:32630"}}, "features": [
 {"type": "Feature", "properties": {"kind": "pathway", "id": "P-1", "status": "planned"}, "geometry": {"type": "LineString", "coordinates": [[1e10, 0], [2e10, 0]]}}
]}`))
	var list *input.Problems
	if !errors.As(err, &list) || len(list.List) != 2 {
		t.Fatalf("got %v, want two problems", err)
	}
	want := `a.geojson: feature #0 "P-1": geometry: position [1e+10, 0] in EPSG:32630: PROJ cannot take it to WGS84 longitude/latitude`
	if got := list.List[0].Error(); !strings.HasPrefix(got, want) || !errors.Is(list.List[0], geo.ErrBadGeometry) {
		t.Errorf("got %q, want it to start %q", got, want)
	}
	if got := list.List[1].Error(); !strings.HasPrefix(got, `a.geojson: feature #0 "P-1": property "status"`) {
		t.Errorf("got %q, want the feature's status", got)
	}
}
