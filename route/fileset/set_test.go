package fileset

import (
	"context"
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// begins are the two ways a set starts: beside the output folder (Begin) and inside it
// (BeginInPlace).
var begins = []struct {
	name  string
	begin func(ctx context.Context, dir string, names, protect []string) (*Set, error)
}{{"beside", Begin}, {"in place", BeginInPlace}}

// oldSet writes the set tagged old into a new output folder and returns the folder.
func oldSet(t *testing.T) string {
	t.Helper()
	out := filepath.Join(t.TempDir(), "out")
	if err := WriteFiles(context.Background(), out, outputSet("old"), nil); err != nil {
		t.Fatal(err)
	}
	return out
}

// streamSet writes outputSet(tag) into set one file at a time, checking after each that dir
// still holds the whole old set: nothing written reaches dir before Commit.
func streamSet(t *testing.T, set *Set, dir, tag string) {
	t.Helper()
	for _, f := range outputSet(tag) {
		if err := set.Write(f.Name, func(w io.Writer) error {
			// In two pieces, as a renderer writes.
			if _, err := w.Write(f.Data[:3]); err != nil {
				return err
			}
			_, err := w.Write(f.Data[3:])
			return err
		}); err != nil {
			t.Fatal(err)
		}
		wholeSet(t, dir, "old")
	}
}

// TestSetWritesAsItRenders: a set written one file at a time replaces the old set only when
// committed, keeping the user's file, and leaves nothing of its own behind.
func TestSetWritesAsItRenders(t *testing.T) {
	for _, b := range begins {
		t.Run(b.name, func(t *testing.T) {
			out := oldSet(t)
			notes := filepath.Join(out, "notes.txt")
			if err := os.WriteFile(notes, []byte("mine"), 0o600); err != nil {
				t.Fatal(err)
			}
			set, err := b.begin(context.Background(), out, outputNames(outputSet("new")), nil)
			if err != nil {
				t.Fatal(err)
			}
			defer set.Abort()
			streamSet(t, set, out, "new")
			if err := set.Commit(); err != nil {
				t.Fatal(err)
			}
			wholeSet(t, out, "new")
			noLeftovers(t, out)
			noLeftovers(t, filepath.Dir(out))
			if got, _ := os.ReadFile(notes); string(got) != "mine" {
				t.Errorf("notes.txt reads %q after the switch", got)
			}
			set.Abort() // after Commit: nothing to do
			wholeSet(t, out, "new")
		})
	}
}

// TestSetStopsWholeOrNothing: a renderer that fails half way, a context done between two
// files or before the switch, a file named twice or one never written: each leaves the old
// set whole and nothing of the new one, and returns the error that stopped it.
func TestSetStopsWholeOrNothing(t *testing.T) {
	broken := errors.New("renderer failed")
	names := outputNames(outputSet("new"))
	cases := []struct {
		name string
		run  func(ctx context.Context, cancel func(), set *Set) error
		want func(error) bool
	}{
		{"renderer fails", func(_ context.Context, _ func(), set *Set) error {
			return set.Write(names[0], func(w io.Writer) error {
				io.WriteString(w, "half a file")
				return broken
			})
		}, func(err error) bool { return err == broken }},
		{"stopped between files", func(_ context.Context, cancel func(), set *Set) error {
			if err := set.Write(names[0], func(w io.Writer) error { return nil }); err != nil {
				return err
			}
			cancel()
			return set.Write(names[1], func(w io.Writer) error { return nil })
		}, func(err error) bool { return errors.Is(err, context.Canceled) }},
		{"stopped before the switch", func(_ context.Context, cancel func(), set *Set) error {
			for _, n := range names {
				if err := set.Write(n, func(w io.Writer) error { return nil }); err != nil {
					return err
				}
			}
			cancel()
			return set.Commit()
		}, func(err error) bool { return errors.Is(err, context.Canceled) }},
		{"written twice", func(_ context.Context, _ func(), set *Set) error {
			set.Write(names[0], func(w io.Writer) error { return nil })
			return set.Write(names[0], func(w io.Writer) error { return nil })
		}, func(err error) bool { return err != nil && strings.Contains(err.Error(), "written twice") }},
		{"one not written", func(_ context.Context, _ func(), set *Set) error {
			for _, n := range names[1:] {
				if err := set.Write(n, func(w io.Writer) error { return nil }); err != nil {
					return err
				}
			}
			return set.Commit()
		}, func(err error) bool { return err != nil && strings.Contains(err.Error(), "named but not written") }},
	}
	for _, b := range begins {
		for _, tc := range cases {
			t.Run(b.name+"/"+tc.name, func(t *testing.T) {
				out := oldSet(t)
				ctx, cancel := context.WithCancel(context.Background())
				defer cancel()
				set, err := b.begin(ctx, out, names, nil)
				if err != nil {
					t.Fatal(err)
				}
				if err := tc.run(ctx, cancel, set); !tc.want(err) {
					t.Errorf("error %v", err)
				}
				set.Abort()
				wholeSet(t, out, "old")
				noLeftovers(t, out)
				noLeftovers(t, filepath.Dir(out))
				if got := entries(t, out); len(got) != len(names) {
					t.Errorf("out holds %v, want the old set alone", got)
				}
			})
		}
	}
}

// TestSetRefusesBeforeWriting: what WriteFiles refuses, Begin refuses before a file is
// rendered (an output that is an input), leaving no folder to write into.
func TestSetRefusesBeforeWriting(t *testing.T) {
	for _, b := range begins {
		t.Run(b.name, func(t *testing.T) {
			out := oldSet(t)
			input := filepath.Join(out, "links.csv")
			if _, err := b.begin(context.Background(), out, outputNames(outputSet("new")), []string{input}); !errors.Is(err, ErrOverwrite) {
				t.Errorf("error %v, want ErrOverwrite", err)
			}
			wholeSet(t, out, "old")
			noLeftovers(t, out)
			noLeftovers(t, filepath.Dir(out))
		})
	}
}
