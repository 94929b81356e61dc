package curve

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/shape"
	"github.com/foilwright/foilwright/internal/testfoil"
)

func TestFitNoiseMatchesRMS(t *testing.T) {
	// With the noise given, λ minimises the unbiased risk estimate (Craven
	// and Wahba 1979): the noise the residuals imply, RMS·√(n/(n − tr H)),
	// comes back within 10 % of the noise put in, and the residual RMS lies
	// between 0.6σ and σ. The deviation from the analytic contour (NACA
	// Report 824 equations) must stay well below 0.001 chord.
	const noiseTol = 0.10 // relative; tolerance from a few seeds, rounded up
	for _, code := range []string{"0012", "2412"} {
		n, _ := shape.ParseNACA4(code)
		part := testfoil.Part{Chord: 152.4, RotDeg: 7, Shift: geometry.Point{X: 37, Y: -12}, Noise: 0.02, Seed: 42}
		c := testfoil.Contour(testfoil.Loop(n, 150), part)
		cv, rep, err := Fit(c, FitOptions{Noise: 0.02})
		if err != nil {
			t.Fatal(err)
		}
		if rep.Method != FitNoise || rep.Ends != FitEndsOpen {
			t.Errorf("%s: method %q ends %q, want noise, open (blunt edge)", code, rep.Method, rep.Ends)
		}
		if math.Abs(rep.NoiseEstimate-0.02)/0.02 > noiseTol {
			t.Errorf("%s: noise estimate %.5f, want 0.02 within %.0f%%", code, rep.NoiseEstimate, 100*noiseTol)
		}
		if rep.RMS < 0.6*0.02 || rep.RMS > 0.02 {
			t.Errorf("%s: RMS residual %.5f, want within [0.6σ, σ] for σ = 0.02", code, rep.RMS)
		}
		if len(rep.S) != c.Len() || len(rep.Residual) != c.Len() {
			t.Fatalf("%s: %d/%d residuals for %d points", code, len(rep.S), len(rep.Residual), c.Len())
		}
		// Every residual is the signed distance to the curve at S.
		for i := range c.Points {
			if d := c.Points[i].Dist(cv.At(rep.S[i])); math.Abs(d-math.Abs(rep.Residual[i])) > 1e-9 {
				t.Fatalf("%s: point %d: |residual| %g but distance to curve at S %g", code, i, rep.Residual[i], d)
			}
		}
		dense := testfoil.Dense(n)
		for i := range dense {
			dense[i] = part.ToPart(dense[i])
		}
		if d := testfoil.MaxDist(cv.Samples(3000), dense); d > 0.001*152.4/2 {
			t.Errorf("%s: curve departs %.4f mm from the analytic contour", code, d)
		}
	}
}

