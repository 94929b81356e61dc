package pipeline

import (
	"bytes"
	"fmt"
	"math"
	"strings"
)

// JobScriptOptions say what a Slurm job script runs and asks for. A zero
// value is estimated by JobScript.
type JobScriptOptions struct {
	Foilwright string // the foilwright executable, absolute
	Pipeline   string // the pipeline file, absolute
	Folder     string // the run folder, absolute
	JobName    string
	Tasks      int // tasks of the array; 0: estimated
	CPUs       int // CPUs (and workers) per task; 0: 1
	TimeS      int // time limit per task, seconds; 0: estimated
	MemMiB     int // memory per task, MiB; 0: estimated
	Partition  string
	Account    string
	// TaskTargetS is the time one task should take when Tasks is
	// estimated; 0 means 30 minutes.
	TaskTargetS float64
	Cost        CostModel
}

// A JobEstimate is what JobScript estimated, and from what.
type JobEstimate struct {
	Sections   int     `json:"sections"`
	Bytes      int64   `json:"input_bytes"`         // input bytes of every section
	LargestB   int64   `json:"largest_bytes"`       // input bytes of the largest section
	CoreS      float64 `json:"core_s"`              // estimated core-seconds of the whole run
	DearestS   float64 `json:"dearest_task_core_s"` // estimated core-seconds of the dearest task
	Tasks      int     `json:"tasks"`
	CPUs       int     `json:"cpus_per_task"`
	TimeS      int     `json:"time_s"`  // asked per task
	MemMiB     int     `json:"mem_mib"` // asked per task
	MergeTimeS int     `json:"merge_time_s"`
	MergeMiB   int     `json:"merge_mem_mib"`
	// The cost model: seconds of one core per section and per MB of input.
	FixedS float64 `json:"model_fixed_s"`
	PerMBS float64 `json:"model_per_mb_s"`
}

// Safety margins of the estimates (common practice: a job past its time
// is killed, so ask for more than the estimate).
const (
	timeMargin    = 2.0
	timeFloorS    = 300 // the least time asked per task
	memMargin     = 1.5
	mergeFloorS   = 600
	mergeFloorMiB = 512
)

// JobScript writes a Slurm batch script for the plan: a job array whose
// tasks each run one shard (run --shard auto --resume, so that a
// requeued task finishes its share instead of repeating it), with the
// time and memory per task estimated from the sections' input bytes and
// the cost model, every value overridable. Run with bash outside a job,
// the script submits itself as the array and the merge as a job that
// starts once every task succeeded. The script holds no date: the same
// plan and options give the same script.
func JobScript(pl *Plan, o JobScriptOptions) ([]byte, JobEstimate, error) {
	est := JobEstimate{Sections: len(pl.Sections), CPUs: max(o.CPUs, 1), FixedS: o.Cost.Fixed, PerMBS: o.Cost.PerMB}
	costs := pl.Costs()
	for _, c := range costs {
		est.Bytes += c
		est.LargestB = max(est.LargestB, c)
		est.CoreS += o.Cost.Seconds(c)
	}
	target := o.TaskTargetS
	if target <= 0 {
		target = 1800
	}
	est.Tasks = o.Tasks
	if est.Tasks <= 0 {
		est.Tasks = int(math.Ceil(est.CoreS / float64(est.CPUs) / target))
		est.Tasks = max(1, min(est.Tasks, len(pl.Sections), MaxShards))
	}
	if est.Tasks > MaxShards {
		return nil, est, fmt.Errorf("%d tasks: at most %d", est.Tasks, MaxShards)
	}
	// The dearest task, as AssignShards shares the sections.
	assign := AssignShards(costs, shardOverhead, est.Tasks)
	load := make([]float64, est.Tasks)
	for i, k := range assign {
		load[k] += o.Cost.Seconds(costs[i])
	}
	for _, l := range load {
		est.DearestS = max(est.DearestS, l)
	}
	est.TimeS = o.TimeS
	if est.TimeS <= 0 {
		est.TimeS = max(timeFloorS, roundUp(est.DearestS/float64(est.CPUs)*timeMargin, 60))
	}
	est.MemMiB = o.MemMiB
	if est.MemMiB <= 0 {
		est.MemMiB = roundUp(o.Cost.MemoryMiB(est.CPUs, len(pl.Stages), est.LargestB)*memMargin, 64)
	}
	// The merge reads and links every file: a fraction of the run's time.
	est.MergeTimeS = max(mergeFloorS, roundUp(est.CoreS*0.05*timeMargin, 60))
	est.MergeMiB = max(mergeFloorMiB, roundUp(o.Cost.BaseMiB*memMargin, 64))

	name := o.JobName
	if name == "" {
		name = "foilwright-" + pl.Pipeline.Name
	}
	var b bytes.Buffer
	p := func(format string, args ...any) { fmt.Fprintf(&b, format, args...) }
	p("#!/bin/bash\n")
	p("# Slurm job script of the foilwright pipeline %s, written by `foilwright jobscript`.\n", pl.Pipeline.Name)
	p("#\n")
	p("#   bash %s     submits the array and, once every task succeeded, the merge\n", "THIS_SCRIPT")
	p("#   sbatch %s   submits only the array; then: foilwright merge %s\n", "THIS_SCRIPT", o.Folder)
	p("#\n")
	p("# Each task runs one shard of the %d section(s) (%s of input), balanced by\n", est.Sections, sizeText(est.Bytes))
	p("# input size, into the run folder's shards/K-of-N; a requeued or resubmitted\n")
	p("# task keeps what its shard finished and makes only the rest (--resume).\n")
	p("# Estimates from %s:\n", o.Cost.Source)
	p("# a section takes %.3g s + %.3g s per MB of input on one core; %.0f core-seconds\n", o.Cost.Fixed, o.Cost.PerMB, est.CoreS)
	p("# in all, %.0f for the dearest task;\n", est.DearestS)
	p("# time asked %s per task (%.0fx the estimate on %d CPU(s), at least %s),\n", SlurmTime(est.TimeS), timeMargin, est.CPUs, SlurmTime(timeFloorS))
	p("# memory %d MiB (%.1fx the estimate for %d worker(s) and %d stage process(es) each).\n", est.MemMiB, memMargin, est.CPUs, len(pl.Stages))
	p("#SBATCH --job-name=%s\n", name)
	p("#SBATCH --array=0-%d\n", est.Tasks-1)
	p("#SBATCH --ntasks=1\n")
	p("#SBATCH --cpus-per-task=%d\n", est.CPUs)
	p("#SBATCH --time=%s\n", SlurmTime(est.TimeS))
	p("#SBATCH --mem=%dM\n", est.MemMiB)
	if o.Partition != "" {
		p("#SBATCH --partition=%s\n", o.Partition)
	}
	if o.Account != "" {
		p("#SBATCH --account=%s\n", o.Account)
	}
	p("#SBATCH --requeue\n")
	p("#SBATCH --open-mode=append\n")
	p("#SBATCH --output=%%x-%%A_%%a.out\n")
	p("set -euo pipefail\n")
	p("FOILWRIGHT=%s\n", shellQuote(o.Foilwright))
	p("PIPELINE=%s\n", shellQuote(o.Pipeline))
	p("RUN=%s\n", shellQuote(o.Folder))
	p("if [ -z \"${SLURM_JOB_ID:-}\" ]; then\n")
	p("  # Not in a job: submit the array, then the merge after it.\n")
	p("  array=$(sbatch --parsable \"$0\")\n")
	p("  array=${array%%%%;*}\n")
	var extra string
	if o.Partition != "" {
		extra += " --partition=" + shellQuote(o.Partition)
	}
	if o.Account != "" {
		extra += " --account=" + shellQuote(o.Account)
	}
	p("  merge=$(sbatch --parsable --dependency=afterok:\"$array\" --job-name=%s --ntasks=1 --cpus-per-task=1 --time=%s --mem=%dM%s --output=%%x-%%j.out --wrap=\"exec $(printf %%q \"$FOILWRIGHT\") merge $(printf %%q \"$RUN\")\")\n",
		shellQuote(name+"-merge"), SlurmTime(est.MergeTimeS), est.MergeMiB, extra)
	p("  echo \"submitted the array as job $array and the merge as job ${merge%%%%;*}\"\n")
	p("  exit 0\n")
	p("fi\n")
	p("status=0\n")
	p("\"$FOILWRIGHT\" run \"$PIPELINE\" -o \"$RUN\" --shard auto --resume --jobs \"${SLURM_CPUS_PER_TASK:-1}\" || status=$?\n")
	p("# 3: the shard is made and a section is out of tolerance against its design;\n")
	p("# the task succeeded (the merge runs after it) and the merge reports the verdicts.\n")
	p("if [ \"$status\" = 3 ]; then exit 0; fi\n")
	p("exit \"$status\"\n")
	return b.Bytes(), est, nil
}

