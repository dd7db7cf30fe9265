package geo

import (
	"encoding/json"
	"errors"
	"math"
	"regexp"
	"strconv"
	"strings"

	"github.com/paulmach/orb"

	"spanwright/geo/crs"
	"spanwright/geo/input"
)

// The names of a coordinate reference system that a GeoJSON "crs" member may give
// (GeoJSON 2008 §3.1.1, named CRS; OGC URN syntax, OGC 07-092r3 §7.1; OGC http URIs, OGC
// 09-048r5 §6). CRS84 is WGS84 longitude/latitude, which RFC 7946 §4 makes the default.
var (
	epsgName  = regexp.MustCompile(`^(?i:EPSG:(\d+)|urn:ogc:def:crs:EPSG:[0-9.]*:(\d+)|https?://www\.opengis\.net/def/crs/EPSG/[0-9.]+/(\d+))$`)
	crs84Name = regexp.MustCompile(`^(?i:(OGC:)?CRS84|urn:ogc:def:crs:OGC:[0-9.]*:CRS84|https?://www\.opengis\.net/def/crs/OGC/[0-9.]+/CRS84)$`)
)

// wantCRS says what a "crs" member must be.
const wantCRS = `want {"type": "name", "properties": {"name": …}} naming an EPSG code ("EPSG:32617" or "urn:ogc:def:crs:EPSG::32617") or OGC CRS84`

// crsCode returns the EPSG code a GeoJSON 2008 "crs" member names, crs.WGS84 for CRS84, or
// what is wrong with it.
func crsCode(raw json.RawMessage) (int, error) {
	v, err := decodeAny(raw)
	obj, ok := v.(map[string]any)
	if err != nil || !ok {
		return 0, problemf(ErrBadValue, "%s, got %s", wantCRS, describe(v))
	}
	if t, _ := obj["type"].(string); t != "name" {
		return 0, problemf(ErrBadValue, `%s, got "type" %s; or reproject to WGS84 longitude/latitude and drop "crs"`, wantCRS, describe(obj["type"]))
	}
	props, _ := obj["properties"].(map[string]any)
	name, ok := props["name"].(string)
	if !ok {
		return 0, problemf(ErrBadValue, `%s, got "properties" without a "name" string`, wantCRS)
	}
	name = strings.TrimSpace(name)
	if crs84Name.MatchString(name) {
		return crs.WGS84, nil
	}
	m := epsgName.FindStringSubmatch(name)
	if m == nil {
		return 0, problemf(ErrBadValue, `%s, got %s; or reproject to WGS84 longitude/latitude and drop "crs"`, wantCRS, describe(name))
	}
	code, err := strconv.Atoi(m[1] + m[2] + m[3]) // one group matched
	if err != nil || code <= 0 {
		return 0, problemf(ErrBadValue, "%s, got %s: not a positive EPSG code", wantCRS, describe(name))
	}
	return code, nil
}

// fileCRS reads the file's "crs" member, if any, and returns the projection that takes its
// coordinates to WGS84 longitude/latitude: nil when there is no member or it names WGS84.
// ok is false when the features cannot be read in their system (a build without PROJ, a code
// PROJ does not know): that is reported, and reading the features would only add a
// "coordinates look projected" for each. A member that names nothing usable is reported
// and the features are read as they are.
func (l *loader) fileCRS(name string, top map[string]json.RawMessage) (to orb.Projection, code int, ok bool) {
	raw, has := top["crs"]
	if !has {
		return nil, 0, true
	}
	code, err := crsCode(raw)
	if err != nil {
		l.errs.Add(&input.Problem{File: name, Key: "crs", Err: err})
		return nil, 0, true
	}
	if code == crs.WGS84 {
		return nil, code, true
	}
	to, err = crs.ToWGS84(code)
	if err != nil {
		if !errors.Is(err, crs.ErrNoPROJ) {
			err = problemf(ErrBadValue, "%v", err)
		}
		l.errs.Add(&input.Problem{File: name, Key: "crs", Err: err})
		l.lost = true // none of the file's features is read: any may be a building a plan names
		return nil, code, false
	}
	return to, code, true
}

// toWGS84 returns the features with every position of their geometries taken through to,
// so that the feature checks see WGS84 longitude/latitude. Positions that are not two finite
// numbers are left for those checks to report. A feature with a position PROJ cannot take is
// reported here, once, and that position replaced by a stand-in in range so that the
// feature's other checks still run without a second message about the same position.
func (l *loader) toWGS84(name string, code int, feats []json.RawMessage, to orb.Projection) []json.RawMessage {
	out := make([]json.RawMessage, len(feats))
	for i, raw := range feats {
		if i%featureCheckEvery == 0 && l.ctx.Err() != nil {
			return feats // parseFile stops at the same look
		}
		out[i] = raw
		v, err := decodeAny(raw)
		obj, isObj := v.(map[string]any)
		if err != nil || !isObj {
			continue
		}
		geom, isObj := obj["geometry"].(map[string]any)
		if !isObj {
			continue
		}
		var failed *orb.Point
		reprojectCoords(geom["coordinates"], to, &failed)
		if failed != nil {
			l.errs.Add(&input.Problem{File: name, Feature: &input.Feature{Index: i, ID: rawFeatureID(obj)}, Key: "geometry",
				Err: problemf(ErrBadGeometry, `position [%s, %s] in EPSG:%d: PROJ cannot take it to WGS84 longitude/latitude; check that "crs" names the system the coordinates are in`,
					fmtCoord(failed[0]), fmtCoord(failed[1]), code)})
		}
		if b, err := json.Marshal(obj); err == nil {
			out[i] = b
		}
	}
	return out
}

// reprojectCoords takes every position in a GeoJSON coordinates array through to, in place,
// and sets *failed to the first position to gives NaN for.
func reprojectCoords(v any, to orb.Projection, failed **orb.Point) {
	arr, ok := v.([]any)
	if !ok || len(arr) == 0 {
		return
	}
	if _, isArr := arr[0].([]any); isArr {
		for _, e := range arr {
			reprojectCoords(e, to, failed)
		}
		return
	}
	if len(arr) < 2 {
		return
	}
	var p orb.Point
	for k := range 2 {
		n, isNum := arr[k].(json.Number)
		if !isNum {
			return
		}
		x, err := strconv.ParseFloat(string(n), 64)
		if err != nil || math.IsInf(x, 0) || math.IsNaN(x) {
			return
		}
		p[k] = x
	}
	q := to(p)
	if math.IsNaN(q[0]) || math.IsNaN(q[1]) {
		if *failed == nil {
			*failed = &p
		}
		q = orb.Point{math.Mod(p[0], 180), math.Mod(p[1], 90)}
	}
	for k := range 2 {
		arr[k] = json.Number(strconv.FormatFloat(q[k], 'g', -1, 64))
	}
}

// rawFeatureID is a feature's id as readID finds it, for a message before the feature is
// read; "" when it has none usable.
func rawFeatureID(obj map[string]any) string {
	props, _ := obj["properties"].(map[string]any)
	if id, err := idText(props[PropID]); err != nil || id != "" {
		return id
	}
	id, _ := idText(obj["id"])
	return id
}
