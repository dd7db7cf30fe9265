package sweep

import (
	"bytes"
	"encoding/csv"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"testing"
)

func hookRows() []Row {
	m := func(x float64) *float64 { return &x }
	return []Row{
		{Index: 0, ID: "a-1", Status: StatusOK, Currency: "USD", TotalCents: 500, WorstMarginDB: m(2)},
		{Index: 1, ID: "b-2", Status: StatusOK, Currency: "USD", TotalCents: 700, WorstMarginDB: m(4)},
		{Index: 2, ID: "c-3", Status: StatusOK, Currency: "USD", TotalCents: 700, WorstMarginDB: m(3)},
		{Index: 3, ID: "d-4", Status: StatusInfeasible, Currency: "USD", TotalCents: 100, InfeasibleLegs: 1},
		{Index: 4, ID: "e-5", Status: StatusFailed, Error: "bad"},
	}
}

// TestJudgeMatchesCompare checks that Judge gives the rank and Pareto flag compare.csv writes.
func TestJudgeMatchesCompare(t *testing.T) {
	rows := hookRows()
	c := Judge(rows, nil)
	files, err := Compare(rows, nil, "")
	if err != nil {
		t.Fatal(err)
	}
	var table [][]string
	for _, f := range files {
		if f.Name == CompareCSV {
			table, err = csv.NewReader(bytes.NewReader(f.Data)).ReadAll()
			if err != nil {
				t.Fatal(err)
			}
		}
	}
	col := map[string]int{}
	for i, h := range table[0] {
		col[h] = i
	}
	for i, j := range c.Rows {
		rec := table[i+1]
		rank := ""
		if j.Rank > 0 {
			rank = strconv.Itoa(j.Rank)
		}
		if rec[col["cost_rank"]] != rank {
			t.Errorf("%s: rank %q, compare.csv %q", j.ID, rank, rec[col["cost_rank"]])
		}
		if want := rec[col["pareto"]] == "yes"; j.Pareto != want {
			t.Errorf("%s: pareto %v, compare.csv %q", j.ID, j.Pareto, rec[col["pareto"]])
		}
	}
	// b-2 dominates c-3 (same cost, larger margin); a-1 is cheapest.
	if !c.Rows[0].Pareto || !c.Rows[1].Pareto || c.Rows[2].Pareto || c.Rows[3].Pareto {
		t.Errorf("pareto flags %v %v %v %v", c.Rows[0].Pareto, c.Rows[1].Pareto, c.Rows[2].Pareto, c.Rows[3].Pareto)
	}
	if c.Currency != "USD" {
		t.Errorf("currency %q", c.Currency)
	}
}

func TestReadComparison(t *testing.T) {
	dir := t.TempDir()
	rows := hookRows()
	data, err := encodeRows(rowsHeader{Format: RowsFormat, Sweep: "x", Scenarios: len(rows), Keys: []string{"hub"}}, rows)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, RowsFile), data, 0o644); err != nil {
		t.Fatal(err)
	}
	c, err := ReadComparison(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Keys) != 1 || c.Keys[0] != "hub" || len(c.Rows) != 5 || c.Rows[4].Error != "bad" || c.Rows[0].Rank != 1 {
		t.Errorf("comparison %+v", c)
	}
	// What a sweep hands its Compare hook is what reading its rows file back gives.
	direct, err := judgeEncoded(data)
	if err != nil || !reflect.DeepEqual(direct, c) {
		t.Errorf("judgeEncoded: %+v, %v; want %+v", direct, err, c)
	}
	// Rows missing, or no rows file: an error naming it.
	short, _ := encodeRows(rowsHeader{Format: RowsFormat, Sweep: "x", Scenarios: 6}, rows)
	os.WriteFile(filepath.Join(dir, RowsFile), short, 0o644)
	if _, err := ReadComparison(dir); err == nil || !strings.Contains(err.Error(), "scenario 5 missing") {
		t.Errorf("short rows: got %v", err)
	}
	if _, err := ReadComparison(t.TempDir()); err == nil || !strings.Contains(err.Error(), RowsFile) {
		t.Errorf("no rows file: got %v", err)
	}
}
