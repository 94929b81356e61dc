package pipeline

import (
	"context"
	"strings"
	"sync"

	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

// HostRunners returns a StageRunner factory for RunOptions.NewRunner that
// runs stages as child processes through h. Each runner it makes (one per
// worker) starts its own process for each stage on first use and keeps it
// for every later section; Close stops them. self is the sha256 of the
// executable that serves the built-in stages (the running binary), recorded
// in the manifest.
func HostRunners(h *host.Host, self string) func() (StageRunner, error) {
	return func() (StageRunner, error) {
		return &hostRunner{h: h, self: self, runners: map[host.Spec]*host.Runner{}}, nil
	}
}

type hostRunner struct {
	h    *host.Host
	self string

	mu       sync.Mutex
	runners  map[host.Spec]*host.Runner
	runsFrom map[string][]FileHash // by stage id, from Describe
}

func specOf(call StageCall) host.Spec {
	env := strings.Join(call.Env, ",")
	if call.Exec {
		return host.Spec{Path: call.Stage, SHA256: call.SHA256, Env: env}
	}
	return host.Spec{Name: call.Stage, Env: env}
}

// Environment returns the environment the stage of call gets.
func (r *hostRunner) Environment(call StageCall) []string {
	return r.h.StageEnv(specOf(call))
}

func (r *hostRunner) runner(call StageCall) *host.Runner {
	spec := specOf(call)
	r.mu.Lock()
	defer r.mu.Unlock()
	run, ok := r.runners[spec]
	if !ok {
		run = r.h.Runner(spec)
		r.runners[spec] = run
	}
	return run
}

// Describe starts the stage if needed and returns its description and the
// sha256 of its executable.
func (r *hostRunner) Describe(ctx context.Context, call StageCall) (stage.Info, string, error) {
	info, err := r.runner(call).Describe(ctx)
	if err != nil {
		return stage.Info{}, "", err
	}
	exe := r.self
	if call.Exec {
		if exe, err = host.FileSHA256(call.Stage); err != nil {
			return stage.Info{}, "", err
		}
		files, err := r.h.RunsFrom(specOf(call), info)
		if err != nil {
			return stage.Info{}, "", err
		}
		r.mu.Lock()
		if r.runsFrom == nil {
			r.runsFrom = map[string][]FileHash{}
		}
		for _, f := range files {
			r.runsFrom[call.ID] = append(r.runsFrom[call.ID], FileHash(f))
		}
		r.mu.Unlock()
	}
	return info, exe, nil
}

// RunsFrom returns what the external stage of call runs from besides its
// executable (its interpreter, the files it declares), as Describe found
// it.
func (r *hostRunner) RunsFrom(call StageCall) []FileHash {
	r.mu.Lock()
	defer r.mu.Unlock()
	return r.runsFrom[call.ID]
}

// Run runs req through the stage of call. Its time limit, timeout_s, is
// applied by Run's caller (runStage); the host's own call limit still
// holds.
func (r *hostRunner) Run(ctx context.Context, call StageCall, req stage.Request) (stage.Result, error) {
	reply, err := r.runner(call).Run(ctx, req)
	if err != nil {
		return stage.Result{}, err
	}
	return reply.Result, nil
}

// Close stops every stage process this runner started.
func (r *hostRunner) Close() error {
	r.mu.Lock()
	defer r.mu.Unlock()
	for _, run := range r.runners {
		run.Close()
	}
	return nil
}
