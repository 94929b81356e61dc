package host

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/hashicorp/go-hclog"
	"github.com/hashicorp/go-plugin"
	"google.golang.org/grpc"
	"google.golang.org/grpc/codes"
	"google.golang.org/grpc/status"

	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/plugins/stage"
)

// Default limits, used when the Options field is zero.
const (
	DefaultStartTimeout = 10 * time.Second
	DefaultCallTimeout  = 2 * time.Minute
)

// exitWait is how long the host waits for a process that broke a call to
// be seen as exited, before it classifies the failure.
const exitWait = 500 * time.Millisecond

// Options configure a Host. The zero value is ready to use.
type Options struct {
	// StartTimeout limits starting a stage: exec, handshake and Describe.
	// Zero means DefaultStartTimeout.
	StartTimeout time.Duration
	// CallTimeout limits each Run call. Zero means DefaultCallTimeout.
	CallTimeout time.Duration
	// AutoMTLS secures the connection to each stage with a fresh mutual TLS
	// certificate pair (about 35 ms per start). Off by default: on Unix the
	// socket lives in a folder only the user can enter.
	AutoMTLS bool
	// Logger receives the host's log and every log line of the stages,
	// named "stage.<name>". Nil means no logging.
	Logger hclog.Logger
	// StageLogLevel is the level passed to stages (trace, debug, info,
	// warn, error). Empty means warn.
	StageLogLevel string
	// NoRetry turns off the one retry of a call whose process crashed.
	NoRetry bool
	// Self is the executable that serves built-in stages with
	// "Self __stage NAME". Empty means the running binary.
	Self string
	// MaxNodes, when positive, is the most section nodes any stage is
	// sent, whatever it describes; stages that honour stage.MaxNodesEnv
	// describe and apply it. Zero leaves each stage its own maximum.
	MaxNodes int
	// MaxReply is the most bytes of one Run reply (result document and
	// artifacts). Zero means DefaultMaxReply.
	MaxReply int
	// Memory limits each stage process's data memory, in bytes, where the
	// system allows (Linux; not in a binary built with the race detector).
	// Zero means no limit.
	Memory int64
	// JSONDepth is the deepest nesting a result document may have. Zero
	// means DefaultJSONDepth.
	JSONDepth int
	// NoFrames sends every Run call over gRPC. By default a stage that
	// speaks frames (stage.Frames; every stage served by plugins/sdk does)
	// gets its Run calls on a socket of their own, read and answered by
	// one goroutine on each side (Unix only). NoFramesEnv set to anything
	// but "" or "0" in the host's environment sets it too.
	NoFrames bool
}

// NoFramesEnv is the environment variable that turns frames off for every
// host of the process (Options.NoFrames), to tell a problem of frames from
// one of the stage when debugging.
const NoFramesEnv = "FOILWRIGHT_NO_FRAMES"

// DefaultJSONDepth is the nesting limit of result documents when
// Options.JSONDepth is zero.
const DefaultJSONDepth = 64

// DefaultMaxReply is the reply limit when Options.MaxReply is zero.
const DefaultMaxReply = 32 << 20

// Spec names a stage: a built-in by Name, or an external executable by
// Path, optionally pinned by the hex sha256 of the file.
type Spec struct {
	Name   string // built-in stage name; used when Path is empty
	Path   string // external stage executable
	SHA256 string // hex digest pinning Path; empty means unpinned
	// Env names variables of the host's environment the stage may see
	// besides the minimal ones (MinimalEnv), separated by commas.
	Env string
}

// Builtin returns the Spec of the built-in stage name.
func Builtin(name string) Spec { return Spec{Name: name} }

// String returns the stage name or path.
func (s Spec) String() string {
	if s.Path != "" {
		return s.Path
	}
	return s.Name
}

// Host starts stage processes and ends them all on Close.
type Host struct {
	opts Options
	log  hclog.Logger
	self string
	dir  string // private folder for the stages' sockets

	mu      sync.Mutex
	procs   map[*process]struct{}
	closed  bool
	digests map[string]string // file digests by path, size and time (files.go)
}

