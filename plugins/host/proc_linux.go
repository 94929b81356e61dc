//go:build linux

package host

import (
	"os/exec"
	"syscall"
)

// selfExe is the running binary. /proc/self/exe stays valid when the file
// is replaced or deleted while the host runs.
func selfExe() (string, error) { return "/proc/self/exe", nil }

// setProcAttr makes the kernel kill the stage when the host dies.
func setProcAttr(cmd *exec.Cmd) {
	cmd.SysProcAttr = &syscall.SysProcAttr{Pdeathsig: syscall.SIGKILL}
}
