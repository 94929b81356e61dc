package geometry

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// fitTestPart describes how a test contour is placed in the part frame.
type fitTestPart struct {
	chord  float64 // input units
	rotDeg float64 // counter-clockwise rotation of the section (nose-down twist)
	shift  Point
	noise  float64 // standard deviation of Gaussian noise on each coordinate
	seed   uint64
	flipX  bool // mirror x before placing (nose pointing the other way)
	flipY  bool // mirror y before placing (measured upside down)
}

// toPart maps a chord-frame point into the part frame.
func (f fitTestPart) toPart(p Point) Point {
	if f.flipX {
		p.X = -p.X
	}
	if f.flipY {
		p.Y = -p.Y
	}
	return p.Scale(f.chord).Rotate(f.rotDeg * math.Pi / 180).Add(f.shift)
}

// fitTestStation returns half-cosine chord stations x = 1 − cos(πi/2n),
// clustered at the leading edge only, so that the spacing at the trailing
// edge stays well above the noise (common practice for measured sections).
func fitTestStation(i, n int) float64 {
	return math.Min(1, 1-math.Cos(math.Pi/2*float64(i)/float64(n)))
}

// fitTestLoop returns a NACA 4-digit loop (NACA Report 824 equations) in the
// package node order. For the closed-edge variant the repeated trailing-edge
// point is left out.
func fitTestLoop(n NACA4, perSurface int) []Point {
	var pts []Point
	for i := perSurface; i >= 1; i-- {
		pts = append(pts, n.Upper(fitTestStation(i, perSurface)))
	}
	pts = append(pts, Point{})
	for i := 1; i <= perSurface; i++ {
		pts = append(pts, n.Lower(fitTestStation(i, perSurface)))
	}
	if n.SharpTE {
		pts = pts[:len(pts)-1]
	}
	return pts
}

// fitTestContour places loop in the part frame with noise (fixed seed) and
// origins test.csv:2, 3, ….
func fitTestContour(loop []Point, f fitTestPart) *Contour {
	rng := rand.New(rand.NewPCG(f.seed, 7))
	pts := make([]Point, len(loop))
	for i, p := range loop {
		pts[i] = f.toPart(p).Add(Point{rng.NormFloat64() * f.noise, rng.NormFloat64() * f.noise})
	}
	if f.flipX != f.flipY {
		// A mirror reverses the loop; restore counter-clockwise order with
		// the trailing edge first.
		for i, j := 1, len(pts)-1; i < j; i, j = i+1, j-1 {
			pts[i], pts[j] = pts[j], pts[i]
		}
	}
	c := &Contour{Units: Millimetre}
	for i, p := range pts {
		c.Points = append(c.Points, p)
		c.Origins = append(c.Origins, Origin{File: "test.csv", Line: i + 2})
	}
	return c
}

// fitTestDense returns the analytic outline (NACA Report 824 equations) as
// a dense polyline in the NACA frame, upper trailing edge to lower.
func fitTestDense(n NACA4) []Point {
	const m = 6000
	var pts []Point
	for i := m; i >= 1; i-- {
		pts = append(pts, n.Upper(cosineStation(i, m)))
	}
	pts = append(pts, Point{})
	for i := 1; i <= m; i++ {
		pts = append(pts, n.Lower(cosineStation(i, m)))
	}
	return pts
}

// fitTestMaxDist returns the largest distance from the points qs (in order
// along the outline) to the polyline poly, searching a moving window.
func fitTestMaxDist(qs, poly []Point) float64 {
	segDist := func(p Point, k int) float64 {
		a, b := poly[k], poly[k+1]
		d := b.Sub(a)
		t := math.Max(0, math.Min(1, p.Sub(a).Dot(d)/d.Dot(d)))
		return p.Dist(a.Add(d.Scale(t)))
	}
	var worst float64
	at := 0 // both start at the upper trailing edge
	for _, q := range qs {
		lo, hi := max(0, at-400), min(len(poly)-1, at+400)
		best := math.Inf(1)
		for k := lo; k < hi; k++ {
			if d := segDist(q, k); d < best {
				best, at = d, k
			}
		}
		worst = math.Max(worst, best)
	}
	return worst
}

// fitTestFarthest returns the point of poly farthest from p.
func fitTestFarthest(poly []Point, p Point) Point {
	var best Point
	bd := -1.0
	for _, q := range poly {
		if d := q.Dist(p); d > bd {
			best, bd = q, d
		}
	}
	return best
}

