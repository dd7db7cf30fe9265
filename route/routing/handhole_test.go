package routing

import (
	"context"
	"errors"
	"fmt"
	"maps"
	"slices"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/media"
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
	hh := fmt.Sprintf(`{"type":"Feature","properties":{"kind":"structure","id":"HH","type":"handhole"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`,
		testsite.X(300), testsite.Y(0))
	s := testsite.Campus(t, "t.geojson", testsite.Features(testsite.Box("A", "mc", 0, 0), testsite.Box("S", "", 150, -30), testsite.Box("B", "", 150, 130),
		testsite.Pathway("D", geo.TypeDuct, 0, 0, 150, 0, 300, 0), testsite.Pathway("L", geo.TypeDuct, 150, 0, 150, 120), hh))
	p := plan.Default
	p.Hub = "A"
	eng, err := plan.Engine(&p)
	if err != nil {
		t.Fatal(err)
	}
	r, m, links := solveOn(t, s, &p, eng)
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
		c := m.entranceCents(geo.Entry{ID: e.Entrance, Access: geo.Access{LateralM: e.LateralM}, Built: e.Built, PoleRiser: e.PoleRiser})
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

// TestOwnTapMeasured (review 4's finding F5): hub A's duct D runs east through J at (60, 0),
// where duct L leaves north to B (the route A-B turns at J: a handhole there), past the tap
// where S's counted lateral (S has one entrance, 20 m south of D) meets D at (224, 0), into
// C. The only medium is OM3, and A-S at 10G is 10GBASE-SR's (IEEE 802.3 Clause 52): its
// channel closes with one handhole's slack loop (3 m a structure passed, the plan's default:
// common practice, no published source) less, so it turns on its own tap's handhole, which
// is built only when a feasible leg uses S's entrance. Measured without that handhole the leg
// passes, so the tap would be built again; measured with it, it fails. A leg is measured with
// its own taps whatever the round (passesOf), so A-S is infeasible in every round, S's tap is
// not built, and C's leg (1G, along D past the tap) is measured without it: every handhole a
// feasible leg passes is one the plan builds, and the rounds settle with no warning. Before,
// the third round stopped with C's leg measured through a handhole at the tap that the
// structures table did not list.
func TestOwnTapMeasured(t *testing.T) {
	t.Parallel()
	s := testsite.Campus(t, "t.geojson", testsite.Features(testsite.Box("A", "mc", 0, 0), testsite.Box("S", "", 224, -30), testsite.Box("B", "", 60, 130), testsite.Box("C", "", 289, 0),
		testsite.Pathway("D", geo.TypeDuct, 0, 0, 60, 0, 284, 0), testsite.Pathway("L", geo.TypeDuct, 60, 0, 60, 120)))
	p := plan.Default
	p.Hub = "A"
	p.Links = []plan.LinkSpec{{To: "C", Rate: "1G"}}
	cat := media.DefaultCatalog()
	cat.Media = slices.DeleteFunc(cat.Media, func(m *media.Medium) bool { return m.ID != "om3" })
	// The geometry is drawn to OM3's 10GBASE-SR reach without a multimode margin (the
	// catalog's before tester 14 F7 gave it 0.5 dB): a catalog whose acceptance maximum for a
	// mated pair is the design's 0.5 dB leaves the margin nothing to cover (media's
	// marginParts), so the reach is the one drawn to, 1.0 dB of 2.6 over 3.5 dB/km.
	cat.MatedPairDB = cat.DesignPairDB
	eng, err := media.NewEngine(cat, nil, nil, plan.EngineOptions(&p))
	if err != nil {
		t.Fatal(err)
	}
	r, m, links := solveOn(t, s, &p, eng)
	legTo := func(b string) *Leg {
		for i := range r.Legs {
			if r.Legs[i].Link.To == b {
				return &r.Legs[i]
			}
		}
		t.Fatalf("no leg to %s among %d", b, len(r.Legs))
		return nil
	}
	sl := legTo("S")
	entry, _ := s.Net.Entry("S", sl.EntranceTo)
	tap := tapOf(s, entry)
	if tap == "" || len(sl.Steps) == 0 {
		t.Fatalf("S's entrance %+v taps no duct, or its leg was not routed (%s): nothing to test", entry, sl.Reason)
	}
	// The leg's facts as fillLeg gives them to the engine, without its tap's loop and with it:
	// feasible without, infeasible with.
	_, _, infos, err := problem(s, m, links, m.runsOf(s))
	if err != nil {
		t.Fatal(err)
	}
	without := infos[slices.IndexFunc(links, func(l site.Link) bool { return l.To == "S" })].facts
	without.RouteM, without.SlackM, without.Splices = sl.RouteM, sl.Cable.SlackM(), without.Splices+sl.Cable.Joins
	without.Outdoor, without.PathwayTypes = true, []string{geo.TypeDuct}
	if sl.Cable.Passes(tap) {
		without.SlackM -= p.Design.SlackLoopStructureM
	}
	with := without
	with.SlackM += p.Design.SlackLoopStructureM
	if eng.Choose(with).Feasible || !eng.Choose(without).Feasible {
		t.Fatalf("A-S with its tap's loop: feasible %v; without: %v; want a leg that turns on its own tap's loop",
			eng.Choose(with).Feasible, eng.Choose(without).Feasible)
	}
	if sl.Feasible || !sl.Cable.Passes(tap) {
		t.Errorf("A-S feasible %v, passes its tap %s %v; want infeasible, measured through its tap", sl.Feasible, tap, sl.Cable.Passes(tap))
	}
	built := handholeJunctions(r.Handholes)
	if built[tap] {
		t.Errorf("handholes %+v: the tap %s of S, whose only leg is infeasible, is built", r.Handholes, tap)
	}
	for _, l := range r.Legs {
		if !l.Feasible {
			continue
		}
		for _, ps := range l.Cable.Passed {
			if ps.Added && ps.Span == "" && !built[ps.ID] {
				t.Errorf("%s passes a handhole at %s that the plan does not build (handholes %+v)", l.Label(), ps.ID, r.Handholes)
			}
		}
	}
	if cl := legTo("C"); !cl.Feasible || cl.Cable.Passes(tap) {
		t.Errorf("A-C feasible %v, passes %s %v; want feasible, not through the unbuilt tap", cl.Feasible, tap, cl.Cable.Passes(tap))
	}
	if len(r.Warnings) > 0 {
		t.Errorf("warnings %q, want none: the rounds settle", r.Warnings)
	}
}

// TestSettleHandholes: the rounds stop when the handholes the legs build are those they were
// measured against; a tap whose handhole flips every round is measured once more after
// maxHandholeRounds and warned of, by junction; an error stops them.
func TestSettleHandholes(t *testing.T) {
	t.Parallel()
	set := func(js ...string) map[string]bool {
		out := map[string]bool{}
		for _, j := range js {
			out[j] = true
		}
		return out
	}
	calls := 0
	with, builds, err := settleHandholes(set("J1", "T"), func(at map[string]bool) (map[string]bool, error) {
		calls++
		return set("J1"), nil // the tap's legs fail: it is not built
	})
	if err != nil || calls != 2 || !maps.Equal(with, set("J1")) || !maps.Equal(builds, set("J1")) || unsettledWarning(with, builds) != "" {
		t.Errorf("settling: %d rounds, with %v, builds %v, err %v; want 2 rounds ending on J1", calls, with, builds, err)
	}
	calls = 0
	with, builds, err = settleHandholes(set("J1", "T"), func(at map[string]bool) (map[string]bool, error) {
		calls++
		if at["T"] {
			return set("J1"), nil
		}
		return set("J1", "T"), nil
	})
	if err != nil || calls != maxHandholeRounds+1 || maps.Equal(with, builds) {
		t.Fatalf("flipping: %d rounds, with %v, builds %v, err %v; want %d rounds, unsettled", calls, with, builds, err, maxHandholeRounds+1)
	}
	w := unsettledWarning(with, builds)
	if !strings.Contains(w, "did not settle in 4 rounds") || !strings.Contains(w, " T ") || strings.Contains(w, "J1") {
		t.Errorf("warning %q: want the rounds and junction T, not J1", w)
	}
	boom := errors.New("stopped")
	if _, _, err := settleHandholes(set("J1"), func(map[string]bool) (map[string]bool, error) { return nil, boom }); !errors.Is(err, boom) {
		t.Errorf("error %v, want %v", err, boom)
	}
}

// solveOn routes the links plan p makes on s from its hub, with engine eng.
func solveOn(t *testing.T, s *site.Site, p *plan.Plan, eng *media.Engine) (*Routed, *Model, []site.Link) {
	t.Helper()
	links, _, errs := s.Links(p, p.Hub)
	if len(errs) > 0 {
		t.Fatal(errs)
	}
	m := NewModel(eng, p.Design)
	r, err := Solve(context.Background(), s, m, links)
	if err != nil {
		t.Fatal(err)
	}
	return r, m, links
}
