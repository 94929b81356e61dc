package compare

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/frame"
	"github.com/foilwright/foilwright/geometry/props"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/digest"
	"github.com/foilwright/foilwright/prep"
	"github.com/foilwright/foilwright/repanel"
)

// Reference shapes a design may name instead of a file.
const (
	ShapeNACA4         = "naca4"          // naca4:2412, or naca4:2412:sharp for the closed trailing edge
	ShapeKarmanTrefftz = "karman-trefftz" // karman-trefftz:XC,YC,TE_DEG
)

// ShapeNodes is the number of panels of the spline through which a
// reference shape is drawn: cosine-spaced on each surface (NACA 4-digit),
// equally spaced in the circle angle (Kármán–Trefftz). The spline of
// NACA 2412 lies within 3.8e-8 chord of the exact shape (measured by
// TestShapeSplineAccuracy, which allows 2e-7; largest at the camber-line
// joint, where the shape's curvature jumps).
const ShapeNodes = 2000

// Design kinds.
const (
	DesignShape   = "shape"   // a reference shape
	DesignSection = "section" // a section document
	DesignPoints  = "points"  // a point file (listing, DXF, delimited)
)

// ErrDesign means the design could not be read or placed.
var ErrDesign = errors.New("design")

// DesignSpec says where the design comes from and where it sits on the
// part.
type DesignSpec struct {
	// Source is a reference shape ("naca4:2412", "karman-trefftz:-0.1,0.05,8")
	// or, with Data, the display name of a design file.
	Source string
	// Data holds the design file's bytes: a section document, or a point
	// file prep reads (coordinate listing, DXF, delimited text).
	Data []byte
	// Units is the length unit of a design file that does not say (mm, in,
	// m or chord); "" takes what the file says.
	Units string
	// Format names the point-file format of a design file; "" detects it.
	Format string
	// The nominal placement of a design in chord units, in the
	// measurement's units: the chord, the twist (degrees, nose-up) and the
	// leading edge. Unset values come from the section document's frame
	// when the design is one, else from the measured section.
	Chord    *float64
	TwistDeg *float64
	Offset   *geometry.Point
}

// IsShape reports whether source names a reference shape rather than a
// file.
func IsShape(source string) bool {
	name, _, ok := strings.Cut(source, ":")
	return ok && (name == ShapeNACA4 || name == ShapeKarmanTrefftz)
}

// Placement is where a design in chord units sits on the part, and what
// said so.
type Placement struct {
	Chord    float64        `json:"chord"`
	TwistDeg float64        `json:"twist_deg"`
	Offset   geometry.Point `json:"offset"`
	// From says where each value came from: "given", "design" (the
	// section document's frame) or "measured" (the measured section).
	ChordFrom    string `json:"chord_from"`
	TwistFrom    string `json:"twist_from"`
	OffsetFrom   string `json:"offset_from"`
	chordGiven   bool
	nominalGiven bool
}

// Design is the nominal section a part is compared with, placed in the
// part frame in the measurement's units.
type Design struct {
	Name   string
	Source string
	Kind   string // DesignShape, DesignSection or DesignPoints
	SHA256 string // of the design file; "" for a reference shape
	// ChordUnits reports a design drawn in chord units and placed by
	// Placement; otherwise the design is in part units and taken as it is.
	ChordUnits bool
	Placement  Placement
	Units      geometry.Unit // the measurement's, which the outline is in
	// Outline is the design's outline in the part frame.
	Outline *Outline
	// Frame is the design's frame (chord, twist, leading edge, mirroring)
	// in the tool's convention: the leading edge is the point farthest
	// from the trailing-edge midpoint, as for a measured section.
	Frame frame.Frame
	// TE is the design's trailing edge.
	TE frame.TrailingEdge
	// Section is the design normalised and repanelled like the measured
	// section, with its properties: what the stages analyse.
	Section *section.Section
	// Props are the design's properties with the figures behind them.
	Props *props.SectionProperties
	// Warnings are remarks about the design (a placement taken from the
	// measurement, a unit conversion).
	Warnings []string
}

// chordShape is a design read in chord units: nodes in the node order and
// the kind of its trailing edge.
type chordShape struct {
	name  string
	nodes []geometry.Point
	kind  string // frame.TESharp, TEBlunt or TERounded
	frame *section.Frame
	units geometry.Unit // of frame
}

