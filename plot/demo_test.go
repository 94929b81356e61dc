package plot

import (
	"math"
	"math/cmplx"
	"math/rand/v2"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
)

// The demo data of these tests is invented: NACA 2412 sections from the
// NACA Report 824 equations (shape.NACA4) with invented noise and
// invented probe slips, the exact potential flow about a Joukowski section,
// thin-aerofoil theory integrals, and invented blade stations.

// naca2412 is the section of the demo.
var naca2412 = shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12}

// demoPrep returns a NACA 2412 of 152.4 mm chord as a coordinate-measuring
// machine might report it: 299 points with normal noise of 0.02 mm (σ), the
// section tilted 3° nose-up and its nose at (37, 12) mm, two points pushed
// 1.2 mm off the surface (a slipped probe, invented) and dropped, and the
// exact shape as the "fitted curve".
func demoPrep() PrepData {
	const (
		chord = 152.4
		tilt  = 3 * math.Pi / 180
		sigma = 0.02
	)
	toPart := func(p geometry.Point) geometry.Point {
		// Nose-up tilt: the trailing edge goes down.
		return p.Scale(chord).Rotate(-tilt).Add(geometry.Point{X: 37, Y: 12})
	}
	loop := naca2412.Loop(450) // 901 points, TE → upper → LE → lower → TE
	curve := make([]geometry.Point, len(loop))
	for i, p := range loop {
		curve[i] = toPart(p)
	}
	s := make([]float64, len(curve))
	for i := 1; i < len(curve); i++ {
		s[i] = s[i-1] + curve[i].Dist(curve[i-1])
	}
	rng := rand.New(rand.NewPCG(2412, 152))
	d := PrepData{
		Name:      "NACA 2412 model",
		Units:     "mm",
		Curve:     curve,
		Tolerance: 0.05,
		LE:        curve[450],
		TE:        curve[0].Add(curve[len(curve)-1]).Scale(0.5),
	}
	for i := 3; i < len(curve)-1; i += 3 {
		t := curve[i+1].Sub(curve[i-1])
		n := geometry.Point{X: t.Y, Y: -t.X}.Scale(1 / t.Norm()) // outward for counter-clockwise order
		e := sigma * rng.NormFloat64()
		switch i {
		case 171, 621:
			line := map[int]string{171: "cmm-run.csv:59", 621: "cmm-run.csv:209"}[i]
			d.Dropped = append(d.Dropped, DroppedPoint{At: curve[i].Add(n.Scale(1.2)), Label: line, Reason: "outlier"})
			continue
		}
		d.Measured = append(d.Measured, curve[i].Add(n.Scale(e)))
		d.S = append(d.S, s[i])
		d.Residual = append(d.Residual, e)
	}
	return d
}

// demoSection returns NACA 2412 in the normalised frame with its camber
// line, thickness distribution and leading-edge circle: radius 1.1019 t²,
// centre on the line through the leading edge with the slope of the camber
// line at x = 0.005 (NACA Report 824, p. 5).
func demoSection() SectionData {
	d := SectionData{Name: "NACA 2412", Nodes: naca2412.Loop(100)}
	for i := 0; i <= 100; i++ {
		x := (1 - math.Cos(math.Pi*float64(i)/100)) / 2
		yc, _ := naca2412.CamberLine(x)
		d.Camber = append(d.Camber, geometry.Point{X: x, Y: yc})
		d.Thickness = append(d.Thickness, geometry.Point{X: x, Y: 2 * naca2412.HalfThickness(x)})
	}
	d.LERadius = 1.1019 * naca2412.Thickness * naca2412.Thickness
	_, slope := naca2412.CamberLine(0.005)
	th := math.Atan(slope)
	d.LECentre = geometry.Point{X: d.LERadius * math.Cos(th), Y: d.LERadius * math.Sin(th)}
	return d
}

