package host

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"path/filepath"
	"strings"
	"sync"
	"time"

	"google.golang.org/grpc/codes"
	"google.golang.org/grpc/status"

	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/plugins/stage"
)

// Reply is a checked reply of a stage: the result as received plus the
// decoded result document (also in Result.Doc).
type Reply struct {
	stage.Result
	Doc *stage.ResultDoc
}

// Runner is one stage, backed by at most one process at a time. The
// process starts on first use and serves every later call; after a crash,
// a timeout or a cancelled call it is killed, and the next call starts a
// new one. A Runner is safe for concurrent use; it runs at most
// Info.MaxConcurrency calls at once.
type Runner struct {
	h    *Host
	spec Spec

	mu     sync.Mutex // held while starting
	proc   *process
	info   *stage.Info
	sem    chan struct{} // nil: no limit
	starts int
	closed bool

	// valid holds the last parameters that passed stage.Validate against
	// info's: a batch sends the same parameters call after call, and
	// their check was a few per cent of the host's processor time a call.
	validMu sync.Mutex
	valid   []byte
}

// Runner returns a Runner for spec. It starts nothing yet.
func (h *Host) Runner(spec Spec) *Runner { return &Runner{h: h, spec: spec} }

// Spec returns the stage the runner runs.
func (r *Runner) Spec() Spec { return r.spec }

// Starts returns how many processes the runner has started.
func (r *Runner) Starts() int {
	r.mu.Lock()
	defer r.mu.Unlock()
	return r.starts
}

// Pid returns the process id of the current stage process, or 0 if none is
// running.
func (r *Runner) Pid() int {
	r.mu.Lock()
	defer r.mu.Unlock()
	if r.proc == nil {
		return 0
	}
	return r.proc.pid()
}

// ensure returns the running process, starting one if there is none.
func (r *Runner) ensure(ctx context.Context) (*process, error) {
	r.mu.Lock()
	defer r.mu.Unlock()
	if r.closed {
		return nil, &Error{Stage: r.spec.String(), Op: "start", Err: ErrClosed}
	}
	if r.proc != nil {
		return r.proc, nil
	}
	p, err := r.h.start(ctx, r.spec)
	if err != nil {
		return nil, err
	}
	r.starts++
	if r.info == nil {
		info := p.info
		r.info = &info
		if n := info.MaxConcurrency; n > 0 {
			r.sem = make(chan struct{}, n)
		}
	}
	r.proc = p
	return p, nil
}

// drop kills p and, if it is still the current process, forgets it.
func (r *Runner) drop(p *process) {
	r.mu.Lock()
	if r.proc == p {
		r.proc = nil
	}
	r.mu.Unlock()
	p.kill()
}

// Describe returns the stage's description, starting the stage if needed.
func (r *Runner) Describe(ctx context.Context) (stage.Info, error) {
	if _, err := r.ensure(ctx); err != nil {
		return stage.Info{}, err
	}
	r.mu.Lock()
	defer r.mu.Unlock()
	return *r.info, nil
}

// Run runs req through the stage. The parameters are checked against the
// stage's description first; the call is limited by the host's
// CallTimeout and by ctx. A call whose process crashed is retried once in a
// new process unless Options.NoRetry is set. The reply's result document
// is checked and decoded.
func (r *Runner) Run(ctx context.Context, req stage.Request) (*Reply, error) {
	info, err := r.Describe(ctx)
	if err != nil {
		return nil, err
	}
	if err := r.validate(info, req.Params); err != nil {
		return nil, r.errorf(req, err)
	}
	if max := info.MaxNodes; max > 0 {
		if n := req.NodeCount(); n > max {
			return nil, r.errorf(req, fmt.Errorf("%w: the section has %d nodes; the stage takes at most %d (its description; raise the stage-nodes limit for stages that allow it)", ErrTooManyNodes, n, max))
		}
	}
	if r.sem != nil {
		select {
		case r.sem <- struct{}{}:
			defer func() { <-r.sem }()
		case <-ctx.Done():
			return nil, r.errorf(req, ctx.Err())
		}
	}
	for attempt := 0; ; attempt++ {
		p, err := r.ensure(ctx)
		if err != nil {
			if e, ok := err.(*Error); ok {
				e.Section = req.SectionName
			}
			return nil, err
		}
		reply, err, crashed := r.call(ctx, p, info, req)
		if crashed && attempt == 0 && !r.h.opts.NoRetry && ctx.Err() == nil {
			r.h.log.Warn("stage crashed; retrying in a new process", "stage", r.spec.String(), "section", req.SectionName, "error", err)
			continue
		}
		return reply, err
	}
}

// validate checks params against info's parameters (stage.Validate),
// unless they are those of the last call that passed.
func (r *Runner) validate(info stage.Info, params []byte) error {
	r.validMu.Lock()
	same := r.valid != nil && bytes.Equal(r.valid, params)
	r.validMu.Unlock()
	if same {
		return nil
	}
	if _, err := stage.Validate(info.Params, params); err != nil {
		return err
	}
	r.validMu.Lock()
	r.valid = append(r.valid[:0:0], params...)
	r.validMu.Unlock()
	return nil
}

