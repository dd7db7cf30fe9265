package geo

import (
	"encoding/binary"
	"errors"
	"fmt"
	"math"
	"strings"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/encoding/wkb"
	"github.com/paulmach/orb/project"

	"spanwright/geo/crs"
)

// ErrCRS is a table whose coordinate reference system cannot be taken to WGS84: not an EPSG
// system, or a projected one in a build without PROJ (see package crs).
var ErrCRS = errors.New("unusable coordinate reference system")

// TableProjection returns the projection to WGS84 longitude/latitude of a table whose
// coordinate reference system the source names as organization and code ("EPSG", 32630).
// EPSG:4326 and OGC CRS84 give the identity; any other EPSG code is crs.ToWGS84's; another
// organization is refused. Errors wrap ErrCRS and say what to do.
func TableProjection(organization string, code int64) (orb.Projection, error) {
	org := strings.ToUpper(strings.TrimSpace(organization))
	switch {
	case org == "OGC" && code == 84:
		code = crs.WGS84
	case org != "EPSG":
		return nil, fmt.Errorf("%w: %s:%d is not an EPSG system; assign or transform it to one (EPSG:4326 for longitude/latitude)",
			ErrCRS, orgName(organization), code)
	}
	if code <= 0 || code > math.MaxInt32 {
		return nil, fmt.Errorf("%w: EPSG code %d: want a positive code", ErrCRS, code)
	}
	proj, err := crs.ToWGS84(int(code))
	if err != nil {
		return nil, fmt.Errorf("%w: %w", ErrCRS, err)
	}
	return proj, nil
}

func orgName(org string) string {
	if org == "" {
		return "(no organization)"
	}
	return org
}

// DecodeWKB decodes a geometry in Well-Known Binary (OGC Simple Features 1.2.1 §8.2, ISO or
// PostGIS extended types) with orb, dropping Z and M as GeoJSON's third position member is
// dropped, and takes it to WGS84 with proj (nil for none). Errors wrap ErrBadGeometry.
func DecodeWKB(data []byte, proj orb.Projection) (orb.Geometry, error) {
	var flat []byte
	if _, err := flattenWKB(data, &flat, 0); err != nil {
		return nil, problemf(ErrBadGeometry, "not a readable WKB geometry: %v", err)
	}
	g, err := wkb.Unmarshal(flat)
	if err != nil {
		return nil, problemf(ErrBadGeometry, "not a readable WKB geometry: %v", err)
	}
	if proj != nil {
		g = project.Geometry(g, proj)
	}
	return g, nil
}

// WKB geometry type codes (OGC Simple Features 1.2.1 §8.2.3).
const (
	wkbPoint = 1 + iota
	wkbLineString
	wkbPolygon
	wkbMultiPoint
	wkbMultiLineString
	wkbMultiPolygon
	wkbCollection
)

// PostGIS extended WKB flags of the type code (from the PostGIS source, liblwgeom).
const (
	ewkbZ    = 0x80000000
	ewkbM    = 0x40000000
	ewkbSRID = 0x20000000
)

// maxWKBDepth bounds the nesting of geometry collections read.
const maxWKBDepth = 32

var errShortWKB = errors.New("ends too early")

// flattenWKB appends to out the geometry at the start of data as little-endian 2D WKB and
// returns how many bytes of data it took.
func flattenWKB(data []byte, out *[]byte, depth int) (int, error) {
	if depth > maxWKBDepth {
		return 0, errors.New("geometry collections nested too deep")
	}
	if len(data) < 5 {
		return 0, errShortWKB
	}
	var order binary.ByteOrder
	switch data[0] {
	case 0:
		order = binary.BigEndian
	case 1:
		order = binary.LittleEndian
	default:
		return 0, fmt.Errorf("byte order %d, want 0 or 1", data[0])
	}
	code := order.Uint32(data[1:5])
	pos := 5
	dims := 2
	if code&ewkbZ != 0 {
		dims++
	}
	if code&ewkbM != 0 {
		dims++
	}
	if code&ewkbSRID != 0 {
		pos += 4
	}
	code &^= ewkbZ | ewkbM | ewkbSRID
	typ := code % 1000
	switch code / 1000 { // ISO: 1000 Z, 2000 M, 3000 ZM
	case 0:
	case 1, 2:
		dims++
	case 3:
		dims += 2
	default:
		return 0, fmt.Errorf("geometry type %d", code)
	}
	if dims > 4 {
		return 0, fmt.Errorf("geometry type %d with both ISO and extended dimensions", code)
	}
	*out = append(*out, 1)
	*out = binary.LittleEndian.AppendUint32(*out, typ)
	count := func() (int, error) {
		if len(data) < pos+4 {
			return 0, errShortWKB
		}
		n := int(order.Uint32(data[pos:]))
		pos += 4
		*out = binary.LittleEndian.AppendUint32(*out, uint32(n))
		return n, nil
	}
	points := func(n int) error {
		if n < 0 || n > (len(data)-pos)/(8*dims) {
			return errShortWKB
		}
		for i := 0; i < n; i++ {
			for k := 0; k < 2; k++ {
				*out = binary.LittleEndian.AppendUint64(*out, order.Uint64(data[pos+8*k:]))
			}
			pos += 8 * dims
		}
		return nil
	}
	switch typ {
	case wkbPoint:
		if err := points(1); err != nil {
			return 0, err
		}
	case wkbLineString:
		n, err := count()
		if err != nil {
			return 0, err
		}
		if err := points(n); err != nil {
			return 0, err
		}
	case wkbPolygon:
		rings, err := count()
		if err != nil {
			return 0, err
		}
		for ; rings > 0; rings-- {
			n, err := count()
			if err != nil {
				return 0, err
			}
			if err := points(n); err != nil {
				return 0, err
			}
		}
	case wkbMultiPoint, wkbMultiLineString, wkbMultiPolygon, wkbCollection:
		parts, err := count()
		if err != nil {
			return 0, err
		}
		for ; parts > 0; parts-- {
			n, err := flattenWKB(data[pos:], out, depth+1)
			if err != nil {
				return 0, err
			}
			pos += n
		}
	default:
		return 0, fmt.Errorf("geometry type %d (curves and surfaces are not read)", code)
	}
	return pos, nil
}
