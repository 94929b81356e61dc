package main

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strings"
	"testing"
	"time"
)

// TestSlurmCluster runs the blade batch (internal/demogen -batch: 8
// printed blades × 5 stations, invented data) on a real Slurm cluster,
// as issue 13 asks, against a run of the same pipeline on this machine:
//
//  1. the job script of `foilwright jobscript`, run with bash, submits
//     a 4-task array and the merge as a dependent job; the merged run
//     holds the same files, byte for byte, and the same manifest (timings
//     aside) as the single-machine run;
//  2. one task of a second array is cancelled (scancel) once its shard
//     has finished a section, then requeued: the requeued task keeps what
//     its shard finished and makes only the rest (its journal says which
//     attempt made each section), and the merge is again the same run;
//  3. a third array whose pipeline file is edited before its last task
//     runs (the task held, then released) does not merge: merge names the
//     pipeline file that differs and exits 2, leaving the shards as they
//     were.
//
// It needs a running cluster whose client commands work with the
// slurm.conf that FOILWRIGHT_SLURM_CONF names (scripts/slurm-cluster.sh
// starts one; .ci/run does it as root), and the go command to build
// foilwright. Skipped otherwise, so that `go test ./...` needs nothing.
func TestSlurmCluster(t *testing.T) {
	conf := os.Getenv("FOILWRIGHT_SLURM_CONF")
	if conf == "" {
		t.Skip("needs a Slurm cluster: scripts/slurm-cluster.sh start DIR, then FOILWRIGHT_SLURM_CONF=DIR/slurm.conf")
	}
	for _, c := range []string{"sbatch", "scancel", "scontrol", "squeue", "go"} {
		if _, err := exec.LookPath(c); err != nil {
			t.Fatalf("%s: %v", c, err)
		}
	}
	dir := t.TempDir()
	bin := filepath.Join(dir, "foilwright")
	if out, err := exec.Command("go", "build", "-o", bin, ".").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	if out, err := exec.Command("go", "run", "../../internal/demogen", "-batch", filepath.Join(dir, "batch"), "-blades", "8").CombinedOutput(); err != nil {
		t.Fatalf("demogen: %v\n%s", err, out)
	}
	// The tasks and the run here get the same environment (the stages'
	// part of it is recorded in the manifest), a TMPDIR of the test's.
	tmp := filepath.Join(dir, "tmp")
	os.Mkdir(tmp, 0o755)
	env := append(os.Environ(), "SLURM_CONF="+conf, "TMPDIR="+tmp)
	env = slices.DeleteFunc(env, func(v string) bool { return strings.HasPrefix(v, "SLURM_JOB_ID=") || strings.HasPrefix(v, "GORACE=") })
	sh := func(name string, args ...string) (string, error) {
		cmd := exec.Command(name, args...)
		cmd.Dir, cmd.Env = dir, env
		out, err := cmd.CombinedOutput()
		return string(out), err
	}
	must := func(name string, args ...string) string {
		t.Helper()
		out, err := sh(name, args...)
		if err != nil {
			t.Fatalf("%s %s: %v\n%s", name, strings.Join(args, " "), err, out)
		}
		return out
	}
	pipe := filepath.Join(dir, "batch", "pipeline.json")
	start := time.Now()
	must(bin, "run", pipe, "-o", filepath.Join(dir, "single"), "--jobs", "2", "-q")
	t.Logf("single machine: 40 sections in %.1f s", time.Since(start).Seconds())

	// 1. The generated script, run with bash: the array, then the merge.
	script := must(bin, "jobscript", pipe, "--tasks", "4", "--run-folder", filepath.Join(dir, "arr"), "-o", "arr.sbatch")
	body, _ := os.ReadFile(filepath.Join(dir, "arr.sbatch"))
	if !strings.Contains(string(body), "#SBATCH --array=0-3\n") {
		t.Fatalf("job script without the 4-task array:\n%s\n%s", script, body)
	}
	start = time.Now()
	out := must("bash", "arr.sbatch")
	m := regexp.MustCompile(`array as job (\d+) and the merge as job (\d+)`).FindStringSubmatch(out)
	if m == nil {
		t.Fatalf("bash arr.sbatch: %s", out)
	}
	array, merge := m[1], m[2]
	waitJobs(t, sh, array, merge)
	for task, state := range jobStates(t, sh, array) {
		if state != "COMPLETED" {
			t.Errorf("task %s of the array: %s\n%s", task, state, taskLog(dir, array, task))
		}
	}
	if st := jobStates(t, sh, merge); st[""] != "COMPLETED" {
		t.Fatalf("the merge job: %v\n%s", st, readAll(filepath.Join(dir, "foilwright-blade-batch-merge-"+merge+".out")))
	}
	t.Logf("4-task array and merge: %.1f s", time.Since(start).Seconds())
	sameRunFolder(t, filepath.Join(dir, "single"), filepath.Join(dir, "arr"))

	// 2. scancel one task midway, requeue it: it finishes its share.
	must(bin, "jobscript", pipe, "--tasks", "4", "--run-folder", filepath.Join(dir, "arr2"), "-o", "arr2.sbatch", "-q")
	array = strings.SplitN(strings.TrimSpace(must("sbatch", "--parsable", "arr2.sbatch")), ";", 2)[0]
	part := filepath.Join(dir, "arr2", "shards", "0-of-4")
	staging := filepath.Join(dir, "arr2", "shards", ".0-of-4.new-*", "journal.jsonl")
	deadline := time.Now().Add(2 * time.Minute)
	for {
		if js, _ := filepath.Glob(staging); len(js) == 1 && len(journalNames(t, js[0], 0)) > 0 {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("task 0 of array %s finished no section in 2 minutes\n%s", array, taskLog(dir, array, "0"))
		}
		time.Sleep(10 * time.Millisecond)
	}
	must("scancel", array+"_0")
	waitState(t, sh, array+"_0", "CANCELLED")
	// What the cancelled task finished: its committed part (it ended on
	// SIGTERM), or its staging folder (had it been killed).
	j := filepath.Join(part, "journal.jsonl")
	if _, err := os.Stat(j); err != nil {
		js, _ := filepath.Glob(staging)
		if len(js) != 1 {
			t.Fatalf("no journal of the cancelled task: %v\n%s", err, taskLog(dir, array, "0"))
		}
		j = js[0]
	}
	done := journalNames(t, j, 0)
	share := countShare(t, bin, pipe, sh)
	if len(done) == 0 || len(done) >= share {
		t.Fatalf("the task was cancelled after %d of its %d sections: not midway", len(done), share)
	}
	// A requeued job is held back a while (Slurm's begin time); let it go
	// now.
	must("scontrol", "requeue", array+"_0")
	must("scontrol", "update", "JobId="+array+"_0", "StartTime=now")
	waitJobs(t, sh, array)
	for task, state := range jobStates(t, sh, array) {
		if state != "COMPLETED" {
			t.Errorf("task %s of the second array: %s\n%s", task, state, taskLog(dir, array, task))
		}
	}
	first, second := journalNames(t, filepath.Join(part, "journal.jsonl"), 1), journalNames(t, filepath.Join(part, "journal.jsonl"), 2)
	sort.Strings(done)
	if !slices.Equal(first, done) || len(second) != share-len(done) {
		t.Errorf("after the requeue: kept %q, made %q; finished before the cancel %q, share %d", first, second, done, share)
	}
	for _, n := range second {
		if slices.Contains(done, n) {
			t.Errorf("%s was made again", n)
		}
	}
	want := fmt.Sprintf("resumed from the earlier run in the folder: %d section(s) kept, %d to make", len(done), share-len(done))
	if lg := taskLog(dir, array, "0"); !strings.Contains(lg, want) {
		t.Errorf("the requeued task's log does not say %q:\n%s", want, lg)
	}
	t.Logf("task 0 cancelled after %d of %d sections; the requeued task made %d", len(done), share, len(second))
	must(bin, "merge", filepath.Join(dir, "arr2"), "-q")
	sameRunFolder(t, filepath.Join(dir, "single"), filepath.Join(dir, "arr2"))

	// 3. The pipeline file edited while the last task waited: no merge.
	edited := filepath.Join(dir, "batch", "edited.json")
	orig, _ := os.ReadFile(pipe)
	os.WriteFile(edited, orig, 0o644)
	must(bin, "jobscript", edited, "--tasks", "4", "--run-folder", filepath.Join(dir, "arr3"), "-o", "arr3.sbatch", "-q")
	array = strings.SplitN(strings.TrimSpace(must("sbatch", "--parsable", "--hold", "arr3.sbatch")), ";", 2)[0]
	for _, k := range []string{"0", "1", "2"} {
		must("scontrol", "release", array+"_"+k)
	}
	for _, k := range []string{"0", "1", "2"} {
		waitState(t, sh, array+"_"+k, "COMPLETED")
	}
	os.WriteFile(edited, bytes.Replace(orig, []byte(`"alpha_deg": [-4, 0, 4, 8]`), []byte(`"alpha_deg": [-4, 0, 4, 8, 12]`), 1), 0o644)
	must("scontrol", "release", array+"_3")
	waitState(t, sh, array+"_3", "COMPLETED")
	before := treeDigest(t, filepath.Join(dir, "arr3"))
	out, err := sh(bin, "merge", filepath.Join(dir, "arr3"))
	code := -1
	if ee, ok := err.(*exec.ExitError); ok {
		code = ee.ExitCode()
	}
	if code != 2 || !strings.Contains(out, "the pipeline file's sha256") || !strings.Contains(out, "shard 3/4") {
		t.Errorf("merge of shards of two pipeline files: exit %d, %s", code, out)
	}
	if after := treeDigest(t, filepath.Join(dir, "arr3")); after != before {
		t.Error("the refused merge changed the run folder")
	}
	t.Logf("refused: %s", strings.TrimSpace(out))
}

