package geo

import (
	"bufio"
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"os/exec"
	"strconv"
	"strings"
	"testing"

	"github.com/paulmach/orb"
)

func TestDistanceMPublished(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name                   string
		lat1, lon1, lat2, lon2 float64
		wantM, tolM            float64
	}{
		// GeographicLib's test suite / Karney 2013, "Algorithms for geodesics": JFK to CDG,
		// published as 5 853 226 m, rounded to the metre (seen).
		{"JFK to CDG", 40.6, -73.8, 49.01666667, 2.55, 5853226, 0.5},
		// Karney 2013, "Algorithms for geodesics", worked example (seen).
		{"Karney 2013 example", 35.60777, -139.44815, -11.17491, -69.95921, 8935244.5604818305, 0.001},
		// Campus scale, computed with GeographicLib (REFERENCES.md, computed).
		{"500 m north at 40N", 40.0, -75.0, 40.0045, -75.0, 499.656, 0.001},
		{"427 m east at 40N", 40.0, -75.0, 40.0, -74.995, 426.969, 0.001},
		{"434 m at 51.5N", 51.5, -0.1, 51.503, -0.096, 434.225, 0.001},
		{"same point", 51.5, -0.1, 51.5, -0.1, 0, 0},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			got := DistanceM(orb.Point{tc.lon1, tc.lat1}, orb.Point{tc.lon2, tc.lat2})
			if math.Abs(got-tc.wantM) > tc.tolM {
				t.Errorf("%s: got %.6f m, want %.6f ± %g", tc.name, got, tc.wantM, tc.tolM)
			}
		})
	}
}

func TestDistanceMSphereIsShort(t *testing.T) {
	t.Parallel()
	// REFERENCES.md (computed with GeographicLib): a sphere gives 433.518 m where the
	// ellipsoid gives 434.225 m, so a spherical length would be 0.16 % short.
	a, b := orb.Point{-0.1, 51.5}, orb.Point{-0.096, 51.503}
	if s := sphericalM(a, b); math.Abs(s-433.5) > 1 {
		t.Errorf("sphere: got %.3f m, want about 433.5", s)
	}
	if e := DistanceM(a, b); e-sphericalM(a, b) < 0.5 {
		t.Errorf("ellipsoid %.3f m should exceed sphere %.3f m by about 0.7 m", e, sphericalM(a, b))
	}
}

func TestDistanceMNearAntipodal(t *testing.T) {
	t.Parallel()
	// Reference lengths from GeodSolve -i (Debian geographiclib-tools), the implementation of
	// Karney 2013, "Algorithms for geodesics"; section 9 there describes where Vincenty's
	// iteration fails.
	cases := []struct {
		name         string
		lat2, lon2   float64
		wantM        float64
		wantVincenty bool
		relTol       float64
	}{
		{"converges", 0.5, 179.5, 19936288.579, true, 1e-9},
		{"falls back to sphere", 0.5, 179.7, 19944127.421, false, 0.005},
		{"equatorial, falls back", 0, 179.9, 20003008.422, false, 0.005},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			_, ok := vincentyM(0, 0, tc.lat2, tc.lon2)
			if ok != tc.wantVincenty {
				t.Errorf("%s: vincenty converged %v, want %v", tc.name, ok, tc.wantVincenty)
			}
			got := DistanceM(orb.Point{0, 0}, orb.Point{tc.lon2, tc.lat2})
			if rel := math.Abs(got-tc.wantM) / tc.wantM; rel > tc.relTol {
				t.Errorf("%s: got %.3f m, want %.3f (relative error %.2g > %g)", tc.name, got, tc.wantM, rel, tc.relTol)
			}
		})
	}
}

func TestLengthM(t *testing.T) {
	t.Parallel()
	ls := orb.LineString{{-75, 40}, {-75, 40.0045}, {-75, 40}}
	if got := LengthM(ls); math.Abs(got-2*499.656) > 0.002 {
		t.Errorf("there and back: got %.4f m, want %.4f", got, 2*499.656)
	}
	if got := LengthM(ls[:1]); got != 0 {
		t.Errorf("one point: got %v, want 0", got)
	}
}

// TestDistanceMAgainstGeodSolve compares DistanceM with GeographicLib's GeodSolve (Debian
// geographiclib-tools), the reference implementation of Karney 2013, on seeded random
// campus-scale pairs.
func TestDistanceMAgainstGeodSolve(t *testing.T) {
	t.Parallel()
	bin, err := exec.LookPath("GeodSolve")
	if err != nil {
		if os.Getenv("CI") == "true" {
			t.Fatalf("GeodSolve not found (apt-get install geographiclib-tools): %v", err)
		}
		t.Skip("GeodSolve not found; install Debian's geographiclib-tools")
	}
	rng := rand.New(rand.NewPCG(2013, 7))
	lats := []float64{0, 1, 25, 40, 51.5, 60, 70, 78, 85, 89}
	type pair struct{ a, b orb.Point }
	var pairs []pair
	for i := 0; i < 400; i++ {
		lat := lats[i%len(lats)] + rng.Float64()
		if rng.IntN(2) == 0 {
			lat = -lat
		}
		lon := rng.Float64()*360 - 180
		// Up to about 3 km in each direction.
		dLat := (rng.Float64()*2 - 1) * 0.027
		dLon := (rng.Float64()*2 - 1) * 0.027 / math.Max(math.Cos(lat*deg), 0.05)
		pairs = append(pairs, pair{orb.Point{lon, lat}, orb.Point{lon + dLon, math.Max(-90, math.Min(90, lat+dLat))}})
	}
	var in bytes.Buffer
	for _, p := range pairs {
		fmt.Fprintf(&in, "%.12f %.12f %.12f %.12f\n", p.a[1], p.a[0], p.b[1], p.b[0])
	}
	cmd := exec.Command(bin, "-i", "-p", "9")
	cmd.Stdin = &in
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("GeodSolve: %v", err)
	}
	sc := bufio.NewScanner(bytes.NewReader(out))
	worst, worstAbs := 0.0, 0.0
	i := 0
	for sc.Scan() {
		if i >= len(pairs) {
			t.Fatalf("GeodSolve printed more lines than pairs")
		}
		f := strings.Fields(sc.Text())
		if len(f) != 3 {
			t.Fatalf("GeodSolve line %d: %q", i+1, sc.Text())
		}
		want, err := strconv.ParseFloat(f[2], 64)
		if err != nil {
			t.Fatalf("GeodSolve line %d: %v", i+1, err)
		}
		got := DistanceM(pairs[i].a, pairs[i].b)
		abs := math.Abs(got - want)
		rel := abs / want
		if rel > 0.0005 {
			t.Errorf("pair %d %v → %v: got %.6f m, GeodSolve %.6f m", i, pairs[i].a, pairs[i].b, got, want)
		}
		worst = math.Max(worst, rel)
		worstAbs = math.Max(worstAbs, abs)
		i++
	}
	if i != len(pairs) {
		t.Fatalf("GeodSolve answered %d of %d pairs", i, len(pairs))
	}
	t.Logf("%d pairs: worst relative error %.3g, worst absolute error %.3g m", len(pairs), worst, worstAbs)
}
