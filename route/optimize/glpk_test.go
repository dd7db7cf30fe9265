package optimize

import (
	"bufio"
	"bytes"
	"context"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"
)

// writeMIP writes p (no diverse demands, unlimited capacity, one option per demand) as a
// fixed-charge multi-commodity flow MIP in CPLEX LP format: per demand d and edge e two arc
// variables (one per direction), flow conservation at every node, reach Σ L_e x ≤ MaxRouteM
// for reach-limited demands, and x_{d,e} ≤ y_e linking each proposed edge to its binary open
// variable y_e. Arc variables are binary for reach-limited demands; for the others they may be
// continuous, since with y fixed each such demand is a shortest-path LP, whose optimum is a
// path. The returned constant is Σ option FixedCents, which the LP objective leaves out.
//
// Charges: a binary z_k per charge with its Cents in the objective, and x_{d,e} ≤ z_k for
// every edge e of charge k (the charge is paid when any of its edges carries a route).
// Transit-free nodes: for each demand, no flow enters a transit-free node other than its
// ends (conservation then keeps flow from leaving it too). With y and z fixed each demand is
// still a shortest-path LP (a transit-free node is a node removed), so continuous arcs stay
// exact.
func writeMIP(p *Problem) (lp string, constant int64) {
	var b strings.Builder
	var bin []string
	b.WriteString("Minimize\n obj:")
	term := func(coef int64, v string) { fmt.Fprintf(&b, " + %d %s", coef, v) }
	for d, dm := range p.Demands {
		o := dm.Options[0]
		constant += o.FixedCents
		for e, ed := range p.Edges {
			if ed.Flags&o.ExcludeFlags != 0 || (ed.Proposed && !p.AllowNew) {
				continue
			}
			c := int64(math.Round(ed.LengthM*float64(o.CablePerMCents))) + int64(math.Round(ed.LengthM*float64(ed.LabourPerMCents)))
			term(c, fmt.Sprintf("f_%d_%d", d, e))
			term(c, fmt.Sprintf("b_%d_%d", d, e))
		}
	}
	for e, ed := range p.Edges {
		if ed.Proposed && p.AllowNew {
			term(ed.FixedCents, fmt.Sprintf("y_%d", e))
			bin = append(bin, fmt.Sprintf("y_%d", e))
		}
	}
	chargesOf := make([][]int, len(p.Edges))
	for k, c := range p.Charges {
		term(c.Cents, fmt.Sprintf("z_%d", k))
		bin = append(bin, fmt.Sprintf("z_%d", k))
		for _, e := range c.Edges {
			chargesOf[e] = append(chargesOf[e], k)
		}
	}
	b.WriteString("\nSubject To\n")
	for d, dm := range p.Demands {
		o := dm.Options[0]
		use := func(e int) bool {
			ed := p.Edges[e]
			return ed.Flags&o.ExcludeFlags == 0 && (!ed.Proposed || p.AllowNew)
		}
		rows := make([][]string, p.Nodes)
		in := make([][]string, len(p.NoTransit)) // arcs into each node, with transit-free nodes
		for e, ed := range p.Edges {
			if !use(e) {
				continue
			}
			f, bk := fmt.Sprintf("f_%d_%d", d, e), fmt.Sprintf("b_%d_%d", d, e)
			rows[ed.From] = append(rows[ed.From], "+ "+f, "- "+bk)
			rows[ed.To] = append(rows[ed.To], "- "+f, "+ "+bk)
			if ed.Proposed {
				fmt.Fprintf(&b, " l_%d_%d: %s + %s - y_%d <= 0\n", d, e, f, bk, e)
			}
			for _, k := range chargesOf[e] {
				fmt.Fprintf(&b, " c_%d_%d_%d: %s + %s - z_%d <= 0\n", d, e, k, f, bk, k)
			}
			if len(p.NoTransit) > 0 {
				in[ed.To] = append(in[ed.To], "+ "+f)
				in[ed.From] = append(in[ed.From], "+ "+bk)
			}
		}
		for v, terms := range in {
			if len(terms) > 0 && p.NoTransit[v] && v != dm.Source && v != dm.Target {
				fmt.Fprintf(&b, " x_%d_%d: %s = 0\n", d, v, strings.Join(terms, " "))
			}
		}
		for v := 0; v < p.Nodes; v++ {
			if len(rows[v]) == 0 {
				continue
			}
			rhs := 0
			switch v {
			case dm.Source:
				rhs = 1
			case dm.Target:
				rhs = -1
			}
			fmt.Fprintf(&b, " n_%d_%d: %s = %d\n", d, v, strings.Join(rows[v], " "), rhs)
		}
		if !math.IsInf(o.MaxRouteM, 1) {
			fmt.Fprintf(&b, " r_%d:", d)
			for e, ed := range p.Edges {
				if use(e) {
					fmt.Fprintf(&b, " + %.1f f_%d_%d + %.1f b_%d_%d", ed.LengthM, d, e, ed.LengthM, d, e)
					bin = append(bin, fmt.Sprintf("f_%d_%d", d, e), fmt.Sprintf("b_%d_%d", d, e))
				}
			}
			fmt.Fprintf(&b, " <= %.3f\n", o.MaxRouteM)
		}
	}
	b.WriteString("Binary\n")
	for _, v := range bin {
		fmt.Fprintf(&b, " %s\n", v)
	}
	b.WriteString("End\n")
	return b.String(), constant
}

