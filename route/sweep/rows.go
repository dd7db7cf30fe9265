package sweep

import (
	"bufio"
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io"
	"maps"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strconv"
	"strings"

	"spanwright/geo/input"
	"spanwright/route/output"
)

// Scenario statuses.
const (
	StatusOK         = "ok"         // planned, every leg feasible
	StatusInfeasible = "infeasible" // planned, some legs infeasible
	StatusFailed     = "failed"     // not planned: the scenario's plan or campus is invalid
)

// Row is what the comparison keeps of one scenario: its overrides, its status and the
// figures of its plan summary. Money is integer cents of Currency.
type Row struct {
	Index  int         `json:"index"` // 0-based position in sweep order
	ID     string      `json:"id"`
	Case   string      `json:"case,omitempty"`
	Set    [][2]string `json:"set"` // overrides in file order: key, value as written
	Status string      `json:"status"`
	Error  string      `json:"error,omitempty"` // why a failed scenario failed

	Currency        string `json:"currency,omitempty"`
	TotalCents      int64  `json:"total_cents"`
	BudgetCents     *int64 `json:"budget_cents"`      // nil (null): the plan sets no budget
	OverBudgetCents *int64 `json:"over_budget_cents"` // total minus budget; nil without a budget
	// BudgetFeasibleOnly says the budget check covers the feasible legs only: the plan has a
	// budget and infeasible legs, which its total does not price
	// (output.Summary.BudgetFeasibleOnly); absent otherwise, and in a rows file written before
	// it was kept. The comparison says so beside over_budget (review 17 F3).
	BudgetFeasibleOnly bool `json:"budget_feasible_legs_only,omitempty"`
	InfeasibleLegs     int  `json:"infeasible_legs"`
	// Unserved names the infeasible legs, "link/leg" in leg order
	// (output.Summary.InfeasibleNames); absent when every leg is feasible, and in a rows
	// file written before it was kept, whose infeasible scenarios are then not ranked. The
	// comparison ranks an infeasible scenario among those leaving the same legs unserved
	// (Row.Apart).
	Unserved      []string `json:"infeasible_leg_names,omitempty"`
	WorstMarginDB *float64 `json:"worst_margin_db"` // smallest loss margin, dB; nil without fibre legs
	NewTrenchM    float64  `json:"new_trench_m"`    // metres of new trench opened
	// NewConstructionM is the new construction by kind in metres (output.Summary
	// .NewConstructionM: trench, bore, aerial, tray, tunnel); nil (absent) for a failed
	// scenario and in a rows file written before it was kept.
	NewConstructionM map[string]float64 `json:"new_construction_m,omitempty"`
	DiverseLinks     int                `json:"diverse_links"` // links with two disjoint feasible legs
	// DiverseSinglePoint is, of DiverseLinks, those whose two routes still share a single
	// point of failure (output.Summary.DiverseSinglePoint); nil (absent) in a rows file
	// written before it was kept.
	DiverseSinglePoint *int   `json:"diverse_single_point,omitempty"`
	DiverseMissing     int    `json:"diverse_missing"` // links that asked for a diverse route and lack one
	MediaMix           string `json:"media_mix"`       // feasible legs per medium: "om4:3 os2:5", by medium
	Warnings           int    `json:"warnings"`
	// Note says what the sweep changed in the scenario's plan beyond its overrides and what of
	// the base plan the scenario left out, and why (output.Summary.Notes, joined by "; "), e.g.
	// a link entry carried to, or dropped for, the building the scenario makes the hub; and
	// what its total leaves out, priced by a book without them (output.Summary.NotPricedNote).
	Note string `json:"note,omitempty"`
	// NotPriced lists what its total leaves out, priced by a book without it
	// (output.Summary.NotPriced); absent when every line is priced, and in a rows file written
	// before it was kept. A scenario with it is incomplete (Row.Incomplete).
	NotPriced []string `json:"not_priced,omitempty"`
	// Report is the name of the scenario's HTML report in its folder (report.html, written
	// with Options.Extra), "" when it has none: the comparison links it.
	Report string `json:"report,omitempty"`
	// DemoPrices is set when the invented demo price book built into spanwright priced the
	// scenario (output.Summary.DemoPrices).
	DemoPrices bool `json:"demo_prices,omitempty"`
	// ObjectiveCents, LowerBoundCents and GapPct are the optimizer's objective, its proved
	// lower bound and their gap in percent (output.Summary.ObjectiveCents, LowerBoundCents,
	// GapPct); the bound and gap are nil (null) with the length objective.
	ObjectiveCents  int64    `json:"objective_cents"`
	LowerBoundCents *int64   `json:"lower_bound_cents"`
	GapPct          *float64 `json:"gap_pct"`
	// StartedFrom is the base scenario whose routes the optimizer's search began from
	// (output.Summary.StartedFrom); "" for a scenario planned from scratch, as `spanwright
	// plan` plans it alone.
	StartedFrom string `json:"started_from,omitempty"`
	// HandholesToBuild is every handhole the plan adds (output.Summary.HandholesToBuild); nil
	// (absent) in a rows file written before it was kept.
	HandholesToBuild *int `json:"handholes_to_build,omitempty"`
	// CostByCategory, ContingencyCents, OverheadCents and TaxCents are the bill's subtotals by
	// category and its markups (output.Summary's of the same names), which add up to
	// TotalCents; CostByCategory is nil (absent) for a plan without a bill and in a rows file
	// written before they were kept.
	CostByCategory   map[string]int64 `json:"cost_by_category_cents,omitempty"`
	ContingencyCents int64            `json:"contingency_cents,omitempty"`
	OverheadCents    int64            `json:"overhead_cents,omitempty"`
	TaxCents         int64            `json:"tax_cents,omitempty"`
	// Cautions are the titles of the safety cautions the scenario's work calls for
	// (output.Summary.Cautions), empty when none; nil (absent or null) for a failed scenario
	// and in a rows file written before they were kept.
	Cautions []string `json:"cautions"`
}

