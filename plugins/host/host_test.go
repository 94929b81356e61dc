package host_test

import (
	"bufio"
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"github.com/hashicorp/go-hclog"

	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

func TestMain(m *testing.M) {
	if len(os.Args) >= 3 && os.Getenv(stage.Handshake.MagicCookieKey) == stage.Handshake.MagicCookieValue && os.Args[1] == "__stage" {
		serveToy(os.Args[2])
		os.Exit(0)
	}
	if len(os.Args) >= 2 && os.Args[1] == "__host" {
		hostChild()
		os.Exit(0)
	}
	if len(os.Args) >= 3 && os.Args[1] == "__sleep" {
		os.WriteFile(os.Args[2], []byte(strconv.Itoa(os.Getpid())), 0o644)
		time.Sleep(time.Hour)
		os.Exit(0)
	}
	// Race-enabled children sleep 1 s at exit by default; the fault
	// tests end many of them.
	if os.Getenv("GORACE") == "" {
		os.Setenv("GORACE", "atexit_sleep_ms=0")
	}
	os.Exit(m.Run())
}

// Limits for the fault tests: a start under -race takes up to about a
// second on a loaded 2-core machine (PLUGINS.md §3), so the start limit is
// generous and the call limit short.
const (
	startTimeout = 10 * time.Second
	callTimeout  = 400 * time.Millisecond
)

func newHost(t *testing.T, o host.Options) *host.Host {
	t.Helper()
	if o.StartTimeout == 0 {
		o.StartTimeout = startTimeout
	}
	if o.CallTimeout == 0 {
		o.CallTimeout = callTimeout
	}
	h, err := host.New(o)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { h.Close() })
	return h
}

var section = []byte(`{"format": "foilwright.section/1", "name": "toy", "nodes": [[1, 0], [0, 0.1], [0, -0.1], [1, 0]]}`)

func request(params string) stage.Request {
	return stage.Request{Section: section, Params: []byte(params), SectionName: "toy.json"}
}

func hostError(t *testing.T, err error) *host.Error {
	t.Helper()
	var e *host.Error
	if !errors.As(err, &e) {
		t.Fatalf("error %v (%T) is not a *host.Error", err, err)
	}
	return e
}

func TestRunReusesProcess(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{})
	r := h.Runner(host.Builtin("echo"))
	info, err := r.Describe(t.Context())
	if err != nil {
		t.Fatal(err)
	}
	if info.Name != "echo" || len(info.Params) != 3 || *info.Params[0].Min != 0 {
		t.Errorf("Describe = %+v", info)
	}
	pid := r.Pid()
	for i := range 5 {
		reply, err := r.Run(t.Context(), request(""))
		if err != nil {
			t.Fatalf("call %d: %v", i, err)
		}
		if got := reply.Doc.Cases[0].CL; got != float64(len(section)) {
			t.Errorf("call %d: cl = %g, want %d", i, got, len(section))
		}
		if got := int(reply.Doc.Scalars["pid"]); got != pid {
			t.Errorf("call %d served by pid %d, want %d", i, got, pid)
		}
		if reply.Timings["total"] != time.Millisecond {
			t.Errorf("timings = %v", reply.Timings)
		}
	}
	if n := r.Starts(); n != 1 {
		t.Errorf("%d processes started for 5 calls, want 1", n)
	}
	if fi, err := os.Stat(h.SocketDir()); err != nil || fi.Mode().Perm() != 0o700 {
		t.Errorf("socket folder: %v, %v", fi.Mode(), err)
	}
	if ents, err := os.ReadDir(h.SocketDir()); err != nil || len(ents) == 0 {
		t.Errorf("the stage's socket is not in the host's folder (%v)", err)
	}
	dir := h.SocketDir()
	h.Close()
	if !waitGone(pid, 2*time.Second) {
		t.Errorf("stage pid %d alive after Close", pid)
	}
	if _, err := os.Stat(dir); !os.IsNotExist(err) {
		t.Errorf("socket folder left after Close: %v", err)
	}
	if _, err := r.Run(t.Context(), request("")); !errors.Is(err, host.ErrClosed) {
		t.Errorf("Run after Close: %v, want ErrClosed", err)
	}
}

