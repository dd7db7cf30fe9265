package sweep

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"encoding/json"
	"errors"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
	"go.yaml.in/yaml/v3"

	"spanwright/route"
	"spanwright/route/fileset"
	"spanwright/route/output"
	"spanwright/route/plan"
)

func run(t *testing.T, f *File, opt Options) *Report {
	t.Helper()
	rep, err := Run(context.Background(), f, opt)
	if err != nil {
		t.Fatal(err)
	}
	return rep
}

// tree reads every file under dir by its slash path relative to dir.
func tree(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := os.ReadFile(p)
		rel, _ := filepath.Rel(dir, p)
		out[filepath.ToSlash(rel)] = data
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

func sameTree(t *testing.T, what string, a, b map[string][]byte) {
	t.Helper()
	var names []string
	for n := range a {
		names = append(names, n)
	}
	for n := range b {
		if _, ok := a[n]; !ok {
			names = append(names, n)
		}
	}
	sort.Strings(names)
	for _, n := range names {
		x, okx := a[n]
		y, oky := b[n]
		switch {
		case !okx || !oky:
			t.Errorf("%s: %s only in one tree", what, n)
		case !bytes.Equal(x, y):
			t.Errorf("%s: %s differs", what, n)
		}
	}
}

func TestRunSameBytesWhateverJobs(t *testing.T) {
	t.Parallel()
	f := load(t, "small.yaml")
	d1, d4 := t.TempDir(), t.TempDir()
	r1 := run(t, f, Options{Out: d1, Jobs: 1})
	r4 := run(t, f, Options{Out: d4, Jobs: 4})
	if r1.OK != 4 || r1.Infeasible != 1 || r1.Failed != 1 || r1.Run != 6 {
		t.Errorf("report: got %+v, want 4 ok, 1 infeasible, 1 failed of 6", r1)
	}
	if r4.OK != r1.OK || r4.Infeasible != r1.Infeasible || r4.Failed != r1.Failed {
		t.Errorf("jobs 4 report %+v differs from jobs 1 %+v", r4, r1)
	}
	t1, t4 := tree(t, d1), tree(t, d4)
	sameTree(t, "jobs 1 vs 4", t1, t4)
	for _, s := range f.Scenarios() {
		if s.Case == "bad-hub" {
			continue
		}
		for _, name := range []string{PlanFile, InputsFile, SummaryFile, "routes.geojson", "links.csv"} {
			if _, ok := t1[s.ID+"/"+name]; !ok {
				t.Errorf("%s: no %s", s.ID, name)
			}
		}
	}
	for _, name := range []string{CompareCSV, CompareMD, CompareXLSX, RowsFile} {
		if _, ok := t1[name]; !ok {
			t.Errorf("no %s", name)
		}
	}
}

// sha256sum returns the path of GNU sha256sum; it skips the test when there is none, except
// in CI.
func sha256sum(t *testing.T) string {
	t.Helper()
	path, err := exec.LookPath("sha256sum")
	if err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatal("sha256sum (GNU coreutils) is needed in CI")
		}
		t.Skip("sha256sum (GNU coreutils) not installed")
	}
	return path
}

func TestInputsFileChecksWithSha256sum(t *testing.T) {
	t.Parallel()
	path := sha256sum(t)
	f := load(t, "small.yaml")
	dir := t.TempDir()
	run(t, f, Options{Out: dir, Jobs: 2})
	sc := f.Scenarios()[0]
	cmd := exec.Command(path, "-c", InputsFile)
	cmd.Dir = filepath.Join(dir, sc.ID)
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("sha256sum -c: %v\n%s", err, out)
	}
	want := "plan.yaml: OK\n" + sc.ID // the campus line follows
	if !strings.HasPrefix(string(out), "plan.yaml: OK\n") || strings.Count(string(out), ": OK") != 2 {
		t.Errorf("sha256sum -c: got %q, want %q and the campus file OK", out, want[:14])
	}
}

