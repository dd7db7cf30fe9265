package sweep

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/output"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// TestSharedPartsSameAsAlone: a sweep's scenarios share one site and what it remembers
// across their price books (the optimizer's solutions, pull plans, reaches and whether each
// laying may carry each link, media.ReachMemo), so each scenario planned with what the ones
// before it left there must equal the same scenario planned alone, on a site of its own:
// summary.json byte for byte. The books differ in labour prices, and in one the 12-strand
// single-mode indoor/outdoor cable is dearer than the 24 (200 strands with the demo's growth,
// 300, then buy 288 + 24, not 288 + 12: the fact `cable` the rules read, which the shared memo
// keys); the strands axis asks for one cable and for two. The project's rule: same inputs,
// same bytes.
func TestSharedPartsSameAsAlone(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	low, err := os.ReadFile(filepath.Join(fixtures, "prices-low.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	const cheap12 = "indoor-outdoor: {12: 2.02, 24: 3.26," // single-mode's, the demo's cable
	if !bytes.Contains(low, []byte(cheap12)) {
		t.Fatalf("prices-low.yaml has no %q", cheap12)
	}
	dear12 := bytes.Replace(low, []byte(cheap12), []byte("indoor-outdoor: {12: 9.02, 24: 3.26,"), 1)
	if err := os.WriteFile(filepath.Join(dir, "prices-dear12.yaml"), dear12, 0o644); err != nil {
		t.Fatal(err)
	}
	base, err := filepath.Abs("../../testdata/demo/plan.yaml")
	if err != nil {
		t.Fatal(err)
	}
	lowPath, _ := filepath.Abs(filepath.Join(fixtures, "prices-low.yaml"))
	highPath, _ := filepath.Abs(filepath.Join(fixtures, "prices-high.yaml"))
	sweepFile := filepath.Join(dir, "sweep.yaml")
	body := "base: " + base + "\nvary:\n  prices: [" + lowPath + ", " + highPath + ", prices-dear12.yaml]\n  defaults.strands: [12, 200]\n"
	if err := os.WriteFile(sweepFile, []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	f, err := Load(sweepFile)
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	run(t, f, Options{Out: out, Jobs: 2})
	checked := 0
	for _, sc := range f.Scenarios() {
		folder := filepath.Join(out, sc.ID)
		swept, err := os.ReadFile(filepath.Join(folder, SummaryFile))
		if err != nil {
			t.Fatalf("%s: %v", sc.ID, err)
		}
		p, err := plan.LoadPlan(filepath.Join(folder, PlanFile))
		if err != nil {
			t.Fatal(err)
		}
		files, opt, _ := siteOf(p)
		s, err := site.Load(context.Background(), nil, files, opt) // a site of its own: nothing remembered
		if err != nil {
			t.Fatal(err)
		}
		res, err := route.Solve(context.Background(), s, p)
		if err != nil {
			t.Fatalf("%s alone: %v", sc.ID, err)
		}
		outs, err := output.Files(context.Background(), res, output.WriteOptions{})
		if err != nil {
			t.Fatal(err)
		}
		for _, o := range outs {
			if o.Name == SummaryFile {
				checked++
				if !bytes.Equal(o.Data, swept) {
					t.Errorf("%s: summary.json planned alone differs from the sweep's:\nalone %s\nswept %s", sc.ID, o.Data, swept)
				}
			}
		}
		if strings.Contains(sc.ID, "strands-200") {
			// The books pick the two cables differently: the memo's key must tell them apart.
			bom, err := os.ReadFile(filepath.Join(folder, "bom.csv"))
			if err != nil {
				t.Fatal(err)
			}
			has12 := bytes.Contains(bom, []byte("cable os2 indoor-outdoor, 12 strands"))
			has24 := bytes.Contains(bom, []byte("cable os2 indoor-outdoor, 24 strands"))
			if dear := strings.Contains(sc.ID, "dear12"); has12 == dear || has24 != dear {
				t.Errorf("%s: 12-strand cable bought %v, 24-strand %v: want 288 + 24 where the 12 is dear, else 288 + 12", sc.ID, has12, has24)
			}
		}
	}
	if checked != len(f.Scenarios()) || checked != 6 {
		t.Fatalf("checked %d summaries of %d scenarios, want 6", checked, len(f.Scenarios()))
	}
}
