package optimize

// Hop is one edge of a route, in travel order.
type Hop struct {
	Edge    int  // index into Problem.Edges
	Forward bool // true when travelled From → To
}

// Leg is one path from a demand's Source to its Target.
type Leg struct {
	Hops    []Hop
	LengthM float64 // sum of the edges' LengthM, in metres
	// ConstructionCents is the leg's part of its route's ConstructionShareCents,
	// AddedDuctCents and ChargeShareCents: each share goes to the leg whose edge it is for (a
	// charge's to the first leg, primary then secondary, that uses one of its edges), so the
	// legs' parts add up to the route's three.
	ConstructionCents int64
}

// Nodes returns the node indices the leg passes, Source first, given the problem's edges.
func (l Leg) Nodes(edges []Edge) []int {
	if len(l.Hops) == 0 {
		return nil
	}
	out := make([]int, 0, len(l.Hops)+1)
	for i, h := range l.Hops {
		e := edges[h.Edge]
		from, to := e.From, e.To
		if !h.Forward {
			from, to = to, from
		}
		if i == 0 {
			out = append(out, from)
		}
		out = append(out, to)
	}
	return out
}

// Breakdown is the cost of one demand in cents. Its parts add up to Total, and the Totals of
// all routes add up to Solution.TotalCents.
type Breakdown struct {
	CableCents  int64 // Σ legs Σ edges round(CableM × CablePerMCents)
	LabourCents int64 // Σ legs Σ edges Option.Cables × (round(LengthM × LabourPerMCents) + PerCableCents)
	// ConstructionShareCents is the demand's share of the opened proposed edges it uses: each
	// edge's FixedCents split equally among its users, the remainder cents to the first user
	// in the order of Problem.Demands (route hands the optimizer its demands in canonical
	// order, by their ends and options, so there it is not the plan's link order).
	ConstructionShareCents int64
	// AddedDuctCents is the price of the ducts added because this demand's cable did not fit
	// (charged to the demand whose cable, pulled in demand order, first needed the duct).
	AddedDuctCents int64
	FixedCents     int64 // the option's FixedCents, and its SecondLegCents with a diverse pair
	// ChargeShareCents is the demand's share of the charges (Problem.Charges) its legs use:
	// each paid charge's Cents split equally among the demands that use any of its edges, the
	// remainder cents to the first of them in the order of Problem.Demands, as for
	// ConstructionShareCents.
	ChargeShareCents int64
}

// Total returns the sum of the parts, in cents.
func (b Breakdown) Total() int64 {
	return b.CableCents + b.LabourCents + b.ConstructionShareCents + b.AddedDuctCents + b.FixedCents + b.ChargeShareCents
}

// Point kinds of a SinglePoint.
const (
	PointEdge  = "edge"
	PointNode  = "node"
	PointGroup = "group"
)

// SinglePoint names what keeps a Diverse demand from having two independent routes.
type SinglePoint struct {
	Kind  string // PointEdge, PointNode or PointGroup
	Index int    // the edge index, node index or group number
	// Separates is true when removing the point disconnects Source from Target, false when a
	// group was shared by every pair the search found but its removal alone does not
	// disconnect them (group-disjoint routing is NP-hard; the search is a heuristic).
	Separates bool
}

// Route is the decision for one demand.
type Route struct {
	Demand int    // index into Problem.Demands
	ID     string // the demand's ID

	Feasible bool
	Option   int    // index into Demand.Options; -1 when infeasible
	Medium   string // the option's Name

	Primary Leg
	// Secondary is the diverse leg of a Diverse demand; empty when none exists, and then
	// SinglePoint says why.
	Secondary   Leg
	SinglePoint *SinglePoint
	// Note says, for a Diverse demand without Secondary, why (e.g. "every route passes node 7").
	Note string
	// CrossingAvoidedCents is, for a Diverse demand with Secondary, what keeping its legs off a
	// shared place (Problem.Sites) costs against the final plan, in the objective's cents: its
	// pair's weight less that of the cheapest pair within reach found when places are not
	// counted, which passes one; 0 when that pair would pass none or weigh no less. Its pair
	// is weighed as a reroute would weigh it (the demand out of the plan).
	CrossingAvoidedCents int64

	Cost Breakdown
}

// Infeasible is a demand that could not be routed.
type Infeasible struct {
	Demand int
	ID     string
	Reason string // e.g. `option 0 ("om4"): shortest route 612.300 m exceeds reach 400.000 m`
	// Options says why each option failed, for a caller that explains it in its own words;
	// empty when the demand itself is invalid (Reason says why).
	Options []OptionFailure
}

// Why an option of an infeasible demand failed.
const (
	FailNoPath      = "no-path"       // no path joins the ends at all
	FailNoPathFlags = "no-path-flags" // none on the edges the option may use (ExcludeFlags)
	FailReach       = "reach"         // the shortest usable path is longer than the reach
	FailDucts       = "ducts"         // every path within reach crosses ducts too full
)

