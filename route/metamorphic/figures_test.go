package metamorphic_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"math"
	"strings"
	"testing"

	"spanwright/route/internal/campusgen"
	"spanwright/route/output"
)

// TestNewTrenchAgrees: new_trench_m in summary.json is the terminal's new trench and the sum of
// the bill's trench and bore lines, on campuses with full ducts (added ducts dig trench
// beside existing spans) and proposed pathways. Before, summary.json counted only the
// proposed pathways opened (29 m where the bill had 534.8 m).
func TestNewTrenchAgrees(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		files, res := outputs(t, sc)
		var sum struct {
			NewTrenchM float64 `json:"new_trench_m"`
		}
		if err := json.Unmarshal(files["summary.json"], &sum); err != nil {
			t.Fatal(err)
		}
		billM := 0.0
		for _, q := range res.Estimate.Quantities {
			if strings.HasPrefix(q.Item, "trench, ") || q.Item == "directional bore" {
				billM += q.Amount
			}
		}
		if math.Abs(sum.NewTrenchM-billM) > 0.05 {
			t.Errorf("summary.json new_trench_m %.1f, bill of materials %.1f m", sum.NewTrenchM, billM)
		}
		var term bytes.Buffer
		if err := output.PrintSummary(&term, res, output.WriteOptions{Units: output.UnitsMetric}); err != nil {
			t.Fatal(err)
		}
		if want := fmt.Sprintf("new trench %.1f m", sum.NewTrenchM); !strings.Contains(term.String(), want) {
			t.Errorf("terminal lacks %q:\n%s", want, term.String())
		}
	})
}
