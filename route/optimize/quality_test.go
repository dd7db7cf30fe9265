package optimize

import (
	"fmt"
	"math"
	"os"
	"os/exec"
	"strconv"
	"strings"
	"testing"
	"time"
)

// qualitySpec is one generated instance of the quality test: a campus (see campus) of
// buildings buildings with proposedPct % of its edges proposed and trench priced at ratio
// times the cable and labour of one cable per metre.
type qualitySpec struct {
	buildings, proposedPct int
	ratio                  float64
	seed                   uint64
}

// qualityCampus builds the instance: campus with one medium per demand and no reach limit, no
// diverse demands and unlimited ducts (the MILP of writeMIP models neither), its trench prices scaled so that
// the median trench costs ratio times one cable's cable and labour per metre.
func qualityCampus(q qualitySpec) *Problem {
	// campus prices trench at 9000–28000 cents a metre plus 1500.00 a span, times
	// trenchScale; a cable pays about 400 cents of cable and 800 of labour a metre.
	const trenchPerM, cablePerM = 16000.0, 1200.0
	p := campus(campusSpec{buildings: q.buildings, seed: q.seed, options: 1, proposedPct: q.proposedPct,
		trenchScale: q.ratio * cablePerM / trenchPerM})
	// No reach limit: every demand is routable, and with y fixed each demand of the MILP is a
	// shortest-path LP (writeMIP keeps its arcs continuous), which keeps CBC's solves short.
	// The reach searches have their own exact tests (rcsp_test.go, oracle_test.go).
	for d := range p.Demands {
		p.Demands[d].Options[0].MaxRouteM = math.Inf(1)
	}
	return p
}

// qualitySpecs returns n instances spread over 100–300 buildings, 10–30 % proposed and
// trench/cable price ratios from 2 to 200 (log-spaced), seeded from first.
func qualitySpecs(n int, first uint64, maxBuildings int) []qualitySpec {
	var out []qualitySpec
	for i := 0; i < n; i++ {
		f := float64(i) / float64(max(n-1, 1))
		b := 100 + int(float64(maxBuildings-100)*math.Mod(f*2.618, 1))
		out = append(out, qualitySpec{
			buildings:   b,
			proposedPct: 10 + int(20*math.Mod(f*1.618, 1)),
			ratio:       2 * math.Pow(100, f),
			seed:        first + uint64(i),
		})
	}
	return out
}

// cbcPath returns the path of CBC (Debian coinor-cbc), failing under CI when it is missing and
// skipping elsewhere.
func cbcPath(t testing.TB) string {
	p, err := exec.LookPath("cbc")
	if err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatal("cbc not found (apt-get install coinor-cbc)")
		}
		t.Skip("cbc not found (apt-get install coinor-cbc)")
	}
	return p
}

// runCBC solves the LP file with COIN-OR CBC and returns the objective and whether CBC proved
// it optimal (its solution file starts "Optimal - objective value V").
func runCBC(t testing.TB, lp string, limit time.Duration) (obj float64, optimal bool) {
	t.Helper()
	sol, out := runMIPTool(t, cbcPath(t), lp, limit, func(lpPath, solPath string) []string {
		return []string{lpPath, "sec", strconv.Itoa(int(limit.Seconds())), "threads", "1", "ratio", "0", "allowableGap", "0", "solve", "solu", solPath}
	})
	line, _, _ := strings.Cut(sol, "\n")
	i := strings.LastIndex(line, "objective value")
	if i < 0 {
		t.Fatalf("cbc solution line %q: no objective value\n%s", line, out)
	}
	v, err := strconv.ParseFloat(strings.TrimSpace(line[i+len("objective value"):]), 64)
	if err != nil {
		t.Fatalf("cbc solution line %q: %v", line, err)
	}
	return v, strings.HasPrefix(line, "Optimal")
}

// qualityRow is one instance's figures.
type qualityRow struct {
	name                 string
	plan, bound, optimum int64
	optimal              bool
}

