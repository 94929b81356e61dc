package pipeline

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"sync"
	"time"

	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/atomicfile"
	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/plot"
	"github.com/foilwright/foilwright/prep"
	"github.com/tidwall/gjson"
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
	Section   []byte     // the section document, JSON (format foilwright.section/1)
	Summary   string     // one or a few lines for a person: points used, fit, warnings
	Artifacts []Artifact // pictures of the preparation, when asked for
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
}

// StageInfo identifies a stage for the manifest.
type StageInfo struct {
	Name       string // the name the stage gives itself
	Version    string
	Executable string // sha256 of the executable that serves it
}

// A StageInput is what a stage run gets: the section document and the
// result documents of the stages it runs after, by stage id.
type StageInput struct {
	Name    string // section name, for messages
	Section []byte
	Deps    map[string][]byte
}

// An Artifact is a file a stage returns; Run writes it under plots/.
type Artifact struct {
	Name      string // base name, e.g. "cp.svg"
	MediaType string
	Data      []byte
}

// StageOutput is the answer of one stage run.
type StageOutput struct {
	Result    []byte // the result document, JSON (format foilwright.result/1)
	Artifacts []Artifact
	Warnings  []string
}

// A StageRunner runs stage calls. One worker uses one runner, never
// concurrently, so a runner may keep its stage processes alive between
// calls; Close stops them.
type StageRunner interface {
	Describe(ctx context.Context, call StageCall) (StageInfo, error)
	Run(ctx context.Context, call StageCall, in StageInput) (StageOutput, error)
	Close() error
}

// RunOptions say how Run does its work.
type RunOptions struct {
	// Folder is the run folder; "" means the one the pipeline file names.
	Folder string
	// Replace allows a run folder that holds an earlier run: the files its
	// manifest lists and the manifest are removed first. Any other file in
	// a non-empty folder makes Run fail with ErrFolderNotEmpty.
	Replace bool
	// Jobs is the number of sections made at once; less than 1 means 1.
	Jobs int
	// Preparer makes the section documents. Required.
	Preparer Preparer
	// NewRunner gives each worker its own StageRunner. Required when the
	// pipeline has stages.
	NewRunner func() (StageRunner, error)
	// Done, if set, is called after each section (also a cancelled one),
	// from the worker that made it: calls may come from several goroutines
	// at once.
	Done func(SectionReport)
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
	Summary string // the Preparer's summary
	Stages  []StageReport
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
	Manifest  string // path of manifest.json
	Sections  []SectionReport
	Cancelled bool
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

// Run makes every section of pl and runs it through the stages, writing the
// run folder and its manifest. A failed section does not stop the others:
// it is reported in the summary with its reason, and the run still returns
// a nil error. Run returns an error when the run cannot start (folder, stage
// runners, a stage that cannot describe itself), and ctx.Err() when it was
// cancelled; then the sections already done keep their outputs, the others
// have none, and the manifest marks the run interrupted. Every file is
// written atomically, so no partial file remains.
func Run(ctx context.Context, pl *Plan, opts RunOptions) (*Summary, error) {
	start := time.Now()
	if opts.Preparer == nil {
		panic("pipeline: Run without a Preparer")
	}
	if len(pl.Stages) > 0 && opts.NewRunner == nil {
		return nil, errors.New("pipeline: the pipeline has stages but no stage runner was given")
	}
	folder := opts.Folder
	if folder == "" {
		folder = pl.Pipeline.Folder()
	}
	if err := prepareFolder(folder, opts.Replace); err != nil {
		return nil, err
	}
	jobs := max(opts.Jobs, 1)
	jobs = min(jobs, max(len(pl.Sections), 1))

	// One runner per worker; the first also describes the stages.
	runners := make([]StageRunner, 0, jobs)
	defer func() {
		for _, r := range runners {
			r.Close()
		}
	}()
	if len(pl.Stages) > 0 {
		for range jobs {
			r, err := opts.NewRunner()
			if err != nil {
				return nil, fmt.Errorf("pipeline: start stage runner: %w", err)
			}
			runners = append(runners, r)
		}
	}
	calls := make([]StageCall, len(pl.Stages))
	infos := make([]StageInfo, len(pl.Stages))
	for i, st := range pl.Stages {
		calls[i] = callOf(st)
		info, err := runners[0].Describe(ctx, calls[i])
		if err != nil {
			if ctx.Err() != nil {
				return nil, ctx.Err()
			}
			return nil, fmt.Errorf("pipeline: stage %q (%s): %w", st.ID, st.Stage, err)
		}
		infos[i] = info
	}

	results := make([]sectionResult, len(pl.Sections))
	work := make(chan int)
	var wg sync.WaitGroup
	for w := range jobs {
		var r StageRunner
		if len(runners) > 0 {
			r = runners[w]
		}
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range work {
				res := runSection(ctx, pl, folder, i, calls, opts.Preparer, r)
				results[i] = res
				if opts.Done != nil {
					opts.Done(res.report)
				}
			}
		}()
	}
	cancelled := false
feed:
	for i := range pl.Sections {
		select {
		case work <- i:
		case <-ctx.Done():
			cancelled = true
			break feed
		}
	}
	close(work)
	wg.Wait()
	cancelled = cancelled || ctx.Err() != nil

	sum := &Summary{Folder: folder, Manifest: filepath.Join(folder, ManifestName), Cancelled: cancelled}
	for i := range results {
		if results[i].report.Name == "" { // never started
			results[i].report = SectionReport{Name: pl.Sections[i].Name, Status: StatusCancelled}
		}
		sum.Sections = append(sum.Sections, results[i].report)
	}
	m := newManifest(pl, folder, infos, results, cancelled)
	if !cancelled && pl.Pipeline.Outputs.HasPlot(PlotStations) {
		name, data, err := stationsPlot(pl, results)
		if err == nil && data != nil {
			err = atomicfile.WriteBytes(filepath.Join(folder, name), data)
		}
		if err != nil {
			return sum, fmt.Errorf("stations plot: %w", err)
		}
		if data != nil {
			m.Outputs[name] = digest.Bytes(data)
		}
	}
	m.Timings.Jobs = jobs
	m.Timings.Started = start.UTC().Format(time.RFC3339)
	m.Timings.TotalS = seconds(time.Since(start))
	if err := writeManifest(filepath.Join(folder, ManifestName), m); err != nil {
		return sum, err
	}
	if cancelled {
		return sum, ctx.Err()
	}
	return sum, nil
}

