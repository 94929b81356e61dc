package align

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// Motion maps a measured point q to
//
//	Scale · R(Angle) · F · q + Shift
//
// where R is the counter-clockwise rotation by Angle (radians) and F the
// mirror x ↦ −x when Mirror is set (the mirror of package frame), else the
// identity. The zero Motion is not usable: its scale is 0; start from
// Identity.
type Motion struct {
	Angle  float64
	Scale  float64
	Shift  geometry.Point
	Mirror bool
}

// Identity returns the motion that leaves every point where it is.
func Identity() Motion { return Motion{Scale: 1} }

// Apply returns the image of q.
func (m Motion) Apply(q geometry.Point) geometry.Point {
	if m.Mirror {
		q.X = -q.X
	}
	return q.Rotate(m.Angle).Scale(m.Scale).Add(m.Shift)
}

// Matrix returns the linear part of m by rows.
func (m Motion) Matrix() [2][2]float64 {
	s, c := math.Sincos(m.Angle)
	a := [2][2]float64{{m.Scale * c, -m.Scale * s}, {m.Scale * s, m.Scale * c}}
	if m.Mirror {
		a[0][0], a[1][0] = -a[0][0], -a[1][0]
	}
	return a
}

// FromMatrix returns the motion x ↦ a·x + b for a matrix a that is a
// positive multiple of a rotation, or of a rotation times the mirror
// x ↦ −x. It panics if a is singular.
func FromMatrix(a [2][2]float64, b geometry.Point) Motion {
	det := a[0][0]*a[1][1] - a[0][1]*a[1][0]
	if det == 0 || math.IsNaN(det) {
		panic("align: singular motion matrix")
	}
	m := Motion{Shift: b, Scale: math.Sqrt(math.Abs(det))}
	if det < 0 {
		// a = s·R·F: undo F on the right, which negates the first column.
		m.Mirror = true
		a[0][0], a[1][0] = -a[0][0], -a[1][0]
	}
	m.Angle = math.Atan2(a[1][0]-a[0][1], a[0][0]+a[1][1])
	return m
}

// step returns the motion q ↦ c + (1+σ)·R(φ)·(m(q) − c) + t: m followed by
// a small rotation φ and scaling σ about c and a shift t.
func (m Motion) step(phi, sigma float64, t, c geometry.Point) Motion {
	f := 1 + sigma
	return Motion{
		Angle:  m.Angle + phi,
		Scale:  m.Scale * f,
		Shift:  m.Shift.Sub(c).Rotate(phi).Scale(f).Add(c).Add(t),
		Mirror: m.Mirror,
	}
}
