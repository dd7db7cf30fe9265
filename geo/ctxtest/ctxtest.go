// Package ctxtest is a context for tests of stopping: it counts the looks the code under test
// takes at it (calls of Err) and cancels itself at a chosen one, so that a test can stop a
// computation at a known point, the same on every run, and see how far it went on.
package ctxtest

import (
	"context"
	"sync/atomic"
)

// Probe is a context that cancels itself at its At-th look; it is never cancelled when At is
// 0 (or not reached). OnStop, when not nil, is called once, at the look that cancels it.
type Probe struct {
	context.Context
	At     int64
	OnStop func()
	cancel context.CancelFunc
	looks  atomic.Int64
}

// New returns a probe that cancels itself at look at (never when 0).
func New(at int64) *Probe {
	ctx, cancel := context.WithCancel(context.Background())
	return &Probe{Context: ctx, At: at, cancel: cancel}
}

// Err counts the look, cancels the probe at look At, and returns the context's error.
func (p *Probe) Err() error {
	if p.looks.Add(1) == p.At {
		p.cancel()
		if p.OnStop != nil {
			p.OnStop()
		}
	}
	return p.Context.Err()
}

// Looks returns the looks taken so far.
func (p *Probe) Looks() int64 { return p.looks.Load() }

// Cancel cancels the probe now.
func (p *Probe) Cancel() { p.cancel() }
