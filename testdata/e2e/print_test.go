//go:build e2e

package e2e

import (
	"bytes"
	"context"
	"fmt"
	"html"
	"net/url"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
	"time"
)

// printMarginPt is the page margin of the printed reports (style.css @page: 12 mm for the
// plan report, 10 mm for compare.html), in points; the checks allow the smaller.
const printMarginPt = 10 / 25.4 * 72

// word is one word of a printed page as pdftotext -bbox reads it back, in points from the
// page's top left.
type word struct {
	xMin, yMin, xMax, yMax float64
	text                   string
}

// pdfPage is one printed page: its size in points and its words.
type pdfPage struct {
	w, h  float64
	words []word
}

// pdfPages reads a PDF's pages and words with poppler's pdftotext (-bbox): what a reader of
// the printed page sees, not what the HTML holds.
func pdfPages(t *testing.T, pdf string) []pdfPage {
	t.Helper()
	bin, err := exec.LookPath("pdftotext")
	if err != nil {
		t.Fatal("no pdftotext: `make e2e` installs Debian's poppler-utils")
	}
	out, err := exec.Command(bin, "-bbox", pdf, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext -bbox %s: %v", pdf, err)
	}
	pageRE := regexp.MustCompile(`<page width="([0-9.]+)" height="([0-9.]+)">`)
	wordRE := regexp.MustCompile(`<word xMin="([0-9.]+)" yMin="([0-9.]+)" xMax="([0-9.]+)" yMax="([0-9.]+)">([^<]*)</word>`)
	var pages []pdfPage
	for _, chunk := range strings.Split(string(out), "</page>") {
		m := pageRE.FindStringSubmatch(chunk)
		if m == nil {
			continue
		}
		p := pdfPage{w: atof(m[1]), h: atof(m[2])}
		for _, w := range wordRE.FindAllStringSubmatch(chunk, -1) {
			p.words = append(p.words, word{atof(w[1]), atof(w[2]), atof(w[3]), atof(w[4]), html.UnescapeString(w[5])})
		}
		pages = append(pages, p)
	}
	if len(pages) == 0 {
		t.Fatalf("pdftotext %s: no pages", pdf)
	}
	return pages
}

func atof(s string) float64 { v, _ := strconv.ParseFloat(s, 64); return v }

// inside fails for every word printed beyond a page's margins, give or take a point: text a
// page cut off would lie outside them (or be missing: see allPrinted).
func inside(t *testing.T, name string, pages []pdfPage) {
	t.Helper()
	for i, p := range pages {
		for _, w := range p.words {
			if w.xMin < printMarginPt-1 || w.xMax > p.w-printMarginPt+1 || w.yMax > p.h-printMarginPt+1 {
				t.Errorf("%s page %d: %q at x %.0f–%.0f, y %.0f, outside the %.0f × %.0f pt page's margins", name, i+1, w.text, w.xMin, w.xMax, w.yMax, p.w, p.h)
			}
		}
	}
}

// allPrinted fails for every text of want missing from the printed pages (pdftotext's text
// in reading order, spaces and line breaks ignored, so text wrapped within a table cell
// counts).
func allPrinted(t *testing.T, name, pdf string, want []string) {
	t.Helper()
	out, err := exec.Command("pdftotext", "-raw", pdf, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext -raw %s: %v", pdf, err)
	}
	squeeze := func(s string) string { return strings.Join(strings.Fields(s), "") }
	text := squeeze(string(out))
	missing := 0
	for _, w := range want {
		if !strings.Contains(text, squeeze(w)) {
			missing++
			if missing <= 10 {
				t.Errorf("%s: %q is not on the printed pages", name, w)
			}
		}
	}
	if missing > 10 {
		t.Errorf("%s: and %d more texts missing", name, missing-10)
	}
}

// printPDF prints a page with headless Chromium (no header or footer) to out/name.pdf.
func printPDF(t *testing.T, page, name string) string {
	t.Helper()
	pdf := filepath.Join(outDir(t), name+".pdf")
	os.Remove(pdf)
	browser(t, "--no-pdf-header-footer", "--print-to-pdf="+pdf, "file://"+page)
	return pdf
}

// probe runs script in a copy of page in headless Chromium (its window w × h CSS pixels) and
// returns what the script left in the body's data-probe attribute.
func probe(t *testing.T, page string, w, h int, script string) string {
	t.Helper()
	data, err := os.ReadFile(page)
	if err != nil {
		t.Fatal(err)
	}
	copyPath := strings.TrimSuffix(page, ".html") + "-probe.html"
	body := bytes.Replace(data, []byte("</body>"), []byte("<script>"+script+"</script></body>"), 1)
	if err := os.WriteFile(copyPath, body, 0o644); err != nil {
		t.Fatal(err)
	}
	defer os.Remove(copyPath)
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	defer cancel()
	cmd := exec.CommandContext(ctx, chromium(t), "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync", "--hide-scrollbars",
		"--force-device-scale-factor=1", fmt.Sprintf("--window-size=%d,%d", w, h), "--user-data-dir="+t.TempDir(),
		"--dump-dom", "file://"+copyPath)
	dom, err := cmd.Output()
	if err != nil {
		t.Fatalf("chromium --dump-dom: %v", err)
	}
	m := regexp.MustCompile(`data-probe="([^"]*)"`).FindSubmatch(dom)
	if m == nil {
		t.Fatal("probe: the script left no data-probe attribute")
	}
	return html.UnescapeString(string(m[1]))
}

