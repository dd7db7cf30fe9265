package metamorphic_test

import (
	"fmt"
	"slices"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/routing"
)

// A street's duct bank as one shared-risk group between its branch points (review 20 F3). The
// campus, on the local metre grid (invented place): a ring of ducts, S (y = 0, x 0 to 400,
// drawn with a vertex at x = 200 that marks nothing), N (y = 200), W and E, with handholes
// at its corners; hub A between S and N, entered by LA1 from S and LA2 from N (handholes H1,
// H2 where they meet the ring); a side duct M looping north off S from x = 150 to x = 250
// along y = 60, meeting S at two junctions with no structure. B stands 10 m north of M and
// within max_lateral_m of nothing else: its one way in is a counted lateral tapping M. Every
// route to B leaves S onto M at x = 150 or x = 250, so B's two legs run on S at once: one
// west of x = 150 (A, LA1, S, M), the other east of x = 250 (A, LA2, N, E, S, M). Those
// stretches share no point and are parted by the side street's junctions: a backhoe on one
// cuts one leg. Parting a street's duct bank at its branch points (structures, junctions of
// three or more spans, a building's wall) and not between them: common practice, no
// published source; physically diverse routes for critical links: ANSI/TIA-569 (from
// memory).
func riskRunCampus(s []string, more ...string) string {
	f := append(slices.Clone(s),
		testsite.Box("A", "mc", 50, 100), testsite.Box("B", "", 200, 80),
		testsite.Pathway("N", "duct", 0, 200, 50, 200, 400, 200), testsite.Pathway("W", "duct", 0, 0, 0, 200),
		testsite.Pathway("E", "duct", 400, 0, 400, 200), testsite.Pathway("LA1", "duct", 50, 90, 50, 0),
		testsite.Pathway("LA2", "duct", 50, 110, 50, 200), testsite.Pathway("M", "duct", 150, 0, 150, 60, 250, 60, 250, 0),
		riskHandhole("H1", 50, 0), riskHandhole("H2", 50, 200), riskHandhole("H3", 0, 0), riskHandhole("H4", 0, 200),
		riskHandhole("H5", 400, 0), riskHandhole("H6", 400, 200))
	return `{"type":"FeatureCollection","features":[` + strings.Join(append(f, more...), ",") + `]}`
}

// riskStreet is S drawn as one pathway.
func riskStreet() []string {
	return []string{testsite.Pathway("S", "duct", 0, 0, 50, 0, 150, 0, 200, 0, 250, 0, 400, 0)}
}

func riskHandhole(id string, x, y float64) string {
	return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"structure","id":%q,"type":"handhole"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`,
		id, testsite.X(x), testsite.Y(y))
}

// riskLegs plans the diverse link A-B on campus and returns, for each of its two legs, what
// the verdict is made of: planned or not, reason code, metres and the pathways taken (named
// back through back, when given). Not the cost: every building is served by the plan's
// defaults, and a leg's share of what it shares with other links moves when a building is
// added.
func riskLegs(t *testing.T, campus string, back map[string]string) []string {
	t.Helper()
	r, err := testplan.PullSolveJSON(t, campus, func(p *plan.Plan) {
		p.Links = append(p.Links, plan.LinkSpec{To: "B", Redundancy: plan.RedundancyDiverse})
	})
	if err != nil {
		t.Fatal(err)
	}
	return riskDigest(r, back)
}

func riskDigest(r *route.Result, back map[string]string) []string {
	var d []string
	for _, l := range r.Legs {
		if l.Link.To != "B" {
			continue
		}
		var ps []string
		for _, p := range l.Pathways {
			if b, ok := back[p]; ok {
				p = b
			}
			if len(ps) == 0 || ps[len(ps)-1] != p { // a street split in two is one pathway named back
				ps = append(ps, p)
			}
		}
		d = append(d, fmt.Sprintf("%s: feasible %v, code %q, %.1f m, %v", l.Name, l.Feasible, l.ReasonCode, l.RouteM, ps))
	}
	return d
}

// wantDiverse fails unless both legs are planned, neither NO-DIVERSE.
func wantDiverse(t *testing.T, what string, d []string) {
	t.Helper()
	if len(d) != 2 {
		t.Fatalf("%s: legs %v, want two", what, d)
	}
	for _, l := range d {
		if !strings.Contains(l, "feasible true") || strings.Contains(l, routing.CodeNoDiverse) {
			t.Errorf("%s: %s; want planned: the legs' stretches of S are parted at M's junctions", what, l)
		}
	}
}

// TestRiskRunUnrelatedBuilding: a building U 10 m south of S at x = 190, no end of A-B (the
// plan's defaults serve it from A, over S), gets a counted lateral tapping S between the two legs' stretches. Its candidate tap builds
// nothing and must not change whether A-B is diverse, nor its legs (before: without U, S was
// one group and A-B was NO-DIVERSE; with U, S was parted at U's tap and A-B was planned).
func TestRiskRunUnrelatedBuilding(t *testing.T) {
	t.Parallel()
	base := riskLegs(t, riskRunCampus(riskStreet()), nil)
	wantDiverse(t, "without U", base)
	with := riskLegs(t, riskRunCampus(riskStreet(), testsite.Box("U", "", 190, -20)), nil)
	if !slices.Equal(base, with) {
		t.Errorf("an unrelated building within reach of S changed A-B:\nwithout %v\nwith    %v", base, with)
	}
}

// TestRiskRunSplitAtVertex: S drawn as two pathways meeting end to end at its vertex
// x = 200, which marks nothing, plans A-B as S drawn whole (before: two pathways were two
// groups, so the split alone made A-B diverse).
func TestRiskRunSplitAtVertex(t *testing.T) {
	t.Parallel()
	base := riskLegs(t, riskRunCampus(riskStreet()), nil)
	split := []string{testsite.Pathway("S", "duct", 0, 0, 50, 0, 150, 0, 200, 0), testsite.Pathway("S-2", "duct", 200, 0, 250, 0, 400, 0)}
	got := riskLegs(t, riskRunCampus(split), map[string]string{"S-2": "S"})
	if !slices.Equal(base, got) {
		t.Errorf("S split at a vertex changed A-B:\nwhole %v\nsplit %v", base, got)
	}
	wantDiverse(t, "split", got)
}

// TestRiskRunRenamed: every pathway and structure renamed, in an order that reverses theirs,
// with U present, plans A-B the same, named back.
func TestRiskRunRenamed(t *testing.T) {
	t.Parallel()
	campus := riskRunCampus(riskStreet(), testsite.Box("U", "", 190, -20))
	base := riskLegs(t, campus, nil)
	ids := []string{"S", "N", "W", "E", "LA1", "LA2", "M", "H1", "H2", "H3", "H4", "H5", "H6"}
	var pairs []string
	back := map[string]string{}
	for i, id := range ids {
		to := fmt.Sprintf("Z%02d", len(ids)-i)
		pairs = append(pairs, fmt.Sprintf("%q", id), fmt.Sprintf("%q", to))
		back[to] = id
	}
	got := riskLegs(t, strings.NewReplacer(pairs...).Replace(campus), back)
	if !slices.Equal(base, got) {
		t.Errorf("renamed ids changed A-B:\nbefore %v\nafter  %v", base, got)
	}
	wantDiverse(t, "renamed", got)
}
