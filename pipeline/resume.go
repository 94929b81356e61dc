package pipeline

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/plugins/stage"
)

// ErrNotResumable means the earlier attempt in a run folder is not an
// attempt at the same run: another pipeline file, plan, tool or stage.
var ErrNotResumable = errors.New("pipeline: the earlier run cannot be resumed")

// A ResumeReport says what a resumed run found of an earlier attempt.
type ResumeReport struct {
	// From is where the earlier attempt was: ResumeCrash, ResumeRun, or
	// "" when there was none.
	From string
	// Kept is the number of sections kept, made again is Redo: finished
	// but failed, or whose inputs or outputs no longer match their record.
	Kept, Redo int
	// Reasons says why each of the first sections made again was.
	Reasons []string
}

// Where an earlier attempt is found.
const (
	ResumeCrash = "crash" // a staging folder a crash or kill left, with its journal
	ResumeRun   = "run"   // the run (or shard part) committed in the folder
)

// maxReasons is the number of reasons a ResumeReport keeps.
const maxReasons = 10

func (r *ResumeReport) redo(name, why string) {
	r.Redo++
	if len(r.Reasons) < maxReasons {
		r.Reasons = append(r.Reasons, name+": "+why)
	}
}

// resume finds the earlier attempt at the run (a staging folder a crash
// left, with its journal; else the run committed in the folder), keeps
// every section of idx it finished that still checks (status ok, the same
// files with the same digests, every output on disk with its digest), and
// starts the journal of this attempt with them. Kept files of a committed
// run are linked into the staging folder; in an adopted staging folder,
// files no kept section lists are removed.
func (rf *runFolder) resume(pl *Plan, hdr journalHeader, idx []int, lim limits.Limits) (*journal, ResumeReport, error) {
	var rep ResumeReport
	mine := make([]bool, len(pl.Sections))
	for _, i := range idx {
		mine[i] = true
	}
	// A staging folder a crash left, of this run: the newest.
	adopt := ""
	var newest int64
	for _, l := range rf.leftover {
		h, _, err := readJournal(journalPath(l), nil, func(*journalEntry, where) bool { return false })
		fi, serr := os.Stat(journalPath(l))
		if err == nil && serr == nil && sameRun(h, hdr) == "" && (adopt == "" || fi.ModTime().UnixNano() > newest) {
			adopt, newest = l, fi.ModTime().UnixNano()
		}
	}
	for _, l := range rf.leftover {
		if l != adopt {
			os.RemoveAll(l)
		}
	}
	rf.leftover = nil
	if adopt != "" {
		os.RemoveAll(rf.staging)
		rf.staging = adopt
		rep.From = ResumeCrash
		j, err := rf.keep(pl, hdr, mine, adopt, false, &rep)
		if err != nil {
			return nil, rep, err
		}
		return j, rep, rf.prune(j)
	}
	if !rf.earlier {
		j, err := createJournal(journalPath(rf.staging), hdr, nil)
		return j, rep, err
	}
	rep.From = ResumeRun
	if _, err := os.Stat(journalPath(rf.final)); err == nil {
		h, _, err := readJournal(journalPath(rf.final), nil, func(*journalEntry, where) bool { return false })
		if err != nil {
			return nil, rep, fmt.Errorf("%w: %v", ErrNotResumable, err)
		}
		if d := sameRun(h, hdr); d != "" {
			return nil, rep, fmt.Errorf("%w: %s was made by another run: %s", ErrNotResumable, rf.final, d)
		}
		j, err := rf.keep(pl, hdr, mine, rf.final, true, &rep)
		return j, rep, err
	}
	j, err := rf.keepManifest(pl, hdr, mine, &rep)
	return j, rep, err
}

