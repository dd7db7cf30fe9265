package input

import (
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"
)

// Sentinels of the problems every input format shares, for errors.Is. The packages that read
// a format re-export those they document (media.ErrUnknownField is ErrUnknownKey).
var (
	// ErrNotYAML is a YAML file that does not parse, or holds no document.
	ErrNotYAML = errors.New("not YAML")
	// ErrUnknownKey is a key the file kind does not have.
	ErrUnknownKey = errors.New("unknown key")
	// ErrMissingKey is a key the file kind needs and the file leaves out.
	ErrMissingKey = errors.New("missing key")
	// ErrWrongType is a value of the wrong kind: a list where a number is wanted.
	ErrWrongType = errors.New("wrong type")
	// ErrBadValue is a value of the right kind that is not allowed.
	ErrBadValue = errors.New("bad value")
)

// Errorf returns an error whose text is the formatted message alone and which unwraps to
// kind, so that messages read naturally and callers still test with errors.Is(err, kind).
func Errorf(kind error, format string, args ...any) error {
	return &problem{kind, fmt.Sprintf(format, args...)}
}

// Feature names one feature: of a GeoJSON FeatureCollection by its 0-based position in the
// file's features, or of a table (a GeoPackage's or a database's) by the table and the row's
// feature id, its primary key; and by its id ("" when it has none).
type Feature struct {
	Index int
	ID    string
	// Table is the feature's table, "" for a GeoJSON feature; FID is then its row's feature id.
	Table string
	FID   int64
}

// String names the feature as a problem does: `feature #3 "P-1"`, `feature #4 (no id)`,
// `table pathways fid 12 (id "D-07")` or `table entrances fid 3 (no id)`.
func (f Feature) String() string {
	if f.Table != "" {
		if f.ID == "" {
			return fmt.Sprintf("table %s fid %d (no id)", TableName(f.Table), f.FID)
		}
		return fmt.Sprintf("table %s fid %d (id %q)", TableName(f.Table), f.FID, f.ID)
	}
	if f.ID == "" {
		return fmt.Sprintf("feature #%d (no id)", f.Index)
	}
	return fmt.Sprintf("feature #%d %q", f.Index, f.ID)
}

// TableName prints a table's name for a message: as it is when it is a plain SQL identifier
// (letters, digits, underscores, not starting with a digit), quoted otherwise.
func TableName(name string) string {
	for i, r := range name {
		if !(r == '_' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || i > 0 && r >= '0' && r <= '9') {
			return strconv.Quote(name)
		}
	}
	if name == "" {
		return `""`
	}
	return name
}

// Problem is one problem with an input file, at a place in it. It prints
//
//	file:line:col: feature #3 "P-1": property "duct_mm": want …, got …
//	file: table pathways fid 12 (id "D-07"): property "duct_mm": want …, got …
//	file:line:col: medium "om4": range_m: want …, got …
//
// leaving out what is unknown: the line and column (1-based, 0 when unknown), the feature
// (nil for a problem of a YAML file or of a whole GeoJSON file), the item and the key.
type Problem struct {
	File      string
	Line, Col int
	Feature   *Feature
	// Item is the entry of a YAML file concerned, as the message shows it: `medium "om4"`,
	// `rule "reach"`, `case "fast"`; "" for none.
	Item string
	// Key is the key path in the file or item ("design.slack_m", "media[0].range_m"), or a
	// feature's property ("riser_m", printed `property "riser_m"`; "geometry" for its
	// geometry); "" when the problem is not about one key.
	Key string
	// Value is the value given, as text, when the problem is about one value (a number
	// out of range); it is printed after Err as ", got Value". "" when Err says it.
	Value string
	// Err says what was expected; it wraps one of the sentinels, for errors.Is.
	Err error
	// Class, when set, is matched by errors.Is without being printed: the kind of file
	// (route.ErrPlan, sweep.ErrInvalid) whose every problem it is.
	Class error
}

func (p *Problem) Error() string {
	var b strings.Builder
	sep := func() {
		if b.Len() > 0 {
			b.WriteString(": ")
		}
	}
	b.WriteString(p.File)
	if p.Line > 0 {
		fmt.Fprintf(&b, ":%d", p.Line)
		if p.Col > 0 {
			fmt.Fprintf(&b, ":%d", p.Col)
		}
	}
	if f := p.Feature; f != nil {
		sep()
		b.WriteString(f.String())
	}
	if p.Item != "" {
		sep()
		b.WriteString(p.Item)
	}
	if p.Key != "" {
		sep()
		if p.Feature != nil && p.Key != "geometry" {
			fmt.Fprintf(&b, "property %q", p.Key)
		} else {
			b.WriteString(p.Key)
		}
	}
	sep()
	if p.Err != nil {
		b.WriteString(p.Err.Error())
	}
	if p.Value != "" {
		b.WriteString(", got ")
		b.WriteString(p.Value)
	}
	return b.String()
}

