package pipeline

import (
	"bytes"
	"context"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"sync"
	"time"

	"github.com/foilwright/foilwright/export"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/atomicfile"
	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/internal/version"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/prep"
)

// An Input is what the geometry chain gets for one section: its name,
// station, and the bytes of its files, read by Run (the chain reads no
// files).
type Input struct {
	Section string   // section name
	Station *float64 // spanwise station, if given
	Files   []prep.File
	// PlotFormat, when not empty, asks for the preparation pictures in
	// that format (plot.SVG or plot.PNG), as Prepared.Artifacts.
	PlotFormat string
}

// Prepared is the geometry chain's answer for one section.
type Prepared struct {
	Section []byte // the section document, JSON (format foilwright.section/1)
	// Doc is the section Section encodes, when the preparer has it; nil
	// means Run decodes Section.
	Doc       *section.Section
	Summary   string           // one or a few lines for a person: points used, fit, warnings
	Artifacts []stage.Artifact // pictures of the preparation, when asked for; Run writes them under plots/
	// Preparation is what the chain made, when the preparer has it: a
	// comparison with the design reads the kept points and their lines
	// from it (without it, the section's nodes stand for the points).
	Preparation *prep.Preparation
}

// A Preparer runs the geometry chain (read, clean, fit, edges, normalise,
// repanel, properties) for one section. It must be deterministic and safe
// for concurrent use by several workers.
type Preparer interface {
	Prepare(ctx context.Context, in Input, s prep.Settings) (Prepared, error)
}

// A StageCall names one stage of a pipeline for a StageRunner.
type StageCall struct {
	ID      string        // stage id in the pipeline
	Stage   string        // built-in name, or the executable's absolute path when Exec
	Exec    bool          // Stage is an executable path
	SHA256  string        // pinned executable digest, "" when not pinned
	Params  []byte        // parameters, the raw JSON object of the pipeline file
	Timeout time.Duration // 0 means the runner's default
	Env     []string      // names of variables of foilwright's environment the stage may see
	Keep    string        // detail of the result document written (stage.KeepAll, …)
}

// An EnvReporter is a StageRunner that can say which environment the stage
// of a call gets (NAME=VALUE), for the manifest.
type EnvReporter interface {
	Environment(call StageCall) []string
}

// A StageRunner runs stage calls. One worker uses one runner, never
// concurrently, so a runner may keep its stage processes alive between
// calls; Close stops them.
type StageRunner interface {
	// Describe starts the stage of call if need be and returns its
	// description and the hex sha256 of the executable that serves it.
	Describe(ctx context.Context, call StageCall) (info stage.Info, executable string, err error)
	// Run runs the stage of call on req, which carries the section
	// document without its nodes and the nodes (req.DecodeSection, or
	// stage.JoinNodes, puts them together), call's parameters, the
	// results of the stages it runs after, decoded, by stage id
	// (req.Dep), and the section's name. The result has Doc or JSON set.
	Run(ctx context.Context, call StageCall, req stage.Request) (stage.Result, error)
	Close() error
}

// RunOptions say how Run does its work.
type RunOptions struct {
	// Folder is the run folder; "" means the one the pipeline file names.
	Folder string
	// Replace allows a run folder that holds an earlier run (and nothing
	// else: ErrFolderUnsafe otherwise). The new run replaces it as a whole
	// once it is made, and only if every section succeeded; otherwise the
	// earlier run stays and the new one is dropped. Without Replace a
	// folder that holds files makes Run fail with ErrFolderNotEmpty.
	Replace bool
	// Limits bound what Run reads (input-bytes, input-lines); the zero
	// value means limits.Default().
	Limits limits.Limits
	// Jobs is the number of sections made at once; less than 1 means 1.
	Jobs int
	// Preparer makes the section documents. Required.
	Preparer Preparer
	// NewRunner gives each worker its own StageRunner. Required when the
	// pipeline has stages.
	NewRunner func() (StageRunner, error)
	// Done, if set, is called after each section (also a cancelled one),
	// from the worker that made it: calls may come from several goroutines
	// at once. Sections a resumed run keeps are not made, and not called.
	Done func(SectionReport)
	// Begin, if set, is called once the stages are described and an
	// earlier attempt looked at (Resume), before any section is made,
	// with the number of sections to make and what was kept.
	Begin func(todo int, resumed ResumeReport)
	// Shard, when set, makes the run one shard of a run split across
	// processes or machines: only the shard's sections (Plan.ShardSections),
	// into the shard's part of the run folder (ShardFolder), with a
	// partial manifest. Merge combines the parts once all are done.
	Shard *Shard
	// Resume keeps what an earlier attempt at the same run (or shard)
	// finished, and makes only the rest: the sections it did not finish,
	// those that failed, and those whose inputs changed or whose outputs
	// no longer match their record. The earlier attempt is the run
	// committed in the folder, or the staging folder a crash left there.
	// A resumed run replaces the earlier one whatever happens (it keeps
	// every section the earlier one had made). An earlier attempt of
	// another pipeline, tool or stages is refused (ErrNotResumable).
	Resume bool
}

