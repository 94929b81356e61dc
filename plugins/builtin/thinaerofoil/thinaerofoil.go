// Package thinaerofoil implements thin-aerofoil theory: the lift, moment,
// zero-lift angle, centre of pressure and load distribution of a section
// from its camber line alone.
//
// With x = (1 − cos θ)/2 along the unit chord, the vortex sheet on the
// camber line is γ(θ) = 2V∞ (A₀ (1 + cos θ)/sin θ + Σ Aₙ sin nθ), with
//
//	A₀ = α − (1/π) ∫₀^π dyc/dx dθ,   Aₙ = (2/π) ∫₀^π dyc/dx cos nθ dθ,
//
// and then
//
//	Cl = 2π (α − α_L0),   α_L0 = −(1/π) ∫₀^π dyc/dx (cos θ − 1) dθ,
//	Cm_c/4 = π/4 (A₂ − A₁),   x_cp = 1/4 − Cm_c/4 / Cl,
//	ΔCp(x) = 4 (A₀ (1 + cos θ)/sin θ + Σ Aₙ sin nθ).
//
// References:
//
//	Katz, J. and Plotkin, A., Low-Speed Aerodynamics, 2nd ed., Cambridge
//	University Press (2001), ch. 5.
//	Abbott, I. H. and von Doenhoff, A. E., Theory of Wing Sections, Dover
//	(1959), ch. 4.
//
// The camber line is given by samples (x, yc) in the normalised frame of
// package geometry (chord from (0, 0) to (1, 0)); α is in radians from the
// x axis, Cm is about the quarter chord, positive nose-up. The samples are
// interpolated by a not-a-knot cubic spline (gonum interp.NotAKnotCubic)
// whose slope is integrated in θ by Gauss–Legendre quadrature, knot interval
// by knot interval, so the integrals are as accurate as the spline.
package thinaerofoil

import (
	"errors"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/plugins/builtin/solver"
	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/interp"
)

const (
	// MinSamples is the fewest camber-line samples New accepts.
	MinSamples = 8
	// MaxEndGap is how far (chord fractions) the first sample may lie from
	// x = 0 and the last from x = 1. The integrals run over 0 ≤ x ≤ 1;
	// across a gap inside that range the slope is held at its end value.
	MaxEndGap = 0.01
	// Terms is the number of Fourier coefficients A₁ … A_Terms kept for
	// the load distribution.
	Terms = 40
	// gaussPoints is the Gauss–Legendre order per knot interval.
	gaussPoints = 8
)

// Errors for bad input, wrapped with figures; test them with errors.Is.
var (
	// ErrTooFewSamples means fewer than MinSamples camber samples (or fewer
	// than 8 section nodes) were given.
	ErrTooFewSamples = errors.New("too few camber-line samples")
	// ErrNonFinite means a value is NaN or infinite.
	ErrNonFinite = errors.New("value is NaN or infinite")
	// ErrNotIncreasing means the chord stations are not strictly increasing
	// (or a surface of the section doubles back in x).
	ErrNotIncreasing = errors.New("chord stations not strictly increasing")
	// ErrChordEnds means the samples do not start at x = 0 and end at x = 1
	// to within MaxEndGap.
	ErrChordEnds = errors.New("camber line does not span the chord")
	// ErrLengths means xs and ycs differ in length.
	ErrLengths = errors.New("xs and ycs differ in length")
	// ErrAlphaRange means an angle of attack is outside [−90°, 90°] (the
	// panel solvers' own, package solver).
	ErrAlphaRange = solver.ErrAlphaRange
	// ErrStation means a load station is not strictly inside (0, 1).
	ErrStation = errors.New("load station outside (0, 1)")
)

// Camber is a camber line with its thin-aerofoil integrals evaluated.
type Camber struct {
	b0 float64            // (1/π) ∫ dyc/dx dθ
	a  [Terms + 1]float64 // a[n] = Aₙ, n ≥ 1
}

