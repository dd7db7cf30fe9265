package report

import (
	"regexp"
	"strconv"
	"strings"
	"testing"

	"spanwright/geo"
	"spanwright/route/items"
	"spanwright/route/output"
)

// TestMapDrawsOverRoutes checks the map's layers over the routes on the demo campus (a bored
// span, tunnels, a pole line) and the starter campus (a trench in turf, a join handhole):
// one works path per span of new construction with the class of its method (the bill's
// items.MethodOf), one carrier per tunnel or aerial span carrying cable, drawn after the
// routes (SVG paints in document order, so later is on top: SVG 1.1 §3.3), a count label
// per labelled span equal to its cable count, the header's demo-price warning only where
// the embedded book priced the plan, and the legend for each layer drawn.
func TestMapDrawsOverRoutes(t *testing.T) {
	for _, path := range []string{demoPlan, "../starter/files/plan.yaml"} {
		r := result(t, path)
		html := render(t, path, Options{})
		svg := html[strings.Index(html, `<svg class="map"`):]
		svg = svg[:strings.Index(svg, "</svg>")]
		routes, works, carriers := strings.Index(svg, `<g class="routes">`), strings.Index(svg, `<g class="works">`), strings.Index(svg, `<g class="carriers">`)
		if routes < 0 || works < routes || carriers < routes {
			t.Errorf("%s: routes at %d, carriers at %d, works at %d: the layers must follow the routes", path, routes, carriers, works)
		}
		opened := map[string]bool{}
		for _, id := range r.Opened {
			opened[id] = true
		}
		cables := map[string]int{}
		wantWorks, wantCarriers := map[string]string{}, 0
		for _, f := range r.Fill {
			cables[f.Span] = f.Cables
			if f.AddedDucts > 0 {
				opened[f.Span] = true
			}
		}
		for i := range r.Site.Net.Spans {
			s := &r.Site.Net.Spans[i]
			if opened[s.ID] {
				wantWorks[s.ID] = "nw-" + items.MethodOf(r.Engine.PriceBook(), r.Design(), s)
			}
			if cables[s.ID] > 0 && s.Status != geo.StatusProposed && (s.Type == geo.TypeTunnel || s.Type == geo.TypeAerial) {
				wantCarriers++
			}
		}
		got := regexp.MustCompile(`<path d="[^"]*" class="(nw-[a-z]+)"><title>([^ ]+) `).FindAllStringSubmatch(svg, -1)
		if len(got) != len(wantWorks) || len(wantWorks) == 0 {
			t.Errorf("%s: %d works paths, want %d (opened and added-duct spans)", path, len(got), len(wantWorks))
		}
		for _, g := range got {
			if wantWorks[g[2]] != g[1] {
				t.Errorf("%s: span %s drawn as %s, want %s", path, g[2], g[1], wantWorks[g[2]])
			}
		}
		if n := len(regexp.MustCompile(`class="on-(tunnel|aerial)"`).FindAllString(svg, -1)); n != wantCarriers || n == 0 {
			t.Errorf("%s: %d tunnel and aerial carriers, want %d", path, n, wantCarriers)
		}
		labels := regexp.MustCompile(`class="cnt"[^>]*>(\d+)<title>([^:]+): (\d+) cables?</title>`).FindAllStringSubmatch(svg, -1)
		if len(labels) == 0 {
			t.Errorf("%s: no cable counts", path)
		}
		for _, l := range labels {
			n, _ := strconv.Atoi(l[1])
			if cables[l[2]] != n || l[1] != l[3] {
				t.Errorf("%s: span %s labelled %s (%s), carries %d cables", path, l[2], l[1], l[3], cables[l[2]])
			}
		}
		demo := output.DemoPrices(r)
		if strings.Contains(html, `class="alert demo-prices"`) != demo {
			t.Errorf("%s: demo-price warning in the header %v, want %v", path, !demo, demo)
		}
		for cls, label := range map[string]string{"nw-trench": "new trench the plan builds", "nw-bore": "new directional bore the plan builds",
			"on-tunnel": "route in a utility tunnel", "on-aerial": "route on a pole line"} {
			if strings.Contains(svg, `class="`+cls+`"`) != strings.Contains(html, "> "+label) {
				t.Errorf("%s: %s drawn %v but legend %q %v", path, cls, !strings.Contains(html, "> "+label), label, strings.Contains(html, "> "+label))
			}
		}
	}
	if !strings.Contains(render(t, "../starter/files/plan.yaml", Options{}), "new pathway joins the network there</title>") {
		t.Error("starter: no handhole to add where the new trench joins the network")
	}
}

// TestMapNewWorkByKind: on a campus whose plan builds a trench, a directional bore, a pole
// line and a cable tray (testdata/newwork), each span of new construction is drawn in the
// style of its kind (items.MethodOf: nw-trench, nw-bore, nw-aerial, nw-tray), each style has
// a dash pattern of its own in the style sheet (nw-tunnel's too, which this plan does not
// build), and the legend names each kind drawn and no other. The styles are this project's
// own choice (common practice, no published source: a map's line styles follow no standard).
func TestMapNewWorkByKind(t *testing.T) {
	const path = "../../testdata/newwork/plan.yaml"
	html := render(t, path, Options{})
	svg := html[strings.Index(html, `<svg class="map"`):]
	svg = svg[:strings.Index(svg, "</svg>")]
	want := map[string]string{"NEW-TRENCH": "nw-trench", "NEW-BORE": "nw-bore", "NEW-POLES": "nw-aerial", "NEW-TRAY": "nw-tray"}
	got := map[string]string{}
	for _, g := range regexp.MustCompile(`<path d="[^"]*" class="(nw-[a-z]+)"><title>([^ ]+) `).FindAllStringSubmatch(svg, -1) {
		got[g[2]] = g[1]
	}
	for span, cls := range want {
		if got[span] != cls {
			t.Errorf("span %s drawn as %q, want %s (works %v)", span, got[span], cls, got)
		}
	}
	if len(got) != len(want) {
		t.Errorf("works %v, want %v", got, want)
	}
	dashes := map[string]string{}
	for _, cls := range []string{"nw-trench", "nw-bore", "nw-aerial", "nw-tray", "nw-tunnel"} {
		m := regexp.MustCompile(`\.` + cls + ` \{[^}]*stroke-dasharray: ([^;]+);`).FindStringSubmatch(styleCSS)
		if m == nil {
			t.Errorf("style sheet: no dash pattern for %s", cls)
			continue
		}
		if other, ok := dashes[m[1]]; ok {
			t.Errorf("%s and %s share the dash pattern %q", cls, other, m[1])
		}
		dashes[m[1]] = cls
	}
	for cls, label := range map[string]string{"nw-trench": "new trench the plan builds", "nw-bore": "new directional bore the plan builds",
		"nw-aerial": "new pole line the plan builds", "nw-tray": "new cable tray the plan builds", "nw-tunnel": "new utility tunnel the plan builds"} {
		drawn, listed := strings.Contains(svg, `class="`+cls+`"`), strings.Contains(html, `class="`+cls+`"/></g></svg> `+label)
		if drawn != listed || drawn != (cls != "nw-tunnel") {
			t.Errorf("%s drawn %v, legend %q %v; want both, but for the tunnel this plan does not build", cls, drawn, label, listed)
		}
	}
}
