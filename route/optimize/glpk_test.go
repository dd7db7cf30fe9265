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
	b.WriteString("\nSubject To\n")
	for d, dm := range p.Demands {
		o := dm.Options[0]
		use := func(e int) bool {
			ed := p.Edges[e]
			return ed.Flags&o.ExcludeFlags == 0 && (!ed.Proposed || p.AllowNew)
		}
		rows := make([][]string, p.Nodes)
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

// runGLPK solves the LP file with glpsol and returns the objective and whether it was proved
// optimal.
func runGLPK(t *testing.T, lp string, limit time.Duration) (obj float64, optimal bool) {
	t.Helper()
	dir := t.TempDir()
	lpPath, solPath := filepath.Join(dir, "model.lp"), filepath.Join(dir, "model.sol")
	if err := os.WriteFile(lpPath, []byte(lp), 0o644); err != nil {
		t.Fatal(err)
	}
	ctx, cancel := context.WithTimeout(context.Background(), limit+30*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, "glpsol", "--lp", lpPath, "--tmlim", strconv.Itoa(int(limit.Seconds())), "-w", solPath)
	var out bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &out
	if err := cmd.Run(); err != nil {
		t.Fatalf("glpsol: %v\n%s", err, out.String())
	}
	f, err := os.Open(solPath)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
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
	t.Fatalf("glpsol wrote no MIP solution line\n%s", out.String())
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
	}{
		{"24 buildings", campusSpec{buildings: 24, seed: 11, options: 1, proposedPct: 12, trenchScale: 0.1}},
		{"32 buildings", campusSpec{buildings: 32, seed: 12, options: 1, proposedPct: 12, trenchScale: 0.15}},
		{"40 buildings", campusSpec{buildings: 40, seed: 13, options: 1, proposedPct: 10, trenchScale: 0.1}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			p := campus(tc.spec)
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
			t.Logf("%s: %d demands, %d edges (%d opened by Solve): Solve %d cents, GLPK %d cents (optimal %v, %.1f s), gap %.3f %%",
				tc.name, len(p.Demands), len(p.Edges), len(sol.Opened), sol.TotalCents, mip, optimal, time.Since(start).Seconds(), gap)
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
