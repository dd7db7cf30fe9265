package geo

import (
	"bytes"
	"cmp"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"math"
	"os"
	"slices"
	"strconv"
	"strings"

	"github.com/paulmach/orb"

	"spanwright/geo/input"
)

// Structure types, the values of a structure's "type" property.
const (
	StructureMaintenanceHole = "maintenance-hole"
	StructureHandhole        = "handhole"
	StructurePullBox         = "pull-box"
)

// Surfaces over proposed work, the values of a pathway's "surface" property.
const (
	SurfaceTurf     = "turf"
	SurfaceAsphalt  = "asphalt"
	SurfaceConcrete = "concrete"
)

// Surfaces lists the values of a pathway's "surface" property, in a fixed order.
func Surfaces() []string { return slices.Clone(surfaces) }

// Methods of new work along a pathway, the values of its "method" property: how a proposed
// pathway is built, and how ducts added beside an existing one are.
const (
	MethodTrench = "trench" // open trench, with restoration of the surface (the default)
	MethodBore   = "bore"   // horizontal directional bore: no open trench, no restoration
	// MethodNone is an existing pathway nothing may be built beside: its ducts full, it stays
	// full (a conduit on a bridge, a casing under a railway, a sleeve through a wall).
	MethodNone = "none"
)

// DefaultSpareDucts is a pathway's number of spare ducts when spare_ducts is absent.
const DefaultSpareDucts = 1

// MaxSpareDucts is the largest spare_ducts value accepted.
const MaxSpareDucts = 1000000

// MaxRiserM is the largest riser_m accepted, in metres: the tallest buildings stand about
// 830 m high.
const MaxRiserM = 1000

// MaxDuctMM is the largest duct_mm accepted, in millimetres (a duct of a metre is a tunnel).
const MaxDuctMM = 1000

// Ranges of the numeric properties.
var (
	riserRange = input.Range{Min: 0, Max: MaxRiserM, Unit: "metres"}
	ductRange  = input.Range{Min: 0, AboveMin: true, Max: MaxDuctMM, Unit: "millimetres"}
	spareRange = input.Range{Min: 0, Max: MaxSpareDucts, Whole: true}
)

// EntrancePrefix starts the junction ID of an entrance that has no id of its own: "E-" + the
// building ID, then "-2", "-3", … for further id-less entrances of the same building, in input
// order.
const EntrancePrefix = "E-"

var (
	kinds          = []string{KindBuilding, KindPathway, KindStructure, KindEntrance}
	roles          = []string{RoleMC, RoleIC}
	pathwayTypes   = []string{TypeDuct, TypeTunnel, TypeAerial, TypeBuried, TypeTray}
	statuses       = []string{StatusExisting, StatusProposed}
	emis           = []string{EMINone, EMILow, EMIHigh}
	surfaces       = []string{SurfaceTurf, SurfaceAsphalt, SurfaceConcrete}
	methods        = []string{MethodTrench, MethodBore, MethodNone}
	structureTypes = []string{StructureMaintenanceHole, StructureHandhole, StructurePullBox}
)

// problem is an error whose text is msg and which unwraps to one of the sentinels, so that
// messages read naturally and callers can still test with errors.Is.
type problem struct {
	kind error
	msg  string
}

func (p *problem) Error() string { return p.msg }
func (p *problem) Unwrap() error { return p.kind }

func problemf(kind error, format string, args ...any) error {
	return &problem{kind: kind, msg: fmt.Sprintf(format, args...)}
}

// Parse reads one GeoJSON FeatureCollection; name is used in error messages only. It returns
// every problem found as an *input.Problems, and never panics on bad input.
//
// Each feature's "kind" property says what it is; without one, polygons are buildings, lines
// are pathways and points are structures. A feature's id is its "id" property, or the
// Feature's own "id" member when the property is absent, each a string or a whole number
// (its decimal text); when both are given and differ, the property wins with a warning. Ids
// share one namespace across all kinds. A property whose value is JSON null or the empty
// string counts as absent; unknown properties are ignored. Campus-wide findings that stop
// nothing (ids that differ, footprints that overlap: sameFootprints) become warnings of
// Build.
func Parse(name string, data []byte) (*Campus, error) {
	l := newLoader()
	l.parseFile(name, data)
	return l.finish()
}

// Load reads and checks the GeoJSON files at paths as one campus: ids must be unique across
// all files, and an entrance may name a building from another file. Errors are as for Parse,
// and name the path as given. Each file must be a regular file of at most
// input.DefaultDataMiB MiB.
func Load(paths []string) (*Campus, error) { return LoadLimitContext(context.Background(), paths, 0) }

// LoadLimit is Load with a cap of maxBytes bytes on each file (0: input.DefaultDataMiB MiB).
func LoadLimit(paths []string, maxBytes int64) (*Campus, error) {
	return LoadLimitContext(context.Background(), paths, maxBytes)
}

// LoadContext is Load that gives up when ctx is done, between files and every
// featureCheckEvery features, returning ctx's error.
func LoadContext(ctx context.Context, paths []string) (*Campus, error) {
	return LoadLimitContext(ctx, paths, 0)
}

// LoadLimitContext is LoadLimit that gives up when ctx is done, as LoadContext.
func LoadLimitContext(ctx context.Context, paths []string, maxBytes int64) (*Campus, error) {
	r := NewReader(ctx)
	for _, p := range paths {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		r.ReadFile(p, maxBytes)
	}
	return r.Campus()
}

// LoadFS is Load reading the named files from fsys.
func LoadFS(fsys fs.FS, names []string) (*Campus, error) {
	return LoadFSContext(context.Background(), fsys, names)
}

// LoadFSContext is LoadContext reading the named files from fsys.
func LoadFSContext(ctx context.Context, fsys fs.FS, names []string) (*Campus, error) {
	r := NewReader(ctx)
	for _, n := range names {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		r.ReadFS(fsys, n)
	}
	return r.Campus()
}

// ReadFS reads the GeoJSON file name from fsys, a file of at most input.DefaultDataMiB MiB.
func (r *Reader) ReadFS(fsys fs.FS, name string) {
	data, err := input.ReadFS(fsys, name, input.Cap(0, input.DefaultDataMiB))
	if err != nil {
		r.l.fileErr(name, fmt.Errorf("read: %w", input.Cause(err)))
		return
	}
	r.l.parseFile(name, data)
}

// Reader reads one campus from any number of sources: GeoJSON files (ReadFile, Parse) and
// tables of GeoPackages and databases (Row, from packages geo/gpkg and geo/postgis). Every
// feature, whatever its source, goes through the same checks; ids are unique across all
// sources and an entrance may name a building of another. Campus returns the campus or
// every problem found. A Reader is not safe for concurrent use.
type Reader struct {
	l    *loader
	seen []seenFile
}

type seenFile struct {
	path string
	info os.FileInfo
}

// NewReader returns a Reader that stops reading when ctx is done: between files, tables and
// every featureCheckEvery features; Campus then returns ctx's error.
func NewReader(ctx context.Context) *Reader {
	l := newLoader()
	l.ctx = ctx
	return &Reader{l: l}
}

// Err is the error of the Reader's context, for readers of other sources to stop on.
func (r *Reader) Err() error { return r.l.ctx.Err() }

// ReadFile reads the GeoJSON file at path, a regular file of at most maxBytes bytes (0:
// input.DefaultDataMiB MiB).
func (r *Reader) ReadFile(path string, maxBytes int64) {
	if !r.Open(path) {
		return
	}
	data, err := input.ReadFile(path, input.Cap(maxBytes, input.DefaultDataMiB))
	if err != nil {
		r.l.fileErr(path, fmt.Errorf("read: %w", input.Cause(err)))
		return
	}
	r.l.parseFile(path, data)
}

// Parse reads one GeoJSON FeatureCollection from data; name is used in messages.
func (r *Reader) Parse(name string, data []byte) { r.l.parseFile(name, data) }

// Open notes path as a file of the campus. It returns false, having reported it, when the
// same file was named before (by the same or another path), which would make every one of
// its ids a duplicate.
func (r *Reader) Open(path string) bool {
	info, err := os.Stat(path)
	if err != nil {
		return true // the reading reports it
	}
	for _, q := range r.seen {
		if os.SameFile(info, q.info) {
			r.l.fileErr(path, input.Errorf(input.ErrBadValue, "the same file as %s, given twice; name each campus file once", q.path))
			return false
		}
	}
	r.seen = append(r.seen, seenFile{path, info})
	return true
}

