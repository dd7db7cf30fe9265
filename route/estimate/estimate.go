package estimate

import (
	"cmp"
	"context"
	"fmt"
	"maps"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"spanwright/geo"
	"spanwright/geo/input"
	"spanwright/media"
	"spanwright/media/install"
	"spanwright/route/internal/ctxio"
	"spanwright/route/items"
	"spanwright/route/plan"
	"spanwright/route/routing"
	"spanwright/route/site"
)

// StandardGravity turns a cable's mass per metre into its weight per metre, in m/s²
// (9.80665 exactly, CGPM 1901).
const StandardGravity = 9.80665

// Conduit bend radius, as a multiple of the duct's internal diameter (TIA-569): 10 × ID for
// optical fibre (from memory); for copper 6 × ID up to 2 in (50.8 mm) and 10 × ID above
// (seen). The pulling plan puts every bend of a duct at this radius.
const (
	BendRadiusFibreID       = 10.0
	BendRadiusCopperSmallID = 6.0
	BendRadiusCopperLargeID = 10.0
	SmallConduitIDMM        = 50.8 // 2 in, in mm
)

// Estimate is the installation takeoff and priced bill of materials of a planned scenario.
type Estimate struct {
	Pulls []PullSection // every pull of every feasible leg, in leg order
	// AddedPullPoints is the number of distinct intermediate pull points the pulls need, each
	// billed as a handhole; legs that need one at the same place share it.
	AddedPullPoints int
	// PullPointsAdded are those pull points, each once (as AddedPullPoints counts them), in
	// the order the legs' pulls first add them: where each is, for the safety cautions that
	// name every handhole the plan digs.
	PullPointsAdded []PullPoint
	Fill            []DuctFill // each duct holding cable on a span of limited capacity, by span and duct
	// SplicePoints is every splice point to build (a mid-span join no structure within its
	// reel's reach takes, routing.SplicePoint.NoStructure), one a place, in the order the legs
	// first join there: the bill's count (SplicePointItem) and the structures table's rows.
	SplicePoints []SplicePointToBuild
	Buildings    []Connectivity
	Construction Construction
	Quantities   []media.Quantity // what the BOM prices, before merging
	// Bases are the quantities bid items are priced per unit of, counted once (bidBases); the
	// zero value when the price book has no bid items.
	Bases         media.BidBases
	BOM           *media.BOM
	Warnings      []string // pulls over rating, cables that fit no duct, conduit bends too tight
	BudgetWarning string   // the total is over the plan's budget; "" when not
	// JamWarnings are the duct sizes whose jam verdict a duct a few per cent wider or
	// narrower would turn, one warning a size (jamWarnings); also among Warnings.
	JamWarnings []string
}

// PullSection is one pull of one cable between two pull points, in the leg's travel order
// (from the served building towards the cross-connect). Tension is computed for conduit
// (pathway type duct) only: cable laid in tunnels, trays, on poles or in a trench is not
// pulled through a duct, and every change to or from duct is a pull point.
type PullSection struct {
	Leg      int       // index in Result.Legs
	Seq      int       // 1-based within the leg
	From, To PullPoint // the pull points at its ends
	Spans    []string  // span IDs in the section, in travel order
	// StartM is where the section starts along the leg's route from its served building, in
	// metres: a leg's sections start at 0 and follow on up to its route (routing.Leg.RouteM),
	// a counted lateral at the served end first, then the spans from SpansStartM.
	StartM float64
	// SpansStartM is where the leg's spans start on StartM's scale: the counted lateral at its
	// served building (0 without one).
	SpansStartM float64
	LengthM     float64
	BendDeg     float64 // sum of the section's bends, in degrees
	// BendRadiusM is the conduit bend radius the capstan's sidewall pressure uses (TIA-569
	// multiples of the duct ID), the smallest in the section; 0 without bends.
	BendRadiusM  float64
	FeedAt       PullPoint // the pull point where the cable is fed: From or To
	TensionN     float64   // highest tension of the pull from FeedAt, in newtons
	OtherN       float64   // highest tension when fed from the other end, in newtons
	RatedN       float64   // the construction's maximum pulling tension, in newtons
	SWBPNPerM    float64   // highest sidewall bearing pressure at a bend, T/R, in N/m
	AddedFrom    bool      // From is a pull point the plan adds
	AddedTo      bool      // To is a pull point the plan adds
	WithinRating bool
	// Over lists the limits it goes over (why not within rating) as numbers, written in an
	// output's units by install.Why.
	Over []install.Excess
	// Lateral is the entrance whose counted lateral the section pulls: from the building to
	// where it ends in a structure or taps a duct (site.Site.Tap), a pull of its own with no
	// span; or, where it carries a duct on from the duct's dangling end, as part of the pull
	// along that duct with the turn between them. "" for a section along spans alone. A
	// lateral at the served end lies before the first span (StartM below SpansStartM).
	Lateral string
}

// SpansText is what the section runs along, for the outputs, in travel order: its span IDs,
// and "lateral of" and the entrance for a lateral in it.
func (p PullSection) SpansText() string {
	switch {
	case p.Lateral == "":
		return strings.Join(p.Spans, " ")
	case len(p.Spans) == 0:
		return "lateral of " + p.Lateral
	case p.StartM < p.SpansStartM-0.01: // at the served end, before the spans
		return "lateral of " + p.Lateral + " " + strings.Join(p.Spans, " ")
	}
	return strings.Join(p.Spans, " ") + " lateral of " + p.Lateral
}

// PullPoint is one end of a pull section: a structure, junction or building by its ID, or a
// handhole the plan adds on a span, AtM metres from the span's from end. Its length stays a
// number here; Text writes it in the units of the output it goes to.
type PullPoint struct {
	ID   string  // structure, junction or building ID; "" for a handhole the plan adds
	Span string  // the span an added handhole stands on; "" for an ID
	AtM  float64 // where on Span, in metres from its from end
	// Splice marks the leg's splice point to build there (routing.SplicePoint.NoStructure):
	// a reel ends there, so the pull does (not a handhole the pulling plan adds).
	Splice bool
	// End names Span's from end, which AtM counts from (geo.Network.EndName; on a counted
	// lateral, its building).
	End string
}

// Text is the pull point as a person reads it: its ID, or "new handhole on SPAN, LENGTH from
// the END end" (routing.AlongText) with the offset written by length (the output's units; a
// number and its unit).
func (p PullPoint) Text(length func(m float64) string) string {
	switch {
	case p.Span == "":
		return p.ID
	case p.Splice:
		return "splice point to build " + routing.AlongText(p.Span, p.End, p.AtM, length)
	}
	return "new handhole " + routing.AlongText(p.Span, p.End, p.AtM, length)
}

// MetresText writes a length as the estimate's warnings do (summary.json keeps them
// metric): one decimal and "m".
func MetresText(m float64) string { return strconv.FormatFloat(m, 'f', 1, 64) + " m" }

// String is Text in metres (MetresText).
func (p PullPoint) String() string { return p.Text(MetresText) }

// DuctFill is the fill of one duct of a span (NFPA 70 Chapter 9 Table 1) and, for three
// cables of equal diameter, its jam ratio 1.05·D/d, jam-prone from 2.8 to 3.2 (NFPA 70
// Chapter 9 Table 1 Informational Note No. 2, seen).
type DuctFill struct {
	Span, PathwayID string
	Duct            int  // 1-based
	Added           bool // a duct the plan adds
	DuctIDMM        float64
	CablesODMM      []float64 // the occupants' outside diameters: the cables, or their innerducts
	// Legs names the leg (routing.Leg.Label) of each cable in the duct, one entry per cable
	// (a leg of two cables twice), in the order the packing was given them: the optimizer's
	// link order on a span it limits, leg order on new construction (CablesODMM is in the
	// order placed, largest first on new construction).
	Legs      []string
	Innerduct bool // the occupants are innerducts, one per cable (design.innerduct_od_mm)
	// Pulls is the count of pulls the packing kept the duct to (install.PullLimit: the
	// design's cables_per_duct for loose cables; 0: no count, innerducts or fill alone).
	Pulls      int
	FillPct    float64 // occupants' area as a percentage of the duct's area
	AllowedPct float64 // 53, 31 or 40 % for 1, 2 or more cables
	OK         bool
	JamRatio   float64 // 0 when the jam check does not apply
	JamRisk    bool
	// Unplaced marks the row of a span's cables that fit none of its ducts (install.Load.Takes:
	// too wide, or every duct full or jam-prone for them): Duct is 0, CablesODMM lists them,
	// FillPct and AllowedPct are 0 and OK is false. Every cable the legs pull along a span of
	// limited capacity is in exactly one row of it.
	Unplaced bool
}

// Crowded reports whether the duct holds more separate cables than its count of pulls
// (install.Crowded); false for cables that fit no duct.
func (f DuctFill) Crowded() bool { return !f.Unplaced && install.Crowded(len(f.CablesODMM), f.Pulls) }

// Note is what an installer is told of the duct: that too many separate cables are pulled into
// it (install.CrowdedNote); "" for none or for cables that fit no duct. The packing keeps to
// the count (install.Load.Takes), so a planned duct has none: the note is a check.
func (f DuctFill) Note() string {
	if f.Unplaced {
		return ""
	}
	return install.CrowdedNote(len(f.CablesODMM), f.Pulls)
}

// Connectivity is what one building terminates: fibre strands on adapter panels in
// enclosures, pigtail splices in trays, copper cables on patch panels.
type Connectivity struct {
	Building      string
	FibreStrands  int
	CopperCables  int
	AdapterPanels map[int]int // panels by port count
	Enclosures    map[int]int // enclosures by port count
	CopperPanels  map[int]int // copper patch panels by port count
	SpliceTrays   int
}

