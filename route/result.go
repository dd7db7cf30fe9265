package route

import (
	"context"
	"errors"
	"fmt"
	"slices"
	"strings"

	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/route/escape"
	"spanwright/route/estimate"
	"spanwright/route/plan"
	"spanwright/route/routing"
	"spanwright/route/site"
)

// Result is a planned scenario: its links, their legs, and what was noticed on the way.
type Result struct {
	Plan  *plan.Plan
	Site  *site.Site
	Hub   string
	Links []site.Link
	// Notes are the plan's own notes (plan.Plan.Notes: what a sweep changed in a scenario's
	// plan, such as a link entry carried to another hub), then what of the plan's entries was
	// left out, and why: a link entry for a building that is this plan's hub (as a sweep's
	// scenario over the hub makes it); then a warm start's notes.
	Notes    []string
	Legs     []routing.Leg // the legs of every link in link order; each points into Links
	Warnings []string
	// Shown are the warnings, among Warnings, that the plan's terminal prints in full, the
	// others being counted there: those that say a number the plan is made with may be wrong
	// by a unit or a few per cent, or is a default taken for a property spelt wrong, which can
	// turn what the plan serves and how many cables a duct takes (tester 15 F4, verify 18 V9):
	// the campus's slips (geo.Warning.Slip, as check prints them) and the duct sizes whose jam verdict turns on their inside diameter
	// (estimate.Estimate.JamWarnings). They speak of the campus's own figures in the units of
	// its keys ("duct_mm" is 4 mm; 100 mm reads as a nominal size), so every output gives them
	// as written, in either units.
	Shown []string

	Currency string // the price book's ISO currency code
	// ExtraCents is plan-level cost not carried by any leg (for example markups); the
	// plan's total is the legs' totals plus ExtraCents.
	ExtraCents int64

	Engine *media.Engine // the engine that chose the media
	Opened []string      // proposed spans the plan builds, by span ID
	// Handholes are the handholes the plan adds at junctions without a structure (routing).
	Handholes []routing.Handhole
	Fill      []routing.SegmentFill // duct fill of every span that carries cable, by span ID
	// ObjectiveCents is the optimizer's objective for the routes it returned
	// (optimize.Solution.TotalCents): see the README's "One cost model".
	ObjectiveCents int64
	// LowerBoundCents is a proved lower bound on ObjectiveCents over every plan that serves the
	// same legs (routing.Routed.LowerBoundCents); -1 when none was computed (length objective).
	LowerBoundCents int64
	// CrossingAvoidedCents is what keeping diverse legs off junctions where ducts cross with
	// no structure costs by that objective, all such links together
	// (routing.Routed.CrossingAvoidedCents).
	CrossingAvoidedCents int64

	// Estimate is the installation takeoff and priced bill of materials (see Estimate).
	Estimate *estimate.Estimate
	// Cautions are the safety cautions the plan calls for (cautionsOf), computed once here
	// for every output that shows them.
	Cautions []Caution

	// StartedFrom names where the optimizer's search began (routing.Start.From: an earlier
	// plan's folder, a sweep's base scenario); "" for a plan solved from scratch.
	StartedFrom string
	// ProblemSHA256 is routing.Routed.ProblemSHA256: the fingerprint of the routing problem
	// when these routes are its plan from scratch, else "" (routes.geojson's problem_sha256).
	ProblemSHA256 string
}

// ErrInfeasible is returned, wrapped in an *InfeasibleError, when a plan finished but some
// links could not be served.
var ErrInfeasible = errors.New("some links are infeasible")

// InfeasibleError lists the legs a finished plan could not serve.
type InfeasibleError struct {
	Legs []string // "link/leg: reason", as Result.InfeasibleLegs gives them
	// Listed says the legs were printed already (the terminal summary, output.PrintSummary):
	// the error then counts them and points there instead of printing them again.
	Listed bool
}

