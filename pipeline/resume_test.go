package pipeline

import (
	"bufio"
	"context"
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"
)

// slowPipeline makes 8 sections, each waiting 60 ms in a stage, so that
// a run can be killed in the middle.
const slowPipeline = `{
  "foilwright": 1,
  "name": "slow",
  "inputs": [{"files": ["in/*.dat"], "per_file": true, "units": "mm", "station": 1}],
  "stages": [
    {"id": "area", "stage": "area"},
    {"id": "wait", "stage": "slow", "after": ["area"], "params": {"ms": 60}},
    {"id": "double", "stage": "scale", "after": ["area"], "params": {"factor": 2}}
  ],
  "outputs": {"folder": "run", "plots": ["stations"]}
}`

func slowFiles() map[string]string {
	files := map[string]string{}
	for i := range 8 {
		files[fmt.Sprintf("in/s%d.dat", i)] = []string{thinPoints, thickPoints}[i%2]
	}
	return files
}

// TestCrashHelper is not a test: run by TestResumeAfterKill in a child
// process, it runs the pipeline named by its environment until it is
// killed.
func TestCrashHelper(t *testing.T) {
	path := os.Getenv("FOILWRIGHT_CRASH_PIPELINE")
	if path == "" {
		t.Skip("runs only as TestResumeAfterKill's child")
	}
	opts := RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}
	if s := os.Getenv("FOILWRIGHT_CRASH_SHARD"); s != "" {
		sh, err := ParseShard(s)
		if err != nil {
			t.Fatal(err)
		}
		opts.Shard = &sh
	}
	Run(context.Background(), loadPlan(t, path), opts)
}

// journalLines counts the complete lines of the journals of the staging
// folders beside (or inside, for a shard) folder.
func journalLines(pattern string) int {
	matches, _ := filepath.Glob(pattern)
	n := 0
	for _, m := range matches {
		f, err := os.Open(m)
		if err != nil {
			continue
		}
		sc := bufio.NewScanner(f)
		sc.Buffer(nil, 1<<24)
		for sc.Scan() {
			n++
		}
		f.Close()
	}
	return n
}

// killMidway runs the pipeline in a child process and kills it (SIGKILL:
// no chance to clean up) once its journal holds entries sections.
func killMidway(t *testing.T, path, shard, journals string, entries int) {
	t.Helper()
	cmd := exec.Command(os.Args[0], "-test.run=^TestCrashHelper$", "-test.count=1")
	cmd.Env = append(os.Environ(), "FOILWRIGHT_CRASH_PIPELINE="+path, "FOILWRIGHT_CRASH_SHARD="+shard)
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	deadline := time.Now().Add(30 * time.Second)
	for journalLines(journals) < 1+entries {
		if time.Now().After(deadline) {
			cmd.Process.Kill()
			cmd.Wait()
			t.Fatal("the child's journal did not grow")
		}
		time.Sleep(5 * time.Millisecond)
	}
	cmd.Process.Signal(syscall.SIGKILL)
	cmd.Wait()
}