// Construction is the new civil work of a plan, in metres and counts.
type Construction struct {
	// TrenchM is the new trench by surface (opened spans and trenches for added ducts), BoreM
	// the same built by directional bore (pathways with method bore): each the bill's line,
	// its pieces' metres added up and rounded to 0.1 m (listPieces).
	TrenchM map[string]float64
	BoreM   float64
	// PathwayM is the proposed pathways opened that are not dug (items.Dug: a pole line, a
	// cable tray, a utility tunnel), by pathway type, each the bill's line of
	// items.NewPathway, to 0.1 m as TrenchM; not in NewM.
	PathwayM map[string]float64
	// ByKind is the new construction by kind: every kind of NewKinds in order, 0 where the
	// plan builds none: trench the bill's trench lines of every surface added up, bore its
	// bore line, a pole line, cable tray or utility tunnel its line of PathwayM, each the
	// metres the bill charges (listPieces). Computed once here and printed from here
	// everywhere (summary.json's new_construction_m, the terminal, the report, the sweep's
	// rows and comparisons).
	ByKind []KindM
	// NewM is all new civil work in metres, trenched or bored: the trench and bore of ByKind
	// (the sum of the bill's trench and bore lines, each to 0.1 m as the bill rounds a line),
	// which the Pieces' ListedM add up to (listPieces); printed from here everywhere
	// (summary.json's new_trench_m, terminal, report, sweeps).
	NewM float64
	// LateralM is the part of NewM that is building laterals counted as new construction
	// (Entrances with a LateralM): built whether or not the plan may open new spans; the
	// laterals' ListedM added up.
	LateralM float64
	// Pieces are the pieces of new work in the order counted: opened spans, counted laterals,
	// trenches beside existing ducts.
	Pieces []WorkPiece
	// pieceOfSpan and pieceOfLateral index Pieces by span, and by building and entrance
	// (listPieces): read-only once built, as the writers run side by side.
	pieceOfSpan    map[string]int
	pieceOfLateral map[[2]string]int
	AddedDuctM     float64 // duct metres added: new duct in opened duct spans plus added ducts
	// AddedDuctWalls is the building walls that ducts added beside full ones enter where the
	// full ducts already do: each takes a penetration of its own (items.AddedDuctWalls).
	AddedDuctWalls int
	// HoleWalls is the walls of existing maintenance holes that new duct enters (opened duct
	// spans and ducts added beside full ones): each takes an entry (items.HoleWalls,
	// items.HoleEntries).
	HoleWalls int
	// HoleEntries are those entries, one per wall, in the order counted: the maintenance
	// hole (junction ID) and the span whose new duct enters it (items.HolesEntered), which
	// the bill's line is from and the structures table names.
	HoleEntries []HoleEntry
	// NewJunctions, TapJunctions and TurnJunctions are the handholes the plan adds at
	// junctions with no structure (routing.Routed.Handholes), each junction in one of them
	// only, under the first of its reasons (routing.Handhole.Purpose), by junction ID in the
	// network's order: NewJunctions where opened pathways join the network (common practice,
	// no published source); TapJunctions where counted laterals of the Entrances tap the side
	// of a duct (site.Site.Tap); TurnJunctions where a route turns from one pathway into
	// another (geo.PassNeedsStructure).
	NewJunctions  []string
	TurnJunctions []string
	// RunHandholes are the handholes placed along the opened runs of new construction
	// (routing.Routed.Runs), in run order.
	RunHandholes []RunHandhole
	// Entrances are the building entrances the plan uses (routing.Routed.Entrances); their
	// counted laterals are in TrenchM or BoreM and AddedDuctM.
	Entrances []routing.EntranceUse
	// TapJunctions: see NewJunctions.
	TapJunctions []string
	// Assumed is the new trench priced on the design's assumed_surface because the campus
	// gives its pathway no surface (items.SurfaceAssumed), in the order it is counted: opened
	// spans, counted laterals, trenches beside existing ducts, each of its Pieces' ListedM.
	// Its surface is TrenchM's key AssumedSurface.
	Assumed        []AssumedWork
	AssumedSurface string
	// SizedDucts are the opened duct spans built to size: those whose cables need more ducts
	// than the design lays (items.NewDucts), in the order the plan opened them. Their ducts
	// are all in AddedDuctM, laid in the span's one trench or bore.
	SizedDucts []SizedDucts
	// ForCount is the new work the plan lays only for the count of pulls
	// (design.cables_per_duct): computed once here, from each span's routing.ForCount, and
	// printed from here everywhere (terminal, summary.json, report).
	ForCount CountWork
}

// NewKinds are the kinds of new construction, in the order every output lists them: how
// new work is built (items.MethodOf), trench (with the restoration of its surface) or
// directional bore for a dug pathway (items.Dug), and for a proposed pathway that is not dug
// its type: a pole line (aerial), a cable tray, a utility tunnel (items.NewPathway).
var NewKinds = []string{geo.MethodTrench, geo.MethodBore, geo.TypeAerial, geo.TypeTray, geo.TypeTunnel}

// KindM is the metres of new construction of one kind of NewKinds (Construction.ByKind).
type KindM struct {
	Kind    string
	LengthM float64
}

// CountWork is the new work laid only because of the count of pulls a duct
// (design.cables_per_duct, install.PullLimit): ducts beside existing banks and in opened
// duct spans, and trench or bore beside existing banks, that the NFPA 70 Chapter 9 Table 1
// fill and the jam band alone would not need on the plan's routes (routing.ForCount: the
// same cables packed both ways; the optimizer might route otherwise without the count).
type CountWork struct {
	DuctM   float64 // duct metres laid for the count (in AddedDuctM)
	TrenchM float64 // metres of trench or bore beside existing banks laid for the count (in NewM)
	Cents   int64   // what they cost, as the optimizer prices them (optimize.Edge.AddedCents)
	Spans   []CountSpan
	// Where names the Spans by the stretches of pathway drawn (geo.Network.Stretches), as the
	// bill names new work: what the report and the terminal say.
	Where []string
}

// CountSpan is one span where the count of pulls lays new work: Ducts ducts of LengthM,
// and the trench or bore beside the span when Trench.
type CountSpan struct {
	Span    string
	Ducts   int
	Trench  bool
	LengthM float64
	Cents   int64
}

// SizedDucts is an opened duct span that gets more ducts than the design's new_ducts:
// Ducts in all, Design of them the design's (at least one).
type SizedDucts struct {
	Span          string
	Ducts, Design int
	LengthM       float64
}

// AssumedWork is new trench priced on an assumed surface: what it is for (a bill source,
// "span D-4" or "entrance E-1 of building B") and its metres.
type AssumedWork struct {
	From    string
	LengthM float64
	Lateral bool // a counted lateral to an entrance, else a span
}

// RunHandhole is a handhole along new construction: on a span, AtM metres from its From end.
type RunHandhole struct {
	Span string
	AtM  float64
}

// fibre tells whether the leg's medium is optical fibre.
func (r *run) fibre(l *routing.Leg) bool {
	m := r.Engine.Catalog().Medium(l.Medium)
	return m != nil && m.Fibre()
}

// Input is what an estimate is built from: a routed plan.
type Input struct {
	Site   *site.Site
	Plan   *plan.Plan // nil (a plan assembled by hand): the zero design and no budget
	Engine *media.Engine
	Legs   []routing.Leg // Build sets each feasible leg's Cost from its bill items
	Fill   []routing.SegmentFill
	Opened []string // proposed spans the plan builds, by span ID
	// Handholes are the handholes the plan adds at junctions without a structure
	// (routing.Routed.Handholes); the pulling plan takes those where routes turn as pull points.
	Handholes []routing.Handhole
	// Runs are the opened runs of new construction with their handholes, and Entrances the
	// entrances the legs use (routing.Routed).
	Runs      []site.NewRun
	Entrances []routing.EntranceUse
}

// run is one estimate being built.
type run struct {
	Input
	Estimate *Estimate
	// newFrom names the spans of each line of new construction, for the bill's From: by
	// trench surface, and under keyBore and keyAddedDuct.
	newFrom map[string][]string
	// runHH holds the handholes along new construction by span ID, at metres from its From end.
	runHH map[string][]float64
	// newDucts holds the ducts each opened duct span is built with (the optimizer's count,
	// routing.SegmentFill.AddedDucts), read once in ductFill and billed from here in
	// construction.
	newDucts map[string]int
	// spliceJoins is the bill's sources of the splice points to build, one per join that
	// needs one (splicePoints).
	spliceJoins []string
}

// Keys of run.newFrom beside the trench surfaces.
const (
	keyBore      = "\x00bore"
	keyPathway   = "\x00new pathway " // and the pathway type: a proposed pathway that is not dug
	keyAddedDuct = "\x00added duct"
	keyDuctWall  = "\x00added duct's wall"
	keyHoleWall  = "\x00new duct's maintenance hole wall"
)

// Sources of bill quantities (media.Quantity.From).
func fromLeg(l *routing.Leg) string { return "leg " + l.Label() }
func fromBuilding(b string) string  { return "building " + b }
func fromSpan(id string) string     { return "span " + id }

// stretches names the spans among from (fromSpan) by the stretches of pathway drawn
// (geo.Network.Stretches), the rest as they are, sorted: a line of the bill names the work
// on one drawn duct once, however many spans the candidates' taps cut it into.
func (r *run) stretches(from []string) []string {
	var ids, out []string
	for _, f := range from {
		if id, ok := strings.CutPrefix(f, fromSpan("")); ok {
			ids = append(ids, id)
		} else {
			out = append(out, f)
		}
	}
	if len(ids) == 0 {
		return from
	}
	out = append(out, r.Site.Net.Stretches(ids)...)
	slices.Sort(out)
	return slices.Compact(out)
}
func fromEntrance(e routing.EntranceUse) string {
	return "entrance " + e.Entrance + " of building " + e.Building
}

// fromHoleEntry names a maintenance hole entry by the hole and the span whose new duct
// enters it (tester 11's finding 12: the bill named the span alone).
// fromHoleEntry and fromWall name a wall new duct along a pathway enters, a maintenance
// hole's or a building's, by the pathway drawn: not by span, which a junction where a counted
// lateral might tap cuts (review 20 F5).
func fromHoleEntry(hole, pathway string) string {
	return "maintenance hole " + hole + " for pathway " + pathway
}
func fromWall(building, pathway string) string {
	return "building " + building + " for pathway " + pathway
}

// fromPoleRiser names a pole riser by the handhole at the pole's foot (the lateral's tap)
// and the entrance whose lateral comes down it.
func fromPoleRiser(e routing.EntranceUse) string {
	if e.Tap == "" {
		return fromEntrance(e)
	}
	return "junction " + e.Tap + " for the lateral of " + fromEntrance(e)
}

func fromJunctions(ids []string) []string {
	out := make([]string, len(ids))
	for i, id := range ids {
		out[i] = "junction " + id
	}
	return out
}

// sourced sets the From of every quantity of qs to from.
func sourced(qs []media.Quantity, from []string) []media.Quantity {
	for i := range qs {
		qs[i].From = from
	}
	return qs
}

// Build builds the installation takeoff and prices it: pulling plans, duct fill,
// connectivity, construction and the bill of materials. A price the plan needs and the
// book lacks is an error naming its key. When ctx is done it returns ctx's error.
func Build(ctx context.Context, in Input) (*Estimate, error) {
	r := &run{Input: in, Estimate: &Estimate{}}
	e := r.Estimate
	added := map[string]bool{}
	r.runHH = site.HandholesBySpan(r.Runs)
	// Each leg's pulls are its own: planned side by side, assembled in leg order.
	pulls := make([]legPulls, len(r.Legs))
	if err := ctxio.Each(ctx, len(r.Legs), func(i int) {
		if r.Legs[i].Feasible {
			pulls[i] = r.pullPlan(i)
		}
	}); err != nil {
		return nil, err
	}
	for _, p := range pulls {
		e.Pulls = append(e.Pulls, p.sections...)
		e.Warnings = append(e.Warnings, p.warnings...)
		for n, k := range p.added {
			if !added[k] {
				e.PullPointsAdded = append(e.PullPointsAdded, p.addedAt[n])
			}
			added[k] = true
		}
	}
	e.AddedPullPoints = len(added)
	r.splicePoints()
	for _, step := range []func(){r.ductFill, r.connectivity, r.construction, r.quantities} {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		step()
	}
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	bom, err := r.Engine.PriceBook().Bill(e.Quantities)
	if err != nil {
		return nil, fmt.Errorf("bill of materials: %w", err)
	}
	e.BOM = bom
	e.Warnings = append(e.Warnings, bom.NotPriced(r.Engine.PriceBook().File)...)
	if r.Plan == nil {
		return e, nil
	}
	if budget := int64(r.Plan.Budget); budget > 0 && bom.TotalCents > budget {
		e.BudgetWarning = fmt.Sprintf("the total %s %s is over the budget %s by %s (%.1f %%)", media.FormatCents(bom.TotalCents), bom.Currency,
			media.FormatCents(budget), media.FormatCents(bom.TotalCents-budget), 100*float64(bom.TotalCents-budget)/float64(budget))
	}
	return e, nil
}

