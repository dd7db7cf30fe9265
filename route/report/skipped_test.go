package report

import (
	"bytes"
	"context"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/output"
	"spanwright/route/plan"
)

// TestSkippedNotServed (tester 13's finding A): a building whose link the plan skips, and
// that no link comes from, is not served: the report's buildings table says "not served
// (link skipped)" and check counts it as skipped, not served, naming it.
func TestSkippedNotServed(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolveJSON(t, testsite.PullCampus(100, 2), func(p *plan.Plan) {
		p.Links = []plan.LinkSpec{{From: "A", To: "C", Skip: true}}
	})
	if err != nil {
		t.Fatal(err)
	}
	page, err := Plan(context.Background(), r, Options{})
	if err != nil {
		t.Fatal(err)
	}
	html := string(page)
	for _, want := range []string{"<tr><td>B</td><td></td><td>served</td></tr>", "<tr><td>C</td><td></td><td>not served (link skipped)</td></tr>"} {
		if !strings.Contains(html, want) {
			t.Errorf("buildings table lacks %q", want)
		}
	}
	rep := r.Site.Check(r.Hub)
	if err := route.CheckPlan(r.Site, r.Plan, &rep); err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	if err := output.PrintCheck(&out, rep, output.WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	if line, _, _ := strings.Cut(out.String(), "\n"); line != "buildings   3 (mc 1, ic 0, served 1, skipped 1: C)" {
		t.Errorf("check: %q, want B served and C skipped", line)
	}
}
