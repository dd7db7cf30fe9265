package route

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route/workbook"
)

// Pull campus, on a local metre grid at latitude 52 (invented place): the hub A and the
// served building B are joined by one duct D running (10, 15) inside A, south to (10, 0),
// east through handhole HH-1 at (110, 0) to (210, 0), then north to (210, 115) inside B:
// two right-angle bends, one each side of the handhole. A proposed duct P under asphalt
// runs from (210, 0) east and north into building C, which has no other pathway.
const pullLat = 52.0

func pullX(m float64) float64 { return -1 + m/(111320*math.Cos(pullLat*math.Pi/180)) }
func pullY(m float64) float64 { return pullLat + m/111000 }

// pullPoint is a grid point as the campus file has it, with 7 decimals.
func pullPoint(x, y float64) [2]float64 {
	r := func(v float64) float64 { f, _ := strconv.ParseFloat(strconv.FormatFloat(v, 'f', 7, 64), 64); return f }
	return [2]float64{r(pullX(x)), r(pullY(y))}
}

// boxJSON is a 20 m square building centred on (x, y) of the pull grid, as a GeoJSON feature.
func boxJSON(id, role string, x, y float64) string {
	r := ""
	if role != "" {
		r = fmt.Sprintf(`,"role":%q`, role)
	}
	return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":%q%s},"geometry":{"type":"Polygon","coordinates":[[[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f]]]}}`,
		id, r, pullX(x-10), pullY(y-10), pullX(x+10), pullY(y-10), pullX(x+10), pullY(y+10), pullX(x-10), pullY(y+10), pullX(x-10), pullY(y-10))
}

func pullCampusJSON(ductMM float64, spare int) string {
	line := func(pts ...float64) string {
		var s []string
		for i := 0; i+1 < len(pts); i += 2 {
			s = append(s, fmt.Sprintf("[%.7f,%.7f]", pullX(pts[i]), pullY(pts[i+1])))
		}
		return "[" + strings.Join(s, ",") + "]"
	}
	f := []string{
		boxJSON("A", "mc", 10, 25), boxJSON("B", "", 210, 125), boxJSON("C", "", 300, 25),
		fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"D","type":"duct","spare_ducts":%d,"duct_mm":%g},"geometry":{"type":"LineString","coordinates":%s}}`,
			spare, ductMM, line(10, 15, 10, 0, 110, 0, 210, 0, 210, 115)),
		fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"P","type":"duct","status":"proposed","surface":"asphalt","duct_mm":%g},"geometry":{"type":"LineString","coordinates":%s}}`,
			ductMM, line(210, 0, 300, 0, 300, 15)),
		fmt.Sprintf(`{"type":"Feature","properties":{"kind":"structure","id":"HH-1","type":"handhole"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`,
			pullX(110), pullY(0)),
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// pullSolve plans the pull campus with the plan's defaults, changed by edit.
func pullSolve(t *testing.T, ductMM float64, spare int, edit func(p *Plan)) (*Result, error) {
	t.Helper()
	return pullSolveJSON(t, pullCampusJSON(ductMM, spare), edit)
}

// pullSolveJSON plans a campus given as GeoJSON with the plan's defaults, changed by edit.
func pullSolveJSON(t *testing.T, campus string, edit func(p *Plan)) (*Result, error) {
	t.Helper()
	c, err := geo.Parse("pull.geojson", []byte(campus))
	if err != nil {
		t.Fatal(err)
	}
	net, err := geo.Build(c, geo.Options{})
	if err != nil {
		t.Fatal(err)
	}
	p := PlanDefaults
	p.File, p.Name, p.Hub = "pull.yaml", "pull test", "A"
	if edit != nil {
		edit(&p)
	}
	eng, err := Engine(&p)
	if err != nil {
		t.Fatal(err)
	}
	return SolveWith(context.Background(), NewSite(c, net), &p, eng)
}

func legOf(t *testing.T, r *Result, link string) (int, *Leg) {
	t.Helper()
	for i := range r.Legs {
		if r.Legs[i].Link.ID == link && r.Legs[i].Name == LegPrimary {
			if !r.Legs[i].Feasible {
				t.Fatalf("%s: infeasible: %s", link, r.Legs[i].Reason)
			}
			return i, &r.Legs[i]
		}
	}
	t.Fatalf("no leg %s", link)
	return 0, nil
}

// TestPullTensionByHand checks the pulling plan of a simple route against the textbook
// statics done by hand: a straight adds W·L·μ, a bend multiplies by e^(μθ) (capstan
// equation), the lower of the two pulling directions wins, and the structure between the
// bends is a pull point (TIA-569: at most 180° between pull points).
func TestPullTensionByHand(t *testing.T) {
	t.Parallel()
	r, err := pullSolve(t, 100, 2, nil)
	if err != nil {
		t.Fatal(err)
	}
	i, leg := legOf(t, r, "A-B")
	k := r.Engine.Catalog().Medium(leg.Medium).Construction(leg.Construction)
	size, _ := k.Fit(leg.StrandsCable)
	w := size.WeightKgPerM * 9.80665 // N/m, standard gravity
	const mu = 0.5                   // PlanDefaults: the usual value when unknown
	capstan := math.Exp(mu * math.Pi / 2)
	// Lengths of the straights, measured between the vertices with the geodesic distance.
	d := func(x1, y1, x2, y2 float64) float64 {
		a, b := pullPoint(x1, y1), pullPoint(x2, y2)
		return geo.DistanceM(a, b)
	}
	north, east1 := d(210, 115, 210, 0), d(210, 0, 110, 0)
	east2, south := d(110, 0, 10, 0), d(10, 0, 10, 15)
	type want struct {
		from, to, feed string
		lengthM, bend  float64
		tension, other float64
	}
	// B → HH-1: 115 m straight, 90°, 100 m. Fed at B: (115·e^(μπ/2) + 100)·W·μ; fed at HH-1:
	// (100·e^(μπ/2) + 115)·W·μ, the lower. HH-1 → A likewise with 100 m and 15 m.
	fedB := (north*capstan + east1) * w * mu
	fedHH := (east1*capstan + north) * w * mu
	fedHH2 := (east2*capstan + south) * w * mu
	fedA := (south*capstan + east2) * w * mu
	wants := []want{
		{"B", "HH-1", "HH-1", north + east1, 90, fedHH, fedB},
		{"HH-1", "A", "A", east2 + south, 90, fedA, fedHH2},
	}
	var got []PullSection
	for _, p := range r.Estimate.Pulls {
		if p.Leg == i {
			got = append(got, p)
		}
	}
	if len(got) != len(wants) {
		t.Fatalf("pull sections: got %d %+v, want %d", len(got), got, len(wants))
	}
	for n, wt := range wants {
		g := got[n]
		if g.From != wt.from || g.To != wt.to || g.FeedAt != wt.feed {
			t.Errorf("section %d: got %s → %s fed at %s, want %s → %s fed at %s", n+1, g.From, g.To, g.FeedAt, wt.from, wt.to, wt.feed)
		}
		if math.Abs(g.LengthM-wt.lengthM) > 1e-6 || math.Abs(g.BendDeg-wt.bend) > 0.01 {
			t.Errorf("section %d: got %.3f m and %.3f°, want %.3f m and %.0f°", n+1, g.LengthM, g.BendDeg, wt.lengthM, wt.bend)
		}
		if math.Abs(g.TensionN-wt.tension) > 0.05 || math.Abs(g.OtherN-wt.other) > 0.05 {
			t.Errorf("section %d: got %.2f N (other way %.2f N), want %.2f N (%.2f N)", n+1, g.TensionN, g.OtherN, wt.tension, wt.other)
		}
		if g.RatedN != k.MaxPullN || !g.WithinRating {
			t.Errorf("section %d: rated %.0f N within %v, want %.0f N within", n+1, g.RatedN, g.WithinRating, k.MaxPullN)
		}
		// TIA-569: conduit bend radius 10 × ID for fibre; SWBP = T/R at the bend (seen).
		if g.BendRadiusM != 1.0 {
			t.Errorf("section %d: bend radius %.3f m, want 1.0 m (10 × 100 mm)", n+1, g.BendRadiusM)
		}
	}
	// The SWBP at the bend when fed at A: the tension leaving the bend over its radius.
	if want := south * w * mu * capstan / 1.0; math.Abs(got[1].SWBPNPerM-want) > 0.05 {
		t.Errorf("sidewall pressure: got %.2f N/m, want %.2f N/m", got[1].SWBPNPerM, want)
	}
}