func newRow(sc Scenario) Row {
	r := Row{Index: sc.Index, ID: sc.ID, Case: sc.Case, Set: make([][2]string, len(sc.Set))}
	for i, o := range sc.Set {
		r.Set[i] = [2]string{o.Key, o.Value}
	}
	return r
}

// fill copies the plan summary's figures into the row and sets its status.
func (r *Row) fill(s output.Summary) {
	r.Currency = s.Currency
	r.TotalCents, r.BudgetCents, r.OverBudgetCents = s.TotalCents, s.BudgetCents, s.OverBudgetCents
	r.BudgetFeasibleOnly = s.BudgetFeasibleOnly
	r.InfeasibleLegs = s.Infeasible
	r.Unserved = slices.Clone(s.InfeasibleNames)
	r.WorstMarginDB = s.WorstMarginDB
	r.NewTrenchM = s.NewTrenchM
	r.NewConstructionM = maps.Clone(s.NewConstructionM)
	r.DiverseLinks, r.DiverseMissing = s.DiverseLinks, s.DiverseShort
	spof := s.DiverseSinglePoint
	r.DiverseSinglePoint = &spof
	media := make([]string, 0, len(s.MediaMix))
	for m, n := range s.MediaMix {
		media = append(media, fmt.Sprintf("%s:%d", m, n))
	}
	sort.Strings(media)
	r.MediaMix = strings.Join(media, " ")
	r.Warnings = s.WarningCount
	r.Note = strings.Join(s.Notes, "; ")
	r.NotPriced = slices.Clone(s.NotPriced)
	if np := s.NotPricedNote(); np != "" { // its total is not comparable with a book that prices them
		r.Note = strings.TrimPrefix(r.Note+"; "+np, "; ")
	}
	r.DemoPrices = s.DemoPrices != ""
	r.ObjectiveCents, r.LowerBoundCents, r.GapPct = s.ObjectiveCents, s.LowerBoundCents, s.GapPct
	r.StartedFrom = s.StartedFrom
	if s.Cautions != nil { // nil: a summary.json written before they were kept (--resume)
		r.Cautions = make([]string, len(s.Cautions))
		for i, c := range s.Cautions {
			r.Cautions[i] = c.Title
		}
	}
	hh := s.HandholesToBuild
	r.HandholesToBuild = &hh
	if s.HasBill() {
		r.CostByCategory = maps.Clone(s.CostByCategory)
		r.ContingencyCents, r.OverheadCents, r.TaxCents = s.ContingencyCents, s.OverheadCents, s.TaxCents
	}
	r.Status = StatusOK
	if s.Infeasible > 0 {
		r.Status = StatusInfeasible
	}
}