// TestRunAsFrames: a stage served by plugins/sdk gets its Run calls as
// frames (stage.Frames), calls that run at once find the channel busy and
// go over gRPC, and Options.NoFrames sends every call over gRPC; the
// replies are the same.
func TestRunAsFrames(t *testing.T) {
	t.Parallel()
	for _, noFrames := range []bool{false, true} {
		h := newHost(t, host.Options{NoFrames: noFrames})
		r := h.Runner(host.Builtin("transport"))
		var replies [4]*host.Reply
		var wg sync.WaitGroup
		for i := range replies {
			wg.Go(func() {
				reply, err := r.Run(t.Context(), request(""))
				if err != nil {
					t.Error(err)
				}
				replies[i] = reply
			})
			if i == 0 {
				wg.Wait() // the first call alone: it starts the process
			}
		}
		wg.Wait()
		if t.Failed() {
			return
		}
		ways := map[string]int{}
		for _, reply := range replies {
			ways[reply.Warnings[0]]++
			if reply.Doc.Cases[0].CL != float64(len(section)) {
				t.Errorf("NoFrames %v: reply %+v", noFrames, reply.Doc.Cases[0])
			}
		}
		if want := "frame"; noFrames {
			if ways["gRPC"] != len(replies) {
				t.Errorf("with NoFrames: calls came %v", ways)
			}
			if !h.Options().NoFrames {
				t.Error("Options lost NoFrames")
			}
		} else if replies[0].Warnings[0] != want || ways["frame"] == 0 {
			t.Errorf("calls came %v, the first %s; want the first and some more as frames", ways, replies[0].Warnings[0])
		}
	}
}

// TestNoFramesEnv: the environment variable turns frames off.
func TestNoFramesEnv(t *testing.T) {
	t.Setenv(host.NoFramesEnv, "1")
	h := newHost(t, host.Options{})
	reply, err := h.Runner(host.Builtin("transport")).Run(t.Context(), request(""))
	if err != nil {
		t.Fatal(err)
	}
	if got := reply.Warnings[0]; got != "gRPC" || !h.Options().NoFrames {
		t.Errorf("with %s=1 the call came as %s", host.NoFramesEnv, got)
	}
}

// TestParamsCheckedEveryCall: parameters that passed the check once are
// not checked again, and any others still are, whatever came before.
func TestParamsCheckedEveryCall(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{})
	r := h.Runner(host.Builtin("echo"))
	good, bad := `{"sleep_ms": 1}`, `{"sleep_ms": 9000}`
	params := []byte(good)
	for i, tc := range []struct {
		params string
		ok     bool
	}{{good, true}, {good, true}, {bad, false}, {good, true}, {bad, false}, {bad, false}, {"", true}, {good, true}} {
		req := request(tc.params)
		if tc.params == good {
			req.Params = params // the caller's own bytes
		}
		_, err := r.Run(t.Context(), req)
		if (err == nil) != tc.ok {
			t.Errorf("call %d (%s): error %v", i, tc.params, err)
		}
		if !tc.ok && !errors.Is(err, stage.ErrBadInput) {
			t.Errorf("call %d (%s): error %v, want bad input", i, tc.params, err)
		}
	}
	// The caller may reuse its bytes: the runner kept a copy.
	copy(params, `{"sleep_mz": 1}`)
	if _, err := r.Run(t.Context(), stage.Request{Section: section, Params: params, SectionName: "toy.json"}); !errors.Is(err, stage.ErrBadInput) {
		t.Errorf("changed bytes: error %v, want bad input", err)
	}
}

