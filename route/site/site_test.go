package site_test

import (
	"context"
	"fmt"
	"math"
	"reflect"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/graph/path"

	"spanwright/geo"
	"spanwright/media"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// lineCampus builds a campus along one east-west street at latitude 52: buildings are
// 20 m squares whose west edge sits at the given metre offsets, each reached by a short
// pathway end inside its footprint. roles maps a building to "mc" or "ic".
func lineCampus(t *testing.T, names []string, offsetsM []float64, roles map[string]string, extra string) *site.Site {
	t.Helper()
	const lat = 52.0
	degX := func(m float64) float64 { return -1 + m/(111320*math.Cos(lat*math.Pi/180)) }
	degY := func(m float64) float64 { return lat + m/111000 }
	var f []string
	var street []string
	for i, n := range names {
		x := offsetsM[i]
		role := ""
		if r := roles[n]; r != "" {
			role = fmt.Sprintf(`,"role":%q`, r)
		}
		f = append(f, fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":%q%s},"geometry":{"type":"Polygon","coordinates":[[[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f]]]}}`,
			n, role, degX(x), degY(10), degX(x+20), degY(10), degX(x+20), degY(30), degX(x), degY(30), degX(x), degY(10)))
		f = append(f, fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"S-%s"},"geometry":{"type":"LineString","coordinates":[[%.7f,%.7f],[%.7f,%.7f]]}}`,
			n, degX(x+10), degY(0), degX(x+10), degY(15)))
		street = append(street, fmt.Sprintf("[%.7f,%.7f]", degX(x+10), degY(0)))
	}
	f = append(f, fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"ST"},"geometry":{"type":"LineString","coordinates":[%s]}}`, strings.Join(street, ",")))
	if extra != "" {
		f = append(f, extra)
	}
	data := `{"type":"FeatureCollection","features":[` + strings.Join(f, ",") + `]}`
	c, err := geo.Parse("line.geojson", []byte(data))
	if err != nil {
		t.Fatal(err)
	}
	net, err := geo.Build(c, geo.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return site.NewSite(c, net)
}

// defaultLinks is the IDs of the links the default plan makes on s with the given hub.
func defaultLinks(t *testing.T, s *site.Site, hub string) []string {
	t.Helper()
	p := plan.Default
	p.File = "plan.yaml"
	links, _, errs := s.Links(&p, hub)
	if len(errs) > 0 {
		t.Fatal(errs)
	}
	var ids []string
	for _, l := range links {
		ids = append(ids, l.ID)
	}
	return ids
}

func TestLinksStar(t *testing.T) {
	t.Parallel()
	// A(mc) ... C D ... B(ic) E: C is nearer A, D and E nearer B.
	s := lineCampus(t, []string{"A", "C", "D", "B", "E"}, []float64{0, 100, 400, 500, 600}, map[string]string{"A": "mc", "B": "ic"}, "")
	got := defaultLinks(t, s, "A")
	// ANSI/TIA-568 hierarchical star: ic to the hub, each served building to its nearest cross-connect.
	if want := "A-B A-C B-D B-E"; strings.Join(got, " ") != want {
		t.Errorf("default links: got %v, want %s", got, want)
	}
}

func TestLinksOverrides(t *testing.T) {
	t.Parallel()
	s := lineCampus(t, []string{"A", "C", "D", "B", "E"}, []float64{0, 100, 400, 500, 600}, map[string]string{"A": "mc", "B": "ic"}, "")
	zero := 0.0
	p := plan.Default
	p.File = "plan.yaml"
	p.Links = []plan.LinkSpec{
		{Line: 1, To: "C", Rate: "40G", Redundancy: plan.RedundancyDiverse},
		{Line: 2, From: "A", To: "D", Rate: "1G", Growth: &zero},
		{Line: 3, To: "E", Skip: true},
		{Line: 4, From: "C", To: "D"}, // a second link to D, from C
	}
	links, _, errs := s.Links(&p, "A")
	if len(errs) > 0 {
		t.Fatal(errs)
	}
	byID := map[string]site.Link{}
	var ids []string
	for _, l := range links {
		byID[l.ID] = l
		ids = append(ids, l.ID)
	}
	if want := "A-B A-C A-D C-D"; strings.Join(ids, " ") != want {
		t.Fatalf("links: got %v, want %s", ids, want)
	}
	if l := byID["A-C"]; l.Rate != "40G" || !l.Diverse || !l.Explicit || l.Line != 1 {
		t.Errorf("A-C: got %+v", l)
	}
	if l := byID["A-D"]; l.Rate != "1G" || l.Growth != 0 || l.Diverse {
		t.Errorf("A-D: got %+v", l)
	}
	if l := byID["C-D"]; l.Rate != "10G" || l.Strands != 12 {
		t.Errorf("C-D keeps the defaults: got %+v", l)
	}
}

