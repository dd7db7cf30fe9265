package route_test

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/media"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
)

// TestMissingPricesAtOnce: a price book without the restoration, added duct and structure
// prices the demo's new construction needs is rejected with every missing price named at once,
// each with the book and the key to add, by check (route.Check, before routing) and by plan
// alike; a user fixing them one run at a time (tester 5, finding 8) needed three runs.
func TestMissingPricesAtOnce(t *testing.T) {
	t.Parallel()
	data, err := os.ReadFile(filepath.Join("..", "media", "prices-demo.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "prices.yaml")
	if err := os.WriteFile(path, testplan.DropPriceKeys(data, "restoration_per_m", "added_duct_per_m", "structures_each"), 0o644); err != nil {
		t.Fatal(err)
	}
	s, p := testsite.Demo(t)
	q := *p
	q.Prices = path
	eng, err := plan.Engine(&q)
	if err != nil {
		t.Fatal(err)
	}
	checkErr := route.Check(s, &q, eng)
	_, planErr := route.SolveWith(context.Background(), s, &q, eng)
	for name, err := range map[string]error{"check": checkErr, "plan": planErr} {
		if !errors.Is(err, media.ErrMissingPrice) {
			t.Fatalf("%s: got %v, want missing prices", name, err)
		}
		for _, key := range []string{"add added_duct_per_m", "add restoration_per_m.turf", "add structures_each.handhole"} {
			if !strings.Contains(err.Error(), path+`: price "`) || !strings.Contains(err.Error(), key) {
				t.Errorf("%s: error lacks %q and the book's name:\n%v", name, key, err)
			}
		}
	}
	if checkErr.Error() != planErr.Error() {
		t.Errorf("check and plan differ:\ncheck: %v\nplan:  %v", checkErr, planErr)
	}
}
