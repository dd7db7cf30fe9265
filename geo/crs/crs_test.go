package crs

import (
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

// TestWGS84Identity: EPSG:4326 is WGS84 longitude/latitude itself (EPSG dataset, code 4326),
// taken as x = longitude, y = latitude like every GeoJSON position (RFC 7946 §3.1.1), so
// its projection gives every point back bit for bit, in any build.
func TestWGS84Identity(t *testing.T) {
	t.Parallel()
	to, err := ToWGS84(WGS84)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range []orb.Point{{-3.7297059, 52.3517286}, {180, -90}, {-180, 90}, {0.1 + 0.2, 1e-300}} {
		if got := to(p); got != p {
			t.Errorf("ToWGS84(4326)(%v) = %v, want it unchanged", p, got)
		}
	}
}

// TestBadCode: EPSG codes are positive integers (EPSG dataset, "code" is a positive
// integer); zero and negative codes are refused before PROJ is asked, in any build.
func TestBadCode(t *testing.T) {
	t.Parallel()
	for _, code := range []int{0, -1, -32630} {
		to, err := ToWGS84(code)
		if err == nil || to != nil {
			t.Errorf("ToWGS84(%d): got no error", code)
			continue
		}
		if !strings.Contains(err.Error(), "want a positive code") {
			t.Errorf("ToWGS84(%d): %v, want it to ask for a positive code", code, err)
		}
	}
}
