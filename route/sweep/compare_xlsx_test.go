package sweep

import (
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
)

// TestCompareWorkbookOpenpyxl reads compare.xlsx with openpyxl (Debian python3-openpyxl), a
// reader written independently of excelize: the override columns hold numbers and booleans
// where the setting is numeric or boolean (0.5, 6, true), text elsewhere, blank where the
// scenario keeps the base plan's value; and in data_only mode, which reads a formula's
// cached value (ECMA-376 Part 1 §18.3.1.96) as pandas and previewers do, the totals are the
// counts and costs of the rows, worked out here: 3 scenarios, 1 ok, 1 with infeasible legs,
// 1 failed, 1 Pareto optimal, lowest and highest cost of an ok scenario 1234.56: the
// infeasible one, cheaper and ranked 1 among those leaving its leg unserved (tester 10's
// finding 5), is ranked in a text cell the formulas pass over; and the planning-aid line
// (tester 12's finding 2) after them.
func TestCompareWorkbookOpenpyxl(t *testing.T) {
	t.Parallel()
	py := testplan.Openpyxl(t)
	keys := []string{"design.slack_m", "defaults.strands", "design.allow_new_trench", "hub", "prices"}
	rows := []Row{
		{Index: 0, ID: "s0", Set: [][2]string{{"design.slack_m", "0.5"}, {"defaults.strands", "6"}, {"design.allow_new_trench", "true"}, {"hub", "ADM"}, {"prices", "prices-low.yaml"}},
			Status: StatusOK, Currency: "USD", TotalCents: 123456},
		{Index: 1, ID: "s1", Set: [][2]string{{"design.slack_m", "2"}, {"design.allow_new_trench", "false"}, {"hub", "0042"}},
			Status: StatusInfeasible, Currency: "USD", TotalCents: 99999, InfeasibleLegs: 1, Unserved: []string{"ADM-B/diverse"}},
		{Index: 2, ID: "s2", Set: [][2]string{{"hub", "NOWHERE"}}, Status: StatusFailed, Error: "no building NOWHERE"},
	}
	files, err := Compare(rows, keys, "")
	if err != nil {
		t.Fatal(err)
	}
	var data []byte
	for _, f := range files {
		if f.Name == CompareXLSX {
			data = f.Data
		}
	}
	path := filepath.Join(t.TempDir(), CompareXLSX)
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	script := `import sys, openpyxl
wb = openpyxl.load_workbook(sys.argv[1], data_only=True)
ws = wb["scenarios"]
for row in ws.iter_rows(min_row=2, max_col=8, values_only=True):
    print(" ".join("%s:%r" % (type(v).__name__, v) for v in row[3:8]))
for row in wb["totals"].iter_rows(min_row=2, values_only=True):
    print("%s = %s:%r" % (row[0], type(row[1]).__name__, row[1]))
`
	out, err := exec.Command(py, "-c", script, path).CombinedOutput()
	if err != nil {
		t.Fatalf("openpyxl: %v\n%s", err, out)
	}
	want := `float:0.5 int:6 bool:True str:'ADM' str:'prices-low.yaml'
int:2 NoneType:None bool:False str:'0042' NoneType:None
NoneType:None NoneType:None NoneType:None str:'NOWHERE' NoneType:None
scenarios = int:3
ok = int:1
with infeasible legs = int:1
failed = int:1
pareto optimal = int:1
lowest total cost of a ranked scenario (USD) = float:1234.56
highest total cost of a ranked scenario (USD) = float:1234.56
planning aid = str:` + "'" + route.PlanningAid + "'" + `
`
	if string(out) != want {
		t.Errorf("openpyxl read:\n%s\nwant:\n%s", out, want)
	}

	// Without an ok scenario the cost totals are the empty text IFERROR gives.
	rows[0].Status = StatusFailed
	files, err = Compare(rows, keys, "")
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		if f.Name == CompareXLSX {
			data = f.Data
		}
	}
	if err := os.WriteFile(path, data, 0o644); err != nil {
		t.Fatal(err)
	}
	out, err = exec.Command(py, "-c", script, path).CombinedOutput()
	if err != nil {
		t.Fatalf("openpyxl: %v\n%s", err, out)
	}
	if !strings.Contains(string(out), "ok = int:0\n") || !strings.Contains(string(out), "lowest total cost of a ranked scenario (USD) = NoneType:None\n") {
		t.Errorf("openpyxl read without an ok scenario:\n%s", out)
	}
}