// SlurmTime writes seconds as a Slurm time limit: [D-]HH:MM:SS.
func SlurmTime(s int) string {
	d, h, m, sec := s/86400, s/3600%24, s/60%60, s%60
	if d > 0 {
		return fmt.Sprintf("%d-%02d:%02d:%02d", d, h, m, sec)
	}
	return fmt.Sprintf("%02d:%02d:%02d", h, m, sec)
}

// ParseSlurmTime reads a time limit as Slurm does: MM, MM:SS, HH:MM:SS,
// D-HH, D-HH:MM or D-HH:MM:SS.
func ParseSlurmTime(t string) (int, error) {
	bad := fmt.Errorf("time %q: want minutes, MM:SS, HH:MM:SS or D-HH:MM:SS", t)
	days := 0
	rest := t
	if d, r, ok := strings.Cut(t, "-"); ok {
		if _, err := fmt.Sscanf(d, "%d", &days); err != nil || days < 0 {
			return 0, bad
		}
		rest = r
	}
	parts := strings.Split(rest, ":")
	n := make([]int, len(parts))
	for i, s := range parts {
		if s == "" || strings.Trim(s, "0123456789") != "" {
			return 0, bad
		}
		fmt.Sscanf(s, "%d", &n[i])
	}
	var s int
	switch {
	case rest != t && len(n) == 1: // D-HH
		s = n[0] * 3600
	case rest != t && len(n) == 2: // D-HH:MM
		s = n[0]*3600 + n[1]*60
	case len(n) == 1: // MM
		s = n[0] * 60
	case len(n) == 2 && rest == t: // MM:SS
		s = n[0]*60 + n[1]
	case len(n) == 3:
		s = n[0]*3600 + n[1]*60 + n[2]
	default:
		return 0, bad
	}
	s += days * 86400
	if s <= 0 {
		return 0, bad
	}
	return s, nil
}

func roundUp(x float64, step int) int {
	return int(math.Ceil(x/float64(step))) * step
}

func sizeText(b int64) string {
	switch {
	case b >= 1<<30:
		return fmt.Sprintf("%.1f GiB", float64(b)/(1<<30))
	case b >= 1<<20:
		return fmt.Sprintf("%.1f MiB", float64(b)/(1<<20))
	}
	return fmt.Sprintf("%.0f KiB", float64(b)/(1<<10))
}

// shellQuote quotes s for a POSIX shell.
func shellQuote(s string) string {
	return "'" + strings.ReplaceAll(s, "'", `'\''`) + "'"
}
