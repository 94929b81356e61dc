package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/spf13/cobra"

	"github.com/foilwright/foilwright/pipeline"
)

type jobScriptOptions struct {
	out        string
	folder     string
	tasks      int
	cpus       int
	time       string
	mem        string
	partition  string
	account    string
	jobName    string
	foilwright string
	calibrate  []string
	quiet      bool
	json       bool
}

func newJobScriptCmd() *cobra.Command {
	var opts jobScriptOptions
	cmd := &cobra.Command{
		Use:   "jobscript PIPELINE.json",
		Short: "Write a Slurm job script that runs a pipeline as a job array, then merges it",
		Long: `jobscript writes a Slurm batch script for a pipeline file: a job array whose
tasks each run one shard of the sections (run --shard auto --resume, so that a
requeued task finishes its share instead of repeating it), with the number of
tasks, the time and the memory per task estimated from the inputs' sizes and a
measured cost model (--calibrate MANIFEST fits it to runs of your own), and
the merge as a job that starts once every task succeeded. Every value can be
given instead. Run the script with bash to submit both, or with sbatch to
submit the array alone. The estimates are printed (on standard error when the
script goes to standard output).`,
		Example: `  foilwright jobscript examples/rotor/pipeline.json -o rotor.sbatch
  foilwright jobscript batch/pipeline.json --tasks 4 --cpus-per-task 2 -o batch.sbatch && bash batch.sbatch
  foilwright jobscript batch/pipeline.json --calibrate runs/pilot/manifest.json --partition short -o batch.sbatch`,
		Args: cobra.ExactArgs(1),
		ValidArgsFunction: func(*cobra.Command, []string, string) ([]string, cobra.ShellCompDirective) {
			return []string{"json"}, cobra.ShellCompDirectiveFilterFileExt
		},
		RunE: func(cmd *cobra.Command, args []string) error { return runJobScript(cmd, args[0], opts) },
	}
	f := cmd.Flags()
	outputFlag(cmd, &opts.out, "the job script (- for standard output)", "sbatch", "sh")
	f.StringVar(&opts.folder, "run-folder", "", "the run folder the tasks write (default: the pipeline's outputs.folder)")
	f.IntVar(&opts.tasks, "tasks", 0, "tasks of the job array (default: enough for about 30 minutes each)")
	f.IntVar(&opts.cpus, "cpus-per-task", 1, "CPUs of each task, and the sections it makes at once")
	f.StringVar(&opts.time, "time", "", "time limit of each task, as Slurm writes it (MM, HH:MM:SS, D-HH:MM:SS; default: estimated)")
	f.StringVar(&opts.mem, "mem", "", "memory of each task, e.g. 2G or 1500M (default: estimated)")
	f.StringVar(&opts.partition, "partition", "", "the partition to submit to (default: the cluster's)")
	f.StringVar(&opts.account, "account", "", "the account to charge (default: yours)")
	f.StringVar(&opts.jobName, "job-name", "", "the job's name (default: foilwright-NAME)")
	f.StringVar(&opts.foilwright, "foilwright", "", "the foilwright executable the tasks run (default: this one)")
	f.StringArrayVar(&opts.calibrate, "calibrate", nil, "the `MANIFEST` (manifest.json) of an earlier run, whose section timings fit the cost model (repeatable: runs of small and of large sections fix both terms)")
	cmd.MarkFlagFilename("calibrate", "json")
	cmd.MarkFlagFilename("foilwright")
	cmd.MarkFlagDirname("run-folder")
	quietFlag(cmd, &opts.quiet, "print no estimates")
	jsonFlag(cmd, &opts.json, "print the estimates as JSON")
	cmd.RegisterFlagCompletionFunc("tasks", fixedCompletions("4", "16", "64"))
	cmd.RegisterFlagCompletionFunc("cpus-per-task", fixedCompletions("1", "2", "4", "8"))
	cmd.RegisterFlagCompletionFunc("time", fixedCompletions("00:30:00", "02:00:00", "1-00:00:00"))
	cmd.RegisterFlagCompletionFunc("mem", fixedCompletions("1G", "2G", "4G"))
	cmd.RegisterFlagCompletionFunc("partition", noFiles)
	cmd.RegisterFlagCompletionFunc("account", noFiles)
	cmd.RegisterFlagCompletionFunc("job-name", noFiles)
	return cmd
}

