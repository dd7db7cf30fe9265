package route

import (
	"context"
	"errors"
	"fmt"
	"math"

	"spanwright/geo"
	"spanwright/media"
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
	StrandsCable  int          // strands (or copper pairs) of the cable installed, after growth and rounding
	Losses        []media.Loss // per wavelength, fibre only
	WorstMarginDB float64      // smallest loss margin over the operating wavelengths; 0 for copper
	Choice        string       // the rule engine's reason for the medium
	Rejected      []media.Rejection

	Cost LegCost
}

// LegCost breaks down what one leg costs, in integer cents of the price book's currency.
type LegCost struct {
	CableCents        int64 // cable material
	LabourCents       int64 // installation labour along the route
	ConstructionCents int64 // this leg's share of new trench it opens, and of added duct
	OpticsCents       int64 // terminations and transceivers
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

	Currency   string  // the price book's ISO currency code
	NewTrenchM float64 // metres of proposed pathway the plan opens
	// ExtraCents is plan-level cost not carried by any leg (for example markups); the
	// plan's total is the legs' totals plus ExtraCents.
	ExtraCents int64
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
			return "", &PlanError{File: p.File, Key: "hub", Err: fmt.Errorf("%w: no hub named and no building has role mc", ErrPlan)}
		}
	}
	if _, ok := s.building[hub]; !ok {
		return "", &PlanError{File: p.File, Key: "hub", Err: fmt.Errorf("%w: unknown building %q", ErrPlan, hub)}
	}
	return hub, nil
}

// Solve plans p on the site: resolves the hub and links, checks that every building served
// can reach the hub, and routes every leg. Input problems come back together as one error;
// infeasible legs do not stop the plan (see Result.Infeasible).
func Solve(ctx context.Context, s *Site, p *Plan) (*Result, error) {
	hub, err := s.Hub(p)
	if err != nil {
		return nil, err
	}
	links, errs := s.Links(p, hub)
	if un := s.unreachableServed(hub, links); len(un) > 0 {
		errs = append(errs, &PlanError{File: p.File, Key: "hub", Err: fmt.Errorf("%w: %d buildings cannot reach the hub %q through the pathway network: %v", geo.ErrUnreachable, len(un), hub, un)})
	}
	if len(errs) > 0 {
		return nil, &ErrorList{Errs: errs}
	}
	r := &Result{Plan: p, Site: s, Hub: hub, Links: links}
	for _, w := range s.Net.Warnings {
		r.Warnings = append(r.Warnings, w.File+": "+w.Feature+": "+w.Message)
	}
	g := NewGraph(s.Net) // a private copy: diverse routing changes weights
	for i := range r.Links {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		r.Legs = append(r.Legs, s.routeLink(g, &r.Links[i])...)
	}
	return r, nil
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

// routeLink routes the legs of one link on length: the shortest path, and for a diverse
// link the shortest path that shares no span with the first.
func (s *Site) routeLink(g *Graph, l *Link) []Leg {
	from, to := s.access[l.To], s.access[l.From]
	riser := s.building[l.To].RiserM + s.building[l.From].RiserM
	names := []string{LegPrimary}
	if l.Diverse {
		names = append(names, LegDiverse)
	}
	g.SetWeight(func(sp *geo.Span) float64 { return sp.LengthM })
	var legs []Leg
	for _, name := range names {
		leg := Leg{Link: l, Name: name, RiserM: riser, LateralM: from.LateralM + to.LateralM}
		steps, ok := s.shortestPath(g, from.Junction, to.Junction)
		if !ok {
			leg.Reason = "no path through the pathway network"
			if name == LegDiverse {
				leg.Reason = "no second route that shares no pathway span with the primary"
			}
			legs = append(legs, leg)
			continue
		}
		leg.Feasible = true
		leg.Steps = steps
		leg.RouteM = leg.LateralM
		seen := map[string]bool{}
		for _, st := range steps {
			sp, _ := s.Net.Span(st.SpanID)
			leg.RouteM += sp.LengthM
			if !seen[sp.PathwayID] {
				seen[sp.PathwayID] = true
				leg.Pathways = append(leg.Pathways, sp.PathwayID)
			}
		}
		legs = append(legs, leg)
		// Exclude the primary's spans before looking for the diverse leg.
		used := map[string]bool{}
		for _, st := range steps {
			used[st.SpanID] = true
		}
		g.SetWeight(func(sp *geo.Span) float64 {
			if used[sp.ID] {
				return math.Inf(1)
			}
			return sp.LengthM
		})
	}
	return legs
}
