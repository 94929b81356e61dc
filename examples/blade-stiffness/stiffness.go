package main

import (
	"context"
	"encoding/json"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/section"
	"github.com/foilwright/foilwright/plugins/stage"
)

// Version is the version of the blade-stiffness stage.
const Version = "1.0.0"

// AreaMismatchTol is the relative difference between the properties' area
// and the area enclosed by the nodes above which the stage warns that the
// properties block may not belong to the nodes (edited or stale). A
// repanelled section of 100 or more panels is well inside it.
const AreaMismatchTol = 0.02

// IsotropicTol is the relative spread of the principal moments,
// (Imax − Imin)/(Imax + Imin), below which every axis counts as principal
// (a circle, a square): the principal angle is then reported as 0 with a
// warning.
const IsotropicTol = 1e-9

// Length of one unit of a section document's "units", in metres. The inch
// is exactly 0.0254 m by definition (international inch, 1959).
var unitMetres = map[geometry.Unit]float64{
	geometry.Millimetre: 1e-3,
	geometry.Inch:       0.0254,
	geometry.Metre:      1,
}

// BladeStiffness is the stage "blade-stiffness": mass per metre of span and
// bending stiffnesses of a blade section, from the area and second moments
// in the section document's properties block and the chord of its frame.
//
// Axes: x along the chord towards the trailing edge, y towards the upper
// side (package geometry's normalised frame); second moments are about the
// centroid,
//
//	Ixx = ∫∫ (y − ȳ)² dA,  Iyy = ∫∫ (x − x̄)² dA,  Ixy = ∫∫ (x − x̄)(y − ȳ) dA.
//
// Lengths scale with the chord c: A = c²·A₁, I = c⁴·I₁, where A₁, I₁ are in
// chord units. The principal moments are the eigenvalues of the tensor
// [[Ixx, −Ixy], [−Ixy, Iyy]]; the flapwise axis is the principal axis
// nearer the chord line, at θ in (−45°, 45°] from it,
//
//	I(θ) = Ixx cos²θ + Iyy sin²θ − 2 Ixy sinθ cosθ,  tan 2θ = 2 Ixy / (Iyy − Ixx),
//
// and the edgewise axis is perpendicular to it: I_edge = Ixx + Iyy − I_flap.
// Flapwise bending (out of the rotor plane, tip deflecting across the
// chord) bends about the flapwise axis; edgewise bending (in the plane of
// the chord) about the edgewise axis (common practice in blade design).
// Material: mass per metre = f·ρ·A, EI = f·E·I with the fill fraction f.
type BladeStiffness struct{}