// keep starts the journal of this attempt with the sections of the
// journal in from that still check, linking their files into the staging
// folder when link is set.
func (rf *runFolder) keep(pl *Plan, hdr journalHeader, mine []bool, from string, link bool, rep *ResumeReport) (*journal, error) {
	old, err := openJournal(journalPath(from))
	if err != nil {
		return nil, fmt.Errorf("%w: %v", ErrNotResumable, err)
	}
	defer old.close()
	hdr.Attempt = old.head.Attempt + 1
	return createJournal(journalPath(rf.staging), hdr, func(add func(*journalEntry) error) error {
		for i := range old.at {
			e, ok, err := old.entry(i)
			if err != nil {
				return err
			}
			if !ok {
				continue
			}
			if !mine[i] {
				continue
			}
			if why := checkEntry(pl, &e, from); why != "" {
				rep.redo(e.Record.Name, why)
				continue
			}
			if link {
				if err := linkOutputs(from, rf.staging, e.Outputs); err != nil {
					return err
				}
			}
			rep.Kept++
			if err := add(&e); err != nil {
				return err
			}
		}
		return nil
	})
}

// keepManifest starts the journal of this attempt with the sections of
// the run committed in the folder (its manifest, read whole) that still
// check, their files linked into the staging folder. Their rows of the
// batch table and their section documents are read back from their
// files; a section whose files do not hold them is made again.
func (rf *runFolder) keepManifest(pl *Plan, hdr journalHeader, mine []bool, rep *ResumeReport) (*journal, error) {
	m, err := ReadManifest(filepath.Join(rf.final, ManifestName))
	if err != nil {
		return nil, fmt.Errorf("%w: %v", ErrNotResumable, err)
	}
	if m.Shard != nil {
		return nil, fmt.Errorf("%w: %s holds a shard's partial manifest without its journal", ErrNotResumable, rf.final)
	}
	was := journalHeader{runHead: runHead{Tool: m.Tool, Pipeline: m.Pipeline, Stages: m.Stages, Plan: hdr.Plan, Sections: hdr.Sections}}
	if d := sameRun(was, hdr); d != "" {
		return nil, fmt.Errorf("%w: %s was made by another run: %s", ErrNotResumable, rf.final, d)
	}
	hdr.Attempt = 2 // the committed run was the first we know of
	byName := map[string]int{}
	for i, s := range pl.Sections {
		byName[s.Name] = i
	}
	timing := map[string]SectionTiming{}
	for _, t := range m.Timings.Sections {
		timing[t.Name] = t
	}
	outputs := map[string]map[string]string{}
	for p, sum := range m.Outputs {
		name, _, ok := strings.Cut(p, "/")
		if !ok {
			continue // the run's own files are made again
		}
		if outputs[name] == nil {
			outputs[name] = map[string]string{}
		}
		outputs[name][p] = sum
	}
	withSection := pl.Pipeline.Outputs.HasPlot(PlotStations) || pl.Pipeline.Outputs.HasExport(ExportStationsDXF) || pl.Pipeline.Outputs.HasExport(ExportStationsCSV)
	return createJournal(journalPath(rf.staging), hdr, func(add func(*journalEntry) error) error {
		for _, rec := range m.Sections {
			i, ok := byName[rec.Name]
			if !ok || !mine[i] || rec.Status == StatusCancelled {
				continue
			}
			e := journalEntry{Index: i, Record: rec, Outputs: outputs[rec.Name], Timing: timing[rec.Name]}
			if why := checkEntry(pl, &e, rf.final); why != "" {
				rep.redo(rec.Name, why)
				continue
			}
			res, why := readBack(pl, i, rf.final, e.Outputs)
			if why != "" {
				rep.redo(rec.Name, why)
				continue
			}
			res.report = SectionReport{Name: rec.Name, Status: rec.Status, Err: rec.Err, Stages: rec.Stages}
			e.Row = res.entry(pl, i, hdr.Attempt-1, withSection).Row
			e.Attempt = hdr.Attempt - 1
			if withSection {
				e.Section = res.doc
			}
			if err := linkOutputs(rf.final, rf.staging, e.Outputs); err != nil {
				return err
			}
			rep.Kept++
			if err := add(&e); err != nil {
				return err
			}
		}
		return nil
	})
}