// TestPullPointAdded: with at most 100 m between pull points (TIA-569 sets 30 m for conduit
// in buildings; a plan may set any), the 215 m from B to HH-1 needs intermediate pull
// points, billed as handholes once however many legs pass them; and a bend budget below a
// single bend cannot be met, which is reported.
func TestPullPointAdded(t *testing.T) {
	t.Parallel()
	r, err := pullSolve(t, 100, 2, func(p *Plan) { p.Design.PullMaxM = 100 })
	if err != nil {
		t.Fatal(err)
	}
	if r.Estimate.AddedPullPoints == 0 {
		t.Fatalf("no pull point added")
	}
	places := map[string]bool{}
	for _, p := range r.Estimate.Pulls {
		if p.LengthM > 100+1e-9 || !p.WithinRating {
			t.Errorf("pull %s → %s: %.1f m, within %v (%s)", p.From, p.To, p.LengthM, p.WithinRating, p.Reason)
		}
		if p.AddedFrom {
			places[p.From] = true
		}
		if p.AddedTo {
			places[p.To] = true
		}
	}
	if len(places) != r.Estimate.AddedPullPoints {
		t.Errorf("added pull points %d, at %d places %v", r.Estimate.AddedPullPoints, len(places), places)
	}
	if got := bomQty(r.Estimate.BOM, "handhole for an added pull point"); got != float64(r.Estimate.AddedPullPoints) {
		t.Errorf("handholes billed for pull points: got %v, want %d", got, r.Estimate.AddedPullPoints)
	}

	r, err = pullSolve(t, 100, 2, func(p *Plan) { p.Design.PullBendDeg = 60 })
	if err != nil {
		t.Fatal(err)
	}
	i, _ := legOf(t, r, "A-B")
	var over []string
	for _, p := range r.Estimate.Pulls {
		if p.Leg == i && !p.WithinRating {
			over = append(over, p.Reason)
		}
	}
	// A single 90° bend cannot be split: each bend becomes its own section, out of rating.
	if len(over) != 2 || !strings.Contains(over[0], "bends 90.0° over 60.0°") {
		t.Errorf("sections over the bend budget: got %q", over)
	}
	found := false
	for _, w := range r.Warnings {
		found = found || strings.Contains(w, "A-B primary: pull") && strings.Contains(w, "reroute or add a structure")
	}
	if !found {
		t.Errorf("no pulling warning in %q", r.Warnings)
	}
	if s := r.Summarize(); s.PullsOverRating == 0 || s.WarningCounts["install"] == 0 {
		t.Errorf("summary: %d pulls over rating, warning counts %v", s.PullsOverRating, s.WarningCounts)
	}
}

func bomQty(b *media.BOM, item string) float64 {
	q := 0.0
	for _, l := range b.Lines {
		if l.Item == item {
			q += l.Quantity
		}
	}
	return q
}

func bomLine(b *media.BOM, prefix string) (media.BOMLine, bool) {
	for _, l := range b.Lines {
		if strings.HasPrefix(l.Item, prefix) {
			return l, true
		}
	}
	return media.BOMLine{}, false
}

// TestReelJoinsInLossBudget: a run longer than a reel is cut with mid-span splices, which
// the loss budget counts (ANSI/TIA-568.3-D splice 0.3 dB maximum, from memory) and the
// bill of materials buys (closures, trays, splicing).
func TestReelJoinsInLossBudget(t *testing.T) {
	t.Parallel()
	base, err := pullSolve(t, 100, 2, nil)
	if err != nil {
		t.Fatal(err)
	}
	cut, err := pullSolve(t, 100, 2, func(p *Plan) { p.Design.ReelM = 150 })
	if err != nil {
		t.Fatal(err)
	}
	_, a := legOf(t, base, "A-B")
	_, b := legOf(t, cut, "A-B")
	if a.Cable.Joins != 0 || a.Cable.Reels != 1 {
		t.Fatalf("4 km reels: got %d reels, %d joins", a.Cable.Reels, a.Cable.Joins)
	}
	wantReels := int(math.Ceil(b.Cable.LengthM / 150))
	if b.Cable.Reels != wantReels || b.Cable.Joins != wantReels-1 || b.Cable.Joins < 2 {
		t.Fatalf("150 m reels for %.0f m: got %d reels, %d joins, want %d reels", b.Cable.LengthM, b.Cable.Reels, b.Cable.Joins, wantReels)
	}
	if a.Medium != b.Medium || a.Construction != b.Construction {
		t.Fatalf("medium changed: %s %s → %s %s", a.Medium, a.Construction, b.Medium, b.Construction)
	}
	splice := base.Engine.Catalog().SpliceDB
	for n, x := range a.Losses {
		y := b.Losses[n]
		if d := y.LossDB - x.LossDB; math.Abs(d-float64(b.Cable.Joins)*splice) > 1e-9 {
			t.Errorf("%d nm: joins add %.4f dB, want %d × %.2f dB", x.WavelengthNM, d, b.Cable.Joins, splice)
		}
	}
	joins, splices := 0.0, 0
	for _, l := range cut.Legs {
		joins += float64(l.Cable.Joins * l.Cable.Cables)
		splices += l.Cable.Joins * l.Cable.Cables * l.Cable.Size.Count
	}
	if got := bomQty(cut.Estimate.BOM, "splice closure, mid-span join"); got != joins {
		t.Errorf("closures: got %v, want %v", got, joins)
	}
	if l, ok := bomLine(cut.Estimate.BOM, "splice fibre, mid-span joins"); !ok || l.Work != float64(splices) ||
		!strings.HasPrefix(l.Describe(nil, ""), fmt.Sprintf("splice fibre, mid-span joins: %d at", splices)) {
		t.Errorf("splicing labour: got %+v", l)
	}
	if _, ok := bomLine(base.Estimate.BOM, "splice closure"); ok {
		t.Errorf("closures bought without joins")
	}
	if s := cut.Summarize(); s.MidSpanSplices != int(joins) {
		t.Errorf("summary mid-span splices: got %d", s.MidSpanSplices)
	}
}

