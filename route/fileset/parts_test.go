package fileset

import (
	"context"
	"errors"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"
	"time"
)

// partsOf makes the parts of outputSet(tag), each rendering through render (with its index)
// before writing its bytes in two pieces, as a renderer writes.
func partsOf(tag string, render func(ctx context.Context, i int) error) []Part {
	files := outputSet(tag)
	parts := make([]Part, len(files))
	for i, f := range files {
		parts[i] = Part{Name: f.Name, Render: func(ctx context.Context, w io.Writer) error {
			if err := render(ctx, i); err != nil {
				return err
			}
			if _, err := w.Write(f.Data[:3]); err != nil {
				return err
			}
			_, err := w.Write(f.Data[3:])
			return err
		}}
	}
	return parts
}

// beginParts begins a set over the old set of a new output folder, for the parts.
func beginParts(t *testing.T, ctx context.Context, parts []Part) (*Set, string) {
	t.Helper()
	return beginPartsWith(t, ctx, parts, Begin)
}

// beginPartsWith is beginParts with the given way to begin (Begin or BeginInPlace).
func beginPartsWith(t *testing.T, ctx context.Context, parts []Part, begin func(ctx context.Context, dir string, names, protect []string) (*Set, error)) (*Set, string) {
	t.Helper()
	out := oldSet(t)
	names := make([]string, len(parts))
	for i, p := range parts {
		names[i] = p.Name
	}
	set, err := begin(ctx, out, names, nil)
	if err != nil {
		t.Fatal(err)
	}
	return set, out
}

// oldLeftAlone checks that out holds the whole old set and nothing of a new one.
func oldLeftAlone(t *testing.T, out string) {
	t.Helper()
	wholeSet(t, out, "old")
	noLeftovers(t, out)
	noLeftovers(t, filepath.Dir(out))
	if got := entries(t, out); len(got) != len(outputSet("old")) {
		t.Errorf("out holds %v, want the old set alone", got)
	}
}

// TestWritePartsSideBySide: with two workers two parts render at the same time, and the set
// committed, beside the folder or in place, is the same bytes as one written a file at a time.
func TestWritePartsSideBySide(t *testing.T) {
	for _, b := range begins {
		t.Run(b.name, func(t *testing.T) { sideBySide(t, b.begin) })
	}
}

func sideBySide(t *testing.T, begin func(ctx context.Context, dir string, names, protect []string) (*Set, error)) {
	var arrived sync.Mutex
	n := 0
	met := make(chan struct{})
	parts := partsOf("new", func(context.Context, int) error {
		arrived.Lock()
		n++
		first, second := n == 1, n == 2
		arrived.Unlock()
		switch {
		case first:
			select {
			case <-met:
			case <-time.After(10 * time.Second):
				return errors.New("no second part rendered beside the first")
			}
		case second:
			close(met)
		}
		return nil
	})
	set, out := beginPartsWith(t, context.Background(), parts, begin)
	defer set.Abort()
	if err := set.WriteParts(parts, 2, 0); err != nil {
		t.Fatal(err)
	}
	if err := set.Commit(); err != nil {
		t.Fatal(err)
	}
	wholeSet(t, out, "new")
	noLeftovers(t, out)
	noLeftovers(t, filepath.Dir(out))
}

// TestWritePartsBudget: parts start heaviest first (ties in the order given), and the weights
// rendering at once stay within the budget unless a part renders alone.
func TestWritePartsBudget(t *testing.T) {
	weights := []int{1, 2, 0, 2, 1, 3} // bom.csv, bom.xlsx, links.csv, report.html, routes.geojson, summary.json
	for _, tc := range []struct {
		workers, budget int
		order           string // the start order, with one worker
	}{
		{1, 2, "summary.json bom.xlsx report.html bom.csv routes.geojson links.csv"},
		{2, 2, ""},
		{3, 3, ""},
		{6, 4, ""},
	} {
		var mu sync.Mutex
		var started []string
		used, most := 0, 0
		var parts []Part
		parts = partsOf("new", func(_ context.Context, i int) error {
			mu.Lock()
			started = append(started, parts[i].Name)
			used += weights[i]
			if used > tc.budget && used != weights[i] {
				most = max(most, used)
			}
			mu.Unlock()
			time.Sleep(2 * time.Millisecond) // long enough for others to start beside it
			mu.Lock()
			used -= weights[i]
			mu.Unlock()
			return nil
		})
		for i := range parts {
			parts[i].Weight = weights[i]
		}
		set, out := beginParts(t, context.Background(), parts)
		if err := set.WriteParts(parts, tc.workers, tc.budget); err != nil {
			t.Fatal(err)
		}
		if err := set.Commit(); err != nil {
			t.Fatal(err)
		}
		wholeSet(t, out, "new")
		if most > 0 {
			t.Errorf("%d workers, budget %d: weight %d rendered at once", tc.workers, tc.budget, most)
		}
		if got := strings.Join(started, " "); tc.order != "" && got != tc.order {
			t.Errorf("%d workers: started %s, want %s", tc.workers, got, tc.order)
		}
	}
}

