package media

import (
	"errors"

	"spanwright/geo/input"
)

// Sentinels carried in the Err of each *input.Problem of a catalog, rule or price file, so
// callers can test with errors.Is. Those every file kind shares are input's.
var (
	ErrNotYAML          = input.ErrNotYAML
	ErrUnknownField     = input.ErrUnknownKey
	ErrMissingField     = input.ErrMissingKey
	ErrWrongType        = input.ErrWrongType
	ErrBadValue         = input.ErrBadValue
	ErrDuplicateID      = errors.New("duplicate id")
	ErrUnknownReference = errors.New("unknown reference")
	ErrSyntax           = errors.New("syntax error")
	ErrUnknownFact      = errors.New("unknown fact")
	ErrMissingPrice     = errors.New("missing price")
	// ErrDuplicateKey is a key given twice in one mapping, at any level.
	ErrDuplicateKey = input.ErrDuplicateKey
)