// AddFile lists path among the campus's Files (the inputs outputs must never overwrite),
// for a reader of a file that is not GeoJSON; a GeoJSON file read by ReadFile or Parse is
// listed already.
func (r *Reader) AddFile(path string) { r.l.c.Files = append(r.l.c.Files, path) }

// Problem reports a problem of a source as a whole (a file, a table): a reader of another
// source calls it for what is not one feature's.
func (r *Reader) Problem(p *input.Problem) {
	r.l.lost = true
	r.l.errs.Add(p)
}

// Partial is what a campus read with problems tells of its buildings, for checking what
// names them (a plan's hub and links) in the same run (Reader.Partial).
type Partial struct {
	// Buildings are the buildings read, by id; their properties may have problems of their
	// own.
	Buildings []Building
	// Unsure are the ids of the features that could not be read far enough to know their
	// kind (a kind misspelt, no geometry): each may be a building, with any role.
	Unsure []string
	// RoleUnread is set when a building gives its role under a property spelt like "role"
	// ("ROLE"), which is not read: which building has role mc is not known.
	RoleUnread bool
}

// PartialOf is the Partial of a campus read whole (whose network has problems).
func PartialOf(c *Campus) *Partial { return &Partial{Buildings: c.Buildings} }

// Partial returns, once Campus has returned problems, what they leave known of the
// buildings: nil when a feature, file or table could not be read far enough to know its id
// (it might be the building a plan names), or when the campus read without problems.
func (r *Reader) Partial() *Partial {
	l := r.l
	if l.lost || l.errs.Len() == 0 || l.ctx.Err() != nil {
		return nil
	}
	bs := slices.Clone(l.c.Buildings)
	slices.SortStableFunc(bs, func(a, b Building) int { return strings.Compare(a.ID, b.ID) })
	return &Partial{Buildings: bs, Unsure: slices.Sorted(slices.Values(l.unsure)), RoleUnread: l.roleSlip}
}

// Campus checks the campus as a whole and returns it, or every problem found in any source
// as an *input.Problems, or the context's error.
func (r *Reader) Campus() (*Campus, error) { return r.l.finishContext() }

type loader struct {
	ctx   context.Context // the Reader's; parseFile stops reading features when it is done
	c     Campus
	errs  input.Problems
	warns []warnRec // what reading found that is no problem (Campus.warns)
	slips []warnRec // those of warns on a value likely not meant (Campus.slips)
	ids   map[string]idUse
	// idDiffers are the features whose id member differs from their id property, in the
	// order read (idWarnings).
	idDiffers []idDiff
	// blanks are the properties given as "" that took their default, by file, kind and
	// property in the order first met (blankWarnings); blankAt indexes them.
	blanks  []blankUse
	blankAt map[string]int
	// unprojected are the rows left in their table's own coordinate system (Row.Unprojected),
	// whose positions checkFar does not measure.
	unprojected map[Source]bool
	// blankIDs are the features whose id starts or ends with a space, in the order read
	// (blankIDWarnings).
	blankIDs []idCand
	// smallDucts are the pathways whose duct_mm is below SmallestDuctMM, in the order read
	// (smallDuctWarnings).
	smallDucts []unitSlip
	// tallRisers are the buildings whose riser_m is above TallRiserM, in the order read
	// (tallRiserWarnings).
	tallRisers []unitSlip
	// lost is set when a feature, file or table could not be read far enough to know its
	// id (Reader.Partial); unsure are the ids of features read that far but not to a kind.
	lost   bool
	unsure []string
	// near are the properties not read that are a slip for one read, in the order read
	// (nearFindings); nearMemo remembers nearestName's answers (nearCache).
	near     []nearUse
	nearMemo map[string]map[string]string
	// groups are the shared-risk groups pathways give, with the pathway, in the order read
	// (groupWarnings).
	groups []groupUse
	// missingIDs are the features without the id their kind needs, and projected those
	// with a position that looks projected, in the order read (missingIDFindings,
	// projectedFindings: one problem per file for each).
	missingIDs []missingID
	projected  []projected
	// roleSlip is set when a building's role is not read for a property spelt like it
	// (nearFindings): the hub by role is not known (Partial.RoleUnread).
	roleSlip bool
}

// idDiff is a feature whose Feature "id" member (as a message prints it) differs from its
// "id" property, the feature's id.
type idDiff struct {
	src    Source
	id     string
	member string
}

// idWarningsEach is how many features of one file whose id member differs from their id
// property are warned about one by one; more are one warning, on the first.
const idWarningsEach = 3

// idWarnings warns of the features whose id member differs from their id property: each,
// or one warning per file when a file has more than idWarningsEach (an export that writes
// its own key as the member, say).
func (l *loader) idWarnings() {
	warnPerFile(l, l.idDiffers, func(d idDiff) (Source, string) { return d.src, d.id },
		func(d idDiff) string {
			return fmt.Sprintf("the Feature's \"id\" member %s differs from its \"id\" property %q; the property is the feature's id",
				d.member, d.id)
		},
		func(d idDiff, more int) string {
			return fmt.Sprintf("the Feature's \"id\" member %s differs from its \"id\" property %q, and so do those of %s of this file; the property is each feature's id",
				d.member, d.id, input.Counted(more, "more feature", "more features"))
		})
}

// warnPerFile warns of each finding of items (its source and feature id by at) with each's
// text, or, for a file with more than idWarningsEach of them, once on its first with first's
// text, told how many more the file has.
func warnPerFile[T any](l *loader, items []T, at func(T) (Source, string), each func(T) string, first func(T, int) string) {
	byFile := map[string][]T{}
	var files []string
	for _, x := range items {
		src, _ := at(x)
		if byFile[src.File] == nil {
			files = append(files, src.File)
		}
		byFile[src.File] = append(byFile[src.File], x)
	}
	for _, file := range files {
		xs := byFile[file]
		if len(xs) <= idWarningsEach {
			for _, x := range xs {
				src, id := at(x)
				l.warn(src, id, each(x))
			}
			continue
		}
		src, id := at(xs[0])
		l.warn(src, id, first(xs[0], len(xs)-1))
	}
}

// warn notes a finding of the reading that does not stop it, on the feature of id at src.
func (l *loader) warn(src Source, id, msg string) {
	l.warns = append(l.warns, warnRec{src: src, id: id, msg: msg})
}

// idUse records the first feature that used an id.
type idUse struct {
	Source
	kind string
}

func newLoader() *loader {
	return &loader{ctx: context.Background(), ids: make(map[string]idUse), unprojected: make(map[Source]bool)}
}

// featureCheckEvery is how many features a file's reading takes between two looks at the
// context.
const featureCheckEvery = 256

// finishContext is finish, or the error of a context done while the files were read.
func (l *loader) finishContext() (*Campus, error) {
	if err := l.ctx.Err(); err != nil {
		return nil, err
	}
	return l.finish()
}

func (l *loader) fileErr(file string, err error) {
	l.lost = true
	l.errs.Add(&input.Problem{File: file, Err: err})
}

func (l *loader) finish() (*Campus, error) {
	// Entrances in one order before their ids are generated, so that an entrance without an
	// id gets the same generated id whatever the order of the features and files.
	slices.SortStableFunc(l.c.Entrances, func(a, b Entrance) int {
		return cmp.Or(strings.Compare(a.Building, b.Building), cmp.Compare(a.Point[0], b.Point[0]),
			cmp.Compare(a.Point[1], b.Point[1]), strings.Compare(a.ID, b.ID))
	})
	read := len(l.errs.List)
	l.nearFindings()
	l.missingIDFindings()
	l.projectedFindings()
	l.checkEntrances()
	l.checkMC()
	l.checkFar()
	if l.errs.Len() > 0 {
		l.placeLate(read)
		return nil, &l.errs
	}
	c := l.c
	c.sortFeatures()
	l.idWarnings()
	l.blankIDWarnings()
	l.smallDuctWarnings()
	l.tallRiserWarnings()
	l.groupWarnings()
	l.blankWarnings()
	c.warns = append(slices.Clone(l.warns), sameFootprints(c.Buildings)...)
	c.slips = slices.Clone(l.slips)
	return &c, nil
}

