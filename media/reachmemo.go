package media

import (
	"crypto/sha256"
	"encoding/json"
	"strings"
	"sync"
	"sync/atomic"

	lru "github.com/hashicorp/golang-lru/v2"
)

// ReachMemo remembers MaxChannelM and Lays across engines, for callers that build many
// engines of one catalog and rule set that differ in their prices (the scenarios of a sweep
// over price books): whether the rules let a medium carry a link, and how far, is a matter
// of the catalog, the rules and the options, and of the price book only through its
// termination method, the attenuator values it prices, whether it prices the entrance
// transition's enclosure (Engine.reachID), which listed construction is the cheapest to
// splice on at the entrances and which cables each construction buys for the strands
// (bookKey). A remembered answer is keyed by all of these and by the question with the link
// as the rules judge it (Engine.maxKeyOf: every field of Link but its ID and the names no
// rule's condition reads), so it equals a fresh one. It keeps at most the size given to
// NewReachMemo answers, or what Hold asks when more, dropping the least recently used, and is
// safe for concurrent use. A nil *ReachMemo remembers nothing: its answers are the engine's.
type ReachMemo struct {
	answers *lru.Cache[sharedKey, float64]
	lays    *lru.Cache[sharedKey, bool] // Lays's answers

	mu                    sync.Mutex   // over growing the caches
	answersSize, laysSize atomic.Int64 // the caches' sizes, read without mu
}

// laysPerReach is how many answers of Lays a ReachMemo keeps per reach it keeps.
const laysPerReach = 4

// sharedKey is what a remembered answer of MaxChannelMAs or Lays depends on: the engine's
// reachID, what of the price book the candidates read (bookKey) and the question (maxKey:
// Lays judges the laying on the same facts, at the shortest channel).
type sharedKey struct {
	engine [32]byte // Engine.reachID
	book   string   // Engine.bookKey
	max    maxKey
}

// sharedKeyOf is the key of medium laid as lay at rateGbps (and futureRateGbps) on l, and
// whether there is one: none of an engine whose reachID could not be made, nor of a medium or
// construction the catalog lacks.
func (e *Engine) sharedKeyOf(medium string, lay Laying, rateGbps, futureRateGbps float64, l Link) (sharedKey, bool) {
	if e.reachID == ([32]byte{}) {
		return sharedKey{}, false
	}
	book, ok := e.bookKey(medium, lay, rateGbps, l)
	if !ok {
		return sharedKey{}, false
	}
	return sharedKey{engine: e.reachID, book: book, max: e.maxKeyOf(medium, lay, rateGbps, futureRateGbps, l)}, true
}

// bookKey names what of the price book the candidates of a question of medium laid as lay
// read, besides what reachID digests: the listed construction an entrance transition would
// splice on (insideKey), which makes the candidates' variants, and the cables each
// construction asked of (lay's, or every one of the medium for the zero Laying) buys for the
// strands (writeCables), which the fact cable names. ok is false for a medium or construction
// the catalog does not have.
func (e *Engine) bookKey(medium string, lay Laying, rateGbps float64, l Link) (string, bool) {
	m := e.cat.Medium(medium)
	if m == nil {
		return "", false
	}
	var b strings.Builder
	b.WriteString(e.insideKey(medium, rateGbps, l))
	found := false
	for _, k := range m.Constructions {
		if lay.Construction != "" && k.ID != lay.Construction {
			continue
		}
		if len(k.Sizes) == 0 {
			return "", false
		}
		found = true
		b.WriteByte(1)
		e.writeCables(&b, m, k, rateGbps, l)
	}
	return b.String(), found
}

