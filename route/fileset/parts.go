package fileset

import (
	"context"
	"errors"
	"io"
	"slices"
	"sync"
)

// A Part is one file of a set, rendered by WriteParts side by side with others.
type Part struct {
	Name string
	// Render writes the whole file to w, looking at ctx as it goes, and returns an error (ctx's
	// when ctx is done). It runs on a goroutine of its own, beside other parts' renderers: it
	// must not change anything another part reads.
	Render func(ctx context.Context, w io.Writer) error
	// Weight is the part's share of WriteParts' budget: a rough measure of the memory its
	// renderer holds beyond what the set's parts share. Parts start heaviest first.
	Weight int
}

// WriteParts writes the parts into the set, up to workers at a time, each rendered straight
// into its temporary file as Write does. Parts start heaviest first (ties in the order
// given), and a part starts only while the weights of the parts rendering, its own added,
// stay within budget, or when nothing else renders: with budget 0 and every weight 0 the
// parts only share the workers; a part heavier than the budget renders alone. workers below
// 1 is 1, which renders the parts one after the other.
//
// When a part fails, the parts after it in the order given are stopped (their renderers'
// contexts are cancelled) or not started, and the parts before it are rendered to their
// end: the error returned is always that of the first failing part in the order given, the
// error a one-at-a-time writer would return, whatever the scheduling. The set is then
// aborted (once every renderer has returned), as it is when ctx is done (ctx's error). Every
// part's name must have been given to Begin and not written yet.
func (s *Set) WriteParts(parts []Part, workers, budget int) error {
	if s.done {
		return errors.New("fileset: parts written after the set was committed or aborted")
	}
	for _, p := range parts {
		if err := s.claim(p.Name); err != nil {
			s.Abort()
			return err
		}
	}
	if err := s.ctx.Err(); err != nil {
		s.Abort()
		return err
	}
	if err := newSchedule(s, parts, budget).run(max(1, min(workers, len(parts)))); err != nil {
		s.Abort()
		return err
	}
	return nil
}

// schedule is the shared state of WriteParts' workers.
type schedule struct {
	set     *Set
	parts   []Part
	order   []int // indexes into parts, heaviest first
	budget  int
	ctxs    []context.Context
	cancels []context.CancelFunc

	mu      sync.Mutex
	wake    *sync.Cond // a part ended: its weight is free, or a failure stops parts
	started []bool
	used    int // the weight rendering
	errs    []error
	failed  int // the first failing part in the order given; len(parts) while none has
}

func newSchedule(s *Set, parts []Part, budget int) *schedule {
	n := len(parts)
	sc := &schedule{set: s, parts: parts, budget: budget, order: make([]int, n),
		ctxs: make([]context.Context, n), cancels: make([]context.CancelFunc, n),
		started: make([]bool, n), errs: make([]error, n), failed: n}
	for i := range parts {
		sc.order[i] = i
		sc.ctxs[i], sc.cancels[i] = context.WithCancel(s.ctx)
	}
	slices.SortStableFunc(sc.order, func(a, b int) int { return parts[b].Weight - parts[a].Weight })
	sc.wake = sync.NewCond(&sc.mu)
	return sc
}

// run renders the parts on workers goroutines and returns the first failing part's error.
func (sc *schedule) run(workers int) error {
	var wg sync.WaitGroup
	for range workers {
		wg.Go(sc.work)
	}
	wg.Wait()
	for _, cancel := range sc.cancels {
		cancel()
	}
	if sc.failed < len(sc.parts) {
		return sc.errs[sc.failed]
	}
	return nil
}

// work renders parts until none is left to start.
func (sc *schedule) work() {
	for {
		i, ok := sc.next()
		if !ok {
			return
		}
		p := sc.parts[i]
		err := sc.ctxs[i].Err()
		if err == nil {
			ctx := WithScratchDir(sc.ctxs[i], sc.set.tmp)
			err = sc.set.write(p.Name, func(w io.Writer) error { return p.Render(ctx, w) })
		}
		sc.end(i, err)
	}
}

// next claims the next part to render: the heaviest not started that fits the budget, and
// not after a failed part. It waits while the parts left do not fit, and says false when no
// part is left to start.
func (sc *schedule) next() (int, bool) {
	sc.mu.Lock()
	defer sc.mu.Unlock()
	for {
		left := false
		for _, i := range sc.order {
			if sc.started[i] || i > sc.failed {
				continue
			}
			left = true
			if w := sc.parts[i].Weight; sc.used == 0 || sc.used+w <= sc.budget {
				sc.started[i] = true
				sc.used += w
				return i, true
			}
		}
		if !left {
			return 0, false
		}
		sc.wake.Wait()
	}
}

// end records that part i ended with err; a failure stops the parts after it.
func (sc *schedule) end(i int, err error) {
	sc.mu.Lock()
	defer sc.mu.Unlock()
	sc.used -= sc.parts[i].Weight
	sc.errs[i] = err
	if err != nil && i < sc.failed {
		sc.failed = i
		for _, cancel := range sc.cancels[i+1:] {
			cancel()
		}
	}
	sc.wake.Broadcast()
}

// scratchKey is the context key of ScratchDir.
type scratchKey struct{}

// ScratchDir returns, to a renderer, the folder its scratch files go in (WithScratchDir): a
// renderer that needs a scratch file (the GeoPackage is built in one) makes it there, with a
// name that starts with a dot and is no output's, and removes it before it returns; a killed
// run leaves it in that staging folder, which the next run clears. WriteParts gives its
// renderers the set's staging folder, a sweep a scenario's. "" when none was given: the
// system's temporary folder.
func ScratchDir(ctx context.Context) string {
	dir, _ := ctx.Value(scratchKey{}).(string)
	return dir
}

// WithScratchDir returns ctx carrying dir as its renderers' ScratchDir: a staging folder that
// the next run clears when this one is killed.
func WithScratchDir(ctx context.Context, dir string) context.Context {
	return context.WithValue(ctx, scratchKey{}, dir)
}