// placeLate puts the problems from index read on, found by the checks of the campus as a
// whole once every feature is read (an entrance's building, a second mc), among those found
// while reading: after the last problem of their file, and before those of the features
// after theirs there, so that every problem is listed in the order of the features. The
// problems found while reading keep their order.
func (l *loader) placeLate(read int) {
	late := slices.Clone(l.errs.List[read:])
	slices.SortStableFunc(late, func(a, b *input.Problem) int {
		return cmp.Or(strings.Compare(a.File, b.File), compareFeature(a.Feature, b.Feature))
	})
	list := l.errs.List[:read:read]
	for _, q := range late {
		at := len(list)
		for i := len(list) - 1; i >= 0; i-- {
			if list[i].File == q.File {
				at = i + 1
				break
			}
		}
		for at > 0 && list[at-1].File == q.File && list[at-1].Feature != nil && compareFeature(list[at-1].Feature, q.Feature) > 0 {
			at--
		}
		list = slices.Insert(list, at, q)
	}
	l.errs.List = list
}

// compareFeature orders two features of one file: by table, then index or feature id; no
// feature (a problem of the file or a table as a whole) first.
func compareFeature(a, b *input.Feature) int {
	switch {
	case a == nil && b == nil:
		return 0
	case a == nil:
		return -1
	case b == nil:
		return 1
	}
	return cmp.Or(strings.Compare(a.Table, b.Table), cmp.Compare(a.Index, b.Index), cmp.Compare(a.FID, b.FID))
}

// sortFeatures puts buildings, pathways and structures in one order whatever the order of the
// features and files: by id, and structures without an id by their point. (Entrances are put
// in order by their building and point before their ids are generated, in finish.)
func (c *Campus) sortFeatures() {
	slices.SortStableFunc(c.Buildings, func(a, b Building) int { return strings.Compare(a.ID, b.ID) })
	slices.SortStableFunc(c.Pathways, func(a, b Pathway) int { return strings.Compare(a.ID, b.ID) })
	slices.SortStableFunc(c.Structures, func(a, b Structure) int {
		return cmp.Or(strings.Compare(a.ID, b.ID), cmp.Compare(a.Point[0], b.Point[0]), cmp.Compare(a.Point[1], b.Point[1]),
			strings.Compare(a.Type, b.Type))
	})
}

// checkEntrances checks that every entrance names a building, and that the ids generated for
// id-less entrances clash with no declared id.
func (l *loader) checkEntrances() {
	for _, e := range l.c.Entrances {
		if e.Building == "" {
			continue // already reported as missing
		}
		use, ok := l.ids[e.Building]
		switch {
		case !ok:
			l.errs.Add(&input.Problem{File: e.File, Feature: e.Feature(e.ID), Key: PropBuilding,
				Err: problemf(ErrUnknownReference, "want the id of a building, got %q, which no feature has%s", e.Building, l.c.BuildingHint(e.Building))})
		case use.kind != KindBuilding:
			l.errs.Add(&input.Problem{File: e.File, Feature: e.Feature(e.ID), Key: PropBuilding,
				Err: problemf(ErrUnknownReference, "want the id of a building, got %q, which is a %s (%s)",
					e.Building, use.kind, use.Source)})
		}
	}
	for i, id := range EntranceIDs(l.c.Entrances) {
		e := l.c.Entrances[i]
		if e.ID != "" || e.Building == "" {
			continue
		}
		if use, ok := l.ids[id]; ok {
			l.errs.Add(&input.Problem{File: e.File, Feature: e.Feature(""), Key: PropID,
				Err: problemf(ErrDuplicateID, "this entrance has no id and its generated id %q is used by %s; give the entrance an id",
					id, use.Source)})
		}
	}
}

func (l *loader) checkMC() {
	first := -1
	for i, b := range l.c.Buildings {
		if b.Role != RoleMC {
			continue
		}
		if first < 0 {
			first = i
			continue
		}
		f := l.c.Buildings[first]
		l.errs.Add(&input.Problem{File: b.File, Feature: b.Feature(b.ID), Key: PropRole,
			Err: problemf(ErrBadValue, "want at most one %q building in the campus, got a second: %q (%s) is already %q",
				RoleMC, f.ID, f.Source, RoleMC)})
	}
}

// EntranceIDs returns the junction ID of each entrance, in the order given: its own id, or
// EntrancePrefix + building for the first id-less entrance of a building, then
// EntrancePrefix + building + "-2", "-3", … for the next ones.
func EntranceIDs(es []Entrance) []string {
	ids := make([]string, len(es))
	seen := make(map[string]int)
	for i, e := range es {
		if e.ID != "" {
			ids[i] = e.ID
			continue
		}
		seen[e.Building]++
		if n := seen[e.Building]; n > 1 {
			ids[i] = EntrancePrefix + e.Building + "-" + strconv.Itoa(n)
		} else {
			ids[i] = EntrancePrefix + e.Building
		}
	}
	return ids
}

func (l *loader) parseFile(name string, data []byte) {
	l.c.Files = append(l.c.Files, name)
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	var raw json.RawMessage
	if err := json.Unmarshal(data, &raw); err != nil {
		l.fileErr(name, problemf(ErrNotJSON, "not JSON: %s", jsonErrText(data, err)))
		return
	}
	dups := l.duplicates(name, data)
	var top map[string]json.RawMessage
	if err := json.Unmarshal(data, &top); err != nil || top == nil {
		l.fileErr(name, problemf(ErrNotCollection, "not a FeatureCollection: want a JSON object, got %s", describeRaw(data)))
		return
	}
	var typ string
	if t, ok := top["type"]; !ok {
		l.fileErr(name, problemf(ErrNotCollection, `not a FeatureCollection: missing "type"`))
		return
	} else if err := json.Unmarshal(t, &typ); err != nil {
		l.fileErr(name, problemf(ErrNotCollection, `not a FeatureCollection: want "type" "FeatureCollection", got %s`, describeRaw(t)))
		return
	}
	if typ != "FeatureCollection" {
		hint := ""
		if typ == "Feature" || isGeometryType(typ) {
			hint = "; wrap it in a FeatureCollection"
		}
		l.fileErr(name, problemf(ErrNotCollection, `not a FeatureCollection: "type" is %q%s`, typ, hint))
		return
	}
	to, code, readable := l.fileCRS(name, top)
	if !readable {
		return
	}
	var feats []json.RawMessage
	if f, ok := top["features"]; !ok {
		l.fileErr(name, problemf(ErrNotCollection, `not a FeatureCollection: missing "features"`))
		return
	} else if err := json.Unmarshal(f, &feats); err != nil || feats == nil {
		l.fileErr(name, problemf(ErrNotCollection, `not a FeatureCollection: want "features" to be an array, got %s`, describeRaw(f)))
		return
	}
	if to != nil {
		feats = l.toWGS84(name, code, feats, to)
	}
	for i, f := range feats {
		if i%featureCheckEvery == 0 && l.ctx.Err() != nil {
			return
		}
		l.parseFeature(Source{File: name, Index: i}, f, dups[i])
	}
}

// duplicates reports the members given twice outside the features and returns those inside
// them by feature index, for parseFeature to report with the feature's id.
func (l *loader) duplicates(name string, data []byte) map[int][]input.Duplicate {
	var byFeature map[int][]input.Duplicate
	for _, d := range input.JSONDuplicates(data) {
		if len(d.Path) >= 2 && d.Path[0].Key == "features" && d.Path[1].Key == "" {
			if byFeature == nil {
				byFeature = map[int][]input.Duplicate{}
			}
			byFeature[d.Path[1].Index] = append(byFeature[d.Path[1].Index], d)
			continue
		}
		l.fileErr(name, fmt.Errorf("member %q: %w", d.Where(), d.Err()))
	}
	return byFeature
}

// reportDuplicates reports members of the feature given twice: a property by its name,
// any other member by its path in the feature.
func (f *feature) reportDuplicates(dups []input.Duplicate) {
	for _, d := range dups {
		if len(d.Path) == 3 && d.Path[2].Key == "properties" {
			f.add(d.Key, d.Err())
			continue
		}
		d.Path = d.Path[2:]
		f.add("", fmt.Errorf("member %q: %w", d.Where(), d.Err()))
	}
}