// TestQualityAgainstCBC solves generated campuses of 100–300 buildings (10–30 % proposed,
// trench/cable ratios 2–200) with Solve and as a MILP with COIN-OR CBC (Debian coinor-cbc),
// and checks bound ≤ optimum ≤ plan (the bound is Solution.LowerBoundCents) and the plan's
// gap to the proved optimum: mean at most 0.1 %, worst at most 0.5 % (issue 16's targets).
// make test runs qualityQuick; SPANWRIGHT_SOAK_QUALITY=n runs n instances of qualitySpecs
// instead (make soak: 24).
func TestQualityAgainstCBC(t *testing.T) {
	cbcPath(t)
	specs, limit := qualityQuick, 300*time.Second
	if n, _ := strconv.Atoi(os.Getenv("SPANWRIGHT_SOAK_QUALITY")); n > 0 {
		limit = 1800 * time.Second // CBC takes minutes on some campuses of 120 buildings
		most := 300                // SPANWRIGHT_SOAK_QUALITY_BUILDINGS lowers the largest campus
		if m, _ := strconv.Atoi(os.Getenv("SPANWRIGHT_SOAK_QUALITY_BUILDINGS")); m >= 100 {
			most = m
		}
		specs = qualitySpecs(n, 1700, most)
	}
	rows := make([]qualityRow, len(specs))
	for i, q := range specs {
		name := fmt.Sprintf("b%d_p%d_r%.1f_s%d", q.buildings, q.proposedPct, q.ratio, q.seed)
		t.Run(name, func(t *testing.T) {
			p := qualityCampus(q)
			sol, err := Solve(p, Settings{})
			if err != nil {
				t.Fatal(err)
			}
			verify(t, name, p, sol)
			lp, constant := writeMIP(p)
			start := time.Now()
			obj, optimal := runCBC(t, lp, limit)
			opt := int64(math.Round(obj)) + constant
			rows[i] = qualityRow{name, sol.TotalCents, sol.LowerBoundCents, opt, optimal}
			t.Logf("%s: %d edges, %d demands, %d opened: plan %d, bound %d, CBC %d (optimal %v, %.1f s): plan gap %.4f %%, bound gap %.4f %%",
				name, len(p.Edges), len(p.Demands), len(sol.Opened), sol.TotalCents, sol.LowerBoundCents, opt, optimal,
				time.Since(start).Seconds(), pct(sol.TotalCents, opt), pct(opt, sol.LowerBoundCents))
			if !optimal {
				t.Fatalf("%s: CBC did not prove optimality within its time limit", name)
			}
			if sol.TotalCents < opt {
				t.Errorf("%s: plan %d below the proved optimum %d: a bug in the model or the solver", name, sol.TotalCents, opt)
			}
			if sol.LowerBoundCents > opt {
				t.Errorf("%s: bound %d above the proved optimum %d: the bound is wrong", name, sol.LowerBoundCents, opt)
			}
		})
	}
	var sum, worst float64
	var n, exact int
	for _, r := range rows {
		if !r.optimal {
			continue
		}
		g := pct(r.plan, r.optimum)
		sum += g
		worst = max(worst, g)
		n++
		if r.plan == r.optimum {
			exact++
		}
	}
	if n == 0 {
		return
	}
	t.Logf("%d instances: mean gap %.4f %%, worst %.4f %%, %d optimal", n, sum/float64(n), worst, exact)
	if mean := sum / float64(n); mean > 0.1 {
		t.Errorf("mean gap to the optimum %.4f %%, want at most 0.1 %%", mean)
	}
	if worst > 0.5 {
		t.Errorf("worst gap to the optimum %.4f %%, want at most 0.5 %%", worst)
	}
}

// qualityQuick are the instances make test runs: a campus of 100 buildings that CBC proves in
// a few seconds (with dearer trench or more buildings it takes CBC one to several minutes:
// those run under make soak).
var qualityQuick = []qualitySpec{
	{buildings: 100, proposedPct: 10, ratio: 2, seed: 1600},
}

// pct returns (a − b) / b in percent.
func pct(a, b int64) float64 {
	if b == 0 {
		return 0
	}
	return 100 * float64(a-b) / float64(b)
}