// TestResumeAfterKill kills a run in the middle (its journal complete up
// to the last finished section), tears the journal's last line as a
// crash in the middle of a write would, and resumes: only the sections
// not finished are made, and the run is the one an uninterrupted run
// makes, byte for byte but for the timings.
func TestResumeAfterKill(t *testing.T) {
	if testing.Short() {
		t.Skip("runs a child process")
	}
	path := setup(t, slowPipeline, slowFiles())
	dir := filepath.Dir(path)
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Folder: filepath.Join(dir, "whole"), Jobs: 2, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	killMidway(t, path, "", filepath.Join(dir, ".run.new-*", JournalName), 3)
	if _, err := os.Stat(filepath.Join(dir, "run")); err == nil {
		t.Fatal("the killed run committed a run folder")
	}
	staged, _ := filepath.Glob(filepath.Join(dir, ".run.new-*", JournalName))
	if len(staged) != 1 {
		t.Fatalf("staging journals %v", staged)
	}
	// A torn last line: half an entry, no newline.
	f, _ := os.OpenFile(staged[0], os.O_WRONLY|os.O_APPEND, 0)
	f.WriteString(`{"i":7,"attempt":1,"record":{"name":"s7","sta`)
	f.Close()
	done := journalLines(staged[0]) - 1 - 1 // header and the torn line

	var mu sync.Mutex
	var made []string
	var begun ResumeReport
	todo := -1
	sum, err := Run(context.Background(), loadPlan(t, path), RunOptions{Resume: true, Jobs: 2, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New,
		Begin: func(n int, r ResumeReport) { todo, begun = n, r },
		Done: func(r SectionReport) {
			mu.Lock()
			made = append(made, r.Name)
			mu.Unlock()
		}})
	if err != nil {
		t.Fatal(err)
	}
	if begun.From != ResumeCrash || begun.Kept != done || todo != 8-done || len(made) != 8-done || sum.Resumed.Kept != done {
		t.Errorf("resumed %+v, %d to make, made %q; the journal held %d sections", begun, todo, made, done)
	}
	if len(sum.Sections) != 8 || sum.Err() != nil {
		t.Errorf("summary %+v", sum.Sections)
	}
	assertSameRun(t, filepath.Join(dir, "whole"), filepath.Join(dir, "run"))
	assertNoLeftovers(t, dir)

	// Resuming a finished run makes nothing and changes nothing.
	made = nil
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Resume: true, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New,
		Begin: func(n int, r ResumeReport) { todo, begun = n, r }}); err != nil {
		t.Fatal(err)
	}
	if todo != 0 || begun.From != ResumeRun || begun.Kept != 8 {
		t.Errorf("resuming a finished run: %d to make, %+v", todo, begun)
	}
	assertSameRun(t, filepath.Join(dir, "whole"), filepath.Join(dir, "run"))
}

// TestResumeShardAfterKill: a shard killed in the middle is resumed into
// its part, which then merges into the one-machine run. The journal says
// which attempt made each section.
func TestResumeShardAfterKill(t *testing.T) {
	if testing.Short() {
		t.Skip("runs a child process")
	}
	path := setup(t, slowPipeline, slowFiles())
	dir := filepath.Dir(path)
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Folder: filepath.Join(dir, "whole"), Jobs: 2, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	s := Shard{0, 2}
	killMidway(t, path, s.String(), filepath.Join(dir, "run", ShardsDir, ".0-of-2.new-*", JournalName), 2)
	before := journalLines(filepath.Join(dir, "run", ShardsDir, ".0-of-2.new-*", JournalName)) - 1
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Shard: &s, Resume: true, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	// The part's journal: the first attempt's sections, then the second's,
	// none made twice.
	j, err := openJournal(journalPath(ShardFolder(filepath.Join(dir, "run"), s)))
	if err != nil {
		t.Fatal(err)
	}
	attempts := map[int]int{}
	j.each(func(e *journalEntry) error { attempts[e.Attempt]++; return nil })
	j.close()
	share := len(loadPlan(t, path).ShardSections(s))
	if j.head.Attempt != 2 || attempts[1] != before || attempts[2] != share-before || j.count != share {
		t.Errorf("attempt %d; sections by attempt %v, %d before the kill, share %d", j.head.Attempt, attempts, before, share)
	}
	t1 := Shard{1, 2}
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Shard: &t1, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	if _, err := Merge(context.Background(), filepath.Join(dir, "run"), MergeOptions{Parse: ParseOptions{Known: fakeStages}}); err != nil {
		t.Fatal(err)
	}
	assertSameRun(t, filepath.Join(dir, "whole"), filepath.Join(dir, "run"))
}

