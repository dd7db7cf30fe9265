package media

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"
	"sync"
	"unique"

	lru "github.com/hashicorp/golang-lru/v2"

	"spanwright/geo/input"
)

// Rule ids of Rejections that no rule file defines.
const (
	RuleCost          = "cost"           // the medium was feasible but cost more
	RuleNoApplication = "no-application" // no application at the link's rate runs on the medium
)

// EngineOptions tunes the rule engine. Zero values mean: the catalog's margin policy and
// nothing more, no copper between buildings, the catalog's design connection losses, the
// price book's termination method and 10 m of copper cords.
type EngineOptions struct {
	LossMarginDB       float64 // the least margin every fibre loss budget keeps, in dB; the catalog's margin policy may ask more
	AllowOutdoorCopper bool    // permit copper between buildings
	PairLossDB         float64 // design loss of a mated connector pair, in dB; 0 = catalog design_pair_db
	SpliceLossDB       float64 // design loss of a splice, in dB; 0 = catalog design_splice_db
	// Termination is how fibre strand ends are terminated (a Termination* constant); "" = the
	// price book's termination_method, which says what its termination price buys.
	Termination string
	// CopperCordsM is the patch and equipment cords of a copper channel, both ends together,
	// in metres; 0 = 10 m (ANSI/TIA-568.2).
	CopperCordsM float64
	// Margins replaces the catalog's margin policy when not nil.
	Margins *MarginPolicy
	// WastePct is the cable bought beyond the channel, in percent (design.waste_pct): the
	// cost of a candidate prices the cable the bill buys, so that a transition's cheaper metres
	// are weighed with their waste against its ends' items; 0 = none.
	WastePct float64
}

// Engine applies a rule file to a catalog and prices the survivors from a price book. It is
// safe for concurrent use once built.
type Engine struct {
	// bases remembers marginBasis by basisKey (marginFor).
	bases  sync.Map
	cat    *Catalog
	rules  *Rules
	prices *PriceBook
	opt    EngineOptions
	design Connections // connection losses for LossDB
	field  Connections // the catalog's, for FieldLimitDB
	// termination is the termination method in force, margins the margin policy, cordsM the
	// copper cords, attenuators the attenuator values the price book prices, ascending.
	termination string
	margins     MarginPolicy
	cordsM      float64
	attenuators []int
	// reaches holds Catalog.ReachesOn for every application and medium, which the engine
	// asks for on every candidate.
	reaches map[reachKey][]Reach
	// breakpoints are the positive numbers in the rule conditions: candidate channel lengths
	// at which feasibility may change, for MaxChannelM.
	breakpoints []float64
	// maxMemo caches MaxChannelM by maxKey: plans and sweeps ask the same question often.
	maxMemo *lru.Cache[maxKey, float64]
	// chosen caches Choose by chooseKey, bounded so a long sweep's memory stays flat.
	chosen *lru.Cache[chooseKey, Choice]
	// reachID digests what MaxChannelM depends on besides its arguments (ReachMemo).
	reachID [32]byte
	// reads are the link's names some rule's condition reads a fact made from (Fact.names):
	// the only names the rules' verdicts can depend on (judged).
	reads names
	// oneCable is Cables of every construction of the catalog for the strands one cable of
	// its largest size holds (oneCables).
	oneCable map[*Construction][]covered
}

// chooseCacheSize bounds the choices an engine remembers: about a hundred scenarios' legs
// of a mid-sized campus.
const chooseCacheSize = 8192

// NewEngine checks that the rules, catalog and price book fit together and returns the
// engine. A nil catalog, rule set or price book means the embedded default. It reports at
// once every rule naming an unknown medium, application or construction, every price the
// catalog needs that the book lacks (see Needs), and bad options.
func NewEngine(c *Catalog, r *Rules, p *PriceBook, opt EngineOptions) (*Engine, error) {
	e, err := NewCheckEngine(c, r, p, opt)
	if err != nil {
		return nil, err
	}
	return e, nil
}

// NewCheckEngine is NewEngine for a check that goes on past missing prices: when the only
// problems are prices the catalog needs and the book lacks (ErrMissingPrice), it returns
// the engine with them, so that the checks that need an engine (the plan's rates, the prices
// its routes need) still run and every problem comes out in one run. Such an engine must
// never plan; on any other problem it returns nil, as NewEngine does.
func NewCheckEngine(c *Catalog, r *Rules, p *PriceBook, opt EngineOptions) (*Engine, error) {
	if c == nil {
		c = DefaultCatalog()
	}
	if r == nil {
		r = DefaultRules()
	}
	if p == nil {
		p = DefaultPriceBook()
	}
	var errs input.Problems
	for _, o := range []struct {
		name string
		v    float64
	}{{"loss_margin_db", opt.LossMarginDB}, {"pair_loss_db", opt.PairLossDB}, {"splice_loss_db", opt.SpliceLossDB},
		{"copper_cords_m", opt.CopperCordsM}} {
		if !finite(o.v) || o.v < 0 {
			errs.Add(fmt.Errorf("media: option %s: %w: want dB >= 0, got %g", o.name, ErrBadValue, o.v))
		}
	}
	e := &Engine{cat: c, rules: r, prices: p, opt: opt,
		design:      Connections{PairDB: c.DesignPairDB, SpliceDB: c.DesignSpliceDB},
		field:       Connections{PairDB: c.MatedPairDB, SpliceDB: c.SpliceDB},
		termination: p.Termination, margins: c.Margins, cordsM: defaultCopperCordsM,
		attenuators: sortedAttenuators(p), oneCable: map[*Construction][]covered{}}
	for _, m := range c.Media {
		for _, k := range m.Constructions {
			e.oneCable[k] = oneCables(p, m, k)
		}
	}
	if e.termination == "" {
		e.termination = TerminationSplicedPigtail
	}
	if opt.Termination != "" {
		if TerminationSplices(opt.Termination) < 0 {
			errs.Add(fmt.Errorf("media: option termination: %w: want one of %s, got %q", ErrBadValue, strings.Join(Terminations(), ", "), opt.Termination))
		}
		e.termination = opt.Termination
	}
	if opt.CopperCordsM > 0 {
		e.cordsM = opt.CopperCordsM
	}
	if opt.Margins != nil {
		for _, o := range []struct {
			name string
			v    float64
		}{{"extra_multimode_db", opt.Margins.MultimodeDB}, {"extra_singlemode_db", opt.Margins.SinglemodeDB}, {"repair_splices_per_km", opt.Margins.RepairSplicesPerKm}} {
			if !finite(o.v) || o.v < 0 {
				errs.Add(fmt.Errorf("media: option margins %s: %w: want >= 0, got %g", o.name, ErrBadValue, o.v))
			}
		}
		e.margins = *opt.Margins
	}
	if opt.PairLossDB > 0 {
		e.design.PairDB = opt.PairLossDB
	}
	if opt.SpliceLossDB > 0 {
		e.design.SpliceDB = opt.SpliceLossDB
	}
	for _, rule := range r.Rules {
		e.checkRule(rule, &errs)
		for _, f := range rule.When.reads {
			e.reads |= facts[f].names
		}
	}
	if err := sorted(&errs); err != nil {
		if perr := p.Check(Needs(c)); perr != nil {
			errs.Add(perr)
			err = sorted(&errs)
		}
		return nil, err
	}
	missing := p.Check(Needs(c))
	e.reaches = map[reachKey][]Reach{}
	for _, a := range c.Applications {
		for _, m := range c.Media {
			if rs := c.ReachesOn(a, m.ID); len(rs) > 0 {
				e.reaches[reachKey{a, m}] = rs
			}
		}
	}
	// lru.New errs only on a size <= 0.
	e.chosen, _ = lru.New[chooseKey, Choice](chooseCacheSize)
	e.maxMemo, _ = lru.New[maxKey, float64](4 * chooseCacheSize)
	e.reachID = reachID(e)
	return e, missing
}

// reachKey is an application and a medium of the engine's catalog, by pointer: cheaper to
// hash than the medium's ID, and asked for on every candidate.
type reachKey struct {
	a *Application
	m *Medium
}

// reachesOn is Catalog.ReachesOn(a, m.ID), computed once.
func (e *Engine) reachesOn(a *Application, m *Medium) []Reach {
	return e.reaches[reachKey{a, m}]
}

