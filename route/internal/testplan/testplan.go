package testplan

import (
	"bytes"
	"context"
	"encoding/csv"
	"spanwright/geo"
	"spanwright/media"
	"spanwright/route"
	"spanwright/route/fileset"
	"spanwright/route/internal/testsite"
	"spanwright/route/plan"
	"spanwright/route/routing"
	"spanwright/route/site"
	"strings"
	"testing"
)

// PullSolve plans the pull campus with the plan's defaults, changed by edit.
func PullSolve(t *testing.T, ductMM float64, spare int, edit func(p *plan.Plan)) (*route.Result, error) {
	t.Helper()
	return PullSolveJSON(t, testsite.PullCampus(ductMM, spare), edit)
}

// PullSolveJSON plans a campus given as GeoJSON with the plan's defaults, changed by edit.
func PullSolveJSON(t *testing.T, campus string, edit func(p *plan.Plan)) (*route.Result, error) {
	t.Helper()
	c, err := geo.Parse("pull.geojson", []byte(campus))
	if err != nil {
		t.Fatal(err)
	}
	net, err := geo.Build(c, geo.Options{})
	if err != nil {
		t.Fatal(err)
	}
	p := plan.Default
	p.File, p.Name, p.Hub = "pull.yaml", "pull test", "A"
	if edit != nil {
		edit(&p)
	}
	eng, err := plan.Engine(&p)
	if err != nil {
		t.Fatal(err)
	}
	return route.SolveWith(context.Background(), site.NewSite(c, net), &p, eng)
}

func LegOf(t *testing.T, r *route.Result, link string) (int, *routing.Leg) {
	t.Helper()
	for i := range r.Legs {
		if r.Legs[i].Link.ID == link && r.Legs[i].Name == routing.LegPrimary {
			if !r.Legs[i].Feasible {
				t.Fatalf("%s: infeasible: %s", link, r.Legs[i].Reason)
			}
			return i, &r.Legs[i]
		}
	}
	t.Fatalf("no leg %s", link)
	return 0, nil
}

func BOMQty(b *media.BOM, item string) float64 {
	q := 0.0
	for _, l := range b.Lines {
		if l.Item == item {
			q += l.Quantity
		}
	}
	return q
}

func BOMLine(b *media.BOM, prefix string) (media.BOMLine, bool) {
	for _, l := range b.Lines {
		if strings.HasPrefix(l.Item, prefix) {
			return l, true
		}
	}
	return media.BOMLine{}, false
}

func DemoResult(t *testing.T) *route.Result {
	t.Helper()
	s, p := testsite.Demo(t)
	eng, err := plan.Engine(p)
	if err != nil {
		t.Fatal(err)
	}
	r, err := route.SolveWith(context.Background(), s, p, eng)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func FileOf(t *testing.T, files []fileset.OutputFile, name string) []byte {
	t.Helper()
	for _, f := range files {
		if f.Name == name {
			return f.Data
		}
	}
	t.Fatalf("no output %s", name)
	return nil
}

func ReadCSV(t *testing.T, data []byte) [][]string {
	t.Helper()
	rows, err := csv.NewReader(bytes.NewReader(data)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return rows
}
