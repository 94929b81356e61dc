package pipeline

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"
)

// A run folder is committed as a whole. Run writes the new run into a
// staging folder beside the run folder (".NAME.new-…", same file system)
// and, when it is to be kept, swaps it into place in one step: on Linux
// renameat2 exchanges the two folders atomically, elsewhere two renames do
// it with the earlier run parked as ".NAME.old-…" in between. Only then is
// the earlier run removed (never following a symbolic link). A crash at
// any moment leaves the earlier run whole (in place, or parked, whence the
// next run puts it back) and no half new one in its place; leftovers of
// a crash are removed by the next run into the folder.
//
// A lock file beside the folder (".NAME.lock", holding the owner's
// process id) keeps two runs from making the same folder at once.

const (
	stagingInfix = ".new-"
	parkedInfix  = ".old-"
)

// runFolder is a run folder being made.
type runFolder struct {
	final   string // the run folder, absolute
	staging string // where the run is written
	earlier bool   // final holds an earlier run (a manifest), replaced on commit
	exists  bool   // final exists (an earlier run or an empty folder)
	lock    *folderLock
	// leftover are staging folders a crash left, kept for a resumed run
	// to adopt (openRunFolder with adopt); the others remove them.
	leftover []string
}

// openRunFolder takes the folder's lock, puts back an earlier run a crash
// left parked, checks the folder (a new or empty folder; with replace, an
// earlier run and nothing else) and makes the staging folder. With adopt,
// staging folders a crash left are kept in rf.leftover, for a resumed run.
func openRunFolder(folder string, replace, adopt bool) (rf *runFolder, err error) {
	return openFolder(folder, replace, adopt, false)
}

// openRunFolderShards is openRunFolder for Merge: the folder may also hold
// the shards' parts (under ShardsDir), which the merged run replaces.
func openRunFolderShards(folder string, replace bool) (*runFolder, error) {
	return openFolder(folder, replace, false, true)
}

func openFolder(folder string, replace, adopt, shards bool) (rf *runFolder, err error) {
	abs, err := filepath.Abs(folder)
	if err != nil {
		return nil, fmt.Errorf("pipeline: run folder: %w", err)
	}
	parent, base := filepath.Dir(abs), filepath.Base(abs)
	if base == "." || base == string(filepath.Separator) || parent == abs {
		return nil, fmt.Errorf("%w: %s cannot be a run folder", ErrFolderUnsafe, folder)
	}
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return nil, fmt.Errorf("pipeline: run folder: %w", err)
	}
	lock, err := lockFolder(filepath.Join(parent, "."+base+".lock"))
	if err != nil {
		if errors.Is(err, ErrFolderLocked) {
			return nil, err
		}
		return nil, fmt.Errorf("pipeline: run folder %s: lock: %w", folder, err)
	}
	defer func() {
		if err != nil {
			lock.unlock()
		}
	}()
	rf = &runFolder{final: abs, lock: lock}
	if err := rf.recover(parent, base, adopt); err != nil {
		return nil, err
	}
	if err := rf.check(folder, replace, shards); err != nil {
		return nil, err
	}
	if rf.staging, err = os.MkdirTemp(parent, "."+base+stagingInfix); err != nil {
		return nil, fmt.Errorf("pipeline: run folder: %w", err)
	}
	// MkdirTemp makes the folder private (0700); it becomes the run
	// folder, which others may read, as a folder made by MkdirAll.
	if err := os.Chmod(rf.staging, 0o755); err != nil {
		os.Remove(rf.staging)
		return nil, fmt.Errorf("pipeline: run folder: %w", err)
	}
	return rf, nil
}

// recover puts back an earlier run parked by a crash between the two
// renames of a commit, and removes staging folders and parked runs that a
// crash left (keeping the staging folders in rf.leftover with adopt).
func (rf *runFolder) recover(parent, base string, adopt bool) error {
	entries, err := os.ReadDir(parent)
	if err != nil {
		return fmt.Errorf("pipeline: run folder: %w", err)
	}
	var parked, staged []string
	for _, e := range entries {
		switch n := e.Name(); {
		case strings.HasPrefix(n, "."+base+parkedInfix):
			parked = append(parked, filepath.Join(parent, n))
		case strings.HasPrefix(n, "."+base+stagingInfix):
			staged = append(staged, filepath.Join(parent, n))
		}
	}
	if _, err := os.Lstat(rf.final); errors.Is(err, fs.ErrNotExist) && len(parked) == 1 {
		if err := os.Rename(parked[0], rf.final); err != nil {
			return fmt.Errorf("pipeline: run folder: put back the earlier run: %w", err)
		}
		parked = nil
	}
	if adopt {
		rf.leftover, staged = staged, nil
	}
	for _, p := range append(parked, staged...) {
		os.RemoveAll(p) // never follows a symbolic link
	}
	return nil
}

