//go:build proj

package crs

import (
	"fmt"
	"math"
	"os"
	"os/exec"
	"strconv"
	"strings"
	"sync"
	"testing"

	"github.com/paulmach/orb"
)

// gdalCases are points in systems of different kinds, each as x (easting or longitude) and
// y (northing or latitude), whatever the order the system declares.
var gdalCases = []struct {
	epsg int
	pts  []orb.Point
}{
	// WGS 84 / UTM zone 30N, the demo campus's zone: its corners and the zone's edges.
	{32630, []orb.Point{{450299.190942779, 5800410.23642676}, {450424.960756378, 5800470.0}, {166021.44, 0}, {833978.56, 9329005.18}}},
	// WGS 84 / UTM zone 33S: a southern zone (false northing 10,000 km).
	{32733, []orb.Point{{500000, 10000000}, {612345.6, 7654321.0}}},
	// NAD83 / New York Long Island (ftUS): US survey feet, a datum other than WGS84.
	{2263, []orb.Point{{1000000, 200000}, {987654.3, 210987.6}}},
	// SWEREF99 TM: declares northing before easting; given here easting first.
	{3006, []orb.Point{{674032.357, 6580821.991}, {319180, 6399862}}},
	// CH1903+ / LV95: a datum shift to WGS84.
	{2056, []orb.Point{{2600000, 1200000}, {2683000, 1248000}}},
	// WGS 84 / Pseudo-Mercator.
	{3857, []orb.Point{{-415190.7, 6860120.3}, {0, 0}}},
	// NAD83 geographic: declares latitude before longitude; given here longitude first.
	{4269, []orb.Point{{-77.0365, 38.8977}, {-122.4194, 37.7749}}},
}

// gdalTransform runs GDAL's gdaltransform (Debian gdal-bin; it uses PROJ) on pts from
// EPSG:epsg to EPSG:4326. GDAL's command-line tools take and print coordinates in the
// traditional GIS order (x easting or longitude first), whatever the system declares.
func gdalTransform(t *testing.T, epsg int, pts []orb.Point) []orb.Point {
	t.Helper()
	bin, err := exec.LookPath("gdaltransform")
	if err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatal("gdaltransform not found; CI installs gdal-bin")
		}
		t.Skip("gdaltransform not found (apt-get install gdal-bin); skipping the check against GDAL")
	}
	var in strings.Builder
	for _, p := range pts {
		fmt.Fprintf(&in, "%.17g %.17g\n", p[0], p[1])
	}
	cmd := exec.Command(bin, "-s_srs", "EPSG:"+strconv.Itoa(epsg), "-t_srs", "EPSG:4326")
	cmd.Stdin = strings.NewReader(in.String())
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("gdaltransform EPSG:%d: %v\n%s", epsg, err, out)
	}
	lines := strings.Split(strings.TrimSpace(string(out)), "\n")
	if len(lines) != len(pts) {
		t.Fatalf("gdaltransform EPSG:%d: %d lines for %d points:\n%s", epsg, len(lines), len(pts), out)
	}
	got := make([]orb.Point, len(pts))
	for i, l := range lines {
		f := strings.Fields(l)
		if len(f) < 2 {
			t.Fatalf("gdaltransform EPSG:%d: line %q", epsg, l)
		}
		for k := range 2 {
			if got[i][k], err = strconv.ParseFloat(f[k], 64); err != nil {
				t.Fatalf("gdaltransform EPSG:%d: line %q: %v", epsg, l, err)
			}
		}
	}
	return got
}

