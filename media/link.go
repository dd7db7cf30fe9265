package media

import "fmt"

// Link holds the facts about one candidate route for one link leg that the rule engine decides on.
type Link struct {
	ID string // the link's id, for messages

	RouteM float64 // along pathways, laterals included, in metres
	RiserM float64 // risers at both ends, in metres
	SlackM float64 // slack loops and service coils, in metres

	RateGbps       float64 // required data rate
	FutureRateGbps float64 // rate the medium must also carry later; 0 when none

	MaxEMI string // highest EMI level on the route: "none", "low" or "high"
	// EMISpans names the route's spans at MaxEMI, for reasons (the fact emi_spans): "span
	// D-EW02b" or "spans A/1, A/2"; "" when the caller does not say (or MaxEMI is "none").
	EMISpans     string
	Outdoor      bool     // the route leaves a building (any segment outside)
	PathwayTypes []string // distinct pathway types on the route, sorted
	Plenum       bool     // part of the route runs in a plenum (an air-handling space)

	// Connection counts from the route: mated connector pairs (two patch panels plus any
	// cross-connect passed) and splices (entrance transitions and mid-span joins).
	ConnectorPairs int
	Splices        int

	Strands int // fibre strands required; copper carries them as one 4-pair cable per two strands

	// CopperCables is the number of 4-pair cables a copper candidate needs: one per port pair
	// the link asks for. 0 falls back to one per two Strands.
	CopperCables int

	// InsideAM and InsideBM are the metres of the leg's cable inside the building at each end
	// (from, to): riser, service coil, entrance slack loop and in-building trays or tunnels, up
	// to the point of entrance. NFPA 70 Article 770 limits unlisted cable there to 15 m. When
	// both are 0 each end is taken as half of RiserM.
	InsideAM, InsideBM float64
	// EndA and EndB name the buildings at InsideAM's and InsideBM's ends, for reasons (the
	// facts end_a and end_b); "" when the caller does not say.
	EndA, EndB string

	// CrossedInsideM is the metres of the route on pathways drawn inside buildings it passes
	// through (neither end's): a tray or tunnel there is not in InsideAM or InsideBM, and the
	// inside cable of an entrance transition, spliced on at the two ends' entrances, cannot
	// take it.
	CrossedInsideM float64
	// CrossedInsideMaxM is the most metres of the route inside any one building it passes
	// through (neither end's): pathways drawn inside it, and a tunnel or tray that runs across
	// its footprint from wall to wall (geo.Span.Through); CrossedBuilding names that building,
	// for reasons. NFPA 70 770.48(A) counts unlisted cable inside a building from its point of
	// entrance, where the route crosses the wall, whatever building it goes on to.
	CrossedInsideMaxM float64
	CrossedBuilding   string
}

// names is a set of the fields of Link that name things, for reasons: the buildings at its
// ends (EndA, EndB), the spans at its highest EMI level (EMISpans) and the building it passes
// through the most (CrossedBuilding). The facts made from them (Fact.names) tell one link from
// another; a rule decides on them only where its condition reads such a fact (Engine.reads).
type names uint8

// The names of a link.
const (
	nameEndA names = 1 << iota
	nameEndB
	nameEMISpans
	nameCrossedBuilding
	allNames = nameEndA | nameEndB | nameEMISpans | nameCrossedBuilding
)

// keep is l with its names not in n, and its ID, cleared: the ID is in no fact (messages
// only), and a name not in n is in no fact a rule's condition reads when n is Engine.reads.
func (n names) keep(l Link) Link {
	l.ID = ""
	if n&nameEndA == 0 {
		l.EndA = ""
	}
	if n&nameEndB == 0 {
		l.EndB = ""
	}
	if n&nameEMISpans == 0 {
		l.EMISpans = ""
	}
	if n&nameCrossedBuilding == 0 {
		l.CrossedBuilding = ""
	}
	return l
}

// Ends names the ends of a link where its outside-plant cable is spliced to listed inside
// cable at the entrance (an entrance transition): none, the first end (EndA, the building of
// Link.InsideAM), the other (EndB, of Link.InsideBM) or both. Which ends a candidate splices
// at is the rules' to judge (the facts transition_a and transition_b); the engine tries each.
type Ends uint8

// The ends of an entrance transition.
const (
	EndsNone Ends = 0
	EndA     Ends = 1
	EndB     Ends = 2
	EndsBoth      = EndA | EndB
)

// Has reports whether x includes end.
func (x Ends) Has(end Ends) bool { return x&end != 0 }

