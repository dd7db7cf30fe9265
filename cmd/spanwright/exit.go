package main

import (
	"context"
	"errors"
	"fmt"
	"os"
	"os/signal"
	"slices"
	"strings"
	"sync/atomic"
	"syscall"
)

// Exit statuses. 130 and 143 (stopped by a signal) are set by main.
const (
	exitOK          = 0
	exitInternal    = 1 // a bug in spanwright
	exitInvalid     = 2 // invalid input or usage, an output that would overwrite an input
	exitInfeasible  = 3 // finished, but some links are infeasible
	exitEnvironment = 4 // the machine refused: an output could not be written, a file not read
	exitInterrupt   = 130
	exitTerminate   = 143
)

// exitStatus is one row of the table of exit statuses: the status, what it means, and the
// commands that can return it ("" for spanwright with no command or with --version). A
// status whose meaning differs between commands has a row per group of them (3, 4); a
// clause that only some of a row's commands can give is an exitClause of the row, shown in
// those commands' help only (tester 14 F11).
type exitStatus struct {
	Code     int
	Meaning  string
	Clauses  []exitClause // added to Meaning for their commands
	Tail     string       // after the meaning and its clauses, for every command of the row
	Commands []string
}

// exitClause is part of a status's meaning that only some of its commands can give.
type exitClause struct {
	Text     string
	Commands []string
}

// allCommands are the commands, in the order help lists them.
var allCommands = []string{"check", "plan", "demo", "media", "sweep", "merge", "starter"}

// exitStatuses is the one table of exit statuses: every help text and the README's table
// ("Exit status") are made from it (TestExitTableInREADME keeps the README in step).
var exitStatuses = []exitStatus{
	{Code: exitOK, Meaning: "done", Commands: append([]string{""}, allCommands...),
		Clauses: []exitClause{{"every scenario planned with all legs feasible", []string{"sweep", "merge"}}}},
	{Code: exitInternal, Meaning: "internal error: a bug in spanwright, please report it", Commands: append([]string{""}, allCommands...)},
	{Code: exitInvalid, Meaning: "invalid input or usage: an unknown command, flag or argument",
		Clauses: []exitClause{
			{"an invalid file (every problem listed at once)", []string{"check", "plan", "media", "sweep", "merge"}},
			{"an output that would replace an input or an existing file", []string{"plan", "demo", "sweep", "merge", "starter"}},
			{"an --out folder holding a sub-folder", []string{"plan", "demo"}},
			{"a scenario that failed", []string{"sweep", "merge"}},
			{"rows that do not make one whole sweep", []string{"merge"}},
		},
		Tail: "running the same command again cannot succeed", Commands: append([]string{""}, allCommands...)},
	{Code: exitInfeasible, Meaning: "finished, but some links are infeasible (listed with their reasons; everything else is written)",
		Commands: []string{"plan", "sweep", "merge"}},
	{Code: exitInfeasible, Meaning: "checked, but a plan would leave some links infeasible: buildings that cannot reach the hub " +
		"or reach it only through a building routes may not cross, diverse links with no second route (listed in the report above)",
		Commands: []string{"check"}},
	{Code: exitEnvironment, Meaning: "the machine refused:",
		Clauses: []exitClause{
			{"an output could not be written (disk full, quota, no permission, read-only file system, --out names a file)",
				[]string{"plan", "demo", "sweep", "merge", "starter"}},
			{"an input could not be read (no permission, I/O error)", []string{"check", "plan", "media", "sweep", "merge"}},
		},
		Tail: "the same command may succeed once that is put right", Commands: allCommands},
	{Code: exitInterrupt, Meaning: "stopped by Ctrl-C (SIGINT), nothing left half-written", Commands: []string{"check", "plan", "demo", "sweep"}},
	{Code: exitTerminate, Meaning: "stopped by SIGTERM, nothing left half-written", Commands: []string{"check", "plan", "demo", "sweep"}},
}

// text is the status's meaning for command, or for the whole program when command is "":
// the meaning with the clauses that command can give (for the program, every clause, each
// naming its commands when they are not all of the row's), and the tail.
func (s exitStatus) text(command string) string {
	var parts []string
	for _, c := range s.Clauses {
		switch {
		case command == "" && len(c.Commands) < len(s.Commands)-1:
			who := "for " + andList(c.Commands)
			if t, ok := strings.CutSuffix(c.Text, ")"); ok {
				parts = append(parts, t+"; "+who+")")
			} else {
				parts = append(parts, c.Text+" ("+who+")")
			}
		case command == "" || slices.Contains(c.Commands, command):
			parts = append(parts, c.Text)
		}
	}
	t := s.Meaning
	if len(parts) > 0 {
		sep := ", "
		if strings.HasSuffix(t, ":") {
			sep = " "
		}
		join := ", "
		if strings.HasSuffix(t, ":") {
			join = " or "
		}
		t += sep + strings.Join(parts, join)
	}
	if s.Tail != "" {
		t += "; " + s.Tail
	}
	return t
}