// TestResumeCancelledShard: a shard cancelled in the middle (SIGTERM, as
// scancel or a preemption sends it) commits its part with the sections
// it finished and the others cancelled; resumed (the requeued task), it
// keeps its part's finished sections and makes only the rest.
func TestResumeCancelledShard(t *testing.T) {
	path := setup(t, slowPipeline, slowFiles())
	dir := filepath.Dir(path)
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Folder: filepath.Join(dir, "whole"), Jobs: 2, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	s := Shard{0, 2}
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	var finished []string
	sum, err := Run(ctx, loadPlan(t, path), RunOptions{Shard: &s, Resume: true, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New,
		Done: func(r SectionReport) {
			if r.Status == StatusOK {
				finished = append(finished, r.Name)
			}
			if len(finished) == 2 {
				cancel()
			}
		}})
	if !errors.Is(err, context.Canceled) || sum == nil || !sum.Cancelled {
		t.Fatalf("cancelled shard: %v", err)
	}
	share := loadPlan(t, path).ShardSections(s)
	if len(finished) >= len(share) {
		t.Fatalf("the shard finished (%d of %d) before it was cancelled", len(finished), len(share))
	}
	var made []string
	var rep ResumeReport
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Shard: &s, Resume: true, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New,
		Begin: func(_ int, r ResumeReport) { rep = r },
		Done:  func(r SectionReport) { made = append(made, r.Name) }}); err != nil {
		t.Fatal(err)
	}
	if rep.From != ResumeRun || rep.Kept != len(finished) || len(made) != len(share)-len(finished) {
		t.Errorf("resumed %+v, made %q; %q finished before the cancel, share %d", rep, made, finished, len(share))
	}
	for _, n := range made {
		if slices.Contains(finished, n) {
			t.Errorf("%s was made again", n)
		}
	}
	t1 := Shard{1, 2}
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Shard: &t1, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	if _, err := Merge(context.Background(), filepath.Join(dir, "run"), MergeOptions{Parse: ParseOptions{Known: fakeStages}}); err != nil {
		t.Fatal(err)
	}
	assertSameRun(t, filepath.Join(dir, "whole"), filepath.Join(dir, "run"))
}

// TestResumeCommittedRun resumes a run committed in the folder (without a
// journal: from its manifest and files): a section whose output was
// changed, one whose input changed and one that failed are made again;
// the others are kept, their rows of the batch table read back.
func TestResumeCommittedRun(t *testing.T) {
	path := setup(t, rotorPipeline, rotorFiles)
	dir := filepath.Dir(path)
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Folder: filepath.Join(dir, "whole"), Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	// The run to resume: probe-b fails (its file is broken, then mended).
	good, _ := os.ReadFile(filepath.Join(dir, "in", "probe-b.dat"))
	os.WriteFile(filepath.Join(dir, "in", "probe-b.dat"), []byte("1 2 3\n"), 0o644)
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	os.WriteFile(filepath.Join(dir, "in", "probe-b.dat"), good, 0o644)
	os.WriteFile(filepath.Join(dir, "out", "probe-a", "nodes.dat"), []byte("changed\n"), 0o644)
	// probe-c's input is touched but the same bytes: kept.
	data, _ := os.ReadFile(filepath.Join(dir, "in", "probe-c.dat"))
	os.WriteFile(filepath.Join(dir, "in", "probe-c.dat"), data, 0o644)

	var made []string
	var rep ResumeReport
	sum, err := Run(context.Background(), loadPlan(t, path), RunOptions{Resume: true, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New,
		Begin: func(_ int, r ResumeReport) { rep = r },
		Done:  func(r SectionReport) { made = append(made, r.Name) }})
	if err != nil || sum.Err() != nil {
		t.Fatal(err, sum.Err())
	}
	if strings.Join(made, " ") != "probe-a probe-b" || rep.Kept != 2 || rep.Redo != 2 || rep.From != ResumeRun {
		t.Errorf("made %q, report %+v", made, rep)
	}
	why := strings.Join(rep.Reasons, "; ")
	if !strings.Contains(why, "probe-a: output probe-a/nodes.dat changed") || !strings.Contains(why, "probe-b: it was failed") {
		t.Errorf("reasons %q", why)
	}
	assertSameRun(t, filepath.Join(dir, "whole"), filepath.Join(dir, "out"))
}