func TestFitNoiseMatchesRMS(t *testing.T) {
	// With the noise given, λ minimises the unbiased risk estimate (Craven
	// and Wahba 1979): the noise the residuals imply, RMS·√(n/(n − tr H)),
	// comes back within 10 % of the noise put in, and the residual RMS lies
	// between 0.6σ and σ. The deviation from the analytic contour (NACA
	// Report 824 equations) must stay well below 0.001 chord.
	const noiseTol = 0.10 // relative; tolerance from a few seeds, rounded up
	for _, code := range []string{"0012", "2412"} {
		n, _ := ParseNACA4(code)
		part := fitTestPart{chord: 152.4, rotDeg: 7, shift: Point{37, -12}, noise: 0.02, seed: 42}
		c := fitTestContour(fitTestLoop(n, 150), part)
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
		dense := fitTestDense(n)
		for i := range dense {
			dense[i] = part.toPart(dense[i])
		}
		if d := fitTestMaxDist(cv.Samples(3000), dense); d > 0.001*152.4/2 {
			t.Errorf("%s: curve departs %.4f mm from the analytic contour", code, d)
		}
	}
}

func TestFitGCV(t *testing.T) {
	// Generalised cross-validation should find about the noise level: the
	// residual RMS of a good fit is σ·√(1 − tr H/n) (Green and Silverman 1994,
	// ch. 3), between 0.5σ and σ here, and the curve stays close to the
	// analytic contour (NACA Report 824 equations).
	n, _ := ParseNACA4("2412")
	part := fitTestPart{chord: 152.4, rotDeg: 7, shift: Point{37, -12}, noise: 0.02, seed: 3}
	c := fitTestContour(fitTestLoop(n, 150), part)
	cv, rep, err := Fit(c, FitOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if rep.Method != FitGCV || !(rep.Lambda > 0) {
		t.Errorf("method %q λ %g, want gcv, λ > 0", rep.Method, rep.Lambda)
	}
	if rep.RMS < 0.01 || rep.RMS > 0.02 {
		t.Errorf("GCV residual RMS %.4f, want within [0.5σ, σ] for σ = 0.02", rep.RMS)
	}
	dense := fitTestDense(n)
	for i := range dense {
		dense[i] = part.toPart(dense[i])
	}
	if d := fitTestMaxDist(cv.Samples(3000), dense); d > 0.001*152.4/2 {
		t.Errorf("curve departs %.4f mm from the analytic contour", d)
	}
}

func TestFitExactAndSharp(t *testing.T) {
	// Noise 0 interpolates: every residual vanishes (exact by construction).
	// The closed-edge variant of NACA Report 824 is fitted open at its
	// corner, with both curve ends at the trailing-edge point.
	n := NACA4{Thickness: 0.12, SharpTE: true}
	c := fitTestContour(fitTestLoop(n, 80), fitTestPart{chord: 100, rotDeg: -3, shift: Point{5, 5}})
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
	n, _ := ParseNACA4("0012")
	c := fitTestContour(fitTestLoop(n, 150), fitTestPart{chord: 152.4, noise: 0.02, seed: 5})
	for _, i := range []int{60, 220} {
		c.Points[i] = c.Points[i].Add(Point{0, 0.5 * math.Copysign(1, c.Points[i].Y)})
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
	line := &Contour{}
	for i := range 10 {
		line.Points = append(line.Points, Point{float64(i), 2 * float64(i)})
	}
	nan := fitTestContour(fitTestLoop(NACA4{Thickness: 0.12}, 10), fitTestPart{chord: 1})
	nan.Points[3].X = math.NaN()
	for _, tc := range []struct {
		name string
		c    *Contour
		want error
	}{
		{"few", &Contour{Points: []Point{{0, 0}, {1, 0}, {0, 1}}}, ErrTooFewPoints},
		{"collinear", line, ErrCollinear},
		{"nan", nan, ErrNonFinite},
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
	n, _ := ParseNACA4("2412")
	for _, size := range []int{1000, 10000, 100000} {
		c := fitTestContour(fitTestLoop(n, size/2), fitTestPart{chord: 152.4, rotDeg: 7, noise: 0.002, seed: 1})
		b.Run(fmt.Sprintf("n=1e%d", int(math.Log10(float64(size)))), func(b *testing.B) {
			for b.Loop() {
				if _, _, err := Fit(c, FitOptions{Noise: 0.002}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}
