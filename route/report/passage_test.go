package report

import (
	"context"
	"regexp"
	"strings"
	"testing"

	"spanwright/route/internal/testplan"
)

// TestPlanPassage renders a plan whose leg A–C uses entrances A:1 and C:1, passes through
// building B and turns at J0002 and HH-1 (testplan.PassageResult): the map marks every
// entrance of the network at its junction (the used ones filled), draws B as a building a
// route passes through and marks the added handholes; the links table names the entrances,
// the building and the turns; the legend explains the new marks.
func TestPlanPassage(t *testing.T) {
	t.Parallel()
	r := testplan.PassageResult(t, nil, "A", "B", "C", "HH-1")
	b, err := Plan(context.Background(), r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	group := func(class string) string {
		m := regexp.MustCompile(`<g class="` + class + `">(.*?)</g>`).FindStringSubmatch(html)
		if m == nil {
			t.Fatalf("map has no group %s", class)
		}
		return m[1]
	}
	ents := regexp.MustCompile(`<circle cx="[^"]*" cy="[^"]*" r="2.5" class="(ent(?: used)?)"><title>([^<]*)</title></circle>`).
		FindAllStringSubmatch(group("entrances"), -1)
	if len(ents) != len(r.Site.Net.Entrances) {
		t.Fatalf("%d entrance marks, want one per entrance of the network, %d", len(ents), len(r.Site.Net.Entrances))
	}
	used := map[string]string{}
	for _, e := range ents {
		id, _, _ := strings.Cut(e[2], ": entrance of ")
		used[id] = e[1]
	}
	for id, cls := range map[string]string{"A:1": "ent used", "C:1": "ent used", "B:1": "ent used"} {
		if used[id] != cls {
			t.Errorf("entrance %s: class %q, want %q (%q)", id, used[id], cls, used)
		}
	}
	for _, want := range []string{
		`class="bldg crossed" fill-rule="evenodd"><title>B; routes pass through it: A-C primary</title>`,
		`class="st turn"><title>J0002: handhole to add, where a route turns between pathways (A-C primary); new pathway joins the network there</title>`,
		`class="st turn"><title>HH-1: handhole to add, where a route turns between pathways (A-C primary)</title>`,
		`<span class="small entrances">entrances A:1 → C:1</span>`,
		`<span class="small crosses">Passes through buildings B</span>`,
		`<span class="small turns">Turns between pathways at HH-1, J0002, where a handhole is added</span>`,
		"> building a route passes through</li>", "> handhole to add (a route turns between pathways, new pathway joins, a lateral taps a duct or a pole line, along new construction, or a pull point)</li>",
		"> building entrance</li>", "> entrance a leg uses</li>",
		"<title>A:1: entrance of A (pathway end at the footprint), used by 2 legs</title>",
		"<title>B:1: entrance of B (pathway end at the footprint), used by 1 leg</title>",
	} {
		if !strings.Contains(html, want) {
			t.Errorf("report lacks %q", want)
		}
	}
	if n := strings.Count(group("turns"), "<rect "); n != 2 {
		t.Errorf("%d turn marks, want 2", n)
	}
	if n := strings.Count(html, `<span class="small entrances">`); n != 2 {
		t.Errorf("%d legs name their entrances, want 2 (A-B's are the routing's own)", n)
	}
}

// TestPlanPassagePayloads: the ids of the entrances, the buildings passed through and the
// junctions turned at come out as text, as every other id (html/template's escaping), and a
// bidi control in one shows as its code point.
func TestPlanPassagePayloads(t *testing.T) {
	t.Parallel()
	ids := strings.NewReplacer(`"id":"A"`, `"id":"\u003cb\u003eA"`, `"id":"B"`, `"id":"B\"\u003e\u003cscript\u003ex()\u003c/script\u003e"`,
		`"id":"C"`, `"id":"C\u202E"`, `"id":"HH-1"`, `"id":"\u003chh\u0026\u003e"`)
	r := testplan.PassageResult(t, ids, "<b>A", `B"><script>x()</script>`, "C\u202E", "<hh&>")
	b, err := Plan(context.Background(), r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	html := string(b)
	for _, bad := range []string{"<script", "<b>A", "<hh&>", "\u202E"} {
		if strings.Contains(html, bad) {
			t.Errorf("report holds %q raw", bad)
		}
	}
	for _, want := range []string{
		// html/template's escaper (HTMLEscapeString): & < > " ' become entities
		"<title>&lt;b&gt;A:1: entrance of &lt;b&gt;A (pathway end at the footprint), used by 2 legs</title>",
		"<title>B&#34;&gt;&lt;script&gt;x()&lt;/script&gt;; routes pass through it: &lt;b&gt;A-C&lt;U+202E&gt; primary</title>",
		"<title>&lt;hh&amp;&gt;: handhole to add, where a route turns between pathways (&lt;b&gt;A-C&lt;U+202E&gt; primary)</title>",
		`<span class="small entrances">entrances &lt;b&gt;A:1 → C&lt;U+202E&gt;:1</span>`,
		`<span class="small crosses">Passes through buildings B&#34;&gt;&lt;script&gt;x()&lt;/script&gt;</span>`,
		`<span class="small turns">Turns between pathways at &lt;hh&amp;&gt;, J0002, where a handhole is added</span>`,
	} {
		if !strings.Contains(html, want) {
			t.Errorf("report lacks the escaped text %q", want)
		}
	}
}