// jobStates returns the state of each task of a job (by task id; "" for
// a job that is not an array), as scontrol shows them.
func jobStates(t *testing.T, sh func(string, ...string) (string, error), job string) map[string]string {
	t.Helper()
	out, err := sh("scontrol", "show", "job", "-o", job)
	if err != nil {
		t.Fatalf("scontrol show job %s: %v\n%s", job, err, out)
	}
	states := map[string]string{}
	for _, line := range strings.Split(strings.TrimSpace(out), "\n") {
		var task, state string
		for _, f := range strings.Fields(line) {
			if v, ok := strings.CutPrefix(f, "ArrayTaskId="); ok {
				task = v
			}
			if v, ok := strings.CutPrefix(f, "JobState="); ok {
				state = v
			}
		}
		states[task] = state
	}
	return states
}

// waitJobs waits until the jobs (every task of an array) have ended.
func waitJobs(t *testing.T, sh func(string, ...string) (string, error), jobs ...string) {
	t.Helper()
	deadline := time.Now().Add(5 * time.Minute)
	for {
		busy := false
		for _, j := range jobs {
			for _, s := range jobStates(t, sh, j) {
				switch s {
				case "PENDING", "RUNNING", "CONFIGURING", "COMPLETING", "REQUEUED", "SUSPENDED":
					busy = true
				}
			}
		}
		if !busy {
			return
		}
		if time.Now().After(deadline) {
			t.Fatalf("jobs %v still running after 5 minutes", jobs)
		}
		time.Sleep(200 * time.Millisecond)
	}
}

