package output

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"strconv"
	"testing"

	"spanwright/route/internal/testplan"
	"spanwright/route/items"
	"spanwright/route/plan"
	"spanwright/route/workbook"
)

// TestMoreStrandsThanTheLargestCable (tester 11's finding 15): links of 200 strands with 50 %
// growth need 300 strands, more than the largest size of the catalog (288: its counts are the
// TIA-598 common-practice counts 12 to 288, seen). On the starter price book, the one the
// tester planned with, each buys 288 + 12, the cheapest two cables (21.00 + 1.40 USD/m on
// os2 osp-loose-tube against 2 × 21.00; media.Engine.Cables), not 2 × 288; and everything the
// bill counts per strand follows the 300 strands bought: the cable lines (one per size), the
// terminations at both ends, the loss and OTDR tests; the cable labels and the duct fill follow
// the two cables, each of its own diameter. The money is the same in metres and feet.
func TestMoreStrandsThanTheLargestCable(t *testing.T) {
	t.Parallel()
	r, err := testplan.PullSolve(t, 100, 2, func(p *plan.Plan) {
		p.Prices = filepath.Join("..", "starter", "files", "prices.yaml")
		p.Defaults.Strands, p.Defaults.Growth = 200, 0.5
	})
	if err != nil {
		t.Fatal(err)
	}
	cat := r.Engine.Catalog()
	strands, tests := 0, 0.0
	cableM := map[string]float64{}
	n := 0
	for i := range r.Legs {
		l := &r.Legs[i]
		if !l.Feasible {
			t.Fatalf("%s: infeasible: %s", l.Label(), l.Reason)
		}
		if !cat.Medium(l.Medium).Fibre() {
			continue
		}
		n++
		c := l.Cable
		if got := c.Cables.Text(); got != "288 + 12" || c.Cables.Strands() != 300 || l.StrandsCable != 300 || c.Terminated != 300 {
			t.Errorf("%s: cables %s (%d strands), strands %d, terminated %d; want 288 + 12, 300, 300, 300",
				l.Label(), got, c.Cables.Strands(), l.StrandsCable, c.Terminated)
		}
		if labels := CableLabels(r, i); len(labels) != 2 {
			t.Errorf("%s: labels %v, want two (one per cable)", l.Label(), labels)
		}
		strands += 2 * c.Cables.Strands()
		tests += float64(c.Cables.Strands())
		for _, s := range c.Cables {
			cableM[items.Cable(l.Medium, l.Construction, s.Count, true, 0).Item] += c.OutsideLengthM()
		}
		// The duct fill counts the two cables, each its own diameter (the catalog's sizes:
		// 20 mm and 10.5 mm for osp-loose-tube).
		for _, f := range r.Estimate.Fill {
			if ods := f.CablesODMM; slices.Contains(f.Legs, l.Label()) && len(ods) > 0 && !slices.Contains(ods, c.Cables[1].ODMM) {
				t.Errorf("%s on %s: cable ODs %v, none the 12's %g mm", l.Label(), f.Span, ods, c.Cables[1].ODMM)
			}
		}
	}
	if n == 0 {
		t.Fatal("no fibre leg")
	}
	b := r.Estimate.BOM
	medium := r.Legs[0].Medium
	if got := testplan.BOMQty(b, "termination "+medium+", per strand end"); got != float64(strands) {
		t.Errorf("terminations: %v, want %d (both ends of every strand bought)", got, strands)
	}
	for _, item := range []string{"loss test fibre strands", "OTDR test fibre strands"} {
		if l, ok := testplan.BOMLine(b, item); !ok || l.Work != tests {
			t.Errorf("%s: %+v (found %v), want %v strands", item, l, ok, tests)
		}
	}
	for item, want := range cableM {
		if got := testplan.BOMQty(b, item); got != want {
			t.Errorf("%s: %v m, want %v m", item, got, want)
		}
	}
	if len(cableM) != 2 {
		t.Errorf("cable lines %v, want a 288 and a 12 line", cableM)
	}
	total := func(units string) int64 {
		files, err := Files(context.Background(), r, WriteOptions{Units: units, SkipGeoPackage: true})
		if err != nil {
			t.Fatal(err)
		}
		var sum struct {
			TotalCents int64 `json:"total_cents"`
		}
		if err := json.Unmarshal(testplan.FileOf(t, files, "summary.json"), &sum); err != nil {
			t.Fatal(err)
		}
		return sum.TotalCents
	}
	if m, ft := total(UnitsMetric), total(UnitsImperial); m != ft || m != b.TotalCents {
		t.Errorf("total: %d cents in metres, %d in feet, bill %d", m, ft, b.TotalCents)
	}
}

// TestLossBudgetAttenuation (tester 11's finding 7): bom.xlsx's loss budgets sheet gives the
// cabled attenuation each row counts, in dB/km, in metres and in feet alike; on the demo it is
// the catalog's maximum of the leg's construction (ANSI/TIA-568.3-D: 3.5 dB/km at 850 nm
// multimode, 0.5 dB/km outside-plant single-mode at 1310 and 1550 nm, from memory), with an
// entrance transition the inside construction's over its run (1.0 dB/km riser), and the
// design loss is it × the channel + the design losses of the connections and splices
// (computed), within the sheet's rounding.
func TestLossBudgetAttenuation(t *testing.T) {
	t.Parallel()
	r := testplan.DemoResult(t)
	cat := r.Engine.Catalog()
	for _, units := range []string{UnitsMetric, UnitsImperial} {
		files, err := Files(context.Background(), r, WriteOptions{Units: units, SkipGeoPackage: true})
		if err != nil {
			t.Fatal(err)
		}
		x, err := workbook.Open(testplan.FileOf(t, files, "bom.xlsx"))
		if err != nil {
			t.Fatal(err)
		}
		defer x.Close()
		if h, _ := x.Value("loss budgets", "G1"); h != "attenuation (dB/km)" {
			t.Fatalf("%s: loss budgets G1 %q, want attenuation (dB/km)", units, h)
		}
		row := 2
		for i := range r.Legs {
			l := &r.Legs[i]
			for _, loss := range l.Losses {
				v, _ := x.Value("loss budgets", fmt.Sprintf("G%d", row))
				got, _ := strconv.ParseFloat(v, 64)
				row++
				m := cat.Medium(l.Medium)
				want, ok := m.Construction(l.Construction).AttenDBPerKm(loss.WavelengthNM)
				if l.Inside != "" {
					// With an entrance transition, the inside construction over its run (computed).
					in, has := m.Construction(l.Inside).AttenDBPerKm(loss.WavelengthNM)
					f := min(1, l.Cable.InsideRunM/l.Cable.ChannelM)
					want, ok = want*(1-f)+in*f, ok && has
				}
				if !ok || math.Abs(got-want) > 1e-12 {
					t.Errorf("%s %s, %d nm: attenuation %q, want %g dB/km (catalog)", units, l.Label(), loss.WavelengthNM, v, want)
				}
				if units != UnitsMetric {
					continue
				}
				budget := got*l.Cable.ChannelM/1000 + float64(loss.Pairs)*cat.DesignPairDB + float64(loss.Splices)*cat.DesignSpliceDB
				if loss.Operating {
					budget += loss.AttenuatorDB
				}
				if math.Abs(budget-loss.LossDB) > 1e-6 {
					t.Errorf("%s, %d nm: %g dB/km × %g m + connections = %.6f dB, loss %.6f dB", l.Label(), loss.WavelengthNM, got, l.Cable.ChannelM, budget, loss.LossDB)
				}
			}
		}
		if row == 2 {
			t.Fatal("no loss budget")
		}
	}
}
