package pipeline

import (
	"context"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"

	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/internal/limits"
)

// VerifyOptions say how Verify re-runs a manifest.
type VerifyOptions struct {
	// Pipeline is the pipeline file to use; "" means the one the manifest
	// records. Its sha256 must match either way.
	Pipeline string
	// Known reports the built-in stage names, as for Load.
	Known func(name string) bool
	// Jobs, Preparer and NewRunner are as in RunOptions.
	Jobs      int
	Preparer  Preparer
	NewRunner func() (StageRunner, error)
	// TempDir is where the scratch run folder is made; "" means the system's.
	TempDir string
	// Keep keeps the scratch run folder (VerifyReport.Folder) instead of
	// removing it.
	Keep bool
	// Parse are the checks of the pipeline file (Known above is used when
	// Parse.Known is nil); Limits bound the re-run's reading.
	Parse  ParseOptions
	Limits limits.Limits
}

// A Difference is one output that does not match its manifest, in the run
// folder on disk or in the re-run. Got is "" when the file is missing;
// Want is "" when the manifest does not list it.
type Difference struct {
	Path string
	Want string // sha256 in the manifest
	Got  string // sha256 of the file; "" when missing
	// OnDisk is set for a difference of the run folder as it is on disk,
	// clear for one of the re-run.
	OnDisk bool
	// Note says what is wrong when it is not a digest (a symbolic link).
	Note string
}

func (d Difference) String() string {
	switch {
	case d.Note != "":
		return fmt.Sprintf("%s: %s", d.Path, d.Note)
	case d.Got == "":
		return fmt.Sprintf("%s: missing (want sha256 %s)", d.Path, d.Want)
	case d.Want == "":
		return fmt.Sprintf("%s: not in the manifest (got sha256 %s)", d.Path, d.Got)
	}
	return fmt.Sprintf("%s: want sha256 %s, got %s", d.Path, d.Want, d.Got)
}

// A VerifyReport is the outcome of Verify.
type VerifyReport struct {
	Manifest    string
	Pipeline    string
	Folder      string // the scratch run folder, when kept
	Checked     int    // outputs compared
	Differences []Difference
	Changes     []string // sections whose status or error changed
	Notes       []string // tool or stage versions that changed (not failures by themselves)
}

// OK reports whether the run folder on disk and the re-run both match the
// manifest, and the re-run reproduced every section's outcome.
func (r *VerifyReport) OK() bool { return len(r.Differences) == 0 && len(r.Changes) == 0 }

// Verify checks the run that the manifest at path records twice: it hashes
// every file of the run folder (the manifest's folder) against the
// manifest, naming each that is changed, missing, not a regular file or
// not listed; and it re-runs the pipeline into a scratch folder and
// compares every output byte for byte (by sha256) with the manifest. It
// refuses, with an error wrapping ErrPipelineChanged or ErrInputChanged,
// when the pipeline file or an input is not what the run used. Outputs
// that differ are reported, not returned as an error.
func Verify(ctx context.Context, path string, opts VerifyOptions) (*VerifyReport, error) {
	m, err := ReadManifest(path)
	if err != nil {
		return nil, err
	}
	if m.Shard != nil {
		return nil, fmt.Errorf("%w: %s is the partial manifest of shard %s: merge the shards (foilwright merge RUN_FOLDER) and verify the merged run", ErrNotManifest, path, m.Shard.Shard)
	}
	disk := checkDisk(filepath.Dir(path), m)
	file := opts.Pipeline
	if file == "" {
		file = filepath.FromSlash(m.Pipeline.File)
		if !filepath.IsAbs(file) {
			file = filepath.Join(filepath.Dir(path), file)
		}
	}
	rep := &VerifyReport{Manifest: path, Pipeline: file}
	data, err := limits.ReadJSON(file, opts.Parse.maxBytes())
	if err != nil {
		return nil, fmt.Errorf("%w: %s: %v", ErrPipelineChanged, file, err)
	}
	if got := digest.Bytes(data); got != m.Pipeline.SHA256 {
		return nil, fmt.Errorf("%w: %s has sha256 %s, the run used %s", ErrPipelineChanged, file, got, m.Pipeline.SHA256)
	}
	abs, err := filepath.Abs(file)
	if err != nil {
		return nil, err
	}
	po := opts.Parse
	po.Dir = filepath.Dir(abs)
	if po.Known == nil {
		po.Known = opts.Known
	}
	p, err := Parse(data, file, po)
	if err != nil {
		return nil, err
	}
	p.Path = abs
	pl := p.Plan()
	if err := checkInputs(p, pl, m); err != nil {
		return nil, err
	}

	folder, err := os.MkdirTemp(opts.TempDir, "foilwright-verify-*")
	if err != nil {
		return nil, fmt.Errorf("pipeline: verify: %w", err)
	}
	if opts.Keep {
		rep.Folder = folder
	} else {
		defer os.RemoveAll(folder)
	}
	if _, err := Run(ctx, pl, RunOptions{Folder: folder, Jobs: opts.Jobs, Preparer: opts.Preparer, NewRunner: opts.NewRunner, Limits: opts.Limits}); err != nil {
		return nil, fmt.Errorf("pipeline: verify: re-run: %w", err)
	}
	got, err := ReadManifest(filepath.Join(folder, ManifestName))
	if err != nil {
		return nil, err
	}
	compare(rep, m, got)
	rep.Differences = append(disk, rep.Differences...)
	return rep, nil
}