var info = stage.Info{
	Name:    "blade-stiffness",
	Version: Version,
	Summary: "mass per metre of span and flapwise/edgewise bending stiffness of a solid blade section",
	Params: []stage.Param{
		{
			Name: "density_kg_m3", Type: stage.Number, Default: json.RawMessage("1240"),
			Min: stage.Bound(1), Max: stage.Bound(25000), Unit: "kg/m³",
			Doc: "density of the solid material; default 1240, a typical printed PLA/PETG-like part (typical values, from memory)",
		},
		{
			Name: "modulus_gpa", Type: stage.Number, Default: json.RawMessage("3.5"),
			Min: stage.Bound(0.001), Max: stage.Bound(1200), Unit: "GPa",
			Doc: "Young's modulus along the span; default 3.5, a typical printed PLA/PETG-like part (typical values, from memory; printed parts are weaker across layers)",
		},
		{
			Name: "fill_fraction", Type: stage.Number, Default: json.RawMessage("1"),
			Min: stage.Bound(0.01), Max: stage.Bound(1),
			Doc: "fraction of the section filled with material; scales density and modulus alike, as if the fill were spread evenly (1 = solid)",
		},
		{
			Name: "chord_m", Type: stage.Number, Default: json.RawMessage("0"),
			Min: stage.Bound(0), Max: stage.Bound(1000), Unit: "m",
			Doc: "chord in metres, for a section in chord units or without a frame; 0 = take the chord from the section's frame and units",
		},
	},
	Scalars: []stage.Scalar{
		{Name: "chord_m", Doc: "chord used, metres"},
		{Name: "area_m2", Doc: "cross-section area, m²"},
		{Name: "mass_per_m_kg", Doc: "mass per metre of span, kg/m: fill_fraction · density · area"},
		{Name: "centroid_x", Doc: "centroid along the chord from the leading edge, chord fractions"},
		{Name: "centroid_y", Doc: "centroid above the chord line, chord fractions"},
		{Name: "ixx_m4", Doc: "second moment about the centroidal axis parallel to the chord, ∫(y−ȳ)² dA, m⁴"},
		{Name: "iyy_m4", Doc: "second moment about the centroidal axis normal to the chord, ∫(x−x̄)² dA, m⁴"},
		{Name: "ixy_m4", Doc: "product of inertia about the centroid, ∫(x−x̄)(y−ȳ) dA, m⁴"},
		{Name: "i_flap_m4", Doc: "principal second moment about the flapwise axis (the principal axis nearer the chord line), m⁴"},
		{Name: "i_edge_m4", Doc: "principal second moment about the edgewise axis (perpendicular to the flapwise axis), m⁴"},
		{Name: "principal_deg", Doc: "angle of the flapwise axis from the chord line, degrees in (−45, 45], counter-clockwise: positive when the axis rises towards the trailing edge"},
		{Name: "principal_part_deg", Doc: "angle of the flapwise axis in the part's input coordinates, counter-clockwise from +x, degrees in (−90, 90]; only when the section has a frame"},
		{Name: "ei_flap_nm2", Doc: "flapwise bending stiffness, N·m²: fill_fraction · modulus · i_flap_m4 (bending out of the chord plane)"},
		{Name: "ei_edge_nm2", Doc: "edgewise bending stiffness, N·m²: fill_fraction · modulus · i_edge_m4 (bending in the chord plane)"},
	},
}

// Describe returns the stage's description.
func (BladeStiffness) Describe(context.Context) (stage.Info, error) { return info, nil }

// Run computes the figures of one section. Errors are marked
// stage.ErrBadInput when the section or parameters cannot give them.
func (BladeStiffness) Run(ctx context.Context, req stage.Request) (stage.Result, error) {
	if err := ctx.Err(); err != nil {
		return stage.Result{}, err
	}
	v, err := stage.Validate(info.Params, req.Params)
	if err != nil {
		return stage.Result{}, err
	}
	s, err := req.DecodeSection()
	if err != nil {
		return stage.Result{}, err
	}
	name := req.SectionName
	if name == "" {
		name = "section"
	}
	m := Material{
		Density: v.Number("density_kg_m3"),
		Modulus: v.Number("modulus_gpa") * 1e9,
		Fill:    v.Number("fill_fraction"),
	}
	st, warnings, err := Compute(s, m, v.Number("chord_m"))
	if err != nil {
		return stage.Result{}, stage.BadInput(fmt.Errorf("%s: %w", name, err))
	}
	d := stage.NewResultDoc(info)
	d.Warnings = append(d.Warnings, warnings...)
	st.setScalars(d)
	b, err := d.Encode()
	if err != nil {
		return stage.Result{}, err
	}
	return stage.Result{JSON: b}, nil
}

// Material is a material smeared over the section.
type Material struct {
	Density float64 // kg/m³
	Modulus float64 // Young's modulus, Pa
	Fill    float64 // fraction of the section filled, (0, 1]
}

// Stiffness holds the figures of one section, SI units unless named
// otherwise.
type Stiffness struct {
	ChordM           float64
	Area             float64 // m²
	MassPerM         float64 // kg/m
	CentroidX        float64 // chord fractions
	CentroidY        float64 // chord fractions
	Ixx, Iyy, Ixy    float64 // m⁴, centroidal, chord-line axes
	IFlap, IEdge     float64 // m⁴, principal
	PrincipalDeg     float64 // flapwise axis from the chord line, (−45, 45]
	PrincipalPartDeg float64 // flapwise axis in part coordinates, (−90, 90]
	HasPartAngle     bool    // PrincipalPartDeg is set (the section has a frame)
	EIFlap, EIEdge   float64 // N·m²
}