// joukowski is the exact potential flow about a Joukowski section: the
// circle of centre mu through ζ = a, mapped by z = ζ + a²/ζ, with the
// circulation that puts the rear stagnation point at the cusp (Kutta
// condition). Katz, J. and Plotkin, A., Low-Speed Aerodynamics, 2nd ed.,
// Cambridge University Press (2001), section 6.6.
type joukowski struct {
	a  float64
	mu complex128
}

var demoJoukowski = joukowski{a: 1, mu: complex(-0.08, 0.06)}

func (j joukowski) radius() float64 { return cmplx.Abs(complex(j.a, 0) - j.mu) }

// beta is the angle of the cusp below the circle's centre.
func (j joukowski) beta() float64 { return math.Asin(imag(j.mu) / j.radius()) }

// gamma is the Kutta circulation (clockwise positive) for V∞ = 1.
func (j joukowski) gamma(alpha float64) float64 {
	return 4 * math.Pi * j.radius() * math.Sin(alpha+j.beta())
}

func (j joukowski) z(zeta complex128) complex128 { return zeta + complex(j.a*j.a, 0)/zeta }

// frame returns the leading-edge x and the chord in the z-plane.
func (j joukowski) frame() (xle, chord float64) {
	xle = math.Inf(1)
	for k := range 2000 {
		th := 2 * math.Pi * float64(k) / 2000
		xle = math.Min(xle, real(j.z(j.mu+cmplx.Rect(j.radius(), th))))
	}
	return xle, 2*j.a - xle
}

// surface returns n+1 points of the section in the normalised frame in node
// order, with the exact Cp = 1 − |w/(dz/dζ)|² at α (radians), leaving out
// the cusp itself, where the ratio is 0/0.
func (j joukowski) surface(n int, alpha float64) (xs, ys, cps []float64) {
	r, b := j.radius(), j.beta()
	xle, c := j.frame()
	g := j.gamma(alpha)
	for k := 1; k < n; k++ {
		th := -b + 2*math.Pi*float64(k)/float64(n)
		zp := cmplx.Rect(r, th)
		zeta := j.mu + zp
		w := cmplx.Exp(complex(0, -alpha)) - complex(r*r, 0)*cmplx.Exp(complex(0, alpha))/(zp*zp) + complex(0, g/(2*math.Pi))/zp
		dz := 1 - complex(j.a*j.a, 0)/(zeta*zeta)
		v := cmplx.Abs(w / dz)
		z := j.z(zeta)
		xs = append(xs, (real(z)-xle)/c)
		ys = append(ys, imag(z)/c)
		cps = append(cps, 1-v*v)
	}
	return xs, ys, cps
}

// cl returns the exact lift coefficient on the section's chord.
func (j joukowski) cl(alpha float64) float64 {
	_, c := j.frame()
	return 2 * j.gamma(alpha) / c
}

// flow returns the stream function around the section at α (radians) on a
// grid in the normalised frame.
func (j joukowski) flow(alpha float64, nx, ny int, x0, y0, dx, dy float64) FlowField {
	r := j.radius()
	xle, c := j.frame()
	g := j.gamma(alpha)
	f := FlowField{AlphaDeg: alpha * 180 / math.Pi, Method: "Joukowski exact", Nx: nx, Ny: ny, X0: x0, Y0: y0, DX: dx, DY: dy}
	for jy := range ny {
		for ix := range nx {
			z := complex(xle+c*(x0+float64(ix)*dx), c*(y0+float64(jy)*dy))
			s := cmplx.Sqrt(z*z - complex(4*j.a*j.a, 0))
			zeta := (z + s) / 2
			if z2 := (z - s) / 2; cmplx.Abs(z2-j.mu) > cmplx.Abs(zeta-j.mu) {
				zeta = z2
			}
			zp := zeta - j.mu
			F := zp*cmplx.Exp(complex(0, -alpha)) + complex(r*r, 0)*cmplx.Exp(complex(0, alpha))/zp + complex(0, g/(2*math.Pi))*cmplx.Log(zp)
			f.Psi = append(f.Psi, imag(F)/c) // per unit chord
		}
	}
	xs, ys, _ := j.surface(200, alpha)
	for k := range xs {
		f.Body = append(f.Body, geometry.Point{X: xs[k], Y: ys[k]})
	}
	return f
}

