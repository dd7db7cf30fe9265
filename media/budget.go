package media

import (
	"fmt"
	"math"
	"slices"
	"strings"
)

// Default copper cords: ANSI/TIA-568.2's 100 m channel is a 90 m permanent link plus up to
// 10 m of patch and equipment cords (seen).
const defaultCopperCordsM = 10

// termSplices is the number of splices the terminations put in a channel of medium m: one per
// strand end for spliced pigtails, two ends; none for copper or connectors.
func (e *Engine) termSplices(m *Medium) int {
	if !m.Fibre() {
		return 0
	}
	return 2 * TerminationSplices(e.termination)
}

// outsideM is the metres of the channel in outside plant: the channel less the cable inside
// the buildings at both ends when the link gives them (Link.InsideAM, InsideBM), otherwise
// the whole channel when it leaves a building (the conservative reading: the risers and
// slack of the old facts do not say which end they are at); 0 for a route that stays inside.
func outsideM(l Link, at lengths) float64 {
	if !l.Outdoor {
		return 0
	}
	if l.InsideAM != 0 || l.InsideBM != 0 {
		return max(0, at.channelM-l.InsideAM-l.InsideBM)
	}
	return at.channelM
}

// repairSplices is the repair-splice allowance of the margin policy for a link on medium m:
// single-mode only, RepairSplicesPerKm per km of outside plant rounded up.
func (e *Engine) repairSplices(m *Medium, outM float64) int {
	if m.Kind != KindSinglemode || outM <= 0 || e.margins.RepairSplicesPerKm <= 0 {
		return 0
	}
	return int(math.Ceil(outM/1000*e.margins.RepairSplicesPerKm - 1e-9))
}

// classMargin is the catalog's fixed extra margin of medium m's class and the class's name in
// words; ok is false for copper.
func (e *Engine) classMargin(m *Medium) (db float64, class string, ok bool) {
	switch m.Kind {
	case KindMultimode:
		return e.margins.MultimodeDB, "multimode", true
	case KindSinglemode:
		return e.margins.SinglemodeDB, "single-mode", true
	}
	return 0, "", false
}

// marginParts is what the margin a fibre channel keeps is made of: the one rule, which
// Engine.marginOf applies and both the loss budget (Choose) and the optimizer's reach
// (MaxChannelM, budgetPoints) read. A channel built of parts at their ANSI/TIA-568.3-D maxima
// must still close its application's budget, so the margin holds, for each of the channel's
// mated pairs and splices, what the part may lose at that maximum beyond the design loss the
// budget counts (never less than nothing), the repair splices of the policy, each at the
// larger of its design and maximum loss, and the class's fixed extra from the catalog; or the
// plan's loss_margin_db when that is larger. The cabled attenuation needs no part: the budget
// counts it at the construction's maximum already.
type marginParts struct {
	pairs, splices, repair int
	pairGapDB, spliceGapDB float64 // per part: max(0, ANSI/TIA-568.3-D maximum − design loss)
	repairDB               float64 // per repair splice
	extraDB                float64 // the catalog's margin of the class (margins.extra_multimode_db, extra_singlemode_db)
	class                  string  // "multimode" or "single-mode"
	floorDB                float64 // the plan's loss_margin_db
	tia                    bool    // the catalog's maxima are ANSI/TIA-568.3-D's (tiaPairDB, tiaSpliceDB)
}

// ANSI/TIA-568.3-D's maxima for a mated connector pair and a splice (from memory; the embedded
// catalog's connections): which the margin's words name when a catalog keeps them.
const (
	tiaPairDB   = 0.75
	tiaSpliceDB = 0.3
)

