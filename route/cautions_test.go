package route_test

import (
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// cautionIDs lists the IDs of r's cautions, in order.
func cautionIDs(r *route.Result) []string {
	var ids []string
	for _, c := range r.Cautions {
		ids = append(ids, c.ID)
	}
	return ids
}

// cautionOf returns r's caution of the given id, or fails.
func cautionOf(t *testing.T, r *route.Result, id string) route.Caution {
	t.Helper()
	for _, c := range r.Cautions {
		if c.ID == id {
			return c
		}
	}
	t.Fatalf("no %q caution; the plan has %v", id, cautionIDs(r))
	return route.Caution{}
}

// TestCautionsFollowTheWork: each caution is listed when, and only when, the plan's work
// has what it is about, and names what in the plan calls for it.
//   - Utility locates before any excavation, trench or bore (one-call laws, from memory; the
//     README's Safety section) and only then: a plan that only pulls cable into existing
//     ducts digs nothing.
//   - Trench cave-in protection where new trench is dug (29 CFR 1926 Subpart P, 1926.652(a)(1):
//     a protective system from 5 ft, 1.52 m; seen in a secondary publication).
//   - A bore plan where the plan bores (common practice, no published source).
//   - Pole lines (29 CFR 1910.268(n), seen in a secondary publication; NESC, from memory),
//     utility tunnels (29 CFR 1910.146, from memory), confined spaces at maintenance holes
//     (29 CFR 1910.146, from memory).
//   - Laser light on every plan with a fibre leg (IEC 60825-1, from memory).
//   - Copper leaving a building: primary protector and bonding (NFPA 70 800.90, seen), at
//     the entrances named, where the protectors go.
//   - Cave-in protection for every excavation a worker enters, a handhole's pit and a bore's
//     pits too, with no new trench at all (29 CFR 1926.650(b), an excavation is any
//     man-made cut, cavity, trench or depression formed by earth removal, from memory;
//     Subpart P then applies to it: tester 11's finding 1).
//   - A handhole cut into an existing duct bank is named (work around cables in service,
//     the owner's outage coordination: common practice, no published source).
//   - New work on or beside a span marked emi high is named as near power conductors
//     (29 CFR 1926.416(a)(3): ascertain energized circuits before work, from memory;
//     1926.651(b) utility locates, from memory).
func TestCautionsFollowTheWork(t *testing.T) {
	t.Parallel()
	method := func(m string) *strings.Replacer {
		return strings.NewReplacer(`"id":"P","type":"duct",`, `"id":"P","type":"duct","method":"`+m+`",`)
	}
	pull := testsite.PullCampus(100, 2)
	// hairpin: street S from A east to B, duct L leaving junction J (200, 0) back to C, where
	// A-C turns from S into L (TestNoSharpRun): a turn handhole on the existing ducts, nothing
	// else dug; L marked emi level.
	hairpin := func(level string) string {
		return collection(testsite.Box("A", "mc", 0, 0), testsite.Box("B", "", 410, 0), testsite.Box("C", "", 0, 60),
			duct("S", 0, 0, 200, 0, 400, 0), strings.Replace(duct("L", 200, 0, 0, 50), `"type":"duct"`, `"type":"duct","emi":"`+level+`"`, 1))
	}
	copperOnly := copperOnlyRules(t)
	skipC := []plan.LinkSpec{{From: "A", To: "C", Skip: true}} // B alone, over the existing duct D
	for _, tc := range []struct {
		name, campus string
		edit         func(p *plan.Plan)
		want         []string
		where        map[string]string // a caution's Where, when checked
	}{
		{name: "existing duct only", campus: pull, edit: func(p *plan.Plan) {
			p.Links = skipC
		}, want: []string{route.CautionLaser}},
		{name: "trench", campus: method("trench").Replace(pull),
			want: []string{route.CautionLocates, route.CautionTrench, route.CautionDuctBank, route.CautionLaser},
			where: map[string]string{route.CautionTrench: "new trench: span P; 1 handhole to set: J0002",
				route.CautionLocates: "new trench: span P; 1 handhole to set"}},
		{name: "bore", campus: method("bore").Replace(pull),
			want: []string{route.CautionLocates, route.CautionTrench, route.CautionBore, route.CautionDuctBank, route.CautionLaser},
			where: map[string]string{route.CautionBore: "directional bore: span P",
				route.CautionTrench: "entry and exit pits of the directional bore: span P; 1 handhole to set: J0002"}},
		{name: "turn handhole only", campus: hairpin("none"), want: []string{route.CautionLocates, route.CautionTrench, route.CautionDuctBank, route.CautionLaser},
			where: map[string]string{route.CautionLocates: "1 handhole to set", route.CautionTrench: "1 handhole to set: J0003",
				route.CautionDuctBank: "1 handhole to set into existing ducts or direct-buried cable: J0003 (pathways L, S)"}},
		{name: "turn handhole beside power", campus: hairpin("high"), want: []string{route.CautionLocates, route.CautionTrench, route.CautionPower, route.CautionDuctBank, route.CautionLaser},
			where: map[string]string{route.CautionPower: "new work on or beside spans the campus marks emi high: handhole J0003 at span L"}},
		{name: "pole line", campus: strings.Replace(pull, `"id":"D","type":"duct"`, `"id":"D","type":"aerial"`, 1), edit: func(p *plan.Plan) {
			p.Links = skipC
		}, want: []string{route.CautionAerial, route.CautionLaser},
			where: map[string]string{route.CautionAerial: "1 leg on aerial pathway D"}},
		{name: "tunnel", campus: strings.Replace(pull, `"id":"D","type":"duct"`, `"id":"D","type":"tunnel"`, 1), edit: func(p *plan.Plan) {
			p.Links = skipC
		}, want: []string{route.CautionTunnel, route.CautionLaser},
			where: map[string]string{route.CautionTunnel: "1 leg through tunnel pathway D"}},
		{name: "maintenance hole", campus: strings.Replace(pull, `"id":"HH-1","type":"handhole"`, `"id":"MH-1","type":"maintenance-hole"`, 1), edit: func(p *plan.Plan) {
			p.Links = skipC
		}, want: []string{route.CautionConfined, route.CautionLaser},
			where: map[string]string{route.CautionConfined: "1 maintenance hole passed: MH-1"}},
		{name: "copper between buildings", campus: copperCampus(), edit: func(p *plan.Plan) {
			p.Links = []plan.LinkSpec{{From: "A", To: "B", Rate: "1G"}}
			p.Design.AllowOutdoorCopper = true
			p.Rules = copperOnly
		}, want: []string{route.CautionCopper},
			where: map[string]string{route.CautionCopper: "1 copper leg leaving a building: A-B/primary; primary protectors at 2 entrances A:1, B:1"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			r, err := testplan.PullSolveJSON(t, tc.campus, tc.edit)
			if err != nil {
				t.Fatal(err)
			}
			if got := cautionIDs(r); !slices.Equal(got, tc.want) {
				t.Errorf("cautions %v, want %v", got, tc.want)
			}
			for id, want := range tc.where {
				if got := cautionOf(t, r, id).Where; got != want {
					t.Errorf("%s caution: where %q, want %q", id, got, want)
				}
			}
			for _, c := range r.Cautions {
				if c.Title == "" || c.Text == "" || c.Source == "" || c.Where == "" {
					t.Errorf("caution %q lacks a title, text, source or where: %+v", c.ID, c)
				}
			}
		})
	}
}

// copperOnlyRules writes the embedded rules with one more that keeps fibre out of outdoor
// routes (copper costs more than fibre on the test campuses) and returns the file's path.
func copperOnlyRules(t *testing.T) string {
	t.Helper()
	rules, err := os.ReadFile("../media/rules.yaml")
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "rules.yaml")
	rules = append(rules, "\n  - id: test-copper-only\n    kinds: [multimode, singlemode]\n    when: outdoor\n    effect: exclude\n    reason: \"this test plans copper\"\n    source: the test\n"...)
	if err := os.WriteFile(path, rules, 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// copperCampus is hub A and building B 30 m apart, joined by one existing duct, with risers
// of 1 m: a channel short enough for copper (ANSI/TIA-568.2, 90 m permanent link, seen).
func copperCampus() string {
	line := func(pts ...float64) string {
		var s []string
		for i := 0; i+1 < len(pts); i += 2 {
			s = append(s, fmt.Sprintf("[%.7f,%.7f]", testsite.X(pts[i]), testsite.Y(pts[i+1])))
		}
		return "[" + strings.Join(s, ",") + "]"
	}
	riser := strings.NewReplacer(`"kind":"building",`, `"kind":"building","riser_m":1,`)
	f := []string{
		riser.Replace(testsite.Box("A", "mc", 10, 25)), riser.Replace(testsite.Box("B", "", 40, 25)),
		// Four spare ducts: the link's 4-pair cables, one per port pair (ANSI/TIA-568.2), three
		// to a duct (install.DefaultCablesPerDuct: common practice, no published source),
		// need no duct added beside D.
		fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"D","type":"duct","spare_ducts":4},"geometry":{"type":"LineString","coordinates":%s}}`,
			line(10, 15, 10, 0, 40, 0, 40, 15)),
	}
	return `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
}

// TestDemoCautions: the demo's work calls for every caution but copper's (it has no copper
// leg), each naming what of the demo calls for it, and the demo's 3 legs over the pole line
// and 10 through the tunnel (tester 5's count, finding 7) are named.
func TestDemoCautions(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	want := []string{route.CautionLocates, route.CautionTrench, route.CautionBore, route.CautionDuctBank, route.CautionBuried,
		route.CautionAerial, route.CautionTunnel, route.CautionConfined, route.CautionLaser}
	if got := cautionIDs(r); !slices.Equal(got, want) {
		t.Fatalf("demo cautions %v, want %v", got, want)
	}
	for id, prefix := range map[string]string{
		route.CautionAerial: "3 legs on aerial pathways ",
		route.CautionTunnel: "10 legs through tunnel pathways ",
		route.CautionBore:   "directional bore: span P-5",
	} {
		if w := cautionOf(t, r, id).Where; !strings.HasPrefix(w, prefix) {
			t.Errorf("%s: where %q, want it to start %q", id, w, prefix)
		}
	}
}

// TestDirectBurialOnBuriedSpans: on the fan campus every link's cable is laid along an
// existing direct-buried pathway (FB, FC, FE) after the duct T. Every feasible leg lays a
// construction the catalog rates for direct burial (rule direct-burial: ICEA S-87-640 and
// Telcordia GR-20 outside-plant cable, from memory), and the plan's cautions name the
// digging beside the buried cable and the locates it needs (common practice, no published
// source).
func TestDirectBurialOnBuriedSpans(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, testsite.FanCampus(100, 2, false), nil)
	if err != nil {
		t.Fatal(err)
	}
	buried := 0
	for _, l := range r.Legs {
		if !l.Feasible {
			t.Fatalf("%s/%s infeasible: %s", l.Link.ID, l.Name, l.Reason)
		}
		k := r.Engine.Catalog().Medium(l.Medium).Construction(l.Construction)
		for _, st := range l.Steps {
			if sp, _ := r.Site.Net.Span(st.SpanID); sp.Type == "buried" {
				buried++
				if !k.DirectBurialRated {
					t.Errorf("%s/%s is laid along buried span %s on %s, not rated for direct burial", l.Link.ID, l.Name, sp.ID, k.ID)
				}
				break
			}
		}
	}
	if buried != len(r.Legs) || buried == 0 {
		t.Fatalf("%d of %d legs on a buried span: the campus no longer tests direct burial", buried, len(r.Legs))
	}
	if w, want := cautionOf(t, r, route.CautionBuried).Where, "3 legs laid along existing direct-buried pathways FB, FC, FE"; w != want {
		t.Errorf("buried caution: where %q, want %q", w, want)
	}
	if w := cautionOf(t, r, route.CautionLocates).Where; !strings.Contains(w, "direct-buried pathways FB, FC, FE") {
		t.Errorf("locates caution: where %q does not name the buried pathways", w)
	}
}