// legPulls is what pullPlan finds for one leg.
type legPulls struct {
	sections []PullSection
	warnings []string
	added    []string    // the intermediate pull points it adds, keyed by place
	addedAt  []PullPoint // where each of added is, parallel to it
}

// ends records the pull points section sec adds at its ends (keyed fromKey and toKey) and
// the end ps is fed from, the one with the lower tension, with the other way's tension.
func (e *legPulls) ends(ps *PullSection, sec *install.Section, fromKey, toKey string) {
	if sec.StartAdded {
		e.added, e.addedAt = append(e.added, fromKey), append(e.addedAt, ps.From)
	}
	if sec.EndAdded {
		e.added, e.addedAt = append(e.added, toKey), append(e.addedAt, ps.To)
	}
	ps.FeedAt, ps.OtherN = ps.From, sec.Reverse.MaxTensionN
	if sec.Best == install.Reverse {
		ps.FeedAt, ps.OtherN = ps.To, sec.Forward.MaxTensionN
	}
}

// pullPlan plans the pulls of leg i: its sections, its warnings and the intermediate pull
// points it adds. It changes nothing of r, so legs may be planned side by side.
func (r *run) pullPlan(i int) legPulls {
	s, d := r.Site, r.Plan.Design
	var e legPulls
	leg := &r.Legs[i]
	med := r.Engine.Catalog().Medium(leg.Medium)
	k := med.Construction(leg.Construction)
	// One plan of pull points for all the leg's cables, each pulled on its own: the heaviest
	// one's weight against the lowest rating of any (of 288 + 12 indoor-outdoor fibres, the
	// 288's weight and the 12's 1335 N), so that every cable may be pulled at the points it gives.
	spec := install.PullSpec{WNPerM: leg.Cable.Cables.HeaviestKgPerM() * StandardGravity, Mu: d.PullMu,
		MaxTensionN: k.LeastPullRatingN(leg.Cable.Cables), MaxBendDeg: d.PullBendDeg, MaxLengthM: d.PullMaxM, MaxSWBPNPerM: d.PullMaxSWBPNPerM}
	juncs := s.JunctionsOf(leg.Steps)
	cum := make([]float64, len(leg.Steps)+1)
	spans := make([]geo.Span, len(leg.Steps))
	for j, st := range leg.Steps {
		spans[j], _ = s.Net.Span(st.SpanID)
		cum[j+1] = cum[j] + spans[j].LengthM
	}
	cableBendM := k.BendRadiusMM(leg.Cable.Cables.Largest(), true) / 1000
	tight := ""
	radius := func(sp *geo.Span) float64 {
		f := BendRadiusFibreID
		if !med.Fibre() {
			f = BendRadiusCopperLargeID
			if sp.DuctMM <= SmallConduitIDMM {
				f = BendRadiusCopperSmallID
			}
		}
		rm := f * sp.DuctMM / 1000
		if rm < cableBendM && tight == "" {
			tight = fmt.Sprintf("%s %s: conduit bend radius %.2f m on span %s is below the cable's %.2f m at rated tension",
				leg.Link.ID, leg.Name, rm, sp.ID, cableBendM)
		}
		return rm
	}
	// A counted lateral that ends in a structure or taps a duct (where the plan builds a
	// handhole) is pulled on its own: the spans' pulls start and end there, not at the building.
	// A lateral that carries a duct on from its dangling end is pulled with that duct: before
	// the first span (carryTo) or after the last (carryFrom), with the turn between them.
	var head, tail *geo.Span // the spans at the served end and at the cross-connect
	if len(spans) > 0 {
		head, tail = &spans[0], &spans[len(spans)-1]
	}
	latTo, carryTo := r.lateralEnd(leg.Link.To, leg.EntranceTo, head)
	// The sections are placed from the served building, whose counted lateral (pulled on its
	// own, with the first duct, or not at all) comes before the spans, as in the leg's route.
	served, _ := s.Net.Entry(leg.Link.To, leg.EntranceTo)
	lead := served.LateralM
	latFrom, carryFrom := r.lateralEnd(leg.Link.From, leg.EntranceFrom, tail)
	endM := cum[len(cum)-1]
	name := func(x float64) (at PullPoint, key string) {
		switch { // in a carried lateral: its building, or a handhole the plan adds along it
		case carryTo.ID != "" && x < -0.01:
			if off := x + carryTo.LateralM; off > 0.01 {
				return PullPoint{Span: "lateral of " + carryTo.ID, AtM: off, End: leg.Link.To}, fmt.Sprintf("L:%s@%.0f", carryTo.ID, off)
			}
			return PullPoint{ID: leg.Link.To}, "B:" + leg.Link.To
		case carryFrom.ID != "" && x > endM+0.01:
			if off := endM + carryFrom.LateralM - x; off > 0.01 {
				return PullPoint{Span: "lateral of " + carryFrom.ID, AtM: off, End: leg.Link.From}, fmt.Sprintf("L:%s@%.0f", carryFrom.ID, off)
			}
			return PullPoint{ID: leg.Link.From}, "B:" + leg.Link.From
		}
		for j, c := range cum {
			if math.Abs(x-c) < 0.01 {
				switch {
				case j == 0 && latTo.ID == "" && carryTo.ID == "":
					return PullPoint{ID: leg.Link.To}, "B:" + leg.Link.To
				case j == len(cum)-1 && latFrom.ID == "" && carryFrom.ID == "":
					return PullPoint{ID: leg.Link.From}, "B:" + leg.Link.From
				}
				return PullPoint{ID: juncs[j]}, "J:" + juncs[j]
			}
		}
		j := sort.SearchFloat64s(cum, x) - 1
		j = min(max(j, 0), len(spans)-1)
		off := x - cum[j]
		if leg.Steps[j].Reverse {
			off = spans[j].LengthM - off
		}
		at = PullPoint{Span: spans[j].ID, AtM: off, End: s.Net.EndName(spans[j].From)}
		at.Splice = slices.ContainsFunc(leg.Cable.Splices, func(p routing.SplicePoint) bool {
			return p.NoStructure && p.Span == at.Span && math.Abs(p.AtM-off) < 0.01
		})
		return at, fmt.Sprintf("S:%s@%.0f", spans[j].ID, off)
	}
	seq := 0
	// lateral pulls the counted lateral of entrance en, from building b to junction at, as
	// straight duct (its turn into the duct or structure is taken there), from start along
	// the leg.
	lateral := func(en geo.Entry, b string, start float64, served bool) {
		plan, err := s.Pulls.Sections([]install.Step{{Kind: install.KindStraight, LengthM: en.LateralM}}, nil, spec)
		if err != nil {
			e.warnings = append(e.warnings, fmt.Sprintf("%s %s: no pulling plan for the lateral of %s: %v", leg.Link.ID, leg.Name, en.ID, err))
			return
		}
		at := func(x float64) (PullPoint, string) { // x metres from the building
			switch {
			case x < 0.01:
				return PullPoint{ID: b}, "B:" + b
			case x > en.LateralM-0.01:
				return PullPoint{ID: en.Junction}, "J:" + en.Junction
			}
			return PullPoint{Span: "lateral of " + en.ID, AtM: x, End: b}, fmt.Sprintf("L:%s@%.0f", en.ID, x)
		}
		for _, sec := range plan.Sections {
			seq++
			ps := PullSection{Leg: i, Seq: seq, LengthM: sec.LengthM, TensionN: sec.MaxTensionN, RatedN: spec.MaxTensionN,
				SWBPNPerM: sec.MaxSWBPNPerM, AddedFrom: sec.StartAdded, AddedTo: sec.EndAdded, WithinRating: sec.WithinRating,
				Over: sec.Over, Lateral: en.ID}
			ps.StartM, ps.SpansStartM = start+sec.StartM+lead, lead
			var fromKey, toKey string
			if served { // travel order: from the building to the junction
				ps.From, fromKey = at(sec.StartM)
				ps.To, toKey = at(sec.StartM + sec.LengthM)
			} else { // from the junction to the building
				ps.From, fromKey = at(en.LateralM - sec.StartM)
				ps.To, toKey = at(en.LateralM - sec.StartM - sec.LengthM)
			}
			e.ends(&ps, &sec, fromKey, toKey)
			if !sec.WithinRating {
				e.warnings = append(e.warnings, fmt.Sprintf("%s %s: pull %d from %s to %s: %s; reroute or add a structure",
					leg.Link.ID, leg.Name, seq, ps.From, ps.To, sec.Reason()))
			}
			e.sections = append(e.sections, ps)
		}
	}
	if latTo.ID != "" {
		lateral(latTo, leg.Link.To, -latTo.LateralM, true)
	}
	for j := 0; j < len(spans); {
		if spans[j].Type != geo.TypeDuct {
			j++
			continue
		}
		first := j
		var steps []install.Step
		var points []int
		// atPoint: the cable is at a pull point, where a bend is taken inside the structure
		// (site.NewRuns places handholes at bends so).
		atPoint := func() bool { return len(points) > 0 && points[len(points)-1] == len(steps) }
		pre := 0.0 // metres of carried lateral before the group's first span
		if first == 0 && carryTo.ID != "" {
			pre = carryTo.LateralM
			steps = append(steps, install.Step{Kind: install.KindStraight, LengthM: pre})
			if turn := s.Net.LateralTurnDeg(carryTo.Lateral, leg.Steps[0], true); turn > 0 {
				steps = append(steps, install.Step{Kind: install.KindBend, AngleDeg: turn, RadiusM: radius(&spans[0])})
			}
		}
		for ; j < len(spans) && spans[j].Type == geo.TypeDuct; j++ {
			sp := &spans[j]
			rm := radius(sp)
			if j > first {
				if s.IsStructure(juncs[j]) || leg.Cable.Passes(juncs[j]) {
					// a structure, or a handhole the plan adds that the leg passes (its turn, new
					// pathway joining, or another leg's, built into its duct run)
					points = append(points, len(steps))
				} else if turn := s.Net.TurnDeg(leg.Steps[j-1], leg.Steps[j]); turn > 0 && !atPoint() {
					rb := math.Min(rm, radius(&spans[j-1]))
					steps = append(steps, install.Step{Kind: install.KindBend, AngleDeg: turn, RadiusM: rb})
				}
			}
			// The handholes along new construction on this span, and the leg's own splice points
			// to build on it (a reel ends there, so a pull does too: tester 9's finding 3, a
			// 5.9 km pull through the joins of 3.8 km reels), as metres into it in travel order.
			var hh []float64
			from := func(at float64) {
				if leg.Steps[j].Reverse {
					at = sp.LengthM - at
				}
				hh = append(hh, at)
			}
			for _, at := range r.runHH[sp.ID] {
				from(at)
			}
			for _, p := range leg.Cable.Splices {
				if p.NoStructure && p.Span == sp.ID {
					from(p.AtM)
				}
			}
			slices.Sort(hh)
			segs := s.SegmentsM(sp)
			travelM := 0.0
			for q := range segs {
				qq, bq := q, q-1
				if leg.Steps[j].Reverse {
					qq, bq = len(segs)-1-q, len(segs)-1-q
				}
				if q > 0 && bq < len(sp.BendsDeg) && sp.BendsDeg[bq] > 0 && !atPoint() {
					steps = append(steps, install.Step{Kind: install.KindBend, AngleDeg: sp.BendsDeg[bq], RadiusM: rm})
				}
				straight := func(m float64) {
					n := len(steps)
					split := len(points) > 0 && points[len(points)-1] == n
					if n > 0 && steps[n-1].Kind == install.KindStraight && (q > 0 || j == first) && !split {
						steps[n-1].LengthM += m // straight on: one straight
					} else {
						steps = append(steps, install.Step{Kind: install.KindStraight, LengthM: m})
					}
				}
				segM := segs[qq]
				for len(hh) > 0 && hh[0] <= travelM+segM+1e-9 {
					part := max(hh[0]-travelM, 0)
					if part > 1e-9 {
						straight(part)
					} else if n := len(steps); n > 0 && steps[n-1].Kind == install.KindBend {
						steps = steps[:n-1] // a bend at a handhole is taken inside it (site.NewRuns)
					}
					if !atPoint() { // a splice point where a handhole stands already is one point
						points = append(points, len(steps))
					}
					travelM, segM, hh = travelM+part, segM-part, hh[1:]
				}
				if segM > 1e-9 {
					straight(segM)
				}
				travelM += segM
			}
		}
		if j == len(spans) && carryFrom.ID != "" {
			if turn := s.Net.LateralTurnDeg(carryFrom.Lateral, leg.Steps[j-1], false); turn > 0 && !atPoint() {
				steps = append(steps, install.Step{Kind: install.KindBend, AngleDeg: turn, RadiusM: radius(&spans[j-1])})
			}
			steps = append(steps, install.Step{Kind: install.KindStraight, LengthM: carryFrom.LateralM})
		}
		plan, err := s.Pulls.Sections(steps, points, spec)
		if err != nil {
			e.warnings = append(e.warnings, fmt.Sprintf("%s %s: no pulling plan: %v", leg.Link.ID, leg.Name, err))
			continue
		}
		for _, sec := range plan.Sections {
			seq++
			start := cum[first] + sec.StartM - pre
			end := start + sec.LengthM
			ps := PullSection{Leg: i, Seq: seq, StartM: start + lead, SpansStartM: lead, LengthM: sec.LengthM, BendDeg: sec.BendDeg,
				TensionN: sec.MaxTensionN, RatedN: spec.MaxTensionN, SWBPNPerM: sec.MaxSWBPNPerM,
				AddedFrom: sec.StartAdded, AddedTo: sec.EndAdded, WithinRating: sec.WithinRating, Over: sec.Over}
			var fromKey, toKey string
			ps.From, fromKey = name(start)
			ps.To, toKey = name(end)
			e.ends(&ps, &sec, fromKey, toKey)
			for _, st := range sec.Steps {
				if st.Kind == install.KindBend && (ps.BendRadiusM == 0 || st.RadiusM < ps.BendRadiusM) {
					ps.BendRadiusM = st.RadiusM
				}
			}
			for q := first; q < j; q++ {
				if cum[q] < end-0.01 && cum[q+1] > start+0.01 {
					ps.Spans = append(ps.Spans, spans[q].ID)
				}
			}
			switch {
			case pre > 0 && start < -0.01:
				ps.Lateral = carryTo.ID
			case j == len(spans) && carryFrom.ID != "" && end > endM+0.01:
				ps.Lateral = carryFrom.ID
			}
			if !sec.WithinRating {
				e.warnings = append(e.warnings, fmt.Sprintf("%s %s: pull %d from %s to %s: %s; reroute or add a structure",
					leg.Link.ID, leg.Name, seq, ps.From, ps.To, sec.Reason()))
			}
			e.sections = append(e.sections, ps)
		}
	}
	if latFrom.ID != "" {
		lateral(latFrom, leg.Link.From, cum[len(cum)-1], false)
	}
	if tight != "" {
		e.warnings = append(e.warnings, tight)
	}
	return e
}

