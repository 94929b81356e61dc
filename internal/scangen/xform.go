package scangen

import (
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// The section families beyond NACA 4-digit and Kármán–Trefftz. Each is a
// closed form in the chord station x: a half-thickness yt(x) laid off a
// mean line yc(x), normal to the mean line as NACA Report 824 lays it, or
// vertically (the flat-bottomed sections, whose lower surface is then
// exactly straight). The outline is that closed form itself, so the truth
// is exact whatever the coefficients are.

// NACA5Spec is a NACA 5-digit section (NACA Report 824; Abbott and von
// Doenhoff, Theory of Wing Sections, 1959, §6.4): the 4-digit thickness
// and the 5-digit mean line of design lift coefficient 0.15·L with its
// maximum camber at 0.05·P chord (P = 1..5), plain (Reflex false, the
// 230xx of the report) or reflexed (the 2P1xx lines).
type NACA5Spec struct {
	L         int     `json:"l"` // design lift coefficient in steps of 0.15 (2 for the 230xx)
	P         int     `json:"p"` // position of the maximum camber in steps of 0.05 chord, 1..5
	Reflex    bool    `json:"reflex,omitempty"`
	Thickness float64 `json:"thickness"`
	ClosedTE  bool    `json:"closed_te"`
}

// camber returns the mean line of the 5-digit section and its slope.
func (s NACA5Spec) camber(x float64) (yc, dyc float64) {
	return shape.NACA5{L: s.L, P: s.P, Reflex: s.Reflex}.CamberLine(x)
}

// naca4Thickness is the half-thickness of NACA Report 824 and its slope,
// with the open (a₄ = 0.1015) or closed (0.1036, common practice) edge.
func naca4Thickness(t float64, closed bool) func(x float64) (float64, float64) {
	a4 := 0.1015
	if closed {
		a4 = 0.1036
	}
	return func(x float64) (float64, float64) {
		y := t / 0.2 * (0.2969*math.Sqrt(x) - 0.1260*x - 0.3516*x*x + 0.2843*x*x*x - a4*x*x*x*x)
		if x <= 0 {
			return y, math.Inf(1)
		}
		d := t / 0.2 * (0.2969/(2*math.Sqrt(x)) - 0.1260 - 2*0.3516*x + 3*0.2843*x*x - 4*a4*x*x*x)
		return y, d
	}
}

// ModNACA4Spec is a NACA 4-digit-modified section (Abbott and von
// Doenhoff, §6.5): the 4-digit mean line and a thickness form
//
//	yt = t/0.2 · (a₀√x + a₁x + a₂x² + a₃x³)                  for x < M
//	yt = t/0.2 · (d₀ + d₁(1−x) + d₂(1−x)² + d₃(1−x)³)         for x ≥ M
//
// with a₀ = 0.2969·I/6 (leading-edge radius 1.1019 (t·I/6)², I the
// leading-edge radius index, 6 the normal 4-digit nose), d₀ the half
// base (0.002 open, 0 closed) and d₁ the trailing-edge slope. The other
// coefficients follow from the conditions of that section: the maximum
// thickness t at M with zero slope on both pieces and the curvature of
// the aft piece carried into the forward one at M (solved here in closed
// form). A small d₁ over a closed edge gives a cusped trailing edge.
type ModNACA4Spec struct {
	Camber    float64 `json:"camber"`
	CamberPos float64 `json:"camber_pos"`
	Thickness float64 `json:"thickness"`
	NoseIndex float64 `json:"nose_index"` // I, 2–9
	MaxPos    float64 `json:"max_pos"`    // M, 0.3–0.6
	TESlope   float64 `json:"te_slope"`   // d₁
	ClosedTE  bool    `json:"closed_te"`  // d₀ = 0
}

// thickness returns yt and its slope.
func (s ModNACA4Spec) thickness() func(x float64) (float64, float64) {
	M, S := s.MaxPos, 1-s.MaxPos
	a0 := 0.2969 * s.NoseIndex / 6
	d0, d1 := 0.002, s.TESlope
	if s.ClosedTE {
		d0 = 0
	}
	R := 0.1 - d0 - d1*S
	d3 := -(2*R + d1*S) / (S * S * S)
	d2 := -(d1 + 3*d3*S*S) / (2 * S)
	y2 := 2*d2 + 6*d3*S // d²y/dx² at M from the aft piece
	A := 0.1 - a0*math.Sqrt(M)
	B := -a0 / (2 * math.Sqrt(M))
	C := y2 + a0/(4*M*math.Sqrt(M))
	a3 := (A - B*M + C*M*M/2) / (M * M * M)
	a2 := C/2 - 3*a3*M
	a1 := B - 2*a2*M - 3*a3*M*M
	k := s.Thickness / 0.2
	return func(x float64) (float64, float64) {
		if x < M {
			y := k * (a0*math.Sqrt(x) + a1*x + a2*x*x + a3*x*x*x)
			if x <= 0 {
				return y, math.Inf(1)
			}
			return y, k * (a0/(2*math.Sqrt(x)) + a1 + 2*a2*x + 3*a3*x*x)
		}
		r := 1 - x
		return k * (d0 + d1*r + d2*r*r + d3*r*r*r), -k * (d1 + 2*d2*r + 3*d3*r*r)
	}
}

// waist reports whether the thickness form falls anywhere between the
// nose and M, or rises between M and the tail, and where first: a
// section has one thickest point. The table's combinations (Abbott and
// von Doenhoff, §6.5) all rise to M and fall after it; a large nose
// index with M = 0.6 and a cusp's small d₁ does not: the aft piece's
// strong curvature at M, carried into the forward piece, bends it down
// to almost nothing at 15–20 % of the chord (I 8.03, M 0.6, d₁ 0.050:
// 0.0012 c thick there, under 2 % of its 0.11 c), and no measured part
// has that shape.
func (s ModNACA4Spec) waist() (float64, bool) {
	const n = 2000
	f := s.thickness()
	prev, _ := f(0)
	for i := 1; i <= n; i++ {
		x := float64(i) / n
		y, _ := f(x)
		// 1e-12 of the half thickness 0.1 (t/0.2 = 1): rounding, not shape.
		if (x <= s.MaxPos && y < prev-1e-12*s.Thickness) || (x > s.MaxPos && y > prev+1e-12*s.Thickness) {
			return x, true
		}
		prev = y
	}
	return 0, false
}

// FlatSpec is a flat-bottomed section, constructed here: the closed NACA
// 4-digit thickness yt (Report 824) laid vertically about the mean line
// yc = yt·w(x/F), w(s) = 6s⁵ − 15s⁴ + 10s³ (1 beyond F), so that
//
//	upper = yt·(1 + w),  lower = −yt·(1 − w)
//
// and the lower surface is exactly straight (y = 0) from x = F to the
// trailing edge, joining the rounded nose with continuous slope and
// curvature. The thickness is t; the nose is that of the 4-digit section.
type FlatSpec struct {
	Thickness float64 `json:"thickness"`
	FlatFrom  float64 `json:"flat_from"` // F, 0.1–0.35
}

func (s FlatSpec) blend(x float64) float64 {
	if x >= s.FlatFrom {
		return 1
	}
	u := x / s.FlatFrom
	return u * u * u * (10 + u*(-15+6*u))
}

// xForm is a section in closed form over the chord station x ∈ [0, 1].
type xForm struct {
	thick    func(x float64) (yt, dyt float64)
	camber   func(x float64) (yc, dyc float64) // nil: no camber
	vertical bool                              // lay yt vertically, not normal to the mean line
}

func (f xForm) upper(x float64) geometry.Point { return f.surface(x, 1) }
func (f xForm) lower(x float64) geometry.Point { return f.surface(x, -1) }

// surface returns the point of the upper (side 1) or lower (side −1)
// surface at x: x ∓ yt sin θ, yc ± yt cos θ with tan θ = dyc/dx (NACA
// Report 824), or x, yc ± yt when laid vertically.
func (f xForm) surface(x, side float64) geometry.Point {
	yt, _ := f.thick(x)
	var yc, dyc float64
	if f.camber != nil {
		yc, dyc = f.camber(x)
	}
	if f.vertical {
		return geometry.Point{X: x, Y: yc + side*yt}
	}
	s, c := math.Sincos(math.Atan(dyc))
	return geometry.Point{X: x - side*yt*s, Y: yc + side*yt*c}
}

// pieces returns the upper surface (x = (1 + cos πu)/2, trailing edge to
// nose), the lower surface back, and the straight base of an open edge.
func (f xForm) pieces() []piece {
	clamp := func(x float64) float64 { return math.Min(math.Max(x, 0), 1) }
	ps := []piece{
		{kind: Upper, at: func(u float64) geometry.Point { return f.upper(clamp((1 + math.Cos(math.Pi*u)) / 2)) }},
		{kind: Lower, at: func(u float64) geometry.Point { return f.lower(clamp((1 - math.Cos(math.Pi*u)) / 2)) }},
	}
	if yt, _ := f.thick(1); yt > 0 {
		lo, up := f.lower(1), f.upper(1)
		ps = append(ps, piece{kind: Base, at: func(u float64) geometry.Point { return lo.Add(up.Sub(lo).Scale(u)) }})
	}
	return ps
}

// check refuses a form whose thickness is not positive inside the chord
// or whose surfaces cross: sampled on 2000 cosine-spaced stations.
func (f xForm) check(name string) error {
	const n = 2000
	for i := 1; i < n; i++ {
		x := (1 - math.Cos(math.Pi*float64(i)/n)) / 2
		yt, _ := f.thick(x)
		u, l := f.upper(x), f.lower(x)
		if !(yt > 0) || math.IsNaN(u.Y+l.Y) || u.Y <= l.Y {
			return fmt.Errorf("scangen: %s: thickness %.3g at x = %.4f, not a section", name, yt, x)
		}
	}
	return nil
}