// TestConstruction: C is reached only over the proposed duct P, whose far end meets D at a
// junction with no structure (a new handhole there), and D's single 25 mm duct takes one
// 24-strand cable (NFPA 70 Chapter 9 Table 1: 53 % for one cable) but not two (31 %), so the
// plan adds a duct where B's and C's cables share it.
func TestConstruction(t *testing.T) {
	t.Parallel()
	r, err := pullSolve(t, 25, 1, nil)
	if err != nil {
		t.Fatal(err)
	}
	legOf(t, r, "A-C")
	if len(r.Opened) != 1 || !strings.HasPrefix(r.Opened[0], "P") {
		t.Fatalf("opened: got %v, want P", r.Opened)
	}
	con := r.Estimate.Construction
	p, _ := r.Site.Net.Span(r.Opened[0])
	if math.Abs(con.TrenchM["asphalt"]-p.LengthM) > 1e-9 || len(con.NewJunctions) != 1 {
		t.Errorf("trench in asphalt %.2f m (want %.2f), new junctions %v", con.TrenchM["asphalt"], p.LengthM, con.NewJunctions)
	}
	addedM, addedDucts := 0.0, 0
	turf := 0.0
	for _, f := range r.Fill {
		if f.AddedDucts > 0 {
			sp, _ := r.Site.Net.Span(f.Span)
			addedM += float64(f.AddedDucts) * sp.LengthM
			turf += sp.LengthM
			addedDucts += f.AddedDucts
		}
	}
	if addedDucts == 0 {
		t.Fatalf("no duct added: fill %+v", r.Fill)
	}
	if math.Abs(con.AddedDuctM-(p.LengthM+addedM)) > 1e-9 || math.Abs(con.TrenchM["turf"]-turf) > 1e-9 {
		t.Errorf("added duct %.2f m, want %.2f; turf trench %.2f m, want %.2f", con.AddedDuctM, p.LengthM+addedM, con.TrenchM["turf"], turf)
	}
	b := r.Estimate.BOM
	for item, want := range map[string]float64{
		"trench, asphalt":      math.Round(p.LengthM*10) / 10,
		"restoration, asphalt": math.Round(p.LengthM*10) / 10,
		"trench, turf":         math.Round(turf*10) / 10,
		"added duct":           math.Round((p.LengthM+addedM)*10) / 10,
		"handhole where new pathway joins the network": 1,
	} {
		if got := bomQty(b, item); got != want {
			t.Errorf("%s: got %v, want %v", item, got, want)
		}
	}
	// Duct fill rows: one cable per 25 mm duct, π/4·d² over π/4·D² (computed).
	rows := 0
	for _, f := range r.Estimate.Fill {
		if f.DuctIDMM != 25 || len(f.CablesODMM) == 0 {
			continue
		}
		rows++
		want := 100 * f.CablesODMM[0] * f.CablesODMM[0] / (25 * 25)
		if len(f.CablesODMM) != 1 || math.Abs(f.FillPct-want) > 1e-9 || f.AllowedPct != 53 || !f.OK {
			t.Errorf("fill %s duct %d: %v cables, %.2f %% of %.0f %%, want one at %.2f %% of 53 %%", f.Span, f.Duct, f.CablesODMM, f.FillPct, f.AllowedPct, want)
		}
	}
	if rows == 0 {
		t.Errorf("no duct fill rows")
	}
	if got := b.CategoryCents(media.CategoryConstruction); got <= 0 {
		t.Errorf("construction subtotal: got %d", got)
	}
}

// TestDuctFillJamBand: three equal cables in one spare duct. NFPA 70 Chapter 9 (seen):
// 40 % fill for three or more; the 1.05·D/d jam band 2.8-3.2 (informative note, seen).
func TestDuctFillJamBand(t *testing.T) {
	t.Parallel()
	const od = 10.5
	cases := []struct {
		name       string
		idMM       float64
		wantRows   []int // cables per duct row
		ratio      float64
		unplaced   bool
		allowedPct float64
	}{
		// 1.05 × 31.5 / 10.5 = 3.15: in the band, so the third cable is refused (computed).
		{"in the jam band", 31.5, []int{2}, 0, true, 31},
		// 1.05 × 40 / 10.5 = 4.0, and 3 × 10.5² / 40² = 20.7 % of 40 % (computed).
		{"clear of the band", 40, []int{3}, 4.0, false, 40},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			net := &geo.Network{Spans: []geo.Span{{ID: "S1", PathwayID: "P1", DuctMM: tc.idMM, LengthM: 10, Type: geo.TypeDuct}}}
			r := &Result{Site: &Site{Net: net}, Estimate: &Estimate{},
				Fill: []SegmentFill{{Span: "S1", PathwayID: "P1", Cables: 3, Limited: true, Ducts: 1}}}
			for range 3 {
				r.Legs = append(r.Legs, Leg{Feasible: true, Steps: []geo.Step{{SpanID: "S1"}},
					Cable: CableTakeoff{Size: media.Size{Count: 24, ODMM: od}, Cables: 1}})
			}
			r.ductFill()
			var got []int
			for _, f := range r.Estimate.Fill {
				got = append(got, len(f.CablesODMM))
				if f.AllowedPct != tc.allowedPct || math.Abs(f.JamRatio-tc.ratio) > 1e-9 || f.JamRisk || !f.OK {
					t.Errorf("%s: row %+v, want limit %.0f %% and ratio %.2f", tc.name, f, tc.allowedPct, tc.ratio)
				}
				if want := 100 * float64(len(f.CablesODMM)) * od * od / (tc.idMM * tc.idMM); math.Abs(f.FillPct-want) > 1e-9 {
					t.Errorf("%s: fill %.3f %%, want %.3f %%", tc.name, f.FillPct, want)
				}
			}
			if fmt.Sprint(got) != fmt.Sprint(tc.wantRows) {
				t.Errorf("%s: cables per duct %v, want %v", tc.name, got, tc.wantRows)
			}
			warned := len(r.Estimate.Warnings) == 1 && strings.Contains(r.Estimate.Warnings[0], "1 of 3 cables fit no duct")
			if warned != tc.unplaced {
				t.Errorf("%s: warnings %q", tc.name, r.Estimate.Warnings)
			}
		})
	}
}