// NewDesign reads and places the design of spec against the measurement
// m: a reference shape or a design file, in chord units (placed by the
// spec, the section document's frame, or the measured section, in that
// order) or in part units (converted to the measurement's units). The
// design is then normalised in the tool's convention and repanelled with
// the panel options po (those of the measured section), and its
// properties are computed with the property options pr. Errors wrap
// ErrDesign, or are the reader's, naming the file and line.
func NewDesign(spec DesignSpec, m *Measurement, po repanel.Options, pr props.Options) (*Design, error) {
	d := &Design{Source: spec.Source, Units: m.Units}
	var cs *chordShape
	var partPts []geometry.Point
	var partUnits geometry.Unit
	switch {
	case spec.Data == nil:
		if !IsShape(spec.Source) {
			return nil, fmt.Errorf("%w %q: not a reference shape (want %s:CODE or %s:XC,YC,TE_DEG) and no file", ErrDesign, spec.Source, ShapeNACA4, ShapeKarmanTrefftz)
		}
		var err error
		if cs, err = parseShape(spec.Source); err != nil {
			return nil, err
		}
		d.Kind = DesignShape
	case IsSectionDocument(spec.Data):
		s, err := section.Read(bytes.NewReader(spec.Data), spec.Source)
		if err != nil {
			return nil, err
		}
		if _, err := section.CheckNodes(s.Nodes); err != nil {
			return nil, fmt.Errorf("%s: %w", spec.Source, err)
		}
		cs = &chordShape{name: s.Name, nodes: s.Nodes, frame: s.Frame, units: s.Units}
		if cs.name == "" {
			cs.name = filepath.Base(spec.Source)
		}
		cs.kind = frame.TEBlunt
		if s.TrailingEdge != nil && (s.TrailingEdge.Kind == frame.TESharp || s.TrailingEdge.Kind == frame.TERounded) {
			cs.kind = s.TrailingEdge.Kind
		} else if s.Nodes[0].Dist(s.Nodes[len(s.Nodes)-1]) == 0 {
			cs.kind = frame.TESharp
		}
		d.Kind, d.SHA256 = DesignSection, digest.Bytes(spec.Data)
	default:
		cl, err := prep.ReadAndClean([]prep.File{prep.NewFile(spec.Source, spec.Data)}, prep.Settings{Units: spec.Units, Format: spec.Format, KeepOutliers: ptr(true)})
		if err != nil {
			return nil, err
		}
		d.Kind, d.SHA256 = DesignPoints, digest.Bytes(spec.Data)
		name := filepath.Base(spec.Source)
		for _, c := range cl.Clouds {
			if c.Name != "" {
				name = c.Name
			}
		}
		if cl.Units == geometry.ChordUnit {
			pts, kind := trailingEdgeFirst(cl.Contour.Points)
			cs = &chordShape{name: name, nodes: pts, kind: kind}
		} else {
			partPts, partUnits = cl.Contour.Points, cl.Units
			d.Name = name
		}
	}
	if cs != nil {
		d.Name = cs.name
		// The design's own frame in the tool's convention, in chord units:
		// a placement taken from the measured section puts this frame on
		// the measured one, not the design's nominal chord line (they
		// differ for a cambered section).
		cv, _ := splineOf(cs.nodes, cs.kind)
		nz, err := frame.Normalize(cv, frame.Options{TE: frame.TEKeep, Mirror: frame.MirrorNo})
		if err != nil {
			return nil, fmt.Errorf("%w %s: %v", ErrDesign, spec.Source, err)
		}
		if err := d.place(spec, cs, m, nz.Frame); err != nil {
			return nil, err
		}
		partPts = make([]geometry.Point, len(cs.nodes))
		fr := frame.Frame{Chord: d.Placement.Chord, TwistDeg: d.Placement.TwistDeg, LE: [2]float64{d.Placement.Offset.X, d.Placement.Offset.Y}}
		for i, q := range cs.nodes {
			partPts[i] = fr.ToPart(q)
		}
		return d, d.build(partPts, cs.kind, frame.MirrorNo, po, pr)
	}
	if spec.Chord != nil || spec.TwistDeg != nil || spec.Offset != nil {
		return nil, fmt.Errorf("%w %s: the design is in %s, not in chord units, so it is not placed by a chord, twist or offset", ErrDesign, spec.Source, partUnits)
	}
	f, err := unitFactor(partUnits, m.Units)
	if err != nil {
		return nil, fmt.Errorf("%w %s: %v", ErrDesign, spec.Source, err)
	}
	if f != 1 {
		for i := range partPts {
			partPts[i] = partPts[i].Scale(f)
		}
		d.Warnings = append(d.Warnings, fmt.Sprintf("design converted from %s to %s", partUnits, m.Units))
	}
	pts, kind := trailingEdgeFirst(partPts)
	d.Placement = Placement{chordGiven: true, nominalGiven: true}
	return d, d.build(pts, kind, frame.MirrorAuto, po, pr)
}

