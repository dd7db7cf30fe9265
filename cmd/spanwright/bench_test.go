package main

import (
	"context"
	"fmt"
	"io"
	"os/exec"
	"path/filepath"
	"strconv"
	"testing"
)

// BenchmarkCommands runs check and plan (cost objective, every file written, report.html
// included) as the command line does, on generated campuses that look like real ones
// (campusgen.BenchOptions: about 4.5 pathway features per building, a fifth of them
// proposed, full ducts, broken runs, parallel banks, aerial, tunnel and EMI spans) written
// to GeoJSON in a temporary folder by route/internal/campusgen/campusfiles (run with go run:
// the generator is internal to route). Run it on one core:
//
//	go test -run '^$' -bench Commands -benchmem -cpu 1 ./cmd/spanwright/
func BenchmarkCommands(b *testing.B) {
	for _, n := range []int{1000, 5000} {
		dir := b.TempDir()
		gen := exec.Command("go", "run", "./route/internal/campusgen/campusfiles", "-buildings", strconv.Itoa(n), "-out", dir)
		gen.Dir = filepath.Join("..", "..")
		if out, err := gen.CombinedOutput(); err != nil {
			b.Fatalf("generating the campus: %v\n%s", err, out)
		}
		planFile := filepath.Join(dir, "plan.yaml")
		for _, cmd := range [][]string{{"check", planFile}, {"plan", "--out", filepath.Join(dir, "out"), planFile}} {
			b.Run(fmt.Sprintf("%s/buildings_%d", cmd[0], n), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					app := newApp()
					app.Writer, app.ErrWriter = io.Discard, io.Discard
					err := app.RunContext(context.Background(), append([]string{"spanwright"}, cmd...))
					if code := exitCode(err); code != exitOK && code != exitInfeasible {
						b.Fatalf("%s: exit %d: %v", cmd[0], code, err)
					}
				}
			})
		}
	}
}
