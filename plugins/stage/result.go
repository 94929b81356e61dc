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

// The formats of result documents. ResultFormat is the one written;
// DecodeResult reads both.
//
// In foilwright.result/1 every pressure and load point is an object,
// "cp": [{"x": …, "y": …, "cp": …}, …]. In foilwright.result/2 the
// distributions are columns, "cp": {"x": […], "y": […], "cp": […]} and
// "load": {"x": […], "dcp": […]}, and the points or stations the cases
// share are given once at the top, "cp_at": {"x": […], "y": […]} and
// "load_at": {"x": […]}, the cases then leaving out their own "x" and "y".
// Everything else is the same. A document a pipeline trimmed says what it
// kept ("kept": "scalars" or "cases").
const (
	ResultFormat   = "foilwright.result/2"
	ResultFormatV1 = "foilwright.result/1"
)

// The detail of a result document a pipeline may keep (the "keep" key of
// a stage in a pipeline file); Keeps lists them.
const (
	KeepScalars = "scalars" // scalars and warnings; no cases
	KeepCases   = "cases"   // also each case's coefficients and checks; no distributions or fields
	KeepAll     = "all"     // everything the stage gave
)

// Keeps returns the detail levels a result document may be trimmed to,
// from the least to the most.
func Keeps() []string { return []string{KeepScalars, KeepCases, KeepAll} }

// ResultDoc is the result document of one stage run on one section. JSON
// has no NaN: a case that failed is nil in Cases (null in the document),
// with a warning saying why. A stage documents its scalars and checks in
// Info.Scalars and its package documentation.
//
// The Go value is the same whichever format the document was read from;
// Encode writes ResultFormat, EncodeV1 the row form of ResultFormatV1.
type ResultDoc struct {
	Format   string             `json:"format"`
	Stage    string             `json:"stage"`
	Version  string             `json:"version"`
	Kept     string             `json:"kept,omitempty"` // "" when nothing was left out
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

// Encode returns d as a ResultFormat document followed by a newline (see
// ResultFormat; the cases keep what d.Kept says). The output is
// deterministic: keys sorted, every number in the shortest form that reads
// back to the same float64. It fails on non-finite values.
func (d *ResultDoc) Encode() ([]byte, error) {
	return encodeV2(d)
}

// EncodeV1 returns d as an indented ResultFormatV1 document (points as
// objects) followed by a newline, for readers that predate
// ResultFormat. The output is deterministic. It fails on non-finite
// values.
func (d *ResultDoc) EncodeV1() ([]byte, error) {
	c := *d
	c.Format = ResultFormatV1
	b, err := json.MarshalIndent(&c, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("stage: encode result: %w", err)
	}
	return append(b, '\n'), nil
}

// Trim returns a copy of d keeping only the detail keep asks for
// (KeepScalars, KeepCases or KeepAll; "" means KeepAll), with Kept set.
// d is not changed; what the copy keeps is shared with d.
func (d *ResultDoc) Trim(keep string) *ResultDoc {
	c := *d
	switch keep {
	case KeepScalars:
		c.Kept = KeepScalars
		c.Cases = []*Case{}
	case KeepCases:
		if c.Kept != KeepScalars {
			c.Kept = KeepCases
		}
		c.Cases = make([]*Case, len(d.Cases))
		for i, k := range d.Cases {
			if k != nil {
				c.Cases[i] = &Case{AlphaDeg: k.AlphaDeg, CL: k.CL, CMc4: k.CMc4, Checks: k.Checks}
			}
		}
	}
	return &c
}

// ErrMalformed means a document received from a stage is not valid JSON or
// not the documented format.
var ErrMalformed = errors.New("stage: malformed reply")

// DecodeResult checks and decodes a result document of either format
// (ResultFormat or ResultFormatV1). It returns an error wrapping
// ErrMalformed if data is not valid JSON, has another format, lacks stage
// or version, has a case with no alpha_deg, or (in ResultFormat) columns
// of different lengths or points given nowhere.
func DecodeResult(data []byte) (*ResultDoc, error) {
	// The JSON checks below recurse once per level: refuse absurd nesting
	// first (the documented formats nest four levels).
	if err := limits.CheckDepth(data, limits.MaxJSONDepth); err != nil {
		return nil, fmt.Errorf("%w: result: %v", ErrMalformed, err)
	}
	if !gjson.ValidBytes(data) {
		return nil, fmt.Errorf("%w: result is not valid JSON (%s)", ErrMalformed, excerpt(data))
	}
	f := gjson.GetBytes(data, "format")
	if f.Type != gjson.String || f.Str != ResultFormat && f.Str != ResultFormatV1 {
		return nil, fmt.Errorf("%w: result format %s, want %q or %q", ErrMalformed, describe(f), ResultFormat, ResultFormatV1)
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
	var d *ResultDoc
	if f.Str == ResultFormatV1 {
		d = &ResultDoc{}
		if err := json.NewDecoder(bytes.NewReader(data)).Decode(d); err != nil {
			return nil, fmt.Errorf("%w: result: %v", ErrMalformed, err)
		}
	} else {
		var err error
		if d, err = decodeV2(data); err != nil {
			return nil, err
		}
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
	if d.Kept != "" && d.Kept != KeepScalars && d.Kept != KeepCases {
		return nil, fmt.Errorf("%w: result kept is %q, want %q or %q", ErrMalformed, d.Kept, KeepScalars, KeepCases)
	}
	return d, nil
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