func TestStageErrorsKeepTheirSentinel(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{})
	r := h.Runner(host.Builtin("echo"))
	for _, tc := range []struct {
		params string
		want   error
		text   string
	}{
		{`{"fail": "bad-input"}`, stage.ErrBadInput, "section toy.json: too few nodes"},
		{`{"fail": "diverged"}`, stage.ErrDiverged, "singular system"},
		// Checked by the host before the call.
		{`{"sleep_ms": 9000}`, stage.ErrBadInput, `parameter "sleep_ms": 9000 is above the maximum 5000`},
		{`{"nope": 1}`, stage.ErrBadInput, `parameter "nope": unknown parameter`},
		{`[1]`, stage.ErrBadInput, "must be a JSON object"},
	} {
		_, err := r.Run(t.Context(), request(tc.params))
		if !errors.Is(err, tc.want) || !strings.Contains(err.Error(), tc.text) {
			t.Errorf("%s: error %v, want %v containing %q", tc.params, err, tc.want, tc.text)
		}
		if e := hostError(t, err); e.Stage != "echo" || e.Section != "toy.json" {
			t.Errorf("%s: error names stage %q section %q", tc.params, e.Stage, e.Section)
		}
	}
	if n := r.Starts(); n != 1 {
		t.Errorf("stage errors restarted the process: %d starts", n)
	}
}

func TestStartFailures(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	script := func(name, body string, mode os.FileMode) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(body), mode); err != nil {
			t.Fatal(err)
		}
		return p
	}
	good := script("echo-stage", fmt.Sprintf("#!/bin/sh\nexec %q __stage echo\n", self), 0o755)
	sum, err := host.FileSHA256(good)
	if err != nil {
		t.Fatal(err)
	}
	zero := hex.EncodeToString(make([]byte, sha256.Size))
	h := newHost(t, host.Options{StartTimeout: 3 * time.Second})
	for _, tc := range []struct {
		name string
		spec host.Spec
		want error
		text string
	}{
		{"missing", host.Spec{Path: filepath.Join(dir, "no-such-stage")}, host.ErrNotFound, "does not exist"},
		{"not in PATH", host.Spec{Path: "no-such-stage-in-path"}, host.ErrNotFound, "not in PATH"},
		{"not executable", host.Spec{Path: script("plain", "#!/bin/sh\n", 0o644)}, host.ErrNotExecutable, "chmod +x"},
		{"folder", host.Spec{Path: dir + "/"}, host.ErrNotExecutable, "is a folder"},
		{"checksum", host.Spec{Path: good, SHA256: zero}, host.ErrChecksum, "sha256 of " + good + " is " + sum},
		{"bad pin", host.Spec{Path: good, SHA256: "abc"}, host.ErrChecksum, "not a hex sha256"},
		{"no handshake", host.Builtin("nohandshake"), host.ErrHandshake, "ended without a handshake"},
		{"stdout before serve", host.Builtin("garbage"), host.ErrHandshake, "hello from init"},
		{"version", host.Builtin("badversion"), host.ErrVersion, "Plugin version: 99"},
		{"wrong name", host.Builtin("wrongname"), host.ErrHandshake, `describes itself as "not-wrongname"`},
		{"bad description", host.Builtin("badinfo"), stage.ErrMalformed, `default: parameter "panels": want an integer, got 2.5`},
		{"unknown builtin", host.Builtin("no-such-toy"), host.ErrHandshake, `unknown toy stage "no-such-toy"`},
	} {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			_, err := h.Runner(tc.spec).Run(t.Context(), request(""))
			if !errors.Is(err, tc.want) || !strings.Contains(err.Error(), tc.text) {
				t.Fatalf("error:\n%v\nwant %v containing %q", err, tc.want, tc.text)
			}
			if e := hostError(t, err); e.Op != "start" && e.Op != "describe" {
				t.Errorf("op %q", e.Op)
			}
		})
	}
	t.Run("slow start", func(t *testing.T) {
		t.Parallel()
		h := newHost(t, host.Options{StartTimeout: time.Second})
		_, err := h.Runner(host.Builtin("slowstart")).Run(t.Context(), request(""))
		if !errors.Is(err, host.ErrHandshake) || !strings.Contains(err.Error(), "no handshake within 1s") {
			t.Fatalf("error %v, want ErrHandshake after 1s", err)
		}
	})
	t.Run("pinned", func(t *testing.T) {
		t.Parallel()
		reply, err := h.Runner(host.Spec{Path: good, SHA256: sum}).Run(t.Context(), request(""))
		if err != nil || reply.Doc.Stage != "echo" {
			t.Fatalf("pinned external stage: %v", err)
		}
	})
}

