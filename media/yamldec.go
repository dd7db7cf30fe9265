package media

import (
	"fmt"

	"spanwright/geo/input"
)

// The catalog, rule and price files are decoded by input.Decoder, the strict walker every
// YAML file of spanwright goes through; its tags (range, keyrange, item) name the entries of
// ranges below.

// pos records where a YAML mapping was and which keys it held; the walker fills a struct
// field of this type.
type pos = input.Mapping

// Ranges of the numeric keys of the catalog and the price book, by the name a field's
// `range` or `keyrange` tag gives; each field must have one (TestEveryNumberHasARange).
// Amounts of money have their own type, read exactly and capped (parseDecimal2).
var ranges = map[string]input.Range{
	// A connection, a splice, an application's budget: a few dB; 100 dB is no optical link.
	"db": {Min: 0, Max: 100, Unit: "dB"},
	// Fibre attenuates well under 10 dB/km (TIA-568.3-D Table 4); plastic fibre about 200.
	"db-per-km": {Min: 0, Max: 1000, Unit: "dB/km"},
	// Optical fibre transmits from the visible to about 1.7 µm (ITU-T G.Sup39 bands end at 1675 nm).
	"nm": {Min: 400, Max: 2000, Whole: true, Unit: "nm"},
	// Strands, ports, lanes: the largest cables hold a few thousand fibres.
	"count": {Min: 1, Max: 10000, Whole: true},
	// Bend radius as a multiple of the cable's diameter (TIA-568.3-D: 10× unloaded, 20× loaded).
	"od":      {Min: 0, AboveMin: true, Max: 100, Unit: "cable diameters"},
	"newtons": {Min: 0, AboveMin: true, Max: 100000, Unit: "N"},
	"mm":      {Min: 0, AboveMin: true, Max: 1000, Unit: "mm"},
	"kg-m":    {Min: 0, AboveMin: true, Max: 100, Unit: "kg/m"},
	"gbps":    {Min: 0, AboveMin: true, Max: 100000, Unit: "Gbit/s"},
	// An application's reach: the longest single-mode reaches are tens of kilometres.
	"reach-m":  {Min: 0, AboveMin: true, Max: 1000000, Unit: "metres"},
	"per-hour": {Min: 0, AboveMin: true, Max: 1000000, Unit: "a number per hour"},
	// Fixed attenuators come in whole dB, a few to a few tens.
	"attenuator-db": {Min: 1, Max: 60, Whole: true, Unit: "dB"},
	// Repair splices allowed per km of outside plant: a few at most.
	"per-km": {Min: 0, Max: 100, Unit: "a number per km"},
}

// newDecoder is the walker for the media file name, adding its problems to errs.
func newDecoder(name string, errs *input.Problems) *input.Decoder {
	return &input.Decoder{File: name, Problems: errs, Ranges: ranges}
}

// readFile reads an input file of at most input.DefaultTextMiB MiB, and reports a problem
// reading it as an *input.Problem naming the file.
func readFile(path string) ([]byte, error) {
	data, err := input.ReadFile(path, input.Cap(0, input.DefaultTextMiB))
	if err != nil {
		return nil, &input.Problem{File: path, Err: fmt.Errorf("read: %w", input.Cause(err))}
	}
	return data, nil
}

// sorted returns errs in file, line and column order, or nil when it is empty.
func sorted(errs *input.Problems) error {
	errs.Sort()
	return errs.Err()
}
