package geo

import (
	"errors"
	"os"
	"path/filepath"
	"testing"

	"spanwright/geo/input"
)

// FuzzParse checks that Parse never panics, that it returns either a campus or an
// *input.Problems, and that Build never panics on what Parse accepts. The seed corpus is every
// fixture under testdata/bad plus a small valid campus; testdata/fuzz/FuzzParse holds
// crashers found earlier.
func FuzzParse(f *testing.F) {
	ents, err := os.ReadDir(badDir)
	if err != nil {
		f.Fatal(err)
	}
	for _, e := range ents {
		data, err := os.ReadFile(filepath.Join(badDir, e.Name()))
		if err != nil {
			f.Fatal(err)
		}
		f.Add(data)
	}
	f.Add([]byte(validCampus))
	f.Fuzz(func(t *testing.T, data []byte) {
		c, err := Parse("fuzz.geojson", data)
		if err != nil {
			var list *input.Problems
			if !errors.As(err, &list) || c != nil {
				t.Fatalf("got %T and campus %v, want *input.Problems and nil", err, c)
			}
			return
		}
		n, err := Build(c, Options{})
		if err == nil {
			checkNetworkFuzz(t, n)
		}
	})
}

// checkNetworkFuzz checks that every span names junctions that exist.
func checkNetworkFuzz(t *testing.T, n *Network) {
	for _, s := range n.Spans {
		if _, ok := n.Junction(s.From); !ok {
			t.Fatalf("span %s: unknown junction %q", s.ID, s.From)
		}
		if _, ok := n.Junction(s.To); !ok {
			t.Fatalf("span %s: unknown junction %q", s.ID, s.To)
		}
		if !(s.LengthM >= 0) {
			t.Fatalf("span %s: length %v", s.ID, s.LengthM)
		}
	}
	for _, a := range n.Access {
		if _, ok := n.Junction(a.Junction); !ok {
			t.Fatalf("access %s: unknown junction %q", a.Building, a.Junction)
		}
	}
}

// FuzzBuild builds small campuses whose coordinates lie on a 0.25 m lattice, so that
// vertices, ends, structures and entrances often fall within SnapM of each other, lines
// overlap and loops close: Build must never panic and must keep its invariants.
func FuzzBuild(f *testing.F) {
	f.Add([]byte{2, 3, 0, 0, 40, 0, 40, 40, 2, 20, 246, 20, 20, 1, 20, 1, 1, 10, 10, 4})
	f.Add([]byte{3, 1, 0, 0, 100, 0, 1, 0, 0, 100, 0, 2, 50, 0, 50, 1, 50, 100, 2, 50, 0, 51, 0})
	f.Add([]byte{1, 4, 0, 0, 80, 0, 80, 80, 0, 0, 1, 0, 0, 1, 40, 40, 2})
	f.Fuzz(func(t *testing.T, data []byte) {
		next := func() int {
			if len(data) == 0 {
				return 0
			}
			v := int(int8(data[0]))
			data = data[1:]
			return v
		}
		pt := func() (float64, float64) { return float64(next()) * 0.25, float64(next()) * 0.25 }
		var c Campus
		np := next()&7 + 1
		for i := 0; i < np; i++ {
			nv := next()&7 + 2
			var xy []float64
			for j := 0; j < nv; j++ {
				x, y := pt()
				xy = append(xy, x, y)
			}
			ls := ml(xy...)
			distinct := 1
			for k := 1; k < len(ls); k++ {
				if ls[k] != ls[k-1] {
					distinct++
				}
			}
			if distinct < 2 {
				continue
			}
			c.Pathways = append(c.Pathways, pw("P"+itoa(i), ls))
		}
		ns := next() & 3
		for i := 0; i < ns; i++ {
			x, y := pt()
			c.Structures = append(c.Structures, Structure{ID: "S" + itoa(i), Point: at(x, y)})
		}
		nb := next() & 3
		for i := 0; i < nb; i++ {
			x, y := pt()
			id := "B" + itoa(i)
			c.Buildings = append(c.Buildings, box(id, x, y, float64(next()&15)+0.5))
			if next()&1 == 1 {
				ex, ey := pt()
				c.Entrances = append(c.Entrances, Entrance{Building: id, Point: at(ex, ey)})
			}
		}
		n, err := Build(&c, Options{})
		if err != nil {
			var list *input.Problems
			if !errors.As(err, &list) {
				t.Fatalf("got %T, want *input.Problems: %v", err, err)
			}
			return
		}
		checkNetwork(t, n)
		if len(n.Access) != len(c.Buildings) {
			t.Fatalf("got %d accesses for %d buildings", len(n.Access), len(c.Buildings))
		}
		n2, _ := Build(&c, Options{})
		if spanIDs(n) != spanIDs(n2) {
			t.Fatalf("two builds differ")
		}
	})
}