// Section statuses.
const (
	StatusOK        = "ok"        // every step succeeded
	StatusPartial   = "partial"   // a stage with on_error "continue" failed
	StatusFailed    = "failed"    // preparing failed, or a stage with on_error "stop" failed
	StatusCancelled = "cancelled" // the run was cancelled before the section was done
)

// A SectionReport says how one section went.
type SectionReport struct {
	Name    string
	Status  string
	Err     string // why it failed, when it did
	Input   bool   // it failed because of its input (files, parameters, a stage refusing the section)
	Summary string // the Preparer's summary
	Stages  []StageReport
	// Compare is how the section compared with its design, when the
	// pipeline compares it.
	Compare *Verdict
}

// A StageReport says how one stage went for one section.
type StageReport struct {
	ID       string   `json:"id"`
	Status   string   `json:"status"` // ok, failed, skipped (a stage it runs after failed), not-run (the section stopped)
	Err      string   `json:"error,omitempty"`
	Warnings []string `json:"warnings,omitempty"`
}

// A Summary reports a whole run.
type Summary struct {
	Folder    string
	Manifest  string // path of manifest.json; "" when the run was not kept
	Sections  []SectionReport
	Cancelled bool
	// Kept is set when the run replaced nothing because it did not fully
	// succeed: the earlier run in Folder was kept and this one dropped.
	Kept bool
	// Resumed says what a resumed run kept of the earlier attempt.
	Resumed ResumeReport
}

// OutOfTolerance returns the sections that were compared with their
// design and failed their tolerance.
func (s *Summary) OutOfTolerance() []SectionReport {
	var f []SectionReport
	for _, r := range s.Sections {
		if r.Compare != nil && r.Compare.Verdict == "fail" {
			f = append(f, r)
		}
	}
	return f
}

// Failed returns the sections that failed.
func (s *Summary) Failed() []SectionReport {
	var f []SectionReport
	for _, r := range s.Sections {
		if r.Status == StatusFailed {
			f = append(f, r)
		}
	}
	return f
}

// Err returns nil when every section and every stage succeeded, else an
// error saying how many sections did not: it wraps ErrBadInput when one
// of them failed because of its input (the exit-status rule: bad input
// first). A stage that failed with on_error "continue" counts.
func (s *Summary) Err() error {
	bad, input := 0, false
	var first *SectionReport
	for i := range s.Sections {
		r := &s.Sections[i]
		if r.Status == StatusOK {
			continue
		}
		bad++
		input = input || r.Input
		if first == nil || first.Err == "" && r.Err != "" {
			first = r
		}
	}
	if bad == 0 {
		return nil
	}
	msg := fmt.Sprintf("%d of %d section(s) did not complete; %s: %s", bad, len(s.Sections), first.Name, first.reason())
	if input {
		return fmt.Errorf("%s (%w: a section's input or parameters must be fixed)", msg, ErrBadInput)
	}
	return errors.New(msg)
}

// reason says why a section did not complete: its error, or the first
// stage that failed.
func (r *SectionReport) reason() string {
	if r.Err != "" {
		return r.Err
	}
	for _, st := range r.Stages {
		if st.Err != "" {
			return fmt.Sprintf("stage %q %s: %s", st.ID, st.Status, st.Err)
		}
	}
	return r.Status
}

// allOK reports whether every section succeeded.
func (s *Summary) allOK() bool {
	for _, r := range s.Sections {
		if r.Status != StatusOK {
			return false
		}
	}
	return true
}

