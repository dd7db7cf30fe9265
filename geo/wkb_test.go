package geo

import (
	"encoding/binary"
	"errors"
	"math"
	"testing"

	"github.com/paulmach/orb"

	"spanwright/geo/crs"
)

type byteOrder interface {
	binary.ByteOrder
	binary.AppendByteOrder
}

// wkbLine writes a LineString as WKB by hand (OGC Simple Features 1.2.1 §8.2.3): type code
// code, dims ordinates per point, each point's x and y then 10*x+k for the rest.
func wkbLine(order byteOrder, code uint32, dims int, pts [][2]float64) []byte {
	b := []byte{1}
	if order == byteOrder(binary.BigEndian) {
		b[0] = 0
	}
	b = order.AppendUint32(b, code)
	b = order.AppendUint32(b, uint32(len(pts)))
	for _, p := range pts {
		b = order.AppendUint64(b, math.Float64bits(p[0]))
		b = order.AppendUint64(b, math.Float64bits(p[1]))
		for k := 2; k < dims; k++ {
			b = order.AppendUint64(b, math.Float64bits(10*p[0]+float64(k)))
		}
	}
	return b
}

func TestDecodeWKB(t *testing.T) {
	t.Parallel()
	pts := [][2]float64{{10, 50}, {10.5, 50.25}}
	want := orb.LineString{{10, 50}, {10.5, 50.25}}
	for _, tc := range []struct {
		name  string
		order byteOrder
		code  uint32
		dims  int
	}{
		{"2D little-endian", binary.LittleEndian, 2, 2},
		{"2D big-endian", binary.BigEndian, 2, 2},
		{"ISO Z (1002)", binary.LittleEndian, 1002, 3},
		{"ISO M (2002)", binary.BigEndian, 2002, 3},
		{"ISO ZM (3002)", binary.LittleEndian, 3002, 4},
		// PostGIS extended WKB: the Z and M flags in the type's high bits.
		{"EWKB Z", binary.LittleEndian, 2 | 0x80000000, 3},
		{"EWKB ZM", binary.BigEndian, 2 | 0xC0000000, 4},
	} {
		g, err := DecodeWKB(wkbLine(tc.order, tc.code, tc.dims, pts), nil)
		if err != nil {
			t.Errorf("%s: %v", tc.name, err)
			continue
		}
		if ls, ok := g.(orb.LineString); !ok || !orb.Equal(ls, want) {
			t.Errorf("%s: got %v, want %v", tc.name, g, want)
		}
	}
	full := wkbLine(binary.LittleEndian, 1002, 3, pts)
	for _, bad := range [][]byte{full[:len(full)-1], full[:7], {7, 1, 0, 0, 0}, wkbLine(binary.LittleEndian, 8, 2, pts)} {
		if _, err := DecodeWKB(bad, nil); !errors.Is(err, ErrBadGeometry) {
			t.Errorf("% x: got %v, want ErrBadGeometry", bad, err)
		}
	}
	shift := func(p orb.Point) orb.Point { return orb.Point{p[0] + 1, p[1]} }
	g, err := DecodeWKB(full, shift)
	if err != nil || !orb.Equal(g, orb.LineString{{11, 50}, {11.5, 50.25}}) {
		t.Errorf("projected: got %v, %v", g, err)
	}
}

func TestTableProjection(t *testing.T) {
	t.Parallel()
	p := orb.Point{-3.7, 52.35}
	for _, tc := range []struct {
		org  string
		code int64
	}{{"EPSG", 4326}, {"epsg", 4326}, {"OGC", 84}} {
		proj, err := TableProjection(tc.org, tc.code)
		if err != nil || proj(p) != p {
			t.Errorf("%s:%d: got %v, want the identity", tc.org, tc.code, err)
		}
	}
	for _, tc := range []struct {
		org  string
		code int64
		want error
	}{{"NONE", 0, ErrCRS}, {"ESRI", 102100, ErrCRS}, {"EPSG", 0, ErrCRS}, {"EPSG", math.MaxInt64, ErrCRS}} {
		if _, err := TableProjection(tc.org, tc.code); !errors.Is(err, tc.want) {
			t.Errorf("%s:%d: got %v, want %v", tc.org, tc.code, err, tc.want)
		}
	}
	// A projected system: PROJ's in a build with it, else ErrNoPROJ (package crs).
	if _, err := TableProjection("EPSG", 32630); err != nil && (!errors.Is(err, crs.ErrNoPROJ) || !errors.Is(err, ErrCRS)) {
		t.Errorf("EPSG:32630: got %v", err)
	}
}