// TestMissingPriceNamed: a price book without the enclosures and OTDR rate the plan needs is
// rejected, every missing item named by its key.
func TestMissingPriceNamed(t *testing.T) {
	t.Parallel()
	data, err := os.ReadFile(filepath.Join("..", "media", "prices-demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	var keep []string
	for _, line := range strings.Split(string(data), "\n") {
		if strings.HasPrefix(line, "fibre_enclosures:") {
			continue
		}
		keep = append(keep, strings.Replace(line, "{loss: 20, otdr: 12}", "{loss: 20}", 1))
	}
	dir := t.TempDir()
	path := filepath.Join(dir, "prices.yaml")
	if err := os.WriteFile(path, []byte(strings.Join(keep, "\n")), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = pullSolve(t, 100, 2, func(p *Plan) { p.Prices = path })
	if err == nil || !errors.Is(err, media.ErrMissingPrice) {
		t.Fatalf("got %v, want a missing price", err)
	}
	for _, want := range []string{"add fibre_enclosures.24", "add labour.tests_per_hour.otdr", path} {
		if !strings.Contains(err.Error(), want) {
			t.Errorf("error %q lacks %q", err, want)
		}
	}
}

// TestBOMOutputsAddUp parses bom.csv of the demo and checks that every subtotal is the sum
// of its lines, every extended price its quantity times unit price, and the markups and
// total those of the price book; summary.json says the same.
func TestBOMOutputsAddUp(t *testing.T) {
	t.Parallel()
	r := demoResult(t)
	files, err := r.Outputs(context.Background(), WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	rows := readCSV(t, fileOf(t, files, "bom.csv"))
	if got := strings.Join(rows[0], ","); got != "category,item,unit,quantity,unit_price_usd,extended_usd" {
		t.Fatalf("header: %s", got)
	}
	cents := func(s string) int64 {
		c, err := ParseCents(strings.TrimPrefix(s, "-"))
		if err != nil {
			t.Fatalf("amount %q: %v", s, err)
		}
		return c
	}
	byCat := map[string]int64{}
	sub := map[string]int64{}
	var all, cont, over, tax, total int64
	for _, row := range rows[1:] {
		switch row[0] {
		case media.CategoryMaterial, media.CategoryLabour, media.CategoryConstruction, media.CategoryOptics:
			qty, _ := strconv.ParseFloat(row[3], 64)
			if want := media.ExtendCents(int64(math.Round(qty*100)), cents(row[4])); cents(row[5]) != want {
				t.Errorf("%s: extended %s, want %s", row[1], row[5], media.FormatCents(want))
			}
			byCat[row[0]] += cents(row[5])
		case rowSubtotal:
			if row[1] == "all categories" {
				all = cents(row[5])
			} else {
				sub[row[1]] = cents(row[5])
			}
		case rowContingency:
			cont = cents(row[5])
		case rowOverhead:
			over = cents(row[5])
		case rowTax:
			tax = cents(row[5])
		case rowTotal:
			total = cents(row[5])
		}
	}
	var sum int64
	for _, c := range media.Categories() {
		if sub[c] != byCat[c] {
			t.Errorf("%s: subtotal %d, lines sum to %d", c, sub[c], byCat[c])
		}
		sum += sub[c]
	}
	book := r.Engine.PriceBook()
	if all != sum || cont != media.ApplyBP(all, book.ContingencyBP) || over != media.ApplyBP(all, book.OverheadBP) ||
		tax != media.ApplyBP(all+cont+over, book.TaxBP) || total != all+cont+over+tax {
		t.Errorf("totals: subtotal %d (sum %d), contingency %d, overhead %d, tax %d, total %d", all, sum, cont, over, tax, total)
	}
	s := r.Summarize()
	if s.TotalCents != total || s.SubtotalCents != all || s.CostByCategory[media.CategoryLabour] != sub[media.CategoryLabour] ||
		s.OverBudgetCents != total-s.BudgetCents || len(s.CostDrivers) != 5 {
		t.Errorf("summary: %+v", s)
	}
	var model int64
	for _, l := range r.Legs {
		model += l.Cost.TotalCents()
	}
	if s.ModelCents != model {
		t.Errorf("model cost: got %d, want %d", s.ModelCents, model)
	}
}

func demoResult(t *testing.T) *Result {
	t.Helper()
	s, p := demoSite(t)
	eng, err := Engine(p)
	if err != nil {
		t.Fatal(err)
	}
	r, err := SolveWith(context.Background(), s, p, eng)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func fileOf(t *testing.T, files []OutputFile, name string) []byte {
	t.Helper()
	for _, f := range files {
		if f.Name == name {
			return f.Data
		}
	}
	t.Fatalf("no output %s", name)
	return nil
}

func readCSV(t *testing.T, data []byte) [][]string {
	t.Helper()
	rows, err := csv.NewReader(bytes.NewReader(data)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}

// TestBOMWorkbook opens bom.xlsx back and checks its formulas and their results against
// the bill of materials, then changes a unit price as an estimator would and checks that
// the total moves by what the price book's markups give.
func TestBOMWorkbook(t *testing.T) {
	t.Parallel()
	r := demoResult(t)
	b := r.Estimate.BOM
	for _, opt := range []WriteOptions{{}, {Units: UnitsImperial}} {
		t.Run("units "+opt.Units, func(t *testing.T) {
			files, err := r.Outputs(context.Background(), opt)
			if err != nil {
				t.Fatal(err)
			}
			x, err := workbook.Open(fileOf(t, files, "bom.xlsx"))
			if err != nil {
				t.Fatal(err)
			}
			defer x.Close()
			want := []string{"summary", "links", "bill of materials", "pull sections", "duct fill", "loss budgets"}
			if got := x.Sheets(); fmt.Sprint(got) != fmt.Sprint(want) {
				t.Fatalf("sheets: got %v, want %v", got, want)
			}
			const sh = "bill of materials"
			num := func(sheet, ref string) float64 {
				t.Helper()
				v, err := x.Calc(sheet, ref)
				if err != nil {
					t.Fatal(err)
				}
				f, err := strconv.ParseFloat(v, 64)
				if err != nil {
					t.Fatalf("%s!%s: %q is not a number", sheet, ref, v)
				}
				return f
			}
			cents := func(f float64) int64 { return int64(math.Round(f * 100)) }
			for i, l := range b.Lines {
				row := i + 2
				if f, _ := x.Formula(sh, fmt.Sprintf("F%d", row)); f != fmt.Sprintf("ROUND(D%d*E%d,2)", row, row) {
					t.Errorf("F%d formula: %q", row, f)
				}
				if got := cents(num(sh, fmt.Sprintf("F%d", row))); got != l.ExtendedCents {
					t.Errorf("%s: extended %d, want %d", l.Item, got, l.ExtendedCents)
				}
			}
			n := len(b.Lines)
			totalRow := n + 1 + 1 + len(b.Subtotal) + 5 // lines, a blank row, subtotals, all, three markups, total
			if v, _ := x.Value(sh, fmt.Sprintf("A%d", totalRow)); v != rowTotal {
				t.Fatalf("row %d is %q, not the total", totalRow, v)
			}
			totalRef := fmt.Sprintf("F%d", totalRow)
			if got := cents(num(sh, totalRef)); got != b.TotalCents {
				t.Errorf("total: got %d, want %d", got, b.TotalCents)
			}
			if got := cents(num("summary", "B21")); got != b.TotalCents {
				v, _ := x.Value("summary", "A21")
				t.Errorf("summary %s: got %d, want total %d", v, got, b.TotalCents)
			}
			if got := cents(num("summary", "B23")); got != b.TotalCents-int64(r.Plan.Budget) {
				t.Errorf("summary over budget: got %d", got)
			}
			// An estimator raises the first line's unit price by 1.00 (per unit shown).
			price := num(sh, "E2")
			qty := num(sh, "D2")
			if err := x.SetNumber(sh, "E2", price+1); err != nil {
				t.Fatal(err)
			}
			book := r.Engine.PriceBook()
			sub := b.SubtotalCents + cents(math.Round(qty*(price+1)*100)/100) - b.Lines[0].ExtendedCents
			cont, over := media.ApplyBP(sub, book.ContingencyBP), media.ApplyBP(sub, book.OverheadBP)
			moved := sub + cont + over + media.ApplyBP(sub+cont+over, book.TaxBP)
			if got := cents(num(sh, totalRef)); got != moved || got == b.TotalCents {
				t.Errorf("total after the edit: got %d, want %d (was %d)", got, moved, b.TotalCents)
			}
			if got := cents(num("summary", "B21")); got != moved {
				t.Errorf("summary total after the edit: got %d, want %d", got, moved)
			}
		})
	}
}

// TestImperialEdges: bom.csv in feet keeps the metric extended prices, and the pull
// sheet's tensions are in pound-force.
func TestImperialEdges(t *testing.T) {
	t.Parallel()
	r := demoResult(t)
	files, err := r.Outputs(context.Background(), WriteOptions{Units: UnitsImperial})
	if err != nil {
		t.Fatal(err)
	}
	rows := readCSV(t, fileOf(t, files, "bom.csv"))
	b := r.Estimate.BOM
	feet := 0
	for i, l := range b.Lines {
		row := rows[i+1]
		if l.Unit != media.UnitM {
			continue
		}
		feet++
		qty, _ := strconv.ParseFloat(row[3], 64)
		price, _ := strconv.ParseFloat(row[4], 64)
		ext, _ := ParseCents(row[5])
		// 1 ft = 0.3048 m exactly: the quantity in feet times the price per foot is the
		// metric line within the rounding of the shown figures.
		if row[2] != "ft" || ext != l.ExtendedCents || math.Abs(qty*price-float64(l.ExtendedCents)/100) > 0.05*price+0.00005*qty+0.01 {
			t.Errorf("%s: %v, want feet and %s", l.Item, row, media.FormatCents(l.ExtendedCents))
		}
	}
	if feet == 0 {
		t.Errorf("no length line")
	}
	x, err := workbook.Open(fileOf(t, files, "bom.xlsx"))
	if err != nil {
		t.Fatal(err)
	}
	defer x.Close()
	for ref, want := range map[string]string{"L1": "tension (lbf)", "I1": "length (ft)", "P1": "sidewall pressure (lbf/ft)"} {
		if v, _ := x.Value("pull sections", ref); v != want {
			t.Errorf("pull sections %s: got %q, want %q", ref, v, want)
		}
	}
	v, _ := x.Value("pull sections", "L2")
	lbf, _ := strconv.ParseFloat(v, 64)
	// 1 lbf = 4.4482216152605 N exactly.
	if want := r.Estimate.Pulls[0].TensionN / 4.4482216152605; math.Abs(lbf-want) > 1e-9 {
		t.Errorf("tension: got %v lbf, want %v", lbf, want)
	}
	var out bytes.Buffer
	if err := r.PrintSummary(&out, WriteOptions{Units: UnitsImperial}); err != nil {
		t.Fatal(err)
	}
	if s := out.String(); !strings.Contains(s, " lbf rated") || !strings.Contains(s, " ft in all") || strings.Contains(s, " m ") {
		t.Errorf("imperial summary:\n%s", s)
	}
}

func TestDesignValidation(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name, design, want string
	}{
		{"waste over 100", "{waste_pct: 150}", "design.waste_pct: want a percentage from 0 to 100, got 150"},
		{"negative loop", "{slack_loop_structure_m: -1}", "p.yaml:2:34: design.slack_loop_structure_m: want metres from 0 to 1000, got -1"},
		{"reel shorter than copper", "{reel_m: 50}", "design.reel_m: want metres from 100 to 100000, got 50"},
		{"friction NaN", "{pull_mu: .nan}", "design.pull_mu: want a coefficient of friction from 0 to 2, got NaN"},
		{"bends over NFPA 70", "{pull_bend_deg: 400}", "design.pull_bend_deg: want degrees above 0 and at most 360"},
		{"negative pull length", "{pull_max_m: -5}", "design.pull_max_m: want metres from 0 to 100000, got -5"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParsePlan("p.yaml", []byte("campus: [c.geojson]\ndesign: "+tc.design+"\n"))
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: got %v, want %q", tc.name, err, tc.want)
			}
		})
	}
	p, err := ParsePlan("p.yaml", []byte("campus: [c.geojson]\ndesign: {pull_mu: 0.35, reel_m: 2000}\n"))
	if err != nil || p.Design.PullMu != 0.35 || p.Design.ReelM != 2000 || p.Design.WastePct != 5 || p.Design.PullBendDeg != 180 {
		t.Errorf("design: got %+v (%v)", p.Design, err)
	}
}

// TestCopperTakeoff: a copper leg terminates 4-pair cables (one per two strands) on the
// buildings' copper patch panels and is certified per channel; it has no splice trays.
func TestCopperTakeoff(t *testing.T) {
	t.Parallel()
	r, err := pullSolve(t, 100, 2, nil)
	if err != nil {
		t.Fatal(err)
	}
	_, leg := legOf(t, r, "A-B")
	cat := r.Engine.Catalog()
	k := cat.Medium("cat6a").Construction("outdoor")
	leg.Medium, leg.Construction, leg.Application = "cat6a", "outdoor", "1000BASE-T"
	leg.Cable.fit(cat, media.Choice{Medium: "cat6a", Construction: "outdoor", Strands: (leg.StrandsCable + 1) / 2}, leg.RiserM, 0)
	if leg.Cable.Cables != (leg.StrandsCable+1)/2 || leg.Cable.Size != k.Sizes[0] {
		t.Fatalf("copper fit: %+v", leg.Cable)
	}
	r.Estimate = &Estimate{}
	r.connectivity()
	r.quantities()
	b, err := r.Engine.PriceBook().Bill(r.Estimate.Quantities)
	if err != nil {
		t.Fatal(err)
	}
	cables := float64(leg.Cable.Cables)
	for item, want := range map[string]float64{
		"termination cat6a, per 4-pair cable end": 2 * cables,
		"copper patch panel, 24 ports":            2, // one at A and one at B
		"patch cord cat6a":                        2,
		"transceiver 1000BASE-T":                  2,
	} {
		if got := bomQty(b, item); got != want {
			t.Errorf("%s: got %v, want %v", item, got, want)
		}
	}
	if l, ok := bomLine(b, "certify copper channels"); !ok || l.Work != cables {
		t.Errorf("copper certification: got %+v", l)
	}
	if l, ok := bomLine(b, "cable cat6a outdoor, 4-pair"); !ok || l.Quantity != leg.Cable.LengthM*cables {
		t.Errorf("copper cable: got %+v, want %v m", l, leg.Cable.LengthM*cables)
	}
	for _, c := range r.Estimate.Buildings {
		if c.Building == "B" && (c.SpliceTrays != 0 || c.CopperCables != leg.Cable.Cables || c.FibreStrands != 0) {
			t.Errorf("building B: %+v", c)
		}
	}
}

// TestBOMWorkbookOpenpyxl reads bom.xlsx with openpyxl (Debian package python3-openpyxl),
// a reader written independently of excelize, and recomputes the total from the stored
// quantities, unit prices and markup percentages with Python's decimal arithmetic.
func TestBOMWorkbookOpenpyxl(t *testing.T) {
	t.Parallel()
	py := "/usr/bin/python3"
	if err := exec.Command(py, "-c", "import openpyxl").Run(); err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatalf("python3-openpyxl is needed in CI: %v", err)
		}
		t.Skip("python3-openpyxl not installed (apt-get install python3-openpyxl)")
	}
	r := demoResult(t)
	files, err := r.Outputs(context.Background(), WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "bom.xlsx")
	if err := os.WriteFile(path, fileOf(t, files, "bom.xlsx"), 0o644); err != nil {
		t.Fatal(err)
	}
	script := `import sys, openpyxl
from decimal import Decimal, ROUND_HALF_UP
wb = openpyxl.load_workbook(sys.argv[1])
ws = wb["bill of materials"]
cent = Decimal("0.01")
def rnd(x): return x.quantize(cent, rounding=ROUND_HALF_UP)
sub, pct, formulas = Decimal(0), {}, 0
for row in ws.iter_rows(min_row=2):
    a, d, e, f = row[0].value, row[3].value, row[4].value, row[5].value
    if a in ("material", "labour", "construction", "optics"):
        assert isinstance(d, (int, float)) and isinstance(e, (int, float)), (a, d, e)
        assert f == "=ROUND(D%d*E%d,2)" % (row[0].row, row[0].row), f
        sub += rnd(Decimal(repr(d)) * Decimal(repr(e)))
        formulas += 1
    elif a in ("contingency", "overhead", "tax"):
        pct[a] = Decimal(repr(d))
cont = rnd(sub * pct["contingency"] / 100)
over = rnd(sub * pct["overhead"] / 100)
tax = rnd((sub + cont + over) * pct["tax"] / 100)
print(wb.sheetnames)
print(formulas, int((sub + cont + over + tax) * 100))
print(wb["summary"]["B21"].value)
`
	out, err := exec.Command(py, "-c", script, path).CombinedOutput()
	if err != nil {
		t.Fatalf("openpyxl: %v\n%s", err, out)
	}
	b := r.Estimate.BOM
	want := fmt.Sprintf("['summary', 'links', 'bill of materials', 'pull sections', 'duct fill', 'loss budgets']\n%d %d\n='bill of materials'!F%d\n",
		len(b.Lines), b.TotalCents, len(b.Lines)+1+1+len(b.Subtotal)+5)
	if string(out) != want {
		t.Errorf("openpyxl read:\n%s\nwant:\n%s", out, want)
	}
}

// TestConstructionBore is TestConstruction with the proposed duct P built by directional
// bore: its metres are bored, not trenched, no surface is restored, and the bill prices them
// at the book's directional_bore_per_m; a book without that price is an error naming it.
func TestConstructionBore(t *testing.T) {
	t.Parallel()
	campus := strings.Replace(pullCampusJSON(25, 1), `"surface":"asphalt"`, `"surface":"asphalt","method":"bore"`, 1)
	r, err := pullSolveJSON(t, campus, nil)
	if err != nil {
		t.Fatal(err)
	}
	legOf(t, r, "A-C")
	if len(r.Opened) != 1 || !strings.HasPrefix(r.Opened[0], "P") {
		t.Fatalf("opened: got %v, want P", r.Opened)
	}
	p, _ := r.Site.Net.Span(r.Opened[0])
	con := r.Estimate.Construction
	if math.Abs(con.BoreM-p.LengthM) > 1e-9 || con.TrenchM["asphalt"] != 0 || len(con.NewJunctions) != 1 {
		t.Errorf("bore %.2f m (want %.2f), asphalt trench %.2f m (want 0), new junctions %v", con.BoreM, p.LengthM, con.TrenchM["asphalt"], con.NewJunctions)
	}
	b := r.Estimate.BOM
	line, ok := bomLine(b, "directional bore")
	if !ok || line.Quantity != math.Round(p.LengthM*10)/10 || line.UnitCents != 11500 { // the demo book's 115.00 per metre
		t.Errorf("directional bore line: got %+v (found %v), want %.1f m at 115.00", line, ok, p.LengthM)
	}
	for _, item := range []string{"trench, asphalt", "restoration, asphalt"} {
		if q := bomQty(b, item); q != 0 {
			t.Errorf("%s: got %v, want none for a bored pathway", item, q)
		}
	}

	book, err := os.ReadFile("../media/prices-demo.yaml")
	if err != nil {
		t.Fatal(err)
	}
	noBore := strings.Replace(string(book), "directional_bore_per_m: 115.00\n", "", 1)
	if noBore == string(book) {
		t.Fatal("the demo price book has no directional_bore_per_m: 115.00 line to remove")
	}
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "prices.yaml"), []byte(noBore), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err = pullSolveJSON(t, campus, func(p *Plan) { p.Dir, p.Prices = dir, "prices.yaml" })
	if err == nil || !errors.Is(err, media.ErrMissingPrice) || !strings.Contains(err.Error(), "directional_bore_per_m") {
		t.Errorf("a bore without a bore price: got %v, want a missing directional_bore_per_m", err)
	}
	// The same book plans the campus when P is trenched.
	if _, err := pullSolveJSON(t, pullCampusJSON(25, 1), func(p *Plan) { p.Dir, p.Prices = dir, "prices.yaml" }); err != nil {
		t.Errorf("a book without bores, no bore in the plan: %v", err)
	}
}