// New returns a Host with a private socket folder (mode 0700) that Close
// removes.
func New(opts Options) (*Host, error) {
	if opts.StartTimeout <= 0 {
		opts.StartTimeout = DefaultStartTimeout
	}
	if opts.CallTimeout <= 0 {
		opts.CallTimeout = DefaultCallTimeout
	}
	if opts.StageLogLevel == "" {
		opts.StageLogLevel = "warn"
	}
	if opts.MaxReply <= 0 {
		opts.MaxReply = DefaultMaxReply
	}
	if opts.JSONDepth <= 0 {
		opts.JSONDepth = DefaultJSONDepth
	}
	if v := os.Getenv(NoFramesEnv); v != "" && v != "0" {
		opts.NoFrames = true
	}
	log := opts.Logger
	if log == nil {
		log = hclog.NewNullLogger()
	}
	self := opts.Self
	if self == "" {
		var err error
		if self, err = selfExe(); err != nil {
			return nil, fmt.Errorf("host: locate own executable: %w", err)
		}
	}
	dir, err := os.MkdirTemp("", "foilwright-stages-")
	if err != nil {
		return nil, fmt.Errorf("host: socket folder: %w", err)
	}
	if err := os.Chmod(dir, 0o700); err != nil {
		os.RemoveAll(dir)
		return nil, fmt.Errorf("host: socket folder: %w", err)
	}
	return &Host{opts: opts, log: log, self: self, dir: dir, procs: map[*process]struct{}{}}, nil
}

// Options returns the host's options, defaults filled in.
func (h *Host) Options() Options { return h.opts }

// SocketDir returns the private folder in which stages create their
// sockets.
func (h *Host) SocketDir() string { return h.dir }

// Close kills every stage process the host started and removes its socket
// folder. It is safe to call more than once.
func (h *Host) Close() error {
	h.mu.Lock()
	h.closed = true
	procs := make([]*process, 0, len(h.procs))
	for p := range h.procs {
		procs = append(procs, p)
	}
	h.mu.Unlock()
	var wg sync.WaitGroup
	for _, p := range procs {
		wg.Go(p.kill)
	}
	wg.Wait()
	return os.RemoveAll(h.dir)
}

// process is one running stage process.
type process struct {
	h      *Host
	spec   Spec
	client *plugin.Client
	cmd    *exec.Cmd                   // set when go-plugin starts the process (no process groups)
	group  atomic.Pointer[groupRunner] // set when the host starts it in a group of its own
	tail   *ring
	rpc    plugin.ClientProtocol
	stage  stage.Stage
	info   stage.Info
	frames *os.File // the host's end of the frames channel, or nil
	once   sync.Once
}

// kill ends the process (idempotent, blocking) and forgets it.
func (p *process) kill() {
	p.once.Do(func() {
		if p.frames != nil {
			shutdownFrames(p.frames) // ends a call under way
			p.frames.Close()
		}
		p.client.Kill()
		p.h.mu.Lock()
		delete(p.h.procs, p)
		p.h.mu.Unlock()
	})
}

// exited waits up to d for the process to be seen as exited and reports
// whether it has, with how it ended.
func (p *process) exited(d time.Duration) (bool, string) {
	deadline := time.Now().Add(d)
	for {
		if g := p.group.Load(); g != nil {
			if ok, how := g.exitedState(); ok {
				return true, how
			}
		} else if p.cmd != nil && p.client.Exited() {
			// Exited is set after Wait returned, under the client's lock,
			// so ProcessState is safe to read now.
			if ps := p.cmd.ProcessState; ps != nil {
				return true, ps.String()
			}
			return true, "exited"
		}
		if time.Now().After(deadline) {
			return false, ""
		}
		time.Sleep(5 * time.Millisecond)
	}
}

// pid returns the process id, or 0.
func (p *process) pid() int {
	if g := p.group.Load(); g != nil {
		return groupPid(g)
	}
	if rc := p.client.ReattachConfig(); rc != nil {
		return rc.Pid
	}
	return 0
}

