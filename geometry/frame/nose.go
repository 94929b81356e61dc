package frame

import (
	"math"

	"github.com/foilwright/foilwright/geometry"
	"github.com/foilwright/foilwright/geometry/curve"
	"github.com/foilwright/foilwright/internal/numeric"
	"gonum.org/v1/gonum/mat"
)

// This file reads the leading edge from a least-squares form of the nose.
//
// The leading edge is the outline point farthest from the trailing edge
// (common practice). On a round nose that point is where the outline's
// normal passes through the trailing edge, and the distance changes only
// to second order along the nose, so the farthest point of a fitted curve
// slides along the nose with the slope of the curve's error: a wiggle of
// the smoothing spline of a few hundredths of a percent of the chord
// moves it, by about √(2rδ) for a wiggle δ on a nose of radius r. On
// noisy scans of thick or blunt noses that slide was the largest part of
// the twist error (the leading edge slid across the chord line turns the
// chord with it) and of the node error near the nose (the whole section
// moves across by the slide), measured on the robustness campaign
// (internal/campaign): where the twist was off by more than 0.05°, the
// leading edge was off by more than 0.0008 chord in three cases of four.
//
// So the place along the nose is read from the nose as a whole. In the
// frame of the trailing edge (a along the line to the farthest curve
// point, b across it) the nose is a graph a = f(b); it is fitted by
// least squares, over the arc either side of the farthest point until
// the tangent has turned by noseTurn, with the polynomial of degree
// noseDegree in b and the term |b|³ that a NACA 4-digit nose holds (its
// half-thickness a√x + bx + … gives x = y²/a² ∓ 2b|y|³/a³ + …, NACA
// Report 824), the samples weighted 1 − t² over the window t ∈ [−1, 1]
// so that its ends, where the form departs most from a nose, count
// least. The leading edge is the point of that form farthest from the
// trailing edge, taken back onto the curve (its nearest point). The
// form's own departure from the nose is small against the slide it
// removes on noisy scans (campaign, well-sampled scans: twist error 95th
// percentile 0.085° → 0.063°, median node error 0.00038 → 0.00026 chord),
// and the slide of the spline's own farthest point stays in the section's
// bounds (package accuracy measures both).
const (
	noseTurn   = 60 * math.Pi / 180 // tangent turn either side of the farthest point that ends the window
	noseArc    = 0.1                // longest arc of the window either side, in chords
	noseDegree = 6                  // degree of the polynomial part of the form
	noseSample = 201                // samples of the curve over the window
)

// refineLE returns the arc length along cv of the leading edge read from
// the least-squares form of the nose about the farthest point from te at
// s0, and false (with s0) when the nose gives no form: a window too short,
// a fit that cannot be solved, or a form whose farthest point lies in the
// outer quarters of the window (it then describes the window's ends, not
// the nose).
func refineLE(cv *curve.Curve, te geometry.Point, s0 float64) (float64, bool) {
	L := cv.Length()
	le0 := cv.At(s0)
	c0 := le0.Dist(te)
	if !(c0 > 0) || !(L > 0) {
		return s0, false
	}
	t0 := cv.Tangent(s0)
	// Walk out from s0 either way until the tangent has turned by noseTurn.
	step := math.Min(c0*1e-3, L/4000)
	reach := func(dir float64) float64 {
		s := s0
		for {
			n := s + dir*step
			if math.Abs(n-s0) > noseArc*c0 || n <= 0 || n >= L {
				return s
			}
			tn := cv.Tangent(n)
			if math.Abs(math.Atan2(t0.Cross(tn), t0.Dot(tn))) > noseTurn {
				return n
			}
			s = n
		}
	}
	sA, sB := reach(-1), reach(1)
	if !(sB-sA > 0) || s0-sA < 4*step || sB-s0 < 4*step {
		return s0, false
	}
	u := le0.Sub(te).Scale(1 / c0)
	v := geometry.Point{X: -u.Y, Y: u.X}
	as := make([]float64, noseSample)
	bs := make([]float64, noseSample)
	var h float64
	for k := range noseSample {
		p := cv.At(sA + (sB-sA)*float64(k)/(noseSample-1)).Sub(te)
		as[k], bs[k] = p.Dot(u)-c0, p.Dot(v)
		h = math.Max(h, math.Abs(bs[k]))
	}
	if !(h > 0) {
		return s0, false
	}
	const nb = noseDegree + 2
	basis := func(b float64, row []float64) {
		x := b / h
		p := 1.0
		for j := 0; j <= noseDegree; j++ {
			row[j] = p
			p *= x
		}
		row[noseDegree+1] = math.Abs(x * x * x)
	}
	A := mat.NewDense(noseSample, nb, nil)
	y := mat.NewVecDense(noseSample, nil)
	row := make([]float64, nb)
	for k := range noseSample {
		t := 2*float64(k)/(noseSample-1) - 1
		w := math.Max(1-t*t, 1e-3)
		basis(bs[k], row)
		for j := range row {
			row[j] *= w
		}
		A.SetRow(k, row)
		y.SetVec(k, w*as[k])
	}
	var qr mat.QR
	qr.Factorize(A)
	var coef mat.VecDense
	if err := qr.SolveVecTo(&coef, false, y); err != nil {
		return s0, false
	}
	f := func(b float64) float64 {
		basis(b, row)
		var s float64
		for j := range nb {
			s += row[j] * coef.AtVec(j)
		}
		return s + c0
	}
	// The inner half of the window, in b: the samples a quarter and three
	// quarters of the way along it.
	lo, hi := bs[noseSample/4], bs[3*noseSample/4]
	if lo > hi {
		lo, hi = hi, lo
	}
	if !(hi > lo) {
		return s0, false
	}
	b := numeric.Golden(func(b float64) float64 { a := f(b); return -(a*a + b*b) }, lo, hi, 60)
	if tol := 1e-3 * (hi - lo); b-lo < tol || hi-b < tol {
		return s0, false
	}
	s, _ := cv.Project(te.Add(u.Scale(f(b))).Add(v.Scale(b)))
	if s < sA || s > sB {
		return s0, false
	}
	return s, true
}
