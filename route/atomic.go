package route

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"sync/atomic"
)

// tmpSeq numbers temporary files so that concurrent writers in one process never collide.
var tmpSeq atomic.Uint64

// OutputFile is one file of a plan's output, rendered in memory before anything is written.
type OutputFile struct {
	Name string // file name inside the output folder
	Data []byte
}

// WriteFiles writes every file into dir so that none is ever seen half-written: each goes to
// a temporary name in dir first, and only when all are written are they renamed into place.
// It refuses to overwrite any path in protect (the run's inputs). When ctx is done before the
// renames begin it removes what it wrote and returns ctx's error: nothing is written.
func WriteFiles(ctx context.Context, dir string, files []OutputFile, protect []string) error {
	if err := ctx.Err(); err != nil {
		return err
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("create output folder: %w", err)
	}
	wd, _ := os.Getwd() // once: filepath.Abs asks the system on every call
	abs := func(p string) string {
		if filepath.IsAbs(p) || wd == "" {
			return filepath.Clean(p)
		}
		return filepath.Join(wd, p)
	}
	guard := map[string]bool{}
	for _, p := range protect {
		guard[abs(p)] = true
	}
	sorted := append([]OutputFile(nil), files...)
	sort.Slice(sorted, func(i, j int) bool { return sorted[i].Name < sorted[j].Name })
	type pending struct{ tmp, final string }
	var done []pending
	cleanup := func() {
		for _, p := range done {
			os.Remove(p.tmp)
		}
	}
	for _, f := range sorted {
		if err := ctx.Err(); err != nil {
			cleanup()
			return err
		}
		final := filepath.Join(dir, f.Name)
		if guard[abs(final)] {
			cleanup()
			return fmt.Errorf("output %s would overwrite an input; choose another --out folder", final)
		}
		if sub := filepath.Dir(final); sub != filepath.Clean(dir) {
			if err := os.MkdirAll(sub, 0o755); err != nil {
				cleanup()
				return fmt.Errorf("create output folder: %w", err)
			}
		}
		tmpName := filepath.Join(filepath.Dir(final), fmt.Sprintf(".%s.tmp-%d-%d", filepath.Base(f.Name), os.Getpid(), tmpSeq.Add(1)))
		tmp, err := os.OpenFile(tmpName, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
		if err != nil {
			cleanup()
			return fmt.Errorf("write %s: %w", final, err)
		}
		done = append(done, pending{tmp.Name(), final})
		// No fsync: the rename already guarantees that an interrupted run leaves each file
		// whole or absent; syncing every file of every sweep scenario costs milliseconds each.
		_, werr := tmp.Write(f.Data)
		if cerr := tmp.Close(); werr == nil {
			werr = cerr
		}
		if werr != nil {
			cleanup()
			return fmt.Errorf("write %s: %w", final, werr)
		}
	}
	if err := ctx.Err(); err != nil {
		cleanup()
		return err
	}
	for i, p := range done {
		if err := os.Rename(p.tmp, p.final); err != nil {
			for _, q := range done[i:] {
				os.Remove(q.tmp)
			}
			return fmt.Errorf("write %s: %w", p.final, err)
		}
	}
	return nil
}

// WriteFresh writes files into dir, a new folder no one else sees until the caller renames it
// into place (as a sweep publishes a scenario folder): the folder's rename is what makes the
// set appear whole, so the files go straight to their names.
func WriteFresh(dir string, files []OutputFile) error {
	sorted := append([]OutputFile(nil), files...)
	sort.Slice(sorted, func(i, j int) bool { return sorted[i].Name < sorted[j].Name })
	for _, f := range sorted {
		name := filepath.Join(dir, f.Name)
		if sub := filepath.Dir(name); sub != filepath.Clean(dir) {
			if err := os.MkdirAll(sub, 0o755); err != nil {
				return fmt.Errorf("create output folder: %w", err)
			}
		}
		if err := os.WriteFile(name, f.Data, 0o644); err != nil {
			return fmt.Errorf("write %s: %w", name, err)
		}
	}
	return nil
}
