package pipeline

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"

	"github.com/foilwright/foilwright/internal/digest"
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
}

// A Difference is one output that does not match its manifest. Got is ""
// when the re-run did not make the file; Want is "" when the manifest does
// not list it.
type Difference struct {
	Path string
	Want string // sha256 in the manifest
	Got  string // sha256 of the re-run
}

func (d Difference) String() string {
	switch {
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

// OK reports whether the re-run reproduced every output and every
// section's outcome.
func (r *VerifyReport) OK() bool { return len(r.Differences) == 0 && len(r.Changes) == 0 }

// Verify re-runs the run that the manifest at path records, into a scratch
// folder, and compares every output byte for byte (by sha256) with the
// manifest. It refuses, with an error wrapping ErrPipelineChanged or
// ErrInputChanged, when the pipeline file or an input is not what the run
// used. Outputs that differ are reported, not returned as an error.
func Verify(ctx context.Context, path string, opts VerifyOptions) (*VerifyReport, error) {
	m, err := ReadManifest(path)
	if err != nil {
		return nil, err
	}
	file := opts.Pipeline
	if file == "" {
		file = filepath.FromSlash(m.Pipeline.File)
		if !filepath.IsAbs(file) {
			file = filepath.Join(filepath.Dir(path), file)
		}
	}
	rep := &VerifyReport{Manifest: path, Pipeline: file}
	data, err := os.ReadFile(file)
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
	p, err := Parse(data, file, ParseOptions{Dir: filepath.Dir(abs), Known: opts.Known})
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
	if _, err := Run(ctx, pl, RunOptions{Folder: folder, Jobs: opts.Jobs, Preparer: opts.Preparer, NewRunner: opts.NewRunner}); err != nil {
		return nil, fmt.Errorf("pipeline: verify: re-run: %w", err)
	}
	got, err := ReadManifest(filepath.Join(folder, ManifestName))
	if err != nil {
		return nil, err
	}
	compare(rep, m, got)
	return rep, nil
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
