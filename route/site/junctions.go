package site

import (
	"errors"
	"fmt"
	"slices"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/route/plan"
)

// JunctionsOf lists the junction IDs along steps: the start, then the end of every step.
func (s *Site) JunctionsOf(steps []geo.Step) []string {
	if len(steps) == 0 {
		return nil
	}
	out := make([]string, 0, len(steps)+1)
	for i, st := range steps {
		sp, _ := s.Net.Span(st.SpanID)
		from, to := sp.From, sp.To
		if st.Reverse {
			from, to = to, from
		}
		if i == 0 {
			out = append(out, from)
		}
		out = append(out, to)
	}
	return out
}

// LoopStructure reports whether a junction gets a slack loop: a maintenance hole or handhole.
func (s *Site) LoopStructure(id string) bool {
	j, ok := s.Net.Junction(id)
	return ok && j.Kind == geo.JunctionStructure &&
		(j.StructureType == geo.StructureMaintenanceHole || j.StructureType == geo.StructureHandhole)
}

// IsStructure reports whether junction id is a structure (a maintenance hole, handhole,
// pull box or vault).
func (s *Site) IsStructure(id string) bool {
	j, ok := s.Net.Junction(id)
	return ok && j.Kind == geo.JunctionStructure
}

// Hub resolves the plan's hub: the plan's hub, else the building with role mc.
func (s *Site) Hub(p *plan.Plan) (string, error) {
	hub := p.Hub
	if hub == "" {
		hub = s.MainCrossConnect()
		if hub == "" {
			return "", p.Problem("hub", input.Errorf(input.ErrMissingKey, "missing; no building has role mc to be the hub"))
		}
	}
	if _, ok := s.building[hub]; !ok {
		return "", p.Problem("hub", input.Errorf(input.ErrBadValue, "want the id of a building, got %q, which no building has%s",
			hub, s.Campus.BuildingHint(hub)))
	}
	return hub, nil
}

// CheckNames checks what the plan names of a campus read with problems, campusErr (rd, the
// buildings that did read: site.LoadRead): the hub and the buildings of the links, as Check
// finds them (Hub, UnknownBuildings), so that a run reports them beside the campus's problems
// and not one run later (tester 14 F8). An id of a feature read without a kind (rd.Unsure)
// may be a building's, and is taken as one. A plan without a hub takes the campus's mc: that
// none has role mc is said only when every feature's kind is known and no building's role
// has a problem of its own (a misspelt "MC" is that building's problem, not the plan's, and
// so is a role given under "ROLE": rd.RoleUnread). Nil for a nil rd.
func CheckNames(rd *geo.Partial, campusErr error, p *plan.Plan) []error {
	if rd == nil {
		return nil
	}
	s := &Site{Campus: &geo.Campus{Buildings: rd.Buildings}, building: make(map[string]*geo.Building, len(rd.Buildings)+len(rd.Unsure))}
	for i := range rd.Buildings {
		s.building[rd.Buildings[i].ID] = &rd.Buildings[i]
	}
	for _, id := range rd.Unsure {
		if s.building[id] == nil {
			s.building[id] = &geo.Building{ID: id}
		}
	}
	var errs []error
	if _, err := s.Hub(p); err != nil && (p.Hub != "" || len(rd.Unsure) == 0 && !rd.RoleUnread && !roleProblem(campusErr)) {
		errs = append(errs, err)
	}
	return append(errs, s.UnknownBuildings(p)...)
}

// roleProblem reports whether err holds a problem of a feature's role property.
func roleProblem(err error) bool {
	var ps *input.Problems
	if !errors.As(err, &ps) {
		return false
	}
	return slices.ContainsFunc(ps.List, func(q *input.Problem) bool { return q.Key == geo.PropRole })
}

// HubOverride is the warning when the plan's hub (p.Hub) is not the campus's building with
// role mc: two sources name the main cross-connect, and the plan's wins, so the mc building
// is planned as a served building (or as whatever the plan's links make it). "" when they
// agree, or when either names none.
func (s *Site) HubOverride(p *plan.Plan) string {
	mc := s.MainCrossConnect()
	if p == nil || p.Hub == "" || mc == "" || mc == p.Hub {
		return ""
	}
	return fmt.Sprintf("the plan's hub %s replaces %s, the campus's building with role mc: %s is planned as any other building (drop its role mc, or the plan's hub, to say one main cross-connect)",
		p.Hub, mc, mc)
}

// UnreachableServed lists the buildings at either end of a link that cannot reach the hub.
func (s *Site) UnreachableServed(hub string, links []Link) []string {
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

// JoinsNetwork reports whether an opened span ending at junction j gets a handhole there: j
// is a junction without a structure that is not a building's entrance, where the new pathway
// joins others or branches, not one where it carries on: inside a run of new construction
// (InRun), or where two pieces of new pathway of another type meet alone, as a proposed
// direct-buried pathway drawn as two features (common practice, no published source). Nor
// where only aerial spans meet (a pole) or only tunnels and trays (geo.Meeting.Open): new
// strand is attached to the pole, new tray or tunnel joined to the old, with no handhole.
func (s *Site) JoinsNetwork(j string) bool {
	jn, ok := s.Net.Junction(j)
	if !ok || jn.Kind != geo.JunctionNode || s.entrance[j] || s.InRun(j) {
		return false
	}
	if m, ok := s.Net.MeetingAt(j); ok && m.Open {
		return false
	}
	k, ok := s.junction[j]
	return !ok || s.carried == nil || !s.carried[k]
}

// Tap reports whether a counted lateral that joins the network at junction j taps the side of
// a duct there: no structure stands at j and a duct pathway runs on through it (two span ends
// or more, one of them a duct's). A new duct cannot be joined into the side of one in the
// ground, and the cable turns from the lateral into the duct there, so the plan builds a
// handhole at the tap (common practice, no published source), a pull point like any
// structure: the lateral is pulled on its own, and its turn is taken inside the handhole.
// At a structure the lateral ends in it; at a duct's dangling end it carries the duct on.
// A lateral from a pole line (geo.Build joins it at a pole, never mid-span) comes down the
// pole in a riser (geo.Entry.PoleRiser) into a handhole at its foot, a dead-end pole too: the same
// handhole, built and billed as any the plan adds (README, "Pathway types").
func (s *Site) Tap(j string) bool {
	m, ok := s.Net.MeetingAt(j)
	if !ok || m.Structure {
		return false
	}
	for _, id := range m.Spans {
		if sp, ok := s.Net.Span(id); ok && (sp.Type == geo.TypeDuct && m.Degree >= 2 || sp.Type == geo.TypeAerial) {
			return true
		}
	}
	return false
}

// TapOf reports whether entry e reaches its building by a counted lateral that taps a duct
// (Tap at its junction): the lateral's handhole is part of using the entrance (items.Entrance).
func (s *Site) TapOf(e geo.Entry) bool { return e.LateralM > 0 && s.Tap(e.Junction) }
