package host

import (
	"context"
	"sync"

	"github.com/foilwright/foilwright/plugins/stage"
)

// Pool runs calls on up to N workers at once, each with its own stage
// processes, started on first use. It suits single-threaded stages and
// isolation; a Go stage also serves concurrent calls in one Runner.
type Pool struct {
	h    *Host
	free chan *worker
	all  []*worker
}

type worker struct {
	mu      sync.Mutex
	runners map[Spec]*Runner
}

// NewPool returns a Pool of jobs workers; jobs < 1 means 1.
func (h *Host) NewPool(jobs int) *Pool {
	jobs = max(jobs, 1)
	p := &Pool{h: h, free: make(chan *worker, jobs)}
	for range jobs {
		w := &worker{runners: map[Spec]*Runner{}}
		p.all = append(p.all, w)
		p.free <- w
	}
	return p
}

// Jobs returns the number of workers.
func (p *Pool) Jobs() int { return len(p.all) }

func (w *worker) runner(h *Host, spec Spec) *Runner {
	w.mu.Lock()
	defer w.mu.Unlock()
	r, ok := w.runners[spec]
	if !ok {
		r = h.Runner(spec)
		w.runners[spec] = r
	}
	return r
}

// take waits for a free worker.
func (p *Pool) take(ctx context.Context) (*worker, error) {
	select {
	case w := <-p.free:
		return w, nil
	case <-ctx.Done():
		return nil, ctx.Err()
	}
}

// Run runs req through spec on a free worker, waiting for one if all are
// busy.
func (p *Pool) Run(ctx context.Context, spec Spec, req stage.Request) (*Reply, error) {
	w, err := p.take(ctx)
	if err != nil {
		return nil, &Error{Stage: spec.String(), Section: req.SectionName, Op: "run", Err: err}
	}
	defer func() { p.free <- w }()
	return w.runner(p.h, spec).Run(ctx, req)
}

// Describe returns the description of spec, from a free worker.
func (p *Pool) Describe(ctx context.Context, spec Spec) (stage.Info, error) {
	w, err := p.take(ctx)
	if err != nil {
		return stage.Info{}, &Error{Stage: spec.String(), Op: "describe", Err: err}
	}
	defer func() { p.free <- w }()
	return w.runner(p.h, spec).Describe(ctx)
}

// Close kills every process of the pool's workers.
func (p *Pool) Close() {
	for _, w := range p.all {
		w.mu.Lock()
		for _, r := range w.runners {
			r.Close()
		}
		w.mu.Unlock()
	}
}