func (st Stiffness) setScalars(d *stage.ResultDoc) {
	d.SetScalar("chord_m", st.ChordM)
	d.SetScalar("area_m2", st.Area)
	d.SetScalar("mass_per_m_kg", st.MassPerM)
	d.SetScalar("centroid_x", st.CentroidX)
	d.SetScalar("centroid_y", st.CentroidY)
	d.SetScalar("ixx_m4", st.Ixx)
	d.SetScalar("iyy_m4", st.Iyy)
	d.SetScalar("ixy_m4", st.Ixy)
	d.SetScalar("i_flap_m4", st.IFlap)
	d.SetScalar("i_edge_m4", st.IEdge)
	d.SetScalar("principal_deg", st.PrincipalDeg)
	if st.HasPartAngle {
		d.SetScalar("principal_part_deg", st.PrincipalPartDeg)
	}
	d.SetScalar("ei_flap_nm2", st.EIFlap)
	d.SetScalar("ei_edge_nm2", st.EIEdge)
}

// Compute returns the figures of section s for material m. chordM is the
// chord in metres, used when the section is in chord units or has no
// frame; 0 means not given. The warnings say what the figures rest on.
// It returns an error when s has fewer than three nodes, no properties
// block, properties no real section can have, or no way to know its chord
// in metres.
func Compute(s *section.Section, m Material, chordM float64) (Stiffness, []string, error) {
	var warnings []string
	if len(s.Nodes) < 3 {
		return Stiffness{}, nil, fmt.Errorf("%d node(s): a section needs at least 3", len(s.Nodes))
	}
	p := s.Properties
	if p == nil {
		return Stiffness{}, nil, fmt.Errorf("no \"properties\" block: run the points through prep first, which computes area and second moments")
	}
	if !(p.Area > 0) || !(p.Ixx > 0) || !(p.Iyy > 0) {
		return Stiffness{}, nil, fmt.Errorf("properties: area %g, ixx %g, iyy %g: all must be positive", p.Area, p.Ixx, p.Iyy)
	}
	if !(p.Ixx*p.Iyy > p.Ixy*p.Ixy) {
		return Stiffness{}, nil, fmt.Errorf("properties: ixx·iyy = %g is not above ixy² = %g, which no real section has", p.Ixx*p.Iyy, p.Ixy*p.Ixy)
	}
	if a := nodeArea(s.Nodes); math.Abs(a-p.Area) > AreaMismatchTol*p.Area {
		warnings = append(warnings, fmt.Sprintf("the nodes enclose area %.6g but the properties say %.6g (chord units): the properties may not belong to these nodes; re-run prep", a, p.Area))
	}
	c, w, err := chordMetres(s, chordM)
	if err != nil {
		return Stiffness{}, nil, err
	}
	warnings = append(warnings, w...)

	c2 := c * c
	c4 := c2 * c2
	st := Stiffness{
		ChordM:    c,
		Area:      p.Area * c2,
		CentroidX: p.Centroid[0],
		CentroidY: p.Centroid[1],
		Ixx:       p.Ixx * c4,
		Iyy:       p.Iyy * c4,
		Ixy:       p.Ixy * c4,
	}
	flap, edge, deg, iso := Principal(p.Ixx, p.Iyy, p.Ixy)
	if iso {
		warnings = append(warnings, "the principal moments are equal (within IsotropicTol): every axis is principal; principal_deg set to 0")
	}
	st.IFlap, st.IEdge, st.PrincipalDeg = flap*c4, edge*c4, deg
	if f := s.Frame; f != nil {
		st.PrincipalPartDeg, st.HasPartAngle = partAngle(deg, f.TwistDeg, f.Mirrored), true
	}
	st.MassPerM = m.Fill * m.Density * st.Area
	st.EIFlap = m.Fill * m.Modulus * st.IFlap
	st.EIEdge = m.Fill * m.Modulus * st.IEdge
	if m.Fill < 1 {
		warnings = append(warnings, fmt.Sprintf("fill_fraction %g scales density and modulus alike, as if the fill were spread evenly; solid walls put more material far from the centroid, so a real print is stiffer for its mass", m.Fill))
	}
	return st, warnings, nil
}

