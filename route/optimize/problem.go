package optimize

import (
	"errors"
	"fmt"
	"math"
	"strings"

	"spanwright/media/install"
)

// Edge flags that an Option may exclude through Option.ExcludeFlags. Bits above these are free
// for the caller to define.
const (
	// FlagHighEMI marks an edge that runs near a strong source of electromagnetic interference.
	FlagHighEMI uint64 = 1 << iota
	// FlagOutdoor marks an edge that runs outside a building.
	FlagOutdoor
)

// Edge is one span of the pathway network. Parallel edges between the same nodes are allowed.
type Edge struct {
	ID       string
	From, To int // node indices, 0-based, in [0, Problem.Nodes)

	LengthM float64 // span length in metres, finite and >= 0

	// LabourPerMCents is the installation labour per metre per cable on this edge, in cents;
	// it depends on the pathway type.
	LabourPerMCents int64

	// CableM is the cable one cable takes along this edge, in metres: LengthM with what the
	// caller adds to it (slack loops stored at its ends, waste); 0 means LengthM. An option
	// pays round(CableM × CablePerMCents) on the edge.
	CableM float64

	// ReachM is what the edge adds to a channel, in metres: LengthM with the slack loops
	// stored along it (no waste: the loss budget counts what is installed); 0 means LengthM.
	// Reach (Option.MaxRouteM), the length objective and the tie between equal costs count
	// it; a leg's LengthM in the Solution stays the route's own metres.
	ReachM float64

	// PerCableCents is what each cable routed over the edge pays besides its cable and
	// LabourPerMCents, in cents: costs the caller prices per item (labour at a productivity
	// rate, material that goes with the cable) and sums per edge.
	PerCableCents int64

	// Proposed marks an edge that does not exist yet. It can be used only when Problem.AllowNew
	// is set, and using it opens it: FixedCents (trench or bore, structures) is paid once,
	// however many cables use it.
	Proposed   bool
	FixedCents int64

	// Group is the shared-risk group (duct bank, trench) of the edge; edges with the same
	// Group > 0 fail together. Group 0 means the edge shares its risk with no other edge.
	Group int
	// EndParted says the edge's group is one run of duct with no branch between its ends (a
	// chain of edges): a demand's two legs that both leave its source, or both reach its
	// target, along the group (one each way) do not share the group by those first (last)
	// hops, so the group is parted at the demand's own ends and nowhere else on its account.
	// Every edge of a group has the same EndParted.
	EndParted bool

	// Flags holds FlagHighEMI, FlagOutdoor and caller-defined bits.
	Flags uint64

	// Ducts is the number of ducts of internal diameter DuctIDMM (millimetres) the edge's
	// cables may use without adding one: on an existing edge its spare ducts (0 with
	// DuctIDMM > 0: its ducts are full); on a proposed edge the ducts its opening lays, paid
	// in FixedCents. An edge with DuctIDMM == 0 has unlimited capacity.
	//
	// A proposed edge with DuctIDMM > 0 is built to size: it gets Ducts ducts, or as many as
	// its cables need (packed as on an existing edge), whichever is more, all in its one
	// trench; each beyond Ducts costs AddDuctPerMCents a metre (which may be 0), and only a
	// cable no empty duct takes makes it over capacity.
	Ducts    int
	DuctIDMM float64

	// AddDuctPerMCents is the price, in cents per metre, of adding one duct of DuctIDMM
	// along this edge when its ducts are full; on an existing edge 0 means no duct can be
	// added.
	AddDuctPerMCents int64

	// AddTrenchPerMCents is the price, in cents per metre, of the trench or bore the first
	// added duct needs along an existing edge: paid once, however many ducts are added. A
	// proposed edge's trench is its FixedCents: the three AddTrench fields are not read there.
	AddTrenchPerMCents int64
	// AddTrenchCents is the price, in cents, of the work at the ends of that trench, paid
	// with it: the wall penetrations where the added ducts enter buildings through walls the
	// full ducts already enter.
	AddTrenchCents int64
	// AddTrenchDucts is the fewest ducts that trench is laid with, each at AddDuctPerMCents:
	// k added ducts cost max(k, AddTrenchDucts) ducts (0 or 1: just the ducts added). In
	// [0, install.MaxBankDucts].
	AddTrenchDucts int

	// Innerduct says that what the edge's ducts take (Option.CableODMM) are innerducts, each
	// pulled in empty and holding one cable: a duct takes as many as fill and the jam band
	// allow. False: loose cables, at most CablesPerDuct to a duct, one pull each
	// (install.PullLimit, the count install.Load.Takes keeps to).
	Innerduct bool
	// CablesPerDuct is the most loose cables one of the edge's ducts takes, one pull each (the
	// plan's design.cables_per_duct, install.DefaultCablesPerDuct unless it says otherwise);
	// 0: no count, fill and the jam band alone. Not read when Innerduct.
	CablesPerDuct int
}

