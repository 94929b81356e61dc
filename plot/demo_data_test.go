package plot

import (
	"math"
	"testing"
)

// TestDemoJoukowski checks the demo's exact Joukowski solution against
// itself two ways: the lift from integrating its surface Cp must equal the
// Kutta–Joukowski lift 2Γ/(V∞c), and the rear stagnation point must sit at
// the cusp (Cp → the same value from both sides).
func TestDemoJoukowski(t *testing.T) {
	const tol = 1e-5 // relative; trapezoid sums over 4000 points, measured 4e-7, rounded up
	for _, deg := range []float64{0, 4, 8} {
		a := deg * math.Pi / 180
		xs, ys, cps := demoJoukowski.surface(4000, a)
		var fx, fy float64
		n := len(xs)
		for i := range n {
			j := (i + 1) % n
			cp := (cps[i] + cps[j]) / 2
			dx, dy := xs[j]-xs[i], ys[j]-ys[i]
			fx -= cp * dy // outward normal of a counter-clockwise walk: (dy, −dx)
			fy += cp * dx
		}
		cl := -fx*math.Sin(a) + fy*math.Cos(a)
		want := demoJoukowski.cl(a)
		if math.Abs(cl-want) > tol*math.Abs(want) {
			t.Errorf("α = %g°: Cl from Cp %.5f, Kutta–Joukowski %.5f", deg, cl, want)
		}
		if d := math.Abs(cps[0] - cps[n-1]); d > 0.02 {
			t.Errorf("α = %g°: Cp either side of the cusp %.4f and %.4f", deg, cps[0], cps[n-1])
		}
	}
}

// TestDemoThinAerofoil checks the demo's thin-aerofoil integrals for NACA
// 2412: zero-lift angle −2.08° and cm_c/4 −0.053 (values from memory, to
// the digits given).
func TestDemoThinAerofoil(t *testing.T) {
	al0, cm := thinAerofoil()
	if got := al0 * 180 / math.Pi; math.Abs(got+2.08) > 0.01 {
		t.Errorf("α_L0 = %.4f°, want −2.08°", got)
	}
	if math.Abs(cm+0.053) > 0.0006 {
		t.Errorf("cm_c/4 = %.5f, want −0.053", cm)
	}
}
