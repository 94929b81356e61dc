package host_test

import (
	"context"
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

// wrapper writes a shell script that runs the toy stage name of this test
// binary, writing its pid to pidFile: with exec, or without (the shell
// waits, holding the stage's stdout and stderr open).
func wrapper(t *testing.T, name, pidFile string, withExec bool) string {
	t.Helper()
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	line := "'" + self + "' __stage " + name + " '" + pidFile + "'"
	script := "#!/bin/sh\n" + line + "\nstatus=$?\nexit $status\n"
	if withExec {
		script = "#!/bin/sh\nexec " + line + "\n"
	}
	p := filepath.Join(t.TempDir(), name+".sh")
	if err := os.WriteFile(p, []byte(script), 0o755); err != nil {
		t.Fatal(err)
	}
	return p
}

// readPid waits up to d for a pid file and returns its pid.
func readPid(t *testing.T, path string, d time.Duration) int {
	t.Helper()
	deadline := time.Now().Add(d)
	for {
		if b, err := os.ReadFile(path); err == nil {
			if pid, err := strconv.Atoi(strings.TrimSpace(string(b))); err == nil {
				return pid
			}
		}
		if time.Now().After(deadline) {
			t.Fatalf("no pid in %s", path)
		}
		time.Sleep(10 * time.Millisecond)
	}
}

// TestWrapperWithoutExecEnds is the regression test of defect 4 of issue
// 11: a stage behind a shell wrapper without exec kept the stage's stdout
// open and hung the run past its start timeout. The stage runs in a process
// group of its own, ended as a group.
func TestWrapperWithoutExecEnds(t *testing.T) {
	t.Parallel()
	pidFile := filepath.Join(t.TempDir(), "pid")
	h := newHost(t, host.Options{StartTimeout: time.Second})
	start := time.Now()
	_, err := h.Runner(host.Spec{Path: wrapper(t, "slowstart", pidFile, false)}).Describe(t.Context())
	if !errors.Is(err, host.ErrHandshake) || !strings.Contains(err.Error(), "no handshake within 1s") {
		t.Errorf("start: %v", err)
	}
	if el := time.Since(start); el > 6*time.Second {
		t.Errorf("the start took %v past a limit of 1 s", el)
	}
	if pid := readPid(t, pidFile, time.Second); !waitGone(pid, 2*time.Second) {
		t.Errorf("the stage under the wrapper (pid %d) is alive", pid)
	}

	// A good stage behind such a wrapper works and ends with the host.
	pidFile = filepath.Join(t.TempDir(), "pid")
	r := h.Runner(host.Spec{Path: wrapper(t, "echo", pidFile, false)})
	if _, err := r.Run(t.Context(), request("")); err != nil {
		t.Fatal(err)
	}
	shell, stagePid := r.Pid(), readPid(t, pidFile, time.Second)
	h.Close()
	for _, pid := range []int{shell, stagePid} {
		if !waitGone(pid, 3*time.Second) {
			t.Errorf("pid %d alive after Close", pid)
		}
	}
}

// TestGrandchildrenEnded: stage grandchildren were never ended (defect 4).
func TestGrandchildrenEnded(t *testing.T) {
	t.Parallel()
	pidFile := filepath.Join(t.TempDir(), "pid")
	h := newHost(t, host.Options{})
	r := h.Runner(host.Spec{Path: wrapper(t, "grandchild", pidFile, true)})
	if _, err := r.Run(t.Context(), request("")); err != nil {
		t.Fatal(err)
	}
	grandchild := readPid(t, pidFile+".grandchild", 2*time.Second)
	h.Close()
	if !waitGone(grandchild, 3*time.Second) {
		t.Errorf("grandchild pid %d alive after Close", grandchild)
	}
}

// TestCancelDuringStart: Ctrl-C did not stop a stage hanging in its start
// (defect 4): the start now gives up when its context ends.
func TestCancelDuringStart(t *testing.T) {
	t.Parallel()
	pidFile := filepath.Join(t.TempDir(), "pid")
	h := newHost(t, host.Options{StartTimeout: time.Minute})
	ctx, cancel := context.WithTimeout(t.Context(), 300*time.Millisecond)
	defer cancel()
	start := time.Now()
	_, err := h.Runner(host.Spec{Path: wrapper(t, "slowstart", pidFile, false)}).Describe(ctx)
	if !errors.Is(err, context.DeadlineExceeded) {
		t.Errorf("start: %v, want the context's error", err)
	}
	if el := time.Since(start); el > 5*time.Second {
		t.Errorf("the start ended %v after it was cancelled", el)
	}
	if pid := readPid(t, pidFile, time.Second); !waitGone(pid, 2*time.Second) {
		t.Errorf("stage pid %d alive", pid)
	}
}

// TestTimeoutEndsProcess is the regression test of defect 10 of issue 11:
// with a call time limit, a raw "rpc error … DeadlineExceeded" was
// sometimes shown and the stage process reused. A call past its limit is
// ErrTimeout, worded by the host, and the process is always ended, also a
// stage that answered "cancelled" in time for its own deadline.
func TestTimeoutEndsProcess(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{CallTimeout: 300 * time.Millisecond})
	for _, tc := range []struct {
		name, params string
	}{{"hang", ""}, {"echo", `{"sleep_ms": 5000}`}} {
		r := h.Runner(host.Builtin(tc.name))
		for call := range 3 {
			if _, err := r.Describe(t.Context()); err != nil {
				t.Fatal(err)
			}
			pid := r.Pid()
			_, err := r.Run(t.Context(), request(tc.params))
			if !errors.Is(err, host.ErrTimeout) || strings.Contains(err.Error(), "rpc error") || strings.Contains(err.Error(), "DeadlineExceeded") {
				t.Errorf("%s call %d: %v", tc.name, call, err)
			}
			if !waitGone(pid, 3*time.Second) {
				t.Errorf("%s call %d: pid %d alive after the timeout", tc.name, call, pid)
			}
		}
		if n := r.Starts(); n != 3 {
			t.Errorf("%s: %d processes for 3 timed-out calls, want 3", tc.name, n)
		}
	}
}