// lateralEnd sorts out the counted lateral of building b's entrance id at one end of a leg,
// whose span at that end is sp (nil without spans): pulled on its own (own: it ends in a
// structure, or taps a duct where the plan builds a handhole), or pulled with sp when sp is a
// duct it carries on from its dangling end (carried); the zero Entry for what it is not (no
// lateral at all: both).
func (r *run) lateralEnd(b, id string, sp *geo.Span) (own, carried geo.Entry) {
	en, ok := r.Site.Net.Entry(b, id)
	switch {
	case !ok || en.LateralM <= 0:
	case r.Site.IsStructure(en.Junction) || r.Site.TapOf(en):
		return en, geo.Entry{}
	case sp != nil && sp.Type == geo.TypeDuct:
		return geo.Entry{}, en
	}
	return geo.Entry{}, geo.Entry{}
}

// ductFill checks every duct of every span of limited capacity that carries cable, with
// the chosen cables' outside diameters, in the optimizer's order (routing.SegmentFill.Links),
// and the ducts of new construction. Which cable goes in which duct is install.DuctBank.Spread:
// the cables first fit places (install.DuctBank.Pull, as the optimizer packs them, in the
// ducts it counted: at most design.cables_per_duct loose cables a duct, install.PullLimit), each carried on in the
// duct it holds on the span before where that duct takes it. Cables that fit no duct get a row
// of their own, not OK.
func (r *run) ductFill() {
	e := r.Estimate
	var design plan.Design // a Result assembled by hand may lack its plan
	if r.Plan != nil {
		design = r.Plan.Design
	}
	// The cables each link pulls along each span, in leg order: a diverse link's two legs
	// share no span.
	type onSpan struct {
		link, leg string
		ods       []float64
	}
	bySpan := map[string][]onSpan{}
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		ods := l.Cable.Cables.ODsMM() // each cable its own diameter: 288 + 12 are 20 and 10.5 mm
		if design.Innerduct() {
			for j := range ods {
				ods[j] = design.InnerductODMM // every cable in a duct is in an innerduct of its own
			}
		}
		link := ""
		if l.Link != nil { // a leg assembled by hand may lack its link
			link = l.Link.ID
		}
		for _, st := range l.Steps {
			bySpan[st.SpanID] = append(bySpan[st.SpanID], onSpan{link, l.Label(), ods})
		}
	}
	// cables lists a span's cables in the optimizer's packing order (the links in order), then
	// any the optimizer did not count, in leg order; legs names the leg of each.
	cables := func(span string, order []string) (ods []float64, legs []string) {
		on := bySpan[span]
		done := make([]bool, len(on))
		take := func(k int) {
			ods, done[k] = append(ods, on[k].ods...), true
			legs = append(legs, slices.Repeat([]string{on[k].leg}, len(on[k].ods))...)
		}
		for _, id := range order {
			for k := range on {
				if !done[k] && on[k].link == id {
					take(k)
					break
				}
			}
		}
		for k := range on {
			if !done[k] {
				take(k)
			}
		}
		return ods, legs
	}
	// legsIn names the legs of the cables a packing put in duct d, in the order placed (the
	// order of the duct's CablesODMM), or, for d -1, of those in none, in input order.
	legsIn := func(a install.Assignment, legs []string, d int) []string {
		var out []string
		if d >= 0 {
			for _, i := range a.Cables[d] {
				out = append(out, legs[i])
			}
			return out
		}
		for i, at := range a.DuctOf {
			if at == d {
				out = append(out, legs[i])
			}
		}
		return out
	}
	pulls := install.PullLimit(design.Innerduct(), design.CablesPerDuct) // as every packing's
	// pack fills the ducts of a span, existing ones first; ducts from `added` on are new.
	pack := func(sp *geo.Span, added int, a install.Assignment, ods []float64, legs []string, hint string) {
		if a.Err != nil {
			e.Warnings = append(e.Warnings, fmt.Sprintf("span %s: duct fill: %v", sp.ID, a.Err))
			return
		}
		for d, df := range a.Ducts {
			if len(df.CablesODMM) == 0 {
				continue
			}
			e.Fill = append(e.Fill, DuctFill{Span: sp.ID, PathwayID: sp.PathwayID, Duct: d + 1, Added: d >= added,
				DuctIDMM: sp.DuctMM, CablesODMM: df.CablesODMM, Legs: legsIn(a, legs, d), Innerduct: design.Innerduct(), Pulls: pulls, FillPct: df.Pct, AllowedPct: df.AllowedPct,
				OK: df.OK && !df.JamRisk, JamRatio: df.JamRatio, JamRisk: df.JamRisk})
		}
		if a.Unplaced > 0 {
			e.Warnings = append(e.Warnings, fmt.Sprintf("span %s: %d of %d cables fit no duct within NFPA 70 Chapter 9 fill and jam limits%s",
				sp.ID, a.Unplaced, len(ods), hint))
			var left []float64
			for i, d := range a.DuctOf {
				if d < 0 {
					left = append(left, ods[i])
				}
			}
			e.Fill = append(e.Fill, DuctFill{Span: sp.ID, PathwayID: sp.PathwayID, DuctIDMM: sp.DuctMM, CablesODMM: left,
				Legs: legsIn(a, legs, -1), Innerduct: design.Innerduct(), Pulls: pulls, Unplaced: true})
		}
	}
	// Every span of limited capacity, new construction among them: its ducts are the spare
	// ones and those the plan lays (routing.SegmentFill.AddedDucts, the optimizer's count,
	// which it priced), its cables packed in the optimizer's order. An opened duct span is
	// built to size, so every duct of it is new (Ducts 0) and only a cable no empty duct
	// takes is left out.
	type limited struct {
		f    routing.SegmentFill
		sp   geo.Span
		bank install.DuctBank
		ods  []float64
		legs []string
		a    install.Assignment
	}
	var spans []*limited
	for _, f := range r.Fill {
		if f.Limited {
			sp, _ := r.Site.Net.Span(f.Span)
			ods, legs := cables(f.Span, f.Links)
			spans = append(spans, &limited{f: f, sp: sp, bank: install.DuctBank{Ducts: f.Ducts + f.AddedDucts, IDMM: sp.DuctMM, Innerduct: design.Innerduct(), CablesPerDuct: design.CablesPerDuct}, ods: ods, legs: legs})
		}
	}
	// A cable carried on from one span into the next of its leg in the same duct (geo's
	// PassStraight: pieces of one pathway, or one run of duct through a junction) keeps its
	// duct number where the two spans have ducts of one size: the spans are packed the
	// fullest first (then the longest; the id only breaks an exact tie), each cable preferring
	// the duct it holds on such a span next to it already packed (install.DuctBank.Spread). A
	// duct number the span does not have is no preference. Where the cable turns into another
	// pathway at a structure, it takes whichever duct the packing gives it.
	packOrder := slices.Clone(spans)
	slices.SortStableFunc(packOrder, func(a, b *limited) int {
		return cmp.Or(cmp.Compare(len(b.ods), len(a.ods)), cmp.Compare(b.sp.LengthM, a.sp.LengthM), strings.Compare(a.sp.ID, b.sp.ID))
	})
	// carriedOn lists, for each leg, the spans it passes from one into the next in one duct,
	// both ways: span → the spans next to it on the leg so.
	carriedOn := map[string]map[string][]string{}
	isLimited := map[string]bool{}
	for _, x := range spans {
		isLimited[x.sp.ID] = true
	}
	straight := map[[3]string]bool{} // PassAt, once per junction and pair of spans (it may scan the network)
	for i := range r.Legs {
		l := &r.Legs[i]
		for k := 1; k < len(l.Steps); k++ {
			a, b := l.Steps[k-1], l.Steps[k]
			if !isLimited[a.SpanID] || !isLimited[b.SpanID] {
				continue
			}
			sa, _ := r.Site.Net.Span(a.SpanID)
			at := sa.To
			if a.Reverse {
				at = sa.From
			}
			pair := [3]string{at, a.SpanID, b.SpanID}
			is, seen := straight[pair]
			if !seen {
				pass, ok := r.Site.Net.PassAt(at, a.SpanID, b.SpanID)
				is = ok && pass == geo.PassStraight
				straight[pair] = is
			}
			if !is {
				continue
			}
			if carriedOn[l.Label()] == nil {
				carriedOn[l.Label()] = map[string][]string{}
			}
			carriedOn[l.Label()][a.SpanID] = append(carriedOn[l.Label()][a.SpanID], b.SpanID)
			carriedOn[l.Label()][b.SpanID] = append(carriedOn[l.Label()][b.SpanID], a.SpanID)
		}
	}
	// The spans are packed outward from the fullest along the ducts cables are carried on in
	// (breadth first, the fuller next span first), so a span is packed next to one already
	// packed wherever one is.
	byID, rank := map[string]*limited{}, map[string]int{}
	for k, x := range packOrder {
		byID[x.sp.ID], rank[x.sp.ID] = x, k
	}
	next := map[string][]string{} // span → the limited spans a cable is carried on into from it
	for _, on := range carriedOn {
		for a, bs := range on {
			for _, b := range bs {
				if byID[a] != nil && byID[b] != nil && !slices.Contains(next[a], b) {
					next[a] = append(next[a], b)
				}
			}
		}
	}
	var order []*limited
	queued := map[string]bool{}
	for _, seed := range packOrder {
		if queued[seed.sp.ID] {
			continue
		}
		queued[seed.sp.ID] = true
		for queue := []*limited{seed}; len(queue) > 0; queue = queue[1:] {
			x := queue[0]
			order = append(order, x)
			ns := next[x.sp.ID]
			slices.SortFunc(ns, func(a, b string) int { return cmp.Compare(rank[a], rank[b]) })
			for _, n := range ns {
				if !queued[n] {
					queued[n] = true
					queue = append(queue, byID[n])
				}
			}
		}
	}
	packed := map[string]*limited{}
	ductsOf := map[string]map[string][]int{} // span → leg → the duct of each of its cables there
	for _, x := range order {
		prefer := make([]int, len(x.ods))
		nth := map[string]int{}
		for i, leg := range x.legs {
			j := nth[leg]
			nth[leg]++
			prefer[i] = -1
			for _, next := range carriedOn[leg][x.sp.ID] {
				if y := packed[next]; prefer[i] < 0 && y != nil && y.bank.IDMM == x.bank.IDMM && j < len(ductsOf[next][leg]) {
					prefer[i] = ductsOf[next][leg][j]
				}
			}
		}
		x.a = x.bank.Spread(x.ods, prefer)
		packed[x.sp.ID] = x
		ductsOf[x.sp.ID] = map[string][]int{}
		for i, leg := range x.legs {
			ductsOf[x.sp.ID][leg] = append(ductsOf[x.sp.ID][leg], x.a.DuctOf[i])
		}
	}
	r.newDucts = map[string]int{}
	for _, x := range spans {
		hint := ""
		if x.sp.Status == geo.StatusProposed {
			r.newDucts[x.sp.ID] = x.f.AddedDucts
			hint = "; each too large for an empty duct (one cable: 53 % fill)"
		}
		pack(&x.sp, x.f.Ducts, x.a, x.ods, x.legs, hint)
	}
	e.JamWarnings = jamWarnings(e.Fill, design.Innerduct(), design.CablesPerDuct)
	e.Warnings = append(e.Warnings, e.JamWarnings...)
}