// start starts a process for spec, completes the handshake and calls
// Describe.
func (h *Host) start(ctx context.Context, spec Spec) (*process, error) {
	fail := func(err error, p *process) error {
		e := &Error{Stage: spec.String(), Op: "start", Err: err}
		if p != nil {
			if ok, how := p.exited(50 * time.Millisecond); ok {
				e.Exit = how
			}
			e.Stderr = p.tail.lines()
		}
		return e
	}
	h.mu.Lock()
	closed := h.closed
	h.mu.Unlock()
	if closed {
		return nil, fail(ErrClosed, nil)
	}
	if err := ctx.Err(); err != nil {
		return nil, fail(err, nil)
	}

	path, args := h.self, []string{"__stage", spec.Name}
	if spec.Path == "" {
		if spec.Name == "" {
			return nil, fail(errors.New("host: spec names no stage"), nil)
		}
	} else {
		var err error
		if path, err = executable(spec.Path); err != nil {
			return nil, fail(err, nil)
		}
		args = nil
	}
	if spec.SHA256 != "" {
		want, err := hex.DecodeString(spec.SHA256)
		if err != nil || len(want) != sha256.Size {
			return nil, fail(fmt.Errorf("%w: pin %q is not a hex sha256 (64 hex digits)", ErrChecksum, spec.SHA256), nil)
		}
		// Checked here, not by go-plugin's SecureConfig, which needs the
		// Cmd that a process group of our own replaces.
		got, err := digest.File(path)
		if err != nil {
			return nil, fail(fmt.Errorf("%w: %v", ErrNotFound, err), nil)
		}
		if got != spec.SHA256 {
			return nil, fail(fmt.Errorf("%w: sha256 of %s is %s, but %s is pinned; the executable changed since it was pinned: check it, then update the pin",
				ErrChecksum, path, got, spec.SHA256), nil)
		}
	}
	env := h.StageEnv(spec)

	log := h.log.Named("stage." + filepath.Base(spec.String()))
	tail := newRing(StderrTail)
	// The stage's log lines: parsed here, leniently (logline.go), not by
	// go-plugin.
	tail.onLine = (&lineLogger{log: log}).logLine
	cfg := &plugin.ClientConfig{
		HandshakeConfig:  stage.Handshake,
		VersionedPlugins: stage.VersionedPlugins(nil),
		AllowedProtocols: []plugin.Protocol{plugin.ProtocolGRPC},
		Logger:           pluginLogger{log, filepath.Base(path)},
		Stderr:           tail,
		SyncStderr:       tail.quiet(),
		SyncStdout:       io.Discard,
		StartTimeout:     h.opts.StartTimeout,
		AutoMTLS:         h.opts.AutoMTLS,
		SkipHostEnv:      true,
		UnixSocketConfig: &plugin.UnixSocketConfig{TempDir: h.dir},
		// Fixed windows: no bandwidth-probing ping with every reply.
		GRPCDialOptions: []grpc.DialOption{grpc.WithStaticStreamWindowSize(stage.WindowSize), grpc.WithStaticConnWindowSize(stage.WindowSize)},
	}
	p := &process{h: h, spec: spec, tail: tail}
	memory := h.opts.Memory
	if raceBuild {
		memory = 0
	}
	// The frames channel (stage.Frames) is offered to every stage started
	// in a group of our own; the stage's end is closed here once the
	// process has started.
	var framesChild *os.File
	if !h.opts.NoFrames && groupRunnerFunc(path, args, env, memory, nil) != nil {
		if conn, child, err := framesPair(); err == nil {
			p.frames, framesChild = conn, child
			env = append(env, fmt.Sprintf("%s=%d", stage.FramesEnv, framesFD))
		} else {
			h.log.Debug("no frames channel; Run calls go over gRPC", "error", err)
		}
	}
	if run := groupRunnerFunc(path, args, env, memory, func(g *groupRunner) {
		p.group.Store(g)
		if framesChild != nil {
			offerFrames(g, framesChild)
		}
	}); run != nil {
		cfg.RunnerFunc = run
	} else {
		cmd := exec.Command(path, args...)
		cmd.Env = append(env, "PLUGIN_UNIX_SOCKET_DIR="+h.dir)
		cfg.Cmd = cmd
		p.cmd = cmd
	}
	p.client = plugin.NewClient(cfg)
	h.mu.Lock()
	if h.closed {
		h.mu.Unlock()
		if p.frames != nil {
			p.frames.Close()
			framesChild.Close()
		}
		return nil, fail(ErrClosed, nil)
	}
	h.procs[p] = struct{}{}
	h.mu.Unlock()

	rpc, err := p.connect(ctx)
	if framesChild != nil {
		framesChild.Close() // the stage has its own copy, or never started
	}
	if err != nil {
		p.kill()
		if ctx.Err() != nil {
			return nil, fail(ctx.Err(), p)
		}
		return nil, fail(h.startError(err), p)
	}
	raw, err := rpc.Dispense(stage.PluginName)
	if err != nil {
		p.kill()
		return nil, fail(fmt.Errorf("%w: %v", ErrHandshake, err), p)
	}
	st, ok := raw.(stage.Stage)
	if !ok {
		p.kill()
		return nil, fail(fmt.Errorf("%w: dispensed %T, not a stage", ErrHandshake, raw), p)
	}
	p.stage, p.rpc = st, rpc
	if c, ok := raw.(*stage.Client); ok {
		c.SetMaxReply(h.opts.MaxReply)
	}

	dctx, cancel := context.WithTimeout(ctx, h.opts.StartTimeout)
	defer cancel()
	info, err := st.Describe(dctx)
	if err != nil {
		err = describeError(ctx, dctx, h.opts.StartTimeout, err)
	}
	if err == nil {
		err = stage.CheckInfo(info)
		if err != nil {
			err = fmt.Errorf("%w: %w", stage.ErrMalformed, err)
		}
	}
	if err == nil && spec.Path == "" && info.Name != spec.Name {
		err = fmt.Errorf("%w: started as %q, describes itself as %q", ErrHandshake, spec.Name, info.Name)
	}
	if err != nil {
		p.kill()
		e := fail(err, p).(*Error)
		e.Op = "describe"
		return nil, e
	}
	if h.opts.MaxNodes > 0 && (info.MaxNodes == 0 || info.MaxNodes > h.opts.MaxNodes) {
		info.MaxNodes = h.opts.MaxNodes
	}
	p.info = info
	if p.frames != nil {
		c, ok := raw.(*stage.Client)
		if ok && framesHello(p.frames) {
			f := p.frames
			c.SetFrames(stage.NewFrames(f, func() { shutdownFrames(f) }))
		} else {
			p.frames.Close() // a stage that does not speak frames
		}
	}
	h.log.Debug("stage started", "stage", spec.String(), "pid", p.pid(), "version", info.Version)
	return p, nil
}

