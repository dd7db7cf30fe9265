package report

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"html/template"
	"math"
	"regexp"
	"strings"
	"sync"
	"testing"

	"spanwright/media"
	"spanwright/route"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/site"
)

const (
	demoPlan   = "../../testdata/demo/plan.yaml"
	markupPlan = "testdata/markup/plan.yaml"
)

var (
	solved   = map[string]*route.Result{}
	solvedMu sync.Mutex
)

// result plans the plan file once per test binary.
func result(t *testing.T, path string) *route.Result {
	t.Helper()
	solvedMu.Lock()
	defer solvedMu.Unlock()
	if r, ok := solved[path]; ok {
		return r
	}
	p, err := plan.LoadPlan(path)
	if err != nil {
		t.Fatal(err)
	}
	var files []string
	for _, c := range p.Campus {
		files = append(files, p.Path(c))
	}
	site, err := site.Load(context.Background(), nil, files, site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
	if err != nil {
		t.Fatal(err)
	}
	r, err := route.Solve(context.Background(), site, p)
	if err != nil {
		t.Fatal(err)
	}
	solved[path] = r
	return r
}

func render(t *testing.T, path string, opt Options) string {
	t.Helper()
	b, err := Plan(context.Background(), result(t, path), opt)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

var dataLeg = regexp.MustCompile(`<path d="[^"]*" class="route" stroke="[^"]*"(?: stroke-dasharray="[^"]*")? data-leg="([^"]*)"`)

// TestPlanEscapesInput renders a campus whose names and ids hold markup: every one must come
// out as text (html/template's escaping), and the page must hold no element from the input.
func TestPlanEscapesInput(t *testing.T) {
	html := render(t, markupPlan, Options{})
	for _, bad := range []string{"<script", "<img", "<b>co</b>", "<hh>"} {
		if strings.Contains(html, bad) {
			t.Errorf("report holds %q from the input unescaped", bad)
		}
	}
	for _, want := range []string{
		"&lt;script&gt;alert(1)&lt;/script&gt;",              // the hub's name
		"&amp;&lt;&gt;&#34;&#39;",                            // the hub's id
		"&lt;img src=x onerror=alert(2)&gt;",                 // another building's name
		"&lt;script&gt;alert(&#39;plan&#39;)&lt;/script&gt;", // the plan's name
		"Far &amp; away &#34;hall&#34;",
		"D&lt;1&gt;", "D2&amp;", "&lt;hh&gt;: handhole",
		`data-leg="&amp;&lt;&gt;&#34;&#39;-NEAR/primary"`,
	} {
		if !strings.Contains(html, want) {
			t.Errorf("report lacks the escaped text %q", want)
		}
	}
}

// TestPlanInfeasibleFirst checks the links table: the infeasible legs (the diverse legs the
// one pathway cannot give) come first, with the optimizer's reason.
func TestPlanInfeasibleFirst(t *testing.T) {
	r := result(t, markupPlan)
	html := render(t, markupPlan, Options{})
	bodies := regexp.MustCompile(`<tbody class="leg( infeasible)?">`).FindAllStringSubmatch(html, -1)
	if len(bodies) != len(r.Legs) {
		t.Fatalf("%d leg rows, want %d", len(bodies), len(r.Legs))
	}
	bad := 0
	for _, l := range r.Legs {
		if !l.Feasible {
			bad++
		}
	}
	if bad == 0 {
		t.Fatal("fixture has no infeasible leg")
	}
	for i, b := range bodies {
		if got, want := b[1] != "", i < bad; got != want {
			t.Errorf("leg row %d: infeasible %v, want %v (infeasible legs first)", i, got, want)
		}
	}
	if !strings.Contains(html, "<b>Infeasible:</b> no diverse route: every route uses span") {
		t.Error("the infeasible legs' reason is missing")
	}
	if !strings.Contains(html, fmt.Sprintf("%d legs are infeasible", bad)) {
		t.Error("no alert about infeasible legs")
	}
}

// TestPlanRoutePaths counts the map's route paths: one per feasible leg, each named once.
func TestPlanRoutePaths(t *testing.T) {
	for _, path := range []string{demoPlan, markupPlan} {
		t.Run(path, func(t *testing.T) {
			r := result(t, path)
			html := render(t, path, Options{})
			want := map[string]bool{}
			for _, l := range r.Legs {
				if l.Feasible {
					want[l.Link.ID+"/"+l.Name] = true
				}
			}
			got := dataLeg.FindAllStringSubmatch(html, -1)
			if len(got) != len(want) {
				t.Fatalf("%s: %d route paths, want %d", path, len(got), len(want))
			}
			if n := strings.Count(html, "data-leg="); n != len(want) {
				t.Errorf("%s: %d data-leg attributes, want %d", path, n, len(want))
			}
			for _, g := range got {
				if strings.Contains(g[1], "&") {
					continue // escaped ids, checked in TestPlanEscapesInput
				}
				if !want[g[1]] {
					t.Errorf("%s: route path for %q, which is no feasible leg", path, g[1])
				}
			}
		})
	}
}

// TestPlanSelfContained checks that the page fetches nothing: no external reference, no
// script, inline style only, and the A3 print rules are there.
func TestPlanSelfContained(t *testing.T) {
	html := render(t, demoPlan, Options{})
	for _, bad := range []string{"http:", "https:", "//cdn", "<link", "@import", "url(", " src=", "<script", "<iframe", "<object"} {
		if strings.Contains(html, bad) {
			t.Errorf("demo report contains %q", bad)
		}
	}
	for _, want := range []string{"<!DOCTYPE html>", `<meta charset="utf-8">`, "@page { size: A3;", "@media print", "<svg class=\"map\""} {
		if !strings.Contains(html, want) {
			t.Errorf("demo report lacks %q", want)
		}
	}
}

// TestPlanContent checks the sections the report must carry, on the demo.
func TestPlanContent(t *testing.T) {
	r := result(t, demoPlan)
	html := render(t, demoPlan, Options{})
	s := output.Summarize(r)
	for _, want := range []string{
		"<h2>Summary</h2>", "<h2>Map</h2>", "<h2>Links</h2>", "<h2>Pull sections</h2>", "<h2>Duct fill</h2>",
		"<h2>Warnings</h2>", "<h2>Safety</h2>", "<h2>Sources of the standard values</h2>",
		"Cost by category", money(s.TotalCents) + " USD", "budget " + money(*s.BudgetCents),
		// The gap to the bound as the terminal prints it (output.GapText, in percent).
		", gap " + output.GapText(s.GapPct) + " <span",
		"13,481.4 m", // total route of the demo, as summary.json has it
		// The new trench with its bored part, in the terminal's words (output.NewWorkParts):
		// the demo bores P-5's 20.0 m (tester 11's finding 13: the report said "new trench"
		// for bored metres).
		"20.0 m of it bored; 74.8 m of it building laterals)",
		// The safety cautions the demo's work calls for (route.Result.Cautions): locates, trench
		// (29 CFR 1926 Subpart P), bore, the pole line, the tunnel, maintenance holes, lasers.
		"one-call service", "invisible", "confined spaces", "<b>Trench and excavation cave-in.</b>", "29 CFR 1926 Subpart P",
		"<b>Directional bore.</b>", "<b>Pole lines.</b>", "29 CFR 1910.268(n)", "<b>Utility tunnels.</b>",
		"In this plan: 3 legs on aerial pathways ", "authority having jurisdiction",
		// The cable's own jacket beside the medium: the demo's outside-plant legs are black
		// (TIA-598: outside-plant jackets usually black, as the catalog says, seen), and its
		// sources name the PHYs it uses (IEEE 802.3).
		"jacket black", "jacket yellow", "100GBASE-DR",
		// TIA-598 premises jacket colour of single-mode (REFERENCES.md, seen), named beside the swatch.
		"os2, OS2 single-mode: yellow", "NFPA 70 Chapter 9 Table 1", "IEEE 802.3",
		// Legend entries the demo needs: tunnel, pole line, proposed trench, high EMI, structures.
		"existing utility tunnel", "existing aerial (pole line)", "proposed trench, not used (dashed)", "high EMI (halo)",
		"maintenance-hole", "handhole", "pull-box",
		// The demo's counted laterals (LEC, MUS, RSA) run to a junction, where the pulls along
		// them start; none taps a duct (each building is offered a lateral to every pathway
		// within max_lateral_m, and a junction there saves the tap's handhole).
		"lateral of LEC:3",
	} {
		if !strings.Contains(html, want) {
			t.Errorf("demo report lacks %q", want)
		}
	}
	for _, c := range media.Categories() {
		if _, ok := s.CostByCategory[c]; !ok {
			t.Errorf("summary has no %s category", c)
		}
	}
	// Every building is on the map with its id as a label.
	for _, b := range r.Site.Campus.Buildings {
		if !strings.Contains(html, `text-anchor="middle">`+b.ID+`</text>`) {
			t.Errorf("map has no label for building %s", b.ID)
		}
	}
	if n := strings.Count(html, `<tr class="main">`); n != len(r.Legs) {
		t.Errorf("%d link rows, want %d", n, len(r.Legs))
	}
	est := r.Estimate
	if n := strings.Count(html, "<tr><td><b>") + strings.Count(html, `<tr class="over"><td><b>`); n != len(est.Pulls) {
		t.Errorf("%d pull rows, want %d", n, len(est.Pulls))
	}
}

// TestPlanImperial shows lengths in feet (1 ft = 0.3048 m exactly).
func TestPlanImperial(t *testing.T) {
	html := render(t, demoPlan, Options{Units: output.UnitsImperial})
	// The demo's total route, 13 481.5 m in summary.json (a few cm less unrounded) / 0.3048 = 44 230.5 ft; the metres
	// are converted before rounding (output.Units.Rounded), as in every other output.
	if !strings.Contains(html, "44,230.5 ft") {
		t.Error("imperial report lacks the total route in feet")
	}
	if !strings.Contains(html, "lengths in ft") || !strings.Contains(html, "Tension (lbf)") {
		t.Error("imperial report does not say its units")
	}
}

// TestPlanDeterministic renders the demo twice from two solves: same bytes.
func TestPlanDeterministic(t *testing.T) {
	a := render(t, demoPlan, Options{})
	p, err := plan.LoadPlan(demoPlan)
	if err != nil {
		t.Fatal(err)
	}
	site, err := site.Load(context.Background(), nil, []string{p.Path(p.Campus[0])}, site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
	if err != nil {
		t.Fatal(err)
	}
	r, err := route.Solve(context.Background(), site, p)
	if err != nil {
		t.Fatal(err)
	}
	b, err := Plan(context.Background(), r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if a != string(b) {
		t.Error("two renders of the demo differ")
	}
}

// TestColourOf checks the drawn colours against TIA-598's names (REFERENCES.md, seen): each
// of the twelve strand colours and the jacket colours aqua and lime green has its own colour,
// and the catalog's media get the jacket colour of their type.
func TestColourOf(t *testing.T) {
	seen := map[string]string{}
	for _, n := range []string{"blue", "orange", "green", "brown", "slate", "white", "red", "black", "yellow",
		"violet", "rose", "aqua", "lime green"} {
		hex, label := colourOf(n)
		if hex == unknownHex || label != n {
			t.Errorf("%s: got %s %q", n, hex, label)
		}
		if o, dup := seen[hex]; dup {
			t.Errorf("%s and %s are drawn alike", n, o)
		}
		seen[hex] = n
	}
	cat := media.DefaultCatalog()
	cases := []struct{ medium, colour string }{
		{"om3", "aqua"},       // TIA-598: aqua for OM3/OM4 (seen)
		{"om4", "aqua"},       // TIA-598: aqua for OM3/OM4 (seen)
		{"om5", "lime green"}, // TIA-598: lime green for OM5 (seen)
		{"os2", "yellow"},     // TIA-598: yellow for single-mode (seen)
		{"cat6a", "no TIA-598 colour"},
	}
	for _, tc := range cases {
		t.Run(tc.medium, func(t *testing.T) {
			if got := mediumOf(cat, tc.medium).ColourLabel; got != tc.colour {
				t.Errorf("%s: colour %q, want %q", tc.medium, got, tc.colour)
			}
		})
	}
	if hex, label := colourOf("tartan"); hex != unknownHex || !strings.Contains(label, "not a TIA-598") {
		t.Errorf("unknown colour: got %s %q", hex, label)
	}
}

// TestProjectionScale checks the map's local projection against geodesic distances computed
// with GeographicLib on WGS84 (REFERENCES.md, computed): a campus-scale north and east step.
func TestProjectionScale(t *testing.T) {
	cases := []struct {
		name                   string
		lat1, lon1, lat2, lon2 float64
		wantM                  float64
	}{
		{"500 m north at 40° N", 40.0, -75.0, 40.0045, -75.0, 499.656},
		{"427 m east at 40° N", 40.0, -75.0, 40.0, -74.995, 426.969},
		{"434 m north-east at 51.5° N", 51.5, -0.1, 51.503, -0.096, 434.225},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			var b bounds
			b.add(tc.lon1, tc.lat1)
			b.add(tc.lon2, tc.lat2)
			p := newProjection(b, 1000, 1000, 10)
			a, c := p.at(tc.lon1, tc.lat1), p.at(tc.lon2, tc.lat2)
			gotM := math.Hypot(c.X-a.X, c.Y-a.Y) / p.pxPerM
			if math.Abs(gotM-tc.wantM) > 0.001*tc.wantM {
				t.Errorf("%s: %.3f m on the map, want %.3f m (GeographicLib) within 0.1 %%", tc.name, gotM, tc.wantM)
			}
			if tc.lat2 > tc.lat1 && c.Y >= a.Y {
				t.Errorf("%s: north is not up", tc.name)
			}
		})
	}
}

// TestScaleBar checks that the bar's drawn width is its label's length at the map's scale.
func TestScaleBar(t *testing.T) {
	var b bounds
	b.add(-3.74, 52.34)
	b.add(-3.71, 52.36)
	p := newProjection(b, 1000, 1100, 36)
	for _, tc := range []struct {
		units  string
		perM   float64
		suffix string
	}{{output.UnitsMetric, 1, " m"}, {output.UnitsImperial, output.FtPerM, " ft"}} {
		sb := newScaleBar(p, Options{Units: tc.units})
		if !strings.HasSuffix(sb.Label, tc.suffix) {
			t.Fatalf("%s: label %q", tc.units, sb.Label)
		}
		var length, w float64
		if err := json.Unmarshal([]byte(strings.ReplaceAll(strings.TrimSuffix(sb.Label, tc.suffix), ",", "")), &length); err != nil {
			t.Fatal(err)
		}
		if err := json.Unmarshal([]byte(sb.TotalW), &w); err != nil {
			t.Fatal(err)
		}
		if got := w / p.pxPerM * tc.perM; math.Abs(got-length) > 0.2*tc.perM/p.pxPerM+1e-9 {
			t.Errorf("%s: bar %.1f px is %.2f at scale, label says %g", tc.units, w, got, length)
		}
		if len(sb.Segs) != 4 {
			t.Errorf("%s: %d segments, want 4", tc.units, len(sb.Segs))
		}
	}
}

// TestOffsetLine checks the offset of diverse legs by plane geometry (computed): a straight
// line moves by d to its right, and a right-angle corner's miter point lies d·√2 from it.
func TestOffsetLine(t *testing.T) {
	cases := []struct {
		name string
		in   []xy
		want []xy
	}{
		{"straight east", []xy{{0, 0}, {10, 0}}, []xy{{0, 6}, {10, 6}}}, // y down: right of east is +y
		{"corner east then south", []xy{{0, 0}, {10, 0}, {10, 10}}, []xy{{0, 6}, {4, 6}, {4, 10}}},
		{"repeated point", []xy{{0, 0}, {0, 0}, {0, 10}}, []xy{{-6, 0}, {-6, 0}, {-6, 10}}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got := offsetLine(tc.in, 6)
			for i := range got {
				if math.Hypot(got[i].X-tc.want[i].X, got[i].Y-tc.want[i].Y) > 1e-9 {
					t.Fatalf("%s: got %v, want %v", tc.name, got, tc.want)
				}
			}
			if tc.name == "corner east then south" {
				if d := math.Hypot(got[1].X-10, got[1].Y-0); math.Abs(d-6*math.Sqrt2) > 1e-9 {
					t.Errorf("miter at %.3f, want %.3f", d, 6*math.Sqrt2)
				}
			}
		})
	}
}

func TestFormat(t *testing.T) {
	cases := []struct{ got, want string }{
		{money(123456789), "1,234,567.89"},
		{money(-5), "−0.05"},
		{money(100), "1.00"},
		{moneyShort(123456789), "1,234,568"},
		{group("1234567.5"), "1,234,567.5"},
		{group("-999.0"), "−999.0"},
		{dB(-0.001), "0.00"},
		{dB(-1.5), "−1.50"},
		{num(-0.04), "0.0"},
		{Options{}.lengthU(1234.56), "1,234.6 m"},
		{Options{Units: output.UnitsImperial}.lengthU(30.48), "100.0 ft"}, // 1 ft = 0.3048 m exactly
	}
	for i, tc := range cases {
		if tc.got != tc.want {
			t.Errorf("case %d: got %q, want %q", i, tc.got, tc.want)
		}
	}
	for _, x := range []struct{ in, want float64 }{{0.9, 0.5}, {1, 1}, {1.9, 1}, {4.99, 2}, {270, 200}, {999, 500}} {
		if got := niceLength(x.in); got != x.want {
			t.Errorf("niceLength(%g) = %g, want %g", x.in, got, x.want)
		}
	}
}

// TestExtraAndFile checks the sweep hook and the output file name.
func TestExtraAndFile(t *testing.T) {
	r := result(t, markupPlan)
	files, err := Extra(Options{})(context.Background(), r)
	if err != nil {
		t.Fatal(err)
	}
	if len(files) != 1 || files[0].Name != FileName {
		t.Fatalf("Extra: got %d files", len(files))
	}
	direct, _ := Plan(context.Background(), r, Options{})
	if !bytes.Equal(files[0].Data, direct) {
		t.Error("Extra's file differs from Plan")
	}
}

// TestBillInUnitsWithSeparators: the report writes the bill of materials' lengths and the
// cost chart's money with one formatting of each (Options.lengthU, money: thousands
// separators), lengths in the run's units (1 ft = 0.3048 m exactly, NIST SP 811 B.8); each
// bar of the cost chart gives its amount and its share of the total, the caption the currency.
func TestBillInUnitsWithSeparators(t *testing.T) {
	r := result(t, demoPlan)
	html := render(t, demoPlan, Options{Units: output.UnitsImperial})
	var pull media.BOMLine
	for _, l := range r.Estimate.BOM.Lines {
		if l.WorkUnit == media.UnitM && l.Work > pull.Work {
			pull = l
		}
	}
	if pull.Work < 1000 {
		t.Fatalf("demo: no labour line of 1,000 m or more: %+v", pull)
	}
	ft := group(fmt.Sprintf("%.1f", pull.Work/0.3048))
	// The rate with the decimals that make the work over it give the line's hours (media's
	// Describe): 60 m per hour is 196.850… ft, written 196.85 (tester 13's finding I).
	if want := fmt.Sprintf("%s: %s ft at %.2f ft per hour", pull.Item, ft, pull.RatePerHour/0.3048); !strings.Contains(html, want) {
		t.Errorf("report lacks %q", want)
	}
	if !strings.Contains(ft, ",") {
		t.Errorf("%s ft: no thousands separator", ft)
	}
	table := html[strings.Index(html, "Largest lines of the bill of materials"):]
	table = table[:strings.Index(table, "</table>")]
	if m := regexp.MustCompile(`\d{4}(\.\d+)? (m|ft)\b`).FindString(table); m != "" {
		t.Errorf("bill of materials table: %q without separators or in metres", m)
	}
	b := r.Estimate.BOM
	if !strings.Contains(html, "Cost by category, in USD") {
		t.Errorf("cost chart caption does not give the currency")
	}
	share := fmt.Sprintf("%s (%.1f %%)", money(b.ContingencyCents), 100*float64(b.ContingencyCents)/float64(b.TotalCents))
	if !strings.Contains(html, `class="small">markup: contingency</text>`) || !strings.Contains(html, `class="small">`+share+`</text>`) {
		t.Errorf("cost chart: contingency not labelled a markup with %q", share)
	}
}

// TestDiametersInUnits: the duct fill table gives duct and cable diameters in the report's
// units, equal cables counted once (a duct of 21 cables listed 21 diameters): millimetres,
// or inches at 25.4 mm each (exactly, NIST SP 811 B.8).
func TestDiametersInUnits(t *testing.T) {
	t.Parallel()
	metric, imperial := Options{}, Options{Units: output.UnitsImperial}
	cases := []struct {
		opt  Options
		ods  []float64
		want string
	}{
		{metric, []float64{10.5, 10.5, 10.5, 12}, "3 × 10.5, 12.0 mm"},
		{metric, []float64{12, 10.5}, "12.0, 10.5 mm"},
		{imperial, []float64{10.5, 10.5}, "2 × 0.41 in"},
		{imperial, []float64{25.4}, "1.00 in"},
	}
	for _, tc := range cases {
		if got := tc.opt.diameters(tc.ods); got != tc.want {
			t.Errorf("%s %v: %q, want %q", tc.opt.Units, tc.ods, got, tc.want)
		}
	}
	if got := metric.diameter(101.6); got != "102" {
		t.Errorf("a 4 in duct in mm: %q, want 102", got)
	}
	if got := imperial.diameter(101.6); got != "4.00" {
		t.Errorf("a 4 in duct in inches: %q, want 4.00", got)
	}
}

// TestPlanCautionsFromResult: the report's Safety section is the result's one list of
// cautions (route.Result.Cautions), in its order, each with what in the plan calls for it and
// its source; with none it says so rather than leaving an empty list, and still defers to the
// local codes and the authority having jurisdiction.
func TestPlanCautionsFromResult(t *testing.T) {
	r := *result(t, demoPlan)
	b, err := Plan(context.Background(), &r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	at := 0
	for _, c := range r.Cautions {
		i := strings.Index(html[at:], "<b>"+template.HTMLEscapeString(c.Title)+".</b>")
		if i < 0 {
			t.Fatalf("caution %q missing, or out of the result's order", c.Title)
		}
		at += i
		if !strings.Contains(html[at:], "In this plan: "+template.HTMLEscapeString(c.Where)+". Source: "+template.HTMLEscapeString(c.Source)) {
			t.Errorf("caution %q: its where and source are not beside it", c.Title)
		}
	}
	r.Cautions = nil
	b, err = Plan(context.Background(), &r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	html = string(b)
	for _, want := range []string{"calls for none of the cautions", "authority having jurisdiction"} {
		if !strings.Contains(html, want) {
			t.Errorf("a plan with no cautions: the report lacks %q", want)
		}
	}
}

// TestPlanNotes: the plan's notes (a links entry dropped for the hub, a warm start's links
// placed afresh) and the folder its search started from are in the report, as on the terminal
// and in summary.json (tester 12's finding 13: the owner's document did not say that a
// requirement was dropped, nor that the search was a warm start's); a plan from scratch
// without notes says so.
func TestPlanNotes(t *testing.T) {
	r := *result(t, demoPlan)
	if html := render(t, demoPlan, Options{}); !strings.Contains(html, "<h2>Notes</h2>\n\n<p>None: planned from scratch") {
		t.Error("a plan from scratch without notes: the report does not say so")
	}
	r.Notes = []string{"links[0] (to LIB) dropped: LIB is the hub of this plan"}
	r.StartedFrom = "base-1"
	b, err := Plan(context.Background(), &r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	for _, want := range []string{"<li>links[0] (to LIB) dropped: LIB is the hub of this plan</li>",
		"search began from the routes of <b>base-1</b> (summary.json: started_from)"} {
		if !strings.Contains(html, want) {
			t.Errorf("report lacks %q", want)
		}
	}
}