// TestAgainstGDAL checks ToWGS84 against GDAL's gdaltransform, point by point, to 1e-9
// degrees (about 0.1 mm): both ask the same PROJ for the same transformation, so they differ
// only in the digits gdaltransform prints (15 significant).
func TestAgainstGDAL(t *testing.T) {
	t.Parallel()
	const tolDeg = 1e-9
	for _, tc := range gdalCases {
		t.Run("EPSG:"+strconv.Itoa(tc.epsg), func(t *testing.T) {
			t.Parallel()
			to, err := ToWGS84(tc.epsg)
			if err != nil {
				t.Fatal(err)
			}
			want := gdalTransform(t, tc.epsg, tc.pts)
			for i, p := range tc.pts {
				got := to(p)
				if math.Abs(got[0]-want[i][0]) > tolDeg || math.Abs(got[1]-want[i][1]) > tolDeg {
					t.Errorf("EPSG:%d %v: got lon/lat %.10f, %.10f; gdaltransform %.10f, %.10f", tc.epsg, p, got[0], got[1], want[i][0], want[i][1])
				}
			}
		})
	}
}

// TestUTMCentralMeridian: a UTM zone's central meridian lies at 6z−183 degrees, its false
// easting is 500,000 m and the equator is northing 0 in the north (DMA TM 8358.2, "The
// Universal Grids", §2-6), so (500000, 0) in zone 30N is longitude −3, latitude 0.
func TestUTMCentralMeridian(t *testing.T) {
	t.Parallel()
	to, err := ToWGS84(32630)
	if err != nil {
		t.Fatal(err)
	}
	if got := to(orb.Point{500000, 0}); math.Abs(got[0]+3) > 1e-9 || math.Abs(got[1]) > 1e-9 {
		t.Errorf("EPSG:32630 (500000, 0): got %v, want (-3, 0)", got)
	}
}

// TestCodesThatAreNotAPlace: a code PROJ's database does not have, a vertical system and a
// geocentric one are refused with the code in the message (EPSG dataset: 5703 is NAVD88
// height, 4978 is WGS 84 geocentric).
func TestCodesThatAreNotAPlace(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		epsg int
		want string
	}{
		{999999, "PROJ's database has none of that code"},
		{5703, "a vertical one"},
		{4978, "a geocentric one"},
	} {
		to, err := ToWGS84(tc.epsg)
		if err == nil || to != nil {
			t.Errorf("ToWGS84(%d): got no error", tc.epsg)
			continue
		}
		if msg := err.Error(); !strings.Contains(msg, "EPSG:"+strconv.Itoa(tc.epsg)) || !strings.Contains(msg, tc.want) {
			t.Errorf("ToWGS84(%d): %q, want the code and %q", tc.epsg, msg, tc.want)
		}
		if _, again := ToWGS84(tc.epsg); again == nil || again.Error() != err.Error() {
			t.Errorf("ToWGS84(%d) the second time: %v, want the same error", tc.epsg, again)
		}
	}
}

// TestFailedPointIsNaN: a point the transverse Mercator cannot invert comes back as NaN,
// the documented contract.
func TestFailedPointIsNaN(t *testing.T) {
	t.Parallel()
	to, err := ToWGS84(32630)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range []orb.Point{{1e30, 1e30}, {1e10, 0}} {
		if got := to(p); !math.IsNaN(got[0]) || !math.IsNaN(got[1]) {
			t.Errorf("EPSG:32630 %v: got %v, want NaN, NaN", p, got)
		}
	}
}

// TestConcurrentSameAnswer: projections of one code, used from many goroutines at once (as
// a sweep's workers do), give bit for bit the answers of one goroutine.
func TestConcurrentSameAnswer(t *testing.T) {
	t.Parallel()
	var pts []orb.Point
	for i := range 200 {
		pts = append(pts, orb.Point{400000 + 137.5*float64(i), 5700000 + 911.25*float64(i)})
	}
	to, err := ToWGS84(32630)
	if err != nil {
		t.Fatal(err)
	}
	want := make([]orb.Point, len(pts))
	for i, p := range pts {
		want[i] = to(p)
	}
	var wg sync.WaitGroup
	errs := make(chan string, 8*len(pts))
	for range 8 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			mine, err := ToWGS84(32630) // the cached transformation, asked for concurrently
			if err != nil {
				errs <- err.Error()
				return
			}
			for i, p := range pts {
				if got := mine(p); got != want[i] {
					errs <- fmt.Sprintf("%v: got %v, want %v", p, got, want[i])
				}
			}
		}()
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Error(e)
	}
}
