package site

import (
	"github.com/paulmach/orb"
	"slices"
	"sort"
	"spanwright/geo"
)

// CheckReport is what `spanwright check` prints about a campus.
type CheckReport struct {
	Buildings int
	ByRole    map[string]int // "mc", "ic", "served"; given a plan, "skipped" (SkippedFor) out of "served"
	// Skipped lists, given a plan, the buildings of role served that no link of the plan
	// serves or comes from (their links skipped: `skip: true`), sorted; nil without a plan.
	Skipped     []string
	Pathways    []PathwayTally // by type then status
	Structures  int
	Junctions   int
	Spans       int
	Components  int      // separate pieces of the pathway network that hold a building (Site.pieces)
	Hub         string   // "" when none could be resolved
	Unreachable []string // buildings with no path to the hub
	CutOff      []string // for each of Unreachable, in its order, why (Site.CutOff)
	// Unserved lists, given a plan, those of Unreachable that no link of the plan serves
	// (skipped, and no link comes from them): facts of the campus, no problem of the plan
	// (ServedFor); nil without a plan.
	Unserved []string
	// ThroughOnly lists the buildings that reach the hub only through another building routes
	// may not cross (Site.ThroughOnly).
	ThroughOnly []string
	Through     []string // for each of ThroughOnly, in its order, why and what would serve it (Site.Through)
	// Served lists the buildings that reach the hub only through another building but that
	// a plan's links serve from a cross-connect they reach (ThroughFor); nil without a plan.
	Served []string
	// NoDiverse lists, given a plan, its diverse links that can have no second route, each
	// with its building and the reason plan gives its diverse leg (route.NoDiverse, which the
	// caller sets it from); nil without a plan.
	NoDiverse []string
	// TurnsOnly lists, given a plan with design.turn_handholes: false, its links that only
	// routes changing pathway at a junction without a structure join, each with its building
	// and the reason plan gives their legs (route.TurnsOnly, which the caller sets it from);
	// nil otherwise.
	TurnsOnly []string
	// OnlyProposed lists, given a plan with design.allow_new_trench: false, the buildings that
	// reach the hub only over proposed pathways (Site.OnlyOverProposed); nil otherwise.
	OnlyProposed []string
	// Entrances lists every building's entrances, by building then entrance ID.
	Entrances []geo.Entry
	// Turns lists the junctions where a turn from one pathway into another needs a structure
	// built (Site.TurnsNeedingStructure).
	Turns []string
	// TurnPoints are the Turns' junction points (longitude, latitude), in the same order, so
	// that check can say where each is.
	TurnPoints []orb.Point
	// NearMisses lists the pathway ends that just miss a pathway or footprint (geo.NearMiss).
	NearMisses []string
	Warnings   []string
	// Slips are those of Warnings on a value the plan would be made with that the campus
	// likely did not mean (geo.Warning.Slip: a number typed in another unit, a property slip
	// whose default is planned): they speak of the campus's figures in its keys' units
	// ("duct_mm" is 4 mm; inches? 4 in is 101.6 mm), so they are printed as written, in
	// either units.
	Slips []string
}

// PathwayTally counts pathways of one type and status and their length in metres.
type PathwayTally struct {
	Type, Status string
	Pathways     int
	LengthM      float64
}

