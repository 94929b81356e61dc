package pipeline

import (
	"cmp"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
)

// A Shard is one part of a run split across several processes or
// machines (the tasks of a job array): shard Index of Count, Index from 0.
// Every shard of a run plans the same sections and assigns them the same
// way (AssignShards), runs only its own into its own part of the run
// folder (ShardFolder), and Merge combines the parts.
type Shard struct {
	Index int `json:"index"`
	Count int `json:"count"`
}

func (s Shard) String() string { return fmt.Sprintf("%d/%d", s.Index, s.Count) }

// dir is the name of the shard's part under the run folder's shards/.
func (s Shard) dir() string { return fmt.Sprintf("%d-of-%d", s.Index, s.Count) }

// MaxShards is the largest shard count, the largest Slurm job array
// (common practice: MaxArraySize is at most 4 000 001).
const MaxShards = 4_000_000

// ShardsDir is the folder of the shards' parts in a run folder, until
// Merge replaces the run folder by the merged run.
const ShardsDir = "shards"

// ShardFolder returns the folder shard s writes under the run folder.
func ShardFolder(runFolder string, s Shard) string {
	return filepath.Join(runFolder, ShardsDir, s.dir())
}

// A ShardRecord is the shard a partial manifest is of, and the plan it
// was cut from.
type ShardRecord struct {
	Shard
	Plan     string `json:"plan"`          // Plan.Digest
	Sections int    `json:"plan_sections"` // sections in the plan, every shard's
}

// ParseShard reads "K/N" (K from 0 to N-1).
func ParseShard(text string) (Shard, error) {
	k, n, ok := strings.Cut(strings.TrimSpace(text), "/")
	if !ok {
		return Shard{}, fmt.Errorf("shard %q: want K/N, K from 0 to N-1 (e.g. 0/4)", text)
	}
	ki, err1 := strconv.Atoi(strings.TrimSpace(k))
	ni, err2 := strconv.Atoi(strings.TrimSpace(n))
	if err1 != nil || err2 != nil {
		return Shard{}, fmt.Errorf("shard %q: want K/N with whole numbers, K from 0 to N-1", text)
	}
	s := Shard{Index: ki, Count: ni}
	return s, s.check()
}

func (s Shard) check() error {
	if s.Count < 1 || s.Count > MaxShards {
		return fmt.Errorf("shard %s: the count must be 1 to %d", s, MaxShards)
	}
	if s.Index < 0 || s.Index >= s.Count {
		return fmt.Errorf("shard %s: K must be 0 to %d", s, s.Count-1)
	}
	return nil
}

// ErrNoShardEnv means the environment names no shard: the process is not
// a task of a job array.
var ErrNoShardEnv = errors.New("no job-array task in the environment")

// ShardFromEnv reads the shard from the environment of a job-array task:
// Slurm's SLURM_ARRAY_TASK_ID with SLURM_ARRAY_TASK_COUNT, or with
// SLURM_ARRAY_TASK_MIN and SLURM_ARRAY_TASK_MAX (the array's indexes
// must be consecutive: --array=0-3 or 1-4, not 0,2,4); or a Kubernetes
// indexed Job's JOB_COMPLETION_INDEX, whose count the environment does not
// give: count is used for it (and may be given for Slurm too, which must
// then agree). getenv is os.Getenv in use.
func ShardFromEnv(getenv func(string) string, count int) (Shard, error) {
	num := func(name string) (int, bool, error) {
		v := strings.TrimSpace(getenv(name))
		if v == "" {
			return 0, false, nil
		}
		n, err := strconv.Atoi(v)
		if err != nil {
			return 0, false, fmt.Errorf("%s=%q is not a whole number", name, v)
		}
		return n, true, nil
	}
	id, ok, err := num("SLURM_ARRAY_TASK_ID")
	if err != nil {
		return Shard{}, err
	}
	if ok {
		lo, haveLo, err1 := num("SLURM_ARRAY_TASK_MIN")
		hi, haveHi, err2 := num("SLURM_ARRAY_TASK_MAX")
		n, haveN, err3 := num("SLURM_ARRAY_TASK_COUNT")
		if err := errors.Join(err1, err2, err3); err != nil {
			return Shard{}, err
		}
		if !haveLo {
			lo = 0
		}
		switch {
		case haveN:
		case haveHi:
			n = hi - lo + 1
		case count > 0:
			n = count
		default:
			return Shard{}, errors.New("SLURM_ARRAY_TASK_ID is set but neither SLURM_ARRAY_TASK_COUNT nor SLURM_ARRAY_TASK_MAX: give the count (--shard auto/N)")
		}
		if haveHi && hi-lo+1 != n {
			return Shard{}, fmt.Errorf("the job array's indexes %d to %d are not consecutive (%d tasks): submit it as --array=%d-%d", lo, hi, n, lo, lo+n-1)
		}
		if count > 0 && count != n {
			return Shard{}, fmt.Errorf("the job array has %d tasks, the command line says %d", n, count)
		}
		s := Shard{Index: id - lo, Count: n}
		if err := s.check(); err != nil {
			return Shard{}, fmt.Errorf("SLURM_ARRAY_TASK_ID=%d: %w", id, err)
		}
		return s, nil
	}
	id, ok, err = num("JOB_COMPLETION_INDEX")
	if err != nil {
		return Shard{}, err
	}
	if ok {
		if count < 1 {
			return Shard{}, errors.New("JOB_COMPLETION_INDEX is set but the environment does not give the Job's completions: give the count (--shard auto/N)")
		}
		s := Shard{Index: id, Count: count}
		if err := s.check(); err != nil {
			return Shard{}, fmt.Errorf("JOB_COMPLETION_INDEX=%d: %w", id, err)
		}
		return s, nil
	}
	return Shard{}, ErrNoShardEnv
}

