package geo

import (
	"errors"
	"fmt"
	"strings"

	"spanwright/geo/input"
)

// Sentinels carried in FeatureError.Err so callers can test with errors.Is.
var (
	ErrNotJSON          = errors.New("not JSON")
	ErrNotCollection    = errors.New("not a FeatureCollection")
	ErrMissingProperty  = errors.New("missing property")
	ErrWrongType        = errors.New("wrong type")
	ErrBadValue         = errors.New("bad value")
	ErrDuplicateID      = errors.New("duplicate id")
	ErrBadGeometry      = errors.New("bad geometry")
	ErrProjected        = errors.New("coordinates look projected")
	ErrUnknownReference = errors.New("unknown reference")
	ErrUnreachable      = errors.New("unreachable")
	// ErrDuplicateKey is a member given twice in one JSON object: a property, or any other
	// member at any level.
	ErrDuplicateKey = input.ErrDuplicateKey
)

// FeatureError is one problem with one input feature. Index is the 0-based position of the
// feature in its file's FeatureCollection, or -1 when the problem concerns the whole file.
type FeatureError struct {
	File      string
	Index     int
	FeatureID string // "" when the feature has no id
	Property  string // "" when the problem is not about one property ("geometry" for geometry)
	Err       error  // a sentinel above, wrapped with the detail
}

func (e *FeatureError) Error() string {
	var b strings.Builder
	b.WriteString(e.prefix())
	switch e.Property {
	case "":
	case "geometry":
		b.WriteString(": geometry")
	default:
		fmt.Fprintf(&b, ": property %q", e.Property)
	}
	b.WriteString(": ")
	b.WriteString(e.Err.Error())
	return b.String()
}

func (e *FeatureError) prefix() string {
	if e.Index < 0 {
		return e.File
	}
	if e.FeatureID != "" {
		return fmt.Sprintf("%s: feature #%d %q", e.File, e.Index, e.FeatureID)
	}
	return fmt.Sprintf("%s: feature #%d (no id)", e.File, e.Index)
}

func (e *FeatureError) Unwrap() error { return e.Err }

// MaxErrors caps how many problems one ErrorList reports; the rest are counted.
const MaxErrors = 100

// ErrorList collects every input problem of a run, in the order found.
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

// Err returns l when it holds a problem and nil otherwise.
func (l *ErrorList) Err() error {
	if l.Len() == 0 {
		return nil
	}
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
