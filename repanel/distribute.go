package repanel

import (
	"errors"
	"fmt"
	"math"

	"github.com/foilwright/foilwright/geometry"
)

// Panel-count limits, for Options.Panels.
const (
	MinPanels = 16
	MaxPanels = 2000
	// MinSurfacePanels is the fewest panels either surface receives.
	MinSurfacePanels = 8
)

// Spacing law names accepted by Options.Spacing.
const (
	LawCosine     = "cosine"
	LawHalfCosine = "half-cosine"
	LawUniform    = "uniform"
	LawCurvature  = "curvature"
)

// laws is the one list of spacing laws: the name a user gives and how the
// law is made for one surface (from arc length from to arc length to of p,
// n panels). Flags, completions, the pipeline file's checks and messages
// read it through Laws; a new law is a type in spacing.go and an entry
// here.
var laws = []struct {
	name string
	law  func(p geometry.Path, from, to float64, n int, o Options) (Spacing, error)
}{
	{LawCosine, func(geometry.Path, float64, float64, int, Options) (Spacing, error) { return Cosine{}, nil }},
	{LawHalfCosine, func(geometry.Path, float64, float64, int, Options) (Spacing, error) { return HalfCosine{}, nil }},
	{LawUniform, func(geometry.Path, float64, float64, int, Options) (Spacing, error) { return Uniform{}, nil }},
	{LawCurvature, curvatureLaw},
}

// Laws returns the spacing law names in the order a user sees them.
func Laws() []string {
	out := make([]string, len(laws))
	for i, l := range laws {
		out[i] = l.name
	}
	return out
}

// lawIndex returns the index in laws of the law called name, or -1.
func lawIndex(name string) int {
	for i, l := range laws {
		if l.name == name {
			return i
		}
	}
	return -1
}

// Errors Distribute returns for options or a path it cannot use; the
// returned error wraps one of them and quotes the offending value.
var (
	// ErrPanelCount means Options.Panels is outside [MinPanels, MaxPanels].
	ErrPanelCount = errors.New("repanel: panel count out of range")
	// ErrUnknownSpacing means Options.Spacing names no spacing law.
	ErrUnknownSpacing = errors.New("repanel: unknown spacing law")
	// ErrOptionRange means a clustering strength or the curvature weight is
	// outside its documented range or not a number.
	ErrOptionRange = errors.New("repanel: option out of range")
	// ErrPath means the path or the leading-edge arc length cannot be used:
	// a length that is not positive and finite, a leading edge not strictly
	// inside the path, a point or a curvature that is NaN or infinite, or a
	// surface too short to hold its panels in floating point.
	ErrPath = errors.New("repanel: unusable path")
)

// Options controls Distribute. The zero value of every field means its
// default.
type Options struct {
	// Panels is the number of panels N, in [MinPanels, MaxPanels];
	// Distribute returns N+1 nodes. 0 means the fewest panels that trace
	// the path within Tolerance (see Count and Deviation), in
	// [AutoMinPanels, AutoMaxPanels].
	Panels int
	// Tolerance is the largest distance between the panels and the path
	// that an automatic panel count (Panels 0) accepts, in the units of the
	// path; 0 means DefaultTolerance (1e-4). It must not be negative; it
	// is ignored when Panels is set.
	Tolerance float64
	// Spacing names the law that spaces the nodes along each surface:
	// "cosine" (the default, for ""), "half-cosine" (clustered at the
	// leading edge only), "uniform" or "curvature" (curvature-weighted on a
	// cosine base). See the package documentation for the formulas.
	Spacing string
	// LECluster is the clustering strength at the leading edge, in
	// [−ClusterLimit, ClusterLimit] = [−3, 3]; 0 (the default) leaves the law
	// as it is. Positive values cluster nodes more tightly at the leading
	// edge, shrinking the panels there by about exp(−LECluster); negative
	// values spread them. See Stretched.
	LECluster float64
	// TECluster is the same at the trailing edge.
	TECluster float64
	// CurvatureWeight, for the "curvature" law, blends the cosine base
	// density (toward 0) with pure curvature weighting (1); it must lie in
	// [0, 1], and 0 means DefaultCurvatureWeight (0.5). It is ignored by the
	// other laws. See Curvature.
	CurvatureWeight float64
}

