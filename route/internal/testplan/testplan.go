package testplan

import (
	"bytes"
	"context"
	"encoding/csv"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"slices"
	"spanwright/geo"
	"spanwright/media"
	"spanwright/route"
	"spanwright/route/fileset"
	"spanwright/route/internal/campusgen"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/routing"
	"spanwright/route/site"
	"strings"
	"testing"
)

// PullSolve plans the pull campus with the plan's defaults, changed by edit.
func PullSolve(t *testing.T, ductMM float64, spare int, edit func(p *plan.Plan)) (*route.Result, error) {
	t.Helper()
	return PullSolveJSON(t, testsite.PullCampus(ductMM, spare), edit)
}

// PullSolveJSON plans a campus given as GeoJSON with the plan's defaults, changed by edit.
func PullSolveJSON(t *testing.T, campus string, edit func(p *plan.Plan)) (*route.Result, error) {
	t.Helper()
	c, err := geo.Parse("pull.geojson", []byte(campus))
	if err != nil {
		t.Fatal(err)
	}
	net, err := geo.Build(c, geo.Options{})
	if err != nil {
		t.Fatal(err)
	}
	p := plan.Default
	p.File, p.Name, p.Hub = "pull.yaml", "pull test", "A"
	if edit != nil {
		edit(&p)
	}
	eng, err := plan.Engine(&p)
	if err != nil {
		t.Fatal(err)
	}
	return route.SolveWith(context.Background(), site.NewSite(c, net), &p, eng)
}

func LegOf(t *testing.T, r *route.Result, link string) (int, *routing.Leg) {
	t.Helper()
	for i := range r.Legs {
		if r.Legs[i].Link.ID == link && r.Legs[i].Name == routing.LegPrimary {
			if !r.Legs[i].Feasible {
				t.Fatalf("%s: infeasible: %s", link, r.Legs[i].Reason)
			}
			return i, &r.Legs[i]
		}
	}
	t.Fatalf("no leg %s", link)
	return 0, nil
}

func BOMQty(b *media.BOM, item string) float64 {
	q := 0.0
	for _, l := range b.Lines {
		if l.Item == item {
			q += l.Quantity
		}
	}
	return q
}

func BOMLine(b *media.BOM, prefix string) (media.BOMLine, bool) {
	for _, l := range b.Lines {
		if strings.HasPrefix(l.Item, prefix) {
			return l, true
		}
	}
	return media.BOMLine{}, false
}

func DemoResult(t testing.TB) *route.Result {
	t.Helper()
	s, p := testsite.Demo(t)
	return SolvePlan(t, s, p)
}

// DemoOperatingLoss plans the demo and returns the result and the loss of its first leg at
// that leg's first operating wavelength, for a test to change by hand; it fails t when there
// is none.
func DemoOperatingLoss(t testing.TB) (*route.Result, *media.Loss) {
	t.Helper()
	r := DemoResult(t)
	l := &r.Legs[0]
	j := slices.IndexFunc(l.Losses, func(x media.Loss) bool { return x.Operating })
	if j < 0 {
		t.Fatalf("leg %s has no operating wavelength", l.Label())
	}
	return r, &l.Losses[j]
}

// SolvePlan plans p on site s with p's own engine, failing t on an error.
func SolvePlan(tb testing.TB, s *site.Site, p *plan.Plan) *route.Result {
	tb.Helper()
	eng, err := plan.Engine(p)
	if err != nil {
		tb.Fatal(err)
	}
	r, err := route.SolveWith(context.Background(), s, p, eng)
	if err != nil {
		tb.Fatal(err)
	}
	return r
}

func FileOf(t *testing.T, files []fileset.OutputFile, name string) []byte {
	t.Helper()
	for _, f := range files {
		if f.Name == name {
			return f.Data
		}
	}
	t.Fatalf("no output %s", name)
	return nil
}

func ReadCSV(t *testing.T, data []byte) [][]string {
	t.Helper()
	rows, err := csv.NewReader(bytes.NewReader(data)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// PassageResult plans the pull campus (testsite.PullCampus) with its ids changed by ids (nil
// keeps them), then gives the leg hub–C by hand what the optimizer will give a leg that
// passes the campus: the entrances used at both ends (the network's own entries), a building
// it passes through (b) and two junctions where it turns at an added handhole: J0002, where
// the proposed duct P leaves D, and turn. The leg hub–B keeps them empty. Ids are given as the
// campus has them after the change.
func PassageResult(t *testing.T, ids *strings.Replacer, hub, b, c, turn string) *route.Result {
	t.Helper()
	campus := testsite.PullCampus(100, 1)
	if ids != nil {
		campus = ids.Replace(campus)
	}
	r, err := PullSolveJSON(t, campus, func(p *plan.Plan) { p.Hub = hub })
	if err != nil {
		t.Fatal(err)
	}
	_, leg := LegOf(t, r, hub+"-"+c)
	entry := func(building string) string {
		for _, e := range r.Site.Net.Entrances {
			if e.Building == building {
				return e.ID
			}
		}
		t.Fatalf("building %q has no entrance", building)
		return ""
	}
	leg.EntranceFrom, leg.EntranceTo = entry(hub), entry(c)
	leg.Crosses = []string{b}
	leg.Turns = []string{"J0002", turn}
	// The bill's turn handholes, as the routing would give them for these turns.
	r.Estimate.Construction.TurnJunctions = slices.Compact(slices.Sorted(slices.Values(leg.Turns)))
	return r
}

// Openpyxl returns Debian's Python (/usr/bin/python3) when openpyxl imports there
// (python3-openpyxl, the independent .xlsx reader the workbook tests use); it fails the test
// under CI=true, where .ci/run installs it, and skips it elsewhere.
func Openpyxl(t *testing.T) string {
	t.Helper()
	py := "/usr/bin/python3"
	if err := exec.Command(py, "-c", "import openpyxl").Run(); err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatalf("python3-openpyxl is needed in CI: %v", err)
		}
		t.Skip("python3-openpyxl not installed (apt-get install python3-openpyxl)")
	}
	return py
}

