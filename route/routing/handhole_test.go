package routing

import (
	"context"
	"fmt"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route/internal/testsite"
	"spanwright/route/items"
	"spanwright/route/optimize"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// TestPrepaidTapHandhole: hub A's duct D runs east through junction J at (150, 0), where
// duct L leaves north to B (the route A-B turns at J) and S's counted lateral taps D (S has
// one entrance). The handhole at J is one: the junction's charge costs the optimizer nothing
// (S's tap pays it, in Routed.ConstantCents once), and Routed.Handholes lists J once with
// both reasons. Had every leg to S been infeasible (S's entrance not used), no tap would be
// built, and the turn's handhole the search took at 0 is the one the objective adds after
// it (handholesOf's unpaid).
func TestPrepaidTapHandhole(t *testing.T) {
	t.Parallel()
	line := func(id string, pts ...float64) string {
		var c []string
		for i := 0; i+1 < len(pts); i += 2 {
			c = append(c, fmt.Sprintf("[%.7f,%.7f]", testsite.X(pts[i]), testsite.Y(pts[i+1])))
		}
		return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":%q,"type":"duct"},"geometry":{"type":"LineString","coordinates":[%s]}}`, id, strings.Join(c, ","))
	}
	hh := fmt.Sprintf(`{"type":"Feature","properties":{"kind":"structure","id":"HH","type":"handhole"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`,
		testsite.X(300), testsite.Y(0))
	campus := `{"type":"FeatureCollection","features":[` + strings.Join([]string{testsite.Box("A", "mc", 0, 0), testsite.Box("S", "", 150, -30),
		testsite.Box("B", "", 150, 130), line("D", 0, 0, 150, 0, 300, 0), line("L", 150, 0, 150, 120), hh}, ",") + `]}`
	c, err := geo.Parse("t.geojson", []byte(campus))
	if err != nil {
		t.Fatal(err)
	}
	net, err := geo.Build(c, geo.Options{})
	if err != nil {
		t.Fatal(err)
	}
	s := site.NewSite(c, net)
	p := plan.Default
	p.Hub = "A"
	eng, err := plan.Engine(&p)
	if err != nil {
		t.Fatal(err)
	}
	links, _, errs := s.Links(&p, "A")
	if len(errs) > 0 {
		t.Fatal(errs)
	}
	m := NewModel(eng, p.Design)
	r, err := Solve(context.Background(), s, m, links)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Handholes) != 1 || !r.Handholes[0].Taps || !r.Handholes[0].Turns || r.Handholes[0].Purpose() != PurposeTap {
		t.Fatalf("handholes %+v, want one where S taps and A-B turns", r.Handholes)
	}
	j := r.Handholes[0].Junction
	prob, lay, _, err := problem(s, m, links, m.runsOf(s))
	if err != nil {
		t.Fatal(err)
	}
	for _, ch := range prob.Charges {
		if ch.ID == "handhole at "+j && ch.Cents != 0 {
			t.Errorf("the charge at %s costs %d cents, want 0 (S's tap pays it)", j, ch.Cents)
		}
	}
	var entries int64
	for _, e := range r.Entrances {
		c := m.entranceCents(geo.Entry{ID: e.Entrance, Access: geo.Access{LateralM: e.LateralM}, Built: e.Built})
		entries += c
	}
	if hh := m.cents(items.JoinHandholes(1)); r.ConstantCents != entries+hh {
		t.Errorf("constant %d cents, want the entrances %d and one handhole %d", r.ConstantCents, entries, hh)
	}
	sol, err := optimize.Solve(prob, optimize.Settings{})
	if err != nil {
		t.Fatal(err)
	}
	var withoutS []EntranceUse
	for _, e := range r.Entrances {
		if e.Building != "S" {
			withoutS = append(withoutS, e)
		}
	}
	for _, tc := range []struct {
		name   string
		used   []EntranceUse
		taps   bool
		unpaid int64
	}{{"S's entrance used", r.Entrances, true, 0}, {"S's entrance not used", withoutS, false, 1}} {
		hs, unpaid := handholesOf(s, lay, prob, sol, tc.used)
		if len(hs) != 1 || hs[0].Junction != j || hs[0].Taps != tc.taps || !hs[0].Turns || unpaid != tc.unpaid {
			t.Errorf("%s: handholes %+v, unpaid %d; want one at %s, taps %v, turns, unpaid %d", tc.name, hs, unpaid, j, tc.taps, tc.unpaid)
		}
	}
}
