package pipeline

import (
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/foilwright/foilwright/internal/digest"
)

// ErrNotMergeable means the shards in a run folder cannot be merged: one
// is missing, has not finished, is still running, or was made by another
// pipeline file, plan, tool or stage than the others.
var ErrNotMergeable = errors.New("pipeline: the shards cannot be merged")

// MergeOptions say how Merge works.
type MergeOptions struct {
	// Replace allows a run folder that also holds an earlier run (and
	// nothing else besides the shards): the merged run replaces it.
	Replace bool
	// Parse are the checks of the pipeline file, which Merge reads again
	// (the run's own outputs, the stations and the batch table, follow
	// its outputs).
	Parse ParseOptions
}

// shardPart is one shard's part of a run folder, open for merging.
type shardPart struct {
	shard  Shard
	folder string
	lock   *folderLock
	j      *journal
	m      *Manifest
}

var shardDirName = regexp.MustCompile(`^([0-9]+)-of-([0-9]+)$`)

// Merge combines the parts the shards of a run wrote under folder into
// one run folder, the same, file for file and byte for byte (timings
// aside), as the run of the same pipeline on one machine: the sections
// in plan order, the manifest, the stations picture and exports and the
// batch table. It refuses, with an error wrapping ErrNotMergeable and
// naming what is wrong, when a shard is missing, still running or has not
// finished every section of its share, or when the shards differ in the
// pipeline file, the plan (the inputs), the tool or a stage. Every
// output is checked against its shard's record before it is taken. The
// merged run is committed as a whole in place of folder (the shards'
// parts go with it); a section that failed in its shard is recorded as
// failed, as a run on one machine would, and reported in the summary.
func Merge(ctx context.Context, folder string, opts MergeOptions) (*Summary, error) {
	start := time.Now()
	abs, err := filepath.Abs(folder)
	if err != nil {
		return nil, err
	}
	parts, err := openShards(abs)
	defer func() {
		for _, p := range parts {
			p.close()
		}
	}()
	if err != nil {
		return nil, err
	}
	first := parts[0]
	for _, p := range parts[1:] {
		if d := headDifference(first.j.head.runHead, p.j.head.runHead, "shard "+first.shard.String(), "shard "+p.shard.String()); d != "" {
			return nil, fmt.Errorf("%w: %s", ErrNotMergeable, d)
		}
	}
	head := first.j.head.runHead

	// The pipeline file, as the shards recorded it, and the same plan.
	pfile := filepath.FromSlash(head.Pipeline.File)
	if !filepath.IsAbs(pfile) {
		pfile = filepath.Join(abs, pfile)
	}
	po := opts.Parse
	po.Dir = ""
	p, err := LoadWith(pfile, po)
	if err != nil {
		return nil, fmt.Errorf("%w: the shards' pipeline file: %w", ErrNotMergeable, err)
	}
	if p.SHA256 != head.Pipeline.SHA256 {
		return nil, fmt.Errorf("%w: %s has sha256 %s, the shards ran %s", ErrNotMergeable, pfile, p.SHA256, head.Pipeline.SHA256)
	}
	pl := p.Plan()
	if d := pl.Digest(); d != head.Plan || len(pl.Sections) != head.Sections {
		return nil, fmt.Errorf("%w: the inputs changed since the shards ran: the pipeline now plans %d section(s) (plan %s), the shards %d (plan %s)",
			ErrNotMergeable, len(pl.Sections), short(d), head.Sections, short(head.Plan))
	}

	// Every section finished by exactly one shard.
	owner := make([]int32, len(pl.Sections))
	for i := range owner {
		owner[i] = -1
	}
	for k, part := range parts {
		for i := range owner {
			if !part.j.has(i) {
				continue
			}
			if owner[i] >= 0 {
				return nil, fmt.Errorf("%w: section %s was made by shard %s and by shard %s", ErrNotMergeable, pl.Sections[i].Name, parts[owner[i]].shard, part.shard)
			}
			owner[i] = int32(k)
		}
	}
	var missing []string
	for i, k := range owner {
		if k < 0 {
			missing = append(missing, pl.Sections[i].Name)
		}
	}
	if len(missing) > 0 {
		return nil, fmt.Errorf("%w: %d section(s) not made yet: %s (the shards that did not finish: %s; requeue them, which resume)",
			ErrNotMergeable, len(missing), listSome(missing, 5), strings.Join(unfinished(pl, parts, owner), ", "))
	}

	rf, err := openRunFolderShards(abs, opts.Replace)
	if err != nil {
		return nil, err
	}
	defer rf.close()
	keep := false
	defer func() {
		if !keep {
			rf.discard()
		}
	}()
	entry := func(i int) (journalEntry, bool, error) { return parts[owner[i]].j.entry(i) }
	idx := make([]int, len(pl.Sections))
	for i := range idx {
		idx[i] = i
		if ctx.Err() != nil {
			return nil, ctx.Err()
		}
		e, _, err := entry(i)
		if err != nil {
			return nil, err
		}
		from := parts[owner[i]].folder
		for path, want := range e.Outputs {
			full, ok := inside(from, path)
			if !ok {
				return nil, fmt.Errorf("%w: shard %s lists %s, outside its folder", ErrNotMergeable, parts[owner[i]].shard, path)
			}
			if got, err := digest.File(full); err != nil || got != want {
				return nil, fmt.Errorf("%w: %s of shard %s is not what the shard wrote (run the shard again with --resume)", ErrNotMergeable, path, parts[owner[i]].shard)
			}
		}
		if err := linkOutputs(from, rf.staging, e.Outputs); err != nil {
			return nil, err
		}
	}
	a := &assembly{pl: pl, head: head, idx: idx, entry: entry, runOutputs: map[string]string{}}
	if err := writeRunOutputs(pl, rf.staging, idx, entry, a.runOutputs); err != nil {
		return nil, err
	}
	a.timings = mergeTimings(parts)
	a.timings.TotalS += seconds(time.Since(start))
	sum := &Summary{Folder: abs, Manifest: filepath.Join(abs, ManifestName)}
	for _, i := range idx {
		e, _, err := entry(i)
		if err != nil {
			return nil, err
		}
		sum.Sections = append(sum.Sections, e.report())
	}
	if err := a.writeTo(filepath.Join(rf.staging, ManifestName)); err != nil {
		return nil, err
	}
	if err := rf.commit(); err != nil {
		return nil, err
	}
	keep = true
	return sum, nil
}

