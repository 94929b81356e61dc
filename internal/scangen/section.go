package scangen

import "fmt"

// The section families.
const (
	FamilyNACA = "naca4"
	FamilyKT   = "karman-trefftz"
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
	Family string    `json:"family"`
	NACA   *NACASpec `json:"naca,omitempty"`
	KT     *KTSpec   `json:"kt,omitempty"`
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
