package geo

import (
	"errors"
	"fmt"
	"strings"

	"spanwright/geo/input"
)

// A GIS export repeats one slip on every feature it writes: ids under "ID", or a whole file
// in a projected system. Such a problem of many features of one file (or table) is said
// once, on the first feature, with how many more share it and which come next (tester 15
// F3: 210 identical lines buried the one that says what to do), as the properties that are
// slips for one read are (nearFindings). Each problem still names its file, feature and
// property.

// groupShown is how many more features a grouped problem names after its first.
const groupShown = 3

// missingID is a feature that needs an id and has none: its source and kind, and the notes
// its message carries (feature.emptyNote, feature.nearNote).
type missingID struct {
	src               Source
	kind, empty, near string
}

// projected is a feature with a position that looks projected: its source, id and the
// geometry problem (ErrProjected) as found.
type projected struct {
	src Source
	id  string
	err error
}

// sameFile names a feature within its file, for the list a grouped problem ends with:
// `#3 (P-1)`, `#4`, or `fid 12 (D-07)` of a table.
func sameFile(src Source, id string) string {
	at := fmt.Sprintf("#%d", src.Index)
	if src.Table != "" {
		at = fmt.Sprintf("fid %d", src.FID)
	}
	if id != "" {
		at += " (" + id + ")"
	}
	return at
}

// othersText lists the features after the first of a group: "#1, #2, #3, …".
func othersText(srcs []Source, ids []string) string {
	var parts []string
	for i := range srcs {
		if i == groupShown {
			parts = append(parts, "…")
			break
		}
		parts = append(parts, sameFile(srcs[i], ids[i]))
	}
	return strings.Join(parts, ", ")
}

// groupBy returns the groups of items by key, each in the order read, in the order of their
// first item.
func groupBy[T any](items []T, key func(T) string) [][]T {
	at := map[string]int{}
	var groups [][]T
	for _, x := range items {
		k := key(x)
		i, ok := at[k]
		if !ok {
			i = len(groups)
			at[k] = i
			groups = append(groups, nil)
		}
		groups[i] = append(groups[i], x)
	}
	return groups
}

// missingIDFindings reports the features without an id: one problem for each file (or
// table), kind and notes, on the first such feature.
func (l *loader) missingIDFindings() {
	for _, g := range groupBy(l.missingIDs, func(m missingID) string {
		return strings.Join([]string{m.src.File, m.src.Table, m.kind, m.empty, m.near}, "\x00")
	}) {
		m := g[0]
		more := ""
		if len(g) > 1 {
			srcs := make([]Source, len(g)-1)
			for i, o := range g[1:] {
				srcs[i] = o.src
			}
			more = fmt.Sprintf(", and on %s of this file (%s)", input.Counted(len(g)-1, "more "+m.kind, "more "+m.kind+"s"),
				othersText(srcs, make([]string, len(srcs))))
		}
		l.errs.Add(&input.Problem{File: m.src.File, Feature: m.src.Feature(""), Key: PropID,
			Err: problemf(ErrMissingProperty, "missing%s%s; every %s needs a unique id%s", m.empty, more, m.kind, m.near)})
	}
}

// projectedAdvice ends the problem of a position that looks projected: what to do.
const projectedAdvice = `reproject to WGS84 longitude/latitude, or name their system in a "crs" member of the FeatureCollection ({"type": "name", "properties": {"name": "EPSG:<code>"}}; needs a build with PROJ)`

// projectedFindings reports the features whose positions look projected: one problem for
// each file (or table), on its first such feature, saying how many more there are.
func (l *loader) projectedFindings() {
	for _, g := range groupBy(l.projected, func(p projected) string { return p.src.File + "\x00" + p.src.Table }) {
		p := g[0]
		err := p.err
		if len(g) > 1 {
			srcs := make([]Source, len(g)-1)
			ids := make([]string, len(g)-1)
			for i, o := range g[1:] {
				srcs[i], ids[i] = o.src, o.id
			}
			head, _ := strings.CutSuffix(err.Error(), "; "+projectedAdvice)
			err = problemf(ErrProjected, "%s, and so do positions of %s of this file (%s); %s",
				head, input.Counted(len(g)-1, "more feature", "more features"), othersText(srcs, ids), projectedAdvice)
		}
		l.errs.Add(input.Place(input.Problem{File: p.src.File, Feature: p.src.Feature(p.id), Key: "geometry"}, err))
	}
}

// geometryErr reports a feature's geometry problem: at once, or, for a position that looks
// projected, with the file's others (projectedFindings).
func (f *feature) geometryErr(err error) {
	if errors.Is(err, ErrProjected) {
		f.l.projected = append(f.l.projected, projected{f.src, f.id, err})
		return
	}
	f.add("geometry", err)
}