// checkRule reports rule references the catalog cannot satisfy, and collects breakpoints.
func (e *Engine) checkRule(rule *Rule, errs *input.Problems) {
	item := "rule " + fmt.Sprintf("%q", rule.ID)
	for _, id := range rule.Media {
		if e.cat.Medium(id) == nil {
			errs.Add(&input.Problem{File: e.rules.File, Line: rule.mediaLine, Item: item, Key: "media",
				Err: input.Errorf(ErrUnknownReference, "no medium %q in %s", id, e.cat.File)})
		}
	}
	for _, lit := range rule.When.lits {
		known := false
		switch lit.fact {
		case "medium":
			known = e.cat.Medium(lit.value) != nil
		case "application", "future_application":
			known = e.cat.Application(lit.value) != nil || (lit.fact == "future_application" && lit.value == "none")
		case "construction":
			for _, m := range e.cat.Media {
				known = known || m.Construction(lit.value) != nil
			}
		default:
			known = true
		}
		if !known {
			line, col := rule.whenPos(lit.off)
			errs.Add(&input.Problem{File: e.rules.File, Line: line, Col: col, Item: item, Key: "when",
				Err: input.Errorf(ErrUnknownReference, "no %s %q in %s", lit.fact, lit.value, e.cat.File)})
		}
	}
	collectNumbers(rule.When.root, &e.breakpoints)
}

func collectNumbers(x expr, out *[]float64) {
	switch x := x.(type) {
	case litExpr:
		if x.t == typeNumber && x.v.num > 0 {
			*out = append(*out, x.v.num)
		}
	case notExpr:
		collectNumbers(x.x, out)
	case logicExpr:
		collectNumbers(x.x, out)
		collectNumbers(x.y, out)
	case cmpExpr:
		collectNumbers(x.x, out)
		collectNumbers(x.y, out)
	}
}

// Catalog returns the engine's catalog.
func (e *Engine) Catalog() *Catalog { return e.cat }

// Rules returns the engine's rules.
func (e *Engine) Rules() *Rules { return e.rules }

// PriceBook returns the engine's price book.
func (e *Engine) PriceBook() *PriceBook { return e.prices }

// Media returns the catalog's medium ids in catalog order.
func (e *Engine) Media() []string {
	ids := make([]string, len(e.cat.Media))
	for i, m := range e.cat.Media {
		ids[i] = m.ID
	}
	return ids
}

// candidate is one (medium, application, construction) evaluated for one link.
type candidate struct {
	m          *Medium
	a          *Application
	k          *Construction
	r          Reach
	mi, ai, ki int
	losses     []Loss
	marginDB   float64 // worst operating margin; 0 for copper
	f          [nFacts]value
	failed     int    // index of the first rule failed, -1 when none
	nFailed    int    // how many rules it fails
	prefer     []bool // per prefer rule, in rule order
	costCents  int64
	cableCents int64  // the cable part of costCents, transition enclosures and trays included
	strands    int    // strands (4-pair cables on copper) the link needs of the application
	cables     Cables // what construction k buys for them (Engine.Cables)
	perMCents  int64  // the cables' price per metre, all of them

	// inside, when not nil, makes this a transition candidate: outside-plant construction k
	// is spliced to inside at the entrances of at, and inside takes what runs inside those
	// buildings (the riser, coil, loop and in-building pathways).
	inside      *Construction
	at          Ends          // the ends of the transition; EndsNone when inside is nil
	lossK       *Construction // k, or k and inside blended by length, for the loss budget
	splices     int           // the link's splices, the termination splices and one per transition end
	labourCents int64         // the transitions' labour and bid items per cable end (LayingPrice.LabourCents), part of costCents
	b           budget        // the loss budget, on the reach-and-loss pair it uses
	repair      int           // repair splices in the required margin
}

// label names the candidate's cable: its construction, with the number of cables in front
// when the strands need more than one ("9 × outdoor") and their strand counts when they differ
// ("2 × osp-loose-tube (288 + 12 strands)"), and for copper why so many: one 4-pair
// cable per port pair (copperCables) — a reason that prices copper against fibre otherwise
// hides that a 22 m copper run costs nine cables (tester 10's finding 15); and the inside
// construction it is spliced to and where ("at both entrances", "at the entrance of CAF").
// The end facts (end_a, end_b) must be set.
func (c *candidate) label() string {
	id := c.k.ID
	if n := len(c.cables); n > 1 {
		id = fmt.Sprintf("%d × %s", n, id)
		if c.cables.Mixed() {
			id += " (" + c.cables.Text() + " strands)"
		}
		if c.m.Kind == KindCopper {
			id += " (one 4-pair cable per port pair)"
		}
	}
	switch {
	case c.inside == nil:
		return id
	case c.at == EndsBoth:
		return id + " spliced to " + c.inside.ID + " at both entrances"
	case c.at == EndA:
		return id + " spliced to " + c.inside.ID + " at the entrance of " + c.f[fEndA].str
	}
	return id + " spliced to " + c.inside.ID + " at the entrance of " + c.f[fEndB].str
}

// variant is one way of laying a construction: as it is (a nil inside), or spliced at the
// entrances of at to the listed construction inside.
type variant struct {
	inside *Construction
	at     Ends
}

// transitionInside is the listed construction a transition candidate of construction k
// would splice to at each entrance, or nil when the link and the book allow no transition:
// fibre only, outside-plant cable (outdoor rated, unlisted) on a route that leaves the
// buildings through no plenum and runs inside no building but its ends, risers to run
// inside, and the book pricing the entrance splice enclosure (transition_splice_each).
func (e *Engine) transitionInside(l Link, m *Medium, k *Construction, strands int) *Construction {
	if !transitionFits(l, m, k) {
		return nil
	}
	if _, ok := e.prices.Price(PriceKey{Item: PriceTransition}); !ok {
		return nil
	}
	in, _ := e.constructionFor(m, strands, false)
	return in
}

// transitionFits reports whether construction k of medium m could be spliced to inside cable
// at the link's entrances, prices aside: an unlisted outdoor fibre construction of a medium
// on a link that may have one (transitionLink).
func transitionFits(l Link, m *Medium, k *Construction) bool {
	return m.Fibre() && transitionLink(l) && k.OutdoorRated && k.Listing == ""
}

// transitionLink reports whether a link may have an entrance transition at all: it leaves the
// buildings, has risers to run inside, passes through no plenum and runs inside no building
// but its ends. The inside cable takes everything inside the end buildings, in-building trays
// and tunnels included (Link.transitionInsideM), as installers splice outside-plant cable to
// riser or plenum cable at the entrance and run that through the building's pathways (NFPA 70
// 770.48, seen as fragment: unlisted cable ends within 15 m of the point of entrance). A
// plenum would need the outside part plenum rated too on these facts, which do not say where
// the plenum is; a building the route passes through would need splices of its own.
func transitionLink(l Link) bool {
	return l.Outdoor && !l.Plenum && l.RiserM > 0 && l.CrossedInsideM == 0
}

// variants lists the candidates of construction k of medium m for application a: the
// construction as it is (a nil inside), then, when it may have an entrance transition, the
// transition at the first end only, at the other only and at both (an end with no cable
// inside its building has none). Which of them the rules let carry the link (the 15 m of
// unlisted cable past an entrance judged at each end) and which costs least decides: a
// transition where the outside-plant cable may run to the telecom room costs an enclosure,
// splicing and cable ends for nothing, so it is chosen only at the ends that need one.
func (e *Engine) variants(l Link, a *Application, m *Medium, k *Construction) []variant {
	in := e.transitionInside(l, m, k, strandsFor(l, a, m))
	if in == nil {
		return asItIs
	}
	ia, ib := l.insideM()
	vs := []variant{{}}
	for _, at := range []Ends{EndA, EndB, EndsBoth} {
		if (at.Has(EndA) && ia <= 0) || (at.Has(EndB) && ib <= 0) {
			continue
		}
		vs = append(vs, variant{inside: in, at: at})
	}
	return vs
}

// asItIs is the variants of a construction without a transition; read only.
var asItIs = []variant{{}}

// blend is construction k with its attenuation mixed with inside's by length: insideM of
// lengthM metres in the inside construction, the rest in k. Only the attenuation is used.
func blend(k, inside *Construction, insideM, lengthM float64) *Construction {
	if inside == nil || lengthM <= 0 {
		return k
	}
	f := math.Min(1, insideM/lengthM)
	b := *k
	b.Attenuation = make([]Attenuation, len(k.Attenuation))
	for i, at := range k.Attenuation {
		in := at.DBPerKm
		for _, x := range inside.Attenuation {
			if x.WavelengthNM == at.WavelengthNM {
				in = x.DBPerKm
			}
		}
		b.Attenuation[i] = Attenuation{WavelengthNM: at.WavelengthNM, DBPerKm: at.DBPerKm*(1-f) + in*f}
	}
	return &b
}

// strandsFor is what a link needs of application a on medium m: the link's strands but at
// least the application's. On copper the count is of 4-pair cables: Link.CopperCables, one per
// port pair the link asks for, or else one per duplex channel the strands would carry, i.e. half
// the strands rounded up (common practice, no published source: a backbone channel is one fibre
// pair or one 4-pair cable).
func strandsFor(l Link, a *Application, m *Medium) int {
	n := l.Strands
	if m.Kind == KindCopper {
		n = copperCables(l)
	}
	if n > a.Strands {
		return n
	}
	return a.Strands
}