// Run makes every section of pl and runs it through the stages, writing the
// run folder and its manifest. A failed section does not stop the others:
// it is reported in the summary with its reason, and the run still returns
// a nil error (Summary.Err says how the sections went). Run returns an
// error when the run cannot start (folder, lock, stage runners, a stage
// that cannot describe itself or refuses its parameters), and ctx.Err()
// when it was cancelled; then the sections already done keep their
// outputs, the others have none, and the manifest marks the run
// interrupted.
//
// The run is written beside the run folder and committed as a whole at
// the end (see folder.go): a new folder gets the run whatever happened to
// its sections; a replacement happens only when every section succeeded,
// and otherwise the earlier run stays as it was. As each section ends,
// its record is appended to the run's journal (journal.go), from which
// the manifest is assembled at the end: a crash leaves the journal
// complete up to the last finished section, and RunOptions.Resume picks
// up from it.
//
// With RunOptions.Shard, Run makes only the shard's sections, into the
// shard's part of the run folder (ShardFolder), with a partial manifest
// and its journal; Merge makes the run folder of the parts.
func Run(ctx context.Context, pl *Plan, opts RunOptions) (*Summary, error) {
	start := time.Now()
	if opts.Preparer == nil {
		panic("pipeline: Run without a Preparer")
	}
	if (len(pl.Stages) > 0 || pl.needsRunner()) && opts.NewRunner == nil {
		return nil, errors.New("pipeline: the pipeline has stages but no stage runner was given")
	}
	if opts.Limits == (limits.Limits{}) {
		opts.Limits = limits.Default()
	}
	runFolder := opts.Folder
	if runFolder == "" {
		runFolder = pl.Pipeline.Folder()
	}
	folder, idx := runFolder, make([]int, len(pl.Sections))
	for i := range idx {
		idx[i] = i
	}
	if opts.Shard != nil {
		if err := opts.Shard.check(); err != nil {
			return nil, fmt.Errorf("%w: %v", ErrBadInput, err)
		}
		folder, idx = ShardFolder(runFolder, *opts.Shard), pl.ShardSections(*opts.Shard)
	}
	rf, err := openRunFolder(folder, opts.Replace || opts.Resume, opts.Resume)
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
	jobs := max(opts.Jobs, 1)
	jobs = min(jobs, max(len(idx), 1))

	// One runner per worker; the first also describes the stages.
	runners, err := startRunners(pl, opts, jobs)
	defer func() {
		for _, r := range runners {
			r.Close()
		}
	}()
	if err != nil {
		return nil, err
	}
	calls, infos, exes, err := describeStages(ctx, pl, runners)
	if err != nil {
		return nil, err
	}
	hdr := journalHeader{Format: JournalFormat, runHead: newRunHead(pl, runFolder, infos, exes, calls, runners), Shard: opts.Shard, Attempt: 1}
	var j *journal
	var resumed ResumeReport
	if opts.Resume {
		j, resumed, err = rf.resume(pl, hdr, idx, opts.Limits)
	} else {
		j, err = createJournal(journalPath(rf.staging), hdr, nil)
	}
	if err != nil {
		return nil, err
	}
	defer j.close()
	var todo []int
	for _, i := range idx {
		if !j.has(i) {
			todo = append(todo, i)
		}
	}
	if opts.Begin != nil {
		opts.Begin(len(todo), resumed)
	}
	cancelled, err := runSections(ctx, pl, rf.staging, calls, opts, runners, min(jobs, max(len(todo), 1)), todo, j)
	if err != nil {
		return nil, err
	}

	sum := &Summary{Folder: runFolder, Manifest: filepath.Join(folder, ManifestName), Cancelled: cancelled, Resumed: resumed}
	if err := j.reports(pl, idx, func(r SectionReport) { sum.Sections = append(sum.Sections, r) }); err != nil {
		return sum, err
	}
	a := &assembly{pl: pl, head: hdr.runHead, interrupted: cancelled, idx: idx, entry: j.entry, runOutputs: map[string]string{}}
	if opts.Shard != nil {
		a.shard = &ShardRecord{Shard: *opts.Shard, Plan: hdr.Plan, Sections: hdr.Sections}
	} else if !cancelled {
		if err := writeRunOutputs(pl, rf.staging, idx, j.entry, a.runOutputs); err != nil {
			return sum, err
		}
	}
	a.timings = Timings{Started: start.UTC().Format(time.RFC3339), Jobs: jobs}
	a.timings.TotalS = seconds(time.Since(start))
	a.timings.MaxRSSKiB = maxRSSKiB()
	if err := a.writeTo(filepath.Join(rf.staging, ManifestName)); err != nil {
		sum.Manifest = ""
		return sum, err
	}
	j.close()
	if opts.Shard == nil {
		// A run folder holds what its manifest lists, and the manifest.
		if err := os.Remove(journalPath(rf.staging)); err != nil {
			sum.Manifest = ""
			return sum, fmt.Errorf("pipeline: journal: %w", err)
		}
	}
	if rf.earlier && !opts.Resume && (cancelled || !sum.allOK()) {
		sum.Manifest, sum.Kept = "", true
	} else {
		if err := rf.commit(); err != nil {
			sum.Manifest = ""
			return sum, err
		}
		keep = true
	}
	if cancelled {
		return sum, ctx.Err()
	}
	return sum, nil
}