// withDefaults returns o with defaults filled in, or an error for a value
// outside its range.
func (o Options) withDefaults() (Options, error) {
	if !(o.Tolerance >= 0) || math.IsInf(o.Tolerance, 0) {
		return o, fmt.Errorf("%w: panel tolerance %g, want a positive length", ErrOptionRange, o.Tolerance)
	}
	if o.Tolerance == 0 {
		o.Tolerance = DefaultTolerance
	}
	if o.Panels != 0 && (o.Panels < MinPanels || o.Panels > MaxPanels) {
		return o, fmt.Errorf("%w: %d, want %d..%d", ErrPanelCount, o.Panels, MinPanels, MaxPanels)
	}
	if o.Spacing == "" {
		o.Spacing = LawCosine
	}
	if lawIndex(o.Spacing) < 0 {
		return o, fmt.Errorf("%w %q, want one of %q", ErrUnknownSpacing, o.Spacing, Laws())
	}
	if !inCluster(o.LECluster) {
		return o, fmt.Errorf("%w: leading-edge cluster %g, want %g..%g", ErrOptionRange, o.LECluster, -ClusterLimit, ClusterLimit)
	}
	if !inCluster(o.TECluster) {
		return o, fmt.Errorf("%w: trailing-edge cluster %g, want %g..%g", ErrOptionRange, o.TECluster, -ClusterLimit, ClusterLimit)
	}
	if !(o.CurvatureWeight >= 0 && o.CurvatureWeight <= 1) {
		return o, fmt.Errorf("%w: curvature weight %g, want 0..1", ErrOptionRange, o.CurvatureWeight)
	}
	if o.CurvatureWeight == 0 {
		o.CurvatureWeight = DefaultCurvatureWeight
	}
	return o, nil
}

// Distribute returns opts.Panels+1 nodes along p in its order (trailing
// edge, upper surface, leading edge, lower surface, trailing edge): the
// points p.At(s) at the arc lengths that Stations returns. The first node is
// p.At(0), the last p.At(p.Length()), and one node lies exactly at arc length
// sLE, the leading edge.
//
// It returns an error wrapping ErrPanelCount, ErrUnknownSpacing or
// ErrOptionRange for options outside their ranges, and ErrPath when p or sLE
// cannot be used.
func Distribute(p geometry.Path, sLE float64, opts Options) ([]geometry.Point, error) {
	ss, _, err := Stations(p, sLE, opts)
	if err != nil {
		return nil, err
	}
	nodes := make([]geometry.Point, len(ss))
	for i, s := range ss {
		nodes[i] = p.At(s)
		if !nodes[i].IsFinite() {
			return nil, fmt.Errorf("%w: point (%g, %g) at arc length %g is not finite", ErrPath, nodes[i].X, nodes[i].Y, s)
		}
	}
	return nodes, nil
}