// Unwrap returns Err.
func (p *Problem) Unwrap() error { return p.Err }

// Is reports whether target is the problem's Class.
func (p *Problem) Is(target error) bool { return p.Class != nil && target == p.Class }

// Place returns err as a problem at the place at gives (its File, Line, Col, Feature, Item,
// Key and Class). When err is a *Problem that names no file (a Range's), its Err and Value
// are taken over, so the value stays a field; any other error becomes Err.
func Place(at Problem, err error) *Problem {
	if p, ok := err.(*Problem); ok && p.File == "" && p.Line == 0 && p.Feature == nil && p.Item == "" && p.Key == "" {
		at.Err, at.Value = p.Err, p.Value
		return &at
	}
	at.Err = err
	return &at
}

// MaxProblems caps how many problems one Problems keeps, so that a file whose every feature
// is wrong cannot fill memory; the rest are counted. It is far above what a campus file of
// the largest size accepted shows in practice (a systematic error, such as numbers written
// as strings, gives one problem per feature: 259 on a 40-building campus).
const MaxProblems = 10000

// Problems is every problem found in the input of one run, reported at once: one per line,
// then how many more there were beyond MaxProblems.
type Problems struct {
	List    []*Problem
	Dropped int // problems beyond MaxProblems
}

// Add appends err: a *Problem as it is, the problems of a *Problems one by one, and any
// other error as the Err of a Problem that names no file. It counts in Dropped what is
// beyond MaxProblems; a nil err adds nothing.
func (l *Problems) Add(err error) {
	var p *Problem
	var ps *Problems
	switch {
	case err == nil:
		return
	case errors.As(err, &ps) && error(ps) == err:
		for _, q := range ps.List {
			l.Add(q)
		}
		l.Dropped += ps.Dropped
		return
	case errors.As(err, &p) && error(p) == err:
	default:
		p = &Problem{Err: err}
	}
	if len(l.List) >= MaxProblems {
		l.Dropped++
		return
	}
	l.List = append(l.List, p)
}

// AddNew is Add for problems that may have been found already by another check: each
// problem of err (one, or every one of a *Problems) is added unless l holds one of the same
// text. The texts l holds are looked up in a set, so adding many to many stays linear.
func (l *Problems) AddNew(err error) {
	var more Problems
	more.Add(err)
	if len(more.List) == 0 {
		l.Dropped += more.Dropped
		return
	}
	kept := make(map[string]bool, len(l.List)+len(more.List))
	for _, p := range l.List {
		kept[p.Error()] = true
	}
	for _, q := range more.List {
		if t := q.Error(); !kept[t] {
			kept[t] = true
			l.Add(q)
		}
	}
	l.Dropped += more.Dropped
}

// Len is the number of problems found, kept or dropped.
func (l *Problems) Len() int { return len(l.List) + l.Dropped }

// Err returns l when it holds a problem and nil otherwise.
func (l *Problems) Err() error {
	if l.Len() == 0 {
		return nil
	}
	return l
}

// Sort orders the problems of each file by line and column, files in the order of their
// first problem; problems at the same place keep the order they were found in.
func (l *Problems) Sort() {
	first := map[string]int{}
	for i, p := range l.List {
		if _, ok := first[p.File]; !ok {
			first[p.File] = i
		}
	}
	slices.SortStableFunc(l.List, func(a, b *Problem) int {
		if a.File != b.File {
			return first[a.File] - first[b.File]
		}
		if a.Line != b.Line {
			return a.Line - b.Line
		}
		return a.Col - b.Col
	})
}

// Error prints every kept problem on its own line, then how many were dropped.
func (l *Problems) Error() string {
	var b strings.Builder
	for i, p := range l.List {
		if i > 0 {
			b.WriteByte('\n')
		}
		b.WriteString(p.Error())
	}
	if l.Dropped > 0 {
		fmt.Fprintf(&b, "\n(and %d more errors)", l.Dropped)
	}
	return b.String()
}

// Unwrap lets errors.Is and errors.As look at every kept problem.
func (l *Problems) Unwrap() []error {
	errs := make([]error, len(l.List))
	for i, p := range l.List {
		errs[i] = p
	}
	return errs
}
