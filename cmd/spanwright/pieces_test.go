package main

import (
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCheckPiecesDanglingEntrance runs check on a campus where B's second entrance is a
// lateral joined to nothing: the network line counts the pieces that hold buildings over
// every entrance (B is on the street through its first), so the campus is in one piece and
// check exits 0; with a building F whose only pathway joins nothing, it is in two, F is named
// off the hub's piece and check exits 3 (as plan would: F cannot be served).
func TestCheckPiecesDanglingEntrance(t *testing.T) {
	const lat = 52.0
	degX := func(m float64) float64 { return -1 + m/(111320*math.Cos(lat*math.Pi/180)) }
	degY := func(m float64) float64 { return lat + m/111000 }
	line := func(id string, pts ...[2]float64) string {
		var c []string
		for _, p := range pts {
			c = append(c, fmt.Sprintf("[%.7f,%.7f]", degX(p[0]), degY(p[1])))
		}
		return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":%q},"geometry":{"type":"LineString","coordinates":[%s]}}`, id, strings.Join(c, ","))
	}
	building := func(id, role string, x, y float64) string {
		if role != "" {
			role = fmt.Sprintf(`,"role":%q`, role)
		}
		return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":%q%s},"geometry":{"type":"Polygon","coordinates":[[[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f]]]}}`,
			id, role, degX(x), degY(y), degX(x+20), degY(y), degX(x+20), degY(y+20), degX(x), degY(y+20), degX(x), degY(y))
	}
	base := []string{
		building("A", "mc", 0, 10), building("B", "", 200, 10), building("C", "", 400, 10),
		line("ST", [2]float64{10, 0}, [2]float64{210, 0}, [2]float64{410, 0}),
		line("S-A", [2]float64{10, 0}, [2]float64{10, 10}),
		line("S-B", [2]float64{210, 0}, [2]float64{210, 10}),
		line("S-C", [2]float64{410, 0}, [2]float64{410, 10}),
		// B's second entrance: a lateral from 60 m north to its north wall, joined to nothing.
		line("B-L2", [2]float64{205, 90}, [2]float64{205, 30}),
	}
	cutOff := []string{building("F", "", 800, 60), line("F-L", [2]float64{810, 140}, [2]float64{810, 80})}
	cases := []struct {
		name     string
		features []string
		code     int
		want     []string
	}{
		{"one piece", base, exitOK, []string{
			"network     in one piece: every pathway that reaches a building joins the others",
			"hub         A: every building can reach it",
			"  B: [B:1 B:2]",
		}},
		{"a building cut off", append(append([]string(nil), base...), cutOff...), exitInfeasible, []string{
			"network     in 2 separate pieces that each hold buildings; 1 building is off the hub's piece: [F]",
			"1 building cannot reach the hub A: [F]",
		}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			path := filepath.Join(t.TempDir(), "campus.geojson")
			data := `{"type":"FeatureCollection","features":[` + strings.Join(tc.features, ",\n") + "]}\n"
			if err := os.WriteFile(path, []byte(data), 0o644); err != nil {
				t.Fatal(err)
			}
			out, msg, code := run(t, "check", path)
			if code != tc.code {
				t.Errorf("exit %d, want %d: %s", code, tc.code, msg)
			}
			for _, w := range tc.want {
				if !strings.Contains(out+msg, w) {
					t.Errorf("output lacks %q:\n%s%s", w, out, msg)
				}
			}
		})
	}
}
