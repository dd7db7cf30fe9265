// Package metamorphic_test holds spanwright's metamorphic tests: small changes of input that
// mean nothing (a millimetre, a renamed id, another feature order, a file split, a pathway
// split at a vertex, another number of cores) must not change the answer beyond what they
// mean. The campuses come from campusgen, generated inside the tests.
package metamorphic_test

import (
	"bytes"
	"context"
	"fmt"
	"regexp"
	"slices"
	"sort"
	"strings"
	"testing"
	"testing/fstest"

	"spanwright/route"
	"spanwright/route/internal/campusgen"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/report"
	"spanwright/route/routing"
	"spanwright/route/site"
)

// scenario is one generated campus with its plan.
type scenario struct {
	seed  uint64
	files map[string][]byte // campus files by name
	plan  string            // plan YAML; campus: lists the files
}

// planYAML is the plan used on generated campuses: every building linked to its nearest
// cross-connect, a few diverse links, and design keys given as extra YAML.
func planYAML(c *campusgen.Campus, files []string, design string) string {
	var diverse []string
	for _, id := range c.IDs {
		if strings.HasPrefix(id, "B") && !strings.Contains(id, "-") && id != c.Hub && len(diverse) < 3 {
			diverse = append(diverse, fmt.Sprintf("  - {to: %s, redundancy: diverse}", id))
		}
	}
	var b strings.Builder
	fmt.Fprintf(&b, "name: generated\ncampus: [%s]\nhub: %s\nbudget: 500000\n", strings.Join(files, ", "), c.Hub)
	b.WriteString("defaults: {rate: 10G, strands: 12, growth: 0.5, redundancy: none}\n")
	if len(diverse) > 0 {
		b.WriteString("links:\n" + strings.Join(diverse, "\n") + "\n")
	}
	if design != "" {
		b.WriteString("design: {" + design + "}\n")
	}
	return b.String()
}

func newScenario(seed uint64, buildings int) (*campusgen.Campus, scenario) {
	c := campusgen.Generate(seed, campusgen.Options{Buildings: buildings})
	return c, scenario{seed: seed, files: map[string][]byte{"campus.geojson": campusgen.GeoJSON(c.Features)},
		plan: planYAML(c, []string{"campus.geojson"}, "")}
}

// outputs plans sc and renders every output file in memory, report.html included.
func outputs(t *testing.T, sc scenario) (map[string][]byte, *route.Result) {
	t.Helper()
	fsys := fstest.MapFS{}
	for name, data := range sc.files {
		fsys[name] = &fstest.MapFile{Data: data}
	}
	p, err := plan.ParsePlan("plan.yaml", []byte(sc.plan))
	if err != nil {
		t.Fatalf("seed %d: plan: %v", sc.seed, err)
	}
	site, err := site.Load(context.Background(), fsys, p.Campus, site.Options{SnapM: p.Design.SnapM, MaxLateralM: p.Design.MaxLateralM})
	if err != nil {
		t.Fatalf("seed %d: campus: %v", sc.seed, err)
	}
	res, err := route.Solve(context.Background(), site, p)
	if err != nil {
		t.Errorf("seed %d: solve: %v", sc.seed, err)
	}
	files, err := output.Files(context.Background(), res, output.WriteOptions{Units: output.UnitsMetric})
	if err != nil {
		t.Fatalf("seed %d: outputs: %v", sc.seed, err)
	}
	rep, err := report.File(context.Background(), res, report.Options{Units: output.UnitsMetric})
	if err != nil {
		t.Fatalf("seed %d: report: %v", sc.seed, err)
	}
	out := map[string][]byte{}
	for _, f := range append(files, rep) {
		out[f.Name] = f.Data
	}
	return out, res
}

// legKey names a leg by its link and leg name.
func legKey(l *routing.Leg) string { return l.Link.ID + "/" + l.Name }

// verdicts is each leg's feasibility and medium.
func verdicts(res *route.Result) map[string]string {
	v := map[string]string{}
	for i := range res.Legs {
		l := &res.Legs[i]
		if l.Feasible {
			v[legKey(l)] = l.Medium
		} else {
			v[legKey(l)] = "infeasible"
		}
	}
	return v
}

// sameVerdicts reports the legs whose verdict differs.
func diffVerdicts(a, b map[string]string) []string {
	var d []string
	for k, va := range a {
		if vb := b[k]; vb != va {
			d = append(d, fmt.Sprintf("%s: %s → %s", k, va, vb))
		}
	}
	for k, vb := range b {
		if _, ok := a[k]; !ok {
			d = append(d, fmt.Sprintf("%s: absent → %s", k, vb))
		}
	}
	sort.Strings(d)
	return d
}

// where is the place a warning gives for a feature: its file and index. Another feature
// order or file split moves a feature, and its warning rightly says where it now is; the
// comparisons of whole outputs leave that out and compare everything else.
var where = regexp.MustCompile(`[\w./-]+\.geojson: #\d+ \(`)

// diffFiles names the first line that differs in each output file, with the places that
// warnings give left out.
func diffFiles(a, b map[string][]byte) []string {
	var d []string
	names := make([]string, 0, len(a))
	for n := range a {
		names = append(names, n)
	}
	slices.Sort(names)
	for _, n := range names {
		x, y := where.ReplaceAll(a[n], []byte("(")), where.ReplaceAll(b[n], []byte("("))
		if bytes.Equal(x, y) {
			continue
		}
		al, bl := strings.Split(string(x), "\n"), strings.Split(string(y), "\n")
		for i := 0; i < len(al) || i < len(bl); i++ {
			var x, y string
			if i < len(al) {
				x = al[i]
			}
			if i < len(bl) {
				y = bl[i]
			}
			if x != y {
				d = append(d, fmt.Sprintf("%s:%d\n  was: %.300s\n  now: %.300s", n, i+1, x, y))
				break
			}
		}
	}
	return d
}