// Stations returns the opts.Panels+1 arc lengths at which Distribute places
// its nodes, strictly increasing from exactly 0 to exactly p.Length(), and
// the index le of the node at exactly sLE. With opts.Panels 0 the count is
// the fewest in [AutoMinPanels, AutoMaxPanels] whose panels trace p within
// opts.Tolerance (see Count); AutoMaxPanels when none does, which
// Deviation of the stations then shows.
//
// The two surfaces, [0, sLE] (upper, trailing edge to leading edge) and
// [sLE, p.Length()] (lower), are spaced separately. The panel count is split
// between them in proportion to their arc lengths, rounded, with at least
// MinSurfacePanels on each. On each surface the law gives fractions u from
// the leading edge (u = 0) to the trailing edge (u = 1):
//
//	upper:  s = sLE·(1 − u)
//	lower:  s = sLE + (p.Length() − sLE)·u
//
// so LECluster acts at u = 0 and TECluster at u = 1 on both surfaces.
//
// Errors are those of Distribute.
func Stations(p geometry.Path, sLE float64, opts Options) (ss []float64, le int, err error) {
	o, err := opts.withDefaults()
	if err != nil {
		return nil, 0, err
	}
	if p == nil {
		return nil, 0, fmt.Errorf("%w: nil path", ErrPath)
	}
	L := p.Length()
	if !(L > 0) || math.IsInf(L, 0) {
		return nil, 0, fmt.Errorf("%w: length %g", ErrPath, L)
	}
	if !(sLE > 0 && sLE < L) {
		return nil, 0, fmt.Errorf("%w: leading edge at arc length %g, want strictly inside (0, %g)", ErrPath, sLE, L)
	}
	if o.Panels == 0 {
		n, _, _, err := Count(AutoMinPanels, AutoMaxPanels, o.Tolerance, func(n int) (float64, error) {
			o.Panels = n
			ss, _, err := stations(p, sLE, L, o)
			if err != nil {
				return 0, err
			}
			d, _ := Deviation(p, ss)
			return d, nil
		})
		if err != nil {
			return nil, 0, err
		}
		o.Panels = n
	}
	return stations(p, sLE, L, o)
}

// stations places o.Panels+1 stations along p (see Stations).
func stations(p geometry.Path, sLE, L float64, o Options) (ss []float64, le int, err error) {
	n := o.Panels
	nu := int(math.Round(float64(n) * sLE / L))
	nu = min(max(nu, MinSurfacePanels), n-MinSurfacePanels)
	nl := n - nu

	us, err := surfaceFractions(p, sLE, 0, nu, o)
	if err != nil {
		return nil, 0, err
	}
	ls, err := surfaceFractions(p, sLE, L, nl, o)
	if err != nil {
		return nil, 0, err
	}
	ss = make([]float64, n+1)
	for i := 0; i < nu; i++ {
		ss[i] = sLE * (1 - us[nu-i])
	}
	ss[nu] = sLE
	for j := 1; j < nl; j++ {
		ss[nu+j] = sLE + (L-sLE)*ls[j]
	}
	ss[n] = L
	for i := 1; i <= n; i++ {
		if !(ss[i] > ss[i-1]) {
			return nil, 0, fmt.Errorf("%w: arc lengths %g and %g of nodes %d and %d are not increasing (surface too short for %d panels)",
				ErrPath, ss[i-1], ss[i], i-1, i, n)
		}
	}
	return ss, nu, nil
}

// surfaceFractions returns n+1 fractions for the surface from arc length
// from (the leading edge, u = 0) to arc length to (the trailing edge, u = 1).
func surfaceFractions(p geometry.Path, from, to float64, n int, o Options) ([]float64, error) {
	law, err := laws[lawIndex(o.Spacing)].law(p, from, to, n, o)
	if err != nil {
		return nil, err
	}
	if o.LECluster != 0 || o.TECluster != 0 {
		law = Stretched{Base: law, Start: o.LECluster, End: o.TECluster}
	}
	return law.Fractions(n), nil
}

// curvatureLaw evaluates the curvature law on the surface from arc length
// from to to of p for n panels.
func curvatureLaw(p geometry.Path, from, to float64, n int, o Options) (Spacing, error) {
	c := Curvature{Path: p, From: from, To: to, Weight: o.CurvatureWeight}
	ts, err := c.fractions(n)
	if err != nil {
		return nil, fmt.Errorf("%w: %v", ErrPath, err)
	}
	return fixed(ts), nil
}

// fixed is a law already evaluated for one n.
type fixed []float64

// Fractions returns a copy of f; it panics if n is not len(f)−1.
func (f fixed) Fractions(n int) []float64 {
	if n != len(f)-1 {
		panic("repanel: fixed fractions asked for another count")
	}
	return append([]float64(nil), f...)
}
