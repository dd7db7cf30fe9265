// The cases use /dev/zero and a FIFO, which exist on unix systems only.

//go:build unix

package main

import (
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// TestBadInputFiles runs each command on an input that once slipped past validation or
// never finished reading, one fixture per case: each exits 2 at once, naming the file, the
// line and the key. Outside sources are named beside each case.
func TestBadInputFiles(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	// POSIX mkfifo(3): opening a FIFO for reading waits for a writer, which never comes.
	fifo := filepath.Join(dir, "campus.geojson")
	if err := syscall.Mkfifo(fifo, 0o644); err != nil {
		t.Fatal(err)
	}
	fifoPlan := write(t, dir, "fifo.yaml", "campus: [campus.geojson]\nhub: ADM\n")
	// The demo campus padded with spaces to 2 MiB: valid GeoJSON over a 1 MiB cap.
	demo, err := os.ReadFile("../../testdata/demo/campus.geojson")
	if err != nil {
		t.Fatal(err)
	}
	big := write(t, dir, "big.geojson", string(demo)+strings.Repeat(" ", 2<<20-len(demo)))
	base, err := filepath.Abs("../../testdata/demo/plan.yaml")
	if err != nil {
		t.Fatal(err)
	}
	sweepDup := write(t, dir, "dup.sweep.yaml", "base: "+base+"\nvary:\n  hub: [ADM, ENG]\n  hub: [LIB]\n")
	sweepNaN := write(t, dir, "nan.sweep.yaml", "base: "+base+"\nvary:\n  design.slack_m: [5, .nan]\n")
	catalog, err := os.ReadFile("../../media/catalog.yaml")
	if err != nil {
		t.Fatal(err)
	}
	hugeCatalog := write(t, dir, "huge-catalog.yaml", strings.Replace(string(catalog), "splice_db: 0.3", "splice_db: 1e308", 1))
	if !strings.Contains(string(catalog), "splice_db: 0.3") {
		t.Fatal("catalog.yaml: splice_db: 0.3 not found; update the case")
	}
	out := filepath.Join(dir, "out")

	cases := []struct {
		name string
		args []string
		want []string
	}{
		// Linux null(4): /dev/zero reads as zeros without end; it was read until memory ran out.
		{"campus a device", []string{"plan", "testdata/plans/campus_device.yaml", "--out", out}, []string{"/dev/zero: read: not a regular file but a character device"}},
		{"check a device", []string{"check", "/dev/zero"}, []string{"/dev/zero: read: not a regular file"}},
		{"campus a FIFO", []string{"plan", fifoPlan, "--out", out}, []string{fifo + ": read: not a regular file but a named pipe (FIFO)"}},
		{"plan a folder", []string{"check", dir + "/"}, []string{"not a regular file but a folder"}},
		// common practice, no published source: a 1 MiB cap, a 2 MiB file.
		{"over the cap", []string{"check", "--max-input-mb", "1", big}, []string{big + ": read: larger than the input limit of 1 MiB (raise it with --max-input-mb)"}},
		{"cap not a size", []string{"check", "--max-input-mb", "0", big}, []string{"--max-input-mb: want MiB from 1 to 1048576, got 0"}},
		// YAML 1.2.2 §3.2.1.1: the keys of a mapping are unique; yaml.v3 kept the last.
		{"hub given twice", []string{"plan", "testdata/plans/dup_hub.yaml", "--out", out}, []string{"dup_hub.yaml:5:1: hub: given twice, at line 3 and line 5; remove one"}},
		{"design key given twice", []string{"check", "testdata/plans/dup_design.yaml"}, []string{"dup_design.yaml:7:3: design.slack_m: given twice, at line 5 and line 7"}},
		{"axis given twice", []string{"sweep", sweepDup, "--out", out, "--quiet"}, []string{"dup.sweep.yaml:4:3: vary.hub: given twice, at line 3 and line 4"}},
		// RFC 8259 §4: names within an object SHOULD be unique; encoding/json keeps the last.
		{"property given twice", []string{"check", "../../testdata/bad/duplicate_property.geojson"}, []string{`feature #0 "B-1": property "riser_m": given twice, at line 2 and line 3`}},
		// IEEE 754: NaN fails every comparison, so "growth < 0" let it through.
		{"growth NaN", []string{"plan", "testdata/plans/nan_growth.yaml", "--out", out}, []string{"nan_growth.yaml:5:11: defaults.growth: want a fraction from 0 to 10, got NaN"}},
		{"growth huge", []string{"plan", "testdata/plans/huge_growth.yaml", "--out", out}, []string{"huge_growth.yaml:4:20: defaults.growth: want a fraction from 0 to 10, got 1e+308"}},
		// Go spec: int is 64 bits; strands times (1 + growth) overflowed.
		{"strands overflow", []string{"plan", "testdata/plans/huge_strands.yaml", "--out", out}, []string{"huge_strands.yaml:5:12: defaults.strands: want a whole number of strands from 1 to 10000, got 9223372036854775807"}},
		{"slack infinite", []string{"plan", "testdata/plans/inf_slack.yaml", "--out", out}, []string{"inf_slack.yaml:5:12: design.slack_m: want metres from 0 to 1000, got +Inf"}},
		{"slack NaN", []string{"plan", "testdata/plans/nan_slack.yaml", "--out", out}, []string{"nan_slack.yaml:5:12: design.slack_m: want metres from 0 to 1000, got NaN"}},
		{"lateral infinite", []string{"check", "testdata/plans/inf_lateral.yaml"}, []string{"inf_lateral.yaml:5:18: design.max_lateral_m: want metres above 0 and at most 1000, got +Inf"}},
		// YAML 1.2.2 §10.3.2 (core schema): a plain 3 is an integer and true a boolean, not
		// text; they were read as the notes "3" and "true". A quoted "3" is text and stays.
		{"notes not text, check", []string{"check", "testdata/plans/notes_not_text.yaml"}, []string{
			`notes_not_text.yaml:4:9: notes[0]: want text, got 3, which YAML reads as a number; quote it ("3") to keep it as written`,
			`notes_not_text.yaml:4:12: notes[1]: want text, got true, which YAML reads as true or false; quote it ("true") to keep it as written`,
			`notes_not_text.yaml:4:18: notes[2]: want text, got a mapping`}},
		{"notes not text, plan", []string{"plan", "testdata/plans/notes_not_text.yaml", "--out", out}, []string{
			`notes_not_text.yaml:4:9: notes[0]: want text, got 3`, `notes_not_text.yaml:4:12: notes[1]: want text, got true`,
			`notes_not_text.yaml:4:18: notes[2]: want text, got a mapping`}},
		{"sweep value NaN", []string{"sweep", sweepNaN, "--out", out, "--quiet"}, []string{"nan.sweep.yaml:3:23: vary: design.slack_m: want metres from 0 to 1000, got NaN"}},
		// TIA-568.3-D: a splice loses 0.3 dB at most; 1e308 dB is a slip, not a design.
		{"catalog loss huge", []string{"plan", "testdata/plans/ok.yaml", "--out", out, "--catalog", hugeCatalog}, []string{`huge-catalog.yaml:`, `huge-catalog.yaml:18:14: connections.splice_db: want dB from 0 to 100, got 1e+308`}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			stdout, msg, code := run(t, tc.args...)
			if code != exitInvalid {
				t.Errorf("%s: exit %d, want %d (%s)", tc.name, code, exitInvalid, msg)
			}
			for _, w := range tc.want {
				if !strings.Contains(stdout+msg, w) {
					t.Errorf("%s: output %q lacks %q", tc.name, stdout+msg, w)
				}
			}
		})
	}
	if _, err := os.Stat(out); err == nil {
		t.Errorf("a refused input left an output folder")
	}
}

// TestMaxInputRaised: the cap that refuses a file lets it through once raised.
func TestMaxInputRaised(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	demo, err := os.ReadFile("../../testdata/demo/campus.geojson")
	if err != nil {
		t.Fatal(err)
	}
	// 17 MiB: over the 16 MiB cap of YAML files, under the 512 MiB one of GeoJSON.
	big := write(t, dir, "big.geojson", string(demo)+strings.Repeat(" ", 17<<20))
	if _, msg, code := run(t, "check", big); code != exitOK {
		t.Fatalf("default cap: exit %d: %s", code, msg)
	}
	plan := write(t, dir, "plan.yaml", "campus: [big.geojson]\nhub: ADM\n"+strings.Repeat("# padding\n", 17<<20/10))
	if _, msg, code := run(t, "check", plan); code != exitInvalid || !strings.Contains(msg, "larger than the input limit of 16 MiB") {
		t.Errorf("17 MiB plan: exit %d: %s; want refused at 16 MiB", code, msg)
	}
	if _, msg, code := run(t, "check", "--max-input-mb", "18", plan); code != exitOK {
		t.Errorf("17 MiB plan, --max-input-mb 18: exit %d: %s", code, msg)
	}
}

func write(t *testing.T, dir, name, text string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}