// chordMetres returns the chord of s in metres: the frame's chord times the
// length of the document's unit, or chordM for a section in chord units,
// without units or without a frame.
func chordMetres(s *section.Section, chordM float64) (float64, []string, error) {
	var u geometry.Unit
	if s.Units != "" {
		var err error
		if u, err = geometry.ParseUnit(string(s.Units)); err != nil {
			return 0, nil, fmt.Errorf("units: %w", err)
		}
	}
	if u == "" || u == geometry.ChordUnit || s.Frame == nil {
		if chordM > 0 {
			return chordM, nil, nil
		}
		why := fmt.Sprintf("the section is in units %q", u)
		switch {
		case u == "":
			why = "the section does not say its units"
		case u != geometry.ChordUnit:
			why = "the section has no frame to give its chord"
		}
		return 0, nil, fmt.Errorf("%s, so its size is unknown: give the chord in metres with the parameter chord_m", why)
	}
	if !(s.Frame.Chord > 0) {
		return 0, nil, fmt.Errorf("frame chord %g: must be positive", s.Frame.Chord)
	}
	c := s.Frame.Chord * unitMetres[u]
	var warnings []string
	if chordM > 0 {
		warnings = append(warnings, fmt.Sprintf("chord_m %g ignored: the section's frame gives the chord, %g %s = %g m", chordM, s.Frame.Chord, u, c))
	}
	return c, warnings, nil
}

// Principal returns the principal second moments of the centroidal tensor
// (ixx, iyy, ixy) and the angle of the flapwise axis: flap is the moment
// about the principal axis at deg in (−45, 45] from the x axis, edge the
// moment about the axis perpendicular to it. iso reports that the moments
// are equal within IsotropicTol, in which case deg is 0.
func Principal(ixx, iyy, ixy float64) (flap, edge, deg float64, iso bool) {
	mean, half := (ixx+iyy)/2, (ixx-iyy)/2
	r := math.Hypot(half, ixy)
	if r <= IsotropicTol*mean {
		return mean, mean, 0, true
	}
	// θ of the axis of the smaller moment, in (−90°, 90°].
	theta := 0.5 * math.Atan2(2*ixy, iyy-ixx)
	lo, hi := mean-r, mean+r
	flap, edge = lo, hi
	// Bring the axis into (−45°, 45°]; the perpendicular axis carries the
	// other moment.
	switch {
	case theta > math.Pi/4:
		theta -= math.Pi / 2
		flap, edge = hi, lo
	case theta <= -math.Pi/4:
		theta += math.Pi / 2
		flap, edge = hi, lo
	}
	return flap, edge, theta * 180 / math.Pi, false
}

// partAngle maps the angle deg of an axis in the normalised frame into the
// part's input coordinates for a frame of twist twistDeg, mirrored or not
// (geometry: p = LE + c·M·R(−τ)·q), as an angle in (−90, 90].
func partAngle(deg, twistDeg float64, mirrored bool) float64 {
	a := deg - twistDeg
	if mirrored {
		a = 180 - a
	}
	a = math.Mod(a, 180)
	switch {
	case a > 90:
		a -= 180
	case a <= -90:
		a += 180
	}
	return a
}

// nodeArea returns the area enclosed by the nodes (shoelace formula, the
// last node joined to the first, as the properties close a blunt edge).
func nodeArea(ns []geometry.Point) float64 {
	var a float64
	for i := range ns {
		p, q := ns[i], ns[(i+1)%len(ns)]
		a += p.X*q.Y - q.X*p.Y
	}
	return a / 2
}