// newRunHead records what makes the run the run it is: the tool, the
// pipeline file (relative to the run folder, so that a run folder moved
// together with its inputs still verifies), the stages as they described
// themselves with the environment each gets, and the plan.
func newRunHead(pl *Plan, folder string, infos []stage.Info, exes []string, calls []StageCall, runners []StageRunner) runHead {
	p := pl.Pipeline
	file := p.Path
	if file == "" {
		file = p.File
	}
	if abs, err := filepath.Abs(file); err == nil {
		if af, err := filepath.Abs(folder); err == nil {
			if rel, err := filepath.Rel(af, abs); err == nil {
				file = filepath.ToSlash(rel)
			}
		}
	}
	h := runHead{
		Tool:     Tool{Name: "foilwright", Version: version.Version, Revision: version.Revision()},
		Pipeline: PipelineRef{File: file, Name: p.Name, SHA256: p.SHA256},
		Stages:   []StageRecord{},
		Plan:     pl.Digest(),
		Sections: len(pl.Sections),
	}
	var er EnvReporter
	var rr RunsFromReporter
	if len(runners) > 0 {
		er, _ = runners[0].(EnvReporter)
		rr, _ = runners[0].(RunsFromReporter)
	}
	for i, st := range pl.Stages {
		rec := StageRecord{
			ID: st.ID, Stage: st.Stage, Name: infos[i].Name, Version: infos[i].Version,
			Executable: exes[i], Pin: st.SHA256, Params: json.RawMessage(st.Params),
			After: st.After, OnError: st.OnError, TimeoutS: st.TimeoutS, Pins: st.Pins,
		}
		if st.Keep != stage.KeepAll {
			rec.Keep = st.Keep
		}
		if er != nil {
			rec.Environment = er.Environment(calls[i])
		}
		if rr != nil {
			rec.RunsFrom = rr.RunsFrom(calls[i])
		}
		h.Stages = append(h.Stages, rec)
	}
	return h
}

// reports calls f with the report of each section of idx, in plan order:
// from its journal entry, or cancelled when it has none.
func (j *journal) reports(pl *Plan, idx []int, f func(SectionReport)) error {
	for _, i := range idx {
		e, ok, err := j.entry(i)
		if err != nil {
			return err
		}
		if ok {
			f(e.report())
		} else {
			f(SectionReport{Name: pl.Sections[i].Name, Status: StatusCancelled})
		}
	}
	return nil
}

// startRunners makes one stage runner per worker when the pipeline has
// stages. The runners made so far are returned with an error, for the
// caller to close.
func startRunners(pl *Plan, opts RunOptions, jobs int) ([]StageRunner, error) {
	runners := make([]StageRunner, 0, jobs)
	if len(pl.Stages) == 0 && !pl.needsRunner() {
		return runners, nil
	}
	for range jobs {
		r, err := opts.NewRunner()
		if err != nil {
			return runners, fmt.Errorf("pipeline: start stage runner: %w", err)
		}
		runners = append(runners, r)
	}
	return runners, nil
}

// describeStages makes the call of every stage and asks the first runner
// to describe it, for the manifest: its description and the digest of its
// executable.
func describeStages(ctx context.Context, pl *Plan, runners []StageRunner) ([]StageCall, []stage.Info, []string, error) {
	calls := make([]StageCall, len(pl.Stages))
	infos := make([]stage.Info, len(pl.Stages))
	exes := make([]string, len(pl.Stages))
	for i, st := range pl.Stages {
		calls[i] = callOf(st)
		info, exe, err := runners[0].Describe(ctx, calls[i])
		if err != nil {
			if ctx.Err() != nil {
				return nil, nil, nil, ctx.Err()
			}
			return nil, nil, nil, fmt.Errorf("pipeline: stage %q (%s): %w", st.ID, st.Stage, err)
		}
		// Every stage's parameters are checked before any section is made.
		if _, err := stage.Validate(info.Params, st.Params); err != nil {
			return nil, nil, nil, pl.Pipeline.ParamsError(st, err)
		}
		infos[i], exes[i] = info, exe
	}
	return calls, infos, exes, nil
}

