package pipeline

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"github.com/tidwall/gjson"

	"github.com/foilwright/foilwright/export"
	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/pointfile"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/internal/atomicfile"
	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/internal/enum"
	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/plugins/host"
	"github.com/foilwright/foilwright/plugins/stage"
	"github.com/foilwright/foilwright/prep"
)

// Document kinds of outputs.documents.
const (
	DocSection = "section" // section.json
	DocNodes   = "nodes"   // nodes.dat
	DocResults = "results" // results/<stage-id>.json
)

// documents is the one list of the files a section's preparation gives,
// in the order they are written: the outputs.documents kind that asks for
// each ("" for those written whenever they are made) and how it is made.
// A new per-section output is an entry here (and its kind in Documents).
var documents = []struct {
	kind string
	make func(r *sectionRun) ([]output, error)
}{
	{DocSection, func(r *sectionRun) ([]output, error) {
		return []output{{r.sp.Name + "/section.json", withNewline(r.prepared.Section)}}, nil
	}},
	{DocNodes, func(r *sectionRun) ([]output, error) {
		name := r.sec.Name
		if name == "" {
			name = r.sp.Name
		}
		var b bytes.Buffer
		if err := pointfile.WriteNodes(&b, name, r.sec.Nodes); err != nil {
			return nil, fmt.Errorf("prepare gave a bad section document: %v", err)
		}
		return []output{{r.sp.Name + "/nodes.dat", b.Bytes()}}, nil
	}},
	// The preparation's pictures, when outputs.plots asks for them.
	{"", func(r *sectionRun) ([]output, error) {
		var outs []output
		for _, a := range r.prepared.Artifacts {
			outs = append(outs, output{r.sp.Name + "/plots/" + a.Name, a.Data})
		}
		return outs, nil
	}},
}

// Documents returns the kinds outputs.documents may list, in the order a
// section's files are written; the results of the stages come last.
func Documents() []string {
	var kinds []string
	for _, d := range documents {
		if d.kind != "" {
			kinds = append(kinds, d.kind)
		}
	}
	return append(kinds, DocResults, DocCompare)
}

// sectionResult is what one section produced.
type sectionResult struct {
	report  SectionReport
	files   []FileHash // inputs as read
	outputs map[string]string
	timing  SectionTiming
	// doc is the section document and results the stages' result
	// documents by stage id (as the run folder keeps them), for the batch
	// table and the stations.
	doc     []byte
	results map[string]*stage.ResultDoc
	// The comparison with the design, when the pipeline asks for one.
	compare    *CompareRecord
	designFile *FileHash
}

// entry is the journal entry of a finished section i: its record for the
// manifest, its outputs and timing, its report and its row of the batch
// table (and its section document when withSection).
func (res *sectionResult) entry(pl *Plan, i, attempt int, withSection bool) *journalEntry {
	sp := pl.Sections[i]
	inputs := res.files
	if inputs == nil {
		inputs = []FileHash{}
	}
	rep := res.report
	e := &journalEntry{Index: i, Attempt: attempt,
		Record: SectionRecord{Name: sp.Name, Station: sp.Station, Inputs: inputs, Settings: sp.Settings,
			Status: rep.Status, Err: rep.Err, Stages: rep.Stages, Compare: res.compare},
		Outputs: res.outputs, Timing: res.timing, Summary: rep.Summary, Input: rep.Input, Compare: rep.Compare}
	if res.compare == nil && sp.Compare != nil {
		// Not compared (failed): still record what it would have been
		// held against.
		e.Record.Compare = notCompared(sp, res.designFile)
	}
	e.Row = tableRow(sp.Name, sp.Station, rep.Status, rep.Err, res.verdict(), res.doc, pl.stageIDs(), res.results)
	if withSection && res.doc != nil {
		e.Section = json.RawMessage(res.doc)
	}
	return e
}

// verdict is the section's verdict against its design, for the batch
// table, when the pipeline compares it ("" otherwise).
func (res *sectionResult) verdict() string {
	if res.compare == nil {
		return ""
	}
	return res.compare.Verdict.Verdict
}

// notCompared is the comparison record of a section of a comparing
// pipeline that was not compared (it failed or was cancelled first).
func notCompared(sp SectionPlan, designFile *FileHash) *CompareRecord {
	return &CompareRecord{Settings: sp.Compare, DesignFile: designFile, Verdict: Verdict{Design: sp.Compare.Design, Verdict: "not compared"}}
}

// stageIDs returns the ids of the stages in the order they run.
func (pl *Plan) stageIDs() []string {
	ids := make([]string, len(pl.Stages))
	for i, st := range pl.Stages {
		ids[i] = st.ID
	}
	return ids
}

// output is one file of a section, relative to the run folder.
type output struct {
	path string
	data []byte
}

