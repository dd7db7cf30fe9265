package geo

import (
	"fmt"
	"strings"
	"unicode"

	"spanwright/geo/input"
)

// Ids are matched exactly, as values are (README, "Campus"): "HUB " with a space at its end
// is no "HUB", nor "plov" "PLOV". What the eye cannot tell apart gets a hint instead: an id
// that names nothing is shown the ids that differ from it only by letter case or by spaces
// at either end (BuildingHint), and an id of the campus with a space at either end is warned
// of on reading (blankIDWarnings).

// idHintsMax is how many ids a hint names at most.
const idHintsMax = 3

// BuildingHint returns the hint for got, an id that names no building: "; did you mean …?"
// naming each building (up to idHintsMax, in the campus's order) whose id differs from got
// only by letter case or by spaces at either end, with where it is and what differs; "" when
// none does, or for a nil campus.
func (c *Campus) BuildingHint(got string) string {
	if c == nil {
		return ""
	}
	var cands []idCand
	for _, b := range c.Buildings {
		cands = append(cands, idCand{b.ID, b.Source})
	}
	return idHint(got, cands)
}

// idCand is an id a hint may name, and its feature.
type idCand struct {
	id  string
	src Source
}

// idHint is BuildingHint over the ids cands.
func idHint(got string, cands []idCand) string {
	key := strings.TrimSpace(got)
	var names []string
	spaces, letterCase := false, false
	for _, c := range cands {
		if c.id == got || !strings.EqualFold(strings.TrimSpace(c.id), key) {
			continue
		}
		if len(names) == idHintsMax {
			names = append(names, "…")
			break
		}
		names = append(names, fmt.Sprintf("%q (%s)", c.id, c.src))
		spaces = spaces || strings.TrimSpace(c.id) != c.id || key != got
		letterCase = letterCase || strings.TrimSpace(c.id) != key
	}
	if len(names) == 0 {
		return ""
	}
	var matter string
	switch {
	case spaces && letterCase:
		matter = " (letter case and spaces at either end matter)"
	case spaces:
		matter = " (spaces at either end matter)"
	default:
		matter = " (letter case matters)"
	}
	return "; did you mean " + strings.Join(names, " or ") + "?" + matter
}

// blankEnds describes the spaces at the ends of id: "starts with a space", "ends with a
// space", "starts and ends with a space"; "" when it has none.
func blankEnds(id string) string {
	lead := strings.TrimLeftFunc(id, unicode.IsSpace) != id
	trail := strings.TrimRightFunc(id, unicode.IsSpace) != id
	switch {
	case lead && trail:
		return "starts and ends with a space"
	case lead:
		return "starts with a space"
	case trail:
		return "ends with a space"
	}
	return ""
}

// blankIDWarnings warns of the features whose id starts or ends with a space (a tab, a
// no-break space): invisible in every output, and matched exactly, so a plan that writes the
// id without it names nothing. Each is warned of, or, when a file has more than
// idWarningsEach (a text column padded to its width by the export), one warning on the first.
func (l *loader) blankIDWarnings() {
	warnPerFile(l, l.blankIDs, func(b idCand) (Source, string) { return b.src, b.id },
		func(b idCand) string {
			return fmt.Sprintf("its id %q %s: ids are matched exactly, so the plan and the campus must name it with the space; take the space out of the id",
				b.id, blankEnds(b.id))
		},
		func(b idCand, more int) string {
			return fmt.Sprintf("its id %q %s, and so do those of %s of this file (a text column padded to its width?): ids are matched exactly, so the plan and the campus must name each with its spaces; take the spaces out of the ids",
				b.id, blankEnds(b.id), input.Counted(more, "more feature", "more features"))
		})
}

// groupWarnings warns of each shared-risk group given that differs from one given before
// only by letter case or by spaces at either end ("North trench" and "north trench "): they
// are two groups, matched exactly, so a diverse pair may take one of each, and the warning
// names the other pathway. One warning per spelling, on its first pathway. Ids stay what
// they are: a pathway's id is its group only when it gives none.
func (l *loader) groupWarnings() {
	first := map[string]bool{}     // the spellings met
	byKey := map[string]groupUse{} // by the spelling folded: the first spelling given
	for _, g := range l.groups {
		if first[g.group] {
			continue
		}
		first[g.group] = true
		key := strings.ToLower(strings.TrimSpace(g.group))
		other, ok := byKey[key]
		if !ok {
			byKey[key] = g
			continue
		}
		l.warn(g.src, g.pathway, fmt.Sprintf("its shared-risk group %q differs from %q (pathway %q, %s) only by %s: they are two groups, and a diverse pair may use one of each; write the group alike on every pathway of one trench or duct bank",
			g.group, other.group, other.pathway, other.src, differsBy(g.group, other.group)))
	}
}

// groupUse is a shared-risk group a pathway gives.
type groupUse struct {
	group, pathway string
	src            Source
}

// differsBy says what sets a apart from b, two strings equal but for letter case and spaces
// at their ends.
func differsBy(a, b string) string {
	switch {
	case strings.TrimSpace(a) == strings.TrimSpace(b):
		return "spaces at either end"
	case strings.TrimSpace(a) == a && strings.TrimSpace(b) == b:
		return "letter case"
	}
	return "letter case and spaces at either end"
}