func TestCrashes(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{})
	t.Run("exit every call", func(t *testing.T) {
		t.Parallel()
		r := h.Runner(host.Builtin("exit"))
		_, err := r.Run(t.Context(), request(""))
		if !errors.Is(err, host.ErrCrashed) {
			t.Fatalf("error %v, want ErrCrashed", err)
		}
		e := hostError(t, err)
		if e.Exit != "exit status 3" || !strings.Contains(e.Stderr, "giving up why=toy exits on every call") {
			t.Errorf("exit %q, stderr %q", e.Exit, e.Stderr)
		}
		if n := r.Starts(); n != 2 {
			t.Errorf("%d starts, want 2 (one retry)", n)
		}
	})
	t.Run("crash once then succeed", func(t *testing.T) {
		t.Parallel()
		r := h.Runner(host.Builtin("flaky"))
		marker := filepath.Join(t.TempDir(), "crashed")
		reply, err := r.Run(t.Context(), request(fmt.Sprintf(`{"marker": %q}`, marker)))
		if err != nil {
			t.Fatalf("retry after a crash failed: %v", err)
		}
		if reply.Doc.Cases[0] == nil || r.Starts() != 2 {
			t.Errorf("starts %d, cases %v", r.Starts(), reply.Doc.Cases)
		}
	})
	t.Run("no retry", func(t *testing.T) {
		t.Parallel()
		h := newHost(t, host.Options{NoRetry: true})
		r := h.Runner(host.Builtin("flaky"))
		marker := filepath.Join(t.TempDir(), "crashed")
		if _, err := r.Run(t.Context(), request(fmt.Sprintf(`{"marker": %q}`, marker))); !errors.Is(err, host.ErrCrashed) {
			t.Fatalf("error %v, want ErrCrashed", err)
		}
		if _, err := r.Run(t.Context(), request(fmt.Sprintf(`{"marker": %q}`, marker))); err != nil {
			t.Fatalf("the next call did not restart the stage: %v", err)
		}
	})
	t.Run("panic in handler", func(t *testing.T) {
		t.Parallel()
		r := h.Runner(host.Builtin("panic"))
		_, err := r.Run(t.Context(), request(""))
		if !errors.Is(err, stage.ErrInternal) || !strings.Contains(err.Error(), "stage panicked: assignment to entry in nil map") {
			t.Fatalf("error %v, want ErrInternal with the panic", err)
		}
		pid := r.Pid()
		if _, err := r.Run(t.Context(), request("")); !errors.Is(err, stage.ErrInternal) {
			t.Fatalf("second call: %v", err)
		}
		if r.Pid() != pid || r.Starts() != 1 {
			t.Errorf("a recovered panic restarted the process")
		}
	})
	t.Run("panic in goroutine", func(t *testing.T) {
		t.Parallel()
		h := newHost(t, host.Options{NoRetry: true})
		_, err := h.Runner(host.Builtin("gopanic")).Run(t.Context(), request(""))
		if !errors.Is(err, host.ErrCrashed) {
			t.Fatalf("error %v, want ErrCrashed", err)
		}
		e := hostError(t, err)
		if e.Exit != "exit status 2" || !strings.HasPrefix(e.Stderr, "panic: toy panics in a goroutine") {
			t.Errorf("exit %q, stderr %q", e.Exit, e.Stderr)
		}
	})
}

