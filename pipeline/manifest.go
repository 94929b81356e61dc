package pipeline

import (
	"bytes"
	"encoding/json"
	"fmt"

	"github.com/foilwright/foilwright/internal/limits"
	"github.com/foilwright/foilwright/prep"
)

// ManifestName is the manifest's file name at the root of a run folder.
const ManifestName = "manifest.json"

// ManifestFormat is the value of the manifest's "format" key.
const ManifestFormat = "foilwright.manifest/1"

// A Manifest records a run so that it can be repeated and checked: the tool,
// the pipeline file, each section's input files, the stages and their
// parameters, and the sha256 of every output. All of it is the same for two
// runs of the same work except Timings, which Verify ignores.
type Manifest struct {
	Format      string      `json:"format"`
	Tool        Tool        `json:"tool"`
	Pipeline    PipelineRef `json:"pipeline"`
	Interrupted bool        `json:"interrupted,omitempty"` // the run was cancelled
	// Shard is set in the partial manifest of one shard of a run (in its
	// part of the run folder), which lists only that shard's sections.
	Shard    *ShardRecord      `json:"shard,omitempty"`
	Stages   []StageRecord     `json:"stages"` // dependency order
	Sections []SectionRecord   `json:"sections"`
	Outputs  map[string]string `json:"outputs"` // slash path in the run folder → sha256
	Timings  Timings           `json:"timings"`
}

// Tool identifies the program that made a run.
type Tool struct {
	Name     string `json:"name"`
	Version  string `json:"version"`
	Revision string `json:"revision,omitempty"`
}

// PipelineRef identifies the pipeline file of a run.
type PipelineRef struct {
	File   string `json:"file"` // relative to the manifest's folder (or absolute)
	Name   string `json:"name"`
	SHA256 string `json:"sha256"`
}

// A StageRecord is one stage as the pipeline named it and as it described
// itself.
type StageRecord struct {
	ID         string          `json:"id"`
	Stage      string          `json:"stage"` // as written in the pipeline file
	Name       string          `json:"name"`
	Version    string          `json:"version"`
	Executable string          `json:"executable_sha256,omitempty"`
	Pin        string          `json:"pinned_sha256,omitempty"`
	Params     json.RawMessage `json:"params"`
	After      []string        `json:"after,omitempty"`
	OnError    string          `json:"on_error"`
	TimeoutS   float64         `json:"timeout_s,omitempty"`
	Pins       []Pin           `json:"pins,omitempty"`
	// Keep is the detail of the result documents written, when not all.
	Keep string `json:"keep,omitempty"`
	// RunsFrom is what an external stage runs from besides its executable:
	// the interpreter its "#!" line names (absolute path) and the files
	// and folders it declares (relative to its folder), with their
	// sha256 (a folder's tree digest).
	RunsFrom []FileHash `json:"runs_from,omitempty"`
	// Environment is what the stage's process got from foilwright's
	// environment, NAME=VALUE, sorted: the minimal variables, those the
	// pipeline allowed and foilwright's own settings.
	Environment []string `json:"environment,omitempty"`
}

// A SectionRecord is one section: what went in and how it went.
type SectionRecord struct {
	Name     string        `json:"name"`
	Station  *float64      `json:"station,omitempty"`
	Inputs   []FileHash    `json:"inputs"`
	Settings prep.Settings `json:"settings"`
	Status   string        `json:"status"`
	Err      string        `json:"error,omitempty"`
	Stages   []StageReport `json:"stages,omitempty"`
	// Compare is the section's comparison with its design: settings,
	// design file, verdict and figures.
	Compare *CompareRecord `json:"compare,omitempty"`
}

// FileHash is a recorded file and its sha256.
type FileHash struct {
	Path   string `json:"path"`
	SHA256 string `json:"sha256"`
}

// Timings is how long a run took; it is the one part of a manifest that
// differs between two runs of the same work.
type Timings struct {
	Started string  `json:"started"` // RFC 3339, UTC
	TotalS  float64 `json:"total_s"`
	Jobs    int     `json:"jobs"`
	// Shards is the number of shards a merged run was made in.
	Shards int `json:"shards,omitempty"`
	// MaxRSSKiB is the most memory foilwright's own process held
	// (resident, KiB) until the manifest was written; its stage processes
	// are not counted. 0 where the system does not say.
	MaxRSSKiB int64           `json:"max_rss_kib,omitempty"`
	Sections  []SectionTiming `json:"sections"`
}

// SectionTiming is the time one section took, in seconds.
type SectionTiming struct {
	Name     string        `json:"name"`
	PrepareS float64       `json:"prepare_s"`
	Stages   []StageTiming `json:"stages,omitempty"`
}

// StageTiming is the time one stage took for one section, in seconds.
type StageTiming struct {
	ID string  `json:"id"`
	S  float64 `json:"s"`
}

// A RunsFromReporter is a StageRunner that can say what the external
// stage of a call runs from besides its executable, for the manifest.
type RunsFromReporter interface {
	RunsFrom(call StageCall) []FileHash
}

func writeManifest(path string, m *Manifest) error {
	b, err := json.MarshalIndent(m, "", "  ")
	if err != nil {
		return fmt.Errorf("pipeline: write manifest: %w", err)
	}
	return writeFile(path, append(b, '\n'))
}

// ReadManifest reads the manifest at path. It returns an error wrapping
// ErrNotManifest when the file is not one.
func ReadManifest(path string) (*Manifest, error) {
	l := limits.Default()
	data, err := limits.ReadJSON(path, l.JSONBytes)
	if err != nil {
		return nil, err
	}
	// A manifest embeds parameters up to the json-depth limit, a few
	// levels down: allow the most that may be set.
	if err := limits.CheckDepth(data, limits.MaxJSONDepth); err != nil {
		return nil, fmt.Errorf("%w: %s: %v", ErrNotManifest, path, err)
	}
	var m Manifest
	if err := json.NewDecoder(bytes.NewReader(data)).Decode(&m); err != nil {
		return nil, fmt.Errorf("%w: %s: %v", ErrNotManifest, path, err)
	}
	if m.Format != ManifestFormat {
		return nil, fmt.Errorf("%w: %s: format %q, want %q", ErrNotManifest, path, m.Format, ManifestFormat)
	}
	return &m, nil
}