// TestLinksRateSpellings (tester 14 F8): a rate written "10Gb", "10 Gbps" or "1g" is the
// link's rate in one form (media.RateText), in the defaults and in a link entry, future
// rates too, so every output shows one spelling per rate.
func TestLinksRateSpellings(t *testing.T) {
	t.Parallel()
	s := lineCampus(t, []string{"A", "C", "D"}, []float64{0, 100, 200}, map[string]string{"A": "mc"}, "")
	p := plan.Default
	p.File = "plan.yaml"
	p.Defaults.Rate, p.Defaults.FutureRate = "10Gb", "40 Gbps"
	p.Links = []plan.LinkSpec{{Line: 1, To: "C", Rate: "1g", FutureRate: "10 Gb/s"}}
	links, _, errs := s.Links(&p, "A")
	if len(errs) > 0 {
		t.Fatal(errs)
	}
	var got []string
	for _, l := range links {
		got = append(got, l.ID+" "+l.Rate+" "+l.FutureRate)
	}
	if want := "A-C 1G 10G|A-D 10G 40G"; strings.Join(got, "|") != want {
		t.Errorf("got %q, want %s", got, want)
	}
}

func TestLinksErrors(t *testing.T) {
	t.Parallel()
	s := lineCampus(t, []string{"A", "C"}, []float64{0, 100}, map[string]string{"A": "mc"}, "")
	p, err := plan.ParsePlan("plan.yaml", []byte("campus: [c]\nlinks:\n  - {to: X}\n  - {from: Y, to: C}\n  - {to: A}\n  - {from: C, to: C}\n"))
	if err != nil {
		t.Fatal(err)
	}
	_, notes, errs := s.Links(p, "A")
	// An entry for the hub's own link is no error: the hub has none, so the entry is dropped
	// with a note (a sweep over the hub makes every building the hub in turn; issue 13).
	if len(errs) != 3 || len(notes) != 1 || notes[0] != "links[2] (to A) dropped: A is the hub of this plan" {
		t.Errorf("errors %q, notes %q: want 3 errors and the note for links[2]", errs, notes)
	}
	var msgs []string
	for _, e := range errs {
		msgs = append(msgs, e.Error())
	}
	all := strings.Join(msgs, "\n")
	for _, want := range []string{`plan.yaml:3:10: links[0].to: want the id of a building, got "X", which no building has`,
		`plan.yaml:4:12: links[1].from: want the id of a building, got "Y", which no building has`,
		`plan.yaml:6:12: links[3].from: a link from "C" to itself`} {
		if !strings.Contains(all, want) {
			t.Errorf("got %q, want it to contain %q", all, want)
		}
	}
}

