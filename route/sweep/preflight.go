package sweep

import (
	"context"
	"errors"
	"fmt"
	"path/filepath"
	"slices"
	"strings"

	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/route"
	"spanwright/route/plan"
	"spanwright/route/site"
)

// preflight checks the inputs of every scenario of the sweep (every shard's, so that the
// tasks of an array job agree) before anything is planned or written (Options.Preflight):
// each scenario's plan as `spanwright plan` reads it, every file it names (read and hashed,
// as its inputs.sha256 will list them), its campus, its catalog, rules and price book, and
// route.Check (the hub, the links, the rates, the prices the plan needs). It returns every
// problem at once, as an *input.Problems whose every problem matches ErrInvalid, or nil.
//
// A problem that an override causes is placed at the override's value in the sweep file,
// under its axis ("vary") or case, and given once however many scenarios take that value:
//
//	sweep.yaml:4:26: vary: prices: cannot read ../../sweeps/missing.yaml: no such file or directory
//	sweep.yaml:3:24: vary: defaults.rate: rate "800G": no application runs at 800G; the catalog has …
//
// A problem of another file (a campus file, a price book an axis names) names that file, as
// `spanwright plan` would. Any other problem of a scenario's plan names the base plan and
// the key. Both are given once, with the scenarios that have them when not all do ("in
// scenario ID and 3 more").
//
// The sites and engines it builds stay in the runner's caches, so planning reuses them; a
// sweep over more campus variants than the site cache holds reads some campuses twice. When
// ctx is done it stops between two scenarios and returns an error wrapping ctx's.
func (r *runner) preflight(ctx context.Context, list []Scenario) error {
	var out input.Problems
	seen := map[string]bool{} // the texts out holds: AddNew one at a time would rebuild its set each call
	add := func(p *input.Problem) {
		p.Class = ErrInvalid
		if t := p.Error(); !seen[t] { // once, however many scenarios have it
			seen[t] = true
			out.Add(p)
		}
	}
	// Problems not placed at an override (the base plan's, another file's), by message, with
	// the scenarios that have them.
	type shared struct {
		p   *input.Problem
		ids []string
	}
	var byText []*shared
	index := map[string]*shared{}
	var books []*media.PriceBook // every price book the scenarios use, once each, in sweep order
	for _, sc := range list {
		if err := ctx.Err(); err != nil {
			return fmt.Errorf("sweep stopped while checking its scenarios, before any was planned: %w", err)
		}
		probs, book := r.checkScenario(sc)
		if book != nil && !slices.ContainsFunc(books, func(b *media.PriceBook) bool { return b.File == book.File }) {
			books = append(books, book)
		}
		for _, p := range probs {
			if p.File == r.f.Path {
				add(p) // at an override: its place names the axis or case
				continue
			}
			k := p.Error()
			sh := index[k]
			if sh == nil {
				sh = &shared{p: p}
				index[k] = sh
				byText = append(byText, sh)
			}
			sh.ids = append(sh.ids, sc.ID)
		}
	}
	for _, sh := range byText {
		which := ""
		switch n := len(sh.ids); {
		case n == len(list):
		case n == 1:
			which = "in scenario " + sh.ids[0]
		default:
			which = fmt.Sprintf("in scenario %s and %d more", sh.ids[0], n-1)
		}
		if which != "" {
			q := *sh.p // the problem may be a loader's own, shared with its cache: change a copy
			if q.Item != "" {
				which += ": " + q.Item
			}
			q.Item = which
			sh.p = &q
		}
		add(sh.p)
	}
	for _, p := range mixedCurrencies(books) {
		add(p)
	}
	out.Sort()
	return out.Err()
}

// mixedCurrencies returns, when the price books of a sweep are not all in one currency, one
// problem per book naming its currency and every other book's: the comparison ranks total
// costs against one another, and a total in USD is not cheaper than one in EUR because its
// number is smaller. nil when they agree.
func mixedCurrencies(books []*media.PriceBook) []*input.Problem {
	var curs []string // in order of first use
	byCur := map[string][]string{}
	for _, b := range books {
		if _, seen := byCur[b.Currency]; !seen {
			curs = append(curs, b.Currency)
		}
		byCur[b.Currency] = append(byCur[b.Currency], filepath.ToSlash(b.File))
	}
	if len(curs) < 2 {
		return nil
	}
	var out []*input.Problem
	for _, b := range books {
		var others []string
		for _, c := range curs {
			if c == b.Currency {
				continue
			}
			others = append(others, strings.Join(byCur[c], ", ")+" in "+c)
		}
		out = append(out, &input.Problem{File: b.File, Key: "currency", Err: input.Errorf(input.ErrBadValue,
			"this price book is in %s, but the sweep also prices with %s; a sweep ranks total costs against one another, so every price book it uses must be in one currency: convert the amounts, or sweep each currency on its own",
			b.Currency, strings.Join(others, "; "))})
	}
	return out
}