// marginOf is the margin parts of a fibre channel on medium m with pairs mated pairs, splices
// splices and repair repair splices; ok is false for copper, which keeps none.
func (e *Engine) marginOf(m *Medium, pairs, splices, repair int) (marginParts, bool) {
	extra, class, ok := e.classMargin(m)
	if !ok {
		return marginParts{}, false
	}
	return marginParts{pairs: pairs, splices: splices, repair: repair,
		pairGapDB:   max(0, e.field.PairDB-e.design.PairDB),
		spliceGapDB: max(0, e.field.SpliceDB-e.design.SpliceDB),
		repairDB:    max(e.design.SpliceDB, e.field.SpliceDB),
		extraDB:     extra, class: class, floorDB: e.opt.LossMarginDB,
		tia: e.field.PairDB == tiaPairDB && e.field.SpliceDB == tiaSpliceDB}, true
}

// policyDB is the margin the parts ask for without the plan's floor, in dB.
func (p marginParts) policyDB() float64 {
	return roundDB(float64(p.pairs)*p.pairGapDB + float64(p.splices)*p.spliceGapDB + float64(p.repair)*p.repairDB + p.extraDB)
}

// db is the required margin, in dB: the policy's, or the plan's floor when larger.
func (p marginParts) db() float64 { return roundDB(max(p.policyDB(), p.floorDB)) }

// basis says in words what db is made of, for reasons and loss budgets: "the plan's
// loss_margin_db" when the floor is the larger; otherwise each part that is not nothing, e.g.
// "2 mated pairs × 0.25 dB to the TIA-568.3-D maxima + 3 repair splices × 0.3 dB".
func (p marginParts) basis() string {
	if p.floorDB > p.policyDB() {
		return "the plan's loss_margin_db"
	}
	var gaps, parts []string
	count := func(n int, one, many string) string {
		if n == 1 {
			return "1 " + one
		}
		return fmt.Sprintf("%d %s", n, many)
	}
	if p.pairs > 0 && p.pairGapDB > 0 {
		gaps = append(gaps, fmt.Sprintf("%s × %s dB", count(p.pairs, "mated pair", "mated pairs"), formatNum(roundDB(p.pairGapDB))))
	}
	if p.splices > 0 && p.spliceGapDB > 0 {
		gaps = append(gaps, fmt.Sprintf("%s × %s dB", count(p.splices, "splice", "splices"), formatNum(roundDB(p.spliceGapDB))))
	}
	maxima, maximum := "the TIA-568.3-D maxima", "its TIA-568.3-D maximum"
	if !p.tia { // a catalog of one's own (review 21 F7)
		maxima, maximum = "the catalog's maxima (connections.mated_pair_db, splice_db)", "its maximum in the catalog (connections.mated_pair_db, splice_db)"
	}
	if len(gaps) > 0 {
		parts = append(parts, strings.Join(gaps, " + ")+" to "+maxima)
	}
	if p.repair > 0 && p.repairDB > 0 {
		parts = append(parts, fmt.Sprintf("%s × %s dB", count(p.repair, "repair splice", "repair splices"), formatNum(roundDB(p.repairDB))))
	}
	if p.extraDB > 0 {
		parts = append(parts, fmt.Sprintf("the catalog's %s %s dB", p.class, formatNum(p.extraDB)))
	}
	if len(parts) == 0 {
		return "none: no part is designed below " + maximum
	}
	return strings.Join(parts, " + ")
}

// requiredMarginDB is the margin a fibre channel on medium m with pairs mated pairs, splices
// splices and repair repair splices keeps, in dB (marginParts); 0 for copper.
func (e *Engine) requiredMarginDB(m *Medium, pairs, splices, repair int) float64 {
	p, ok := e.marginOf(m, pairs, splices, repair)
	if !ok {
		return 0
	}
	return p.db()
}

// marginBasis says in words what requiredMarginDB(m, pairs, splices, repair) is made of
// (marginParts.basis); "" for copper.
func (e *Engine) marginBasis(m *Medium, pairs, splices, repair int) string {
	p, ok := e.marginOf(m, pairs, splices, repair)
	if !ok {
		return ""
	}
	return p.basis()
}

// margin is a channel's required margin in dB and its words, worked out once (Engine.marginFor)
// and carried by its budget to every operating Loss (RequiredMarginDB, RequiredMarginBasis).
type margin struct {
	db    float64
	basis string
}

// basisKey is what a margin's words depend on, besides the engine.
type basisKey struct {
	kind                   string
	pairs, splices, repair int
}