// Error counts the legs and lists them (InfeasibleList), or with Listed says they are
// listed above.
func (e *InfeasibleError) Error() string {
	head := "1 infeasible link leg"
	if len(e.Legs) != 1 {
		head = fmt.Sprintf("%d infeasible link legs", len(e.Legs))
	}
	if e.Listed {
		return head + ", listed above"
	}
	return head + ":\n" + strings.TrimSuffix(InfeasibleList(e.Legs), "\n")
}

// InfeasibleList is the one text of a list of infeasible legs on the terminal: one indented
// line per leg (escape.Terminal: an id or reason cannot add a line), at most ShownInfeasible
// of them and a line counting the rest, each line ending in a line feed. A large campus can
// have dozens, each with a long reason; links.csv has every leg with its reason (column
// reason).
func InfeasibleList(legs []string) string {
	var b strings.Builder
	for i, l := range legs {
		if i == ShownInfeasible {
			fmt.Fprintf(&b, "  and %d more; links.csv lists every leg with its reason\n", len(legs)-i)
			break
		}
		b.WriteString("  " + escape.Terminal(l) + "\n")
	}
	return b.String()
}

// ShownInfeasible is the most infeasible legs InfeasibleList names.
const ShownInfeasible = 10

func (e *InfeasibleError) Unwrap() error { return ErrInfeasible }

// InfeasibleLegs names every infeasible leg with its reason, "link/leg: reason", in the
// order of the legs.
func (r *Result) InfeasibleLegs() []string {
	var names []string
	for _, l := range r.Legs {
		if !l.Feasible {
			names = append(names, l.Label()+": "+l.Reason)
		}
	}
	return names
}

// Infeasible returns an *InfeasibleError naming every infeasible leg, or nil.
func (r *Result) Infeasible() error {
	names := r.InfeasibleLegs()
	if len(names) == 0 {
		return nil
	}
	return &InfeasibleError{Legs: names}
}

// Solve plans p on the site with the plan's own engine (see plan.Engine).
func Solve(ctx context.Context, s *site.Site, p *plan.Plan) (*Result, error) {
	eng, err := plan.Engine(p)
	if err != nil {
		return nil, err
	}
	return SolveWith(ctx, s, p, eng)
}

// SolveWith plans p on the site: resolves the hub and links, checks that every building
// served can reach the hub, routes every leg and chooses its medium (package routing), and
// estimates and prices the installation (package estimate). Input problems come back together
// as one error; infeasible legs do not stop the plan (see Result.Infeasible). When ctx is
// done, the optimizer, the media choice and the estimate stop within a step and SolveWith
// returns ctx's error and no result.
func SolveWith(ctx context.Context, s *site.Site, p *plan.Plan, eng *media.Engine) (*Result, error) {
	return SolveFrom(ctx, s, p, eng, nil)
}