// SectionCost is the expected cost of making a section, in input bytes:
// the points of a section (what the geometry chain's time and memory grow
// with) are not known before its files are read, and bytes stand for them
// (a point is one line of a text file, three of a mesh's vertices). A
// section whose files cannot be read costs 0 and fails wherever it runs.
func (pl *Plan) SectionCost(i int) int64 {
	var n int64
	for _, f := range pl.Sections[i].Files {
		if st, err := os.Stat(pl.Pipeline.abs(f)); err == nil {
			n += st.Size()
		}
	}
	return n
}

// AssignShards gives each section of the plan to one of count shards,
// balancing their expected cost: the sections, dearest first (equal
// costs in plan order), each go to the shard with the least cost so far
// (the lowest index among equals). A section counts its cost plus
// overhead, what the stages cost whatever the size. The same plan and
// costs give the same assignment in every process. It returns the shard
// of each section.
func AssignShards(costs []int64, overhead int64, count int) []int {
	order := make([]int, len(costs))
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return cmp.Compare(costs[b], costs[a]) })
	load := make([]int64, count)
	shard := make([]int, len(costs))
	for _, i := range order {
		best := 0
		for k := 1; k < count; k++ {
			if load[k] < load[best] {
				best = k
			}
		}
		shard[i] = best
		load[best] += costs[i] + overhead
	}
	return shard
}

// shardOverhead is the cost of a section beside its input bytes, in
// bytes: what preparing and the stages cost whatever the size of the
// input, measured on the demo batch (about 20 ms on the development
// machine, which prepares some 2 MB of text a second). It keeps many
// small sections from piling onto one shard.
const shardOverhead = 40_000

// Costs returns the expected cost of every section of the plan.
func (pl *Plan) Costs() []int64 {
	c := make([]int64, len(pl.Sections))
	for i := range c {
		c[i] = pl.SectionCost(i)
	}
	return c
}

// ShardSections returns the plan indexes of the sections shard s makes,
// in plan order.
func (pl *Plan) ShardSections(s Shard) []int {
	assign := AssignShards(pl.Costs(), shardOverhead, s.Count)
	var idx []int
	for i, k := range assign {
		if k == s.Index {
			idx = append(idx, i)
		}
	}
	return idx
}

// Digest is the sha256 of what the plan makes: the pipeline file's
// digest and every section's name, files and station, in plan order.
// Shards of one run have the same digest; a shard planned from other
// files (a glob that matched another set) has another.
func (pl *Plan) Digest() string {
	h := sha256.New()
	enc := json.NewEncoder(h)
	enc.Encode(pl.Pipeline.SHA256)
	for _, s := range pl.Sections {
		enc.Encode([]any{s.Name, s.Files, s.Station})
	}
	return hex.EncodeToString(h.Sum(nil))
}
