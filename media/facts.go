package media

// Fact is one name a rule condition or reason may use. The rule engine computes every fact
// for each candidate: one medium, one application at the link's rate on that medium, and
// one construction of the medium.
type Fact struct {
	Name string
	Type string   // "number", "string" or "bool"
	Enum []string // the values a string fact takes, when fixed
	Doc  string   // meaning and unit
	typ  valType
	// names are the names of the link (Link.EndA, EndB, EMISpans, CrossedBuilding) the fact's
	// value is made from; 0 for a fact made from none. Such a fact tells one building or span
	// from another: the rules' verdicts depend on those names only where a condition reads
	// the fact (Engine.reads), and the engine's memos of verdicts leave the other names out
	// of their keys (Engine.judged). TestNamesOnlyInTheirFacts holds every fact to its names.
	names names
}

// Indices of the facts, in the order of facts.
const (
	fChannelM = iota
	fRouteM
	fRiserM
	fSlackM
	fRateGbps
	fFutureRateGbps
	fMaxEMI
	fEMILevel
	fOutdoor
	fHasDuct
	fHasTunnel
	fHasAerial
	fHasBuried
	fHasTray
	fPlenum
	fConnectorPairs
	fSplices
	fTransition
	fTransitionA
	fTransitionB
	fStrands
	fKind
	fMedium
	fApplication
	fConstruction
	fConstructionOutdoorRated
	fConstructionListed
	fConstructionPlenumRated
	fConstructionBurialRated
	fReachM
	fLossDB
	fLimitDB
	fMarginDB
	fWavelengthNM
	fLossMarginDB
	fAllowOutdoorCopper
	fFutureFits
	fFutureApplication
	fFutureReachM
	fFutureMarginDB
	fFutureNote
	fInsideAM
	fInsideBM
	fInsideMaxM
	fUnsplicedInsideMaxM
	fCrossedInsideMaxM
	fCrossedBuilding
	fEndA
	fEndB
	fCordsM
	fCopperChannelM
	fMinLossDB
	fLeastLossDB
	fAttenuatorDB
	fOverloadDB
	fRepairSplices
	fCable
	fLossMarginBasis
	fEMISpans
	nFacts
)

func numFact(name, doc string) Fact {
	return Fact{Name: name, Type: "number", Doc: doc, typ: typeNumber}
}
func strFact(name, doc string, enum ...string) Fact {
	return Fact{Name: name, Type: "string", Enum: enum, Doc: doc, typ: typeString}
}
func boolFact(name, doc string) Fact { return Fact{Name: name, Type: "bool", Doc: doc, typ: typeBool} }

// nameFact is a string fact made from the link's names n.
func nameFact(name, doc string, n names) Fact {
	f := strFact(name, doc)
	f.names = n
	return f
}