// copperCables is the number of 4-pair cables a copper link needs: Link.CopperCables, or one
// per two strands when it is 0.
func copperCables(l Link) int {
	if l.CopperCables > 0 {
		return l.CopperCables
	}
	return (l.Strands + 1) / 2
}

// lengths are the lengths a candidate is judged at: the link's own (its route and channel),
// or, when the engine asks how far a medium reaches, a trial channel. They travel together so
// that a channel is never rebuilt from a route by subtraction, or a route from a channel
// (floating point would leave a few 1e-15 m below zero: a route of -0.000 m).
type lengths struct{ routeM, channelM float64 }

// linkLengths are l's own lengths.
func linkLengths(l Link) lengths { return lengths{routeM: l.RouteM, channelM: l.ChannelM()} }

// trialLengths are l's lengths with a channel of channelM metres, at least l's risers and
// slack: the route is what remains, never below zero.
func trialLengths(l Link, channelM float64) lengths {
	return lengths{routeM: max(0, channelM-(l.RiserM+l.SlackM)), channelM: channelM}
}

// evaluate computes the facts of one candidate at lengths at and applies the rules to it.
func (e *Engine) evaluate(c *candidate, l Link, at lengths, mi, ai, ki int, v variant) {
	m, a := e.cat.Media[mi], e.cat.Applications[ai]
	k := m.Constructions[ki]
	channel := at.channelM
	prefer := c.prefer[:0] // a candidate evaluated again (feasibleAt's scratch) keeps its array
	*c = candidate{m: m, a: a, k: k, mi: mi, ai: ai, ki: ki, failed: -1, strands: strandsFor(l, a, m),
		lossK: k, splices: l.Splices + e.termSplices(m), prefer: prefer}
	c.cables, c.perMCents = e.Cables(m, k, c.strands)
	if v.inside != nil {
		c.inside, c.at, c.splices = v.inside, v.at, c.splices+v.at.Count()
		ia, ib := l.transitionInsideM(channel, v.at)
		c.lossK = blend(k, v.inside, ia+ib, channel)
	}
	c.repair = e.repairSplices(m, outsideM(l, at))
	c.b = e.budgetFor(c.lossK, a, e.reachesOn(a, m), channel, l.ConnectorPairs, c.splices, e.marginFor(m, l.ConnectorPairs, c.splices, c.repair))
	c.r, c.losses = c.b.r, c.b.losses
	f := &c.f
	f[fChannelM].num = channel
	f[fRouteM].num = at.routeM
	f[fRiserM].num = l.RiserM
	f[fSlackM].num = l.SlackM
	f[fRateGbps].num = l.RateGbps
	f[fFutureRateGbps].num = l.FutureRateGbps
	emi := l.MaxEMI
	if emi == "" {
		emi = "none"
	}
	f[fMaxEMI].str = emi
	f[fEMISpans].str = cmp.Or(l.EMISpans, "one of its spans")
	f[fEMILevel].num = emiLevels[emi]
	f[fOutdoor].b = l.Outdoor
	f[fPlenum].b = l.Plenum
	for _, t := range l.PathwayTypes {
		if i, ok := pathwayFacts[t]; ok {
			f[i].b = true
		}
	}
	f[fConnectorPairs].num = float64(l.ConnectorPairs)
	f[fSplices].num = float64(c.splices)
	f[fTransition].b = c.at == EndsBoth
	f[fTransitionA].b, f[fTransitionB].b = c.at.Has(EndA), c.at.Has(EndB)
	f[fStrands].num = float64(c.strands)
	f[fKind].str = m.Kind
	f[fMedium].str = m.ID
	f[fApplication].str = a.Name
	f[fConstruction].str = k.ID
	f[fConstructionOutdoorRated].b = k.OutdoorRated
	f[fConstructionListed].b = k.Listing != ""
	f[fConstructionPlenumRated].b = k.PlenumRated
	f[fConstructionBurialRated].b = k.DirectBurialRated
	f[fReachM].num = c.r.RangeM
	if w, ok := worstLoss(c.losses); ok {
		c.marginDB = w.MarginDB
		f[fLossDB].num = w.LossDB
		f[fLimitDB].num = w.LimitDB
		f[fMarginDB].num = w.MarginDB
		f[fWavelengthNM].num = float64(w.WavelengthNM)
	}
	f[fLossMarginDB].num = c.b.req.db
	f[fAllowOutdoorCopper].b = e.opt.AllowOutdoorCopper
	ia, ib := l.insideM()
	f[fInsideAM].num, f[fInsideBM].num, f[fInsideMaxM].num = ia, ib, max(ia, ib)
	if c.at.Has(EndA) {
		ia = 0
	}
	if c.at.Has(EndB) {
		ib = 0
	}
	f[fUnsplicedInsideMaxM].num = max(ia, ib)
	f[fCrossedInsideMaxM].num, f[fCrossedBuilding].str = l.CrossedInsideMaxM, cmp.Or(l.CrossedBuilding, "a building it passes through")
	f[fEndA].str, f[fEndB].str = cmp.Or(l.EndA, "the building at one end"), cmp.Or(l.EndB, "the building at the other end")
	f[fCable].str = c.label()
	if !m.Fibre() {
		f[fCordsM].num = e.cordsM
		f[fCopperChannelM].num = channel + e.cordsM
	}
	f[fMinLossDB].num = a.MinLossDB
	f[fLeastLossDB].num = c.b.leastDB
	f[fAttenuatorDB].num = float64(c.b.attDB)
	f[fOverloadDB].num = c.b.overloadDB
	f[fRepairSplices].num = float64(c.repair)
	f[fLossMarginBasis].str = c.b.req.basis
	e.future(l, c)
	for ri, rule := range e.rules.Rules {
		if !rule.appliesTo(m) {
			continue
		}
		holds := rule.When.eval(f[:])
		switch rule.Effect {
		case EffectPrefer:
			c.prefer = append(c.prefer, holds)
			continue
		case EffectExclude:
			if !holds {
				continue
			}
		case EffectRequire:
			if holds {
				continue
			}
		}
		// Every rule is applied, not only up to the first failure, so that a rejection can
		// report the construction that came closest (fewest failures).
		c.nFailed++
		if c.failed < 0 {
			c.failed = ri // its reason is rendered only when a rejection reports it
		}
	}
	if c.failed < 0 {
		c.cableCents, c.costCents = e.cost(c, channel, l)
	}
}

// future fills the future_* facts: whether some application at the future rate on the same
// medium and construction reaches the channel and closes its budget with the plan's margin.
// When one does, its channel insertion loss (less its attenuator) also bounds the field
// limits of the candidate's losses at its wavelengths (Loss.accept): the link is accepted
// for the rate it is planned to carry later too.
func (e *Engine) future(l Link, c *candidate) {
	f := &c.f
	f[fFutureApplication].str = "none"
	if l.FutureRateGbps <= 0 {
		f[fFutureFits].b = true
		return
	}
	channel := c.f[fChannelM].num
	var best *Application
	var bestR Reach
	var bestLosses []Loss
	bestMargin, bestScore := 0.0, -1
	for _, a := range e.cat.Applications {
		rs := e.reachesOn(a, c.m)
		if len(rs) == 0 || a.RateGbps != l.FutureRateGbps {
			continue
		}
		b := e.budgetFor(c.lossK, a, rs, channel, l.ConnectorPairs, c.splices, c.b.req)
		r := b.r
		margin, _ := b.marginDB()
		reaches := r.RangeM >= channel
		closes := !c.m.Fibre() || (margin >= b.req.db && b.overloadDB == 0)
		score := 0 // 2 fits, 1 reaches but the budget fails, 0 short
		switch {
		case reaches && closes:
			score = 2
		case reaches:
			score = 1
		}
		if score > bestScore || (score == bestScore && score == 0 && r.RangeM > bestR.RangeM) ||
			(score == bestScore && score == 1 && margin > bestMargin) {
			best, bestR, bestMargin, bestScore, bestLosses = a, r, margin, score, b.losses
		}
	}
	if best == nil {
		f[fFutureNote].str = fmt.Sprintf("no application at %s runs on %s", FormatRate(l.FutureRateGbps), c.m.ID)
		return
	}
	f[fFutureApplication].str = best.Name
	f[fFutureReachM].num = bestR.RangeM
	f[fFutureMarginDB].num = bestMargin
	switch bestScore {
	case 2:
		f[fFutureFits].b = true
		for _, fx := range bestLosses {
			for j := range c.losses {
				if x := &c.losses[j]; fx.Operating && x.WavelengthNM == fx.WavelengthNM {
					x.accept(best.Name, fx.LimitDB, fx.AttenuatorDB)
				}
			}
		}
	case 1:
		f[fFutureNote].str = fmt.Sprintf("%s leaves a loss margin of %s dB, below the required %s dB, or overloads its receiver",
			best.Name, formatNum(bestMargin), formatNum(c.b.req.db))
	default:
		f[fFutureNote].str = fmt.Sprintf("%s reaches %s m", best.Name, formatNum(bestR.RangeM))
	}
}