func TestHangIsKilled(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{})
	r := h.Runner(host.Builtin("hang"))
	if _, err := r.Describe(t.Context()); err != nil {
		t.Fatal(err)
	}
	pid := r.Pid()
	start := time.Now()
	_, err := r.Run(t.Context(), request(""))
	if !errors.Is(err, host.ErrTimeout) || !strings.Contains(err.Error(), "no reply within 400ms") {
		t.Fatalf("error %v, want ErrTimeout", err)
	}
	if d := time.Since(start); d > callTimeout+3*time.Second {
		t.Errorf("timed-out call took %v", d)
	}
	if !waitGone(pid, 3*time.Second) {
		t.Errorf("hung stage pid %d still alive", pid)
	}
	if r.Pid() != 0 {
		t.Errorf("runner kept the killed process")
	}
}

func TestCancelEndsChild(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{CallTimeout: time.Minute})
	r := h.Runner(host.Builtin("hang"))
	if _, err := r.Describe(t.Context()); err != nil {
		t.Fatal(err)
	}
	pid := r.Pid()
	ctx, cancel := context.WithCancel(t.Context())
	time.AfterFunc(100*time.Millisecond, cancel) // Ctrl-C mid-call
	_, err := r.Run(ctx, request(""))
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("error %v, want context.Canceled", err)
	}
	if !waitGone(pid, 3*time.Second) {
		t.Errorf("stage pid %d survived the cancelled call", pid)
	}
}

func TestMalformedReplies(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{})
	r := h.Runner(host.Builtin("malformed"))
	for kind, text := range map[string]string{
		"truncated": "not valid JSON",
		"empty":     "empty result document",
		"format":    `result format "something/2"`,
		"stage":     `result of stage "other"`,
		"case":      "case 0: alpha_deg is missing",
		"artifact":  `name "../escape.svg" is not a plain file name`,
	} {
		_, err := r.Run(t.Context(), request(fmt.Sprintf(`{"kind": %q}`, kind)))
		if !errors.Is(err, stage.ErrMalformed) || !strings.Contains(err.Error(), text) {
			t.Errorf("%s: error %v, want ErrMalformed containing %q", kind, err, text)
		}
	}
	if _, err := r.Run(t.Context(), request(`{"kind": "fine"}`)); err != nil {
		t.Errorf("good reply: %v", err)
	}
}

// TestLargeMessages sends a request and gets a reply above gRPC's default
// 4 MiB limit.
func TestLargeMessages(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{CallTimeout: 20 * time.Second})
	var b strings.Builder
	b.WriteString(`{"format": "foilwright.section/1", "nodes": [[1, 0]`)
	for b.Len() < 5<<20 {
		b.WriteString(", [0.123456789012, -0.123456789012]")
	}
	b.WriteString("]}")
	req := stage.Request{Section: []byte(b.String()), Params: []byte(`{"reply_bytes": 5242880}`), SectionName: "big.json"}
	reply, err := h.Runner(host.Builtin("echo")).Run(t.Context(), req)
	if err != nil {
		t.Fatal(err)
	}
	if got := int(reply.Doc.Cases[0].CL); got != b.Len() {
		t.Errorf("stage saw %d bytes, sent %d", got, b.Len())
	}
	if len(reply.Artifacts) != 1 || len(reply.Artifacts[0].Data) != 5<<20 {
		t.Errorf("artifact lost")
	}
}

func TestAutoMTLS(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{AutoMTLS: true})
	if _, err := h.Runner(host.Builtin("echo")).Run(t.Context(), request("")); err != nil {
		t.Fatal(err)
	}
}

