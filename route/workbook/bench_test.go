package workbook

import (
	"fmt"
	"testing"
)

// BenchmarkBytes renders a workbook the size of a plan's bill of materials: five sheets of
// 40 rows by 12 columns.
func BenchmarkBytes(b *testing.B) {
	w := New()
	for s := 0; s < 5; s++ {
		cols := make([]Column, 12)
		for c := range cols {
			cols[c] = Column{Name: fmt.Sprintf("column %d", c), Unit: "m"}
		}
		sh := w.AddSheet(fmt.Sprintf("sheet %d", s), cols...)
		sh.Filter = true
		for r := 0; r < 40; r++ {
			cells := []Cell{Text(fmt.Sprintf("L-%d", r))}
			for c := 1; c < 11; c++ {
				cells = append(cells, Number(float64(r*c)/3, 1))
			}
			cells = append(cells, Formula(fmt.Sprintf("SUM(%s:%s)", Ref(1, r+2), Ref(10, r+2)), 0, 1))
			sh.Append(cells...)
		}
	}
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		if _, err := w.Bytes(); err != nil {
			b.Fatal(err)
		}
	}
}
