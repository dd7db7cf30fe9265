package report

import (
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// farCampus writes a campus of eight buildings 80 m apart along a street, and a ninth, FAR,
// 3 km out along it (a pump house on a long duct: tester 13's F-E in small), and its plan;
// it returns the plan's path.
func farCampus(t *testing.T) string {
	t.Helper()
	const lon0, lat0 = 10.0, 50.0
	const mLon, mLat = 71_696.0, 111_229.0 // metres per degree at 50° N, from memory (WGS84)
	at := func(x, y float64) string { return fmt.Sprintf("[%.7f,%.7f]", lon0+x/mLon, lat0+y/mLat) }
	box := func(id string, x float64) string {
		return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":%q},"geometry":{"type":"Polygon","coordinates":[[%s,%s,%s,%s,%s]]}}`,
			id, at(x-10, 20), at(x+10, 20), at(x+10, 40), at(x-10, 40), at(x-10, 20))
	}
	var fs []string
	for i := range 8 {
		fs = append(fs, box(fmt.Sprintf("B%d", i), float64(i)*80))
	}
	fs = append(fs, box("FAR", 3000),
		`{"type":"Feature","properties":{"kind":"pathway","id":"ST","type":"duct"},"geometry":{"type":"LineString","coordinates":[`+at(-20, 0)+","+at(3020, 0)+`]}}`)
	dir := t.TempDir()
	campus := `{"type":"FeatureCollection","features":[` + strings.Join(fs, ",") + `]}`
	if err := os.WriteFile(filepath.Join(dir, "campus.geojson"), []byte(campus), 0o644); err != nil {
		t.Fatal(err)
	}
	p := "name: far test\ncampus: [campus.geojson]\nhub: B3\ndefaults: {rate: 1G, strands: 12}\n"
	path := filepath.Join(dir, "plan.yaml")
	if err := os.WriteFile(path, []byte(p), 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

var (
	mapSVG   = regexp.MustCompile(`(?s)<svg class="map"[^>]*aria-label="([^"]*)">.*?</svg>`)
	mapLabel = regexp.MustCompile(`<text x="([0-9.-]+)" y="([0-9.-]+)" class="(lbl(?: xc)?)" text-anchor="middle">([^<]*)</text>`)
)

// TestCoreMap: on the far campus the whole map draws the eight buildings' 600 m within 3 km, so
// the report adds the core's map (the rule in core.go: all buildings but the farthest tenth,
// at least one, drawn here at about 3040/680 = 4.5 times the whole's scale), outlines it on
// the whole map, and labels the core's buildings there, not on the whole map; FAR keeps its
// label on the whole map. No two building labels overlap on either map. The demo campus,
// compact, gets no core map. Common practice, no published source (key plan and enlarged plan).
func TestCoreMap(t *testing.T) {
	html := render(t, farCampus(t), Options{})
	svgs := mapSVG.FindAllStringSubmatch(html, -1)
	if len(svgs) != 2 {
		t.Fatalf("%d maps, want 2 (the whole campus, the core)", len(svgs))
	}
	whole, core := svgs[0][0], svgs[1][0]
	if svgs[1][1] != "map of the campus core with the planned routes" {
		t.Errorf("second map's label %q", svgs[1][1])
	}
	if !strings.Contains(whole, `class="core-frame"`) || strings.Contains(core, `class="core-frame"`) {
		t.Errorf("the frame must be outlined on the whole map only")
	}
	m := regexp.MustCompile(`The core: the (\d+) of (\d+) buildings nearest the campus's middle, [0-9.]+ m by [0-9.]+ m, drawn at ([0-9.]+) times`).FindStringSubmatch(html)
	if m == nil {
		t.Fatal("no caption for the core's map")
	}
	if m[1] != "8" || m[2] != "9" {
		t.Errorf("core of %s of %s buildings, want 8 of 9", m[1], m[2])
	}
	// Whole 3,040 m wide, core the 8 buildings' 580 m + 2 x corePadM = 660 m, each fitted to
	// the same width: 3040/660 = 4.6.
	if z, _ := strconv.ParseFloat(m[3], 64); z < 4.3 || z > 4.9 {
		t.Errorf("zoom %s, want about 4.6", m[3])
	}
	labels := func(svg string) map[string]bool {
		out := map[string]bool{}
		type box struct{ x0, y0, x1, y1 float64 }
		var placed []box
		for _, l := range mapLabel.FindAllStringSubmatch(svg, -1) {
			x, _ := strconv.ParseFloat(l[1], 64)
			y, _ := strconv.ParseFloat(l[2], 64)
			w := labelCharPx
			if l[3] != "lbl" {
				w = labelCharXCPx
			}
			half := float64(len(l[4])) * w / 2
			b := box{x - half, y - 4 - labelHeightPx/2, x + half, y - 4 + labelHeightPx/2}
			for _, o := range placed {
				if b.x0 < o.x1 && o.x0 < b.x1 && b.y0 < o.y1 && o.y0 < b.y1 {
					t.Errorf("label %s overlaps another", l[4])
				}
			}
			placed = append(placed, b)
			out[l[4]] = true
		}
		return out
	}
	wl, cl := labels(whole), labels(core)
	if !wl["FAR"] || len(wl) != 1 {
		t.Errorf("whole map labels %v, want FAR alone (the core's are on its own map)", wl)
	}
	for i := range 8 {
		if id := fmt.Sprintf("B%d", i); !cl[id] {
			t.Errorf("core map lacks the label of %s: %v", id, cl)
		}
	}
	if cl["FAR"] {
		t.Errorf("core map labels FAR, 2.4 km outside it")
	}
	if n := len(mapSVG.FindAllString(render(t, demoPlan, Options{}), -1)); n != 1 {
		t.Errorf("demo: %d maps, want 1 (a compact campus)", n)
	}
}
