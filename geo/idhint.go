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
// none does.
func (c *Campus) BuildingHint(got string) string {
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
	byFile := map[string][]idCand{}
	var files []string
	for _, b := range l.blankIDs {
		if byFile[b.src.File] == nil {
			files = append(files, b.src.File)
		}
		byFile[b.src.File] = append(byFile[b.src.File], b)
	}
	for _, file := range files {
		bs := byFile[file]
		if len(bs) <= idWarningsEach {
			for _, b := range bs {
				l.warn(b.src, b.id, fmt.Sprintf("its id %q %s: ids are matched exactly, so the plan and the campus must name it with the space; take the space out of the id",
					b.id, blankEnds(b.id)))
			}
			continue
		}
		b := bs[0]
		l.warn(b.src, b.id, fmt.Sprintf("its id %q %s, and so do those of %s of this file (a text column padded to its width?): ids are matched exactly, so the plan and the campus must name each with its spaces; take the spaces out of the ids",
			b.id, blankEnds(b.id), input.Counted(len(bs)-1, "more feature", "more features")))
	}
}
