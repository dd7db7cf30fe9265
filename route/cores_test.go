package route_test

import (
	"bytes"
	"context"
	"runtime"
	"testing"

	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/output"
)

// TestSameBytesAnyCores plans a generated campus (diverse links, pulls through full ducts) with
// one and with two cores, nothing remembered between, and compares every file: the legs and
// pull plans worked out side by side (ctxio.Each) are put together in a fixed order.
func TestSameBytesAnyCores(t *testing.T) {
	s, p := testplan.CampusSite(t, 150)
	render := func(procs int) map[string][]byte {
		t.Helper()
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		s.Solved.Purge()
		s.Pulls.Purge()
		s.Reaches.Purge()
		r, err := route.Solve(context.Background(), s, p) // with a new engine
		if err != nil {
			t.Fatal(err)
		}
		if len(r.Estimate.Pulls) == 0 || len(r.Legs) < 2*64 {
			t.Fatalf("%d legs and %d pull sections: too few to be worked out side by side", len(r.Legs), len(r.Estimate.Pulls))
		}
		files, err := output.Files(context.Background(), r, output.WriteOptions{})
		if err != nil {
			t.Fatal(err)
		}
		out := map[string][]byte{}
		for _, f := range files {
			out[f.Name] = f.Data
		}
		return out
	}
	one, two := render(1), render(2)
	if len(one) == 0 {
		t.Fatal("no files")
	}
	for name, data := range one {
		if !bytes.Equal(data, two[name]) {
			t.Errorf("%s differs between one core and two", name)
		}
	}
}
