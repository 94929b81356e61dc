package repanel

import (
	"errors"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"gonum.org/v1/gonum/floats/scalar"
)

// Cosine spacing on a flat plate puts the nodes at the chord stations
// x = (1 − cos β)/2, β evenly spaced in [0, π] on each surface (common
// practice).
func TestDistributeFlatPlateCosine(t *testing.T) {
	const tol = 1e-14
	for _, n := range []int{16, 17, 40, 160, 161, 2000} {
		nodes, err := Distribute(plate{}, 1, Options{Panels: n})
		if err != nil {
			t.Fatal(err)
		}
		if len(nodes) != n+1 {
			t.Fatalf("n=%d: %d nodes, want %d", n, len(nodes), n+1)
		}
		_, le, _ := Stations(plate{}, 1, Options{Panels: n})
		if want := (n + 1) / 2; le != want {
			t.Fatalf("n=%d: leading edge at node %d, want %d", n, le, want)
		}
		for i, p := range nodes {
			// Upper surface: k from le at the TE down to 0 at the LE;
			// lower surface: k from 1 to n − le.
			k, m := le-i, le
			if i > le {
				k, m = i-le, n-le
			}
			want := (1 - math.Cos(math.Pi*float64(k)/float64(m))) / 2
			if !scalar.EqualWithinAbs(p.X, want, tol) || p.Y != 0 {
				t.Errorf("n=%d node %d: (%v, %v), want (%v, 0)", n, i, p.X, p.Y, want)
			}
		}
	}
}

// The laws do not depend on the units of the path: the same section in
// millimetres (chord 1000) gets the same nodes, scaled. The curvature floor
// ε = 1/ℓ scales with the curvature.
func TestDistributeScaleFree(t *testing.T) {
	const tol = 1e-9 // relative to the chord; round-off through the inversion
	p, sle := naca0012()
	pts := make([]geometry.Point, len(p.pts))
	for i, q := range p.pts {
		pts[i] = q.Scale(1000)
	}
	mm := newPolyline(pts)
	for _, law := range Laws() {
		o := Options{Panels: 120, Spacing: law, LECluster: 0.5}
		a, err := Distribute(p, sle, o)
		if err != nil {
			t.Fatal(err)
		}
		b, err := Distribute(mm, mm.cum[2000], o)
		if err != nil {
			t.Fatal(err)
		}
		for i := range a {
			if d := a[i].Dist(b[i].Scale(1e-3)); d > tol {
				t.Errorf("%s: node %d differs by %g chord in millimetres", law, i, d)
			}
		}
	}
}

// checkDistribution fails t unless nodes and stations are a valid
// distribution of n panels along p with the leading edge at sLE.
func checkDistribution(t *testing.T, name string, p geometry.Path, sLE float64, n int, o Options) {
	t.Helper()
	o.Panels = n
	nodes, err := Distribute(p, sLE, o)
	if err != nil {
		t.Fatalf("%s n=%d: %v", name, n, err)
	}
	ss, le, err := Stations(p, sLE, o)
	if err != nil {
		t.Fatalf("%s n=%d: %v", name, n, err)
	}
	if len(nodes) != n+1 || len(ss) != n+1 {
		t.Fatalf("%s n=%d: %d nodes, %d stations, want %d", name, n, len(nodes), len(ss), n+1)
	}
	if nodes[0] != p.At(0) || nodes[n] != p.At(p.Length()) || ss[0] != 0 || ss[n] != p.Length() {
		t.Errorf("%s n=%d: ends %v, %v (s = %v, %v), want %v, %v", name, n, nodes[0], nodes[n], ss[0], ss[n], p.At(0), p.At(p.Length()))
	}
	if ss[le] != sLE || nodes[le] != p.At(sLE) {
		t.Errorf("%s n=%d: node %d at s = %v, want the leading edge at %v", name, n, le, ss[le], sLE)
	}
	atLE := 0
	for i := range ss {
		if ss[i] == sLE {
			atLE++
		}
		if nodes[i] != p.At(ss[i]) {
			t.Fatalf("%s n=%d: node %d = %v, want p.At(%v) = %v", name, n, i, nodes[i], ss[i], p.At(ss[i]))
		}
		if i > 0 && !(ss[i] > ss[i-1]) {
			t.Fatalf("%s n=%d: s[%d] = %v after s[%d] = %v: not strictly increasing", name, n, i, ss[i], i-1, ss[i-1])
		}
	}
	if atLE != 1 {
		t.Errorf("%s n=%d: %d nodes at the leading edge, want 1", name, n, atLE)
	}
	if le < MinSurfacePanels || n-le < MinSurfacePanels {
		t.Errorf("%s n=%d: surfaces get %d and %d panels, want at least %d each", name, n, le, n-le, MinSurfacePanels)
	}
}

