// Package ctxio stops a renderer that writes through an io.Writer when a context is done.
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