// TestInnerduct plans the pull campus with a 50 mm duct D, whose one spare duct takes the two
// 24-strand cables of B and C side by side, with and without a 32/27 mm innerduct per cable.
// With innerduct the duct fill counts the innerducts (NFPA 70 Chapter 9 Table 1: one at 41 %
// of a 50 mm duct is within 53 %, two at 82 % are over 31 %), so where B's and C's routes share
// D a duct is added; the bill adds the innerduct along every duct span and its placing pull,
// and the legs' costs carry them at the demo book's 2.40 per metre and 92.00 per hour at 60 m
// per hour, over the leg's duct metres (media.PriceBook.Cents). A cable too large for the
// innerduct is kept off ducts.
func TestInnerduct(t *testing.T) {
	t.Parallel()
	plain, err := pullSolve(t, 50, 1, nil)
	if err != nil {
		t.Fatal(err)
	}
	inner, err := pullSolve(t, 50, 1, func(p *Plan) { p.Design.InnerductODMM, p.Design.InnerductIDMM = 32, 27 })
	if err != nil {
		t.Fatal(err)
	}
	added := func(r *Result) int {
		n := 0
		for _, f := range r.Fill {
			n += f.AddedDucts
		}
		return n
	}
	if added(plain) != 0 || added(inner) == 0 {
		t.Errorf("added ducts: %d without innerduct (want 0), %d with (want some)", added(plain), added(inner))
	}
	for _, f := range plain.Estimate.Fill {
		if f.Innerduct {
			t.Errorf("span %s duct %d: innerduct in a plan without it", f.Span, f.Duct)
		}
	}
	for _, f := range inner.Estimate.Fill {
		if !f.Innerduct {
			t.Errorf("span %s duct %d: not marked as innerducts", f.Span, f.Duct)
		}
		for _, od := range f.CablesODMM {
			if od != 32 {
				t.Errorf("span %s duct %d: an occupant of %g mm, want the 32 mm innerduct", f.Span, f.Duct, od)
			}
		}
		if len(f.CablesODMM) != 1 || math.Abs(f.FillPct-100*32*32/(50*50.0)) > 1e-9 || !f.OK {
			t.Errorf("span %s duct %d: %v at %.1f %% (ok %v), want one innerduct at 41 %%", f.Span, f.Duct, f.CablesODMM, f.FillPct, f.OK)
		}
	}
	ductM := 0.0
	for _, name := range []string{"A-B", "A-C"} {
		_, lp := legOf(t, plain, name)
		_, li := legOf(t, inner, name)
		m := 0.0
		for _, st := range li.Steps {
			if sp, _ := inner.Site.Net.Span(st.SpanID); sp.Type == geo.TypeDuct {
				m += sp.LengthM
			}
		}
		ductM += m
		labour, material := int64(math.Round(m*9200/60)), media.MulCents(240, m)
		if got, want := li.Cost.LabourCents-lp.Cost.LabourCents, labour; got != want {
			t.Errorf("%s: innerduct placing labour %d cents, want %d (92.00 per hour at 60 m per hour over %.1f m)", name, got, want, m)
		}
		if name == "A-B" { // A-C shares an added duct, so its construction share moves too
			if got, want := li.Cost.ConstructionCents-lp.Cost.ConstructionCents, material; got != want {
				t.Errorf("%s: innerduct material %d cents, want %d (2.40 per metre over %.1f m)", name, got, want, m)
			}
		}
	}
	if got, want := bomQty(inner.Estimate.BOM, "innerduct 32/27 mm"), math.Round(ductM*10)/10; got != want {
		t.Errorf("innerduct in the bill: %v m, want %v", got, want)
	}
	if l, ok := bomLine(inner.Estimate.BOM, "place innerduct in duct"); !ok || math.Abs(l.Work-ductM) > 1e-6 || l.Quantity != math.Ceil(ductM/60*100)/100 {
		t.Errorf("placing innerduct: got %+v (found %v), want %.2f m at 60 m per hour", l, ok, ductM)
	}
	if q := bomQty(plain.Estimate.BOM, "innerduct 32/27 mm"); q != 0 {
		t.Errorf("a plan without innerduct bills %v m of it", q)
	}

	small, err := pullSolve(t, 50, 1, func(p *Plan) { p.Design.InnerductODMM, p.Design.InnerductIDMM = 12, 8 })
	if err != nil && !errors.Is(err, ErrInfeasible) {
		t.Fatal(err)
	}
	for _, l := range small.Legs {
		if l.Feasible || !strings.Contains(l.Reason, "does not fit the 8 mm innerduct") {
			t.Errorf("%s %s with an 8 mm innerduct: feasible %v, reason %q; want infeasible, kept off ducts", l.Link.ID, l.Name, l.Feasible, l.Reason)
		}
	}
}