// SolveFrom is SolveWith with the optimizer's search begun from an earlier plan's routes
// (routing.SolveFrom); nil start is SolveWith, and so is a start with WherePays where it does
// not pay (routing.StartPays). The result records where it started (StartedFrom, "" when it
// did not) and, in a note, the links whose earlier routes no longer fit and were placed
// afresh.
func SolveFrom(ctx context.Context, s *site.Site, p *plan.Plan, eng *media.Engine, start *routing.Start) (*Result, error) {
	pr, err := prepare(s, p, eng)
	if err != nil {
		return nil, err
	}
	hub, links := pr.hub, pr.links
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	rt, err := routing.SolveFrom(ctx, s, pr.model, links, start)
	if err != nil {
		return nil, err
	}
	if !rt.Started {
		start = nil // not worth it (routing.Start.WherePays): planned from scratch
	}
	if start != nil && rt.StartSame {
		pr.notes = append(pr.notes, fmt.Sprintf("started from the routes of %s, a plan of this same routing problem (every route cost, rule and reach the optimizer sees is the same): this plan is that problem's own plan from scratch, as that one was, not a search from its routes", start.From))
	} else if start != nil {
		pr.notes = append(pr.notes, startNote(start, hub, links, rt.StartUnused, rt.StartNoRoom)...)
	}
	r := &Result{Plan: p, Site: s, Hub: hub, Links: links, Legs: rt.Legs, Currency: eng.PriceBook().Currency, Engine: eng,
		Opened: rt.Opened, Handholes: rt.Handholes, Fill: rt.Fill, ObjectiveCents: rt.ObjectiveCents, LowerBoundCents: rt.LowerBoundCents,
		CrossingAvoidedCents: rt.CrossingAvoidedCents, Notes: pr.notes}
	if start != nil {
		r.StartedFrom = start.From
	}
	r.ProblemSHA256 = rt.ProblemSHA256
	for _, w := range s.Net.Warnings {
		r.Warnings = append(r.Warnings, w.File+": "+w.Feature+": "+w.Message)
		if w.Slip {
			r.Shown = append(r.Shown, r.Warnings[len(r.Warnings)-1])
		}
	}
	r.Warnings = append(r.Warnings, pr.warnings...)
	r.Warnings = append(r.Warnings, rt.Warnings...)
	r.cutOff(s.UnreachableServed(hub, links))
	e, err := estimate.Build(ctx, estimate.Input{Site: s, Plan: p, Engine: eng, Legs: r.Legs, Fill: r.Fill, Opened: r.Opened, Handholes: r.Handholes,
		Runs: rt.Runs, Entrances: rt.Entrances})
	if err != nil {
		return nil, err
	}
	r.Estimate = e
	r.Cautions = cautionsOf(r)
	r.Warnings = append(r.Warnings, e.Warnings...)
	r.Shown = append(r.Shown, e.JamWarnings...)
	if e.BudgetWarning != "" {
		r.Warnings = append(r.Warnings, e.BudgetWarning)
	}
	return r, nil
}

// Check runs every check of SolveWith that comes before routing — the hub, the links and
// their buildings, the rates, the prices the plan needs — and returns their problems
// together, as SolveWith would; nil when the plan can be routed.
func Check(s *site.Site, p *plan.Plan, eng *media.Engine) error {
	_, err := prepare(s, p, eng)
	return err
}

// CheckPlan adds to rep, the campus's check report, what plan p finds before routing: the
// buildings whose links it skips (Site.SkippedFor); of the
// buildings reached only through another, those its links meet (Site.ThroughFor: one
// served from an ic it reaches directly is fine); with allow_new_trench false, the buildings
// reached only over proposed pathways; and the diverse links that can have no second route
// (NoDiverse); with turn_handholes false, the links only routes turning where no structure
// stands join (TurnsOnly); and the warning plan gives when its hub overrides the campus's mc
// (site.HubOverride). It returns the problems plan would reject p for (Check), with or
// without a hub.
func CheckPlan(s *site.Site, p *plan.Plan, rep *site.CheckReport) error {
	if w := s.HubOverride(p); w != "" && rep.Hub == p.Hub {
		rep.Warnings = append(rep.Warnings, w)
	}
	if rep.Hub != "" {
		if links, _, errs := s.Links(p, rep.Hub); len(errs) == 0 {
			s.SkippedFor(rep, links)
			if len(rep.ThroughOnly) > 0 || len(rep.Unreachable) > 0 {
				s.ThroughFor(rep, links) // bad links are Check's to report
				s.ServedFor(rep, links)
			}
		}
	}
	if rep.Hub != "" && !p.Design.AllowNewTrench {
		rep.OnlyProposed = s.OnlyOverProposed(rep.Hub)
	}
	eng, err := plan.Engine(p)
	switch {
	case err != nil:
	case rep.Hub != "":
		if rep.NoDiverse, err = NoDiverse(s, p, eng); err == nil {
			rep.TurnsOnly, err = TurnsOnly(s, p, eng)
		}
	default:
		err = Check(s, p, eng) // no hub: its problem is among plan's
	}
	return err
}