// runSections makes the sections todo on jobs workers, each with its own
// runner, appending each finished section to the journal, and reports
// whether the run was cancelled. It fails when the journal cannot be
// written.
func runSections(ctx context.Context, pl *Plan, folder string, calls []StageCall, opts RunOptions, runners []StageRunner, jobs int, todo []int, j *journal) (bool, error) {
	withSection := pl.Pipeline.Outputs.HasPlot(PlotStations) || pl.Pipeline.Outputs.HasExport(ExportStationsDXF) || pl.Pipeline.Outputs.HasExport(ExportStationsCSV)
	work := make(chan int)
	var wg sync.WaitGroup
	var mu sync.Mutex
	var jerr error
	ctx, stop := context.WithCancel(ctx)
	defer stop()
	for w := range jobs {
		var r StageRunner
		if len(runners) > 0 {
			r = runners[w]
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range work {
				res := runSection(ctx, pl, folder, i, calls, opts, r)
				if res.report.Status != StatusCancelled {
					if err := j.add(res.entry(pl, i, j.head.Attempt, withSection)); err != nil {
						mu.Lock()
						jerr = errors.Join(jerr, err)
						mu.Unlock()
						stop()
					}
				}
				if opts.Done != nil {
					opts.Done(res.report)
				}
			}
		}()
	}
	cancelled := false
feed:
	for _, i := range todo {
		select {
		case work <- i:
		case <-ctx.Done():
			cancelled = true
			break feed
		}
	}
	close(work)
	wg.Wait()
	if jerr != nil {
		return false, jerr
	}
	return cancelled || ctx.Err() != nil, nil
}

// writeRunOutputs writes the run's own outputs (the stations picture and
// exports, the batch table) from the journal entries of the sections idx,
// and records them in outs.
func writeRunOutputs(pl *Plan, folder string, idx []int, entry func(int) (journalEntry, bool, error), outs map[string]string) error {
	if err := writeTable(pl, folder, idx, entry, outs); err != nil {
		return err
	}
	if err := writeVerdicts(pl, folder, idx, entry, outs); err != nil {
		return err
	}
	out := pl.Pipeline.Outputs
	if !out.HasPlot(PlotStations) && !out.HasExport(ExportStationsDXF) && !out.HasExport(ExportStationsCSV) {
		return nil
	}
	var docs []stationDoc
	for _, i := range idx {
		e, ok, err := entry(i)
		if err != nil {
			return err
		}
		if !ok || len(e.Section) == 0 {
			continue
		}
		sec, err := section.Read(bytes.NewReader(e.Section), pl.Sections[i].Name+"/section.json")
		if err != nil {
			return fmt.Errorf("stations: %w", err)
		}
		docs = append(docs, stationDoc{i: i, sec: sec})
	}
	if out.HasPlot(PlotStations) {
		if err := writeStations(pl, folder, docs, outs); err != nil {
			return err
		}
	}
	return writeStationExports(pl, folder, docs, outs)
}

// stationDoc is a section made, for the stations picture and exports.
type stationDoc struct {
	i   int // in the plan
	sec *section.Section
}

// writeTable writes the batch table: a row per section, in plan order.
func writeTable(pl *Plan, folder string, idx []int, entry func(int) (journalEntry, bool, error), outs map[string]string) error {
	ids := pl.stageIDs()
	cols := newTableColumns(ids)
	rows := func(f func(row []Cell)) error {
		for _, i := range idx {
			e, ok, err := entry(i)
			if err != nil {
				return err
			}
			if ok {
				f(e.Row)
			} else {
				sp := pl.Sections[i]
				f(tableRow(sp.Name, sp.Station, StatusCancelled, "", "", nil, nil, nil))
			}
		}
		return nil
	}
	if err := rows(cols.add); err != nil {
		return err
	}
	h := sha256.New()
	err := writeStream(filepath.Join(folder, TableName), func(w io.Writer) error {
		t := newTableWriter(io.MultiWriter(w, h), cols.headers())
		if err := rows(t.row); err != nil {
			return err
		}
		return t.flush()
	})
	if err != nil {
		return fmt.Errorf("batch table: %w", err)
	}
	outs[TableName] = hex.EncodeToString(h.Sum(nil))
	return nil
}

