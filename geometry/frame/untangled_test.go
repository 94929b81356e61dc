package frame

import (
	"math"
	"testing"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/internal/testfoil"
)

// TestNormalizeUntangledDistance checks that a section whose surfaces
// cross ahead of its sharp corner says how far the edge was moved
// (Normalized.Untangled), the distance package accuracy adds to the
// chord's bound. The outline is made so (calculated by hand): half
// thickness h(x) = 0.3 √x (1 − x)(xc − x), upper surface at +h, lower at
// −h, so the surfaces cross at x = xc and meet again at the corner x = 1;
// the crossing lies (1 − xc) chords ahead of the corner. Without the
// crossing (xc = 1) nothing is moved.
func TestNormalizeUntangledDistance(t *testing.T) {
	const chord = 100.0
	const tol = 0.1 // share of the distance; the cut lands on the fitted curve's crossing
	for _, xc := range []float64{1, 0.985, 0.97} {
		h := func(x float64) float64 { return 0.3 * math.Sqrt(x) * (1 - x) * (xc - x) }
		const n = 200
		var loop []geometry.Point
		for k := 0; k <= n; k++ { // trailing edge over the upper surface to the nose
			x := (1 + math.Cos(math.Pi*float64(k)/n)) / 2
			loop = append(loop, geometry.Point{X: x, Y: h(x)})
		}
		for k := n - 1; k >= 0; k-- { // and back along the lower one
			x := (1 + math.Cos(math.Pi*float64(k)/n)) / 2
			loop = append(loop, geometry.Point{X: x, Y: -h(x)})
		}
		c := testfoil.Contour(loop, testfoil.Part{Chord: chord, RotDeg: 5})
		nz := normalizeExact(t, c)
		want := (1 - xc) * chord
		t.Logf("crossing at x = %g: Untangled %.4g, want %.4g", xc, nz.Untangled, want)
		if math.Abs(nz.Untangled-want) > tol*math.Max(want, 1) {
			t.Errorf("crossing at x = %g: Untangled %.4g, want %.4g (warnings %q)", xc, nz.Untangled, want, nz.Warnings)
		}
	}
}

// TestNormalizeUntangledKeepsCorner checks where a sharp edge whose
// surfaces cross ahead of its corner is put. The outline is that of
// TestNormalizeUntangledDistance (calculated by hand): half thickness
// h(x) = 0.3 √x (1 − x)(xc − x), surfaces ±h, crossing at x = xc and
// meeting again at the corner x = 1, a thin edge's surfaces crossed as
// points offset inwards cross them. With the fit's points as Support (they
// run on to the corner) the edge stays at the corner: the chord is the
// whole, the section no longer crosses itself, and its surfaces aft of the
// crossing lie within the thickness there of the part's mean line. With
// Support only ahead of the crossing, or UntangleCut, it is put where they
// cross, as before.
func TestNormalizeUntangledKeepsCorner(t *testing.T) {
	const chord = 100.0
	for _, xc := range []float64{0.985, 0.97} {
		h := func(x float64) float64 { return 0.3 * math.Sqrt(x) * (1 - x) * (xc - x) }
		const n = 200
		var loop []geometry.Point
		for k := 0; k <= n; k++ {
			x := (1 + math.Cos(math.Pi*float64(k)/n)) / 2
			loop = append(loop, geometry.Point{X: x, Y: h(x)})
		}
		for k := n - 1; k >= 0; k-- {
			x := (1 + math.Cos(math.Pi*float64(k)/n)) / 2
			loop = append(loop, geometry.Point{X: x, Y: -h(x)})
		}
		c := testfoil.Contour(loop, testfoil.Part{Chord: chord, RotDeg: 5})
		cv, rep, err := curve.Fit(c, curve.FitOptions{Exact: true})
		if err != nil {
			t.Fatal(err)
		}
		nz, err := Normalize(cv, Options{Support: rep.S})
		if err != nil {
			t.Fatal(err)
		}
		want := (1 - xc) * chord
		if !nz.Cornered || math.Abs(nz.Untangled-want) > 0.1*want {
			t.Errorf("xc %g: Cornered %v, Untangled %.4g, want true and %.4g", xc, nz.Cornered, nz.Untangled, want)
		}
		// The part's chord runs from the corner (1, 0) to the nose (0, 0).
		if d := math.Abs(nz.Frame.Chord - chord); d > 1e-3*chord {
			t.Errorf("xc %g: chord %.4f, want %.4f (corner kept)", xc, nz.Frame.Chord, chord)
		}
		path := nz.Path.(*curve.Curve)
		if _, _, crossed := crossingOf(path); crossed {
			t.Errorf("xc %g: the section still crosses itself", xc)
		}
		// Aft of 2xc − 1 the part's half thickness is at most
		// h(2xc − 1) (calculated by hand: < 3.5e-4 for both xc); the
		// straight surfaces lie within it of the mean line (y = 0).
		x0 := 2*xc - 1
		lim := math.Abs(h(x0)) + 1e-4
		for _, p := range path.Samples(4000) {
			if p.X > x0 && math.Abs(p.Y) > lim {
				t.Errorf("xc %g: surface at (%.4f, %.5f) off the mean line by more than %.5f", xc, p.X, p.Y, lim)
				break
			}
		}
		// No point beyond the crossing (none, or the fit's points ahead
		// of it only): the corner is the fit's guess.
		L := cv.Length()
		var fore []float64
		for _, s := range rep.S {
			if s > 0.05*L && s < 0.95*L {
				fore = append(fore, s)
			}
		}
		if beyond(fore)(0.05*L, 0.95*L) || !beyond(rep.S)(0.05*L, 0.95*L) {
			t.Errorf("beyond: points ahead of a crossing only read as beyond it, or the fit's own not")
		}
		for _, opts := range []Options{{Untangle: UntangleCut}, {}} {
			cut, err := Normalize(cv, opts)
			if err != nil {
				t.Fatal(err)
			}
			if cut.Cornered || math.Abs(cut.Frame.Chord-(chord-want)) > 0.1*want {
				t.Errorf("xc %g, %+v: Cornered %v, chord %.4f, want false and %.4f (put where they cross)", xc, opts, cut.Cornered, cut.Frame.Chord, chord-want)
			}
		}
	}
}