// TestStageEnvironmentIsMinimal: a stage received the host's whole
// environment, a secret in an unrelated variable included. It gets the
// minimal variables and those its Spec allows.
func TestStageEnvironmentIsMinimal(t *testing.T) {
	t.Setenv("FOILWRIGHT_TEST_SECRET", "hunter2")
	t.Setenv("FOILWRIGHT_TEST_ALLOWED", "yes")
	h := newHost(t, host.Options{MaxNodes: 1234})
	seen := func(spec host.Spec) string {
		reply, err := h.Runner(spec).Run(t.Context(), request(""))
		if err != nil {
			t.Fatal(err)
		}
		return strings.Join(reply.Warnings, "\n")
	}
	env := seen(host.Builtin("env"))
	if strings.Contains(env, "hunter2") || strings.Contains(env, "FOILWRIGHT_TEST_ALLOWED") {
		t.Errorf("the stage saw variables it was not given:\n%s", env)
	}
	for _, want := range []string{"PATH=", stage.LogLevelEnv + "=", stage.MaxNodesEnv + "=1234", stage.Handshake.MagicCookieKey + "="} {
		if !strings.Contains(env, want) {
			t.Errorf("the stage lacks %s", want)
		}
	}
	if env := seen(host.Spec{Name: "env", Env: "FOILWRIGHT_TEST_ALLOWED"}); !strings.Contains(env, "FOILWRIGHT_TEST_ALLOWED=yes") || strings.Contains(env, "hunter2") {
		t.Errorf("with FOILWRIGHT_TEST_ALLOWED allowed:\n%s", env)
	}
	got := strings.Join(h.StageEnv(host.Spec{Name: "env", Env: "FOILWRIGHT_TEST_ALLOWED"}), " ")
	if !strings.Contains(got, "FOILWRIGHT_TEST_ALLOWED=yes") || strings.Contains(got, "hunter2") || strings.Contains(got, "COOKIE") {
		t.Errorf("StageEnv = %s", got)
	}
}

