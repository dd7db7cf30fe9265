package sweep

import (
	"bytes"
	"fmt"
	"net/url"
	"path/filepath"
	"spanwright/route/fileset"
)

// Judged is one scenario of a finished sweep with what the comparison works out across
// scenarios (the same as the cost_rank and pareto columns of compare.csv).
type Judged struct {
	Row
	// Rank is 1 for the cheapest ok scenario; equal costs share a rank and the next rank
	// skips (1, 2, 2, 4); 0 for an infeasible or failed scenario. An incomplete one
	// (Row.Incomplete: its total leaves out items its book does not price) is ranked among
	// those leaving out the same items (Row.Exclusion), apart from the complete ones.
	Rank int
	// Of is the number of rows ranked with it (its rank group), for RankText; 0 when not ranked.
	Of int
	// LegSet is the number of its set of unserved legs (UnservedSets) when the rows leave
	// more than one, for RankText and ParetoText; 0 otherwise.
	LegSet int
	// Pareto is set on an ok scenario that no other one of the same exclusion dominates on
	// total cost (lower is better), worst loss margin (higher) and links missing a diverse
	// route (fewer).
	Pareto bool
	// Dir is the scenario's folder relative to the comparison's folder, with slashes and
	// each part escaped for a URL: the id for a sweep's own comparison, and for a merge into
	// another folder the way from there to the shard's folder ("../shard-1/<id>").
	Dir string
}

// Comparison is a finished sweep's comparison: its override keys (the columns that tell
// scenarios apart, in file order) and every scenario's row, judged, in index order.
type Comparison struct {
	Keys     []string
	Rows     []Judged
	Currency string // the currency every planned scenario shares; "" when they differ
	// Units are the units the scenarios' files for people are in (output.UnitsImperial, or
	// "" for metric): the report shows lengths in them, as compare.csv does.
	Units string
	// RankSets and OKSets are the numbers of sets the ranked rows and the ok rows are ranked
	// in (RankSets): a row is said to be ranked apart only when its kind has more than one.
	RankSets, OKSets int
}

// Judge ranks rows (every scenario of a sweep, in index order) and flags the Pareto-optimal
// ones, as Compare does for compare.csv.
func Judge(rows []Row, keys []string) *Comparison {
	js := judge(rows)
	c := &Comparison{Keys: append([]string(nil), keys...), Rows: make([]Judged, len(js)), Currency: currencyOf(rows), RankSets: RankSets(rows, false), OKSets: RankSets(rows, true)}
	for i, j := range js {
		c.Rows[i] = Judged{Row: *j.Row, Rank: j.rank, Of: j.of, LegSet: j.set, Pareto: j.pareto, Dir: url.PathEscape(j.ID)}
	}
	return c
}

// ReadComparison reads the rows file of a whole sweep or of a merge (rows.jsonl) in dir and
// judges it. It fails when the file is missing, is not a rows file, or lacks a scenario.
func ReadComparison(dir string) (*Comparison, error) {
	path := filepath.Join(dir, RowsFile)
	h, rs, err := readRows(path)
	if err != nil {
		return nil, fmt.Errorf("read comparison: %w", err)
	}
	rows := make([]Row, h.Scenarios)
	seen := make([]bool, h.Scenarios)
	for _, r := range rs {
		rows[r.Index], seen[r.Index] = r, true
	}
	for i, ok := range seen {
		if !ok {
			return nil, fmt.Errorf("read comparison: %s: scenario %d missing", path, i)
		}
	}
	return h.judge(rows), nil
}

// judge is Judge on rows read back with their header h, in the units the rows were written in.
func (h rowsHeader) judge(rows []Row) *Comparison {
	c := Judge(rows, h.Keys)
	c.Units = h.Units
	return c
}

// CompareFunc renders more comparison files (a report) from a finished sweep's comparison;
// see Options.Compare and Merge.
type CompareFunc func(*Comparison) ([]fileset.OutputFile, error)

// judgeEncoded judges the rows of an encoded rows file, as ReadComparison would after
// reading it back: the comparison files a merge renders from the shards' rows files are then
// the same bytes as the unsharded sweep's.
func judgeEncoded(data []byte) (*Comparison, error) {
	h, rows, err := decodeRows(RowsFile, bytes.NewReader(data))
	if err != nil {
		return nil, err
	}
	return h.judge(rows), nil
}