// readBack reads a finished section's documents back from its files, for
// its row of the batch table: the section document and every stage's
// result. why says what is missing.
func readBack(pl *Plan, i int, folder string, outs map[string]string) (sectionResult, string) {
	name := pl.Sections[i].Name
	var res sectionResult
	read := func(rel string) ([]byte, bool) {
		if _, listed := outs[rel]; !listed {
			return nil, false
		}
		b, err := os.ReadFile(filepath.Join(folder, filepath.FromSlash(rel)))
		return b, err == nil
	}
	doc, ok := read(name + "/section.json")
	if !ok {
		return res, "its section document was not written, and the batch table needs it"
	}
	res.doc = doc
	res.results = map[string]*stage.ResultDoc{}
	for _, st := range pl.Stages {
		if b, ok := read(name + "/results/" + st.ID + ".json"); ok {
			d, err := stage.DecodeResult(b)
			if err != nil {
				return res, "the result of stage " + st.ID + " does not read: " + err.Error()
			}
			res.results[st.ID] = d
		} else if pl.Pipeline.Outputs.Has(DocResults) {
			return res, "the result of stage " + st.ID + " is missing"
		} else {
			return res, "its results were not written, and the batch table needs them"
		}
	}
	return res, ""
}

// checkEntry says why a finished section cannot be kept ("" when it can):
// it is not the plan's section at its index, it did not succeed, an input
// is not what it read, or an output in folder is not what it wrote.
func checkEntry(pl *Plan, e *journalEntry, folder string) string {
	sp := pl.Sections[e.Index]
	if e.Record.Name != sp.Name {
		return "the plan has another section there"
	}
	if e.Record.Status != StatusOK {
		return "it was " + e.Record.Status
	}
	var files []string
	for _, f := range e.Record.Inputs {
		files = append(files, f.Path)
	}
	if !slices.Equal(files, sp.Files) {
		return "its files are now " + strings.Join(sp.Files, ", ")
	}
	for _, f := range e.Record.Inputs {
		sum, err := digest.File(pl.Pipeline.abs(f.Path))
		if err != nil {
			return fmt.Sprintf("input %s: %v", f.Path, err)
		}
		if sum != f.SHA256 {
			return "input " + f.Path + " changed"
		}
	}
	for p, want := range e.Outputs {
		full, ok := inside(folder, p)
		if !ok {
			return "output " + p + " is outside the run folder"
		}
		fi, err := os.Lstat(full)
		switch {
		case err != nil:
			return "output " + p + " is missing"
		case !fi.Mode().IsRegular():
			return "output " + p + " is not a regular file"
		}
		if got, err := digest.File(full); err != nil || got != want {
			return "output " + p + " changed"
		}
	}
	return ""
}

// linkOutputs puts the files outs lists, from folder from, into folder to:
// a hard link where the file system allows, else a copy.
func linkOutputs(from, to string, outs map[string]string) error {
	for p := range outs {
		src := filepath.Join(from, filepath.FromSlash(p))
		dst := filepath.Join(to, filepath.FromSlash(p))
		if err := os.MkdirAll(filepath.Dir(dst), 0o755); err != nil {
			return err
		}
		if err := os.Link(src, dst); err == nil {
			continue
		}
		if err := copyFile(src, dst); err != nil {
			return fmt.Errorf("pipeline: keep %s: %w", p, err)
		}
	}
	return nil
}

func copyFile(src, dst string) error {
	in, err := os.Open(src)
	if err != nil {
		return err
	}
	defer in.Close()
	out, err := os.OpenFile(dst, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return err
	}
	if _, err := io.Copy(out, in); err != nil {
		out.Close()
		return err
	}
	return out.Close()
}

// prune removes from the adopted staging folder every file that no kept
// section lists: what the section under way at the crash had written,
// and the files of sections made again.
func (rf *runFolder) prune(j *journal) error {
	listed := map[string]bool{JournalName: true}
	err := j.each(func(e *journalEntry) error {
		for p := range e.Outputs {
			listed[p] = true
		}
		return nil
	})
	if err != nil {
		return err
	}
	var stale []string
	filepath.WalkDir(rf.staging, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return nil
		}
		rel, _ := filepath.Rel(rf.staging, p)
		if !listed[filepath.ToSlash(rel)] {
			stale = append(stale, p)
		}
		return nil
	})
	for _, p := range stale {
		if err := os.Remove(p); err != nil {
			return fmt.Errorf("pipeline: resume: %w", err)
		}
	}
	return nil
}

