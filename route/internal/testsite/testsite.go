package testsite

import (
	"context"
	"fmt"
	"math"
	"path/filepath"
	"runtime"
	"spanwright/geo"
	"spanwright/route/plan"
	"spanwright/route/site"
	"strconv"
	"strings"
	"sync"
	"testing"
)

var demoOnce struct {
	sync.Once
	site *site.Site
	plan *plan.Plan
	err  error
}

// Demo loads the demo campus once for the benchmarks.
func Demo(tb testing.TB) (*site.Site, *plan.Plan) {
	tb.Helper()
	demoOnce.Do(func() {
		p, err := plan.LoadPlan(demoPlanPath())
		if err != nil {
			demoOnce.err = err
			return
		}
		files := make([]string, len(p.Campus))
		for i, f := range p.Campus {
			files[i] = p.Path(f)
		}
		demoOnce.site, demoOnce.err = site.Load(context.Background(), nil, files, site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
		demoOnce.plan = p
	})
	if demoOnce.err != nil {
		tb.Fatal(demoOnce.err)
	}
	return demoOnce.site, demoOnce.plan
}

// SynthCampus writes a synthetic campus of about n buildings as GeoJSON: a grid of streets
// 120 m apart (one existing duct pathway per block side), a building beside the middle of
// n block sides joined by a 15 m service duct, a handhole three quarters along each such side, (every tenth also by a second duct to the
// block corner, for diverse routes), a proposed diagonal trench across every tenth
// block, the mc at the centre and two ics. It has about five spans per building.
func SynthCampus(n int) []byte {
	g := 2
	for 2*g*(g-1) < n {
		g++
	}
	const lat0, lon0, stepM = 40.0, -75.0, 120.0
	ll := func(xM, yM float64) string {
		return fmt.Sprintf("[%.7f,%.7f]", lon0+xM/(111320*math.Cos(lat0*math.Pi/180)), lat0+yM/110540)
	}
	var b strings.Builder
	b.WriteString(`{"type":"FeatureCollection","features":[`)
	first := true
	add := func(f string) {
		if !first {
			b.WriteByte(',')
		}
		first = false
		b.WriteString(f)
	}
	built := 0
	mc := n / 2
	ics := map[int]bool{n / 4: true, 3 * n / 4: true}
	side := func(x0, y0, x1, y1 float64, id string) {
		if built >= n {
			add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"%s","spare_ducts":2},"geometry":{"type":"LineString","coordinates":[%s,%s]}}`,
				id, ll(x0, y0), ll(x1, y1)))
			return
		}
		mx, my := (x0+x1)/2, (y0+y1)/2
		// The building sits 15 m off the street, to the north or east.
		dx, dy := 0.0, 15.0
		if x0 == x1 {
			dx, dy = 15, 0
		}
		hx, hy := x0+(x1-x0)*0.75, y0+(y1-y0)*0.75
		add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"%s","spare_ducts":2},"geometry":{"type":"LineString","coordinates":[%s,%s,%s,%s]}}`,
			id, ll(x0, y0), ll(mx, my), ll(hx, hy), ll(x1, y1)))
		add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"structure","id":"H-%s","type":"handhole"},"geometry":{"type":"Point","coordinates":%s}}`,
			id, ll(hx, hy)))
		add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"%s-S"},"geometry":{"type":"LineString","coordinates":[%s,%s]}}`,
			id, ll(mx, my), ll(mx+dx, my+dy)))
		bx, by := mx+dx, my+dy
		if built%10 == 5 || built == mc || ics[built] {
			// A second service duct to the block corner, so a diverse pair exists.
			add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"%s-T"},"geometry":{"type":"LineString","coordinates":[%s,%s]}}`,
				id, ll(bx, by), ll(x1, y1)))
		}
		role := ""
		if built == mc {
			role = `,"role":"mc"`
		} else if ics[built] {
			role = `,"role":"ic"`
		}
		add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":"B%05d"%s},"geometry":{"type":"Polygon","coordinates":[[%s,%s,%s,%s,%s]]}}`,
			built, role, ll(bx-8, by-8), ll(bx+8, by-8), ll(bx+8, by+8), ll(bx-8, by+8), ll(bx-8, by-8)))
		built++
	}
	for i := 0; i < g; i++ {
		for j := 0; j < g; j++ {
			x, y := float64(i)*stepM, float64(j)*stepM
			if i+1 < g {
				side(x, y, x+stepM, y, fmt.Sprintf("E%d-%d", i, j))
			}
			if j+1 < g {
				side(x, y, x, y+stepM, fmt.Sprintf("N%d-%d", i, j))
			}
			if i+1 < g && j+1 < g && (i*g+j)%10 == 3 {
				add(fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"P%d-%d","status":"proposed","type":"buried","surface":"turf"},"geometry":{"type":"LineString","coordinates":[%s,%s]}}`,
					i, j, ll(x, y), ll(x+stepM, y+stepM)))
			}
		}
	}
	b.WriteString("]}")
	return []byte(b.String())
}

var synthSites sync.Map // n → *site.Site

func Synth(tb testing.TB, n int) *site.Site {
	tb.Helper()
	if s, ok := synthSites.Load(n); ok {
		return s.(*site.Site)
	}
	s := NewSynth(tb, n)
	synthSites.Store(n, s)
	return s
}

// NewSynth builds a site of its own on the synthetic campus of about n buildings.
func NewSynth(tb testing.TB, n int) *site.Site {
	tb.Helper()
	return Campus(tb, "synthetic.geojson", SynthCampus(n))
}

// Campus builds the site of a campus file's contents (data, named name in messages) with
// geo's default options.
func Campus(tb testing.TB, name string, data []byte) *site.Site {
	tb.Helper()
	c, err := geo.Parse(name, data)
	if err != nil {
		tb.Fatal(err)
	}
	net, err := geo.Build(c, geo.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	return site.NewSite(c, net)
}

// Features is a campus file of the GeoJSON features given (Box, Pathway).
func Features(features ...string) []byte {
	return []byte(`{"type":"FeatureCollection","features":[` + strings.Join(features, ",") + `]}`)
}

// SynthPlan is the benchmark plan: one link per building to its nearest cross-connect,
// every tenth building diverse.
func SynthPlan(s *site.Site) *plan.Plan {
	p := plan.Default
	p.File, p.Name = "synthetic.yaml", "synthetic"
	for i, b := range s.Campus.Buildings {
		if i%10 == 5 && b.Role == "" {
			p.Links = append(p.Links, plan.LinkSpec{To: b.ID, Redundancy: plan.RedundancyDiverse})
		}
	}
	return &p
}

// DemoFresh loads the demo campus into a site of its own.
func DemoFresh(tb testing.TB) (*site.Site, *plan.Plan) {
	tb.Helper()
	_, p := Demo(tb)
	return Load(tb, p), p
}

// Load loads the campus of the plan p into a site, with the plan's snapping and lateral
// limits, as the command does.
func Load(tb testing.TB, p *plan.Plan) *site.Site {
	tb.Helper()
	files := make([]string, len(p.Campus))
	for i, f := range p.Campus {
		files[i] = p.Path(f)
	}
	s, err := site.Load(context.Background(), nil, files, site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
	if err != nil {
		tb.Fatal(err)
	}
	return s
}

// Pull campus, on a local metre grid at latitude 52 (invented place): the hub A and the
// served building B are joined by one duct D running (10, 15) inside A, south to (10, 0),
// east through handhole HH-1 at (110, 0) to (210, 0), then north to (210, 115) inside B:
// two right-angle bends, one each side of the handhole. A proposed duct P under asphalt
// runs from (210, 0) east and north into building C, which has no other pathway.
const Lat = 52.0

func X(m float64) float64 { return -1 + m/(111320*math.Cos(Lat*math.Pi/180)) }
func Y(m float64) float64 { return Lat + m/111000 }

// Point is a grid point as the campus file has it, with 7 decimals.
func Point(x, y float64) [2]float64 {
	r := func(v float64) float64 { f, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'f', 7, 64), 64); return f }
	return [2]float64{r(X(x)), r(Y(y))}
}

// Box is a 20 m square building centred on (x, y) of the pull grid, as a GeoJSON feature.
func Box(id, role string, x, y float64) string {
	r := ""
	if role != "" {
		r = fmt.Sprintf(`,"role":%q`, role)
	}
	return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":%q%s},"geometry":{"type":"Polygon","coordinates":[[[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f]]]}}`,
		id, r, X(x-10), Y(y-10), X(x+10), Y(y-10), X(x+10), Y(y+10), X(x-10), Y(y+10), X(x-10), Y(y-10))
}

