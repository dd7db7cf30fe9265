package optimize

import (
	"math"
	"reflect"
	"testing"
)

// TestFingerprintCoversEveryField changes each field of a problem's edges, demands, options,
// the problem and the settings in turn, and checks that the fingerprint changes: a field
// added to these types without a line in Fingerprint fails here, as would a field the
// fingerprint reads from the wrong place. Solve being deterministic (TestDeterminism) is what
// makes a fingerprint a sound cache key.
func TestFingerprintCoversEveryField(t *testing.T) {
	p := randomInstance(7, 3, 4)
	base, ok := Fingerprint(p, Settings{})
	if !ok {
		t.Fatal("no fingerprint for a problem without Fits")
	}
	if again, _ := Fingerprint(randomInstance(7, 3, 4), Settings{}); again != base {
		t.Fatal("the same problem gave two fingerprints")
	}
	if len(p.Demands) == 0 || len(p.Demands[0].Options) == 0 || len(p.Edges) == 0 {
		t.Fatal("instance too small for the test")
	}
	changed := func(what string, mutate func(q *Problem, s *Settings)) {
		t.Helper()
		q := clone(p)
		var s Settings
		mutate(q, &s)
		if got, _ := Fingerprint(q, s); got == base {
			t.Errorf("changing %s left the fingerprint as it was", what)
		}
	}
	each := func(kind string, v reflect.Value, apply func(q *Problem) reflect.Value) {
		for i := 0; i < v.NumField(); i++ {
			name := v.Type().Field(i).Name
			if kind == "Problem" && (name == "Fits" || name == "Edges" || name == "Demands" || name == "NoTransit" || name == "Sites" || name == "Charges") {
				continue // Fits: no fingerprint at all (below); slices: their elements are checked
			}
			if kind == "Demand" && name == "Options" {
				continue
			}
			changed(kind+"."+name, func(q *Problem, _ *Settings) { bump(apply(q).Field(i)) })
		}
	}
	each("Problem", reflect.ValueOf(*p), func(q *Problem) reflect.Value { return reflect.ValueOf(q).Elem() })
	each("Edge", reflect.ValueOf(p.Edges[0]), func(q *Problem) reflect.Value { return reflect.ValueOf(&q.Edges[0]).Elem() })
	each("Demand", reflect.ValueOf(p.Demands[0]), func(q *Problem) reflect.Value { return reflect.ValueOf(&q.Demands[0]).Elem() })
	each("Option", reflect.ValueOf(p.Demands[0].Options[0]), func(q *Problem) reflect.Value {
		return reflect.ValueOf(&q.Demands[0].Options[0]).Elem()
	})
	st := reflect.TypeOf(Settings{})
	for i := 0; i < st.NumField(); i++ {
		changed("Settings."+st.Field(i).Name, func(_ *Problem, s *Settings) { bump(reflect.ValueOf(s).Elem().Field(i)) })
	}
	changed("Problem.NoTransit", func(q *Problem, _ *Settings) { q.NoTransit = make([]bool, q.Nodes) })
	changed("a NoTransit mark", func(q *Problem, _ *Settings) {
		q.NoTransit = make([]bool, q.Nodes)
		q.NoTransit[1] = true
	})
	changed("Problem.Sites", func(q *Problem, _ *Settings) { q.Sites = make([]int, q.Nodes) })
	sites := func(q *Problem) {
		q.Sites = make([]int, q.Nodes)
		q.Sites[1], q.Sites[2] = 1, 1
	}
	p1 := clone(p)
	sites(p1)
	withSites, _ := Fingerprint(p1, Settings{})
	if withSites == base {
		t.Error("marking a place left the fingerprint as it was")
	}
	p1 = clone(p1)
	p1.Sites[2] = 0
	if got, _ := Fingerprint(p1, Settings{}); got == withSites {
		t.Error("changing one Sites mark left the fingerprint as it was")
	}
	charged := func(q *Problem) { q.Charges = []Charge{{ID: "h", Edges: []int{0, 1}, Cents: 5}} }
	p0 := clone(p)
	charged(p0)
	withCharge, _ := Fingerprint(p0, Settings{})
	if withCharge == base {
		t.Error("adding a charge left the fingerprint as it was")
	}
	ct := reflect.TypeOf(Charge{})
	for i := 0; i < ct.NumField(); i++ {
		q := clone(p0)
		if f := reflect.ValueOf(&q.Charges[0]).Elem().Field(i); f.Kind() == reflect.Slice {
			q.Charges[0].Edges = []int{0, 2} // Charge.Edges
		} else {
			bump(f)
		}
		if got, _ := Fingerprint(q, Settings{}); got == withCharge {
			t.Errorf("changing Charge.%s left the fingerprint as it was", ct.Field(i).Name)
		}
	}
	changed("the number of edges", func(q *Problem, _ *Settings) { q.Edges = q.Edges[:len(q.Edges)-1] })
	changed("the number of options", func(q *Problem, _ *Settings) {
		q.Demands[0].Options = append(q.Demands[0].Options, q.Demands[0].Options[0])
	})

	q := clone(p)
	q.Fits = func(int, []float64, int) bool { return true }
	if _, ok := Fingerprint(q, Settings{}); ok {
		t.Error("a problem with a custom Fits got a fingerprint")
	}
}

// clone copies a problem deeply enough for the test to change any field.
func clone(p *Problem) *Problem {
	q := *p
	q.Edges = append([]Edge(nil), p.Edges...)
	q.Demands = append([]Demand(nil), p.Demands...)
	q.NoTransit = append([]bool(nil), p.NoTransit...)
	q.Sites = append([]int(nil), p.Sites...)
	q.Charges = append([]Charge(nil), p.Charges...)
	for i := range q.Charges {
		q.Charges[i].Edges = append([]int(nil), p.Charges[i].Edges...)
	}
	for i := range q.Demands {
		q.Demands[i].Options = append([]Option(nil), p.Demands[i].Options...)
	}
	return &q
}

// bump changes a field's value.
func bump(v reflect.Value) {
	switch v.Kind() {
	case reflect.String:
		v.SetString(v.String() + "x")
	case reflect.Int, reflect.Int64:
		v.SetInt(v.Int() + 1)
	case reflect.Uint64:
		v.SetUint(v.Uint() ^ 1<<5)
	case reflect.Float64:
		if math.IsInf(v.Float(), 0) {
			v.SetFloat(1)
		} else {
			v.SetFloat(v.Float() + 0.5)
		}
	case reflect.Bool:
		v.SetBool(!v.Bool())
	case reflect.Slice: // Settings.Start: one more (zero) element
		v.Set(reflect.Append(v, reflect.Zero(v.Type().Elem())))
	default:
		panic("bump: unhandled kind " + v.Kind().String())
	}
}
