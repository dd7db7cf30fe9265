package media

import (
	"fmt"
	"math"
	"slices"
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

// classMargin is the catalog's margin of medium m's class and its name in reasons; ok is
// false for copper.
func (e *Engine) classMargin(m *Medium) (db float64, name string, ok bool) {
	switch m.Kind {
	case KindMultimode:
		return e.margins.MultimodeDB, "the catalog's multimode margin", true
	case KindSinglemode:
		return e.margins.SinglemodeDB, "the catalog's single-mode margin", true
	}
	return 0, "", false
}

// requiredMarginDB is the margin a fibre link on medium m with repair repair splices keeps:
// its class's margin and the repair splices at the design splice loss, or the plan's margin
// when that is larger (the plan's loss_margin_db is the least margin of every fibre link).
func (e *Engine) requiredMarginDB(m *Medium, repair int) float64 {
	class, _, ok := e.classMargin(m)
	if !ok {
		return 0
	}
	return roundDB(max(class+float64(repair)*e.design.SpliceDB, e.opt.LossMarginDB))
}

// marginBasis says in words what requiredMarginDB(m, repair) is made of, for reasons: the
// plan's loss_margin_db when it is the larger; otherwise the class's margin with the repair
// splices at the design splice loss ("0.5 dB + 3 repair splices of 0.3 dB"), or the class's
// margin alone; "" for copper.
func (e *Engine) marginBasis(m *Medium, repair int) string {
	class, name, ok := e.classMargin(m)
	switch {
	case !ok:
		return ""
	case e.opt.LossMarginDB > roundDB(class+float64(repair)*e.design.SpliceDB):
		return "the plan's loss_margin_db"
	case repair == 0:
		return name
	}
	splices := "repair splices"
	if repair == 1 {
		splices = "repair splice"
	}
	return fmt.Sprintf("%s dB + %d %s of %s dB", formatNum(class), repair, splices, formatNum(e.design.SpliceDB))
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
	requiredDB float64
}

// marginDB is the worst operating margin, and whether there is an operating wavelength.
func (b *budget) marginDB() (float64, bool) {
	w, ok := worstLoss(b.losses)
	return w.MarginDB, ok
}

// budgetFor is the loss budget of application a on medium m built as construction k (its
// attenuation; blended for a transition) over a channel of channelM metres with pairs
// connector pairs and splices splices, keeping requiredDB of margin. Of the reach-and-loss
// pairs a may use on m (Catalog.ReachesOn) it takes the one that reaches the channel and keeps
// the margin, then the one with the larger margin, then the longer reach, then the first: a
// higher grade that meets a lower one never does worse. A channel losing less than a's
// minimum gets the smallest attenuator the price book prices that makes it up.
func (e *Engine) budgetFor(k *Construction, a *Application, reaches []Reach, channelM float64, pairs, splices int, requiredDB float64) budget {
	b := budget{r: reaches[0], requiredDB: requiredDB,
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
			if margin >= requiredDB {
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
			x.RequiredMarginDB = requiredDB
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
							x := length(r.MaxLossDB - e.requiredMarginDB(m, n) - float64(v))
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
								next := length(r.MaxLossDB - e.requiredMarginDB(m, n+1) - float64(v))
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