// andList is "a", "a and b", "a, b and c".
func andList(xs []string) string {
	if len(xs) < 2 {
		return strings.Join(xs, "")
	}
	return strings.Join(xs[:len(xs)-1], ", ") + " and " + xs[len(xs)-1]
}

// helpWidth is the widest line of the EXIT STATUS sections, in bytes.
const helpWidth = 92

// exitHelp is the EXIT STATUS section of a command's help ("" for the program's own): every
// status the command can return, one per line, each status once. The program's lists every
// status; one with a row per group of commands names the group before each meaning.
func exitHelp(command string) string {
	var b strings.Builder
	b.WriteString("EXIT STATUS\n")
	for i, s := range exitStatuses {
		if command != "" && !slices.Contains(s.Commands, command) {
			continue
		}
		text := s.text(command)
		first := command != "" || i == 0 || exitStatuses[i-1].Code != s.Code
		if command == "" && (!first || i+1 < len(exitStatuses) && exitStatuses[i+1].Code == s.Code) {
			text = andList(s.Commands) + ": " + text
		}
		line := fmt.Sprintf("   %3d ", s.Code)
		if !first {
			line = strings.Repeat(" ", 7)
		}
		for j, w := range strings.Fields(text) {
			if j > 0 && len(line)+1+len(w) > helpWidth {
				b.WriteString(line + "\n")
				line = strings.Repeat(" ", 7)
			}
			line += " " + w
		}
		b.WriteString(line + "\n")
	}
	return strings.TrimRight(b.String(), "\n")
}

// exitTableMarkdown is the table of exit statuses as the README prints it.
func exitTableMarkdown() string {
	var b strings.Builder
	b.WriteString("| status | meaning | commands |\n|---|---|---|\n")
	for _, s := range exitStatuses {
		cmds := make([]string, 0, len(s.Commands))
		for _, c := range s.Commands {
			if c == "" {
				c = "spanwright"
			}
			cmds = append(cmds, "`"+c+"`")
		}
		who := strings.Join(cmds, ", ")
		if len(s.Commands) == len(allCommands)+1 {
			who = "all"
		}
		fmt.Fprintf(&b, "| %d | %s | %s |\n", s.Code, strings.ReplaceAll(s.text(""), "--out", "`--out`"), who)
	}
	return b.String()
}

// stopped is the error of a run stopped by its context (a signal): what says what it
// wrote ("nothing written"). It wraps the context's error, for errors.Is and the exit status,
// without printing it: main prints a stopped run as one plain line (stopLine).
type stopped struct {
	what string
	err  error
}

func (e stopped) Error() string { return "stopped, " + e.what }
func (e stopped) Unwrap() error { return e.err }

// stopLine is the one line main prints, after "spanwright: ", when a signal stopped the run
// with err: which signal, and what the run wrote (nothing, unless err is a stopped that says
// otherwise).
func stopLine(sig syscall.Signal, err error) string {
	name := sig.String()
	switch sig {
	case syscall.SIGINT:
		name = "Ctrl-C (SIGINT)"
	case syscall.SIGTERM:
		name = "SIGTERM"
	}
	what := "nothing written"
	var st stopped
	if errors.As(err, &st) {
		what = st.what
	}
	return "stopped by " + name + ": " + what
}

// stopOnSignal returns a context that SIGINT (Ctrl-C) or SIGTERM cancels, a function that
// names the signal that did (0 when none), and one that stops listening and cancels the
// context, for main to call once the run returns.
func stopOnSignal() (context.Context, func() syscall.Signal, func()) {
	ctx, cancel := context.WithCancel(context.Background())
	sigs := make(chan os.Signal, 1)
	signal.Notify(sigs, os.Interrupt, syscall.SIGTERM)
	var got atomic.Value // the signal that stopped the run
	go func() {
		s := <-sigs
		got.Store(s)
		cancel()
	}()
	which := func() syscall.Signal { s, _ := got.Load().(syscall.Signal); return s }
	return ctx, which, func() { signal.Stop(sigs); cancel() }
}

// finalStatus is the exit status of a run that returned err, stopped by the signal sig (0
// when none), and the line main prints after "spanwright: " ("" for none): for a run the
// signal stopped, 128 + the signal (the shell's convention: 130 for Ctrl-C, 143 for SIGTERM)
// and stopLine, one plain line, not the context's "canceled"; otherwise exitCode and the
// error's text.
func finalStatus(err error, sig syscall.Signal) (int, string) {
	if err == nil {
		return exitCode(nil), ""
	}
	if sig != 0 && errors.Is(err, context.Canceled) {
		return 128 + int(sig), stopLine(sig, err)
	}
	return exitCode(err), err.Error()
}
