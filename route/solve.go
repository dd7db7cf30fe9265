package route

import (
	"context"
	"errors"
	"fmt"
	"sort"
	"strconv"
	"strings"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/route/optimize"
)

// Leg names.
const (
	LegPrimary = "primary"
	LegDiverse = "diverse"
)

// Leg is one routed cable of a link: the primary, or the diverse second route.
type Leg struct {
	Link     *Link
	Name     string     // LegPrimary or LegDiverse
	Steps    []geo.Step // spans from the served building's access junction to the cross-connect's
	Pathways []string   // pathway IDs in travel order, each once
	RouteM   float64    // along pathways, laterals at both ends included, in metres
	LateralM float64    // the laterals alone, in metres
	RiserM   float64    // risers at both ends, in metres
	Feasible bool
	Reason   string // why the leg is infeasible, or notes

	// The medium decision, filled by the media rule engine.
	Medium        string       // catalog medium id, e.g. "os2"; "" when infeasible
	Application   string       // IEEE 802.3 PHY, e.g. "10GBASE-LR"
	Construction  string       // cable construction id
	Inside        string       // with an entrance transition: the listed construction spliced on at both entrances; "" without
	StrandsCable  int          // strands (or copper pairs) of the cable installed, after growth and rounding
	Losses        []media.Loss // per wavelength, fibre only
	WorstMarginDB float64      // smallest loss margin over the operating wavelengths; 0 for copper
	Choice        string       // the rule engine's reason for the medium
	Rejected      []media.Rejection

	// Cable is the leg's cable takeoff: slack loops, length bought, reels and the mid-span
	// splices between them, which the loss budget counts (see CableTakeoff).
	Cable CableTakeoff

	Cost LegCost
}

// LegCost breaks down what one leg costs, in integer cents of the price book's currency: its
// bill items (legItems) priced one by one, and its share of new construction.
type LegCost struct {
	CableCents        int64 // cable material, entrance transitions and reel joins
	LabourCents       int64 // installation labour: pulls, splicing, terminating, testing
	ConstructionCents int64 // innerduct, and this leg's share of new trench it opens and of added duct
	OpticsCents       int64 // terminations, patch cords and transceivers
}

// TotalCents is the sum of the breakdown.
func (c LegCost) TotalCents() int64 {
	return c.CableCents + c.LabourCents + c.ConstructionCents + c.OpticsCents
}

// Result is a planned scenario: its links, their legs, and what was noticed on the way.
type Result struct {
	Plan     *Plan
	Site     *Site
	Hub      string
	Links    []Link
	Legs     []Leg
	Warnings []string

	Currency string // the price book's ISO currency code
	// ExtraCents is plan-level cost not carried by any leg (for example markups); the
	// plan's total is the legs' totals plus ExtraCents.
	ExtraCents int64

	Engine *media.Engine // the engine that chose the media
	Opened []string      // proposed spans the plan builds, by span ID
	Fill   []SegmentFill // duct fill of every span that carries cable, by span ID
	// ObjectiveCents is the optimizer's objective for the routes it returned
	// (optimize.Solution.TotalCents): see the README's "One cost model".
	ObjectiveCents int64

	// Estimate is the installation takeoff and priced bill of materials (see Estimate).
	Estimate *Estimate
}

// ErrInfeasible is returned, wrapped in an *InfeasibleError, when a plan finished but some
// links could not be served.
var ErrInfeasible = errors.New("some links are infeasible")

// InfeasibleError lists the legs a finished plan could not serve.
type InfeasibleError struct{ Legs []string }

func (e *InfeasibleError) Error() string {
	return fmt.Sprintf("%d infeasible link legs: %v", len(e.Legs), e.Legs)
}

func (e *InfeasibleError) Unwrap() error { return ErrInfeasible }

// Infeasible returns an *InfeasibleError naming every infeasible leg, or nil.
func (r *Result) Infeasible() error {
	var names []string
	for _, l := range r.Legs {
		if !l.Feasible {
			names = append(names, l.Link.ID+"/"+l.Name+": "+l.Reason)
		}
	}
	if len(names) == 0 {
		return nil
	}
	return &InfeasibleError{Legs: names}
}

