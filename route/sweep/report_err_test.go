package sweep

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/route"
)

// TestReportErrInfeasible: scenarios with infeasible legs end the sweep with exit status 3
// (route.ErrInfeasible) and one sentence that says where to look, without the wrapped
// error's words repeated after it ("9 of 17 scenarios have infeasible legs: some links are
// infeasible").
func TestReportErrInfeasible(t *testing.T) {
	err := (&Report{Run: 17, Infeasible: 9}).Err()
	if !errors.Is(err, route.ErrInfeasible) {
		t.Fatalf("%v does not wrap route.ErrInfeasible", err)
	}
	msg := err.Error()
	if !strings.HasPrefix(msg, "9 of 17 scenarios have infeasible legs (") || strings.Contains(msg, route.ErrInfeasible.Error()) {
		t.Errorf("message %q", msg)
	}
	if msg := (&Report{Run: 1, Infeasible: 1}).Err().Error(); !strings.HasPrefix(msg, "1 of 1 scenario has infeasible legs") {
		t.Errorf("one scenario: %q", msg)
	}
}

// TestResumeNamesForeignFolders: a resumed sweep whose sweep file lost an axis value names
// the scenario folders it no longer has (the comparison leaves them out, silently before),
// and leaves them where they are.
func TestResumeNamesForeignFolders(t *testing.T) {
	t.Parallel()
	tmp := t.TempDir()
	prices, err := os.ReadFile(filepath.Join(fixtures, "prices-low.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(tmp, "a.yaml"), prices, 0o644)
	base, _ := filepath.Abs("../../testdata/demo/plan.yaml")
	sweepFile := filepath.Join(tmp, "s.yaml")
	load := func(hubs string) *File {
		os.WriteFile(sweepFile, []byte("base: "+base+"\nvary:\n  hub: ["+hubs+"]\n  prices: [a.yaml]\n"), 0o644)
		f, err := Load(sweepFile)
		if err != nil {
			t.Fatal(err)
		}
		return f
	}
	out := filepath.Join(tmp, "out")
	if rep := run(t, load("ADM, ENG"), Options{Out: out, Jobs: 1}); len(rep.Notes) != 0 {
		t.Errorf("first run: notes %q", rep.Notes)
	}
	f := load("ADM")
	rep := run(t, f, Options{Out: out, Jobs: 1, Resume: true})
	if len(rep.Notes) != 1 || !strings.Contains(rep.Notes[0], "1 folder in "+out+" is no scenario of this sweep") || !strings.Contains(rep.Notes[0], "eng") {
		t.Errorf("resume with an axis value dropped: notes %q", rep.Notes)
	}
	ents, _ := os.ReadDir(out)
	dirs := 0
	for _, e := range ents {
		if e.IsDir() && !strings.HasPrefix(e.Name(), ".") {
			dirs++
		}
	}
	if dirs != 2 {
		t.Errorf("%d scenario folders left, want both (the dropped one is not removed)", dirs)
	}
}
