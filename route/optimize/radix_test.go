package optimize

import (
	"math/rand/v2"
	"testing"
)

// TestRadixHeapOrder replays random monotone push and pop sequences (every key at least the
// last popped, as in Dijkstra's algorithm) on the radix heap and on minHeap, and wants the
// same (key, item) sequence out of both: the searches must return the same routes whichever
// queue they run on. Reference: the binary heap of this package (minHeap), a different
// implementation of the same order.
func TestRadixHeapOrder(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name   string
		spread int64 // keys pushed fall in [last, last+spread)
		items  int32
	}{
		{"many equal keys", 3, 50},
		{"small integers", 100, 1000},
		{"cents over a campus", 1 << 40, 20000},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			rng := rand.New(rand.NewPCG(7, uint64(tc.spread)))
			for round := 0; round < 20; round++ {
				var rh radixHeap
				var mh minHeap[int64]
				var last int64
				for step := 0; step < 2000; step++ {
					if mh.len() == 0 || rng.IntN(3) > 0 {
						k := last + rng.Int64N(tc.spread)
						it := rng.Int32N(tc.items)
						rh.push(k, it)
						mh.push(k, it)
						continue
					}
					k1, i1 := rh.pop()
					k2, i2 := mh.pop()
					if k1 != k2 || i1 != i2 {
						t.Fatalf("%s: round %d step %d: radix heap gave (%d, %d), minHeap (%d, %d)", tc.name, round, step, k1, i1, k2, i2)
					}
					last = k1
				}
				if rh.len() != mh.len() {
					t.Fatalf("%s: lengths differ: got %d, want %d", tc.name, rh.len(), mh.len())
				}
				rh.reset()
				if rh.len() != 0 {
					t.Fatalf("%s: reset left %d entries", tc.name, rh.len())
				}
			}
		})
	}
}
