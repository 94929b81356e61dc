package stage

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"sort"

	"github.com/tidwall/gjson"

	"github.com/foilwright/foilwright/internal/limits"
)

// ResultFormat is the value of the "format" key of a result document.
const ResultFormat = "foilwright.result/1"

// ResultDoc is the result document (format foilwright.result/1) of one stage
// run on one section. JSON has no NaN: a case that failed is null in Cases,
// with a warning saying why. A stage documents its scalars and checks in
// Info.Scalars and its package documentation.
type ResultDoc struct {
	Format   string             `json:"format"`
	Stage    string             `json:"stage"`
	Version  string             `json:"version"`
	Scalars  map[string]float64 `json:"scalars"`
	Cases    []*Case            `json:"cases"`
	Warnings []string           `json:"warnings"`
}

// Case is the result at one angle of attack. Coefficients follow the
// conventions of package geometry: cm_c4 about the quarter chord, positive
// nose-up; Cp = 1 − (V/V∞)².
type Case struct {
	AlphaDeg float64 `json:"alpha_deg"`
	CL       float64 `json:"cl"`
	CMc4     float64 `json:"cm_c4"`
	// Checks holds the self-checks of the case by name (for example the
	// closed-body source sum), as documented by the stage.
	Checks map[string]float64 `json:"checks,omitempty"`
	Cp     []CpPoint          `json:"cp,omitempty"`
	// Load is the chordwise load distribution of a thin-section stage,
	// ΔCp = Cp,lower − Cp,upper along the chord.
	Load []LoadPoint `json:"load,omitempty"`
	// Field is the flow on a grid around the section, when asked for.
	Field *Field `json:"field,omitempty"`
}

// Field is the flow of one case on a regular grid in chord units: point
// (i, j) is (X0 + i·DX, Y0 + j·DY), stored row by row (j outer). Values at
// points inside the body, or too near the surface to evaluate, are null.
// Psi is the stream function ψ/(V∞ c), defined up to a constant.
type Field struct {
	X0  float64    `json:"x0"`
	Y0  float64    `json:"y0"`
	DX  float64    `json:"dx"`
	DY  float64    `json:"dy"`
	NX  int        `json:"nx"`
	NY  int        `json:"ny"`
	Psi []*float64 `json:"psi"`
	Cp  []*float64 `json:"cp"`
}

// LoadPoint is the load ΔCp = Cp,lower − Cp,upper at chord station x.
type LoadPoint struct {
	X   float64 `json:"x"`
	DCp float64 `json:"dcp"`
}

// CpPoint is the pressure coefficient at a point of the section, in chord
// units.
type CpPoint struct {
	X  float64 `json:"x"`
	Y  float64 `json:"y"`
	Cp float64 `json:"cp"`
}

// NewResultDoc returns an empty result document of the stage described by
// info.
func NewResultDoc(info Info) *ResultDoc {
	return &ResultDoc{
		Format:   ResultFormat,
		Stage:    info.Name,
		Version:  info.Version,
		Scalars:  map[string]float64{},
		Cases:    []*Case{},
		Warnings: []string{},
	}
}

// AddCase appends c to d. If any value of c is NaN or infinite, it appends
// null instead, with a warning naming the angle.
func (d *ResultDoc) AddCase(c Case) {
	if name, ok := c.nonFinite(); ok {
		d.FailCase(c.AlphaDeg, fmt.Errorf("%s is not finite", name))
		return
	}
	d.Cases = append(d.Cases, &c)
}

// FailCase appends a null case for the angle alphaDeg (degrees) with a
// warning giving err.
func (d *ResultDoc) FailCase(alphaDeg float64, err error) {
	d.Cases = append(d.Cases, nil)
	d.Warnings = append(d.Warnings, fmt.Sprintf("case %d (alpha %g deg): %v", len(d.Cases)-1, alphaDeg, err))
}

// SetScalar sets the scalar name to v. A non-finite v is left out, with a
// warning.
func (d *ResultDoc) SetScalar(name string, v float64) {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		delete(d.Scalars, name)
		d.Warnings = append(d.Warnings, fmt.Sprintf("scalar %s is not finite (%g), left out", name, v))
		return
	}
	d.Scalars[name] = v
}