func TestDistributeCounts(t *testing.T) {
	p, sle := naca0012()
	for _, o := range []Options{
		{},
		{Spacing: LawHalfCosine},
		{Spacing: LawUniform},
		{Spacing: LawCurvature},
		{Spacing: LawCurvature, CurvatureWeight: 1, LECluster: 1, TECluster: -1},
		{Spacing: LawCosine, LECluster: 3, TECluster: 3},
		{Spacing: LawUniform, LECluster: -3, TECluster: -3},
	} {
		for _, n := range []int{16, 17, 160, 161, 2000} {
			checkDistribution(t, o.Spacing, p, sle, n, o)
		}
	}
	// The default panel count: chosen for DefaultTolerance.
	ss, _, err := Stations(p, sle, Options{})
	if n := len(ss) - 1; err != nil || n < AutoMinPanels || n > AutoMaxPanels {
		t.Errorf("zero Options: %d panels, %v; want %d to %d", n, err, AutoMinPanels, AutoMaxPanels)
	} else if d, _ := Deviation(p, ss); d > DefaultTolerance {
		t.Errorf("zero Options: %d panels deviate by %g, more than %g", n, d, DefaultTolerance)
	}
	// An odd count on a symmetric section: the rounding gives the upper
	// surface the extra panel.
	if _, le, _ := Stations(plate{}, 1, Options{Panels: 17}); le != 9 {
		t.Errorf("plate, 17 panels: leading edge at node %d, want 9", le)
	}
}

// The panel count is split in proportion to the surface arc lengths; on a
// circle with the "leading edge" a quarter of the way round, 40 panels split
// 10 + 30, and at 1/40 of the way round the upper surface still gets 8.
func TestDistributeSplit(t *testing.T) {
	c := circle{r: 1}
	for _, tc := range []struct {
		sLE    float64
		n, wLE int
	}{
		{c.Length() / 4, 40, 10},
		{c.Length() / 40, 40, MinSurfacePanels},
		{c.Length() * 39 / 40, 40, 40 - MinSurfacePanels},
		{c.Length() / 2, 2000, 1000},
	} {
		_, le, err := Stations(c, tc.sLE, Options{Panels: tc.n, Spacing: LawUniform})
		if err != nil || le != tc.wLE {
			t.Errorf("sLE = %v, n = %d: leading edge at node %d (%v), want %d", tc.sLE, tc.n, le, err, tc.wLE)
		}
		checkDistribution(t, "circle", c, tc.sLE, tc.n, Options{Spacing: LawCurvature})
	}
}

func TestDistributeErrors(t *testing.T) {
	for _, tc := range []struct {
		name string
		p    geometry.Path
		sLE  float64
		o    Options
		want error
	}{
		{"15 panels", plate{}, 1, Options{Panels: 15}, ErrPanelCount},
		{"2001 panels", plate{}, 1, Options{Panels: 2001}, ErrPanelCount},
		{"negative panels", plate{}, 1, Options{Panels: -160}, ErrPanelCount},
		{"unknown law", plate{}, 1, Options{Spacing: "Cosine"}, ErrUnknownSpacing},
		{"LE cluster 3.5", plate{}, 1, Options{LECluster: 3.5}, ErrOptionRange},
		{"TE cluster -4", plate{}, 1, Options{TECluster: -4}, ErrOptionRange},
		{"cluster NaN", plate{}, 1, Options{LECluster: math.NaN()}, ErrOptionRange},
		{"weight 1.5", plate{}, 1, Options{Spacing: LawCurvature, CurvatureWeight: 1.5}, ErrOptionRange},
		{"weight -0.1", plate{}, 1, Options{Spacing: LawCurvature, CurvatureWeight: -0.1}, ErrOptionRange},
		{"nil path", nil, 1, Options{}, ErrPath},
		{"LE at start", plate{}, 0, Options{}, ErrPath},
		{"LE at end", plate{}, 2, Options{}, ErrPath},
		{"LE NaN", plate{}, math.NaN(), Options{}, ErrPath},
		{"zero length", circle{r: 0}, 0, Options{}, ErrPath},
		{"NaN curvature", nanPath{}, 1, Options{Spacing: LawCurvature}, ErrPath},
		{"curvature spike at weight 1", spikePath{}, 1, Options{Spacing: LawCurvature, CurvatureWeight: 1}, ErrPath},
		{"NaN point", nanPoint{}, 1, Options{}, ErrPath},
		{"tiny upper surface", plate{}, 5e-324, Options{}, ErrPath},
	} {
		nodes, err := Distribute(tc.p, tc.sLE, tc.o)
		if !errors.Is(err, tc.want) || nodes != nil {
			t.Errorf("%s: %d nodes, error %v; want %v", tc.name, len(nodes), err, tc.want)
		}
	}
}