// TestIDHints: a plan's id that names no building, but differs from one of the campus only
// by letter case or by spaces at either end (invisible in the GIS), is refused as any unknown
// id, and its message names the building meant, where it is and what differs; the hub's
// message and the links' are worded alike (tester 13 F-J).
func TestIDHints(t *testing.T) {
	t.Parallel()
	s := lineCampus(t, []string{"HUB ", "plov", "Plov", "ELDE"}, []float64{0, 100, 200, 300}, nil, "")
	p, err := plan.ParsePlan("plan.yaml", []byte("campus: [c]\nhub: HUB\nlinks:\n  - {to: PLOV}\n  - {from: \" elde\", to: plov}\n  - {to: GONE}\n"))
	if err != nil {
		t.Fatal(err)
	}
	_, herr := s.Hub(p)
	errs := append([]error{herr}, s.UnknownBuildings(p)...)
	var msgs []string
	for _, e := range errs {
		if e != nil {
			msgs = append(msgs, e.Error())
		}
	}
	want := []string{
		`plan.yaml:2:6: hub: want the id of a building, got "HUB", which no building has; did you mean "HUB " (line.geojson feature #0)? (spaces at either end matter)`,
		`plan.yaml:4:10: links[0].to: want the id of a building, got "PLOV", which no building has; did you mean "Plov" (line.geojson feature #4) or "plov" (line.geojson feature #2)? (letter case matters)`,
		`plan.yaml:5:12: links[1].from: want the id of a building, got " elde", which no building has; did you mean "ELDE" (line.geojson feature #6)? (letter case and spaces at either end matter)`,
		`plan.yaml:6:10: links[2].to: want the id of a building, got "GONE", which no building has`,
	}
	if !reflect.DeepEqual(msgs, want) {
		t.Errorf("got\n%s\nwant\n%s", strings.Join(msgs, "\n"), strings.Join(want, "\n"))
	}
}