// waitState waits until a job (or one task, JOB_K) is in state.
func waitState(t *testing.T, sh func(string, ...string) (string, error), job, state string) {
	t.Helper()
	deadline := time.Now().Add(5 * time.Minute)
	for {
		var got string
		for _, s := range jobStates(t, sh, job) {
			got = s
		}
		if got == state {
			return
		}
		if time.Now().After(deadline) || (got != "PENDING" && got != "RUNNING" && got != "COMPLETING" && got != "CONFIGURING") {
			t.Fatalf("job %s is %s, waiting for %s", job, got, state)
		}
		time.Sleep(100 * time.Millisecond)
	}
}

func taskLog(dir, array, task string) string {
	return readAll(filepath.Join(dir, "foilwright-blade-batch-"+array+"_"+task+".out"))
}

func readAll(path string) string {
	b, err := os.ReadFile(path)
	if err != nil {
		return err.Error()
	}
	return string(b)
}

// journalNames returns, sorted, the sections a journal records as
// finished ok (by attempt; 0: every attempt). A torn last line is
// skipped.
func journalNames(t *testing.T, path string, attempt int) []string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	sc.Buffer(nil, 1<<26)
	var names []string
	for first := true; sc.Scan(); first = false {
		if first {
			continue
		}
		var e struct {
			Attempt int `json:"attempt"`
			Record  struct {
				Name   string `json:"name"`
				Status string `json:"status"`
			} `json:"record"`
		}
		if json.Unmarshal(sc.Bytes(), &e) != nil || e.Record.Status != "ok" {
			continue
		}
		if attempt == 0 || e.Attempt == attempt {
			names = append(names, e.Record.Name)
		}
	}
	sort.Strings(names)
	return names
}