// sectionRun is one section on its way through Run: what it has made so
// far and the files it will write. Each step returns false when the
// section ends early, failed or cancelled, with res saying so.
type sectionRun struct {
	ctx      context.Context
	limits   limits.Limits
	pl       *Plan
	sp       SectionPlan
	res      sectionResult
	in       Input
	prepared Prepared
	sec      *section.Section
	outs     []output
	results  []stageResult // the results of the stages that succeeded, in order
	// designData is the design file of the section's comparison.
	designData []byte
}

// stageResult is the result document of one stage, as decoded once from
// the stage's reply.
type stageResult struct {
	id  string
	doc *stage.ResultDoc
}

// runSection makes one section and writes its outputs: read its files,
// prepare it, collect its documents, run the stages, write. When the run
// is cancelled while the section is under way, nothing of it is written.
func runSection(ctx context.Context, pl *Plan, folder string, i int, calls []StageCall, opts RunOptions, runner StageRunner) sectionResult {
	sp := pl.Sections[i]
	r := &sectionRun{ctx: ctx, pl: pl, sp: sp, limits: opts.Limits,
		res: sectionResult{report: SectionReport{Name: sp.Name}, timing: SectionTiming{Name: sp.Name}}}
	if ctx.Err() != nil {
		r.cancel()
		return r.res
	}
	_ = r.readInputs() &&
		r.readDesign() &&
		r.prepare(opts.Preparer) &&
		r.collectDocuments() &&
		r.compare(runner) &&
		r.runStages(calls, runner) &&
		r.collectExports() &&
		r.write(folder)
	return r.res
}

// cancel marks the section cancelled, dropping what it made.
func (r *sectionRun) cancel() bool {
	r.res = sectionResult{report: SectionReport{Name: r.sp.Name, Status: StatusCancelled}, timing: r.res.timing, designFile: r.res.designFile}
	return false
}

// fail marks the section failed for the reason given.
func (r *sectionRun) fail(format string, args ...any) bool {
	r.res.report.Status = StatusFailed
	r.res.report.Err = fmt.Sprintf(format, args...)
	return false
}

// failInput marks the section failed because of its input.
func (r *sectionRun) failInput(format string, args ...any) bool {
	r.res.report.Input = true
	return r.fail(format, args...)
}

// inputCaused reports whether a stage's error was caused by the section or
// the parameters (the stage refused them, or its executable is missing or
// not the pinned one), not by the stage failing.
func inputCaused(err error) bool {
	for _, target := range []error{stage.ErrBadInput, host.ErrTooManyNodes, host.ErrChecksum, host.ErrNotFound, host.ErrNotExecutable, limits.ErrLimit} {
		if errors.Is(err, target) {
			return true
		}
	}
	return false
}

// readInputs reads the section's files (the chain reads none) and takes
// their digests, once, for the section document and the manifest.
func (r *sectionRun) readInputs() bool {
	r.in = Input{Section: r.sp.Name, Station: r.sp.Station}
	if out := r.pl.Pipeline.Outputs; out.HasPlot(PlotPrep) {
		r.in.PlotFormat = out.PlotFormat
	}
	for _, f := range r.sp.Files {
		data, err := limits.ReadFile(r.pl.Pipeline.abs(f), r.limits.InputBytes, r.limits.InputLines)
		if err != nil {
			return r.failInput("read %s: %v", f, err)
		}
		file := prep.NewFile(f, data)
		r.res.files = append(r.res.files, FileHash{Path: f, SHA256: file.SHA256})
		r.in.Files = append(r.in.Files, file)
	}
	return true
}

// prepare runs the geometry chain and takes the section it made: as the
// preparer gave it, or decoded from the document when it gave only that.
func (r *sectionRun) prepare(preparer Preparer) bool {
	t := time.Now()
	prepared, err, crashed := safePrepare(r.ctx, preparer, r.in, r.sp.Settings)
	r.res.timing.PrepareS = seconds(time.Since(t))
	if r.ctx.Err() != nil {
		return r.cancel()
	}
	if crashed {
		return r.fail("prepare: %v", err)
	}
	if errors.Is(err, prep.ErrNoUnits) {
		return r.failInput("prepare: %v: give it with the \"units\" key of prepare or of the input", err)
	}
	if err != nil {
		return r.failInput("prepare: %v", err)
	}
	r.res.report.Summary = prepared.Summary
	r.prepared, r.sec = prepared, prepared.Doc
	if r.sec == nil {
		if r.sec, err = section.Read(bytes.NewReader(prepared.Section), r.sp.Name+"/section.json"); err != nil {
			return r.fail("prepare gave a bad section document: %v", err)
		}
	}
	return true
}

