//go:build !js && !wasip1 && !windows

package ingest

import (
	"syscall"
	"time"
)

// cpuTime is the process's user + system CPU time: benchmarks report MB per
// CPU second as well, which other work on a shared machine disturbs less
// than wall time.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// maxRSS is the peak resident set size of the process in bytes.
func maxRSS() int64 {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return ru.Maxrss * 1024
}
