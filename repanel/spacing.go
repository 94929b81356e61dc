package repanel

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/interp"

	"github.com/foilwright/foilwright/geometry"
)

// Spacing is a law that places n+1 fractions along a unit interval.
type Spacing interface {
	// Fractions returns n+1 values in [0, 1], strictly increasing, with the
	// first exactly 0 and the last exactly 1. It panics if n < 1.
	Fractions(n int) []float64
}

// Uniform spaces fractions evenly,
//
//	t[i] = i / n,  i = 0, …, n
type Uniform struct{}

// Fractions returns i/n for i = 0, …, n. It panics if n < 1.
func (Uniform) Fractions(n int) []float64 {
	checkCount(n)
	ts := make([]float64, n+1)
	for i := range ts {
		ts[i] = float64(i) / float64(n)
	}
	ts[n] = 1
	return ts
}

// Cosine clusters fractions toward both ends (common practice),
//
//	t[i] = (1 − cos(π i / n)) / 2,  i = 0, …, n
type Cosine struct{}

// Fractions returns the cosine-spaced fractions. It panics if n < 1.
func (Cosine) Fractions(n int) []float64 {
	checkCount(n)
	ts := make([]float64, n+1)
	for i := 1; i < n; i++ {
		ts[i] = (1 - math.Cos(math.Pi*float64(i)/float64(n))) / 2
	}
	ts[n] = 1
	return ts
}

// HalfCosine clusters fractions toward 0 only, and is nearly even at 1
// (common practice),
//
//	t[i] = 1 − cos(π i / (2n)),  i = 0, …, n
type HalfCosine struct{}

// Fractions returns the half-cosine-spaced fractions. It panics if n < 1.
func (HalfCosine) Fractions(n int) []float64 {
	checkCount(n)
	ts := make([]float64, n+1)
	for i := 1; i < n; i++ {
		ts[i] = 1 - math.Cos(math.Pi*float64(i)/float64(2*n))
	}
	ts[n] = 1
	return ts
}

// ClusterLimit bounds the clustering strengths of Stretched and of
// Options.LECluster and Options.TECluster: they must lie in
// [−ClusterLimit, ClusterLimit].
const ClusterLimit = 3.0

// Stretched applies an end-clustering warp to the fractions of Base,
//
//	t'[i] = G(t[i]),  G(u) = (u² + a·u(1−u)) / (1 + (a + b − 2)·u(1−u))
//	a = exp(−Start),  b = exp(−End)
//
// G is the rational quadratic of Gregory and Delbourgo with G(0) = 0,
// G(1) = 1, G′(0) = a and G′(1) = b; it is strictly increasing for all
// a, b > 0. The end panel at 0 is therefore scaled by about exp(−Start) and
// the one at 1 by about exp(−End). Zero strengths give G(u) = u, the plain
// Base law. G(u) increases with a and with b at every interior u, so raising
// Start moves every interior node toward 0 and raising End moves every
// interior node toward 1: the effect is monotone.
//
// References:
//
//	Gregory, J. A. and Delbourgo, R., Piecewise rational quadratic
//	interpolation to monotonic data, IMA Journal of Numerical Analysis 2
//	(1982), pp. 123–130.
type Stretched struct {
	Base       Spacing // the law to warp; nil means Cosine
	Start, End float64 // clustering strength at fraction 0 and at fraction 1, in [−ClusterLimit, ClusterLimit]
}

// Fractions returns the warped fractions of Base. It panics if n < 1 or if
// Start or End is outside [−ClusterLimit, ClusterLimit] or NaN.
func (s Stretched) Fractions(n int) []float64 {
	checkCount(n)
	if !inCluster(s.Start) || !inCluster(s.End) {
		panic("repanel: Stretched strength outside [-ClusterLimit, ClusterLimit]")
	}
	base := s.Base
	if base == nil {
		base = Cosine{}
	}
	ts := base.Fractions(n)
	if s.Start == 0 && s.End == 0 {
		return ts
	}
	a, b := math.Exp(-s.Start), math.Exp(-s.End)
	for i := 1; i < n; i++ {
		u := ts[i]
		w := u * (1 - u)
		ts[i] = (u*u + a*w) / (1 + (a+b-2)*w)
	}
	return ts
}

