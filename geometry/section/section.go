package section

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"

	"github.com/foilwright/foilwright/geometry"
)

// Format is the value of the "format" key of a section document.
const Format = "foilwright.section/1"

// Section is the section document (format foilwright.section/1): the nodes of
// a clean, normalised, repanelled section in the node order of package
// geometry, with the record of how it was made and how it maps back to the
// part.
//
// A reader accepts any document with "format" and "nodes"; the other keys are
// optional and may be added to, never renamed. Lengths are in chord units
// except where a field says "input units".
type Section struct {
	Format       string           `json:"format"`
	Name         string           `json:"name,omitempty"`
	Units        geometry.Unit    `json:"units,omitempty"`
	Source       *SourceInfo      `json:"source,omitempty"`
	Frame        *Frame           `json:"frame,omitempty"`
	Fit          *FitSummary      `json:"fit,omitempty"`
	TrailingEdge *TrailingEdge    `json:"trailing_edge,omitempty"`
	LEIndex      *int             `json:"le_index,omitempty"`
	Panels       *PanelSummary    `json:"panels,omitempty"`
	Properties   *Properties      `json:"properties,omitempty"`
	Uncertainty  *Uncertainty     `json:"uncertainty,omitempty"`
	Warnings     []string         `json:"warnings,omitempty"`
	Nodes        []geometry.Point `json:"nodes"`
}

// SourceInfo records the files a section was made from and what was dropped.
type SourceInfo struct {
	Files      []string  `json:"files"`
	SHA256     []string  `json:"sha256"` // SHA256[i] is the hex digest of Files[i]
	PointsRead int       `json:"points_read"`
	PointsUsed int       `json:"points_used"`
	Dropped    []Dropped `json:"dropped"`
	// ProbeRadius is the radius of the probe ball whose centres the points
	// were, by which they were moved toward the part (input units); 0 when
	// the points were taken as on the part.
	ProbeRadius float64 `json:"probe_radius,omitempty"`
}

// Dropped is one input point that did not make it into the section.
type Dropped struct {
	File   string `json:"file"`
	Line   int    `json:"line"`
	Entity int    `json:"entity,omitempty"`
	Reason string `json:"reason"`
}

// FitSummary reports how far the fitted curve departs from the kept input
// points, in input units.
type FitSummary struct {
	Method string  `json:"method"`
	RMS    float64 `json:"rms"`
	Max    float64 `json:"max"`
	MaxAt  string  `json:"max_at"` // origin of the worst point, "file:line"
	// NoiseEstimate is the measurement noise the points show (a standard
	// deviation normal to the outline); 0 for an interpolating fit.
	NoiseEstimate float64 `json:"noise_estimate,omitempty"`
	// Interpolates says why the curve passes through every point, when
	// it does (noise 0 given, exact samples, too few points).
	Interpolates string `json:"interpolates,omitempty"`
	// Parameter is the parameter an interpolating fit runs in (chord
	// length, centripetal or uniform: the one under which every second
	// point best predicts the others).
	Parameter string `json:"parameter,omitempty"`
	// Fairness measures the curvature of the fitted curve (chord
	// units): its sign changes, those of them made by noise (lobes much
	// shorter than the outline's own turns), and its roughness.
	Fairness *Fairness `json:"fairness,omitempty"`
}

// Fairness is the fairness of a section's fitted curve.
type Fairness struct {
	// Inflections counts the sign changes of the curvature.
	Inflections int `json:"inflections"`
	// Wiggles counts the short lobes of curvature noise leaves: 0 on a
	// fair curve.
	Wiggles int `json:"wiggles"`
	// Ripples counts the dips of the curvature round the nose (a minimum
	// between two maxima) left in the fit: 0 on a fair curve.
	Ripples int `json:"ripples"`
	// Roughness is the RMS of dκ/ds along the outline, chord units (1/c²).
	Roughness float64 `json:"roughness"`
}

// Uncertainty holds 95 % bounds on the error of the section against the
// part: chord and leading-edge position (a distance) in input units,
// twist in degrees, and the surface (the largest distance of the section
// from the part's outline, normalised) in chord units.
type Uncertainty struct {
	Chord    float64 `json:"chord"`
	TwistDeg float64 `json:"twist_deg"`
	LE       float64 `json:"le"`
	Surface  float64 `json:"surface"`
}

// Frame maps the normalised section back to the part, in input units:
// chord, twist (degrees, positive nose-up), the leading edge in input
// coordinates, and whether the section was mirrored to bring it into the
// normalised frame.
type Frame struct {
	Chord    float64    `json:"chord"`
	TwistDeg float64    `json:"twist_deg"`
	LE       [2]float64 `json:"le"`
	Mirrored bool       `json:"mirrored"`
	// Plane is set when the section was cut from or fitted to 3D data: the
	// section's 2D input coordinates (u, v) are Origin + u·U + v·V in space.
	Plane *geometry.Plane `json:"plane,omitempty"`
}

// TrailingEdge reports the kind of trailing edge found and what was done to it.
type TrailingEdge struct {
	Kind      string  `json:"kind"`      // sharp | blunt | rounded | open
	Thickness float64 `json:"thickness"` // as found, chord units
	Action    string  `json:"action"`    // kept | closed | thinned | thickened | sharpened
	MaxShift  float64 `json:"max_shift"` // input units
	// Target is the thickness a reshape gave the edge (chord units); nil
	// when it was not reshaped.
	Target *float64 `json:"target_thickness,omitempty"`
	// Blend is the length ahead of the edge over which a reshape blended
	// into the surfaces (chord units); 0 when it was not reshaped.
	Blend float64 `json:"blend_length,omitempty"`
}