// TestPullSidewallLimit sets design.pull_max_swbp_n_per_m below the sidewall bearing pressure
// the plain plan reaches (SWBP = tension out of the bend over its radius, seen): every pull
// section then keeps under it, with pull points added, or is flagged with the reason; a
// limit above every bend's pressure changes nothing.
func TestPullSidewallLimit(t *testing.T) {
	t.Parallel()
	plain, err := pullSolve(t, 100, 2, nil)
	if err != nil {
		t.Fatal(err)
	}
	worst := 0.0
	for _, p := range plain.Estimate.Pulls {
		worst = math.Max(worst, p.SWBPNPerM)
	}
	if worst <= 0 {
		t.Fatal("the plain plan has no bend under tension")
	}
	high, err := pullSolve(t, 100, 2, func(p *Plan) { p.Design.PullMaxSWBPNPerM = 2 * worst })
	if err != nil {
		t.Fatal(err)
	}
	if len(high.Estimate.Pulls) != len(plain.Estimate.Pulls) || high.Estimate.AddedPullPoints != plain.Estimate.AddedPullPoints {
		t.Errorf("a limit above every bend changed the pulls: %d sections and %d added points, want %d and %d",
			len(high.Estimate.Pulls), high.Estimate.AddedPullPoints, len(plain.Estimate.Pulls), plain.Estimate.AddedPullPoints)
	}
	limit := worst / 2
	low, err := pullSolve(t, 100, 2, func(p *Plan) { p.Design.PullMaxSWBPNPerM = limit })
	if err != nil {
		t.Fatal(err)
	}
	changed := low.Estimate.AddedPullPoints > plain.Estimate.AddedPullPoints
	for _, p := range low.Estimate.Pulls {
		switch {
		case p.SWBPNPerM <= limit+1e-9:
		case !p.WithinRating && strings.Contains(p.Reason, "sidewall pressure"):
			changed = true
		default:
			t.Errorf("pull %s → %s: sidewall pressure %.1f N/m over the %.1f N/m limit, within %v (%s)", p.From, p.To, p.SWBPNPerM, limit, p.WithinRating, p.Reason)
		}
	}
	if !changed {
		t.Errorf("a limit of half the worst sidewall pressure added no pull point and flagged no pull")
	}
}