// checkDisk hashes the files of the run folder against the manifest: every
// output it lists must be there, a regular file with its digest, and no
// other file may be (besides the manifest). It never follows a symbolic
// link.
func checkDisk(folder string, m *Manifest) []Difference {
	var diffs []Difference
	paths := make([]string, 0, len(m.Outputs))
	for p := range m.Outputs {
		paths = append(paths, p)
	}
	sort.Strings(paths)
	for _, p := range paths {
		want := m.Outputs[p]
		d := Difference{Path: p, Want: want, OnDisk: true}
		full, ok := inside(folder, p)
		if !ok {
			d.Note = "outside the run folder (the manifest was altered)"
			diffs = append(diffs, d)
			continue
		}
		fi, err := os.Lstat(full)
		switch {
		case err != nil:
			diffs = append(diffs, d) // missing
		case !fi.Mode().IsRegular():
			d.Note = "not a regular file"
			diffs = append(diffs, d)
		default:
			if d.Got, err = digest.File(full); err != nil {
				d.Note = err.Error()
			}
			if d.Got != want {
				diffs = append(diffs, d)
			}
		}
	}
	filepath.WalkDir(folder, func(p string, de fs.DirEntry, err error) error {
		if err != nil || de.IsDir() {
			return nil
		}
		rel, _ := filepath.Rel(folder, p)
		rel = filepath.ToSlash(rel)
		if _, listed := m.Outputs[rel]; listed || rel == ManifestName {
			return nil
		}
		d := Difference{Path: rel, OnDisk: true}
		if de.Type().IsRegular() {
			d.Got, _ = digest.File(p)
		} else {
			d.Note = "not in the manifest (and not a regular file)"
		}
		diffs = append(diffs, d)
		return nil
	})
	return diffs
}

