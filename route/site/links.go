package site

import (
	"fmt"
	"slices"
	"sort"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/route/plan"
)

// Link is one backbone link the plan needs: a cable (or a diverse pair) from the
// cross-connect building From to the building To.
type Link struct {
	ID         string // From + "-" + To, with "#n" added when the pair repeats
	From, To   string // building IDs: cross-connect end, served end
	Rate       string // e.g. "10G", as media.RateText writes it whatever the plan's spelling
	FutureRate string // "" when none; as Rate
	Strands    int    // required strands before growth
	Growth     float64
	Diverse    bool
	Explicit   bool // set by an entry of the plan's links list
	Line       int  // that entry's line in the plan file, 0 for a default link
}

// unknownBuilding returns the problem of the plan's links[n] when its to or from names no
// building of the site, else nil.
func (s *Site) unknownBuilding(p *plan.Plan, n int) error {
	ls := p.Links[n]
	for _, end := range []struct{ key, id string }{{"to", ls.To}, {"from", ls.From}} {
		if end.key == "from" && end.id == "" {
			continue
		}
		if _, ok := s.building[end.id]; !ok {
			return p.Problem(fmt.Sprintf("links[%d].%s", n, end.key), input.Errorf(input.ErrBadValue, "want the id of a building, got %q, which no building has%s",
				end.id, s.Campus.BuildingHint(end.id)))
		}
	}
	return nil
}

// UnknownBuildings returns the problems of the plan's links that name no building of the
// site, as Links reports them: what can be said of the links when the hub is not known.
func (s *Site) UnknownBuildings(p *plan.Plan) []error {
	var errs []error
	for n := range p.Links {
		if err := s.unknownBuilding(p, n); err != nil {
			errs = append(errs, err)
		}
	}
	return errs
}

