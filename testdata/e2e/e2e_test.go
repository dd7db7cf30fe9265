//go:build e2e

// Package e2e checks the HTML reports in a real browser: it plans the demo and a small sweep
// with the spanwright binary, renders report.html and compare.html with headless Chromium
// (Debian's chromium package) to PNG and PDF, and fails on a blank, clipped or wrongly sized
// page. Run it with `make e2e`; it is not part of `make test`. The pictures stay in
// testdata/e2e/out/ for a person to look at.
package e2e

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"image/png"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"time"
)

// Screenshot sizes, in CSS pixels at a device scale of 1.
const (
	planW, planH   = 1400, 2400
	sweepW, sweepH = 1400, 1100
)

func chromium(t *testing.T) string {
	t.Helper()
	for _, c := range []string{os.Getenv("CHROMIUM"), "/usr/bin/chromium", "/usr/bin/chromium-browser"} {
		if c == "" {
			continue
		}
		if _, err := os.Stat(c); err == nil {
			return c
		}
	}
	t.Fatal("no chromium: `make e2e` installs Debian's chromium package (apt-get install -y chromium)")
	return ""
}

// sortedByCost clicks the head of the total cost column twice in a copy of compare.html (a
// script appended to the page, run by Chromium) and reads the sorted table back from the DOM:
// the costs must descend (the page lists scenarios in index order, not by cost), blanks
// (failed scenarios) last.
func sortedByCost(t *testing.T, dir string, html []byte) {
	t.Helper()
	click := []byte(`<script>(function(){var hs=document.querySelectorAll("#compare th");` +
		`for(var i=0;i<hs.length;i++){if(hs[i].textContent.indexOf("total cost")===0){hs[i].querySelector("button").click();hs[i].querySelector("button").click();}}})();</script></body>`)
	page := filepath.Join(dir, "compare-sorted.html")
	if err := os.WriteFile(page, bytes.Replace(html, []byte("</body>"), click, 1), 0o644); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	defer cancel()
	cmd := exec.CommandContext(ctx, chromium(t), "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync", "--user-data-dir="+t.TempDir(),
		"--dump-dom", "file://"+page)
	dom, err := cmd.Output()
	if err != nil {
		t.Fatalf("chromium --dump-dom: %v", err)
	}
	head := regexp.MustCompile(`<th(?: [^>]*)?>`).FindAllIndex(dom, -1)
	col := -1
	for i, h := range head {
		if bytes.HasPrefix(dom[h[1]:], []byte(`<button type="button">total cost`)) {
			col = i
		}
	}
	if col < 0 {
		t.Fatal("sorted page: no total cost column")
	}
	if !bytes.Contains(dom, []byte(`aria-sort="descending"`)) {
		t.Error("sorted page: no column marked descending: the inline sorter did not run")
	}
	body := dom[bytes.Index(dom, []byte("<tbody>")):]
	var costs []string
	for _, tr := range regexp.MustCompile(`(?s)<tr[^>]*>(.*?)</tr>`).FindAllSubmatch(body, -1) {
		cells := regexp.MustCompile(`<td data-v="([^"]*)"`).FindAllSubmatch(tr[1], -1)
		if col < len(cells) {
			costs = append(costs, string(cells[col][1]))
		}
	}
	if len(costs) < 3 {
		t.Fatalf("sorted page: %d rows", len(costs))
	}
	prev := math.Inf(1)
	blank := false
	for i, c := range costs {
		if c == "" {
			blank = true
			continue
		}
		v, err := strconv.ParseFloat(c, 64)
		if err != nil || blank || v > prev {
			t.Fatalf("sorted page: costs %v not descending with blanks last (row %d)", costs, i)
		}
		prev = v
	}
	t.Logf("sorted by total cost, descending, in Chromium: %v", costs)
}

// browser runs headless Chromium on a local file with the flags that keep it off the
// network and out of the user's profile.
func browser(t *testing.T, args ...string) {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), 2*time.Minute)
	defer cancel()
	base := []string{"--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync",
		"--hide-scrollbars", "--force-device-scale-factor=1", "--user-data-dir=" + t.TempDir()}
	cmd := exec.CommandContext(ctx, chromium(t), append(base, args...)...)
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("chromium %v: %v\n%s", args, err, out)
	}
}