func TestGraphParallelSpans(t *testing.T) {
	t.Parallel()
	// A second, longer duct (ST2, via a point 30 m south) joins the same two street junctions:
	// the graph keeps both spans and weighs the pair as the lighter one.
	const lat = 52.0
	degX := func(m float64) float64 { return -1 + m/(111320*math.Cos(lat*math.Pi/180)) }
	degY := func(m float64) float64 { return lat + m/111000 }
	st2 := fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"ST2"},"geometry":{"type":"LineString","coordinates":[[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f]]}}`,
		degX(10), degY(0), degX(60), degY(-30), degX(110), degY(0))
	s := lineCampus(t, []string{"A", "C"}, []float64{0, 100}, map[string]string{"A": "mc"}, st2)
	if got := len(s.Net.Spans); got != 4 {
		t.Fatalf("spans: got %d, want 4", got)
	}
	g := s.Graph
	a, _ := g.NodeOf(s.Access("A").Junction)
	c, _ := g.NodeOf(s.Access("C").Junction)
	// Each building's pathway runs 10 m from the street to its wall (drawn 5 m on inside
	// the footprint, which Build cuts at the wall).
	if d := path.DijkstraFrom(g.Node(a), g).WeightTo(c); math.Abs(d-(10+100+10)) > 0.5 {
		t.Errorf("A to C: got %.2f m, want about 120 m", d)
	}
	g2 := site.NewGraph(s.Net)
	g2.SetWeight(func(sp *geo.Span) float64 {
		if sp.PathwayID == "ST" {
			return math.Inf(1)
		}
		return sp.LengthM
	})
	want := 10 + 2*math.Hypot(50, 30) + 10
	if d := path.DijkstraFrom(g2.Node(a), g2).WeightTo(c); math.Abs(d-want) > 0.5 {
		t.Errorf("A to C without ST: got %.2f m, want about %.1f m over the parallel duct", d, want)
	}
}

// TestSolvedCache plans the demo twice on one site and once on a fresh site: the second plan
// reuses the first's optimizer solution and all three write the same bytes; a plan whose
// routing problem differs (another objective) is solved afresh.
func TestSolvedCache(t *testing.T) {
	s, p := testsite.Demo(t)
	fresh, _ := testsite.DemoFresh(t)
	eng, err := plan.Engine(p)
	if err != nil {
		t.Fatal(err)
	}
	s.Solved.Purge()
	render := func(site *site.Site, p *plan.Plan) map[string]string {
		t.Helper()
		res, err := route.SolveWith(context.Background(), site, p, eng)
		if err != nil {
			t.Fatal(err)
		}
		files, err := output.Files(context.Background(), res, output.WriteOptions{SkipWorkbook: true})
		if err != nil {
			t.Fatal(err)
		}
		out := map[string]string{}
		for _, f := range files {
			out[f.Name] = string(f.Data)
		}
		return out
	}
	first := render(s, p)
	if s.Solved.Len() != 1 {
		t.Fatalf("cache holds %d solutions after one plan, want 1", s.Solved.Len())
	}
	second := render(s, p)
	if s.Solved.Len() != 1 {
		t.Fatalf("cache holds %d solutions after the same plan twice, want 1", s.Solved.Len())
	}
	third := render(fresh, p)
	for name, data := range first {
		if second[name] != data || third[name] != data {
			t.Errorf("%s differs between a cached and a fresh solve", name)
		}
	}
	q := *p
	q.Design.Objective = "length"
	render(s, &q)
	if s.Solved.Len() != 2 {
		t.Errorf("cache holds %d solutions after a plan with another objective, want 2", s.Solved.Len())
	}
}

// TestPlenumRoute joins two buildings by a tray that runs in a plenum: the link takes
// plenum-rated cable (NFPA 70 Articles 770 and 800, cables in plenums; from memory); the same
// tray outside a plenum takes riser cable.
func TestPlenumRoute(t *testing.T) {
	t.Parallel()
	for _, plenum := range []bool{false, true} {
		// A (the hub) and B 40 m apart, joined only by a tray from inside A to inside B.
		data := fmt.Sprintf(`{"type":"FeatureCollection","features":[%s,%s,{"type":"Feature","properties":{"kind":"pathway","id":"T","type":"tray","plenum":%v},"geometry":{"type":"LineString","coordinates":[[%.7f,%.7f],[%.7f,%.7f]]}}]}`,
			testsite.Box("A", "mc", 20, 20), testsite.Box("B", "", 60, 20), plenum, testsite.X(20), testsite.Y(20), testsite.X(60), testsite.Y(20))
		r, err := testplan.PullSolveJSON(t, data, nil)
		if err != nil {
			t.Fatal(err)
		}
		if len(r.Legs) != 1 || !r.Legs[0].Feasible {
			t.Fatalf("plenum %v: want one feasible leg, got %+v", plenum, r.Legs)
		}
		l := r.Legs[0]
		k := r.Engine.Catalog().Medium(l.Medium).Construction(l.Construction)
		t.Logf("plenum %v: %s %s, %.1f m", plenum, l.Medium, l.Construction, l.RouteM)
		if k.PlenumRated != plenum {
			t.Errorf("plenum %v: chose %s %s (plenum rated %v)", plenum, l.Medium, l.Construction, k.PlenumRated)
		}
	}
}

// factsCampus is a street duct S along y = 0 from x = 0 to 300 m on the pull grid; A (the hub)
// is joined to it by lateral LA teeing off at (50, 0), where no structure is; B by lateral LB
// at (150, 0), where handhole HH is; C is joined only by duct DC from inside B to inside C;
// island I's duct DI ends 1 m short of S's end. DC starts at x = dcFromX, inside B: at 150
// where LB ends (the two meet at one point inside B), or elsewhere in B (they do not).
// factsDuct is a duct feature id through the points x0, y0, x1, y1, … (metres, testsite.X and Y).
func factsDuct(id string, pts ...float64) string {
	var c []string
	for i := 0; i+1 < len(pts); i += 2 {
		c = append(c, fmt.Sprintf("[%.7f,%.7f]", testsite.X(pts[i]), testsite.Y(pts[i+1])))
	}
	return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":%q,"type":"duct"},"geometry":{"type":"LineString","coordinates":[%s]}}`, id, strings.Join(c, ","))
}

