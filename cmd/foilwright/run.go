package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"sync"
	"time"

	"github.com/schollz/progressbar/v3"
	"github.com/spf13/cobra"
	"golang.org/x/term"

	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/pipeline"
	"github.com/foilwright/foilwright/plugins/builtin"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
)

type runOptions struct {
	host    hostFlags
	out     string
	jobs    int
	replace bool
	verify  bool
	keep    bool
	quiet   bool
	plan    bool
}

func newRunCmd() *cobra.Command {
	var opts runOptions
	cmd := &cobra.Command{
		Use:   "run PIPELINE.json | --verify MANIFEST.json",
		Short: "Run a pipeline file, or re-run a recorded run and compare every output",
		Long: `run makes every section a pipeline file lists and runs its stages on each, each
stage in its own process, and writes the run folder: one folder per section with
section.json, nodes.dat, results/<stage-id>.json and plots/, and manifest.json,
which records the tool version, the pipeline's and every input's sha256, each
stage's name, version, executable sha256 and parameters, every output's sha256
and the timings. Outputs are written atomically; a failed section leaves the
others intact. The exit status is 0 only when every section succeeded.

With --verify, run re-runs the run that a manifest records (refusing if the
pipeline file or an input changed) and reports every output that differs,
byte for byte.`,
		Example: `  foilwright run examples/tunnel-model/pipeline.json
  foilwright run examples/rotor/pipeline.json --jobs 2 --out /tmp/rotor
  foilwright run --verify /tmp/rotor/manifest.json`,
		Args: cobra.ExactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if opts.verify {
				return runVerify(cmd, args[0], opts)
			}
			return runPipeline(cmd, args[0], opts)
		},
	}
	f := cmd.Flags()
	f.StringVar(&opts.out, "out", "", "run folder (default: the pipeline's outputs.folder)")
	f.IntVarP(&opts.jobs, "jobs", "j", 1, "sections made at once, each worker with its own stage processes")
	f.BoolVar(&opts.replace, "replace", false, "replace the earlier run in the run folder, as a whole, once every section succeeded (the folder must hold only that run)")
	f.BoolVar(&opts.verify, "verify", false, "the argument is a manifest.json: re-run it and compare every output")
	f.BoolVar(&opts.keep, "keep", false, "with --verify, keep the re-run's folder")
	f.BoolVarP(&opts.quiet, "quiet", "q", false, "show no progress")
	f.BoolVar(&opts.plan, "plan", false, "check the pipeline file and print the plan, running nothing")
	opts.host.register(cmd)
	cmd.MarkFlagDirname("out")
	return cmd
}

// known reports whether name is a built-in stage.
func known(name string) bool {
	_, ok := builtin.Lookup(name)
	return ok
}

func runPipeline(cmd *cobra.Command, path string, opts runOptions) error {
	stdout, stderr := cmd.OutOrStdout(), cmd.ErrOrStderr()
	if opts.jobs < 1 {
		return badInputf("--jobs %d: want 1 or more", opts.jobs)
	}
	lim, err := limitsOf(cmd)
	if err != nil {
		return err
	}
	p, err := pipeline.LoadWith(path, parseOptions(lim))
	if err != nil {
		return badInput(err)
	}
	pl := p.Plan()
	if opts.plan {
		return pl.Describe(stdout)
	}
	h, err := opts.host.newHost(stderr, lim)
	if err != nil {
		return err
	}
	defer h.Close()
	self, err := selfSHA256()
	if err != nil {
		return err
	}
	prog := newProgress(stderr, len(pl.Sections), opts.quiet)
	sum, err := pipeline.Run(cmd.Context(), pl, pipeline.RunOptions{
		Folder: opts.out, Replace: opts.replace, Jobs: opts.jobs,
		Preparer: pipeline.Chain{}, NewRunner: pipeline.HostRunners(h, self),
		Done: prog.done, Limits: lim,
	})
	prog.finish()
	if sum != nil {
		sum.Write(stdout)
	}
	if err != nil {
		return err
	}
	return sum.Err()
}

// parseOptions are the pipeline file's checks for the limits lim: its
// size and nesting, and the parameters of built-in stages.
func parseOptions(lim limits.Limits) pipeline.ParseOptions {
	return pipeline.ParseOptions{Known: known, Describe: builtinInfo, MaxBytes: lim.JSONBytes, MaxDepth: lim.JSONDepth}
}

// builtinInfo describes a built-in stage in process, for the checks of a
// pipeline file.
func builtinInfo(name string) (stage.Info, bool) {
	s, ok := builtin.Lookup(name)
	if !ok {
		return stage.Info{}, false
	}
	info, err := s.Describe(context.Background())
	return info, err == nil
}

func runVerify(cmd *cobra.Command, manifest string, opts runOptions) error {
	stdout, stderr := cmd.OutOrStdout(), cmd.ErrOrStderr()
	lim, err := limitsOf(cmd)
	if err != nil {
		return err
	}
	h, err := opts.host.newHost(stderr, lim)
	if err != nil {
		return err
	}
	defer h.Close()
	self, err := selfSHA256()
	if err != nil {
		return err
	}
	rep, err := pipeline.Verify(cmd.Context(), manifest, pipeline.VerifyOptions{
		Known: known, Jobs: opts.jobs, Preparer: pipeline.Chain{}, NewRunner: pipeline.HostRunners(h, self), Keep: opts.keep,
		Parse: parseOptions(lim), Limits: lim,
	})
	if err != nil {
		if errors.Is(err, os.ErrNotExist) {
			return badInput(err)
		}
		return err
	}
	rep.Write(stdout)
	if !rep.OK() {
		return fmt.Errorf("%d output(s) differ, %d section outcome(s) changed", len(rep.Differences), len(rep.Changes))
	}
	return nil
}

// selfSHA256 returns the sha256 of the running executable, which serves the
// built-in stages.
func selfSHA256() (string, error) {
	exe, err := os.Executable()
	if err != nil {
		return "", err
	}
	return host.FileSHA256(exe)
}

// progress shows sections done: a bar with rate and time left on a
// terminal, one line per section otherwise, nothing when quiet.
type progress struct {
	mu    sync.Mutex
	w     io.Writer
	bar   *progressbar.ProgressBar
	total int
	count int
	start time.Time
	quiet bool
}

func newProgress(w io.Writer, total int, quiet bool) *progress {
	p := &progress{w: w, total: total, start: time.Now(), quiet: quiet}
	if quiet {
		return p
	}
	if f, ok := w.(*os.File); ok && term.IsTerminal(int(f.Fd())) {
		p.bar = progressbar.NewOptions(total,
			progressbar.OptionSetWriter(w),
			progressbar.OptionSetDescription("sections"),
			progressbar.OptionShowCount(),
			progressbar.OptionShowIts(),
			progressbar.OptionSetItsString("section"),
			progressbar.OptionSetPredictTime(true),
			progressbar.OptionClearOnFinish(),
		)
	}
	return p
}

func (p *progress) done(r pipeline.SectionReport) {
	if p.quiet {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.count++
	if p.bar != nil {
		p.bar.Add(1)
		return
	}
	el := time.Since(p.start)
	left := time.Duration(float64(el) / float64(p.count) * float64(p.total-p.count))
	fmt.Fprintf(p.w, "[%d/%d] %-9s %s (%.1f s elapsed, about %.0f s left)\n", p.count, p.total, r.Status, r.Name, el.Seconds(), left.Seconds())
}

func (p *progress) finish() {
	if p.bar != nil {
		p.bar.Finish()
	}
}