// PullLimit is the count of pulls of one of the edge's ducts (install.PullLimit of
// Innerduct and CablesPerDuct; 0: no count), which its packing keeps to.
func (e *Edge) PullLimit() int { return install.PullLimit(e.Innerduct, e.CablesPerDuct) }

// limited reports whether the edge's capacity is checked (and its added ducts priced).
func (e *Edge) limited() bool { return e.DuctIDMM > 0 }

// canAdd reports whether ducts may be added to the edge when its ducts are full: on a
// proposed edge always (built to size), on an existing one when they have a price.
func (e *Edge) canAdd() bool { return e.Proposed || e.AddDuctPerMCents > 0 }

// MayAddDucts reports whether the plan may add ducts to the edge when its ducts are full
// (the rule Solve packs by): on a proposed edge always, on an existing one when
// AddDuctPerMCents prices them.
func (e *Edge) MayAddDucts() bool { return e.canAdd() }

// addedFor is the ducts a packing into ducts ducts adds beyond the edge's own, and whether the
// edge may have them.
func (e *Edge) addedFor(ducts int) (added int, ok bool) {
	added = max(0, ducts-e.Ducts)
	return added, added == 0 || e.canAdd()
}

// LaidDucts is how many ducts the plan lays along the edge when its cables need added
// ducts beyond Ducts: on a proposed edge all of its ducts, Ducts + added; on an existing one
// none without an added duct, else the added ducts or AddTrenchDucts, whichever is more (one
// trench beside the full ducts, laid with at least the design's ducts). It is the one count
// of ducts laid that the cost (Solve's objective) and EdgeFill.AddedDucts read.
func (e *Edge) LaidDucts(added int) int {
	switch {
	case e.Proposed:
		return e.Ducts + max(added, 0)
	case added <= 0:
		return 0
	}
	return max(added, e.AddTrenchDucts)
}

// AddedCents is what added ducts beyond Ducts cost along the edge, as Solve's objective
// prices them (doc.go): on an existing edge the trench beside the full ducts, once,
// round(LengthM × AddTrenchPerMCents) + AddTrenchCents, laid with LaidDucts(added) ducts at
// round(LengthM × AddDuctPerMCents) each; on a proposed edge the added ducts at that price
// each (its trench and Ducts are in FixedCents). 0 for added <= 0.
func (e *Edge) AddedCents(added int) int64 {
	if added <= 0 {
		return 0
	}
	duct := centsFor(e.LengthM, e.AddDuctPerMCents)
	if e.Proposed {
		return int64(added) * duct
	}
	return int64(e.LaidDucts(added))*duct + centsFor(e.LengthM, e.AddTrenchPerMCents) + e.AddTrenchCents
}

// Option is one candidate medium for a demand.
type Option struct {
	Name string

	// CablePerMCents is the cable price per metre for the demand's strand count, in cents.
	CablePerMCents int64

	// FixedCents is the route-independent cost of the option (terminations, transceivers), in cents.
	FixedCents int64

	// SecondLegCents is the route-independent cost of a diverse demand's second leg, in
	// cents, paid only when the demand gets its pair (a second cable's terminations,
	// transceivers, risers).
	SecondLegCents int64

	// MaxRouteM is the longest route, in metres, that the medium reaches along pathways (the
	// caller has already taken off risers and slack); math.Inf(1) or 0 means no limit.
	MaxRouteM float64

	// ExcludeFlags lists edge flags the medium may not run on (e.g. FlagHighEMI for copper).
	ExcludeFlags uint64

	// CableODMM is the cable's outside diameter in millimetres, used for duct fill; 0 means
	// the cable takes no duct area.
	CableODMM float64

	// Cables is how many cables of CableODMM a leg of the option pulls side by side (a copper
	// link of several 4-pair cables, ANSI/TIA-568.2: one per port; a fibre count above the
	// largest cable's); 0 means 1. Each takes its place in the ducts and pays every edge's
	// per-cable prices (LabourPerMCents, PerCableCents); CablePerMCents is the price of all of
	// them together.
	Cables int
}