// factsCampus is the campus of TestSiteFacts, with the features extra besides.
func factsCampus(t *testing.T, dcFromX float64, extra ...string) *site.Site {
	t.Helper()
	duct := factsDuct
	f := []string{testsite.Box("A", "mc", 50, 25), testsite.Box("B", "", 150, 25), testsite.Box("C", "", 250, 25), testsite.Box("I", "", 400, 25),
		duct("S", 0, 0, 50, 0, 150, 0, 300, 0), duct("LA", 50, 0, 50, 20), duct("LB", 150, 0, 150, 20),
		duct("DC", dcFromX, 20, 245, 20), duct("DI", 400, 20, 400, 0, 301, 0),
		fmt.Sprintf(`{"type":"Feature","properties":{"kind":"structure","id":"HH","type":"handhole"},"geometry":{"type":"Point","coordinates":[%.7f,%.7f]}}`, testsite.X(150), testsite.Y(0))}
	f = append(f, extra...)
	c, err := geo.Parse("facts.geojson", []byte(`{"type":"FeatureCollection","features":[`+strings.Join(f, ",")+`]}`))
	if err != nil {
		t.Fatal(err)
	}
	net, err := geo.Build(c, geo.Options{SnapM: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	return site.NewSite(c, net)
}

// TestSiteFacts: the campus facts check reports (issue 13). A tee of three ducts with no
// structure is a turn that needs one built, a tee at a handhole is not (common practice, no
// published source); C reaches the hub only through B; I is cut off, and the reason names the
// near miss that would join it.
func TestSiteFacts(t *testing.T) {
	t.Parallel()
	s := factsCampus(t, 155)
	var tee, hh string
	for _, m := range s.Net.Meetings {
		if slices.Contains(m.Pathways, "LA") && slices.Contains(m.Pathways, "S") {
			tee = m.Junction
		}
		if slices.Contains(m.Pathways, "LB") {
			hh = m.Junction
		}
	}
	turns := s.TurnsNeedingStructure()
	if tee == "" || !slices.Contains(turns, tee) || slices.Contains(turns, hh) {
		t.Errorf("turns needing a structure: %q; want the tee %q and not the handhole %q", turns, tee, hh)
	}
	if got := s.ThroughOnly("A"); !slices.Equal(got, []string{"C"}) {
		t.Errorf("reached only through another building: %q, want [C]", got)
	}
	if got, want := s.Through("C", "A"), `building C reaches A only through B: a route crosses a building only along a pathway drawn inside it`; !strings.HasPrefix(got, want) {
		t.Errorf("through reason:\n got %s\nwant %s…", got, want)
	}
	// LB and DC reach B at separate points: transit: true on B would not let a route through
	// (the search with B open still stops at its entrances), so the reason says to draw a
	// pathway inside it; with DC starting where LB ends, transit: true would do.
	const apart = "; to serve C, transit: true on B would not do, its pathways do not meet at one point inside it: draw a tray or tunnel inside it between its entrances; " +
		"or draw a pathway to C that passes no building; or serve it from B (role ic, and a link from it)"
	if got := s.Through("C", "A"); !strings.HasSuffix(got, apart) {
		t.Errorf("through reason, pathways apart in B:\n got %s\nwant …%s", got, apart)
	}
	const meet = "; to serve C, setting transit: true on B lets routes through where its pathways meet; or draw a pathway to C"
	if got := factsCampus(t, 150).Through("C", "A"); !strings.Contains(got, meet) {
		t.Errorf("through reason, pathways meeting in B:\n got %s\nwant …%s…", got, meet)
	}
	if got := s.Unreachable("A"); !slices.Equal(got, []string{"I"}) {
		t.Fatalf("unreachable: %q, want [I]", got)
	}
	why := s.CutOff("I", "A")
	const want = "building I is cut off from A: the pathways that reach it (DI) join none that reaches A; near misses: pathway DI ends 1.0 m from pathway S, beyond snap_m 0.5"
	if !strings.HasPrefix(why, want) {
		t.Errorf("cut-off reason:\n got %s\nwant %s", why, want)
	}
}

func TestLinksNearestOverAnyEntrance(t *testing.T) {
	t.Parallel()
	// B (ic) has two pathway ends in its footprint: S-B to the street and B-L2, drawn from
	// 60 m north and joined to nothing (a lateral whose network end was pulled back). Build
	// picks B-L2's end as B's one access; D and E are still nearer B than A over S-B.
	const lat = 52.0
	degX := func(m float64) float64 { return -1 + m/(111320*math.Cos(lat*math.Pi/180)) }
	degY := func(m float64) float64 { return lat + m/111000 }
	dangle := fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":"B-L2"},"geometry":{"type":"LineString","coordinates":[[%.7f,%.7f],[%.7f,%.7f]]}}`,
		degX(505), degY(60), degX(505), degY(25))
	s := lineCampus(t, []string{"A", "C", "D", "B", "E"}, []float64{0, 100, 400, 500, 600}, map[string]string{"A": "mc", "B": "ic"}, dangle)
	var via []string
	for _, sp := range s.Net.Spans {
		if a := s.Access("B").Junction; sp.From == a || sp.To == a {
			via = append(via, sp.PathwayID)
		}
	}
	if !slices.Equal(via, []string{"B-L2"}) {
		t.Fatalf("B's access is on %v, want B-L2 (the case this test is about)", via)
	}
	got := defaultLinks(t, s, "A")
	// ANSI/TIA-568 hierarchical star: each served building to its nearest cross-connect, by
	// the network between any entrance of one and any entrance of the other.
	if want := "A-B A-C B-D B-E"; strings.Join(got, " ") != want {
		t.Errorf("default links: got %v, want %s", got, want)
	}
}

func TestGraphDistancesFromSeveral(t *testing.T) {
	t.Parallel()
	// Dijkstra from two sources at once, each with a start length, against gonum's
	// single-source Dijkstra (gonum.org/v1/gonum/graph/path) run from each: the least of the
	// two starts plus path, at every node.
	s := lineCampus(t, []string{"A", "C", "D", "B", "E"}, []float64{0, 100, 400, 500, 600}, nil, "")
	g := s.Graph
	a, _ := g.NodeOf(s.Access("A").Junction)
	b, _ := g.NodeOf(s.Access("B").Junction)
	got := g.DistancesM(map[int64]float64{a: 3, b: 40})
	fromA, fromB := path.DijkstraFrom(g.Node(a), g), path.DijkstraFrom(g.Node(b), g)
	for n := range got {
		want := min(3+fromA.WeightTo(int64(n)), 40+fromB.WeightTo(int64(n)))
		if math.Abs(got[n]-want) > 1e-9 {
			t.Errorf("node %s: got %.3f m, want %.3f m", g.Junction(int64(n)), got[n], want)
		}
	}
}

// TestThroughNamesOnlyInTheWay: the buildings a reason says a route must cross are those in
// its way, not every building the search meets: D, at the end of a spur off C's duct, is met
// by the search from C and is in nobody's way; G reaches A through E and then B, both named.
// A route crosses a building only along a pathway inside it; which buildings are in the way
// is common practice, no published source.
func TestThroughNamesOnlyInTheWay(t *testing.T) {
	t.Parallel()
	spur := []string{testsite.Box("D", "", 200, 80), factsDuct("DD", 200, 20, 200, 72)}
	row := []string{testsite.Box("E", "", 200, 140), testsite.Box("G", "", 300, 140),
		factsDuct("GE", 295, 140, 205, 140), factsDuct("EB", 195, 135, 155, 30)}
	cases := []struct {
		name     string
		extra    []string
		building string
		want     string
	}{
		{"spur building met, not in the way", spur, "C", "building C reaches A only through B: "},
		{"two buildings in a row", append(slices.Clone(spur), row...), "G", "building G reaches A only through B, E: "},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			s := factsCampus(t, 155, tc.extra...)
			if got := s.ThroughOnly("A"); !slices.Contains(got, tc.building) {
				t.Errorf("%s: reached only through another building: %q, want %s among them", tc.name, got, tc.building)
			}
			if got := s.Through(tc.building, "A"); !strings.HasPrefix(got, tc.want) {
				t.Errorf("%s: through reason:\n got %s\nwant %s…", tc.name, got, tc.want)
			}
		})
	}
}