// mergeTimings are the timings of a merged run: the start of the first
// shard, the longest shard's time, the workers of every shard.
func mergeTimings(parts []*shardPart) Timings {
	t := Timings{Shards: len(parts)}
	for _, p := range parts {
		if t.Started == "" || p.m.Timings.Started < t.Started {
			t.Started = p.m.Timings.Started
		}
		t.TotalS = max(t.TotalS, p.m.Timings.TotalS)
		t.Jobs += p.m.Timings.Jobs
		t.MaxRSSKiB = max(t.MaxRSSKiB, p.m.Timings.MaxRSSKiB)
	}
	return t
}

// unfinished names the shards whose share is not all made.
func unfinished(pl *Plan, parts []*shardPart, owner []int32) []string {
	assign := AssignShards(pl.Costs(), shardOverhead, parts[0].shard.Count)
	bad := map[int]bool{}
	for i, k := range owner {
		if k < 0 {
			bad[assign[i]] = true
		}
	}
	var names []string
	for k := range parts[0].shard.Count {
		if bad[k] {
			names = append(names, Shard{k, parts[0].shard.Count}.String())
		}
	}
	return names
}

// openShards finds the shards' parts under folder/shards, takes each
// one's lock (a shard still running holds it) and opens its journal and
// partial manifest. Every shard of the split must be there, finished.
func openShards(folder string) ([]*shardPart, error) {
	dir := filepath.Join(folder, ShardsDir)
	entries, err := os.ReadDir(dir)
	if errors.Is(err, os.ErrNotExist) {
		return nil, fmt.Errorf("%w: %s holds no shards (no %s folder): run the pipeline with --shard first", ErrNotMergeable, folder, ShardsDir)
	}
	if err != nil {
		return nil, err
	}
	count := 0
	found := map[int]string{}
	for _, e := range entries {
		m := shardDirName.FindStringSubmatch(e.Name())
		if m == nil || !e.IsDir() {
			continue
		}
		k, _ := strconv.Atoi(m[1])
		n, _ := strconv.Atoi(m[2])
		if count != 0 && n != count {
			return nil, fmt.Errorf("%w: %s holds shards of a split in %d and of a split in %d; remove the parts of the split you do not want", ErrNotMergeable, dir, count, n)
		}
		count = n
		found[k] = e.Name()
	}
	if count == 0 {
		return nil, fmt.Errorf("%w: %s holds no shard parts", ErrNotMergeable, dir)
	}
	var missing []string
	for k := range count {
		if _, ok := found[k]; !ok {
			missing = append(missing, Shard{k, count}.String())
		}
	}
	if len(missing) > 0 {
		return nil, fmt.Errorf("%w: shard(s) %s of %d have written nothing yet", ErrNotMergeable, listSome(missing, 8), count)
	}
	var parts []*shardPart
	for k := range count {
		s := Shard{k, count}
		p := &shardPart{shard: s, folder: filepath.Join(dir, found[k])}
		parts = append(parts, p)
		lock, err := lockFolder(filepath.Join(dir, "."+found[k]+".lock"))
		if errors.Is(err, ErrFolderLocked) {
			return parts, fmt.Errorf("%w: shard %s is still running: %v", ErrNotMergeable, s, err)
		}
		if err != nil {
			return parts, err
		}
		p.lock = lock
		if p.m, err = ReadManifest(filepath.Join(p.folder, ManifestName)); err != nil {
			return parts, fmt.Errorf("%w: shard %s has not finished (%v); requeue it, which resumes it", ErrNotMergeable, s, err)
		}
		if p.m.Shard == nil || p.m.Shard.Shard != s {
			return parts, fmt.Errorf("%w: %s holds no partial manifest of shard %s", ErrNotMergeable, p.folder, s)
		}
		if p.j, err = openJournal(journalPath(p.folder)); err != nil {
			return parts, fmt.Errorf("%w: shard %s: %v", ErrNotMergeable, s, err)
		}
		if p.j.head.Shard == nil || *p.j.head.Shard != s {
			return parts, fmt.Errorf("%w: the journal in %s is not of shard %s", ErrNotMergeable, p.folder, s)
		}
	}
	return parts, nil
}

func (p *shardPart) close() {
	if p.j != nil {
		p.j.close()
	}
	if p.lock != nil {
		p.lock.unlock()
	}
}

// listSome lists the first n of names and counts the rest.
func listSome(names []string, n int) string {
	sort.Strings(names)
	if len(names) <= n {
		return strings.Join(names, ", ")
	}
	return strings.Join(names[:n], ", ") + fmt.Sprintf(" and %d more", len(names)-n)
}
