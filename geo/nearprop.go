package geo

import (
	"encoding/json"
	"fmt"
	"maps"
	"slices"
	"strconv"
	"strings"

	"spanwright/geo/input"
)

// A GIS export carries attributes of its own (OBJECTID, Shape_Length, a building's address),
// which the reader ignores: property names are matched exactly. One spelt like a property the
// reader reads ("riser" for riser_m, "Spare_Ducts" for spare_ducts, "Kind") is a slip that
// would take the default without a word (tester 14 F5), and is answered:
//
//   - the property it means absent, whose default changes the plan (every property but a
//     building's name), and the name the same but for letter case and separators
//     ("Spare_Ducts", "Riser M"): a problem of the file, "did you mean spare_ducts?", as an
//     unknown key of a plan file is; a default taken silently where the drawing gives a value
//     changes the bill, and the fix (rename the attribute) is the user's to make;
//   - the same, the name near by spelling only ("riser", "spare_duct"): a warning, and nothing
//     when the value is not of the kind the property takes (a GIS export's own "duct_id":
//     "D-12" is no duct_mm);
//   - the property it means absent, a name (a building's name, an entrance's id): a warning;
//   - the property it means given with another value: a warning (which one is meant?);
//     with the same value, nothing (an export that writes both);
//   - the property it means required and absent (a feature's id, an entrance's building):
//     the hint goes into that problem's message (nearNote).
//
// The properties a feature is matched against are the ones the reader read of it (feature.
// asked): the reader's own list, by kind, with no second copy.

// nearMinLen is the fewest characters a name (folded) needs for a near one by edit distance:
// shorter names ("id", "emi") match only in other letter case or with other separators, so
// that "fid" or "em" is no "id" or "emi" (common practice, no published source).
const nearMinLen = 4

// foldName is a property name for matching: lower case, without spaces, underscores,
// hyphens and dots ("Spare_Ducts", "spare ducts" and "spare-ducts" are "spareducts").
func foldName(s string) string {
	return strings.Map(func(r rune) rune {
		switch r {
		case ' ', '_', '-', '.', '\t':
			return -1
		}
		return r
	}, strings.ToLower(s))
}

// nearestName returns the name of known that got, an unknown name, is a slip for: one equal
// to it folded (foldName), else the one input.Nearest finds among the folded names of at
// least nearMinLen characters; "" when none is.
func nearestName(got string, known []string) string {
	g := foldName(got)
	for _, k := range known {
		if foldName(k) == g {
			return k
		}
	}
	if len(g) < nearMinLen {
		return ""
	}
	byFold := map[string]string{}
	for _, k := range known {
		if fk := foldName(k); len(fk) >= nearMinLen {
			byFold[fk] = k
		}
	}
	return byFold[input.Nearest(g, byFold)]
}

// nearUse is a property of a feature that is not read but is a slip for one that is.
type nearUse struct {
	src        Source
	id, kind   string
	key, known string
	problem    bool   // the property meant is absent and changes the plan: a problem, not a warning
	given      string // the value of the property meant, when given (a warning says it)
	n          int    // features of the file (table) and kind with this slip
	// unit is set when key is known in another unit (unitprop.go): value is key's value
	// written in known's unit, "" when it is no number.
	unit       *otherUnit
	raw, value string
}

// prop returns property key's value as given (nil when absent) and notes that the reader
// reads key (asked).
func (f *feature) prop(key string) any {
	if f.asked == nil {
		f.asked = f.askedBuf[:0]
	}
	if !slices.Contains(f.asked, key) {
		f.asked = append(f.asked, key)
	}
	return f.props[key]
}