// Long is a building from x0 to x1 and 15 to 35 m of the pull grid, with a 2 m riser, as a
// GeoJSON feature: a building long enough for a tunnel to run inside it.
func Long(id, role string, x0, x1 float64) string {
	r := ""
	if role != "" {
		r = fmt.Sprintf(`,"role":%q`, role)
	}
	return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":%q,"riser_m":2%s},"geometry":{"type":"Polygon","coordinates":[[[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f]]]}}`,
		id, r, X(x0), Y(15), X(x1), Y(15), X(x1), Y(35), X(x0), Y(35), X(x0), Y(15))
}

// Pathway is a pathway of type typ through points of the pull grid (x, y in metres), as a
// GeoJSON feature.
func Pathway(id, typ string, pts ...float64) string { return fanWay(id, typ, "", fanLine(pts...)) }

func PullCampus(ductMM float64, spare int) string {
	line := fanLine
	f := []string{
		Box("A", "mc", 10, 25), Box("B", "", 210, 125), Box("C", "", 300, 25),
		fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"D","type":"duct","spare_ducts":%d,"duct_mm":%g},"geometry":{"type":"LineString","coordinates":%s}}`,
			spare, ductMM, line(10, 15, 10, 0, 110, 0, 210, 0, 210, 115)),
		fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"P","type":"duct","status":"proposed","surface":"asphalt","duct_mm":%g},"geometry":{"type":"LineString","coordinates":%s}}`,
			ductMM, line(210, 0, 300, 0, 300, 15)),
		fmt.Sprintf(`{"type":"Feature","properties":{"kind":"structure","id":"HH-1","type":"handhole"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`,
			X(110), Y(0)),
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// fanLine is a LineString's coordinates through the points (x, y pairs, metres on the local
// grid), as GeoJSON text.
func fanLine(pts ...float64) string {
	var s []string
	for i := 0; i+1 < len(pts); i += 2 {
		s = append(s, fmt.Sprintf("[%.7f,%.7f]", X(pts[i]), Y(pts[i+1])))
	}
	return "[" + strings.Join(s, ",") + "]"
}

