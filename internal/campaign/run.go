package campaign

import (
	"fmt"
	"io"
	"runtime"
	"strings"
	"sync"
	"time"

	"github.com/foilwright/foilwright/internal/scangen"
)

// Case is a generated case ready to run: its seed, spec and scan.
type Case struct {
	Seed uint64
	Spec scangen.Spec
	Scan *scangen.Scan
}

// NewCase draws and generates the case of seed. It returns the
// generator's error, which means a bug in the generator.
func NewCase(seed uint64) (*Case, error) { return newCase(seed, false) }

// NewFixtureCase is NewCase with a fixture's face measured with the part
// (scangen.WithFixture): the case of seed, its other draws unchanged.
func NewFixtureCase(seed uint64) (*Case, error) { return newCase(seed, true) }

func newCase(seed uint64, fixture bool) (*Case, error) {
	spec := scangen.Draw(seed)
	if fixture {
		spec = scangen.WithFixture(spec, seed)
	}
	scan, err := scangen.Generate(spec, seed)
	if err != nil {
		return nil, fmt.Errorf("case %d: %w", seed, err)
	}
	return &Case{Seed: seed, Spec: spec, Scan: scan}, nil
}

// WellSampled reports whether the case counts among the well-sampled
// ones of the figures (Record.Well).
func (c *Case) WellSampled() bool { return wellSampled(c.Spec, c.Scan.Truth) }

// Run runs the case through the geometry chain and compares the section
// with the truth. A panic in the chain is recorded as a failure.
func (c *Case) Run() Record {
	tr := *c.Scan.Truth
	tr.Lines, tr.Section = nil, nil // records stay small
	r := Record{Seed: c.Seed, Spec: c.Spec, Truth: &tr, File: c.Scan.Name, Well: c.WellSampled()}
	panels := 0
	if c.Spec.Category == "lift" {
		panels = LiftPanels
	}
	start := time.Now()
	doc, err := safePrepare(c.Scan.Name, c.Scan.Data, panels)
	r.Seconds = time.Since(start).Seconds()
	var sec *section
	if err == nil {
		sec, err = decodeSection(doc)
	}
	if err != nil {
		r.Err = firstLine(err.Error())
		if c.Spec.Category == "lift" {
			r.Lift = &Lift{NoiseMM: c.Spec.Noise.MM, Irregular: c.Spec.Sampling.Sigma > 0, Err: "prep: " + r.Err}
		}
		return r
	}
	evaluate(&r, c.Scan.Truth, sec)
	if c.Spec.Category == "lift" {
		r.Lift = liftCheck(c.Spec, c.Scan.Truth, sec)
	}
	return r
}

// safePrepare calls prepare and turns a panic into an error.
func safePrepare(name string, data []byte, panels int) (doc []byte, err error) {
	defer func() {
		if v := recover(); v != nil {
			err = fmt.Errorf("panic: %v", v)
		}
	}()
	return prepare(name, data, panels)
}

// firstLine returns s up to its first line break.
func firstLine(s string) string {
	if i := strings.IndexByte(s, '\n'); i >= 0 {
		return s[:i]
	}
	return s
}

// Options control a campaign run.
type Options struct {
	// Workers is the number of cases run at once; 0 means one per CPU.
	Workers int
	// Progress, when set, receives a line every Every cases.
	Progress io.Writer
	Every    int
	// Keep, when set, is called with every case whose record it may want
	// (to dump the files of failures); it runs on the worker's goroutine.
	Keep func(*Case, *Record)
	// Fixture adds a fixture's face to every case (NewFixtureCase): an
	// opt-in hazard, so that the plain cases of a seed stay as they were.
	Fixture bool
}

// Run runs the cases of the seeds and returns their records in the order
// of the seeds. It returns the first generator error.
func Run(seeds []uint64, opts Options) ([]Record, error) {
	workers := opts.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	recs := make([]Record, len(seeds))
	errs := make([]error, len(seeds))
	next := make(chan int)
	var wg sync.WaitGroup
	var mu sync.Mutex
	done := 0
	start := time.Now()
	for range workers {
		wg.Go(func() {
			for i := range next {
				c, err := newCase(seeds[i], opts.Fixture)
				if err != nil {
					errs[i] = err
					continue
				}
				recs[i] = c.Run()
				if opts.Keep != nil {
					opts.Keep(c, &recs[i])
				}
				mu.Lock()
				done++
				if opts.Progress != nil && opts.Every > 0 && done%opts.Every == 0 {
					fmt.Fprintf(opts.Progress, "%d of %d cases, %.0f s\n", done, len(seeds), time.Since(start).Seconds())
				}
				mu.Unlock()
			}
		})
	}
	for i := range seeds {
		next <- i
	}
	close(next)
	wg.Wait()
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	return recs, nil
}