// cost is the installed cost of a candidate, in cents: cable per metre (all cables bought
// for the strands, Engine.Cables) times the channel length with the design's waste
// (EngineOptions.WastePct), one termination per strand
// (per 4-pair cable for copper) at each end, and one transceiver at each end. Two transceivers serve the link
// whether the PHY is duplex (2 fibres) or parallel (8 fibres in one module each end).
// Labour, pathway and enclosures are not part of it, but for a transition's: with one, the
// inside cable is l's (Link.transitionInsideM) at the candidate's ends, and what the
// entrances there put on the bill besides cable is added (layingPrice, TransitionEnds). On a
// link that leaves the buildings, a construction with metallic members adds their bonding at
// both ends of each cable (BondingEnds), with the cable.
func (e *Engine) cost(c *candidate, channelM float64, l Link) (cableCents, totalCents int64) {
	p := e.layingPrice(c.m, c.k, c.inside, c.at, c.strands)
	term, _ := e.prices.Price(PriceKey{Item: PriceTermination, Medium: c.m.ID})
	trx, _ := e.prices.Price(PriceKey{Item: PriceTransceiver, Name: c.a.Transceiver})
	ends := 2 * int64(c.strands)
	var bond int64
	if l.Outdoor {
		for _, q := range BondingEnds(c.k, 2*len(c.cables)) {
			bond += e.prices.Cents(q)
		}
	}
	// The cable bought: the channel with the design's waste, as the bill buys it (to whole
	// metres there, a metre a piece at most).
	bought := 1 + e.opt.WastePct/100
	if c.inside == nil {
		cableCents = MulCents(p.PerMCents, channelM*bought) + bond
		return cableCents, cableCents + ends*term + 2*trx + c.b.attCents
	}
	// Outside-plant cable to the entrances of the transition, inside cable inside those
	// buildings, and at each such entrance its items (TransitionEnds): enclosures and trays
	// with the cable, their installation, the splicing, the inside cable ends' preparation and
	// the bid items per cable end as labour.
	ia, ib := l.transitionInsideM(channelM, c.at)
	insideM := ia + ib
	cableCents = MulCents(p.PerMCents, (channelM-insideM)*bought) + MulCents(p.InsidePerMCents, insideM*bought) + p.HardwareCents + bond
	c.labourCents = p.LabourCents
	return cableCents, cableCents + c.labourCents + ends*term + 2*trx + c.b.attCents
}

// LayingPrice is what a laying's cable costs apart from its length: the prices routing puts
// on a route and on its ends, from the same function as Choose's cost.
type LayingPrice struct {
	PerMCents       int64 // the construction's cable per metre, all the cables the strands buy (Engine.Cables)
	InsidePerMCents int64 // with a transition, the inside construction's per metre, all its cables; 0 without
	// With a transition, what the entrances of its ends put on the bill besides cable
	// (TransitionEnds): HardwareCents its material (enclosures and splice trays), LabourCents
	// its labour (splicing, the inside cable ends' preparation, the enclosures' installation)
	// and its bid items per cable end; 0 without.
	HardwareCents int64
	LabourCents   int64
	InsideCables  int // with a transition, the cables of the inside construction at each of its ends; 0 without
}

// layingPrice prices construction k of medium m for strands strands (the cables Engine.Cables
// buys), spliced to inside at the entrances of at when inside is not nil: the items of those
// transition ends (TransitionEnds) priced one by one, as the bill prices them.
func (e *Engine) layingPrice(m *Medium, k, inside *Construction, at Ends, strands int) LayingPrice {
	cables, perM := e.Cables(m, k, strands)
	p := LayingPrice{PerMCents: max(perM, 0)} // a check engine's book may price none of them
	if inside == nil {
		return p
	}
	in, inPerM := e.Cables(m, inside, strands)
	p.InsidePerMCents, p.InsideCables = max(inPerM, 0), len(in)
	for _, q := range TransitionEnds(e.prices, cables, len(in), at.Count()) {
		if q.Category == CategoryMaterial {
			p.HardwareCents += e.prices.Cents(q)
		} else {
			p.LabourCents += e.prices.Cents(q)
		}
	}
	return p
}

// checkLink lists what is wrong with a link's facts, or "" when nothing is.
func checkLink(l Link) string {
	var bad []string
	for _, q := range []struct {
		name string
		v    float64
	}{{"route_m", l.RouteM}, {"riser_m", l.RiserM}, {"slack_m", l.SlackM}, {"future_rate_gbps", l.FutureRateGbps},
		{"inside_a_m", l.InsideAM}, {"inside_b_m", l.InsideBM}, {"crossed_inside_m", l.CrossedInsideM}, {"crossed_inside_max_m", l.CrossedInsideMaxM}} {
		if !finite(q.v) || q.v < 0 {
			bad = append(bad, fmt.Sprintf("%s is %g, want >= 0", q.name, q.v))
		}
	}
	if !finite(l.RateGbps) || l.RateGbps <= 0 {
		bad = append(bad, fmt.Sprintf("rate_gbps is %g, want > 0", l.RateGbps))
	}
	if _, ok := emiLevels[l.MaxEMI]; !ok {
		bad = append(bad, fmt.Sprintf("max_emi is %q, want none, low or high", l.MaxEMI))
	}
	for _, q := range []struct {
		name string
		v    int
	}{{"connector_pairs", l.ConnectorPairs}, {"splices", l.Splices}, {"strands", l.Strands}, {"copper_cables", l.CopperCables}} {
		if q.v < 0 {
			bad = append(bad, fmt.Sprintf("%s is %d, want >= 0", q.name, q.v))
		}
	}
	return strings.Join(bad, "; ")
}

func linkName(l Link) string {
	if l.ID == "" {
		return "link"
	}
	return "link " + l.ID
}

// Choose decides the medium of one link. It evaluates every candidate at the link's rate:
// each medium, each application at that rate on the medium, each construction of the
// medium. A candidate fails at the first exclude or require rule it fails. Among the rest,
// prefer rules rank first, then the lowest installed cost (see CostCents), then the larger
// loss margin, then catalog order. Rejected holds, in catalog order, for each medium not
// chosen: one Rejection with Rule "cost" (or the deciding prefer rule) when it had a
// feasible candidate, otherwise one per application at the rate, reporting the first rule
// failed by the construction that failed the fewest rules. When no candidate is feasible Feasible is false and Reason says
// why each medium failed, listing every one of its Rejections.
func (e *Engine) Choose(l Link) Choice {
	k := keyOf(l)
	if ch, ok := e.chosen.Get(k); ok {
		return ch.clone()
	}
	ch := e.choose(l)
	e.chosen.Add(k, ch)
	return ch.clone()
}

// chooseKey is everything Choose's answer depends on besides the engine: every field of Link,
// its pathway types joined.
type chooseKey struct {
	id                                           string
	routeM, riserM, slackM, rateGbps, futureGbps float64
	emi                                          string
	outdoor, plenum                              bool
	types                                        string
	pairs, splices, strands, copper              int
	insideA, insideB, crossed, crossedMax        float64
	endA, endB, emiSpans, crossedBuilding        string
}

func keyOf(l Link) chooseKey {
	return chooseKey{id: l.ID, routeM: l.RouteM, riserM: l.RiserM, slackM: l.SlackM, rateGbps: l.RateGbps,
		futureGbps: l.FutureRateGbps, emi: l.MaxEMI, outdoor: l.Outdoor, plenum: l.Plenum, types: strings.Join(l.PathwayTypes, "\x00"),
		pairs: l.ConnectorPairs, splices: l.Splices, strands: l.Strands, copper: l.CopperCables, insideA: l.InsideAM, insideB: l.InsideBM,
		crossed: l.CrossedInsideM, crossedMax: l.CrossedInsideMaxM, endA: l.EndA, endB: l.EndB, emiSpans: l.EMISpans, crossedBuilding: l.CrossedBuilding}
}

// clone gives the caller slices of its own, so a remembered choice cannot be changed.
func (c Choice) clone() Choice {
	c.Losses = slices.Clone(c.Losses)
	c.Rejected = slices.Clone(c.Rejected)
	c.Cables, c.InsideCables = slices.Clone(c.Cables), slices.Clone(c.InsideCables)
	return c
}

// ChooseLaid is Choose among the candidates of medium laid as lay alone: its application,
// losses and cost on l's facts, no other medium rejected, and a reason that compares it with
// no other medium (none was judged): "os2 with 10GBASE-LR on …, at 3,100.00 USD … for a
// 926.53 m channel, loss …". A caller that has chosen the laying on other facts (routing's
// fillLeg: the reel joins of the cable the laying buys, fewer than the count the choice was
// made on) measures it so, and says how it was chosen. Not remembered.
func (e *Engine) ChooseLaid(l Link, medium string, lay Laying) Choice {
	ch := e.chooseAmong(sameLinks(l), true, func(m *Medium, k *Construction, v variant) bool {
		return m.ID == medium && layingOf(k, v) == lay
	})
	ch.Rejected = nil
	return ch
}