// TestWritePartsFirstFailure: the error is the first failing part's in the order given,
// whichever fails first in time; the parts before it render to their end, those after it are
// not started (or stopped), and the folder keeps its old set.
func TestWritePartsFirstFailure(t *testing.T) {
	early, late := errors.New("part 0 failed"), errors.New("part 1 failed")
	for _, tc := range []struct {
		name     string
		zeroErr  error // what part 0 returns, after part 1 has failed
		want     error
		notAfter int // no part after this index may start
	}{
		{"an earlier part fails later", early, early, 1},
		// Part 0 may end before part 1's failure is recorded, and its worker start part 2.
		{"an earlier part succeeds later", nil, late, 5},
	} {
		t.Run(tc.name, func(t *testing.T) {
			oneFailed := make(chan struct{})
			var mu sync.Mutex
			var rendered []int
			zeroStopped := false
			parts := partsOf("new", func(ctx context.Context, i int) error {
				mu.Lock()
				rendered = append(rendered, i)
				mu.Unlock()
				switch i {
				case 0:
					<-oneFailed
					time.Sleep(5 * time.Millisecond) // part 1's failure is recorded meanwhile
					zeroStopped = ctx.Err() != nil
					return tc.zeroErr
				case 1:
					defer close(oneFailed)
					return late
				}
				return nil
			})
			set, out := beginParts(t, context.Background(), parts)
			err := set.WriteParts(parts, 2, 0)
			if err != tc.want {
				t.Errorf("error %v, want %v", err, tc.want)
			}
			if zeroStopped {
				t.Error("part 0 was stopped by a failure after it")
			}
			if slices.Sort(rendered); slices.Max(rendered) > tc.notAfter {
				t.Errorf("rendered parts %v, want none after %d", rendered, tc.notAfter)
			}
			set.Abort()
			oldLeftAlone(t, out)
		})
	}
}

// TestWritePartsStopped: a context done while parts render stops every renderer, returns the
// context's error and leaves the old set.
func TestWritePartsStopped(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	var once sync.Once
	parts := partsOf("new", func(ctx context.Context, i int) error {
		once.Do(cancel)
		<-ctx.Done()
		return ctx.Err()
	})
	set, out := beginParts(t, ctx, parts)
	if err := set.WriteParts(parts, 2, 0); !errors.Is(err, context.Canceled) {
		t.Errorf("error %v, want the context's", err)
	}
	set.Abort()
	oldLeftAlone(t, out)
	if err := set.Commit(); err == nil {
		t.Error("a stopped set committed")
	}
}

// TestScratchDirIsStaging: a renderer that WriteParts runs is given the set's staging folder
// as its scratch folder, exactly (Begin's hidden sibling of the output folder, BeginInPlace's
// journal folder in it), and a scratch file it removes before returning leaves nothing in the
// committed set. WithScratchDir is what gives it.
func TestScratchDirIsStaging(t *testing.T) {
	for _, b := range begins {
		t.Run(b.name, func(t *testing.T) {
			var dirs []string
			var mu sync.Mutex
			parts := partsOf("new", func(ctx context.Context, i int) error {
				dir := ScratchDir(ctx)
				f, err := os.CreateTemp(dir, ".scratch-*")
				if err != nil {
					return err
				}
				f.Close()
				mu.Lock()
				dirs = append(dirs, dir)
				mu.Unlock()
				return os.Remove(f.Name())
			})
			set, out := beginPartsWith(t, context.Background(), parts, b.begin)
			defer set.Abort()
			staging := set.tmp
			if err := set.WriteParts(parts, 2, 0); err != nil {
				t.Fatal(err)
			}
			if err := set.Commit(); err != nil {
				t.Fatal(err)
			}
			if len(dirs) != len(parts) {
				t.Fatalf("%d renderers ran, want %d", len(dirs), len(parts))
			}
			for _, d := range dirs {
				if d != staging || staging == "" {
					t.Errorf("scratch folder %q; want the set's staging folder %q", d, staging)
				}
			}
			wholeSet(t, out, "new")
			noLeftovers(t, out)
			noLeftovers(t, filepath.Dir(out))
		})
	}
	if ScratchDir(context.Background()) != "" {
		t.Error("ScratchDir outside WriteParts is not empty")
	}
	if got := ScratchDir(WithScratchDir(context.Background(), "x")); got != "x" {
		t.Errorf("ScratchDir of WithScratchDir(x): %q", got)
	}
}