// TestEntranceTransition gives the pull campus 40 m risers in every building, beyond what
// unlisted outside-plant cable may run inside (NFPA 70 Article 770: 15 m past the entrance,
// seen as fragment), and a price book with an entrance splice enclosure: B's leg then
// runs outside-plant cable between the entrances, spliced at both to listed riser cable,
// which the bill buys for the risers and the service coils; the loss budget counts the two
// transition splices (ANSI/TIA-568.3-D 0.3 dB each, from memory) and the riser cable's inside
// attenuation. Without the enclosure price the leg keeps indoor/outdoor cable.
func TestEntranceTransition(t *testing.T) {
	t.Parallel()
	campus := strings.ReplaceAll(pullCampusJSON(100, 2), `"kind":"building",`, `"kind":"building","riser_m":40,`)
	book, err := os.ReadFile("../media/prices-demo.yaml")
	if err != nil {
		t.Fatal(err)
	}
	// Indoor/outdoor single-mode at 6.26 a metre instead of 3.26, so that over this short route
	// the two transitions (enclosures, trays and 48 splices) cost less than it.
	const demoLine = "transition_splice_each: 260.00\n"
	priced := strings.Replace(string(book), "indoor-outdoor: {12: 2.02, 24: 3.26,", "indoor-outdoor: {12: 2.02, 24: 6.26,", 1)
	if priced == string(book) || !strings.Contains(priced, demoLine) {
		t.Fatal("the demo book's os2 indoor-outdoor or transition prices moved")
	}
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "prices.yaml"), []byte(strings.Replace(priced, demoLine, "transition_splice_each: 5.00\n", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "none.yaml"), []byte(strings.Replace(priced, demoLine, "", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	plain, err := pullSolveJSON(t, campus, func(p *Plan) { p.Dir, p.Prices = dir, "none.yaml" })
	if err != nil {
		t.Fatal(err)
	}
	tr, err := pullSolveJSON(t, campus, func(p *Plan) { p.Dir, p.Prices = dir, "prices.yaml" })
	if err != nil {
		t.Fatal(err)
	}
	_, lp := legOf(t, plain, "A-B")
	_, lt := legOf(t, tr, "A-B")
	if lp.Construction != "indoor-outdoor" || lp.Inside != "" {
		t.Fatalf("without the enclosure price: %s + %q, want indoor-outdoor", lp.Construction, lp.Inside)
	}
	if lt.Construction != "osp-loose-tube" || lt.Inside != "ofnr-riser" || lt.ConstructionText() != "osp-loose-tube + ofnr-riser at entrances" {
		t.Fatalf("with it: %s + %q (%s), want osp-loose-tube spliced to ofnr-riser", lt.Construction, lt.Inside, lt.Choice)
	}
	c := lt.Cable
	if want := math.Ceil((80 + c.EndSlackM) * 1.05); c.InsideLengthM != want || c.LengthM != lp.Cable.LengthM {
		t.Errorf("inside cable %.0f m of %.0f m bought, want %.0f of %.0f (risers 2 × 40 m and the service coils, 5 %% waste)",
			c.InsideLengthM, c.LengthM, want, lp.Cable.LengthM)
	}
	for _, nm := range []int{1310} {
		a, _ := lp.lossAt(nm)
		b, _ := lt.lossAt(nm)
		// Two splices at 0.3 dB, and the risers at 1.0 dB/km instead of 0.5 (80 m: 0.04 dB).
		if d := b.LossDB - a.LossDB; math.Abs(d-(0.6+0.04)) > 0.011 {
			t.Errorf("%d nm: the transition adds %.3f dB, want 0.64", nm, d)
		}
	}
	b := tr.Estimate.BOM
	if q := bomQty(b, "entrance transition enclosure"); q < 2 {
		t.Errorf("entrance transition enclosures: %v, want 2 for each transition leg", q)
	}
	if q := bomQty(b, "cable os2 ofnr-riser, 24 strands"); q < c.InsideLengthM {
		t.Errorf("riser cable bought: %v m, want at least B's %.0f m", q, c.InsideLengthM)
	}
	if l, ok := bomLine(b, "splice fibre, entrance transitions"); !ok || l.Work < float64(2*c.Size.Count) {
		t.Errorf("transition splicing: %+v (found %v), want at least %d splices", l, ok, 2*c.Size.Count)
	}
	files, err := tr.Outputs(context.Background(), WriteOptions{SkipWorkbook: true})
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		if f.Name == "links.csv" && !bytes.Contains(f.Data, []byte("osp-loose-tube + ofnr-riser at entrances")) {
			t.Errorf("links.csv does not show the transition:\n%s", f.Data)
		}
	}
}
