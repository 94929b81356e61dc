package repanel

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/geometry/shape"
)

// The panels of a regular N-gon inscribed in a circle of radius r depart
// from the circle by the sagitta r(1 − cos(π/N)) at their midpoints (exact
// geometry), which the sampling includes.
func TestDeviationCircle(t *testing.T) {
	const tol = 1e-14
	for _, n := range []int{16, 40, 161, 1000} {
		c := circle{r: 2.5}
		ss := make([]float64, n+1)
		for i := range ss {
			ss[i] = c.Length() * float64(i) / float64(n)
		}
		got, _ := Deviation(c, ss)
		want := c.r * (1 - math.Cos(math.Pi/float64(n)))
		if math.Abs(got-want) > tol*c.r {
			t.Errorf("n=%d: deviation %.17g, want %.17g", n, got, want)
		}
	}
	if d, at := PolygonDeviation([]geometry.Point{{X: 1}}, nil); d != 0 || at != -1 {
		t.Errorf("one node: %g at %d, want 0 at -1", d, at)
	}
}

// Count finds the smallest count that meets the tolerance: on the circle
// with uniform spacing, each half of it split into ⌊N/2⌋ or more panels, the
// deviation is r(1 − cos(π/(2⌊N/2⌋))), so the count is the smallest N with
// that at most tol (exact geometry).
func TestCountCircle(t *testing.T) {
	c := circle{r: 1}
	for _, tol := range []float64{1e-3, 1e-4, 3e-5} {
		o := Options{Spacing: LawUniform, Tolerance: tol}
		ss, _, err := Stations(c, c.Length()/2, o)
		if err != nil {
			t.Fatal(err)
		}
		want := AutoMinPanels
		for c.r*(1-math.Cos(math.Pi/float64(2*(want/2)))) > tol {
			want++
		}
		if n := len(ss) - 1; n != want {
			t.Errorf("tol %g: %d panels, want %d", tol, n, want)
		}
	}
}

func TestCountEdges(t *testing.T) {
	inverseSquare := func(n int) (float64, error) { return 1 / float64(n*n), nil }
	for _, tc := range []struct {
		lo, hi int
		tol    float64
		n      int
		met    bool
	}{
		{10, 1000, 1e-4, 100, true},
		{10, 1000, 1.01e-4, 100, true},
		{10, 1000, 0.99e-4, 101, true},
		{200, 1000, 1e-4, 200, true}, // the lower clamp
		{10, 50, 1e-4, 50, false},    // not met at the upper clamp
		{7, 7, 1, 7, true},
	} {
		n, d, met, err := Count(tc.lo, tc.hi, tc.tol, inverseSquare)
		if err != nil || n != tc.n || met != tc.met || d != 1/float64(n*n) {
			t.Errorf("Count(%d, %d, %g) = %d, %g, %v, %v; want %d, met %v", tc.lo, tc.hi, tc.tol, n, d, met, err, tc.n, tc.met)
		}
	}
	for _, bad := range [][3]float64{{0, 10, 1e-4}, {10, 9, 1e-4}, {10, 20, 0}, {10, 20, math.NaN()}, {10, 20, math.Inf(1)}} {
		if _, _, _, err := Count(int(bad[0]), int(bad[1]), bad[2], inverseSquare); !errors.Is(err, ErrOptionRange) {
			t.Errorf("Count%v: %v, want ErrOptionRange", bad, err)
		}
	}
	boom := errors.New("boom")
	if _, _, _, err := Count(10, 20, 1e-4, func(int) (float64, error) { return 0, boom }); !errors.Is(err, boom) {
		t.Errorf("error of dev: %v", err)
	}
	if _, _, err := Stations(circle{r: 1}, 1, Options{Tolerance: -1}); !errors.Is(err, ErrOptionRange) {
		t.Errorf("negative tolerance: %v", err)
	}
}

