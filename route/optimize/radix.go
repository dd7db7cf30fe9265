package optimize

import "math/bits"

// radixHeap is a monotone priority queue of (key, item) for keys that never fall below the
// last key popped, as in Dijkstra's algorithm and A* with a consistent lower bound: the radix
// heap of Ahuja, Mehlhorn, Orlin and Tarjan ("Faster algorithms for the shortest path
// problem", J. ACM 37(2), 1990). Bucket b > 0 holds the entries whose key differs from the
// last key popped first at bit b−1 (counting from 0), so a push is O(1) and a pop moves each
// entry down at most 64 times in all. Entries leave in the order of (key, item), as from
// minHeap: the entries whose key equals the last popped wait in a heap on items.
//
// All the int64 searches of the package (cents and millimetres, non-negative, on consistent
// bounds) use it; LARAC's float64 searches keep minHeap.
type radixHeap struct {
	last    uint64
	n       int
	full    uint64 // bit b−1 set when bucket b is not empty
	buckets [65][]heapEntry[int64]
	zero    []int32 // items whose key is last: a binary min-heap
}

func (h *radixHeap) len() int { return h.n }

func (h *radixHeap) reset() {
	for m := h.full; m != 0; m &= m - 1 {
		b := bits.TrailingZeros64(m) + 1
		h.buckets[b] = h.buckets[b][:0]
	}
	h.last, h.n, h.full, h.zero = 0, 0, 0, h.zero[:0]
}

func (h *radixHeap) push(k int64, it int32) {
	uk := uint64(k)
	if k < 0 || uk < h.last {
		panic("optimize: radix heap: key below the last popped (negative weight or inconsistent bound)")
	}
	h.n++
	if uk == h.last {
		h.pushZero(it)
		return
	}
	b := bits.Len64(uk ^ h.last)
	h.buckets[b] = append(h.buckets[b], heapEntry[int64]{key: k, item: it})
	h.full |= 1 << (b - 1)
}

func (h *radixHeap) pop() (int64, int32) {
	if len(h.zero) == 0 {
		// Refill from the lowest bucket: its least key becomes last, and each of its entries
		// moves to a lower bucket (or to zero).
		b := bits.TrailingZeros64(h.full) + 1
		es := h.buckets[b]
		m := uint64(es[0].key)
		for _, e := range es[1:] {
			m = min(m, uint64(e.key))
		}
		h.last = m
		for _, e := range es {
			if uk := uint64(e.key); uk == m {
				h.pushZero(e.item)
			} else {
				nb := bits.Len64(uk ^ m)
				h.buckets[nb] = append(h.buckets[nb], e)
				h.full |= 1 << (nb - 1)
			}
		}
		h.buckets[b] = es[:0]
		h.full &^= 1 << (b - 1)
	}
	h.n--
	z := h.zero
	it := z[0]
	n := len(z) - 1
	x := z[n]
	z = z[:n]
	for i := 0; ; {
		c := 2*i + 1
		if c >= n {
			if n > 0 {
				z[i] = x
			}
			break
		}
		if c+1 < n && z[c+1] < z[c] {
			c++
		}
		if z[c] >= x {
			z[i] = x
			break
		}
		z[i] = z[c]
		i = c
	}
	h.zero = z
	return int64(h.last), it
}

func (h *radixHeap) pushZero(it int32) {
	h.zero = append(h.zero, it)
	z := h.zero
	i := len(z) - 1
	for i > 0 {
		p := (i - 1) / 2
		if z[p] <= it {
			break
		}
		z[i] = z[p]
		i = p
	}
	z[i] = it
}
