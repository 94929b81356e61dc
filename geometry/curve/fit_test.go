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
	if rep.Method != FitGCV || !(rep.Lambda > 0) {
		t.Errorf("method %q λ %g, want gcv, λ > 0", rep.Method, rep.Lambda)
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