// NoDiverse lists the diverse links of the plan that can have no second route however the
// plan routes them (routing.NoDiverse: one lateral only, or every route through one span,
// junction or shared-risk group such as one trench), one line each, in link order: the
// building the link serves, then its diverse leg and the reason plan gives that leg,
// "building B, L-1/diverse: no diverse route: …". Plan then finishes with that leg
// infeasible (ErrInfeasible); check says so beforehand. It returns Check's error when the
// plan has a problem Check finds.
func NoDiverse(s *site.Site, p *plan.Plan, eng *media.Engine) ([]string, error) {
	return linkReasons(s, p, eng, routing.NoDiverse, func(l site.Link) string { return l.ID + "/" + routing.LegDiverse })
}

// linkReasons resolves the plan on the site and gives, in link order, one line for each link
// find has a reason for: the building the link serves, the link or leg (name) and the reason.
func linkReasons(s *site.Site, p *plan.Plan, eng *media.Engine,
	find func(*site.Site, *routing.Model, []site.Link) (map[int]string, error), name func(site.Link) string) ([]string, error) {
	prep, err := prepare(s, p, eng)
	if err != nil {
		return nil, err
	}
	why, err := find(s, prep.model, prep.links)
	if err != nil {
		return nil, err
	}
	var out []string
	for i, l := range prep.links {
		if r, ok := why[i]; ok {
			out = append(out, fmt.Sprintf("building %s, %s: %s", l.To, name(l), r))
		}
	}
	return out, nil
}

// TurnsOnly lists, given design.turn_handholes: false, the links whose ends only routes that
// change pathway at a junction without a structure join (routing.TurnsOnly, from the problem
// plan routes on), one line each, in link order: the building the link serves, the link and
// the reason, "building B, L: every route between A and B turns …". Plan then finishes with
// those legs infeasible (ErrInfeasible); check says so beforehand. Nil with the setting on; it
// returns Check's error when the plan has a problem Check finds.
func TurnsOnly(s *site.Site, p *plan.Plan, eng *media.Engine) ([]string, error) {
	if p.Design.TurnHandholes {
		return nil, nil
	}
	return linkReasons(s, p, eng, routing.TurnsOnly, func(l site.Link) string { return l.ID })
}

// prepared is a plan resolved on a site, ready to route.
type prepared struct {
	hub   string
	links []site.Link
	notes []string // what was dropped of the plan's entries, and why
	model *routing.Model
	// warnings are the plan's own warnings, given beside the campus's: the buildings no
	// pathway joins and no link needs (site.Site.Unjoined), its hub overriding the campus's
	// mc (site.HubOverride).
	warnings []string
}

// prepare resolves the plan's hub and links on the site and builds its cost model; every
// problem comes back together as one error.
func prepare(s *site.Site, p *plan.Plan, eng *media.Engine) (prepared, error) {
	hub, err := s.Hub(p)
	var links []site.Link
	var notes []string
	var errs []error
	if err != nil {
		// The links cannot be resolved without their hub; their buildings and rates can be
		// checked all the same, so that every problem comes out in one run.
		errs = append([]error{err}, s.UnknownBuildings(p)...)
	} else {
		links, notes, errs = s.Links(p, hub)
	}
	notes = append(slices.Clone(p.Notes), notes...) // the plan's own first (plan.Plan.Notes)
	var warnings []string
	if err == nil {
		var unjoined []error
		unjoined, warnings = s.Unjoined(hub, links)
		errs = append(errs, unjoined...)
	}
	if w := s.HubOverride(p); w != "" {
		warnings = append(warnings, w)
	}
	errs = append(errs, p.CheckRates(eng.Catalog())...)
	model := routing.NewModel(eng, p.Design)
	if err := model.CheckPrices(s, links); err != nil {
		errs = append(errs, err) // every price routing asks and the book lacks, with the other problems
	}
	if len(errs) > 0 {
		var l input.Problems
		for _, e := range errs {
			l.Add(e)
		}
		l.Sort()
		return prepared{}, l.Err()
	}
	return prepared{hub: hub, links: links, notes: notes, model: model, warnings: warnings}, nil
}

// Design is the plan's design, or the defaults for a result with no plan.
func (r *Result) Design() plan.Design {
	if r.Plan == nil {
		return plan.Default.Design
	}
	return r.Plan.Design
}