// jsonErrText describes a JSON syntax error with its line and column (both 1-based).
func jsonErrText(data []byte, err error) string {
	var se *json.SyntaxError
	if errors.As(err, &se) {
		off := int(se.Offset)
		if off > len(data) {
			off = len(data)
		}
		line := 1 + bytes.Count(data[:off], []byte("\n"))
		col := off - bytes.LastIndexByte(data[:off], '\n')
		return fmt.Sprintf("%s (line %d, column %d)", se.Error(), line, col)
	}
	return err.Error()
}

func isGeometryType(t string) bool {
	switch t {
	case "Point", "MultiPoint", "LineString", "MultiLineString", "Polygon", "MultiPolygon", "GeometryCollection":
		return true
	}
	return false
}

// feature is one feature being read: its source, id and raw properties.
type feature struct {
	l     *loader
	src   Source
	id    string
	kind  string // set once check has decided it: blankDefaults names it
	props map[string]any
	// asked are the properties the reader read of the feature (prop), in the order read:
	// what nearCheck matches the others against. hinted are those a missing problem's
	// message named a slip for (nearNote).
	asked, hinted []string
	askedBuf      [16]string // asked's first array, in the feature's own allocation
	// taken are the defaults taken for properties not given (defaulted), in the order read.
	taken    []takenDefault
	takenBuf [12]takenDefault
}

func (f *feature) add(prop string, err error) {
	f.l.errs.Add(input.Place(input.Problem{File: f.src.File, Feature: f.src.Feature(f.id), Key: prop}, err))
}

func (l *loader) parseFeature(src Source, raw json.RawMessage, dups []input.Duplicate) {
	f := &feature{l: l, src: src}
	defer f.reportDuplicates(dups) // after readID, so that the messages name the feature's id
	v, err := decodeAny(raw)
	obj, ok := v.(map[string]any)
	if err != nil || !ok {
		l.lost = true
		f.add("", problemf(ErrWrongType, "want a Feature object, got %s", describe(v)))
		return
	}
	if t, _ := obj["type"].(string); t != "Feature" {
		l.lost = true
		f.add("", problemf(ErrWrongType, `want "type" "Feature", got %s`, describe(obj["type"])))
		return
	}
	switch p := obj["properties"].(type) {
	case nil:
		f.props = map[string]any{}
	case map[string]any:
		f.props = p
	default:
		l.lost = true
		f.add("", problemf(ErrWrongType, `want "properties" to be an object, got %s`, describe(p)))
		return
	}

	geom, gerr := parseGeometry(obj["geometry"])
	f.check(obj["id"], geom, gerr, "")
}

// check is the one path every feature takes, whatever its source: its id (the "id" property,
// else member, the GeoJSON Feature's own id), its kind (the "kind" property, else tableKind,
// the kind its table's name gives, else its geometry's type), then its geometry (geom as
// decoded, or gerr) and properties by kind, adding the feature to the campus.
func (f *feature) check(member any, geom orb.Geometry, gerr error, tableKind string) {
	l := f.l
	idOK := f.readID(member)
	if !idOK {
		l.lost = true // its id, which a plan may name, is not known
	}
	kind, hasKind := f.str(PropKind)
	switch {
	case hasKind && !contains(kinds, kind):
		f.unsure(idOK)
		f.add(PropKind, badEnum(kinds, kind))
		return
	case hasKind && tableKind != "" && kind != tableKind:
		f.unsure(idOK)
		f.add(PropKind, problemf(ErrBadValue, "want %q in table %s, which holds %ss (or no kind), got %q",
			tableKind, input.TableName(f.src.Table), tableKind, kind))
		return
	case hasKind:
	case tableKind != "":
		kind = tableKind
	default:
		switch geom.(type) {
		case orb.Polygon, orb.MultiPolygon:
			kind = KindBuilding
		case orb.LineString, orb.MultiLineString:
			kind = KindPathway
		case orb.Point:
			kind = KindStructure
		default:
			f.unsure(idOK) // no kind: a building, perhaps
			if gerr != nil {
				f.geometryErr(gerr)
				return
			}
			f.add("geometry", problemf(ErrBadGeometry, `want Polygon, MultiPolygon, LineString, MultiLineString or Point (or a "kind" property), got %s`, geomName(geom)))
			return
		}
	}

	if idOK {
		if f.id == "" {
			if kindNeedsID(kind) {
				l.missingIDs = append(l.missingIDs, missingID{src: f.src, kind: kind, empty: f.emptyNote(PropID), near: f.nearNote(PropID)})
			}
			if kind == KindBuilding {
				l.lost = true // a building without an id may be the one a plan names
			}
		} else if kind == KindPathway && strings.Contains(f.id, "/") {
			f.add(PropID, problemf(ErrBadValue, `want a pathway id without "/" (span ids use it), got %q`, f.id))
		} else if use, dup := l.ids[f.id]; dup {
			f.add(PropID, problemf(ErrDuplicateID, "duplicate id %q: first used by %s", f.id, use.Source))
		} else {
			l.ids[f.id] = idUse{Source: f.src, kind: kind}
			if blankEnds(f.id) != "" {
				l.blankIDs = append(l.blankIDs, idCand{f.id, f.src})
			}
		}
	}

	if gerr != nil {
		f.geometryErr(gerr)
	}
	f.kind = kind
	switch kind {
	case KindBuilding:
		f.building(geom, gerr == nil)
	case KindPathway:
		f.pathway(geom, gerr == nil)
	case KindStructure:
		f.structure(geom, gerr == nil)
	case KindEntrance:
		f.entrance(geom, gerr == nil)
	}
	f.nearCheck()
}

// unsure notes that f could not be read to a kind: its id, when idOK (else lost is set
// already), may be a building's.
func (f *feature) unsure(idOK bool) {
	if idOK && f.id != "" {
		f.l.unsure = append(f.l.unsure, f.id)
	}
}

func kindNeedsID(kind string) bool { return kind != KindEntrance }

// readID sets f.id from the "id" property or, failing that, the Feature's own id member:
// each a string, or a whole number taken as its decimal text (idText), as GIS exports
// write integer ids. An empty string counts as absent, as null does (present). When both
// are given and differ, the property is the id and a warning says so. It reports false when
// the id is given but unusable (already reported).
func (f *feature) readID(member any) bool {
	prop, propErr := idText(f.prop(PropID))
	mem, memErr := idText(member)
	if propErr != nil {
		f.add(PropID, problemf(ErrWrongType, "want a string or a whole number, got %s", describe(f.props[PropID])))
		return false
	}
	if prop != "" {
		f.id = prop
		if mem != "" && mem != prop {
			f.l.idDiffers = append(f.l.idDiffers, idDiff{f.src, prop, describeID(member)})
		}
		return true
	}
	if memErr != nil {
		f.add(PropID, problemf(ErrWrongType, `want the Feature "id" member to be a string or a whole number, got %s`, describe(member)))
		return false
	}
	f.id = mem
	return true
}

// idText is an id as given in v: a string as it is, a whole number as its decimal text
// (1021 and 1021.0 are "1021"), "" for null, absent or an empty string; an error for any
// other value (a fraction, a boolean, an array).
func idText(v any) (string, error) {
	switch t := v.(type) {
	case nil:
		return "", nil
	case string:
		return t, nil
	case json.Number:
		if wholeDigits(string(t)) {
			return string(t), nil
		}
		x, err := strconv.ParseFloat(string(t), 64)
		// 2^53: beyond it a float64 holds no longer every whole number, so 1e300 is no id.
		if err == nil && x == math.Trunc(x) && math.Abs(x) <= 1<<53 {
			return strconv.FormatFloat(x, 'f', -1, 64), nil
		}
	}
	return "", problemf(ErrWrongType, "not an id")
}

// wholeDigits reports whether s is an integer as JSON writes one: an optional minus, then
// digits.
func wholeDigits(s string) bool {
	s = strings.TrimPrefix(s, "-")
	if s == "" {
		return false
	}
	for _, r := range s {
		if r < '0' || r > '9' {
			return false
		}
	}
	return true
}

// describeID prints an id member, or another property's value, for a message: a string
// quoted, anything else as describe does.
func describeID(v any) string {
	if s, ok := v.(string); ok {
		return strconv.Quote(s)
	}
	return describe(v)
}

