package sweep

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/geo/input"
)

// TestPreflightRefusesBeforePlanning: with Options.Preflight, a sweep whose axes name a price
// book that is not there, a rate no application runs at and a hub that is no building stops
// before anything is planned or written (the output folder is not even made), with every
// problem at once, each once, at the value's line and column in the sweep file, under its
// axis or case; without it, the same sweep plans and fails those scenarios one by one (the
// behaviour the command had, which ran hours before saying so).
func TestPreflightRefusesBeforePlanning(t *testing.T) {
	t.Parallel()
	f := parseInline(t, "vary:\n"+
		"  prices: [prices-low.yaml, missing.yaml]\n"+
		"  defaults.rate: [10G, 800G]\n"+
		"cases:\n"+
		"  - {name: bad-hub, hub: NOWHERE}")
	out := filepath.Join(t.TempDir(), "out")
	rep, err := Run(context.Background(), f, Options{Out: out, Jobs: 2, Preflight: true})
	if err == nil {
		t.Fatalf("got no error (%+v), want the sweep refused", rep)
	}
	var ps *input.Problems
	if !errors.As(err, &ps) || !errors.Is(err, ErrInvalid) {
		t.Fatalf("got %T %v, want *input.Problems matching ErrInvalid", err, err)
	}
	lines := strings.Split(err.Error(), "\n")
	missing := filepath.Join(fixtures, "missing.yaml")
	abs, _ := filepath.Abs(missing)
	want := []string{
		f.Path + ":3:29: vary: prices: cannot read " + filepath.ToSlash(abs) + ": no such file or directory",
		f.Path + `:4:24: vary: defaults.rate: rate "800G": no application runs at 800G; the catalog has 1G, 10G, 25G, 40G, 100G, 400G`,
		f.Path + `:6:26: case "bad-hub": hub: want the id of a building, got "NOWHERE", which no building has`,
	}
	if strings.Join(lines, "\n") != strings.Join(want, "\n") {
		t.Errorf("got\n%s\nwant\n%s", err, strings.Join(want, "\n"))
	}
	if _, err := os.Stat(out); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("the refused sweep made its output folder (%v)", err)
	}

	rep = run(t, f, Options{Out: out, Jobs: 2})
	if rep.Failed != 2*2+1-1 {
		t.Errorf("without pre-flight: %d scenarios failed, want 4 (all but the first)", rep.Failed)
	}
}

// TestPreflightBasePlanProblem: a problem of the base plan itself (a link to a building the
// campus does not have), found in every scenario, is named once, in the base plan, by its key.
func TestPreflightBasePlanProblem(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	campus, err := filepath.Abs("../../testdata/demo/campus.geojson")
	if err != nil {
		t.Fatal(err)
	}
	base := filepath.Join(dir, "plan.yaml")
	plan := "campus: [" + campus + "]\nhub: ADM\nlinks:\n  - {to: NOSUCH}\n"
	if err := os.WriteFile(base, []byte(plan), 0o644); err != nil {
		t.Fatal(err)
	}
	f, err := Parse(filepath.Join(dir, "s.yaml"), []byte("base: plan.yaml\nvary:\n  defaults.rate: [10G, 25G]\n"))
	if err != nil {
		t.Fatal(err)
	}
	_, err = Run(context.Background(), f, Options{Out: filepath.Join(dir, "out"), Preflight: true})
	if err == nil || strings.Count(err.Error(), "\n") != 0 || !strings.HasPrefix(err.Error(), base+": links[0]") ||
		!strings.Contains(err.Error(), "NOSUCH") {
		t.Errorf("got %v, want one problem of %s at links[0] naming NOSUCH", err, base)
	}
}

// TestPreflightStops: a sweep stopped (its context done) during the pre-flight returns an
// error wrapping the context's, before planning or writing anything.
func TestPreflightStops(t *testing.T) {
	t.Parallel()
	f := parseInline(t, "vary:\n  defaults.rate: [10G, 25G]")
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	out := filepath.Join(t.TempDir(), "out")
	if _, err := Run(ctx, f, Options{Out: out, Preflight: true}); !errors.Is(err, context.Canceled) {
		t.Errorf("got %v, want context.Canceled", err)
	}
	if _, err := os.Stat(out); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("the stopped sweep made its output folder (%v)", err)
	}
}

// TestPreflightNamesScenario: a problem of another file that only some scenarios have (the
// demo campus's buildings beyond a max_lateral_m of 0.1 m, in one case) names that file, as
// `spanwright plan` would, and the scenario that has it.
func TestPreflightNamesScenario(t *testing.T) {
	t.Parallel()
	f := parseInline(t, "cases:\n  - {name: as-drawn}\n  - {name: tight, design.max_lateral_m: 0.1}")
	_, err := Run(context.Background(), f, Options{Out: filepath.Join(t.TempDir(), "out"), Preflight: true})
	if err == nil {
		t.Fatal("got no error, want the buildings no pathway reaches within 0.1 m")
	}
	tight := f.Scenarios()[1].ID
	for _, line := range strings.Split(err.Error(), "\n") {
		if !strings.Contains(line, "campus.geojson: feature #") || !strings.Contains(line, ": in scenario "+tight+": no pathway within 0.1 m") {
			t.Errorf("problem %q does not name the campus feature and the scenario %s", line, tight)
		}
	}
}

// TestPreflightMixedCurrencies: a sweep whose price books are in different currencies is
// refused before anything is planned, one problem per book naming its currency and the other
// books', since the comparison would rank a total in EUR against one in USD by its number
// (tester 5, finding 2). The same books in one currency plan.
func TestPreflightMixedCurrencies(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	low, err := os.ReadFile(filepath.Join(fixtures, "prices-low.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	eur := filepath.Join(dir, "prices-eur.yaml")
	if err := os.WriteFile(eur, []byte(strings.Replace(string(low), "currency: USD", "currency: EUR", 1)), 0o644); err != nil {
		t.Fatal(err)
	}
	f := parseInline(t, "vary:\n  prices: [prices-low.yaml, prices-high.yaml, "+eur+"]")
	out := filepath.Join(t.TempDir(), "out")
	_, err = Run(context.Background(), f, Options{Out: out, Preflight: true})
	if !errors.Is(err, ErrInvalid) {
		t.Fatalf("got %v, want the sweep refused as invalid", err)
	}
	lowPath, _ := filepath.Abs(filepath.Join(fixtures, "prices-low.yaml")) // the plan names its files absolute
	highPath, _ := filepath.Abs(filepath.Join(fixtures, "prices-high.yaml"))
	lines := strings.Split(err.Error(), "\n")
	if len(lines) != 3 {
		t.Fatalf("got %d problems, want one per price book:\n%s", len(lines), err)
	}
	for _, want := range []struct{ file, cur, other string }{
		{lowPath, "USD", eur + " in EUR"},
		{highPath, "USD", eur + " in EUR"},
		{eur, "EUR", lowPath + ", " + highPath + " in USD"},
	} {
		found := false
		for _, l := range lines {
			if strings.HasPrefix(l, want.file+": currency: this price book is in "+want.cur+", but the sweep also prices with "+want.other+";") {
				found = true
			}
		}
		if !found {
			t.Errorf("no problem of %s in %s naming %s:\n%s", want.file, want.cur, want.other, err)
		}
	}
	if _, err := os.Stat(out); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("the refused sweep made its output folder (%v)", err)
	}
	if p := mixedCurrencies(nil); p != nil {
		t.Errorf("no price books: got %v, want none", p)
	}
}
