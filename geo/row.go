package geo

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
)

// Table names that give every row of a table its kind (TableKind); in any other table each
// row says with its "kind" column, or its geometry, as a GeoJSON feature does.
const (
	TableBuildings  = "buildings"
	TablePathways   = "pathways"
	TableStructures = "structures"
	TableEntrances  = "entrances"
)

// TableKind returns the kind of feature a table of this name holds (case does not matter),
// or "" for a table whose rows each say.
func TableKind(table string) string {
	switch strings.ToLower(table) {
	case TableBuildings:
		return KindBuilding
	case TablePathways:
		return KindPathway
	case TableStructures:
		return KindStructure
	case TableEntrances:
		return KindEntrance
	}
	return ""
}

// Row is one feature read from a table of a GeoPackage or a database.
type Row struct {
	Source Source // File, Table and FID
	// Kind is TableKind of the table: the kind of every row, or "" when each row says.
	Kind string
	// Props are the row's columns other than its feature id and geometry, by column name,
	// as the properties of a GeoJSON feature: a value is a string, a json.Number (Int,
	// Float), a bool, nil for NULL (absent, as JSON null is) or a Value of another type.
	Props map[string]any
	// Geometry is the row's geometry decoded and taken to WGS84 longitude/latitude; nil for
	// NULL. GeometryErr, when not nil, says why it could not be (Geometry is then ignored).
	Geometry    orb.Geometry
	GeometryErr error
	// Unprojected marks a Geometry left in its table's own coordinate system, which cannot be
	// taken to WGS84 (a problem the table's reader reports once): its type is checked, its
	// coordinates are not, and the campus fails anyway.
	Unprojected bool
}

// Value is a column value of a type no property takes (a date, a blob), named for messages.
type Value struct {
	Type string // the column's type as the source names it: "date", "BLOB"
}

// Int is an integer column value as a property.
func Int(n int64) json.Number { return json.Number(strconv.FormatInt(n, 10)) }

// Float is a floating-point column value as a property; bits is 32 for a single-precision
// column (printed with the digits that single precision holds), 64 otherwise.
func Float(x float64, bits int) json.Number {
	return json.Number(strconv.FormatFloat(x, 'g', -1, bits))
}

// Row checks one row as a GeoJSON feature is checked (same properties, defaults and rules)
// and adds it to the campus; its problems name Source's file, table and feature id.
func (r *Reader) Row(row Row) {
	f := &feature{l: r.l, src: row.Source, props: row.Props}
	if f.props == nil {
		f.props = map[string]any{}
	}
	geom, gerr := row.Geometry, row.GeometryErr
	if row.Unprojected && geom != nil {
		r.l.unprojected[row.Source] = true // its coordinates are no longitude/latitude (checkFar)
	}
	if gerr == nil && !(row.Unprojected && geom != nil) {
		geom, gerr = checkGeometry(geom)
	}
	f.check(nil, geom, gerr, row.Kind)
}

// FeatureProblem reports a problem of one row that is not about a property or its geometry
// (its feature id is not read, say).
func (r *Reader) FeatureProblem(src Source, err error) {
	r.l.lost = true
	f := &feature{l: r.l, src: src}
	f.add("", err)
}

// checkGeometry applies to a geometry decoded from binary (WKB) the rules parseGeometry
// applies to GeoJSON's, with the same functions: every coordinate finite and in range
// (checkRange), lines of at least two distinct positions with repeats dropped
// (distinctLine), closed rings of at least four positions (closedRing). A geometry geo has
// no use for comes back as a namedGeometry.
func checkGeometry(g orb.Geometry) (orb.Geometry, error) {
	switch t := g.(type) {
	case nil:
		return nil, problemf(ErrMissingProperty, "missing (null or absent)")
	case orb.Point:
		if err := checkPoint(t); err != nil {
			return nil, err
		}
		return t, nil
	case orb.LineString:
		return checkedLine(t, "")
	case orb.MultiLineString:
		if len(t) == 0 {
			return nil, problemf(ErrBadGeometry, "want at least one line, got an empty MultiLineString")
		}
		mls := make(orb.MultiLineString, 0, len(t))
		for i, l := range t {
			ls, err := checkedLine(l, fmt.Sprintf("line %d: ", i+1))
			if err != nil {
				return nil, err
			}
			mls = append(mls, ls)
		}
		return mls, nil
	case orb.Polygon:
		return checkedPolygon(t, "")
	case orb.MultiPolygon:
		if len(t) == 0 {
			return nil, problemf(ErrBadGeometry, "want at least one polygon, got an empty MultiPolygon")
		}
		mp := make(orb.MultiPolygon, 0, len(t))
		for i, p := range t {
			q, err := checkedPolygon(p, fmt.Sprintf("polygon %d: ", i+1))
			if err != nil {
				return nil, err
			}
			mp = append(mp, q)
		}
		return mp, nil
	}
	return namedGeometry{name: g.GeoJSONType()}, nil
}

// checkPoint checks a decoded coordinate pair: finite, then checkRange.
func checkPoint(p orb.Point) error {
	for _, x := range p {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return problemf(ErrBadGeometry, "coordinate %s is not a finite number", fmtCoord(x))
		}
	}
	return checkRange(p)
}

func checkedPoints(pts []orb.Point, what string) error {
	for _, p := range pts {
		if err := checkPoint(p); err != nil {
			return prefixed(what, err)
		}
	}
	return nil
}

func checkedLine(l orb.LineString, what string) (orb.LineString, error) {
	if err := checkedPoints(l, what); err != nil {
		return nil, err
	}
	return distinctLine(l, what)
}

func checkedPolygon(p orb.Polygon, what string) (orb.Polygon, error) {
	if len(p) == 0 {
		return nil, problemf(ErrBadGeometry, "%swant at least one ring, got an empty Polygon", what)
	}
	poly := make(orb.Polygon, 0, len(p))
	for i, r := range p {
		w := fmt.Sprintf("%sring %d: ", what, i+1)
		if err := checkedPoints(r, w); err != nil {
			return nil, err
		}
		ring, err := closedRing(r, w)
		if err != nil {
			return nil, err
		}
		poly = append(poly, ring)
	}
	return poly, nil
}
