//go:build pprof

package main

import (
	"fmt"
	"os"
	"runtime"
	"runtime/pprof"
)

// A developer build (go build -tags pprof ./cmd/spanwright) writes a CPU profile to the file
// named by SPANWRIGHT_CPUPROFILE and a heap profile, taken at exit, to SPANWRIGHT_MEMPROFILE:
// profiles of the whole command, for go tool pprof. The product build has neither.
func init() {
	if path := os.Getenv("SPANWRIGHT_CPUPROFILE"); path != "" {
		f, err := os.Create(path)
		if err != nil {
			fmt.Fprintf(os.Stderr, "spanwright: cpu profile: %v\n", err)
			os.Exit(2)
		}
		if err := pprof.StartCPUProfile(f); err != nil {
			fmt.Fprintf(os.Stderr, "spanwright: cpu profile: %v\n", err)
			os.Exit(2)
		}
		prev := stopProfile
		stopProfile = func() { pprof.StopCPUProfile(); f.Close(); prev() }
	}
	if path := os.Getenv("SPANWRIGHT_MEMPROFILE"); path != "" {
		prev := stopProfile
		stopProfile = func() {
			prev()
			f, err := os.Create(path)
			if err != nil {
				fmt.Fprintf(os.Stderr, "spanwright: heap profile: %v\n", err)
				return
			}
			runtime.GC()
			err = pprof.WriteHeapProfile(f)
			if cerr := f.Close(); err == nil {
				err = cerr
			}
			if err != nil {
				fmt.Fprintf(os.Stderr, "spanwright: heap profile: %v\n", err)
			}
		}
	}
}