// countShare is the number of sections of shard 0 of 4, as the plan
// assigns them.
func countShare(t *testing.T, bin, pipe string, sh func(string, ...string) (string, error)) int {
	t.Helper()
	out, err := sh(bin, "run", pipe, "--plan", "--json", "--shard", "0/4")
	if err != nil {
		t.Fatalf("run --plan --shard 0/4: %v\n%s", err, out)
	}
	var plan struct {
		Shard struct {
			Sections []string `json:"sections"`
		} `json:"shard"`
	}
	if err := json.Unmarshal([]byte(out), &plan); err != nil || len(plan.Shard.Sections) == 0 {
		t.Fatalf("the plan of shard 0/4: %v\n%s", err, out)
	}
	return len(plan.Shard.Sections)
}

// sameRunFolder checks that two run folders hold the same files, byte for
// byte, and the same manifest but for its timings.
func sameRunFolder(t *testing.T, a, b string) {
	t.Helper()
	fa, fb := files(t, a), files(t, b)
	if !slices.Equal(keys(fa), keys(fb)) {
		t.Fatalf("%s and %s hold different files:\n%q\n%q", a, b, keys(fa), keys(fb))
	}
	for _, p := range keys(fa) {
		x, y := fa[p], fb[p]
		if p == "manifest.json" {
			x, y = withoutTimings(t, x), withoutTimings(t, y)
		}
		if !bytes.Equal(x, y) {
			t.Errorf("%s differs between %s and %s", p, a, b)
		}
	}
}

func files(t *testing.T, root string) map[string][]byte {
	t.Helper()
	m := map[string][]byte{}
	err := filepath.WalkDir(root, func(p string, d os.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, _ := filepath.Rel(root, p)
		m[filepath.ToSlash(rel)], err = os.ReadFile(p)
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return m
}

func keys(m map[string][]byte) []string {
	var k []string
	for p := range m {
		k = append(k, p)
	}
	sort.Strings(k)
	return k
}

// withoutTimings is a manifest with its timings key removed, every
// other byte as it was (re-encoded in the same indented form).
func withoutTimings(t *testing.T, b []byte) []byte {
	t.Helper()
	var m map[string]json.RawMessage
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	if _, ok := m["timings"]; !ok {
		t.Fatal("a manifest without timings")
	}
	delete(m, "timings")
	out, err := json.MarshalIndent(m, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// treeDigest lists every file under root with its size and content.
func treeDigest(t *testing.T, root string) string {
	t.Helper()
	fs := files(t, root)
	var b strings.Builder
	for _, p := range keys(fs) {
		fmt.Fprintf(&b, "%s %d %x\n", p, len(fs[p]), fs[p])
	}
	return b.String()
}
