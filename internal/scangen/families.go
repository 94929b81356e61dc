package scangen

import (
	"fmt"
	"math"
	"math/cmplx"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// This file is the only one of the package that uses the reference shapes
// of the geometry package.

// NACASpec is a NACA 4-digit section (NACA Report 824).
type NACASpec struct {
	Camber    float64 `json:"camber"`     // maximum camber, chord fractions
	CamberPos float64 `json:"camber_pos"` // its chordwise position
	Thickness float64 `json:"thickness"`  // maximum thickness, chord fractions
	ClosedTE  bool    `json:"closed_te"`  // the closed trailing-edge coefficient (common practice)
}

// KTSpec is a Kármán–Trefftz section: the circle through ζ = 1 with the
// given centre, mapped with trailing-edge angle TEAngleDeg.
type KTSpec struct {
	CentreX    float64 `json:"centre_x"` // < 0
	CentreY    float64 `json:"centre_y"` // > 0 for positive camber
	TEAngleDeg float64 `json:"te_angle_deg"`
}

func (n NACASpec) shape() shape.NACA4 {
	return shape.NACA4{Camber: n.Camber, CamberPos: n.CamberPos, Thickness: n.Thickness, SharpTE: n.ClosedTE}
}

// nacaPieces returns the upper and lower surface of a NACA 4-digit
// section with the chord station x = (1 ± cos πu)/2 (x = 1 at the trailing
// edge), and the straight base of an open trailing edge.
func nacaPieces(spec NACASpec) []piece {
	n := spec.shape()
	clamp := func(x float64) float64 { return math.Min(math.Max(x, 0), 1) }
	ps := []piece{
		{kind: Upper, at: func(u float64) geometry.Point { return n.Upper(clamp((1 + math.Cos(math.Pi*u)) / 2)) }},
		{kind: Lower, at: func(u float64) geometry.Point { return n.Lower(clamp((1 - math.Cos(math.Pi*u)) / 2)) }},
	}
	if !spec.ClosedTE {
		lo, up := n.Lower(1), n.Upper(1)
		ps = append(ps, piece{kind: Base, at: func(u float64) geometry.Point { return lo.Add(up.Sub(lo).Scale(u)) }})
	}
	return ps
}

// nacaStations returns the loop parameters of the points a CAD export of
// the NACA equations would hold: chord stations x spaced by the cosine law
// (or evenly), per surfaces of the given number of intervals, from the
// upper trailing edge over the leading edge to the lower trailing edge.
func nacaStations(perSurface int, cosine bool) []float64 {
	station := func(i int) float64 {
		f := float64(i) / float64(perSurface)
		if cosine {
			return (1 - math.Cos(math.Pi*f)) / 2
		}
		return f
	}
	var ts []float64
	for i := perSurface; i >= 0; i-- {
		ts = append(ts, math.Acos(math.Min(math.Max(2*station(i)-1, -1), 1))/math.Pi)
	}
	for i := 1; i <= perSurface; i++ {
		ts = append(ts, 1+math.Acos(math.Min(math.Max(1-2*station(i), -1), 1))/math.Pi)
	}
	return ts
}

// ktMap is the Kármán–Trefftz map with b = 1 and exponent n = 2 − τ/π,
//
//	z = n ((ζ+1)ⁿ + (ζ−1)ⁿ) / ((ζ+1)ⁿ − (ζ−1)ⁿ) = n (1 + w) / (1 − w),  w = ((ζ−1)/(ζ+1))ⁿ
//
// (Milne-Thomson, Theoretical Hydrodynamics, 5th ed., 1968), on the
// principal branch, which is continuous outside the segment (−1, 1).
func ktMap(zeta complex128, n float64) complex128 {
	if zeta == 1 {
		return complex(n, 0)
	}
	w := cmplx.Pow((zeta-1)/(zeta+1), complex(n, 0))
	return complex(n, 0) * (1 + w) / (1 - w)
}

// ktPieces returns the outline of a Kármán–Trefftz section as two pieces,
// the circle angle φ running counter-clockwise from the trailing edge
// ζ = 1 (φ₀) to φ₀ + π and on to φ₀ + 2π, and the map from the loop
// parameter to φ.
func ktPieces(spec KTSpec) ([]piece, func(t float64) float64, error) {
	k := shape.KarmanTrefftz{Centre: geometry.Point{X: spec.CentreX, Y: spec.CentreY}, TEAngle: spec.TEAngleDeg * math.Pi / 180}
	if _, err := k.Points(4); err != nil { // the shape's own parameter check
		return nil, nil, fmt.Errorf("scangen: %w", err)
	}
	zc := complex(spec.CentreX, spec.CentreY)
	r, phi0 := cmplx.Abs(1-zc), cmplx.Phase(1-zc)
	n := 2 - k.TEAngle/math.Pi
	angle := func(t float64) float64 { return phi0 + math.Pi*t }
	at := func(phi float64) geometry.Point {
		z := ktMap(zc+cmplx.Rect(r, phi), n)
		return geometry.Point{X: real(z), Y: imag(z)}
	}
	ps := []piece{
		{kind: Upper, at: func(u float64) geometry.Point {
			if u == 0 {
				return geometry.Point{X: n}
			}
			return at(angle(u))
		}},
		{kind: Lower, at: func(u float64) geometry.Point {
			if u == 1 {
				return geometry.Point{X: n}
			}
			return at(angle(1 + u))
		}},
	}
	return ps, angle, nil
}

// ktStations returns the loop parameters of a CAD export of a
// Kármán–Trefftz section: even steps of the circle angle, perSurface per
// piece, from the trailing edge round to the trailing edge.
func ktStations(perSurface int) []float64 {
	ts := make([]float64, 0, 2*perSurface+1)
	for i := 0; i <= 2*perSurface; i++ {
		ts = append(ts, float64(i)/float64(perSurface))
	}
	return ts
}