// cables is how many cables a leg of the option pulls: Cables, at least 1.
func (o *Option) cables() int { return max(o.Cables, 1) }

// Demand is one link to route from Source to Target, with the media that may carry it.
type Demand struct {
	ID             string
	Source, Target int // node indices, 0-based

	// Diverse asks for a second route that shares no edge, no interior node and no
	// shared-risk group with the first.
	Diverse bool

	Options []Option
}

// FitsFunc reports whether cables of the given outside diameters (millimetres, in demand order,
// a demand's diameter listed once for each of its Option.Cables) can be pulled into ducts
// ducts of edge edge (an index into Problem.Edges). It must be
// deterministic and must not return false for a set that fits in fewer ducts.
type FitsFunc func(edge int, cableODsMM []float64, ducts int) bool

// Problem is one routing problem: the network, the demands and the rules that apply to all.
type Problem struct {
	Nodes   int
	Edges   []Edge
	Demands []Demand

	// AllowNew lets routes use (and open) proposed edges.
	AllowNew bool

	// Fits decides duct fill on capacity-limited edges; nil means NFPAFits.
	Fits FitsFunc

	// NoTransit marks the nodes that a route may start or end at but never pass through
	// (NoTransit[v] true: v is never an interior node of any leg). Nil, or one entry per node.
	// A building with several entrances is one such node joined by zero-length edges to each
	// entrance: marking it stops routes running in at one entrance and out at another.
	NoTransit []bool

	// Sites marks nodes that are one place drawn as several nodes (a junction with no
	// structure split into one node per run of duct through it, where routes go straight on or
	// turn by a turn edge): nodes with the same Sites value > 0 are that place. Two legs of a
	// diverse demand that pass one place share it as they would share a node (a dig there
	// cuts both): the searches prefer, at any cost, a pair that passes no place twice, and
	// keep one that does only when they find no other. Nil, or one entry per node; 0 is no
	// such place.
	Sites []int

	// Charges are prices paid once for a set of edges; see Charge.
	Charges []Charge
}

// Charge is an amount paid once when any of its edges carries at least one route: a
// structure that serves several edges (a handhole where new pathway joins the network, paid
// once whatever number of opened spans meet there; a pull box where a route turns from one
// pathway into another at a junction modelled as one node per pathway, joined by turn edges
// that all belong to one charge). Its edges may be existing or proposed; on a proposed edge
// it is paid besides the edge's own FixedCents. An edge may belong to several charges.
type Charge struct {
	ID    string
	Edges []int // indices into Problem.Edges, distinct, at least one
	Cents int64 // paid once when any edge of the set carries a route, in cents
}

// Objective names for Settings.Objective.
const (
	ObjectiveCost   = "cost"   // minimise the plan cost in cents (the default)
	ObjectiveLength = "length" // minimise total route metres; still choose the cheapest feasible medium
)

// DefaultMaxRounds is the number of improvement rounds Solve runs when Settings.MaxRounds is 0.
const DefaultMaxRounds = 12

// Settings tune Solve.
type Settings struct {
	// Objective is ObjectiveCost ("" means the same) or ObjectiveLength.
	Objective string
	// MaxRounds bounds the rip-up-and-reroute rounds; 0 means DefaultMaxRounds.
	MaxRounds int
	// Start is a warm start: per demand, in demand order, a route to begin the search from
	// (StartFrom makes one from an earlier Solution of a problem on the same network, such as
	// the same campus under other prices). Nil means none. A start route that does not fit
	// the problem (another demand ID, an option or edge out of range, legs that do not join
	// the demand's ends, an edge its medium may not use, beyond its reach, through a
	// transit-free node, or a pair that shares an edge, interior node or group) is ignored
	// and its demand placed as without a start; so is one that fits the problem but whose
	// cables, after those of the start routes kept before it in demand order, leave a duct
	// overfull (no room where no duct may be added: Solution.StartNoRoom), so that a start
	// never leaves the plan overfull where placing afresh would not. With a start, Solve
	// skips its second start (every proposed edge free), whose purpose the start serves. The
	// answer depends on the
	// start: the same problem and start give the same solution.
	Start []StartRoute
	// PlaceOnly, with a Start, keeps every start route that fits and places the other
	// demands as the first plan places them, and searches no further (no local search, no
	// perturbation): the start's plan mended where it no longer fits, such as routes a
	// tighter reach rules out. The lower bound is computed as always.
	PlaceOnly bool
}

