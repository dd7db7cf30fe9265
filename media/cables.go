package media

import (
	"math"
	"slices"
	"strconv"
	"strings"
)

// Cables is the cables one link's strands are bought in, one Size per cable, largest first:
// a construction's sizes as Engine.Cables covers the strands with them (for copper, 4-pair
// cables of count 1). Every count per strand or per cable the plan makes (terminations,
// tests, splices, trays, panels, duct fill, labels) reads it.
type Cables []Size

// Strands is the strands the cables hold together (4-pair cables for copper): the strands
// bought, terminated and tested.
func (c Cables) Strands() int {
	n := 0
	for _, s := range c {
		n += s.Count
	}
	return n
}

// Largest is the largest of the cables (the first), the zero Size when there are none.
func (c Cables) Largest() Size {
	if len(c) == 0 {
		return Size{}
	}
	return c[0]
}

// Lot is Cables of one size: the size and how many cables of it.
type Lot struct {
	Size   Size
	Cables int
}

// Lots is c by size, largest first: one bill line of cable each.
func (c Cables) Lots() []Lot {
	var out []Lot
	for _, s := range c {
		if n := len(out); n > 0 && out[n-1].Size.Count == s.Count {
			out[n-1].Cables++
			continue
		}
		out = append(out, Lot{Size: s, Cables: 1})
	}
	return out
}

// Mixed reports whether the cables are of more than one size.
func (c Cables) Mixed() bool { return len(c.Lots()) > 1 }

// Text is the cables' strand counts, largest first, "288 + 12", or "2 × 288" when all are of
// one size ("24" for one cable).
func (c Cables) Text() string {
	lots := c.Lots()
	if len(lots) == 1 && lots[0].Cables > 1 {
		return strconv.Itoa(lots[0].Cables) + " × " + strconv.Itoa(lots[0].Size.Count)
	}
	parts := make([]string, len(c))
	for i, s := range c {
		parts[i] = strconv.Itoa(s.Count)
	}
	return strings.Join(parts, " + ")
}

// ODsMM is the outside diameter of each cable, in mm, in order.
func (c Cables) ODsMM() []float64 {
	out := make([]float64, len(c))
	for i, s := range c {
		out[i] = s.ODMM
	}
	return out
}

// Trays is the splice trays p's trays take to splice every strand of the cables, each cable
// in its own enclosure or closure: the trays of each cable added up.
func (c Cables) Trays(p *PriceBook) int {
	n := 0
	for _, s := range c {
		n += p.TraysFor(s.Count)
	}
	return n
}

// Cables returns the cables of construction k of medium m that a link of strands strands
// (4-pair cables on copper; below 1 taken as 1) buys, and their price per metre in cents,
// all of them together: the one decision of a link's cables, which the optimizer's price per
// metre and the bill both read. They are as few cables as the largest size allows,
// ceil(strands / largest), because each cable more is one more pull, two more ends to
// prepare and one more place in the ducts (common practice, no published source); of those
// the combination of the construction's sizes that holds the strands at the least price per
// metre in the price book (cable_per_m), ties to the fewer strands, then to the larger
// cables. So 300 strands over a largest size of 288 buy 288 + 12, not 2 × 288. A size the
// book does not price is not bought (a check engine's book may lack prices); when it
// prices none, the price is -1 and the cables are as few as the largest size allows, the
// smallest size that holds the rest last. It panics on a construction with no sizes.
func (e *Engine) Cables(m *Medium, k *Construction, strands int) (Cables, int64) {
	if one, ok := e.oneCable[k]; ok && strands < len(one) {
		return one[max(strands, 1)].cables, one[max(strands, 1)].cents
	}
	return cover(k.Sizes, sizePrices(e.prices, m, k), strands)
}

// covered is one answer of Engine.Cables.
type covered struct {
	cables Cables
	cents  int64
}

// oneCables is Engine.Cables of k for every count of strands one cable holds, indexed by the
// count (0 unused), worked out once: the rule engine asks on every candidate it weighs.
func oneCables(p *PriceBook, m *Medium, k *Construction) []covered {
	if len(k.Sizes) == 0 {
		return nil
	}
	cents := sizePrices(p, m, k)
	out := make([]covered, k.Sizes[len(k.Sizes)-1].Count+1)
	for n := 1; n < len(out); n++ {
		if n > 1 && out[n-1].cables[0].Count >= n {
			out[n] = out[n-1] // the same cable holds one strand more
			continue
		}
		out[n].cables, out[n].cents = cover(k.Sizes, cents, n)
	}
	return out
}