// marginFor is the required margin of a channel on medium m (requiredMarginDB) with its words
// (marginBasis), remembered by class and counts: the words are a fact of every fibre candidate
// but read only in reasons and outputs (reread 12: 4.8 % of the demo's CPU formatting them).
func (e *Engine) marginFor(m *Medium, pairs, splices, repair int) margin {
	p, ok := e.marginOf(m, pairs, splices, repair)
	if !ok {
		return margin{}
	}
	k := basisKey{m.Kind, pairs, splices, repair}
	if b, ok := e.bases.Load(k); ok {
		return margin{db: p.db(), basis: b.(string)}
	}
	b, _ := e.bases.LoadOrStore(k, p.basis())
	return margin{db: p.db(), basis: b.(string)}
}

// attenuatorFor is the smallest attenuator the price book prices of at least needDB dB, with
// its price in cents, and whether there is one.
func (e *Engine) attenuatorFor(needDB float64) (int, int64, bool) {
	for _, v := range e.attenuators {
		if float64(v) >= needDB-1e-9 {
			c, _ := e.prices.Price(PriceKey{Item: PriceAttenuator, Count: v})
			return v, c, true
		}
	}
	return 0, 0, false
}

// budget is a candidate's loss budget on the reach-and-loss pair it uses.
type budget struct {
	r          Reach
	losses     []Loss
	leastDB    float64 // the least operating loss without attenuator
	attDB      int     // attenuator at each receiver; 0 none
	attN       int     // attenuators on the link
	attCents   int64   // all of them
	overloadDB float64 // how far the loss, attenuator included, stays below the PHY's minimum
	req        margin  // the margin the channel must keep, with its words
}

// marginDB is the worst operating margin, and whether there is an operating wavelength.
func (b *budget) marginDB() (float64, bool) {
	w, ok := worstLoss(b.losses)
	return w.MarginDB, ok
}

// budgetFor is the loss budget of application a on medium m built as construction k (its
// attenuation; blended for a transition) over a channel of channelM metres with pairs
// connector pairs and splices splices, keeping req's margin (Engine.marginFor). Of the reach-and-loss
// pairs a may use on m (Catalog.ReachesOn) it takes the one that reaches the channel and keeps
// the margin, then the one with the larger margin, then the longer reach, then the first: a
// higher grade that meets a lower one never does worse. A channel losing less than a's
// minimum gets the smallest attenuator the price book prices that makes it up.
func (e *Engine) budgetFor(k *Construction, a *Application, reaches []Reach, channelM float64, pairs, splices int, req margin) budget {
	b := budget{r: reaches[0], req: req,
		losses: Losses(k, a, reaches[0], channelM, pairs, splices, e.design, e.field)}
	if len(b.losses) == 0 { // copper: no loss budget, one reach
		return b
	}
	// The losses do not depend on the pair; the limit and margin do.
	least, most := math.Inf(1), math.Inf(-1)
	for _, x := range b.losses {
		if x.Operating {
			least, most = min(least, x.LossDB), max(most, x.LossDB)
		}
	}
	b.leastDB = least
	if need := roundDB(a.MinLossDB - least); need > 0 {
		if v, cents, ok := e.attenuatorFor(need); ok {
			b.attDB, b.attN, b.attCents = v, a.Strands, int64(a.Strands)*cents
		} else {
			b.overloadDB = need
		}
	}
	worst := roundDB(most + float64(b.attDB))
	bestScore, bestMargin := -1, 0.0
	for _, r := range reaches {
		margin := roundDB(r.MaxLossDB - worst)
		score := 0
		if r.RangeM >= channelM {
			score = 1
			if margin >= req.db {
				score = 2
			}
		}
		if score > bestScore || (score == bestScore && (margin > bestMargin || (margin == bestMargin && r.RangeM > b.r.RangeM))) {
			b.r, bestScore, bestMargin = r, score, margin
		}
	}
	for j := range b.losses {
		x := &b.losses[j]
		x.Pairs, x.Splices = pairs, splices
		if x.Operating {
			x.AttenuatorDB = float64(b.attDB)
			x.LossDB = roundDB(x.LossDB + x.AttenuatorDB)
			x.LimitDB = b.r.MaxLossDB
			x.MarginDB = roundDB(x.LimitDB - x.LossDB)
			x.RequiredMarginDB, x.RequiredMarginBasis = req.db, req.basis
			x.FieldLimitDB, x.FieldLimitBy = x.CablingLimitDB, FieldLimitByCabling
			x.accept(a.Name, x.LimitDB, x.AttenuatorDB)
		}
	}
	return b
}