// startError turns an error of plugin.Client.Client into one of ours, with
// advice.
func (h *Host) startError(err error) error {
	msg := err.Error()
	switch {
	case strings.Contains(msg, "incompatible API version"):
		return fmt.Errorf("%w: this foilwright speaks stage protocol version %d (%s); rebuild the stage against a matching foilwright SDK, or use a foilwright release that speaks its version",
			ErrVersion, stage.ProtocolVersion, firstLine(msg))
	case strings.Contains(msg, "timeout while waiting for plugin to start"):
		return fmt.Errorf("%w: no handshake within %v (raise the start timeout if the stage is slow to start)", ErrHandshake, h.opts.StartTimeout)
	case strings.Contains(msg, "Unrecognized remote plugin message") && !strings.Contains(msg, "Failed to read any lines"):
		return fmt.Errorf("%w: the stage wrote to stdout before serving, which breaks the handshake: %s", ErrHandshake, firstLine(msg))
	case strings.Contains(msg, "Failed to read any lines"), strings.Contains(msg, "plugin exited before we could connect"):
		return fmt.Errorf("%w: the process ended without a handshake (is it a foilwright stage built with the SDK?)", ErrHandshake)
	}
	return fmt.Errorf("%w: %v", ErrHandshake, err)
}

func firstLine(s string) string {
	if i := strings.IndexByte(s, '\n'); i >= 0 {
		return s[:i]
	}
	return s
}

// executable resolves the path of an external stage and checks that it is
// an executable regular file.
func executable(path string) (string, error) {
	if !strings.ContainsRune(path, filepath.Separator) {
		p, err := exec.LookPath(path)
		if err != nil {
			return "", fmt.Errorf("%w: %q is not in PATH", ErrNotFound, path)
		}
		path = p
	}
	abs, err := filepath.Abs(path)
	if err != nil {
		return "", fmt.Errorf("%w: %v", ErrNotFound, err)
	}
	fi, err := os.Stat(abs)
	switch {
	case errors.Is(err, os.ErrNotExist):
		return "", fmt.Errorf("%w: %s does not exist", ErrNotFound, abs)
	case err != nil:
		return "", fmt.Errorf("%w: %v", ErrNotExecutable, err)
	case fi.IsDir():
		return "", fmt.Errorf("%w: %s is a folder", ErrNotExecutable, abs)
	case fi.Mode().Perm()&0o111 == 0:
		return "", fmt.Errorf("%w: %s has mode %v (chmod +x it)", ErrNotExecutable, abs, fi.Mode().Perm())
	}
	return abs, nil
}

