//go:build unix

package report

import "syscall"

// cpuTime is the CPU time the process has used, user and system, in nanoseconds: on a
// machine shared with other work it moves far less than the wall time, and beside ns/op it
// shows how much of the writing ran side by side.
func cpuTime() int64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return ru.Utime.Nano() + ru.Stime.Nano()
}