// onTop is a probe script: at 41 points along every path of the map's works and carriers
// groups (new construction, tunnels and pole lines under cable) it asks the browser which
// elements are painted there, top first (document.elementsFromPoint; a dashed stroke is hit
// only on its dashes), and records for each point where the path is hit the groups of the
// elements above it. Nothing but marks meant to sit on everything (structures, added
// handholes, entrances, labels, counts) may be above it: a route there would hide it.
const onTop = `(function(){
var out=[];
document.querySelectorAll("svg.map g.works path, svg.map g.carriers path").forEach(function(p){
  var len=p.getTotalLength(), hits=0, above={};
  for(var k=0;k<=40;k++){
    var pt=p.getPointAtLength(len*k/40);
    var r=p.ownerSVGElement.createSVGPoint(); r.x=pt.x; r.y=pt.y;
    window.scrollTo(0,0);
    var s=r.matrixTransform(p.getScreenCTM());
    window.scrollTo(0,Math.max(0,s.y-200));
    s=r.matrixTransform(p.getScreenCTM());
    var list=document.elementsFromPoint(s.x,s.y), i=list.indexOf(p);
    if(i<0){continue;}
    hits++;
    for(var j=0;j<i;j++){var g=list[j].closest("g"); above[g?g.getAttribute("class"):list[j].tagName]=true;}
  }
  out.push(p.getAttribute("class")+":"+hits+":"+Object.keys(above).sort().join("+"));
});
document.body.setAttribute("data-probe",out.join(" "));
})();`

// checkOnTop runs onTop and fails on a works or carrier path the browser never finds at its
// own points, or finds under anything but the marks; it returns how many paths it probed.
func checkOnTop(t *testing.T, name, page string) int {
	t.Helper()
	res := probe(t, page, 1400, 1000, onTop)
	n := 0
	for _, r := range strings.Fields(res) {
		n++
		parts := strings.SplitN(r, ":", 3)
		if len(parts) != 3 || parts[1] == "0" {
			t.Errorf("%s: %s: the browser finds the path at none of its points", name, r)
			continue
		}
		for _, g := range strings.Split(parts[2], "+") {
			switch g {
			case "", "structures", "turns", "entrances", "labels", "counts", "north", "scalebar", "carriers", "works": // a neighbouring span of the same layers meets it at a junction
			default:
				t.Errorf("%s: %s is under %q: hidden", name, parts[0], g)
			}
		}
	}
	t.Logf("%s: %d paths over the routes, each found on top: %s", name, n, res)
	return n
}

// firstPageFull checks the printed report's first page: it holds the map (its heading and
// its legend) and its text reaches at least three quarters of the page height.
func firstPageFull(t *testing.T, name string, pages []pdfPage) {
	t.Helper()
	p := pages[0]
	bottom := 0.0
	words := map[string]bool{}
	for _, w := range p.words {
		bottom = max(bottom, w.yMax)
		words[w.text] = true
	}
	if bottom < 0.75*p.h {
		t.Errorf("%s: page 1 ends at %.0f of %.0f pt (%.0f %%): mostly empty", name, bottom, p.h, 100*bottom/p.h)
	}
	for _, want := range []string{"Summary", "Map", "PATHWAYS"} {
		if !words[want] {
			t.Errorf("%s: page 1 lacks %q (the summary, the map and its legend belong there)", name, want)
		}
	}
	t.Logf("%s: page 1 filled to %.0f of %.0f pt (%.0f %%)", name, bottom, p.h, 100*bottom/p.h)
}

