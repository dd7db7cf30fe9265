package install

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
)

// ErrBadInput is wrapped by every *InputError, so callers can test with errors.Is.
var ErrBadInput = errors.New("bad input")

// InputError is one invalid input value.
type InputError struct {
	Item  string // "step", "pull point", "cable", or "" for a scalar parameter
	Index int    // 0-based position within Item; unused when Item is ""
	Field string // the Go name of the value, e.g. "RadiusM" or "mu"
	Got   string // the value as given
	Want  string // what was expected, e.g. "> 0"
}

// Error reads "step 3: RadiusM: want > 0, got 0" or "mu: want finite >= 0, got NaN".
func (e *InputError) Error() string {
	if e.Item == "" {
		return fmt.Sprintf("install: %s: want %s, got %s", e.Field, e.Want, e.Got)
	}
	return fmt.Sprintf("install: %s %d: %s: want %s, got %s", e.Item, e.Index, e.Field, e.Want, e.Got)
}

// Unwrap returns ErrBadInput.
func (e *InputError) Unwrap() error { return ErrBadInput }

// ErrorList collects every input problem found in one call, in input order.
type ErrorList []*InputError

// Error prints the first problem and how many more there are: "first (and 2 more errors)".
func (l ErrorList) Error() string {
	switch len(l) {
	case 0:
		return "install: no errors"
	case 1:
		return l[0].Error()
	}
	if len(l) == 2 {
		return l[0].Error() + " (and 1 more error)"
	}
	return fmt.Sprintf("%s (and %d more errors)", l[0].Error(), len(l)-1)
}

// Err returns l when it holds a problem and nil otherwise.
func (l ErrorList) Err() error {
	if len(l) == 0 {
		return nil
	}
	return l
}

// Unwrap lets errors.Is and errors.As look at every problem.
func (l ErrorList) Unwrap() []error {
	errs := make([]error, len(l))
	for i, e := range l {
		errs[i] = e
	}
	return errs
}

// String lists every problem, one per line.
func (l ErrorList) String() string {
	var b strings.Builder
	for i, e := range l {
		if i > 0 {
			b.WriteByte('\n')
		}
		b.WriteString(e.Error())
	}
	return b.String()
}

func fmtNum(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// checkNonNeg appends an error unless v is finite and >= 0.
func (l *ErrorList) checkNonNeg(item string, index int, field string, v float64) {
	if !finite(v) || v < 0 {
		*l = append(*l, &InputError{Item: item, Index: index, Field: field, Got: fmtNum(v), Want: "finite >= 0"})
	}
}

// checkPos appends an error unless v is finite and > 0.
func (l *ErrorList) checkPos(item string, index int, field string, v float64) {
	if !finite(v) || v <= 0 {
		*l = append(*l, &InputError{Item: item, Index: index, Field: field, Got: fmtNum(v), Want: "finite > 0"})
	}
}
