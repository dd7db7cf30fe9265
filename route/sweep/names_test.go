package sweep

import (
	"bytes"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"spanwright/route/output"
)

// oldSummary rewrites a summary.json as spanwright wrote it before output.SummaryFormat 2:
// no format member, the bound as lower_bound and the gap as gap (a fraction, six decimals),
// and 0 for budget_cents, over_budget_cents and over_budget_pct without a budget.
func oldSummary(t *testing.T, data []byte) []byte {
	t.Helper()
	var m map[string]json.RawMessage
	if err := json.Unmarshal(data, &m); err != nil {
		t.Fatal(err)
	}
	delete(m, "format")
	m["lower_bound"], m["gap"] = m["lower_bound_cents"], m["gap_pct"]
	delete(m, "lower_bound_cents")
	delete(m, "gap_pct")
	if string(m["gap"]) != "null" {
		var pct float64
		if err := json.Unmarshal(m["gap"], &pct); err != nil {
			t.Fatal(err)
		}
		m["gap"], _ = json.Marshal(math.Round(1e4*pct) / 1e6)
	}
	for _, k := range []string{"budget_cents", "over_budget_cents", "over_budget_pct"} {
		if string(m[k]) == "null" {
			m[k] = json.RawMessage("0")
		}
	}
	out, err := json.MarshalIndent(m, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	return append(out, '\n')
}

// TestResumeOtherSummaryFormat: a resumed sweep whose scenario folders hold a summary.json
// of another format (an earlier spanwright's, without a format member, its gap a fraction
// and its budget 0 for none; or a format this version does not write) plans those scenarios
// again, says so in one note naming them, and never reads such a file as its own: the output
// folder comes back byte for byte as this version writes it. The rows carry null where a
// scenario has no budget (budget 0) or no bound (the length objective), and compare.csv
// leaves those cells blank.
func TestResumeOtherSummaryFormat(t *testing.T) {
	t.Parallel()
	f := parseInline(t, "vary:\n  budget: [0, 850000]\n  design.objective: [cost, length]")
	dir := t.TempDir()
	run(t, f, Options{Out: dir})
	before := tree(t, dir)

	// The rows as written: null for no budget and no bound, the gap in percent.
	_, rows, err := decodeRows(RowsFile, bytes.NewReader(before[RowsFile]))
	if err != nil {
		t.Fatal(err)
	}
	for _, r := range rows {
		noBudget := r.value("budget") == "0"
		noBound := r.value("design.objective") == "length"
		if r.Status != StatusOK || (r.BudgetCents == nil) != noBudget || (r.OverBudgetCents == nil) != noBudget ||
			(r.LowerBoundCents == nil) != noBound || (r.GapPct == nil) != noBound {
			t.Errorf("row %s: status %s, budget %v, over %v, bound %v, gap %v; want null budget %v, null bound %v",
				r.ID, r.Status, r.BudgetCents, r.OverBudgetCents, r.LowerBoundCents, r.GapPct, noBudget, noBound)
		}
		var s output.Summary
		if err := json.Unmarshal(before[r.ID+"/"+SummaryFile], &s); err != nil {
			t.Fatal(err)
		}
		if s.Format != output.SummaryFormat || (s.GapPct == nil) != (r.GapPct == nil) || (s.GapPct != nil && *s.GapPct != *r.GapPct) {
			t.Errorf("%s: summary.json format %q, gap_pct %v; row gap_pct %v", r.ID, s.Format, s.GapPct, r.GapPct)
		}
		if !noBound && (*r.GapPct < 0 || *r.GapPct >= 100) {
			t.Errorf("%s: gap_pct %v, want a percentage in [0, 100) on the demo", r.ID, *r.GapPct)
		}
		if line := rowLine(t, before[RowsFile], r.ID); noBudget && !strings.Contains(line, `"budget_cents":null,"over_budget_cents":null`) ||
			noBound && !strings.Contains(line, `"lower_bound_cents":null,"gap_pct":null`) {
			t.Errorf("%s: rows.jsonl line %s", r.ID, line)
		}
	}
	recs, err := csv.NewReader(bytes.NewReader(before[CompareCSV])).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := func(name string) int {
		i := slices.Index(recs[0], name)
		if i < 0 {
			t.Fatalf("compare.csv has no column %s: %q", name, recs[0])
		}
		return i
	}
	budget, over, bound, gap, objective := col("plan_budget"), col("over_budget"), col("lower_bound"), col("gap_pct"), col("design.objective")
	for _, rec := range recs[1:] {
		noBudget, noBound := rec[col("budget")] == "0", rec[objective] == "length"
		if (rec[budget] == "") != noBudget || (rec[over] == "") != noBudget || (rec[bound] == "") != noBound || (rec[gap] == "") != noBound {
			t.Errorf("compare.csv row %q: budget %q, over %q, bound %q, gap %q", rec[1], rec[budget], rec[over], rec[bound], rec[gap])
		}
	}

	// Two folders as an earlier spanwright wrote them (the base scenario's among them), one of
	// a format this one does not know; each with its outputs.sha256 as that version wrote it.
	sc := f.Scenarios()
	for _, s := range sc[:2] {
		writeSummary(t, dir, s.ID, before, oldSummary(t, before[s.ID+"/"+SummaryFile]))
	}
	writeSummary(t, dir, sc[3].ID, before, format99(t, before[sc[3].ID+"/"+SummaryFile]))
	rep := run(t, f, Options{Out: dir, Resume: true})
	if rep.Skipped != 1 {
		t.Errorf("resume over other summary formats: %d of %d kept, want 1", rep.Skipped, rep.Run)
	}
	want := "3 scenarios planned again, not kept: their summary.json files have no format member (written by an earlier spanwright; this one writes \"" +
		output.SummaryFormat + "\"): " + sc[0].ID + ", " + sc[1].ID + ", " + sc[3].ID
	if len(rep.Notes) != 1 || rep.Notes[0] != want {
		t.Errorf("notes %q\nwant [%q]", rep.Notes, want)
	}
	sameTree(t, "resumed over other summary formats", before, tree(t, dir))

	// Only the one of an unknown format.
	writeSummary(t, dir, sc[2].ID, before, format99(t, before[sc[2].ID+"/"+SummaryFile]))
	rep = run(t, f, Options{Out: dir, Resume: true})
	want = "1 scenario planned again, not kept: its summary.json is of format \"spanwright summary 99\" (written by another version; this one writes \"" +
		output.SummaryFormat + "\"): " + sc[2].ID
	if rep.Skipped != 3 || len(rep.Notes) != 1 || rep.Notes[0] != want {
		t.Errorf("resume over one summary of format 99: %d kept, notes %q; want 3 and [%q]", rep.Skipped, rep.Notes, want)
	}
	sameTree(t, "resumed over a summary of format 99", before, tree(t, dir))
}

// format99 is a summary.json of format "spanwright summary 99", a format this version does
// not write.
func format99(t *testing.T, data []byte) []byte {
	t.Helper()
	out := bytes.Replace(data, []byte(`"format": "`+output.SummaryFormat+`"`), []byte(`"format": "spanwright summary 99"`), 1)
	if bytes.Equal(out, data) {
		t.Fatal("summary.json does not hold its format")
	}
	return out
}

// writeSummary replaces scenario id's summary.json in the sweep folder dir by data, and its
// line in the folder's outputs.sha256 (as in before) by data's SHA-256, as the version that
// wrote data would have.
func writeSummary(t *testing.T, dir, id string, before map[string][]byte, data []byte) {
	t.Helper()
	if err := os.WriteFile(filepath.Join(dir, id, SummaryFile), data, 0o644); err != nil {
		t.Fatal(err)
	}
	oldSum, newSum := sha256.Sum256(before[id+"/"+SummaryFile]), sha256.Sum256(data)
	sums := before[id+"/"+OutputsFile]
	fixed := bytes.Replace(sums, []byte(hex.EncodeToString(oldSum[:])+"  "+SummaryFile), []byte(hex.EncodeToString(newSum[:])+"  "+SummaryFile), 1)
	if bytes.Equal(fixed, sums) {
		t.Fatalf("%s: %s does not list %s", id, OutputsFile, SummaryFile)
	}
	if err := os.WriteFile(filepath.Join(dir, id, OutputsFile), fixed, 0o644); err != nil {
		t.Fatal(err)
	}
}

// rowLine is the line of a rows file that holds the row of scenario id.
func rowLine(t *testing.T, data []byte, id string) string {
	t.Helper()
	for _, l := range strings.Split(string(data), "\n") {
		if strings.Contains(l, `"id":"`+id+`"`) {
			return l
		}
	}
	t.Fatalf("no row of %s", id)
	return ""
}

// TestRowsOtherFormat: a rows file of another format (format 1 wrote the gap as a fraction
// and 0 for no budget) is refused with its format named and what to do, never read as
// format 2; a file that is no rows file at all is still called that.
func TestRowsOtherFormat(t *testing.T) {
	t.Parallel()
	old := `{"format":"spanwright sweep rows 1","sweep":"ab","scenarios":1,"keys":["hub"]}` + "\n" +
		`{"index":0,"id":"a","set":[["hub","ADM"]],"status":"ok","total_cents":100,"budget_cents":0,"over_budget_cents":0,"infeasible_legs":0,"worst_margin_db":null,"new_trench_m":0,"diverse_links":0,"diverse_missing":0,"media_mix":"","warnings":0,"objective_cents":90,"lower_bound_cents":80,"gap":0.125}` + "\n"
	_, _, err := decodeRows("shard/rows.jsonl", strings.NewReader(old))
	if err == nil || !strings.Contains(err.Error(), `shard/rows.jsonl:1: sweep rows of format "spanwright sweep rows 1", written by another version of spanwright; this one reads "`+RowsFormat+`": run that sweep (or shard) again`) {
		t.Errorf("rows format 1: got %v", err)
	}
	_, _, err = decodeRows("x.jsonl", strings.NewReader(`{"format":"something else"}`+"\n"))
	if err == nil || !strings.Contains(err.Error(), "x.jsonl:1: not a sweep rows file") {
		t.Errorf("not a rows file: got %v", err)
	}
}
