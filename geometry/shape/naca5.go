package shape

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// NACA5 is a NACA 5-digit section (NACA Report 824; Abbott and von
// Doenhoff, Theory of Wing Sections, 1959, §6.4): the 4-digit thickness
// laid off perpendicular to the 5-digit mean line of design lift
// coefficient 0.15·L with its maximum camber at 0.05·P of the chord
// (P = 1..5), plain (the 230xx of the report: a cubic forward of m, a
// straight line aft) or reflexed (the 2P1xx lines: a cubic aft of m too).
type NACA5 struct {
	L         int     // design lift coefficient in steps of 0.15 (2 for the 230xx)
	P         int     // position of the maximum camber in steps of 0.05 chord, 1..5
	Reflex    bool    // the reflexed mean line
	Thickness float64 // maximum thickness t, chord fractions
	SharpTE   bool    // use the closed trailing-edge coefficient a₄ = 0.1036
}

// naca5Lines are the mean-line constants m, k₁ and, for the reflexed
// lines, m, k₁ and k₂/k₁, at design lift coefficient 0.3, by P. The plain
// lines are those of NACA Report 824 (m = 0.2025, k₁ = 15.957 for the 230
// line); the reflexed ones are from memory (Abbott and von Doenhoff's
// table). k₁ scales with the design lift coefficient.
var naca5Lines = [6]struct{ m, k1, rm, rk1, rk21 float64 }{
	{},
	{0.0580, 361.4, 0.1300, 51.99, 0.000764},
	{0.1260, 51.64, 0.1300, 51.99, 0.000764},
	{0.2025, 15.957, 0.2170, 15.793, 0.00677},
	{0.2900, 6.643, 0.3180, 6.520, 0.0303},
	{0.3910, 3.230, 0.4410, 3.191, 0.1355},
}

// CamberLine returns yc(x) and its slope. It panics if P is not 1..5.
func (n NACA5) CamberLine(x float64) (yc, slope float64) {
	if n.P < 1 || n.P > 5 {
		panic("geometry: NACA5 camber position P must be 1..5")
	}
	c := naca5Lines[n.P]
	scale := float64(n.L) / 2
	if !n.Reflex {
		m, k1 := c.m, c.k1*scale
		if x < m {
			return k1 / 6 * (x*x*x - 3*m*x*x + m*m*(3-m)*x), k1 / 6 * (3*x*x - 6*m*x + m*m*(3-m))
		}
		return k1 * m * m * m / 6 * (1 - x), -k1 * m * m * m / 6
	}
	m, k1, r := c.rm, c.rk1*scale, c.rk21
	q := (1 - m) * (1 - m) * (1 - m)
	if x < m {
		return k1 / 6 * ((x-m)*(x-m)*(x-m) - r*q*x - m*m*m*x + m*m*m),
			k1 / 6 * (3*(x-m)*(x-m) - r*q - m*m*m)
	}
	return k1 / 6 * (r*(x-m)*(x-m)*(x-m) - r*q*x - m*m*m*x + m*m*m),
		k1 / 6 * (3*r*(x-m)*(x-m) - r*q - m*m*m)
}

// HalfThickness returns yt(x), the 4-digit thickness of NACA4.
func (n NACA5) HalfThickness(x float64) float64 {
	return NACA4{Thickness: n.Thickness, SharpTE: n.SharpTE}.HalfThickness(x)
}

// Upper returns the upper-surface point at chord station x.
func (n NACA5) Upper(x float64) geometry.Point {
	yt := n.HalfThickness(x)
	yc, dy := n.CamberLine(x)
	th := math.Atan(dy)
	return geometry.Point{X: x - yt*math.Sin(th), Y: yc + yt*math.Cos(th)}
}

// Lower returns the lower-surface point at chord station x.
func (n NACA5) Lower(x float64) geometry.Point {
	yt := n.HalfThickness(x)
	yc, dy := n.CamberLine(x)
	th := math.Atan(dy)
	return geometry.Point{X: x + yt*math.Sin(th), Y: yc - yt*math.Cos(th)}
}

// Loop returns 2·perSurface+1 points in the package node order, as
// NACA4.Loop. It panics if perSurface < 2.
func (n NACA5) Loop(perSurface int) []geometry.Point {
	if perSurface < 2 {
		panic("geometry: NACA5 loop needs at least 2 points per surface")
	}
	pts := make([]geometry.Point, 0, 2*perSurface+1)
	for i := perSurface; i >= 1; i-- {
		pts = append(pts, n.Upper(CosineStation(i, perSurface)))
	}
	pts = append(pts, geometry.Point{X: 0, Y: 0})
	for i := 1; i <= perSurface; i++ {
		pts = append(pts, n.Lower(CosineStation(i, perSurface)))
	}
	return pts
}