// Count is the number of ends in x: the transitions, each an enclosure per outside cable and
// a splice per strand.
func (x Ends) Count() int {
	n := 0
	for _, e := range []Ends{EndA, EndB} {
		if x.Has(e) {
			n++
		}
	}
	return n
}

// transitionInsideM is the metres of an entrance transition's inside cable at each end of at
// (0 at an end not in at) on a channel of channelM metres: all of the leg's cable inside that
// end's building (insideM: riser, service coil, entrance loop and the in-building trays and
// tunnels up to the point of entrance), both ends scaled down together when they would take
// more than the channel. Their sum is the one length the loss budget blends, the cost prices
// and the takeoff buys (Choice.InsideM).
func (l Link) transitionInsideM(channelM float64, at Ends) (a, b float64) {
	a, b = l.insideM()
	if !at.Has(EndA) {
		a = 0
	}
	if !at.Has(EndB) {
		b = 0
	}
	if sum := a + b; sum > channelM && sum > 0 {
		a, b = a*channelM/sum, b*channelM/sum
	}
	return a, b
}

// insideM is the metres of cable inside the building at each end: InsideAM and InsideBM, or
// half the risers each when neither is set.
func (l Link) insideM() (a, b float64) {
	if l.InsideAM == 0 && l.InsideBM == 0 {
		return l.RiserM / 2, l.RiserM / 2
	}
	return l.InsideAM, l.InsideBM
}

// ChannelM is the full channel length in metres: route, risers and slack.
func (l Link) ChannelM() float64 { return l.RouteM + l.RiserM + l.SlackM }

// Loss is the loss budget of a fibre link at one wavelength. Losses are reported at every
// wavelength the link is tested at (multimode 850 and 1300 nm, single-mode 1310 and
// 1550 nm); LimitDB and MarginDB apply only where the application operates.
type Loss struct {
	WavelengthNM int
	// AttenDBPerKm is the cabled attenuation the budget counts at this wavelength, in dB/km:
	// the construction's maximum (the catalog's attenuation_db_per_km); with an entrance
	// transition, the outside and inside constructions' mixed by their lengths in the channel.
	AttenDBPerKm float64
	LossDB       float64 // cabled attenuation × length + connections + splices
	LimitDB      float64 // the application's maximum channel insertion loss; 0 when !Operating
	MarginDB     float64 // LimitDB − LossDB; 0 when !Operating
	// FieldLimitDB is the acceptance limit for a loss test set on the installed link (the
	// cabling, tested without the attenuator): the lesser of CablingLimitDB and, where an
	// application the link is planned for (its application, and the one that carries its
	// future rate) transmits at this wavelength, that application's channel insertion loss
	// less the attenuator the plan puts at its receiver. FieldLimitBy says which decides.
	FieldLimitDB float64
	// CablingLimitDB is the generic link limit of ANSI/TIA-568.3-D (Tier 1): the catalog's
	// maximum cabled attenuation × length, 0.75 dB per mated pair and 0.3 dB per splice.
	CablingLimitDB float64
	// FieldLimitBy names what sets FieldLimitDB: FieldLimitByCabling, or the IEEE 802.3
	// application whose channel insertion loss is below the cabling limit, e.g. "10GBASE-SR".
	FieldLimitBy string
	Operating    bool // the application transmits at this wavelength

	// The counts LossDB and CablingLimitDB are built from: mated connector pairs, and splices
	// (termination pigtails, entrance transitions and mid-span joins).
	Pairs, Splices int
	// AttenuatorDB is the fixed attenuator at the receiver, in LossDB where Operating; the
	// cabling is tested without it, so FieldLimitDB leaves it out of the application's
	// allowance instead; 0 without one.
	AttenuatorDB float64
	// RequiredMarginDB is the margin this link must keep, where Operating; 0 elsewhere: what its
	// mated pairs and splices may lose at their ANSI/TIA-568.3-D maxima beyond the design
	// losses LossDB counts, the repair splices of the margin policy and the catalog's extra for
	// the class, or the plan's loss_margin_db when larger. RequiredMarginBasis says what it is
	// made of in words ("2 mated pairs × 0.25 dB to the TIA-568.3-D maxima"); both are worked
	// out once per channel and printed from here.
	RequiredMarginDB    float64
	RequiredMarginBasis string
}

// FieldLimitByCabling is Loss.FieldLimitBy where the generic link limit of ANSI/TIA-568.3-D
// decides: no application the link is planned for tolerates less at that wavelength.
const FieldLimitByCabling = "TIA-568.3-D"