func ptr[T any](v T) *T { return &v }

// IsSectionDocument reports whether data looks like a section document (a
// JSON object naming the section format).
func IsSectionDocument(data []byte) bool {
	t := bytes.TrimLeft(data, " \t\r\n\ufeff")
	return len(t) > 0 && t[0] == '{' && bytes.Contains(data, []byte(section.Format))
}

// parseShape reads a reference shape spec into its nodes.
func parseShape(src string) (*chordShape, error) {
	name, args, _ := strings.Cut(src, ":")
	switch name {
	case ShapeNACA4:
		code, variant, _ := strings.Cut(args, ":")
		foil, err := shape.ParseNACA4(code)
		if err != nil {
			return nil, fmt.Errorf("%w %q: %v", ErrDesign, src, err)
		}
		kind := frame.TEBlunt
		switch variant {
		case "":
		case "sharp":
			foil.SharpTE, kind = true, frame.TESharp
		default:
			return nil, fmt.Errorf("%w %q: %q: want naca4:CODE or naca4:CODE:sharp", ErrDesign, src, variant)
		}
		return &chordShape{name: "NACA " + foil.String(), nodes: foil.Nodes(ShapeNodes), kind: kind}, nil
	case ShapeKarmanTrefftz:
		f := strings.Split(args, ",")
		var v [3]float64
		ok := len(f) == 3
		for i := 0; ok && i < 3; i++ {
			x, err := strconv.ParseFloat(strings.TrimSpace(f[i]), 64)
			ok = err == nil && !math.IsNaN(x) && !math.IsInf(x, 0)
			v[i] = x
		}
		if !ok {
			return nil, fmt.Errorf("%w %q: want karman-trefftz:XC,YC,TE_DEG (circle centre and trailing-edge angle in degrees)", ErrDesign, src)
		}
		kt := shape.KarmanTrefftz{Centre: geometry.Point{X: v[0], Y: v[1]}, TEAngle: v[2] * math.Pi / 180}
		nodes, err := kt.Normalized(ShapeNodes)
		if err != nil {
			return nil, fmt.Errorf("%w %q: %v", ErrDesign, src, err)
		}
		return &chordShape{name: fmt.Sprintf("Karman-Trefftz centre (%g, %g), TE angle %g deg", v[0], v[1], v[2]), nodes: nodes, kind: frame.TESharp}, nil
	}
	return nil, fmt.Errorf("%w %q: unknown shape", ErrDesign, src)
}