// checkScenario returns the problems of one scenario's inputs, placed as preflight says, and
// the price book its engine reads (nil when the engine could not be built).
func (r *runner) checkScenario(sc Scenario) ([]*input.Problem, *media.PriceBook) {
	planPath := filepath.Join(r.out, sc.ID, PlanFile)
	data, err := r.planYAML(sc)
	if err != nil {
		return []*input.Problem{{File: r.f.Path, Item: "scenario " + sc.ID, Err: err}}, nil
	}
	p, err := plan.ParsePlanOptions(planPath, data, plan.LoadOptions{CampusDatabase: r.opt.CampusDatabase})
	if err != nil {
		return r.blame(sc, planPath, "", err), nil
	}
	p.MaxInputBytes = r.f.MaxInputBytes
	var probs []*input.Problem
	files := []struct {
		key   string
		names []string
	}{{"campus", p.Campus}, {"catalog", []string{p.Catalog}}, {"rules", []string{p.Rules}}, {"prices", []string{p.Prices}}}
	for _, f := range files {
		for _, n := range f.names {
			if n == "" {
				continue
			}
			if _, err := r.hash(p.Path(n)); err != nil {
				err = fmt.Errorf("cannot read %s: %w", filepath.ToSlash(p.Path(n)), input.Cause(err))
				probs = append(probs, r.blame(sc, planPath, f.key, err)...)
			}
		}
	}
	if len(probs) > 0 {
		return probs, nil // the loaders would only say it again
	}
	l, err := r.load(p)
	st := l.site
	if err != nil {
		probs = append(probs, r.blame(sc, planPath, "campus", err)...)
		// The hub and links on the buildings that did read, in the same run (tester 14 F8).
		for _, e := range site.CheckNames(l.read, err, p) {
			probs = append(probs, r.blame(sc, planPath, "", e)...)
		}
	}
	eng, err := r.engine(p)
	if err != nil {
		probs = append(probs, r.blame(sc, planPath, "", err)...)
		// A book that lacks only prices the catalog needs hides nothing else: the checks
		// that need an engine run on one that must never plan (plan.CheckEngine), as
		// `spanwright plan` runs them.
		if ce, cerr := plan.CheckEngine(p); ce != nil && cerr != nil {
			if st != nil {
				probs = append(probs, r.blame(sc, planPath, "", route.Check(st, p, ce))...)
			} else {
				for _, e := range p.CheckRates(ce.Catalog()) {
					probs = append(probs, r.blame(sc, planPath, "", e)...)
				}
			}
		}
		return probs, nil
	}
	if len(probs) > 0 { // the campus's: the plan's rates can still be checked on the catalog
		for _, e := range p.CheckRates(eng.Catalog()) {
			probs = append(probs, r.blame(sc, planPath, "", e)...)
		}
		return probs, eng.PriceBook()
	}
	return r.blame(sc, planPath, "", route.Check(st, p, eng)), eng.PriceBook()
}

// blame places the problems of err, found in scenario sc's plan (at planPath), as preflight
// says; key is the plan key a problem that names none is about ("" for none).
func (r *runner) blame(sc Scenario, planPath, key string, err error) []*input.Problem {
	if err == nil {
		return nil
	}
	var list []*input.Problem
	var ps *input.Problems
	var p *input.Problem
	switch {
	case errors.As(err, &ps) && error(ps) == err:
		list = ps.List
	case errors.As(err, &p) && error(p) == err:
		list = []*input.Problem{p}
	default:
		list = []*input.Problem{{File: planPath, Key: key, Err: err}}
	}
	out := make([]*input.Problem, 0, len(list))
	for _, q := range list {
		if q.File != planPath && q.File != "" {
			out = append(out, q) // a problem of another file names it
			continue
		}
		k := q.Key
		if k == "" {
			k = key
		}
		if o, ok := overrideOf(sc, k); ok {
			out = append(out, &input.Problem{File: r.f.Path, Line: o.node.Line, Col: o.node.Column, Item: sc.where(),
				Key: o.Key, Err: q.Err, Value: q.Value})
			continue
		}
		out = append(out, &input.Problem{File: r.f.Base, Item: q.Item, Key: k, Err: q.Err, Value: q.Value})
	}
	return out
}

// overrideOf is the override of sc that sets plan key k, or a section holding it, or a key
// inside it.
func overrideOf(sc Scenario, k string) (Override, bool) {
	if k == "" {
		return Override{}, false
	}
	for _, o := range sc.Set {
		if o.Key == k || strings.HasPrefix(k, o.Key+".") || strings.HasPrefix(k, o.Key+"[") || strings.HasPrefix(o.Key, k+".") {
			return o, true
		}
	}
	return Override{}, false
}