// accept lowers the field limit to what application app leaves to the cabling, when that is
// less: its channel insertion loss limitDB less attDB of attenuator at its receiver (the
// attenuator is in the channel in service but not in the link under test). On a tie the
// cabling limit is named.
func (x *Loss) accept(app string, limitDB, attDB float64) {
	if v := roundDB(limitDB - attDB); v < x.FieldLimitDB {
		x.FieldLimitDB, x.FieldLimitBy = v, app
	}
}

// Rejection says why one candidate medium was not chosen.
type Rejection struct {
	Medium string
	Rule   string // the id of the rule that excluded it, or "cost" when it lost on price
	Reason string // e.g. "om4 rejected by reach: 10GBASE-SR reaches 400 m, channel is 612 m"
}

// Choice is the rule engine's decision for one Link.
type Choice struct {
	Feasible     bool
	Medium       string // catalog medium id, e.g. "os2"
	Application  string // IEEE 802.3 PHY name, e.g. "10GBASE-LR"
	Construction string // e.g. "osp-loose-tube"
	Losses       []Loss // fibre only, one per test wavelength, ascending; see Loss.Operating
	CostCents    int64  // installed cost of the medium: cable, terminations, transceivers
	CableCents   int64  // the cable part of CostCents (entrance transition enclosures and trays, and on a link leaving the buildings the bonding of metallic members, BondingEnds, included); the rest is labour, terminations and transceivers
	LabourCents  int64  // the entrance transitions' labour (splicing, inside cable ends, enclosure installation) and bid items per cable end, part of CostCents; 0 without
	Inside       string // with an entrance transition: the listed construction Construction is spliced to at the entrances of InsideAt, which runs inside those buildings; "" without
	InsideAt     Ends   // the ends with an entrance transition: EndsNone without, else one end or both
	// InsideAM and InsideBM are, with an entrance transition, the metres of Inside cable at
	// each end before waste: the cable inside that end's building (Link.InsideAM and InsideBM:
	// riser, service coil, entrance loop, in-building trays) where InsideAt has the end, 0
	// elsewhere; InsideM is their sum; all 0 without.
	InsideAM, InsideBM, InsideM float64
	Strands                     int // strands terminated at each end (4-pair cables for copper), which Cables hold
	// Cables is the cables of Construction the link buys (Engine.Cables), largest first, and
	// InsideCables, with an entrance transition, those of Inside; nil without.
	Cables, InsideCables Cables
	Termination          string // how fibre strand ends are terminated (a Termination* constant); "" for copper
	// Attenuators is the number of fixed attenuators of AttenuatorDB dB each (one at every
	// receiver) the PHY needs on this short a channel, priced at AttenuatorCents in CostCents;
	// see AttenuatorQuantity.
	Attenuators     int
	AttenuatorDB    int
	AttenuatorCents int64
	RepairSplices   int    // repair splices allowed for in the required margin (single-mode outside plant)
	Reason          string // why this medium, or why no medium fits when !Feasible
	Code            string // Reason in a short stable code (a Code* constant)
	Rejected        []Rejection
}

// Codes of a Choice's Reason: short (at most 10 characters, for a Shapefile column) and
// stable, so that a reader can sort and filter by them whatever the words of the reason.
const (
	CodeOnly          = "ONLY"      // the only feasible medium
	CodeCheapest      = "CHEAPEST"  // the cheapest of several feasible media
	CodePreferred     = "PREFERRED" // the cheapest of the media a prefer rule favours
	CodeNoMedium      = "NO-MEDIUM" // no medium carries the link: every one is rejected by a rule
	CodeNoApplication = "NO-APP"    // no application runs at the link's rate
	CodeBadFacts      = "BAD-FACTS" // the link's facts are out of range (a bug upstream)
)

// Verdict is how a choice of code stood among the media, as a note on a reason says it: "the
// only feasible medium" (CodeOnly), "the cheapest feasible medium" (CodeCheapest), "the
// cheapest of the media a rule prefers" (CodePreferred); "" for any other code.
func Verdict(code string) string {
	switch code {
	case CodeOnly:
		return "the only feasible medium"
	case CodeCheapest:
		return "the cheapest feasible medium"
	case CodePreferred:
		return "the cheapest of the media a rule prefers"
	}
	return ""
}

// AttenuatorQuantity is the bill of materials line for the choice's attenuators, and whether
// it needs any.
func (c Choice) AttenuatorQuantity() (Quantity, bool) {
	if c.Attenuators == 0 {
		return Quantity{}, false
	}
	return Quantity{Category: CategoryMaterial, Item: fmt.Sprintf("fixed optical attenuator %d dB", c.AttenuatorDB),
		Unit: UnitEach, Amount: float64(c.Attenuators), Price: PriceKey{Item: PriceAttenuator, Count: c.AttenuatorDB}}, true
}
