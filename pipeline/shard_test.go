package pipeline

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"testing"
)

func TestParseShard(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want Shard
		err  string
	}{
		{"0/4", Shard{0, 4}, ""},
		{" 3 / 4 ", Shard{3, 4}, ""},
		{"0/1", Shard{0, 1}, ""},
		{"4/4", Shard{}, "K must be 0 to 3"},
		{"-1/4", Shard{}, "K must be 0 to 3"},
		{"1/0", Shard{}, "the count must be 1"},
		{"1", Shard{}, "want K/N"},
		{"a/b", Shard{}, "whole numbers"},
	} {
		got, err := ParseShard(tc.in)
		if tc.err != "" {
			if err == nil || !strings.Contains(err.Error(), tc.err) {
				t.Errorf("ParseShard(%q) = %v, %v; want an error saying %q", tc.in, got, err, tc.err)
			}
			continue
		}
		if err != nil || got != tc.want {
			t.Errorf("ParseShard(%q) = %v, %v; want %v", tc.in, got, err, tc.want)
		}
	}
}

func TestShardFromEnv(t *testing.T) {
	env := func(kv ...string) func(string) string {
		m := map[string]string{}
		for i := 0; i+1 < len(kv); i += 2 {
			m[kv[i]] = kv[i+1]
		}
		return func(k string) string { return m[k] }
	}
	for _, tc := range []struct {
		name  string
		env   func(string) string
		count int
		want  Shard
		err   string
	}{
		{"slurm count", env("SLURM_ARRAY_TASK_ID", "2", "SLURM_ARRAY_TASK_COUNT", "4", "SLURM_ARRAY_TASK_MIN", "0", "SLURM_ARRAY_TASK_MAX", "3"), 0, Shard{2, 4}, ""},
		{"slurm from 1", env("SLURM_ARRAY_TASK_ID", "1", "SLURM_ARRAY_TASK_MIN", "1", "SLURM_ARRAY_TASK_MAX", "4"), 0, Shard{0, 4}, ""},
		{"slurm count given", env("SLURM_ARRAY_TASK_ID", "3"), 8, Shard{3, 8}, ""},
		{"slurm no count", env("SLURM_ARRAY_TASK_ID", "3"), 0, Shard{}, "give the count"},
		{"slurm gaps", env("SLURM_ARRAY_TASK_ID", "2", "SLURM_ARRAY_TASK_COUNT", "3", "SLURM_ARRAY_TASK_MIN", "0", "SLURM_ARRAY_TASK_MAX", "4"), 0, Shard{}, "not consecutive"},
		{"slurm disagrees", env("SLURM_ARRAY_TASK_ID", "1", "SLURM_ARRAY_TASK_COUNT", "4"), 3, Shard{}, "the command line says 3"},
		{"slurm garbage", env("SLURM_ARRAY_TASK_ID", "x"), 0, Shard{}, "not a whole number"},
		{"kubernetes", env("JOB_COMPLETION_INDEX", "5"), 6, Shard{5, 6}, ""},
		{"kubernetes no count", env("JOB_COMPLETION_INDEX", "5"), 0, Shard{}, "give the count"},
		{"kubernetes past count", env("JOB_COMPLETION_INDEX", "6"), 6, Shard{}, "K must be 0 to 5"},
	} {
		got, err := ShardFromEnv(tc.env, tc.count)
		if tc.err != "" {
			if err == nil || !strings.Contains(err.Error(), tc.err) {
				t.Errorf("%s: got %v, %v; want an error saying %q", tc.name, got, err, tc.err)
			}
			continue
		}
		if err != nil || got != tc.want {
			t.Errorf("%s: got %v, %v; want %v", tc.name, got, err, tc.want)
		}
	}
	if _, err := ShardFromEnv(env(), 0); !errors.Is(err, ErrNoShardEnv) {
		t.Errorf("no array task: %v, want ErrNoShardEnv", err)
	}
}