// facts is indexed by the f* constants.
var facts = [nFacts]Fact{
	fChannelM:                 numFact("channel_m", "channel length: route, risers and slack, in metres"),
	fRouteM:                   numFact("route_m", "length along pathways, laterals included, in metres"),
	fRiserM:                   numFact("riser_m", "risers at both ends, in metres"),
	fSlackM:                   numFact("slack_m", "slack loops and service coils, in metres"),
	fRateGbps:                 numFact("rate_gbps", "required data rate, in Gbit/s"),
	fFutureRateGbps:           numFact("future_rate_gbps", "rate the medium must also carry later, in Gbit/s; 0 when none"),
	fMaxEMI:                   strFact("max_emi", "highest EMI level on the route", "none", "low", "high"),
	fEMILevel:                 numFact("emi_level", "max_emi as a number: none 0, low 1, high 2"),
	fOutdoor:                  boolFact("outdoor", "the route leaves a building"),
	fHasDuct:                  boolFact("has_duct", "the route uses a duct pathway"),
	fHasTunnel:                boolFact("has_tunnel", "the route uses a tunnel pathway"),
	fHasAerial:                boolFact("has_aerial", "the route uses an aerial pathway"),
	fHasBuried:                boolFact("has_buried", "the route uses a direct-buried pathway"),
	fHasTray:                  boolFact("has_tray", "the route uses a cable tray pathway"),
	fPlenum:                   boolFact("plenum", "part of the route runs in a plenum (an air-handling space)"),
	fConnectorPairs:           numFact("connector_pairs", "mated connector pairs in the channel"),
	fSplices:                  numFact("splices", "splices in the channel, entrance transitions included"),
	fTransition:               boolFact("transition", "the outside-plant cable is spliced at both entrances to listed inside cable, which runs inside the end buildings; false with a transition at one end only (transition_a, transition_b), so that a rule written when transitions were at both ends or none stays as strict"),
	fTransitionA:              boolFact("transition_a", "the cable is spliced to listed inside cable at the entrance of end_a, which the inside cable then runs inside"),
	fTransitionB:              boolFact("transition_b", "the cable is spliced to listed inside cable at the entrance of end_b, which the inside cable then runs inside"),
	fStrands:                  numFact("strands", "strands the link needs (4-pair cables for copper)"),
	fKind:                     strFact("kind", "the medium's kind", KindCopper, KindMultimode, KindSinglemode),
	fMedium:                   strFact("medium", "the medium's catalog id, e.g. om4"),
	fApplication:              strFact("application", "the IEEE 802.3 PHY, e.g. 10GBASE-SR"),
	fConstruction:             strFact("construction", "the construction's catalog id, e.g. osp-loose-tube"),
	fConstructionOutdoorRated: boolFact("construction_outdoor_rated", "the construction may run outside buildings"),
	fConstructionListed:       boolFact("construction_listed", "the construction carries an NFPA 70 listing (OFNR, OFNP, CMR, CMP)"),
	fConstructionPlenumRated:  boolFact("construction_plenum_rated", "the construction is plenum rated"),
	fConstructionBurialRated:  boolFact("construction_direct_burial_rated", "the construction may be laid in the earth with no duct (catalog direct_burial_rated)"),
	fReachM:                   numFact("reach_m", "the application's operating range on the medium, in metres"),
	fLossDB:                   numFact("loss_db", "channel loss at the worst operating wavelength, in dB; 0 for copper"),
	fLimitDB:                  numFact("limit_db", "the application's maximum channel insertion loss there, in dB; 0 for copper"),
	fMarginDB:                 numFact("margin_db", "limit_db - loss_db at the worst operating wavelength, in dB; 0 for copper"),
	fWavelengthNM:             numFact("wavelength_nm", "the worst operating wavelength, in nm; 0 for copper"),
	fLossMarginDB:             numFact("loss_margin_db", "the margin this fibre link must keep, in dB: what its mated pairs and splices may lose at their ANSI/TIA-568.3-D maxima beyond the design losses, its repair-splice allowance and its class's extra (catalog margins), or the plan's loss_margin_db when larger"),
	fAllowOutdoorCopper:       boolFact("allow_outdoor_copper", "the plan permits copper between buildings"),
	fFutureFits:               boolFact("future_fits", "some application at the future rate on this medium and construction reaches the channel and closes its loss budget with loss_margin_db; true when there is no future rate"),
	fFutureApplication:        strFact("future_application", "the application future_fits found, or the closest miss; \"none\" when the medium has none at the future rate"),
	fFutureReachM:             numFact("future_reach_m", "future_application's operating range, in metres; 0 when none"),
	fFutureMarginDB:           numFact("future_margin_db", "future_application's loss margin on this channel, in dB; 0 for copper or none"),
	fFutureNote:               strFact("future_note", "why the future rate does not fit, in words; \"\" when it fits"),
	fInsideAM:                 numFact("inside_a_m", "cable inside the building at the link's first end (riser, coil, loops, in-building pathways), in metres"),
	fInsideBM:                 numFact("inside_b_m", "cable inside the building at the link's other end, in metres"),
	fInsideMaxM:               numFact("inside_max_m", "the larger of inside_a_m and inside_b_m, in metres"),
	fUnsplicedInsideMaxM:      numFact("unspliced_inside_max_m", "the construction's own cable inside a building: the larger of inside_a_m and inside_b_m at the ends with no entrance transition (transition_a, transition_b), in metres; 0 with one at both ends"),
	fCrossedInsideMaxM:        numFact("crossed_inside_max_m", "the most cable inside any one building the route passes through (neither end's): pathways drawn inside it and tunnels or trays across it wall to wall, in metres; 0 when it passes through none"),
	fCrossedBuilding:          nameFact("crossed_building", "the building of crossed_inside_max_m, by id, for reasons; \"a building it passes through\" when not known", nameCrossedBuilding),
	fEndA:                     nameFact("end_a", "the building at inside_a_m's end, by id, for reasons; \"the building at one end\" when not known", nameEndA),
	fEndB:                     nameFact("end_b", "the building at inside_b_m's end, by id, for reasons; \"the building at the other end\" when not known", nameEndB),
	fCordsM:                   numFact("cords_m", "patch and equipment cords of a copper channel, both ends together, in metres"),
	fCopperChannelM:           numFact("copper_channel_m", "channel_m plus cords_m: the copper channel end to end, in metres"),
	fMinLossDB:                numFact("min_loss_db", "the least channel loss the application's receiver takes, in dB; 0 when any"),
	fLeastLossDB:              numFact("least_loss_db", "channel loss at the operating wavelength that loses least, without attenuator, in dB; 0 for copper"),
	fAttenuatorDB:             numFact("attenuator_db", "the fixed attenuator at each receiver that brings the loss up to min_loss_db, in dB; 0 when none is needed"),
	fOverloadDB:               numFact("overload_db", "how far the channel, attenuator included, stays below min_loss_db, in dB; 0 when the receiver is safe"),
	fRepairSplices:            numFact("repair_splices", "repair splices allowed for in loss_margin_db: single-mode outside plant, per km (catalog margins)"),
	fCable:                    nameFact("cable", "the cable laid, for reasons: construction, with the number of cables in front when the strands need more than one (\"9 × outdoor (one 4-pair cable per port pair)\"), or with a transition e.g. \"osp-loose-tube spliced to ofnr-riser at both entrances\" or \"… at the entrance of CAF\"", nameEndA|nameEndB),
	fEMISpans:                 nameFact("emi_spans", "the route's spans at its highest EMI level (max_emi), for reasons: \"span D-EW02b\" or \"spans A/1, A/2\"; \"one of its spans\" when not known", nameEMISpans),
	fLossMarginBasis:          strFact("loss_margin_basis", "what loss_margin_db is made of, for reasons: e.g. \"2 mated pairs × 0.25 dB to the TIA-568.3-D maxima + 3 repair splices × 0.3 dB\" or \"the plan's loss_margin_db\"; \"\" for copper"),
}

var factIndex = func() map[string]int {
	m := make(map[string]int, nFacts)
	for i, f := range facts {
		if f.Name == "" {
			panic("media: fact without a name")
		}
		m[f.Name] = i
	}
	return m
}()

// FactList returns the facts a rule file may use, in a fixed order.
func FactList() []Fact {
	out := make([]Fact, len(facts))
	copy(out, facts[:])
	return out
}

// pathwayFacts maps a pathway type to its has_* fact.
var pathwayFacts = map[string]int{
	"duct": fHasDuct, "tunnel": fHasTunnel, "aerial": fHasAerial, "buried": fHasBuried, "tray": fHasTray,
}

// emiLevels maps max_emi values to emi_level; "" counts as "none".
var emiLevels = map[string]float64{"": 0, "none": 0, "low": 1, "high": 2}
