//go:build unix

package main

import "syscall"

// cpuTime returns the processor time this process has used so far, user
// and system, on all its threads, in seconds.
func cpuTime() float64 {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return float64(ru.Utime.Nano()+ru.Stime.Nano()) / 1e9
}
