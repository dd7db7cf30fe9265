package main

import (
	"os"
	"path/filepath"
	"regexp"
	"runtime/debug"
	"slices"
	"strconv"
	"strings"
	"testing"
)

// TestVersion checks --version and the formatting of build information in its cases: a
// tagged module, a checkout build ("(devel)", as the go command writes it), uncommitted
// changes, no revision, no build information.
func TestVersion(t *testing.T) {
	out, msg, code := run(t, "--version")
	if code != exitOK || !strings.HasPrefix(out, "spanwright version ") {
		t.Fatalf("--version: exit %d, %q %s", code, out, msg)
	}
	settings := func(kv ...string) []debug.BuildSetting {
		var s []debug.BuildSetting
		for i := 0; i < len(kv); i += 2 {
			s = append(s, debug.BuildSetting{Key: kv[i], Value: kv[i+1]})
		}
		return s
	}
	cases := []struct {
		name string
		info *debug.BuildInfo
		want string
	}{
		{"tagged", &debug.BuildInfo{Main: debug.Module{Version: "v1.2.3"},
			Settings: settings("vcs.revision", "0123456789abcdef0123", "vcs.time", "2026-12-03T10:00:00Z", "vcs.modified", "false")},
			"v1.2.3 (revision 0123456789ab, 2026-12-03T10:00:00Z)"},
		{"checkout with changes", &debug.BuildInfo{Main: debug.Module{Version: "(devel)"},
			Settings: settings("vcs.revision", "fedcba9876543210", "vcs.modified", "true")},
			"devel (revision fedcba987654, modified: built with uncommitted changes)"},
		{"no vcs", &debug.BuildInfo{Main: debug.Module{Version: "(devel)"}},
			"devel; no revision recorded: built outside a checkout, or with -buildvcs=false"},
		{"no version", &debug.BuildInfo{Settings: settings("vcs.revision", "abc")}, "devel (revision abc)"},
	}
	for _, tc := range cases {
		if got := versionText(tc.info, true); got != tc.want {
			t.Errorf("%s: got %q, want %q", tc.name, got, tc.want)
		}
	}
	if got := versionText(nil, false); !strings.HasPrefix(got, "unknown") {
		t.Errorf("no build information: got %q", got)
	}
}

// TestUnknownCommand checks that every way of naming a command spanwright lacks is a usage
// error (status 2) with a hint, including `--help NAME`, which urfave/cli v2 reports through
// App.CommandNotFound.
func TestUnknownCommand(t *testing.T) {
	cases := []struct {
		args []string
		hint string
	}{
		{[]string{"plna"}, "did you mean plan?"},
		{[]string{"sweeep", "x.yaml"}, "did you mean sweep?"},
		{[]string{"--help", "chek"}, "did you mean check?"},
		{[]string{"help", "mereg"}, "did you mean merge?"},
		{[]string{"frobnicate"}, "the commands are check, plan, demo, media, sweep, merge, starter"},
	}
	for _, tc := range cases {
		_, msg, code := run(t, tc.args...)
		if code != exitInvalid || !strings.Contains(msg, "unknown command") || !strings.Contains(msg, tc.hint) {
			t.Errorf("%v: exit %d, %q; want 2 and %q", tc.args, code, msg, tc.hint)
		}
	}
	if out, _, code := run(t, "help", "plan"); code != exitOK || !strings.Contains(out, "spanwright plan") {
		t.Errorf("help plan: exit %d, %q", code, out)
	}
}

// TestHelpListsExitStatuses checks that each command's help lists exactly the statuses of the
// table for it, and the program's help every status.
func TestHelpListsExitStatuses(t *testing.T) {
	for _, cmd := range append([]string{""}, allCommands...) {
		args := []string{"--help"}
		if cmd != "" {
			args = []string{cmd, "--help"}
		}
		out, msg, code := run(t, args...)
		if code != exitOK {
			t.Fatalf("%v: exit %d: %s", args, code, msg)
		}
		i := strings.Index(out, "EXIT STATUS")
		if i < 0 {
			t.Errorf("%v: no EXIT STATUS section", args)
			continue
		}
		for _, s := range exitStatuses {
			listed := strings.Contains(out[i:], "\n"+strings.Repeat(" ", 3)) &&
				containsStatus(out[i:], s.Code)
			want := cmd == "" || slices.ContainsFunc(exitStatuses, func(o exitStatus) bool {
				return o.Code == s.Code && slices.Contains(o.Commands, cmd) // a status may have a row per command group (3)
			})
			if listed != want {
				t.Errorf("spanwright %s --help: status %d listed %v, want %v", cmd, s.Code, listed, want)
			}
		}
	}
}

func containsStatus(help string, code int) bool {
	for _, l := range strings.Split(help, "\n") {
		f := strings.Fields(l)
		if len(f) > 1 && f[0] == strconv.Itoa(code) {
			return true
		}
	}
	return false
}

