package output

import (
	"context"
	"fmt"
	"slices"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/routing"
)

// TestJoinHandholeNamesItsLinks: hub A's existing duct D runs east to (150, 0), where the
// proposed duct P carries on to building B at (300, 0). The route A-B opens P and the plan adds a
// handhole where P joins D; no route turns there and no lateral taps there, yet the leg passes
// it and leaves its slack loop there, so plan.gpkg's added_structures names A-B in links_text,
// as the structures layer lists its leg (tester 10's finding 17: links_text was empty on every
// join handhole). The handhole where new pathway joins the network is common practice, no
// published source.
func TestJoinHandholeNamesItsLinks(t *testing.T) {
	t.Parallel()
	line := func(id, extra string, pts ...float64) string {
		var c []string
		for i := 0; i+1 < len(pts); i += 2 {
			c = append(c, fmt.Sprintf("[%.7f,%.7f]", testsite.X(pts[i]), testsite.Y(pts[i+1])))
		}
		return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":%q,"type":"duct"%s},"geometry":{"type":"LineString","coordinates":[%s]}}`,
			id, extra, strings.Join(c, ","))
	}
	campus := `{"type":"FeatureCollection","features":[` + strings.Join([]string{testsite.Box("A", "mc", 0, 0), testsite.Box("B", "", 300, 0),
		line("D", "", 0, 0, 150, 0), line("P", `,"status":"proposed","surface":"turf"`, 150, 0, 300, 0)}, ",") + `]}`
	r, err := testplan.PullSolveJSON(t, campus, nil)
	if err != nil {
		t.Fatal(err)
	}
	_, leg := testplan.LegOf(t, r, "A-B")
	var join string
	for _, h := range r.Handholes {
		if h.Purpose() == routing.PurposeJoin {
			join = h.Junction
		}
	}
	if !leg.Feasible || join == "" || slices.Contains(leg.Turns, join) {
		t.Fatalf("leg A-B feasible %v, turns %q, handholes %+v: want a join handhole it does not turn at", leg.Feasible, leg.Turns, r.Handholes)
	}
	layers, err := planLayers(context.Background(), r, structuresOnce(r))
	if err != nil {
		t.Fatal(err)
	}
	sts, err := StructuresOf(r)
	if err != nil {
		t.Fatal(err)
	}
	var tableLegs []string
	for _, st := range sts {
		if st.ID == join {
			tableLegs = st.Legs
		}
	}
	if !slices.Contains(tableLegs, leg.Label()) {
		t.Fatalf("structures table at %s lists %q, want %s", join, tableLegs, leg.Label())
	}
	found := false
	for _, l := range layers {
		if l.Name != LayerStructures {
			continue
		}
		for _, f := range l.Features {
			if f.Values[0] != join {
				continue
			}
			found = true
			if f.Values[3] != routing.PurposeJoin || f.Values[4] != "A-B" {
				t.Errorf("added_structures at %s: purpose %v, links_text %q; want join, A-B", join, f.Values[3], f.Values[4])
			}
		}
	}
	if !found {
		t.Errorf("added_structures has no row at %s", join)
	}
}
