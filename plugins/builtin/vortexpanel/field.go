package vortexpanel

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// FieldPoint is the flow at one point off the body.
type FieldPoint struct {
	Velocity geometry.Point // V/V∞
	Cp       float64        // 1 − (V/V∞)²
	// StreamFunction is ψ/(V∞ c), zero-based at no particular point: only
	// differences of ψ carry meaning. The body surface is a streamline.
	StreamFunction float64
}

// Field returns the velocity, pressure coefficient and stream function of
// case c at each point. It returns an error wrapping ErrInside for a point
// inside the body and ErrNonFinite for a point that is not finite. On the
// surface itself the panel integrals are singular; keep points a small
// fraction of the local panel length away from it.
func (c *Case) Field(pts []geometry.Point) ([]FieldPoint, error) {
	sv := c.sv
	loop := sv.nodes
	if !sv.blunt {
		loop = loop[:sv.n]
	}
	out := make([]FieldPoint, len(pts))
	sa, ca := math.Sincos(c.Alpha)
	for k, p := range pts {
		if !p.IsFinite() {
			return nil, fmt.Errorf("vortexpanel: %w: field point %d is (%g, %g)", ErrNonFinite, k, p.X, p.Y)
		}
		if geometry.InsideLoop(loop, p) {
			return nil, fmt.Errorf("vortexpanel: %w: field point %d (%g, %g)", ErrInside, k, p.X, p.Y)
		}
		u, v := ca, sa
		psi := p.Y*ca - p.X*sa
		for j := range sv.n {
			du, dv, dpsi := sv.vortexAt(j, p, c.x0[j], c.x0[j+1])
			u, v, psi = u+du, v+dv, psi+dpsi
		}
		if sv.blunt {
			du, dv, dpsi := sv.baseSourceAt(p, c.BaseSource)
			u, v, psi = u+du, v+dv, psi+dpsi
		}
		out[k] = FieldPoint{Velocity: geometry.Point{X: u, Y: v}, Cp: 1 - u*u - v*v, StreamFunction: psi}
	}
	return out, nil
}

// vortexAt returns the velocity and stream function at p of panel j with
// node strengths ga (start) and gb (end). In the panel frame, with
// γ(ξ) = ga + (gb − ga) ξ/s,
//
//	u = −1/(2π) ∫ γ y/r² dξ,  v = 1/(2π) ∫ γ (x−ξ)/r² dξ,  ψ = −1/(2π) ∫ γ ln r dξ.
func (sv *Solver) vortexAt(j int, p geometry.Point, ga, gb float64) (u, v, psi float64) {
	const inv2pi = 1 / (2 * math.Pi)
	x, y, beta, lnr := sv.local(j, p.X, p.Y, false)
	s := sv.s[j]
	i1u := x*beta - y*lnr
	i1v := x*lnr - s + y*beta
	lu := -((ga * (beta - i1u/s)) + gb*i1u/s) * inv2pi
	lv := (ga*(lnr-i1v/s) + gb*i1v/s) * inv2pi
	// ψ integrals: J0 = ∫ ln r dξ, J1 = ∫ ξ ln r dξ.
	xs := x - s
	r1, r2 := x*x+y*y, xs*xs+y*y
	l1, l2 := fldHalfLog(r1), fldHalfLog(r2)
	j0 := fldMul(-xs, l2) + fldMul(x, l1) - s + y*beta
	j1 := x*j0 + 0.5*(fldMul(r2, l2)-fldMul(r1, l1)) - 0.25*(r2-r1)
	psi = -(ga*(j0-j1/s) + gb*j1/s) * inv2pi
	u = lu*sv.tx[j] - lv*sv.ty[j]
	v = lu*sv.ty[j] + lv*sv.tx[j]
	return u, v, psi
}

// baseSourceAt returns the velocity and stream function at p of the base
// panel with source strength sigma. The angle in ψ = σ/(2π) ∫ θ dξ is taken
// in [0, 2π) from the +x direction, so that the branch cut runs downstream
// from the base, along the wake.
func (sv *Solver) baseSourceAt(p geometry.Point, sigma float64) (u, v, psi float64) {
	const inv2pi = 1 / (2 * math.Pi)
	j := sv.n
	x, y, beta, lnr := sv.local(j, p.X, p.Y, false)
	s := sv.s[j]
	lu, lv := sigma*lnr*inv2pi, sigma*beta*inv2pi
	u = lu*sv.tx[j] - lv*sv.ty[j]
	v = lu*sv.ty[j] + lv*sv.tx[j]
	// ∫ θ dξ in the panel frame, then turned to the global branch.
	th1, th2 := math.Atan2(y, x), math.Atan2(y, x-s)
	k := x*th1 - (x-s)*th2 + y*lnr
	thp := math.Atan2(sv.ty[j], sv.tx[j])
	mid := math.Atan2(y, x-s/2) + thp
	shift := thp - 2*math.Pi*math.Floor(mid/(2*math.Pi)) // puts mid in [0, 2π)
	psi = sigma * (k + s*shift) * inv2pi
	return u, v, psi
}

// fldHalfLog returns ln √r2, or 0 for r2 = 0 (where it only ever multiplies 0).
func fldHalfLog(r2 float64) float64 {
	if r2 == 0 {
		return 0
	}
	return 0.5 * math.Log(r2)
}

// fldMul returns a·b, taking 0·(anything) as 0.
func fldMul(a, b float64) float64 {
	if a == 0 {
		return 0
	}
	return a * b
}