// PanelSummary describes the panel distribution of the nodes.
type PanelSummary struct {
	Count      int     `json:"count"`
	Spacing    string  `json:"spacing"`
	MaxRatio   float64 `json:"max_ratio"`
	MaxTurnDeg float64 `json:"max_turn_deg"`
	// Deviation is the largest distance between the panels and the curve
	// they replace (chord units); 0 when not measured.
	Deviation float64 `json:"deviation,omitempty"`
	// Target is the deviation the panel count was chosen to meet (chord
	// units), when it was chosen automatically; 0 when the count was given.
	Target float64 `json:"deviation_target,omitempty"`
}

// Properties are the geometric properties of a normalised section, in chord
// units.
type Properties struct {
	Thickness   float64    `json:"thickness"`
	ThicknessAt float64    `json:"thickness_at"`
	Camber      float64    `json:"camber"`
	CamberAt    float64    `json:"camber_at"`
	LERadius    float64    `json:"le_radius"`
	TEAngleDeg  float64    `json:"te_angle_deg"`
	Area        float64    `json:"area"`
	Centroid    [2]float64 `json:"centroid"`
	Ixx         float64    `json:"ixx"`
	Iyy         float64    `json:"iyy"`
	Ixy         float64    `json:"ixy"`
	Perimeter   float64    `json:"perimeter"`
}

// ErrNotSection means a document is not a section document.
var ErrNotSection = errors.New("not a foilwright section document")

// Read decodes a section document from r. name is used in errors. It
// accepts any document with a "format" of Format and "nodes"; it
// returns an error wrapping ErrNotSection otherwise, and a *ParseError for
// malformed JSON or non-finite nodes.
func Read(r io.Reader, name string) (*Section, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, &geometry.ParseError{File: name, Err: err}
	}
	var s Section
	if err := json.Unmarshal(data, &s); err != nil {
		line := 0
		var se *json.SyntaxError
		if errors.As(err, &se) {
			line = lineOf(data, se.Offset)
		}
		var te *json.UnmarshalTypeError
		if errors.As(err, &te) {
			line = lineOf(data, te.Offset)
		}
		return nil, &geometry.ParseError{File: name, Line: line, Err: fmt.Errorf("%w: %v", ErrNotSection, err)}
	}
	if s.Format != Format {
		return nil, &geometry.ParseError{File: name, Err: fmt.Errorf("%w: format %q, want %q", ErrNotSection, s.Format, Format)}
	}
	if s.Nodes == nil {
		return nil, &geometry.ParseError{File: name, Err: fmt.Errorf("%w: no \"nodes\"", ErrNotSection)}
	}
	for i, p := range s.Nodes {
		if !p.IsFinite() {
			return nil, &geometry.ParseError{File: name, Err: fmt.Errorf("node %d: %w", i, geometry.ErrNonFinite)}
		}
	}
	return &s, nil
}

// Write encodes s to w as indented JSON followed by a newline, with
// one node "[x, y]" per line. The output is deterministic: the same section
// gives the same bytes. It returns an error for non-finite nodes.
func Write(w io.Writer, s *Section) error {
	b, err := Encode(s)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

// Encode returns the bytes Write writes. A section with an
// empty Format field gets Format.
func Encode(s *Section) ([]byte, error) {
	c := *s
	if c.Format == "" {
		c.Format = Format
	}
	for k, p := range c.Nodes {
		if !p.IsFinite() {
			return nil, fmt.Errorf("geometry: write section: node %d (%g, %g): %w", k, p.X, p.Y, geometry.ErrNonFinite)
		}
	}
	b, err := json.MarshalIndent(&c, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("geometry: write section: %w", err)
	}
	b = CompactNumberArrays(b)
	return append(b, '\n'), nil
}

// CompactNumberArrays rewrites indented JSON so that every array holding
// only numbers sits on one line, "[x, y]". Other text is unchanged, so a
// list of points prints one point per line.
func CompactNumberArrays(b []byte) []byte {
	out := make([]byte, 0, len(b))
	inString := false
	for i := 0; i < len(b); i++ {
		ch := b[i]
		if inString {
			out = append(out, ch)
			switch ch {
			case '\\':
				if i+1 < len(b) {
					i++
					out = append(out, b[i])
				}
			case '"':
				inString = false
			}
			continue
		}
		switch ch {
		case '"':
			inString = true
			out = append(out, ch)
		case '[':
			if j, ok := numberArray(b, i); ok {
				out = append(out, '[')
				first := true
				for _, f := range bytes.Split(b[i+1:j], []byte{','}) {
					f = bytes.TrimSpace(f)
					if len(f) == 0 {
						continue
					}
					if !first {
						out = append(out, ", "...)
					}
					first = false
					out = append(out, f...)
				}
				out = append(out, ']')
				i = j
				continue
			}
			out = append(out, ch)
		default:
			out = append(out, ch)
		}
	}
	return out
}

// numberArray reports whether the array opening at b[i] holds only
// numbers, and the index of its closing bracket.
func numberArray(b []byte, i int) (int, bool) {
	for j := i + 1; j < len(b); j++ {
		switch c := b[j]; {
		case c == ']':
			return j, true
		case c == ',' || c == ' ' || c == '\n' || c == '\t' || c == '\r' || c == '-' || c == '+' || c == '.' || c == 'e' || c == 'E' || (c >= '0' && c <= '9'):
		default:
			return 0, false
		}
	}
	return 0, false
}

// lineOf returns the 1-based line of byte offset off in data.
func lineOf(data []byte, off int64) int {
	line := 1
	for i := int64(0); i < off && i < int64(len(data)); i++ {
		if data[i] == '\n' {
			line++
		}
	}
	return line
}