// NewReachMemo returns a ReachMemo that keeps at most size reaches (MaxChannelM; at least
// one) and laysPerReach times as many answers of Lays, which a plan asks of every link,
// medium, laying and span class: 40,896 distinct of one scenario of a generated
// 1,000-building campus, against about 2,000 layings it prices; more when a plan's Hold asks
// for room. An LRU smaller than what one scenario asks, asked in the same order by every
// scenario, would keep nothing useful.
func NewReachMemo(size int) *ReachMemo {
	size = max(size, 1)
	c, _ := lru.New[sharedKey, float64](size) // errs only on a size <= 0
	l, _ := lru.New[sharedKey, bool](size * laysPerReach)
	r := &ReachMemo{answers: c, lays: l}
	r.answersSize.Store(int64(size))
	r.laysSize.Store(int64(size * laysPerReach))
	return r
}

// holdPlans is how many plans' answers Hold makes room for: two, so that two scenarios of a
// sweep planned side by side (--jobs 2), or one after the other asking partly different
// questions (a book that splices on other inside cable, another hub), do not drop what the
// other still needs.
const holdPlans = 2

// Hold makes room for holdPlans times the answers of a plan that has asked reaches distinct
// questions of MaxChannelM and MaxChannelMAs and lays of Lays (each once: the caller
// remembers its own), when the memo keeps fewer; a plan asks it as it goes. Without it a plan
// larger than the memo drops its own first answers before the next scenario of a sweep asks
// them again, in the same order, and that scenario finds none: one plan of the generated
// 5,000-building campus asks 24,361 reaches and 70,356 layings, against NewReachMemo's
// 16,384 and 65,536. The memo never shrinks: a sweep's largest plan sets its size. A plan
// asks it once per new question, mostly of a memo already large enough: that is answered
// without the lock, which only growing takes.
func (r *ReachMemo) Hold(reaches, lays int) {
	if r == nil {
		return
	}
	wantR, wantL := int64(holdPlans*reaches), int64(holdPlans*lays)
	if wantR <= r.answersSize.Load() && wantL <= r.laysSize.Load() {
		return
	}
	r.mu.Lock()
	defer r.mu.Unlock()
	if wantR > r.answersSize.Load() {
		r.answers.Resize(int(wantR))
		r.answersSize.Store(wantR)
	}
	if wantL > r.laysSize.Load() {
		r.lays.Resize(int(wantL))
		r.laysSize.Store(wantL)
	}
}

// Held is how many answers the memo holds: of MaxChannelM and MaxChannelMAs, and of Lays.
func (r *ReachMemo) Held() (reaches, lays int) { return r.answers.Len(), r.lays.Len() }

// Lays is e.Lays(medium, lay, rateGbps, l) for a laying with its construction named,
// remembered across engines whose rules judge it on the same facts (sharedKey). A sweep over
// price books asks it of every link, medium and span class of every scenario's problem
// (routing's lays); the books seldom change the answer.
func (r *ReachMemo) Lays(e *Engine, medium string, lay Laying, rateGbps float64, l Link) bool {
	if r == nil || lay.Construction == "" {
		return e.Lays(medium, lay, rateGbps, l)
	}
	k, ok := e.sharedKeyOf(medium, lay, rateGbps, l.FutureRateGbps, l)
	if !ok {
		return e.Lays(medium, lay, rateGbps, l)
	}
	if v, ok := r.lays.Get(k); ok {
		return v
	}
	v := e.Lays(medium, lay, rateGbps, l)
	r.lays.Add(k, v)
	return v
}

// MaxChannelM is e.MaxChannelM(medium, rateGbps, futureRateGbps, l), remembered across
// engines whose reach depends on the same facts.
func (r *ReachMemo) MaxChannelM(e *Engine, medium string, rateGbps, futureRateGbps float64, l Link) float64 {
	return r.MaxChannelMAs(e, medium, Laying{}, rateGbps, futureRateGbps, l)
}