func callOf(st Stage) StageCall {
	c := StageCall{ID: st.ID, Stage: st.Stage, SHA256: st.SHA256, Params: st.Params,
		Timeout: time.Duration(st.TimeoutS * float64(time.Second))}
	if st.Exec != "" {
		c.Stage, c.Exec = st.Exec, true
	}
	return c
}

// sectionResult is what one section produced.
type sectionResult struct {
	report  SectionReport
	section *section.Section // the section made, when preparing succeeded
	files   []FileHash       // inputs as read
	outputs map[string]string
	timing  SectionTiming
}

// output is one file of a section, relative to the run folder.
type output struct {
	path string
	data []byte
}

// runSection makes one section and writes its outputs. When the run is
// cancelled while the section is under way, nothing of it is written.
func runSection(ctx context.Context, pl *Plan, folder string, i int, calls []StageCall, preparer Preparer, runner StageRunner) sectionResult {
	sp := pl.Sections[i]
	res := sectionResult{report: SectionReport{Name: sp.Name}, timing: SectionTiming{Name: sp.Name}}
	rep := &res.report
	cancelled := func() sectionResult {
		return sectionResult{report: SectionReport{Name: sp.Name, Status: StatusCancelled}, timing: res.timing}
	}
	if ctx.Err() != nil {
		return cancelled()
	}
	fail := func(format string, args ...any) sectionResult {
		rep.Status = StatusFailed
		rep.Err = fmt.Sprintf(format, args...)
		return res
	}

	in := Input{Section: sp.Name, Station: sp.Station}
	if pl.Pipeline.Outputs.HasPlot(PlotPrep) {
		in.PlotFormat = pl.Pipeline.Outputs.PlotFormat
	}
	for _, f := range sp.Files {
		data, err := os.ReadFile(pl.Pipeline.abs(f))
		if err != nil {
			return fail("read %s: %v", f, err)
		}
		file := prep.NewFile(f, data)
		res.files = append(res.files, FileHash{Path: f, SHA256: file.SHA256})
		in.Files = append(in.Files, file)
	}

	t := time.Now()
	prepared, err := preparer.Prepare(ctx, in, sp.Settings)
	res.timing.PrepareS = seconds(time.Since(t))
	if ctx.Err() != nil {
		return cancelled()
	}
	if err != nil {
		return fail("prepare: %v", err)
	}
	rep.Summary = prepared.Summary
	sec, err := section.Read(bytes.NewReader(prepared.Section), sp.Name+"/section.json")
	if err != nil {
		return fail("prepare gave a bad section document: %v", err)
	}
	doc := pl.Pipeline.Outputs
	var outs []output
	if doc.Has(DocSection) {
		outs = append(outs, output{sp.Name + "/section.json", withNewline(prepared.Section)})
	}
	if doc.Has(DocNodes) {
		name := sec.Name
		if name == "" {
			name = sp.Name
		}
		var b bytes.Buffer
		if err := pointfile.WriteNodes(&b, name, sec.Nodes); err != nil {
			return fail("prepare gave a bad section document: %v", err)
		}
		outs = append(outs, output{sp.Name + "/nodes.dat", b.Bytes()})
	}

	for _, a := range prepared.Artifacts {
		outs = append(outs, output{sp.Name + "/plots/" + a.Name, a.Data})
	}
	res.section = sec

	results := map[string][]byte{}
	failed := map[string]bool{}
	artifactBy := map[string]string{} // artifact name → stage id
	stopped := false
	for k, st := range pl.Stages {
		sr := StageReport{ID: st.ID}
		var missing []string
		for _, id := range st.After {
			if failed[id] {
				missing = append(missing, fmt.Sprintf("%q", id))
			}
		}
		switch {
		case stopped:
			sr.Status = "not-run"
		case len(missing) > 0:
			sr.Status = "skipped"
			sr.Err = "runs after " + strings.Join(missing, ", ") + ", which did not succeed"
			failed[st.ID] = true
		default:
			deps := map[string][]byte{}
			for _, id := range st.After {
				deps[id] = results[id]
			}
			t := time.Now()
			out, err := runStage(ctx, runner, calls[k], StageInput{Name: sp.Name, Section: prepared.Section, Deps: deps})
			res.timing.Stages = append(res.timing.Stages, StageTiming{ID: st.ID, S: seconds(time.Since(t))})
			if ctx.Err() != nil {
				return cancelled()
			}
			if err == nil {
				err = checkOutput(out, st.ID, artifactBy)
			}
			if err != nil {
				sr.Status = "failed"
				sr.Err = err.Error()
				failed[st.ID] = true
				if st.OnError == OnErrorStop {
					stopped = true
					rep.Status = StatusFailed
					rep.Err = fmt.Sprintf("stage %q: %v", st.ID, err)
				} else if rep.Status == "" {
					rep.Status = StatusPartial
				}
				break
			}
			sr.Status = StatusOK
			sr.Warnings = out.Warnings
			results[st.ID] = out.Result
			if doc.Has(DocResults) {
				outs = append(outs, output{sp.Name + "/results/" + st.ID + ".json", withNewline(out.Result)})
			}
			for _, a := range out.Artifacts {
				outs = append(outs, output{sp.Name + "/plots/" + a.Name, a.Data})
			}
		}
		rep.Stages = append(rep.Stages, sr)
	}
	if rep.Status == "" {
		rep.Status = StatusOK
	}
	if ctx.Err() != nil {
		return cancelled()
	}
	res.outputs = map[string]string{}
	for _, o := range outs {
		full := filepath.Join(folder, filepath.FromSlash(o.path))
		if err := os.MkdirAll(filepath.Dir(full), 0o755); err != nil {
			return fail("write %s: %v", o.path, err)
		}
		if err := atomicfile.WriteBytes(full, o.data); err != nil {
			return fail("%v", err)
		}
		res.outputs[o.path] = digest.Bytes(o.data)
	}
	return res
}