// OwnCable is the cable a laying buys, as a link's facts count it: its slack (Link.SlackM)
// and its splices (Link.Splices, the mid-span joins with the link's others).
type OwnCable struct {
	SlackM  float64
	Splices int
}

// ChooseOwn is Choose with every candidate judged on the cable its own laying buys: one laid
// with an entrance transition at the ends at (EndsNone: none) on l with the slack and splices
// own(at) gives, the rest of l's facts as they are. A caller whose layings buy different cables
// (routing's fillLeg: the reel joins are placed over the outside-plant cable between a
// transition's splices, which may take fewer than the whole cable) so has each judged on its
// own cut. All candidates are ranked together in Choose's order (prefer rules, cost, margin,
// catalog order), the rejections are of each medium's best on its own cable, and the reason
// and losses are the winner's on its own; with no feasible candidate the reason is of the
// cable without a transition (own(EndsNone)). When every laying's cable is the same, it is
// Choose (remembered); otherwise not remembered.
func (e *Engine) ChooseOwn(l Link, own func(at Ends) OwnCable) Choice {
	var links [EndsBoth + 1]Link
	same := true
	for at := range links {
		c := own(Ends(at))
		links[at] = l
		links[at].SlackM, links[at].Splices = c.SlackM, c.Splices
		same = same && links[at].SlackM == links[0].SlackM && links[at].Splices == links[0].Splices
	}
	if same {
		return e.Choose(links[0])
	}
	return e.chooseAmong(links, false, nil)
}

func (e *Engine) choose(l Link) Choice { return e.chooseAmong(sameLinks(l), false, nil) }

// sameLinks is l for every set of transition ends: the candidates all judged on l's facts.
func sameLinks(l Link) [EndsBoth + 1]Link { return [EndsBoth + 1]Link{l, l, l, l} }

// chooseAmong is choose among the candidates keep keeps (all when nil), each judged on the
// link of its transition's ends (links[at]; links differ in SlackM and Splices alone,
// ChooseOwn); laid: keep keeps one laying of one medium, which the reason then compares with
// no other (ChooseLaid).
func (e *Engine) chooseAmong(links [EndsBoth + 1]Link, laid bool, keep func(m *Medium, k *Construction, v variant) bool) Choice {
	l := links[EndsNone] // the variants, the rate and, with none feasible, the reason's
	for _, x := range links {
		if msg := checkLink(x); msg != "" {
			return Choice{Reason: fmt.Sprintf("%s: bad facts: %s", linkName(x), msg), Code: CodeBadFacts}
		}
	}
	type spec struct {
		mi, ai, ki int
		v          variant
	}
	var specs []spec
	for ai, a := range e.cat.Applications {
		if a.RateGbps != l.RateGbps {
			continue
		}
		for mi, m := range e.cat.Media {
			if len(e.reachesOn(a, m)) == 0 {
				continue
			}
			for ki, k := range m.Constructions {
				for _, v := range e.variants(l, a, m, k) {
					if keep == nil || keep(m, k, v) {
						specs = append(specs, spec{mi, ai, ki, v})
					}
				}
			}
		}
	}
	// The candidates are large (every fact of the rule language): one slice for all, taken
	// from those earlier choices left. Nothing of a candidate outlives choose but what the
	// Choice copies (its losses are allocated per evaluation), so the slice goes back after.
	held := candidates.Get().(*[]candidate)
	pool := slices.Grow((*held)[:0], len(specs))[:len(specs)]
	defer func() {
		*held = pool[:0]
		candidates.Put(held)
	}()
	all := make([]*candidate, len(specs))
	var ok []*candidate
	for i, s := range specs {
		c := &pool[i]
		e.evaluate(c, links[s.v.at], linkLengths(links[s.v.at]), s.mi, s.ai, s.ki, s.v)
		all[i] = c
		if c.failed < 0 {
			ok = append(ok, c)
		}
	}
	if len(all) == 0 {
		return Choice{Reason: fmt.Sprintf("%s: no application runs at %s; the catalog has %s",
			linkName(l), FormatRate(l.RateGbps), rateList(e.cat.Rates())), Code: CodeNoApplication}
	}
	sort.SliceStable(ok, func(i, j int) bool { return better(ok[i], ok[j]) })
	var ch Choice
	var win *candidate
	if len(ok) > 0 {
		win = ok[0]
		l = links[win.at] // the winner's own facts, for its reason
		ch = Choice{Feasible: true, Medium: win.m.ID, Application: win.a.Name, Construction: win.k.ID,
			Losses: win.losses, CostCents: win.costCents,
			CableCents: win.cableCents, LabourCents: win.labourCents, Strands: win.strands, Cables: win.cables,
			Attenuators: win.b.attN, AttenuatorDB: win.b.attDB, AttenuatorCents: win.b.attCents, RepairSplices: win.repair}
		if win.m.Fibre() {
			ch.Termination = e.termination
		}
		if win.inside != nil {
			ch.Inside, ch.InsideAt = win.inside.ID, win.at
			ch.InsideCables, _ = e.Cables(win.m, win.inside, win.strands)
			ch.InsideAM, ch.InsideBM = l.transitionInsideM(l.ChannelM(), win.at)
			ch.InsideM = ch.InsideAM + ch.InsideBM
		}
	}
	var summary []string
	for mi, m := range e.cat.Media {
		if win != nil && mi == win.mi {
			continue
		}
		rej := e.rejections(l, m, mi, all, ok, win)
		ch.Rejected = append(ch.Rejected, rej...)
		if win == nil {
			for _, r := range rej {
				summary = append(summary, r.Reason)
			}
		}
	}
	if win == nil {
		if note := e.UntriedTransition("", l); note != "" {
			summary = append(summary, note)
		}
		ch.Reason = fmt.Sprintf("%s: no medium carries %s over %s m: %s", linkName(l), FormatRate(l.RateGbps),
			formatNum(l.ChannelM()), strings.Join(summary, "; "))
		ch.Code = CodeNoMedium
		return ch
	}
	ch.Reason, ch.Code = e.reason(l, win, ok, all, laid)
	return ch
}

// UntriedTransition says, when it is so, that outside-plant cable of medium ("": any) on a
// link with l's facts could have been spliced to listed cable at the entrances but was not
// tried for want of a price for the splice enclosure (transition_splice_each); "" otherwise.
func (e *Engine) UntriedTransition(medium string, l Link) string {
	if _, priced := e.prices.Price(PriceKey{Item: PriceTransition}); priced {
		return ""
	}
	for _, m := range e.cat.Media {
		if medium != "" && m.ID != medium {
			continue
		}
		for _, k := range m.Constructions {
			if transitionFits(l, m, k) {
				return "no splice to listed cable at the entrances was tried: the price book has no " + PriceKey{Item: PriceTransition}.Path()
			}
		}
	}
	return ""
}

// WhyNotLaid is why laying lay of medium may not carry a link with l's facts at rateGbps at
// the shortest channel (shortLengths): the reason of the first rule failed by the application
// that fails the fewest, as a Rejection's; "" when it passes.
func (e *Engine) WhyNotLaid(medium string, lay Laying, rateGbps float64, l Link) string {
	why, least, passes := "", -1, false
	e.eachLaying(medium, rateGbps, l, func(c *candidate, laid Laying) bool {
		switch {
		case laid != lay:
		case c.failed < 0:
			passes = true
			return false
		case least < 0 || c.nFailed < least:
			rule := e.rules.Rules[c.failed]
			why, least = fmt.Sprintf("%s on %s rejected by %s: %s", c.m.ID, lay.on(l), rule.ID, rule.reason.render(c.f[:])), c.nFailed
		}
		return true
	})
	switch {
	case passes:
		return ""
	case why == "":
		return fmt.Sprintf("%s on %s: no such laying at %s on this link", medium, lay.on(l), FormatRate(rateGbps))
	}
	return why
}

// eachLaying evaluates every laying of medium (each construction as it is, then with its
// entrance transition when it has one: variants) with every application at rateGbps that
// the medium carries, on a link with l's facts at the shortest channel (shortLengths), and
// calls yield with each candidate in catalog order (applications, constructions, variants)
// until yield returns false. c is scratch, valid during the call only. It is what LayingFor
// and WhyNotLaid judge, so the two weigh the same candidates. It panics on a medium not in
// the catalog.
func (e *Engine) eachLaying(medium string, rateGbps float64, l Link, yield func(c *candidate, lay Laying) bool) {
	m := e.mustMedium(medium)
	mi := slices.Index(e.cat.Media, m)
	l.RateGbps = rateGbps
	at := shortLengths(l)
	var c candidate
	for ai, a := range e.cat.Applications {
		if len(e.reachesOn(a, m)) == 0 || a.RateGbps != rateGbps {
			continue
		}
		for ki, k := range m.Constructions {
			for _, v := range e.variants(l, a, m, k) {
				e.evaluate(&c, l, at, mi, ai, ki, v)
				if !yield(&c, layingOf(k, v)) {
					return
				}
			}
		}
	}
}