func (f *feature) building(g orb.Geometry, ok bool) {
	var fp orb.MultiPolygon
	if ok {
		switch t := g.(type) {
		case orb.Polygon:
			fp = orb.MultiPolygon{t}
		case orb.MultiPolygon:
			fp = t
		default:
			f.add("geometry", problemf(ErrBadGeometry, "want Polygon or MultiPolygon for a building, got %s", geomName(g)))
		}
	}
	name, _ := f.str(PropName)
	role, _ := f.enum(PropRole, roles, "")
	riser := f.num(PropRiserM, DefaultRiserM, riserRange)
	if riser > TallRiserM {
		f.l.tallRisers = append(f.l.tallRisers, unitSlip{f.src, f.id, riser})
	}
	transit := f.flag(PropTransit)
	f.l.c.Buildings = append(f.l.c.Buildings, Building{
		Source: f.src, ID: f.id, Name: name, Role: role, RiserM: riser, Transit: transit, Footprint: fp,
	})
}

// joinParts joins the parts of a pathway drawn in pieces where exactly two part ends meet at
// one point, so that a run drawn as two lines meeting at a vertex is the same pathway as the
// run drawn as one line: the meeting point is an interior vertex, not a junction. Parts
// whose ends meet no other part's, or meet two or more, are kept as they are.
func joinParts(mls orb.MultiLineString) orb.MultiLineString {
	parts := make([]orb.LineString, 0, len(mls))
	for _, l := range mls {
		if len(l) > 0 {
			parts = append(parts, l)
		}
	}
	if len(parts) < 2 {
		return parts
	}
	// The part ends at each point: a point with exactly two, of two different open parts,
	// joins them. One pass to count, one to walk the chains: linear in the parts.
	type end struct {
		part int
		head bool
	}
	at := make(map[orb.Point][]end, 2*len(parts))
	closed := func(l orb.LineString) bool { return l[0] == l[len(l)-1] }
	for i, l := range parts {
		if closed(l) {
			continue
		}
		at[l[0]] = append(at[l[0]], end{i, true})
		at[l[len(l)-1]] = append(at[l[len(l)-1]], end{i, false})
	}
	used := make([]bool, len(parts))
	// next is the open part, not yet used, whose end meets the chain's tail at a point
	// where exactly two part ends meet, oriented to continue the chain.
	next := func(tail orb.Point, self int) (orb.LineString, int, bool) {
		es := at[tail]
		if len(es) != 2 || es[0].part == es[1].part {
			return nil, 0, false
		}
		e := es[0]
		if e.part == self {
			e = es[1]
		}
		if used[e.part] {
			return nil, 0, false
		}
		l := parts[e.part]
		if !e.head {
			l = slices.Clone(l)
			slices.Reverse(l)
		}
		return l, e.part, true
	}
	out := make(orb.MultiLineString, 0, len(parts))
	for i, l := range parts {
		if used[i] {
			continue
		}
		used[i] = true
		if closed(l) {
			out = append(out, l)
			continue
		}
		chain := slices.Clone(l)
		last := i
		for pass := 0; pass < 2; pass++ {
			for {
				nl, k, ok := next(chain[len(chain)-1], last)
				if !ok {
					break
				}
				used[k], last = true, k
				chain = append(chain, nl[1:]...)
			}
			if pass == 0 {
				// Then grow it at its head: turn it round and go on from there.
				slices.Reverse(chain)
				last = i
			}
		}
		if chain[len(chain)-1] == l[0] {
			slices.Reverse(chain) // nothing joined at its head: keep the first part's direction
		}
		out = append(out, chain)
	}
	return out
}

func (f *feature) pathway(g orb.Geometry, ok bool) {
	var lines orb.MultiLineString
	if ok {
		switch t := g.(type) {
		case orb.LineString:
			lines = orb.MultiLineString{t}
		case orb.MultiLineString:
			lines = joinParts(t)
		default:
			f.add("geometry", problemf(ErrBadGeometry, "want LineString or MultiLineString for a pathway, got %s", geomName(g)))
		}
	}
	typ, _ := f.enum(PropType, pathwayTypes, TypeDuct)
	status, _ := f.enum(PropStatus, statuses, StatusExisting)
	emi, _ := f.enum(PropEMI, emis, EMINone)
	surface, _ := f.enum(PropSurface, surfaces, "")
	method, methodFixed := f.enum(PropMethod, methods, MethodTrench)
	if method == MethodNone && status == StatusExisting && typ != TypeDuct {
		// What none forbids is ducts added beside full ones and taps cut into the run.
		f.add(PropMethod, problemf(ErrBadValue, "want %q only on a pathway of type %q, whose full ducts it keeps from getting more beside them; this one is %q",
			MethodNone, TypeDuct, typ))
		method, methodFixed = MethodTrench, false
	}
	if method == MethodNone && status == StatusProposed {
		// New construction is built some way: none is for a pathway already there.
		f.add(PropMethod, problemf(ErrBadValue, "want %q or %q on a proposed pathway (status %q), got %q, which is for an existing pathway nothing may be built beside",
			MethodTrench, MethodBore, StatusProposed, MethodNone))
		method, methodFixed = MethodTrench, false
	}
	plenum := f.flag(PropPlenum)
	if plenum && typ != TypeTray {
		// Cable in a raceway or outside a building is not in a plenum's air.
		f.add(PropPlenum, problemf(ErrBadValue, "want true only on a tray pathway (type %q); this one is %q", TypeTray, typ))
		plenum = false
	}
	group, has := f.str(PropGroup)
	if !has || group == "" {
		group = f.id
	} else {
		f.l.groups = append(f.l.groups, groupUse{group: group, pathway: f.id, src: f.src})
	}
	ductMM := f.num(PropDuctMM, DefaultDuctMM, ductRange)
	if ductMM < SmallestDuctMM {
		f.l.smallDucts = append(f.l.smallDucts, unitSlip{f.src, f.id, ductMM})
	}
	f.l.c.Pathways = append(f.l.c.Pathways, Pathway{
		Source:     f.src,
		ID:         f.id,
		Type:       typ,
		Status:     status,
		SpareDucts: int(f.num(PropSpareDucts, DefaultSpareDucts, spareRange)),
		DuctMM:     ductMM,
		EMI:        emi,
		Surface:    surface,
		Method:     method,
		MethodSet:  methodFixed,
		Plenum:     plenum,
		Group:      group,
		Lines:      lines,
	})
}

func (f *feature) point(g orb.Geometry, ok bool, kind string) orb.Point {
	if !ok {
		return orb.Point{}
	}
	p, isPoint := g.(orb.Point)
	if !isPoint {
		f.add("geometry", problemf(ErrBadGeometry, "want Point for a%s %s, got %s", article(kind), kind, geomName(g)))
	}
	return p
}

func article(kind string) string {
	if strings.HasPrefix(kind, "e") {
		return "n"
	}
	return ""
}

func (f *feature) structure(g orb.Geometry, ok bool) {
	p := f.point(g, ok, KindStructure)
	typ, _ := f.enum(PropType, structureTypes, "")
	f.l.c.Structures = append(f.l.c.Structures, Structure{Source: f.src, ID: f.id, Type: typ, Point: p})
}

func (f *feature) entrance(g orb.Geometry, ok bool) {
	p := f.point(g, ok, KindEntrance)
	// The building is named by its id, a string or a whole number as the id itself (idText).
	b, err := idText(f.prop(PropBuilding))
	switch {
	case err != nil:
		f.add(PropBuilding, problemf(ErrWrongType, "want the id of a building (a string or a whole number), got %s", describe(f.props[PropBuilding])))
	case b == "":
		f.add(PropBuilding, problemf(ErrMissingProperty, "missing%s; an entrance names the id of its building%s", f.emptyNote(PropBuilding), f.nearNote(PropBuilding)))
	}
	f.l.c.Entrances = append(f.l.c.Entrances, Entrance{Source: f.src, ID: f.id, Building: b, Point: p})
}

// given returns property key's value and whether it is given: a property that is absent,
// null or the empty string is not. A shapefile's text field cannot be NULL, so exports from
// one write "" for every empty attribute; "" is taken as absent wherever absent has a
// meaning (the default), and a property that is required says "missing" of it (emptyNote).
// A blank of blankDefaults, "" or a GeoJSON null (a database export's unknown), is noted
// for blankWarnings.
func (f *feature) given(key string) (any, bool) {
	v := f.prop(key)
	_, present := f.props[key]
	// A table's NULL is also how it holds a value absent (every row has every column), so
	// only GeoJSON's null, written where the key could have been left out, is a blank.
	if (v == "" || present && v == nil && f.src.Table == "") && blankDefaults[key] {
		f.l.noteBlank(f, key, v == nil)
	}
	if v == nil || v == "" {
		return nil, false
	}
	return v, true
}

