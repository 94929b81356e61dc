package export

import (
	"bufio"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"sort"
	"strings"
)

// The formats of the result documents the stages return, as package
// plugins/stage writes them: ResultFormat with its distributions as
// columns ("cp": {"x": […], "y": […], "cp": […]}, the points the cases
// share once in "cp_at"), ResultFormatV1 with every point an object.
// ReadResult reads both.
const (
	ResultFormat   = "foilwright.result/2"
	ResultFormatV1 = "foilwright.result/1"
)

// ErrNotResult means a document that is not a stage's result document.
var ErrNotResult = errors.New("export: not a foilwright result document")

// A Result is the part of one stage's result document for one section that
// the tables need: the cases, each an angle of attack with its lift and
// moment coefficients, self-checks and pressure distribution.
type Result struct {
	Section string // the section's name
	Stage   string // the stage that made it (its name as it answers)
	Version string
	Cases   []Case // failed cases (null in the document) left out
}

// A Case is the result at one angle of attack.
type Case struct {
	AlphaDeg float64            `json:"alpha_deg"`
	CL       float64            `json:"cl"`
	CMc4     float64            `json:"cm_c4"`
	Checks   map[string]float64 `json:"checks"`
	Cp       []CpPoint          `json:"cp"`
}

// A CpPoint is the pressure coefficient at a node (x, y in chord units).
type CpPoint struct {
	X  float64 `json:"x"`
	Y  float64 `json:"y"`
	Cp float64 `json:"cp"`
}

// ReadResult decodes a result document of the section called section, in
// either format; name names the document in errors. It returns an error
// wrapping ErrNotResult for anything else.
func ReadResult(data []byte, name, section string) (*Result, error) {
	type columns struct {
		X  []float64 `json:"x"`
		Y  []float64 `json:"y"`
		Cp []float64 `json:"cp"`
	}
	var doc struct {
		Format  string          `json:"format"`
		Stage   string          `json:"stage"`
		Version string          `json:"version"`
		CpAt    *columns        `json:"cp_at"`
		Cases   json.RawMessage `json:"cases"`
	}
	if err := json.Unmarshal(data, &doc); err != nil {
		return nil, fmt.Errorf("%s: %w: %v", name, ErrNotResult, err)
	}
	r := &Result{Section: section, Stage: doc.Stage, Version: doc.Version}
	switch doc.Format {
	case ResultFormatV1:
		var cases []*Case
		if len(doc.Cases) > 0 {
			if err := json.Unmarshal(doc.Cases, &cases); err != nil {
				return nil, fmt.Errorf("%s: %w: %v", name, ErrNotResult, err)
			}
		}
		for _, c := range cases {
			if c != nil {
				r.Cases = append(r.Cases, *c)
			}
		}
	case ResultFormat:
		var cases []*struct {
			Case
			Cp *columns `json:"cp"`
		}
		if len(doc.Cases) > 0 {
			if err := json.Unmarshal(doc.Cases, &cases); err != nil {
				return nil, fmt.Errorf("%s: %w: %v", name, ErrNotResult, err)
			}
		}
		for i, c := range cases {
			if c == nil {
				continue
			}
			out := c.Case
			if p := c.Cp; p != nil {
				xs, ys := p.X, p.Y
				if xs == nil && ys == nil && doc.CpAt != nil {
					xs, ys = doc.CpAt.X, doc.CpAt.Y
				}
				if len(xs) != len(p.Cp) || len(ys) != len(p.Cp) {
					return nil, fmt.Errorf("%s: %w: case %d: %d cp value(s) at %d x and %d y", name, ErrNotResult, i, len(p.Cp), len(xs), len(ys))
				}
				out.Cp = make([]CpPoint, len(p.Cp))
				for k := range p.Cp {
					out.Cp[k] = CpPoint{X: xs[k], Y: ys[k], Cp: p.Cp[k]}
				}
			}
			r.Cases = append(r.Cases, out)
		}
	default:
		return nil, fmt.Errorf("%s: %w: format %q, want %q or %q", name, ErrNotResult, doc.Format, ResultFormat, ResultFormatV1)
	}
	return r, nil
}

// csvField quotes s for CSV when it holds a comma, a quote or a line
// break (RFC 4180).
func csvField(s string) string {
	if strings.ContainsAny(s, ",\"\r\n") {
		return `"` + strings.ReplaceAll(s, `"`, `""`) + `"`
	}
	return s
}

// PolarCSV writes the polars of rs, one row per angle per stage per
// section: section, stage, alpha_deg, cl, cm_c4 and each self-check any
// of them reports (empty where a stage does not), after comment lines. It
// returns the first error of w.
func PolarCSV(w io.Writer, rs []*Result) error {
	checkSet := map[string]bool{}
	for _, r := range rs {
		for _, c := range r.Cases {
			for k := range c.Checks {
				checkSet[k] = true
			}
		}
	}
	checks := make([]string, 0, len(checkSet))
	for k := range checkSet {
		checks = append(checks, k)
	}
	sort.Strings(checks)
	bw := bufio.NewWriter(w)
	bw.WriteString("# polars written by foilwright: inviscid estimates, check them against test data\n")
	bw.WriteString("# alpha_deg in degrees, positive nose-up; cm_c4 about the quarter chord, positive nose-up\n")
	bw.WriteString("section,stage,alpha_deg,cl,cm_c4")
	for _, k := range checks {
		bw.WriteString("," + csvField(k))
	}
	bw.WriteString("\n")
	for _, r := range rs {
		for _, c := range r.Cases {
			fmt.Fprintf(bw, "%s,%s,%s,%s,%s", csvField(r.Section), csvField(r.Stage), num(c.AlphaDeg), num(c.CL), num(c.CMc4))
			for _, k := range checks {
				bw.WriteString(",")
				if v, ok := c.Checks[k]; ok {
					bw.WriteString(num(v))
				}
			}
			bw.WriteString("\n")
		}
	}
	return bw.Flush()
}

// CpCSV writes the pressure distributions of rs: one row per node per
// angle per stage per section, with section, stage, alpha_deg, x, y (chord
// units, the normalised frame) and cp, after comment lines. Stages that
// give no Cp add no rows. It returns the first error of w.
func CpCSV(w io.Writer, rs []*Result) error {
	bw := bufio.NewWriter(w)
	bw.WriteString("# pressure coefficients written by foilwright: inviscid estimates, check them against test data\n")
	bw.WriteString("# x, y in chord units (leading edge at 0,0, trailing edge at 1,0); cp = 1 - (V/Vinf)^2\n")
	bw.WriteString("section,stage,alpha_deg,x,y,cp\n")
	for _, r := range rs {
		for _, c := range r.Cases {
			for _, p := range c.Cp {
				fmt.Fprintf(bw, "%s,%s,%s,%s,%s,%s\n", csvField(r.Section), csvField(r.Stage), num(c.AlphaDeg), num(p.X), num(p.Y), num(p.Cp))
			}
		}
	}
	return bw.Flush()
}