// runMIPTool writes lp to a temporary file, runs bin with the arguments args makes of the LP
// and solution paths (killed limit + 30 s on), and returns the solution file's text and the
// tool's output.
func runMIPTool(t testing.TB, bin, lp string, limit time.Duration, args func(lpPath, solPath string) []string) (sol, out string) {
	t.Helper()
	dir := t.TempDir()
	lpPath, solPath := filepath.Join(dir, "model.lp"), filepath.Join(dir, "model.sol")
	if err := os.WriteFile(lpPath, []byte(lp), 0o644); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), limit+30*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, bin, args(lpPath, solPath)...)
	var buf bytes.Buffer
	cmd.Stdout, cmd.Stderr = &buf, &buf
	if err := cmd.Run(); err != nil {
		t.Fatalf("%s: %v\n%s", bin, err, buf.String())
	}
	data, err := os.ReadFile(solPath)
	if err != nil {
		t.Fatalf("%s wrote no solution: %v\n%s", bin, err, buf.String())
	}
	return string(data), buf.String()
}

// runGLPK solves the LP file with glpsol and returns the objective and whether it was proved
// optimal.
func runGLPK(t *testing.T, lp string, limit time.Duration) (obj float64, optimal bool) {
	t.Helper()
	sol, out := runMIPTool(t, "glpsol", lp, limit, func(lpPath, solPath string) []string {
		return []string{"--lp", lpPath, "--tmlim", strconv.Itoa(int(limit.Seconds())), "-w", solPath}
	})
	sc := bufio.NewScanner(strings.NewReader(sol))
	for sc.Scan() {
		fs := strings.Fields(sc.Text())
		// Solution line of glpsol's -w format for a MIP: "s mip ROWS COLS STATUS OBJ".
		if len(fs) == 6 && fs[0] == "s" && fs[1] == "mip" {
			v, err := strconv.ParseFloat(fs[5], 64)
			if err != nil {
				t.Fatalf("glpsol solution line %q: %v", sc.Text(), err)
			}
			return v, fs[4] == "o"
		}
	}
	t.Fatalf("glpsol wrote no MIP solution line\n%s", out)
	return 0, false
}