// MaxChannelMAs is e.MaxChannelMAs(medium, lay, rateGbps, futureRateGbps, l), remembered as
// MaxChannelM is.
func (r *ReachMemo) MaxChannelMAs(e *Engine, medium string, lay Laying, rateGbps, futureRateGbps float64, l Link) float64 {
	if r == nil {
		return e.MaxChannelMAs(medium, lay, rateGbps, futureRateGbps, l)
	}
	k, ok := e.sharedKeyOf(medium, lay, rateGbps, futureRateGbps, l)
	if !ok {
		return e.MaxChannelMAs(medium, lay, rateGbps, futureRateGbps, l)
	}
	if v, ok := r.answers.Get(k); ok {
		return v
	}
	v := e.MaxChannelMAs(medium, lay, rateGbps, futureRateGbps, l)
	r.answers.Add(k, v)
	return v
}

// Purge forgets every remembered answer.
func (r *ReachMemo) Purge() {
	r.answers.Purge()
	r.lays.Purge()
}

// writeCables writes to b the cables construction k of medium m buys for a link of l's facts,
// as the fact cable names them (candidate.label), for each application at rateGbps on the
// medium (strandsFor): "1" for one cable, whatever its size, else the strand counts
// (Cables.Text). k has sizes.
func (e *Engine) writeCables(b *strings.Builder, m *Medium, k *Construction, rateGbps float64, l Link) {
	for _, a := range e.cat.Applications {
		if a.RateGbps != rateGbps || len(e.reachesOn(a, m)) == 0 {
			continue
		}
		if c, _ := e.Cables(m, k, strandsFor(l, a, m)); len(c) > 1 {
			b.WriteString(c.Text())
		} else {
			b.WriteByte('1')
		}
		b.WriteByte(0)
	}
}

// reachID digests everything of the engine that MaxChannelM and Lays read besides their
// arguments and what the cables' prices pick (bookKey): the catalog, each rule's scope, condition and effect
// (in order: a rule's index picks no answer, but it is cheap to keep), the options with the
// connection losses and margin policy in force, the copper cords, and of the price book the
// termination method, the attenuator values and whether the transition enclosure is priced.
// It is zero, and the engine shares nothing, when one of them cannot be encoded.
func reachID(e *Engine) [32]byte {
	h := sha256.New()
	enc := json.NewEncoder(h)
	type rule struct {
		ID, When, Effect string
		Media, Kinds     []string
	}
	rules := make([]rule, len(e.rules.Rules))
	for i, r := range e.rules.Rules {
		rules[i] = rule{ID: r.ID, When: r.When.String(), Effect: r.Effect, Media: r.Media, Kinds: r.Kinds}
	}
	_, transition := e.prices.Price(PriceKey{Item: PriceTransition})
	parts := []any{e.cat.MatedPairDB, e.cat.SpliceDB, e.cat.DesignPairDB, e.cat.DesignSpliceDB, e.cat.Margins, e.cat.Media, e.cat.Applications,
		rules, e.opt, e.design, e.field, e.termination, e.margins, e.cordsM, e.attenuators, transition}
	for _, p := range parts {
		if err := enc.Encode(p); err != nil {
			return [32]byte{}
		}
	}
	var id [32]byte
	h.Sum(id[:0])
	return id
}

// insideKey names the listed constructions an entrance transition of medium would splice on
// for a link with l's facts at rateGbps, one per application at that rate on the medium
// (transitionInside, which asks the price book for the cheapest); "" when the link can have
// no transition.
func (e *Engine) insideKey(medium string, rateGbps float64, l Link) string {
	m := e.cat.Medium(medium)
	if m == nil || !m.Fibre() || !transitionLink(l) {
		return ""
	}
	if _, ok := e.prices.Price(PriceKey{Item: PriceTransition}); !ok {
		return ""
	}
	var b strings.Builder
	for _, a := range e.cat.Applications {
		if a.RateGbps != rateGbps || len(e.reachesOn(a, m)) == 0 {
			continue
		}
		if in, _ := e.constructionFor(m, strandsFor(l, a, m), false); in != nil {
			b.WriteString(in.ID)
		}
		b.WriteByte(0)
	}
	return b.String()
}