// StartRoute is one demand's route in Settings.Start.
type StartRoute struct {
	ID     string  // the demand's ID, which must match
	Option int     // index into Demand.Options; -1: no route (the demand is placed afresh)
	Legs   [][]Hop // the legs, each from Source to Target
}

// StartFrom returns the routes of sol as a warm start (Settings.Start).
func StartFrom(sol *Solution) []StartRoute {
	out := make([]StartRoute, len(sol.Routes))
	for i, r := range sol.Routes {
		out[i] = StartRoute{ID: r.ID, Option: r.Option}
		if !r.Feasible {
			out[i].Option = -1
			continue
		}
		out[i].Legs = append(out[i].Legs, r.Primary.Hops)
		if len(r.Secondary.Hops) > 0 {
			out[i].Legs = append(out[i].Legs, r.Secondary.Hops)
		}
	}
	return out
}

// ErrInvalidProblem is wrapped by every error about a malformed Problem or Settings.
var ErrInvalidProblem = errors.New("invalid problem")

// ErrorList holds every problem found in a Problem, in edge order.
type ErrorList []error

// Error returns the first error and how many more there are.
func (l ErrorList) Error() string {
	switch len(l) {
	case 0:
		return "no errors"
	case 1:
		return l[0].Error()
	}
	return fmt.Sprintf("%s (and %d more errors)", l[0], len(l)-1)
}

// Unwrap returns the errors of the list, for errors.Is and errors.As.
func (l ErrorList) Unwrap() []error { return l }

// Err returns nil when the list is empty and the list otherwise.
func (l ErrorList) Err() error {
	if len(l) == 0 {
		return nil
	}
	return l
}

func finiteNonNeg(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) && v >= 0 }

// ref names an edge or option in messages, formatted only when a message needs it.
type ref struct {
	kind  string
	index int
	id    string
}

func (r ref) String() string { return fmt.Sprintf("%s %d (%q)", r.kind, r.index, r.id) }

