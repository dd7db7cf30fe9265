package metamorphic_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"spanwright/route/internal/campusgen"
	"spanwright/route/output"
)

// TestRenameIDs: renaming every building, pathway and structure id (the hub, links and
// shared-risk groups with them) gives every leg the same pathways and medium, named back,
// and moves the total by at most 0.5 % (the bound; today it does not move at all,
// since the optimizer sees the problem in an order set by geometry and cost).
func TestRenameIDs(t *testing.T) {
	each(t, func(t *testing.T, seed uint64, c *campusgen.Campus, sc scenario) {
		_, base := outputs(t, sc)
		for trial := range 3 {
			r := rand.New(rand.NewPCG(seed, 100+uint64(trial)))
			names := slices.Clone(c.IDs)
			perm := r.Perm(len(names))
			rename := map[string]string{}
			for i, id := range c.IDs {
				rename[id] = fmt.Sprintf("X%04d", perm[i])
			}
			sc2 := rewrite(sc, c, func(fs []campusgen.Feature) []campusgen.Feature {
				for _, f := range fs {
					for k, p := range f.Props {
						if s, ok := p.Value.(string); ok && (p.Key == "id" || p.Key == "group" || p.Key == "building") {
							f.Props[k].Value = rename[s]
						}
					}
				}
				return fs
			})
			plan := sc.plan
			for _, id := range c.IDs {
				plan = strings.ReplaceAll(plan, " "+id+"\n", " "+rename[id]+"\n")
				plan = strings.ReplaceAll(plan, "to: "+id+",", "to: "+rename[id]+",")
			}
			sc2.plan = plan
			_, res := outputs(t, sc2)
			back := map[string]string{}
			for id, to := range rename {
				back[to] = id
			}
			// Every leg takes the same pathways and medium, named back.
			want := map[string]string{}
			for i := range base.Legs {
				l := &base.Legs[i]
				want[l.Link.From+">"+l.Link.To+"/"+l.Name] = l.Medium + " " + strings.Join(l.Pathways, " ")
			}
			if len(res.Legs) != len(base.Legs) {
				t.Errorf("trial %d: %d legs, want %d", trial, len(res.Legs), len(base.Legs))
			}
			for i := range res.Legs {
				l := &res.Legs[i]
				ps := make([]string, len(l.Pathways))
				for k, p := range l.Pathways {
					ps[k] = back[p]
				}
				key := back[l.Link.From] + ">" + back[l.Link.To] + "/" + l.Name
				if got := l.Medium + " " + strings.Join(ps, " "); got != want[key] {
					t.Errorf("trial %d: leg %s: got %s, want %s", trial, key, got, want[key])
				}
			}
			a, b := output.Summarize(base), output.Summarize(res)
			if a.Infeasible != b.Infeasible {
				t.Errorf("trial %d: infeasible legs %d → %d", trial, a.Infeasible, b.Infeasible)
			}
			if rel := math.Abs(float64(b.TotalCents-a.TotalCents)) / float64(a.TotalCents); rel > 0.005 {
				t.Errorf("trial %d: renaming moved the total by %.2f %% (%d → %d cents; route %.0f → %.0f m)",
					trial, 100*rel, a.TotalCents, b.TotalCents, a.TotalRouteM, b.TotalRouteM)
			}
		}
	})
}
