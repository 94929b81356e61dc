package stagetest

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"testing"
	"time"

	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

// StopLimit is how long a stage may take to end when the host asks it to
// (go-plugin's Shutdown). A stage that does not end by itself is killed
// after two seconds, on every stop.
const StopLimit = time.Second

// A Report is what CheckExecutable found.
type Report struct {
	// Info is the stage's description.
	Info stage.Info
	// RunsFrom is what it runs from besides its executable: the
	// interpreter its "#!" line names and the files it declares, hashed.
	RunsFrom []host.FileDigest
	// Failures are the checks it failed; none means it conforms.
	Failures []error
	// Notes are findings that are not failures.
	Notes []string
	// Stop is how long it took to end when asked.
	Stop time.Duration
}

// Err returns the failures joined, or nil.
func (r *Report) Err() error { return errors.Join(r.Failures...) }

// CheckExecutable starts the stage executable at path as foilwright
// starts an external stage (its own process group, go-plugin's handshake,
// the minimal environment, the host's start timeout) and checks it:
//
//   - everything Check checks, on the stage as it answers over gRPC with
//     none of the host's checks in between (so that the stage itself is
//     seen to fill in defaults and refuse bad parameters and sections),
//     packed or not as it describes itself;
//   - that the files it declares it runs from exist inside its folder,
//     and hash (Report.RunsFrom, with its interpreter);
//   - that a call through the host, as a pipeline makes it, succeeds and
//     gives the same result document as the direct call;
//   - that it ends within StopLimit when the host asks it to.
//
// Whether it serves the health service is a note: foilwright does not
// call it. It returns an error, and no report, when the stage cannot be
// started or does not describe itself well (the host's own errors, as a
// pipeline would report them).
func CheckExecutable(ctx context.Context, path string, opts Options) (*Report, error) {
	return CheckSpec(ctx, host.Spec{Path: path}, opts)
}

// CheckSpec is CheckExecutable for a stage named by a host.Spec: an
// executable with its sha256 pin and the variables it may see.
func CheckSpec(ctx context.Context, spec host.Spec, opts Options) (*Report, error) {
	ho := opts.Host
	ho.NoRetry = true
	h, err := host.New(ho)
	if err != nil {
		return nil, err
	}
	defer h.Close()
	r := h.Runner(spec)
	defer r.Close()
	info, err := r.Describe(ctx)
	if err != nil {
		return nil, err
	}
	rep := &Report{Info: info}
	fail := func(format string, args ...any) {
		rep.Failures = append(rep.Failures, fmt.Errorf("stagetest: "+format, args...))
	}
	if rep.RunsFrom, err = h.RunsFrom(spec, info); err != nil {
		fail("the files it runs from: %v", err)
	}
	raw, err := r.Stage(ctx)
	if err != nil {
		return nil, err
	}
	if opts.Section == nil {
		opts.Section = Section(80)
	}
	if opts.Params == nil {
		opts.Params = []byte("{}")
	}
	if err := Check(ctx, raw, opts); err != nil {
		if j, ok := err.(interface{ Unwrap() []error }); ok {
			rep.Failures = append(rep.Failures, j.Unwrap()...)
		} else {
			rep.Failures = append(rep.Failures, err)
		}
	}

	req := stage.Request{Section: opts.Section, Params: opts.Params, SectionName: "stagetest.json"}
	direct, derr := raw.Run(ctx, req)
	reply, err := r.Run(ctx, req)
	switch {
	case err != nil:
		fail("a call through the host, as a pipeline makes it: %v", err)
	case derr == nil && !bytes.Equal(text(reply.Result), text(direct)):
		fail("a call through the host gave another result document than the direct call")
	}

	if err := r.Ping(ctx); err != nil {
		rep.Notes = append(rep.Notes, fmt.Sprintf("no health service (grpc.health.v1.Health answering \"plugin\" as SERVING): %v; foilwright does not call it, go-plugin's Client.Ping does", err))
	}
	t := time.Now()
	r.Close()
	rep.Stop = time.Since(t)
	if rep.Stop > StopLimit {
		fail("it took %v to end when asked: serve plugin.GRPCController/Shutdown and exit on it, or every stop waits 2 s for the host to kill it", rep.Stop.Round(time.Millisecond))
	}
	return rep, nil
}

// RunExecutable checks the stage executable at path with the default
// Options (CheckExecutable), reporting each failure with t.Error and each
// note with t.Log.
func RunExecutable(t *testing.T, path string) { RunExecutableOptions(t, path, Options{}) }

// RunExecutableOptions is RunExecutable with options.
func RunExecutableOptions(t *testing.T, path string, opts Options) {
	t.Helper()
	rep, err := CheckExecutable(t.Context(), path, opts)
	if err != nil {
		t.Fatalf("stagetest: %s: %v", path, err)
	}
	for _, f := range rep.Failures {
		t.Error(f)
	}
	for _, n := range rep.Notes {
		t.Log("stagetest: note: " + n)
	}
}
