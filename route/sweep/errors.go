package sweep

import (
	"errors"
	"fmt"
	"strings"
)

// ErrInvalid matches, through errors.Is, every problem of a sweep file (*Error): the sweep
// cannot start.
var ErrInvalid = errors.New("invalid sweep file")

// Sentinels held in Error.Err, for errors.Is.
var (
	// ErrUnknownKey is an override key that names no plan setting a sweep can change.
	ErrUnknownKey = errors.New("unknown key")
	// ErrWrongType is an override value the plan setting cannot hold.
	ErrWrongType = errors.New("wrong type")
	// ErrDuplicate is a case name or a scenario id used twice.
	ErrDuplicate = errors.New("used twice")
)

// ErrScenarioFailed is wrapped by Report.Err when some scenario could not be planned.
var ErrScenarioFailed = errors.New("some scenarios failed")

// Error is one problem of a sweep file: the file, the line (1-based, 0 when unknown), where
// in the file (Case: "vary" for an axis, the case's name, or "cases[3]" for a case without
// a usable name, 0-based), the key and what is wrong.
type Error struct {
	File string
	Line int
	Case string
	Key  string
	Err  error
}

func (e *Error) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
	}
	if e.Case != "" {
		if e.Case == "vary" || strings.HasPrefix(e.Case, "cases[") {
			fmt.Fprintf(&b, ": %s", e.Case)
		} else {
			fmt.Fprintf(&b, ": case %q", e.Case)
		}
	}
	if e.Key != "" {
		fmt.Fprintf(&b, ": %s", e.Key)
	}
	fmt.Fprintf(&b, ": %v", e.Err)
	return b.String()
}

func (e *Error) Unwrap() error { return e.Err }

// Is reports that every sweep file problem is ErrInvalid.
func (e *Error) Is(target error) bool { return target == ErrInvalid }

// ErrorList is every problem of a sweep file, reported at once; it prints one per line.
type ErrorList struct{ Errs []error }

func (l *ErrorList) Error() string {
	s := make([]string, len(l.Errs))
	for i, e := range l.Errs {
		s[i] = e.Error()
	}
	return strings.Join(s, "\n")
}

// Unwrap lets errors.Is and errors.As see every problem.
func (l *ErrorList) Unwrap() []error { return l.Errs }

// Err returns the list, or nil when it is empty.
func (l *ErrorList) Err() error {
	if len(l.Errs) == 0 {
		return nil
	}
	return l
}