// DefaultCurvatureWeight is the weight a Curvature law uses when its Weight
// (or Options.CurvatureWeight) is zero.
const DefaultCurvatureWeight = 0.5

// CurvatureSamples is the number of curvature samples per panel that a
// Curvature law starts from before it refines adaptively.
const CurvatureSamples = 20

// Curvature is a curvature-weighted law along the part of Path between arc
// lengths From (fraction 0) and To (fraction 1); To may be less than From,
// in which case the fractions run backwards along the path. Node density is
// a blend of the density of the Base law and a curvature density,
//
//	Φ(t) = (1 − w)·τ(t) + w·K(t)/K(1)
//	K(t) = ∫₀ᵗ (ε + |κ(s(t′))|)^½ dt′,  s(t) = From + t·(To − From)
//	ε = 1/ℓ,  ℓ = |To − From|
//	t[i] = Φ⁻¹(i/n)
//
// where τ(t) is the inverse of the Base law (τ(t[i]) = i/n), κ the curvature
// of Path and w the Weight. A straight chord of length h across an arc of
// curvature κ departs from it by about κh²/8, so panels of length
// h ∝ |κ|^(−½), which the pure curvature density (w = 1) gives, make that
// departure the same on every panel: the equidistribution principle for
// piecewise-linear interpolation (de Boor 1978). The floor ε keeps the
// density positive where the path is straight and sets the scale on which
// curvature counts as large; at w = 1 a straight path gets uniform spacing.
//
// K is integrated with the trapezoidal rule on CurvatureSamples·n points
// placed by the Base law, refined by bisection where the curvature density
// changes fast, and Φ is inverted by monotone (Fritsch–Butland) cubic
// interpolation from gonum/interp.
//
// References:
//
//	de Boor, C., A Practical Guide to Splines, Springer (1978), on the
//	choice of breaks for piecewise-linear interpolation (from memory).
type Curvature struct {
	Path     geometry.Path
	From, To float64 // arc lengths of fraction 0 and fraction 1
	Base     Spacing // nil means Cosine
	Weight   float64 // w in (0, 1]; 0 means DefaultCurvatureWeight
}

// Fractions returns the curvature-weighted fractions. It panics if n < 1,
// Path is nil, From equals To, From or To is outside [0, Path.Length()],
// Weight is outside [0, 1], or the curvature of Path between From and To is
// not finite or, at Weight 1, peaks so far above the rest (by some 30 orders
// of magnitude) that the cumulative density cannot be inverted.
func (c Curvature) Fractions(n int) []float64 {
	ts, err := c.fractions(n)
	if err != nil {
		panic("repanel: Curvature: " + err.Error())
	}
	return ts
}

// errCurvature means a path's curvature cannot be used: NaN, infinite, or so
// uneven that the cumulative density cannot be inverted.
var errCurvature = errors.New("unusable curvature")