// safePrepare runs the preparer, turning a panic (a bug in the chain) into
// an error, so that one section cannot end the run; crashed reports it.
func safePrepare(ctx context.Context, p Preparer, in Input, s prep.Settings) (out Prepared, err error, crashed bool) {
	defer func() {
		if v := recover(); v != nil {
			out, err, crashed = Prepared{}, fmt.Errorf("internal error (a bug in foilwright; please report it): %v", v), true
		}
	}()
	out, err = p.Prepare(ctx, in, s)
	return out, err, false
}

// collectDocuments makes the documents outputs.documents asks for (see
// documents).
func (r *sectionRun) collectDocuments() bool {
	out := r.pl.Pipeline.Outputs
	for _, d := range documents {
		if d.kind != "" && !out.Has(d.kind) {
			continue
		}
		outs, err := d.make(r)
		if err != nil {
			return r.fail("%v", err)
		}
		r.outs = append(r.outs, outs...)
	}
	r.res.doc = r.prepared.Section
	return true
}

// runStages runs the stages in order, each seeing the results of those it
// runs after, and collects their results and artifacts.
func (r *sectionRun) runStages(calls []StageCall, runner StageRunner) bool {
	rep := &r.res.report
	results := map[string]*stage.ResultDoc{}
	failed := map[string]bool{}
	// The section goes to every stage as its document without the nodes
	// and the nodes, taken out once: the host sends them packed, or joins
	// them back for a stage that reads them from the document.
	sec, nodes, err := stage.SplitNodes(r.prepared.Section)
	if err != nil {
		return r.fail("prepare gave a bad section document: %v", err)
	}
	artifactBy := map[string]string{} // artifact name → stage id
	stopped := false
	for k, st := range r.pl.Stages {
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
			deps := map[string]*stage.ResultDoc{}
			for _, id := range st.After {
				deps[id] = results[id]
			}
			t := time.Now()
			out, err := runStage(r.ctx, runner, calls[k], stage.Request{Section: sec, Nodes: nodes, Params: calls[k].Params, DepResults: deps, SectionName: r.sp.Name})
			r.res.timing.Stages = append(r.res.timing.Stages, StageTiming{ID: st.ID, S: seconds(time.Since(t))})
			if r.ctx.Err() != nil {
				return r.cancel()
			}
			if err == nil {
				err = checkOutput(&out, st.ID, artifactBy)
			}
			if err != nil {
				sr.Status = "failed"
				sr.Err = err.Error()
				failed[st.ID] = true
				rep.Input = rep.Input || inputCaused(err)
				if st.OnError == OnErrorStop {
					stopped = true
					rep.Status = StatusFailed
					rep.Err = fmt.Sprintf("stage %q: %v", st.ID, err)
				} else if rep.Status == "" {
					rep.Status = StatusPartial
				}
				break
			}
			if err = r.stageOutputs(st.ID, calls[k].Keep, out); err != nil {
				return r.fail("stage %q: %v", st.ID, err)
			}
			sr.Status = StatusOK
			sr.Warnings = out.Warnings
			results[st.ID] = out.Doc
			r.results = append(r.results, stageResult{st.ID, out.Doc})
			// The batch table reads what the run folder keeps.
			if r.res.results == nil {
				r.res.results = map[string]*stage.ResultDoc{}
			}
			r.res.results[st.ID] = kept(out.Doc, calls[k].Keep)
		}
		rep.Stages = append(rep.Stages, sr)
	}
	if rep.Status == "" {
		rep.Status = StatusOK
	}
	if r.ctx.Err() != nil {
		return r.cancel()
	}
	return true
}

// kept is a result document with the detail keep asks for.
func kept(doc *stage.ResultDoc, keep string) *stage.ResultDoc {
	if keep == "" || keep == stage.KeepAll {
		return doc
	}
	return doc.Trim(keep)
}

// stageOutputs collects what a stage that succeeded gives: its result
// document, when outputs.documents lists results, and its artifacts. The
// document is written with the detail keep asks for, in the result format
// of package stage (columns); a stage that answered with JSON text has its
// text written as it is when everything is kept.
func (r *sectionRun) stageOutputs(id, keep string, out stage.Result) error {
	if r.pl.Pipeline.Outputs.Has(DocResults) {
		data := out.JSON
		if len(data) == 0 || keep != stage.KeepAll && keep != "" {
			var err error
			if data, err = kept(out.Doc, keep).Encode(); err != nil {
				return err
			}
		}
		r.outs = append(r.outs, output{r.sp.Name + "/results/" + id + ".json", withNewline(data)})
	}
	for _, a := range out.Artifacts {
		r.outs = append(r.outs, output{r.sp.Name + "/plots/" + a.Name, a.Data})
	}
	return nil
}