// TestSumLineOddNames writes inputs.sha256 lines for file names holding a line feed, a
// carriage return or a backslash: GNU sha256sum must write the same lines and check them OK.
func TestSumLineOddNames(t *testing.T) {
	t.Parallel()
	path := sha256sum(t)
	// GNU coreutils manual, md5sum invocation: a name with a backslash or line feed is
	// escaped and its line begins with a backslash; coreutils 9.1 (installed here) escapes a
	// carriage return too; checked against the installed sha256sum itself
	cases := []string{"plain.geojson", "a\nb.geojson", "c\\d.geojson", "e\rf.geojson", "g\nffff  injected"}
	dir := t.TempDir()
	var sums bytes.Buffer
	for i, name := range cases {
		data := []byte{byte('a' + i)}
		if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
			t.Fatal(err)
		}
		h := sha256.Sum256(data)
		line := sumLine(hex.EncodeToString(h[:]), name)
		sums.WriteString(line)
		t.Run(name, func(t *testing.T) {
			cmd := exec.Command(path, "--", name)
			cmd.Dir = dir
			out, err := cmd.Output()
			if err != nil || string(out) != line {
				t.Errorf("%q: got %q, sha256sum writes %q (%v)", name, line, out, err)
			}
			if strings.Count(line, "\n") != 1 {
				t.Errorf("%q: %q is not one line", name, line)
			}
		})
	}
	if err := os.WriteFile(filepath.Join(dir, "inputs.sha256"), sums.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(path, "-c", "inputs.sha256")
	cmd.Dir = dir
	if out, err := cmd.CombinedOutput(); err != nil || strings.Count(string(out), ": OK") != len(cases) {
		t.Errorf("sha256sum -c: %v\n%s", err, out)
	}
}

func TestFailureRowAndOutcome(t *testing.T) {
	t.Parallel()
	f := load(t, "small.yaml")
	dir := t.TempDir()
	rep := run(t, f, Options{Out: dir, Jobs: 2})
	if len(rep.Failures) != 1 {
		t.Fatalf("got %d failures, want 1", len(rep.Failures))
	}
	fr := rep.Failures[0]
	wantErr := fr.ID + `/plan.yaml:8:6: hub: want the id of a building, got "NOWHERE", which no building has`
	if fr.Case != "bad-hub" || fr.Status != StatusFailed || fr.Error != wantErr {
		t.Errorf("failed row: got %+v, want case bad-hub with error %q", fr, wantErr)
	}
	got, err := os.ReadFile(filepath.Join(dir, fr.ID, ErrorFile))
	if err != nil || string(got) != wantErr+"\n" {
		t.Errorf("error.txt: got %q (%v)", got, err)
	}
	if _, err := os.Stat(filepath.Join(dir, fr.ID, SummaryFile)); err == nil {
		t.Errorf("a failed scenario has a summary")
	}
	csvFile, err := os.Open(filepath.Join(dir, CompareCSV))
	if err != nil {
		t.Fatal(err)
	}
	defer csvFile.Close()
	recs, err := csv.NewReader(csvFile).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	last, head := recs[len(recs)-1], recs[0]
	errCol := slices.Index(head, "error")
	if errCol < 0 || last[errCol] != wantErr || last[3] != "NOWHERE" || last[6] != StatusFailed {
		t.Errorf("compare.csv failure row: got %q", last)
	}
	if err := rep.Err(); !errors.Is(err, ErrScenarioFailed) || errors.Is(err, route.ErrInfeasible) {
		t.Errorf("outcome with a failure: got %v, want ErrScenarioFailed only", err)
	}
	// Without the failing case, the infeasible one decides.
	g := parseInline(t, "cases: [{name: all-diverse, defaults.redundancy: diverse}, {name: base}]")
	rep = run(t, g, Options{Out: t.TempDir(), Jobs: 2})
	if err := rep.Err(); !errors.Is(err, route.ErrInfeasible) || rep.Infeasible != 1 || rep.OK != 1 {
		t.Errorf("outcome with infeasible legs: got %v (%+v), want route.ErrInfeasible", err, rep)
	}
	rep = run(t, parseInline(t, "cases: [{name: base}]"), Options{Out: t.TempDir()})
	if err := rep.Err(); err != nil {
		t.Errorf("outcome of the base alone: got %v, want nil", err)
	}
}

