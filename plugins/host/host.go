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
	"strings"
	"sync"
	"time"

	"github.com/hashicorp/go-hclog"
	"github.com/hashicorp/go-plugin"

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
}

// Spec names a stage: a built-in by Name, or an external executable by
// Path, optionally pinned by the hex sha256 of the file.
type Spec struct {
	Name   string // built-in stage name; used when Path is empty
	Path   string // external stage executable
	SHA256 string // hex digest pinning Path; empty means unpinned
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

	mu     sync.Mutex
	procs  map[*process]struct{}
	closed bool
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
	cmd    *exec.Cmd
	tail   *ring
	stage  stage.Stage
	info   stage.Info
	once   sync.Once
}

// kill ends the process (idempotent, blocking) and forgets it.
func (p *process) kill() {
	p.once.Do(func() {
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
		if p.client.Exited() {
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

	var cmd *exec.Cmd
	if spec.Path == "" {
		if spec.Name == "" {
			return nil, fail(errors.New("host: spec names no stage"), nil)
		}
		cmd = exec.Command(h.self, "__stage", spec.Name)
	} else {
		path, err := executable(spec.Path)
		if err != nil {
			return nil, fail(err, nil)
		}
		cmd = exec.Command(path)
	}
	// go-plugin appends its own variables; ours come after the host's
	// environment so that they win.
	cmd.Env = append(os.Environ(),
		"PLUGIN_UNIX_SOCKET_DIR="+h.dir,
		stage.LogLevelEnv+"="+h.opts.StageLogLevel,
	)
	setProcAttr(cmd)

	tail := newRing(StderrTail)
	cfg := &plugin.ClientConfig{
		HandshakeConfig:  stage.Handshake,
		VersionedPlugins: stage.VersionedPlugins(nil),
		Cmd:              cmd,
		AllowedProtocols: []plugin.Protocol{plugin.ProtocolGRPC},
		Logger:           h.log.Named("stage." + filepath.Base(spec.String())),
		Stderr:           tail,
		SyncStderr:       tail,
		SyncStdout:       io.Discard,
		StartTimeout:     h.opts.StartTimeout,
		AutoMTLS:         h.opts.AutoMTLS,
		SkipHostEnv:      true,
	}
	var want []byte
	if spec.SHA256 != "" {
		var err error
		want, err = hex.DecodeString(spec.SHA256)
		if err != nil || len(want) != sha256.Size {
			return nil, fail(fmt.Errorf("%w: pin %q is not a hex sha256 (64 hex digits)", ErrChecksum, spec.SHA256), nil)
		}
		cfg.SecureConfig = &plugin.SecureConfig{Checksum: want, Hash: sha256.New()}
	}
	p := &process{h: h, spec: spec, client: plugin.NewClient(cfg), cmd: cmd, tail: tail}
	h.mu.Lock()
	if h.closed {
		h.mu.Unlock()
		return nil, fail(ErrClosed, nil)
	}
	h.procs[p] = struct{}{}
	h.mu.Unlock()

	rpc, err := p.client.Client()
	if err != nil {
		p.kill()
		return nil, fail(h.startError(spec, cmd.Path, want, err), p)
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
	p.stage = st

	dctx, cancel := context.WithTimeout(ctx, h.opts.StartTimeout)
	defer cancel()
	info, err := st.Describe(dctx)
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
	p.info = info
	h.log.Debug("stage started", "stage", spec.String(), "pid", p.pid(), "version", info.Version)
	return p, nil
}

// startError turns an error of plugin.Client.Client into one of ours, with
// advice.
func (h *Host) startError(spec Spec, path string, want []byte, err error) error {
	msg := err.Error()
	switch {
	case errors.Is(err, plugin.ErrChecksumsDoNotMatch):
		got := "unknown"
		if sum, herr := digest.File(path); herr == nil {
			got = sum
		}
		return fmt.Errorf("%w: sha256 of %s is %s, but %s is pinned; the executable changed since it was pinned: check it, then update the pin",
			ErrChecksum, path, got, hex.EncodeToString(want))
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