// cover is the cheapest combination of the given sizes (ascending, each priced at
// cents[size]) holding at least n ports: an unbounded min-cost cover solved exactly by
// dynamic programming over port counts 0..n. Among equal costs it takes the fewest units,
// then the most of the largest size, then of the next (common practice, no published
// source). Each order is kept by adding one unit to both sides, so the best cover of c ports
// is the best of the best cover of c-s ports plus one unit of each size s. It is empty for
// n <= 0 or no sizes. Time O(n·k), memory O(n·k) for k sizes.
func cover(sizes []int, cents map[int]int64, n int) map[int]int {
	out := map[int]int{}
	if n <= 0 || len(sizes) == 0 {
		return out
	}
	type best struct {
		cents, units int64
		count        []int // units by size, as sizes
	}
	better := func(a, b best) bool {
		if a.cents != b.cents {
			return a.cents < b.cents
		}
		if a.units != b.units {
			return a.units < b.units
		}
		for i := len(sizes) - 1; i >= 0; i-- {
			if a.count[i] != b.count[i] {
				return a.count[i] > b.count[i]
			}
		}
		return false
	}
	dp := make([]best, n+1)
	dp[0] = best{count: make([]int, len(sizes))}
	for c := 1; c <= n; c++ {
		for i, s := range sizes {
			prev := dp[max(c-s, 0)]
			cand := best{cents: prev.cents + cents[s], units: prev.units + 1, count: slices.Clone(prev.count)}
			cand.count[i]++
			if dp[c].count == nil || better(cand, dp[c]) {
				dp[c] = cand
			}
		}
	}
	for i, k := range dp[n].count {
		if k > 0 {
			out[sizes[i]] = k
		}
	}
	return out
}

// counts are the sizes the book prices for each item, ascending, and their prices in cents.
func counts(p *media.PriceBook, items ...string) (map[string][]int, map[string]map[int]int64) {
	sizes, cents := map[string][]int{}, map[string]map[int]int64{}
	for _, k := range p.Keys() {
		for _, it := range items {
			if k.Item == it {
				sizes[it] = append(sizes[it], k.Count)
				if cents[it] == nil {
					cents[it] = map[int]int64{}
				}
				cents[it][k.Count], _ = p.Price(k)
			}
		}
	}
	return sizes, cents
}

// connectivity sizes what each building terminates. Each fibre cable end gets its own
// adapter panels (the cheapest covering its strands) and its pigtail splices their own
// trays; a building's enclosures hold all its panel ports; copper cables share the
// building's patch panels (common practice, no published source).
func (r *run) connectivity() {
	p := r.Engine.PriceBook()
	sizes, cents := counts(p, media.PriceAdapterPanel, media.PriceEnclosure, media.PriceCopperPanel)
	panels, encl, copper := sizes[media.PriceAdapterPanel], sizes[media.PriceEnclosure], sizes[media.PriceCopperPanel]
	// The covers asked for, by item and port count: most cable ends terminate the same few
	// strand counts and most buildings hold the same few ports. Read only; kept maps are cloned.
	type coverKey struct {
		item string
		n    int
	}
	covers := map[coverKey]map[int]int{}
	coverOf := func(item string, sizes []int, n int) map[int]int {
		k := coverKey{item, n}
		v, ok := covers[k]
		if !ok {
			v = cover(sizes, cents[item], n)
			covers[k] = v
		}
		return v
	}
	byB := map[string]*Connectivity{}
	get := func(b string) *Connectivity {
		c, ok := byB[b]
		if !ok {
			c = &Connectivity{Building: b, AdapterPanels: map[int]int{}, Enclosures: map[int]int{}, CopperPanels: map[int]int{}}
			byB[b] = c
		}
		return c
	}
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		for _, b := range []string{l.Link.From, l.Link.To} {
			c := get(b)
			if !r.fibre(l) {
				c.CopperCables += l.Cable.Terminated
				continue
			}
			c.FibreStrands += l.Cable.Terminated
			for size, n := range coverOf(media.PriceAdapterPanel, panels, l.Cable.Terminated) {
				c.AdapterPanels[size] += n
			}
			c.SpliceTrays += p.TraysFor(l.Cable.Terminated)
		}
	}
	names := make([]string, 0, len(byB))
	for b := range byB {
		names = append(names, b)
	}
	sort.Strings(names)
	for _, b := range names {
		c := byB[b]
		ports := 0
		for size, n := range c.AdapterPanels {
			ports += size * n
		}
		if c.FibreStrands > 0 && len(panels) == 0 {
			ports = c.FibreStrands
		}
		c.Enclosures = maps.Clone(coverOf(media.PriceEnclosure, encl, ports))
		c.CopperPanels = maps.Clone(coverOf(media.PriceCopperPanel, copper, c.CopperCables))
		r.Estimate.Buildings = append(r.Estimate.Buildings, *c)
	}
}

// newWork counts new work along a span built by method (items.MethodOf): bored, or trenched
// on its surface (items.SurfaceOf, noting an assumed one); from records the span under its
// line. A counted lateral is the span sp with no ID, of building and entrance en.
func (c *Construction) newWork(d plan.Design, sp *geo.Span, method string, from map[string][]string, source string, en routing.EntranceUse) {
	w := WorkPiece{Span: sp.ID, Method: method, LengthM: sp.LengthM, source: source}
	if sp.ID == "" {
		w.Building, w.Entrance = en.Building, en.Entrance
	}
	if method == geo.MethodBore {
		c.BoreM += sp.LengthM
		from[keyBore] = append(from[keyBore], source)
		w.line = keyBore
		c.Pieces = append(c.Pieces, w)
		return
	}
	if method != geo.MethodTrench { // a pathway that is not dug, built as its type (items.MethodOf)
		c.PathwayM[method] += sp.LengthM
		from[keyPathway+method] = append(from[keyPathway+method], source)
		w.line = keyPathway + method
		c.Pieces = append(c.Pieces, w)
		return
	}
	sf := items.SurfaceOf(d, sp)
	c.TrenchM[sf] += sp.LengthM
	from[sf] = append(from[sf], source)
	w.Surface, w.line = sf, sf
	if items.SurfaceAssumed(sp, method) {
		w.assumed = true
		c.AssumedSurface = sf
	}
	c.Pieces = append(c.Pieces, w)
}

// WorkPiece is one piece of new civil work: an opened span, the trench beside a span for
// added ducts, or a counted lateral.
type WorkPiece struct {
	Span               string // the span; "" for a lateral
	Building, Entrance string // a counted lateral's building and entrance; "" for a span
	Method             string // geo.MethodTrench, geo.MethodBore, or a pathway type that is not dug (items.MethodOf)
	Surface            string // a trench's surface (items.SurfaceOf); "" for a bore or a pathway not dug
	LengthM            float64
	// ListedM is LengthM to 0.1 m as every output lists the piece (plan.gpkg's
	// new_construction, the report's work on an assumed surface), apportioned so that the
	// pieces of one bill line (a trench surface, the bore) add up to that line's metres, as
	// the bill rounds them: see listPieces.
	ListedM float64

	source  string // the bill's from text
	line    string // the bill line: the surface, keyBore, or keyPathway and the type
	assumed bool   // priced on design.assumed_surface (items.SurfaceAssumed)
}