func (c *Case) nonFinite() (string, bool) {
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	switch {
	case bad(c.AlphaDeg):
		return "alpha_deg", true
	case bad(c.CL):
		return "cl", true
	case bad(c.CMc4):
		return "cm_c4", true
	}
	names := make([]string, 0, len(c.Checks))
	for k := range c.Checks {
		names = append(names, k)
	}
	sort.Strings(names)
	for _, k := range names {
		if bad(c.Checks[k]) {
			return "check " + k, true
		}
	}
	for i, p := range c.Cp {
		if bad(p.X) || bad(p.Y) || bad(p.Cp) {
			return fmt.Sprintf("cp point %d", i), true
		}
	}
	for i, p := range c.Load {
		if bad(p.X) || bad(p.DCp) {
			return fmt.Sprintf("load point %d", i), true
		}
	}
	return "", false
}

// Encode returns d as indented JSON followed by a newline. The output is
// deterministic (map keys sorted). It fails on non-finite values.
func (d *ResultDoc) Encode() ([]byte, error) {
	if d.Format == "" {
		d.Format = ResultFormat
	}
	b, err := json.MarshalIndent(d, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("stage: encode result: %w", err)
	}
	return append(b, '\n'), nil
}

// ErrMalformed means a document received from a stage is not valid JSON or
// not the documented format.
var ErrMalformed = errors.New("stage: malformed reply")

// DecodeResult checks and decodes a result document. It returns an error
// wrapping ErrMalformed if data is not valid JSON, has the wrong format,
// lacks stage or version, or has a case with no alpha_deg.
func DecodeResult(data []byte) (*ResultDoc, error) {
	// The JSON checks below recurse once per level: refuse absurd nesting
	// first (the documented format nests four levels).
	if err := limits.CheckDepth(data, limits.MaxJSONDepth); err != nil {
		return nil, fmt.Errorf("%w: result: %v", ErrMalformed, err)
	}
	if !gjson.ValidBytes(data) {
		return nil, fmt.Errorf("%w: result is not valid JSON (%s)", ErrMalformed, excerpt(data))
	}
	if f := gjson.GetBytes(data, "format"); f.Type != gjson.String || f.Str != ResultFormat {
		return nil, fmt.Errorf("%w: result format %s, want %q", ErrMalformed, describe(f), ResultFormat)
	}
	for _, k := range []string{"stage", "version"} {
		if v := gjson.GetBytes(data, k); v.Type != gjson.String || v.Str == "" {
			return nil, fmt.Errorf("%w: result %s is %s, want a string", ErrMalformed, k, describe(v))
		}
	}
	cases := gjson.GetBytes(data, "cases")
	if cases.Exists() && !cases.IsArray() {
		return nil, fmt.Errorf("%w: result cases is %s, want an array", ErrMalformed, describe(cases))
	}
	i := 0
	var bad error
	cases.ForEach(func(_, c gjson.Result) bool {
		if c.Type != gjson.Null {
			if a := c.Get("alpha_deg"); a.Type != gjson.Number {
				bad = fmt.Errorf("%w: result case %d: alpha_deg is %s, want a number", ErrMalformed, i, describe(a))
				return false
			}
		}
		i++
		return true
	})
	if bad != nil {
		return nil, bad
	}
	var d ResultDoc
	if err := json.NewDecoder(bytes.NewReader(data)).Decode(&d); err != nil {
		return nil, fmt.Errorf("%w: result: %v", ErrMalformed, err)
	}
	if d.Scalars == nil {
		d.Scalars = map[string]float64{}
	}
	if d.Cases == nil {
		d.Cases = []*Case{}
	}
	if d.Warnings == nil {
		d.Warnings = []string{}
	}
	return &d, nil
}

// describe says what a gjson value is, for messages.
func describe(r gjson.Result) string {
	if !r.Exists() {
		return "missing"
	}
	switch r.Type {
	case gjson.String:
		return fmt.Sprintf("%q", r.Str)
	case gjson.Null:
		return "null"
	}
	return excerpt([]byte(r.Raw))
}

// excerpt returns at most 40 bytes of b, quoted.
func excerpt(b []byte) string {
	const max = 40
	if len(b) > max {
		return fmt.Sprintf("%q…", b[:max])
	}
	return fmt.Sprintf("%q", b)
}