// place sets the placement of a design in chord units: each value from
// the spec, else from the design's own frame (a section document made by
// prep), else from the measured section.
func (d *Design) place(spec DesignSpec, cs *chordShape, m *Measurement, f0 frame.Frame) error {
	d.ChordUnits = true
	pl := Placement{}
	var own *frame.Frame
	if cs.frame != nil && cs.units != "" && cs.units != geometry.ChordUnit {
		f, err := unitFactor(cs.units, m.Units)
		if err == nil {
			own = &frame.Frame{Chord: cs.frame.Chord * f, TwistDeg: cs.frame.TwistDeg, LE: [2]float64{cs.frame.LE[0] * f, cs.frame.LE[1] * f}}
			if cs.frame.Mirrored {
				d.Warnings = append(d.Warnings, "the design document's frame is mirrored; the design is placed by its chord, twist and leading edge without the mirror")
			}
		}
	}
	mf := m.Frame()
	switch {
	case spec.Chord != nil:
		if !(*spec.Chord > 0) || math.IsInf(*spec.Chord, 0) {
			return fmt.Errorf("%w %s: chord %g: want a positive length", ErrDesign, spec.Source, *spec.Chord)
		}
		pl.Chord, pl.ChordFrom, pl.chordGiven = *spec.Chord, "given", true
	case own != nil:
		pl.Chord, pl.ChordFrom, pl.chordGiven = own.Chord, "design", true
	default:
		pl.Chord, pl.ChordFrom = mf.Chord, "measured"
	}
	if m.Units == geometry.ChordUnit && spec.Chord == nil && own == nil {
		// A normalised measurement against a normalised design: the chord
		// is 1 by definition.
		pl.Chord, pl.ChordFrom, pl.chordGiven = 1, "given", true
	}
	if pl.ChordFrom == "measured" {
		pl.Chord = mf.Chord / f0.Chord
	}
	switch {
	case spec.TwistDeg != nil:
		pl.TwistDeg, pl.TwistFrom = *spec.TwistDeg, "given"
	case own != nil:
		pl.TwistDeg, pl.TwistFrom = own.TwistDeg, "design"
	default:
		pl.TwistDeg, pl.TwistFrom = mf.TwistDeg-f0.TwistDeg, "measured"
	}
	switch {
	case spec.Offset != nil:
		pl.Offset, pl.OffsetFrom = *spec.Offset, "given"
	case own != nil:
		pl.Offset, pl.OffsetFrom = geometry.Point{X: own.LE[0], Y: own.LE[1]}, "design"
	default:
		// The nominal leading edge where the design's frame puts its own
		// leading edge on the measured one.
		le0 := geometry.Point{X: f0.LE[0], Y: f0.LE[1]}.Rotate(-pl.TwistDeg * math.Pi / 180).Scale(pl.Chord)
		pl.Offset, pl.OffsetFrom = geometry.Point{X: mf.LE[0], Y: mf.LE[1]}.Sub(le0), "measured"
	}
	pl.nominalGiven = pl.ChordFrom != "measured" && pl.TwistFrom != "measured" && pl.OffsetFrom != "measured"
	if !pl.chordGiven {
		d.Warnings = append(d.Warnings, fmt.Sprintf("no chord given: the design is drawn at the measured chord (%.5g %s) and the scale is left free", pl.Chord, m.Units))
	}
	d.Placement = pl
	return nil
}

// build makes the design's outline from its points in the part frame (in
// node order from the trailing edge, the last joining the first), its
// frame in the tool's convention and its repanelled section.
func (d *Design) build(pts []geometry.Point, kind, mirror string, po repanel.Options, pr props.Options) error {
	cv, base := splineOf(pts, kind)
	nz, err := frame.Normalize(cv, frame.Options{TE: frame.TEKeep, Mirror: mirror})
	if err != nil {
		return fmt.Errorf("%w %s: %v", ErrDesign, d.Source, err)
	}
	if nz.Frame.Mirrored {
		return fmt.Errorf("%w %s: the design is drawn mirrored (nose the other way or upside down); draw it with its upper surface up and its nose towards -x", ErrDesign, d.Source)
	}
	d.Frame, d.TE = nz.Frame, nz.TE
	sLE, _ := cv.Project(geometry.Point{X: nz.Frame.LE[0], Y: nz.Frame.LE[1]})
	d.Outline = newOutline(cv, base, sLE)

	ss, le, err := repanel.Stations(nz.Path, nz.SLE, po)
	if err != nil {
		return fmt.Errorf("%w %s: repanel: %v", ErrDesign, d.Source, err)
	}
	nodes := make([]geometry.Point, len(ss))
	for i, s := range ss {
		nodes[i] = nz.Path.At(s)
	}
	nodes[le] = geometry.Point{}
	if _, err := section.CheckNodes(nodes); err != nil {
		return fmt.Errorf("%w %s: the repanelled design is not usable: %v", ErrDesign, d.Source, err)
	}
	sp, _, err := props.Compute(nz.Path, nz.SLE, pr)
	if err != nil {
		return fmt.Errorf("%w %s: %v", ErrDesign, d.Source, err)
	}
	d.Props = sp
	q := repanel.Measure(nodes)
	fr := section.Frame(nz.Frame)
	te := section.TrailingEdge(nz.TE)
	docProps := section.Properties(sp.Properties)
	spacing := po.Spacing
	if spacing == "" {
		spacing = repanel.LawCosine
	}
	d.Section = &section.Section{
		Format: section.Format, Name: d.Name, Units: d.Units,
		Frame: &fr, TrailingEdge: &te, LEIndex: &le,
		Panels:     &section.PanelSummary{Count: len(nodes) - 1, Spacing: spacing, MaxRatio: q.MaxRatio, MaxTurnDeg: q.MaxTurnDeg},
		Properties: &docProps, Nodes: nodes,
	}
	return nil
}