// blankDefaults are the properties whose default the plan prices or routes by (a pathway's
// type, status, ducts, EMI, surface and method; a building's riser): given as "" (a shapefile's
// empty text field, which may mean "unknown"), each takes its default as if absent, and
// blankWarnings says so once per file, kind and property, so that a blank status taken as
// existing duct is never silent. Name, group, role, plenum and transit are left out: their
// default (none, own id, no role, false, may pass) is what a blank means. Common practice, no
// published source.
var blankDefaults = map[string]bool{
	PropType: true, PropStatus: true, PropSpareDucts: true, PropDuctMM: true, PropEMI: true,
	PropSurface: true, PropMethod: true, PropRiserM: true,
}

// blankUse is the first feature of one file and kind that gave property key as "" (or as
// null), and how many did.
type blankUse struct {
	src      Source
	id, kind string
	key      string
	null     bool // given as null (a table's NULL), not ""
	n        int
}

// noteBlank counts f giving property key as "", or as null when null is set (blankDefaults).
func (l *loader) noteBlank(f *feature, key string, null bool) {
	k := f.src.File + "\x00" + f.kind + "\x00" + key + "\x00" + strconv.FormatBool(null)
	if i, ok := l.blankAt[k]; ok {
		l.blanks[i].n++
		return
	}
	if l.blankAt == nil {
		l.blankAt = map[string]int{}
	}
	l.blankAt[k] = len(l.blanks)
	l.blanks = append(l.blanks, blankUse{src: f.src, id: f.id, kind: f.kind, key: key, null: null, n: 1})
}

// blankWarnings warns, on the first such feature, of each file, kind and property given as
// "" that took its default.
func (l *loader) blankWarnings() {
	for _, b := range l.blanks {
		what := "this feature gives"
		if b.n > 1 {
			what = fmt.Sprintf("%s of this file give", input.Counted(b.n, b.kind, b.kind+"s"))
		}
		as := "an empty string"
		if b.null {
			as = "null"
		}
		l.warn(b.src, b.id, fmt.Sprintf("%s %q as %s, taken as absent: %s; give the value if that is not what the drawing means",
			what, b.key, as, blankDefaultText(b.kind, b.key)))
	}
}

// emptyNote is " (an empty string counts as missing)" when property key is "", for the
// message of a required property; "" otherwise.
func (f *feature) emptyNote(key string) string {
	if f.props[key] == "" {
		return " (an empty string counts as missing)"
	}
	return ""
}

// str returns a string property and whether it is given (not absent, null or "", given); a
// non-string is reported.
func (f *feature) str(key string) (string, bool) {
	v, ok := f.given(key)
	if !ok {
		return "", false
	}
	s, isStr := v.(string)
	if !isStr {
		f.add(key, problemf(ErrWrongType, "want a string, got %s", describe(v)))
		return "", false
	}
	return s, true
}

// enum returns a property that must be one of allowed, or def when not given (given) or
// bad.
func (f *feature) enum(key string, allowed []string, def string) (string, bool) {
	v, ok := f.given(key)
	if !ok {
		f.defaulted(key, def)
		return def, false
	}
	s, isStr := v.(string)
	if !isStr || !contains(allowed, s) {
		f.add(key, badEnum(allowed, v))
		return def, false
	}
	return s, true
}

func badEnum(allowed []string, got any) error {
	q := make([]string, len(allowed))
	for i, a := range allowed {
		q[i] = strconv.Quote(a)
	}
	kind, hint := ErrBadValue, ""
	if s, isStr := got.(string); !isStr {
		kind = ErrWrongType
	} else {
		hint = enumHint(allowed, s)
	}
	return problemf(kind, "want one of %s, got %s%s", strings.Join(q, ", "), describe(got), hint)
}

// enumHint is "; did you mean X?" for a value that is an allowed one in other letter case
// (values are matched exactly: "Structure" is not "structure"), a word of the trade for one
// (tradeWords: "manhole" is a "maintenance-hole"), or near one of these by
// input.DidYouMean, so that a misspelt trade word is answered with its meaning and not with
// the value it looks like ("manhol" is not a "handhole"); "; X" for a word that names no
// one value (notOneValue); "" otherwise. It never maps a value silently: the value is refused.
func enumHint(allowed []string, got string) string {
	for _, a := range allowed {
		if strings.EqualFold(a, got) {
			return fmt.Sprintf("; did you mean %q? (letter case matters)", a)
		}
	}
	word := tradeWord(got)
	if n, ok := notOneValue[word]; ok && containsAll(allowed, n.among) {
		return "; " + n.why
	}
	meaning := make(map[string]string, len(allowed)+len(tradeWords))
	for _, a := range allowed {
		meaning[a] = a
	}
	for w, v := range tradeWords {
		if contains(allowed, v) {
			meaning[w] = v
		}
	}
	near, ok := word, false
	if _, ok = meaning[word]; !ok {
		near = input.Nearest(word, meaning)
		ok = near != ""
	}
	switch {
	case !ok:
		return ""
	case meaning[near] == near:
		return fmt.Sprintf("; did you mean %q?", near)
	case near == word:
		return fmt.Sprintf("; did you mean %q? (%q is the trade's other word for it)", meaning[near], got)
	default:
		return fmt.Sprintf("; did you mean %q? (%q is the trade's other word for it)", meaning[near], near)
	}
}

// tradeWord is a value as tradeWords spells its keys: lower case, words joined by "-".
func tradeWord(s string) string {
	return strings.Join(strings.FieldsFunc(strings.ToLower(s), func(r rune) bool {
		return r == ' ' || r == '_' || r == '-' || r == '\t'
	}), "-")
}

// tradeWords maps words of the trade (written as tradeWord writes them: "direct buried" is
// "direct-buried") to the value of a property that means the same thing, for enumHint's hint
// only; a misspelling of one ("pullbox", "man-hole") is found by its edit distance. A word
// that could mean two values is in notOneValue instead. Maintenance hole is the term of ANSI/TIA-758 and
// BICSI for what NFPA 70 (Article 110, Part V) and most drawings call a manhole (from
// memory); the rest are everyday site words (common practice, no published source).
var tradeWords = map[string]string{
	"manhole": StructureMaintenanceHole, "mh": StructureMaintenanceHole,
	"hh": StructureHandhole,

	"conduit": TypeDuct, "ductbank": TypeDuct, "duct-bank": TypeDuct, "underground-conduit": TypeDuct,
	"overhead": TypeAerial, "pole-line": TypeAerial, "aerial-cable": TypeAerial,
	"direct-buried": TypeBuried, "direct-burial": TypeBuried, "directly-buried": TypeBuried,
	"utility-tunnel": TypeTunnel, "service-tunnel": TypeTunnel,
	"cable-tray": TypeTray,

	"planned": StatusProposed, "new": StatusProposed, "future": StatusProposed,
	"in-service": StatusExisting, "active": StatusExisting, "as-built": StatusExisting,

	"main-cross-connect": RoleMC, "intermediate-cross-connect": RoleIC,
	// MDF and IDF (main and intermediate distribution frame) are the everyday words for the
	// rooms ANSI/TIA-568 calls the main and intermediate cross-connect (common practice, no
	// published source); ISO/IEC 11801 names the same levels campus and building distributor
	// (from memory).
	"mdf": RoleMC, "main-distribution-frame": RoleMC, "campus-distributor": RoleMC,
	"idf": RoleIC, "intermediate-distribution-frame": RoleIC, "building-distributor": RoleIC,

	"grass": SurfaceTurf, "lawn": SurfaceTurf,
	"blacktop": SurfaceAsphalt, "tarmac": SurfaceAsphalt,

	"hdd": MethodBore, "directional-bore": MethodBore, "directional-drilling": MethodBore, "boring": MethodBore,
	"open-cut": MethodTrench, "open-trench": MethodTrench, "trenching": MethodTrench,
}

