package geo

import (
	"errors"

	"spanwright/geo/input"
)

// Sentinels carried in the Err of each *input.Problem of a campus file, so callers can test
// with errors.Is; those every input format shares are input's.
var (
	ErrNotJSON          = errors.New("not JSON")
	ErrNotCollection    = errors.New("not a FeatureCollection")
	ErrMissingProperty  = errors.New("missing property")
	ErrWrongType        = input.ErrWrongType
	ErrBadValue         = input.ErrBadValue
	ErrDuplicateID      = errors.New("duplicate id")
	ErrBadGeometry      = errors.New("bad geometry")
	ErrProjected        = errors.New("coordinates look projected")
	ErrUnknownReference = errors.New("unknown reference")
	ErrUnreachable      = errors.New("unreachable")
	// ErrUnknownProperty is a property the reader does not read, spelt like one it does, whose
	// default would be taken instead (a "riser" for riser_m): the unknown key of a campus.
	ErrUnknownProperty = input.ErrUnknownKey
	// ErrDuplicateKey is a member given twice in one JSON object: a property, or any other
	// member at any level.
	ErrDuplicateKey = input.ErrDuplicateKey
)
