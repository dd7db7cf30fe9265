package route_test

import (
	"fmt"
	"math"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// assumedWarning is the plan's warning about new trench on an assumed surface, or "".
func assumedWarning(r *route.Result) string {
	for _, w := range r.Warnings {
		if strings.HasPrefix(w, "new trench priced on an assumed surface") {
			return w
		}
	}
	return ""
}

// TestAssumedSurface: on the pull campus with no spare duct, the cable needs a duct added
// beside the existing duct D, whose pathway gives no surface. That trench is priced on the
// design's assumed_surface (turf by default: common practice, no published source), named span
// by span in Construction.Assumed and counted in one warning; set to asphalt, the same metres
// move to asphalt; the existing pathway's own surface wins over the assumption and nothing is
// warned. The proposed pathway P gives asphalt and is never assumed. D and P are trenched:
// a bore restores no surface (and is never assumed one).
func TestAssumedSurface(t *testing.T) {
	t.Parallel()
	// Trenched, as the campus says: a bore beside D would restore no surface.
	trenched := strings.NewReplacer(`"id":"D","type":"duct",`, `"id":"D","type":"duct","method":"trench",`,
		`"id":"P","type":"duct",`, `"id":"P","type":"duct","method":"trench",`).Replace(testsite.PullCampus(100, 0))
	existingSurface := strings.Replace(trenched, `"id":"D","type":"duct",`, `"id":"D","type":"duct","surface":"concrete",`, 1)
	for _, tc := range []struct {
		name, campus, assumed string
		want                  string // the surface D's trench is priced on
		warned                bool
	}{
		{"default", trenched, "", geo.SurfaceTurf, true},
		{"plan's assumption", trenched, geo.SurfaceAsphalt, geo.SurfaceAsphalt, true},
		{"pathway's own surface", existingSurface, geo.SurfaceAsphalt, "concrete", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			r, err := testplan.PullSolveJSON(t, tc.campus, func(p *plan.Plan) {
				if tc.assumed != "" {
					p.Design.AssumedSurface = tc.assumed
				}
				p.Design.AllowNewTrench = true
			})
			if err != nil {
				t.Fatal(err)
			}
			// The trenches beside D: every span of D given added ducts.
			var besideM float64
			var beside []string
			for _, f := range r.Fill {
				if sp, _ := r.Site.Net.Span(f.Span); f.AddedDucts > 0 && sp.Status != geo.StatusProposed {
					if sp.PathwayID != "D" {
						t.Fatalf("ducts added beside %s (pathway %s); the test expects them only beside D", sp.ID, sp.PathwayID)
					}
					besideM += sp.LengthM
					beside = append(beside, "span "+sp.ID)
				}
			}
			if besideM == 0 {
				t.Fatal("no duct added beside D: the campus no longer tests a trench beside a full duct")
			}
			con := r.Estimate.Construction
			var opened float64 // P's own trench, on its asphalt
			for _, id := range r.Opened {
				sp, _ := r.Site.Net.Span(id)
				opened += sp.LengthM
			}
			wantM := besideM
			if tc.want == geo.SurfaceAsphalt {
				wantM += opened
			}
			if got := con.TrenchM[tc.want]; math.Abs(got-wantM) > 0.05+1e-9 { // the bill's line, to 0.1 m
				t.Errorf("trench on %s: got %.3f m, want %.3f (beside D %.3f)", tc.want, got, wantM, besideM)
			}
			var assumed []string
			var assumedM float64
			for _, a := range con.Assumed {
				assumed = append(assumed, a.From)
				assumedM += a.LengthM
			}
			w := assumedWarning(r)
			if !tc.warned {
				if len(assumed) > 0 || w != "" {
					t.Errorf("the pathway gives its surface, yet assumed %v, warned %q", assumed, w)
				}
				return
			}
			// Each listed to 0.1 m (estimate.WorkPiece.ListedM), within 0.1 m of its length.
			if strings.Join(assumed, ";") != strings.Join(beside, ";") || math.Abs(assumedM-besideM) > 0.1*float64(len(beside)) {
				t.Errorf("assumed %v (%.3f m), want the spans beside D %v (%.3f m)", assumed, assumedM, beside, besideM)
			}
			if con.AssumedSurface != tc.want {
				t.Errorf("assumed surface %q, want %q", con.AssumedSurface, tc.want)
			}
			n := fmt.Sprintf("%d spans", len(beside))
			if len(beside) == 1 {
				n = "1 span"
			}
			if want := fmt.Sprintf("%s (design.assumed_surface): %s, %.1f m,", tc.want, n, besideM); !strings.Contains(w, want) {
				t.Errorf("warning %q, want it to say %q", w, want)
			}
			if got := testplan.BOMQty(r.Estimate.BOM, "trench, "+tc.want); math.Abs(got-con.TrenchM[tc.want]) > 0.05 {
				t.Errorf("bill's trench, %s: %v m, want %.3f", tc.want, got, con.TrenchM[tc.want])
			}
		})
	}
}
