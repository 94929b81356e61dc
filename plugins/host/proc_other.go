//go:build !unix

package host

import (
	"context"
	"os"

	"github.com/hashicorp/go-hclog"
	"github.com/hashicorp/go-plugin/runner"
	"os/exec"
)

// selfExe is the running binary.
func selfExe() (string, error) { return os.Executable() }

const memoryLimited = false

// groupRunnerFunc is nil: without Unix process groups the host lets
// go-plugin start the stage itself (Cmd), which ends the stage but not its
// children.
func groupRunnerFunc(string, []string, []string, int64, func(*groupRunner)) func(hclog.Logger, *exec.Cmd, string) (runner.Runner, error) {
	return nil
}

type groupRunner struct{}

func (*groupRunner) exitedState() (bool, string) { return false, "" }

func (*groupRunner) Kill(context.Context) error { return nil }

func groupPid(*groupRunner) int { return 0 }