// notOneValue holds the trade words that name no one value of a property among the values
// listed: the hint says what to choose instead (common practice, no published source).
var notOneValue = map[string]struct {
	among []string
	why   string
}{
	"vault":        {[]string{StructureMaintenanceHole, StructureHandhole}, `a vault large enough for a person to enter is a "maintenance-hole", a smaller one a "handhole"`},
	"pole":         {[]string{StructureMaintenanceHole, StructureHandhole}, poleWhy},
	"utility-pole": {[]string{StructureMaintenanceHole, StructureHandhole}, poleWhy},
	"riser-pole":   {[]string{StructureMaintenanceHole, StructureHandhole}, poleWhy},
	"abandoned":    {[]string{StatusExisting, StatusProposed}, "a pathway that can carry no cable is left out of the campus"},
	"retired":      {[]string{StatusExisting, StatusProposed}, "a pathway that can carry no cable is left out of the campus"},
	"paved":        {[]string{SurfaceAsphalt, SurfaceConcrete}, `say which paving: "asphalt" or "concrete"`},
	// A horizontal cross-connect (ANSI/TIA-568; ISO/IEC 11801's floor distributor, from
	// memory) serves its floor's outlets: the backbone ends there at a served building.
	"hc":                       {[]string{RoleMC, RoleIC}, hcWhy},
	"horizontal-cross-connect": {[]string{RoleMC, RoleIC}, hcWhy},
	"floor-distributor":        {[]string{RoleMC, RoleIC}, hcWhy},
	"telecommunications-room":  {[]string{RoleMC, RoleIC}, hcWhy},
	"paving":                   {[]string{SurfaceAsphalt, SurfaceConcrete}, `say which paving: "asphalt" or "concrete"`},
}

// hcWhy is the hint for a building's role given as a horizontal cross-connect.
const hcWhy = `a horizontal cross-connect (a telecommunications room) serves its own floor: a building the backbone only serves takes no role; "ic" is a building that other buildings' backbone cables come to, "mc" the campus's hub`

// poleWhy is the hint for a structure typed as a pole: a pole is no structure in the ground
// but the junction of aerial spans (Meeting.Open), or a riser pole beside a handhole.
const poleWhy = `a pole is not drawn as a structure: leave it out and draw the aerial pathways meeting at its point; where only aerial spans meet, routes turn on the pole with nothing built, and where an aerial span meets a duct (a riser pole) draw the "handhole" at its foot`

func containsAll(list, of []string) bool {
	for _, s := range of {
		if !contains(list, s) {
			return false
		}
	}
	return true
}

// flag returns a boolean property, or false when not given (given) or bad. The numbers 1
// and 0 are true and false in every source, as a GeoPackage's BOOLEAN column stores them
// (OGC GeoPackage 1.3, Table 1) and shapefile-born exports write them; text ("true", "Y",
// "T") is refused, with a hint, as a number in quotes is.
func (f *feature) flag(key string) bool {
	v, ok := f.given(key)
	if !ok {
		f.defaulted(key, false)
		return false
	}
	switch t := v.(type) {
	case bool:
		return t
	case json.Number:
		if x, err := strconv.ParseFloat(string(t), 64); err == nil && (x == 0 || x == 1) {
			return x == 1
		}
	}
	hint := ""
	if t, isStr := v.(string); isStr {
		switch strings.ToLower(strings.TrimSpace(t)) {
		case "true", "false", "t", "f", "y", "n", "yes", "no", "1", "0":
			hint = "; write true or false without quotes"
		}
	}
	f.add(key, problemf(ErrWrongType, "want true or false (or 1 or 0), got %s%s", describe(v), hint))
	return false
}