// listPieces sets each piece's ListedM and the totals the outputs print from them: NewM,
// LateralM and Assumed. Rounding each piece and each total on its own gave totals that
// their listed parts do not add up to (laterals of 17.0, 17.1 and 12.0 m under "46.2 m of
// it building laterals"; a bill of 6291.1 m of trench and 1501.3 m of bore under 7792.3 m
// of new trench: tester 5, finding 16). So the pieces of each bill line get decimetres by
// the largest-remainder method (Hamilton's apportionment: each piece its length rounded down
// to 0.1 m, then the decimetres the line still lacks to the pieces with the largest
// remainders, ties to the earlier piece) adding up to the line as the bill rounds it
// (media.BOM: the line's metres to 0.1 m); each piece stays within 0.1 m of its length.
// TrenchM and BoreM become those lines (the metres the bill prices are unchanged: it rounded
// each line to 0.1 m before), NewM their sum, and what is listed adds up to them. With
// --units imperial every one of these converts the same 0.1 m figures to feet.
func (c *Construction) listPieces() {
	byLine := map[string][]int{}
	var lines []string // in order of first piece
	for i, w := range c.Pieces {
		if _, seen := byLine[w.line]; !seen {
			lines = append(lines, w.line)
		}
		byLine[w.line] = append(byLine[w.line], i)
	}
	c.NewM, c.LateralM, c.Assumed = 0, 0, nil
	typeOf := func(line string) (string, bool) { return strings.CutPrefix(line, keyPathway) }
	kindDM := map[string]int64{} // decimetres of each kind of NewKinds, added up as billed
	for _, l := range lines {
		total := c.BoreM
		if t, ok := typeOf(l); ok {
			total = c.PathwayM[t]
		} else if l != keyBore {
			total = c.TrenchM[l]
		}
		idx := byLine[l]
		dm := make([]int64, len(idx))
		rest := make([]float64, len(idx))
		left := int64(math.Round(total * 10)) // as media.BOM rounds a line of metres
		for k, i := range idx {
			x := c.Pieces[i].LengthM * 10
			dm[k] = int64(math.Floor(x))
			rest[k] = x - float64(dm[k])
			left -= dm[k]
		}
		order := make([]int, len(idx))
		for k := range order {
			order[k] = k
		}
		sort.SliceStable(order, func(a, b int) bool { return rest[order[a]] > rest[order[b]] })
		// The floors add up to at most the line's decimetres, and those to less than the
		// floors plus one per piece: 0 <= left <= len(idx).
		for k := 0; left > 0 && k < len(order); k++ {
			dm[order[k]]++
			left--
		}
		var lineDM int64
		for k, i := range idx {
			c.Pieces[i].ListedM = float64(dm[k]) / 10
			lineDM += dm[k]
		}
		// The line itself as billed: its metres to 0.1 m, so that the bill's quantity, and
		// the feet an imperial bill converts from it, are those of the listed pieces.
		if t, ok := typeOf(l); ok {
			c.PathwayM[t] = float64(lineDM) / 10
			kindDM[t] += lineDM
		} else if l == keyBore {
			c.BoreM = float64(lineDM) / 10
			kindDM[geo.MethodBore] += lineDM
		} else {
			c.TrenchM[l] = float64(lineDM) / 10
			kindDM[geo.MethodTrench] += lineDM
		}
	}
	c.NewM = float64(kindDM[geo.MethodTrench]+kindDM[geo.MethodBore]) / 10
	c.ByKind = make([]KindM, 0, len(NewKinds))
	for _, k := range NewKinds {
		c.ByKind = append(c.ByKind, KindM{Kind: k, LengthM: float64(kindDM[k]) / 10})
		delete(kindDM, k)
	}
	if len(kindDM) > 0 { // a pathway type not dug that NewKinds does not list yet
		panic("estimate: new construction of a kind NewKinds lacks: " + strings.Join(slices.Sorted(maps.Keys(kindDM)), ", "))
	}
	c.pieceOfSpan, c.pieceOfLateral = map[string]int{}, map[[2]string]int{}
	for i, w := range c.Pieces {
		if w.Span == "" {
			c.LateralM += w.ListedM
			c.pieceOfLateral[[2]string{w.Building, w.Entrance}] = i
		} else {
			c.pieceOfSpan[w.Span] = i
		}
		if w.assumed {
			c.Assumed = append(c.Assumed, AssumedWork{From: w.source, LengthM: w.ListedM, Lateral: w.Span == ""})
		}
	}
	c.LateralM = float64(int64(math.Round(c.LateralM*10))) / 10
}

// PieceOf is the new work along span id (opened, or a trench beside it for added ducts);
// false when the plan builds none there.
func (c *Construction) PieceOf(span string) (WorkPiece, bool) {
	i, ok := c.pieceOfSpan[span]
	if !ok {
		return WorkPiece{}, false
	}
	return c.Pieces[i], true
}

// LateralPiece is PieceOf the counted lateral to a building's entrance.
func (c *Construction) LateralPiece(building, entrance string) (WorkPiece, bool) {
	i, ok := c.pieceOfLateral[[2]string{building, entrance}]
	if !ok {
		return WorkPiece{}, false
	}
	return c.Pieces[i], true
}

// construction totals the new civil work: opened spans (trench and restoration on their
// surface, or a directional bore, and a duct when the span is a duct), added ducts on existing
// spans (one trench or bore beside the span however many ducts it gets) and a handhole where an opened span meets the
// network at a junction without a structure.
func (r *run) construction() {
	s := r.Site
	c := Construction{TrenchM: map[string]float64{}, PathwayM: map[string]float64{}}
	r.newFrom = map[string][]string{}
	var design plan.Design
	if r.Plan != nil {
		design = r.Plan.Design
	}
	for _, id := range r.Opened {
		sp, _ := s.Net.Span(id)
		c.newWork(design, &sp, items.MethodOf(r.Engine.PriceBook(), design, &sp), r.newFrom, fromSpan(id), routing.EntranceUse{})
		if sp.Type == geo.TypeDuct {
			n, own := items.NewDucts(design), r.newDucts[id] // items.Opening, built to size
			if own > n {
				c.SizedDucts = append(c.SizedDucts, SizedDucts{Span: id, Ducts: own, Design: n, LengthM: sp.LengthM})
				n = own
			}
			c.AddedDuctM += float64(n) * sp.LengthM
			r.newFrom[keyAddedDuct] = append(r.newFrom[keyAddedDuct], fromSpan(id))
		}
		if items.EntersHoles(sp.Type) {
			c.holeWalls(s, &sp, r.newFrom)
		}
	}
	for _, run := range r.Runs {
		for _, h := range run.Handholes {
			id := run.Steps[h.Step].SpanID
			c.RunHandholes = append(c.RunHandholes, RunHandhole{Span: id, AtM: h.AtM})
		}
	}
	// Counted laterals are built as new construction (items.Entrance).
	c.Entrances = r.Entrances
	for _, en := range r.Entrances {
		if en.LateralM <= 0 {
			continue
		}
		lat := &geo.Span{Type: geo.TypeDuct, LengthM: en.LateralM}
		c.newWork(design, lat, items.MethodOf(r.Engine.PriceBook(), design, lat), r.newFrom, fromEntrance(en), en)
		c.AddedDuctM += float64(items.NewDucts(design)) * en.LateralM // no duct size: the design's
		r.newFrom[keyAddedDuct] = append(r.newFrom[keyAddedDuct], fromEntrance(en))
	}
	// The handholes are the routing's (routing.Routed.Handholes): the optimizer's charges it
	// paid and the taps of the entrances used, one per junction, so the bill counts what the
	// model counted.
	for _, h := range r.Handholes {
		switch h.Purpose() {
		case routing.PurposeJoin:
			c.NewJunctions = append(c.NewJunctions, h.Junction)
		case routing.PurposeTap:
			c.TapJunctions = append(c.TapJunctions, h.Junction)
		default:
			c.TurnJunctions = append(c.TurnJunctions, h.Junction)
		}
	}
	builtAt := s.BuiltEntriesAt()
	for _, f := range r.Fill {
		if _, opened := r.newDucts[f.Span]; f.AddedDucts > 0 && !opened {
			// A trench beside a full duct, laid with the ducts the optimizer priced
			// (optimize.Edge.LaidDucts).
			sp, _ := s.Net.Span(f.Span)
			c.newWork(design, &sp, items.MethodOf(r.Engine.PriceBook(), design, &sp), r.newFrom, fromSpan(f.Span), routing.EntranceUse{})
			c.AddedDuctM += float64(f.AddedDucts) * sp.LengthM
			r.newFrom[keyAddedDuct] = append(r.newFrom[keyAddedDuct], fromSpan(f.Span))
			if n := items.AddedDuctWalls(builtAt, &sp); n > 0 {
				c.AddedDuctWalls += n
				for _, e := range s.Net.Entrances {
					if e.Built && (e.Junction == sp.From || e.Junction == sp.To) {
						r.newFrom[keyDuctWall] = append(r.newFrom[keyDuctWall], fromWall(e.Building, sp.PathwayID))
					}
				}
			}
			c.holeWalls(s, &sp, r.newFrom)
		}
	}
	for _, f := range r.Fill {
		if fc := f.ForCount; fc.Ducts > 0 || fc.Trench || fc.Cents > 0 {
			sp, _ := s.Net.Span(f.Span)
			c.ForCount.Spans = append(c.ForCount.Spans, CountSpan{Span: f.Span, Ducts: fc.Ducts, Trench: fc.Trench, LengthM: sp.LengthM, Cents: fc.Cents})
			c.ForCount.DuctM += float64(fc.Ducts) * sp.LengthM
			if fc.Trench {
				c.ForCount.TrenchM += sp.LengthM
			}
			c.ForCount.Cents += fc.Cents
		}
	}
	if len(c.ForCount.Spans) > 0 {
		var ids []string
		for _, sp := range c.ForCount.Spans {
			ids = append(ids, sp.Span)
		}
		c.ForCount.Where = s.Net.Stretches(ids)
	}
	c.listPieces()
	r.Estimate.Construction = c
	if w := c.assumedWarning(); w != "" {
		r.Estimate.Warnings = append(r.Estimate.Warnings, w)
	}
}

// holeWalls counts the walls of existing maintenance holes the new duct or buried cable along span sp enters
// (items.HoleWalls), and the span among those the bill line is from.
func (c *Construction) holeWalls(s *site.Site, sp *geo.Span, from map[string][]string) {
	for _, hole := range items.HolesEntered(s, sp) {
		c.HoleWalls++
		c.HoleEntries = append(c.HoleEntries, HoleEntry{Hole: hole, Span: sp.ID})
		from[keyHoleWall] = append(from[keyHoleWall], fromHoleEntry(hole, sp.PathwayID))
	}
}

// HoleEntry is one wall of an existing maintenance hole that new duct (or a new trench's
// buried cable) enters: the hole's junction ID and the span of the new work.
type HoleEntry struct{ Hole, Span string }

// HoleEntryPurpose is the structures table's purpose of a maintenance hole that new duct
// along span enters (Construction.HoleEntries): "new duct entry (D-12)".
func HoleEntryPurpose(span string) string { return "new duct entry (" + span + ")" }

// PoleRiserPurpose is the structures table's purpose of the handhole at a pole's foot that
// a counted lateral's riser comes down into (routing.EntranceUse.PoleRiser, its Tap):
// "pole riser (lateral of FARM:1)".
func PoleRiserPurpose(entrance string) string { return "pole riser (lateral of " + entrance + ")" }

