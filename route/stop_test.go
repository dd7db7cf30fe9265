package route_test

import (
	"bytes"
	"context"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/geo/ctxtest"
	"spanwright/route"
	"spanwright/route/fileset"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/output"
	"spanwright/route/plan"
)

// TestSolveWithStops plans a 300-building campus with a context that is never done, then
// cancels it at the first, a quarter, half, three quarters and the last of the looks that
// plan took at it (the optimizer's, the media choice's, the estimate's): each stopped plan
// returns context.Canceled and no result, having looked at most three times more (the checks
// on its way out of the optimizer and SolveWith). The plan with the context never done writes
// the same bytes as one with context.Background.
func TestSolveWithStops(t *testing.T) {
	t.Parallel()
	s := testsite.NewSynth(t, 300) // a site of its own: clearing its caches disturbs no other test
	p := testsite.SynthPlan(s)
	eng, err := plan.Engine(p)
	if err != nil {
		t.Fatal(err)
	}
	want, err := route.SolveWith(context.Background(), s, p, eng)
	if err != nil {
		t.Fatal(err)
	}
	s.Solved.Purge()
	count := ctxtest.New(0)
	got, err := route.SolveWith(count, s, p, eng)
	if err != nil {
		t.Fatal(err)
	}
	total := count.Looks()
	wf, err := output.Files(context.Background(), want, output.WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	gf, err := output.Files(ctxtest.New(0), got, output.WriteOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for i := range wf {
		if !bytes.Equal(wf[i].Data, gf[i].Data) {
			t.Errorf("%s differs between a plan with context.Background and one with a context never done", wf[i].Name)
		}
	}
	for _, at := range []int64{1, total / 4, total / 2, 3 * total / 4, total} {
		s.Solved.Purge()
		probe := ctxtest.New(at)
		var seen int64
		probe.OnStop = func() { seen = probe.Looks() }
		r, err := route.SolveWith(probe, s, p, eng)
		if !errors.Is(err, context.Canceled) || r != nil {
			t.Errorf("cancelled at look %d of %d: got a result %v, %v; want none and context.Canceled", at, total, r != nil, err)
			continue
		}
		if more := probe.Looks() - seen; more > 3 {
			t.Errorf("cancelled at look %d of %d: %d more looks after the stop, want at most 3", at, total, more)
		}
	}
}

// TestOutputsStop renders the demo's outputs with a context cancelled at one look after
// another of those rendering takes at it (a dozen, spread over them, the first included):
// each returns context.Canceled and no file.
func TestOutputsStop(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	count := ctxtest.New(0)
	if _, err := output.Files(count, r, output.WriteOptions{}); err != nil {
		t.Fatal(err)
	}
	total := count.Looks()
	for at := int64(1); at <= total; at += max(1, total/12) {
		files, err := output.Files(ctxtest.New(at), r, output.WriteOptions{})
		if !errors.Is(err, context.Canceled) || files != nil {
			t.Errorf("cancelled at look %d of %d: got %d files, %v; want none and context.Canceled", at, total, len(files), err)
		}
	}
}

// TestWriteFilesStop writes three files over an older set with a context cancelled at each
// look WriteFiles takes at it in turn: the older set is left as it was, with no temporary file
// beside it; with the context done from the start, a missing folder is not even created.
func TestWriteFilesStop(t *testing.T) {
	t.Parallel()
	files := []fileset.OutputFile{{Name: "a.csv", Data: []byte("new a\n")}, {Name: "b.json", Data: []byte("new b\n")}, {Name: "c.txt", Data: []byte("new c\n")}}
	count := ctxtest.New(0)
	if err := fileset.WriteFiles(count, t.TempDir(), files, nil); err != nil {
		t.Fatal(err)
	}
	total := count.Looks()
	for at := int64(1); at <= total; at++ {
		dir := t.TempDir()
		for _, f := range files {
			if err := os.WriteFile(filepath.Join(dir, f.Name), []byte("old\n"), 0o644); err != nil {
				t.Fatal(err)
			}
		}
		if err := fileset.WriteFiles(ctxtest.New(at), dir, files, nil); !errors.Is(err, context.Canceled) {
			t.Errorf("cancelled at look %d of %d: got %v, want context.Canceled", at, total, err)
		}
		ents, err := os.ReadDir(dir)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range ents {
			data, _ := os.ReadFile(filepath.Join(dir, e.Name()))
			if strings.HasPrefix(e.Name(), ".") || string(data) != "old\n" {
				t.Errorf("cancelled at look %d of %d: %s holds %q, want only the old files, unchanged", at, total, e.Name(), data)
			}
		}
	}
	missing := filepath.Join(t.TempDir(), "out")
	if err := fileset.WriteFiles(ctxtest.New(1), missing, files, nil); !errors.Is(err, context.Canceled) {
		t.Errorf("context done from the start: got %v, want context.Canceled", err)
	}
	if _, err := os.Stat(missing); !errors.Is(err, os.ErrNotExist) {
		t.Errorf("context done from the start: the output folder was created (%v)", err)
	}
}