// num returns a number property in r, or def when not given (given) or bad.
func (f *feature) num(key string, def float64, r input.Range) float64 {
	v, ok := f.given(key)
	if !ok {
		f.defaulted(key, def)
		return def
	}
	n, isNum := v.(json.Number)
	if !isNum {
		hint := ""
		if t, ok := v.(string); ok {
			t = strings.TrimSpace(t)
			if _, err := strconv.ParseFloat(t, 64); err == nil {
				hint = " (write numbers without quotes)"
			} else if dot := strings.Replace(t, ",", ".", 1); strings.Count(t, ",") == 1 && !strings.Contains(t, ".") {
				if _, err := strconv.ParseFloat(dot, 64); err == nil {
					hint = fmt.Sprintf(" (a decimal comma? write %s, with a point and without quotes)", dot)
					if _, frac, _ := strings.Cut(t, ","); len(frac) == 3 {
						// "1,200": as likely a thousands separator (review 18 F7).
						hint = fmt.Sprintf(" (a thousands separator? write %s; a decimal comma? write %s; with no quotes)", strings.Replace(t, ",", "", 1), dot)
					}
				}
			}
		}
		f.add(key, problemf(ErrWrongType, "want %s, got %s%s", r, describe(v), hint))
		return def
	}
	x, err := strconv.ParseFloat(string(n), 64)
	if err == nil {
		err = r.Check(x)
	}
	if err != nil {
		// n as written: 1e999 rather than its overflow, +Inf
		f.add(key, &input.Problem{Value: string(n), Err: problemf(input.ErrOutOfRange, "want %s", r)})
		return def
	}
	return x
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// decodeAny decodes JSON keeping numbers as json.Number.
func decodeAny(raw []byte) (any, error) {
	d := json.NewDecoder(bytes.NewReader(raw))
	d.UseNumber()
	var v any
	if err := d.Decode(&v); err != nil {
		return nil, err
	}
	return v, nil
}

// describe prints a decoded JSON value for an error message, short.
func describe(v any) string {
	switch t := v.(type) {
	case nil:
		return "null"
	case string:
		if len(t) > 40 {
			return "string " + strconv.Quote(t[:40]) + "…"
		}
		return "string " + strconv.Quote(t)
	case json.Number:
		return string(t)
	case bool:
		return strconv.FormatBool(t)
	case []any:
		if len(t) == 0 {
			return "an empty array"
		}
		return "an array"
	case map[string]any:
		return "an object"
	case Value:
		return "a value of type " + t.Type
	}
	return fmt.Sprintf("%T", v)
}

func describeRaw(raw []byte) string {
	v, err := decodeAny(raw)
	if err != nil {
		return "invalid JSON"
	}
	return describe(v)
}

func geomName(g orb.Geometry) string {
	switch t := g.(type) {
	case nil:
		return "null"
	case namedGeometry:
		return t.name
	default:
		return g.GeoJSONType()
	}
}

// namedGeometry stands for a geometry of a type geo does not read (MultiPoint,
// GeometryCollection), kept only to name it in messages.
type namedGeometry struct {
	orb.Point
	name string
}

// parseGeometry decodes a GeoJSON geometry object into an orb geometry, checking every
// coordinate. A geometry geo has no use for comes back as a namedGeometry.
func parseGeometry(v any) (orb.Geometry, error) {
	if v == nil {
		return nil, problemf(ErrMissingProperty, "missing (null or absent)")
	}
	obj, ok := v.(map[string]any)
	if !ok {
		return nil, problemf(ErrBadGeometry, "want a geometry object, got %s", describe(v))
	}
	typ, ok := obj["type"].(string)
	if !ok {
		return nil, problemf(ErrBadGeometry, `want a geometry "type" string, got %s`, describe(obj["type"]))
	}
	if !isGeometryType(typ) {
		return nil, problemf(ErrBadGeometry, "unknown geometry type %q", typ)
	}
	coords := obj["coordinates"]
	if typ == "GeometryCollection" || typ == "MultiPoint" {
		return namedGeometry{name: typ}, nil
	}
	if coords == nil {
		return nil, problemf(ErrBadGeometry, `%s has no "coordinates"`, typ)
	}
	var (
		g   orb.Geometry
		err error
	)
	switch typ {
	case "Point":
		var p orb.Point
		p, err = position(coords)
		g = p
	case "LineString":
		var ls orb.LineString
		ls, err = line(coords, "")
		g = ls
	case "MultiLineString":
		var mls orb.MultiLineString
		mls, err = multiLine(coords)
		g = mls
	case "Polygon":
		var p orb.Polygon
		p, err = polygon(coords, "")
		g = p
	case "MultiPolygon":
		var mp orb.MultiPolygon
		mp, err = multiPolygon(coords)
		g = mp
	}
	if err != nil {
		return nil, err
	}
	return g, nil
}

func position(v any) (orb.Point, error) {
	arr, ok := v.([]any)
	if !ok || len(arr) < 2 {
		return orb.Point{}, problemf(ErrBadGeometry, "want a position [longitude, latitude], got %s", describePos(v))
	}
	var p orb.Point
	for k := 0; k < 2; k++ {
		n, isNum := arr[k].(json.Number)
		if !isNum {
			return orb.Point{}, problemf(ErrBadGeometry, "want a position [longitude, latitude] of numbers, got %s", describePos(v))
		}
		x, err := strconv.ParseFloat(string(n), 64)
		if err != nil || math.IsInf(x, 0) || math.IsNaN(x) {
			return orb.Point{}, problemf(ErrBadGeometry, "coordinate %s is not a finite number", n)
		}
		p[k] = x
	}
	if err := checkRange(p); err != nil {
		return orb.Point{}, err
	}
	return p, nil
}

// projectedM is the magnitude past which a coordinate is taken for a projected one (metres or
// feet) rather than a slip in longitude/latitude.
const projectedM = 360.0

func checkRange(p orb.Point) error {
	x, y := p[0], p[1]
	switch {
	case math.Abs(x) > projectedM || math.Abs(y) > projectedM:
		return problemf(ErrProjected, `got [%s, %s]: coordinates look projected (metres or feet?); %s`,
			fmtCoord(x), fmtCoord(y), projectedAdvice)
	case math.Abs(x) > 180:
		return problemf(ErrBadGeometry, "longitude %s outside [-180, 180]", fmtCoord(x))
	case math.Abs(y) > 90:
		hint := ""
		if math.Abs(x) <= 90 {
			hint = " (are longitude and latitude swapped? GeoJSON and GeoPackage put longitude first)"
		}
		return problemf(ErrBadGeometry, "latitude %s outside [-90, 90]%s", fmtCoord(y), hint)
	}
	return nil
}

func fmtCoord(x float64) string { return strconv.FormatFloat(x, 'g', 10, 64) }

func describePos(v any) string {
	arr, ok := v.([]any)
	if !ok {
		return describe(v)
	}
	parts := make([]string, 0, len(arr))
	for i, e := range arr {
		if i == 3 {
			parts = append(parts, "…")
			break
		}
		parts = append(parts, describe(e))
	}
	return "[" + strings.Join(parts, ", ") + "]"
}

func positions(v any, what string) ([]orb.Point, error) {
	arr, ok := v.([]any)
	if !ok {
		return nil, problemf(ErrBadGeometry, "%swant an array of positions, got %s", what, describe(v))
	}
	pts := make([]orb.Point, 0, len(arr))
	for _, e := range arr {
		p, err := position(e)
		if err != nil {
			return nil, prefixed(what, err)
		}
		pts = append(pts, p)
	}
	return pts, nil
}

// prefixed puts what ("ring 2: ") before the message of a geometry problem.
func prefixed(what string, err error) error {
	if p, ok := err.(*problem); ok && what != "" {
		return &problem{kind: p.kind, msg: what + p.msg}
	}
	return err
}

// line reads a LineString's coordinates, dropping repeated consecutive positions; what
// prefixes messages ("part 2: ").
func line(v any, what string) (orb.LineString, error) {
	pts, err := positions(v, what)
	if err != nil {
		return nil, err
	}
	return distinctLine(pts, what)
}

// distinctLine is the rule for a line of every source: repeated consecutive positions are
// dropped, and at least two distinct ones must remain.
func distinctLine(pts []orb.Point, what string) (orb.LineString, error) {
	ls := dropRepeats(make(orb.LineString, 0, len(pts)), pts)
	if len(ls) < 2 {
		return nil, problemf(ErrBadGeometry, "%swant a line of at least two distinct positions, got %d position(s), %d distinct", what, len(pts), len(ls))
	}
	return ls, nil
}

// dropRepeats appends the positions of pts to dst, each repeated in a row given once: how
// every line is read (a position repeated draws nothing).
func dropRepeats(dst orb.LineString, pts []orb.Point) orb.LineString {
	for _, p := range pts {
		if len(dst) == 0 || dst[len(dst)-1] != p {
			dst = append(dst, p)
		}
	}
	return dst
}

// closedRing is the rule for a polygon's ring of every source: at least four positions, the
// last the first.
func closedRing(pts []orb.Point, what string) (orb.Ring, error) {
	if len(pts) < 4 {
		return nil, problemf(ErrBadGeometry, "%swant a closed ring of at least 4 positions, got %d", what, len(pts))
	}
	if a, b := pts[0], pts[len(pts)-1]; a != b {
		digits := 10
		if fmtCoord(a[0]) == fmtCoord(b[0]) && fmtCoord(a[1]) == fmtCoord(b[1]) {
			digits = -1 // as many as tell them apart
		}
		c := func(x float64) string { return strconv.FormatFloat(x, 'g', digits, 64) }
		return nil, problemf(ErrBadGeometry, "%snot closed: first position [%s, %s], last [%s, %s], %s apart; end the ring at its first position",
			what, c(a[0]), c(a[1]), c(b[0]), c(b[1]), gapText(DistanceM(a, b)))
	}
	return orb.Ring(pts), nil
}

// gapText prints a small distance in metres for a message: in millimetres, to two
// significant digits, below a metre, so that a gap a reprojection left is seen as one.
func gapText(m float64) string {
	if m < 1 {
		return strconv.FormatFloat(m*1000, 'g', 2, 64) + " mm"
	}
	return strconv.FormatFloat(m, 'f', 1, 64) + " m"
}

func multiLine(v any) (orb.MultiLineString, error) {
	arr, ok := v.([]any)
	if !ok || len(arr) == 0 {
		return nil, problemf(ErrBadGeometry, "want an array of at least one line, got %s", describe(v))
	}
	mls := make(orb.MultiLineString, 0, len(arr))
	for i, e := range arr {
		ls, err := line(e, fmt.Sprintf("line %d: ", i+1))
		if err != nil {
			return nil, err
		}
		mls = append(mls, ls)
	}
	return mls, nil
}

func polygon(v any, what string) (orb.Polygon, error) {
	arr, ok := v.([]any)
	if !ok || len(arr) == 0 {
		return nil, problemf(ErrBadGeometry, "%swant an array of at least one ring, got %s", what, describe(v))
	}
	poly := make(orb.Polygon, 0, len(arr))
	for i, e := range arr {
		w := fmt.Sprintf("%sring %d: ", what, i+1)
		pts, err := positions(e, w)
		if err != nil {
			return nil, err
		}
		r, err := closedRing(pts, w)
		if err != nil {
			return nil, err
		}
		poly = append(poly, r)
	}
	return poly, nil
}

func multiPolygon(v any) (orb.MultiPolygon, error) {
	arr, ok := v.([]any)
	if !ok || len(arr) == 0 {
		return nil, problemf(ErrBadGeometry, "want an array of at least one polygon, got %s", describe(v))
	}
	mp := make(orb.MultiPolygon, 0, len(arr))
	for i, e := range arr {
		p, err := polygon(e, fmt.Sprintf("polygon %d: ", i+1))
		if err != nil {
			return nil, err
		}
		mp = append(mp, p)
	}
	return mp, nil
}

// blankDefaultText says what a property given as "" (or absent) on a feature of kind is taken
// as: its default, as the reading applies it.
func blankDefaultText(kind, key string) string {
	switch key {
	case PropType:
		if kind == KindPathway {
			return fmt.Sprintf("type %q", TypeDuct)
		}
		return "no type"
	case PropStatus:
		return fmt.Sprintf("status %q (no new work is priced on it)", StatusExisting)
	case PropSpareDucts:
		return fmt.Sprintf("%d spare duct", DefaultSpareDucts)
	case PropDuctMM:
		return fmt.Sprintf("ducts of %g mm", DefaultDuctMM)
	case PropEMI:
		return fmt.Sprintf("emi %q", EMINone)
	case PropMethod:
		return fmt.Sprintf("method %q", MethodTrench)
	case PropRiserM:
		return fmt.Sprintf("a riser of %g m", DefaultRiserM)
	case PropKind:
		return fmt.Sprintf("the kind its geometry gives (%s)", kind)
	case PropID:
		return fmt.Sprintf("the id %q and its building's", EntrancePrefix)
	}
	if t, ok := absentTexts[key]; ok {
		return t
	}
	return "its default"
}

// absentTexts are blankDefaultText's words for the properties whose default is said the same
// way on every kind.
var absentTexts = map[string]string{
	PropSurface: "no surface (new trench priced on the design's assumed surface)",
	PropRole:    "no role (a building the backbone serves)",
	PropTransit: "no routes through it (transit false)",
	PropPlenum:  "no plenum (plenum false)",
	PropGroup:   "its own id as its shared-risk group",
	PropName:    "no name",
}
