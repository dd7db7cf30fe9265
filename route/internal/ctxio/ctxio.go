// Package ctxio stops long loops and renderers when a context is done: a writer that fails
// once it is, and the stride at which loops look at it.
package ctxio

import (
	"context"
	"io"
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
