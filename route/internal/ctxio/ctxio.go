// Package ctxio stops long loops and renderers when a context is done: a writer that fails
// once it is, the stride at which loops look at it, and a loop over independent items run on
// two goroutines that stops alike (Each).
package ctxio

import (
	"context"
	"io"
	"runtime"
	"sync"
	"sync/atomic"
)

// Writer returns a writer that passes writes on to w until ctx is done and from then on fails
// them with ctx's error, so that whatever writes through it (a template, a zip packer) stops
// at its next write. A look at ctx is one atomic load.
func Writer(ctx context.Context, w io.Writer) io.Writer { return writer{ctx, w} }

type writer struct {
	ctx context.Context
	w   io.Writer
}

func (c writer) Write(p []byte) (int, error) {
	if err := c.ctx.Err(); err != nil {
		return 0, err
	}
	return c.w.Write(p)
}

// StopStride is how many steps of a loop over legs, rows or pulls go between two looks at
// the context: a look is an atomic load, a step microseconds of work.
const StopStride = 64

// StopEvery returns ctx's error at every StopStride-th step i of a loop, the first included,
// and nil at the others; the loops of planning and rendering call it at their heads so that a
// stop ends them within a few milliseconds.
func StopEvery(ctx context.Context, i int) error {
	if i%StopStride != 0 {
		return nil
	}
	return ctx.Err()
}

// EachWorkers is how many goroutines Each runs at most: the machines spanwright plans on
// have a few cores, and a sweep already plans scenarios side by side.
const EachWorkers = 2

// Each calls f(i) for every i in [0, n) on up to EachWorkers goroutines (no more than
// GOMAXPROCS), and returns ctx's error when ctx is done before every call was made (those not
// begun are not made), else nil. It looks at ctx once per StopStride indices, before the
// first of them, as a loop calling StopEvery does, so that the looks a run takes are the same
// in number whatever the goroutines (tests stop runs at a counted look: geo/ctxtest). f must
// write only what belongs to its own i (a slot of a slice made beforehand) and read what no
// other call writes, so that the caller, assembling the slots in index order, gets the same
// bytes whatever the number of cores.
func Each(ctx context.Context, n int, f func(i int)) error {
	workers := min(EachWorkers, runtime.GOMAXPROCS(0), (n+StopStride-1)/StopStride)
	if workers <= 1 {
		for i := 0; i < n; i++ {
			if err := StopEvery(ctx, i); err != nil {
				return err
			}
			f(i)
		}
		return nil
	}
	var next, made atomic.Int64
	var wg sync.WaitGroup
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for { // blocks of StopStride indices, taken in turn
				start := int(next.Add(1)-1) * StopStride
				if start >= n || ctx.Err() != nil {
					return
				}
				end := min(n, start+StopStride)
				for i := start; i < end; i++ {
					f(i)
				}
				made.Add(int64(end - start))
			}
		}()
	}
	wg.Wait()
	if int(made.Load()) < n {
		return ctx.Err() // a worker stopped at a look at the context
	}
	return nil
}
