package geo

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"
	"strings"

	"spanwright/geo/input"
)

// A facilities GIS keeps lengths in feet and inches: a property named like one the reader
// reads but for its unit ("riser_ft" beside riser_m, "duct_in" beside duct_mm) is that length
// in another unit, not a slip of spelling (tester 15 F10). It is not read, since the reader
// takes one unit for each property and the file says which by the name; when the property
// meant is absent, whose default would change the plan, it is a problem that gives the
// conversion ("riser_ft 24.6 is 7.498 m: write riser_m: 7.498"); when both are given and
// differ, a warning (which one is meant?); when they agree, nothing (an export that writes
// both).

// otherUnit is a unit a length may be given in, by the suffixes of a property name that
// say it, for a property the reader reads in metric unit metric ("m" or "mm"), with the
// metric units in one of it.
type otherUnit struct {
	suffixes []string
	name     string // the unit's name in a message
	symbol   string // its symbol, after a value
	metric   string
	per      float64
}

// otherUnits are the units a property in another unit may give. NIST SP 811 (2008) B.8:
// 1 ft = 0.3048 m, 1 in = 25.4 mm, 1 yd = 0.9144 m, each exactly; 1 cm = 10 mm (SI).
var otherUnits = []otherUnit{
	{[]string{"ft", "feet", "foot"}, "feet", "ft", "m", 0.3048},
	{[]string{"yd", "yard", "yards"}, "yards", "yd", "m", 0.9144},
	{[]string{"in", "inch", "inches"}, "inches", "in", "mm", 25.4},
	{[]string{"cm"}, "centimetres", "cm", "mm", 10},
}

// metricDecimals is how many decimals a converted value is written with: to the millimetre
// for metres, to a hundredth of a millimetre for millimetres (3/4 in is 19.05 mm).
var metricDecimals = map[string]int{"m": 3, "mm": 2}

// splitUnit returns a property name's stem and the unit its last part names ("riser_ft":
// "riser", feet), the stem folded (foldName); ok is false when the name ends in no unit of
// otherUnits after a separator.
func splitUnit(name string) (stem string, u otherUnit, ok bool) {
	i := strings.LastIndexAny(name, "_ -.")
	if i <= 0 {
		return "", otherUnit{}, false
	}
	suffix := strings.ToLower(name[i+1:])
	for _, o := range otherUnits {
		for _, s := range o.suffixes {
			if suffix == s {
				return foldName(name[:i]), o, true
			}
		}
	}
	return "", otherUnit{}, false
}

// otherUnitOf returns the property of asked (read by the reader) that name gives in another
// unit, and that unit; "" when it is none.
func otherUnitOf(name string, asked []string) (string, otherUnit) {
	stem, u, ok := splitUnit(name)
	if !ok {
		return "", otherUnit{}
	}
	for _, k := range asked {
		if ks, found := strings.CutSuffix(k, "_"+u.metric); found && foldName(ks) == stem {
			return k, u
		}
	}
	return "", otherUnit{}
}

// numberOf returns a property's value as a number, with the decimals it is written with: a
// JSON number, or a string holding one (an export's text column); ok is false otherwise.
func numberOf(v any) (x float64, decimals int, ok bool) {
	var s string
	switch t := v.(type) {
	case json.Number:
		s = string(t)
	case string:
		s = strings.TrimSpace(t)
	case float64:
		return t, -1, true
	default:
		return 0, 0, false
	}
	x, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(x, 0) || math.IsNaN(x) {
		return 0, 0, false
	}
	if i := strings.IndexByte(s, '.'); i >= 0 && !strings.ContainsAny(s, "eE") {
		decimals = len(s) - i - 1
	}
	return x, decimals, true
}

// converted is x, in unit u, in u's metric unit, written to metricDecimals.
func (u otherUnit) converted(x float64) string {
	s := strconv.FormatFloat(x*u.per, 'f', metricDecimals[u.metric], 64)
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	return s
}

// agrees reports whether a length given as x in unit u (with xDec decimals) and as m in the
// metric unit (with mDec decimals) are the same length within what either says: half the
// last written place of each (a decimal count of -1 is taken as exact).
func (u otherUnit) agrees(x float64, xDec int, m float64, mDec int) bool {
	half := func(dec int) float64 {
		if dec < 0 {
			return 0
		}
		return 0.5 * math.Pow(10, -float64(dec))
	}
	tol := half(xDec)*u.per + half(mDec) + 1e-9*math.Max(math.Abs(m), 1)
	return math.Abs(x*u.per-m) <= tol
}

// metricNames are the metric units' names in a message.
var metricNames = map[string]string{"m": "metres", "mm": "millimetres"}

// unitFinding reports u, a property that gives the one meant in another unit, with more
// (how many more features of the file have it, nearFindings's words): a problem when the one
// meant is absent, else a warning.
func (l *loader) unitFinding(u *nearUse, more string) {
	per := fmt.Sprintf("1 %s = %s %s exactly", u.unit.symbol, strconv.FormatFloat(u.unit.per, 'f', -1, 64), u.unit.metric)
	conv := fmt.Sprintf("give it in %s as %s (%s)", metricNames[u.unit.metric], u.known, per)
	if u.value != "" {
		conv = fmt.Sprintf("%s %s is %s %s: write %s: %s (%s)", u.key, u.raw, u.value, u.unit.metric, u.known, u.value, per)
		// Inches of a duct are most often its trade size (review 22 F6).
		if x, err := strconv.ParseFloat(u.raw, 64); err == nil && u.known == PropDuctMM && u.unit.symbol == "in" {
			if hint := TradeHint(x); hint != "" {
				conv += "; but if " + u.raw + " in is the conduit's trade size, " + hint + ": write its inside diameter"
			}
		}
	}
	if u.n > 1 {
		conv += ", and convert the others the same way"
	}
	if !u.problem {
		l.warn(u.src, u.id, fmt.Sprintf("property %q is a length in %s and is not read%s: %s %s is %s %s, but %s gives %s %s, which is what is planned",
			u.key, u.unit.name, more, u.key, u.raw, u.value, u.unit.metric, u.known, u.given, u.unit.metric))
		// One of the two is likely wrong, and the text gives both units: shown in full and
		// as written (Warning.Slip), never converted again (review 22 F10).
		l.slips = append(l.slips, l.warns[len(l.warns)-1])
		return
	}
	l.errs.Add(&input.Problem{File: u.src.File, Feature: u.src.Feature(u.id), Key: u.key,
		Err: problemf(ErrUnknownProperty, "a length in %s, not read%s: %s; without %s the %s is planned with %s",
			u.unit.name, more, conv, u.known, u.kind, blankDefaultText(u.kind, u.known))})
}