// candidates holds the candidate slices of finished choices, for the next (choose).
var candidates = sync.Pool{New: func() any { return new([]candidate) }}

// better ranks feasible candidates: prefer rules, cost, margin, catalog order.
func better(a, b *candidate) bool {
	for i := range a.prefer {
		if a.prefer[i] != b.prefer[i] {
			return a.prefer[i]
		}
	}
	if a.costCents != b.costCents {
		return a.costCents < b.costCents
	}
	if a.marginDB != b.marginDB {
		return a.marginDB > b.marginDB
	}
	if a.mi != b.mi {
		return a.mi < b.mi
	}
	if a.ai != b.ai {
		return a.ai < b.ai
	}
	if a.ki != b.ki {
		return a.ki < b.ki
	}
	return a.at.Count() < b.at.Count() || (a.at.Count() == b.at.Count() && a.at < b.at)
}

// rejections explains why medium m lost.
func (e *Engine) rejections(l Link, m *Medium, mi int, all, ok []*candidate, win *candidate) []Rejection {
	for _, c := range ok {
		if c.mi != mi {
			continue
		}
		// c is m's best feasible candidate, since ok is sorted.
		rule, how := RuleCost, ""
		for i := range c.prefer {
			if win.prefer[i] && !c.prefer[i] {
				pr := e.preferRule(i)
				rule = pr.ID
				how = fmt.Sprintf("%s with %s on %s is feasible at %s %s, but rule %s prefers %s: %s",
					m.ID, c.a.Name, c.label(), FormatCents(c.costCents), e.prices.Currency, pr.ID, win.m.ID, pr.reason.render(win.f[:]))
				break
			}
		}
		if how == "" {
			how = fmt.Sprintf("%s with %s on %s costs %s %s %s, %s more than %s", m.ID, c.a.Name, c.label(),
				FormatCents(c.costCents), e.prices.Currency, costCovers, FormatCents(c.costCents-win.costCents), win.m.ID)
			if c.costCents == win.costCents {
				how = fmt.Sprintf("%s with %s on %s costs the same %s %s as %s, which has the larger margin or comes first in the catalog",
					m.ID, c.a.Name, c.label(), FormatCents(c.costCents), e.prices.Currency, win.m.ID)
			}
		}
		return []Rejection{{Medium: m.ID, Rule: rule, Reason: fmt.Sprintf("%s rejected by %s: %s", m.ID, rule, how)}}
	}
	// Per application, the candidates that fail the fewest rules, each distinct rule they fail
	// once, in rule order: a candidate that fails only one rule is one change away from
	// feasible, and which change is the user's to choose (route around a buried span, splice
	// at the entrances, a shorter route...), so every such rule is named, not one of them.
	var out []Rejection
	for ai := range e.cat.Applications {
		least := -1
		for _, c := range all {
			if c.mi == mi && c.ai == ai && (least < 0 || c.nFailed < least) {
				least = c.nFailed
			}
		}
		if least < 0 {
			continue
		}
		var picks []*candidate
		for _, c := range all {
			if c.mi == mi && c.ai == ai && c.nFailed == least && !slices.ContainsFunc(picks, func(p *candidate) bool { return p.failed == c.failed }) {
				picks = append(picks, c)
			}
		}
		slices.SortStableFunc(picks, func(a, b *candidate) int { return a.failed - b.failed })
		for _, pick := range picks {
			rule := e.rules.Rules[pick.failed]
			r := Rejection{Medium: m.ID, Rule: rule.ID,
				Reason: fmt.Sprintf("%s rejected by %s: %s", m.ID, rule.ID, rule.reason.render(pick.f[:]))}
			if !slices.Contains(out, r) { // two applications failing alike say it once
				out = append(out, r)
			}
		}
	}
	if len(out) == 0 {
		out = append(out, Rejection{Medium: m.ID, Rule: RuleNoApplication,
			Reason: fmt.Sprintf("%s rejected by %s: no application at %s runs on %s", m.ID, RuleNoApplication, FormatRate(l.RateGbps), m.ID)})
	}
	return out
}

// costCovers says what a medium's cost in a reason holds: the engine's installed cost of the
// medium (cost: the cable bought with the design's waste and, with a transition, its ends'
// items), not a leg's whole cost (pathway, pulling, testing and patch cords are left out).
const costCovers = "of cable, terminations and transceivers"

// preferRule is the i-th prefer rule.
func (e *Engine) preferRule(i int) *Rule {
	n := 0
	for _, r := range e.rules.Rules {
		if r.Effect == EffectPrefer {
			if n == i {
				return r
			}
			n++
		}
	}
	panic("media: prefer rule index out of range")
}

// reason is the one-sentence explanation of a choice and its code: CodeOnly, CodeCheapest or
// CodePreferred; then, for each application at the rate on the winner's medium that would
// cost less but no laying of which is feasible, why it was refused (refusedApps).
func (e *Engine) reason(l Link, win *candidate, ok, all []*candidate, laid bool) (string, string) {
	var b strings.Builder
	code := CodeOnly
	fmt.Fprintf(&b, "%s with %s on %s", win.m.ID, win.a.Name, win.label())
	media := map[string]bool{}
	for _, c := range ok {
		media[c.m.ID] = true
	}
	switch {
	case laid: // one laying judged: no comparison (ChooseLaid)
		fmt.Fprintf(&b, ", at %s %s %s", FormatCents(win.costCents), e.prices.Currency, costCovers)
	case len(media) == 1:
		fmt.Fprintf(&b, " is the only feasible medium, at %s %s %s", FormatCents(win.costCents), e.prices.Currency, costCovers)
	default:
		fmt.Fprintf(&b, " is the cheapest of %d feasible media at %s %s %s", len(media), FormatCents(win.costCents), e.prices.Currency, costCovers)
		code = CodeCheapest
		for i, p := range win.prefer {
			if p {
				fmt.Fprintf(&b, " among those rule %s prefers", e.preferRule(i).ID)
				code = CodePreferred
				break
			}
		}
	}
	fmt.Fprintf(&b, " for a %s m channel", formatNum(l.ChannelM()))
	if w, found := worstLoss(win.losses); found {
		fmt.Fprintf(&b, ", loss %s dB", formatNum(w.LossDB))
		if w.AttenuatorDB > 0 {
			fmt.Fprintf(&b, " (a %s dB fixed attenuator at each receiver included)", formatNum(w.AttenuatorDB))
		}
		fmt.Fprintf(&b, " against %s dB at %d nm (margin %s dB)", formatNum(w.LimitDB), w.WavelengthNM, formatNum(w.MarginDB))
	} else {
		fmt.Fprintf(&b, ", within its %s m reach", formatNum(win.r.RangeM))
	}
	b.WriteString(futureText(l, win))
	for _, why := range e.refusedApps(l, win, ok, all) {
		b.WriteString("; ")
		b.WriteString(why)
	}
	return b.String(), code
}

// futureText says, for a link planned for a future rate (Link.FutureRateGbps), which
// application at that rate the winner was judged ready for (future) and its loss margin on
// fibre, or its reach on copper, or, when the catalog's future-rate rule was lifted, why it
// is not ready: "; ready for 100G: 100GBASE-LR4, margin 3.20 dB". "" without a future rate.
func futureText(l Link, win *candidate) string {
	if l.FutureRateGbps <= 0 {
		return ""
	}
	f := &win.f
	rate := FormatRate(l.FutureRateGbps)
	app := f[fFutureApplication].str
	switch {
	case !f[fFutureFits].b:
		return fmt.Sprintf("; not ready for %s: %s", rate, f[fFutureNote].str)
	case win.m.Fibre():
		return fmt.Sprintf("; ready for %s: %s, margin %s dB", rate, app, formatNum(f[fFutureMarginDB].num))
	default:
		return fmt.Sprintf("; ready for %s: %s, within its %s m reach", rate, app, formatNum(f[fFutureReachM].num))
	}
}