// Hub resolves the plan's hub: the plan's hub, else the building with role mc.
func (s *Site) Hub(p *Plan) (string, error) {
	hub := p.Hub
	if hub == "" {
		hub = s.MainCrossConnect()
		if hub == "" {
			return "", p.Problem("hub", input.Errorf(input.ErrMissingKey, "missing; no building has role mc to be the hub"))
		}
	}
	if _, ok := s.building[hub]; !ok {
		return "", p.Problem("hub", input.Errorf(input.ErrBadValue, "want the id of a building, got %q, which no building has", hub))
	}
	return hub, nil
}

// Engine builds the media rule engine of a plan: its catalog, rules and price book (the
// embedded defaults where the plan names none) and its design options.
func Engine(p *Plan) (*media.Engine, error) {
	var cat *media.Catalog
	var rules *media.Rules
	var prices *media.PriceBook
	var errs []error
	// read reads a file the plan names under the plan's cap, and parses it.
	read := func(name string, parse func(string, []byte) error) {
		path := p.Path(name)
		data, err := input.ReadFile(path, input.Cap(p.MaxInputBytes, input.DefaultTextMiB))
		if err == nil {
			err = parse(path, data)
		} else {
			err = &input.Problem{File: path, Err: fmt.Errorf("read: %w", input.Cause(err))}
		}
		if err != nil {
			errs = append(errs, err)
		}
	}
	if p.Catalog != "" {
		read(p.Catalog, func(path string, data []byte) (err error) { cat, err = media.ParseCatalog(path, data); return err })
	}
	if p.Rules != "" {
		read(p.Rules, func(path string, data []byte) (err error) { rules, err = media.ParseRules(path, data); return err })
	}
	if p.Prices != "" {
		read(p.Prices, func(path string, data []byte) (err error) { prices, err = media.ParsePriceBook(path, data); return err })
	}
	if len(errs) > 0 {
		return nil, problems(errs)
	}
	return media.NewEngine(cat, rules, prices, EngineOptions(p))
}

// EngineOptions are the options of a plan's media engine, from its design section: with
// the catalog, rule and price files, all that Engine reads.
func EngineOptions(p *Plan) media.EngineOptions {
	return media.EngineOptions{LossMarginDB: p.Design.LossMarginDB, AllowOutdoorCopper: p.Design.AllowOutdoorCopper,
		PairLossDB: p.Design.PairLossDB, SpliceLossDB: p.Design.SpliceLossDB}
}

// Solve plans p on the site with the plan's own engine (see Engine).
func Solve(ctx context.Context, s *Site, p *Plan) (*Result, error) {
	eng, err := Engine(p)
	if err != nil {
		return nil, err
	}
	return SolveWith(ctx, s, p, eng)
}

