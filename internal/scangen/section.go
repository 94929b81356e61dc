package scangen

import (
	"fmt"
	"math"
)

// The section families.
const (
	FamilyNACA    = "naca4"
	FamilyKT      = "karman-trefftz"
	FamilyNACA5   = "naca5"
	FamilyModNACA = "naca4-modified"
	FamilyFlat    = "flat-bottomed"
)

// The trailing-edge kinds of the truth, named as the section document
// names them.
const (
	TESharp   = "sharp"
	TEBlunt   = "blunt"
	TERounded = "rounded"
)

// ShapeSpec says which section a case is: a family with its parameters
// and, for a printed part, the radius of its rounded trailing edge.
type ShapeSpec struct {
	Family string        `json:"family"`
	NACA   *NACASpec     `json:"naca,omitempty"`
	KT     *KTSpec       `json:"kt,omitempty"`
	NACA5  *NACA5Spec    `json:"naca5,omitempty"`
	Mod    *ModNACA4Spec `json:"naca4_modified,omitempty"`
	Flat   *FlatSpec     `json:"flat,omitempty"`
	// RoundRadius is the radius of the rounded end, as a fraction of the
	// chord of the section before rounding; 0 keeps the edge as it is.
	RoundRadius float64 `json:"round_radius,omitempty"`
}

// Section is a true section: its outline in the normalised frame and the
// facts of its trailing edge.
type Section struct {
	Shape *Shape
	// TEKind is sharp, blunt or rounded.
	TEKind string
	// TEThickness is the base height of a blunt edge or the diameter of a
	// rounded end, in chord units (0 for a sharp edge).
	TEThickness float64
	// Symmetric is true for a section without camber: mirroring it about
	// its chord line changes nothing.
	Symmetric bool
}

// Build returns the true section of s. It returns an error for parameters
// that describe no section (see shape.KarmanTrefftz) or a rounding
// radius that does not fit the trailing edge.
func (s ShapeSpec) Build() (*Section, error) {
	var ps []piece
	var angle func(float64) float64
	sec := &Section{TEKind: TESharp}
	switch s.Family {
	case FamilyNACA:
		if s.NACA == nil || !(s.NACA.Thickness > 0) || s.NACA.Thickness > 0.4 {
			return nil, fmt.Errorf("scangen: NACA section needs a thickness in (0, 0.4]")
		}
		ps = nacaPieces(*s.NACA)
		sec.Symmetric = s.NACA.Camber == 0
		if !s.NACA.ClosedTE {
			sec.TEKind = TEBlunt
		}
	case FamilyKT:
		if s.KT == nil {
			return nil, fmt.Errorf("scangen: Kármán–Trefftz section needs its parameters")
		}
		var err error
		if ps, angle, err = ktPieces(*s.KT); err != nil {
			return nil, err
		}
		sec.Symmetric = s.KT.CentreY == 0
	case FamilyNACA5:
		n := s.NACA5
		if n == nil || n.P < 1 || n.P > 5 || n.L < 1 || n.L > 4 || !(n.Thickness > 0) || n.Thickness > 0.4 {
			return nil, fmt.Errorf("scangen: NACA 5-digit section needs L in 1..4, P in 1..5 and a thickness in (0, 0.4]")
		}
		f := xForm{thick: naca4Thickness(n.Thickness, n.ClosedTE), camber: n.camber}
		if err := f.check("NACA 5-digit"); err != nil {
			return nil, err
		}
		ps = f.pieces()
		if !n.ClosedTE {
			sec.TEKind = TEBlunt
		}
	case FamilyModNACA:
		f, err := s.form()
		if err != nil {
			return nil, err
		}
		ps = f.pieces()
		sec.Symmetric = s.Mod.Camber == 0
		if !s.Mod.ClosedTE {
			sec.TEKind = TEBlunt
		}
	case FamilyFlat:
		fl := s.Flat
		if fl == nil || !(fl.Thickness > 0) || fl.Thickness > 0.4 || !(fl.FlatFrom > 0.05 && fl.FlatFrom < 0.6) {
			return nil, fmt.Errorf("scangen: flat-bottomed section needs a thickness in (0, 0.4] and F in (0.05, 0.6)")
		}
		th := naca4Thickness(fl.Thickness, true)
		f := xForm{thick: th, vertical: true, camber: func(x float64) (float64, float64) {
			yt, _ := th(x)
			return yt * fl.blend(x), 0
		}}
		if err := f.check("flat-bottomed"); err != nil {
			return nil, err
		}
		ps = f.pieces()
	default:
		return nil, fmt.Errorf("scangen: unknown section family %q", s.Family)
	}
	rule := teCorner
	if sec.TEKind == TEBlunt {
		rule = teBaseMid
	}
	sh := newShape(ps, rule)
	if sec.TEKind == TEBlunt {
		sec.TEThickness = sh.At(2).Dist(sh.At(3))
	}
	if s.RoundRadius > 0 {
		r := s.RoundRadius / sh.scale // raw units
		rounded, err := roundEnd(ps, r)
		if err != nil {
			return nil, fmt.Errorf("%w (radius %g chord)", err, s.RoundRadius)
		}
		sh = newShape(rounded, teTip)
		sec.TEKind, sec.TEThickness, angle = TERounded, 2*r*sh.scale, nil
	}
	sh.angle = angle
	sec.Shape = sh
	return sec, nil
}

// Thickness returns the maximum thickness the spec asks for (0 for a
// Kármán–Trefftz section, whose thickness follows from its circle).
func (s ShapeSpec) Thickness() float64 {
	switch {
	case s.NACA != nil:
		return s.NACA.Thickness
	case s.NACA5 != nil:
		return s.NACA5.Thickness
	case s.Mod != nil:
		return s.Mod.Thickness
	case s.Flat != nil:
		return s.Flat.Thickness
	}
	return 0
}

// Blunt reports whether the spec's section has an open (blunt) trailing
// edge before any rounding.
func (s ShapeSpec) Blunt() bool {
	switch {
	case s.NACA != nil:
		return !s.NACA.ClosedTE
	case s.NACA5 != nil:
		return !s.NACA5.ClosedTE
	case s.Mod != nil:
		return !s.Mod.ClosedTE
	}
	return false
}

// form returns the closed form of a 4-digit-modified section, checked.
func (s ShapeSpec) form() (xForm, error) {
	m := s.Mod
	if m == nil || !(m.Thickness > 0) || m.Thickness > 0.4 || !(m.MaxPos >= 0.2 && m.MaxPos <= 0.7) || !(m.NoseIndex > 0) || !(m.TESlope >= 0) {
		return xForm{}, fmt.Errorf("scangen: 4-digit-modified section needs a thickness in (0, 0.4], M in [0.2, 0.7], I > 0 and d₁ ≥ 0")
	}
	if x, ok := m.waist(); ok {
		return xForm{}, fmt.Errorf("scangen: 4-digit-modified section I %.3g, M %.2g, d₁ %.3g: its thickness falls forward of its thickest point (at x = %.3f), a waist, not a section", m.NoseIndex, m.MaxPos, m.TESlope, x)
	}
	n4 := NACASpec{Camber: m.Camber, CamberPos: m.CamberPos, Thickness: m.Thickness}.shape()
	f := xForm{thick: m.thickness(), camber: func(x float64) (float64, float64) { return n4.CamberLine(math.Min(math.Max(x, 0), 1)) }}
	return f, f.check("4-digit-modified")
}
