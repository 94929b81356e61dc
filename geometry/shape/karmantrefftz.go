package shape

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"

	"github.com/foilwright/foilwright/geometry"
)

// KarmanTrefftz is a Kármán–Trefftz section: the image of a circle in the
// ζ-plane under the map
//
//	z = n b ((ζ+b)ⁿ + (ζ−b)ⁿ) / ((ζ+b)ⁿ − (ζ−b)ⁿ),   n = 2 − τ/π
//
// where τ is the trailing-edge angle and b = 1. The circle has its centre at
// Centre and passes through ζ = b, which maps to the trailing edge z = n b.
// For τ = 0 (n = 2) the map is the Joukowski map z = ζ + b²/ζ. Centre.X < 0
// gives the section thickness, Centre.Y > 0 positive camber.
//
// References:
//
//	Milne-Thomson, L. M., Theoretical Hydrodynamics, 5th ed., Macmillan (1968).
//	Katz, J. and Plotkin, A., Low-Speed Aerodynamics, 2nd ed., Cambridge
//	University Press (2001), ch. 6.
//
// Far from the circle z ≈ ζ, so the free stream is the same in both planes;
// the exact flow about the section follows from the flow about the circle.
type KarmanTrefftz struct {
	Centre  geometry.Point // circle centre in the ζ-plane, in units of b; X < 0
	TEAngle float64        // trailing-edge angle τ, radians, 0 ≤ τ < π; 0 gives a cusp (Joukowski)
}

// ErrKarmanTrefftz means the parameters of a Kármán–Trefftz section do not
// describe a section.
var ErrKarmanTrefftz = errors.New("invalid Kármán–Trefftz parameters")

// check returns an error if k does not describe a section or panels < 4.
func (k KarmanTrefftz) check(panels int) error {
	switch {
	case !k.Centre.IsFinite() || math.IsNaN(k.TEAngle) || math.IsInf(k.TEAngle, 0):
		return fmt.Errorf("geometry: %w: parameters must be finite", ErrKarmanTrefftz)
	case k.Centre.X >= 0:
		return fmt.Errorf("geometry: %w: centre x = %g, want < 0 (the circle must enclose ζ = −b)", ErrKarmanTrefftz, k.Centre.X)
	case k.TEAngle < 0 || k.TEAngle >= math.Pi:
		return fmt.Errorf("geometry: %w: trailing-edge angle %g rad, want 0 ≤ τ < π", ErrKarmanTrefftz, k.TEAngle)
	case panels < 4:
		return fmt.Errorf("geometry: %w: %d panel(s), want at least 4", ErrKarmanTrefftz, panels)
	}
	return nil
}

// exponent returns n = 2 − τ/π.
func (k KarmanTrefftz) exponent() float64 { return 2 - k.TEAngle/math.Pi }

// radius returns the circle radius |b − centre| and the angle φ₀ of ζ = b
// on the circle, ζ = centre + R e^{iφ₀}.
func (k KarmanTrefftz) radius() (r, phi0 float64) {
	d := complex(1-k.Centre.X, -k.Centre.Y)
	return cmplx.Abs(d), cmplx.Phase(d)
}

// mapZeta returns the image z of a point ζ on or outside the circle.
func (k KarmanTrefftz) mapZeta(zeta complex128) complex128 {
	n := k.exponent()
	if zeta == 1 {
		return complex(n, 0)
	}
	// w = ((ζ−b)/(ζ+b))ⁿ on the principal branch: the ratio is negative real
	// only on the segment (−b, b), which lies inside the circle.
	w := cmplx.Pow((zeta-1)/(zeta+1), complex(n, 0))
	return complex(n, 0) * (1 + w) / (1 - w)
}

// circle returns the point of the circle at angle φ.
func (k KarmanTrefftz) circle(phi float64) complex128 {
	r, _ := k.radius()
	s, c := math.Sincos(phi)
	return complex(k.Centre.X+r*c, k.Centre.Y+r*s)
}