// On a smooth section the automatic count meets the tolerance, one panel
// fewer does not (the deviation falls monotonically here), and halving the
// panel length quarters the deviation (κh²/8, common practice).
func TestAutoCountNACA(t *testing.T) {
	foil := shape.NACA4{Camber: 0.02, CamberPos: 0.4, Thickness: 0.12, SharpTE: true}
	cv, sle, err := curve.NodeCurve(foil.Nodes(1200))
	if err != nil {
		t.Fatal(err)
	}
	for _, law := range Laws() {
		ss, _, err := Stations(cv, sle, Options{Spacing: law})
		if err != nil {
			t.Fatal(err)
		}
		n := len(ss) - 1
		d, _ := Deviation(cv, ss)
		if d > DefaultTolerance {
			t.Errorf("%s: %d panels deviate by %g, more than %g", law, n, d, DefaultTolerance)
		}
		fewer, _, err := Stations(cv, sle, Options{Spacing: law, Panels: n - 1})
		if err != nil {
			t.Fatal(err)
		}
		if df, _ := Deviation(cv, fewer); n > AutoMinPanels && df <= DefaultTolerance {
			t.Errorf("%s: %d panels chosen, but %d deviate by only %g", law, n, n-1, df)
		}
		t.Logf("%s: %d panels, deviation %.3g", law, n, d)
	}
	d1 := deviationOf(t, cv, sle, 100)
	d2 := deviationOf(t, cv, sle, 200)
	if r := d1 / d2; r < 3.2 || r > 4.8 {
		t.Errorf("deviation ratio 100 → 200 panels %.2f, want about 4", r)
	}
}

func deviationOf(t *testing.T, p geometry.Path, sle float64, n int) float64 {
	t.Helper()
	ss, _, err := Stations(p, sle, Options{Panels: n})
	if err != nil {
		t.Fatal(err)
	}
	d, _ := Deviation(p, ss)
	return d
}

// TestPolygonDeviationRuns checks that measuring many panels in runs on
// two cores gives what one pass over the panels in order gives (the
// reference below, the rule as PolygonDeviation states it): the same
// largest distance and the first panel reaching it, with ties (a sample
// distance repeated across runs) and NaN samples (a pass keeps its first
// sample, NaN or not, and takes later ones only when larger).
func TestPolygonDeviationRuns(t *testing.T) {
	onePass := func(nodes []geometry.Point, at func(int, float64) geometry.Point) (float64, int) {
		dev, panel := 0.0, -1
		for i := 0; i+1 < len(nodes); i++ {
			for k := 1; k < DeviationSamples; k++ {
				d := geometry.SegmentDist(at(i, float64(k)/DeviationSamples), nodes[i], nodes[i+1])
				if d > dev || panel < 0 {
					dev, panel = d, i
				}
			}
		}
		return dev, panel
	}
	rng := rand.New(rand.NewPCG(5, 6))
	for trial := range 200 {
		np := []int{1, 63, 128, 200, 513, 1000}[trial%6]
		nodes := make([]geometry.Point, np+1)
		for i := range nodes {
			nodes[i] = geometry.Point{X: float64(i), Y: 0}
		}
		// Sample heights from a few values, so that the largest repeats.
		h := make([]float64, np*DeviationSamples)
		for j := range h {
			h[j] = float64(rng.IntN(5))
			if trial%5 == 4 && rng.IntN(50) == 0 {
				h[j] = math.NaN()
			}
		}
		if trial%7 == 3 {
			h[rng.IntN(len(h))] = math.NaN()
			h[0] = math.NaN()
		}
		at := func(i int, f float64) geometry.Point {
			k := int(math.Round(f * DeviationSamples))
			return geometry.Point{X: float64(i) + f, Y: h[i*DeviationSamples+k]}
		}
		wd, wp := onePass(nodes, at)
		gd, gp := PolygonDeviation(nodes, at)
		if gp != wp || !(gd == wd || math.IsNaN(gd) && math.IsNaN(wd)) {
			t.Fatalf("trial %d (%d panels): got %v at panel %d, one pass gives %v at panel %d", trial, np, gd, gp, wd, wp)
		}
	}
}
