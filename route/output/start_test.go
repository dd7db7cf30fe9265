package output

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/geo/input"
	"spanwright/route/internal/testplan"
	"spanwright/route/routing"
)

// TestReadStartRoundTrip reads the demo plan's routes.geojson back as a warm start: one leg
// per feasible leg, with its link, leg, medium and spans in the line's order (LegRoute), and
// the folder's name as From. GDAL's GeoJSON driver (RFC 7946 reader) reads the same spans
// from spans_text, in the same order, on every feature.
func TestReadStartRoundTrip(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	files, err := Files(context.Background(), r, WriteOptions{SkipWorkbook: true, SkipGeoPackage: true})
	if err != nil {
		t.Fatal(err)
	}
	dir := filepath.Join(t.TempDir(), "earlier-plan")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(dir, RoutesFile)
	if err := os.WriteFile(path, testplan.FileOf(t, files, RoutesFile), 0o644); err != nil {
		t.Fatal(err)
	}
	st, err := ReadStart(dir, 0)
	if err != nil {
		t.Fatal(err)
	}
	if st.From != "earlier-plan" {
		t.Errorf("From: got %q, want the folder's name", st.From)
	}
	if len(r.ProblemSHA256) != 64 || st.ProblemSHA256 != r.ProblemSHA256 {
		t.Errorf("problem_sha256 read back as %q, want the plan's %q", st.ProblemSHA256, r.ProblemSHA256)
	}
	var want []routing.StartLeg
	for i := range r.Legs {
		l := &r.Legs[i]
		if l.Feasible {
			want = append(want, routing.StartLeg{Link: l.Link.ID, Leg: l.Name, Medium: l.Medium, Spans: spansOf(LegRoute(l).Steps)})
		}
	}
	if fmt.Sprint(st.Legs) != fmt.Sprint(want) {
		t.Errorf("legs read back:\n%v\nwant\n%v", st.Legs, want)
	}
	rows := ogrRows(t, path, "SELECT link, leg, spans_text FROM routes")
	if len(rows) != len(want) {
		t.Fatalf("GDAL reads %d features, want %d", len(rows), len(want))
	}
	for i, row := range rows {
		if row["link"] != want[i].Link || row["leg"] != want[i].Leg || row["spans_text"] != strings.Join(want[i].Spans, ListSep) {
			t.Errorf("GDAL reads feature %d as %v, want %v", i, row, want[i])
		}
	}
}

// TestParseStartProblems: every problem of a routes file read as a start comes back at once,
// each naming the file, the feature and the property and saying what was expected (the
// project's rule for bad input), matching ErrStart and input.Problem.
func TestParseStartProblems(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name, data string
		want       []string
	}{
		{"not JSON", "{", []string{"r.geojson: want the routes.geojson of a spanwright plan folder"}},
		{"not a collection", `{"type":"Feature"}`, []string{"want the routes.geojson of a spanwright plan folder"}},
		{"every problem", `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"link":"A-B","leg":"primary","medium":"os2","spans":["S-1","S-2"]}},
{"type":"Feature","properties":{"leg":"sideways","medium":7,"spans":"S-1"}},
{"type":"Feature","properties":{"link":"A-C","leg":"primary","medium":"os2"}},
{"type":"Feature","properties":{"link":"A-B","leg":"primary","medium":"os2","spans":[]}},
{"type":"Feature","properties":{"link":"A-D","leg":"diverse","medium":"os2","spans":["S-1",""]}},
{"type":"Feature"}]}`, []string{
			`r.geojson: feature #1 (no id): property "link": missing; want the leg's link`,
			`r.geojson: feature #1 (no id): property "medium": want the leg's medium as text, got 7`,
			`r.geojson: feature #1 (no id): property "spans": want a list of span IDs, got "S-1"`,
			`r.geojson: feature #2 (no id): property "spans": missing; want the leg's span IDs`,
			`r.geojson: feature #3 (no id): link "A-B": property "leg": the primary leg given twice: feature #0 has it`,
			`r.geojson: feature #4 (no id): property "spans": want a list of span IDs, got ["S-1",""]`,
			`r.geojson: feature #5 (no id): property "properties": want a feature with properties`,
		}},
		{"written before spans", `{"type":"FeatureCollection","features":[
{"type":"Feature","properties":{"link":"A-B","leg":"primary","medium":"os2"}},
{"type":"Feature","properties":{"link":"A-C","leg":"primary","medium":"os2"}}]}`,
			[]string{`r.geojson: no feature has the property "spans" (the leg's span IDs): a routes.geojson written by an older spanwright; plan it again`}},
		{"problem fingerprint", `{"type":"FeatureCollection","problem_sha256":"ABC","features":[{"type":"Feature","properties":{"link":"A-B","leg":"primary","medium":"os2","spans":[]}}]}`,
			[]string{`r.geojson: problem_sha256: want the routing problem's SHA-256 as 64 hexadecimal digits, got "ABC"`}},
		{"leg name", `{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"link":"A-B","leg":"sideways","medium":"os2","spans":[]}}]}`,
			[]string{`feature #0 (no id): property "leg": want "primary" or "diverse", got "sideways"`}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseStart("r.geojson", []byte(tc.data))
			if err == nil {
				t.Fatal("no error")
			}
			var ip *input.Problem
			if !errors.Is(err, ErrStart) || !errors.As(err, &ip) {
				t.Errorf("error %v does not match ErrStart and input.Problem", err)
			}
			var l *input.Problems
			n := 1
			if errors.As(err, &l) {
				n = l.Len()
			}
			if n != len(tc.want) {
				t.Errorf("%d problems, want %d: %v", n, len(tc.want), err)
			}
			for _, w := range tc.want {
				if !strings.Contains(err.Error()+"\n"+fmt.Sprint(l), w) {
					t.Errorf("error lacks %q:\n%v", w, l)
				}
			}
		})
	}
	// A leg without spans (two buildings entered at one junction) is a start like any other.
	st, err := ParseStart("r.geojson", []byte(`{"type":"FeatureCollection","features":[{"type":"Feature","properties":{"link":"A-B","leg":"primary","medium":"os2","spans":[]}}]}`))
	if err != nil || len(st.Legs) != 1 || st.Legs[0].Spans == nil {
		t.Errorf("a leg of no spans: %v, %v", st, err)
	}
}

// TestReadStartFolder: --start-from takes a plan's output folder; a missing folder, a file
// and a folder without routes.geojson are each named with what was wanted.
func TestReadStartFolder(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "routes.geojson")
	os.WriteFile(file, []byte("{}"), 0o644)
	empty := filepath.Join(dir, "empty")
	os.Mkdir(empty, 0o755)
	for _, tc := range []struct{ dir, want string }{
		{filepath.Join(dir, "nosuch"), "no such folder"},
		{file, "is a file, not a folder"},
		{empty, "has no routes.geojson"},
	} {
		_, err := ReadStart(tc.dir, 0)
		if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.Contains(err.Error(), "an earlier plan's output folder") {
			t.Errorf("ReadStart(%s): %v; want %q and what was wanted", tc.dir, err, tc.want)
		}
	}
}
