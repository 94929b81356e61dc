package repanel

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"gonum.org/v1/gonum/floats/scalar"
)

// Tolerances: formula checks are at round-off; the curvature law integrates
// and interpolates numerically, so its limit was measured (2.3e-7, on the
// steep curvature ramp) and rounded up.
const (
	formulaTol   = 1e-14
	curvatureTol = 5e-7
)

// checkFractions fails t unless ts holds n+1 strictly increasing values in
// [0, 1] with exact ends.
func checkFractions(t *testing.T, name string, ts []float64, n int) {
	t.Helper()
	if len(ts) != n+1 {
		t.Fatalf("%s: %d fractions for n = %d, want %d", name, len(ts), n, n+1)
	}
	if ts[0] != 0 || ts[n] != 1 {
		t.Errorf("%s n=%d: ends %v, %v, want exactly 0 and 1", name, n, ts[0], ts[n])
	}
	for i := 1; i <= n; i++ {
		if !(ts[i] > ts[i-1]) || ts[i] > 1 {
			t.Fatalf("%s n=%d: t[%d] = %v after t[%d] = %v: not strictly increasing in [0, 1]", name, n, i, ts[i], i-1, ts[i-1])
		}
	}
}

func TestLawsAreFractions(t *testing.T) {
	p, sle := naca0012()
	laws := []struct {
		name string
		law  Spacing
	}{
		{"uniform", Uniform{}},
		{"cosine", Cosine{}},
		{"half-cosine", HalfCosine{}},
		{"stretched+3,-3", Stretched{Start: 3, End: -3}},
		{"stretched-3,+3", Stretched{Base: Uniform{}, Start: -3, End: 3}},
		{"stretched+3,+3", Stretched{Base: HalfCosine{}, Start: 3, End: 3}},
		{"curvature upper", Curvature{Path: p, From: sle, To: 0}},
		{"curvature lower w=1", Curvature{Path: p, From: sle, To: p.Length(), Weight: 1}},
		{"curvature circle", Curvature{Path: circle{r: 2}, From: 1, To: 3, Base: Uniform{}, Weight: 0.1}},
	}
	for _, tc := range laws {
		t.Run(tc.name, func(t *testing.T) {
			for _, n := range []int{1, 2, 3, 8, 17, 160, 1992} {
				checkFractions(t, tc.name, tc.law.Fractions(n), n)
			}
		})
	}
}

// The closed forms of the plain laws (common practice), evaluated directly.
func TestLawFormulas(t *testing.T) {
	for _, n := range []int{1, 4, 7, 80} {
		u, c, h := Uniform{}.Fractions(n), Cosine{}.Fractions(n), HalfCosine{}.Fractions(n)
		for i := 0; i <= n; i++ {
			b := math.Pi * float64(i) / float64(n)
			for _, tc := range []struct {
				name      string
				got, want float64
			}{
				{"uniform", u[i], float64(i) / float64(n)},
				{"cosine", c[i], (1 - math.Cos(b)) / 2},
				{"half-cosine", h[i], 1 - math.Cos(b/2)},
			} {
				if !scalar.EqualWithinAbs(tc.got, tc.want, formulaTol) {
					t.Errorf("%s n=%d i=%d: %v, want %v", tc.name, n, i, tc.got, tc.want)
				}
			}
		}
	}
	// Cosine spacing is symmetric: t[i] + t[n−i] = 1.
	c := Cosine{}.Fractions(33)
	for i := range c {
		if !scalar.EqualWithinAbs(c[i]+c[33-i], 1, formulaTol) {
			t.Errorf("cosine n=33: t[%d] + t[%d] = %v, want 1", i, 33-i, c[i]+c[33-i])
		}
	}
}

func TestStretched(t *testing.T) {
	const n = 400
	base := Cosine{}.Fractions(n)
	// Zero strengths give the base law unchanged.
	for i, v := range (Stretched{}).Fractions(n) {
		if v != base[i] {
			t.Fatalf("Stretched{} t[%d] = %v, want the cosine value %v", i, v, base[i])
		}
	}
	// The end slopes of the warp are exp(−Start) and exp(−End), so the end
	// panels scale by about that much (Gregory and Delbourgo 1982: G′(0) = a,
	// G′(1) = b). The first cosine fraction is 6e-6, well inside the region
	// where G is linear, hence the tight tolerance.
	for _, c := range []float64{-3, -1, 0.5, 2, 3} {
		s := Stretched{Start: c, End: -c}.Fractions(n)
		if got, want := s[1]/base[1], math.Exp(-c); !scalar.EqualWithinRel(got, want, 1e-3) {
			t.Errorf("Start %g: first panel scaled by %v, want about %v", c, got, want)
		}
		if got, want := (1-s[n-1])/(1-base[n-1]), math.Exp(c); !scalar.EqualWithinRel(got, want, 1e-3) {
			t.Errorf("End %g: last panel scaled by %v, want about %v", -c, got, want)
		}
	}
	// Monotone effect: raising Start moves every interior node toward 0;
	// raising End moves every interior node toward 1.
	strengths := []float64{-3, -2, -0.5, 0, 0.5, 2, 3}
	for k := 1; k < len(strengths); k++ {
		lo := Stretched{Base: Uniform{}, Start: strengths[k-1], End: 1}.Fractions(n)
		hi := Stretched{Base: Uniform{}, Start: strengths[k], End: 1}.Fractions(n)
		loE := Stretched{Base: HalfCosine{}, Start: -1, End: strengths[k-1]}.Fractions(n)
		hiE := Stretched{Base: HalfCosine{}, Start: -1, End: strengths[k]}.Fractions(n)
		for i := 1; i < n; i++ {
			if !(hi[i] < lo[i]) {
				t.Fatalf("Start %g → %g: t[%d] %v → %v, want it to decrease", strengths[k-1], strengths[k], i, lo[i], hi[i])
			}
			if !(hiE[i] > loE[i]) {
				t.Fatalf("End %g → %g: t[%d] %v → %v, want it to increase", strengths[k-1], strengths[k], i, loE[i], hiE[i])
			}
		}
	}
}

