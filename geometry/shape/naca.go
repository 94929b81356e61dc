package shape

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// NACA4 is a NACA 4-digit section, defined by the equations of
//
//	Abbott, I. H., von Doenhoff, A. E. and Stivers, L. S., Summary of Airfoil
//	Data, NACA Report 824 (1945), pp. 5–6.
//
// The half-thickness at chord station x (0 ≤ x ≤ 1) is
//
//	yt = t/0.2 · (0.29690√x − 0.12600x − 0.35160x² + 0.28430x³ − a₄x⁴)
//
// with a₄ = 0.10150 (the standard equation; its trailing edge is open, of
// thickness 2·yt(1) = 0.0105·t) or a₄ = 0.10360 (a variant that closes the
// trailing edge; common practice).
// The camber line is two parabolas meeting at x = p:
//
//	yc = m/p² (2px − x²)                 x < p
//	yc = m/(1−p)² ((1−2p) + 2px − x²)    x ≥ p
//
// and the thickness is laid off perpendicular to the camber line.
type NACA4 struct {
	Camber    float64 // maximum camber m, chord fractions (first digit / 100)
	CamberPos float64 // chordwise position p of maximum camber (second digit / 10)
	Thickness float64 // maximum thickness t, chord fractions (last two digits / 100)
	SharpTE   bool    // use the closed trailing-edge coefficient a₄ = 0.1036
}

// ParseNACA4 parses a four-digit designation such as "2412" or "0012".
func ParseNACA4(code string) (NACA4, error) {
	if len(code) != 4 {
		return NACA4{}, fmt.Errorf("geometry: NACA 4-digit code %q: want 4 digits", code)
	}
	d := make([]int, 4)
	for i, r := range code {
		if r < '0' || r > '9' {
			return NACA4{}, fmt.Errorf("geometry: NACA 4-digit code %q: want 4 digits", code)
		}
		d[i] = int(r - '0')
	}
	n := NACA4{
		Camber:    float64(d[0]) / 100,
		CamberPos: float64(d[1]) / 10,
		Thickness: float64(10*d[2]+d[3]) / 100,
	}
	if n.Thickness == 0 {
		return NACA4{}, fmt.Errorf("geometry: NACA 4-digit code %q: zero thickness", code)
	}
	if (n.Camber == 0) != (n.CamberPos == 0) {
		return NACA4{}, fmt.Errorf("geometry: NACA 4-digit code %q: camber and its position must both be zero or both non-zero", code)
	}
	return n, nil
}

// String returns the four-digit designation of n.
func (n NACA4) String() string {
	return fmt.Sprintf("%d%d%02d", int(math.Round(n.Camber*100)), int(math.Round(n.CamberPos*10)), int(math.Round(n.Thickness*100)))
}

// HalfThickness returns yt(x). It panics if x is outside [0, 1].
func (n NACA4) HalfThickness(x float64) float64 {
	if x < 0 || x > 1 {
		panic("geometry: NACA4 chord station outside [0, 1]")
	}
	a4 := 0.1015
	if n.SharpTE {
		a4 = 0.1036
	}
	return n.Thickness / 0.2 * (0.2969*math.Sqrt(x) - 0.1260*x - 0.3516*x*x + 0.2843*x*x*x - a4*x*x*x*x)
}

// CamberLine returns yc(x) and its slope dyc/dx. It panics if x is outside [0, 1].
func (n NACA4) CamberLine(x float64) (yc, slope float64) {
	if x < 0 || x > 1 {
		panic("geometry: NACA4 chord station outside [0, 1]")
	}
	m, p := n.Camber, n.CamberPos
	if m == 0 {
		return 0, 0
	}
	if x < p {
		return m / (p * p) * (2*p*x - x*x), 2 * m / (p * p) * (p - x)
	}
	q := (1 - p) * (1 - p)
	return m / q * ((1 - 2*p) + 2*p*x - x*x), 2 * m / q * (p - x)
}

// Upper returns the upper-surface point at chord station x.
func (n NACA4) Upper(x float64) geometry.Point {
	yt := n.HalfThickness(x)
	yc, dy := n.CamberLine(x)
	th := math.Atan(dy)
	return geometry.Point{X: x - yt*math.Sin(th), Y: yc + yt*math.Cos(th)}
}

// Lower returns the lower-surface point at chord station x.
func (n NACA4) Lower(x float64) geometry.Point {
	yt := n.HalfThickness(x)
	yc, dy := n.CamberLine(x)
	th := math.Atan(dy)
	return geometry.Point{X: x + yt*math.Sin(th), Y: yc - yt*math.Cos(th)}
}

// Loop returns 2·perSurface+1 points in the package node order: the upper
// trailing edge, the upper surface to the leading edge (x = 0), and the lower
// surface back to the trailing edge, with chord stations x = (1 − cos β)/2
// spaced evenly in β. For a sharp trailing edge the first and last point
// coincide. It panics if perSurface < 2.
func (n NACA4) Loop(perSurface int) []geometry.Point {
	if perSurface < 2 {
		panic("geometry: NACA4 loop needs at least 2 points per surface")
	}
	return n.Nodes(2 * perSurface)
}

// Nodes returns panels+1 nodes in the package node order with cosine
// spacing in x on each surface: (panels+1)/2 panels on the upper surface and
// panels/2 on the lower, and a node exactly at the leading edge. It panics
// if panels < 4.
func (n NACA4) Nodes(panels int) []geometry.Point {
	if panels < 4 {
		panic("geometry: NACA4 needs at least 4 panels")
	}
	up, lo := (panels+1)/2, panels/2
	pts := make([]geometry.Point, 0, panels+1)
	for i := up; i >= 1; i-- {
		pts = append(pts, n.Upper(CosineStation(i, up)))
	}
	pts = append(pts, geometry.Point{X: 0, Y: 0})
	for i := 1; i <= lo; i++ {
		pts = append(pts, n.Lower(CosineStation(i, lo)))
	}
	return pts
}

// CosineStation returns (1 − cos(π i / n)) / 2, exact at both ends.
func CosineStation(i, n int) float64 {
	switch i {
	case 0:
		return 0
	case n:
		return 1
	}
	return (1 - math.Cos(math.Pi*float64(i)/float64(n))) / 2
}