// unread returns the properties of f the reader did not read, with a value given (not null
// or ""), that are a slip for one it did read, in name order, with the name each means.
func (f *feature) unread() (keys, known []string) {
	var cache map[string]string
	for key, v := range f.props {
		if v == nil || v == "" || slices.Contains(f.asked, key) {
			continue
		}
		if cache == nil {
			cache = f.l.nearCache(f.asked)
		}
		k, ok := cache[key]
		if !ok {
			if k, _ = otherUnitOf(key, f.asked); k == "" {
				k = nearestName(key, f.asked)
			}
			cache[key] = k
		}
		if k != "" {
			keys = append(keys, key)
		}
	}
	slices.Sort(keys)
	for _, key := range keys {
		known = append(known, cache[key])
	}
	return keys, known
}

// nearCache is the loader's remembered nearestName answers for features whose reader read
// the properties asked (one list per kind, in practice): a GIS export repeats its attributes
// on every feature.
func (l *loader) nearCache(asked []string) map[string]string {
	k := strings.Join(asked, "\x00")
	m, ok := l.nearMemo[k]
	if !ok {
		if l.nearMemo == nil {
			l.nearMemo = map[string]map[string]string{}
		}
		m = map[string]string{}
		l.nearMemo[k] = m
	}
	return m
}

// nearNote is the hint for a required property known that is missing: "" or "; the feature
// gives \"ID\", which is not read: did you mean \"id\"? (property names are matched exactly)"
// when it gives a slip for it. Such a property is not answered again (nearCheck).
func (f *feature) nearNote(known string) string {
	keys := slices.Sorted(maps.Keys(f.props))
	for _, key := range keys {
		if v := f.props[key]; key == known || v == nil || v == "" {
			continue
		}
		if nearestName(key, []string{known}) == known {
			f.hinted = append(f.hinted, known)
			return fmt.Sprintf("; the feature gives %q, which is not read: did you mean %q? (property names are matched exactly)", key, known)
		}
	}
	return ""
}

// nearCheck notes the properties of f, once its kind's reader has read it, that are not read
// but are a slip for one that is (see the top of this file), for nearFindings.
func (f *feature) nearCheck() {
	keys, known := f.unread()
	for i, key := range keys {
		k := known[i]
		if slices.Contains(f.hinted, k) {
			continue
		}
		u := nearUse{src: f.src, id: f.id, kind: f.kind, key: key, known: k, n: 1}
		if f.unitCheck(u) {
			continue
		}
		v, got := f.props[k], f.props[key]
		if k == PropID {
			// An id is its text, a whole number's too (idText).
			v = f.id
			if s, err := idText(got); err == nil {
				got = s
			}
		}
		if v != nil && v != "" {
			if sameValue(got, v) {
				continue
			}
			u.given = describeID(v)
		} else if sameValue(f.props[key], f.takenFor(k)) || k == PropKind && sameValue(f.props[key], f.kind) {
			continue // "TYPE": "duct", "Kind": "building" on a polygon: what the default gives
		} else if foldName(key) != foldName(k) {
			// Near by spelling only ("riser" for riser_m, but also "duct_id" for duct_mm, a GIS
			// attribute of its own): a warning, and none when its value is not of the kind the
			// property takes (review 20 F1: a whole campus refused for its duct_id column).
			if !sameKind(got, f.takenFor(k)) {
				continue
			}
		} else {
			u.problem = k != PropName && k != PropID // names: an id is required but of an entrance, named by its building without one
		}
		f.l.near = append(f.l.near, u)
	}
}

// unitCheck notes u when its property gives the one meant in another unit (unitprop.go):
// a problem when the one meant is absent, a warning when it is given with another length,
// nothing when they agree. It reports whether u's property is such a one.
func (f *feature) unitCheck(u nearUse) bool {
	k, unit := otherUnitOf(u.key, f.asked)
	if k != u.known {
		return false
	}
	u.unit = &unit
	x, xDec, isNum := numberOf(f.props[u.key])
	if isNum {
		u.raw, u.value = strings.Trim(describeID(f.props[u.key]), `"`), unit.converted(x)
	}
	if v := f.props[k]; v != nil && v != "" {
		m, mDec, ok := numberOf(v)
		if !isNum || !ok || unit.agrees(x, xDec, m, mDec) {
			return true // an export that writes both, or a value no length: the one meant is read
		}
		u.given = describeID(v)
	} else {
		u.problem = true
	}
	f.l.near = append(f.l.near, u)
	return true
}