// validate checks what makes a whole solve meaningless (edges, settings). Problems with one
// demand are not errors: they make that demand infeasible.
func validate(p *Problem, s Settings) error {
	var errs ErrorList
	bad := func(format string, args ...any) {
		errs = append(errs, fmt.Errorf("optimize: "+format+": %w", append(args, ErrInvalidProblem)...))
	}
	if s.Objective != "" && s.Objective != ObjectiveCost && s.Objective != ObjectiveLength {
		bad("settings: objective: want %q or %q, got %q", ObjectiveCost, ObjectiveLength, s.Objective)
	}
	if s.MaxRounds < 0 {
		bad("settings: max rounds: want >= 0, got %d", s.MaxRounds)
	}
	if p.Nodes < 0 {
		bad("nodes: want >= 0, got %d", p.Nodes)
	}
	parted := map[int]bool{} // group → EndParted of its first edge
	for i := range p.Edges {
		e := &p.Edges[i]
		name := ref{"edge", i, e.ID}
		if e.From < 0 || e.From >= p.Nodes {
			bad("%s: from: want node index in [0, %d), got %d", name, p.Nodes, e.From)
		}
		if e.To < 0 || e.To >= p.Nodes {
			bad("%s: to: want node index in [0, %d), got %d", name, p.Nodes, e.To)
		}
		if !finiteNonNeg(e.LengthM) {
			bad("%s: length_m: want finite number >= 0, got %v", name, e.LengthM)
		} else if e.LengthM > maxLengthM {
			bad("%s: length_m: want at most %v, got %v", name, float64(maxLengthM), e.LengthM)
		}
		if !finiteNonNeg(e.CableM) || e.CableM > maxLengthM {
			bad("%s: cable metres: want finite number in [0, %v], got %v", name, float64(maxLengthM), e.CableM)
		}
		if !finiteNonNeg(e.ReachM) || e.ReachM > maxLengthM {
			bad("%s: reach metres: want finite number in [0, %v], got %v", name, float64(maxLengthM), e.ReachM)
		}
		if e.PerCableCents < 0 || e.PerCableCents > maxFixedCents {
			bad("%s: per-cable cost: want cents in [0, %d], got %d", name, int64(maxFixedCents), e.PerCableCents)
		}
		if e.LabourPerMCents < 0 || e.LabourPerMCents > maxPerMCents {
			bad("%s: labour per metre: want cents in [0, %d], got %d", name, int64(maxPerMCents), e.LabourPerMCents)
		}
		if e.FixedCents < 0 || e.FixedCents > maxFixedCents {
			bad("%s: fixed cost: want cents in [0, %d], got %d", name, int64(maxFixedCents), e.FixedCents)
		}
		if e.AddTrenchPerMCents < 0 || e.AddTrenchPerMCents > maxPerMCents {
			bad("%s: added-duct trench price per metre: want cents in [0, %d], got %d", name, int64(maxPerMCents), e.AddTrenchPerMCents)
		}
		if e.AddTrenchCents < 0 || e.AddTrenchCents > maxFixedCents {
			bad("%s: added-duct trench ends: want cents in [0, %d], got %d", name, int64(maxFixedCents), e.AddTrenchCents)
		}
		if e.AddTrenchDucts < 0 || e.AddTrenchDucts > install.MaxBankDucts {
			bad("%s: ducts in an added-duct trench: want [0, %d], got %d", name, install.MaxBankDucts, e.AddTrenchDucts)
		}
		if e.AddDuctPerMCents < 0 || e.AddDuctPerMCents > maxPerMCents {
			bad("%s: add-duct price per metre: want cents in [0, %d], got %d", name, int64(maxPerMCents), e.AddDuctPerMCents)
		}
		if e.Ducts < 0 {
			bad("%s: ducts: want >= 0, got %d", name, e.Ducts)
		}
		if !finiteNonNeg(e.DuctIDMM) {
			bad("%s: duct internal diameter: want finite number of mm >= 0, got %v", name, e.DuctIDMM)
		}
		if e.Group < 0 {
			bad("%s: group: want >= 0, got %d", name, e.Group)
		}
		if e.EndParted && e.Group == 0 {
			bad("%s: parted at ends: want a group > 0", name)
		}
		if e.Group > 0 {
			if first, ok := parted[e.Group]; !ok {
				parted[e.Group] = e.EndParted
			} else if first != e.EndParted {
				bad("%s: parted at ends: want the same for every edge of group %d", name, e.Group)
			}
		}
	}
	if len(p.NoTransit) != 0 && len(p.NoTransit) != p.Nodes {
		bad("no-transit marks: want none or one per node (%d), got %d", p.Nodes, len(p.NoTransit))
	}
	if len(p.Sites) != 0 && len(p.Sites) != p.Nodes {
		bad("sites: want none or one per node (%d), got %d", p.Nodes, len(p.Sites))
	}
	for v, x := range p.Sites {
		if x < 0 {
			bad("node %d: site: want >= 0, got %d", v, x)
		}
	}
	var seen []int // edge → 1 + the last charge that listed it
	if len(p.Charges) > 0 {
		seen = make([]int, len(p.Edges))
	}
	for i := range p.Charges {
		c := &p.Charges[i]
		name := ref{"charge", i, c.ID}
		if len(c.Edges) == 0 {
			bad("%s: edges: want at least one edge", name)
		}
		for _, e := range c.Edges {
			switch {
			case e < 0 || e >= len(p.Edges):
				bad("%s: edges: want edge indices in [0, %d), got %d", name, len(p.Edges), e)
			case seen[e] == i+1:
				bad("%s: edges: edge %d listed twice", name, e)
			default:
				seen[e] = i + 1
			}
		}
		if c.Cents < 0 || c.Cents > maxFixedCents {
			bad("%s: cents: want cents in [0, %d], got %d", name, int64(maxFixedCents), c.Cents)
		}
	}
	return errs.Err()
}

// Bounds that keep every sum of cents and millimetres far from int64 overflow.
const (
	maxLengthM    = 1e6     // 1000 km per edge
	maxPerMCents  = 1e8     // one million currency units per metre
	maxFixedCents = 1e13    // one hundred billion currency units
	maxReachM     = 1e9     // longer reach counts as none
	maxODMM       = 1000.0  // a cable wider than a metre is an input error
	maxCables     = 1000    // cables a leg pulls side by side (install.MaxBankDucts ducts of one each)
	maxOptionCent = 1e13    // option prices
	mmPerM        = 1000.0  // lengths are compared in whole millimetres
	unlimitedMM   = 1 << 62 // reach of an option without limit, in mm
)

