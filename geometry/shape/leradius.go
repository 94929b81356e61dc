package shape

import (
	"math"
	"math/cmplx"

	"github.com/foilwright/foilwright/geometry"
)

// This file gives the exact leading-edge radius of the reference sections:
// the radius of curvature of the outline at its leading edge, in the chord
// convention of the normalised frame (the point farthest from the
// trailing-edge midpoint; the radius over that distance), from the
// sections' own equations, not from points.

// LERadius returns the radius of curvature of n's outline at its leading
// edge, the point of the outline farthest from the trailing-edge midpoint
// (common practice), in units of that distance (the chord of the
// normalised section). For a symmetric section the leading edge is x = 0
// and the radius is (5t · 0.2969)²/2 = 1.10187 t², NACA Report 824's
// 1.1019 t²; camber moves the leading edge round the nose and bends the
// outline there.
//
// The outline is taken in the parameter ξ, x = ξ², ξ ≥ 0 on the upper and
// ξ < 0 on the lower surface, in which it is smooth but for a jump of its
// second derivative at ξ = 0 (the −0.126x term of the thickness), where
// the curvature is nevertheless continuous; derivatives are exact.
func (n NACA4) LERadius() float64 {
	mid := n.Upper(1).Add(n.Lower(1)).Scale(0.5)
	dist := func(xi float64) float64 { p, _, _ := n.outline(xi); return p.Dist(mid) }
	xi := maximise(dist, -0.5, 0.5)
	p, d1, d2 := n.outline(xi)
	k := math.Abs(d1.X*d2.Y-d1.Y*d2.X) / math.Pow(d1.Norm(), 3)
	return 1 / k / p.Dist(mid)
}

// outline returns the point of n's outline at parameter ξ (see LERadius)
// and its first and second derivatives in ξ.
func (n NACA4) outline(xi float64) (p, d1, d2 geometry.Point) {
	s := 1.0
	if xi < 0 {
		s = -1
	}
	a4 := 0.1015
	if n.SharpTE {
		a4 = 0.1036
	}
	k := n.Thickness / 0.2
	x := xi * xi
	// Signed half-thickness T(ξ) = sign(ξ)·yt(ξ²) and its derivatives.
	x2, x3, x4 := x*x, x*x*x, x*x*x*x
	T := k * (0.2969*xi + s*(-0.1260*x-0.3516*x2+0.2843*x3-a4*x4))
	T1 := k * (0.2969 + s*(-0.2520*xi-1.4064*x*xi+1.7058*x2*xi-8*a4*x3*xi))
	T2 := k * s * (-0.2520 - 4.2192*x + 8.5290*x2 - 56*a4*x3)
	// Camber line and its angle θ, as functions of ξ.
	yc, yx := n.CamberLine(x)
	var yxx float64
	if n.Camber != 0 {
		if x < n.CamberPos {
			yxx = -2 * n.Camber / (n.CamberPos * n.CamberPos)
		} else {
			yxx = -2 * n.Camber / ((1 - n.CamberPos) * (1 - n.CamberPos))
		}
	}
	th := math.Atan(yx)
	thx := yxx / (1 + yx*yx)
	thxx := -2 * yx * yxx * yxx / ((1 + yx*yx) * (1 + yx*yx))
	th1, th2 := thx*2*xi, thxx*4*x+thx*2
	yc1, yc2 := yx*2*xi, yxx*4*x+yx*2
	sn, cs := math.Sincos(th)
	p = geometry.Point{X: x - T*sn, Y: yc + T*cs}
	d1 = geometry.Point{X: 2*xi - T1*sn - T*cs*th1, Y: yc1 + T1*cs - T*sn*th1}
	d2 = geometry.Point{
		X: 2 - T2*sn - 2*T1*cs*th1 + T*sn*th1*th1 - T*cs*th2,
		Y: yc2 + T2*cs - 2*T1*sn*th1 - T*cs*th1*th1 - T*sn*th2,
	}
	return p, d1, d2
}

// LERadius returns the radius of curvature of k's outline at its leading
// edge (Edges), in units of the chord |te − le|. The curvature of the image
// of the circle under the conformal map z = f(ζ) is, with τ the unit
// tangent of the circle (counter-clockwise) and R its radius,
//
//	κ_z = (1/R + Im(τ f''(ζ)/f'(ζ))) / |f'(ζ)|
//
// where, with w = ((ζ−b)/(ζ+b))ⁿ, f' = 4n²w / ((1−w)²(ζ²−1)) and f”/f' =
// (2n(1+w)/(1−w) − 2ζ) / (ζ²−1) (b = 1). It returns an error wrapping
// ErrKarmanTrefftz for parameters that describe no section.
func (k KarmanTrefftz) LERadius() (float64, error) {
	if err := k.check(4); err != nil {
		return 0, err
	}
	phi := k.lePhi()
	n := complex(k.exponent(), 0)
	r, _ := k.radius()
	zeta := k.circle(phi)
	w := cmplx.Pow((zeta-1)/(zeta+1), n)
	q := zeta*zeta - 1
	fp := 4 * n * n * w / ((1 - w) * (1 - w) * q)
	ratio := (2*n*(1+w)/(1-w) - 2*zeta) / q
	tau := cmplx.Rect(1, phi+math.Pi/2)
	kappa := (1/r + imag(tau*ratio)) / cmplx.Abs(fp)
	le := k.mapZeta(zeta)
	return 1 / kappa / cmplx.Abs(n-le), nil
}

// maximise returns the x in [a, b] where f is largest, by a scan of 200
// steps and golden-section search about the best of them; f must be
// unimodal near its maximum.
func maximise(f func(float64) float64, a, b float64) float64 {
	const steps = 200
	h := (b - a) / steps
	best, bestF := a, math.Inf(-1)
	for i := 0; i <= steps; i++ {
		if v := f(a + h*float64(i)); v > bestF {
			best, bestF = a+h*float64(i), v
		}
	}
	return goldenMax(f, math.Max(a, best-h), math.Min(b, best+h), 1e-13)
}
