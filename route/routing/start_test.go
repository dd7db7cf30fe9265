package routing

import (
	"context"
	"fmt"
	"slices"
	"strings"
	"testing"
	"testing/fstest"

	"spanwright/route/internal/campusgen"
	"spanwright/route/internal/testsite"
	"spanwright/route/optimize"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// startOfSolution writes sol's routes as routes.geojson carries them (output.ReadStart): per
// feasible route, its legs' span IDs from the link's from building to its to building (the
// demand's Target to its Source) and its medium; entrance and turn edges are left out.
func startOfSolution(nSpans int, prob *optimize.Problem, sol *optimize.Solution) *Start {
	st := &Start{From: "earlier"}
	for _, r := range sol.Routes {
		if !r.Feasible {
			continue
		}
		for i, leg := range []optimize.Leg{r.Primary, r.Secondary} {
			if len(leg.Hops) == 0 {
				continue
			}
			l := StartLeg{Link: prob.Demands[r.Demand].ID, Leg: []string{LegPrimary, LegDiverse}[i], Medium: optionMedium(r.Medium), // as routes.geojson writes it: the catalog medium
				Spans: []string{}}
			for k := len(leg.Hops) - 1; k >= 0; k-- {
				if e := leg.Hops[k].Edge; e < nSpans {
					l.Spans = append(l.Spans, prob.Edges[e].ID)
				}
			}
			st.Legs = append(st.Legs, l)
		}
	}
	return st
}

// TestStartRoutesRebuildsSolution: an optimizer solution written as span IDs alone (as
// routes.geojson keeps it) and read back by startRoutes is the optimizer's own warm start of
// it (optimize.StartFrom), hop for hop, the entrance and turn edges between spans found again;
// on the demo campus (two-entrance buildings, turn handholes) and a generated 150-building
// campus. A start whose spans no longer join is reported, link by link. A round trip of the
// project's own routes: no outside source.
func TestStartRoutesRebuildsSolution(t *testing.T) {
	t.Parallel()
	demo, dp := testsite.Demo(t)
	gen, gp := generatedSite(t, 150)
	for _, tc := range []struct {
		name string
		s    *site.Site
		p    *plan.Plan
	}{{"demo", demo, dp}, {"generated 150", gen, gp}} {
		t.Run(tc.name, func(t *testing.T) {
			eng, err := plan.Engine(tc.p)
			if err != nil {
				t.Fatal(err)
			}
			m := NewModel(eng, tc.p.Design)
			hub, _ := tc.s.Hub(tc.p)
			links, _, errs := tc.s.Links(tc.p, hub)
			if len(errs) > 0 {
				t.Fatal(errs)
			}
			prob, lay, _, err := problem(tc.s, m, links, m.runsOf(tc.s))
			if err != nil {
				t.Fatal(err)
			}
			sol, _, _, err := solve(context.Background(), tc.s, lay, prob, optimize.Settings{}, "")
			if err != nil {
				t.Fatal(err)
			}
			nSpans := len(tc.s.Net.Spans)
			extras := 0
			for _, r := range sol.Routes {
				for _, h := range slices.Concat(r.Primary.Hops, r.Secondary.Hops) {
					if h.Edge >= nSpans {
						extras++
					}
				}
			}
			st := startOfSolution(nSpans, prob, sol)
			got, unfit := startRoutes(tc.s, lay, prob, st)
			want := optimize.StartFrom(sol)
			for d, why := range unfit {
				t.Errorf("link %s reported not to fit its own route: %s", prob.Demands[d].ID, why)
			}
			for d := range want {
				if fmt.Sprint(got[d]) != fmt.Sprint(want[d]) {
					t.Errorf("demand %s: rebuilt\n  %v\nwant\n  %v", want[d].ID, got[d], want[d])
				}
			}
			t.Logf("%d demands, %d entrance and turn edges rebuilt", len(want), extras)
			if extras == 0 {
				t.Error("no route takes an entrance or turn edge: the campus does not test their rebuilding")
			}
			// A span gone, a span from elsewhere: those links start afresh, and are named.
			broken := &Start{From: st.From, Legs: slices.Clone(st.Legs)}
			broken.Legs[0].Spans = append([]string{"no such span"}, broken.Legs[0].Spans...)
			last := len(broken.Legs) - 1
			broken.Legs[last].Spans = slices.Clone(broken.Legs[last].Spans)
			slices.Reverse(broken.Legs[last].Spans) // walked from the wrong end
			got, unfit = startRoutes(tc.s, lay, prob, broken)
			var names []string
			for d, why := range unfit {
				names = append(names, prob.Demands[d].ID)
				if got[d].Option != -1 || got[d].Legs != nil {
					t.Errorf("demand %s does not fit but starts from %v", prob.Demands[d].ID, got[d])
				}
				// The reason names what is wrong: the span that is not there, or the span
				// that does not start at the link's building (walked from the wrong end).
				if prob.Demands[d].ID == broken.Legs[0].Link && !strings.Contains(why, "span no such span is not on this campus") {
					t.Errorf("link %s: reason %q, want the missing span named", prob.Demands[d].ID, why)
				}
				if prob.Demands[d].ID != broken.Legs[0].Link && !strings.Contains(why, "does not start at the link's building") && !strings.Contains(why, "does not meet") {
					t.Errorf("link %s: reason %q, want the span out of place named", prob.Demands[d].ID, why)
				}
			}
			wantNames := []string{broken.Legs[0].Link}
			if len(broken.Legs[last].Spans) > 1 && broken.Legs[last].Link != broken.Legs[0].Link {
				wantNames = append(wantNames, broken.Legs[last].Link)
			}
			slices.Sort(names)
			slices.Sort(wantNames)
			if fmt.Sprint(names) != fmt.Sprint(wantNames) {
				t.Errorf("links reported not to fit: %v, want %v", names, wantNames)
			}
		})
	}
}

// generatedSite is a generated campus of n buildings (seed 1, campusgen.BenchOptions) with
// its plan, every fourth building of those with two laterals on a diverse link.
func generatedSite(t *testing.T, n int) (*site.Site, *plan.Plan) {
	t.Helper()
	c := campusgen.Generate(1, campusgen.BenchOptions(n))
	p, err := plan.ParsePlan("plan.yaml", []byte(c.PlanYAML([]string{"campus.geojson"}, 4)))
	if err != nil {
		t.Fatal(err)
	}
	p.Dir = t.TempDir()
	fsys := fstest.MapFS{"campus.geojson": &fstest.MapFile{Data: campusgen.GeoJSON(c.Features)}}
	s, err := site.Load(context.Background(), fsys, p.Campus, site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
	if err != nil {
		t.Fatal(err)
	}
	return s, p
}

// TestStartSameProblem: a start that came from a plan of this very routing problem solved
// from scratch (its Start.ProblemSHA256 is the problem's) is not searched from: the answer is
// that plan, taken from the site's solutions without a solve, whatever the start's routes say
// (here every leg broken), and it carries the problem's fingerprint again; a start of another
// problem is searched from, and its plan carries none. Identical problems give identical
// plans, whichever scenario of a sweep was the base. The project's own rule: no outside source.
func TestStartSameProblem(t *testing.T) {
	t.Parallel()
	s, p := generatedSite(t, 60)
	m, links := generatedLinks(t, s, p)
	ctx := context.Background()
	cold, err := Solve(ctx, s, m, links)
	if err != nil {
		t.Fatal(err)
	}
	if len(cold.ProblemSHA256) != 64 || cold.StartSame {
		t.Fatalf("a plan from scratch: fingerprint %q, StartSame %v; want a SHA-256 and false", cold.ProblemSHA256, cold.StartSame)
	}
	solved := s.Solved.Len()
	st := &Start{From: "base", ProblemSHA256: cold.ProblemSHA256}
	for _, l := range links {
		st.Legs = append(st.Legs, StartLeg{Link: l.ID, Leg: LegPrimary, Medium: "no such medium", Spans: []string{"no such span"}})
	}
	same, err := SolveFrom(ctx, s, m, links, st)
	if err != nil {
		t.Fatal(err)
	}
	if !same.StartSame || same.ProblemSHA256 != cold.ProblemSHA256 || same.StartUnused != nil || s.Solved.Len() != solved {
		t.Errorf("same problem: StartSame %v, fingerprint %q, unused %d, %d solutions kept (want %d: no solve)",
			same.StartSame, same.ProblemSHA256, len(same.StartUnused), s.Solved.Len(), solved)
	}
	if same.ObjectiveCents != cold.ObjectiveCents || fmt.Sprint(same.Opened) != fmt.Sprint(cold.Opened) || fmt.Sprint(legSpans(same)) != fmt.Sprint(legSpans(cold)) {
		t.Errorf("same problem: %d cents, opened %v; want the plan from scratch, %d cents, opened %v", same.ObjectiveCents, same.Opened, cold.ObjectiveCents, cold.Opened)
	}
	st.ProblemSHA256 = strings.Repeat("0", 64) // another problem's plan
	other, err := SolveFrom(ctx, s, m, links, st)
	if err != nil {
		t.Fatal(err)
	}
	if other.StartSame || other.ProblemSHA256 != "" || len(other.StartUnused) != len(links) {
		t.Errorf("another problem's start: StartSame %v, fingerprint %q, %d of %d links unused; want it searched from (every link placed afresh)",
			other.StartSame, other.ProblemSHA256, len(other.StartUnused), len(links))
	}
}

// legSpans lists every leg's spans, in leg order.
func legSpans(r *Routed) [][]string {
	var out [][]string
	for _, l := range r.Legs {
		var ids []string
		for _, st := range l.Steps {
			ids = append(ids, st.SpanID)
		}
		out = append(out, ids)
	}
	return out
}