// spikePath is a flat plate whose curvature peaks at 1e80 over the first
// tenth of the lower surface.
type spikePath struct{ plate }

func (spikePath) Curvature(s float64) float64 {
	if s > 1 && s < 1.1 {
		return 1e80
	}
	return 0
}

// nanPoint is a flat plate whose points are NaN past the leading edge.
type nanPoint struct{ plate }

func (nanPoint) At(s float64) geometry.Point {
	if s > 1 {
		return geometry.Point{X: math.NaN()}
	}
	return plate{}.At(s)
}

// Raising LECluster shrinks the leading-edge panels and raising TECluster
// the trailing-edge ones, monotonically; the end panels scale by about
// exp(−strength) (see Stretched).
func TestDistributeClusterEffect(t *testing.T) {
	const n = 160
	prevLE, prevTE := math.Inf(1), math.Inf(1)
	for _, c := range []float64{-3, -1, 0, 1, 3} {
		le, err := Distribute(plate{}, 1, Options{Panels: n, LECluster: c})
		if err != nil {
			t.Fatal(err)
		}
		te, err := Distribute(plate{}, 1, Options{Panels: n, TECluster: c})
		if err != nil {
			t.Fatal(err)
		}
		lePanel := le[n/2].Dist(le[n/2+1])
		tePanel := te[0].Dist(te[1])
		if !(lePanel < prevLE) || !(tePanel < prevTE) {
			t.Errorf("strength %g: LE panel %v (before %v), TE panel %v (before %v): want both to shrink", c, lePanel, prevLE, tePanel, prevTE)
		}
		prevLE, prevTE = lePanel, tePanel
		// Cosine end panel on a surface of 80 panels and unit length.
		plain := (1 - math.Cos(math.Pi/80)) / 2
		if got, want := lePanel/plain, math.Exp(-c); !scalar.EqualWithinRel(got, want, 1e-2) {
			t.Errorf("LE strength %g: LE panel scaled by %v, want about %v", c, got, want)
		}
	}
}

// The curvature law moves nodes from the flat trailing-edge region to the
// nose of a NACA 0012 (NACA Report 824 equations, closed trailing edge):
// for the same count it puts more nodes ahead of x = 0.05 and fewer behind
// x = 0.9 than cosine spacing, and the surface turns less between panels.
// The counts were measured (cosine 25 and 34, curvature 29 and 24 at 160
// panels); the test asks only for the direction.
func TestCurvatureNose(t *testing.T) {
	p, sle := naca0012()
	count := func(nodes []geometry.Point, in func(x float64) bool) int {
		k := 0
		for _, q := range nodes {
			if in(q.X) {
				k++
			}
		}
		return k
	}
	nose := func(x float64) bool { return x < 0.05 }
	tail := func(x float64) bool { return x > 0.9 }
	for _, n := range []int{80, 160, 2000} {
		cos, err := Distribute(p, sle, Options{Panels: n})
		if err != nil {
			t.Fatal(err)
		}
		for _, w := range []float64{0.5, 1} {
			cur, err := Distribute(p, sle, Options{Panels: n, Spacing: LawCurvature, CurvatureWeight: w})
			if err != nil {
				t.Fatal(err)
			}
			if cn, kn := count(cos, nose), count(cur, nose); !(kn > cn) {
				t.Errorf("n=%d w=%g: %d nodes ahead of x = 0.05, cosine %d; want more", n, w, kn, cn)
			}
			if ct, kt := count(cos, tail), count(cur, tail); !(kt < ct) {
				t.Errorf("n=%d w=%g: %d nodes behind x = 0.9, cosine %d; want fewer", n, w, kt, ct)
			}
			if qc, qk := Measure(cos), Measure(cur); !(qk.MaxTurnDeg < qc.MaxTurnDeg) {
				t.Errorf("n=%d w=%g: max turn %.2f°, cosine %.2f°; want less", n, w, qk.MaxTurnDeg, qc.MaxTurnDeg)
			}
		}
	}
}