// TestExitTableInREADME checks that the README holds the table of exit statuses as the
// program prints it: one table, in one place.
func TestExitTableInREADME(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(readme), exitTableMarkdown()) {
		t.Errorf("README.md lacks the table of exit statuses as exitTableMarkdown writes it:\n%s", exitTableMarkdown())
	}
}

// singularCounts fails t when text (terminal output) gives a count of one with a plural noun
// ("1 handholes"), or lacks one of the phrases want: English grammar, no published source
// needed; the starter campus has one handhole where new pathway joins and one turn that
// needs a structure, which printed "1 handholes" and "1 junctions".
func singularCounts(t *testing.T, text string, want ...string) {
	t.Helper()
	for _, m := range regexp.MustCompile(`(?:^|[ (])1 ([a-z][a-z-]*s)\b`).FindAllStringSubmatch(text, -1) {
		t.Errorf("a count of one with a plural: %q in\n%s", strings.TrimSpace(m[0]), text)
	}
	for _, w := range want {
		if !strings.Contains(text, w) {
			t.Errorf("output lacks %q:\n%s", w, text)
		}
	}
}

// TestStarterCommand writes the starter files, plans them (status 0, priced from the
// template, so no demo-price warning), then refuses to write them again, naming each file.
func TestStarterCommand(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "mine")
	out, msg, code := run(t, "starter", dir)
	if code != exitOK {
		t.Fatalf("starter: exit %d: %s", code, msg)
	}
	if !strings.Contains(out, "next: spanwright plan") {
		t.Errorf("starter: output %q", out)
	}
	planOut, msg, code := run(t, "plan", filepath.Join(dir, "plan.yaml"), "--out", filepath.Join(dir, "out"))
	if code != exitOK {
		t.Fatalf("plan of the starter files: exit %d: %s\n%s", code, msg, planOut)
	}
	if strings.Contains(planOut, "demo price book") {
		t.Errorf("plan of the starter files warns of the demo price book:\n%s", planOut)
	}
	checkOut, msg, code := run(t, "check", filepath.Join(dir, "plan.yaml"))
	if code != exitOK {
		t.Fatalf("check of the starter files: exit %d: %s\n%s", code, msg, checkOut)
	}
	singularCounts(t, planOut+checkOut, "1 handhole where new pathway joins", "1 junction where a turn")
	before, _ := os.ReadFile(filepath.Join(dir, "plan.yaml"))
	os.WriteFile(filepath.Join(dir, "plan.yaml"), append(before, "# my edit\n"...), 0o644)
	_, msg, code = run(t, "starter", dir)
	if code != exitInvalid {
		t.Fatalf("starter again: exit %d, want 2: %s", code, msg)
	}
	for _, n := range []string{"campus.geojson", "plan.yaml", "prices.yaml"} {
		if !strings.Contains(msg, filepath.Join(dir, n)) {
			t.Errorf("starter again: message %q does not name %s", msg, n)
		}
	}
	if after, _ := os.ReadFile(filepath.Join(dir, "plan.yaml")); !strings.HasSuffix(string(after), "# my edit\n") {
		t.Error("starter again replaced the edited plan.yaml")
	}
}

// TestExitHelpEachStatusOnce: the program's help lists each status once (3 has a line per
// group of commands under one number), and a command's help gives only the clauses it can
// return: media and starter never speak of scenarios, merge rows or check's meaning of 3
// (tester 14 F11).
func TestExitHelpEachStatusOnce(t *testing.T) {
	seen := map[string]bool{}
	for _, l := range strings.Split(exitHelp(""), "\n")[1:] {
		f := strings.Fields(l)
		if len(l) > 7 && l[:7] != strings.Repeat(" ", 7) && len(f) > 0 {
			if seen[f[0]] {
				t.Errorf("status %s listed twice in the program's help:\n%s", f[0], exitHelp(""))
			}
			seen[f[0]] = true
		}
	}
	if len(seen) != 7 {
		t.Errorf("program's help lists %d statuses, want 7:\n%s", len(seen), exitHelp(""))
	}
	for _, cmd := range []string{"media", "starter", "check", "plan", "demo"} {
		h := exitHelp(cmd)
		for _, not := range []string{"scenario", "whole sweep", "for sweep", "for check"} {
			if strings.Contains(h, not) {
				t.Errorf("spanwright %s --help speaks of %q:\n%s", cmd, not, h)
			}
		}
	}
	if h := exitHelp("media"); strings.Contains(h, "could not be written") {
		t.Errorf("media writes no file, yet its help says an output could not be written:\n%s", h)
	}
	if h := exitHelp("merge"); !strings.Contains(h, "rows that do not make one whole sweep") {
		t.Errorf("merge's help lacks its own clause:\n%s", h)
	}
}
