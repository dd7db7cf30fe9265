package route_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// newWorkCampus is hub A, centred on (0, 0), and building C, its west wall centred on the
// first pathway's last point, joined only by proposed duct drawn as the given pathways (each a
// list of grid points in metres), and building B when lateral: 15 m north of the duct at
// x = 300, reached by a counted lateral.
func newWorkCampus(lateral bool, pathways ...[]float64) string {
	line := func(pts []float64) string {
		var s []string
		for i := 0; i+1 < len(pts); i += 2 {
			s = append(s, fmt.Sprintf("[%.7f,%.7f]", testsite.X(pts[i]), testsite.Y(pts[i+1])))
		}
		return "[" + strings.Join(s, ",") + "]"
	}
	f := []string{testsite.Box("A", "mc", 0, 0)}
	end := pathways[len(pathways)-1]
	if len(end)%2 == 1 {
		end = end[1:]
	}
	if len(pathways) > 1 && end[0] > end[len(end)-2] {
		end = end[:2] // drawn towards the first pathway: C is at its first point
	}
	f = append(f, testsite.Box("C", "", end[len(end)-2]+10, end[len(end)-1]))
	if lateral {
		f = append(f, testsite.Box("B", "", 300, 25))
	}
	for i, p := range pathways {
		props := `"type":"duct","status":"proposed","method":"trench","duct_mm":100`
		if len(p)%2 == 1 { // a leading 0 marks an existing duct, a leading 1 proposed aerial, 2 a proposed tunnel
			props = map[float64]string{0: `"type":"duct","spare_ducts":2,"duct_mm":100`, 1: `"type":"aerial","status":"proposed"`,
				2: `"type":"tunnel","status":"proposed"`}[p[0]]
			p = p[1:]
		}
		f = append(f, fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"P%d",%s},"geometry":{"type":"LineString","coordinates":%s}}`,
			i+1, props, line(p)))
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

func solveNewWork(t *testing.T, campus string, edit func(p *plan.Plan)) *route.Result {
	t.Helper()
	r, err := testplan.PullSolveJSON(t, campus, edit)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// TestHandholesAlongNewRun: a straight new duct of about 590 m with handhole_spacing_m 150
// gets ceil(L/150) − 1 = 3 handholes, at 150, 300 and 450 m from its west end, drawn as one
// pathway or split at a vertex into two; the bill counts them, every pull section along the
// run is at most 150 m, and the crew sets up one pull per section (common practice spacing,
// no published source; the count is arithmetic).
func TestHandholesAlongNewRun(t *testing.T) {
	t.Parallel()
	for name, campus := range map[string]string{
		"one pathway":     newWorkCampus(false, []float64{10, 0, 600, 0}),
		"split at vertex": newWorkCampus(false, []float64{10, 0, 300, 0}, []float64{300, 0, 600, 0}),
		"drawn eastwards": newWorkCampus(false, []float64{10, 0, 300, 0}, []float64{600, 0, 300, 0}),
	} {
		t.Run(name, func(t *testing.T) {
			t.Parallel()
			r := solveNewWork(t, campus, nil)
			if r.Plan.Design.HandholeSpacingM != 150 {
				t.Fatalf("handhole_spacing_m default %v, want 150", r.Plan.Design.HandholeSpacingM)
			}
			var runM float64
			for _, id := range r.Opened {
				sp, _ := r.Site.Net.Span(id)
				runM += sp.LengthM
			}
			want := int(math.Ceil(runM/150)) - 1
			if want != 3 {
				t.Fatalf("run of %.2f m: the test campus should need 3 handholes", runM)
			}
			con := r.Estimate.Construction
			if len(con.RunHandholes) != want {
				t.Fatalf("handholes along the run: got %d (%v), want %d", len(con.RunHandholes), con.RunHandholes, want)
			}
			// Their places, as metres from the run's west end.
			for k, h := range con.RunHandholes {
				sp, _ := r.Site.Net.Span(h.Span)
				fromWest := h.AtM
				if sp.Line[0][0] > sp.Line[len(sp.Line)-1][0] {
					fromWest = sp.LengthM - h.AtM
				}
				if h.Span == "P2" {
					p1, _ := r.Site.Net.Span("P1")
					fromWest += p1.LengthM
				}
				if w := 150 * float64(k+1); math.Abs(fromWest-w) > 1e-6 {
					t.Errorf("handhole %d at %.3f m from the west end, want %.0f", k+1, fromWest, w)
				}
			}
			if got := testplan.BOMQty(r.Estimate.BOM, "handhole along new construction"); got != float64(want) {
				t.Errorf("bill: %v handholes along new construction, want %d", got, want)
			}
			sections := 0
			for _, ps := range r.Estimate.Pulls {
				sections++
				if ps.LengthM > 150+1e-6 {
					t.Errorf("pull %d from %s to %s: %.2f m, more than the 150 m spacing", ps.Seq, ps.From, ps.To, ps.LengthM)
				}
			}
			if sections != want+1 {
				t.Errorf("pull sections: got %d, want %d", sections, want+1)
			}
			// The crew: a set-up per section, an entry per handhole, two cable ends.
			for item, q := range map[string]float64{
				"crew set-up, per pull":                            float64(want + 1),
				"crew entry into a structure, per cable":           float64(want),
				"cable end preparation":                            2,
				"building entrance: penetration, sleeve, firestop": 2,
			} {
				if got := testplan.BOMQty(r.Estimate.BOM, item); got != q {
					t.Errorf("%s: got %v, want %v", item, got, q)
				}
			}
			// The design's ducts in the new trench: 2 by default.
			if math.Abs(con.AddedDuctM-2*runM) > 1e-6 {
				t.Errorf("added duct %.2f m, want 2 × %.2f", con.AddedDuctM, runM)
			}
		})
	}
}

// TestHandholesAtBendBudget: a new run with three right-angle bends and no spacing limit gets
// one handhole, at the third bend: pull_bend_deg 180 allows two 90° bends between pull points
// (TIA-569, two 90° bends; the plan's default).
func TestHandholesAtBendBudget(t *testing.T) {
	t.Parallel()
	campus := newWorkCampus(false, []float64{10, 0, 100, 0, 100, 100, 200, 100, 200, 190})
	r := solveNewWork(t, campus, func(p *plan.Plan) { p.Design.HandholeSpacingM = 0 })
	con := r.Estimate.Construction
	if len(con.RunHandholes) != 1 {
		t.Fatalf("handholes: got %v, want one at the third bend", con.RunHandholes)
	}
	sp, _ := r.Site.Net.Span(con.RunHandholes[0].Span)
	segs := sp.SegmentsM()
	at := segs[0] + segs[1] + segs[2] // the third bend, at (200, 100)
	if sp.Line[0][0] > sp.Line[len(sp.Line)-1][0] {
		at = sp.LengthM - at
	}
	if math.Abs(con.RunHandholes[0].AtM-at) > 1e-6 {
		t.Errorf("handhole at %.3f m along %s, want %.3f (the third bend)", con.RunHandholes[0].AtM, sp.ID, at)
	}
	for _, ps := range r.Estimate.Pulls {
		if ps.BendDeg > 180+1e-6 {
			t.Errorf("pull %d bends %.1f°, more than the 180° budget", ps.Seq, ps.BendDeg)
		}
	}
}

// TestNewDucts: design.new_ducts sets the ducts of a new trench; every one is billed.
func TestNewDucts(t *testing.T) {
	t.Parallel()
	r := solveNewWork(t, newWorkCampus(false, []float64{10, 0, 600, 0}), func(p *plan.Plan) { p.Design.NewDucts = 4 })
	sp, _ := r.Site.Net.Span(r.Opened[0])
	if con := r.Estimate.Construction; math.Abs(con.AddedDuctM-4*sp.LengthM) > 1e-6 {
		t.Errorf("added duct %.2f m, want 4 × %.2f", con.AddedDuctM, sp.LengthM)
	}
	// Each new duct holding cable has its fill row: the one cable in the first.
	var rows []int
	for _, f := range r.Estimate.Fill {
		if f.Span == sp.ID {
			rows = append(rows, f.Duct)
			if !f.Added || !f.OK || f.DuctIDMM != 100 {
				t.Errorf("fill of new duct %d: %+v, want a new 100 mm duct within fill", f.Duct, f)
			}
		}
	}
	if len(rows) != 1 || rows[0] != 1 {
		t.Errorf("fill rows of the new trench's ducts: %v, want duct 1 alone", rows)
	}
}

// TestLateralIsNewConstruction: building B reaches the new duct only by a counted lateral of
// 15 m: the plan builds it as new construction (trench and restoration of turf, the design's
// ducts), pulls B's cable in duct along it, and prices B's entrance.
func TestLateralIsNewConstruction(t *testing.T) {
	t.Parallel()
	r := solveNewWork(t, newWorkCampus(true, []float64{10, 0, 600, 0}), func(p *plan.Plan) {
		p.Design.MaxLateralM = 30
	})
	_, leg := testplan.LegOf(t, r, "A-B")
	if !leg.Feasible || leg.LateralM < 14 || leg.LateralM > 16 {
		t.Fatalf("A-B: feasible %v, lateral %.2f m, want a 15 m lateral", leg.Feasible, leg.LateralM)
	}
	con := r.Estimate.Construction
	var opened float64
	for _, id := range r.Opened {
		sp, _ := r.Site.Net.Span(id)
		opened += sp.LengthM
	}
	// TrenchM and BoreM are the bill's lines, each to 0.1 m (estimate.Construction.TrenchM).
	if got, want := con.TrenchM["turf"]+con.BoreM, opened+leg.LateralM; math.Abs(got-want) > 0.1+1e-9 {
		t.Errorf("new work %.2f m, want the opened run %.2f + the lateral %.2f", got, opened, leg.LateralM)
	}
	if len(con.Entrances) != 3 {
		t.Errorf("entrances used: %+v, want A's, B's and C's", con.Entrances)
	}
	if got := testplan.BOMQty(r.Estimate.BOM, "pull cable in buried"); got != 0 {
		t.Errorf("%v m of cable pulled buried: a counted lateral is new duct now", got)
	}
}

// TestNoNewTrenchNoAddedDuct: with allow_new_trench false a plan adds no duct beside a full
// one either, since that needs a trench or bore beside it (README, design keys).
func TestNoNewTrenchNoAddedDuct(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolve(t, 25, 1, func(p *plan.Plan) { p.Design.AllowNewTrench = false })
	if err != nil {
		t.Fatal(err)
	}
	con := r.Estimate.Construction
	if con.AddedDuctM != 0 || con.NewM != 0 || len(r.Opened) != 0 {
		t.Errorf("new work with allow_new_trench false: added duct %.1f m, new %.1f m, opened %v", con.AddedDuctM, con.NewM, r.Opened)
	}
	for _, f := range r.Fill {
		if f.AddedDucts > 0 {
			t.Errorf("span %s: %d ducts added", f.Span, f.AddedDucts)
		}
	}
}

// TestBendAtHandholeTakenInside: bends of 100°, 100°, 90° and 90° along a new run with the
// 180° budget (TIA-569, two 90° bends): one handhole at the second bend, where the bend is
// taken inside it, so the pulls after it bend 180° and the pulling plan adds no pull point of
// its own (the optimizer priced the one handhole only).
func TestBendAtHandholeTakenInside(t *testing.T) {
	t.Parallel()
	campus := newWorkCampus(false, []float64{10, 0, 100, 0, 82.64, 98.48, 182.64, 98.48, 182.64, 198.48, 282.64, 198.48})
	r := solveNewWork(t, campus, func(p *plan.Plan) { p.Design.HandholeSpacingM = 0 })
	if n := len(r.Estimate.Construction.RunHandholes); n != 1 {
		t.Fatalf("handholes along the run: %d, want 1", n)
	}
	if r.Estimate.AddedPullPoints != 0 {
		t.Errorf("the pulling plan added %d pull points", r.Estimate.AddedPullPoints)
	}
	for _, ps := range r.Estimate.Pulls {
		if ps.LengthM < 1 || ps.BendDeg > 180+1e-6 {
			t.Errorf("pull %d from %s to %s: %.2f m, %.1f° of bends", ps.Seq, ps.From, ps.To, ps.LengthM, ps.BendDeg)
		}
	}
}

// TestJoinHandholeIsPullPoint: 120 m of existing duct, then 590 m of new duct: the handhole
// where the new duct joins is a pull point, so the spacing along the run counts from it and no
// pull is longer than 150 m; the crew sets up one pull per section.
func TestJoinHandholeIsPullPoint(t *testing.T) {
	t.Parallel()
	campus := newWorkCampus(false, []float64{0, 10, 0, 130, 0}, []float64{130, 0, 720, 0})
	r := solveNewWork(t, campus, nil)
	con := r.Estimate.Construction
	if len(con.NewJunctions) != 1 || len(con.RunHandholes) != 3 {
		t.Fatalf("join handholes %v, along the run %v: want 1 and 3", con.NewJunctions, con.RunHandholes)
	}
	for _, ps := range r.Estimate.Pulls {
		if ps.LengthM > 150+1e-6 {
			t.Errorf("pull %d from %s to %s: %.2f m", ps.Seq, ps.From, ps.To, ps.LengthM)
		}
	}
	if n := len(r.Estimate.Pulls); n != 5 || r.Estimate.AddedPullPoints != 0 {
		t.Errorf("%d pull sections, %d added pull points: want 5 and 0", n, r.Estimate.AddedPullPoints)
	}
	if got := testplan.BOMQty(r.Estimate.BOM, "crew set-up, per pull"); got != 5 {
		t.Errorf("crew set-ups: %v, want 5", got)
	}
}

// TestNoHandholesOnNewAerial: a proposed pole line is not pulled through a duct: no handholes
// along it, whatever its length.
func TestNoHandholesOnNewAerial(t *testing.T) {
	t.Parallel()
	r := solveNewWork(t, newWorkCampus(false, []float64{1, 10, 0, 600, 0}), func(p *plan.Plan) { p.Design.AllowOutdoorCopper = false })
	if len(r.Opened) != 1 || len(r.Estimate.Construction.RunHandholes) != 0 {
		t.Errorf("opened %v, handholes %v: want the pole line opened without handholes", r.Opened, r.Estimate.Construction.RunHandholes)
	}
}