// assumedWarning is the one line that tells an estimator how much new trench was priced on
// the design's assumed surface; "" when none was. The report lists each span and lateral.
func (c *Construction) assumedWarning() string {
	if len(c.Assumed) == 0 {
		return ""
	}
	var m float64
	spans, laterals := 0, 0
	for _, a := range c.Assumed {
		m += a.LengthM
		if a.Lateral {
			laterals++
		} else {
			spans++
		}
	}
	var what []string
	if spans > 0 {
		what = append(what, input.Counted(spans, "span", "spans"))
	}
	if laterals > 0 {
		what = append(what, input.Counted(laterals, "counted lateral", "counted laterals"))
	}
	return fmt.Sprintf("new trench priced on an assumed surface, %s (design.assumed_surface): %s, %.1f m, to which the campus gives no surface; the report lists them",
		c.AssumedSurface, strings.Join(what, " and "), m)
}

// PatchCordItem is the bill item of the patch cords of leg l, one at each end from its panel to
// the equipment: "patch cord os2, duplex" for an application over two fibres, "patch cord
// om4, 8-fibre array" for parallel optics (its application's fibres, media.Application
// .Strands), "patch cord cat6a" for copper. One price per medium prices either
// (patch_cords_each). The connector (LC, MPO) is the equipment's, which the catalog does not
// name.
func PatchCordItem(cat *media.Catalog, l *routing.Leg) string {
	item := "patch cord " + l.Medium
	a := cat.Application(l.Application)
	m := cat.Medium(l.Medium)
	switch {
	case a == nil || m == nil || !m.Fibre():
	case a.Strands == 2:
		item += ", duplex"
	default:
		item += fmt.Sprintf(", %d-fibre array", a.Strands)
	}
	return item
}

// ProtectorItem is the bill item of the primary protectors of a copper leg whose route leaves
// the buildings (routing.Leg.Outdoor): one at each end of each 4-pair cable, where it enters
// the building from outside. NFPA 70 800.90 (seen; Article 805 for communications circuits)
// asks for a listed primary protector there wherever the circuit is exposed (to lightning, or
// to accidental contact with power conductors: from memory), which the plan cannot tell from
// the campus, so every such end is counted. Priced at primary_protector_each, or listed not
// priced (media.PriceBook.NotPriced). The bonding conductor to the building's grounding
// electrode system is part of the protector's installation here (NFPA 70 800.100, from
// memory), not a line of its own.
const ProtectorItem = "primary protector, copper cable end entering a building"

// SplicePointToBuild is one splice point to build: its place (the first leg's join there;
// on a span when Span is set, else off the spans along that leg's cable) and the legs joining
// there, as indexes into the result's legs, in leg order.
type SplicePointToBuild struct {
	At   routing.SplicePoint
	Legs []int
}

// splicePoints lists the splice points to build (Estimate.SplicePoints) and warns of each
// join that needs one, in leg then splice order: a join no structure within its reel's reach
// takes, or one placed at its reel's end to spare the leg a join (routing.SplicePoint.NoStructure,
// AtReelEnd), needs a splice point built there, one a place, serving every cable of every leg
// that joins there (legs sharing a route and reel lengths join at the same places). The bill's
// line (quantities) comes from there, with one source per join (run.spliceJoins).
func (r *run) splicePoints() {
	e := r.Estimate
	places := map[string]int{}
	e.SplicePoints, r.spliceJoins = nil, nil
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		for n, sp := range l.Cable.Splices {
			if !sp.NoStructure {
				continue
			}
			place := sp.Text(MetresText)
			why := "has no maintenance hole or handhole within its reel's reach (" + place + ")"
			if sp.AtReelEnd {
				why = "is placed at its reel's end (" + place + "), not in the last structure before it: there the leg would take a join more"
			}
			e.Warnings = append(e.Warnings, fmt.Sprintf("%s %s: mid-span splice %d of %d %s; build a splice point there (a handhole, or a closure on an aerial span's strand): the bill's \""+SplicePointItem+"\" line, at splice_point_each",
				l.Link.ID, l.Name, n+1, len(l.Cable.Splices), why))
			k, ok := places[place]
			if !ok {
				k = len(e.SplicePoints)
				places[place] = k
				e.SplicePoints = append(e.SplicePoints, SplicePointToBuild{At: sp})
			}
			if legs := e.SplicePoints[k].Legs; len(legs) == 0 || legs[len(legs)-1] != i {
				e.SplicePoints[k].Legs = append(legs, i)
			}
			r.spliceJoins = append(r.spliceJoins, fromLeg(l))
		}
	}
}

// SplicePointItem is the bill item of a splice point built where a mid-span splice has no
// maintenance hole or handhole within its reel's reach (routing.SplicePoint.NoStructure).
const SplicePointItem = "splice point to build, mid-span splice with no structure within reach"

// legItems lists what one feasible leg puts on the bill of materials: its cables, entrance
// transitions, terminations, tests, patch cords, transceivers, reel joins, and the
// route-dependent items of its spans, ends and structure loops (package items), each for all its
// cables. The bill adds them up; the leg's cost (LegCost) is them priced one by one.
func legItems(s *site.Site, eng *media.Engine, d plan.Design, l *routing.Leg) []media.Quantity {
	p := eng.PriceBook()
	qs := make([]media.Quantity, 0, 24)
	add := func(category, item, unit string, amount float64, price media.PriceKey) {
		qs = append(qs, media.Quantity{Category: category, Item: item, Unit: unit, Amount: amount, Price: price})
	}
	work := func(item, unit string, amount float64, rate media.PriceKey) {
		qs = append(qs, media.Quantity{Category: media.CategoryLabour, Item: item, Unit: unit, Amount: amount, Price: items.LabourHour, Rate: rate})
	}
	times := func(n float64, per ...media.Quantity) { qs = append(qs, items.Times(n, per...)...) }
	t := l.Cable
	n := float64(len(t.Cables))
	m := eng.Catalog().Medium(l.Medium)
	fibre := m != nil && m.Fibre()
	// One line of cable per size bought (288 + 12: a 288 and a 12 line), each all its cables.
	for _, lot := range t.Cables.Lots() {
		qs = append(qs, items.Cable(l.Medium, l.Construction, lot.Size.Count, fibre, t.OutsideLengthM()*float64(lot.Cables)))
	}
	if l.Inside != "" {
		// The entrance transitions, at the ends the engine chose (Leg.InsideAt): inside cable
		// up those risers, and at each such entrance an enclosure per cable with trays for
		// every strand it holds, all spliced through, the inside cables' ends prepared and the
		// enclosures installed.
		for _, lot := range t.InsideCables.Lots() {
			qs = append(qs, items.Cable(l.Medium, l.Inside, lot.Size.Count, true, t.InsideLengthM*float64(lot.Cables)))
		}
		// The transition ends' own items (media.TransitionEnds, which the engine and the
		// optimizer price the laying on): the bid items per cable end among them are counted
		// on the plan's totals with the leg's other cable ends (bidBases, CableTakeoff.CableEnds).
		for _, q := range media.TransitionEnds(p, t.Cables, len(t.InsideCables), t.InsideEnds) {
			if q.Category != media.CategoryBidItems {
				qs = append(qs, q)
			}
		}
	}
	ends := float64(2 * t.Terminated)
	if fibre {
		add(media.CategoryMaterial, "termination "+l.Medium+", per strand end", media.UnitEach, ends, media.PriceKey{Item: media.PriceTermination, Medium: l.Medium})
		work("terminate fibre strands", media.UnitEach, ends, media.PriceKey{Item: media.RateTermination})
		work("loss test fibre strands", media.UnitEach, float64(t.Terminated), media.PriceKey{Item: media.RateLossTest})
		work("OTDR test fibre strands", media.UnitEach, float64(t.Terminated), media.PriceKey{Item: media.RateOTDRTest})
	} else {
		add(media.CategoryMaterial, "termination "+l.Medium+", per 4-pair cable end", media.UnitEach, ends, media.PriceKey{Item: media.PriceTermination, Medium: l.Medium})
		work("terminate copper cables", media.UnitEach, ends, media.PriceKey{Item: media.RateTermination})
		work("certify copper channels", media.UnitEach, float64(t.Terminated), media.PriceKey{Item: media.RateLossTest})
	}
	add(media.CategoryMaterial, PatchCordItem(eng.Catalog(), l), media.UnitEach, 2, media.PriceKey{Item: media.PricePatchCord, Medium: l.Medium})
	if !fibre && l.Outdoor {
		add(media.CategoryMaterial, ProtectorItem, media.UnitEach, ends, media.PriceKey{Item: media.PriceProtector})
	}
	if fibre && l.Outdoor {
		// The outside cables' metallic members, if any, bonded where each end enters its
		// building (with a transition too: the outside cable enters before its splice).
		qs = append(qs, media.BondingEnds(m.Construction(l.Construction), 2*len(t.Cables))...)
	}
	if a := eng.Catalog().Application(l.Application); a != nil {
		add(media.CategoryOptics, "transceiver "+a.Transceiver, media.UnitEach, 2, media.PriceKey{Item: media.PriceTransceiver, Name: a.Transceiver})
	}
	qs = append(qs, l.Attenuators...)
	if t.Joins > 0 {
		for _, c := range t.Cables { // each cable of the leg joined (media.Cables)
			times(float64(t.Joins), items.Join(p, c.Count)...)
		}
	}
	// Along the route by pathway type; then risers, coils and entrance loops inside the buildings,
	// counted laterals and structure loops in duct.
	var alongM [len(items.PathwayTypes)]float64
	for _, st := range l.Steps {
		sp, _ := s.Net.Span(st.SpanID)
		alongM[slices.Index(items.PathwayTypes[:], sp.Type)] += sp.LengthM
	}
	for i, m := range alongM {
		if m > 0 {
			times(n, items.AlongSpan(d, items.PathwayTypes[i], m)...)
		}
	}
	times(n, items.LegEnds(l.RiserM, l.PoleRiserM, t.EndSlackM+t.EntranceLoopM, l.LateralM)...)
	times(n, items.StructureLoops(t.StructureLoopM+t.SpliceSlackM)...)
	// The crew, per cable: a pull set-up per section between the pull points the route
	// passes or ends at (the campus's structures, and the handholes the plan builds on its
	// way: routing.CableTakeoff.Structures), an entry at each maintenance hole or handhole among them (the
	// structures passed, the count its slack loops have), both ends prepared.
	// A splice point to build (a join no structure takes) is a pull point too, where the next
	// reel's pull starts, and one built as a handhole is entered to splice (tester 11's
	// finding 5: README's "every handhole the plan builds that it passes").
	var pull, entered float64
	for _, j := range s.JunctionsOf(l.Steps) {
		if items.PullPoint(s, j) {
			pull++
		}
	}
	spPull, spEntered := t.SplicePointCrew(s.Net)
	pull, entered = pull+spPull, entered+spEntered
	times(n, items.AtJunctions(p, 1+pull+float64(t.AddedStructures), float64(t.Structures)+entered)...)
	// Every cable end is prepared: both ends of each cable, and those a mid-span join adds
	// (CableTakeoff.CableEnds, less a transition's, listed with it above); every splice closure
	// is installed (CableTakeoff.Enclosures, less the transition's). Common practice, no
	// published source: a crew task per cable end and per enclosure whatever the strand count
	// (ANSI/TIA-758-B gives the splice closures' placement, not their labour, from memory).
	qs = append(qs, items.Crew(p, media.CrewCableEndPrep, float64(t.CableEnds()-t.InsideCableEnds()))...)
	qs = append(qs, items.Crew(p, media.CrewEnclosureInstall, float64(t.Enclosures()-t.TransitionEnclosures()))...)
	return qs
}

