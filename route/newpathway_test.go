package route_test

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"spanwright/media"
	"spanwright/route"
	"spanwright/route/internal/testplan"
	"spanwright/route/plan"
)

// newPathwayBooks writes the demo price book (invented prices; new_pathway_per_m aerial
// 44.00 and tray 58.00, no tunnel) as demo.yaml, without new_pathway_per_m as none.yaml and
// with a tunnel at 3,000.00 a metre as tunnel.yaml, into a folder it returns.
func newPathwayBooks(t *testing.T) string {
	t.Helper()
	book, err := os.ReadFile("../media/prices-demo.yaml")
	if err != nil {
		t.Fatal(err)
	}
	const section = "new_pathway_per_m:\n  aerial: 44.00\n  tray: 58.00\n"
	if !strings.Contains(string(book), section) {
		t.Fatal("the demo book's new_pathway_per_m moved")
	}
	dir := t.TempDir()
	for name, text := range map[string]string{"demo.yaml": string(book), "none.yaml": strings.Replace(string(book), section, "", 1),
		"tunnel.yaml": strings.Replace(string(book), section, section+"  tunnel: 3000.00\n", 1)} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

// TestNewPathwayPricedByType (tester 13's finding K): a proposed pole line, about 590 m from A
// to C, is priced as a new pole line per metre at new_pathway_per_m.aerial, never as trench,
// turf restoration or new buried work (no locates bid item per buried metre, nothing on an
// assumed surface), in the bill and in the optimizer's objective alike (oneCostModel); its
// cautions are the pole line's (overhead power, clearances) and the locates of its pole
// holes, not trench cave-in. A proposed tunnel is priced at new_pathway_per_m.tunnel and its
// cautions name it among the confined spaces. A book without the type's price stops the plan
// naming the key. Figures by hand: the span's ellipsoidal length is 591.2 m to 0.1 m (the
// test grid's 590 m east–west, as geo measures it); 591.2 m × 44.00 USD = 26,012.80 USD;
// 591.2 m × 3,000.00 USD = 1,773,600.00 USD.
func TestNewPathwayPricedByType(t *testing.T) {
	t.Parallel()
	dir := newPathwayBooks(t)
	solve := func(campus, book string) (*route.Result, error) {
		return testplan.PullSolveJSON(t, campus, func(p *plan.Plan) {
			p.Dir, p.Prices = dir, book
			p.Design.AllowOutdoorCopper = false
		})
	}
	for _, tc := range []struct {
		name, typ, book, item string
		lead                  float64
		wantCents             int64
		caution, notCaution   string
		where                 string
	}{
		{"pole line", "aerial", "demo.yaml", "new pole line: poles, guys and anchors, messenger strand, lashing", 1, 2601280,
			route.CautionAerial, route.CautionTrench, "new pole line to build: span P1"},
		{"tunnel", "tunnel", "tunnel.yaml", "new utility tunnel", 2, 177360000,
			route.CautionConfined, "", "new tunnel to build: span P1"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			campus := newWorkCampus(false, []float64{tc.lead, 10, 0, 600, 0})
			r, err := solve(campus, tc.book)
			if err != nil {
				t.Fatal(err)
			}
			if len(r.Opened) != 1 || r.Opened[0] != "P1" {
				t.Fatalf("opened %v, want [P1]", r.Opened)
			}
			if sp, _ := r.Site.Net.Span("P1"); math.Round(sp.LengthM*10) != 5912 {
				t.Fatalf("span P1 is %.3f m: the figures by hand take 591.2 m", sp.LengthM)
			}
			var found bool
			for _, l := range r.Estimate.BOM.Lines {
				switch {
				case l.Item == tc.item:
					found = true
					if l.Quantity != 591.2 || l.ExtendedCents != tc.wantCents || l.Price.Path() != "new_pathway_per_m."+tc.typ {
						t.Errorf("%s: %v m at %s, %s: want 591.2 m, %s at new_pathway_per_m.%s", l.Item, l.Quantity,
							l.Price.Path(), media.FormatCents(l.ExtendedCents), media.FormatCents(tc.wantCents), tc.typ)
					}
				case strings.HasPrefix(l.Item, "trench") || strings.HasPrefix(l.Item, "restoration") || l.Item == "directional bore":
					t.Errorf("bill line %q %v: a proposed %s pathway is not dug", l.Item, l.Quantity, tc.typ)
				}
			}
			if !found {
				t.Errorf("no bill line %q", tc.item)
			}
			con := r.Estimate.Construction
			if con.NewM != 0 || len(con.Assumed) != 0 || con.PathwayM[tc.typ] != 591.2 {
				t.Errorf("new trench %v m, assumed %v, new %s %v m: want 0, none, 591.2", con.NewM, con.Assumed, tc.typ, con.PathwayM[tc.typ])
			}
			oneCostModel(t, tc.name, r) // the optimizer prices the opening as the bill does
			var ids []string
			for _, c := range r.Cautions {
				ids = append(ids, c.ID)
				if c.ID == tc.caution && !strings.Contains(c.Where, tc.where) {
					t.Errorf("caution %s names %q, want %q in it", c.ID, c.Where, tc.where)
				}
			}
			if !strings.Contains(strings.Join(ids, " "), tc.caution) || (tc.notCaution != "" && strings.Contains(strings.Join(ids, " "), tc.notCaution)) {
				t.Errorf("cautions %v: want %s, not %q", ids, tc.caution, tc.notCaution)
			}
		})
	}
	t.Run("no price", func(t *testing.T) {
		t.Parallel()
		for lead, book := range map[float64]string{1: "none.yaml", 2: "demo.yaml"} {
			typ := map[float64]string{1: "aerial", 2: "tunnel"}[lead]
			_, err := solve(newWorkCampus(false, []float64{lead, 10, 0, 600, 0}), book)
			if !errors.Is(err, media.ErrMissingPrice) || !strings.Contains(err.Error(), "add new_pathway_per_m."+typ) {
				t.Errorf("proposed %s with %s: got %v, want the missing price new_pathway_per_m.%s", typ, book, err, typ)
			}
		}
	})
}
