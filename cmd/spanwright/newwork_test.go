package main

import (
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// newWorkPlan is the invented Sallowmere field station (testdata/newwork/README.md), whose
// plan builds a proposed trench, a directional bore, a pole line and a cable tray.
const newWorkPlan = "../../testdata/newwork/plan.yaml"

// billedByKind adds up bom.csv's quantities of new construction by kind, read from each
// line's price key as the price book names it: trench_per_m.<surface> (trench; not its
// restoration line, the same metres again), directional_bore_per_m (bore) and
// new_pathway_per_m.<type> (aerial, tray, tunnel).
func billedByKind(t *testing.T, bom []byte) map[string]float64 {
	t.Helper()
	rows, err := csv.NewReader(strings.NewReader(string(bom))).ReadAll()
	if err != nil || len(rows) < 2 {
		t.Fatalf("bom.csv: %v (%d rows)", err, len(rows))
	}
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	out := map[string]float64{}
	for _, r := range rows[1:] {
		key := r[col["price_key"]]
		kind := ""
		switch {
		case strings.HasPrefix(key, "trench_per_m."):
			kind = "trench"
		case key == "directional_bore_per_m":
			kind = "bore"
		case strings.HasPrefix(key, "new_pathway_per_m."):
			kind = strings.TrimPrefix(key, "new_pathway_per_m.")
		default:
			continue
		}
		q, err := strconv.ParseFloat(r[col["quantity"]], 64)
		if err != nil {
			t.Fatalf("bom.csv line %q: quantity %q", r[col["item"]], r[col["quantity"]])
		}
		out[kind] += q
	}
	return out
}

// TestNewConstructionByKind: one plan that builds every kind of new construction but a
// tunnel (testdata/newwork: a trench in turf, a directional bore, a pole line, a cable tray).
// summary.json's new_construction_m gives each kind the metres the bill of materials charges
// for it (bom.csv's lines by price key), 0 for the tunnel it does not build, its trench and
// bore add up to new_trench_m, and the terminal and report.html print the same figures; under
// --units imperial the terminal, report.html and bom.csv give them in feet converted from the
// same 0.1 m figures. A sweep of the plan gives each scenario's figures in compare.csv's
// new_construction_<kind> columns (in feet under --units imperial) and in compare.html. The
// check is of the outputs against one another, no outside source: the bill is what an
// estimator prices.
func TestNewConstructionByKind(t *testing.T) {
	t.Parallel()
	out := filepath.Join(t.TempDir(), "metric")
	stdout, msg, code := run(t, "plan", newWorkPlan, "--out", out)
	if code != exitOK {
		t.Fatalf("plan: exit %d: %s", code, msg)
	}
	read := func(dir, name string) []byte {
		data, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		return data
	}
	var sum struct {
		NewTrenchM       float64            `json:"new_trench_m"`
		NewConstructionM map[string]float64 `json:"new_construction_m"`
	}
	if err := json.Unmarshal(read(out, "summary.json"), &sum); err != nil {
		t.Fatal(err)
	}
	billed := billedByKind(t, read(out, "bom.csv"))
	kinds := []string{"trench", "bore", "aerial", "tray", "tunnel"}
	if len(sum.NewConstructionM) != len(kinds) {
		t.Errorf("new_construction_m %v: want every kind of %v", sum.NewConstructionM, kinds)
	}
	var total, totalBilled float64
	for _, k := range kinds {
		got, ok := sum.NewConstructionM[k]
		if !ok || math.Abs(got-billed[k]) > 1e-9 || (k != "tunnel") != (got > 0) {
			t.Errorf("new_construction_m.%s %v (given %v), bill of materials %v m: want equal, and above 0 but for the tunnel", k, got, ok, billed[k])
		}
		total += got
		totalBilled += billed[k]
	}
	if math.Abs(total-totalBilled) > 1e-9 || math.Abs(sum.NewConstructionM["trench"]+sum.NewConstructionM["bore"]-sum.NewTrenchM) > 1e-9 {
		t.Errorf("new construction %.1f m in all, bill %.1f m; trench and bore %.1f m, new_trench_m %.1f m", total, totalBilled,
			sum.NewConstructionM["trench"]+sum.NewConstructionM["bore"], sum.NewTrenchM)
	}
	m := sum.NewConstructionM
	line := fmt.Sprintf("new construction by kind: open-cut trench %.1f m, directional bore %.1f m, pole line %.1f m, cable tray %.1f m (the bill's lines)\n",
		m["trench"], m["bore"], m["aerial"], m["tray"])
	if !strings.Contains(stdout, line) {
		t.Errorf("terminal lacks %q:\n%s", line, stdout)
	}
	cell := fmt.Sprintf("<th>New construction by kind</th><td>open-cut trench %.1f m, directional bore %.1f m, pole line %.1f m, cable tray %.1f m <span",
		m["trench"], m["bore"], m["aerial"], m["tray"])
	if !strings.Contains(string(read(out, "report.html")), cell) {
		t.Errorf("report.html lacks %q", cell)
	}

	// Imperial: the same 0.1 m figures in feet (1 ft = 0.3048 m exactly, NIST SP 811 B.8),
	// as the bill in feet gives them.
	feet := filepath.Join(t.TempDir(), "imperial")
	stdout, msg, code = run(t, "plan", newWorkPlan, "--out", feet, "--units", "imperial")
	if code != exitOK {
		t.Fatalf("plan --units imperial: exit %d: %s", code, msg)
	}
	billedFt := billedByKind(t, read(feet, "bom.csv"))
	var parts []string
	for k, name := range map[string]string{"trench": "trench", "bore": "directional bore", "aerial": "pole line", "tray": "cable tray"} {
		ft := math.Round(m[k]/0.3048*10) / 10
		if math.Abs(billedFt[k]-ft) > 1e-9 {
			t.Errorf("bom.csv in feet: %s %v ft, want %v ft (%.1f m)", k, billedFt[k], ft, m[k])
		}
		parts = append(parts, fmt.Sprintf("%s %.1f ft", name, ft))
	}
	for _, p := range parts {
		if !strings.Contains(stdout, p) || !strings.Contains(string(read(feet, "report.html")), p) {
			t.Errorf("imperial terminal or report lacks %q:\n%s", p, stdout)
		}
	}

	// A sweep: each scenario's figures in compare.csv and compare.html.
	dir := t.TempDir()
	base, err := filepath.Abs(newWorkPlan)
	if err != nil {
		t.Fatal(err)
	}
	sweepFile := write(t, dir, "sweep.yaml", "base: "+base+"\nvary:\n  defaults.rate: [10G, 1G]\n")
	swept := filepath.Join(dir, "out")
	if _, msg, code := run(t, "sweep", sweepFile, "--out", swept, "--quiet", "--units", "imperial"); code != exitOK {
		t.Fatalf("sweep: exit %d: %s", code, msg)
	}
	rows, err := csv.NewReader(strings.NewReader(string(read(swept, "compare.csv")))).ReadAll()
	if err != nil || len(rows) != 3 {
		t.Fatalf("compare.csv: %v, %d rows", err, len(rows))
	}
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	for _, r := range rows[1:] {
		var s struct {
			NewConstructionM map[string]float64 `json:"new_construction_m"`
		}
		if err := json.Unmarshal(read(filepath.Join(swept, r[col["id"]]), "summary.json"), &s); err != nil {
			t.Fatal(err)
		}
		for _, k := range kinds {
			i, ok := col["new_construction_"+k+"_ft"]
			if want := strconv.FormatFloat(math.Round(s.NewConstructionM[k]/0.3048*10)/10, 'f', 1, 64); !ok || r[i] != want {
				t.Errorf("compare.csv %s: new_construction_%s_ft %q (column %v), want %s ft from its summary.json", r[col["id"]], k, r[i], ok, want)
			}
		}
	}
	html := strings.ReplaceAll(string(read(swept, "compare.html")), "<wbr>", "") // break chances after hyphens
	for _, h := range []string{"new construction: open-cut trench (ft)", "new construction: pole line (ft)", "new construction: cable tray (ft)"} {
		if !strings.Contains(html, h) {
			t.Errorf("compare.html lacks the column %q", h)
		}
	}
}