func TestResumeRefusesAnotherRun(t *testing.T) {
	path := setup(t, rotorPipeline, rotorFiles)
	dir := filepath.Dir(path)
	if _, err := Run(context.Background(), loadPlan(t, path), RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	before := readTree(t, filepath.Join(dir, "out"))
	os.WriteFile(path, []byte(strings.Replace(rotorPipeline, `"factor": 2`, `"factor": 3`, 1)), 0o644)
	_, err := Run(context.Background(), loadPlan(t, path), RunOptions{Resume: true, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if !errors.Is(err, ErrNotResumable) || !strings.Contains(err.Error(), "sha256") {
		t.Errorf("resume with another pipeline file: %v", err)
	}
	if after := readTree(t, filepath.Join(dir, "out")); len(after) != len(before) {
		t.Error("the earlier run changed")
	}
	assertNoLeftovers(t, dir)
}

// TestBatchTable checks the batch table against the section documents and
// results it comes from.
func TestBatchTable(t *testing.T) {
	path := setup(t, rotorPipeline, rotorFiles)
	os.WriteFile(filepath.Join(filepath.Dir(path), "in", "probe-b.dat"), []byte("1 2 3\n"), 0o644)
	sum, err := Run(context.Background(), loadPlan(t, path), RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if err != nil {
		t.Fatal(err)
	}
	folder := filepath.Dir(sum.Manifest)
	f, err := os.Open(filepath.Join(folder, TableName))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := readCSV(f)
	if err != nil {
		t.Fatal(err)
	}
	head := rows[0]
	col := map[string]int{}
	for i, h := range head {
		col[h] = i
	}
	for _, want := range []string{"section", "station", "status", "chord", "area.area", "double.scaled", "plot.nodes", "verdict", "error"} {
		if _, ok := col[want]; !ok {
			t.Errorf("no column %q in %q", want, head)
		}
	}
	if col["area.area"] > col["double.scaled"] || col["double.scaled"] > col["plot.nodes"] {
		t.Errorf("stage columns not in stage order: %q", head)
	}
	names := []string{"thin", "probe-a", "probe-b", "probe-c"}
	if len(rows) != 1+len(names) {
		t.Fatalf("%d rows", len(rows))
	}
	for k, name := range names {
		r := rows[k+1]
		if r[col["section"]] != name {
			t.Errorf("row %d is %s, want %s", k, r[col["section"]], name)
			continue
		}
		if name == "probe-b" {
			if r[col["status"]] != StatusFailed || !strings.Contains(r[col["error"]], "probe-b.dat:1") || r[col["chord"]] != "" {
				t.Errorf("failed row %q", r)
			}
			continue
		}
		var sec struct {
			Frame struct{ Chord json.Number }
		}
		doc, _ := os.ReadFile(filepath.Join(folder, name, "section.json"))
		json.Unmarshal(doc, &sec)
		var res struct{ Scalars map[string]json.Number }
		b, _ := os.ReadFile(filepath.Join(folder, name, "results", "double.json"))
		json.Unmarshal(b, &res)
		if r[col["chord"]] != sec.Frame.Chord.String() || r[col["double.scaled"]] != res.Scalars["scaled"].String() || r[col["status"]] != StatusOK {
			t.Errorf("row %q: chord %s, scaled %s", r, sec.Frame.Chord, res.Scalars["scaled"])
		}
	}
	if r := rows[1]; r[col["station"]] != "0.4" {
		t.Errorf("station of thin: %q", r[col["station"]])
	}
}

func readCSV(f *os.File) ([][]string, error) { return csv.NewReader(f).ReadAll() }
