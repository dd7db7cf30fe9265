package sweep

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/route/output"
)

// TestCompareImperial: a sweep run with --units imperial writes its comparison's lengths in
// feet, as its scenarios' files (1 ft = 0.3048 m exactly, NIST SP 811): compare.csv's
// new_trench_ft, compare.md's "new trench (ft)", and the new construction by kind
// (new_construction_aerial_ft, "new construction: pole line (ft)"); metric sweeps keep
// new_trench_m and new_construction_aerial_m.
func TestCompareImperial(t *testing.T) {
	t.Parallel()
	rows := []Row{{Index: 0, ID: "a", Status: StatusOK, TotalCents: 100, NewTrenchM: 100,
		NewConstructionM: map[string]float64{"trench": 100, "bore": 0, "aerial": 30.5, "tray": 0, "tunnel": 0}}}
	for _, c := range []struct {
		units, head, cell, md string
	}{
		{"", "new_trench_m", "100.0", "new trench (m)"},
		{output.UnitsImperial, "new_trench_ft", "328.1", "new trench (ft)"},
		{"", "new_construction_aerial_m", "30.5", "new construction: pole line (m)"},
		{output.UnitsImperial, "new_construction_aerial_ft", "100.1", "new construction: pole line (ft)"}, // 30.5 / 0.3048 = 100.066
	} {
		files, err := Compare(rows, nil, c.units)
		if err != nil {
			t.Fatal(err)
		}
		for _, f := range files {
			switch f.Name {
			case CompareCSV:
				lines := strings.Split(string(f.Data), "\n")
				head := strings.Split(lines[0], ",")
				i := -1
				for k, h := range head {
					if h == c.head {
						i = k
					}
				}
				if i < 0 || strings.Split(lines[1], ",")[i] != c.cell {
					t.Errorf("units %q: compare.csv head %q, row %q: want %s %s", c.units, lines[0], lines[1], c.head, c.cell)
				}
			case CompareMD:
				if !strings.Contains(string(f.Data), c.md) {
					t.Errorf("units %q: compare.md lacks %q", c.units, c.md)
				}
			}
		}
	}
}

// TestMergeRefusesMixedUnits: shards written in different units are not merged into one
// comparison, whose lengths would be in one of them.
func TestMergeRefusesMixedUnits(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for i, u := range []string{"", output.UnitsImperial} {
		sh := Shard{I: i + 1, N: 2}
		h := rowsHeader{Format: RowsFormat, Sweep: "x", Scenarios: 2, Shard: sh.String(), Units: u}
		data, err := encodeRows(h, []Row{{Index: i, ID: string(rune('a' + i)), Status: StatusOK}})
		if err != nil {
			t.Fatal(err)
		}
		d := filepath.Join(dir, "shard"+string(rune('1'+i)))
		if err := os.MkdirAll(d, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(d, shardRowsFile(sh)), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	_, err := Merge([]string{filepath.Join(dir, "shard1"), filepath.Join(dir, "shard2")}, filepath.Join(dir, "out"), nil)
	if !errors.Is(err, ErrMerge) || !strings.Contains(err.Error(), "imperial units") {
		t.Errorf("merge of metric and imperial shards: %v", err)
	}
}

// TestNewConstructionKindNotKept: a rows file written before a kind of new construction was
// kept has no entry for it; the row reads that kind as not kept (a blank column), not as 0
// metres built, and a row of this version, which names every kind, reads 0 as 0 (review 19
// F8).
func TestNewConstructionKindNotKept(t *testing.T) {
	t.Parallel()
	old := Row{Status: StatusOK, NewConstructionM: map[string]float64{"trench": 12.5}}
	if m, ok := old.NewConstruction("trench"); !ok || m != 12.5 {
		t.Errorf("trench kept: got %v, %v, want 12.5, true", m, ok)
	}
	if m, ok := old.NewConstruction("tunnel"); ok {
		t.Errorf("tunnel not in the row's map: got %v, true, want not kept", m)
	}
	now := Row{Status: StatusOK, NewConstructionM: map[string]float64{"trench": 0, "tunnel": 0}}
	if m, ok := now.NewConstruction("tunnel"); !ok || m != 0 {
		t.Errorf("tunnel kept as 0: got %v, %v, want 0, true", m, ok)
	}
	if _, ok := (&Row{Status: StatusOK}).NewConstruction("trench"); ok {
		t.Error("a row with no figures kept reads a kind as kept")
	}
	if _, ok := (&Row{Status: StatusFailed, NewConstructionM: map[string]float64{"trench": 0}}).NewConstruction("trench"); ok {
		t.Error("a failed row reads a kind as kept")
	}
}