// demandProblem returns why demand d cannot be routed at all, or "" when its data is usable.
func demandProblem(p *Problem, d *Demand) string {
	var msgs []string
	if d.Source < 0 || d.Source >= p.Nodes {
		msgs = append(msgs, fmt.Sprintf("source: want node index in [0, %d), got %d", p.Nodes, d.Source))
	}
	if d.Target < 0 || d.Target >= p.Nodes {
		msgs = append(msgs, fmt.Sprintf("target: want node index in [0, %d), got %d", p.Nodes, d.Target))
	}
	if len(msgs) == 0 && d.Source == d.Target {
		msgs = append(msgs, fmt.Sprintf("source and target are both node %d", d.Source))
	}
	if len(d.Options) == 0 {
		msgs = append(msgs, "no candidate medium")
	}
	for i := range d.Options {
		o := &d.Options[i]
		name := ref{"option", i, o.Name}
		if o.CablePerMCents < 0 || o.CablePerMCents > maxPerMCents {
			msgs = append(msgs, fmt.Sprintf("%s: cable per metre: want cents in [0, %d], got %d", name, int64(maxPerMCents), o.CablePerMCents))
		}
		if o.FixedCents < 0 || o.FixedCents > maxOptionCent {
			msgs = append(msgs, fmt.Sprintf("%s: fixed cost: want cents in [0, %d], got %d", name, int64(maxOptionCent), o.FixedCents))
		}
		if o.SecondLegCents < 0 || o.SecondLegCents > maxOptionCent {
			msgs = append(msgs, fmt.Sprintf("%s: second-leg cost: want cents in [0, %d], got %d", name, int64(maxOptionCent), o.SecondLegCents))
		}
		if math.IsNaN(o.MaxRouteM) || o.MaxRouteM < 0 {
			msgs = append(msgs, fmt.Sprintf("%s: reach: want metres >= 0 or +Inf, got %v", name, o.MaxRouteM))
		}
		if !finiteNonNeg(o.CableODMM) || o.CableODMM > maxODMM {
			msgs = append(msgs, fmt.Sprintf("%s: cable OD: want mm in [0, %v], got %v", name, maxODMM, o.CableODMM))
		}
		if o.Cables < 0 || o.Cables > maxCables {
			msgs = append(msgs, fmt.Sprintf("%s: cables: want [0, %d], got %d", name, maxCables, o.Cables))
		}
	}
	return strings.Join(msgs, "; ")
}

// reachMM converts an option's reach to whole millimetres (rounded down, so a route that is
// reported within reach is within it).
func reachMM(o *Option) int64 {
	if o.MaxRouteM == 0 || math.IsInf(o.MaxRouteM, 1) || o.MaxRouteM >= maxReachM {
		return unlimitedMM
	}
	return int64(math.Floor(o.MaxRouteM*mmPerM + 1e-6))
}

// centsFor returns round(lengthM × perMCents), the cost in cents of one cable-metre price over
// an edge. Every sum in the package adds these per-edge values, so totals are exact.
func centsFor(lengthM float64, perMCents int64) int64 {
	return int64(math.Round(lengthM * float64(perMCents)))
}

// optionCents is what option o of demand d costs whatever its route, with legs legs: its
// FixedCents, and its SecondLegCents with a second leg.
func (sv *solver) optionCents(d, o, legs int) int64 {
	op := &sv.p.Demands[d].Options[o]
	if legs >= 2 {
		return op.FixedCents + op.SecondLegCents
	}
	return op.FixedCents
}

// cableCents is what one cable of an option priced perMCents a metre pays on edge e: its
// cable over CableM (LengthM when unset), its labour per metre and its per-cable cents.
func cableCents(e *Edge, perMCents int64) int64 {
	m := e.CableM
	if m == 0 {
		m = e.LengthM
	}
	return centsFor(m, perMCents)
}

// labourCents is edge e's labour for n cables: per metre, and per cable, n times.
func labourCents(e *Edge, n int) int64 {
	return int64(n) * (centsFor(e.LengthM, e.LabourPerMCents) + e.PerCableCents)
}

// lengthMM returns an edge length in whole millimetres.
func lengthMM(lengthM float64) int64 { return int64(math.Round(lengthM * mmPerM)) }
