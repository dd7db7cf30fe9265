//go:build !unix

package report

// cpuTime is not measured on systems without getrusage: BenchmarkPlanOutputs reports 0.
func cpuTime() int64 { return 0 }