// sizePrices is the book's cable per metre of each size of k, in cents, parallel to k.Sizes:
// -1 where the book has no price.
func sizePrices(p *PriceBook, m *Medium, k *Construction) []int64 {
	out := make([]int64, len(k.Sizes))
	for i, s := range k.Sizes {
		out[i] = -1
		if c, ok := p.Price(PriceKey{Item: PriceCable, Medium: m.ID, Construction: k.ID, Count: s.Count}); ok {
			out[i] = c
		}
	}
	return out
}

// cover is Engine.Cables on sizes (ascending count) priced cents (parallel, -1 unpriced). The
// cheapest set of the fewest cables is found by trying every set of sizes, largest first, that
// can still hold the strands: since the fewest cables leave less than one largest cable of
// room, only a few sets have any cable short of the largest.
func cover(sizes []Size, cents []int64, strands int) (Cables, int64) {
	if len(sizes) == 0 {
		panic("media: cables of a construction with no sizes")
	}
	strands = max(strands, 1)
	if !slices.ContainsFunc(cents, func(c int64) bool { return c >= 0 }) {
		cents = make([]int64, len(sizes)) // none priced: every size at 0, the price -1
		c, _ := cover(sizes, cents, strands)
		return c, -1
	}
	largest := 0
	for i := len(sizes) - 1; i >= 0 && largest == 0; i-- {
		if cents[i] >= 0 {
			largest = sizes[i].Count
		}
	}
	n := (strands + largest - 1) / largest
	if n == 1 { // one cable: the cheapest size that holds the strands, ties to the smaller
		one := -1
		for i, s := range sizes {
			if cents[i] >= 0 && s.Count >= strands && (one < 0 || cents[i] < cents[one]) {
				one = i
			}
		}
		return Cables{sizes[one]}, cents[one]
	}
	var avail []int // the priced sizes, ascending
	for i := range sizes {
		if cents[i] >= 0 {
			avail = append(avail, i)
		}
	}
	if len(avail) == 1 { // one size (a copper construction's 4-pair cable): n of it
		out := make(Cables, n)
		for i := range out {
			out[i] = sizes[avail[0]]
		}
		return out, int64(n) * cents[avail[0]]
	}
	var (
		best        []int
		bestCents   int64
		bestStrands int
		cur         = make([]int, 0, n)
		try         func(top, covered int, spent int64)
		found       bool
	)
	try = func(top, covered int, spent int64) {
		left := n - len(cur)
		if left == 0 {
			if !found || spent < bestCents || (spent == bestCents && covered < bestStrands) {
				best, bestCents, bestStrands, found = append(best[:0], cur...), spent, covered, true
			}
			return
		}
		for a := top; a >= 0; a-- {
			s := sizes[avail[a]]
			if covered+s.Count+(left-1)*largest < strands {
				break // this size and every smaller one leave the strands short
			}
			cur = append(cur, a)
			try(a, covered+s.Count, spent+cents[avail[a]])
			cur = cur[:len(cur)-1]
		}
	}
	try(len(avail)-1, 0, 0)
	out := make(Cables, len(best))
	for i, a := range best {
		out[i] = sizes[avail[a]]
	}
	return out, bestCents
}

// HeaviestKgPerM is the weight of the heaviest of the cables, in kg/m; 0 when there are none.
func (c Cables) HeaviestKgPerM() float64 {
	w := 0.0
	for _, s := range c {
		w = max(w, s.WeightKgPerM)
	}
	return w
}

// LeastPullRatingN is the lowest rated pulling tension of cables of construction k, in
// newtons (PullRatingN of each): one plan of pull points for all of a link's cables, each
// pulled on its own, keeps every one within its rating when it plans with the heaviest's
// weight (Cables.HeaviestKgPerM) against this rating. +Inf when there are no cables.
func (k *Construction) LeastPullRatingN(c Cables) float64 {
	r := math.Inf(1)
	for _, s := range c {
		r = min(r, k.PullRatingN(s))
	}
	return r
}