// checkInputs refuses a re-run whose input files are not those of the run.
func checkInputs(p *Pipeline, pl *Plan, m *Manifest) error {
	var changed []string
	for _, s := range m.Sections {
		files := s.Inputs
		if s.Compare != nil && s.Compare.DesignFile != nil {
			files = append(append([]FileHash(nil), files...), *s.Compare.DesignFile)
		}
		for _, f := range files {
			sum, err := digest.File(p.abs(f.Path))
			switch {
			case err != nil:
				changed = append(changed, fmt.Sprintf("%s: %v", f.Path, err))
			case sum != f.SHA256:
				changed = append(changed, fmt.Sprintf("%s: sha256 %s, the run read %s", f.Path, sum, f.SHA256))
			}
		}
	}
	if !m.Interrupted {
		recorded := map[string][]string{}
		for _, s := range m.Sections {
			recorded[s.Name] = nil
			if s.Status != StatusCancelled && len(s.Inputs) > 0 {
				for _, f := range s.Inputs {
					recorded[s.Name] = append(recorded[s.Name], f.Path)
				}
			}
		}
		now := map[string]bool{}
		for _, s := range pl.Sections {
			now[s.Name] = true
			want, ok := recorded[s.Name]
			switch {
			case !ok:
				changed = append(changed, fmt.Sprintf("section %s is new (%s)", s.Name, strings.Join(s.Files, ", ")))
			case want != nil && !slices.Equal(want, s.Files):
				changed = append(changed, fmt.Sprintf("section %s: files are now %s, the run read %s", s.Name, strings.Join(s.Files, ", "), strings.Join(want, ", ")))
			}
		}
		for _, s := range m.Sections {
			if !now[s.Name] {
				changed = append(changed, fmt.Sprintf("section %s is gone", s.Name))
			}
		}
	}
	if len(changed) > 0 {
		return fmt.Errorf("%w:\n  %s", ErrInputChanged, strings.Join(changed, "\n  "))
	}
	return nil
}

// compare fills rep with how got departs from want.
func compare(rep *VerifyReport, want, got *Manifest) {
	paths := make([]string, 0, len(want.Outputs))
	for p := range want.Outputs {
		paths = append(paths, p)
	}
	for p := range got.Outputs {
		if _, ok := want.Outputs[p]; !ok && !want.Interrupted {
			paths = append(paths, p)
		}
	}
	sort.Strings(paths)
	for _, p := range paths {
		rep.Checked++
		w, g := want.Outputs[p], got.Outputs[p]
		if w != g {
			rep.Differences = append(rep.Differences, Difference{Path: p, Want: w, Got: g})
		}
	}
	status := map[string]SectionRecord{}
	for _, s := range got.Sections {
		status[s.Name] = s
	}
	for _, s := range want.Sections {
		if s.Status == StatusCancelled {
			continue
		}
		g := status[s.Name]
		if g.Status != s.Status || g.Err != s.Err {
			rep.Changes = append(rep.Changes, fmt.Sprintf("section %s: was %s%s, now %s%s", s.Name, s.Status, errSuffix(s.Err), g.Status, errSuffix(g.Err)))
		}
	}
	if want.Tool.Version != got.Tool.Version || want.Tool.Revision != got.Tool.Revision {
		rep.Notes = append(rep.Notes, fmt.Sprintf("foilwright was %s, now %s", toolString(want.Tool), toolString(got.Tool)))
	}
	stages := map[string]StageRecord{}
	for _, s := range got.Stages {
		stages[s.ID] = s
	}
	for _, s := range want.Stages {
		g := stages[s.ID]
		if g.Name != s.Name || g.Version != s.Version || g.Executable != s.Executable {
			rep.Notes = append(rep.Notes, fmt.Sprintf("stage %s was %s %s (%s), now %s %s (%s)", s.ID, s.Name, s.Version, short(s.Executable), g.Name, g.Version, short(g.Executable)))
		}
		now := map[string]string{}
		for _, f := range g.RunsFrom {
			now[f.Path] = f.SHA256
		}
		for _, f := range s.RunsFrom {
			if sum, ok := now[f.Path]; !ok {
				rep.Notes = append(rep.Notes, fmt.Sprintf("stage %s ran from %s (%s), now does not", s.ID, f.Path, short(f.SHA256)))
			} else if sum != f.SHA256 {
				rep.Notes = append(rep.Notes, fmt.Sprintf("stage %s runs from %s, which was %s, now %s", s.ID, f.Path, short(f.SHA256), short(sum)))
			}
		}
	}
}

func errSuffix(e string) string {
	if e == "" {
		return ""
	}
	return " (" + e + ")"
}

func toolString(t Tool) string {
	if t.Revision == "" {
		return t.Version
	}
	return t.Version + " " + t.Revision
}

func short(sum string) string {
	if len(sum) > 12 {
		return sum[:12]
	}
	if sum == "" {
		return "no executable digest"
	}
	return sum
}