// runStage runs one call with its time limit, turning a panic in the runner
// into an error.
func runStage(ctx context.Context, r StageRunner, call StageCall, in StageInput) (out StageOutput, err error) {
	if call.Timeout > 0 {
		var cancel context.CancelFunc
		ctx, cancel = context.WithTimeout(ctx, call.Timeout)
		defer cancel()
	}
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("stage runner panicked: %v", p)
		}
	}()
	out, err = r.Run(ctx, call, in)
	if err != nil && errors.Is(ctx.Err(), context.DeadlineExceeded) {
		err = fmt.Errorf("timed out after %v: %w", call.Timeout, err)
	}
	return out, err
}

// artifactName is the form of an artifact's file name.
var artifactName = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9._-]{0,127}$`)

// checkOutput checks what a stage returned before anything is written.
func checkOutput(out StageOutput, id string, by map[string]string) error {
	if !gjson.ValidBytes(out.Result) || !gjson.ParseBytes(out.Result).IsObject() {
		return errors.New("the stage returned a result that is not a JSON object")
	}
	names := map[string]bool{}
	for _, a := range out.Artifacts {
		if !artifactName.MatchString(a.Name) {
			return fmt.Errorf("the stage returned an artifact named %q (want a plain file name)", a.Name)
		}
		key := strings.ToLower(a.Name) // file names may not differ only in case
		if other, ok := by[key]; ok || names[key] {
			if !ok {
				other = id
			}
			return fmt.Errorf("artifact %q is also returned by stage %q", a.Name, other)
		}
		names[key] = true
	}
	for n := range names {
		by[n] = id
	}
	return nil
}

// withNewline returns b ending in a newline.
func withNewline(b []byte) []byte {
	if len(b) > 0 && b[len(b)-1] == '\n' {
		return b
	}
	return append(append([]byte{}, b...), '\n')
}

// prepareFolder makes sure folder exists and holds no files other than an
// earlier run's (which it removes when replace is set).
func prepareFolder(folder string, replace bool) error {
	entries, err := os.ReadDir(folder)
	if errors.Is(err, os.ErrNotExist) {
		return os.MkdirAll(folder, 0o755)
	}
	if err != nil {
		return fmt.Errorf("pipeline: run folder: %w", err)
	}
	if len(entries) == 0 {
		return nil
	}
	if !replace {
		return fmt.Errorf("%w: %s (choose another folder, or replace the earlier run)", ErrFolderNotEmpty, folder)
	}
	m, err := ReadManifest(filepath.Join(folder, ManifestName))
	if err != nil {
		return fmt.Errorf("%w: %s holds no foilwright run to replace (%v)", ErrFolderNotEmpty, folder, err)
	}
	paths := make([]string, 0, len(m.Outputs))
	for p := range m.Outputs {
		paths = append(paths, p)
	}
	sort.Strings(paths)
	for _, p := range paths {
		full, ok := inside(folder, p)
		if !ok {
			return fmt.Errorf("pipeline: manifest in %s lists %q, outside the run folder", folder, p)
		}
		if err := os.Remove(full); err != nil && !errors.Is(err, os.ErrNotExist) {
			return fmt.Errorf("pipeline: replace earlier run: %w", err)
		}
	}
	if err := os.Remove(filepath.Join(folder, ManifestName)); err != nil {
		return fmt.Errorf("pipeline: replace earlier run: %w", err)
	}
	// Remove the folders the earlier run made, if they are empty now.
	for _, p := range paths {
		for d := filepath.Dir(p); d != "." && d != "/"; d = filepath.Dir(d) {
			os.Remove(filepath.Join(folder, filepath.FromSlash(d)))
		}
	}
	return nil
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
func stationsPlot(pl *Plan, results []sectionResult) (string, []byte, error) {
	var st []plot.Station
	units := ""
	for i, r := range results {
		s, at := r.section, pl.Sections[i].Station
		if s == nil || at == nil || s.Frame == nil || s.Properties == nil {
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