// CampusSite writes the generated campus of n buildings (campusgen.BenchOptions, seed 1, as
// campusfiles writes it) to a temporary folder and loads it and its plan as the command does.
func CampusSite(tb testing.TB, n int) (*site.Site, *plan.Plan) {
	tb.Helper()
	dir := tb.TempDir()
	if err := campusgen.WriteFiles(dir, campusgen.Generate(1, campusgen.BenchOptions(n)), 4); err != nil {
		tb.Fatal(err)
	}
	p, err := plan.LoadPlan(filepath.Join(dir, "plan.yaml"))
	if err != nil {
		tb.Fatal(err)
	}
	return testsite.Load(tb, p), p
}

// DropPriceKeys returns the price book data without the top-level keys named, each with the
// indented lines under it, for tests of a book that leaves prices out.
func DropPriceKeys(data []byte, keys ...string) []byte {
	var keep []string
	skip := false
	for _, line := range strings.Split(string(data), "\n") {
		if slices.ContainsFunc(keys, func(k string) bool { return strings.HasPrefix(line, k+":") }) {
			skip = true
			continue
		}
		if skip && strings.HasPrefix(line, "  ") {
			continue
		}
		skip = false
		keep = append(keep, line)
	}
	return []byte(strings.Join(keep, "\n"))
}

// DemoBookWith writes the demo price book (media/prices-demo.yaml) with the top-level lines
// extra added at its end into a temporary folder of tb, and returns the file's path: the demo
// with an optional price it leaves out.
func DemoBookWith(tb testing.TB, extra string) string {
	tb.Helper()
	_, here, _, _ := runtime.Caller(0)
	data, err := os.ReadFile(filepath.Join(filepath.Dir(here), "..", "..", "..", "media", "prices-demo.yaml"))
	if err != nil {
		tb.Fatal(err)
	}
	path := filepath.Join(tb.TempDir(), "prices.yaml")
	if err := os.WriteFile(path, append(data, extra...), 0o644); err != nil {
		tb.Fatal(err)
	}
	return path
}

// DemoBookWithout writes the demo price book (invented prices) without its line line (the
// whole line, without its newline) into a temporary file of tb and returns the file's path;
// it fails tb when the book has no such line.
func DemoBookWithout(tb testing.TB, line string) string {
	tb.Helper()
	_, here, _, _ := runtime.Caller(0)
	data, err := os.ReadFile(filepath.Join(filepath.Dir(here), "..", "..", "..", "media", "prices-demo.yaml"))
	if err != nil {
		tb.Fatal(err)
	}
	out := bytes.Replace(data, []byte("\n"+line+"\n"), []byte("\n"), 1)
	if len(out) == len(data) {
		tb.Fatalf("demo price book: no line %q", line)
	}
	path := filepath.Join(tb.TempDir(), "prices.yaml")
	if err := os.WriteFile(path, out, 0o644); err != nil {
		tb.Fatal(err)
	}
	return path
}

// TransitionBooks writes two edits of the demo price book (invented prices) into a temporary
// folder of tb and returns it: indoor/outdoor single-mode at 6.26 a metre instead of 3.26, so
// that over short routes entrance transitions (enclosures, trays and splices) cost less than
// it, as "cheap.yaml" with the entrance splice enclosure at 5.00 and as "none.yaml" without
// its price.
func TransitionBooks(tb testing.TB) string {
	tb.Helper()
	_, here, _, _ := runtime.Caller(0)
	book, err := os.ReadFile(filepath.Join(filepath.Dir(here), "..", "..", "..", "media", "prices-demo.yaml"))
	if err != nil {
		tb.Fatal(err)
	}
	const demoLine = "transition_splice_each: 260.00\n"
	priced := strings.Replace(string(book), "indoor-outdoor: {12: 2.02, 24: 3.26,", "indoor-outdoor: {12: 2.02, 24: 6.26,", 1)
	if priced == string(book) || !strings.Contains(priced, demoLine) {
		tb.Fatal("the demo book's os2 indoor-outdoor or transition prices moved")
	}
	dir := tb.TempDir()
	for name, text := range map[string]string{"cheap.yaml": strings.Replace(priced, demoLine, "transition_splice_each: 5.00\n", 1),
		"none.yaml": strings.Replace(priced, demoLine, "", 1)} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	return dir
}

// DemoDesign plans the demo campus and plan with its design edited by edit.
func DemoDesign(tb testing.TB, edit func(d *plan.Design)) *route.Result {
	tb.Helper()
	s, p := testsite.Demo(tb)
	q := *p
	edit(&q.Design)
	return SolvePlan(tb, s, &q)
}