// Links resolves the plan's link list against the site: the defaults of the ANSI/TIA-568
// hierarchical star (each ic to the hub, each served building to its nearest cross-connect
// by network distance), then the plan's entries, which replace the default link of the
// building they name or add a link from another building. It returns every problem at once.
func (s *Site) Links(p *plan.Plan, hub string) ([]Link, []string, []error) {
	var errs []error
	var notes []string
	var spec int // the entry of the plan's links list being resolved
	bad := func(key, format string, args ...any) {
		errs = append(errs, p.Problem(fmt.Sprintf("links[%d].%s", spec, key), input.Errorf(input.ErrBadValue, format, args...)))
	}
	var xcs []string // cross-connects other than the hub, sorted
	for _, b := range s.Campus.Buildings {
		if b.Role == geo.RoleIC && b.ID != hub {
			xcs = append(xcs, b.ID)
		}
	}
	sort.Strings(xcs)
	fromHub := s.distancesFrom(hub)
	dist := map[string]map[string]float64{hub: fromHub}
	for _, x := range xcs {
		dist[x] = s.distancesFrom(x)
	}
	nearest := func(b string) string {
		best, bestD := hub, fromHub[b]
		_, reach := fromHub[b]
		for _, x := range xcs {
			if d, ok := dist[x][b]; ok && (!reach || d < bestD) {
				best, bestD, reach = x, d, true
			}
		}
		return best
	}
	base := func(from, to string) Link {
		d := p.Defaults
		return Link{From: from, To: to, Rate: media.RateText(d.Rate), FutureRate: media.RateText(plan.FutureRate(d.FutureRate)), Strands: d.Strands,
			Growth: d.Growth, Diverse: d.Redundancy == plan.RedundancyDiverse}
	}

	byTo := map[string]int{} // default link index by served building
	var links []Link
	for _, b := range s.Campus.Buildings {
		if b.ID == hub {
			continue
		}
		from := hub
		if b.Role != geo.RoleIC {
			from = nearest(b.ID)
		}
		byTo[b.ID] = len(links)
		links = append(links, base(from, b.ID))
	}
	skip := map[int]bool{}
	for n, ls := range p.Links {
		spec = n
		if err := s.unknownBuilding(p, n); err != nil {
			errs = append(errs, err)
			continue
		}
		if ls.To == hub && (ls.From == "" || ls.From == hub) {
			// The entry is about the building's own link to its cross-connect, and the
			// building is the hub (a sweep's scenario may make it so): there is no such link.
			notes = append(notes, fmt.Sprintf("links[%d] (to %s) dropped: %s is the hub of this plan", n, ls.To, ls.To))
			continue
		}
		if ls.From == ls.To {
			bad("from", "a link from %q to itself", ls.To)
			continue
		}
		i, ok := byTo[ls.To]
		if ls.Skip {
			if ok && (ls.From == "" || links[i].From == ls.From) {
				skip[i] = true
			} else {
				bad("skip", "no default link to %q from %q to skip", ls.To, ls.From)
			}
			continue
		}
		var l Link
		if ok && (ls.From == "" || !links[i].Explicit) {
			l = links[i] // the entry replaces the building's default link
		} else {
			i = len(links)
			links = append(links, base("", ls.To))
			l = links[i]
			if ls.From == "" {
				ls.From = nearest(ls.To)
			}
		}
		if ls.From != "" {
			l.From = ls.From
		}
		if ls.Rate != "" {
			l.Rate = media.RateText(ls.Rate)
		}
		if ls.FutureRate != "" {
			l.FutureRate = media.RateText(plan.FutureRate(ls.FutureRate)) // "none" overrides the defaults' future rate
		}
		if ls.Strands > 0 {
			l.Strands = ls.Strands
		}
		if ls.Growth != nil {
			l.Growth = *ls.Growth
		}
		if ls.Redundancy != "" {
			l.Diverse = ls.Redundancy == plan.RedundancyDiverse
		}
		l.Explicit, l.Line = true, ls.Line
		links[i] = l
		byTo[ls.To] = i
	}
	out := links[:0:0]
	seen := map[string]int{}
	for i, l := range links {
		if skip[i] {
			continue
		}
		id := l.From + "-" + l.To
		seen[id]++
		if n := seen[id]; n > 1 {
			id = fmt.Sprintf("%s#%d", id, n)
		}
		l.ID = id
		out = append(out, l)
	}
	sort.SliceStable(out, func(i, j int) bool { return out[i].ID < out[j].ID })
	return out, notes, errs
}

// unjoinedFix is what would let a plan serve a building no pathway joins.
const unjoinedFix = "draw a pathway (or an entrance on one) within reach of it, or raise design.max_lateral_m"

// Unjoined sorts the buildings no pathway joins (geo.Network.Unjoined) by whether a plan
// from hub with links needs them. One it needs (the hub, or an end of a link) is a problem
// naming its feature, the link and what would fix it; one it does not is a warning, since a
// building no link serves needs no way in.
func (s *Site) Unjoined(hub string, links []Link) (problems []error, warnings []string) {
	for _, u := range s.Net.Unjoined {
		var fix string
		if u.Building == hub {
			fix = fmt.Sprintf("; it is the plan's hub: %s, or choose another hub", unjoinedFix)
		} else if i := slices.IndexFunc(links, func(l Link) bool { return l.To == u.Building || l.From == u.Building }); i >= 0 {
			l := links[i]
			which := fmt.Sprintf("its default link %s", l.ID)
			if l.Explicit {
				which = fmt.Sprintf("link %s, the links entry at line %d of the plan", l.ID, l.Line)
			}
			if l.To == u.Building {
				fix = fmt.Sprintf("; the plan serves it (%s): %s, or skip the link ({to: %s, skip: true} in links)", which, unjoinedFix, u.Building)
			} else {
				fix = fmt.Sprintf("; the plan serves links from it (%s): %s, or serve them from another building (from: in links)", which, unjoinedFix)
			}
		}
		if fix != "" {
			problems = append(problems, u.Problem(fix))
			continue
		}
		w := u.Warning("; no link of the plan serves it, so it needs none")
		warnings = append(warnings, w.File+": "+w.Feature+": "+w.Message)
	}
	return problems, warnings
}