// TestGLPK compares Solve with the optimum of the same problem as a mixed-integer program
// solved by GLPK's glpsol (Debian glpk-utils), the outside reference for the fixed-charge
// search. Tolerance: Solve within 2 % of the proved optimum (this package's criterion) and
// never below it.
func TestGLPK(t *testing.T) {
	if _, err := exec.LookPath("glpsol"); err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatal("glpsol not found (apt-get install glpk-utils)")
		}
		t.Skip("glpsol not found (apt-get install glpk-utils)")
	}
	cases := []struct {
		name string
		spec campusSpec
		// turns is the number of junctions split into turn nodes with a pull-box charge;
		// with turns >= 0, buildings are transit-free and handholes are charges too (see
		// withTransitCharges). -1: the campus as built.
		turns int
	}{
		{"24 buildings", campusSpec{buildings: 24, seed: 11, options: 1, proposedPct: 12, trenchScale: 0.1}, -1},
		{"32 buildings", campusSpec{buildings: 32, seed: 12, options: 1, proposedPct: 12, trenchScale: 0.15}, -1},
		{"40 buildings", campusSpec{buildings: 40, seed: 13, options: 1, proposedPct: 10, trenchScale: 0.1}, -1},
		{"24 buildings, charges", campusSpec{buildings: 24, seed: 11, options: 1, proposedPct: 12, trenchScale: 0.1}, 3},
		{"32 buildings, charges", campusSpec{buildings: 32, seed: 12, options: 1, proposedPct: 12, trenchScale: 0.15}, 4},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			p := campus(tc.spec)
			if tc.turns >= 0 {
				p = withTransitCharges(p, tc.turns)
			}
			sol, err := Solve(p, Settings{})
			if err != nil {
				t.Fatal(err)
			}
			verify(t, tc.name, p, sol)
			lp, constant := writeMIP(p)
			start := time.Now()
			obj, optimal := runGLPK(t, lp, 40*time.Second)
			mip := int64(math.Round(obj)) + constant
			gap := 100 * float64(sol.TotalCents-mip) / float64(mip)
			t.Logf("%s: %d demands, %d edges (%d opened by Solve), %d charges (%d paid): Solve %d cents, GLPK %d cents (optimal %v, %.1f s), gap %.3f %%",
				tc.name, len(p.Demands), len(p.Edges), len(sol.Opened), len(p.Charges), len(sol.Charged), sol.TotalCents, mip, optimal, time.Since(start).Seconds(), gap)
			if tc.turns >= 0 && len(sol.Charged) == 0 {
				t.Errorf("%s: no charge paid: the case does not exercise charges", tc.name)
			}
			if !optimal {
				t.Fatalf("%s: glpsol did not prove optimality within the time limit", tc.name)
			}
			if sol.TotalCents < mip {
				t.Errorf("%s: Solve %d below the MIP optimum %d: a bug in the model or the solver", tc.name, sol.TotalCents, mip)
			}
			if gap > 2 {
				t.Errorf("%s: gap %.3f %%, want at most 2 %%", tc.name, gap)
			}
		})
	}
}

// withTransitCharges makes a campus (see campus) the way the route layer will draw one:
// every building node transit-free (routes may not run in by one lateral and out by the
// other); a handhole charge (600.00) at every node where proposed trenches meet existing duct,
// over those trenches; and turns junctions of three or more spans (not the cross-connects),
// taken in node order, split into one node per span joined by zero-length turn edges in one
// pull-box charge (450.00). Prices are invented.
func withTransitCharges(p *Problem, turns int) *Problem {
	q := clone(p)
	q.NoTransit = make([]bool, q.Nodes)
	ends := make([]bool, q.Nodes)
	for _, d := range q.Demands {
		q.NoTransit[d.Source] = true
		ends[d.Target] = true
	}
	incident := func(v int) (prop, exist []int) { return incidentEdges(q, v) }
	for v := 0; v < q.Nodes; v++ {
		if prop, exist := incident(v); len(prop) > 0 && len(exist) > 0 {
			q.Charges = append(q.Charges, Charge{ID: fmt.Sprintf("handhole %d", v), Edges: prop, Cents: 60000})
		}
	}
	nodes := q.Nodes
	for v := 0; v < nodes && turns > 0; v++ {
		prop, exist := incident(v)
		spans := append(exist, prop...)
		if ends[v] || q.NoTransit[v] || len(spans) < 3 {
			continue
		}
		turns--
		ids := []int{v}
		for _, e := range spans[1:] {
			w := q.Nodes
			q.Nodes++
			q.NoTransit = append(q.NoTransit, false)
			if q.Edges[e].From == v {
				q.Edges[e].From = w
			} else {
				q.Edges[e].To = w
			}
			ids = append(ids, w)
		}
		c := Charge{ID: fmt.Sprintf("pull box %d", v), Cents: 45000}
		for i := range ids {
			for j := i + 1; j < len(ids); j++ {
				c.Edges = append(c.Edges, len(q.Edges))
				q.Edges = append(q.Edges, Edge{ID: fmt.Sprintf("turn %d-%d", ids[i], ids[j]), From: ids[i], To: ids[j]})
			}
		}
		q.Charges = append(q.Charges, c)
	}
	return q
}

// incidentEdges returns the proposed and the existing edges that meet node v, in edge order.
func incidentEdges(p *Problem, v int) (prop, exist []int) {
	for e, ed := range p.Edges {
		if ed.From == v || ed.To == v {
			if ed.Proposed {
				prop = append(prop, e)
			} else {
				exist = append(exist, e)
			}
		}
	}
	return prop, exist
}
