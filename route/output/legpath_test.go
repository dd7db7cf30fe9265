package output

import (
	"context"
	"encoding/json"
	"math"
	"slices"
	"testing"

	"github.com/paulmach/orb"

	"spanwright/geo"
	"spanwright/route"
	"spanwright/route/internal/testplan"
)

// entrancePoint is where a route leaves or reaches building b at its entrance id, rounded as
// the writers round: the building end of the entrance's lateral, or its junction without one.
func entrancePoint(t *testing.T, net *geo.Network, b, id string) orb.Point {
	t.Helper()
	for _, e := range net.EntrancesOf(b) {
		if e.ID != id {
			continue
		}
		p := orb.Point{}
		if len(e.Lateral) > 0 {
			p = e.Lateral[0]
		} else {
			j, ok := net.Junction(e.Junction)
			if !ok {
				t.Fatalf("entrance %s of %s: no junction %s", id, b, e.Junction)
			}
			p = j.Point
		}
		return orb.Point{roundTo7(p[0]), roundTo7(p[1])}
	}
	t.Fatalf("building %s has no entrance %q", b, id)
	return orb.Point{}
}

// roundTo7 rounds a degree to geo.CoordDecimals (7) decimals, as the writers do.
func roundTo7(x float64) float64 { return math.Round(x*1e7) / 1e7 }

// TestLegLineFromTo checks that every leg's line in routes.geojson runs from its from building
// to its to building (RFC 7946 §3.1.4: a LineString's positions are in order, so its first
// position is where it starts): the first position is the from building's entrance the leg
// uses, the last the to building's, and the turns at added handholes, in the listed order,
// are met along the line in that order.
func TestLegLineFromTo(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		name string
		r    func(t *testing.T) *route.Result
	}{
		{"demo", func(t *testing.T) *route.Result { return testplan.DemoResult(t) }},
		{"passage", func(t *testing.T) *route.Result { return testplan.PassageResult(t, nil, "A", "B", "C", "HH-1") }},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := tc.r(t)
			files, err := Files(context.Background(), r, WriteOptions{SkipWorkbook: true})
			if err != nil {
				t.Fatal(err)
			}
			var fc struct {
				Features []struct {
					Geometry struct {
						Coordinates [][2]float64 `json:"coordinates"`
					} `json:"geometry"`
					Properties struct {
						Link, Leg, From, To string
						FromEntrance        string   `json:"from_entrance"`
						ToEntrance          string   `json:"to_entrance"`
						Turns               []string `json:"turns"`
						Pathways            []string `json:"pathways"`
						PathwaysText        string   `json:"pathways_text"`
						TurnsText           string   `json:"turns_text"`
					} `json:"properties"`
				} `json:"features"`
			}
			if err := json.Unmarshal(testplan.FileOf(t, files, "routes.geojson"), &fc); err != nil {
				t.Fatal(err)
			}
			if len(fc.Features) == 0 {
				t.Fatal("no features")
			}
			net := r.Site.Net
			turned := 0
			for _, f := range fc.Features {
				p, cs := f.Properties, f.Geometry.Coordinates
				if len(cs) < 2 {
					t.Errorf("%s %s: %d positions", p.Link, p.Leg, len(cs))
					continue
				}
				if got, want := orb.Point(cs[0]), entrancePoint(t, net, p.From, p.FromEntrance); got != want {
					t.Errorf("%s %s: starts at %v, want %s's entrance %s at %v", p.Link, p.Leg, got, p.From, p.FromEntrance, want)
				}
				if got, want := orb.Point(cs[len(cs)-1]), entrancePoint(t, net, p.To, p.ToEntrance); got != want {
					t.Errorf("%s %s: ends at %v, want %s's entrance %s at %v", p.Link, p.Leg, got, p.To, p.ToEntrance, want)
				}
				at := 0
				for _, id := range p.Turns {
					j, ok := net.Junction(id)
					if !ok {
						t.Fatalf("%s: turn at unknown junction %s", p.Link, id)
					}
					q := orb.Point{roundTo7(j.Point[0]), roundTo7(j.Point[1])}
					k := slices.Index(cs[at:], [2]float64(q))
					if k < 0 {
						t.Errorf("%s %s: turn %s (%v) is not on the line after position %d (turns %q)", p.Link, p.Leg, id, q, at, p.Turns)
						break
					}
					at += k
					turned++
				}
				if p.PathwaysText != ListText(p.Pathways) || p.TurnsText != ListText(p.Turns) {
					t.Errorf("%s %s: text forms %q %q of %q %q", p.Link, p.Leg, p.PathwaysText, p.TurnsText, p.Pathways, p.Turns)
				}
			}
			if tc.name == "passage" && turned != 2 {
				t.Errorf("passage: %d turns checked along the line, want 2", turned)
			}
		})
	}
}

// TestListText: the text form joins ids by "|" and percent-encodes "%" and "|" inside an id
// (RFC 3986 §2.1), so that splitting at "|" and decoding gives the ids back.
func TestListText(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		ids  []string
		want string
	}{
		{nil, ""},
		{[]string{}, ""},
		{[]string{"S-CEP"}, "S-CEP"},
		{[]string{"S-CEP", "SR-4", "FR-1"}, "S-CEP|SR-4|FR-1"},
		{[]string{"a|b", "50%", "c d"}, "a%7Cb|50%25|c d"},
		{[]string{"%7C"}, "%257C"},
	} {
		if got := ListText(tc.ids); got != tc.want {
			t.Errorf("ListText(%q) = %q, want %q", tc.ids, got, tc.want)
		}
	}
}

// TestLegLists: the exported lists are those every file of the package writes, in the line's
// order: the leg from A to C turns at HH-1, then J0002 (TestLegLineFromTo checks that order
// against the geometry).
func TestLegLists(t *testing.T) {
	t.Parallel()
	r := testplan.PassageResult(t, nil, "A", "B", "C", "HH-1")
	_, l := testplan.LegOf(t, r, "A-C")
	p, c, tu := LegLists(r.Site.Net, l)
	if tr := travelOf(r.Site.Net, l); !slices.Equal(p, tr.pathways) || !slices.Equal(c, []string{"B"}) || !slices.Equal(tu, []string{"HH-1", "J0002"}) {
		t.Errorf("LegLists: %q %q %q", p, c, tu)
	}
}
