package route

import "context"

// stopStride is how many steps of a loop over legs, rows or pulls go between two looks at
// the context: a look is an atomic load, a step microseconds of work.
const stopStride = 64

// stopEvery returns ctx's error at every stopStride-th step i of a loop, the first included,
// and nil at the others; the loops of planning and rendering call it at their heads so that a
// stop ends them within a few milliseconds.
func stopEvery(ctx context.Context, i int) error {
	if i%stopStride != 0 {
		return nil
	}
	return ctx.Err()
}
