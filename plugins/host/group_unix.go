//go:build unix

package host

import (
	"context"
	"errors"
	"io"
	"os"
	"os/exec"
	"strconv"
	"sync"
	"sync/atomic"
	"syscall"
	"time"

	"github.com/hashicorp/go-hclog"
	"github.com/hashicorp/go-plugin/runner"
)

// pipeDrain is how long the host keeps reading a stage's stdout and stderr
// after its process group was ended, before it closes them: a process that
// left the group (setsid) may hold them open for ever.
const pipeDrain = time.Second

// groupRunner runs a stage in a process group of its own (go-plugin's
// runner.Runner). When the stage's process ends, or is killed, the whole
// group is killed: a shell wrapper without exec, the stage under it, and
// the grandchildren it started. The stage's stdin is /dev/null; its stdout
// and stderr are pipes this runner owns, so that a grandchild holding them
// cannot keep the host waiting.
type groupRunner struct {
	cmd    *exec.Cmd
	log    hclog.Logger
	name   string
	memory int64 // data memory limit, bytes; 0: none

	stdout, stderr *os.File // read ends
	pid            atomic.Int64
	done           chan struct{} // closed when the process has ended and been reaped
	waitErr        error
	closeOnce      sync.Once
}

var _ runner.Runner = (*groupRunner)(nil)

func (r *groupRunner) Start(context.Context) error {
	outR, outW, err := os.Pipe()
	if err != nil {
		return err
	}
	errR, errW, err := os.Pipe()
	if err != nil {
		outR.Close()
		outW.Close()
		return err
	}
	r.cmd.Stdin = nil // /dev/null: go-plugin would hand the stage the host's stdin
	r.cmd.Stdout, r.cmd.Stderr = outW, errW
	r.cmd.SysProcAttr = groupAttr()
	err = r.cmd.Start()
	outW.Close()
	errW.Close()
	if err != nil {
		outR.Close()
		errR.Close()
		return err
	}
	r.stdout, r.stderr = outR, errR
	pid := r.cmd.Process.Pid
	r.pid.Store(int64(pid))
	if r.memory > 0 {
		if err := limitMemory(pid, r.memory); err != nil {
			r.log.Warn("cannot limit the stage's memory", "error", err)
		}
	}
	go r.wait(pid)
	r.log.Debug("stage process started", "path", r.cmd.Path, "pid", pid)
	return nil
}

// wait waits for the stage's process to end, ends its group (before the
// process is reaped, so the group id cannot be reused meanwhile), reaps it,
// and closes the pipes once they are drained or after pipeDrain.
func (r *groupRunner) wait(pid int) {
	awaitExit(pid)
	syscall.Kill(-pid, syscall.SIGKILL)
	r.waitErr = r.cmd.Wait()
	close(r.done)
	time.AfterFunc(pipeDrain, r.closePipes)
}

func (r *groupRunner) closePipes() {
	r.closeOnce.Do(func() {
		r.stdout.Close()
		r.stderr.Close()
	})
}

func (r *groupRunner) Wait(context.Context) error {
	<-r.done
	return r.waitErr
}

// Kill kills the stage's whole process group.
func (r *groupRunner) Kill(context.Context) error {
	pid := int(r.pid.Load())
	if pid <= 0 {
		return nil
	}
	select {
	case <-r.done:
		return nil // reaped: its group was killed then, and its id may be reused
	default:
	}
	if err := syscall.Kill(-pid, syscall.SIGKILL); err != nil && !errors.Is(err, syscall.ESRCH) {
		return err
	}
	return nil
}

func (r *groupRunner) Diagnose(context.Context) string { return "" }

func (r *groupRunner) Stdout() io.ReadCloser { return r.stdout }
func (r *groupRunner) Stderr() io.ReadCloser { return r.stderr }
func (r *groupRunner) Name() string          { return r.name }
func (r *groupRunner) ID() string            { return strconv.Itoa(int(r.pid.Load())) }

func (r *groupRunner) PluginToHost(network, addr string) (string, string, error) {
	return network, addr, nil
}

func (r *groupRunner) HostToPlugin(network, addr string) (string, string, error) {
	return network, addr, nil
}

// exitedState returns how the process ended, once it has.
func (r *groupRunner) exitedState() (bool, string) {
	select {
	case <-r.done:
		if ps := r.cmd.ProcessState; ps != nil {
			return true, ps.String()
		}
		return true, "exited"
	default:
		return false, ""
	}
}

// groupRunnerFunc returns go-plugin's RunnerFunc that starts path with
// args in a group runner, with env (the stage's environment) before the
// variables go-plugin adds.
func groupRunnerFunc(path string, args, env []string, memory int64, made func(*groupRunner)) func(hclog.Logger, *exec.Cmd, string) (runner.Runner, error) {
	return func(log hclog.Logger, spec *exec.Cmd, _ string) (runner.Runner, error) {
		cmd := exec.Command(path, args...)
		cmd.Env = append(append([]string{}, env...), spec.Env...)
		r := &groupRunner{cmd: cmd, log: log, name: path, memory: memory, done: make(chan struct{})}
		if made != nil {
			made(r)
		}
		return r, nil
	}
}

// groupPid returns the process id of r, 0 before it started.
func groupPid(r *groupRunner) int { return int(r.pid.Load()) }
