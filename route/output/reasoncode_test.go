package output

import (
	"context"
	"slices"
	"testing"

	"spanwright/media"
	"spanwright/route/internal/testplan"
	"spanwright/route/plan"
	"spanwright/route/routing"
)

// ReasonCodes lists every reason code a leg may carry, in the README's order.
var reasonCodes = []string{
	media.CodeOnly, media.CodeCheapest, media.CodePreferred, routing.CodeSharedPt,
	routing.CodeNoRoute, routing.CodeExcluded, media.CodeNoMedium, media.CodeNoApplication,
	routing.CodeNoDiverse, routing.CodePrimary, media.CodeBadFacts,
}

// TestReasonCodes plans the pull campus with diverse routes through a 5 mm duct (no cable
// fits: nothing routes) and a 100 mm one (the primaries route, no second route exists): each
// leg carries the code of its reason, set where the reason is made, and links.csv's last
// column has it. Every code is one of the README's and at most 10 characters (the
// 254-character Shapefile text limit, ESRI Shapefile Technical Description 1998, leaves the
// reason cut; the code is whole).
func TestReasonCodes(t *testing.T) {
	t.Parallel()
	for _, c := range reasonCodes {
		if len(c) > 10 || c == "" {
			t.Errorf("code %q: want 1 to 10 characters", c)
		}
	}
	for _, tc := range []struct {
		ductMM float64
		want   map[string]string // link/leg → code
	}{
		{5, map[string]string{"A-B/primary": routing.CodeNoRoute, "A-B/diverse": routing.CodePrimary,
			"A-C/primary": routing.CodeNoRoute, "A-C/diverse": routing.CodePrimary}},
		{100, map[string]string{"A-B/primary": media.CodeOnly, "A-B/diverse": routing.CodeNoDiverse,
			"A-C/primary": media.CodeOnly, "A-C/diverse": routing.CodeNoDiverse}},
	} {
		// No structure slack loops: A-C's channel is then 366.67 m, which OM4 and OM5 closed
		// with 0.02 dB (os2 was the cheapest of several, CHEAPEST) until the multimode margin
		// of 0.5 dB (tester 14 F7): os2 is the only feasible medium (media's TestChoose
		// covers CHEAPEST).
		r, err := testplan.PullSolve(t, tc.ductMM, 1, func(p *plan.Plan) {
			p.Defaults.Redundancy = "diverse"
			p.Design.SlackLoopStructureM = 0
		})
		if err != nil {
			t.Fatal(err)
		}
		for _, l := range r.Legs {
			key := l.Link.ID + "/" + l.Name
			if l.ReasonCode != tc.want[key] {
				t.Errorf("%g mm duct, %s: code %q, want %q (%s)", tc.ductMM, key, l.ReasonCode, tc.want[key], l.Explain())
			}
			if !slices.Contains(reasonCodes, l.ReasonCode) {
				t.Errorf("%s: code %q is not in the README's table", key, l.ReasonCode)
			}
		}
		files, err := Files(context.Background(), r, WriteOptions{SkipWorkbook: true, SkipGeoPackage: true})
		if err != nil {
			t.Fatal(err)
		}
		rows := testplan.ReadCSV(t, testplan.FileOf(t, files, "links.csv"))
		n := slices.Index(rows[0], "reason_code") + 1 // the cable schedule's columns follow it (scheduleHead)
		if n == 0 {
			t.Fatalf("links.csv: no reason_code in %q", rows[0])
		}
		for _, rec := range rows[1:] {
			if want := tc.want[rec[0]+"/"+rec[1]]; rec[n-1] != want {
				t.Errorf("links.csv %s %s: code %q, want %q", rec[0], rec[1], rec[n-1], want)
			}
		}
	}
}