// writeStations writes the run's stations picture, when two or more
// sections have a station, and records it in m.
func writeStations(pl *Plan, folder string, docs []stationDoc, outs map[string]string) error {
	name, data, err := stationsPlot(pl, docs)
	if err == nil && data != nil {
		err = atomicfile.WriteBytes(filepath.Join(folder, name), data)
	}
	if err != nil {
		return fmt.Errorf("stations plot: %w", err)
	}
	if data != nil {
		outs[name] = digest.Bytes(data)
	}
	return nil
}

// writeStationExports writes the stations exports outputs.exports asks
// for (stations.dxf, stations.csv: every section made, in space, in plan
// order) and records them in m. Sections neither cut from 3D nor given a
// station are left out, with a note in the error when none is left.
func writeStationExports(pl *Plan, folder string, docs []stationDoc, outs map[string]string) error {
	out := pl.Pipeline.Outputs
	if !out.HasExport(ExportStationsDXF) && !out.HasExport(ExportStationsCSV) {
		return nil
	}
	var sts []export.Station
	for _, d := range docs {
		p, err := export.Place(d.sec, export.PlaceOptions{})
		if err != nil {
			return fmt.Errorf("stations export: section %q: %w", pl.Sections[d.i].Name, err)
		}
		at := pl.Sections[d.i].Station
		if p.Plane == nil {
			if at == nil {
				continue
			}
			p.AtStation(*at)
		}
		sts = append(sts, export.Station{Position: at, Section: p})
	}
	if len(sts) == 0 {
		return errors.New("stations export: no section has a place along the span (a cut plane or a station)")
	}
	for _, e := range []struct {
		kind, name string
		write      func(io.Writer, []export.Station) error
	}{{ExportStationsDXF, "stations.dxf", export.StationsDXF}, {ExportStationsCSV, "stations.csv", export.StationsCSV}} {
		if !out.HasExport(e.kind) {
			continue
		}
		var b bytes.Buffer
		if err := e.write(&b, sts); err != nil {
			return fmt.Errorf("stations export: %w", err)
		}
		if err := atomicfile.WriteBytes(filepath.Join(folder, e.name), b.Bytes()); err != nil {
			return err
		}
		outs[e.name] = digest.Bytes(b.Bytes())
	}
	return nil
}

func callOf(st Stage) StageCall {
	c := StageCall{ID: st.ID, Stage: st.Stage, SHA256: st.SHA256, Params: st.Params,
		Timeout: time.Duration(st.TimeoutS * float64(time.Second)), Env: st.Env, Keep: st.Keep}
	if st.Exec != "" {
		c.Stage, c.Exec = st.Exec, true
	}
	return c
}

// inside resolves a slash path recorded in a manifest within folder, and
// reports whether it stays inside.
func inside(folder, p string) (string, bool) {
	c := filepath.Clean(filepath.FromSlash(p))
	if filepath.IsAbs(c) || c == ".." || strings.HasPrefix(c, ".."+string(filepath.Separator)) {
		return "", false
	}
	return filepath.Join(folder, c), true
}

func seconds(d time.Duration) float64 { return d.Round(time.Microsecond).Seconds() }

// stationsPlot draws chord, twist, thickness and fit RMS against the station
// of every section that was made and has a station. It returns no data when
// fewer than two sections qualify.
func stationsPlot(pl *Plan, docs []stationDoc) (string, []byte, error) {
	var st []plot.Station
	units := ""
	for _, d := range docs {
		s, at := d.sec, pl.Sections[d.i].Station
		if at == nil || s.Frame == nil || s.Properties == nil {
			continue
		}
		units = string(s.Units)
		rms := 0.0
		if s.Fit != nil {
			rms = s.Fit.RMS
		}
		st = append(st, plot.Station{Position: *at, Chord: s.Frame.Chord, TwistDeg: s.Frame.TwistDeg, Thickness: s.Properties.Thickness, FitRMS: rms})
	}
	if len(st) < 2 {
		return "", nil, nil
	}
	sort.SliceStable(st, func(a, b int) bool { return st[a].Position < st[b].Position })
	f, err := plot.StationsPlot(units, st)
	if err != nil {
		return "", nil, err
	}
	format := pl.Pipeline.Outputs.PlotFormat
	data, err := plot.Encode(f, format)
	return "stations." + format, data, err
}
