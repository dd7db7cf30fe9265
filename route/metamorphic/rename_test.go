package metamorphic_test

import (
	"fmt"
	"maps"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"spanwright/route"
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
			sc2, back := renameAll(sc, c, rand.New(rand.NewPCG(seed, 100+uint64(trial))))
			_, res := outputs(t, sc2)
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
			// Every span's ducts hold the same cables, of the same legs, in the same order
			// (estimate.DuctFill: first fit, spread over empty ducts by install.DuctBank.Spread).
			if got, want := ductDigest(res, back), ductDigest(base, nil); !maps.Equal(got, want) {
				for k, w := range want {
					if got[k] != w {
						t.Errorf("trial %d: %s holds %q, want %q", trial, k, got[k], w)
					}
				}
				for k, g := range got {
					if _, ok := want[k]; !ok {
						t.Errorf("trial %d: %s holds %q, want nothing", trial, k, g)
					}
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

// renameAll renames every building, pathway and structure id of c (the hub, links and
// shared-risk groups with them) to X and a number in a random order, and returns the
// scenario and the names back.
func renameAll(sc scenario, c *campusgen.Campus, r *rand.Rand) (scenario, map[string]string) {
	perm := r.Perm(len(c.IDs))
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
	back := map[string]string{}
	for id, to := range rename {
		back[to] = id
	}
	return sc2, back
}

// ductDigest is what each duct of each span holds: its cables' legs (from>to/name) in the order
// pulled, keyed by span and duct, with every id named back by back (nil: as it is).
func ductDigest(res *route.Result, back map[string]string) map[string]string {
	name := func(id string) string {
		if back == nil {
			return id
		}
		return back[id]
	}
	legs := map[string]string{}
	for i := range res.Legs {
		l := &res.Legs[i]
		legs[l.Label()] = name(l.Link.From) + ">" + name(l.Link.To) + "/" + l.Name
	}
	out := map[string]string{}
	for _, f := range res.Estimate.Fill {
		var in []string
		for _, lbl := range f.Legs {
			in = append(in, legs[lbl])
		}
		key := fmt.Sprintf("span %s%s duct %d", name(f.PathwayID), strings.TrimPrefix(f.Span, f.PathwayID), f.Duct)
		out[key] = strings.Join(in, " ")
	}
	return out
}