// TestStarterReport plans the starter files (written by `spanwright starter`), and checks the
// report's map in Chromium: the new trench, the tunnel and the pole line are drawn over the
// routes (no route paints over them), the trench's red shows in a screenshot, and the printed
// page 1 holds the summary and the map.
func TestStarterReport(t *testing.T) {
	bin := spanwright(t)
	dir := filepath.Join(t.TempDir(), "mine")
	if code := run(t, bin, "starter", dir); code != 0 {
		t.Fatalf("starter: exit %d", code)
	}
	if code := run(t, bin, "plan", filepath.Join(dir, "plan.yaml"), "--out", filepath.Join(dir, "out")); code != 0 {
		t.Fatalf("plan of the starter files: exit %d", code)
	}
	page := filepath.Join(dir, "out", "report.html")
	if n := checkOnTop(t, "starter report", page); n < 3 {
		t.Errorf("starter report: %d works and carrier paths probed, want at least 3 (trench, tunnel, pole line)", n)
	}
	shot := filepath.Join(outDir(t), "starter-report.png")
	os.Remove(shot)
	browser(t, "--screenshot="+shot, fmt.Sprintf("--window-size=%d,%d", planW, planH), "file://"+page)
	p := look(t, shot)
	// The trench's red dashes (#c0180c) on its yellow route: 200 m of trench.
	if n := p.near("#c0180c", 30); n < 300 {
		t.Errorf("starter report: %d trench-red pixels, want at least 300: is the new trench drawn over the route?", n)
	}
	pages := pdfPages(t, printPDF(t, page, "starter-report"))
	firstPageFull(t, "starter report", pages)
	inside(t, "starter report", pages)
}

// TestWideSweepPrint prints compare.html of a sweep with six axes and two cases on A3
// landscape and reads the pages back: every column head and every cell of the table is
// printed, no word lies beyond the margins; then runs the sweep in two shards with --full,
// merges them into another folder, and asks Chromium where each scenario link of the merged
// compare.html leads (the href it resolves): every one must be an existing report.html.
func TestWideSweepPrint(t *testing.T) {
	bin := spanwright(t)
	dir := t.TempDir()
	if code := run(t, bin, "sweep", "testdata/sweep/wide.yaml", "--out", dir, "--quiet", "--jobs", "2"); code != 2 {
		t.Fatalf("sweep: exit %d, want 2 (one case fails)", code)
	}
	page := filepath.Join(dir, "compare.html")
	data, err := os.ReadFile(page)
	if err != nil {
		t.Fatal(err)
	}
	var want []string
	for _, h := range regexp.MustCompile(`<button type="button">(.*?)</button>`).FindAllSubmatch(data, -1) {
		want = append(want, html.UnescapeString(strings.ReplaceAll(string(h[1]), "<wbr>", "")))
	}
	if len(want) < 6+17 {
		t.Fatalf("compare.html: %d columns, want the six axes and the comparison's own", len(want))
	}
	for _, c := range regexp.MustCompile(`(?s)<td data-v="[^"]*"(?: class="n")?>(?:<a href="[^"]*">)?(.*?)(?:</a>)?</td>`).FindAllSubmatch(data, -1) {
		if s := html.UnescapeString(string(c[1])); s != "" {
			want = append(want, s)
		}
	}
	pdf := printPDF(t, page, "wide-sweep")
	pages := pdfPages(t, pdf)
	for i, p := range pages {
		// A3 landscape: 420 × 297 mm = 1190.55 × 841.89 pt (ISO 216).
		if d, e := p.w-1190.55, p.h-841.89; d < -1.5 || d > 1.5 || e < -1.5 || e > 1.5 {
			t.Errorf("wide sweep page %d: %.2f × %.2f pt, want A3 landscape 1190.55 × 841.89", i+1, p.w, p.h)
		}
	}
	inside(t, "wide sweep", pages)
	allPrinted(t, "wide sweep", pdf, want)
	t.Logf("wide sweep: %d texts of the table printed on %d A3 landscape pages; see %s", len(want), len(pages), pdf)

	root := t.TempDir()
	var shards []string
	for i := 1; i <= 2; i++ {
		d := filepath.Join(root, fmt.Sprintf("shard %d", i))
		shards = append(shards, d)
		run(t, bin, "sweep", "testdata/sweep/wide.yaml", "--out", d, "--quiet", "--full", "--shard", fmt.Sprintf("%d/2", i))
	}
	merged := filepath.Join(root, "elsewhere", "merged")
	if code := run(t, bin, append(append([]string{"merge"}, shards...), "--out", merged)...); code != 2 {
		t.Fatalf("merge: exit %d, want 2 (one case fails)", code)
	}
	res := probe(t, filepath.Join(merged, "compare.html"), 1400, 900,
		`document.body.setAttribute("data-probe",Array.prototype.map.call(document.querySelectorAll("#compare td a"),function(a){return a.href;}).join(" "));`)
	links := strings.Fields(res)
	if len(links) != 5 {
		t.Errorf("merged compare.html: %d scenario links, want 5 (the planned scenarios)", len(links))
	}
	for _, l := range links {
		u, err := url.Parse(l)
		if err != nil || u.Scheme != "file" || !strings.HasSuffix(u.Path, "/report.html") {
			t.Errorf("merged compare.html: link %s is not a scenario's report.html", l)
			continue
		}
		if _, err := os.Stat(u.Path); err != nil {
			t.Errorf("merged compare.html: link %s leads nowhere: %v", l, err)
		}
	}
}