// Inputs lists the files the plan read, which outputs must never overwrite.
func (r *Result) Inputs() []string {
	in := []string{r.Plan.File}
	in = append(in, r.Site.Campus.Files...)
	for _, f := range []string{r.Plan.Catalog, r.Plan.Rules, r.Plan.Prices} {
		if f != "" {
			in = append(in, r.Plan.Path(f))
		}
	}
	return in
}

// cutOff gives every leg the optimizer could not route because the network keeps its two
// buildings apart — one is cut off from the other, or reaches it only through buildings routes
// may not cross — the reason that names what to fix (site.Site.Apart), in place of the media's
// reasons, and warns once per building cut off from the hub. The rest of the plan stands.
func (r *Result) cutOff(buildings []string) {
	for _, b := range buildings {
		r.Warnings = append(r.Warnings, r.Site.CutOff(b, r.Hub))
	}
	for i := range r.Legs {
		l := &r.Legs[i]
		if l.Feasible || (l.Name == routing.LegDiverse && l.Reason == routing.PrimaryInfeasible) {
			continue
		}
		if why, apart := r.Site.Apart(l.Link.To, l.Link.From); apart {
			l.Reason, l.Choice, l.Rejected = why, "", nil
		}
	}
}

// warmSearchNote ends the note on a start with a route for none of the plan's links: every
// link is placed afresh, but the search is still a warm start's (the optimizer's Settings.Start
// is given: no second start from scratch, no perturbation phase), so the plan is not the one
// `spanwright plan` makes alone; both lie above the same proved lower bound (tester 10's
// finding 10: 2 % apart, either way, with gaps of 16-21 %).
const warmSearchNote = "searched as a warm start is (no second start from scratch, no perturbation phase: README, \"Warm start\"), " +
	"so the plan may be cheaper or dearer than the one `spanwright plan` makes alone, within its gap to the proved lower bound"

// startNoteLinks is how many links a start note names before it counts the rest.
const startNoteLinks = 10

// startNote is the note on the links whose start routes were placed afresh (none when every
// route fitted), or, when the start has a route for none of the plan's links (another
// campus's or another plan's folder, or a plan from another hub, as a sweep that varies the
// hub starts from), the note that it was no start at all and why. noRoom of the unused were
// placed afresh for a duct with no room (routing.Routed.StartNoRoom), which the note counts.
func startNote(start *routing.Start, hub string, links []site.Link, unused []string, noRoom int) []string {
	if !start.KeepsRoute(links) && len(links) > 0 {
		// A link's ID starts with its cross-connect end (site.Link.ID): when none of the
		// start's starts with one of this plan's, the start was planned from another hub.
		sameEnd := slices.ContainsFunc(start.Legs, func(sl routing.StartLeg) bool {
			return slices.ContainsFunc(links, func(l site.Link) bool { return strings.HasPrefix(sl.Link, l.From+"-") })
		})
		if !sameEnd && len(start.Legs) > 0 {
			return []string{fmt.Sprintf("started from the routes of %s, whose links leave another cross-connect than this plan's (hub %s): it has a route for none of this plan's links, and every link was placed afresh; %s", start.From, hub, warmSearchNote)}
		}
		return []string{fmt.Sprintf("started from the routes of %s, which has a route for none of this plan's links (its links differ from this plan's: another plan or campus?): every link was placed afresh; %s", start.From, warmSearchNote)}
	}
	if len(unused) == 0 {
		return nil
	}
	shown, more := input.Shown(unused, startNoteLinks)
	names := strings.Join(shown, ", ") + more
	what := fmt.Sprintf("%d links' routes there no longer fit this plan and were placed afresh", len(unused))
	if len(unused) == 1 {
		what = "1 link's route there no longer fits this plan and was placed afresh"
	}
	switch {
	case noRoom == 0:
	case noRoom == len(unused):
		what += ", for a duct with no room"
	default:
		what += fmt.Sprintf(", %d of them for a duct with no room", noRoom)
	}
	return []string{fmt.Sprintf("started from the routes of %s: %s: %s", start.From, what, names)}
}