// fractions is Fractions with data-dependent failures returned as errors.
func (c Curvature) fractions(n int) ([]float64, error) {
	checkCount(n)
	if c.Path == nil {
		panic("repanel: Curvature with nil Path")
	}
	L := c.Path.Length()
	if c.From == c.To || c.From < 0 || c.To < 0 || c.From > L || c.To > L {
		panic("repanel: Curvature arc-length range empty or outside the path")
	}
	w := c.Weight
	if w == 0 {
		w = DefaultCurvatureWeight
	}
	if !(w > 0 && w <= 1) {
		panic("repanel: Curvature Weight outside [0, 1]")
	}
	base := c.Base
	if base == nil {
		base = Cosine{}
	}
	ell := math.Abs(c.To - c.From)
	eps := 1 / ell
	density := func(t float64) (float64, error) {
		k := c.Path.Curvature(c.From + t*(c.To-c.From))
		if math.IsNaN(k) || math.IsInf(k, 0) {
			return 0, fmt.Errorf("%w: %g at arc length %g", errCurvature, k, c.From+t*(c.To-c.From))
		}
		return math.Sqrt(eps + math.Abs(k)), nil
	}

	m := max(CurvatureSamples*n, 64)
	grid := base.Fractions(m)
	// Sample points: ts (fractions), taus (base-law cumulative), ks (curvature cumulative).
	ts := make([]float64, 1, 2*m)
	taus := make([]float64, 1, 2*m)
	ks := make([]float64, 1, 2*m)
	fa, err := density(0)
	if err != nil {
		return nil, err
	}
	for j := 1; j <= m; j++ {
		a, b := grid[j-1], grid[j]
		fb, err := density(b)
		if err != nil {
			return nil, err
		}
		tauA, tauB := float64(j-1)/float64(m), float64(j)/float64(m)
		if err := curvatureRefine(density, a, b, fa, fb, tauA, tauB, 0, &ts, &taus, &ks); err != nil {
			return nil, err
		}
		fa = fb
	}
	total := ks[len(ks)-1]
	phis := make([]float64, len(ts))
	for i := range ts {
		phis[i] = (1-w)*taus[i] + w*ks[i]/total
	}
	phis[len(phis)-1] = 1
	for i := 1; i < len(phis); i++ {
		if !(phis[i] > phis[i-1]) {
			// Only at w = 1, where a curvature peak many orders of magnitude
			// above the rest leaves no resolvable density elsewhere.
			return nil, fmt.Errorf("%w: curvature varies too widely for weight %g near arc length %g", errCurvature, w, c.From+ts[i]*(c.To-c.From))
		}
	}
	var inv interp.FritschButland
	if err := inv.Fit(phis, ts); err != nil {
		return nil, err
	}
	out := make([]float64, n+1)
	for i := 1; i < n; i++ {
		out[i] = min(max(inv.Predict(float64(i)/float64(n)), 0), 1)
	}
	out[n] = 1
	for i := 1; i <= n; i++ {
		if !(out[i] > out[i-1]) {
			return nil, fmt.Errorf("repanel: curvature law lost monotonicity at node %d of %d", i, n)
		}
	}
	return out, nil
}

// curvatureMaxDepth bounds the bisection of one sample interval.
const curvatureMaxDepth = 6

// curvatureRefine appends the samples of (a, b] to ts, taus and ks, bisecting
// the interval while the curvature density at its ends differs by more than
// a quarter of the larger value. fa and fb are the density at a and b; the
// base-law cumulative τ is interpolated linearly inside the interval.
func curvatureRefine(density func(float64) (float64, error), a, b, fa, fb, tauA, tauB float64, depth int, ts, taus, ks *[]float64) error {
	if depth < curvatureMaxDepth && math.Abs(fa-fb) > 0.25*max(fa, fb) {
		mid := (a + b) / 2
		if mid > a && mid < b {
			fm, err := density(mid)
			if err != nil {
				return err
			}
			tauM := (tauA + tauB) / 2
			if err := curvatureRefine(density, a, mid, fa, fm, tauA, tauM, depth+1, ts, taus, ks); err != nil {
				return err
			}
			return curvatureRefine(density, mid, b, fm, fb, tauM, tauB, depth+1, ts, taus, ks)
		}
	}
	k := (*ks)[len(*ks)-1] + (b-a)*(fa+fb)/2
	*ts = append(*ts, b)
	*taus = append(*taus, tauB)
	*ks = append(*ks, k)
	return nil
}

// checkCount panics if a law is asked for fewer than one interval.
func checkCount(n int) {
	if n < 1 {
		panic("repanel: spacing needs n >= 1")
	}
}

// inCluster reports whether c is a valid clustering strength.
func inCluster(c float64) bool { return c >= -ClusterLimit && c <= ClusterLimit }
