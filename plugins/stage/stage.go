package stage

import (
	"bytes"
	"context"
	"os"
	"strconv"
	"time"

	"github.com/tidwall/gjson"

	"github.com/foilwright/foilwright/geometry/section"
)

// Stage is one analysis step, run in its own process.
type Stage interface {
	// Describe returns what the stage is and which parameters it takes. It
	// must return the same Info every time.
	Describe(ctx context.Context) (Info, error)
	// Run analyses one section. It must not write files or print to
	// stdout; it returns its outputs in the Result.
	Run(ctx context.Context, req Request) (Result, error)
}

// Info describes a stage.
type Info struct {
	Name    string // kebab-case, e.g. "vortex-panel"
	Version string
	Summary string // one line, no final period
	Params  []Param
	// Scalars names the scalars of the result document, with their meaning.
	Scalars []Scalar
	// MaxConcurrency is the number of calls the stage serves at once in one
	// process; 0 means no limit.
	MaxConcurrency int
	// MaxNodes is the most section nodes the stage takes (0: it states no
	// maximum). The host refuses a larger section before calling Run; a
	// stage also checks it itself. Built-in stages honour MaxNodesEnv.
	MaxNodes int
}

// MaxNodesEnv is the environment variable the host sets when the user set
// the stage-nodes limit: a stage that honours it describes and applies
// that maximum instead of its own.
const MaxNodesEnv = "FOILWRIGHT_STAGE_MAX_NODES"

// Param returns the parameter called name and whether there is one.
func (in Info) Param(name string) (Param, bool) {
	for _, p := range in.Params {
		if p.Name == name {
			return p, true
		}
	}
	return Param{}, false
}

// Scalar documents one scalar of a result document.
type Scalar struct {
	Name string
	Doc  string
}

// Request is the input of one Run call.
type Request struct {
	// Section is the section document (foilwright.section/1), as JSON.
	Section []byte
	// Params is a JSON object of parameters; nil or empty means {}.
	Params []byte
	// Deps holds the result documents of the stages this one depends on,
	// by stage id.
	Deps map[string][]byte
	// SectionName is a display name for the section (a file name), used in
	// messages only.
	SectionName string
}

// DecodeSection decodes the section document of r. Errors are marked
// BadInput and name r.SectionName.
func (r Request) DecodeSection() (*section.Section, error) {
	name := r.SectionName
	if name == "" {
		name = "section"
	}
	s, err := section.Read(bytes.NewReader(r.Section), name)
	if err != nil {
		return nil, BadInput(err)
	}
	return s, nil
}

// Result is the output of one Run call.
type Result struct {
	// JSON is the result document (foilwright.result/1).
	JSON      []byte
	Artifacts []Artifact
	Warnings  []string
	// Timings holds the wall-clock time of named phases of the run
	// ("build", "factor", "solve", "total"). They are not part of the result
	// document, which stays reproducible byte for byte.
	Timings map[string]time.Duration
}

// Artifact is a named file a stage returns for the host to write.
type Artifact struct {
	Name      string // a plain file name, no directories
	MediaType string // e.g. "image/svg+xml"
	Data      []byte
}

// MaxNodesOr returns the maximum a stage should describe and apply: the
// value of MaxNodesEnv when the host set it to a positive integer, else
// own.
func MaxNodesOr(own int) int {
	if s := os.Getenv(MaxNodesEnv); s != "" {
		if n, err := strconv.Atoi(s); err == nil && n > 0 {
			return n
		}
	}
	return own
}

// CountNodes returns the number of nodes of a section document (the length
// of its "nodes" array), without decoding it; -1 when it has none.
func CountNodes(section []byte) int {
	r := gjson.GetBytes(section, "nodes")
	if !r.IsArray() {
		return -1
	}
	n := 0
	r.ForEach(func(_, _ gjson.Result) bool { n++; return true })
	return n
}
