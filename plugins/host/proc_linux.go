//go:build linux

package host

import (
	"syscall"

	"golang.org/x/sys/unix"
)

// selfExe is the running binary. /proc/self/exe stays valid when the file
// is replaced or deleted while the host runs.
func selfExe() (string, error) { return "/proc/self/exe", nil }

// groupAttr puts the stage in a process group of its own and makes the
// kernel kill it when the host dies.
func groupAttr() *syscall.SysProcAttr {
	return &syscall.SysProcAttr{Setpgid: true, Pdeathsig: syscall.SIGKILL}
}

// awaitExit waits until process pid has exited, without reaping it, so
// that its process group id stays taken until the group is killed.
func awaitExit(pid int) {
	var info unix.Siginfo
	for {
		err := unix.Waitid(unix.P_PID, pid, &info, unix.WEXITED|unix.WNOWAIT, nil)
		if err != unix.EINTR {
			return
		}
	}
}

// limitMemory limits the data memory (heap and other private writable
// mappings, RLIMIT_DATA) of process pid to n bytes. RLIMIT_AS would count
// the address space a Go runtime reserves without using it (about 1 GiB
// before a Go stage does anything), so it is not used.
func limitMemory(pid int, n int64) error {
	lim := unix.Rlimit{Cur: uint64(n), Max: uint64(n)}
	var old unix.Rlimit
	if err := unix.Prlimit(pid, unix.RLIMIT_DATA, nil, &old); err == nil && old.Max < lim.Max {
		lim.Cur, lim.Max = min(lim.Cur, old.Max), old.Max
	}
	return unix.Prlimit(pid, unix.RLIMIT_DATA, &lim, nil)
}

// memoryLimited reports whether limitMemory does anything here.
const memoryLimited = true