// New fits the camber line (xs, ycs) and evaluates its Fourier
// coefficients. It returns an error wrapping ErrLengths, ErrTooFewSamples,
// ErrNonFinite, ErrNotIncreasing or ErrChordEnds.
func New(xs, ycs []float64) (*Camber, error) {
	if len(xs) != len(ycs) {
		return nil, fmt.Errorf("thinaerofoil: %w: %d and %d", ErrLengths, len(xs), len(ycs))
	}
	if len(xs) < MinSamples {
		return nil, fmt.Errorf("thinaerofoil: %w: %d sample(s), want at least %d", ErrTooFewSamples, len(xs), MinSamples)
	}
	for i := range xs {
		if math.IsNaN(xs[i]) || math.IsInf(xs[i], 0) || math.IsNaN(ycs[i]) || math.IsInf(ycs[i], 0) {
			return nil, fmt.Errorf("thinaerofoil: %w: sample %d is (%g, %g)", ErrNonFinite, i, xs[i], ycs[i])
		}
		if i > 0 && !(xs[i] > xs[i-1]) {
			return nil, fmt.Errorf("thinaerofoil: %w: x[%d] = %g after x[%d] = %g", ErrNotIncreasing, i, xs[i], i-1, xs[i-1])
		}
	}
	last := len(xs) - 1
	if math.Abs(xs[0]) > MaxEndGap || math.Abs(xs[last]-1) > MaxEndGap {
		return nil, fmt.Errorf("thinaerofoil: %w: samples run from x = %g to %g, want 0 and 1 within %g", ErrChordEnds, xs[0], xs[last], MaxEndGap)
	}
	var sp interp.NotAKnotCubic
	if err := sp.Fit(xs, ycs); err != nil {
		return nil, fmt.Errorf("thinaerofoil: fitting the camber line: %w", err)
	}
	// Breakpoints in θ at the knots, so each interval sees one cubic piece.
	breaks := []float64{0}
	for _, x := range xs {
		if th := math.Acos(1 - 2*x); th > breaks[len(breaks)-1] && th < math.Pi {
			breaks = append(breaks, th)
		}
	}
	breaks = append(breaks, math.Pi)
	c := &Camber{}
	gx, gw := make([]float64, gaussPoints), make([]float64, gaussPoints)
	var leg quad.Legendre
	for k := 1; k < len(breaks); k++ {
		leg.FixedLocations(gx, gw, breaks[k-1], breaks[k])
		for q, th := range gx {
			f := gw[q] * sp.PredictDerivative((1-math.Cos(th))/2)
			c.b0 += f / math.Pi
			for n := 1; n <= Terms; n++ {
				c.a[n] += 2 / math.Pi * f * math.Cos(float64(n)*th)
			}
		}
	}
	return c, nil
}

// CamberFromNodes returns the camber line of a section in the normalised
// frame and node order of package geometry: the mean of the upper and lower
// surfaces at equal x, at max(upper, lower) node count cosine-spaced
// stations from the leading edge (the node of least x) to the nearer of the
// two trailing-edge nodes. Each surface is interpolated linearly in x. It
// returns an error wrapping ErrTooFewSamples for fewer than 8 nodes,
// ErrNonFinite, or ErrNotIncreasing if a surface doubles back in x.
func CamberFromNodes(nodes []geometry.Point) (xs, ycs []float64, err error) {
	if len(nodes) < 8 {
		return nil, nil, fmt.Errorf("thinaerofoil: %w: %d node(s), want at least 8", ErrTooFewSamples, len(nodes))
	}
	le := 0
	for i, p := range nodes {
		if !p.IsFinite() {
			return nil, nil, fmt.Errorf("thinaerofoil: %w: node %d is (%g, %g)", ErrNonFinite, i, p.X, p.Y)
		}
		if p.X < nodes[le].X {
			le = i
		}
	}
	upper := make([]geometry.Point, 0, le+1)
	for i := le; i >= 0; i-- {
		upper = append(upper, nodes[i])
	}
	lower := nodes[le:]
	surfaces := [][]geometry.Point{upper, lower}
	x0 := nodes[le].X
	for k, s := range surfaces {
		if len(s) < 2 {
			return nil, nil, fmt.Errorf("thinaerofoil: %w: a surface has %d node(s)", ErrTooFewSamples, len(s))
		}
		// Round the nose the panels of a dense section may step back in x
		// for a node or two (the least-x node is not where the curve turns
		// to within rounding, or the fit's nose wobbles by less than a
		// node spacing): the mean line needs none of them, so a node
		// that does not advance there is left out.
		kept := make([]geometry.Point, 1, len(s))
		kept[0] = s[0]
		for _, p := range s[1:] {
			if !(p.X > kept[len(kept)-1].X) && kept[len(kept)-1].X-x0 < taNoseTo {
				continue
			}
			kept = append(kept, p)
		}
		s = kept
		surfaces[k] = s
		for i := 1; i < len(s); i++ {
			if !(s[i].X > s[i-1].X) {
				// A rounded or hooked trailing edge doubles back in its last
				// few per cent of chord: the surface ends where x stops
				// growing. Anywhere else the section is not a thin one.
				if s[i-1].X >= taHookFrom && i >= 2 {
					surfaces[k] = s[:i]
					break
				}
				return nil, nil, fmt.Errorf("thinaerofoil: %w: surface node at x = %g follows x = %g", ErrNotIncreasing, s[i].X, s[i-1].X)
			}
		}
	}
	upper, lower = surfaces[0], surfaces[1]
	x1 := math.Min(upper[len(upper)-1].X, lower[len(lower)-1].X)
	m := max(len(upper), len(lower))
	xs, ycs = make([]float64, m), make([]float64, m)
	for k := range m {
		x := x0 + (x1-x0)*(1-math.Cos(math.Pi*float64(k)/float64(m-1)))/2
		if k == m-1 {
			x = x1
		}
		xs[k] = x
		ycs[k] = (taLinear(upper, x) + taLinear(lower, x)) / 2
	}
	return xs, ycs, nil
}