// TestStageMemoryLimit: a stage that eats memory is stopped at the
// stage-memory limit, and the error says so.
func TestStageMemoryLimit(t *testing.T) {
	if raceEnabled {
		t.Skip("the race detector's shadow memory passes any data limit")
	}
	t.Parallel()
	h := newHost(t, host.Options{Memory: 256 << 20, CallTimeout: 30 * time.Second, NoRetry: true})
	_, err := h.Runner(host.Builtin("memory")).Run(t.Context(), request(""))
	if !errors.Is(err, host.ErrCrashed) || !strings.Contains(err.Error(), "out of memory") || !strings.Contains(err.Error(), "256 MiB") {
		t.Errorf("got %v", err)
	}
	if strings.Contains(err.Error(), "goroutine ") {
		t.Errorf("the error holds a stack dump:\n%v", err)
	}
}

// TestCrashReportHasNoStackDump: a stage's Go stack trace was passed on
// whole; the report keeps the panic and where it happened.
func TestCrashReportHasNoStackDump(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{NoRetry: true})
	_, err := h.Runner(host.Builtin("gopanic")).Run(t.Context(), request(""))
	msg := err.Error()
	if !strings.Contains(msg, "panic: toy panics in a goroutine") || !strings.Contains(msg, "| at ") {
		t.Errorf("report lacks the panic or its place:\n%s", msg)
	}
	if strings.Contains(msg, "goroutine ") && strings.Contains(msg, "[running]") || strings.Contains(msg, "+0x") {
		t.Errorf("report holds a stack dump:\n%s", msg)
	}
}

// TestTooManyNodesRefusedBeforeTheCall: a section larger than the stage
// describes is refused by the host, as bad input.
func TestTooManyNodesRefusedBeforeTheCall(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{})
	six := stage.Request{Section: []byte(`{"format": "foilwright.section/1", "nodes": [[1,0],[0.5,0.1],[0,0],[0.5,-0.1],[0.9,0],[1,0]]}`), SectionName: "six.json"}
	_, err := h.Runner(host.Builtin("small")).Run(t.Context(), six)
	if !errors.Is(err, host.ErrTooManyNodes) || !strings.Contains(err.Error(), "6 nodes") || !strings.Contains(err.Error(), "at most 5") {
		t.Errorf("got %v", err)
	}
	// A host limit lower than the stage's own applies too.
	h = newHost(t, host.Options{MaxNodes: 3})
	if _, err := h.Runner(host.Builtin("echo")).Run(t.Context(), request("")); !errors.Is(err, host.ErrTooManyNodes) {
		t.Errorf("4 nodes past a host limit of 3: %v", err)
	}
}

// TestReplyLimits: a reply past the result-bytes limit, or a result nested
// past the json-depth limit, is refused without being kept.
func TestReplyLimits(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{MaxReply: 1 << 20})
	_, err := h.Runner(host.Builtin("echo")).Run(t.Context(), request(`{"reply_bytes": 2097152}`))
	if !errors.Is(err, host.ErrTooLarge) || !strings.Contains(err.Error(), "result-bytes") {
		t.Errorf("2 MiB past 1 MiB: %v", err)
	}
	_, err = h.Runner(host.Builtin("malformed")).Run(t.Context(), request(`{"kind": "deep"}`))
	if !errors.Is(err, stage.ErrMalformed) || !strings.Contains(err.Error(), "nested more than 64") {
		t.Errorf("deep result: %v", err)
	}
}
