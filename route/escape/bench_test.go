package escape

import (
	"os"
	"testing"
)

// BenchmarkHTML passes the demo's report.html (the golden file, 177 KB, no hidden
// character) through HTML.
func BenchmarkHTML(b *testing.B) {
	page, err := os.ReadFile("../../cmd/spanwright/testdata/golden/demo/report.html")
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(int64(len(page)))
	for b.Loop() {
		HTML(page)
	}
}

// BenchmarkCSVCell is one id cell of links.csv.
func BenchmarkCSVCell(b *testing.B) {
	for b.Loop() {
		CSVCell("ADM-LIB")
	}
}