// call makes one Run call on p and classifies its failure. crashed reports
// that the process died.
func (r *Runner) call(ctx context.Context, p *process, info stage.Info, req stage.Request) (_ *Reply, _ error, crashed bool) {
	cctx, cancel := context.WithTimeout(ctx, r.h.opts.CallTimeout)
	defer cancel()
	res, err := p.stage.Run(cctx, req)
	if err == nil {
		reply, err := check(info, res, r.h.opts.JSONDepth)
		if err != nil {
			return nil, r.errorf(req, err), false
		}
		return reply, nil, false
	}
	fail := func(err error) *Error {
		e := r.errorf(req, err)
		if ok, how := p.exited(0); ok {
			e.Exit = how
		}
		e.Stderr = p.tail.lines()
		if r.h.opts.Memory > 0 && !raceBuild && strings.Contains(e.Stderr, "out of memory") {
			e.Err = fmt.Errorf("%w; it ran out of memory: each stage may use %d MiB of data memory (the stage-memory limit)", e.Err, r.h.opts.Memory>>20)
		}
		return e
	}
	var remote *stage.RemoteError
	isRemote := errors.As(err, &remote)
	code := status.Code(err)
	if code == codes.DeadlineExceeded || isRemote && remote.Code == stage.CodeCancelled {
		// The stage gets the deadline as a timeout header and may give up
		// a moment before this side's context ends: wait for it (it is due
		// now), so that the failure is told by the context that ended.
		select {
		case <-cctx.Done():
		case <-time.After(exitWait):
		}
	}
	switch {
	case ctx.Err() != nil:
		// Cancelled or timed out by the caller (Ctrl-C, a pipeline's
		// timeout_s): end the process, which may be busy with a call
		// nobody waits for.
		r.drop(p)
		return nil, r.errorf(req, ctx.Err()), false
	case cctx.Err() != nil:
		// Whatever the stage answered, it did not answer in time; a stage
		// that gave up may still be computing: end it, the next call
		// starts a new one.
		r.drop(p)
		return nil, fail(fmt.Errorf("%w: no reply within %v; the process was ended", ErrTimeout, r.h.opts.CallTimeout)), false
	case isRemote, errors.Is(err, stage.ErrMalformed), errors.Is(err, stage.ErrBadInput):
		// The stage's own error, a packed reply that is not well formed,
		// or a request that could not be sent (checked before the call).
		return nil, r.errorf(req, err), false
	case code == codes.ResourceExhausted:
		return nil, r.errorf(req, fmt.Errorf("%w: the reply is larger than %d MiB (the result-bytes limit): %s", ErrTooLarge, r.h.opts.MaxReply>>20, status.Convert(err).Message())), false
	default:
		exited, _ := p.exited(exitWait)
		if exited || code == codes.Unavailable || code == codes.Canceled {
			e := fail(fmt.Errorf("%w: %s", ErrCrashed, status.Convert(err).Message()))
			r.drop(p)
			return nil, e, true
		}
		r.drop(p)
		return nil, fail(transportError(err)), false
	}
}

func (r *Runner) errorf(req stage.Request, err error) *Error {
	return &Error{Stage: r.spec.String(), Section: req.SectionName, Op: "run", Err: err}
}

// Close kills the runner's process. Later calls fail with ErrClosed.
func (r *Runner) Close() {
	r.mu.Lock()
	p := r.proc
	r.proc = nil
	r.closed = true
	r.mu.Unlock()
	if p != nil {
		p.kill()
	}
}

// check checks a stage's result and decodes it when it came as JSON
// text (a packed one was decoded and checked as it came).
func check(info stage.Info, res stage.Result, depth int) (*Reply, error) {
	doc := res.Doc
	if doc == nil {
		if len(res.JSON) == 0 {
			return nil, fmt.Errorf("%w: empty result document", stage.ErrMalformed)
		}
		if err := limits.CheckDepth(res.JSON, depth); err != nil {
			return nil, fmt.Errorf("%w: result document: %v", stage.ErrMalformed, err)
		}
		var err error
		if doc, err = stage.DecodeResult(res.JSON); err != nil {
			return nil, err
		}
		res.Doc = doc
	}
	if doc.Stage != info.Name {
		return nil, fmt.Errorf("%w: result of stage %q, want %q", stage.ErrMalformed, doc.Stage, info.Name)
	}
	seen := map[string]bool{}
	for i, a := range res.Artifacts {
		switch {
		case a.Name == "" || a.Name == "." || a.Name == ".." || filepath.Base(a.Name) != a.Name || strings.ContainsAny(a.Name, `/\`):
			return nil, fmt.Errorf("%w: artifact %d: name %q is not a plain file name", stage.ErrMalformed, i, a.Name)
		case seen[a.Name]:
			return nil, fmt.Errorf("%w: artifact %q returned twice", stage.ErrMalformed, a.Name)
		case a.MediaType == "":
			return nil, fmt.Errorf("%w: artifact %q has no media type", stage.ErrMalformed, a.Name)
		}
		seen[a.Name] = true
	}
	return &Reply{Result: res, Doc: doc}, nil
}

// Stage returns the stage of the runner's process (started if need be) as
// it answers, with none of the host's checks in between: for conformance
// checks of a stage executable.
func (r *Runner) Stage(ctx context.Context) (stage.Stage, error) {
	p, err := r.ensure(ctx)
	if err != nil {
		return nil, err
	}
	return p.stage, nil
}

// Ping asks the health service of the runner's process (started if need
// be) whether it serves, as go-plugin's Client.Ping does. The host does
// not need it otherwise.
func (r *Runner) Ping(ctx context.Context) error {
	p, err := r.ensure(ctx)
	if err != nil {
		return err
	}
	return p.rpc.Ping()
}