func TestCheckPiecesEveryEntrance(t *testing.T) {
	t.Parallel()
	// B has two entrances: S-B on the street and B-L2, a lateral drawn from 60 m north and
	// joined to nothing, which Build picks as B's one access (TestLinksNearestOverAnyEntrance).
	// B is in the street's piece of the network through S-B: the campus is in one piece, as
	// Joined and the distances between buildings say. Counting one access per building made
	// it two (the street, through A, C, D and E; B-L2, through B).
	const lat = 52.0
	degX := func(m float64) float64 { return -1 + m/(111320*math.Cos(lat*math.Pi/180)) }
	degY := func(m float64) float64 { return lat + m/111000 }
	line := func(id string, x0, y0, x1, y1 float64) string {
		return fmt.Sprintf(`{"type":"Feature","properties":{"kind":"pathway","id":%q},"geometry":{"type":"LineString","coordinates":[[%.7f,%.7f],[%.7f,%.7f]]}}`,
			id, degX(x0), degY(y0), degX(x1), degY(y1))
	}
	names, at := []string{"A", "C", "D", "B", "E"}, []float64{0, 100, 400, 500, 600}
	cases := []struct {
		name   string
		extra  string
		pieces int
		off    []string
	}{
		{"second entrance on a dangling lateral", line("B-L2", 505, 60, 505, 25), 1, nil},
		// F's only pathway joins nothing: a piece of its own, however many entrances others have.
		{"and a building cut off", line("B-L2", 505, 60, 505, 25) + `,` +
			fmt.Sprintf(`{"type":"Feature","properties":{"kind":"building","id":"F"},"geometry":{"type":"Polygon","coordinates":[[[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f],[%.7f,%.7f]]]}}`,
				degX(800), degY(60), degX(820), degY(60), degX(820), degY(80), degX(800), degY(80), degX(800), degY(60)) + `,` +
			line("F-L", 810, 120, 810, 70), 2, []string{"F"}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			s := lineCampus(t, names, at, map[string]string{"A": "mc"}, tc.extra)
			if a := s.Access("B").Junction; !slices.ContainsFunc(s.Net.Spans, func(sp geo.Span) bool {
				return sp.PathwayID == "B-L2" && (sp.From == a || sp.To == a)
			}) {
				t.Fatalf("B's access is %s, not on B-L2 (the case this test is about)", a)
			}
			r := s.Check("")
			if r.Components != tc.pieces || !slices.Equal(r.Unreachable, tc.off) {
				t.Errorf("pieces %d, off the hub's %q; want %d, %q", r.Components, r.Unreachable, tc.pieces, tc.off)
			}
		})
	}
}