// TestAssignShardsBalances checks the greedy assignment: every section
// goes to one shard, the same costs give the same assignment, and no
// shard carries more than the lightest plus the dearest section (the
// bound of assigning the dearest first, each to the least loaded).
func TestAssignShardsBalances(t *testing.T) {
	costs := []int64{900, 30, 30, 500, 40, 700, 20, 20, 400, 100, 80, 60, 30, 1200, 10}
	for _, n := range []int{1, 2, 3, 4, 7, 20} {
		a := AssignShards(costs, 5, n)
		if b := AssignShards(costs, 5, n); !slices.Equal(a, b) {
			t.Fatalf("%d shards: not deterministic", n)
		}
		load := make([]int64, n)
		for i, k := range a {
			if k < 0 || k >= n {
				t.Fatalf("section %d in shard %d of %d", i, k, n)
			}
			load[k] += costs[i] + 5
		}
		lo, hi := slices.Min(load), slices.Max(load)
		if n <= len(costs) && hi-lo > slices.Max(costs)+5 {
			t.Errorf("%d shards: loads %v spread more than the dearest section", n, load)
		}
	}
}

// runShards runs every shard of the pipeline at path into folder, each
// in turn, with its own stage runners.
func runShards(t *testing.T, path, folder string, n int, reg *fakeRegistry) {
	t.Helper()
	for k := range n {
		s := Shard{k, n}
		if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Folder: folder, Shard: &s, Jobs: 2, Preparer: fakePrep{}, NewRunner: reg.New}); err != nil {
			t.Fatalf("shard %s: %v", s, err)
		}
	}
}

// sameRun checks that folder b holds the same files as folder a and the
// same manifest but for its timings.
func assertSameRun(t *testing.T, a, b string) {
	t.Helper()
	ta, tb := readTree(t, a), readTree(t, b)
	ma, mb := ta[ManifestName], tb[ManifestName]
	delete(ta, ManifestName)
	delete(tb, ManifestName)
	if !reflect.DeepEqual(ta, tb) {
		var names []string
		for p := range ta {
			if !bytes.Equal(ta[p], tb[p]) {
				names = append(names, p)
			}
		}
		for p := range tb {
			if _, ok := ta[p]; !ok {
				names = append(names, p+" (only in "+b+")")
			}
		}
		t.Fatalf("the folders differ: %q", names)
	}
	cut := func(m []byte) []byte { return m[:bytes.Index(m, []byte(`"timings"`))] }
	if ma == nil || mb == nil || !bytes.Equal(cut(ma), cut(mb)) {
		t.Fatalf("the manifests differ before their timings:\n%s\n----\n%s", ma, mb)
	}
}

func TestShardsMergeIntoTheOneMachineRun(t *testing.T) {
	path := setup(t, rotorPipeline, rotorFiles)
	dir := filepath.Dir(path)
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Folder: filepath.Join(dir, "single"), Jobs: 2, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	for _, n := range []int{1, 3, 6} { // 6 shards of 4 sections: two make nothing
		folder := filepath.Join(dir, "sharded-"+string(rune('0'+n)))
		runShards(t, path, folder, n, &fakeRegistry{})
		parts, _ := os.ReadDir(filepath.Join(folder, ShardsDir))
		if len(parts) < n {
			t.Fatalf("%d shards left %d parts", n, len(parts))
		}
		sum, err := Merge(context.Background(), folder, MergeOptions{Parse: ParseOptions{Known: fakeStages}})
		if err != nil {
			t.Fatalf("%d shards: %v", n, err)
		}
		if len(sum.Sections) != 4 || sum.Err() != nil {
			t.Errorf("%d shards: summary %+v", n, sum)
		}
		assertSameRun(t, filepath.Join(dir, "single"), folder)
		m, err := ReadManifest(filepath.Join(folder, ManifestName))
		if err != nil || m.Timings.Shards != n {
			t.Errorf("%d shards: timings %+v, %v", n, m.Timings, err)
		}
		rep, err := Verify(context.Background(), filepath.Join(folder, ManifestName), verifyOpts(t, &fakeRegistry{}))
		if err != nil || !rep.OK() {
			t.Errorf("%d shards: verify %+v, %v", n, rep, err)
		}
	}
}