// Apart is what sets a row's total apart from the complete totals of scenarios serving every
// leg, in short, for the comparison's rank and pareto cells ("1 of 4 leaving 31 legs
// unserved", "yes (leaving 31 legs unserved)"): how many legs it leaves unserved, "leaving 1
// leg unserved", "leaving 31 legs unserved" (the legs are named once, in compare.csv's
// unserved_legs and below compare.md's table: UnservedSets; tester 15 F7: 31 names in every
// rank and pareto cell made compare.md's rows screens wide), and the items its total leaves
// out, "without " and Exclusion, joined by " and "; "" for an ok scenario pricing every line.
// Scenarios of one rank group (group: the same legs, the same items) are ranked and judged
// among themselves (judge): their totals cover the same legs and the same items (common
// practice, no published source: bids are compared on the same scope). It means nothing for
// a row not ranked at all (Ranked: failed, or infeasible in a rows file without its legs'
// names).
func (r *Row) Apart() string { return r.ApartIn(0) }

// ApartIn is Apart with the number of the row's set of unserved legs, "leaving the 1 leg of set
// 2 unserved", when set is not 0: the comparison numbers the sets when its
// scenarios leave more than one (UnservedSets), so that two rank groups each leaving one leg
// unserved, another leg each, never read alike.
func (r *Row) ApartIn(set int) string {
	var parts []string
	if r.Status == StatusInfeasible && len(r.Unserved) > 0 {
		legs := output.Counted(len(r.Unserved), "leg", "legs")
		if set > 0 {
			legs = "the " + legs + " of set " + strconv.Itoa(set)
		}
		parts = append(parts, "leaving "+legs+" unserved")
	}
	if x := r.Exclusion(); x != "" && r.Status != StatusFailed {
		parts = append(parts, "without "+x)
	}
	return strings.Join(parts, " and ")
}

// Total is the row's total cost as a figure to set against other rows': that of an ok
// scenario, which serves every leg; false for a failed one and for one leaving legs unserved,
// whose total prices the served legs only (ServedLegsTotal): sorted among complete totals it
// came out as the cheapest alternative (tester 15 F7). compare.csv's total_cost, compare.md's
// and compare.xlsx's total cost and the sweep report's all print it.
func (r *Row) Total() (int64, bool) { return r.TotalCents, r.Status == StatusOK }

// ServedLegsTotal is the total of a scenario leaving legs unserved, which prices its served
// legs only (compare.csv's total_cost_served_legs_only); false for any other row, whose total
// is Total's or none.
func (r *Row) ServedLegsTotal() (int64, bool) { return r.TotalCents, r.Status == StatusInfeasible }

// UnservedSet is a set of legs that scenarios leave unserved ("link/leg", in the leg order of
// the first of them) and those scenarios' ids, in index order.
type UnservedSet struct {
	Legs, IDs []string
	key       string // Row.legsKey of its rows
}

// UnservedSets are the sets of legs the planned rows leave unserved (Row.Unserved), each with
// the scenarios that leave exactly it, in the order of their first scenario: the one place
// the comparison names unserved legs beside compare.csv's own column (below compare.md's table
// and the sweep report's), so that the rank and pareto cells only count them (Row.ApartIn,
// with the set's number, its index here plus one, when there is more than one set).
func UnservedSets(rows []Row) []UnservedSet {
	var out []UnservedSet
	at := map[string]int{}
	for i := range rows {
		r := &rows[i]
		if r.Status != StatusInfeasible || len(r.Unserved) == 0 {
			continue
		}
		k := r.legsKey()
		n, seen := at[k]
		if !seen {
			n = len(out)
			at[k] = n
			out = append(out, UnservedSet{Legs: slices.Clone(r.Unserved), key: k})
		}
		out[n].IDs = append(out[n].IDs, r.ID)
	}
	return out
}

