package media

import (
	"errors"
	"fmt"
	"sort"
	"strings"

	"spanwright/geo/input"
)

// Sentinels carried in FileError.Err so callers can test with errors.Is.
var (
	ErrNotYAML          = errors.New("not YAML")
	ErrUnknownField     = errors.New("unknown field")
	ErrMissingField     = errors.New("missing field")
	ErrWrongType        = errors.New("wrong type")
	ErrBadValue         = errors.New("bad value")
	ErrDuplicateID      = errors.New("duplicate id")
	ErrUnknownReference = errors.New("unknown reference")
	ErrSyntax           = errors.New("syntax error")
	ErrUnknownFact      = errors.New("unknown fact")
	ErrMissingPrice     = errors.New("missing price")
	// ErrDuplicateKey is a key given twice in one mapping, at any level.
	ErrDuplicateKey = input.ErrDuplicateKey
)

// FileError is one problem in a catalog, rule or price file. Line and Col are 1-based and 0
// when unknown. Item names the entry concerned, e.g. `medium "om4"` or `rule "reach"`, and is
// "" for a top-level key; Field is the key path inside the item, e.g. "media[0].range_m".
type FileError struct {
	File  string
	Line  int
	Col   int
	Item  string
	Field string
	Err   error // a sentinel above, wrapped with the detail
}

func (e *FileError) Error() string {
	var b strings.Builder
	b.WriteString(e.File)
	if e.Line > 0 {
		fmt.Fprintf(&b, ":%d", e.Line)
		if e.Col > 0 {
			fmt.Fprintf(&b, ":%d", e.Col)
		}
	}
	if e.Item != "" {
		b.WriteString(": ")
		b.WriteString(e.Item)
	}
	if e.Field != "" {
		fmt.Fprintf(&b, ": field %q", e.Field)
	}
	b.WriteString(": ")
	b.WriteString(e.Err.Error())
	return b.String()
}

func (e *FileError) Unwrap() error { return e.Err }

// MaxErrors caps how many problems one ErrorList reports; the rest are counted.
const MaxErrors = 100

// ErrorList collects every problem found in one file, sorted by position when it is returned.
type ErrorList struct {
	Errs    []error
	Dropped int // problems beyond MaxErrors
}

// Add appends err, counting it in Dropped past MaxErrors.
func (l *ErrorList) Add(err error) {
	if len(l.Errs) >= MaxErrors {
		l.Dropped++
		return
	}
	l.Errs = append(l.Errs, err)
}

// Len is the number of problems found, kept or dropped.
func (l *ErrorList) Len() int { return len(l.Errs) + l.Dropped }

// Err sorts the problems by file, line and column and returns l, or nil when l is empty.
func (l *ErrorList) Err() error {
	if l.Len() == 0 {
		return nil
	}
	sort.SliceStable(l.Errs, func(i, j int) bool {
		a, aok := l.Errs[i].(*FileError)
		b, bok := l.Errs[j].(*FileError)
		if !aok || !bok {
			return aok && !bok
		}
		if a.File != b.File {
			return a.File < b.File
		}
		if a.Line != b.Line {
			return a.Line < b.Line
		}
		return a.Col < b.Col
	})
	return l
}

// Error prints every kept problem on its own line, then how many were dropped.
func (l *ErrorList) Error() string {
	var b strings.Builder
	for i, e := range l.Errs {
		if i > 0 {
			b.WriteByte('\n')
		}
		b.WriteString(e.Error())
	}
	if l.Dropped > 0 {
		fmt.Fprintf(&b, "\n(and %d more errors)", l.Dropped)
	}
	return b.String()
}

// Unwrap lets errors.Is and errors.As look at every kept problem.
func (l *ErrorList) Unwrap() []error { return l.Errs }
