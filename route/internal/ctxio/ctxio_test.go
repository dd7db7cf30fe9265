package ctxio

import (
	"context"
	"errors"
	"sync/atomic"
	"testing"

	"spanwright/geo/ctxtest"
)

// TestEach: every index is called exactly once and its slot holds its own answer, whatever
// GOMAXPROCS (run with -cpu 1,2); a done context stops the loop with its error, and calls
// no index at all when it was done from the start.
func TestEach(t *testing.T) {
	for _, n := range []int{0, 1, 2, 3, StopStride, StopStride + 1, 5*StopStride + 7} {
		slots := make([]int, n)
		var calls atomic.Int64
		probe := ctxtest.New(0)
		if err := Each(probe, n, func(i int) { slots[i] = i*i + 1; calls.Add(1) }); err != nil {
			t.Fatalf("n=%d: %v", n, err)
		}
		// As many looks as a loop calling StopEvery takes, on any number of goroutines.
		if want := int64((n + StopStride - 1) / StopStride); probe.Looks() != want {
			t.Errorf("n=%d: %d looks at the context, want %d", n, probe.Looks(), want)
		}
		if int(calls.Load()) != n {
			t.Errorf("n=%d: %d calls", n, calls.Load())
		}
		for i, v := range slots {
			if v != i*i+1 {
				t.Fatalf("n=%d: slot %d holds %d, want %d", n, i, v, i*i+1)
			}
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	var calls atomic.Int64
	if err := Each(ctx, 1000, func(int) { calls.Add(1) }); !errors.Is(err, context.Canceled) {
		t.Errorf("a done context: got %v, want context.Canceled", err)
	}
	if calls.Load() != 0 {
		t.Errorf("a context done from the start: %d calls, want none", calls.Load())
	}
	// Cancelled at its last look, the loop stops short and says so.
	n := 3*StopStride + 1
	calls.Store(0)
	if err := Each(ctxtest.New(4), n, func(int) { calls.Add(1) }); !errors.Is(err, context.Canceled) || calls.Load() >= int64(n) {
		t.Errorf("cancelled at the last look: %v after %d calls, want context.Canceled before all %d", err, calls.Load(), n)
	}
	ctx, cancel = context.WithCancel(context.Background())
	calls.Store(0)
	err := Each(ctx, 100*StopStride, func(i int) {
		if calls.Add(1) == 10 {
			cancel()
		}
	})
	if !errors.Is(err, context.Canceled) || calls.Load() >= 100*StopStride {
		t.Errorf("stopped half way: %v after %d calls, want context.Canceled before all %d", err, calls.Load(), 100*StopStride)
	}
}