// collectExports makes the exports outputs.exports asks for, in the
// part frame (the chord frame for a section in chord units), after the
// stages, whose results the tables need.
func (r *sectionRun) collectExports() bool {
	out := r.pl.Pipeline.Outputs
	if len(out.Exports) == 0 {
		return true
	}
	frame := out.ExportFrame
	if frame == "" && (r.sec.Frame == nil || r.sec.Units == "" || r.sec.Units == geometry.ChordUnit) {
		frame = export.FrameChord
	}
	// The tables are made from every stage's whole result, whatever the
	// run folder keeps of it.
	var results []*export.Result
	if r.pl.Pipeline.Outputs.Has(DocResults) {
		for _, sr := range r.results {
			results = append(results, exportResult(sr.doc, r.sp.Name))
		}
	}
	for _, kind := range out.Exports {
		if !slices.ContainsFunc(export.Kinds(), func(c enum.Choice) bool { return c.Name == kind }) {
			continue // a run-level export
		}
		var b bytes.Buffer
		var err error
		switch {
		case kind == export.KindPolarCSV:
			err = export.PolarCSV(&b, results)
		case kind == export.KindCpCSV:
			err = export.CpCSV(&b, results)
		default:
			var p *export.Placed
			if p, err = export.Place(r.sec, export.PlaceOptions{Frame: frame}); err == nil {
				err = export.Write(&b, kind, p, export.Options{})
			}
		}
		if err != nil {
			return r.fail("export %s: %v", kind, err)
		}
		r.outs = append(r.outs, output{r.sp.Name + "/export/" + export.FileName(kind), b.Bytes()})
	}
	return true
}

// writeFile and writeStream write one output; tests replace them to fail
// like a full disk.
var (
	writeFile   = atomicfile.WriteBytes
	writeStream = atomicfile.Write
)

// write writes the collected files into the (staging) run folder, each
// atomically, and records their digests. Two outputs of one name fail the
// section before anything is written: no file silently replaces another.
// When a write fails (a full disk) the section's files are removed again:
// a failed section has no outputs.
func (r *sectionRun) write(folder string) bool {
	seen := map[string]bool{}
	for _, o := range r.outs {
		key := strings.ToLower(o.path) // file names may not differ only in case
		if seen[key] {
			return r.fail("two outputs would be written to %s", o.path)
		}
		seen[key] = true
	}
	r.res.outputs = map[string]string{}
	for _, o := range r.outs {
		full := filepath.Join(folder, filepath.FromSlash(o.path))
		err := os.MkdirAll(filepath.Dir(full), 0o755)
		if err == nil {
			err = writeFile(full, o.data)
		}
		if err != nil {
			for p := range r.res.outputs {
				os.Remove(filepath.Join(folder, filepath.FromSlash(p)))
			}
			r.res.outputs = nil
			return r.fail("write %s: %v", o.path, err)
		}
		r.res.outputs[o.path] = digest.Bytes(o.data)
	}
	return true
}

// runStage runs one call with its time limit, the one place a stage's
// timeout_s is applied, turning a panic in the runner into an error.
func runStage(ctx context.Context, r StageRunner, call StageCall, req stage.Request) (out stage.Result, err error) {
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
	out, err = r.Run(ctx, call, req)
	if err != nil && errors.Is(ctx.Err(), context.DeadlineExceeded) {
		err = fmt.Errorf("timed out after %v: %w", call.Timeout, err)
	}
	return out, err
}

// artifactName is the form of an artifact's file name.
var artifactName = nameForm{most: 128}

// exportResult is the part of a result document the export tables need.
func exportResult(d *stage.ResultDoc, section string) *export.Result {
	r := &export.Result{Section: section, Stage: d.Stage, Version: d.Version}
	for _, c := range d.Cases {
		if c == nil {
			continue
		}
		ec := export.Case{AlphaDeg: c.AlphaDeg, CL: c.CL, CMc4: c.CMc4, Checks: c.Checks}
		if len(c.Cp) > 0 {
			ec.Cp = make([]export.CpPoint, len(c.Cp))
			for k, p := range c.Cp {
				ec.Cp[k] = export.CpPoint{X: p.X, Y: p.Y, Cp: p.Cp}
			}
		}
		r.Cases = append(r.Cases, ec)
	}
	return r
}

// checkOutput checks what a stage returned before anything is written,
// decoding its result document when the runner gave only its text.
func checkOutput(out *stage.Result, id string, by map[string]string) error {
	if out.Doc == nil {
		if !gjson.ValidBytes(out.JSON) || !gjson.ParseBytes(out.JSON).IsObject() {
			return errors.New("the stage returned a result that is not a JSON object")
		}
		d, err := stage.DecodeResult(out.JSON)
		if err != nil {
			return err
		}
		out.Doc = d
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
