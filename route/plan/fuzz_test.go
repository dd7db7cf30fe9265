package plan

import (
	"os"
	"path/filepath"
	"testing"

	"spanwright/geo/input"
)

// FuzzParsePlan checks that no plan file, however broken, panics the plan reader: it returns
// a plan or an error, and a plan it returns passes its own validation.
func FuzzParsePlan(f *testing.F) {
	for _, p := range []string{"../../testdata/demo/plan.yaml", "../../testdata/sweep/prices-low.yaml"} {
		if data, err := os.ReadFile(p); err == nil {
			f.Add(data)
		}
	}
	f.Add([]byte("campus: [c]\ndesign:\n  snap: 2\n  loss_margin_db: lots\n"))
	f.Add([]byte("campus: c\nlinks:\n  - &a {to: A}\n  - *a\n  - <<: *a\n    rate: 1G\n"))
	f.Add([]byte("campus: [c]\nbudget: [1]\ndefaults: 3\nlinks: {to: A}\nname: {a: b}\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		p, err := ParsePlan(filepath.Join("dir", "plan.yaml"), data)
		if err != nil {
			return
		}
		var errs input.Problems
		if p.validate(&errs); errs.Len() > 0 {
			t.Errorf("ParsePlan returned a plan that fails validation: %v", &errs)
		}
	})
}
