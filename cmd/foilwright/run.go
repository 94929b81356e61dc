package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/schollz/progressbar/v3"
	"github.com/spf13/cobra"

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
	json    bool
	plan    bool
	shard   string
	resume  bool
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
others intact. A "compare" block holds each section against its design (see
compare) and adds compare.json, compare.csv and verdicts.csv. The exit status is
0 only when every section succeeded, 3 when they all did but one is out of
tolerance against its design.

Progress goes to standard error (a bar on a terminal, a line per section
otherwise); the summary, one line per section, to standard output.

With --verify, run re-runs the run that a manifest records (refusing if the
pipeline file or an input changed) and reports every output that differs,
byte for byte.

Batches: the manifest is written as the run goes (a journal of finished
sections), so --resume after a crash, a kill or a failure makes only what is
missing, failed or no longer matches its record. --shard K/N runs one of N
shards (sections balanced by input size) into OUT/shards/K-of-N; --shard auto
takes K and N from a Slurm job array (or a Kubernetes indexed Job's index,
with auto/N); merge combines the shards into the run one machine would make.`,
		Example: `  foilwright run examples/tunnel-model/pipeline.json
  foilwright run examples/rotor/pipeline.json --jobs 2 -o /tmp/rotor
  foilwright run --verify /tmp/rotor/manifest.json`,
		Args: cobra.ExactArgs(1),
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			return []string{"json"}, cobra.ShellCompDirectiveFilterFileExt
		},
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := fileOnly("--output", opts.out); err != nil {
				return err
			}
			if opts.verify {
				if opts.shard != "" || opts.resume {
					return badInputf("--verify re-runs a whole run: it takes neither --shard nor --resume")
				}
				return runVerify(cmd, args[0], opts)
			}
			return runPipeline(cmd, args[0], opts)
		},
	}
	f := cmd.Flags()
	f.StringVarP(&opts.out, "output", "o", "", "run folder (default: the pipeline's outputs.folder)")
	deprecatedAlias(f, "out", "output")
	cmd.MarkFlagDirname("output")
	f.IntVarP(&opts.jobs, "jobs", "j", 1, "sections made at once, each worker with its own stage processes")
	f.BoolVar(&opts.replace, "replace", false, "replace the earlier run in the run folder, as a whole, once every section succeeded (the folder must hold only that run)")
	f.BoolVar(&opts.verify, "verify", false, "the argument is a manifest.json: re-run it and compare every output")
	f.BoolVar(&opts.keep, "keep", false, "with --verify, keep the re-run's folder")
	quietFlag(cmd, &opts.quiet, "show no progress and print no summary: the exit status and the manifest say how the run went")
	jsonFlag(cmd, &opts.json, "print the summary (or the plan, or the verify report) as JSON")
	f.BoolVar(&opts.plan, "plan", false, "check the pipeline file and print the plan, running nothing")
	f.StringVar(&opts.shard, "shard", "", "run one shard of the sections: K/N (K from 0), or auto (auto/N) from a job array's environment (SLURM_ARRAY_TASK_ID and COUNT, or JOB_COMPLETION_INDEX)")
	f.BoolVar(&opts.resume, "resume", false, "keep what an earlier attempt at this run (or shard) finished and still checks, make the rest")
	opts.host.register(cmd)
	cmd.RegisterFlagCompletionFunc("jobs", fixedCompletions("1", "2", "4", "8"))
	cmd.RegisterFlagCompletionFunc("shard", fixedCompletions("auto", "0/2", "1/2", "0/4"))
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
	shard, err := shardOf(opts.shard, os.Getenv)
	if err != nil {
		return err
	}
	if opts.plan {
		rep := planJSON(pl)
		if shard != nil {
			rep.Shard = &planShardJSON{Index: shard.Index, Count: shard.Count, Sections: []string{}}
			for _, i := range pl.ShardSections(*shard) {
				rep.Shard.Sections = append(rep.Shard.Sections, pl.Sections[i].Name)
			}
		}
		if opts.json {
			return writeJSON(stdout, rep)
		}
		if err := pl.Describe(stdout); err != nil {
			return err
		}
		if rep.Shard != nil {
			_, err := fmt.Fprintf(stdout, "shard %s makes %d section(s): %s\n", shard, len(rep.Shard.Sections), strings.Join(rep.Shard.Sections, " "))
			return err
		}
		return nil
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
		Done: prog.done, Limits: lim, Shard: shard, Resume: opts.resume,
		Begin: func(todo int, r pipeline.ResumeReport) { prog.begin(todo, shard, r) },
	})
	prog.finish()
	if sum != nil && sum.Manifest != "" {
		sum.Manifest = displayPath(sum.Manifest)
	}
	if sum != nil && !opts.quiet {
		if opts.json {
			if err := writeJSON(stdout, summaryJSON(sum)); err != nil {
				return err
			}
		} else {
			sum.Write(stdout)
		}
	}
	if err != nil {
		return err
	}
	if err := sum.Err(); err != nil {
		return err
	}
	if n := len(sum.OutOfTolerance()); n > 0 {
		return &toleranceError{fmt.Sprintf("%d of %d section(s) out of tolerance against their design", n, len(sum.Sections))}
	}
	return nil
}

// shardOf reads --shard: "" (the whole run), K/N, auto or auto/N (from
// the environment of a job-array task).
func shardOf(flag string, getenv func(string) string) (*pipeline.Shard, error) {
	switch {
	case flag == "":
		return nil, nil
	case flag == "auto" || strings.HasPrefix(flag, "auto/"):
		count := 0
		if n, ok := strings.CutPrefix(flag, "auto/"); ok {
			c, err := strconv.Atoi(n)
			if err != nil || c < 1 {
				return nil, badInputf("--shard %s: want auto or auto/N with N the number of tasks", flag)
			}
			count = c
		}
		s, err := pipeline.ShardFromEnv(getenv, count)
		if err != nil {
			return nil, badInputf("--shard %s: %v", flag, err)
		}
		return &s, nil
	}
	s, err := pipeline.ParseShard(flag)
	if err != nil {
		return nil, badInputf("--shard: %v", err)
	}
	return &s, nil
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
	switch {
	case opts.quiet:
	case opts.json:
		if err := writeJSON(stdout, verifyJSON(rep)); err != nil {
			return err
		}
	default:
		rep.Write(stdout)
	}
	if !rep.OK() {
		return fmt.Errorf("%d output(s) differ, %d section outcome(s) changed", len(rep.Differences), len(rep.Changes))
	}
	return nil
}

// displayPath returns path relative to the current folder when it lies
// inside it, as the user would type it, else as it is.
func displayPath(path string) string {
	wd, err := os.Getwd()
	if err != nil {
		return path
	}
	abs, err := filepath.Abs(path)
	if err != nil {
		return path
	}
	if rel, err := filepath.Rel(wd, abs); err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return rel
	}
	return path
}

// writeJSON writes v as indented JSON and a newline.
func writeJSON(w io.Writer, v any) error {
	b, err := json.MarshalIndent(v, "", "  ")
	if err != nil {
		return err
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

// The JSON forms of run's reports.
type (
	runSummaryJSON struct {
		Folder    string           `json:"folder"`
		Manifest  string           `json:"manifest"`
		Cancelled bool             `json:"cancelled"`
		Kept      bool             `json:"earlier_run_kept,omitempty"` // a replacement that did not succeed left the earlier run
		Sections  []runSectionJSON `json:"sections"`
		Counts    map[string]int   `json:"counts"`
		Failed    []string         `json:"failed"`
		// OutOfTolerance names the sections compared with their design
		// that failed their tolerance.
		OutOfTolerance []string `json:"out_of_tolerance"`
	}
	runSectionJSON struct {
		Name    string                 `json:"name"`
		Status  string                 `json:"status"`
		Error   string                 `json:"error,omitempty"`
		Summary string                 `json:"summary,omitempty"`
		Stages  []pipeline.StageReport `json:"stages"`
		Compare *pipeline.Verdict      `json:"compare,omitempty"`
	}
	verifyReportJSON struct {
		Manifest    string           `json:"manifest"`
		Reproduced  bool             `json:"reproduced"`
		Checked     int              `json:"checked"`
		Differences []differenceJSON `json:"differences"`
		Changes     []string         `json:"changes"`
		Notes       []string         `json:"notes"`
		Kept        string           `json:"kept,omitempty"`
	}
	differenceJSON struct {
		Path   string `json:"path"`
		Want   string `json:"want_sha256,omitempty"`
		Got    string `json:"got_sha256,omitempty"`
		OnDisk bool   `json:"on_disk"` // in the run folder; else in the re-run
		Note   string `json:"note,omitempty"`
	}
	planReportJSON struct {
		Name     string            `json:"name"`
		Folder   string            `json:"folder"`
		Sections []planSectionJSON `json:"sections"`
		Stages   []planStageJSON   `json:"stages"`
		Shard    *planShardJSON    `json:"shard,omitempty"`
	}
	// planShardJSON is the share of one shard (run --plan --shard K/N).
	planShardJSON struct {
		Index    int      `json:"index"`
		Count    int      `json:"count"`
		Sections []string `json:"sections"`
	}
	planSectionJSON struct {
		Name    string   `json:"name"`
		Files   []string `json:"files"`
		Station *float64 `json:"station,omitempty"`
	}
	planStageJSON struct {
		ID    string   `json:"id"`
		Stage string   `json:"stage"`
		After []string `json:"after"`
	}
)

func summaryJSON(s *pipeline.Summary) runSummaryJSON {
	out := runSummaryJSON{Folder: s.Folder, Manifest: s.Manifest, Cancelled: s.Cancelled, Kept: s.Kept,
		Sections: []runSectionJSON{}, Counts: map[string]int{}, Failed: []string{}, OutOfTolerance: []string{}}
	for _, r := range s.Sections {
		st := r.Stages
		if st == nil {
			st = []pipeline.StageReport{}
		}
		out.Sections = append(out.Sections, runSectionJSON{Name: r.Name, Status: r.Status, Error: r.Err, Summary: r.Summary, Stages: st, Compare: r.Compare})
		out.Counts[r.Status]++
	}
	for _, r := range s.Failed() {
		out.Failed = append(out.Failed, r.Name)
	}
	for _, r := range s.OutOfTolerance() {
		out.OutOfTolerance = append(out.OutOfTolerance, r.Name)
	}
	return out
}

func verifyJSON(r *pipeline.VerifyReport) verifyReportJSON {
	out := verifyReportJSON{Manifest: r.Manifest, Reproduced: r.OK(), Checked: r.Checked, Kept: r.Folder,
		Differences: []differenceJSON{}, Changes: append([]string{}, r.Changes...), Notes: append([]string{}, r.Notes...)}
	for _, d := range r.Differences {
		out.Differences = append(out.Differences, differenceJSON{Path: d.Path, Want: d.Want, Got: d.Got, OnDisk: d.OnDisk, Note: d.Note})
	}
	return out
}

func planJSON(pl *pipeline.Plan) planReportJSON {
	out := planReportJSON{Name: pl.Pipeline.Name, Folder: pl.Pipeline.Folder(), Sections: []planSectionJSON{}, Stages: []planStageJSON{}}
	for _, s := range pl.Sections {
		out.Sections = append(out.Sections, planSectionJSON{Name: s.Name, Files: s.Files, Station: s.Station})
	}
	for _, st := range pl.Stages {
		after := st.After
		if after == nil {
			after = []string{}
		}
		out.Stages = append(out.Stages, planStageJSON{ID: st.ID, Stage: st.Stage, After: after})
	}
	return out
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

// progress shows sections done: a bar with the time per section and the
// time left on a terminal, one line per section otherwise, nothing when
// quiet.
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
	if isTerminal(w) {
		// The bar's own rate would divide by the few microseconds before
		// the first section is done; rateText words the rate once it
		// means something.
		p.bar = progressbar.NewOptions(total,
			progressbar.OptionSetWriter(w),
			progressbar.OptionSetDescription("sections"),
			progressbar.OptionShowCount(),
			progressbar.OptionSetPredictTime(false),
			progressbar.OptionClearOnFinish(),
		)
	}
	return p
}

// begin learns the sections to make, and says what a shard makes and
// what a resumed run kept.
func (p *progress) begin(todo int, shard *pipeline.Shard, r pipeline.ResumeReport) {
	if p.quiet {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.total = todo
	if p.bar != nil {
		p.bar.ChangeMax(todo)
	}
	if shard != nil {
		fmt.Fprintf(p.w, "shard %s: %d section(s) of the run's to make\n", shard, todo+r.Kept)
	}
	switch r.From {
	case pipeline.ResumeCrash:
		fmt.Fprintf(p.w, "resumed from the journal of an attempt that did not finish: %d section(s) kept, %d to make\n", r.Kept, todo)
	case pipeline.ResumeRun:
		fmt.Fprintf(p.w, "resumed from the earlier run in the folder: %d section(s) kept, %d to make\n", r.Kept, todo)
	}
	for _, why := range r.Reasons {
		fmt.Fprintf(p.w, "  made again: %s\n", why)
	}
	if r.Redo > len(r.Reasons) {
		fmt.Fprintf(p.w, "  and %d more made again\n", r.Redo-len(r.Reasons))
	}
}

func (p *progress) done(r pipeline.SectionReport) {
	if p.quiet {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	p.count++
	el := time.Since(p.start)
	if p.bar != nil {
		p.bar.Describe("sections" + rateText(p.count, p.total, el))
		p.bar.Add(1)
		return
	}
	fmt.Fprintf(p.w, "[%d/%d] %-9s %s (%.1f s elapsed%s)\n", p.count, p.total, r.Status, r.Name, el.Seconds(), leftText(p.count, p.total, el))
}

func (p *progress) finish() {
	if p.bar != nil {
		p.bar.Finish()
	}
}

// rateText words the pace of a run for the progress bar: the time per
// section and the time left, once two sections are done and a second has
// passed (before that a rate is noise); "" until then.
func rateText(done, total int, elapsed time.Duration) string {
	if done < 2 || elapsed < time.Second {
		return ""
	}
	per := elapsed.Seconds() / float64(done)
	return fmt.Sprintf(" (%.1f s each%s)", per, leftText(done, total, elapsed))
}

// leftText words the time left, as ", about N s left", once a section is
// done and while some are left; "" otherwise.
func leftText(done, total int, elapsed time.Duration) string {
	if done < 1 || done >= total {
		return ""
	}
	left := elapsed.Seconds() / float64(done) * float64(total-done)
	return fmt.Sprintf(", about %.0f s left", left)
}