// refusedApps says, for each other application at the link's rate on the winner's medium
// that would cost less than the winner but was refused, why: "10GBASE-LR, 2,140.00 USD less,
// rejected by loss-budget: …" with the rule's reason. It judges the application on the
// winner's laying (construction and transition), which the winner's numbers are for: refused
// there, it is named, and where it is feasible on another laying at a higher cost that is
// said too; feasible there, it lost on price or preference and is not named. An application
// with no candidate on the winner's laying is judged by its candidate that fails the fewest
// rules, and named only when it has no feasible one at all.
func (e *Engine) refusedApps(l Link, win *candidate, ok, all []*candidate) []string {
	var out []string
	for ai, a := range e.cat.Applications {
		if ai == win.ai {
			continue
		}
		var pick *candidate
		for _, c := range all {
			if c.mi == win.mi && c.ai == ai && c.ki == win.ki && c.inside == win.inside && c.at == win.at {
				pick = c
			}
		}
		i := slices.IndexFunc(ok, func(c *candidate) bool { return c.mi == win.mi && c.ai == ai })
		if pick == nil && i < 0 {
			for _, c := range all {
				if c.mi == win.mi && c.ai == ai && (pick == nil || c.nFailed < pick.nFailed) {
					pick = c
				}
			}
		}
		if pick == nil || pick.failed < 0 {
			continue
		}
		// Its cost as Choose would price it, on a copy: cost sets the candidate's labour.
		cp := *pick
		channel := pick.f[fChannelM].num
		_, cents := e.cost(&cp, channel, l)
		if cents >= win.costCents {
			continue
		}
		rule := e.rules.Rules[pick.failed]
		why := fmt.Sprintf("%s, %s %s less, rejected by %s: %s", a.Name, FormatCents(win.costCents-cents),
			e.prices.Currency, rule.ID, rule.reason.render(pick.f[:]))
		if i >= 0 { // ok is sorted: its first candidate of a is a's best
			// Dearer than the winner, or, where a prefer rule chose the winner, cheaper.
			diff, than := ok[i].costCents-win.costCents, "more"
			if diff < 0 {
				diff, than = -diff, "less"
			}
			why += fmt.Sprintf(", and is feasible on %s at %s %s %s than %s", ok[i].label(), FormatCents(diff),
				e.prices.Currency, than, win.a.Name)
		}
		out = append(out, why)
	}
	return out
}

// feasibleAt reports whether medium mi carries l at channelM metres with some application
// and construction, the laying lay's when it names one; c is scratch space, its contents of
// no meaning after.
func (e *Engine) feasibleAt(c *candidate, l Link, mi int, channelM float64, lay Laying) bool {
	at := trialLengths(l, channelM)
	m := e.cat.Media[mi]
	for ai, a := range e.cat.Applications {
		rs := e.reachesOn(a, m)
		if len(rs) == 0 || a.RateGbps != l.RateGbps || channelM > longestRange(rs) {
			continue
		}
		for ki, k := range m.Constructions {
			if lay.Construction != "" && k.ID != lay.Construction {
				continue
			}
			for _, v := range e.variants(l, a, m, k) {
				if lay.Construction != "" && lay != layingOf(k, v) {
					continue
				}
				if e.evaluate(c, l, at, mi, ai, ki, v); c.failed < 0 {
					return true
				}
			}
		}
	}
	return false
}

// Laying is one way of laying a medium's cable on a link: a construction (a catalog id), and,
// when Inside is not "", an entrance transition splicing it at the entrances of At (one end
// or both) to the listed construction Inside, which runs inside those buildings. The zero
// Laying names none: any construction the rules allow.
type Laying struct {
	Construction, Inside string
	At                   Ends // the ends of the transition; EndsNone when Inside is ""
}

// layingOf names construction k laid as v.
func layingOf(k *Construction, v variant) Laying {
	if v.inside == nil {
		return Laying{Construction: k.ID}
	}
	return Laying{Construction: k.ID, Inside: v.inside.ID, At: v.at}
}

// String is the laying in words: "osp-loose-tube + ofnr-riser at entrances" with a
// transition at both ends, "… at the first end's entrance" or "… at the other end's
// entrance" (end_a, end_b) at one.
func (l Laying) String() string { return l.on(Link{}) }

// on is the laying in words on link k, naming the end of a transition at one end by its
// building (Link.EndA, EndB) when k names it: "… at CAF entrance".
func (l Laying) on(k Link) string {
	switch {
	case l.Inside == "":
		return l.Construction
	case l.At == EndA:
		return l.Construction + " + " + l.Inside + " at " + cmp.Or(k.EndA, "the first end's") + " entrance"
	case l.At == EndB:
		return l.Construction + " + " + l.Inside + " at " + cmp.Or(k.EndB, "the other end's") + " entrance"
	}
	return l.Construction + " + " + l.Inside + " at entrances"
}

// shortLengths are the lengths LayingFor and Lays judge a link at: a channel of its risers and
// slack and one metre of route, where only the rules on the route's kind and ends can fail.
func shortLengths(l Link) lengths { return trialLengths(l, l.RiserM+l.SlackM+1) }

// LayingFor is the laying of medium that carries a link with l's facts at rateGbps by every
// rule at the shortest channel (shortLengths), with some application at that rate, and costs
// the least installed there (Choose's cost: a transition's enclosures and splicing count in
// full, so a laying without one wins where one passes); with its prices (for the strands of
// that application). It is the laying a route of l's kind (pathway types, plenum, EMI) must
// be priced as whatever its length, for routing. ok is false when none passes. It panics on a
// medium not in the catalog.
func (e *Engine) LayingFor(medium string, rateGbps float64, l Link) (lay Laying, price LayingPrice, ok bool) {
	var cost int64
	e.eachLaying(medium, rateGbps, e.judged(l), func(c *candidate, laid Laying) bool {
		if c.failed < 0 && (!ok || c.costCents < cost) {
			lay, price, cost, ok = laid, e.layingPrice(c.m, c.k, c.inside, c.at, c.strands), c.costCents, true
		}
		return true
	})
	return lay, price, ok
}

// Lays reports whether laying lay of medium carries a link with l's facts at rateGbps by every
// rule at the shortest channel (shortLengths), with some application at that rate: whether a
// route of l's kind may be laid so. It panics on a medium not in the catalog.
func (e *Engine) Lays(medium string, lay Laying, rateGbps float64, l Link) bool {
	m := e.mustMedium(medium)
	l = e.judged(l)
	l.RateGbps = rateGbps
	var c candidate
	return e.feasibleAt(&c, l, slices.Index(e.cat.Media, m), shortLengths(l).channelM, lay)
}

// MaxChannelM is the longest channel in metres over which medium can carry rateGbps, and
// futureRateGbps when it is > 0, for a link with l's other facts (connector pairs, splices,
// EMI, outdoor, plenum, risers, slack, inside lengths; l's rates and route length are ignored).
// It honours every rule of the engine: the applications' reach (a higher grade's and the grades
// it meets), the multimode 2 km cap, the copper 90 m installed and 100 m channel caps and the
// loss budget solved for length with the margin policy, repair splices and attenuators, as the
// default rules state them. It never exceeds the longest operating range of an application at
// the rate on the medium. It returns 0 when the medium never carries the rate for such a link,
// or is unknown.
func (e *Engine) MaxChannelM(medium string, rateGbps, futureRateGbps float64, l Link) float64 {
	return e.MaxChannelMAs(medium, Laying{}, rateGbps, futureRateGbps, l)
}

// MaxChannelMAs is MaxChannelM with the cable laid as lay (its construction, with or without
// its transition); the zero Laying is any, as MaxChannelM.
func (e *Engine) MaxChannelMAs(medium string, lay Laying, rateGbps, futureRateGbps float64, l Link) float64 {
	l = e.judged(l)
	k := e.maxKeyOf(medium, lay, rateGbps, futureRateGbps, l)
	if v, ok := e.maxMemo.Get(k); ok {
		return v
	}
	v := e.maxChannelM(medium, lay, rateGbps, futureRateGbps, l)
	e.maxMemo.Add(k, v)
	return v
}

// maxKeyOf is MaxChannelMAs's question as a key: the link as judged, with the rates asked and
// no route (maxChannelM sets them so), which Lays reads alike (it judges at its own rate and
// the shortest channel, shortLengths).
func (e *Engine) maxKeyOf(medium string, lay Laying, rateGbps, futureRateGbps float64, l Link) maxKey {
	l.RouteM, l.RateGbps, l.FutureRateGbps = 0, rateGbps, futureRateGbps
	return maxKey{medium: medium, laying: lay, link: e.VerdictKey(l)}
}

// maxKey is what MaxChannelM's answer depends on (with the engine): the medium, the laying
// and every field of the link as the rules judge it (VerdictKey).
type maxKey struct {
	medium string
	laying Laying
	link   LinkKey
}

// judged is l as the rules' verdicts read it (MaxChannelM, Lays, LayingFor, CableLayingFor,
// and the memos of them): with its ID and the names no rule's condition reads (e.reads)
// cleared. A verdict is whether the rules' conditions hold on each candidate's facts, with
// the candidates' costs (cost, layingPrice: no name in them); a name is in no fact but those
// made from it (Fact.names, held to it by TestNamesOnlyInTheirFacts), so a verdict on the
// judged link is the verdict on l, and a memo keyed by the judged link (keyOf, every field)
// keys every name its answer can depend on. Reasons (Choose, WhyNotLaid) are judged on l.
func (e *Engine) judged(l Link) Link { return e.reads.keep(l) }