// Check summarises the site; hub may be "" (then the mc building, if any, is used).
func (s *Site) Check(hub string) CheckReport {
	r := CheckReport{Buildings: len(s.Campus.Buildings), ByRole: map[string]int{},
		Structures: len(s.Campus.Structures), Junctions: len(s.Net.Junctions), Spans: len(s.Net.Spans)}
	for _, b := range s.Campus.Buildings {
		role := b.Role
		if role == "" {
			role = "served"
		}
		r.ByRole[role]++
	}
	type key struct{ t, st string }
	tally := map[key]*PathwayTally{}
	pathways := map[key]map[string]bool{}
	for _, sp := range s.Net.Spans {
		k := key{sp.Type, sp.Status}
		if tally[k] == nil {
			tally[k] = &PathwayTally{Type: sp.Type, Status: sp.Status}
			pathways[k] = map[string]bool{}
		}
		tally[k].LengthM += sp.LengthM
		pathways[k][sp.PathwayID] = true
	}
	for k, t := range tally {
		t.Pathways = len(pathways[k])
		r.Pathways = append(r.Pathways, *t)
	}
	sort.Slice(r.Pathways, func(i, j int) bool {
		a, b := r.Pathways[i], r.Pathways[j]
		if a.Type != b.Type {
			return a.Type < b.Type
		}
		return a.Status < b.Status
	})
	r.Components = s.pieces()
	if hub == "" {
		hub = s.MainCrossConnect()
	}
	if _, ok := s.building[hub]; ok {
		r.Hub = hub
		r.Unreachable = s.Unreachable(hub)
		for _, b := range r.Unreachable {
			r.CutOff = append(r.CutOff, s.CutOff(b, hub))
		}
		r.ThroughOnly = s.ThroughOnly(hub)
		for _, b := range r.ThroughOnly {
			r.Through = append(r.Through, s.Through(b, hub))
		}
	}
	r.Entrances = s.Net.Entrances
	r.Turns = s.TurnsNeedingStructure()
	for _, id := range r.Turns {
		j, _ := s.Net.Junction(id)
		r.TurnPoints = append(r.TurnPoints, j.Point)
	}
	for _, m := range s.Net.NearMisses {
		r.NearMisses = append(r.NearMisses, m.String())
	}
	for _, w := range s.Net.Warnings {
		r.Warnings = append(r.Warnings, w.File+": "+w.Feature+": "+w.Message)
		if w.Slip {
			r.Slips = append(r.Slips, r.Warnings[len(r.Warnings)-1])
		}
	}
	for _, u := range s.Net.Unjoined {
		w := u.Warning("; a plan that serves it is refused (to serve it, " + unjoinedFix + "; else skip its link)")
		r.Warnings = append(r.Warnings, w.File+": "+w.Feature+": "+w.Message)
	}
	return r
}

// SkippedFor sets the report's Skipped, given a plan's links: the buildings of role served
// (no role) at neither end of any link, their default link skipped, which the plan does not
// serve; they are counted under "skipped" and no longer under "served" (tester 13's finding A:
// a skipped building was counted served).
func (s *Site) SkippedFor(r *CheckReport, links []Link) {
	ends := map[string]bool{}
	for _, l := range links {
		ends[l.From], ends[l.To] = true, true
	}
	r.Skipped = nil
	for _, b := range s.Campus.Buildings {
		if b.Role == "" && b.ID != r.Hub && !ends[b.ID] {
			r.Skipped = append(r.Skipped, b.ID)
		}
	}
	slices.Sort(r.Skipped)
	if n := len(r.Skipped); n > 0 {
		r.ByRole["served"] -= n
		r.ByRole["skipped"] = n
	}
}

// ServedFor sets the report's Unserved: the buildings cut off from the hub that no link of
// a plan's links serves (neither end of any), which plan leaves out without a word.
func (s *Site) ServedFor(r *CheckReport, links []Link) {
	served := s.UnreachableServed(r.Hub, links)
	r.Unserved = nil
	for _, b := range r.Unreachable {
		if !slices.Contains(served, b) {
			r.Unserved = append(r.Unserved, b)
		}
	}
}

// ThroughFor narrows the report's buildings reached only through another building to what a
// plan of links will meet: each building a link serves (its To) that reaches the link's
// cross-connect (From) only through a building routes may not cross, with the reason for that
// link (Through). A building served from an ic it reaches directly, or served by no link, is
// no problem of the plan.
func (s *Site) ThroughFor(r *CheckReport, links []Link) {
	before := r.ThroughOnly
	r.ThroughOnly, r.Through = nil, nil
	defer func() {
		for _, b := range before {
			if !slices.Contains(r.ThroughOnly, b) && slices.ContainsFunc(links, func(l Link) bool { return l.To == b }) {
				r.Served = append(r.Served, b)
			}
		}
	}()
	for _, l := range links {
		if slices.Contains(r.ThroughOnly, l.To) || !s.Joined(l.To, l.From) {
			continue // listed once; a cut-off building is Unreachable's
		}
		if seen, _ := s.search(l.To, l.From); !seen.any(s, s.Net.EntrancesOf(l.From)) {
			r.ThroughOnly = append(r.ThroughOnly, l.To)
			r.Through = append(r.Through, s.Through(l.To, l.From))
		}
	}
}

// pieces counts the separate pieces of the pathway network that hold buildings: the parts
// (components, entrances joined) that some entrance of some building is in. Every entrance
// counts, as for Joined and the distances between buildings: a building whose second
// entrance is on a lateral that joins nothing is in one piece with the network its first
// entrance is on, not in a piece of its own, and whichever entrance the plan uses (Access)
// changes nothing.
func (s *Site) pieces() int {
	seen := map[int]bool{}
	for _, b := range s.Campus.Buildings {
		for _, p := range s.partsOf(b.ID) {
			seen[p] = true
		}
	}
	return len(seen)
}