// spanwright builds the command once per test binary.
func spanwright(t *testing.T) string {
	t.Helper()
	bin := filepath.Join(t.TempDir(), "spanwright")
	goBin := filepath.Join(runtime.GOROOT(), "bin", "go")
	cmd := exec.Command(goBin, "build", "-o", bin, "spanwright/cmd/spanwright")
	cmd.Dir = filepath.Join("..", "..")
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

// run runs the binary and returns its exit status.
func run(t *testing.T, bin string, args ...string) int {
	t.Helper()
	cmd := exec.Command(bin, args...)
	cmd.Dir = filepath.Join("..", "..")
	out, err := cmd.CombinedOutput()
	if ee, ok := err.(*exec.ExitError); ok {
		return ee.ExitCode()
	} else if err != nil {
		t.Fatalf("%v: %v\n%s", args, err, out)
	}
	return 0
}

func outDir(t *testing.T) string {
	t.Helper()
	dir, err := filepath.Abs("out")
	if err != nil {
		t.Fatal(err)
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	return dir
}

// picture is what the PNG checks need of a screenshot.
type picture struct {
	w, h   int
	colour map[[3]uint8]int // pixels per colour
	bands  []int            // distinct colours in each of 8 horizontal bands, top to bottom
}

func look(t *testing.T, path string) picture {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	img, err := png.Decode(f)
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	b := img.Bounds()
	p := picture{w: b.Dx(), h: b.Dy(), colour: map[[3]uint8]int{}, bands: make([]int, 8)}
	band := make([]map[[3]uint8]bool, 8)
	for i := range band {
		band[i] = map[[3]uint8]bool{}
	}
	for y := b.Min.Y; y < b.Max.Y; y++ {
		k := (y - b.Min.Y) * 8 / b.Dy()
		for x := b.Min.X; x < b.Max.X; x++ {
			r, g, bl, _ := img.At(x, y).RGBA()
			c := [3]uint8{uint8(r >> 8), uint8(g >> 8), uint8(bl >> 8)}
			p.colour[c]++
			band[k][c] = true
		}
	}
	for i := range band {
		p.bands[i] = len(band[i])
	}
	return p
}

// near counts the pixels within tol of the colour #rrggbb in every channel.
func (p picture) near(hex string, tol int) int {
	v, _ := strconv.ParseUint(strings.TrimPrefix(hex, "#"), 16, 32)
	want := [3]int{int(v >> 16 & 255), int(v >> 8 & 255), int(v & 255)}
	n := 0
	for c, k := range p.colour {
		ok := true
		for i := range 3 {
			if d := int(c[i]) - want[i]; d < -tol || d > tol {
				ok = false
			}
		}
		if ok {
			n += k
		}
	}
	return n
}

func (p picture) check(t *testing.T, name string, w, h int) {
	t.Helper()
	if p.w != w || p.h != h {
		t.Errorf("%s: screenshot %d×%d, want %d×%d", name, p.w, p.h, w, h)
	}
	if len(p.colour) < 50 {
		t.Errorf("%s: %d distinct colours: a blank page", name, len(p.colour))
	}
	// A page cut short leaves bands of background: every band must hold text or drawing.
	for i, n := range p.bands {
		if n < 8 {
			t.Errorf("%s: band %d of 8 has %d colours: blank or clipped (%v)", name, i+1, n, p.bands)
		}
	}
}

func TestPlanReport(t *testing.T) {
	bin := spanwright(t)
	dir := t.TempDir()
	if code := run(t, bin, "demo", "--out", dir); code != 0 && code != 3 {
		t.Fatalf("demo: exit %d", code)
	}
	html, err := os.ReadFile(filepath.Join(dir, "report.html"))
	if err != nil {
		t.Fatal(err)
	}
	var sum struct {
		Legs       int `json:"legs"`
		Infeasible int `json:"infeasible_legs"`
	}
	data, _ := os.ReadFile(filepath.Join(dir, "summary.json"))
	if err := json.Unmarshal(data, &sum); err != nil {
		t.Fatal(err)
	}
	feasible := sum.Legs - sum.Infeasible
	// The map holds one route path per feasible leg, each with its data-leg attribute.
	paths := regexp.MustCompile(`<path [^>]*class="route"[^>]*data-leg="[^"]+"`).FindAll(html, -1)
	if len(paths) != feasible || feasible == 0 {
		t.Errorf("report.html: %d route paths, want %d (one per feasible leg)", len(paths), feasible)
	}
	for _, bad := range [][]byte{[]byte("http:"), []byte("https:")} {
		if bytes.Contains(html, bad) {
			t.Errorf("report.html refers to %s", bad)
		}
	}

	out := outDir(t)
	shot := filepath.Join(out, "demo-report.png")
	os.Remove(shot)
	browser(t, "--screenshot="+shot, fmt.Sprintf("--window-size=%d,%d", planW, planH), "file://"+filepath.Join(dir, "report.html"))
	p := look(t, shot)
	p.check(t, "demo report", planW, planH)
	// Routes are drawn: the single-mode jacket yellow (TIA-598) of the demo's os2 legs, and
	// the hub's fill.
	if n := p.near("#f2c500", 24); n < 3000 {
		t.Errorf("demo report: %d yellow route pixels, want at least 3000: are the routes drawn?", n)
	}
	if n := p.near("#b9c9e6", 6); n < 100 {
		t.Errorf("demo report: %d hub pixels, want at least 100", n)
	}
	t.Logf("demo report: %d×%d, %d colours, bands %v; see %s", p.w, p.h, len(p.colour), p.bands, shot)

	// Printed: A3 pages (297 × 420 mm = 841.89 × 1190.55 pt, ISO 216).
	pdf := filepath.Join(out, "demo-report.pdf")
	os.Remove(pdf)
	browser(t, "--no-pdf-header-footer", "--print-to-pdf="+pdf, "file://"+filepath.Join(dir, "report.html"))
	doc, err := os.ReadFile(pdf)
	if err != nil {
		t.Fatal(err)
	}
	boxes := regexp.MustCompile(`/MediaBox \[0 0 ([0-9.]+) ([0-9.]+)\]`).FindAllSubmatch(doc, -1)
	if len(boxes) < 2 {
		t.Fatalf("demo report PDF: %d pages, want several", len(boxes))
	}
	for _, m := range boxes {
		w, _ := strconv.ParseFloat(string(m[1]), 64)
		h, _ := strconv.ParseFloat(string(m[2]), 64)
		if d := w - 841.89; d < -1.5 || d > 1.5 {
			t.Errorf("PDF page %s × %s pt, want A3 841.89 × 1190.55", m[1], m[2])
		} else if d := h - 1190.55; d < -1.5 || d > 1.5 {
			t.Errorf("PDF page %s × %s pt, want A3 841.89 × 1190.55", m[1], m[2])
		}
	}
	t.Logf("demo report printed: %d A3 pages; see %s", len(boxes), pdf)
	pages := pdfPages(t, pdf)
	firstPageFull(t, "demo report", pages)
	inside(t, "demo report", pages)
	if n := checkOnTop(t, "demo report", filepath.Join(dir, "report.html")); n == 0 {
		t.Error("demo report: no works or carrier path probed (the demo bores one span and uses tunnels)")
	}
}

func TestSweepReport(t *testing.T) {
	bin := spanwright(t)
	dir := t.TempDir()
	// The small sweep has a failing case (exit 2) and an infeasible one.
	if code := run(t, bin, "sweep", "testdata/sweep/small.yaml", "--out", dir, "--quiet", "--jobs", "2"); code != 2 {
		t.Fatalf("sweep: exit %d, want 2", code)
	}
	html, err := os.ReadFile(filepath.Join(dir, "compare.html"))
	if err != nil {
		t.Fatal(err)
	}
	rows, err := os.ReadFile(filepath.Join(dir, "rows.jsonl"))
	if err != nil {
		t.Fatal(err)
	}
	planned := bytes.Count(rows, []byte(`"status":"ok"`)) + bytes.Count(rows, []byte(`"status":"infeasible"`))
	if n := bytes.Count(html, []byte(`data-point="scenario"`)); n != planned || planned == 0 {
		t.Errorf("compare.html: %d points, want %d (one per planned scenario)", n, planned)
	}
	if n := bytes.Count(html, []byte("<script")); n != 1 {
		t.Errorf("compare.html: %d scripts, want the one inline sorter", n)
	}
	for _, sc := range regexp.MustCompile(`href="([^"]+/report\.html)"`).FindAllSubmatch(html, -1) {
		if _, err := os.Stat(filepath.Join(dir, string(sc[1]))); err != nil {
			t.Errorf("compare.html links %s: %v", sc[1], err)
		}
	}
	sortedByCost(t, dir, html)
	out := outDir(t)
	shot := filepath.Join(out, "sweep-report.png")
	os.Remove(shot)
	browser(t, "--screenshot="+shot, fmt.Sprintf("--window-size=%d,%d", sweepW, sweepH), "file://"+filepath.Join(dir, "compare.html"))
	p := look(t, shot)
	p.check(t, "sweep report", sweepW, sweepH)
	// Pareto points are filled green.
	if n := p.near("#1e7a34", 10); n < 30 {
		t.Errorf("sweep report: %d Pareto-green pixels, want at least 30", n)
	}
	t.Logf("sweep report: %d×%d, %d colours, bands %v; see %s", p.w, p.h, len(p.colour), p.bands, shot)
}
