package output

import (
	"bytes"
	"context"
	"errors"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"

	"spanwright/route/fileset"
	"spanwright/route/internal/testplan"
)

// TestWriteSet: the files are rendered into the set (side by side: fileset's tests check the
// scheduling) and put in place together; an output that would replace an input is refused
// before anything is rendered; a renderer's failure fails the set with its error, leaving the
// folder as it was (README, "Outputs": whole or nothing).
func TestWriteSet(t *testing.T) {
	t.Parallel()
	var mu sync.Mutex
	var rendered []string
	file := func(name, body string, err error) File {
		return File{Name: name, Render: func(_ context.Context, w io.Writer) error {
			mu.Lock()
			rendered = append(rendered, name)
			mu.Unlock()
			io.WriteString(w, body)
			return err
		}}
	}
	out := filepath.Join(t.TempDir(), "out")
	if err := WriteSet(context.Background(), out, []File{file("b.csv", "old b", nil), file("a.json", "old a", nil)}, nil); err != nil {
		t.Fatal(err)
	}
	if slices.Sort(rendered); strings.Join(rendered, " ") != "a.json b.csv" {
		t.Errorf("rendered %v, want a.json and b.csv", rendered)
	}
	same := func(when string) {
		t.Helper()
		for name, want := range map[string]string{"a.json": "old a", "b.csv": "old b"} {
			if got, err := os.ReadFile(filepath.Join(out, name)); err != nil || string(got) != want {
				t.Errorf("%s: %s holds %q (%v), want %q", when, name, got, err, want)
			}
		}
		if ents, _ := os.ReadDir(out); len(ents) != 2 {
			t.Errorf("%s: %d entries in the output folder, want the old a.json and b.csv", when, len(ents))
		}
		if ents, _ := os.ReadDir(filepath.Dir(out)); len(ents) != 1 {
			t.Errorf("%s: %d entries beside the output folder, want it alone", when, len(ents))
		}
	}

	rendered = nil
	err := WriteSet(context.Background(), out, []File{file("b.csv", "new b", nil)}, []string{filepath.Join(out, "b.csv")})
	if !errors.Is(err, fileset.ErrOverwrite) || len(rendered) != 0 {
		t.Errorf("an output over an input: error %v after rendering %v; want ErrOverwrite before any", err, rendered)
	}
	same("refused")

	rendered = nil
	broken := errors.New("renderer failed")
	err = WriteSet(context.Background(), out, []File{file("b.csv", "new b", nil), file("a.json", "half", broken), file("c.txt", "new c", nil)}, nil)
	if slices.Sort(rendered); err != broken || !slices.Contains(rendered, "a.json") || !slices.Contains(rendered, "b.csv") {
		t.Errorf("a failing renderer: error %v after rendering %v; want its error, after b.csv and a.json", err, rendered)
	}
	same("failed")
}

// TestNames: the names Outputs writes, as the resumed sweep checks them, follow the write
// options and whether the plan has a bill.
func TestNames(t *testing.T) {
	lean := WriteOptions{SkipGeoPackage: true, SkipWorkbook: true}
	for _, tc := range []struct {
		opt  WriteOptions
		bill bool
		want string
	}{
		{lean, false, "routes.geojson links.csv summary.json"},
		{lean, true, "routes.geojson links.csv summary.json bom.csv"},
		{WriteOptions{}, true, "routes.geojson links.csv summary.json plan.gpkg bom.csv bom.xlsx"},
	} {
		if got := strings.Join(Names(tc.opt, tc.bill), " "); got != tc.want {
			t.Errorf("Names(%+v, bill %v) = %s, want %s", tc.opt, tc.bill, got, tc.want)
		}
	}
}

// TestWriteSetSameBytes: the demo's files written side by side (WriteSet) are byte for byte
// those rendered one after the other in memory (Files), in both unit systems, whatever the
// scheduling.
func TestWriteSetSameBytes(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	for _, opt := range []WriteOptions{{}, {Units: UnitsImperial}} {
		want, err := Files(context.Background(), r, opt)
		if err != nil {
			t.Fatal(err)
		}
		for range 3 {
			out := filepath.Join(t.TempDir(), "out")
			if err := WriteSet(context.Background(), out, Outputs(r, opt), nil); err != nil {
				t.Fatal(err)
			}
			for _, f := range want {
				got, err := os.ReadFile(filepath.Join(out, f.Name))
				if err != nil || !bytes.Equal(got, f.Data) {
					t.Errorf("%s (%s): written side by side, %d bytes (%v), differs from the %d rendered alone", f.Name, opt.Units, len(got), err, len(f.Data))
				}
			}
		}
	}
}
