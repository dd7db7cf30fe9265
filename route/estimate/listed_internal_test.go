package estimate

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"spanwright/geo"
)

// TestListPiecesAddUp: the pieces of new work listed to 0.1 m add up to their bill line as
// the bill rounds it (media.BOM: a line of metres to 0.1 m, math.Round), and so to NewM and
// LateralM; each stays within 0.1 m of its length (Hamilton's largest-remainder
// apportionment; from memory: Balinski and Young, "Fair Representation", 1982). Three
// laterals of 17.04, 17.07 and 12.04 m (invented, like the demo's) each rounded on its own
// list 17.0 + 17.1 + 12.0 = 46.1 m under a line of 46.2 m, as the demo's did (tester 5,
// finding 16); apportioned, the two largest remainders get the missing decimetres.
func TestListPiecesAddUp(t *testing.T) {
	t.Parallel()
	c := Construction{TrenchM: map[string]float64{}}
	for i, m := range []float64{17.04, 17.07, 12.04} {
		c.TrenchM[geo.SurfaceTurf] += m
		c.Pieces = append(c.Pieces, WorkPiece{Building: string(rune('A' + i)), Entrance: "1", LengthM: m, line: geo.SurfaceTurf, assumed: true})
	}
	c.BoreM = 20.04
	c.Pieces = append(c.Pieces, WorkPiece{Span: "P-5", Method: geo.MethodBore, LengthM: 20.04, line: keyBore})
	c.PathwayM = map[string]float64{geo.TypeAerial: 100.06}
	c.Pieces = append(c.Pieces, WorkPiece{Span: "P-6", Method: geo.TypeAerial, LengthM: 100.06, line: keyPathway + geo.TypeAerial})
	c.listPieces()
	if c.NewM != 66.2 || c.LateralM != 46.2 {
		t.Errorf("new %v m, laterals %v m; want 66.2 (46.2 of turf + 20.0 of bore, as the bill's lines) and 46.2", c.NewM, c.LateralM)
	}
	// By kind, every kind in order: the bill's lines (a pole line is no trench: not in NewM).
	wantKinds := []KindM{{geo.MethodTrench, 46.2}, {geo.MethodBore, 20.0}, {geo.TypeAerial, 100.1}, {geo.TypeTray, 0}, {geo.TypeTunnel, 0}}
	if !slices.Equal(c.ByKind, wantKinds) || c.PathwayM[geo.TypeAerial] != 100.1 {
		t.Errorf("by kind %v, pole line line %v: want %v", c.ByKind, c.PathwayM[geo.TypeAerial], wantKinds)
	}
	want := []float64{17.0, 17.1, 12.1, 20.0, 100.1} // 17.07 and 12.04 have the largest remainders
	for i, w := range c.Pieces {
		if w.ListedM != want[i] {
			t.Errorf("piece %d (%.2f m): listed %v, want %v", i, w.LengthM, w.ListedM, want[i])
		}
	}
	if len(c.Assumed) != 3 || c.Assumed[0].LengthM+c.Assumed[1].LengthM+c.Assumed[2].LengthM != 46.2 {
		t.Errorf("assumed %+v, want the three laterals as listed, 46.2 m", c.Assumed)
	}
	if w, ok := c.LateralPiece("C", "1"); !ok || w.ListedM != 12.1 {
		t.Errorf("lateral of C: %v %v, want 12.1", w.ListedM, ok)
	}
	if w, ok := c.PieceOf("P-5"); !ok || w.ListedM != 20.0 {
		t.Errorf("span P-5: %v %v, want 20.0", w.ListedM, ok)
	}

	// Any pieces: per line, the listed decimetres add up to the line rounded; each piece
	// within 0.1 m; NewM the lines added up.
	rng := rand.New(rand.NewPCG(1, 2))
	surfaces := []string{geo.SurfaceTurf, geo.SurfaceAsphalt, keyBore}
	for trial := 0; trial < 500; trial++ {
		c := Construction{TrenchM: map[string]float64{}}
		for range 1 + rng.IntN(40) {
			l := surfaces[rng.IntN(len(surfaces))]
			m := rng.Float64() * 300
			if l == keyBore {
				c.BoreM += m
			} else {
				c.TrenchM[l] += m
			}
			c.Pieces = append(c.Pieces, WorkPiece{Span: "s", LengthM: m, line: l})
		}
		exact := map[string]float64{keyBore: c.BoreM}
		for k, m := range c.TrenchM {
			exact[k] = m
		}
		c.listPieces()
		var lines float64
		for _, l := range surfaces {
			total := exact[l]
			if billed := c.BoreM; l != keyBore {
				if billed = c.TrenchM[l]; billed != math.Round(total*10)/10 {
					t.Fatalf("trial %d, line %q: TrenchM %v, want the exact %v to 0.1 m", trial, l, billed, total)
				}
			} else if billed != math.Round(total*10)/10 {
				t.Fatalf("trial %d: BoreM %v, want the exact %v to 0.1 m", trial, billed, total)
			}
			var dm int64
			for _, w := range c.Pieces {
				if w.line != l {
					continue
				}
				d := math.Round(w.ListedM * 10)
				if math.Abs(d/10-w.ListedM) > 1e-12 || math.Abs(w.ListedM-w.LengthM) >= 0.1 {
					t.Fatalf("trial %d: piece of %.4f m listed %v: want a whole 0.1 m within 0.1 m", trial, w.LengthM, w.ListedM)
				}
				dm += int64(d)
			}
			if dm != int64(math.Round(total*10)) {
				t.Fatalf("trial %d, line %q: pieces add up to %d dm, the bill's line is %v m", trial, l, dm, math.Round(total*10)/10)
			}
			lines += math.Round(total*10) / 10
		}
		if math.Abs(c.NewM-lines) > 1e-9 {
			t.Fatalf("trial %d: NewM %v, want the lines added up, %v", trial, c.NewM, lines)
		}
		var trench float64
		for _, m := range c.TrenchM {
			trench += m
		}
		if k := c.ByKind; len(k) != len(NewKinds) || math.Abs(k[0].LengthM-trench) > 1e-9 || k[1].LengthM != c.BoreM || math.Abs(k[0].LengthM+k[1].LengthM-c.NewM) > 1e-9 {
			t.Fatalf("trial %d: by kind %v, want trench %v (the surfaces' lines) and bore %v adding up to NewM %v", trial, k, trench, c.BoreM, c.NewM)
		}
	}
}
