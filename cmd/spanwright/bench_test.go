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
// (campusgen.BenchOptions: about 4.6 pathway features per building, a fifth of them
// proposed, full ducts, broken runs, parallel banks, aerial, tunnel and EMI spans, every
// building linked to its nearest cross-connect, a few diverse links) written to GeoJSON in a
// temporary folder by route/internal/campusgen/campusfiles (run with go run: the generator
// is internal to route). Run it on one core, once per count (the 5,000-building plan takes
// minutes):
//
//	go test -run '^$' -bench Commands -benchmem -benchtime 1x -count 3 -cpu 1 ./cmd/spanwright/
func BenchmarkCommands(b *testing.B) {
	for _, n := range []int{1000, 5000} {
		dir := ""
		campus := func(sb *testing.B) string {
			if dir == "" {
				dir = b.TempDir() // the parent's: it outlives each sub-benchmark
				gen := exec.Command("go", "run", "./route/internal/campusgen/campusfiles", "-buildings", strconv.Itoa(n), "-out", dir)
				gen.Dir = filepath.Join("..", "..")
				if out, err := gen.CombinedOutput(); err != nil {
					sb.Fatalf("generating the campus: %v\n%s", err, out)
				}
			}
			return filepath.Join(dir, "plan.yaml")
		}
		for _, cmd := range []string{"check", "plan"} {
			b.Run(fmt.Sprintf("%s/buildings_%d", cmd, n), func(b *testing.B) {
				planFile := campus(b)
				args := []string{"spanwright", "check", planFile}
				if cmd == "plan" {
					args = []string{"spanwright", "plan", "--out", filepath.Join(b.TempDir(), "out"), planFile}
				}
				b.ReportAllocs()
				b.ResetTimer()
				for b.Loop() {
					app := newApp()
					app.Writer, app.ErrWriter = io.Discard, io.Discard
					err := app.RunContext(context.Background(), args)
					if code := exitCode(err); code != exitOK && code != exitInfeasible {
						b.Fatalf("%s: exit %d: %v", cmd, code, err)
					}
				}
			})
		}
	}
}