// TestHubAxisCarriesItsLink: a sweep over the hub makes, in turn, a building the hub that the
// base plan gives a link entry of its own (the demo's LIB and TWR, both diverse). The
// scenario is planned (issue 13: the README's sweep example failed half its scenarios with
// "LIB is the hub"), and the entry is carried to the link between the two hubs the other way,
// from the scenario's hub to the base's, with its settings (tester 12's finding 13: dropped,
// the LIB alternative was priced without the diverse route the ADM one pays for, and read as
// lacking none): its plan.yaml says so at the entry, its row's note too, and every scenario
// asks for as many diverse links (diverse_links + diverse_missing) as the base. ANSI/TIA-568
// names no hub; a diverse route between two buildings is one requirement whichever end is
// the hub (common practice, no published source).
func TestHubAxisCarriesItsLink(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	f := parseInline(t, "vary: {hub: [ADM, LIB, TWR]}")
	rep := run(t, f, Options{Out: dir})
	if err := rep.Err(); err != nil {
		t.Fatalf("sweep over the hub: %v", err)
	}
	want := map[string]string{"ADM": "",
		"LIB": "links[0] (to LIB) carried to the link LIB-ADM, the other way: LIB is this scenario's hub and ADM the base plan's, so the link between them keeps the entry's settings (its redundancy among them)",
		"TWR": "links[3] (to TWR) carried to the link TWR-ADM, the other way: TWR is this scenario's hub and ADM the base plan's, so the link between them keeps the entry's settings (its redundancy among them)"}
	entry := map[string]string{"LIB": "{to: ADM, rate: 40G, redundancy: diverse, from: LIB}", "TWR": "{to: ADM, rate: 40G, redundancy: diverse, from: TWR}"}
	rows, err := os.ReadFile(filepath.Join(dir, CompareCSV))
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(bytes.NewReader(rows)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	hub, status, note := slices.Index(recs[0], "hub"), slices.Index(recs[0], "status"), slices.Index(recs[0], "note")
	dl, dm := slices.Index(recs[0], "diverse_links"), slices.Index(recs[0], "diverse_missing")
	if len(recs) != 4 || hub < 0 || status < 0 || note < 0 {
		t.Fatalf("compare.csv: %q", recs)
	}
	asked := func(r []string) int { a, _ := strconv.Atoi(r[dl]); b, _ := strconv.Atoi(r[dm]); return a + b }
	for i, r := range recs[1:] {
		if r[status] != StatusOK || r[note] != want[r[hub]] {
			t.Errorf("hub %s: status %q, note %q; want ok and %q", r[hub], r[status], r[note], want[r[hub]])
		}
		if asked(r) != asked(recs[1]) {
			t.Errorf("hub %s: %d diverse links asked for, the base %d", r[hub], asked(r), asked(recs[1]))
		}
		planData, err := os.ReadFile(filepath.Join(dir, f.Scenarios()[i].ID, PlanFile))
		if err != nil {
			t.Fatal(err)
		}
		if e := entry[r[hub]]; e != "" && !strings.Contains(string(planData), e+" # carried by the sweep from {to: "+r[hub]+"}") {
			t.Errorf("hub %s: plan.yaml lacks %q:\n%s", r[hub], e, planData)
		}
		// The scenario's own outputs say it, not only the comparison (review 17 F6): its
		// summary.json's notes (and so the terminal and the report's Notes, which print
		// route.Result.Notes), and its plan.yaml planned alone says it too (plan.Plan.Notes),
		// so that `spanwright plan` of it still writes the scenario's files byte for byte.
		data, err := os.ReadFile(filepath.Join(dir, f.Scenarios()[i].ID, "summary.json"))
		if err != nil {
			t.Fatal(err)
		}
		var sum output.Summary
		if err := json.Unmarshal(data, &sum); err != nil {
			t.Fatal(err)
		}
		if w := want[r[hub]]; w != "" && !slices.Contains(sum.Notes, w) || w == "" && len(sum.Notes) > 0 {
			t.Errorf("hub %s: summary.json notes %q, want %q among them", r[hub], sum.Notes, w)
		}
		p, err := plan.LoadPlan(filepath.Join(dir, f.Scenarios()[i].ID, PlanFile))
		if err != nil {
			t.Fatal(err)
		}
		if w := want[r[hub]]; w != "" && !slices.Equal(p.Notes, []string{w}) {
			t.Errorf("hub %s: plan.yaml's notes %q, want %q", r[hub], p.Notes, w)
		}
	}
}

func TestResume(t *testing.T) {
	t.Parallel()
	// The sweep's own copy of a price book, so the test can change it.
	tmp := t.TempDir()
	prices, err := os.ReadFile(filepath.Join(fixtures, "prices-low.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(tmp, "a.yaml"), prices, 0o644)
	os.WriteFile(filepath.Join(tmp, "b.yaml"), prices, 0o644)
	base, _ := filepath.Abs("../../testdata/demo/plan.yaml")
	src := "base: " + base + "\nvary:\n  hub: [ADM, ENG]\n  prices: [a.yaml, b.yaml]\ncases: [{name: bad-hub, hub: NOWHERE}]\n"
	sweepFile := filepath.Join(tmp, "s.yaml")
	os.WriteFile(sweepFile, []byte(src), 0o644)
	f, err := Load(sweepFile)
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(tmp, "out")
	run(t, f, Options{Out: out, Jobs: 2})
	first := tree(t, out)

	rep := run(t, f, Options{Out: out, Jobs: 2, Resume: true})
	if rep.Skipped != 4 { // the failed scenario is planned again
		t.Errorf("resume, nothing changed: skipped %d, want 4", rep.Skipped)
	}
	sameTree(t, "resumed", first, tree(t, out))

	// Change one price book: the two scenarios using it are planned again.
	os.WriteFile(filepath.Join(tmp, "b.yaml"), bytes.Replace(prices, []byte("hourly_rate: 92.00"), []byte("hourly_rate: 99.00"), 1), 0o644)
	f, _ = Load(sweepFile)
	rep = run(t, f, Options{Out: out, Jobs: 2, Resume: true})
	if rep.Skipped != 2 {
		t.Errorf("resume after a price change: skipped %d, want 2", rep.Skipped)
	}
	// A damaged inputs file makes its scenario run again too.
	id := f.Scenarios()[0].ID
	os.WriteFile(filepath.Join(out, id, InputsFile), []byte("0  plan.yaml\n"), 0o644)
	rep = run(t, f, Options{Out: out, Jobs: 1, Resume: true})
	if rep.Skipped != 3 {
		t.Errorf("resume after damage: skipped %d, want 3", rep.Skipped)
	}
	after := tree(t, out)
	if !bytes.Equal(after[id+"/"+InputsFile], first[id+"/"+InputsFile]) {
		t.Errorf("the damaged scenario was not written again")
	}
	// A file removed by hand makes its scenario run again, and it is written back the same.
	id1 := f.Scenarios()[1].ID
	os.Remove(filepath.Join(out, id1, "links.csv"))
	rep = run(t, f, Options{Out: out, Jobs: 1, Resume: true})
	if rep.Skipped != 3 {
		t.Errorf("resume after a file was removed: skipped %d, want 3", rep.Skipped)
	}
	if got := tree(t, out); !bytes.Equal(got[id1+"/links.csv"], after[id1+"/links.csv"]) {
		t.Errorf("the scenario missing links.csv was not written again as it was")
	}
	// A run that writes more files than the one before (a report: --full) plans every
	// scenario again rather than keep folders without them.
	extra := func(ctx context.Context, r *route.Result) ([]fileset.OutputFile, error) {
		return []fileset.OutputFile{{Name: "report.html", Data: []byte("<p>report</p>\n")}}, nil
	}
	rep = run(t, f, Options{Out: out, Jobs: 1, Resume: true, Extra: extra})
	if rep.Skipped != 0 {
		t.Errorf("resume with a report added: skipped %d, want 0", rep.Skipped)
	}
	rep = run(t, f, Options{Out: out, Jobs: 1, Resume: true, Extra: extra})
	if rep.Skipped != 4 {
		t.Errorf("resume with the report, again: skipped %d, want 4", rep.Skipped)
	}
	run(t, f, Options{Out: out, Jobs: 2})
	after = tree(t, out)
	// The resumed comparison is the one a fresh sweep writes.
	fresh := filepath.Join(tmp, "fresh")
	run(t, f, Options{Out: fresh, Jobs: 2})
	sameTree(t, "resumed vs fresh", tree(t, fresh), after)
}

func TestShardAndMerge(t *testing.T) {
	t.Parallel()
	f := load(t, "small.yaml")
	whole := t.TempDir()
	run(t, f, Options{Out: whole, Jobs: 2})
	want := tree(t, whole)

	// Three shards in three folders, and the same three in one shared folder.
	root := t.TempDir()
	shared := filepath.Join(root, "shared")
	var dirs []string
	for i := 1; i <= 3; i++ {
		d := filepath.Join(root, "shard", string(rune('0'+i)))
		dirs = append(dirs, d)
		rep := run(t, f, Options{Out: d, Jobs: 2, Shard: Shard{i, 3}})
		if rep.Run != 2 || rep.Scenarios != 6 {
			t.Errorf("shard %d/3: ran %d of %d, want 2 of 6", i, rep.Run, rep.Scenarios)
		}
		run(t, f, Options{Out: shared, Jobs: 1, Shard: Shard{i, 3}})
		if _, err := os.Stat(filepath.Join(d, CompareCSV)); err == nil {
			t.Errorf("shard %d wrote a comparison", i)
		}
	}
	for _, tc := range []struct {
		name string
		dirs []string
	}{{"separate folders", dirs}, {"shared folder", []string{shared}}} {
		t.Run(tc.name, func(t *testing.T) {
			out := filepath.Join(t.TempDir(), "merged")
			rep, err := Merge(tc.dirs, out, nil)
			if err != nil {
				t.Fatal(err)
			}
			if rep.OK != 4 || rep.Failed != 1 || rep.Infeasible != 1 {
				t.Errorf("merge report: %+v", rep)
			}
			got := tree(t, out)
			for _, name := range []string{CompareCSV, CompareMD, CompareXLSX, RowsFile} {
				if !bytes.Equal(got[name], want[name]) {
					t.Errorf("%s: merged %s differs from the unsharded one", tc.name, name)
				}
			}
		})
	}
	// The shared folder holds the same scenario outputs as the unsharded sweep (plan.yaml and
	// inputs.sha256 name files relative to the output folder, which sits elsewhere).
	sh := tree(t, shared)
	for name, data := range want {
		base := filepath.Base(name)
		if strings.Contains(name, "/") && base != PlanFile && base != InputsFile && !bytes.Equal(sh[name], data) {
			t.Errorf("shared shard folder: %s differs", name)
		}
	}
	// Merging into the shared folder itself works too.
	if _, err := Merge([]string{shared}, shared, nil); err != nil {
		t.Errorf("merge into a shard folder: %v", err)
	}

	t.Run("shard with no scenarios", func(t *testing.T) {
		d := t.TempDir()
		rep := run(t, f, Options{Out: d, Shard: Shard{7, 8}})
		if rep.Run != 0 || rep.Err() != nil {
			t.Errorf("shard 7/8 of 6: got %+v", rep)
		}
		if _, err := os.Stat(filepath.Join(d, "rows-7-of-8.jsonl")); err != nil {
			t.Errorf("no rows file: %v", err)
		}
	})
	t.Run("missing shard", func(t *testing.T) {
		_, err := Merge(dirs[:2], filepath.Join(t.TempDir(), "m"), nil)
		if !errors.Is(err, ErrMerge) || !strings.Contains(err.Error(), "2 of 6 scenarios missing: #2, #5") {
			t.Errorf("got %v, want missing #2, #5", err)
		}
	})
	t.Run("other sweep", func(t *testing.T) {
		other := t.TempDir()
		run(t, parseInline(t, "cases: [{name: base}]"), Options{Out: other})
		_, err := Merge(append([]string{other}, dirs...), filepath.Join(t.TempDir(), "m"), nil)
		if !errors.Is(err, ErrMerge) || !strings.Contains(err.Error(), "rows of another sweep") {
			t.Errorf("got %v, want rows of another sweep", err)
		}
	})
	t.Run("not a sweep folder", func(t *testing.T) {
		_, err := Merge([]string{t.TempDir()}, filepath.Join(t.TempDir(), "m"), nil)
		if !errors.Is(err, ErrMerge) || !strings.Contains(err.Error(), "no rows file") {
			t.Errorf("got %v, want no rows file", err)
		}
	})
}

func TestCancel(t *testing.T) {
	t.Parallel()
	f := load(t, "sweep.yaml")
	dir := t.TempDir()
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	_, err := Run(ctx, f, Options{Out: dir, Jobs: 2, Progress: func(p Progress) {
		if p.Done == 3 {
			cancel()
		}
	}})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("got %v, want context.Canceled", err)
	}
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	complete := 0
	for _, e := range ents {
		n := e.Name()
		if strings.Contains(n, ".tmp-") || !e.IsDir() {
			t.Errorf("left after cancel: %s", n)
			continue
		}
		files := tree(t, filepath.Join(dir, n))
		_, failed := files[ErrorFile]
		_, planned := files[SummaryFile]
		_, inputs := files[InputsFile]
		_, routes := files["routes.geojson"]
		if _, plan := files[PlanFile]; !plan || !(failed || planned && inputs && routes) {
			t.Errorf("%s: incomplete scenario folder: %d files", n, len(files))
		}
		complete++
	}
	if complete < 3 || complete == len(f.Scenarios()) {
		t.Errorf("got %d scenario folders, want at least the 3 finished and not all %d", complete, len(f.Scenarios()))
	}
	// Resuming finishes the sweep and keeps what was done.
	rep := run(t, f, Options{Out: dir, Jobs: 2, Resume: true})
	if rep.Skipped < 2 || rep.OK+rep.Infeasible+rep.Failed != len(f.Scenarios()) {
		t.Errorf("resume after cancel: %+v", rep)
	}
}

func TestCompareXLSX(t *testing.T) {
	t.Parallel()
	f := load(t, "small.yaml")
	dir := t.TempDir()
	run(t, f, Options{Out: dir, Jobs: 2})
	h, rows, err := readRows(filepath.Join(dir, RowsFile))
	if err != nil || len(rows) != 6 || h.Scenarios != 6 {
		t.Fatalf("rows.jsonl: %d rows, %+v, %v", len(rows), h, err)
	}
	x, err := excelize.OpenFile(filepath.Join(dir, CompareXLSX))
	if err != nil {
		t.Fatal(err)
	}
	defer x.Close()
	all, err := x.GetRows("scenarios", excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	head := all[0]
	col := func(name string) int {
		for i, h := range head {
			if h == name {
				return i
			}
		}
		t.Fatalf("no column %q in %v", name, head)
		return -1
	}
	cur := rows[0].Currency
	if cur == "" {
		t.Fatal("the demo's price book gives no currency")
	}
	cost, status, pareto, rank := col("total cost ("+cur+")"), col("status"), col("pareto optimal"), col("rank by cost")
	served := col("total cost of the served legs only (" + cur + ")")
	col("worst loss margin (dB)")
	col("new trench (m)")
	col("hub")
	col("defaults.rate")
	if len(all) != 7 {
		t.Fatalf("got %d sheet rows, want header and 6", len(all))
	}
	js := judge(rows)
	for i, r := range rows {
		cells := all[i+1]
		if cells[1] != r.ID || cells[status] != r.Status {
			t.Errorf("row %d: got id %q status %q, want %q %q", i, cells[1], cells[status], r.ID, r.Status)
		}
		ref := func(c int) string { return cellRef(c, i+2) }
		if r.Status == StatusInfeasible {
			// A total of the served legs only: under its own header, not total cost's (tester 15 F7).
			cost, served = served, cost
		}
		if r.Status == StatusFailed {
			if len(cells) > cost && cells[cost] != "" {
				t.Errorf("failed row %d has a cost %q", i, cells[cost])
			}
			continue
		}
		typ, _ := x.GetCellType("scenarios", ref(cost))
		if typ != excelize.CellTypeUnset { // a number
			t.Errorf("row %d: cost stored as %v, want a number", i, typ)
		}
		if want := money(r.TotalCents); strings.TrimRight(strings.TrimRight(want, "0"), ".") != strings.TrimRight(strings.TrimRight(cells[cost], "0"), ".") {
			t.Errorf("row %d: cost %s, want %s", i, cells[cost], want)
		}
		if shown, _ := x.GetCellValue("scenarios", ref(cost)); shown != money(r.TotalCents) {
			t.Errorf("row %d: cost shown as %q, want %q", i, shown, money(r.TotalCents))
		}
		if len(cells) > served && cells[served] != "" {
			t.Errorf("row %d (%s): %q under the other total's header", i, r.Status, cells[served])
		}
		if r.Status == StatusInfeasible {
			cost, served = served, cost
		}
		if r.Status == StatusOK {
			wantP := map[bool]string{true: "1", false: "0"}[js[i].pareto]
			if cells[pareto] != wantP || cells[rank] == "" {
				t.Errorf("row %d: pareto %q rank %q, want %q and a rank", i, cells[pareto], cells[rank], wantP)
			}
		}
	}
	// The totals sheet counts with formulas; excelize's calculator checks them.
	checks := map[string]string{"B2": "6", "B3": "4", "B4": "1", "B5": "1"}
	for ref, want := range checks {
		if v, err := x.CalcCellValue("totals", ref); err != nil || v != want {
			f, _ := x.GetCellFormula("totals", ref)
			t.Errorf("totals!%s (%s): got %q (%v), want %s", ref, f, v, err, want)
		}
	}
	var cheapest int64 = -1
	for _, r := range rows {
		if r.Status == StatusOK && (cheapest < 0 || r.TotalCents < cheapest) {
			cheapest = r.TotalCents
		}
	}
	if v, err := x.CalcCellValue("totals", "B7"); err != nil || v != strings.TrimSuffix(strings.TrimRight(money(cheapest), "0"), ".") && v != money(cheapest) {
		t.Errorf("lowest cost formula: got %q (%v), want %s", v, err, money(cheapest))
	}
}

func cellRef(col, row int) string {
	name, _ := excelize.CoordinatesToCellName(col+1, row)
	return name
}

// TestCloneNode checks that a scenario's copy of the base plan encodes as the original, anchors
// and aliases included, and that editing the copy leaves the original as it was.
func TestCloneNode(t *testing.T) {
	t.Parallel()
	src := "# head\nname: x # side\nd: &d {rate: 10G}\nlinks:\n  - *d\n  - {to: A}\n"
	var doc yaml.Node
	if err := yaml.Unmarshal([]byte(src), &doc); err != nil {
		t.Fatal(err)
	}
	enc := func(n *yaml.Node) string {
		out, err := yaml.Marshal(n)
		if err != nil {
			t.Fatal(err)
		}
		return string(out)
	}
	want := enc(&doc)
	c := cloneNode(&doc)
	if got := enc(c); got != want {
		t.Errorf("copy encodes as\n%s\nwant\n%s", got, want)
	}
	links := c.Content[0].Content[5]
	if links.Content[0].Alias != c.Content[0].Content[3] {
		t.Error("the copy's alias points outside the copy")
	}
	c.Content[0].Content[1].Value = "changed"
	c.Content[0].Content[3].Content[1].Value = "25G"
	if got := enc(&doc); got != want {
		t.Errorf("editing the copy changed the original:\n%s", got)
	}
}

// TestBuiltInsInPlan checks that a scenario's plan names, with their hashes, the embedded
// files it reads (so that --resume plans again when a new build changes them), and leaves out
// those the scenario names itself. The hashes are checked against the files in media/.
func TestBuiltInsInPlan(t *testing.T) {
	t.Parallel()
	sum := func(path string) string {
		data, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		s := sha256.Sum256(data)
		return hex.EncodeToString(s[:])[:16]
	}
	f := parseInline(t, "cases: [{name: own, prices: prices-low.yaml}, {name: embedded}]")
	out := t.TempDir()
	run(t, f, Options{Out: out})
	files := tree(t, out)
	own, embedded := string(files[f.Scenarios()[0].ID+"/"+PlanFile]), string(files[f.Scenarios()[1].ID+"/"+PlanFile])
	for _, w := range []string{"built-in catalog sha256 " + sum("../../media/catalog.yaml"), "built-in rules sha256 " + sum("../../media/rules.yaml")} {
		if !strings.Contains(own, w) || !strings.Contains(embedded, w) {
			t.Errorf("scenario plans should both say %q:\n%s\n%s", w, own, embedded)
		}
	}
	prices := "built-in prices sha256 " + sum("../../media/prices-demo.yaml")
	if !strings.Contains(embedded, prices) {
		t.Errorf("the scenario on the built-in price book should say %q:\n%s", prices, embedded)
	}
	if strings.Contains(own, "built-in prices") {
		t.Errorf("the scenario with its own price book names the built-in one:\n%s", own)
	}
}

// TestCablesPerDuctAxis: a sweep may vary design.cables_per_duct like any design setting
// (override.go), and its rows differ where it does: on the demo campus three loose cables a
// duct (the default, common practice, no published source) lay ducts and trench beside banks
// that the NFPA 70 Chapter 9 Table 1 fill alone (0) does not, so the plan of 3 costs more.
// Each scenario's summary.json says what the count laid (count_laid_cents: 0 without it).
func TestCablesPerDuctAxis(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	rep := run(t, parseInline(t, "vary: {design.cables_per_duct: [0, 3]}"), Options{Out: dir})
	if err := rep.Err(); err != nil {
		t.Fatalf("sweep over cables_per_duct: %v", err)
	}
	data, err := os.ReadFile(filepath.Join(dir, CompareCSV))
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(bytes.NewReader(data)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	key, total, status := slices.Index(recs[0], "design.cables_per_duct"), slices.Index(recs[0], "total_cost"), slices.Index(recs[0], "status")
	if len(recs) != 3 || key < 0 || total < 0 || status < 0 {
		t.Fatalf("compare.csv: %q", recs)
	}
	cost := map[string]float64{}
	for _, r := range recs[1:] {
		if r[status] != StatusOK {
			t.Errorf("cables_per_duct %s: status %q", r[key], r[status])
		}
		v, err := strconv.ParseFloat(r[total], 64)
		if err != nil {
			t.Fatalf("cables_per_duct %s: total %q: %v", r[key], r[total], err)
		}
		cost[r[key]] = v
	}
	if !(cost["3"] > cost["0"]) {
		t.Errorf("total cost with 3 loose cables a duct %.2f, with the fill alone %.2f: want the count dearer", cost["3"], cost["0"])
	}
	laid := map[int]int64{}
	err = filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.Name() != "summary.json" {
			return err
		}
		b, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		var s struct {
			PerDuct int   `json:"cables_per_duct"`
			Cents   int64 `json:"count_laid_cents"`
		}
		if err := json.Unmarshal(b, &s); err != nil {
			return err
		}
		laid[s.PerDuct] = s.Cents
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(laid) != 2 || laid[0] != 0 || laid[3] <= 0 {
		t.Errorf("summary.json count_laid_cents by cables_per_duct %v, want 0 for 0 and more for 3", laid)
	}
}

// TestCarryHubLink: only an entry for the scenario's hub with no from (or from itself) is
// carried the other way; a skip stays dropped, and an entry of the plan for the base's hub
// already wins (site.Site.Links then drops the other, with its note); the same hub carries
// nothing. A base plan that names no hub has the campus's building with role mc for its hub
// (site.Site.Hub): the entry is carried to it all the same (review 17 F2).
func TestCarryHubLink(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name, base, scenario, want string
		baseHub                    string
	}{
		{"the base names none: its mc", "links: [{to: LIB, redundancy: diverse}]", "hub: LIB\nlinks: [{to: LIB, redundancy: diverse}]",
			"{to: ADM, redundancy: diverse, from: LIB}", "ADM"},
		{"carried", "hub: ADM\nlinks: [{to: LIB, redundancy: diverse}]", "hub: LIB\nlinks: [{to: LIB, redundancy: diverse}]",
			"{to: ADM, redundancy: diverse, from: LIB}", ""},
		{"same hub", "hub: ADM\nlinks: [{to: LIB, redundancy: diverse}]", "hub: ADM\nlinks: [{to: LIB, redundancy: diverse}]", "", ""},
		{"skip stays dropped", "hub: ADM\nlinks: [{to: LIB, skip: true}]", "hub: LIB\nlinks: [{to: LIB, skip: true}]", "", ""},
		{"the base's hub has its own", "hub: ADM\nlinks: [{to: LIB}, {to: ADM, rate: 1G}]", "hub: LIB\nlinks: [{to: LIB}, {to: ADM, rate: 1G}]", "", ""},
		{"from another building stays", "hub: ADM\nlinks: [{to: LIB, from: ENG}]", "hub: LIB\nlinks: [{to: LIB, from: ENG}]", "", ""},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			var base, sc yaml.Node
			if err := yaml.Unmarshal([]byte(tc.base), &base); err != nil {
				t.Fatal(err)
			}
			if err := yaml.Unmarshal([]byte(tc.scenario), &sc); err != nil {
				t.Fatal(err)
			}
			note := carryHubLink(sc.Content[0], base.Content[0], tc.baseHub)
			out, err := yaml.Marshal(&sc)
			if err != nil {
				t.Fatal(err)
			}
			if got := strings.Contains(string(out), tc.want) && (note != "") == (tc.want != ""); !got || (tc.want == "" && strings.Contains(string(out), "carried")) {
				t.Errorf("%s: note %q, plan:\n%s\nwant %q", tc.name, note, out, tc.want)
			}
		})
	}
}

// TestCarryHubLinkMainCrossConnect: the demo plan without its hub key (ADM is the campus's
// building with role mc, so the hub all the same), swept over hub [ADM, LIB]: the LIB
// scenario's plan carries the diverse ADM-LIB entry the other way, as it does when the plan
// names its hub (review 17 F2: it was dropped, and the LIB row priced without that link).
func TestCarryHubLinkMainCrossConnect(t *testing.T) {
	t.Parallel()
	src, err := os.ReadFile("../../testdata/demo/plan.yaml")
	if err != nil {
		t.Fatal(err)
	}
	campus, err := filepath.Abs("../../testdata/demo/campus.geojson")
	if err != nil {
		t.Fatal(err)
	}
	body := strings.Replace(strings.Replace(string(src), "hub: ADM\n", "", 1), "campus: [campus.geojson]", "campus: ["+campus+"]", 1)
	if body == string(src) || strings.Contains(body, "hub: ADM") {
		t.Fatal("the demo plan no longer has the lines this test edits")
	}
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "plan.yaml"), []byte(body), 0o644); err != nil {
		t.Fatal(err)
	}
	f, err := Parse(filepath.Join(dir, "sweep.yaml"), []byte("base: plan.yaml\nvary: {hub: [ADM, LIB]}\n"))
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(dir, "out")
	run(t, f, Options{Out: out, Write: output.WriteOptions{SkipWorkbook: true, SkipGeoPackage: true}})
	var lib string
	for _, sc := range f.Scenarios() {
		if strings.HasPrefix(sc.ID, "lib") {
			lib = sc.ID
		}
	}
	data, err := os.ReadFile(filepath.Join(out, lib, PlanFile))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(data), "{to: ADM, rate: 40G, redundancy: diverse, from: LIB}") {
		t.Errorf("scenario %s: the diverse ADM-LIB entry is not carried:\n%s", lib, data)
	}
}
