package input

import (
	"fmt"
	"math"
	"strconv"
)

// ErrOutOfRange is a number that is not finite, lies outside its key's range, or has a
// fraction where a whole number is wanted. It is an ErrBadValue too.
var ErrOutOfRange = fmt.Errorf("number out of range: %w", ErrBadValue)

// Range is what a numeric key of an input file may hold: a finite number from Min to Max
// (Min itself excluded when AboveMin), a whole number when Whole. Unit names the quantity
// in messages ("metres", "dB"); it may be empty.
type Range struct {
	Min, Max float64
	AboveMin bool
	Whole    bool
	Unit     string
}

// Check returns nil when x is in r, and otherwise a *Problem naming no file, whose Err wraps
// ErrOutOfRange and says what was wanted and whose Value is what was given; it prints "want
// metres from 0 to 1000, got NaN", and Place puts it at its key.
func (r Range) Check(x float64) error {
	if r.holds(x) {
		return nil
	}
	return r.fail(strconv.FormatFloat(x, 'g', -1, 64))
}

// CheckInt is Check for an integer, printed exactly in the message.
func (r Range) CheckInt(x int64) error {
	if r.holds(float64(x)) {
		return nil
	}
	return r.fail(strconv.FormatInt(x, 10))
}

func (r Range) holds(x float64) bool {
	switch {
	case math.IsNaN(x) || math.IsInf(x, 0):
		return false
	case x < r.Min || (r.AboveMin && x == r.Min) || x > r.Max:
		return false
	case r.Whole && x != math.Trunc(x):
		return false
	}
	return true
}

func (r Range) fail(got string) error {
	return &Problem{Value: got, Err: &problem{ErrOutOfRange, "want " + r.String()}}
}

// String describes the range: "metres from 0 to 1000", "an integer above 0 and at most
// 10000".
func (r Range) String() string {
	what := r.Unit
	if r.Whole {
		what = "an integer"
		if r.Unit != "" {
			what = "a whole number of " + r.Unit
		}
	}
	if what == "" {
		what = "a number"
	}
	if r.AboveMin {
		return fmt.Sprintf("%s above %s and at most %s", what, num(r.Min), num(r.Max))
	}
	return fmt.Sprintf("%s from %s to %s", what, num(r.Min), num(r.Max))
}

// num prints a range's end: whole numbers in full (1000000, not 1e+06).
func num(x float64) string {
	if x == math.Trunc(x) && math.Abs(x) < 1e15 {
		return strconv.FormatFloat(x, 'f', -1, 64)
	}
	return strconv.FormatFloat(x, 'g', -1, 64)
}