// curvatureRamp is a path of length ℓ whose curvature grows linearly,
// κ(s) = a·s. Only Length and Curvature matter to the curvature law.
type curvatureRamp struct{ ell, a float64 }

func (r curvatureRamp) Length() float64             { return r.ell }
func (r curvatureRamp) At(s float64) geometry.Point { return geometry.Point{X: s} }
func (r curvatureRamp) Curvature(s float64) float64 { return r.a * s }

func TestCurvatureExact(t *testing.T) {
	// Exact: with constant curvature (a circle) or none (a flat plate) the
	// pure curvature density is constant, so w = 1 gives uniform spacing.
	for _, tc := range []struct {
		name     string
		p        geometry.Path
		from, to float64
	}{
		{"circle", circle{r: 0.3}, 0, circle{r: 0.3}.Length()},
		{"circle backwards", circle{r: 5}, 20, 3},
		{"plate", plate{}, 1, 2},
	} {
		for _, n := range []int{8, 80} {
			got := Curvature{Path: tc.p, From: tc.from, To: tc.to, Weight: 1}.Fractions(n)
			for i, v := range got {
				if want := float64(i) / float64(n); !scalar.EqualWithinAbs(v, want, curvatureTol) {
					t.Errorf("%s n=%d: t[%d] = %v, want %v", tc.name, n, i, v, want)
				}
			}
		}
	}
	// Exact: for κ(s) = a·s on [0, ℓ] and ε = 1/ℓ, K(t) ∝ (ε + aℓt)^(3/2) − ε^(3/2),
	// so t[i] = ((ε^(3/2) + i/n·((ε + aℓ)^(3/2) − ε^(3/2)))^(2/3) − ε) / (aℓ)
	// (calculated by hand).
	for _, r := range []curvatureRamp{{ell: 1, a: 50}, {ell: 3, a: 0.2}} {
		const n = 40
		eps := 1 / r.ell
		al := r.a * r.ell
		e32, top := math.Pow(eps, 1.5), math.Pow(eps+al, 1.5)
		got := Curvature{Path: r, From: 0, To: r.ell, Weight: 1}.Fractions(n)
		for i, v := range got {
			want := (math.Pow(e32+float64(i)/n*(top-e32), 2.0/3) - eps) / al
			if !scalar.EqualWithinAbs(v, want, curvatureTol) {
				t.Errorf("ramp %+v: t[%d] = %v, want %v", r, i, v, want)
			}
		}
	}
	// A blend is the weighted mean of the two cumulative densities: on a
	// circle Φ(t) = (1 − w)·τ(t) + w·t with τ the inverse of the base law,
	// here Uniform, so every blend is uniform again.
	got := Curvature{Path: circle{r: 1}, From: 0, To: 2, Base: Uniform{}, Weight: 0.3}.Fractions(20)
	for i, v := range got {
		if want := float64(i) / 20; !scalar.EqualWithinAbs(v, want, curvatureTol) {
			t.Errorf("uniform base on a circle: t[%d] = %v, want %v", i, v, want)
		}
	}
}

// nanPath reports a NaN curvature.
type nanPath struct{ plate }

func (nanPath) Curvature(float64) float64 { return math.NaN() }

func TestSpacingPanics(t *testing.T) {
	for _, tc := range []struct {
		name string
		fn   func()
	}{
		{"uniform n=0", func() { Uniform{}.Fractions(0) }},
		{"cosine n=-1", func() { Cosine{}.Fractions(-1) }},
		{"half-cosine n=0", func() { HalfCosine{}.Fractions(0) }},
		{"stretched strength 3.5", func() { Stretched{Start: 3.5}.Fractions(4) }},
		{"stretched NaN", func() { Stretched{End: math.NaN()}.Fractions(4) }},
		{"curvature nil path", func() { Curvature{From: 0, To: 1}.Fractions(4) }},
		{"curvature empty range", func() { Curvature{Path: plate{}, From: 1, To: 1}.Fractions(4) }},
		{"curvature beyond path", func() { Curvature{Path: plate{}, From: 1, To: 2.5}.Fractions(4) }},
		{"curvature weight 2", func() { Curvature{Path: plate{}, From: 0, To: 1, Weight: 2}.Fractions(4) }},
		{"curvature NaN", func() { Curvature{Path: nanPath{}, From: 0, To: 1}.Fractions(4) }},
	} {
		if !panics(tc.fn) {
			t.Errorf("%s: no panic", tc.name)
		}
	}
}

func panics(fn func()) (panicked bool) {
	defer func() { panicked = recover() != nil }()
	fn()
	return false
}