func TestShardPartHoldsOnlyItsSections(t *testing.T) {
	path := setup(t, rotorPipeline, rotorFiles)
	folder := filepath.Join(filepath.Dir(path), "run")
	s := Shard{1, 2}
	pl := loadPlan(t, path)
	sum, err := Run(context.Background(), pl, RunOptions{Folder: folder, Shard: &s, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if err != nil {
		t.Fatal(err)
	}
	want := pl.ShardSections(s)
	if len(sum.Sections) != len(want) || len(want) == 0 || len(want) == len(pl.Sections) {
		t.Fatalf("shard %s made %d sections, its share is %d of %d", s, len(sum.Sections), len(want), len(pl.Sections))
	}
	part := ShardFolder(folder, s)
	m, err := ReadManifest(filepath.Join(part, ManifestName))
	if err != nil {
		t.Fatal(err)
	}
	if m.Shard == nil || m.Shard.Shard != s || m.Shard.Plan != pl.Digest() || m.Shard.Sections != len(pl.Sections) {
		t.Errorf("partial manifest's shard %+v", m.Shard)
	}
	for k, i := range want {
		if m.Sections[k].Name != pl.Sections[i].Name {
			t.Errorf("section %d is %s, want %s", k, m.Sections[k].Name, pl.Sections[i].Name)
		}
	}
	// The pipeline file is recorded relative to the run folder the shards
	// make, not to the part.
	if m.Pipeline.File != "../pipeline.json" {
		t.Errorf("pipeline file %q", m.Pipeline.File)
	}
	if _, err := os.Stat(journalPath(part)); err != nil {
		t.Errorf("the part keeps no journal: %v", err)
	}
	if _, err := Verify(context.Background(), filepath.Join(part, ManifestName), verifyOpts(t, &fakeRegistry{})); !errors.Is(err, ErrNotManifest) || !strings.Contains(err.Error(), "merge") {
		t.Errorf("verify of a part: %v", err)
	}
	entries, _ := os.ReadDir(folder)
	if len(entries) != 1 || entries[0].Name() != ShardsDir {
		t.Errorf("the run folder holds %v besides the shards", entries)
	}
}

func TestMergeRefuses(t *testing.T) {
	merge := func(folder string) error {
		_, err := Merge(context.Background(), folder, MergeOptions{Parse: ParseOptions{Known: fakeStages}})
		return err
	}
	path := setup(t, rotorPipeline, rotorFiles)
	dir := filepath.Dir(path)
	run := func(path, folder string, s Shard, reg *fakeRegistry) {
		t.Helper()
		if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Folder: folder, Shard: &s, Preparer: fakePrep{}, NewRunner: reg.New}); err != nil {
			t.Fatal(err)
		}
	}
	expect := func(name string, err error, words ...string) {
		t.Helper()
		if !errors.Is(err, ErrNotMergeable) {
			t.Errorf("%s: %v, want ErrNotMergeable", name, err)
			return
		}
		for _, w := range words {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s: %q does not say %q", name, err, w)
			}
		}
	}

	// No shards at all, and a shard missing.
	expect("no shards", merge(filepath.Join(dir, "none")), "holds no shards")
	folder := filepath.Join(dir, "missing")
	run(path, folder, Shard{0, 3}, &fakeRegistry{})
	run(path, folder, Shard{2, 3}, &fakeRegistry{})
	expect("missing", merge(folder), "1/3", "written nothing")

	// A shard of another pipeline file: the same file with other stage
	// parameters, into the same folder.
	other := filepath.Join(dir, "other.json")
	os.WriteFile(other, []byte(strings.Replace(rotorPipeline, `"factor": 2`, `"factor": 3`, 1)), 0o644)
	folder = filepath.Join(dir, "mixed")
	run(path, folder, Shard{0, 2}, &fakeRegistry{})
	run(other, folder, Shard{1, 2}, &fakeRegistry{})
	expect("another pipeline", merge(folder), "shard 0/2", "shard 1/2", "sha256")

	// A shard whose stage is another version.
	folder = filepath.Join(dir, "versions")
	run(path, folder, Shard{0, 2}, &fakeRegistry{})
	run(path, folder, Shard{1, 2}, &fakeRegistry{version: "2.0"})
	expect("another stage", merge(folder), "stage area", "1.0", "2.0")

	// A shard still running holds its lock.
	folder = filepath.Join(dir, "running")
	runShards(t, path, folder, 2, &fakeRegistry{})
	lock, err := lockFolder(filepath.Join(folder, ShardsDir, ".1-of-2.lock"))
	if err != nil {
		t.Fatal(err)
	}
	expect("running", merge(folder), "shard 1/2 is still running")
	lock.unlock()

	// A shard cancelled before it finished its share.
	folder = filepath.Join(dir, "cancelled")
	run(path, folder, Shard{0, 2}, &fakeRegistry{})
	ctx, cancel := context.WithCancel(context.Background())
	s := Shard{1, 2}
	_, err = Run(ctx, loadPlan(t, path), RunOptions{Folder: folder, Shard: &s, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New,
		Done: func(SectionReport) { cancel() }})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled shard: %v", err)
	}
	expect("unfinished", merge(folder), "not made yet", "1/2")

	// The inputs changed after the shards ran: the plan differs.
	folder = filepath.Join(dir, "changed")
	runShards(t, path, folder, 2, &fakeRegistry{})
	os.WriteFile(filepath.Join(dir, "in", "probe-e.dat"), []byte(thinPoints), 0o644)
	expect("changed inputs", merge(folder), "inputs changed")
	os.Remove(filepath.Join(dir, "in", "probe-e.dat"))

	// A file of a part that is not what the shard wrote.
	folder = filepath.Join(dir, "tampered")
	runShards(t, path, folder, 2, &fakeRegistry{})
	part := ShardFolder(folder, Shard{0, 2})
	m, _ := ReadManifest(filepath.Join(part, ManifestName))
	var victim string
	for p := range m.Outputs {
		victim = p
		break
	}
	os.WriteFile(filepath.Join(part, filepath.FromSlash(victim)), []byte("changed"), 0o644)
	expect("tampered", merge(folder), victim, "not what the shard wrote")

	// Nothing refused was touched: the parts are all still there.
	for _, f := range []string{"missing", "mixed", "versions", "running", "cancelled", "tampered"} {
		if _, err := os.Stat(filepath.Join(dir, f, ShardsDir)); err != nil {
			t.Errorf("%s: %v", f, err)
		}
		if _, err := os.Stat(filepath.Join(dir, f, ManifestName)); err == nil {
			t.Errorf("%s: a manifest was written", f)
		}
	}
}

