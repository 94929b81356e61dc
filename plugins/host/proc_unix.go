//go:build unix && !linux

package host

import (
	"os"
	"syscall"
)

// selfExe is the running binary.
func selfExe() (string, error) { return os.Executable() }

// groupAttr puts the stage in a process group of its own. Stages served
// by plugins/sdk also exit when the host goes away.
func groupAttr() *syscall.SysProcAttr { return &syscall.SysProcAttr{Setpgid: true} }

// awaitExit returns at once: without waitid's WNOWAIT the group is killed
// after the process is reaped.
func awaitExit(int) {}

// limitMemory does nothing: only Linux can limit another process's memory.
func limitMemory(int, int64) error { return nil }

const memoryLimited = false