// OptionFailure is why one option of an infeasible demand failed.
type OptionFailure struct {
	Option       int
	Name         string
	Kind         string // FailNoPath, FailNoPathFlags, FailReach or FailDucts
	ExcludeFlags uint64 // the option's, for FailNoPathFlags
	// BlockFlags, for FailNoPathFlags, are those of ExcludeFlags on the shortest path between
	// the demand's ends over every edge: what on the way the link would take keeps the
	// option out, not every kind of edge it may not use.
	BlockFlags uint64
	ShortestM  float64 // for FailReach: the shortest usable path, in metres
	ReachM     float64 // for FailReach: the option's MaxRouteM
	// Full, for FailDucts, are the capacity-limited edges of the shortest path the option may
	// use (within its reach) that have no room for its cable as the plan fills them, in path
	// order: where ducts would have to be added for the demand to be routed that way.
	Full []FullEdge
}

// FullEdge is an edge with no room for an infeasible option's cable (OptionFailure.Full).
type FullEdge struct {
	Edge   int // index into Problem.Edges
	Ducts  int // the edge's spare ducts before the plan (Edge.Ducts), and those the plan adds
	Cables int // cables the plan pulls along it, every cable of every routed leg
}

// EdgeFill is the load of one edge that carries at least one cable.
type EdgeFill struct {
	Edge   int // index into Problem.Edges
	Cables int // cables pulled along the edge, each of a leg's Option.Cables (a diverse demand's two legs never share one)
	// Limited is false for an edge with unlimited capacity (no duct data); the duct and area
	// figures are then zero.
	Limited bool
	// Ducts is the spare ducts before the plan (0 on a proposed edge); AddedDucts the ducts
	// the plan lays along the edge (Edge.LaidDucts): on an existing edge the trench beside
	// the full ducts, with as many as its cables need or AddTrenchDucts, whichever is more;
	// on a proposed edge every duct it is built with.
	Ducts      int
	AddedDucts int
	// UsedAreaMM2 is the cables' cross-section in mm²; AllowedAreaMM2 is the NFPA 70
	// Chapter 9 Table 1 area allowed in the ducts used, packing the cables first-fit in demand
	// order (53 % of a duct for one cable, 31 % for two, 40 % for more).
	UsedAreaMM2    float64
	AllowedAreaMM2 float64
	// Demands are the demands whose cables a limited edge carries, in the order they are
	// packed into its ducts (first fit, install.Load.Takes): install.DuctBank.Pull given their
	// cables in this order and Ducts+AddedDucts ducts places what the optimizer placed. Nil on
	// an unlimited edge.
	Demands []int
}

// Solution is the result of Solve.
type Solution struct {
	Routes     []Route      // one per demand, in demand order
	Infeasible []Infeasible // in demand order
	Opened     []int        // proposed edges the plan opens, ascending
	Charged    []int        // charges (indices into Problem.Charges) whose edges carry a route, ascending
	Fill       []EdgeFill   // edges that carry cables, ascending by edge index
	TotalCents int64        // Σ Routes[i].Cost.Total()
	TotalM     float64      // Σ route metres over all legs
	Rounds     int          // improvement rounds run
	// LowerBoundCents is a proved lower bound, in cents, on the cost of every plan that routes
	// the same demands as this one and gives each diverse demand at least as many legs
	// (lowerbound.go: a dual ascent on the linear relaxation of the fixed-charge network design
	// problem); TotalCents − LowerBoundCents bounds what a better plan could save. It is -1 for
	// the length objective, which computes no bound.
	LowerBoundCents int64
	// StartUnused lists, ascending, the demands whose route in Settings.Start did not fit the
	// problem (see Settings.Start) and were placed afresh; a start route with Option -1 is
	// not listed. Nil without a start.
	StartUnused []int
	// StartNoRoom lists, by demand ascending, the demands of StartUnused whose start route
	// fits the problem but not the ducts: kept after the start routes kept before it (in
	// demand order), its cables would leave the ducts of capacity-limited edges overfull by
	// the packing every plan is held to (state.go's flush, capacity.go's rule: NFPA 70
	// Chapter 9 Table 1 fill, the jam band and the count of pulls, install.Load.Takes): no
	// duct there has room and none may be added,
	// or a cable is wider than one duct takes. Nil when there are none.
	StartNoRoom []StartNoRoom
	// CrossingAvoidedCents is what keeping the diverse demands off shared places
	// (Problem.Sites) costs together: TotalCents less the objective of the plan with every
	// demand whose Route.CrossingAvoidedCents is above 0 moved onto its cheaper pair at once.
	// The routes' own figures each hold the rest of the plan fixed and need not add up to it.
	CrossingAvoidedCents int64
}

// StartNoRoom is a demand whose start route was placed afresh because its cables did not fit
// the ducts (Solution.StartNoRoom).
type StartNoRoom struct {
	Demand int   // index into Problem.Demands
	Edges  []int // the edges of its route its cables would have left overfull, ascending
}
