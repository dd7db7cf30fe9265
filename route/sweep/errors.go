package sweep

import (
	"errors"

	"spanwright/geo/input"
)

// ErrInvalid matches, through errors.Is, every problem of a sweep file (an *input.Problem
// whose Class it is): the sweep cannot start.
var ErrInvalid = errors.New("invalid sweep file")

// Sentinels held in the Err of a sweep file's problems, for errors.Is.
var (
	// ErrUnknownKey is an override key that names no plan setting a sweep can change.
	ErrUnknownKey = input.ErrUnknownKey
	// ErrWrongType is an override value the plan setting cannot hold.
	ErrWrongType = input.ErrWrongType
	// ErrDuplicate is a case name or a scenario id used twice.
	ErrDuplicate = errors.New("used twice")
)

// ErrScenarioFailed is wrapped by Report.Err when some scenario could not be planned.
var ErrScenarioFailed = errors.New("some scenarios failed")