// Points returns panels+1 points of the section in the mapping plane, in the
// package node order: the circle angle φ runs counter-clockwise in equal
// steps from the trailing edge, φₖ = φ₀ + 2πk/panels, where ζ = b at φ₀.
// The first and last point are the trailing edge z = n b. It returns an
// error wrapping ErrKarmanTrefftz if Centre.X ≥ 0, τ is outside [0, π),
// a parameter is not finite or panels < 4.
func (k KarmanTrefftz) Points(panels int) ([]geometry.Point, error) {
	if err := k.check(panels); err != nil {
		return nil, err
	}
	_, phi0 := k.radius()
	pts := make([]geometry.Point, panels+1)
	for i := range pts {
		z := k.mapZeta(k.circle(phi0 + 2*math.Pi*float64(i)/float64(panels)))
		pts[i] = geometry.Point{X: real(z), Y: imag(z)}
	}
	te := geometry.Point{X: k.exponent(), Y: 0}
	pts[0], pts[panels] = te, te
	return pts, nil
}

// Edges returns the leading and trailing edge of the section in the mapping
// plane. The trailing edge is z = n b; the leading edge is the point of the
// section farthest from it (common practice), found by golden-section search
// in the circle angle; since the distance is stationary there, the point is
// located to about 1e-8 (its distance to the trailing edge to about 1e-15).
func (k KarmanTrefftz) Edges() (le, te geometry.Point, err error) {
	if err := k.check(4); err != nil {
		return geometry.Point{}, geometry.Point{}, err
	}
	n := k.exponent()
	z := k.mapZeta(k.circle(k.lePhi()))
	return geometry.Point{X: real(z), Y: imag(z)}, geometry.Point{X: n, Y: 0}, nil
}

// lePhi returns the circle angle of the leading edge: the point of the
// section farthest from the trailing edge z = n b, by a coarse scan and
// golden-section search in the angle.
func (k KarmanTrefftz) lePhi() float64 {
	n := k.exponent()
	tez := complex(n, 0)
	_, phi0 := k.radius()
	dist := func(phi float64) float64 { return cmplx.Abs(k.mapZeta(k.circle(phi)) - tez) }
	// Coarse scan, then golden-section search around the best sample.
	const samples = 720
	best, bestD := 0, -1.0
	for i := 1; i < samples; i++ {
		if d := dist(phi0 + 2*math.Pi*float64(i)/samples); d > bestD {
			best, bestD = i, d
		}
	}
	h := 2 * math.Pi / samples
	return goldenMax(dist, phi0+float64(best-1)*h, phi0+float64(best+1)*h, 1e-12)
}

// goldenMax returns the maximiser of f on [a, b] by golden-section search
// (Kiefer 1953), shrinking the bracket to tol; f is assumed unimodal there.
func goldenMax(f func(float64) float64, a, b, tol float64) float64 {
	g := (math.Sqrt(5) - 1) / 2
	c, d := b-g*(b-a), a+g*(b-a)
	fc, fd := f(c), f(d)
	for b-a > tol {
		if fc > fd {
			b, d, fd = d, c, fc
			c = b - g*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + g*(b-a)
			fd = f(d)
		}
	}
	return (a + b) / 2
}

// Normalized returns the points of Points(panels) translated, rotated and
// scaled so that the leading edge of Edges is at (0, 0) and the trailing edge
// at (1, 0). A point z of the mapping plane goes to (z − le)·e^{−iθ}/c, where
// c = |te − le| and θ = arg(te − le). It returns the errors of Points.
func (k KarmanTrefftz) Normalized(panels int) ([]geometry.Point, error) {
	pts, err := k.Points(panels)
	if err != nil {
		return nil, err
	}
	le, te, err := k.Edges()
	if err != nil {
		return nil, err
	}
	d := te.Sub(le)
	c, theta := d.Norm(), math.Atan2(d.Y, d.X)
	for i, p := range pts {
		pts[i] = p.Sub(le).Rotate(-theta).Scale(1 / c)
	}
	pts[0], pts[panels] = geometry.Point{X: 1, Y: 0}, geometry.Point{X: 1, Y: 0}
	return pts, nil
}
