//go:build unix

package pipeline

import (
	"runtime"
	"syscall"
)

// maxRSSKiB returns the peak resident memory of this process, KiB.
func maxRSSKiB() int64 {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	if runtime.GOOS == "darwin" {
		return int64(ru.Maxrss) / 1024 // bytes there
	}
	return int64(ru.Maxrss)
}
