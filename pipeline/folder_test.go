package pipeline

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"strconv"
	"strings"
	"sync"
	"testing"
)

// twoSections is a pipeline of two sections through the fake area stage,
// into the folder "out".
const twoSections = `{"foilwright": 1, "name": "two",
  "inputs": [{"files": ["in/a.dat"]}, {"files": ["in/b.dat"]}],
  "stages": [{"id": "area", "stage": "area"}, {"id": "wait", "stage": "slow", "after": ["area"], "params": {"ms": 0}}],
  "outputs": {"folder": "out"}}`

func twoFiles() map[string]string {
	return map[string]string{"in/a.dat": thinPoints, "in/b.dat": thickPoints}
}

// earlierRun makes a good run of twoSections and returns its plan and the
// run folder's files.
func earlierRun(t *testing.T) (*Plan, map[string][]byte) {
	t.Helper()
	pl := loadPlan(t, setup(t, twoSections, twoFiles()))
	if _, err := Run(context.Background(), pl, RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New}); err != nil {
		t.Fatal(err)
	}
	return pl, readTree(t, pl.Pipeline.Folder())
}

// TestReplaceKeepsEarlierRunOnFailure is the regression test of defect 6
// of issue 11: --replace deleted the earlier run before the new one
// succeeded, and a failed replacement removed every good file.
func TestReplaceKeepsEarlierRunOnFailure(t *testing.T) {
	pl, before := earlierRun(t)
	folder := pl.Pipeline.Folder()
	// The same pipeline, now with a stage that fails on every section.
	pl.Stages[1].Stage, pl.Stages[1].Params = "fail", []byte("{}")
	sum, err := Run(context.Background(), pl, RunOptions{Replace: true, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if err != nil {
		t.Fatal(err)
	}
	if !sum.Kept || sum.Manifest != "" || sum.Err() == nil {
		t.Errorf("summary kept=%v manifest=%q err=%v, want the earlier run kept and an error", sum.Kept, sum.Manifest, sum.Err())
	}
	if after := readTree(t, folder); !reflect.DeepEqual(after, before) {
		t.Errorf("the earlier run changed: %d files before, %d after", len(before), len(after))
	}
	if fi, err := os.Stat(folder); err != nil || fi.Mode().Perm() != 0o755 {
		t.Errorf("run folder mode %v (%v), want 0755 like any folder foilwright makes", fi.Mode().Perm(), err)
	}
	var b strings.Builder
	sum.Write(&b)
	if !strings.Contains(b.String(), "earlier run in") {
		t.Errorf("summary does not say the earlier run was kept:\n%s", b.String())
	}
	assertNoLeftovers(t, filepath.Dir(folder))
}

// TestReplaceKeepsEarlierRunOnCancel: Ctrl-C during a replacement left 24
// of 96 files of the earlier run (defect 6).
func TestReplaceKeepsEarlierRunOnCancel(t *testing.T) {
	pl, before := earlierRun(t)
	folder := pl.Pipeline.Folder()
	ctx, cancel := context.WithCancel(context.Background())
	defer cancel()
	runner := &switchRunner{reg: &fakeRegistry{}, onSecond: cancel}
	pl.Stages[1].Params = []byte(`{"ms": 600000}`)
	_, err := Run(ctx, pl, RunOptions{Replace: true, Preparer: fakePrep{}, NewRunner: runner.New})
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("err %v, want context.Canceled", err)
	}
	if after := readTree(t, folder); !reflect.DeepEqual(after, before) {
		t.Errorf("the earlier run changed: %d files before, %d after", len(before), len(after))
	}
	assertNoLeftovers(t, filepath.Dir(folder))
}

// TestRunWriteFailureLeavesNoHalfRun: a full disk during run left outputs
// with no manifest (defect 13). Writes fail after the first few: the
// failed section keeps no outputs; when the manifest cannot be written
// either, nothing is committed and an earlier run stays whole.
func TestRunWriteFailureLeavesNoHalfRun(t *testing.T) {
	full := func(fails func(path string) bool) func() {
		saved, savedStream := writeFile, writeStream
		writeFile = func(path string, data []byte) error {
			if fails(path) {
				return fmt.Errorf("write %s: no space left on device", path)
			}
			return saved(path, data)
		}
		writeStream = func(path string, fill func(io.Writer) error) error {
			if fails(path) {
				return fmt.Errorf("write %s: no space left on device", path)
			}
			return savedStream(path, fill)
		}
		return func() { writeFile, writeStream = saved, savedStream }
	}

	// A new folder: section a is written, b's second file fails; the run
	// is consistent.
	pl := loadPlan(t, setup(t, twoSections, twoFiles()))
	restore := full(func(p string) bool { return strings.HasSuffix(p, filepath.Join("b", "nodes.dat")) })
	sum, err := Run(context.Background(), pl, RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	restore()
	if err != nil {
		t.Fatal(err)
	}
	if sum.Sections[1].Status != StatusFailed || !strings.Contains(sum.Sections[1].Err, "no space left") {
		t.Errorf("section b: %+v", sum.Sections[1])
	}
	m, err := ReadManifest(sum.Manifest)
	if err != nil {
		t.Fatal(err)
	}
	tree := readTree(t, pl.Pipeline.Folder())
	delete(tree, ManifestName)
	if len(tree) != len(m.Outputs) {
		t.Errorf("run folder holds %d outputs, the manifest lists %d", len(tree), len(m.Outputs))
	}
	for p, data := range tree {
		if m.Outputs[p] != hexSum(data) {
			t.Errorf("%s is not what the manifest records", p)
		}
	}

	// A replacement whose manifest cannot be written: nothing changes.
	pl, before := earlierRun(t)
	restore = full(func(p string) bool { return strings.HasSuffix(p, ManifestName) })
	_, err = Run(context.Background(), pl, RunOptions{Replace: true, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	restore()
	if err == nil || !strings.Contains(err.Error(), "no space left") {
		t.Fatalf("err %v, want the manifest's write error", err)
	}
	if after := readTree(t, pl.Pipeline.Folder()); !reflect.DeepEqual(after, before) {
		t.Error("the earlier run changed")
	}
	assertNoLeftovers(t, filepath.Dir(pl.Pipeline.Folder()))
}

// TestConcurrentRunsIntoOneFolder is the regression test of defect 8 of
// issue 11: two runs into one new folder both succeeded and mixed their
// sections. A run holds the folder's lock while it works; the other is
// refused, naming the owner.
func TestConcurrentRunsIntoOneFolder(t *testing.T) {
	pl := loadPlan(t, setup(t, twoSections, twoFiles()))
	folder := pl.Pipeline.Folder()
	held, err := openRunFolder(folder, false, false)
	if err != nil {
		t.Fatal(err)
	}
	_, err = Run(context.Background(), pl, RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if !errors.Is(err, ErrFolderLocked) || !strings.Contains(err.Error(), "process "+strconv.Itoa(os.Getpid())) {
		t.Errorf("run into a locked folder: %v, want ErrFolderLocked naming pid %d", err, os.Getpid())
	}
	held.discard()
	held.close()

	for trial := range 5 {
		pl := loadPlan(t, setup(t, twoSections, twoFiles()))
		var wg sync.WaitGroup
		errs := make([]error, 2)
		for k := range 2 {
			wg.Go(func() {
				_, errs[k] = Run(context.Background(), pl, RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
			})
		}
		wg.Wait()
		ok := 0
		for _, err := range errs {
			switch {
			case err == nil:
				ok++
			case !errors.Is(err, ErrFolderLocked) && !errors.Is(err, ErrFolderNotEmpty):
				t.Errorf("trial %d: %v", trial, err)
			}
		}
		if ok != 1 {
			t.Errorf("trial %d: %d runs succeeded (%v), want 1", trial, ok, errs)
		}
		m, err := ReadManifest(filepath.Join(pl.Pipeline.Folder(), ManifestName))
		if err != nil {
			t.Fatal(err)
		}
		tree := readTree(t, pl.Pipeline.Folder())
		if len(tree) != len(m.Outputs)+1 {
			t.Errorf("trial %d: %d files for %d outputs", trial, len(tree), len(m.Outputs))
		}
		assertNoLeftovers(t, filepath.Dir(pl.Pipeline.Folder()))
	}
}

// TestReplaceNeverFollowsSymlinks is the regression test of defect 9 of
// issue 11: --replace deleted through symbolic links inside the run
// folder. A run folder holding a link, or being one, is refused, and what
// the links point to is untouched.
func TestReplaceNeverFollowsSymlinks(t *testing.T) {
	pl, _ := earlierRun(t)
	folder := pl.Pipeline.Folder()
	outside := filepath.Join(filepath.Dir(folder), "outside")
	os.MkdirAll(outside, 0o755)
	victim := filepath.Join(outside, "area.json")
	os.WriteFile(victim, []byte("victim"), 0o644)
	results := filepath.Join(folder, "a", "results")
	os.RemoveAll(results)
	if err := os.Symlink(outside, results); err != nil {
		t.Fatal(err)
	}
	_, err := Run(context.Background(), pl, RunOptions{Replace: true, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if !errors.Is(err, ErrFolderUnsafe) || !strings.Contains(err.Error(), "a/results (a symbolic link)") {
		t.Errorf("replace through a link: %v", err)
	}
	if got, _ := os.ReadFile(victim); string(got) != "victim" {
		t.Errorf("the file behind the link changed: %q", got)
	}

	// A run folder that is itself a symbolic link.
	pl = loadPlan(t, setup(t, twoSections, twoFiles()))
	real := filepath.Join(filepath.Dir(pl.Pipeline.Folder()), "real")
	os.MkdirAll(real, 0o755)
	os.WriteFile(filepath.Join(real, "keep.txt"), []byte("keep"), 0o644)
	os.Symlink(real, pl.Pipeline.Folder())
	for _, replace := range []bool{false, true} {
		_, err = Run(context.Background(), pl, RunOptions{Replace: replace, Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
		if !errors.Is(err, ErrFolderUnsafe) || !strings.Contains(err.Error(), "symbolic link") {
			t.Errorf("replace=%v: run folder that is a link: %v", replace, err)
		}
	}
	if got, _ := os.ReadFile(filepath.Join(real, "keep.txt")); string(got) != "keep" {
		t.Error("the folder behind the link changed")
	}
}

// TestOpenRunFolderRecovers: a crash between the two renames of a commit
// (where no atomic exchange exists) leaves the earlier run parked; the
// next run puts it back, and removes a staging folder a crash left.
func TestOpenRunFolderRecovers(t *testing.T) {
	pl, before := earlierRun(t)
	folder := pl.Pipeline.Folder()
	parent, base := filepath.Dir(folder), filepath.Base(folder)
	parked := filepath.Join(parent, "."+base+parkedInfix+"123")
	if err := os.Rename(folder, parked); err != nil {
		t.Fatal(err)
	}
	stale := filepath.Join(parent, "."+base+stagingInfix+"456")
	os.MkdirAll(filepath.Join(stale, "a"), 0o755)
	os.WriteFile(filepath.Join(stale, "a", "section.json"), []byte("half"), 0o644)
	_, err := Run(context.Background(), pl, RunOptions{Preparer: fakePrep{}, NewRunner: (&fakeRegistry{}).New})
	if !errors.Is(err, ErrFolderNotEmpty) {
		t.Errorf("run after the crash: %v, want ErrFolderNotEmpty (the earlier run is back)", err)
	}
	if after := readTree(t, folder); !reflect.DeepEqual(after, before) {
		t.Error("the earlier run was not put back whole")
	}
	assertNoLeftovers(t, parent)
}

// TestCommitWithoutExchange commits by the two renames where the file
// system has no atomic exchange.
func TestCommitWithoutExchange(t *testing.T) {
	pl, before := earlierRun(t)
	rf, err := openRunFolder(pl.Pipeline.Folder(), true, false)
	if err != nil {
		t.Fatal(err)
	}
	defer rf.close()
	os.WriteFile(filepath.Join(rf.staging, "new.txt"), []byte("new"), 0o644)
	saved := exchange
	exchange = func(a, b string) error { return errors.New("no exchange") }
	defer func() { exchange = saved }()
	if err := rf.commit(); err != nil {
		t.Fatal(err)
	}
	rf.close()
	after := readTree(t, pl.Pipeline.Folder())
	if len(after) != 1 || string(after["new.txt"]) != "new" || len(before) < 2 {
		t.Errorf("after the commit: %v", after)
	}
	assertNoLeftovers(t, filepath.Dir(pl.Pipeline.Folder()))
}
