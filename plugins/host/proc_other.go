//go:build !linux

package host

import (
	"os"
	"os/exec"
)

// selfExe is the running binary.
func selfExe() (string, error) { return os.Executable() }

// setProcAttr does nothing: only Linux has Pdeathsig. Stages served by
// plugins/sdk watch their parent instead.
func setProcAttr(*exec.Cmd) {}