// splineOf returns the interpolating spline through the outline pts
// (node order from the trailing edge) with a trailing edge of kind: open
// from corner to corner for a blunt edge (base is then set: a straight
// base closes it), from the tip round to the tip for a sharp one, and
// periodic for a rounded one.
func splineOf(pts []geometry.Point, kind string) (cv *curve.Curve, base bool) {
	n := len(pts)
	switch kind {
	case frame.TESharp:
		loop := pts
		if pts[0].Dist(pts[n-1]) != 0 {
			loop = append(append([]geometry.Point(nil), pts...), pts[0])
		}
		return curve.Interpolate(loop, false).WithClosed(true), false
	case frame.TERounded:
		loop := pts
		if pts[0].Dist(pts[n-1]) == 0 {
			loop = pts[:n-1]
		}
		return curve.Interpolate(loop, true), false
	}
	return curve.Interpolate(pts, false), true
}

// trailingEdgeFirst returns the closed loop pts (counter-clockwise, each
// point once) turned to start at its trailing edge, and the edge's kind:
// blunt when two neighbouring points both turn the outline by more than
// 45° (the corners of a base), sharp when one point turns it by more than
// 60°, rounded (a smooth loop) otherwise. The largest turn marks the edge.
func trailingEdgeFirst(pts []geometry.Point) ([]geometry.Point, string) {
	n := len(pts)
	if n > 1 && pts[0].Dist(pts[n-1]) == 0 {
		pts, n = pts[:n-1], n-1
	}
	turn := make([]float64, n)
	top := 0
	for i := range n {
		a, b, c := pts[(i+n-1)%n], pts[i], pts[(i+1)%n]
		turn[i] = math.Abs(geometry.Turn(b.Sub(a), c.Sub(b)))
		if turn[i] > turn[top] {
			top = i
		}
	}
	const blunt, sharp = 45 * math.Pi / 180, 60 * math.Pi / 180
	rot := func(start int) []geometry.Point {
		return append(append([]geometry.Point(nil), pts[start:]...), pts[:start]...)
	}
	next, prev := (top+1)%n, (top+n-1)%n
	switch {
	case turn[top] > blunt && turn[next] > blunt:
		// Base from top to next: the loop starts after the base.
		return rot(next), frame.TEBlunt
	case turn[top] > blunt && turn[prev] > blunt:
		return rot(top), frame.TEBlunt
	case turn[top] > sharp:
		return rot(top), frame.TESharp
	}
	return rot(top), frame.TERounded
}

// unitFactor returns the factor that converts lengths in unit from to
// unit to.
func unitFactor(from, to geometry.Unit) (float64, error) {
	if from == to {
		return 1, nil
	}
	mm := map[geometry.Unit]float64{geometry.Millimetre: 1, geometry.Inch: 25.4, geometry.Metre: 1000}
	a, ok1 := mm[from]
	b, ok2 := mm[to]
	if !ok1 || !ok2 {
		return 0, fmt.Errorf("cannot convert %s to %s", from, to)
	}
	return a / b, nil
}

// PanelOptions returns the repanelling options that give the design the
// measured section's panels: its count and spacing law, with the
// clustering of the settings it was prepared with.
func PanelOptions(m *section.Section, s prep.Settings) repanel.Options {
	o := repanel.Options{Spacing: s.Spacing}
	if m.Panels != nil {
		o.Panels = m.Panels.Count
		if o.Spacing == "" && slices.Contains(repanel.Laws(), m.Panels.Spacing) {
			o.Spacing = m.Panels.Spacing
		}
	}
	if s.LECluster != nil {
		o.LECluster = *s.LECluster
	}
	if s.TECluster != nil {
		o.TECluster = *s.TECluster
	}
	if s.CurvatureWeight != nil {
		o.CurvatureWeight = *s.CurvatureWeight
	}
	return o
}

// PropsOptions returns the property options of the settings, for the
// design's properties to be measured as the measured section's were.
func PropsOptions(s prep.Settings) props.Options {
	return props.Options{Thickness: s.ThicknessMode, Camber: s.CamberMode}
}