// group is the key of the row's rank group: its unserved legs and the items it leaves out,
// joined so that no id (which may hold ", " or " and ") makes two groups one.
func (r *Row) group() string {
	return r.legsKey() + "\x01" + strings.Join(slices.Sorted(slices.Values(r.NotPriced)), "\x00")
}

// legsKey is the key of the row's set of unserved legs: the legs sorted, joined by NUL; ""
// for a row that is not infeasible.
func (r *Row) legsKey() string {
	if r.Status != StatusInfeasible {
		return ""
	}
	return strings.Join(slices.Sorted(slices.Values(r.Unserved)), "\x00")
}

// RankSets is the number of sets the comparison ranks apart from one another among rows: the
// distinct groups (the same legs unserved, the same items not priced) of the ranked rows, or
// with okOnly of the ok rows alone (the items not priced). An ok row is said to be ranked
// apart only when the ok rows make more than one set, a row with infeasible legs only when
// the ranked rows do (tester 14 F10: six ok rows all without the same item, beside rows with
// infeasible legs, were said to be ranked apart).
func RankSets(rows []Row, okOnly bool) int {
	sets := map[string]bool{}
	for i := range rows {
		if rows[i].Ranked() && (!okOnly || rows[i].Status == StatusOK) {
			sets[rows[i].group()] = true
		}
	}
	return len(sets)
}

// Ranked reports whether the comparison ranks the row: an ok scenario, or an infeasible one
// whose unserved legs are named (Unserved), ranked among those leaving the same legs out.
func (r *Row) Ranked() bool {
	return r.Status == StatusOK || (r.Status == StatusInfeasible && len(r.Unserved) > 0)
}

// RankedApart reports whether the row is ranked apart from the ok scenarios that price every
// line (Apart is not ""): incomplete, or leaving legs unserved.
func (r *Row) RankedApart() bool { return r.Ranked() && r.Apart() != "" }

// Incomplete reports whether the scenario is planned with every leg feasible but its total
// leaves out items its price book does not price (NotPriced): a total not to rank against
// complete ones (common practice, no published source: bids are compared on the same scope).
func (r *Row) Incomplete() bool { return r.Status == StatusOK && len(r.NotPriced) > 0 }

func (r *Row) fail(err error) {
	*r = Row{Index: r.Index, ID: r.ID, Case: r.Case, Set: r.Set, Status: StatusFailed, Error: err.Error()}
}

// value returns the row's value for an override key, "" when the scenario leaves it as the
// base plan has it.
func (r *Row) value(key string) string {
	for _, kv := range r.Set {
		if kv[0] == key {
			return kv[1]
		}
	}
	return ""
}

// NewConstruction is the row's metres of new construction of kind (estimate.NewKinds);
// false for a failed row, one of a rows file written before the figures were kept and one
// written before kind was (every row this version writes names every kind, 0 for none built).
func (r *Row) NewConstruction(kind string) (float64, bool) {
	if r.Status == StatusFailed {
		return 0, false
	}
	m, ok := r.NewConstructionM[kind]
	return m, ok
}

// RowsFormat is the first field of a rows file's header line. Format 2 (with
// output.SummaryFormat 2) names the gap gap_pct, in percent (format 1: gap, a fraction), and
// writes null for budget_cents and over_budget_cents without a budget (format 1: 0) and for
// lower_bound_cents and gap_pct without a bound (format 1 left them out). A rows file of
// another format is refused (rowsFormatPrefix), never read as this one.
const RowsFormat = "spanwright sweep rows 2"

// rowsFormatPrefix begins the format of every rows file spanwright has written.
const rowsFormatPrefix = "spanwright sweep rows "

// RowsFile is the rows file of an unsharded sweep or of a merge.
const RowsFile = "rows.jsonl"

// shardRowsFile is the rows file of one shard.
func shardRowsFile(s Shard) string { return fmt.Sprintf("rows-%d-of-%d.jsonl", s.I, s.N) }

// rowsHeader is the first line of a rows file: which sweep the rows belong to.
type rowsHeader struct {
	Format    string   `json:"format"`
	Sweep     string   `json:"sweep"`     // SHA-256 of the base plan's hash and the scenario ids in order, one a line
	Scenarios int      `json:"scenarios"` // in the whole sweep
	Keys      []string `json:"keys"`      // override keys, the comparison's columns
	Shard     string   `json:"shard,omitempty"`
	// Units are the units the scenarios' files for people are in, output.UnitsImperial or ""
	// for metric (absent, so a metric rows file reads as before): the comparison's lengths
	// follow them (columnsIn).
	Units string `json:"units,omitempty"`
}