// FileSHA256 returns the hex sha256 of the file at path, as a pin for
// Spec.SHA256 and for manifests.
func FileSHA256(path string) (string, error) { return digest.File(path) }

// connect starts the process and completes the handshake, giving up when
// ctx ends (Ctrl-C during a start).
func (p *process) connect(ctx context.Context) (plugin.ClientProtocol, error) {
	type result struct {
		rpc plugin.ClientProtocol
		err error
	}
	ch := make(chan result, 1)
	go func() {
		rpc, err := p.client.Client()
		ch <- result{rpc, err}
	}()
	select {
	case r := <-ch:
		return r.rpc, r.err
	case <-ctx.Done():
		// Killing the process group ends the handshake wait at once; the
		// process may not have started yet, so keep at it until it ends.
		tick := time.NewTicker(20 * time.Millisecond)
		defer tick.Stop()
		for {
			if g := p.group.Load(); g != nil {
				g.Kill(context.Background())
			}
			select {
			case r := <-ch:
				if r.err == nil {
					r.err = ctx.Err()
				}
				return nil, r.err
			case <-tick.C:
			}
		}
	}
}

// describeError turns a failed Describe call into an error of ours: a
// timeout, a process that died, or a broken reply; never a raw gRPC
// status.
func describeError(ctx, dctx context.Context, limit time.Duration, err error) error {
	switch {
	case ctx.Err() != nil:
		return ctx.Err()
	case dctx.Err() != nil:
		return fmt.Errorf("%w: no description within %v (raise the start timeout if the stage is slow to start)", ErrTimeout, limit)
	}
	return transportError(err)
}

// transportError words a gRPC failure of a call: the process went away
// (ErrCrashed), a message was too large (ErrTooLarge), or the protocol
// broke (ErrHandshake); the gRPC code is not shown.
func transportError(err error) error {
	st := status.Convert(err)
	switch st.Code() {
	case codes.Unavailable, codes.Canceled:
		return fmt.Errorf("%w: the connection broke (%s)", ErrCrashed, st.Message())
	case codes.ResourceExhausted:
		return fmt.Errorf("%w: %s", ErrTooLarge, st.Message())
	case codes.DeadlineExceeded:
		return fmt.Errorf("%w: %s", ErrTimeout, st.Message())
	}
	return fmt.Errorf("%w: %s", ErrHandshake, st.Message())
}

// MinimalEnv lists the variables of the host's environment every stage
// gets (those set): the search path, home, temporary folder, locale and
// time zone, and the Go race detector's settings (for tests). A pipeline
// allows more by name (a stage's "env"); nothing else passes, so a secret
// in an unrelated variable stays with the host.
var MinimalEnv = []string{"PATH", "HOME", "TMPDIR", "LANG", "LC_ALL", "TZ", "GORACE"}

// StageEnv returns the environment a stage of spec gets, as NAME=VALUE,
// sorted: the minimal variables and those spec allows, as the host's
// environment has them, and the host's own settings (log level, node
// limit). go-plugin adds its handshake variables at start.
func (h *Host) StageEnv(spec Spec) []string {
	names := append([]string{}, MinimalEnv...)
	for _, n := range strings.Split(spec.Env, ",") {
		if n = strings.TrimSpace(n); n != "" {
			names = append(names, n)
		}
	}
	seen := map[string]bool{}
	var env []string
	for _, n := range names {
		if seen[n] {
			continue
		}
		seen[n] = true
		if v, ok := os.LookupEnv(n); ok {
			env = append(env, n+"="+v)
		}
	}
	env = append(env, stage.LogLevelEnv+"="+h.opts.StageLogLevel)
	if h.opts.MaxNodes > 0 {
		env = append(env, stage.MaxNodesEnv+"="+strconv.Itoa(h.opts.MaxNodes))
	}
	sort.Strings(env)
	return env
}