// demoCp returns the exact Cp of the Joukowski section at the given angles.
func demoCp(alphasDeg ...float64) []CpCase {
	var cases []CpCase
	for _, a := range alphasDeg {
		xs, ys, cps := demoJoukowski.surface(160, a*math.Pi/180)
		cases = append(cases, CpCase{AlphaDeg: a, Method: "Joukowski exact", X: xs, Y: ys, Cp: cps})
	}
	return cases
}

// thinAerofoil returns the zero-lift angle (radians) and the moment about
// the quarter chord of the NACA 2412 camber line by thin-aerofoil theory,
//
//	α_L0 = −(1/π) ∫ dyc/dx (cos θ − 1) dθ,  cm_c/4 = (π/4)(A₂ − A₁),
//	A_n = (2/π) ∫ dyc/dx cos nθ dθ,  x = (1 − cos θ)/2,  θ ∈ [0, π]
//
// (Katz and Plotkin 2001, section 5.3), by the midpoint rule.
func thinAerofoil() (alphaL0, cmc4 float64) {
	const n = 4000
	var i0, a1, a2 float64
	for k := range n {
		th := math.Pi * (float64(k) + 0.5) / n
		_, s := naca2412.CamberLine((1 - math.Cos(th)) / 2)
		i0 += s * (math.Cos(th) - 1)
		a1 += s * math.Cos(th)
		a2 += s * math.Cos(2*th)
	}
	h := math.Pi / n
	alphaL0 = -i0 * h / math.Pi
	a1 *= 2 * h / math.Pi
	a2 *= 2 * h / math.Pi
	return alphaL0, math.Pi / 4 * (a2 - a1)
}

// demoPolars returns the thin-aerofoil polar of NACA 2412 and the exact lift
// of the Joukowski section, −4° to 10°.
func demoPolars() []PolarSeries {
	al0, cm := thinAerofoil()
	thin := PolarSeries{Method: "thin-aerofoil, NACA 2412"}
	exact := PolarSeries{Method: "Joukowski section, exact"}
	for a := -4.0; a <= 10; a += 2 {
		r := a * math.Pi / 180
		thin.AlphaDeg = append(thin.AlphaDeg, a)
		thin.Cl = append(thin.Cl, 2*math.Pi*(r-al0))
		thin.Cm = append(thin.Cm, cm)
		exact.AlphaDeg = append(exact.AlphaDeg, a)
		exact.Cl = append(exact.Cl, demoJoukowski.cl(r))
	}
	return []PolarSeries{thin, exact}
}

// demoStations are five invented stations of a 2.4 m rotor blade.
var demoStations = []Station{
	{Position: 240, Chord: 150.2, TwistDeg: 14.1, Thickness: 0.152, FitRMS: 0.21},
	{Position: 480, Chord: 128.7, TwistDeg: 9.2, Thickness: 0.134, FitRMS: 0.17},
	{Position: 720, Chord: 105.4, TwistDeg: 5.6, Thickness: 0.122, FitRMS: 0.16},
	{Position: 960, Chord: 86.1, TwistDeg: 3.1, Thickness: 0.116, FitRMS: 0.19},
	{Position: 1140, Chord: 72.3, TwistDeg: 1.4, Thickness: 0.111, FitRMS: 0.24},
}

// demoOutline returns the outline of the demo Joukowski section.
func demoOutline() []geometry.Point {
	xs, ys, _ := demoJoukowski.surface(160, 0)
	out := make([]geometry.Point, len(xs))
	for i := range xs {
		out[i] = geometry.Point{X: xs[i], Y: ys[i]}
	}
	return out
}