// sameRun says how two runs differ in what makes a run the run it is
// (the tool, the pipeline file, the plan, the stages and their
// executables), "" when they do not.
func sameRun(a, b journalHeader) string {
	return headDifference(a.runHead, b.runHead, "the earlier run", "this one")
}

// headDifference words the first way in which a differs from b, named
// an and bn ("" when they do not differ).
func headDifference(a, b runHead, an, bn string) string {
	diff := func(what, x, y string) string {
		return fmt.Sprintf("%s: %s in %s, %s in %s", what, x, an, y, bn)
	}
	switch {
	case a.Tool != b.Tool:
		return diff("foilwright", toolString(a.Tool), toolString(b.Tool))
	case a.Pipeline.SHA256 != b.Pipeline.SHA256:
		return diff("the pipeline file's sha256", a.Pipeline.SHA256, b.Pipeline.SHA256)
	case a.Pipeline != b.Pipeline:
		return diff("the pipeline file", a.Pipeline.File, b.Pipeline.File)
	case a.Sections != b.Sections:
		return diff("the inputs (sections planned)", fmt.Sprint(a.Sections), fmt.Sprint(b.Sections))
	case a.Plan != b.Plan:
		return diff("the inputs (the files of the sections; plan digest)", short(a.Plan), short(b.Plan))
	case len(a.Stages) != len(b.Stages):
		return diff("the stages", fmt.Sprint(len(a.Stages)), fmt.Sprint(len(b.Stages)))
	}
	for k := range a.Stages {
		x, y := a.Stages[k], b.Stages[k]
		what := "stage " + x.ID
		switch {
		case x.ID != y.ID || x.Stage != y.Stage:
			return diff("stage "+fmt.Sprint(k+1), x.ID+" ("+x.Stage+")", y.ID+" ("+y.Stage+")")
		case x.Name != y.Name || x.Version != y.Version:
			return diff(what, x.Name+" "+x.Version, y.Name+" "+y.Version)
		case x.Executable != y.Executable:
			return diff(what+"'s executable (sha256)", short(x.Executable), short(y.Executable))
		case string(x.Params) != string(y.Params) && !jsonEqual(x.Params, y.Params):
			return diff(what+"'s parameters", string(x.Params), string(y.Params))
		case !slices.Equal(x.Environment, y.Environment):
			return diff(what+"'s environment", envDiff(x.Environment, y.Environment), envDiff(y.Environment, x.Environment))
		case x.Keep != y.Keep:
			return diff(what+"'s keep", orDefault(x.Keep, stage.KeepAll), orDefault(y.Keep, stage.KeepAll))
		case !slices.Equal(x.RunsFrom, y.RunsFrom):
			return diff(what+"'s files it runs from", fmt.Sprint(x.RunsFrom), fmt.Sprint(y.RunsFrom))
		case !slices.Equal(x.After, y.After) || x.OnError != y.OnError || x.TimeoutS != y.TimeoutS || x.Pin != y.Pin || !slices.Equal(x.Pins, y.Pins):
			return diff(what+"'s settings", fmt.Sprintf("after %v, on_error %s", x.After, x.OnError), fmt.Sprintf("after %v, on_error %s", y.After, y.OnError))
		}
	}
	return ""
}

func orDefault(s, d string) string {
	if s == "" {
		return d
	}
	return s
}

// envDiff lists the variables of a that b lacks or has otherwise.
func envDiff(a, b []string) string {
	var d []string
	for _, v := range a {
		if !slices.Contains(b, v) {
			d = append(d, v)
		}
	}
	if len(d) == 0 {
		return "nothing more"
	}
	return strings.Join(d, " ")
}

// jsonEqual reports whether two JSON texts are the same but for spacing.
func jsonEqual(a, b []byte) bool {
	var ca, cb bytes.Buffer
	return json.Compact(&ca, a) == nil && json.Compact(&cb, b) == nil && bytes.Equal(ca.Bytes(), cb.Bytes())
}