// TestLinksFutureRateNone: future_rate none, the documented default (README, Plan), plans a
// link for its rate alone, as the key absent or "" does, in the defaults and in a link entry,
// where it overrides the defaults' future rate (tester 12 F9); CheckRates accepts it for
// future_rate only, and still refuses it as a rate.
func TestLinksFutureRateNone(t *testing.T) {
	t.Parallel()
	s := lineCampus(t, []string{"A", "C", "D"}, []float64{0, 100, 200}, map[string]string{"A": "mc"}, "")
	p := plan.Default
	p.File = "plan.yaml"
	p.Defaults.FutureRate = "40G"
	p.Links = []plan.LinkSpec{{Line: 1, To: "C", FutureRate: plan.FutureRateNone}}
	links, _, errs := s.Links(&p, "A")
	if len(errs) > 0 {
		t.Fatal(errs)
	}
	got := map[string]string{}
	for _, l := range links {
		got[l.ID] = l.FutureRate
	}
	if got["A-C"] != "" || got["A-D"] != "40G" {
		t.Errorf("future rates: got %q, want A-C none (\"\") over the defaults' 40G, A-D 40G", got)
	}
	for _, v := range []string{plan.FutureRateNone, ""} {
		p.Defaults.FutureRate = v
		p.Links = nil
		links, _, errs := s.Links(&p, "A")
		if len(errs) > 0 {
			t.Fatal(errs)
		}
		for _, l := range links {
			if l.FutureRate != "" {
				t.Errorf("defaults.future_rate %q: link %s future rate %q, want none (\"\")", v, l.ID, l.FutureRate)
			}
		}
	}
	cat := media.DefaultCatalog()
	p.Defaults.FutureRate = plan.FutureRateNone
	p.Links = []plan.LinkSpec{{Line: 1, To: "C", FutureRate: plan.FutureRateNone}}
	if errs := p.CheckRates(cat); len(errs) != 0 {
		t.Errorf("future_rate none: got %v, want no problem", errs)
	}
	p.Defaults.Rate = plan.FutureRateNone
	if errs := p.CheckRates(cat); len(errs) != 1 || !strings.Contains(errs[0].Error(), "defaults.rate") {
		t.Errorf("rate none: got %v, want one problem at defaults.rate", errs)
	}
}