// check refuses a run folder that is not a folder, that holds files when
// replace is not set, or, with replace, anything the earlier run did not
// write there (a symbolic link, a file its manifest does not list): the
// whole folder is replaced, so nothing else may be in it.
func (rf *runFolder) check(folder string, replace, shards bool) error {
	fi, err := os.Lstat(rf.final)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return nil
	case err != nil:
		return fmt.Errorf("pipeline: run folder: %w", err)
	case fi.Mode()&fs.ModeSymlink != 0:
		return fmt.Errorf("%w: %s is a symbolic link; name the folder it points to", ErrFolderUnsafe, folder)
	case !fi.IsDir():
		return fmt.Errorf("%w: %s is not a folder", ErrFolderUnsafe, folder)
	}
	rf.exists = true
	entries, err := os.ReadDir(rf.final)
	if err != nil {
		return fmt.Errorf("pipeline: run folder: %w", err)
	}
	if shards {
		entries = slices.DeleteFunc(entries, func(e fs.DirEntry) bool { return e.Name() == ShardsDir && e.IsDir() })
	}
	if len(entries) == 0 {
		return nil
	}
	if !replace {
		return fmt.Errorf("%w: %s (choose another folder, or replace the earlier run)", ErrFolderNotEmpty, folder)
	}
	m, err := ReadManifest(filepath.Join(rf.final, ManifestName))
	if err != nil {
		return fmt.Errorf("%w: %s holds no foilwright run to replace (%v)", ErrFolderNotEmpty, folder, err)
	}
	listed := map[string]bool{ManifestName: true}
	if m.Shard != nil {
		// A shard's part keeps its journal beside its partial manifest.
		listed[JournalName] = true
	}
	for p := range m.Outputs {
		listed[p] = true
	}
	var foreign []string
	filepath.WalkDir(rf.final, func(p string, d fs.DirEntry, err error) error {
		if err != nil || p == rf.final {
			return err
		}
		rel, _ := filepath.Rel(rf.final, p)
		rel = filepath.ToSlash(rel)
		if shards && rel == ShardsDir && d.IsDir() {
			return filepath.SkipDir
		}
		switch t := d.Type(); {
		case t&fs.ModeSymlink != 0:
			foreign = append(foreign, rel+" (a symbolic link)")
		case d.IsDir():
		case !t.IsRegular():
			foreign = append(foreign, rel+" (not a regular file)")
		case !listed[rel]:
			foreign = append(foreign, rel+" (not written by the earlier run)")
		}
		return nil
	})
	if len(foreign) > 0 {
		sort.Strings(foreign)
		if len(foreign) > 5 {
			foreign = append(foreign[:5], fmt.Sprintf("and %d more", len(foreign)-5))
		}
		return fmt.Errorf("%w: %s holds %s; a replacement replaces the whole folder: move them away first",
			ErrFolderUnsafe, folder, strings.Join(foreign, ", "))
	}
	rf.earlier = true
	return nil
}

// commit puts the staging folder in the run folder's place and removes
// what was there.
func (rf *runFolder) commit() error {
	if !rf.exists {
		if err := os.Rename(rf.staging, rf.final); err != nil {
			return fmt.Errorf("pipeline: commit the run folder: %w", err)
		}
		return nil
	}
	old := rf.staging // after the exchange it holds the earlier run
	if err := exchange(rf.staging, rf.final); err != nil {
		// No atomic exchange here: park the earlier run, then move the
		// new one in. A crash in between leaves the earlier run parked,
		// and the next run puts it back.
		parked, err := os.MkdirTemp(filepath.Dir(rf.final), "."+filepath.Base(rf.final)+parkedInfix)
		if err != nil {
			return fmt.Errorf("pipeline: commit the run folder: %w", err)
		}
		os.Remove(parked)
		if err := os.Rename(rf.final, parked); err != nil {
			return fmt.Errorf("pipeline: commit the run folder: %w", err)
		}
		if err := os.Rename(rf.staging, rf.final); err != nil {
			os.Rename(parked, rf.final)
			return fmt.Errorf("pipeline: commit the run folder: %w", err)
		}
		old = parked
	}
	return os.RemoveAll(old)
}

// discard removes the staging folder, leaving the run folder as it was.
func (rf *runFolder) discard() { os.RemoveAll(rf.staging) }

// close releases the lock.
func (rf *runFolder) close() { rf.lock.unlock() }
