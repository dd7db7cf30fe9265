package geo_test

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"path"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spanwright"
	"spanwright/geo"
	"spanwright/route"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// demoWithStray writes the embedded demo campus and plan into dir, the plan naming one more
// campus file with a handhole at lon, lat that joins nothing, and returns the plan's path.
func demoWithStray(t *testing.T, dir string, lon, lat float64) string {
	t.Helper()
	for _, name := range []string{"campus.geojson", "plan.yaml"} {
		data, err := fs.ReadFile(spanwright.Demo, path.Join(spanwright.DemoDir, name))
		if err != nil {
			t.Fatal(err)
		}
		if name == "plan.yaml" {
			data = []byte(strings.Replace(string(data), "campus: [campus.geojson]", "campus: [campus.geojson, stray.geojson]", 1))
		}
		if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	stray := fmt.Sprintf(`{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"kind":"structure","id":"HH-STRAY","type":"handhole"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}]}`, lon, lat)
	if err := os.WriteFile(filepath.Join(dir, "stray.geojson"), []byte(stray), 0o644); err != nil {
		t.Fatal(err)
	}
	return filepath.Join(dir, "plan.yaml")
}

// planDemo plans the plan at planPath as the plan command does; err is the campus's.
func planDemo(t *testing.T, planPath string) (*route.Result, error) {
	t.Helper()
	p, err := plan.LoadPlan(planPath)
	if err != nil {
		t.Fatal(err)
	}
	var files []string
	for _, f := range p.Campus {
		files = append(files, p.Path(f))
	}
	s, err := site.Load(context.Background(), nil, files, site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
	if err != nil {
		return nil, err
	}
	eng, err := plan.Engine(p)
	if err != nil {
		t.Fatal(err)
	}
	r, err := route.SolveWith(context.Background(), s, p, eng)
	if err != nil {
		t.Fatal(err)
	}
	return r, nil
}

// TestDemoStrayPlansSame plans the demo with one more handhole that joins nothing: 1 m
// west of the campus (the base: a point of the campus's extent that moves nothing), then 20,
// 60 and 95 km away. Within geo.FarM every leg takes the same spans and pathways with the
// same medium, its route length within 1 mm per km (the projection's centre may move by half
// the distance; lengths are ellipsoidal), and the bill's total is the same to the cent;
// beyond FarM, 5,000 km off with longitude and latitude swapped, the campus is refused with
// the slip named (tester 13 F-C: such a point re-planned the whole campus).
func TestDemoStrayPlansSame(t *testing.T) {
	t.Parallel()
	const lon0, lat0 = -3.7297059 - 0.00002, 52.3517286 // 1 m west of ADM's south-west corner
	want, err := planDemo(t, demoWithStray(t, t.TempDir(), lon0, lat0))
	if err != nil {
		t.Fatal(err)
	}
	for _, km := range []float64{20, 60, 95} {
		dLat := km * 1000 / 111250 // north, about km kilometres (WGS84 at 52°N: 111.25 km a degree)
		got, err := planDemo(t, demoWithStray(t, t.TempDir(), lon0, lat0+dLat))
		if err != nil {
			t.Fatalf("%.0f km: %v", km, err)
		}
		if len(got.Legs) != len(want.Legs) {
			t.Fatalf("%.0f km: %d legs, want %d", km, len(got.Legs), len(want.Legs))
		}
		for i := range want.Legs {
			w, g := &want.Legs[i], &got.Legs[i]
			name := fmt.Sprintf("%.0f km: %s %s", km, w.Link.ID, w.Name)
			if g.Link.ID != w.Link.ID || g.Feasible != w.Feasible || g.Medium != w.Medium ||
				!slices.Equal(g.Steps, w.Steps) || !slices.Equal(g.Pathways, w.Pathways) {
				t.Errorf("%s: %s %v %q over %v, want %s %v %q over %v", name, g.Link.ID, g.Feasible, g.Medium, g.Pathways,
					w.Link.ID, w.Feasible, w.Medium, w.Pathways)
			}
			if tol := 1e-6 * w.RouteM; math.Abs(g.RouteM-w.RouteM) > tol {
				t.Errorf("%s: %.6f m, want %.6f m within %.6f m", name, g.RouteM, w.RouteM, tol)
			}
		}
		if g, w := got.Estimate.BOM.TotalCents, want.Estimate.BOM.TotalCents; g != w {
			t.Errorf("%.0f km: total %d cents, want %d", km, g, w)
		}
	}
	_, err = planDemo(t, demoWithStray(t, t.TempDir(), lat0, lon0))
	if err == nil || !errors.Is(err, geo.ErrBadGeometry) || !strings.Contains(err.Error(), `stray.geojson: feature #0 "HH-STRAY": geometry: want positions within 100 km of the middle of the campus`) ||
		!strings.Contains(err.Error(), "longitude and latitude swapped?") {
		t.Errorf("swapped: got %v, want the stray refused with the slip named", err)
	}
}