// fanWay is a pathway feature with id, type, extra properties (each with its leading comma)
// and coordinates, as GeoJSON text.
func fanWay(id, typ, props, coords string) string {
	return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":%q,"type":%q%s},"geometry":{"type":"LineString","coordinates":%s}}`,
		id, typ, props, coords)
}

// FanCampus is hub A and buildings B, C and E, all reached over one duct T (spare ducts of
// ductMM, or, proposed, new construction whose ducts are of ductMM) that ends at a junction,
// where direct-buried pathways (no duct limit) fan out to the three buildings: every link's
// cable crosses T, and there is no other way.
func FanCampus(ductMM float64, spare int, proposed bool) string {
	t := fmt.Sprintf(`,"spare_ducts":%d,"duct_mm":%g`, spare, ductMM)
	if proposed {
		t = fmt.Sprintf(`,"status":"proposed","surface":"turf","duct_mm":%g`, ductMM)
	}
	f := []string{
		Box("A", "mc", 10, 25), Box("B", "", 300, 25), Box("C", "", 200, 125), Box("E", "", 200, -125),
		fanWay("T", "duct", t, fanLine(10, 15, 10, 0, 200, 0)),
		fanWay("FB", "buried", "", fanLine(200, 0, 300, 0, 300, 15)),
		fanWay("FC", "buried", "", fanLine(200, 0, 200, 115)),
		fanWay("FE", "buried", "", fanLine(200, 0, 200, -115)),
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// FanN is hub A and n buildings B1…Bn, every one reached over one duct T (spare ducts of
// ductMM, or, proposed, new construction under turf whose ducts are of ductMM) from A's wall
// to a junction at (200, 0), where a direct-buried pathway (no duct limit) runs straight to
// each building: B1, B3, … north at x = 120, 160, … (centres at y = 125), B2, B4, … south
// (y = -125). Every link's cable crosses T, and there is no other way.
func FanN(ductMM float64, spare, n int, proposed bool) string {
	t := fmt.Sprintf(`,"spare_ducts":%d,"duct_mm":%g`, spare, ductMM)
	if proposed {
		t = fmt.Sprintf(`,"status":"proposed","surface":"turf","duct_mm":%g`, ductMM)
	}
	f := []string{Box("A", "mc", 10, 25), fanWay("T", "duct", t, fanLine(10, 15, 10, 0, 200, 0))}
	for i := range n {
		x, side := 120+40*float64(i/2), 1.0
		if i%2 == 1 {
			side = -1
		}
		id := fmt.Sprintf("B%d", i+1)
		f = append(f, Box(id, "", x, side*125), fanWay("F"+id, "buried", "", fanLine(200, 0, x, side*115)))
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// CopperFan is hub A and buildings B and C, 42 and 35 m of pathway from it, both reached over one duct T
// (one spare duct of 21 mm) that ends at a junction where roomy duct banks fan out (not
// direct-buried: outdoor copper is not rated for burial, rule direct-burial).
func CopperFan() string {
	// Risers of 3 m: outdoor copper cable, unlisted, may run at most 15 m inside a building
	// from its point of entrance (NFPA 70 800.48, from memory), riser, service coil and
	// entrance loop together.
	box := func(id, role string, x, y float64) string {
		return strings.Replace(Box(id, role, x, y), `"kind":"building",`, `"kind":"building","riser_m":3,`, 1)
	}
	f := []string{
		box("A", "mc", 10, 25), box("B", "", 32, 25), box("C", "", 20, -20),
		fanWay("T", "duct", `,"spare_ducts":1,"duct_mm":21`, fanLine(10, 15, 10, 5, 20, 5)),
		fanWay("FB", "duct", `,"spare_ducts":4,"duct_mm":100`, fanLine(20, 5, 32, 5, 32, 15)),
		fanWay("FC", "duct", `,"spare_ducts":4,"duct_mm":100`, fanLine(20, 5, 20, -10)),
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// demoPlanPath is the demo plan's path, found from this file's own place in the repository
// (tests run in their package's folder, which differs from package to package).
func demoPlanPath() string {
	_, file, _, _ := runtime.Caller(0)
	return filepath.Join(filepath.Dir(file), "..", "..", "..", "testdata", "demo", "plan.yaml")
}