// takenDefault is a property not given and the default the reader took for it.
type takenDefault struct {
	key string
	def any
}

// defaulted notes that property key was not given and the reader took def for it.
func (f *feature) defaulted(key string, def any) {
	if f.taken == nil {
		f.taken = f.takenBuf[:0]
	}
	f.taken = append(f.taken, takenDefault{key, def})
}

// takenFor is the default the reader took for property key, nil when it took none.
func (f *feature) takenFor(key string) any {
	for _, t := range f.taken {
		if t.key == key {
			return t.def
		}
	}
	return nil
}

// sameKind reports whether a property's value v is of the kind of the default x the reader
// takes for another property: a number for a number, text for text, true or false for a
// flag; true when no default is known.
func sameKind(v, x any) bool {
	switch x.(type) {
	case nil:
		return true
	case float64, json.Number:
		_, ok := v.(json.Number)
		return ok
	case string:
		_, ok := v.(string)
		return ok
	case bool:
		_, ok := v.(bool)
		return ok
	}
	return true
}

// sameValue reports whether a property's value v is x, a default the reader takes (a string,
// a float64, a bool) or another value: numbers by value (15 is 15.0), the rest by their text.
func sameValue(v, x any) bool {
	if x == nil {
		return false
	}
	if n, ok := v.(json.Number); ok {
		a, err := strconv.ParseFloat(string(n), 64)
		switch t := x.(type) {
		case float64:
			return err == nil && a == t
		case json.Number:
			b, errB := strconv.ParseFloat(string(t), 64)
			return err == nil && errB == nil && a == b
		}
		return false
	}
	if s, ok := x.(string); ok {
		vs, isStr := v.(string)
		return isStr && vs == s
	}
	return v == x
}

// nearFindings turns the slips nearCheck noted into problems and warnings: one for each file
// (or table), kind of feature, property and property meant, on its first feature, saying how
// many more of the file have it.
func (l *loader) nearFindings() {
	var firsts []*nearUse
	at := map[[6]string]*nearUse{}
	for _, u := range l.near {
		k := [6]string{u.src.File, u.src.Table, u.kind, u.key, u.known, fmt.Sprint(u.problem, u.given != "")}
		if f, ok := at[k]; ok {
			f.n++
			continue
		}
		u := u
		at[k] = &u
		firsts = append(firsts, &u)
	}
	for _, u := range firsts {
		more := ""
		if u.n > 1 {
			more = fmt.Sprintf(" (nor on %s of this file)", input.Counted(u.n-1, "more "+u.kind, "more "+u.kind+"s"))
		}
		switch {
		case u.unit != nil:
			l.unitFinding(u, more)
		case u.problem:
			if u.known == PropRole {
				l.roleSlip = true
			}
			l.errs.Add(&input.Problem{File: u.src.File, Feature: u.src.Feature(u.id), Key: u.key,
				Err: problemf(ErrUnknownProperty, "not read%s: did you mean %q? Without it the %s is planned with %s; rename the property (property names are matched exactly)",
					more, u.known, u.kind, blankDefaultText(u.kind, u.known))})
		case u.given != "":
			l.warn(u.src, u.id, fmt.Sprintf("property %q is not read%s: did you mean %q? The %s gives %q as %s, which is what is planned (property names are matched exactly)",
				u.key, more, u.known, u.kind, u.known, u.given))
		default:
			l.warn(u.src, u.id, fmt.Sprintf("property %q is not read%s: did you mean %q? The %s is planned with %s (property names are matched exactly)",
				u.key, more, u.known, u.kind, blankDefaultText(u.kind, u.known)))
			// The plan takes a default the campus likely did not mean: its terminal shows it
			// (Warning.Slip; verify 18 V9).
			l.slips = append(l.slips, l.warns[len(l.warns)-1])
		}
	}
}