// LinkKey is a link as the engine's verdicts read it (Engine.VerdictKey), comparable: a
// caller's memo of MaxChannelM, Lays, LayingFor or CableLayingFor keys it with the
// question's other arguments. It is a handle of the link's every field (unique.Handle), one
// word: a memo's many questions about a few thousand links keep each link once, and compare
// and hash a pointer.
type LinkKey struct{ h unique.Handle[chooseKey] }

// VerdictKey is l as MaxChannelM, MaxChannelMAs, Lays, LayingFor and CableLayingFor read it,
// as a key: every field of Link (a field added to Link is added to it, TestChooseRemembers)
// but those that cannot change their answers: the ID, which is in no fact, and the names of
// buildings and spans (EndA, EndB, EMISpans, CrossedBuilding) that no rule's condition reads.
// Two links of one key get the same answers from each of them with the same other arguments.
func (e *Engine) VerdictKey(l Link) LinkKey { return LinkKey{unique.Make(keyOf(e.judged(l)))} }

func (e *Engine) maxChannelM(medium string, lay Laying, rateGbps, futureRateGbps float64, l Link) float64 {
	mi := -1
	for i, m := range e.cat.Media {
		if m.ID == medium {
			mi = i
		}
	}
	l.RateGbps, l.FutureRateGbps = rateGbps, futureRateGbps
	l.RouteM = 0 // ignored: the facts checked are l's own, the channel is a trial length
	if mi < 0 || checkLink(l) != "" {
		return 0
	}
	m := e.cat.Media[mi]
	// Feasibility changes only where some fact crosses a number: the numbers in the rules,
	// the applications' ranges, and the lengths at which a loss budget closes exactly.
	points := append([]float64(nil), e.breakpoints...)
	for _, a := range e.cat.Applications {
		rs := e.reachesOn(a, m)
		if len(rs) == 0 || (a.RateGbps != rateGbps && a.RateGbps != futureRateGbps) {
			continue
		}
		for _, r := range rs {
			points = append(points, r.RangeM)
		}
		points = e.budgetPoints(points, l, a, m, rs, lay)
	}
	sort.Float64s(points)
	points = slices.Compact(points)
	var c candidate // one for every trial: a candidate is large
	for i := len(points) - 1; i >= 0; i-- {
		x := points[i]
		if x <= 0 || (i+1 < len(points) && points[i+1] == x) {
			continue
		}
		for _, y := range []float64{x, x * (1 - 1e-9)} {
			if e.feasibleAt(&c, l, mi, y, lay) {
				return e.refine(&c, l, mi, y, points[i+1:], lay)
			}
		}
	}
	return 0
}

// refine extends a feasible length lo towards the next breakpoint above it, in case a rule
// compares facts in a way the breakpoints do not capture; it bisects to 1 mm.
func (e *Engine) refine(c *candidate, l Link, mi int, lo float64, above []float64, lay Laying) float64 {
	if len(above) == 0 {
		return lo
	}
	hi := above[0]
	if !e.feasibleAt(c, l, mi, (lo+hi)/2, lay) {
		return lo
	}
	for hi-lo > 0.001 {
		mid := (lo + hi) / 2
		if e.feasibleAt(c, l, mi, mid, lay) {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo
}

// constructionFor is the cheapest construction of medium m for strands strands that may
// run outdoors (outdoor) or is listed for indoor use (!outdoor), with its per-metre price.
func (e *Engine) constructionFor(m *Medium, strands int, outdoor bool) (*Construction, int64) {
	var best *Construction
	bestCents := int64(math.MaxInt64)
	for _, k := range m.Constructions {
		if (outdoor && !k.OutdoorRated) || (!outdoor && k.Listing == "") {
			continue
		}
		if _, perM := e.Cables(m, k, strands); perM >= 0 && perM < bestCents {
			best, bestCents = k, perM
		}
	}
	return best, bestCents
}

// LongestRangeM is the longest operating range in metres of any application at rateGbps on
// medium, of it or the grades it meets (Catalog.ReachesOn): no channel of the medium at the
// rate is longer. It is 0 when none runs, and panics on a medium not in the catalog.
func (e *Engine) LongestRangeM(medium string, rateGbps float64) float64 {
	m := e.mustMedium(medium)
	x := 0.0
	for _, a := range e.cat.Applications {
		if a.RateGbps == rateGbps {
			x = max(x, longestRange(e.reachesOn(a, m)))
		}
	}
	return x
}

func (e *Engine) mustMedium(id string) *Medium {
	m := e.cat.Medium(id)
	if m == nil {
		panic("media: unknown medium " + id)
	}
	return m
}

// CablePerMCents is the price in cents per metre of cable for strands strands (counted as
// in Link.Strands: on copper, one 4-pair cable per two strands) of medium: the cheapest outdoor-rated construction when outdoor, else
// the cheapest listed (riser or plenum) one, all the cables it buys (Engine.Cables).
// It is a lower bound of what Choose prices, for routing. It returns -1 when the medium has
// no such construction, and panics on a medium not in the catalog.
func (e *Engine) CablePerMCents(medium string, strands int, outdoor bool) int64 {
	m := e.mustMedium(medium)
	if m.Kind == KindCopper {
		strands = (strands + 1) / 2
	}
	k, c := e.constructionFor(m, strands, outdoor)
	if k == nil {
		return -1
	}
	return c
}

// CableLayingFor is the per-metre price in cents (all cables needed for strands strands) of the
// cheapest construction of medium that carries a link with l's facts at rateGbps by every
// rule, on some application at that rate and without an entrance transition, at a channel
// of l's risers and slack plus one metre: what the rules let the medium run on whatever the
// route's length (a rule on the risers, such as the 15 m limit of unlisted cable past an
// entrance, already applies there). It falls back to CablePerMCents(medium, l.Strands,
// l.Outdoor) when no construction passes, and panics on a medium not in the catalog.
// It returns the laying it prices too: the construction that passes, without a transition;
// the zero Laying when none passes and the price is CablePerMCents's.
func (e *Engine) CableLayingFor(medium string, rateGbps float64, l Link) (Laying, int64) {
	m := e.mustMedium(medium)
	mi := slices.Index(e.cat.Media, m)
	l = e.judged(l)
	l.RateGbps = rateGbps
	at := trialLengths(l, l.RiserM+l.SlackM+1)
	// The constructions by price, cheapest first: the first that passes is the answer.
	type priced struct {
		ki   int
		perM int64
	}
	var ks []priced
	for ki, k := range m.Constructions {
		strands := l.Strands
		if m.Kind == KindCopper {
			strands = copperCables(l)
		}
		if _, perM := e.Cables(m, k, strands); perM >= 0 {
			ks = append(ks, priced{ki, perM})
		}
	}
	slices.SortStableFunc(ks, func(a, b priced) int { return cmp.Compare(a.perM, b.perM) })
	best := int64(-1)
	var lay Laying
	var c candidate
search:
	for _, k := range ks {
		for ai, a := range e.cat.Applications {
			if len(e.reachesOn(a, m)) == 0 || a.RateGbps != rateGbps {
				continue
			}
			if e.evaluate(&c, l, at, mi, ai, k.ki, variant{}); c.failed < 0 {
				best, lay = c.perMCents, layingOf(m.Constructions[k.ki], variant{})
				break search
			}
		}
	}
	if best < 0 {
		return Laying{}, e.CablePerMCents(medium, l.Strands, l.Outdoor)
	}
	return lay, best
}

// FixedCents is FixedCentsFor a link of strands strands (on copper one 4-pair cable per two).
func (e *Engine) FixedCents(medium string, rateGbps float64, strands int) int64 {
	return e.FixedCentsFor(medium, rateGbps, Link{Strands: strands})
}

// FixedCentsFor is the length-independent part of the installed cost of a link with l's
// strands (Link.CopperCables on copper) on medium at rateGbps, in cents: one termination per
// strand (per 4-pair cable for copper) at both ends for max(strands, the application's
// strands), plus two transceivers, for the application at that rate on the medium that makes
// this cheapest, whatever its reach. Use MaxChannelM for reach and Choose for the final price.
// It returns -1 when no application at the rate runs on the medium, and panics on a medium not
// in the catalog.
func (e *Engine) FixedCentsFor(medium string, rateGbps float64, l Link) int64 {
	m := e.mustMedium(medium)
	term, _ := e.prices.Price(PriceKey{Item: PriceTermination, Medium: m.ID})
	best := int64(-1)
	for _, a := range e.cat.Applications {
		if len(e.reachesOn(a, m)) == 0 || a.RateGbps != rateGbps {
			continue
		}
		trx, _ := e.prices.Price(PriceKey{Item: PriceTransceiver, Name: a.Transceiver})
		c := 2*int64(strandsFor(l, a, m))*term + 2*trx
		if best < 0 || c < best {
			best = c
		}
	}
	return best
}
