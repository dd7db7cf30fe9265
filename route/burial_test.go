package route_test

import (
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/plan"
	"spanwright/route/routing"
)

// buriedSpansOf lists the direct-buried spans leg l is laid on.
func buriedSpansOf(t *testing.T, r *route.Result, l *routing.Leg) []string {
	t.Helper()
	var out []string
	for _, st := range l.Steps {
		sp, ok := r.Site.Net.Span(st.SpanID)
		if !ok {
			t.Fatalf("leg %s %s: no span %s", l.Link.ID, l.Name, st.SpanID)
		}
		if sp.Type == geo.TypeBuried {
			out = append(out, sp.ID)
		}
	}
	return out
}

// TestBuriedSpansLaidRated: on a generated campus with direct-buried pathways (campusgen
// draws proposed buried trenches), every leg laid on a buried span carries a construction the
// catalog rates for direct burial (rule direct-burial: ICEA S-87-640 and Telcordia GR-20
// outside-plant cable, from memory), and the optimizer routed it in an option priced as that
// cable (routing's options per laying), not as the indoor/outdoor cable it used to price every
// route with; every leg is feasible, as the plan was before the burial rule. Without the
// entrance splice's price (transition_splice_each, optional) a leg is either kept off buried
// spans or refused with a reason that names the missing price.
func TestBuriedSpansLaidRated(t *testing.T) {
	t.Parallel()
	s, p := testplan.CampusSite(t, 40)
	book, err := os.ReadFile(filepath.Join("..", "media", "prices-demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "none.yaml"), testplan.DropPriceKeys(book, "transition_splice_each"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, priced := range []bool{true, false} {
		q := *p
		if !priced {
			q.Dir, q.Prices = dir, "none.yaml"
		}
		r := testplan.SolvePlan(t, s, &q)
		laid := 0
		for i := range r.Legs {
			l := &r.Legs[i]
			if !l.Feasible {
				if l.Name == routing.LegDiverse && l.ReasonCode == routing.CodeNoDiverse {
					continue
				}
				if priced || !strings.Contains(l.Reason, "transition_splice_each") {
					t.Errorf("transition priced %v: leg %s %s infeasible: %s", priced, l.Link.ID, l.Name, l.Reason)
				}
				continue
			}
			buried := buriedSpansOf(t, r, l)
			if len(buried) == 0 {
				continue
			}
			laid++
			k := r.Engine.Catalog().Medium(l.Medium).Construction(l.Construction)
			if !k.DirectBurialRated {
				t.Errorf("transition priced %v: leg %s %s on buried %s: %s is not rated for direct burial", priced, l.Link.ID, l.Name, strings.Join(buried, ", "), k.ID)
			}
			if l.Option != l.Medium+" as "+l.ConstructionText() && l.Option != l.Medium {
				t.Errorf("transition priced %v: leg %s %s laid as %s, routed in option %q", priced, l.Link.ID, l.Name, l.ConstructionText(), l.Option)
			}
			if strings.Contains(l.Choice, "the optimizer routed it for") {
				t.Errorf("transition priced %v: leg %s %s: %s", priced, l.Link.ID, l.Name, l.Choice)
			}
		}
		t.Logf("transition priced %v: %d legs laid on buried spans", priced, laid)
		if priced && laid == 0 {
			t.Error("no leg on a buried span: the campus no longer tests the rule")
		}
	}
}

// TestReelsBuriedReason: the demo campus with 400 m reels (three mid-span joins on the
// 1,459 m channel to OBS, which the only pathway reaches direct-buried). Indoor/outdoor
// cable may not be buried there (rule direct-burial, from memory: ICEA S-87-640) and
// outside-plant cable spliced to riser cable at both entrances loses too much with its joins
// and the two transition splices (ANSI/TIA-568.3-D 0.3 dB a splice, from memory; IEEE 802.3
// 1000BASE-LX 4.5 dB channel). The leg is refused, and its reason names both: the burial rule
// for the medium priced as indoor/outdoor cable and the reach of the spliced outside plant,
// where it used to name only the 15 m rule of NFPA 70 770.48.
func TestReelsBuriedReason(t *testing.T) {
	t.Parallel()
	r := testplan.DemoDesign(t, func(d *plan.Design) {
		d.ReelM, d.PullMaxM = 400, 200
	})
	var l *routing.Leg
	for i := range r.Legs {
		if r.Legs[i].Link.ID == "TWR-OBS" {
			l = &r.Legs[i]
		}
	}
	if l == nil {
		t.Fatal("no leg TWR-OBS")
	}
	if l.Feasible {
		if k := r.Engine.Catalog().Medium(l.Medium).Construction(l.Construction); !k.DirectBurialRated && slices.Contains(l.Pathways, "B-OBS") {
			t.Fatalf("feasible on %s over buried B-OBS, not rated for burial", k.ID)
		}
		return
	}
	for _, want := range []string{"os2 on indoor-outdoor rejected by direct-burial", "os2 as osp-loose-tube + ofnr-riser at entrances: reaches"} {
		if !strings.Contains(l.Reason, want) {
			t.Errorf("reason lacks %q: %s", want, l.Reason)
		}
	}
}