func runJobScript(cmd *cobra.Command, path string, opts jobScriptOptions) error {
	if opts.tasks < 0 || opts.tasks > pipeline.MaxShards {
		return badInputf("--tasks %d: want 1 to %d", opts.tasks, pipeline.MaxShards)
	}
	if opts.cpus < 1 {
		return badInputf("--cpus-per-task %d: want 1 or more", opts.cpus)
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
	o := pipeline.JobScriptOptions{Pipeline: p.Path, Tasks: opts.tasks, CPUs: opts.cpus, Partition: opts.partition,
		Account: opts.account, JobName: opts.jobName, Cost: pipeline.DefaultCostModel}
	if o.Folder, err = filepath.Abs(orDefault(opts.folder, p.Folder())); err != nil {
		return err
	}
	if opts.time != "" {
		if o.TimeS, err = pipeline.ParseSlurmTime(opts.time); err != nil {
			return badInputf("--time: %v", err)
		}
	}
	if opts.mem != "" {
		n, err := parseMiB(opts.mem)
		if err != nil {
			return badInputf("--mem: %v", err)
		}
		o.MemMiB = n
	}
	if o.Foilwright = opts.foilwright; o.Foilwright == "" {
		if o.Foilwright, err = os.Executable(); err != nil {
			return err
		}
	}
	if o.Foilwright, err = filepath.Abs(o.Foilwright); err != nil {
		return err
	}
	if len(opts.calibrate) > 0 {
		if o.Cost, err = pipeline.CalibrateCost(opts.calibrate, o.Cost); err != nil {
			return badInputf("--calibrate: %v", err)
		}
	}
	stdout, stderr := cmd.OutOrStdout(), cmd.ErrOrStderr()
	if opts.out == "" {
		if isTerminal(stdout) {
			return badInputf("give the job script a file with -o (or -o - for standard output)")
		}
		opts.out = stdoutPath
	}
	out, err := newOutputs(stdout, opts.out)
	if err != nil {
		return badInput(err)
	}
	script, est, err := pipeline.JobScript(pl, o)
	if err != nil {
		return badInput(err)
	}
	if err := out.write(opts.out, func(w io.Writer) error { _, err := w.Write(script); return err }); err != nil {
		return err
	}
	if err := out.commit(); err != nil {
		return err
	}
	// The estimates never share a stream with the script.
	rep := stdout
	if opts.out == stdoutPath {
		rep = stderr
	}
	switch {
	case opts.quiet:
	case opts.json:
		return writeJSON(rep, est)
	default:
		fmt.Fprintf(rep, "%d section(s), %.1f MB of input: about %.0f core-seconds at %.3g s + %.3g s per MB a section (%s)\n",
			est.Sections, float64(est.Bytes)/1e6, est.CoreS, o.Cost.Fixed, o.Cost.PerMB, o.Cost.Source)
		fmt.Fprintf(rep, "%d task(s) of %d CPU(s): the dearest about %.0f s of work; asking %s and %d MiB each; the merge %s and %d MiB\n",
			est.Tasks, est.CPUs, est.DearestS/float64(est.CPUs), pipeline.SlurmTime(est.TimeS), est.MemMiB, pipeline.SlurmTime(est.MergeTimeS), est.MergeMiB)
		wrote(rep, opts.out)
	}
	return nil
}

// parseMiB reads a memory size as Slurm's --mem takes it (a number of
// MiB, or with K, M, G or T), in MiB.
func parseMiB(s string) (int, error) {
	num, mult := s, 1.0
	for _, u := range []struct {
		suffix string
		mult   float64
	}{{"K", 1.0 / 1024}, {"M", 1}, {"G", 1024}, {"T", 1024 * 1024}} {
		if t, ok := strings.CutSuffix(strings.ToUpper(s), u.suffix); ok {
			num, mult = t, u.mult
			break
		}
	}
	x, err := strconv.ParseFloat(num, 64)
	if err != nil || x <= 0 || x*mult > 1<<40 {
		return 0, fmt.Errorf("%q: want a size such as 1500M or 2G", s)
	}
	return int(math.Ceil(x * mult)), nil
}

func orDefault(s, d string) string {
	if s == "" {
		return d
	}
	return s
}
