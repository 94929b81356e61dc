package campaign

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/internal/scangen"
)

// naca0012OpenEnd returns the half-thickness and the slope of the upper
// surface at the open edge of NACA 0012 (NACA Report 824: y_t = 5t(0.2969
// √x − 0.1260 x − 0.3516 x² + 0.2843 x³ − 0.1015 x⁴), at x = 1), exact.
func naca0012OpenEnd() (half, slope float64) {
	const t = 0.12
	half = 5 * t * (0.2969 - 0.1260 - 0.3516 + 0.2843 - 0.1015)
	slope = 5 * t * (0.2969/2 - 0.1260 - 2*0.3516 + 3*0.2843 - 4*0.1015)
	return half, slope
}

// evenLines puts good points every h of arc along both surfaces of sec,
// the first h/2 from each end corner, over the last 0.1 c, and the given
// loop parameters on the end piece.
func evenLines(sec *scangen.Section, h float64, ends ...float64) []scangen.Line {
	sh := sec.Shape
	sLo := sh.ArcAt(2)
	var ls []scangen.Line
	for d := h / 2; d < 0.1; d += h {
		ls = append(ls, scangen.Line{Kind: scangen.LineGood, T: sh.ParamAt(d)}, scangen.Line{Kind: scangen.LineGood, T: sh.ParamAt(sLo - d)})
	}
	for _, e := range ends {
		ls = append(ls, scangen.Line{Kind: scangen.LineGood, T: e})
	}
	return ls
}

// The stop 26 judgement's λ against a sharp rival is, for a blunt base
// with one point at its middle, that point's squared distance in scatters
// from the end tangent, the surface points lying on the rival: exact from
// Report 824's half-thickness h and slope m at the edge, h/√(1 + m²).
// At twice the noise, λ is a quarter (a sum of squares in scatters).
func TestTEJudgeBasePointLambda(t *testing.T) {
	open, _, _ := naca0012Ends(t, 0.005)
	half, slope := naca0012OpenEnd()
	d := half / math.Sqrt(1+slope*slope)
	for _, noise := range []float64{1e-4, 2e-4, 5e-4} {
		tr := &scangen.Truth{Section: open, TEKind: open.TEKind, TEThickness: 2 * half, Noise: noise, Lines: evenLines(open, 0.004, 2.5)}
		v := teJudge(tr)
		want := sq(d / noise)
		if !v.OK || math.Abs(v.Each[0]/want-1) > 0.01 {
			t.Errorf("noise %g: λ against sharp %.6g, want %.6g (ok %v)", noise, v.Each[0], want, v.OK)
		}
	}
}

// Where no point lies on the base, the gap round the end weighs the
// rivals: against the sharp corner, λ is the difference of −2 ln f(g) of
// the log-normal gap law between the rival's end gap and the truth's,
// exact from Report 824's edge (the tangents meet a = h√(1 + m²)/|m|
// beyond each corner) and the even spacing (σ at its floor). A rounded
// end no point lies on can leave the same gap as the base: the points do
// not tell the two apart, and the judgement says so.
func TestTEJudgeGapLambda(t *testing.T) {
	open, _, _ := naca0012Ends(t, 0.005)
	half, slope := naca0012OpenEnd()
	const h, noise = 0.004, 2e-4
	tr := &scangen.Truth{Section: open, TEKind: open.TEKind, TEThickness: 2 * half, Noise: noise, Lines: evenLines(open, h)}
	v := teJudge(tr)
	a := half * math.Sqrt(1+slope*slope) / math.Abs(slope)
	gt, gs := h+2*half, h+2*a
	sigma := teGapSigma
	mu := math.Log(h) - sigma*sigma/2
	dev := func(g float64) float64 { return 2*math.Log(g) + sq(math.Log(g)-mu)/(sigma*sigma) }
	want := dev(gs) - dev(gt)
	if !v.OK || math.Abs(v.Each[0]/want-1) > 0.01 {
		t.Errorf("λ against sharp %.6g, want %.6g", v.Each[0], want)
	}
	if v.Decided || v.Rival != scangen.TERounded || v.Each[2] > 1 {
		t.Errorf("decided %v, rival %q, λ against rounded %.4g; want undecided by a rounded end (λ < 1)", v.Decided, v.Rival, v.Each[2])
	}
	// Three points on the base: a rounded end misses the outer two by
	// some 0.07 of the base, λ ≈ 0.33 at a scatter of 0.08 of it
	// (indistinct) and 100 times that at a tenth of the scatter.
	tr.Lines = evenLines(open, h, 2.25, 2.5, 2.75)
	if v := teJudge(tr); v.Decided {
		t.Errorf("three base points, noise %g: decided (rival %s, λ %.4g)", tr.Noise, v.Rival, v.Lambda)
	}
	tr.Noise /= 10
	if v := teJudge(tr); !v.Decided {
		t.Errorf("three base points, noise %g: undecided (rival %s, λ %.4g)", tr.Noise, v.Rival, v.Lambda)
	}
	// A base thinner than four scatters may read sharp: no sharp rival.
	tr.Noise = 1e-3
	if v := teJudge(tr); !math.IsInf(v.Each[0], 1) {
		t.Errorf("base under four scatters: λ against sharp %.4g, want none", v.Each[0])
	}
	// A sharp truth is the nested case: always decided.
	_, closed, _ := naca0012Ends(t, 0.005)
	tr = &scangen.Truth{Section: closed, TEKind: closed.TEKind, Noise: noise, Lines: evenLines(open, h)}
	if v := teJudge(tr); !v.OK || !v.Decided {
		t.Errorf("sharp truth: ok %v decided %v", v.OK, v.Decided)
	}
}

// teNoPointProb against the probability computed by quadrature of its
// definition, E[(G − w)⁺]/h over the log-normal gap law (Simpson's rule
// on ln G over ±12σ), and its σ → 0 limit 1 − w/h.
func TestTENoPointProb(t *testing.T) {
	for _, tc := range []struct{ w, h, sigma float64 }{{0.0025, 0.004, 0.1}, {0.0025, 0.004, 0.5}, {0.01, 0.004, 0.8}, {0.001, 0.01, 0.3}} {
		mu := math.Log(tc.h) - tc.sigma*tc.sigma/2
		const n = 20000
		lo, hi := mu-12*tc.sigma, mu+12*tc.sigma
		step := (hi - lo) / n
		var sum float64
		for k := 0; k <= n; k++ {
			x := lo + float64(k)*step
			f := math.Exp(-sq(x-mu)/(2*tc.sigma*tc.sigma)) / (tc.sigma * math.Sqrt(2*math.Pi))
			v := max(math.Exp(x)-tc.w, 0) * f
			wgt := 2.0
			switch {
			case k == 0 || k == n:
				wgt = 1
			case k%2 == 1:
				wgt = 4
			}
			sum += wgt * v
		}
		want := sum * step / 3 / tc.h
		if got := teNoPointProb(tc.w, tc.h, tc.sigma); math.Abs(got-want) > 1e-6 {
			t.Errorf("w %g h %g σ %g: %.8f, quadrature %.8f", tc.w, tc.h, tc.sigma, got, want)
		}
	}
	if got := teNoPointProb(0.001, 0.004, 1e-4); math.Abs(got-0.75) > 1e-3 {
		t.Errorf("σ → 0: %.6f, want 0.75", got)
	}
}