func sweepHash(f *File) string {
	h := sha256.New()
	base := sha256.Sum256(f.baseData)
	h.Write([]byte(hex.EncodeToString(base[:]) + "\n"))
	for _, s := range f.Scenarios() {
		h.Write([]byte(s.ID + "\n"))
	}
	return hex.EncodeToString(h.Sum(nil))
}

// encodeRows renders a rows file: the header line, then one JSON object a line, in index order.
func encodeRows(h rowsHeader, rows []Row) ([]byte, error) {
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(h); err != nil {
		return nil, err
	}
	for i := range rows {
		if err := enc.Encode(&rows[i]); err != nil {
			return nil, err
		}
	}
	return b.Bytes(), nil
}

// MaxRowsMiB caps a rows file, in MiB: a sweep of MaxScenarios scenarios writes rows of a
// few hundred bytes each, well within it. Rows files are spanwright's own output, so the cap
// only guards against a wrong path (a huge or sparse file); named pipes and devices are
// refused whatever their size.
const MaxRowsMiB = 4096

// readRows reads one rows file.
func readRows(path string) (rowsHeader, []Row, error) {
	data, err := input.ReadFile(path, MaxRowsMiB*input.MiB)
	if err != nil {
		return rowsHeader{}, nil, err
	}
	return decodeRows(path, bytes.NewReader(data))
}

// decodeRows reads a rows file from r; path names it in errors.
func decodeRows(path string, r io.Reader) (rowsHeader, []Row, error) {
	var h rowsHeader
	sc := bufio.NewScanner(r)
	sc.Buffer(make([]byte, 0, 64<<10), 16<<20)
	var rows []Row
	line := 0
	for sc.Scan() {
		line++
		dec := json.NewDecoder(bytes.NewReader(sc.Bytes()))
		dec.DisallowUnknownFields()
		if line == 1 {
			if err := dec.Decode(&h); err != nil || h.Format != RowsFormat {
				var other struct {
					Format string `json:"format"`
				}
				if json.Unmarshal(sc.Bytes(), &other) == nil && strings.HasPrefix(other.Format, rowsFormatPrefix) {
					return h, nil, fmt.Errorf("%s:1: sweep rows of format %q, written by another version of spanwright; this one reads %q: run that sweep (or shard) again with this version (--resume plans again the scenarios the other version planned)",
						path, other.Format, RowsFormat)
				}
				return h, nil, fmt.Errorf("%s:1: not a sweep rows file (want a header with format %q)", path, RowsFormat)
			}
			continue
		}
		var r Row
		if err := dec.Decode(&r); err != nil {
			return h, nil, fmt.Errorf("%s:%d: %v", path, line, err)
		}
		if dups := input.JSONDuplicates(sc.Bytes()); len(dups) > 0 {
			return h, nil, fmt.Errorf("%s:%d: member %q given twice; a rows file is written by spanwright, not by hand", path, line, dups[0].Where())
		}
		if r.Index < 0 || r.Index >= h.Scenarios {
			return h, nil, fmt.Errorf("%s:%d: scenario index %d outside 0..%d", path, line, r.Index, h.Scenarios-1)
		}
		rows = append(rows, r)
	}
	if err := sc.Err(); err != nil {
		return h, nil, fmt.Errorf("%s: %w", path, err)
	}
	if line == 0 {
		return h, nil, fmt.Errorf("%s: empty file, want a sweep rows file", path)
	}
	return h, rows, nil
}

// findRows lists the rows files of a sweep output folder, sorted.
func findRows(dir string) ([]string, error) {
	ents, err := os.ReadDir(dir)
	if err != nil {
		return nil, err
	}
	var out []string
	for _, e := range ents {
		n := e.Name()
		if !e.IsDir() && strings.HasPrefix(n, "rows") && strings.HasSuffix(n, ".jsonl") {
			out = append(out, filepath.Join(dir, n))
		}
	}
	sort.Strings(out)
	return out, nil
}