// SolveWith plans p on the site: resolves the hub and links, checks that every building
// served can reach the hub, routes every leg and chooses its medium with the optimizer and
// the engine. Input problems come back together as one error; infeasible legs do not stop
// the plan (see Result.Infeasible). When ctx is done, the optimizer, the media choice and
// the estimate stop within a step and SolveWith returns ctx's error and no result.
func SolveWith(ctx context.Context, s *Site, p *Plan, eng *media.Engine) (*Result, error) {
	hub, err := s.Hub(p)
	if err != nil {
		return nil, err
	}
	links, errs := s.Links(p, hub)
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	cat := eng.Catalog()
	errs = append(errs, p.checkRates(cat)...)
	if un := s.unreachableServed(hub, links); len(un) > 0 {
		errs = append(errs, p.Problem("hub", input.Errorf(geo.ErrUnreachable, "%d buildings cannot reach the hub %q through the pathway network: %q", len(un), hub, un)))
	}
	cm, err := newCostModel(eng, p.Design)
	if err != nil {
		errs = append(errs, err)
	}
	if len(errs) > 0 {
		return nil, problems(errs)
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	prob, infos, err := s.problem(cm, links)
	if err != nil {
		return nil, err
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	sol, err := s.solve(ctx, prob, optimize.Settings{Objective: p.Design.Objective})
	if err != nil {
		if ctx.Err() != nil {
			return nil, ctx.Err()
		}
		return nil, fmt.Errorf("route: optimizer: %w", err)
	}
	r := &Result{Plan: p, Site: s, Hub: hub, Links: links, Currency: eng.PriceBook().Currency, Engine: eng}
	for _, w := range s.Net.Warnings {
		r.Warnings = append(r.Warnings, w.File+": "+w.Feature+": "+w.Message)
	}
	r.ObjectiveCents = sol.TotalCents
	for _, e := range sol.Opened {
		r.Opened = append(r.Opened, s.Net.Spans[e].ID)
	}
	r.Fill = s.fillReport(prob, sol)
	infeasible := map[int]string{}
	for _, in := range sol.Infeasible {
		infeasible[in.Demand] = cm.explain(in)
	}
	for i := range links {
		if err := stopEvery(ctx, i); err != nil {
			return nil, err
		}
		r.Legs = append(r.Legs, s.legsOf(cm, prob, &sol.Routes[i], &r.Links[i], infos[i], infeasible[i])...)
	}
	if err := r.estimate(ctx); err != nil {
		return nil, err
	}
	return r, nil
}

// legsOf turns the optimizer's route of one link into its legs, with media and costs.
func (s *Site) legsOf(cm *costModel, prob *optimize.Problem, rt *optimize.Route, l *Link, info demandInfo, why string) []Leg {
	from, to := s.access[l.To], s.access[l.From]
	base := Leg{Link: l, RiserM: info.facts.RiserM, LateralM: from.LateralM + to.LateralM, StrandsCable: info.strands}
	primary := base
	primary.Name = LegPrimary
	if !rt.Feasible {
		primary.Reason = why
		if primary.Reason == "" {
			primary.Reason = "no route and medium satisfy the rules"
		}
		if len(info.excluded) > 0 {
			primary.Reason += "; before routing: " + strings.Join(info.excluded, "; ")
		}
		legs := []Leg{primary}
		if l.Diverse {
			d := base
			d.Name, d.Reason = LegDiverse, "the primary leg is infeasible"
			legs = append(legs, d)
		}
		return legs
	}
	s.fillLeg(cm, &primary, rt.Primary, rt.Medium, info)
	primary.Cost.ConstructionCents += rt.Cost.ConstructionShareCents + rt.Cost.AddedDuctCents
	legs := []Leg{primary}
	if l.Diverse {
		d := base
		d.Name = LegDiverse
		if len(rt.Secondary.Hops) > 0 {
			s.fillLeg(cm, &d, rt.Secondary, rt.Medium, info)
		} else {
			d.Reason = "no diverse route: " + s.singlePoint(prob, rt)
		}
		legs = append(legs, d)
	}
	return legs
}

// fillLeg sets a leg's route and its medium from the rule engine on the route's own facts;
// the estimate prices it (Result.quantities).
func (s *Site) fillLeg(cm *costModel, leg *Leg, ol optimize.Leg, medium string, info demandInfo) {
	leg.RouteM = leg.LateralM
	emi := geo.EMINone
	outdoor := leg.LateralM > 0
	plenum := false
	types := map[string]bool{}
	seen := map[string]bool{}
	for _, h := range ol.Hops {
		sp := &s.Net.Spans[h.Edge]
		leg.Steps = append(leg.Steps, geo.Step{SpanID: sp.ID, Reverse: !h.Forward})
		leg.RouteM += sp.LengthM
		if !seen[sp.PathwayID] {
			seen[sp.PathwayID] = true
			leg.Pathways = append(leg.Pathways, sp.PathwayID)
		}
		types[sp.Type] = true
		plenum = plenum || sp.Plenum
		if sp.Type != geo.TypeTray {
			outdoor = true
		}
		if emiRank[sp.EMI] > emiRank[emi] {
			emi = sp.EMI
		}
	}
	facts := info.facts
	facts.RouteM = leg.RouteM
	facts.MaxEMI = emi
	facts.Outdoor = outdoor
	facts.Plenum = plenum
	for t := range types {
		facts.PathwayTypes = append(facts.PathwayTypes, t)
	}
	sort.Strings(facts.PathwayTypes)
	// The installation's slack loops and reel joins go into the loss budget.
	leg.Cable = s.takeoff(cm.design, leg)
	facts.SlackM, facts.Splices = leg.Cable.SlackM(), facts.Splices+leg.Cable.Joins
	ch := cm.eng.Choose(facts)
	leg.Rejected = ch.Rejected
	leg.Choice = ch.Reason
	if !ch.Feasible {
		leg.Reason = ch.Reason
		return
	}
	leg.Feasible = true
	leg.Cable.fit(cm.eng.Catalog(), ch, leg.RiserM, cm.design.WastePct)
	leg.Medium, leg.Application, leg.Construction, leg.Inside = ch.Medium, ch.Application, ch.Construction, ch.Inside
	leg.Losses = ch.Losses
	leg.WorstMarginDB = worstMargin(ch.Losses)
	if ch.Medium != medium {
		leg.Choice += fmt.Sprintf(" (the optimizer routed it for %s)", medium)
	}
}

// legCost prices a leg's bill items one by one (media.PriceBook.Cents) into its breakdown:
// cables, transitions and reel joins as cable; terminations, patch cords and transceivers
// as optics; labour; innerduct as construction.
func legCost(p *media.PriceBook, qs []media.Quantity) LegCost {
	var c LegCost
	for _, q := range qs {
		x := p.Cents(q)
		switch {
		case q.Category == media.CategoryLabour:
			c.LabourCents += x
		case q.Category == media.CategoryOptics, q.Price.Item == media.PriceTermination, q.Price.Item == media.PricePatchCord:
			c.OpticsCents += x
		case q.Price.Item == media.PriceInnerduct, q.Category == media.CategoryConstruction:
			c.ConstructionCents += x
		default:
			c.CableCents += x
		}
	}
	return c
}

var emiRank = map[string]int{geo.EMINone: 0, geo.EMILow: 1, geo.EMIHigh: 2}

// worstMargin is the smallest margin over the operating wavelengths, 0 when none.
func worstMargin(ls []media.Loss) float64 {
	w, any := 0.0, false
	for _, l := range ls {
		if !l.Operating {
			continue
		}
		if !any || l.MarginDB < w {
			w, any = l.MarginDB, true
		}
	}
	return w
}

// singlePoint says in words what keeps a diverse link from two independent routes.
func (s *Site) singlePoint(prob *optimize.Problem, rt *optimize.Route) string {
	sp := rt.SinglePoint
	if sp == nil {
		if rt.Note != "" {
			return rt.Note
		}
		return "no second route found"
	}
	var what string
	switch sp.Kind {
	case optimize.PointEdge:
		what = fmt.Sprintf("every route uses span %s (pathway %s)", s.Net.Spans[sp.Index].ID, s.Net.Spans[sp.Index].PathwayID)
	case optimize.PointNode:
		what = fmt.Sprintf("every route passes junction %s", s.Net.Junctions[sp.Index].ID)
	case optimize.PointGroup:
		what = fmt.Sprintf("every route found shares the shared-risk group %s", s.groupName(prob, sp.Index))
	}
	if !sp.Separates && sp.Kind == optimize.PointGroup {
		what += " (a heuristic finding: group-disjoint routing is NP-hard)"
	}
	return what
}

func (s *Site) groupName(prob *optimize.Problem, g int) string {
	for i, e := range prob.Edges {
		if e.Group == g {
			return s.Net.Spans[i].Group
		}
	}
	return strconv.Itoa(g)
}

// SegmentFill is the duct fill of one span that carries cable.
type SegmentFill struct {
	Span           string
	PathwayID      string
	Cables         int
	Limited        bool // false: unlimited capacity (proposed, tunnel, tray, aerial, buried)
	Ducts          int
	AddedDucts     int
	UsedAreaMM2    float64
	AllowedAreaMM2 float64
}

func (s *Site) fillReport(prob *optimize.Problem, sol *optimize.Solution) []SegmentFill {
	out := make([]SegmentFill, 0, len(sol.Fill))
	for _, f := range sol.Fill {
		sp := &s.Net.Spans[f.Edge]
		out = append(out, SegmentFill{Span: sp.ID, PathwayID: sp.PathwayID, Cables: f.Cables, Limited: f.Limited,
			Ducts: f.Ducts, AddedDucts: f.AddedDucts, UsedAreaMM2: f.UsedAreaMM2, AllowedAreaMM2: f.AllowedAreaMM2})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].Span < out[j].Span })
	return out
}

// unreachableServed lists the buildings at either end of a link that cannot reach the hub.
func (s *Site) unreachableServed(hub string, links []Link) []string {
	un := s.Unreachable(hub)
	need := map[string]bool{}
	for _, l := range links {
		need[l.From], need[l.To] = true, true
	}
	var out []string
	for _, b := range un {
		if need[b] {
			out = append(out, b)
		}
	}
	return out
}