func TestPoolGivesEachWorkerItsOwnProcess(t *testing.T) {
	t.Parallel()
	h := newHost(t, host.Options{CallTimeout: 10 * time.Second})
	p := h.NewPool(2)
	defer p.Close()
	pids := make(chan int, 8)
	errs := make(chan error, 8)
	for range 8 {
		go func() {
			reply, err := p.Run(t.Context(), host.Builtin("echo"), request(`{"sleep_ms": 100}`))
			if err != nil {
				errs <- err
				pids <- 0
				return
			}
			errs <- nil
			pids <- int(reply.Doc.Scalars["pid"])
		}()
	}
	seen := map[int]bool{}
	for range 8 {
		if err := <-errs; err != nil {
			t.Fatal(err)
		}
		seen[<-pids] = true
	}
	if len(seen) != 2 {
		t.Errorf("8 calls on 2 workers ran in %d processes, want 2", len(seen))
	}
	p.Close()
	for pid := range seen {
		if !waitGone(pid, 3*time.Second) {
			t.Errorf("pid %d alive after Pool.Close", pid)
		}
	}
}

// hostChild is the test binary acting as a host: it starts the echo stage,
// prints the stage's pid and waits to be killed.
func hostChild() {
	h, err := host.New(host.Options{StartTimeout: startTimeout})
	if err != nil {
		fmt.Println("error", err)
		return
	}
	r := h.Runner(host.Builtin("echo"))
	if _, err := r.Run(context.Background(), request("")); err != nil {
		fmt.Println("error", err)
		return
	}
	fmt.Println("pid", r.Pid())
	time.Sleep(time.Minute)
}

// TestNoOrphanWhenHostIsKilled kills a host process with SIGKILL (no
// cleanup runs) and checks that its stage process goes too.
func TestNoOrphanWhenHostIsKilled(t *testing.T) {
	t.Parallel()
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command(self, "__host")
	out, err := cmd.StdoutPipe()
	if err != nil {
		t.Fatal(err)
	}
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	defer cmd.Process.Kill()
	line, err := bufio.NewReader(out).ReadString('\n')
	if err != nil {
		t.Fatalf("host child: %v", err)
	}
	f := strings.Fields(line)
	if len(f) != 2 || f[0] != "pid" {
		t.Fatalf("host child said %q", line)
	}
	pid, err := strconv.Atoi(f[1])
	if err != nil || !pidAlive(pid) {
		t.Fatalf("stage pid %q not alive", f[1])
	}
	if err := cmd.Process.Signal(syscall.SIGKILL); err != nil {
		t.Fatal(err)
	}
	cmd.Wait()
	if !waitGone(pid, 3*time.Second) {
		syscall.Kill(pid, syscall.SIGKILL)
		t.Fatalf("stage pid %d outlived its killed host", pid)
	}
}

// TestStageLogLines: a stage's log lines reach the host's log at their
// levels, whatever the fraction digits of their timestamps (a stage in
// JavaScript writes three); other lines are debug unless prefixed.
func TestStageLogLines(t *testing.T) {
	var buf syncBuffer
	log := hclog.New(&hclog.LoggerOptions{Level: hclog.Info, Output: &buf})
	h := newHost(t, host.Options{Logger: log})
	r := h.Runner(host.Builtin("logs"))
	if _, err := r.Run(t.Context(), request("")); err != nil {
		t.Fatal(err)
	}
	r.Close() // the lines are read by the time the process has ended
	got := buf.String()
	for _, want := range []string{
		`[WARN]  stage.logs: three fraction digits: section=toy.json timestamp=2026-12-03T21:00:00.123Z`,
		`[ERROR] stage.logs: no fraction: timestamp="2026-12-03T21:00:00.000+0100"`,
		`[INFO]  stage.logs: six fraction digits: timestamp=2026-12-03T21:00:00.123Z`,
		`[WARN]  stage.logs: no timestamp` + "\n",
		`[WARN]  stage.logs: a timestamp that is not one` + "\n",
		`[WARN]  stage.logs: [WARN] a prefixed line`,
	} {
		if !strings.Contains(got, want) {
			t.Errorf("log lacks %q:\n%s", want, got)
		}
	}
	if strings.Contains(got, "plain text") {
		t.Errorf("a plain line was logged above debug:\n%s", got)
	}
}

// syncBuffer is a bytes.Buffer safe for concurrent use.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}