// taNoseTo is the distance from the leading edge in x (chord units: a
// section's nodes are normalised), within which a node that does not advance in x is
// left out of its surface rather than refused.
const taNoseTo = 0.01

// taHookFrom is the chord station beyond which a surface may double back
// (a rounded trailing edge) and is cut where it does.
const taHookFrom = 0.9

// taLinear interpolates y at x on a surface with strictly increasing x.
func taLinear(s []geometry.Point, x float64) float64 {
	lo, hi := 0, len(s)-1
	for hi-lo > 1 {
		mid := (lo + hi) / 2
		if s[mid].X <= x {
			lo = mid
		} else {
			hi = mid
		}
	}
	a, b := s[lo], s[hi]
	f := (x - a.X) / (b.X - a.X)
	return a.Y + f*(b.Y-a.Y)
}

// ZeroLiftAngle returns α_L0 in radians.
func (c *Camber) ZeroLiftAngle() float64 { return c.b0 - c.a[1]/2 }

// CmQuarter returns Cm about the quarter chord, π/4 (A₂ − A₁), which does
// not depend on α.
func (c *Camber) CmQuarter() float64 { return math.Pi / 4 * (c.a[2] - c.a[1]) }

// A returns the Fourier coefficient Aₙ at angle of attack alpha (radians):
// A₀ depends on α, the others do not. It panics if n < 0 or n > Terms.
func (c *Camber) A(n int, alpha float64) float64 {
	if n < 0 || n > Terms {
		panic("thinaerofoil: Fourier coefficient index out of range")
	}
	if n == 0 {
		return alpha - c.b0
	}
	return c.a[n]
}

// Case is the thin-aerofoil result at one angle of attack.
type Case struct {
	Alpha      float64 // radians
	A0, A1, A2 float64 // Fourier coefficients
	Cl         float64 // 2π (α − α_L0)
	Cm         float64 // about the quarter chord, positive nose-up
	// XCP is the centre of pressure, 1/4 − Cm/Cl (chord fractions); it is
	// undefined (HasXCP false, XCP 0) where |Cl| < 1e-9.
	XCP    float64
	HasXCP bool
}

// Solve returns the case at each angle of attack (radians). It returns an
// error wrapping ErrNonFinite or ErrAlphaRange for a bad angle.
func (c *Camber) Solve(alphas []float64) ([]Case, error) {
	if err := solver.CheckAlphas("thinaerofoil", alphas, ErrNonFinite); err != nil {
		return nil, err
	}
	out := make([]Case, len(alphas))
	for k, a := range alphas {
		cs := Case{Alpha: a, A0: c.A(0, a), A1: c.a[1], A2: c.a[2], Cm: c.CmQuarter()}
		cs.Cl = 2 * math.Pi * (a - c.ZeroLiftAngle())
		if math.Abs(cs.Cl) >= 1e-9 {
			cs.XCP, cs.HasXCP = 0.25-cs.Cm/cs.Cl, true
		}
		out[k] = cs
	}
	return out, nil
}

// Load returns the load distribution ΔCp = Cp,lower − Cp,upper at the chord
// stations xs for angle of attack alpha (radians), from the series with
// A₀ … A_Terms. It returns an error wrapping ErrStation for a station not
// strictly inside (0, 1), or the errors of Solve for a bad angle.
func (c *Camber) Load(alpha float64, xs []float64) ([]float64, error) {
	if err := solver.CheckAlphas("thinaerofoil", []float64{alpha}, ErrNonFinite); err != nil {
		return nil, err
	}
	out := make([]float64, len(xs))
	a0 := c.A(0, alpha)
	for k, x := range xs {
		if !(x > 0 && x < 1) {
			return nil, fmt.Errorf("thinaerofoil: %w: station %d is %g", ErrStation, k, x)
		}
		th := math.Acos(1 - 2*x)
		st, ct := math.Sincos(th)
		v := a0 * (1 + ct) / st
		for n := 1; n <= Terms; n++ {
			v += c.a[n] * math.Sin(float64(n)*th)
		}
		out[k] = 4 * v
	}
	return out, nil
}