// longestRange is the longest operating range among reaches, in metres.
func longestRange(reaches []Reach) float64 {
	var x float64
	for _, r := range reaches {
		x = max(x, r.RangeM)
	}
	return x
}

// budgetPoints adds to points the channel lengths at which a fibre candidate of application a
// on medium m may change feasibility through its loss budget: where the budget closes with
// every count of repair splices up to the application's reach, where the repair count steps,
// where the channel reaches the receiver's minimum loss and where an attenuator's loss closes
// the budget; of the laying lay's construction, with or without its transition, when lay
// names one.
func (e *Engine) budgetPoints(points []float64, l Link, a *Application, m *Medium, reaches []Reach, lay Laying) []float64 {
	if !m.Fibre() {
		return points
	}
	span := longestRange(reaches)
	maxRepair := e.repairSplices(m, span) + 1
	ends := 0.0
	if l.InsideAM != 0 || l.InsideBM != 0 {
		ends = l.InsideAM + l.InsideBM
	}
	atts := []int{0}
	if a.MinLossDB > 0 {
		atts = append(atts, e.attenuators...)
	}
	for _, k := range m.Constructions {
		if lay.Construction != "" && k.ID != lay.Construction {
			continue
		}
		for _, extra := range []int{0, 1, 2} { // without an entrance transition, with one at one end, at both
			if lay.Construction != "" && extra != lay.At.Count() {
				continue
			}
			splices := l.Splices + e.termSplices(m) + extra
			for _, nm := range a.WavelengthsNM {
				at, _ := k.AttenDBPerKm(nm)
				length := func(budgetDB float64) float64 {
					return MaxLengthM(at, budgetDB, l.ConnectorPairs, splices, e.design.PairDB, e.design.SpliceDB)
				}
				if x := length(a.MinLossDB); a.MinLossDB > 0 && finite(x) && x > 0 {
					points = append(points, x)
				}
				for _, r := range reaches {
					for _, v := range atts {
						// The budget closes with n repair splices at x; x counts only when a channel
						// of that length has n of them (outside plant within the channel less its ends).
						for n := 0; n <= maxRepair; n++ {
							x := length(r.MaxLossDB - e.requiredMarginDB(m, l.ConnectorPairs, splices, n) - float64(v))
							if !finite(x) || x <= 0 {
								continue
							}
							if n == 0 || e.repairSplices(m, max(0, x-ends)) == n || e.repairSplices(m, x) == n {
								points = append(points, x)
							}
							// Where the count of repair splices steps from n to n+1 the budget may
							// stop closing: the step is a breakpoint when it falls between the
							// lengths at which the budget closes with n and with n+1 splices.
							if e.margins.RepairSplicesPerKm > 0 && m.Kind == KindSinglemode {
								step := float64(n) * 1000 / e.margins.RepairSplicesPerKm
								next := length(r.MaxLossDB - e.requiredMarginDB(m, l.ConnectorPairs, splices, n+1) - float64(v))
								for _, y := range []float64{step, step + ends} {
									if x >= y && next < y {
										points = append(points, y)
									}
								}
							}
						}
					}
				}
			}
		}
	}
	return points
}

// sortedAttenuators lists the attenuator values p prices, ascending.
func sortedAttenuators(p *PriceBook) []int {
	var out []int
	for k := range p.money {
		if k.Item == PriceAttenuator {
			out = append(out, k.Count)
		}
	}
	slices.Sort(out)
	return out
}
