package stage

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"sort"
	"strconv"
	"time"

	"github.com/tidwall/gjson"

	"github.com/foilwright/foilwright/geometry"
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
	// Packed says the stage reads a request's nodes from Request.Nodes
	// when they are there (Request.DecodeSection does) and its
	// dependencies through Request.Dep: the host then sends numeric
	// arrays packed, not as JSON text. A stage that parses
	// Request.Section or Request.Deps itself leaves it false.
	Packed bool
	// Files are the files the stage runs from besides its executable
	// (modules of a script, data, a lock file; a folder stands for all
	// below it), as slash paths relative to the executable's folder. The
	// host hashes them for the manifest. Go stages, one static binary,
	// leave it empty.
	Files []string
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
	// When Nodes is set it may lack "nodes" (SplitNodes takes them out).
	Section []byte
	// Nodes, when not nil, are the section's nodes, Section's "nodes" if
	// it has them. The host sends them packed to a stage that describes
	// itself Packed.
	Nodes []geometry.Point
	// Params is a JSON object of parameters; nil or empty means {}.
	Params []byte
	// Deps holds the result documents (JSON) of the stages this one
	// depends on, by stage id; DepResults the same decoded. A stage reads
	// either through Dep.
	Deps       map[string][]byte
	DepResults map[string]*ResultDoc
	// SectionName is a display name for the section (a file name), used in
	// messages only.
	SectionName string
}

// DecodeSection decodes the section document of r, with r.Nodes when they
// are set. Errors are marked BadInput and name r.SectionName.
func (r Request) DecodeSection() (*section.Section, error) {
	name := r.SectionName
	if name == "" {
		name = "section"
	}
	if r.Nodes != nil {
		rest := r.Section
		if gjson.GetBytes(rest, "nodes").Exists() {
			var err error
			if rest, _, err = SplitNodes(rest); err != nil {
				return nil, BadInput(fmt.Errorf("%s: %w", name, err))
			}
		}
		s, err := decodePacked(rest, r.Nodes, name)
		return s, BadInput(err)
	}
	s, err := section.Read(bytes.NewReader(r.Section), name)
	if err != nil {
		return nil, BadInput(err)
	}
	return s, nil
}

// NodeCount returns the number of section nodes of r, -1 when it has
// none.
func (r Request) NodeCount() int {
	if r.Nodes != nil {
		return len(r.Nodes)
	}
	return CountNodes(r.Section)
}

// DepIDs returns the ids of the stages whose results r carries, sorted.
func (r Request) DepIDs() []string {
	ids := make([]string, 0, len(r.Deps)+len(r.DepResults))
	for id := range r.DepResults {
		ids = append(ids, id)
	}
	for id := range r.Deps {
		if _, ok := r.DepResults[id]; !ok {
			ids = append(ids, id)
		}
	}
	sort.Strings(ids)
	return ids
}

// Dep returns the result document of the stage id this one depends on,
// decoded from Deps when it is not in DepResults. Errors are marked
// BadInput.
func (r Request) Dep(id string) (*ResultDoc, error) {
	if d, ok := r.DepResults[id]; ok && d != nil {
		return d, nil
	}
	b, ok := r.Deps[id]
	if !ok {
		return nil, BadInputf("no result of stage %q", id)
	}
	d, err := DecodeResult(b)
	if err != nil {
		return nil, BadInput(fmt.Errorf("result of %q: %w", id, err))
	}
	return d, nil
}

// Result is the output of one Run call.
type Result struct {
	// Doc is the result document. A stage sets Doc (the host receives its
	// arrays packed) or JSON; the host sets both Doc and, when the stage
	// answered with JSON text, JSON.
	Doc *ResultDoc
	// JSON is the result document as JSON text (foilwright.result/1 or
	// /2), from a stage that gives it as text.
	JSON      []byte
	Artifacts []Artifact
	Warnings  []string
	// Timings holds the wall-clock time of named phases of the run
	// ("build", "factor", "solve", "total"). They are not part of the result
	// document, which stays reproducible byte for byte.
	Timings map[string]time.Duration
}

// Document returns the result document as JSON text: JSON when the stage
// answered with text, else Doc encoded in ResultFormat.
func (r Result) Document() ([]byte, error) {
	if len(r.JSON) > 0 || r.Doc == nil {
		return r.JSON, nil
	}
	return r.Doc.Encode()
}

// DocumentV1 returns the result document as ResultFormatV1 JSON (points
// as objects, ResultDoc.EncodeV1), for readers that predate ResultFormat.
func (r Result) DocumentV1() ([]byte, error) {
	doc := r.Doc
	if doc == nil {
		var err error
		if doc, err = DecodeResult(r.JSON); err != nil {
			return nil, err
		}
	}
	return doc.EncodeV1()
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