func TestFitGCV(t *testing.T) {
	// Generalised cross-validation should find about the noise level: the
	// residual RMS of a good fit is σ·√(1 − tr H/n) (Green and Silverman 1994,
	// ch. 3), between 0.5σ and σ here, and the curve stays close to the
	// analytic contour (NACA Report 824 equations).
	n, _ := shape.ParseNACA4("2412")
	part := testfoil.Part{Chord: 152.4, RotDeg: 7, Shift: geometry.Point{X: 37, Y: -12}, Noise: 0.02, Seed: 3}
	c := testfoil.Contour(testfoil.Loop(n, 150), part)
	cv, rep, err := Fit(c, FitOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Method != FitAuto || !(rep.Lambda > 0) {
		t.Errorf("method %q λ %g, want auto, λ > 0", rep.Method, rep.Lambda)
	}
	if rep.RMS < 0.01 || rep.RMS > 0.02 {
		t.Errorf("GCV residual RMS %.4f, want within [0.5σ, σ] for σ = 0.02", rep.RMS)
	}
	dense := testfoil.Dense(n)
	for i := range dense {
		dense[i] = part.ToPart(dense[i])
	}
	if d := testfoil.MaxDist(cv.Samples(3000), dense); d > 0.001*152.4/2 {
		t.Errorf("curve departs %.4f mm from the analytic contour", d)
	}
}

func TestFitExactAndSharp(t *testing.T) {
	// Noise 0 interpolates: every residual vanishes (exact by construction).
	// The closed-edge variant of NACA Report 824 is fitted open at its
	// corner, with both curve ends at the trailing-edge point.
	n := shape.NACA4{Thickness: 0.12, SharpTE: true}
	c := testfoil.Contour(testfoil.Loop(n, 80), testfoil.Part{Chord: 100, RotDeg: -3, Shift: geometry.Point{X: 5, Y: 5}})
	cv, rep, err := Fit(c, FitOptions{Exact: true})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Method != FitInterpolate || rep.Lambda != 0 || rep.Ends != FitEndsOpen {
		t.Errorf("method %q λ %g ends %q", rep.Method, rep.Lambda, rep.Ends)
	}
	if rep.Max > 1e-9 {
		t.Errorf("interpolation residual %g at %s, want 0", rep.Max, rep.MaxAt)
	}
	te := c.Points[0]
	if cv.Start().Dist(te) > 1e-9 || cv.End().Dist(te) > 1e-9 {
		t.Errorf("curve ends %v %v, want both at the trailing edge %v", cv.Start(), cv.End(), te)
	}
}

func TestFitListsOutliers(t *testing.T) {
	// Two probe slips of 0.5 mm are listed beyond the tolerance and not
	// moved: their residuals stay near 0.5 mm.
	n, _ := shape.ParseNACA4("0012")
	c := testfoil.Contour(testfoil.Loop(n, 150), testfoil.Part{Chord: 152.4, Noise: 0.02, Seed: 5})
	for _, i := range []int{60, 220} {
		c.Points[i] = c.Points[i].Add(geometry.Point{X: 0, Y: 0.5 * math.Copysign(1, c.Points[i].Y)})
	}
	_, rep, err := Fit(c, FitOptions{Noise: 0.02, Tolerance: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	if len(rep.Beyond) != 2 || rep.Beyond[0].Line != 62 || rep.Beyond[1].Line != 222 {
		t.Fatalf("beyond = %v, want test.csv:62 and test.csv:222 (residuals %.3f %.3f, rms %.4f, lambda %g, tol %g)", rep.Beyond, rep.Residual[60], rep.Residual[220], rep.RMS, rep.Lambda, rep.Tolerance)
	}
	for _, i := range []int{60, 220} {
		if r := rep.Residual[i]; r < 0.3 || r > 0.55 {
			t.Errorf("point %d residual %.3f, want about +0.5 (outside)", i, r)
		}
	}
}

func TestFitErrors(t *testing.T) {
	line := &geometry.Contour{}
	for i := range 10 {
		line.Points = append(line.Points, geometry.Point{X: float64(i), Y: 2 * float64(i)})
	}
	nan := testfoil.Contour(testfoil.Loop(shape.NACA4{Thickness: 0.12}, 10), testfoil.Part{Chord: 1})
	nan.Points[3].X = math.NaN()
	for _, tc := range []struct {
		name string
		c    *geometry.Contour
		want error
	}{
		{"few", &geometry.Contour{Points: []geometry.Point{{X: 0, Y: 0}, {X: 1, Y: 0}, {X: 0, Y: 1}}}, geometry.ErrTooFewPoints},
		{"collinear", line, geometry.ErrCollinear},
		{"nan", nan, geometry.ErrNonFinite},
	} {
		if _, _, err := Fit(tc.c, FitOptions{}); !errors.Is(err, tc.want) {
			t.Errorf("%s: err = %v, want %v", tc.name, err, tc.want)
		}
	}
	var o FitOptions
	for _, tc := range []struct {
		in    string
		noise float64
		exact bool
		bad   bool
	}{{"auto", 0, false, false}, {"0", 0, true, false}, {"0.02", 0.02, false, false}, {"-1", 0, false, true}, {"x", 0, false, true}} {
		err := o.SetNoise(tc.in)
		if (err != nil) != tc.bad || (!tc.bad && (o.Noise != tc.noise || o.Exact != tc.exact)) {
			t.Errorf("SetNoise(%q) = %+v, %v", tc.in, o, err)
		}
	}
}

func BenchmarkFit(b *testing.B) {
	n, _ := shape.ParseNACA4("2412")
	for _, size := range []int{1000, 10000, 100000} {
		c := testfoil.Contour(testfoil.Loop(n, size/2), testfoil.Part{Chord: 152.4, RotDeg: 7, Noise: 0.002, Seed: 1})
		b.Run(fmt.Sprintf("n=1e%d", int(math.Log10(float64(size)))), func(b *testing.B) {
			for b.Loop() {
				if _, _, err := Fit(c, FitOptions{Noise: 0.002}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func TestSamplingTest(t *testing.T) {
	// Exact samples of a smooth outline (NACA Report 824 equations) are
	// told from noisy ones: the interpolation error grows as the fourth
	// power of the spacing (de Boor, A Practical Guide to Splines, ch. V),
	// noise does not. Noise shared by neighbouring points (a cut mesh)
	// must not pass for exactness.
	n, _ := shape.ParseNACA4("2412")
	cosine := func(per int) []geometry.Point {
		var pts []geometry.Point
		for i := per; i >= 1; i-- {
			pts = append(pts, n.Upper(shape.CosineStation(i, per)))
		}
		pts = append(pts, geometry.Point{})
		for i := 1; i <= per; i++ {
			pts = append(pts, n.Lower(shape.CosineStation(i, per)))
		}
		return pts
	}
	for _, tc := range []struct {
		name  string
		c     *geometry.Contour
		exact bool
	}{
		{"CAD polyline, 41 points", testfoil.Contour(cosine(20), testfoil.Part{Chord: 100}), true},
		{"CAD polyline, 81 points", testfoil.Contour(cosine(40), testfoil.Part{Chord: 100, RotDeg: 12}), true},
		{"CMM, 151 points, 0.002 mm", testfoil.Contour(testfoil.Loop(n, 75), testfoil.Part{Chord: 100, Noise: 0.002, Seed: 4}), false},
		{"scan, 1501 points, 0.02 mm", testfoil.Contour(testfoil.Loop(n, 750), testfoil.Part{Chord: 150, Noise: 0.02, Seed: 4}), false},
		{"cut mesh near a ring", testfoil.CutAt(testfoil.Loop(n, 90), 0.04, 3, 0.98), false},
		{"cut mesh between rings", testfoil.CutAt(testfoil.Loop(n, 90), 0.04, 3, 0.37), false},
	} {
		m := tc.c.Len()
		ts, xs, ys := make([]float64, m), make([]float64, m), make([]float64, m)
		for i, p := range tc.c.Points {
			xs[i], ys[i] = p.X, p.Y
			if i > 0 {
				ts[i] = ts[i-1] + p.Dist(tc.c.Points[i-1])
			}
		}
		period := ts[m-1] + tc.c.Points[m-1].Dist(tc.c.Points[0])
		s := sampleTest(ts, xs, ys, true, period, period)
		if s.Exact != tc.exact {
			t.Errorf("%s: exact %v (ratios %.3g, %.3g), want %v", tc.name, s.Exact, s.Ratio, s.Ratio8, tc.exact)
		}
	}
}

func TestFitFairOnCutMesh(t *testing.T) {
	// A plane's cut through a noisy mesh close to a ring of vertices:
	// neighbouring points share a vertex's noise (0.04 mm), which a risk
	// estimate that takes the points as independent reads as shape. The
	// curve must keep no noise-made wiggles along the surfaces (none in
	// the fairness measure), stay within 0.06 mm of the exact blade (NACA
	// Report 824 equations with a rounded end), and the noise estimate
	// must come out near the vertices' 0.04 mm (measured 0.03–0.04 over
	// the seeds; the points between vertices carry less). The curve stays
	// within 2σ of the blade (worst over the seeds 0.060 mm, tolerance
	// rounded up).
	bl := testfoil.DefaultBlade()
	exact := bl.Loop(2000, 200)
	for _, seed := range []uint64{1, 2, 3} {
		c := testfoil.CutAt(bl.Loop(90, 8), 0.04, seed, 0.97)
		cv, rep, err := Fit(c, FitOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if rep.Method != FitAuto || rep.Fairness.Wiggles != 0 {
			t.Errorf("seed %d: method %s, fairness %+v", seed, rep.Method, rep.Fairness)
		}
		if rep.NoiseEstimate < 0.025 || rep.NoiseEstimate > 0.05 {
			t.Errorf("seed %d: noise estimate %.4f mm, want about 0.04", seed, rep.NoiseEstimate)
		}
		if d := testfoil.MaxDist(cv.Samples(4000), exact); d > 0.08 {
			t.Errorf("seed %d: curve departs %.4f mm from the exact blade", seed, d)
		}
	}
}

func TestFitDenseBinned(t *testing.T) {
	// 20000 noisy points (0.01 mm on a 152.4 mm chord) are fitted through
	// bins; the curve stays within 0.01 mm of the analytic contour (NACA
	// Report 824 equations) but at its two ends, which are pinned to the
	// last point either side of the open trailing edge and so carry that
	// point's noise (within 4σ); every point gets its residual, and the
	// noise estimate comes back within 10 %.
	n, _ := shape.ParseNACA4("2412")
	part := testfoil.Part{Chord: 152.4, RotDeg: 7, Shift: geometry.Point{X: 37, Y: -12}, Noise: 0.01, Seed: 8}
	c := testfoil.Contour(testfoil.Loop(n, 10000), part)
	cv, rep, err := Fit(c, FitOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if len(rep.Residual) != c.Len() {
		t.Fatalf("%d residuals for %d points", len(rep.Residual), c.Len())
	}
	// Noise 0.01 on each coordinate is 0.01 normal to the outline.
	if math.Abs(rep.NoiseEstimate-0.01) > 0.001 {
		t.Errorf("noise estimate %.5f, want 0.01 within 10%%", rep.NoiseEstimate)
	}
	dense := testfoil.Dense(n)
	for i := range dense {
		dense[i] = part.ToPart(dense[i])
	}
	L := cv.Length()
	if d := testfoil.MaxDist(cv.Sub(0.005*L, 0.995*L).Samples(6000), dense); d > 0.01 {
		t.Errorf("curve departs %.4f mm from the analytic contour", d)
	}
	if d := testfoil.MaxDist(cv.Samples(6000), dense); d > 0.04 {
		t.Errorf("curve ends depart %.4f mm from the analytic contour", d)
	}
}

func TestFitExactPolyline(t *testing.T) {
	// Noise-free CAD polylines of NACA 4-digit sections (NACA Report 824
	// equations, sharp edge), 20 and 40 cosine stations a surface, with
	// the default options: the points are found exact and interpolated in
	// the uniform parameter (the curve is smooth in the cosine law's
	// angle), which follows the analytic outline within 1e-4 chord at 41
	// points and 1e-5 at 81 (chord length: 2e-4 and 1e-5, measured).
	for _, tc := range []struct {
		code string
		per  int
		tol  float64
	}{{"0012", 20, 1e-4}, {"2412", 20, 1e-4}, {"0012", 40, 1e-5}, {"4415", 40, 1e-5}} {
		n, _ := shape.ParseNACA4(tc.code)
		n.SharpTE = true
		var loop []geometry.Point
		for i := tc.per; i >= 1; i-- {
			loop = append(loop, n.Upper(shape.CosineStation(i, tc.per)))
		}
		loop = append(loop, geometry.Point{})
		for i := 1; i < tc.per; i++ {
			loop = append(loop, n.Lower(shape.CosineStation(i, tc.per)))
		}
		part := testfoil.Part{Chord: 1, RotDeg: 5, Shift: geometry.Point{X: 0.3, Y: -0.1}}
		c := testfoil.Contour(loop, part)
		cv, rep, err := Fit(c, FitOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if rep.Method != FitInterpolate || rep.Interpolates == "" || rep.Parameter != "uniform" || rep.Max > 1e-12 {
			t.Errorf("%s/%d: method %s (%q), parameter %q, max residual %g", tc.code, tc.per, rep.Method, rep.Interpolates, rep.Parameter, rep.Max)
		}
		dense := testfoil.Dense(n)
		for i := range dense {
			dense[i] = part.ToPart(dense[i])
		}
		if d := testfoil.MaxDist(cv.Samples(4000), dense); d > tc.tol {
			t.Errorf("%s/%d: curve departs %.2e chord from the analytic outline, want ≤ %.0e", tc.code, tc.per, d, tc.tol)
		}
	}
}