// TestAssembledManifestIsTheIndentedManifest: the manifest assembled from
// the journal is the very bytes json.MarshalIndent gives for the whole
// manifest in memory, as it was written before the journal, for a
// complete run, an interrupted one and a shard's part.
func TestAssembledManifestIsTheIndentedManifest(t *testing.T) {
	check := func(name, path string) {
		t.Helper()
		data, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		var m Manifest
		if err := json.Unmarshal(data, &m); err != nil {
			t.Fatal(err)
		}
		want, _ := json.MarshalIndent(&m, "", "  ")
		want = append(want, '\n')
		if !bytes.Equal(data, want) {
			t.Errorf("%s: the assembled manifest is not the indented one:\n%s\n----\n%s", name, data, want)
		}
	}
	_, manifest := runRotor(t)
	check("complete", manifest)

	path := setup(t, rotorPipeline, rotorFiles)
	ctx, cancel := context.WithCancel(context.Background())
	sum, err := Run(ctx, loadPlan(t, path), RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New, Done: func(SectionReport) { cancel() }})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled: %v", err)
	}
	check("interrupted", sum.Manifest)
	m, _ := ReadManifest(sum.Manifest)
	if !m.Interrupted || len(m.Sections) != 4 || m.Sections[3].Status != StatusCancelled {
		t.Errorf("interrupted manifest %+v", m.Sections)
	}

	s := Shard{0, 2}
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Folder: filepath.Join(filepath.Dir(path), "part"), Shard: &s, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	check("shard", filepath.Join(ShardFolder(filepath.Join(filepath.Dir(path), "part"), s), ManifestName))
}