// quantities lists everything the bill of materials prices, and sets each feasible leg's
// cost from its items (legCost).
func (r *run) quantities() {
	e := r.Estimate
	p := r.Engine.PriceBook()
	e.Quantities = make([]media.Quantity, 0, 20*len(r.Legs)+8*len(e.Buildings)+8)
	add := func(category, item, unit string, amount float64, price media.PriceKey) {
		e.Quantities = append(e.Quantities, media.Quantity{Category: category, Item: item, Unit: unit, Amount: amount, Price: price})
	}
	var design plan.Design
	if r.Plan != nil {
		design = r.Plan.Design
	}
	for i := range r.Legs {
		if l := &r.Legs[i]; l.Feasible {
			items := legItems(r.Site, r.Engine, design, l)
			// The leg's cost: its items priced one by one, and its share of new construction.
			c := legCost(p, items)
			c.ConstructionCents += l.Cost.ConstructionCents
			l.Cost = c
			e.Quantities = append(e.Quantities, sourced(items, []string{fromLeg(l)})...)
		}
	}
	for _, c := range e.Buildings {
		first := len(e.Quantities)
		for _, size := range slices.Sorted(maps.Keys(c.AdapterPanels)) {
			add(media.CategoryMaterial, fmt.Sprintf("adapter panel, %d ports, one fibre each", size), media.UnitEach, float64(c.AdapterPanels[size]), media.PriceKey{Item: media.PriceAdapterPanel, Count: size})
		}
		for _, size := range slices.Sorted(maps.Keys(c.Enclosures)) {
			add(media.CategoryMaterial, fmt.Sprintf("fibre enclosure, %d ports", size), media.UnitEach, float64(c.Enclosures[size]), media.PriceKey{Item: media.PriceEnclosure, Count: size})
		}
		for _, size := range slices.Sorted(maps.Keys(c.CopperPanels)) {
			add(media.CategoryMaterial, fmt.Sprintf("copper patch panel, %d ports", size), media.UnitEach, float64(c.CopperPanels[size]), media.PriceKey{Item: media.PriceCopperPanel, Count: size})
		}
		if c.FibreStrands > 0 && len(c.AdapterPanels) == 0 {
			add(media.CategoryMaterial, "adapter panel", media.UnitEach, 1, media.PriceKey{Item: media.PriceAdapterPanel, Count: c.FibreStrands})
		}
		if c.FibreStrands > 0 && len(c.Enclosures) == 0 {
			add(media.CategoryMaterial, "fibre enclosure", media.UnitEach, 1, media.PriceKey{Item: media.PriceEnclosure, Count: c.FibreStrands})
		}
		if c.CopperCables > 0 && len(c.CopperPanels) == 0 {
			add(media.CategoryMaterial, "copper patch panel", media.UnitEach, 1, media.PriceKey{Item: media.PriceCopperPanel, Count: c.CopperCables})
		}
		if c.SpliceTrays > 0 {
			add(media.CategoryMaterial, fmt.Sprintf("splice tray, %d splices", p.TraySplices()), media.UnitEach, float64(c.SpliceTrays), media.PriceKey{Item: media.PriceSpliceTray})
		}
		installed := 0
		for _, q := range e.Quantities[first:] {
			if k := q.Price.Item; k == media.PriceEnclosure || k == media.PriceCopperPanel {
				installed += int(q.Amount)
			}
		}
		e.Quantities = append(e.Quantities, items.Crew(p, media.CrewEnclosureInstall, float64(installed))...)
		sourced(e.Quantities[first:], []string{fromBuilding(c.Building)})
	}
	con := e.Construction
	for _, sf := range slices.Sorted(maps.Keys(con.TrenchM)) {
		e.Quantities = append(e.Quantities, sourced(items.Trench(sf, con.TrenchM[sf]), r.stretches(r.newFrom[sf]))...)
	}
	one := func(q media.Quantity, from []string) media.Quantity {
		q.From = from
		return q
	}
	if con.BoreM > 0 { // a price book without bores stays valid while no plan bores
		e.Quantities = append(e.Quantities, one(items.Bore(con.BoreM), r.stretches(r.newFrom[keyBore])))
	}
	for _, t := range slices.Sorted(maps.Keys(con.PathwayM)) {
		e.Quantities = append(e.Quantities, one(items.NewPathway(t, con.PathwayM[t]), r.stretches(r.newFrom[keyPathway+t])))
	}
	e.Quantities = append(e.Quantities, one(items.AddedDuct(con.AddedDuctM), r.stretches(r.newFrom[keyAddedDuct])),
		one(items.JoinHandholes(len(con.NewJunctions)), fromJunctions(con.NewJunctions)))
	if len(con.TurnJunctions) > 0 { // a price book without handholes stays valid while no route turns
		e.Quantities = append(e.Quantities, one(items.TurnHandholes(len(con.TurnJunctions)), fromJunctions(con.TurnJunctions)))
	}
	if len(con.RunHandholes) > 0 {
		var on []string
		for _, h := range con.RunHandholes {
			if f := fromSpan(h.Span); !slices.Contains(on, f) {
				on = append(on, f)
			}
		}
		e.Quantities = append(e.Quantities, one(items.RunHandholes(len(con.RunHandholes)), r.stretches(on)))
	}
	if len(con.TapJunctions) > 0 {
		var at []string
		for _, en := range con.Entrances {
			if en.Tap != "" && slices.Contains(con.TapJunctions, en.Tap) {
				at = append(at, fromEntrance(en))
			}
		}
		e.Quantities = append(e.Quantities, one(items.TapHandholes(len(con.TapJunctions)), at))
	}
	for _, q := range items.AddedDuctEntrances(p, con.AddedDuctWalls) {
		e.Quantities = append(e.Quantities, one(q, r.newFrom[keyDuctWall]))
	}
	for _, q := range items.HoleEntries(con.HoleWalls) {
		e.Quantities = append(e.Quantities, one(q, r.newFrom[keyHoleWall]))
	}
	// The entries, new or there already (items.Entrance), one line of each.
	for _, built := range []bool{false, true} {
		var at []string
		var q []media.Quantity
		for _, en := range con.Entrances {
			if en.Built == built {
				at = append(at, fromEntrance(en))
				q = items.Entrance(p, design, 0, built, false)
			}
		}
		if len(q) > 0 {
			q[0].Amount = float64(len(at))
			e.Quantities = append(e.Quantities, one(q[0], at))
		}
	}
	// The risers of the laterals that come down a pole (items.Entrance, items.PoleRisers).
	var risers []string
	for _, en := range con.Entrances {
		if en.PoleRiser && en.LateralM > 0 {
			risers = append(risers, fromPoleRiser(en))
		}
	}
	for _, q := range items.PoleRisers(len(risers)) {
		e.Quantities = append(e.Quantities, one(q, risers))
	}
	// The added pull points come from the pulls of the legs that need them.
	var pulled []string
	for _, ps := range e.Pulls {
		if ps.AddedFrom || ps.AddedTo {
			pulled = append(pulled, fromLeg(&r.Legs[ps.Leg]))
		}
	}
	e.Quantities = append(e.Quantities, media.Quantity{Category: media.CategoryConstruction, Item: "handhole for an added pull point",
		Unit: media.UnitEach, Amount: float64(e.AddedPullPoints), Price: media.PriceKey{Item: media.PriceStructure, Name: geo.StructureHandhole}, From: pulled})
	// The splice points to build (splicePoints): priced at splice_point_each, or listed not
	// priced (media.PriceBook.NotPriced), so that the total and summary.json's not_priced say
	// they are left out. Like the added pull points, not in any leg's cost.
	e.Quantities = append(e.Quantities, media.Quantity{Category: media.CategoryConstruction, Item: SplicePointItem,
		Unit: media.UnitEach, Amount: float64(len(e.SplicePoints)), Price: media.PriceKey{Item: media.PriceSplicePoint}, From: r.spliceJoins})
	if len(p.BidItems) > 0 {
		e.Bases = r.bidBases()
		for _, q := range p.BidQuantities(e.Bases) {
			q.From = []string{"plan"} // the whole plan's: its bases are counted over every leg and span
			e.Quantities = append(e.Quantities, q)
		}
	}
}

// bidBases counts, once, the quantities the price book's bid items may be priced per unit of:
// new trench and bore metres (Construction.NewM); metres of aerial spans and of existing duct
// spans (not opened by the plan) that feasible legs use, each span once, the latter only where
// a cable goes into an existing duct of it (intoExistingDuct); structure entries,
// one per cable per structure its route passes; buildings terminating cable; cable ends (routing.CableTakeoff.CableEnds:
// two per cable and those transitions and mid-span joins add); feasible legs.
func (r *run) bidBases() media.BidBases {
	e := r.Estimate
	b := media.BidBases{NewBuriedM: e.Construction.NewM, Buildings: len(e.Buildings)}
	opened := map[string]bool{}
	for _, id := range r.Opened {
		opened[id] = true
	}
	used := map[string]bool{}
	var spans []string
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			continue
		}
		b.Legs++
		b.CableEnds += l.Cable.CableEnds()
		b.Structures += l.Cable.Structures * len(l.Cable.Cables)
		for _, st := range l.Steps {
			if !used[st.SpanID] {
				used[st.SpanID] = true
				spans = append(spans, st.SpanID)
			}
		}
	}
	sort.Strings(spans) // in one order: a float sum depends on it
	existing := r.intoExistingDuct()
	for _, id := range spans {
		sp, _ := r.Site.Net.Span(id)
		switch {
		case sp.Type == geo.TypeAerial:
			b.AerialM += sp.LengthM
		case sp.Type == geo.TypeDuct && !opened[id] && existing(id):
			b.ExistingDuctM += sp.LengthM
		}
	}
	return b
}

// intoExistingDuct reports, of an existing duct span a leg uses, whether a cable is pulled
// into one of its existing ducts: on a span of limited capacity, whether the packing
// (Estimate.Fill, after ductFill) put a cable in a duct of it the plan does not add; on any
// other, always. A span whose every cable went into ducts laid beside it (spare_ducts 0,
// tester 8's finding 12) has no existing duct to prove and clean.
func (r *run) intoExistingDuct() func(span string) bool {
	limited, existing := map[string]bool{}, map[string]bool{}
	for _, f := range r.Fill {
		limited[f.Span] = limited[f.Span] || f.Limited
	}
	for _, f := range r.Estimate.Fill {
		if !f.Added && !f.Unplaced {
			existing[f.Span] = true
		}
	}
	return func(span string) bool { return !limited[span] || existing[span] }
}

// legCost prices a leg's bill items one by one (media.PriceBook.Cents) into its breakdown:
// cables, transitions, reel joins and the bonding of metallic members as cable; terminations, patch cords, primary
// protectors and transceivers as optics; labour; innerduct as construction.
func legCost(p *media.PriceBook, qs []media.Quantity) routing.LegCost {
	var c routing.LegCost
	for _, q := range qs {
		x := p.Cents(q)
		switch {
		case q.Category == media.CategoryLabour:
			c.LabourCents += x
		case q.Category == media.CategoryOptics, q.Price.Item == media.PriceTermination, q.Price.Item == media.PricePatchCord,
			q.Price.Item == media.PriceProtector:
			c.OpticsCents += x
		case q.Price.Item == media.PriceInnerduct, q.Category == media.CategoryConstruction:
			c.ConstructionCents += x
		default:
			c.CableCents += x
		}
	}
	return c
}
